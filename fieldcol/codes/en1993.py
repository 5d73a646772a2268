"""EN 1993-1-1:2005 6.3.1: buckling resistance of uniform members in compression."""

from __future__ import annotations

from typing import Any

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._section import Section
from fieldcol.trace import Trace

from ._en_class import classify
from ._inputs import flag, positive, prepare, reshaped
from ._modes import choose, euler_load, torsional_stress, trace_inputs
from ._result import CodeResult, ModeResult, Warning

CODE = "en1993-1-1"
ALPHA = {"a0": 0.13, "a": 0.21, "b": 0.34, "c": 0.49, "d": 0.76}
T62 = "EN 1993-1-1 Table 6.2"
C6312 = "EN 1993-1-1 6.3.1.2"


def reduction_factor(lam_bar: Any, alpha: Any) -> np.ndarray:
    """chi = 1 / (Phi + sqrt(Phi^2 - lb^2)) <= 1, Phi = 0.5 (1 + alpha (lb - 0.2) + lb^2)  (6.49).

    Args:
        lam_bar: non-dimensional slenderness. alpha: imperfection factor (Table 6.1).
    Returns:
        chi.

    Example:
        >>> round(float(reduction_factor(1.0, 0.34)), 4)
        0.597
    """
    lb = np.asarray(lam_bar, dtype=float)
    phi = 0.5 * (1 + alpha * (lb - 0.2) + lb**2)
    return np.minimum(1.0, 1.0 / (phi + np.sqrt(phi**2 - lb**2)))


