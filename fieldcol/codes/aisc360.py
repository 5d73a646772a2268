"""AISC 360-22 Chapter E: compression strength of doubly symmetric members (I, rectangular and round HSS)."""

from __future__ import annotations

from typing import Any

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._section import Section
from fieldcol.trace import Trace

from ._aisc_local import B4, effective_area, elements, round_effective_area
from ._inputs import prepare, reshaped
from ._modes import choose, torsional_stress, trace_inputs
from ._result import CodeResult, ModeResult, Warning

CODE = "aisc360-22"
BASES = {"lrfd": 0.90, "asd": 1.67}
E3 = "AISC 360-22 E3"
E4 = "AISC 360-22 E4"


def critical_stress(Fy: Any, Fe: Any) -> np.ndarray:
    """E3 critical stress: 0.658^(Fy/Fe) Fy when Fy/Fe <= 2.25, else 0.877 Fe (MPa, or any one unit).

    Args:
        Fy: yield stress. Fe: elastic buckling stress (same unit).
    Returns:
        Fcr in that unit.

    Example:
        >>> round(float(critical_stress(36.0, np.pi**2 * 29000 / 25**2)), 2)   # ksi
        34.83
    """
    Fy, Fe = np.asarray(Fy, dtype=float), np.asarray(Fe, dtype=float)
    ratio = Fy / Fe
    return np.where(ratio <= 2.25, 0.658**ratio * Fy, 0.877 * Fe)


