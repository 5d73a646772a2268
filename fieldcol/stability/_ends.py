"""End conditions and brace points of one column axis, and the checks on them."""

from __future__ import annotations

import math
from dataclasses import dataclass
from collections.abc import Sequence

import numpy as np

from fieldcol.errors import InputError

HELD = math.inf
SAME = 1e-9  # brace points closer than this fraction of the length are one point
GAP = 1e-4   # ... and closer than this (but not the same point) are refused as ambiguous
LABELS = ("fixed", "pinned", "free", "guided", "partial")

# (translation, rotation) of the four classical ends.
_CLASSICAL = {
    "fixed": (HELD, HELD),
    "pinned": (HELD, 0.0),
    "free": (0.0, 0.0),
    "guided": (0.0, HELD),
}


@dataclass(frozen=True)
class End:
    """How one end of a column is held about one axis.

    Args:
        translation: 0 = free to sway, ``math.inf`` = held, else a spring in N/mm.
        rotation: 0 = free to rotate, ``math.inf`` = held, else a spring in N*mm/rad.
        label: ``"fixed"``, ``"pinned"``, ``"free"``, ``"guided"`` or ``"partial"``.

    Example:
        >>> End(math.inf, 0.0, "pinned").label
        'pinned'
    """

    translation: float
    rotation: float
    label: str


@dataclass(frozen=True)
class Brace:
    """A brace point along the height.

    Args:
        at: position in mm from the bottom of the column.
        stiffness: translational stiffness in N/mm; ``math.inf`` (default) is a rigid brace.

    Example:
        >>> Brace(1500.0).stiffness
        inf
    """

    at: float
    stiffness: float = math.inf


def sub(field: str, name: str) -> str:
    """The dotted field ``name`` under ``field`` (``field`` may be empty)."""
    return f"{field}.{name}" if field else name


def end(spec: str | End, field: str) -> End:
    """An end condition from its name, or a checked copy of an ``End``.

    Args:
        spec: ``"fixed"``, ``"pinned"``, ``"free"`` or ``"guided"`` (any case, surrounding blanks
            ignored), or an ``End`` (its springs must be >= 0 and its label must agree with them).
        field: the field the entry came from, named in any error.

    Returns:
        The ``End``.

    Example:
        >>> end("pinned", "restraints.weak.top")
        End(translation=inf, rotation=0.0, label='pinned')
    """
    if isinstance(spec, End):
        if id(spec) in _MADE_IDS:  # one of ours, checked when it was made
            return spec
        return _checked(spec, field)
    if isinstance(spec, str):
        made = _MADE.get(spec)
        if made is not None:
            return made
        name = spec.strip().lower()
        if name in _CLASSICAL:
            return _MADE[name]
        if name == "partial":
            raise InputError(field, spec, "a partial end needs its spring stiffness",
                             "use partial_end(rotation=..., translation=...) in N*mm/rad and N/mm")
    raise InputError(field, spec, "unknown end condition",
                     "use fixed, pinned, free or guided, or a partial end with springs")


#: the classical ends, made once (an ``End`` is frozen: one shared copy cannot be changed)
_MADE = {name: End(t, r, name) for name, (t, r) in _CLASSICAL.items()}
_MADE_IDS = frozenset(id(e) for e in _MADE.values())


def partial_end(rotation: float, translation: float = HELD, field: str = "") -> End:
    """An end held by springs (rotation in N*mm/rad, translation in N/mm; ``math.inf`` = held).

    Args:
        rotation: rotational spring, N*mm/rad (0 = free, inf = held).
        translation: translational spring, N/mm (default held).
        field: the field named in any error.

    Returns:
        ``End(translation, rotation, "partial")``.

    Example:
        >>> partial_end(2.0e9).rotation
        2000000000.0
    """
    return _checked(End(translation, rotation, "partial"), field)


def kind(e: End) -> str:
    """The classical name of an end by its springs, else ``"partial"``.

    Example:
        >>> kind(End(math.inf, 0.0, "partial"))
        'pinned'
    """
    for name, (t, r) in _CLASSICAL.items():
        if e.translation == t and e.rotation == r:
            return name
    return "partial"


