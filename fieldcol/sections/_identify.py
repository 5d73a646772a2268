"""Which catalogue section was measured? Rank the catalogue against site measurements.

Each nominal dimension gets a band of rolling tolerance, widened on both sides by the
measuring gauge's own tolerance; a deviation is expressed as a fraction of its band (negative
below nominal). A shape is ``within_tolerance`` when every measured dimension lies in its band, the limits
included (a dimension exactly at the limit fits; a part in 1e9 of the band is allowed for the
rounding of unit conversions). Ranking: shapes within tolerance first; among them, with a code
given, the catalogue of that code first (AISC: W, HP, S, M, HSS, Pipe; EN: IPE, HE), because a
wider band (EN 10034) would otherwise make a foreign shape look the closer fit; then by the
root-mean-square of the fractions, each of its shape's own band.

Tolerances (mm, per side, minus / plus):
  AISC W, HP, S, M: ASTM A6 as in AISC Manual Table 1-22: depth +-1/8 in; flange width
    +1/4 / -3/16 in. A6 tabulates no plate thickness tolerance for these shapes; its cross-
    sectional area / weight tolerance -2.5 % / +3.0 % is read here as the same fraction of each
    thickness tf, tw (our reading).
  AISC HSS rectangular (ASTM A500, from memory): outside dimension +-0.020 in up to 2-1/2 in,
    +-0.025 in up to 3-1/2 in, +-0.030 in up to 5-1/2 in, +-1 % above; wall +-10 % of nominal.
  AISC HSS round (ASTM A500, from memory): OD +-0.75 %; wall +-10 % of nominal.
  AISC Pipe (ASTM A53, from memory): OD +1/64 / -1/32 in up to NPS 1-1/2, +-1 % above; wall
    -12.5 % of nominal (A53 sets no plus limit; +12.5 % is used so the band is symmetric).
  EN IPE, HE (EN 10034, from memory): h +3/-2 mm (h <= 180), +4/-2 (<= 400), +5/-3 (<= 700),
    +-5 above; b +4/-1 (b <= 110), +4/-2 (<= 210), +-4 (<= 325), +6/-5 above; tw +-0.7 (< 7),
    +-1.0 (< 10), +-1.5 (< 20), +-2.0 (< 40), +-2.5 (< 60), +-3.0 above; tf +1.5/-0.5 (< 6.5),
    +2.0/-1.0 (< 10), +2.5/-1.5 (< 20), +2.5/-2.0 (< 30), +-2.5 (< 40), +-3.0 (< 60), +-4.0 above.
Hollow sections are compared on the nominal wall thickness (measured walls of ERW HSS sit near
the design thickness 0.93 tnom, inside the band). A box is matched whichever way round it was
measured (the larger of d, b is compared with the catalogue depth). S shapes: measure tf halfway
along the sloped outstand, where the tabulated mean thickness applies.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass, field

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._catalogue import FAMILIES, catalogue_arrays

IN = 25.4
# query dimension -> catalogue column
_I_DIMS = ("d", "bf", "tf", "tw")
_RECT_DIMS = ("d", "b", "t")
_ROUND_DIMS = ("D", "t")
_COLUMN = {"d": "d", "bf": "bf", "tf": "tf", "tw": "tw", "b": "bf", "t": "t", "D": "d"}
#: the catalogue families of each code, preferred when both fit
CODE_FAMILIES = {"aisc360-22": ("W", "HP", "S", "M", "HSS", "PIPE"),
                 "en1993-1-1": ("IPE", "HEA", "HEB", "HEM")}
_FAMILY_KIND = {"W": "i", "HP": "i", "S": "i", "M": "i", "IPE": "i", "HEA": "i", "HEB": "i",
                "HEM": "i", "HSS": "rect|round", "PIPE": "round"}


@dataclass(frozen=True)
class Match:
    """One catalogue candidate for a measured section.

    Args:
        name: catalogue designation.
        family: catalogue family (``"W"``, ``"HSS"``, ``"HEB"``, ...).
        score: root-mean-square of the deviations as fractions of their tolerance bands
            (0 = exactly nominal, 1 = at the edge of the bands on average).
        deviation_mm: measured - nominal per measured dimension (mm).
        deviation_frac: the same as a fraction of the band on that side (negative below nominal).
        within_tolerance: every measured dimension lies within its band.

    Example:
        >>> m = Match("W14X90", "W", 0.2, {"d": 1.0}, {"d": 0.31}, True)
        >>> m.within_tolerance
        True
    """

    name: str
    family: str
    score: float
    deviation_mm: dict[str, float] = field(default_factory=dict)
    deviation_frac: dict[str, float] = field(default_factory=dict)
    within_tolerance: bool = False


def _step(x: np.ndarray, edges: tuple[float, ...], values: tuple[float, ...]) -> np.ndarray:
    """values[k] where x lies in the k-th interval of edges (x < edges[0] -> values[0])."""
    return np.asarray(values)[np.searchsorted(np.asarray(edges), x, side="left")]


@functools.lru_cache(maxsize=1)
def _bands() -> dict[str, tuple[np.ndarray, np.ndarray]]:
    """Per catalogue row and column: (minus, plus) tolerance in mm (NaN where not applicable)."""
    cat = catalogue_arrays()
    fam, kind = cat.family, cat.kind
    aisc_i = np.isin(fam, ("W", "HP", "S", "M"))
    en_i = np.isin(fam, ("IPE", "HEA", "HEB", "HEM"))
    rect = kind == "rect"
    hss_round = (fam == "HSS") & (kind == "round")
    pipe = fam == "PIPE"
    nan = np.full(cat.d.shape, np.nan)
    minus = {k: nan.copy() for k in ("d", "bf", "tf", "tw", "t")}
    plus = {k: nan.copy() for k in ("d", "bf", "tf", "tw", "t")}

    def put(mask, col, lo, hi):
        minus[col][mask] = np.broadcast_to(lo, mask.shape)[mask]
        plus[col][mask] = np.broadcast_to(hi, mask.shape)[mask]

    # ASTM A6 / AISC Manual Table 1-22
    put(aisc_i, "d", IN / 8, IN / 8)
    put(aisc_i, "bf", 3 * IN / 16, IN / 4)
    for col in ("tf", "tw"):
        put(aisc_i, col, 0.025 * getattr(cat, col), 0.030 * getattr(cat, col))
    # EN 10034 (from memory)
    h = cat.d
    put(en_i, "d", _step(h, (180, 400, 700), (2, 2, 3, 5)), _step(h, (180, 400, 700), (3, 4, 5, 5)))
    b = cat.bf
    put(en_i, "bf", _step(b, (110, 210, 325), (1, 2, 4, 5)),
        _step(b, (110, 210, 325), (4, 4, 4, 6)))
    tw_tol = _step(cat.tw, (7 - 1e-9, 10 - 1e-9, 20 - 1e-9, 40 - 1e-9, 60 - 1e-9),
                   (0.7, 1.0, 1.5, 2.0, 2.5, 3.0))
    put(en_i, "tw", tw_tol, tw_tol)
    tf_edges = (6.5 - 1e-9, 10 - 1e-9, 20 - 1e-9, 30 - 1e-9, 40 - 1e-9, 60 - 1e-9)
    put(en_i, "tf", _step(cat.tf, tf_edges, (0.5, 1.0, 1.5, 2.0, 2.5, 3.0, 4.0)),
        _step(cat.tf, tf_edges, (1.5, 2.0, 2.5, 2.5, 2.5, 3.0, 4.0)))
    # ASTM A500 rectangular (from memory)
    for col in ("d", "bf"):
        x = getattr(cat, col)
        tol = np.where(x <= 2.5 * IN + 1e-9, 0.020 * IN,
                       np.where(x <= 3.5 * IN + 1e-9, 0.025 * IN,
                                np.where(x <= 5.5 * IN + 1e-9, 0.030 * IN, 0.01 * x)))
        put(rect, col, tol, tol)
    put(rect | hss_round, "t", 0.10 * cat.t, 0.10 * cat.t)
    # ASTM A500 round, A53 pipe (from memory)
    put(hss_round, "d", 0.0075 * cat.d, 0.0075 * cat.d)
    small = cat.d <= 1.9 * IN + 1e-9  # NPS 1-1/2 has OD 1.900 in
    put(pipe, "d", np.where(small, IN / 32, 0.01 * cat.d), np.where(small, IN / 64, 0.01 * cat.d))
    put(pipe, "t", 0.125 * cat.t, 0.125 * cat.t)
    return {k: (minus[k], plus[k]) for k in minus}


def _measured(value: object, name: str) -> float | None:
    if value is None:
        return None
    try:
        v = float(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        raise InputError(name, value, "not a number", "give the measurement in mm") from None
    if not np.isfinite(v) or v <= 0:
        raise InputError(name, value, "a measured dimension must be greater than zero",
                         "give the measurement in mm")
    return v


def _families(family: str | list[str] | tuple[str, ...] | None) -> tuple[str, ...]:
    if family is None:
        return FAMILIES
    names = [family] if isinstance(family, str) else list(family)
    out = []
    for f in names:
        key = str(f).strip().upper()
        if key == "HE":
            out += ["HEA", "HEB", "HEM"]
        elif key in FAMILIES:
            out.append(key)
        else:
            raise InputError("family", f, "unknown family", "one of " + ", ".join(FAMILIES))
    return tuple(out)


def identify(*, d: float | None = None, bf: float | None = None, tf: float | None = None,
             tw: float | None = None, b: float | None = None, t: float | None = None,
             D: float | None = None, gauge: float = 0.0,
             family: str | list[str] | None = None, limit: int = 10,
             code: str | None = None) -> list[Match]:
    """Rank catalogue sections against measured dimensions (all in mm).

    Give ``d, bf, tf, tw`` (any of them) for an I or H shape, ``d, b, t`` for a rectangular
    hollow section, ``D, t`` for a round one. Every catalogue section of that kind (and of
    ``family`` if given) is scored at once with numpy.

    Args:
        d, bf, tf, tw: I shape depth, flange width, flange and web thickness (mm).
        b, t: hollow section width and wall (mm); ``d`` is then the depth.
        D: round hollow section outside diameter (mm).
        gauge: tolerance of the measuring gauge (mm), added to each band on both sides.
        family: a family name or list of them (``"W"``, ``"HE"``, ``"HSS"``, ...) or None for all.
        limit: how many candidates to return when some are within tolerance.
        code: the site's code (``"aisc360-22"``, ``"en1993-1-1"``): its catalogue ranks first
            among the shapes within tolerance; None or ``"elastic"``: no preference.
    Returns:
        Matches best first. When none is within tolerance, the nearest three (at most
        ``limit``), all flagged ``within_tolerance=False``: use the measured section.
    Raises:
        InputError: a non-positive or non-numeric measurement, dimensions of two kinds mixed,
            too few dimensions to tell the kind, an unknown family, a bad gauge or limit.

    Example:
        >>> m = identify(d=356.0, bf=368.0, tf=18.0, tw=11.2)
        >>> m[0].name, m[0].within_tolerance
        ('W14X90', True)
    """
    given = {k: _measured(v, k) for k, v in
             (("d", d), ("bf", bf), ("tf", tf), ("tw", tw), ("b", b), ("t", t), ("D", D))}
    given = {k: v for k, v in given.items() if v is not None}
    try:
        g = float(gauge)
    except (TypeError, ValueError):
        raise InputError("gauge", gauge, "not a number", "the gauge tolerance in mm, e.g. 0.5") \
            from None
    if not np.isfinite(g) or g < 0:
        raise InputError("gauge", gauge, "cannot be negative", "the gauge tolerance in mm, or 0")
    if isinstance(limit, bool) or not isinstance(limit, (int, np.integer)) or limit < 1:
        raise InputError("limit", limit, "must be a whole number of at least 1", "e.g. 10")
    fams = _families(family)
    if code is not None and code not in (*CODE_FAMILIES, "elastic"):
        raise InputError("code", code, "unknown code", "aisc360-22, en1993-1-1 or elastic")

    i_keys = {"bf", "tf", "tw"} & given.keys()
    if "D" in given:
        kind, dims = "round", _ROUND_DIMS
        other = (i_keys | {"b", "d"}) & given.keys()
        if other:
            raise InputError(sorted(other)[0], given[sorted(other)[0]],
                             "a round section is measured by D and t only", "drop it, or drop D")
    elif "b" in given or ("t" in given and not i_keys):
        kind, dims = "rect", _RECT_DIMS
        if i_keys:
            k = sorted(i_keys)[0]
            raise InputError(k, given[k], "an I shape dimension mixed with a hollow section's b, t",
                             "use d, bf, tf, tw for an I shape; d, b, t for a box")
    elif i_keys:
        kind, dims = "i", _I_DIMS
        if "t" in given:
            raise InputError("t", given["t"], "a wall thickness mixed with I shape dimensions",
                             "use tf and tw for an I shape")
    else:
        raise InputError("d", given.get("d"), "not enough to tell the kind of section",
                         "give bf, tf, tw for an I shape; b, t for a box; D, t for a round one")
    if kind == "rect" and "d" in given and "b" in given and given["d"] < given["b"]:
        given["d"], given["b"] = given["b"], given["d"]  # the catalogue lists depth >= width
    fam_kinds = {k for f in fams for k in _FAMILY_KIND[f].split("|")}
    if kind not in fam_kinds:
        raise InputError("family", family, f"no {kind} sections in the families asked for",
                         "drop the family or measure the other dimensions")

    cat = catalogue_arrays()
    bands = _bands()
    mask = (cat.kind == kind) & np.isin(cat.family, fams)
    rows = np.flatnonzero(mask)
    used = [k for k in dims if k in given]
    devs, fracs = [], []
    for k in used:
        col = _COLUMN[k]
        nominal = getattr(cat, col)[rows]
        lo, hi = bands[col][0][rows] + g, bands[col][1][rows] + g
        dev = given[k] - nominal
        devs.append(dev)
        fracs.append(np.where(dev >= 0, dev / hi, dev / lo))
    dev_a = np.array(devs)
    frac_a = np.array(fracs)
    score = np.sqrt(np.mean(frac_a**2, axis=0))
    # inclusive limits: 1 + 1e-9 absorbs the rounding of an exact limit typed in other units
    within = np.all(np.abs(frac_a) <= 1.0 + 1e-9, axis=0)
    foreign = ~np.isin(cat.family[rows], CODE_FAMILIES.get(code or "", tuple(fams)))
    order = np.lexsort((score, foreign & within, ~within))
    n = int(limit) if within.any() else min(int(limit), 3)
    out = []
    for j in order[:n]:
        i = rows[j]
        out.append(Match(
            name=str(cat.names[i]), family=str(cat.family[i]), score=float(score[j]),
            deviation_mm={k: float(dev_a[m, j]) for m, k in enumerate(used)},
            deviation_frac={k: float(frac_a[m, j]) for m, k in enumerate(used)},
            within_tolerance=bool(within[j]),
        ))
    return out
