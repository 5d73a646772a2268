"""The first buckled shape of one column axis, for a side-view sketch."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Sequence

import numpy as np

from ._ends import Brace, End
from ._fe import buckling_analysis


@dataclass(frozen=True)
class ModeShape:
    """The lowest buckling mode of one axis.

    Fields:
        z: heights from the bottom, mm (ascending, bottom end to top end).
        w: lateral deflection at each height, scaled so that max |w| = 1 and the largest
            deflection is +1.
        Pcr: the elastic buckling load of this mode, N.
        K: effective length factor relative to the whole length.
    """

    z: np.ndarray
    w: np.ndarray
    Pcr: float
    K: float

    def at(self, height: float) -> float:
        """The deflection at ``height`` (mm), by linear interpolation between nodes.

        Example:
            >>> round(mode_shape(4000.0, 1.0e12, "pinned", "pinned").at(2000.0), 4)
            1.0
        """
        return float(np.interp(height, self.z, self.w))


def mode_shape(L: float, EI: float, bottom: End | str, top: End | str,
               braces: Sequence[Brace] = (), points: int = 41,
               field: str = "column") -> ModeShape:
    """The first buckled shape of one column axis from the elastic buckling analysis.

    Cubic beam elements with nodes at every brace (``buckling_analysis``); the shape is
    resampled at ``points`` evenly spaced heights plus every brace point, using the element
    shape functions (the cubic Hermite interpolation of deflection and slope), so it is smooth
    enough to draw at any size.

    Args:
        L: length, mm. EI: flexural rigidity about the axis, N*mm^2.
        bottom, top: the ends (``End`` or a name: fixed, pinned, free, guided).
        braces: the brace points that hold the column (``stiffness`` inf = rigid).
        points: evenly spaced heights to return (at least 3).
        field: the restraints field named in errors.

    Returns:
        ``ModeShape(z, w, Pcr, K)``.

    Raises:
        InputError: bad input, or supports that leave the column a mechanism.

    Example:
        >>> s = mode_shape(3000.0, 1.0e12, "fixed", "free")
        >>> round(float(s.w[-1]), 6), round(s.K, 3)
        (1.0, 2.0)
    """
    points = max(3, int(points))
    res = buckling_analysis(L, EI, bottom, top, braces, n_el=40, field=field)
    zn = np.asarray(res.z, dtype=float)
    wn = np.asarray(res.shape, dtype=float)
    theta = _slopes(zn, wn)
    z = np.union1d(np.linspace(0.0, L, points), [b.at for b in braces if 0 <= b.at <= L])
    w = _hermite(zn, wn, theta, z)
    big = w[np.argmax(np.abs(w))]
    w = w / big if big != 0 else w
    return ModeShape(z, w, float(res.Pcr), float(res.K))


def _slopes(z: np.ndarray, w: np.ndarray) -> np.ndarray:
    """Slopes at the nodes from a cubic through neighbouring nodes (the FE keeps only w here)."""
    return np.gradient(w, z, edge_order=2)


def _hermite(zn: np.ndarray, wn: np.ndarray, tn: np.ndarray, z: np.ndarray) -> np.ndarray:
    i = np.clip(np.searchsorted(zn, z, side="right") - 1, 0, zn.size - 2)
    h = zn[i + 1] - zn[i]
    s = (z - zn[i]) / h
    h00, h10 = 2 * s**3 - 3 * s**2 + 1, s**3 - 2 * s**2 + s
    h01, h11 = -2 * s**3 + 3 * s**2, s**3 - s**2
    return h00 * wn[i] + h10 * h * tn[i] + h01 * wn[i + 1] + h11 * h * tn[i + 1]
