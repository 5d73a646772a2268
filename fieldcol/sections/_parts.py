"""Parts of built-up sections: plates, angles, channels and tees, measured or from the parts
catalogue (``data/parts_aisc.csv``, ``data/parts_en.csv``; see ``data/SOURCES.md``).

Dimensions in mm. A channel's sloped inner flange face is modelled (``tf`` is the thickness
halfway along the flange, as tabulated): taking it parallel would overstate a C shape's own
Iy by a quarter.
"""

from __future__ import annotations

import csv
import difflib
import functools
import re
from dataclasses import dataclass

import numpy as np

from fieldcol._resources import shipped
from fieldcol.errors import InputError
from fieldcol.sections._outline import Outline, angle, channel, plate, properties, tee

PART_KINDS = ("plate", "angle", "channel", "tee")
_FILES = (("parts_aisc.csv", 25.4), ("parts_en.csv", 1.0))


@dataclass(frozen=True)
class Part:
    """One component. ``d``: depth (channel, tee) or the vertical leg (angle) or thickness-wise
    nothing (plate: ``d`` is the thickness); ``b``: flange width, the other leg, or the plate's
    width; ``tf``, ``tw``: flange and web (angle: both the leg thickness); ``r1`` root radius,
    ``r2`` toe radius; ``name``: catalogue designation or None (measured)."""

    kind: str
    d: float
    b: float
    tf: float
    tw: float
    r1: float = 0.0
    r2: float = 0.0
    name: str | None = None
    area_published: float | None = None   # mm^2, catalogue rows only
    slope: float = 0.0                    # channel: rise over run of the inner flange face

    def outline(self) -> Outline:
        """The part in its own frame (see ``fieldcol.sections._outline``).

        Example:
            >>> round(properties(Part("plate", 10, 300, 10, 10).outline())["A"])
            3000
        """
        label = self.name or self.kind
        if self.kind == "plate":
            return plate(self.b, self.d, label)
        if self.kind == "angle":
            return angle(self.d, self.b, self.tf, self.r1, self.r2, label)
        if self.kind == "channel":
            return channel(self.d, self.b, self.tf, self.tw, self.r1, self.r2, label, self.slope)
        return tee(self.d, self.b, self.tf, self.tw, self.r1, label)

    @property
    def J(self) -> float:
        """Saint-Venant torsion constant as thin rectangles, sum b t^3 / 3 (mm^4): fillets left
        out, which is on the safe side.

        Example:
            >>> round(Part("plate", 10, 300, 10, 10).J)
            100000
        """
        if self.kind == "plate":
            return self.b * self.d**3 / 3
        if self.kind == "angle":
            t = self.tf
            return ((self.b + self.d - t) * t**3) / 3
        if self.kind == "channel":
            return (2 * self.b * self.tf**3 + (self.d - 2 * self.tf) * self.tw**3) / 3
        return (self.b * self.tf**3 + (self.d - self.tf) * self.tw**3) / 3

    def elements(self) -> list[tuple[str, float, str]]:
        """The part's plate elements for local buckling: (name, width / thickness, type) with
        type ``"leg"`` (an angle leg), ``"outstand"`` (one edge free) or ``"internal"``
        (both edges held). Widths as AISC 360-22 Table B4.1a measures them (from memory):
        angle legs the full leg b / t; channel flanges the full width bf / tf; the channel
        web h / tw with h clear of the fillets; a tee flange bf / 2tf, its stem d / tw.
        A plate's own elements depend on where it is held (the arrangement gives them).
        """
        if self.kind == "angle":
            return [(f"{self.name or 'angle'} leg", max(self.b, self.d) / self.tf, "leg")]
        if self.kind == "channel":
            h = self.d - 2 * (self.tf + self.r1)
            return [(f"{self.name or 'channel'} flange", self.b / self.tf, "outstand"),
                    (f"{self.name or 'channel'} web", h / self.tw, "internal")]
        if self.kind == "tee":
            return [(f"{self.name or 'tee'} flange", self.b / (2 * self.tf), "outstand"),
                    (f"{self.name or 'tee'} stem", self.d / self.tw, "stem")]
        return []

    def own(self) -> dict[str, float]:
        """A, centroid, Ix, Iy and the principal second moments of the part alone (mm)."""
        return properties(self.outline())


