"""What a column brace must provide, and what a cable or a chain of parts does provide."""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

from fieldcol.errors import InputError

_PHI = 0.75    # AISC 360-22 Appendix 6 resistance factor for brace stiffness (LRFD)
_OMEGA = 2.00  # AISC 360-22 Appendix 6 safety factor for brace stiffness (ASD)


def _arr(x: ArrayLike, field: str, *, positive: bool, what: str) -> np.ndarray:
    try:
        a = np.asarray(x, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, x, "not a number", what) from None
    bad = np.isnan(a) | ((a <= 0) if positive else (a < 0)) | np.isinf(a)
    if bad.any():
        i = tuple(int(j) for j in np.argwhere(bad)[0])
        raise InputError(field + (str(list(i)) if i else ""), float(a[i]),
                         "must be finite and > 0" if positive else "must be finite and >= 0", what)
    return a


def _out(a: np.ndarray):
    return a[()] if a.ndim == 0 else a


def brace_requirement(Pr: ArrayLike, Lbr: ArrayLike, basis: str = "lrfd", kind: str = "point",
                      field: str = "brace") -> tuple[np.ndarray, np.ndarray]:
    """Strength and stiffness a column brace needs (AISC 360-22 Appendix 6.2).

    Point brace: Pbr = 0.01 Pr, beta_br = (1/phi)(8 Pr / Lbr) (LRFD, phi = 0.75) or
    Omega (8 Pr / Lbr) (ASD, Omega = 2.00). Panel brace: Vbr = 0.005 Pr, beta_br with 2 Pr / Lbr.

    Args:
        Pr: required axial strength of the column, N (LRFD or ASD load combinations).
        Lbr: unbraced length next to the brace, mm.
        basis: ``"lrfd"`` or ``"asd"``.
        kind: ``"point"`` (nodal) or ``"panel"`` (relative) bracing.
        field: the field named in errors.

    Returns:
        (Pbr in N, beta_br in N/mm), broadcast over the inputs.

    Example:
        >>> [round(float(v), 3) for v in brace_requirement(1.0e6, 3000.0)]
        [10000.0, 3555.556]
    """
    if type(Pr) is float and type(Lbr) is float and 0.0 <= Pr < math.inf and \
            0.0 < Lbr < math.inf and basis in ("lrfd", "asd") and kind in ("point", "panel"):
        # one brace of one column (every check asks this per brace): the same products in
        # float64 as below, without making arrays of single numbers
        force, coeff = (0.01, 8.0) if kind == "point" else (0.005, 2.0)
        factor = 1.0 / _PHI if basis == "lrfd" else _OMEGA
        return np.float64(force * Pr), np.float64(factor * coeff * Pr / Lbr)
    Pr = _arr(Pr, f"{field}.Pr", positive=False, what="the column's required axial strength, N")
    Lbr = _arr(Lbr, f"{field}.Lbr", positive=True, what="the unbraced length, mm")
    if basis not in ("lrfd", "asd"):
        raise InputError(f"{field}.basis", basis, "unknown basis", "lrfd or asd")
    if kind not in ("point", "panel"):
        raise InputError(f"{field}.kind", kind, "unknown kind of bracing", "point or panel")
    force, coeff = (0.01, 8.0) if kind == "point" else (0.005, 2.0)
    factor = 1.0 / _PHI if basis == "lrfd" else _OMEGA
    Pr, Lbr = np.broadcast_arrays(Pr, Lbr)
    return _out(force * Pr), _out(factor * coeff * Pr / Lbr)


def cable_stiffness(A: ArrayLike, E: ArrayLike, L: ArrayLike, angle_deg: ArrayLike,
                    field: str = "cable") -> np.ndarray:
    """Lateral stiffness a cable or rod gives the braced point: k = (A E / L) cos^2(theta).

    theta is the angle between the cable and the direction the braced point moves (common
    practice; a tension-only member counts on one side only).

    Args:
        A: area, mm^2. E: modulus, MPa. L: cable length, mm.
        angle_deg: theta in degrees, 0 <= theta < 90.
        field: the field named in errors.

    Returns:
        k in N/mm.

    Example:
        >>> round(float(cable_stiffness(100.0, 200000.0, 5000.0, 60.0)), 6)
        1000.0
    """
    A = _arr(A, f"{field}.A", positive=True, what="area in mm^2")
    E = _arr(E, f"{field}.E", positive=True, what="modulus in MPa")
    L = _arr(L, f"{field}.L", positive=True, what="length in mm")
    th = _arr(angle_deg, f"{field}.angle_deg", positive=False, what="degrees, 0 to < 90")
    if np.any(th >= 90.0):
        i = tuple(int(j) for j in np.argwhere(th >= 90.0)[0])
        raise InputError(f"{field}.angle_deg" + (str(list(i)) if i else ""), float(th[i]),
                         "a cable square to the movement gives no stiffness",
                         "the angle between the cable and the movement, 0 to < 90 degrees")
    return _out(np.asarray(A * E / L * np.cos(np.radians(th)) ** 2))


def series(*k: ArrayLike, field: str = "springs") -> np.ndarray:
    """Stiffness of springs in series (brace, connections, support): 1 / sum(1 / k_i).

    A rigid part (``inf``) adds no flexibility; a part with zero stiffness makes the chain zero.

    Args:
        *k: stiffnesses (N/mm or N*mm/rad, all alike), each broadcast against the others.
        field: the field named in errors (``field[i]`` for the i-th part).

    Returns:
        The combined stiffness.

    Example:
        >>> float(series(1000.0, 1000.0))
        500.0
    """
    if not k:
        raise InputError(field, "()", "no springs given", "give at least one stiffness")
    parts = []
    for i, x in enumerate(k):
        try:
            a = np.asarray(x, dtype=float)
        except (TypeError, ValueError):
            raise InputError(f"{field}[{i}]", x, "not a number", "a stiffness") from None
        if np.any(np.isnan(a) | (a < 0)):
            raise InputError(f"{field}[{i}]", x, "a stiffness must be >= 0", "inf for rigid")
        parts.append(a)
    parts = np.broadcast_arrays(*parts)
    with np.errstate(divide="ignore"):
        flex = sum(1.0 / a for a in parts)
        out = np.where(flex == 0, np.inf, 1.0 / flex)
    return _out(np.asarray(out, dtype=float))