def _checked(e: End, field: str) -> End:
    for name in ("translation", "rotation"):
        v = getattr(e, name)
        if isinstance(v, bool) or not isinstance(v, (int, float, np.floating, np.integer)):
            raise InputError(sub(field, name), v, "not a number",
                             "give a spring stiffness, 0 for free or math.inf for held")
        if math.isnan(v) or v < 0:
            raise InputError(sub(field, name), v, "a spring stiffness must be >= 0",
                             "0 for free, math.inf for held")
    if e.label not in LABELS:
        raise InputError(sub(field, "label"), e.label, "unknown end label",
                         "fixed, pinned, free, guided or partial")
    k = kind(e)
    if e.label != "partial" and e.label != k:
        raise InputError(field, e, f"labelled {e.label!r} but its springs make it {k!r}",
                         "use end(name) for a classical end or label it 'partial'")
    return End(float(e.translation), float(e.rotation), e.label)


def check_length(L: float, field: str) -> float:
    """``L`` as a float if it is a finite positive length, else InputError."""
    if isinstance(L, bool) or not isinstance(L, (int, float, np.floating, np.integer)):
        raise InputError(field, L, "not a number", "a length in mm, e.g. 3600")
    if not (math.isfinite(L) and L > 0):
        raise InputError(field, L, "a length must be finite and > 0", "a length in mm, e.g. 3600")
    return float(L)


def check_braces(braces: Sequence[Brace], L: float, field: str) -> list[Brace]:
    """The braces checked against the length: 0 <= at <= L, stiffness > 0 (inf = rigid)."""
    if isinstance(braces, (Brace, str)) or not isinstance(braces, Sequence):
        raise InputError(sub(field, "braces"), braces, "not a list of Brace",
                         "give a list, e.g. [Brace(1800.0)] or []")
    out = []
    for i, b in enumerate(braces):
        f = sub(field, f"braces[{i}]")
        if not isinstance(b, Brace):
            raise InputError(f, b, "not a Brace", "Brace(at=mm from the bottom, stiffness=N/mm)")
        at = b.at
        if isinstance(at, bool) or not isinstance(at, (int, float, np.floating, np.integer)) \
                or not math.isfinite(at):
            raise InputError(f + ".at", at, "not a finite position", "mm from the bottom")
        if not 0.0 <= at <= L:
            raise InputError(f + ".at", at, f"outside the column (0 to {L:g} mm)",
                             "measure it from the bottom of the column")
        k = b.stiffness
        if isinstance(k, bool) or not isinstance(k, (int, float, np.floating, np.integer)) \
                or math.isnan(k):
            raise InputError(f + ".stiffness", k, "not a number", "N/mm, or math.inf for rigid")
        if k <= 0:
            raise InputError(f + ".stiffness", k, "a brace with no stiffness holds nothing",
                             "remove the brace, or give its stiffness in N/mm")
        out.append(Brace(float(at), float(k)))
    check_spacing([b.at / L for b in out], L, field)
    return out


def check_spacing(fracs: Sequence[float], L: float | None, field: str) -> None:
    """Refuse brace points a hair apart (or a hair from an end) that are not the same point.

    Why: two points 1e-4 L apart cannot be told apart on site, and a tiny element between them
    ruins the conditioning of the analysis; the engineer should enter them as one.
    """
    pts = sorted((f, i) for i, f in enumerate(fracs))
    prev: tuple[float, int | None] = (0.0, None)
    for f, i in pts + [(1.0, None)]:
        gap = f - prev[0]
        if SAME < gap < GAP:
            j = i if i is not None else prev[1]
            near = "the other end" if i is None else (
                "the bottom" if prev[1] is None else f"brace {prev[1]}")
            far = f"{gap * L:.3g} mm" if L else f"{gap:.3g} of the length"
            raise InputError(sub(field, f"braces[{j}].at"), fracs[j] * (L or 1.0),
                             f"{far} from {near}",
                             "enter braces this close as one point (at an end: at the end)")
        prev = (f, i)