def measured(kind: str, fld: str, **dims: float) -> Part:
    """A part from measured dimensions (mm), each checked.

    Args:
        kind: ``plate`` (``width``, ``thickness``), ``angle`` (``legs`` (d, b), ``t``, optional
            ``r1``, ``r2``), ``channel`` (``d``, ``bf``, ``tf``, ``tw``, optional ``r1``, ``r2``),
            ``tee`` (``d``, ``bf``, ``tf``, ``tw``, optional ``r1``).
        fld: the record path named in errors.
    Returns:
        A ``Part``.
    Raises:
        InputError: a missing, non-positive or impossible dimension, naming ``fld.<key>``.

    Example:
        >>> measured("angle", "section.built.angle", d=100, b=75, t=10).b
        75.0
    """
    def need(key: str) -> float:
        v = dims.get(key)
        if v is None:
            raise InputError(f"{fld}.{key}", "", f"required for a measured {kind}",
                             "give it with its unit, e.g. 3/8 in")
        if not np.isfinite(v) or v <= 0:
            raise InputError(f"{fld}.{key}", f"{v:g} mm", "must be greater than zero",
                             "give it with its unit, e.g. 3/8 in")
        return float(v)

    def opt(key: str) -> float:
        v = dims.get(key)
        if v is None:
            return 0.0
        if not np.isfinite(v) or v < 0:
            raise InputError(f"{fld}.{key}", f"{v:g} mm", "must be zero or more", None)
        return float(v)

    if kind == "plate":
        return Part("plate", need("thickness"), need("width"), need("thickness"),
                    need("thickness"))
    if kind == "angle":
        d, b, t = need("d"), need("b"), need("t")
        r1, r2 = opt("r1"), opt("r2")
        if t >= min(b, d) or r2 >= t:
            raise InputError(f"{fld}.t", f"{t:g} mm", "thicker than a leg (or the toe radius)",
                             "check the leg lengths and thickness")
        if t + r1 >= min(b, d):
            raise InputError(f"{fld}.r1", f"{r1:g} mm", "the root fillet does not fit the legs", None)
        return Part("angle", d, b, t, t, r1, r2)
    d, bf, tf, tw = need("d"), need("bf"), need("tf"), need("tw")
    r1, r2 = opt("r1"), opt("r2") if kind == "channel" else 0.0
    slope = float(dims.get("slope") or 0.0) if kind == "channel" else 0.0
    if 2 * tf >= d if kind == "channel" else tf >= d:
        raise InputError(f"{fld}.tf", f"{tf:g} mm", "the flanges fill the depth", None)
    if (tw + r1 >= bf) if kind == "channel" else (tw + 2 * r1 >= bf):
        raise InputError(f"{fld}.tw", f"{tw:g} mm", "the web and fillets are wider than the flange",
                         None)
    return Part(kind, d, bf, tf, tw, r1, r2, slope=slope)


@functools.lru_cache(maxsize=1)
def _rows() -> dict[str, Part]:
    out: dict[str, Part] = {}
    for fname, scale in _FILES:
        with (shipped("data") / fname).open(newline="", encoding="utf-8") as fh:
            for rec in csv.DictReader(line for line in fh if not line.startswith("#")):
                A = float(rec["A"]) * scale**2
                out[rec["designation"]] = Part(
                    rec["kind"], float(rec["d"]) * scale, float(rec["b"]) * scale,
                    float(rec["tf"]) * scale, float(rec["tw"]) * scale,
                    float(rec["r1"]) * scale, float(rec["r2"]) * scale, rec["designation"], A,
                    float(rec["slope"]))
    return out


def _key(text: str) -> str:
    return re.sub(r"[\s_]", "", text.upper().replace("×", "X").replace("*", "X"))


@functools.lru_cache(maxsize=1)
def _index() -> dict[str, str]:
    return {_key(name): name for name in _rows()}


def part_names(kind: str | None = None) -> list[str]:
    """Designations in the parts catalogue, optionally of one kind (``angle``, ``channel``).

    Example:
        >>> "C12X20.7" in part_names("channel"), "UPN 200" in part_names("channel")
        (True, True)
    """
    return [n for n, p in _rows().items() if kind is None or p.kind == kind]


def catalogue_part(name: str, fld: str, kind: str | None = None) -> Part:
    """A channel or angle by its designation (``C12X20.7``, ``L4X4X1/2``, ``UPN 200``).

    Raises:
        InputError: an unknown name (with the nearest names) or a part of another kind.

    Example:
        >>> round(catalogue_part("l4 x 4 x 1/2", "angle").tf, 1)
        12.7
    """
    if not isinstance(name, str) or not name.strip():
        raise InputError(fld, name, "must be a designation (text)", 'e.g. "L4X4X1/2"')
    found = _index().get(_key(name))
    if found is None:
        near = difflib.get_close_matches(_key(name), list(_index()), n=3, cutoff=0.6)
        hint = ("nearest: " + ", ".join(_index()[n] for n in near)) if near else \
            "give the dimensions instead"
        raise InputError(fld, name, "not in the parts catalogue", hint)
    part = _rows()[found]
    if kind is not None and part.kind != kind:
        raise InputError(fld, name, f"is a {part.kind}, not a {kind}", None)
    return part