def buckling_curves(kind: str, rolled: Any, h_over_b: Any, tf: Any, high_strength: Any
                    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Table 6.2 buckling curve letters about the strong (y-y) and weak (z-z) axes.

    Args:
        kind: ``"i"``, ``"rect"`` or ``"round"``. rolled: rolled I / hot-finished hollow (True)
            or welded I / cold-formed hollow (False). h_over_b: d/bf. tf: flange thickness (mm).
        high_strength: True for the S460 column of the table.
    Returns:
        (strong curves, weak curves, mask where the table has no row and curve d was assumed).

    Example:
        >>> y, z, _ = buckling_curves("i", True, 2.0, 10.7, False)
        >>> str(y), str(z)
        ('a', 'b')
    """
    rolled, hb, tf, hs = np.broadcast_arrays(np.asarray(rolled, dtype=bool), np.asarray(h_over_b, float),
                                             np.asarray(tf, float), np.asarray(high_strength, dtype=bool))
    none = np.zeros(hb.shape, dtype=bool)
    if kind != "i":
        y = np.where(rolled, np.where(hs, "a0", "a"), "c")
        return y, y.copy(), none
    deep = hb > 1.2
    rolled_y = np.select([deep & (tf <= 40), tf <= 100], [np.where(hs, "a0", "a"), np.where(hs, "a", "b")],
                         np.where(hs, "c", "d"))
    rolled_z = np.select([deep & (tf <= 40), tf <= 100], [np.where(hs, "a0", "b"), np.where(hs, "a", "c")],
                         np.where(hs, "c", "d"))
    welded_y = np.where(tf <= 40, "b", "c")
    welded_z = np.where(tf <= 40, "c", "d")
    y = np.where(rolled, rolled_y, welded_y)
    z = np.where(rolled, rolled_z, welded_z)
    # Table 6.2 lists tf > 100 mm only for h/b <= 1.2; deeper shapes that thick get the same row
    return y, z, rolled & deep & (tf > 100)


def check_en1993(section: Section, fy: Any, E: Any, G: Any, Lc_strong: Any, Lc_weak: Any,
                 Lc_twist: Any, *, gamma_M1: float = 1.0, high_strength: Any = False) -> CodeResult:
    """Buckling resistance Nb,Rd of a batch of columns per EN 1993-1-1 6.3.1 (Class 4 via EN 1993-1-5).

    Args:
        section: cross-section(s), mm. fy: yield strength for the section's thickness (MPa).
        E, G: moduli (MPa; EN uses 210000 / 81000). Lc_strong, Lc_weak, Lc_twist: buckling lengths (mm).
        gamma_M1: partial factor (1.0 recommended; National Annexes may differ); must be >= 1.
        high_strength: True (or a bool array) for S460 in Table 6.2.
    Returns:
        a ``CodeResult``: nominal = chi_min A fy (Aeff for Class 4), design = nominal / gamma_M1.
    Raises:
        InputError: bad values, naming the field.

    Example:
        >>> from fieldcol.sections._section import Section
        >>> s = Section("round", *[np.array(x) for x in (100., 100., 5., 5., 0., 1492., 1.7e6, 1.7e6,
        ...     3.4e4, 3.4e4, 4.6e4, 4.6e4, 33.8, 33.8, 3.4e6, 0., 95., 20., 20., 20., 20.)])
        >>> r = check_en1993(s, 235, 210000, 81000, 4000, 4000, 4000)
        >>> str(r.governing), round(float(r.design))
        ('flexural-strong', 172604)
    """
    g = positive("gamma_M1", gamma_M1, "a partial factor such as 1.0 or 1.1")
    if g.ndim or g < 1.0:
        raise InputError("gamma_M1", repr(gamma_M1), "must be a single factor of at least 1.0",
                         "1.0 recommended by EN 1993-1-1 6.1; see the National Annex")
    gamma_M1 = float(g)
    hs = flag("high_strength", high_strength)
    sec, v, shape = prepare(section, fy=fy, E=E, G=G, Lc_strong=Lc_strong, Lc_weak=Lc_weak,
                            Lc_twist=Lc_twist)
    try:
        hs = np.broadcast_to(hs, shape).reshape(shape or (1,))
    except ValueError:
        raise InputError("high_strength", f"array of shape {hs.shape}",
                         f"does not match the batch of shape {shape}", "one flag per column or one for all"
                         ) from None
    fy, E, G = v["fy"], v["E"], v["G"]
    A = sec["A"]
    kind = section.kind
    t = Trace()
    t.add("A", "gross area", "", A, "mm^2", "section")
    t.add("fy", "yield strength for the thickness", "", fy, "MPa", "EN 1993-1-1 3.2.2")
    trace_inputs(t, sec, v)
    eps = t.add("eps", "material factor", "sqrt(235 / fy)", np.sqrt(235.0 / fy), "", "EN 1993-1-1 Table 5.2")
    cls, Aeff = classify(kind, sec, eps, t)
    warnings: list[Warning] = []
    class4 = np.asarray(cls == 4)
    if kind == "round" and class4.any():
        warnings.append(Warning("class-4-chs", "Class 4 circular hollow section: outside EN 1993-1-1 "
                                "(shell buckling, EN 1993-1-6); no resistance is given", class4))
    elif class4.any():
        warnings.append(Warning("class-4", "Class 4 section in compression: effective area Aeff "
                                "per EN 1993-1-5 4.4 used", class4))

    # the Table 6.2 row follows the flange as rolled, not as corroded
    tf_row = np.broadcast_to(np.asarray(section.tf_nominal, dtype=float), sec["tf"].shape)
    y, z, assumed = buckling_curves(kind, sec["rolled"], sec["d"] / sec["bf"], tf_row, hs)
    t.add("curve,y", "buckling curve, strong (y-y) axis", "by kind, h/b, tf, grade", y, "", T62)
    t.add("curve,z", "buckling curve, weak (z-z) axis", "by kind, h/b, tf, grade", z, "", T62)
    if assumed.any():
        warnings.append(Warning("curve-assumed", "rolled I with h/b > 1.2 and tf > 100 mm is not in "
                                "EN 1993-1-1 Table 6.2: curve d (S460: c) assumed", np.asarray(assumed)))

    def resistance(tag: str, Ncr: np.ndarray, curve: np.ndarray, clause: str) -> tuple:
        alpha = t.add(f"alpha,{tag}", f"imperfection factor, {tag}", "Table 6.1 from the curve",
                      np.select([curve == k for k in ALPHA], list(ALPHA.values()), np.nan), "",
                      "EN 1993-1-1 Table 6.1")
        lb = t.add(f"lb,{tag}", f"non-dimensional slenderness, {tag}",
                   "sqrt(A fy / Ncr) (Aeff for Class 4)", np.sqrt(Aeff * fy / Ncr), "", clause)
        t.add(f"Phi,{tag}", f"Phi, {tag}", "0.5 (1 + alpha (lb - 0.2) + lb^2)",
                    0.5 * (1 + alpha * (lb - 0.2) + lb**2), "", f"{C6312} (6.49)")
        chi = t.add(f"chi,{tag}", f"reduction factor, {tag}", "1 / (Phi + sqrt(Phi^2 - lb^2)) <= 1",
                    reduction_factor(lb, alpha), "", f"{C6312} (6.49)")
        # the resistance is found without the load, so the clause's other test is not used
        t.add(f"ignore,{tag}", f"buckling may be ignored, {tag} (lb <= 0.2; the resistance does "
              "not depend on the load: NEd/Ncr <= 0.04 not used)", "lb <= 0.2", lb <= 0.2, "",
              f"{C6312} (4)")
        Pn = t.add(f"Nb,{tag}", f"buckling resistance before gamma_M1, {tag}", "chi A fy (Aeff for Class 4)",
                   chi * (Aeff * fy), "N", f"{C6312} (6.47), (6.48)")
        return lb, chi * fy * Aeff / A, Pn

    modes: dict[str, ModeResult] = {}
    for mode, axis, I, Lc, curve in (("flexural-strong", "strong", sec["Ix"], v["Lc_strong"], y),
                                     ("flexural-weak", "weak", sec["Iy"], v["Lc_weak"], z)):
        Ncr = t.add(f"Ncr,{axis}", f"elastic critical force, {axis} axis", "pi^2 E I / Lcr^2",
                    euler_load(E, I, Lc), "N", "EN 1993-1-1 6.3.1.3")
        lb, Fcr, Pn = resistance(axis, Ncr, curve, f"{'EN 1993-1-1 6.3.1.3'} (6.50), (6.51)")
        modes[mode] = ModeResult(mode, Lc, lb, Ncr, Fcr, Pn)
    Lz = v["Lc_twist"]
    if kind != "i":
        t.add("note", "closed section: torsional buckling is reported but not applied "
              "(6.3.1.4 concerns open cross-sections)", "", "", "", "EN 1993-1-1 6.3.1.4 (1)")
    NcrT = t.add("Ncr,T", "elastic torsional buckling force (doubly symmetric)",
                 "(G It + pi^2 E Iw / lT^2) / i0^2, i0^2 = iy^2 + iz^2",
                 torsional_stress(E, G, sec["J"], sec["Cw"], Lz, sec["Ix"], sec["Iy"]) * A, "N",
                 "EN 1993-1-1 6.3.1.4")
    lbT, FcrT, PnT = resistance("torsion", NcrT, z, "EN 1993-1-1 6.3.1.4 (6.52), z-z curve")
    modes["torsional"] = ModeResult("torsional", Lz, lbT, NcrT, FcrT, PnT)
    Ny = t.add("Nc", "cross-section resistance before gamma_M0", "A fy (Aeff fy for Class 4)", Aeff * fy,
               "N", "EN 1993-1-1 6.2.4 (6.10), (6.11)")
    modes["yield"] = ModeResult("yield", None, None, None, fy * Aeff / A, Ny)

    closed = () if kind == "i" else ("torsional",)
    nominal, governing = choose(modes, t, "EN 1993-1-1 6.3.1.1", exclude=closed)
    design = t.add("Nb,Rd", "design buckling resistance",
                   f"chi A fy / gamma_M1 (Aeff for Class 4), gamma_M1 = {gamma_M1:g}; "
                   "gamma_M0 = 1.0 <= gamma_M1 so Nc,Rd does not govern", nominal / gamma_M1, "N",
                   "EN 1993-1-1 6.3.1.1 (6.47)")
    result = CodeResult(CODE, "en", np.asarray(nominal), np.asarray(design),
                        np.asarray(governing), modes, t, warnings)
    return reshaped(result, shape)
