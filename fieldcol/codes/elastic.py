"""Classical elastic buckling: Euler loads about both axes, torsional buckling, and the squash load.

No resistance factor and no allowance for imperfections or residual stresses: the result is an
upper bound that is meaningful only where the critical stress stays below yield.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from fieldcol.sections._section import Section
from fieldcol.trace import Trace

from ._inputs import prepare, reshaped
from ._modes import choose, euler_load, torsional_stress, trace_inputs
from ._result import CodeResult, ModeResult, Warning

_CLAUSE = "classical elastic stability (Euler; Timoshenko & Gere)"
NOTE = ("classical elastic buckling: no resistance factor, no imperfection allowance; "
        "valid only where Pcr/A < Fy")


def check_elastic(section: Section, Fy: Any, E: Any, G: Any,
                  Lc_strong: Any, Lc_weak: Any, Lc_twist: Any) -> CodeResult:
    """Elastic critical loads of a batch of doubly symmetric columns, capped by the squash load.

    Args:
        section: cross-section(s); arrays in mm.
        Fy: yield stress (MPa). E, G: elastic and shear moduli (MPa).
        Lc_strong, Lc_weak, Lc_twist: effective lengths (mm) for flexure about each axis and twist.
    Returns:
        a ``CodeResult`` with code ``"elastic"``, basis ``"none"``, design == nominal.
    Raises:
        InputError: a non-positive, NaN or mismatched input, naming its field.

    Example:
        >>> from fieldcol.sections._section import Section
        >>> s = Section("round", *[np.array(x) for x in (100., 100., 5., 5., 0., 1492., 1.7e6, 1.7e6,
        ...     3.4e4, 3.4e4, 4.6e4, 4.6e4, 33.8, 33.8, 3.4e6, 0., 95., 20., 20., 20., 20.)])
        >>> r = check_elastic(s, 250, 200000, 77200, 4000, 4000, 4000)
        >>> str(r.governing), round(float(r.nominal))
        ('flexural-strong', 209729)
    """
    sec, v, shape = prepare(section, Fy=Fy, E=E, G=G, Lc_strong=Lc_strong, Lc_weak=Lc_weak,
                            Lc_twist=Lc_twist)
    Fy, E, G = v["Fy"], v["E"], v["G"]
    A = sec["A"]
    t = Trace()
    t.add("note", NOTE, "", "", "", _CLAUSE)
    t.add("A", "gross area", "", A, "mm^2", "section")
    t.add("Fy", "yield stress", "", Fy, "MPa", "material")
    trace_inputs(t, sec, v)
    modes: dict[str, ModeResult] = {}
    for mode, axis, I, r, Lc in (("flexural-strong", "strong", sec["Ix"], sec["rx"], v["Lc_strong"]),
                                 ("flexural-weak", "weak", sec["Iy"], sec["ry"], v["Lc_weak"])):
        slender = t.add(f"Lc/r,{axis}", f"slenderness, {axis} axis", f"Lc,{axis} / r", Lc / r, "", _CLAUSE)
        Pe = t.add(f"Pcr,{axis}", f"Euler load, {axis} axis", "pi^2 E I / Lc^2",
                   euler_load(E, I, Lc), "N", _CLAUSE)
        Fcr = t.add(f"Fcr,{axis}", f"critical stress, {axis} axis", "min(Pcr/A, Fy)",
                    np.minimum(Pe / A, Fy), "MPa", _CLAUSE)
        Pn = t.add(f"Pn,{axis}", f"strength, {axis} axis", "Fcr A", Fcr * A, "N", _CLAUSE)
        modes[mode] = ModeResult(mode, Lc, slender, Pe, Fcr, Pn)
    Lz = v["Lc_twist"]
    Fe = t.add("Fe,T", "elastic torsional buckling stress",
               "(pi^2 E Cw / Lcz^2 + G J) / (Ix + Iy)",
               torsional_stress(E, G, sec["J"], sec["Cw"], Lz, sec["Ix"], sec["Iy"]), "MPa", _CLAUSE)
    PeT = t.add("Pcr,T", "torsional buckling load", "Fe,T A", Fe * A, "N", _CLAUSE)
    slT = t.add("Lc/r,T", "equivalent slenderness in torsion", "pi sqrt(E / Fe,T)",
                np.pi * np.sqrt(E / Fe), "", _CLAUSE)
    FcrT = t.add("Fcr,T", "critical stress, torsion", "min(Fe,T, Fy)", np.minimum(Fe, Fy), "MPa", _CLAUSE)
    PnT = t.add("Pn,T", "strength, torsion", "Fcr,T A", FcrT * A, "N", _CLAUSE)
    modes["torsional"] = ModeResult("torsional", Lz, slT, PeT, FcrT, PnT)
    Py = t.add("Py", "squash load", "A Fy", A * Fy, "N", _CLAUSE)
    modes["yield"] = ModeResult("yield", None, None, None, np.array(Fy), Py)
    nominal, governing = choose(modes, t, _CLAUSE)
    design = t.add("P", "capacity (no resistance factor applied)", "= Pn", nominal, "N", _CLAUSE)
    warnings = []
    lowest = np.minimum(np.minimum(modes["flexural-strong"].Pe, modes["flexural-weak"].Pe), PeT) / A
    beyond = np.asarray(lowest >= Fy)
    if beyond.any():
        warnings.append(Warning("beyond-elastic",
                                "the lowest elastic critical stress reaches yield: the squash load governs "
                                "and the elastic buckling result alone is not a reliable strength", beyond))
    result = CodeResult("elastic", "none", np.asarray(nominal), np.asarray(design),
                        np.asarray(governing), modes, t, warnings)
    return reshaped(result, shape)
