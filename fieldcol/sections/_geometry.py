"""Closed-form properties of I, rectangular hollow and round hollow sections (vectorised).

All inputs and results in mm (mm^2, mm^3, mm^4, mm^6). Inputs broadcast like numpy; scalars give
0-d arrays. The formulas are exact for the idealised outline (straight plates, circular root
fillets, circular corners) except J of open I shapes, which uses the published approximation
below.
"""

from __future__ import annotations

from typing import Callable

import numpy as np
from numpy.typing import ArrayLike

from fieldcol.errors import InputError
from fieldcol.sections._section import Section

_PI = np.pi
# A "spandrel" is the fillet material between two perpendicular straight edges and a concave
# quarter circle of radius r (a root fillet, or the piece a round corner removes from a square).
_SPANDREL_AREA = 1.0 - _PI / 4.0  # x r^2
_SPANDREL_C = (10.0 - 3.0 * _PI) / (12.0 - 3.0 * _PI)  # x r: centroid from each straight edge
_SPANDREL_I_EDGE = 1.0 - 5.0 * _PI / 16.0  # x r^4: second moment about one straight edge
_GAUSS_X, _GAUSS_W = np.polynomial.legendre.leggauss(3)
S_SLOPE = 1.0 / 6.0  # S shapes: inner flange faces slope 1:6 (16-2/3 %), from memory
S_SLOPE_NOTE = "S shape: sloped flanges (1:6) modelled, tf is the mean flange thickness"


