"""Elastic buckling of a column whose stiffness drops over a band of its height (section loss),
relative to the same column as built: the factor by which the loss lowers Pcr.

Cubic beam elements as in ``_fe``, with the element stiffness multiplied inside the band; the
geometric stiffness is unchanged. Solved in the same dimensionless form (L = 1, EI as built = 1).
"""

from __future__ import annotations

import math
from typing import Sequence

import numpy as np

from fieldcol.errors import InputError

from ._ends import SAME, Brace, End, end
from ._fe import _mechanism_error, _solve, _stable


def _nodes(cuts: list[float], n_el: int) -> np.ndarray:
    parts = []
    for a, b in zip(cuts[:-1], cuts[1:]):
        n = max(4, int(round(n_el * (b - a))))
        parts.append(np.linspace(a, b, n + 1)[:-1])
    return np.concatenate(parts + [np.array([1.0])])


def band_factor(L: float, EI: float, bottom: End | str, top: End | str, braces: Sequence[Brace],
                start: float, stop: float, ratio: float, *, n_el: int = 40,
                field: str = "section.loss") -> float:
    """Pcr of the column with EI x ``ratio`` between ``start`` and ``stop`` over Pcr as built.

    Args:
        L: length (mm); EI: as built (N*mm^2; scales the finite springs); bottom, top: the ends;
        braces: brace points (inf = rigid); start, stop: the band (mm from the bottom);
        ratio: I in the band / I as built (0 < r <= 1); n_el: elements (at least 4 per length
        between cuts).
    Returns:
        the factor (0 < f <= 1): the band lowers the buckling load to f Pcr.
    Raises:
        InputError: a ratio outside (0, 1], a band outside the column, a mechanism.

    Example:
        >>> round(band_factor(4000.0, 1e12, "pinned", "pinned", (), 0.0, 4000.0, 0.5), 4)
        0.5
        >>> band_factor(4000.0, 1e12, "pinned", "pinned", (), 0.0, 150.0, 0.5) > 0.99
        True
    """
    if not (0 < ratio <= 1):
        raise InputError(field, repr(ratio), "the stiffness in the band must be above 0 and at most as built")
    if not 0 <= start < stop <= L:
        raise InputError(field, f"{start:g}..{stop:g} mm", "the band lies outside the column")
    if not (math.isfinite(EI) and EI > 0):
        raise InputError(field, repr(EI), "EI must be positive")
    if ratio == 1:
        return 1.0
    fr = sorted({0.0, 1.0, start / L, stop / L, *(b.at / L for b in braces)})
    cuts = [fr[0]] + [f for a, f in zip(fr[:-1], fr[1:]) if f - a > SAME]
    cuts[-1] = 1.0
    xi = _nodes(cuts, n_el)
    h = np.diff(xi)
    mid = 0.5 * (xi[:-1] + xi[1:])
    f = np.where((mid > start / L) & (mid < stop / L), ratio, 1.0)
    one = np.ones_like(h)
    ke = np.array([[12 * one, 6 * h, -12 * one, 6 * h], [6 * h, 4 * h**2, -6 * h, 2 * h**2],
                   [-12 * one, -6 * h, 12 * one, -6 * h], [6 * h, 2 * h**2, -6 * h, 4 * h**2]]) / h**3
    kg = np.array([[36 * one, 3 * h, -36 * one, 3 * h], [3 * h, 4 * h**2, -3 * h, -h**2],
                   [-36 * one, -3 * h, 36 * one, -3 * h], [3 * h, -h**2, -3 * h, 4 * h**2]]) / (30 * h)
    ne, nd = h.size, 2 * xi.size
    dofs = 2 * np.arange(ne)[:, None] + np.arange(4)[None, :]
    rows = np.broadcast_to(dofs[:, :, None], (ne, 4, 4))
    cols = np.broadcast_to(dofs[:, None, :], (ne, 4, 4))
    Kg = np.zeros((nd, nd))
    np.add.at(Kg, (rows, cols), kg.transpose(2, 0, 1))
    b, t = end(bottom, f"{field}.bottom"), end(top, f"{field}.top")
    S = np.zeros(nd)   # springs: translation k L^3 / EI, rotation r L / EI (inf stays inf)
    S[0], S[1], S[nd - 2], S[nd - 1] = b.translation, b.rotation, t.translation, t.rotation
    for br in braces:
        S[2 * int(np.argmin(np.abs(xi - br.at / L)))] += br.stiffness
    if not _stable(S[None])[0]:
        raise _mechanism_error(S, xi, field)
    scale = np.tile([L**3 / EI, L / EI], nd // 2)
    with np.errstate(invalid="ignore"):
        Sd = np.where(S == 0, 0.0, S * scale)
    free = ~np.isinf(Sd)
    out = []
    for fac in (np.ones(ne), f):
        K = np.zeros((nd, nd))
        np.add.at(K, (rows, cols), (ke * fac).transpose(2, 0, 1))
        K = K + np.diag(np.where(free, Sd, 0.0))
        p, _ = _solve(K[np.ix_(free, free)][None], Kg[np.ix_(free, free)][None])
        out.append(float(np.asarray(p).reshape(-1)[0]))
    return min(1.0, out[1] / out[0])
