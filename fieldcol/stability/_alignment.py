"""Effective length factor from the alignment-chart equations (AISC 360-22 Commentary App. 7)."""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from fieldcol.errors import InputError

_ITER = 80  # bisection halvings: the bracket shrinks below 1e-20 of pi, beyond float64 precision


def _split(G: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(g, h) = (G/(1+G), 1/(1+G)): both finite for G = 0 .. inf, so pinned ends need no cap."""
    inf = np.isinf(G)
    h = np.where(inf, 0.0, 1.0 / (1.0 + np.where(inf, 0.0, G)))
    g = np.where(inf, 1.0, np.where(inf, 0.0, G) * h)
    return g, h


def _braced(x, ga, ha, gb, hb):
    # The braced equation times ha*hb*sin(x): smooth on [pi, 2 pi], >= 0 at pi, <= 0 at 2 pi.
    s, c = np.sin(x), np.cos(x)
    return (ga * gb / 4.0 * x * x * s
            + (ga * hb + gb * ha) / 2.0 * (s - x * c)
            + ha * hb * (2.0 * (1.0 - c) / x - s))


def _sway(x, ga, ha, gb, hb):
    # The sway equation times 6*ha*hb*(Ga+Gb)*sin(x): <= 0 as x -> 0, >= 0 at pi.
    s, c = np.sin(x), np.cos(x)
    return (ga * gb * x * x - 36.0 * ha * hb) * s - 6.0 * (ga * hb + gb * ha) * x * c


def k_alignment(Ga: ArrayLike, Gb: ArrayLike, sway: bool, field: str = "G") -> np.ndarray:
    """K from the alignment-chart equations, solved exactly (no chart reading).

    Braced frame: (GaGb/4)(pi/K)^2 + ((Ga+Gb)/2)(1 - (pi/K)/tan(pi/K)) + 2 tan(pi/2K)/(pi/K) = 1.
    Sway frame:   [GaGb (pi/K)^2 - 36] / [6 (Ga+Gb)] = (pi/K)/tan(pi/K).
    (AISC 360-22 Commentary Appendix 7.) G = 0 is a fixed end, G = inf a pinned one; common
    practice takes G = 10 for a pinned base and G = 1 for a fixed base.

    Args:
        Ga, Gb: stiffness ratios at the two ends (broadcast against each other; 0 .. inf).
        sway: True for a sway (unbraced) frame, False for a braced frame.
        field: the field named in errors.

    Returns:
        K, float64 array of the broadcast shape (a numpy scalar for scalar input).

    Raises:
        InputError: a G that is negative or not a number, or a sway column pinned at both ends
        (Ga = Gb = inf), which is a mechanism.

    Example:
        >>> round(float(k_alignment(0.0, np.inf, sway=True)), 6)
        2.0
    """
    try:
        Ga = np.asarray(Ga, dtype=float)
        Gb = np.asarray(Gb, dtype=float)
        Ga, Gb = np.broadcast_arrays(Ga, Gb)
    except (TypeError, ValueError) as e:
        raise InputError(field, f"{Ga!r}, {Gb!r}", "not numbers of matching shape", str(e)) from None
    for name, G in (("Ga", Ga), ("Gb", Gb)):
        bad = np.isnan(G) | (G < 0)
        if bad.any():
            i = tuple(int(j) for j in np.argwhere(bad)[0])
            raise InputError(f"{field}.{name}{list(i) if i else ''}", float(G[i]),
                             "G must be >= 0 (0 fixed, inf pinned)",
                             "G = sum(EI/L columns) / sum(EI/L beams)")
    if sway and bool(np.any(np.isinf(Ga) & np.isinf(Gb))):
        i = tuple(int(j) for j in np.argwhere(np.isinf(Ga) & np.isinf(Gb))[0])
        raise InputError(f"{field}{list(i) if i else ''}", "Ga = Gb = inf",
                         "mechanism: a sway column pinned at both ends",
                         "restrain one end against rotation (a finite G)")
    ga, ha = _split(Ga)
    gb, hb = _split(Gb)
    if sway:
        lo, hi, f = np.zeros(Ga.shape), np.full(Ga.shape, np.pi), _sway
        neg_below = True  # f < 0 below the root
    else:
        lo, hi, f = np.full(Ga.shape, np.pi), np.full(Ga.shape, 2 * np.pi), _braced
        neg_below = False  # f > 0 below the root
    for _ in range(_ITER):
        mid = 0.5 * (lo + hi)
        v = f(mid, ga, ha, gb, hb)
        below = (v < 0) if neg_below else (v > 0)
        lo = np.where(below, mid, lo)
        hi = np.where(below, hi, mid)
    K = np.pi / (0.5 * (lo + hi))
    return K[()] if K.ndim == 0 else K
