"""The column curve of a code: the stress a column reaches against its slenderness."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fieldcol.errors import InputError

from .aisc360 import critical_stress
from .en1993 import ALPHA, reduction_factor


@dataclass(frozen=True)
class ColumnCurve:
    """Points of one column curve, ready to draw.

    Fields:
        x: slenderness: Lc/r (AISC 360-22, elastic) or the non-dimensional lambda-bar (EN).
        stress: the stress reached at each x, MPa: AISC Fcr (E3), EN chi fy (6.3.1.2), elastic
            min(pi^2 E / (Lc/r)^2, Fy).
        x_name, stress_name: the symbols of the axes as the code writes them.
        label: what the curve is, e.g. ``"EN 1993-1-1 curve b"``.
    """

    x: np.ndarray
    stress: np.ndarray
    x_name: str
    stress_name: str
    label: str


def column_curve(code: str, fy: float, E: float, *, curve: str = "b", x_max: float | None = None,
                 points: int = 121) -> ColumnCurve:
    """The column curve of ``code`` for a steel of yield stress ``fy``.

    Args:
        code: ``aisc360-22``, ``en1993-1-1`` or ``elastic``.
        fy: yield stress, MPa. E: modulus, MPa.
        curve: the EN 1993-1-1 Table 6.2 curve letter (``a0``, ``a``, ``b``, ``c``, ``d``);
            not used by the other codes.
        x_max: the largest slenderness (default 200 for Lc/r, 3.0 for lambda-bar).
        points: how many points along the curve.

    Returns:
        A ``ColumnCurve``; x starts at 0 (the squash stress).

    Raises:
        InputError: an unknown code or curve, or a yield stress or modulus that is not > 0.

    Example:
        >>> c = column_curve("en1993-1-1", 355.0, 210000.0, curve="b", x_max=2.0, points=5)
        >>> [round(float(s / 355.0), 4) for s in c.stress]
        [1.0, 0.8842, 0.597, 0.3422, 0.2095]
    """
    for name, v in (("fy", fy), ("E", E)):
        if isinstance(v, bool) or not isinstance(v, (int, float, np.floating)) or not v > 0:
            raise InputError(name, v, "must be a number > 0", "MPa")
    points = max(2, int(points))
    if code == "en1993-1-1":
        if curve not in ALPHA:
            raise InputError("curve", curve, "not a buckling curve of EN 1993-1-1 Table 6.1",
                             ", ".join(ALPHA))
        x = np.linspace(0.0, 3.0 if x_max is None else float(x_max), points)
        return ColumnCurve(x, reduction_factor(x, ALPHA[curve]) * fy, "λ-bar", "χ fy",
                           f"EN 1993-1-1 curve {curve}")
    if code not in ("aisc360-22", "elastic"):
        raise InputError("code", code, "not a code of the check", "aisc360-22, en1993-1-1, elastic")
    x = np.linspace(0.0, 200.0 if x_max is None else float(x_max), points)
    with np.errstate(divide="ignore"):
        Fe = np.where(x > 0, np.pi**2 * E / np.maximum(x, 1e-12) ** 2, np.inf)
    if code == "elastic":
        return ColumnCurve(x, np.minimum(Fe, fy), "Lc/r", "Fcr", "elastic buckling, capped at Fy")
    return ColumnCurve(x, critical_stress(fy, Fe), "Lc/r", "Fcr", "AISC 360-22 E3")