def check_aisc360(section: Section, Fy: Any, E: Any, G: Any, Lc_strong: Any, Lc_weak: Any,
                  Lc_twist: Any, *, basis: str = "lrfd") -> CodeResult:
    """Available axial strength of a batch of columns per AISC 360-22 E3, E4 and E7.

    Args:
        section: cross-section(s) (I, rectangular or round HSS), mm.
        Fy: specified minimum yield stress (MPa). E, G: moduli (MPa).
        Lc_strong, Lc_weak, Lc_twist: effective lengths (mm).
        basis: ``"lrfd"`` (phi_c = 0.90) or ``"asd"`` (Omega_c = 1.67).
    Returns:
        a ``CodeResult``: nominal = min Pn over the modes, design = phi Pn or Pn / Omega.
    Raises:
        InputError: bad values or an unknown basis, naming the field.

    Example:
        >>> from fieldcol.sections._section import Section
        >>> s = Section("round", *[np.array(x) for x in (100., 100., 5., 5., 0., 1492., 1.7e6, 1.7e6,
        ...     3.4e4, 3.4e4, 4.6e4, 4.6e4, 33.8, 33.8, 3.4e6, 0., 95., 20., 20., 20., 20.)])
        >>> r = check_aisc360(s, 250, 200000, 77200, 4000, 4000, 4000)
        >>> str(r.governing), round(float(r.design))
        ('flexural-strong', 159781)
    """
    if not isinstance(basis, str) or basis not in BASES:
        raise InputError("basis", basis, "unknown design basis", "lrfd or asd")
    sec, v, shape = prepare(section, Fy=Fy, E=E, G=G, Lc_strong=Lc_strong, Lc_weak=Lc_weak,
                            Lc_twist=Lc_twist)
    Fy, E, G = v["Fy"], v["E"], v["G"]
    A = sec["A"]
    kind = section.kind
    t = Trace()
    t.add("Ag", "gross area", "", A, "mm^2", "section")
    t.add("Fy", "specified minimum yield stress", "", Fy, "MPa", "material")
    trace_inputs(t, sec, v)
    warnings: list[Warning] = []

    # Local buckling: classify the plates once (Table B4.1a), reduce per mode with its Fcr (E7).
    if kind == "round":
        Dt = sec["lam_flange"]
        Ae_round, outside = round_effective_area(A, Dt, Fy, E, t)
        slender_any = np.asarray(Dt > 0.11 * E / Fy)
        if outside.any():
            warnings.append(Warning("outside-scope",
                                    "D/t is at or above 0.45 E/Fy: AISC 360-22 E7.2 does not cover this "
                                    "round HSS; no strength is given", outside))
        elems = []
    else:
        elems = elements(kind, sec, Fy, E, t)
        slender_any = np.zeros(A.shape, dtype=bool)
        for e in elems:
            cls = np.asarray(e.lam > e.lam_r)
            t.add(f"slender,{e.name}", f"{e.name} slender for compression", "lam > lr", cls, "", B4)
            slender_any = slender_any | cls
    slender_some = bool(slender_any.any())  # asked once: each mode's strength reads it
    if slender_some:
        warnings.append(Warning("slender-element",
                                "slender element(s) for axial compression: effective area per "
                                "AISC 360-22 E7", slender_any))

    def strength(Fcr: np.ndarray, tag: str) -> np.ndarray:
        if kind == "round":
            Ae = Ae_round
        elif slender_some:
            Ae = effective_area(elems, A, Fy, Fcr, t, tag)
        else:
            Ae = A
        clause = "AISC 360-22 E7 (E7-1)" if slender_some else f"{E3} (E3-1)"
        return t.add(f"Pn,{tag}", f"nominal strength, {tag}", "Fcr Ae" if slender_some else "Fcr Ag",
                     Fcr * Ae, "N", clause)

    modes: dict[str, ModeResult] = {}
    over200 = np.zeros(A.shape, dtype=bool)
    for mode, axis, r, Lc in (("flexural-strong", "strong", sec["rx"], v["Lc_strong"]),
                              ("flexural-weak", "weak", sec["ry"], v["Lc_weak"])):
        slender = t.add(f"Lc/r,{axis}", f"slenderness, {axis} axis", f"Lc,{axis} / r", Lc / r, "", E3)
        over200 |= np.asarray(slender > 200)
        Fe = t.add(f"Fe,{axis}", f"elastic buckling stress, {axis} axis", "pi^2 E / (Lc/r)^2",
                   np.pi**2 * E / slender**2, "MPa", f"{E3} (E3-4)")
        Fcr = t.add(f"Fcr,{axis}", f"critical stress, {axis} axis",
                    "Fy/Fe <= 2.25: 0.658^(Fy/Fe) Fy; else 0.877 Fe", critical_stress(Fy, Fe), "MPa",
                    f"{E3} (E3-2), (E3-3)")
        modes[mode] = ModeResult(mode, Lc, slender, Fe * A, Fcr, strength(Fcr, axis))

    Lz = v["Lc_twist"]
    if kind != "i":
        t.add("note", "closed section: torsional buckling is reported but not applied "
              "(E4 user note: it does not govern closed HSS)", "", "", "", E4)
    Fe = t.add("Fe,T", "elastic torsional buckling stress (doubly symmetric)",
               "(pi^2 E Cw / Lcz^2 + G J) / (Ix + Iy)",
               torsional_stress(E, G, sec["J"], sec["Cw"], Lz, sec["Ix"], sec["Iy"]), "MPa",
               f"{E4} (E4-2)")
    FcrT = t.add("Fcr,T", "critical stress, torsion", "E3 equations with Fe,T", critical_stress(Fy, Fe),
                 "MPa", f"{E4}; {E3} (E3-2), (E3-3)")
    modes["torsional"] = ModeResult("torsional", Lz, np.pi * np.sqrt(E / Fe), Fe * A, FcrT,
                                    strength(FcrT, "torsion"))
    modes["yield"] = ModeResult("yield", None, None, None, np.array(Fy), strength(Fy, "yield"))

    closed = () if kind == "i" else ("torsional",)
    nominal, governing = choose(modes, t, "AISC 360-22 E1", exclude=closed)
    if basis == "lrfd":
        design = t.add("phiPn", "design strength (LRFD)", "phi_c Pn, phi_c = 0.90", 0.90 * nominal, "N",
                       "AISC 360-22 E1")
    else:
        design = t.add("Pn/Omega", "allowable strength (ASD)", "Pn / Omega_c, Omega_c = 1.67",
                       nominal / 1.67, "N", "AISC 360-22 E1")
    if over200.any():
        warnings.append(Warning("slenderness-over-200",
                                "Lc/r exceeds 200 (AISC 360-22 E2 user note: preferably not)", over200))
    result = CodeResult(CODE, basis, np.asarray(nominal), np.asarray(design),
                        np.asarray(governing), modes, t, warnings)
    return reshaped(result, shape)