def _spandrel(r: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Area, centroid offset from each straight edge, own second moment (parallel to an edge)."""
    a = _SPANDREL_AREA * r**2
    c = _SPANDREL_C * r
    i_own = _SPANDREL_I_EDGE * r**4 - a * c**2
    return a, c, i_own


def _as_arrays(**named: object) -> dict[str, np.ndarray]:
    """Float arrays broadcast together; non-numeric or non-finite input names its field."""
    out = {}
    for field, value in named.items():
        try:
            arr = np.asarray(value, dtype=float)
        except (TypeError, ValueError):
            raise InputError(field, value, "not a number", "give a length in mm") from None
        bad = ~np.isfinite(arr)
        if bad.any():
            _raise_first(bad, field, arr, "not a finite number", "give a length in mm")
        out[field] = arr
    try:
        shaped = np.broadcast_arrays(*out.values())
    except ValueError:
        shapes = ", ".join(f"{k} {np.shape(v)}" for k, v in out.items())
        raise InputError(next(iter(out)), shapes, "array shapes do not broadcast together",
                         "give scalars or arrays of one shape") from None
    return {k: np.array(v, dtype=float) for k, v in zip(out, shaped)}


_Reason = str | Callable[[tuple], str]


def _raise_first(bad: np.ndarray, field: str, values: np.ndarray, reason: _Reason,
                 hint: str | None) -> None:
    """Raise InputError for the first flagged element; batches name it as ``field[i]``."""
    idx = tuple(int(i) for i in np.argwhere(bad)[0]) if np.ndim(bad) else ()
    name = field if not idx else f"{field}[{','.join(map(str, idx))}]"
    value = np.asarray(values)[idx] if np.ndim(values) else values
    unit = "" if field == "flange_slope" else " mm"
    text = f"{float(value):g}{unit}" if np.size(value) == 1 else repr(value)
    why = reason(idx) if callable(reason) else reason
    raise InputError(name, text, why, hint)


def _require(ok: np.ndarray, field: str, values: np.ndarray, reason: _Reason,
             hint: str | None = None) -> None:
    bad = ~np.asarray(ok, dtype=bool)
    if bad.any():
        _raise_first(bad, field, values, reason, hint)


def _positive(arrs: dict[str, np.ndarray], *fields: str) -> None:
    for f in fields:
        _require(arrs[f] > 0, f, arrs[f], "must be greater than zero", "give the dimension in mm")


def _at(arr: np.ndarray, idx: tuple) -> float:
    return float(arr[idx]) if arr.ndim else float(arr)


def i_section(d: ArrayLike, bf: ArrayLike, tf: ArrayLike, tw: ArrayLike, r: ArrayLike = 0.0, *,
              rolled: bool = True, name: str | None = None,
              flange_slope: ArrayLike = 0.0) -> Section:
    """Doubly symmetric I or H section from its plates and root fillets.

    Rolled shapes include the four root fillets of radius ``r`` in every property; welded or
    built-up shapes take ``r = 0`` and ``rolled=False`` (weld fillets ignored, on the safe side).
    Sloped inner flange faces (S shapes: 1:6, i.e. 16-2/3 %, from memory) are modelled when
    ``flange_slope`` > 0: ``tf`` is then the mean flange thickness (the thickness halfway along the
    outstand, as tabulated) and the root fillet meets the thicker flange root.
    J uses the El Darwish-Johnston expression as reproduced in AISC Design Guide 9 (Torsional
    Analysis of Structural Steel Members), Appendix A (from memory; checked here against every W
    shape of the AISC Shapes Database v15.0):
    J = 2/3 bf tf^3 + 1/3 (d - 2 tf) tw^3 + 2 alpha D^4 - 4 V1 tf^4, V1 = 0.105,
    alpha = -0.042 + 0.2204 tw/tf + 0.1355 r/tf - 0.0865 r tw/tf^2 - 0.0725 (tw/tf)^2,
    D = [(tf + r)^2 + tw (r + tw/4)] / (2 r + tf); sloped flanges add the exact thin-strip
    term 4 bo tf delta^2 / 3 of the tapered outstands (bo the outstand, delta half its thickness
    change).
    Cw = Iy ho^2 / 4 with ho = d - tf (the same Design Guide).

    Args:
        d, bf, tf, tw: depth, flange width, flange and web thickness (mm); arrays broadcast.
        r: root fillet radius (mm), 0 for welded.
        rolled: True for hot-rolled, False for welded / built-up.
        name: designation to carry, or None.
        flange_slope: rise over run of the inner flange face (0 for parallel flanges).
    Returns:
        Section of kind ``"i"`` (0-d arrays for scalar input).
    Raises:
        InputError: a non-positive dimension, ``tw >= bf``, ``2 tf >= d``, fillets that do not fit.

    Example:
        >>> s = i_section(300.0, 300.0, 19.0, 11.0, 27.0)  # EN HEB 300 plates
        >>> round(float(s.A))
        14908
    """
    a = _as_arrays(d=d, bf=bf, tf=tf, tw=tw, r=r, flange_slope=flange_slope)
    d, bf, tf, tw, r, slope = a["d"], a["bf"], a["tf"], a["tw"], a["r"], a["flange_slope"]
    _positive(a, "d", "bf", "tf", "tw")
    _require(r >= 0, "r", r, "a fillet radius cannot be negative", "use 0 for a welded section")
    _require(slope >= 0, "flange_slope", slope, "cannot be negative", "0 for parallel flanges")
    _require(tw < bf, "tw", tw, lambda i: f"web as thick as or thicker than the flange width "
             f"bf = {_at(bf, i):g} mm", "check tw and bf")
    _require(2 * tf < d, "tf", tf, lambda i: f"two flanges fill the depth d = {_at(d, i):g} mm",
             "check tf and d")
    bo = (bf - tw) / 2  # flange outstand from the web face
    t_root = tf + slope * bo / 2
    _require(tf - slope * bo / 2 > 0, "tf", tf, "the sloped flange would end in a point",
             "check tf and flange_slope")
    _require(tw + 2 * r <= bf, "r", r, lambda i: f"root fillets wider than the flange "
             f"bf = {_at(bf, i):g} mm", "check r")
    _require(d - 2 * t_root - 2 * r > 0, "r", r, lambda i: f"root fillets fill the web height "
             f"{_at(d - 2 * t_root, i):g} mm", "check r")

    # Central strip tw x d, four flange outstands (exact by 3-point Gauss: integrands are at
    # most cubic in x), four root fillets.
    A = tw * d
    Ix = tw * d**3 / 12
    Iy = d * tw**3 / 12
    Zx = tw * d**2 / 4
    Zy = d * tw**2 / 4
    xm = (bf + tw) / 4
    for g, w in zip(_GAUSS_X, _GAUSS_W):
        x = xm + g * bo / 2
        wt = 4 * w * bo / 2  # four outstands
        t = tf + slope * (xm - x)
        y_in = d / 2 - t
        A = A + wt * t
        Ix = Ix + wt * (d**3 / 8 - y_in**3) / 3
        Zx = Zx + wt * (d**2 / 4 - y_in**2) / 2
        Iy = Iy + wt * t * x**2
        Zy = Zy + wt * t * x
    af, c, i_f = _spandrel(r)
    y_f = d / 2 - t_root - c
    x_f = tw / 2 + c
    A = A + 4 * af
    Ix = Ix + 4 * (i_f + af * y_f**2)
    Iy = Iy + 4 * (i_f + af * x_f**2)
    Zx = Zx + 4 * af * y_f
    Zy = Zy + 4 * af * x_f

    q, p = tw / tf, r / tf
    alpha = -0.042 + 0.2204 * q + 0.1355 * p - 0.0865 * p * q - 0.0725 * q**2
    D = ((tf + r) ** 2 + tw * (r + tw / 4)) / (2 * r + tf)
    J = 2 / 3 * bf * tf**3 + (d - 2 * tf) * tw**3 / 3 + 2 * alpha * D**4 - 4 * 0.105 * tf**4
    # Sloped flanges: the thin-strip integral of t^3/3 over a linearly tapered outstand exceeds
    # bo tf^3/3 by bo tf delta^2/3 (delta = half the thickness change); four outstands.
    delta = slope * bo / 2
    J = J + 4 * bo * tf * delta**2 / 3
    ho = d - tf
    Cw = Iy * ho**2 / 4

    h_web = d - 2 * (tf + r) if rolled else d - 2 * tf
    notes: tuple[str, ...] = ()
    if np.any(slope > 0):
        notes = (S_SLOPE_NOTE,)
    return Section(
        kind="i", d=d, bf=bf, tf=tf, tw=tw, r=r,
        A=A, Ix=Ix, Iy=Iy, Sx=2 * Ix / d, Sy=2 * Iy / bf, Zx=Zx, Zy=Zy,
        rx=np.sqrt(Ix / A), ry=np.sqrt(Iy / A), J=J, Cw=Cw, ho=ho,
        lam_flange=bf / (2 * tf), lam_web=h_web / tw,
        ct_flange=(bf - tw - 2 * r) / 2 / tf, ct_web=(d - 2 * tf - 2 * r) / tw,
        name=name, rolled=bool(rolled), notes=notes,
    )


def _rounded_rect(B: np.ndarray, H: np.ndarray, R: np.ndarray):
    """A, Ix, Iy, Zx, Zy of a solid B x H rectangle whose four corners are rounded to R."""
    a, c, i_c = _spandrel(R)
    A = B * H - 4 * a
    Ix = B * H**3 / 12 - 4 * (i_c + a * (H / 2 - c) ** 2)
    Iy = H * B**3 / 12 - 4 * (i_c + a * (B / 2 - c) ** 2)
    Zx = B * H**2 / 4 - 4 * a * (H / 2 - c)
    Zy = H * B**2 / 4 - 4 * a * (B / 2 - c)
    return A, Ix, Iy, Zx, Zy


def rect_hollow(d: ArrayLike, b: ArrayLike, t: ArrayLike, r_out: ArrayLike | None = None, *,
                rolled: bool = False, name: str | None = None) -> Section:
    """Rectangular or square hollow section with rounded corners.

    ``r_out`` defaults to 2 t, the outside corner radius the AISC Manual (Part 1, HSS
    dimensions and properties; from memory) uses for its tabulated HSS properties; the
    AISC Shapes Database v15.0 values are reproduced with it (see tests). The inside radius is
    ``r_out - t`` (a sharp inside corner when ``r_out <= t``).
    J follows the thin-walled closed-section (Bredt) formula on the wall mid-line, as AISC does
    for HSS: J = 4 Ap^2 t / p with Ap, p the area enclosed by and the length of the mid-line
    (mid-line corner radius (r_out + r_in)/2). Cw is taken as 0: a closed section resists twist
    by St Venant shear and its warping constant is negligible for column checks (AISC tabulates
    none for HSS).

    Args:
        d: outside depth (strong-axis direction, mm). b: outside width (mm).
        t: wall thickness for properties (mm), the design thickness for AISC ERW HSS.
        r_out: outside corner radius (mm) or None for 2 t.
        rolled: True for hot-finished, False for cold-formed (the default, as ERW HSS).
        name: designation to carry, or None.
    Returns:
        Section of kind ``"rect"``: ``bf = b``, ``tf = tw = t``, ``r = r_out``,
        ``ho = d - t`` (mid-line distance of the width walls).
    Raises:
        InputError: non-positive dimension, ``2 t >= b`` or ``d``, corner radius too large.

    Example:
        >>> s = rect_hollow(203.2, 203.2, 11.811)  # HSS8X8X1/2, tdes 0.465 in
        >>> round(float(s.A) / 645.16, 1)
        13.5
    """
    if r_out is None:
        a = _as_arrays(d=d, b=b, t=t)
        a["r_out"] = 2.0 * a["t"]
    else:
        a = _as_arrays(d=d, b=b, t=t, r_out=r_out)
    d, b, t, ro = a["d"], a["b"], a["t"], a["r_out"]
    _positive(a, "d", "b", "t")
    # the strong axis is the one across the depth: a d smaller than b would swap the axes
    _require(d >= b, "d", d, lambda i: f"d is smaller than b = {_at(b, i):g} mm",
             "d is the larger outside dimension (the strong axis): swap d and b")
    _require(ro >= 0, "r_out", ro, "a corner radius cannot be negative", "use 0 for sharp corners")
    _require(2 * t < b, "t", t, lambda i: f"two walls fill the width b = {_at(b, i):g} mm",
             "check t and b")
    _require(2 * t < d, "t", t, lambda i: f"two walls fill the depth d = {_at(d, i):g} mm",
             "check t and d")
    _require(2 * ro <= np.minimum(b, d), "r_out", ro,
             lambda i: f"corners larger than half the smaller side "
             f"{_at(np.minimum(b, d), i):g} mm", "check r_out")

    ri = np.maximum(ro - t, 0.0)  # geometry: an inside corner cannot be rounder than sharp
    Ao, Ixo, Iyo, Zxo, Zyo = _rounded_rect(b, d, ro)
    Ai, Ixi, Iyi, Zxi, Zyi = _rounded_rect(b - 2 * t, d - 2 * t, ri)
    A, Ix, Iy, Zx, Zy = Ao - Ai, Ixo - Ixi, Iyo - Iyi, Zxo - Zxi, Zyo - Zyi
    rm = (ro + ri) / 2
    Ap = (b - t) * (d - t) - (4 - _PI) * rm**2
    p = 2 * (b - t) + 2 * (d - t) - (8 - 2 * _PI) * rm
    J = 4 * Ap**2 * t / p
    wall_b = (b - 3 * t) / t
    wall_d = (d - 3 * t) / t
    return Section(
        kind="rect", d=d, bf=b, tf=t.copy(), tw=t.copy(), r=ro,
        A=A, Ix=Ix, Iy=Iy, Sx=2 * Ix / d, Sy=2 * Iy / b, Zx=Zx, Zy=Zy,
        rx=np.sqrt(Ix / A), ry=np.sqrt(Iy / A), J=J, Cw=np.zeros_like(A), ho=d - t,
        lam_flange=wall_b, lam_web=wall_d, ct_flange=wall_b.copy(), ct_web=wall_d.copy(),
        name=name, rolled=bool(rolled),
        notes=("hollow section: warping constant Cw taken as 0 (closed section)",),
    )


def round_hollow(D: ArrayLike, t: ArrayLike, *, rolled: bool = False,
                 name: str | None = None) -> Section:
    """Circular hollow section or pipe.

    J = 2 I (exact for a circular tube); Cw = 0 (no warping).

    Args:
        D: outside diameter (mm). t: wall thickness for properties (mm), the design thickness
            for AISC ERW HSS and pipe.
        rolled: True for hot-finished, False for cold-formed (the default).
        name: designation to carry, or None.
    Returns:
        Section of kind ``"round"``: ``d = bf = D``, ``tf = tw = t``, ``r = 0``, ``ho = D - t``.
    Raises:
        InputError: non-positive dimension or ``2 t >= D``.

    Example:
        >>> s = round_hollow(168.275, 6.6294)  # Pipe6STD, tdes 0.261 in
        >>> round(float(s.A) / 645.16, 2)
        5.22
    """
    a = _as_arrays(D=D, t=t)
    D, t = a["D"], a["t"]
    _positive(a, "D", "t")
    _require(2 * t < D, "t", t, lambda i: f"the wall fills the diameter D = {_at(D, i):g} mm",
             "check t and D")
    Di = D - 2 * t
    A = _PI / 4 * (D**2 - Di**2)
    I = _PI / 64 * (D**4 - Di**4)
    Z = (D**3 - Di**3) / 6
    rr = np.sqrt(I / A)
    ratio = D / t
    return Section(
        kind="round", d=D, bf=D.copy(), tf=t, tw=t.copy(), r=np.zeros_like(D),
        A=A, Ix=I, Iy=I.copy(), Sx=2 * I / D, Sy=2 * I / D, Zx=Z, Zy=Z.copy(),
        rx=rr, ry=rr.copy(), J=2 * I, Cw=np.zeros_like(A), ho=D - t,
        lam_flange=ratio, lam_web=ratio.copy(), ct_flange=ratio.copy(), ct_web=ratio.copy(),
        name=name, rolled=bool(rolled),
        notes=("round hollow section: J = 2 I, Cw = 0",),
    )
