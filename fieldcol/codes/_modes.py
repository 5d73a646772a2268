"""Pieces every check shares: elastic critical loads and choosing the governing mode."""

from __future__ import annotations

import math

import numpy as np

from fieldcol.trace import Trace

from ._result import MODES, ModeResult

# Ties go to the first name here: a column that reaches the squash load in every mode is
# reported as governed by yielding, not by a buckling mode that happens to equal it.
_TIE_ORDER = ("yield", "flexural-strong", "flexural-weak", "torsional", "tie-joint")
AXES = {"flexural-strong": "strong", "flexural-weak": "weak", "torsional": "twist"}


def euler_load(E: np.ndarray, I: np.ndarray, Lc: np.ndarray) -> np.ndarray:
    """Euler load pi^2 E I / Lc^2 (N).

    Example:
        >>> round(float(euler_load(200000.0, 1e7, 5000.0)))
        789568
    """
    return np.pi**2 * E * I / Lc**2


def torsional_stress(E: np.ndarray, G: np.ndarray, J: np.ndarray, Cw: np.ndarray,
                     Lcz: np.ndarray, Ix: np.ndarray, Iy: np.ndarray) -> np.ndarray:
    """Elastic torsional buckling stress of a doubly symmetric member (MPa):
    (pi^2 E Cw / Lcz^2 + G J) / (Ix + Iy), i.e. Pcr,T / A with r0^2 = rx^2 + ry^2.

    Example:
        >>> round(float(torsional_stress(200000.0, 77200.0, 1e5, 0.0, 3000.0, 1e7, 1e7)), 1)
        386.0
    """
    return (np.pi**2 * E * Cw / Lcz**2 + G * J) / (Ix + Iy)


def trace_inputs(trace: Trace, sec: dict[str, np.ndarray], v: dict[str, np.ndarray]) -> None:
    """Record the moduli, effective lengths and section properties a check uses.

    Example:
        >>> t = Trace()
        >>> one = np.ones(1)
        >>> trace_inputs(t, {k: one for k in ("Ix", "Iy", "rx", "ry", "J", "Cw")},
        ...              {k: one for k in ("E", "G", "Lc_strong", "Lc_weak", "Lc_twist")})
        >>> [s.symbol for s in t.steps][:3]
        ['E', 'G', 'Lc,strong']
    """
    rows = (("E", "modulus of elasticity", v["E"], "MPa", "material"),
            ("G", "shear modulus", v["G"], "MPa", "material"),
            ("Lc,strong", "effective length, strong axis", v["Lc_strong"], "mm", "effective length"),
            ("Lc,weak", "effective length, weak axis", v["Lc_weak"], "mm", "effective length"),
            ("Lc,twist", "effective length for twist", v["Lc_twist"], "mm", "effective length"),
            ("Ix", "second moment of area, strong axis", sec["Ix"], "mm^4", "section"),
            ("Iy", "second moment of area, weak axis", sec["Iy"], "mm^4", "section"),
            ("rx", "radius of gyration, strong axis", sec["rx"], "mm", "section"),
            ("ry", "radius of gyration, weak axis", sec["ry"], "mm", "section"),
            ("J", "torsion constant", sec["J"], "mm^4", "section"),
            ("Cw", "warping constant", sec["Cw"], "mm^6", "section"))
    for symbol, what, value, unit, source in rows:
        trace.add(symbol, what, "", value, unit, source)


def choose(modes: dict[str, ModeResult], trace: Trace, clause: str,
           exclude: tuple[str, ...] = ()) -> tuple[np.ndarray, np.ndarray]:
    """Lowest nominal strength over the modes and the name of the mode giving it.

    Args:
        modes: every mode's result (keys from ``MODES``).
        trace: the steps are added here.
        clause: the clause that says "the least of the modes".
        exclude: modes reported but not applicable (torsion of closed sections); they are
            marked so (``applies`` False) for whoever shows the modes.
    Returns:
        (nominal N, governing mode names); NaN nominal and ``""`` where any mode is NaN.

    Example:
        >>> m = {k: ModeResult(k, None, None, None, np.array(1.0), np.array(v))
        ...      for k, v in zip(MODES, (3.0, 2.0, 5.0, 2.0))}
        >>> n, g = choose(m, Trace(), "")
        >>> float(n), str(g)
        (2.0, 'yield')
    """
    for n in exclude:
        if n in modes:
            modes[n].applies = False
    names = [n for n in _TIE_ORDER if n in modes and n not in exclude]
    pns = [modes[n].Pn for n in names]
    vals = ([float(p[0]) for p in pns]
            if all(type(p) is np.ndarray and p.shape == (1,) and p.dtype == np.float64
                   for p in pns) else [])
    i = min(range(len(vals)), key=vals.__getitem__) if vals else 0
    if vals and not any(math.isnan(x) for x in vals) and vals[i] != 0.0:
        # one column (a batch of one) with no NaN and no zero (whose sign numpy's min would
        # pick): the same least value and first mode giving it, without stacking arrays
        nominal = np.array([vals[i]])
        governing = np.array([names[i]], dtype=np.asarray(names).dtype)
    else:
        stack = np.stack([np.asarray(p, dtype=float) for p in pns])
        nominal = stack.min(axis=0)
        idx = np.argmin(np.where(np.isnan(stack), np.inf, stack), axis=0)
        governing = np.asarray(names)[idx]
        governing = np.where(np.isnan(nominal), "", governing)
    trace.add("Pn", "nominal strength: least of the modes", "min(" + ", ".join(names) + ")",
              nominal, "N", clause)
    trace.add("mode", "governing mode", "argmin", governing, "", clause)
    return nominal, governing


__all__ = ["AXES", "MODES", "choose", "euler_load", "torsional_stress", "trace_inputs"]
