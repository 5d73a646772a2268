"""Flexural strength about one axis for the beam-column checks: AISC 360-22 Chapter F,
EN 1993-1-1 6.2.5 / 6.3.2.2 with EN 1993-1-5 effective moduli for Class 4, and the vectorised
root finder the interaction checks share.

Every function takes the section arrays ``sec`` as ``_inputs.prepare`` gives them (one value per
column of the batch) together with the bending properties it reads (Sx, Sy, Zx, Zy, ho), and adds
its steps to a ``Trace``. Units N, mm, MPa; moments N*mm.
"""

from __future__ import annotations

from typing import Callable

import numpy as np

from fieldcol.trace import Trace

from .en1993 import reduction_factor

F2, F3, F6, F7, F8 = (f"AISC 360-22 {c}" for c in ("F2", "F3", "F6", "F7", "F8"))
B4B = "AISC 360-22 Table B4.1b"
C6322 = "EN 1993-1-1 6.3.2.2"
ALPHA_LT = {"a": 0.21, "b": 0.34, "c": 0.49, "d": 0.76}   # EN 1993-1-1 Table 6.3


def _between(lam: np.ndarray, lo: np.ndarray, hi: np.ndarray) -> np.ndarray:
    """(lam - lo)/(hi - lo), the linear transition of the noncompact range."""
    return (lam - lo) / (hi - lo)


def aisc_flexure(kind: str, axis: str, sec: dict[str, np.ndarray], Fy: np.ndarray, E: np.ndarray,
                 Lb: np.ndarray, t: Trace) -> tuple[np.ndarray, np.ndarray]:
    """Nominal flexural strength Mn (N*mm) about ``axis`` per AISC 360-22 Chapter F, Cb = 1.0.

    I shapes: strong axis F2 (yielding, lateral-torsional buckling over Lb) and F3 (flange local
    buckling); webs noncompact in flexure by F4; slender webs (F5) are not covered. Weak axis F6.
    Rectangular HSS F7 (yielding, flange and web local buckling, F7.4 lateral-torsional buckling
    about the major axis); slender webs (F7.3(c)) are not covered. Round HSS F8 (D/t < 0.45 E/Fy).

    Args:
        kind: ``"i"``, ``"rect"`` or ``"round"``; axis: ``"strong"`` or ``"weak"``.
        sec: section arrays; Fy, E: MPa; Lb: laterally unbraced length (mm); t: trace.
    Returns:
        (Mn N*mm, mask of columns outside the clauses covered: Mn is NaN there).

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> sec = {k: np.atleast_1d(a) for k, a in vars(from_catalogue("W14X90")).items()
        ...        if k not in ("kind", "name", "rolled", "notes")} | {"rolled": np.array([True])}
        >>> one = np.ones(1)
        >>> Mn, out = aisc_flexure("i", "weak", sec, 345.0 * one, 2e5 * one, 3000.0 * one, Trace())
        >>> round(float(Mn[0] / 1e6)), bool(out[0])
        (410, False)
    """
    root = np.sqrt(E / Fy)
    if kind == "i":
        return (_aisc_i_strong if axis == "strong" else _aisc_i_weak)(sec, Fy, E, Lb, root, t)
    if kind == "rect":
        return _aisc_rect(axis, sec, Fy, E, Lb, root, t)
    return _aisc_round(sec, Fy, E, t)


def _aisc_i_strong(sec, Fy, E, Lb, root, t):
    # Compact webs: F2 (yielding, LTB) and F3 (flange local buckling). Noncompact webs: F4 with the
    # web plastification factor Rpc in place of Mp and rt in place of rts. Slender webs (F5): none.
    Sx, Zx, Iy, Cw, ho, J, ry = (sec[k] for k in ("Sx", "Zx", "Iy", "Cw", "ho", "J", "ry"))
    lam_w, tw, bf, tf = sec["lam_web"], sec["tw"], sec["bf"], sec["tf"]
    lpw = t.add("lp,web", "web limit, compact in flexure", "3.76 sqrt(E/Fy)", 3.76 * root, "", B4B)
    lrw = t.add("lr,web", "web limit, noncompact in flexure", "5.70 sqrt(E/Fy)", 5.70 * root, "", B4B)
    f4 = np.asarray(lam_w > lpw)
    out = np.asarray(lam_w > lrw)
    Myc = Fy * Sx
    Mp = t.add("Mp", "plastic moment, strong axis", "Fy Zx (F4: <= 1.6 Fy Sx)",
               np.where(f4, np.minimum(Fy * Zx, 1.6 * Myc), Fy * Zx), "N*mm", f"{F2}.1 (F2-1); F4.1")
    if f4.any():
        Rpc = t.add("Rpc", "web plastification factor (noncompact web)",
                    "Mp/Myc - (Mp/Myc - 1)(hc/tw - lpw)/(lrw - lpw) <= Mp/Myc (Iyc/Iy = 0.5 > 0.23)",
                    np.where(f4, np.minimum(Mp / Myc, Mp / Myc - (Mp / Myc - 1) * _between(lam_w, lpw, lrw)),
                             np.nan), "", "AISC 360-22 F4.2 (F4-9b)")
        top = np.where(f4, Rpc * Myc, Mp)
    else:
        top = Mp
    # Lateral-torsional buckling, Cb = 1.0 (uniform moment: conservative for any moment shape)
    rts = np.sqrt(np.sqrt(Iy * Cw) / Sx)                                       # (F2-7)
    aw = lam_w * tw * tw / (bf * tf)
    rt = bf / np.sqrt(12 * (1 + aw / 6))                                        # (F4-11)
    r_ltb = t.add("rts", "effective radius of gyration (F4: rt)",
                  "compact web: sqrt(sqrt(Iy Cw) / Sx); noncompact: bf / sqrt(12 (1 + aw/6)), aw = hc tw/(bf tf)",
                  np.where(f4, rt, rts), "mm", f"{F2}.2 (F2-7); AISC 360-22 F4.2 (F4-11)")
    Lp = t.add("Lp", "limiting length, yielding", "compact web: 1.76 ry sqrt(E/Fy); noncompact: 1.1 rt sqrt(E/Fy)",
               np.where(f4, 1.1 * rt * root, 1.76 * ry * root), "mm", f"{F2}.2 (F2-5); AISC 360-22 F4.2 (F4-7)")
    jc = J * 1.0 / (Sx * ho)   # c = 1 for a doubly symmetric I (F2-8a); F4 uses J/(Sxc ho) alike
    Lr = t.add("Lr", "limiting length, inelastic LTB", "1.95 rts E/(0.7Fy) sqrt(Jc/(Sx ho) + "
               "sqrt((Jc/(Sx ho))^2 + 6.76 (0.7Fy/E)^2)), c = 1 (F4: rt, FL = 0.7 Fy)",
               1.95 * r_ltb * E / (0.7 * Fy) * np.sqrt(jc + np.sqrt(jc**2 + 6.76 * (0.7 * Fy / E) ** 2)),
               "mm", f"{F2}.2 (F2-6); AISC 360-22 F4.2 (F4-8)")
    t.add("Lb", "laterally unbraced length (the twist length)", "Lc,twist", Lb, "mm", f"{F2}.2")
    t.add("Cb", "lateral-torsional buckling modification factor", "1.0 (conservative)", 1.0, "",
          "AISC 360-22 F1")
    My = 0.7 * Fy * Sx        # FL Sxc with FL = 0.7 Fy for a doubly symmetric I
    inelastic = np.minimum(top, top - (top - My) * _between(Lb, Lp, Lr))
    Fcr = np.pi**2 * E / (Lb / r_ltb) ** 2 * np.sqrt(1 + 0.078 * jc * (Lb / r_ltb) ** 2)
    Mltb = t.add("Mn,LTB", "lateral-torsional buckling strength",
                 "Lb <= Lp: M1; Lb <= Lr: Cb [M1 - (M1 - 0.7 Fy Sx)(Lb - Lp)/(Lr - Lp)] <= M1; "
                 "else Fcr Sx <= M1, Fcr = Cb pi^2 E/(Lb/rts)^2 sqrt(1 + 0.078 Jc/(Sx ho) (Lb/rts)^2); "
                 "M1 = Mp (F2) or Rpc Fy Sx (F4)",
                 np.where(Lb <= Lp, top, np.where(Lb <= Lr, inelastic, np.minimum(top, Fcr * Sx))),
                 "N*mm", f"{F2}.2 (F2-2), (F2-3), (F2-4); AISC 360-22 F4.2 (F4-2), (F4-3)")
    # Flange local buckling (F3, or F4.3 with a noncompact web)
    lam = sec["lam_flange"]
    kc = np.clip(4.0 / np.sqrt(lam_w), 0.35, 0.76)
    lpf = t.add("lp,flange", "flange limit, compact in flexure", "0.38 sqrt(E/Fy)", 0.38 * root, "", B4B)
    lrf = t.add("lr,flange", "flange limit, noncompact in flexure",
                "rolled 1.0 sqrt(E/Fy); built-up 0.95 sqrt(kc E/(0.7 Fy))",
                np.where(sec["rolled"], 1.0 * root, 0.95 * np.sqrt(kc * E / (0.7 * Fy))), "", B4B)
    Mflb = t.add("Mn,FLB", "flange local buckling strength",
                 "compact: M1; noncompact: M1 - (M1 - 0.7 Fy Sx)(lam - lpf)/(lrf - lpf); "
                 "slender: 0.9 E kc Sx / lam^2",
                 np.where(lam <= lpf, top, np.where(lam <= lrf, top - (top - My) * _between(lam, lpf, lrf),
                                                    0.9 * E * kc * Sx / lam**2)),
                 "N*mm", f"{F3}.2 (F3-1), (F3-2); AISC 360-22 F4.3 (F4-13), (F4-14)")
    Mn = np.where(out, np.nan, np.minimum(top, np.minimum(Mltb, Mflb)))
    t.add("Mn", "nominal flexural strength, strong axis",
          "min(M1, Mn,LTB, Mn,FLB); slender web: not covered (F5)", Mn, "N*mm", f"{F2}, {F3}, AISC 360-22 F4")
    return Mn, out


def _aisc_i_weak(sec, Fy, E, Lb, root, t):
    Sy, Zy = sec["Sy"], sec["Zy"]
    Mp = t.add("Mp", "plastic moment, weak axis", "min(Fy Zy, 1.6 Fy Sy)",
               np.minimum(Fy * Zy, 1.6 * Fy * Sy), "N*mm", f"{F6}.1 (F6-1)")
    lam = sec["lam_flange"]
    kc = np.clip(4.0 / np.sqrt(sec["lam_web"]), 0.35, 0.76)
    lpf = t.add("lp,flange", "flange limit, compact in weak-axis flexure", "0.38 sqrt(E/Fy)",
                0.38 * root, "", B4B)
    lrf = t.add("lr,flange", "flange limit, noncompact in weak-axis flexure",
                "rolled 1.0 sqrt(E/Fy); built-up 0.95 sqrt(kc E/(0.7 Fy))",
                np.where(sec["rolled"], 1.0 * root, 0.95 * np.sqrt(kc * E / (0.7 * Fy))), "", B4B)
    Mn = t.add("Mn", "nominal flexural strength, weak axis",
               "compact: Mp; noncompact: Mp - (Mp - 0.7 Fy Sy)(lam - lpf)/(lrf - lpf); "
               "slender: Fcr Sy, Fcr = 0.69 E / lam^2",
               np.where(lam <= lpf, Mp,
                        np.where(lam <= lrf, Mp - (Mp - 0.7 * Fy * Sy) * _between(lam, lpf, lrf),
                                 0.69 * E / lam**2 * Sy)),
               "N*mm", f"{F6}.2 (F6-2), (F6-3), (F6-4)")
    return Mn, np.zeros(Mn.shape, dtype=bool)


def _aisc_rect(axis, sec, Fy, E, Lb, root, t):
    # Bent about the weak axis, the depth walls become the flanges.
    strong = axis == "strong"
    S, Z = (sec["Sx"], sec["Zx"]) if strong else (sec["Sy"], sec["Zy"])
    lam_f, lam_w = (sec["lam_flange"], sec["lam_web"]) if strong else (sec["lam_web"], sec["lam_flange"])
    H = sec["d"] if strong else sec["bf"]          # depth in the plane of bending
    tf = sec["tf"]
    I = sec["Ix"] if strong else sec["Iy"]
    Mp = t.add("Mp", f"plastic moment, {axis} axis", "Fy Z", Fy * Z, "N*mm", f"{F7}.1 (F7-1)")
    lpf = t.add("lp,flange", "HSS flange limit, compact in flexure", "1.12 sqrt(E/Fy)", 1.12 * root, "", B4B)
    lrf = t.add("lr,flange", "HSS flange limit, noncompact in flexure", "1.40 sqrt(E/Fy)", 1.40 * root, "",
                B4B)
    # Slender flange: effective section modulus. The ineffective width is taken out of both
    # flanges, which keeps the neutral axis at mid-depth: slightly conservative against removing
    # it from the compression flange alone, and the way the AISC Design Examples work it.
    b = lam_f * tf
    be = t.add("be", "effective width of the compression flange (used when slender)",
               "1.92 t sqrt(E/Fy) (1 - 0.38/(b/t) sqrt(E/Fy)) <= b",
               np.minimum(b, 1.92 * tf * root * (1 - 0.38 / lam_f * root)), "mm", f"{F7}.2 (F7-4)")
    arm = (H - tf) / 2
    I_eff = I - 2 * (b - be) * tf * (arm**2 + tf**2 / 12)
    Se = t.add("Se", "effective section modulus (used when the flange is slender)",
               "[I - 2 (b - be) t ((H - t)/2)^2] / (H/2): width b - be out of both flanges",
               I_eff / (H / 2), "mm^3", f"{F7}.2 (F7-3)")
    Mflb = t.add("Mn,FLB", "flange local buckling strength",
                 "compact: Mp; noncompact: Mp - (Mp - Fy S)(3.57 (b/t) sqrt(Fy/E) - 4.0) <= Mp; slender: Fy Se",
                 np.where(lam_f <= lpf, Mp,
                          np.where(lam_f <= lrf, np.minimum(Mp, Mp - (Mp - Fy * S) * (3.57 * lam_f / root - 4.0)),
                                   Fy * Se)),
                 "N*mm", f"{F7}.2 (F7-2), (F7-3)")
    lpw = t.add("lp,web", "HSS web limit, compact in flexure", "2.42 sqrt(E/Fy)", 2.42 * root, "", B4B)
    lrw = t.add("lr,web", "HSS web limit, noncompact in flexure", "5.70 sqrt(E/Fy)", 5.70 * root, "", B4B)
    out = np.asarray(lam_w > lrw)
    Mwlb = t.add("Mn,WLB", "web local buckling strength",
                 "compact: Mp; noncompact: Mp - (Mp - Fy S)(0.305 (h/t) sqrt(Fy/E) - 0.738) <= Mp; "
                 "slender: not covered (F7.3(c))",
                 np.where(lam_w <= lpw, Mp,
                          np.minimum(Mp, Mp - (Mp - Fy * S) * (0.305 * lam_w / root - 0.738))),
                 "N*mm", f"{F7}.3 (F7-6)")
    Mn = np.minimum(Mp, np.minimum(Mflb, Mwlb))
    if strong:
        # F7.4 applies about the major axis only; a square HSS has none and does not buckle laterally
        major = np.asarray(sec["d"] > sec["bf"])
        JA = np.sqrt(sec["J"] * sec["A"])
        ry = sec["ry"]
        Lp = t.add("Lp", "limiting length, yielding (HSS)", "0.13 E ry sqrt(J Ag) / Mp",
                   0.13 * E * ry * JA / Mp, "mm", f"{F7}.4 (F7-12)")
        Lr = t.add("Lr", "limiting length, inelastic LTB (HSS)", "2 E ry sqrt(J Ag) / (0.7 Fy Sx)",
                   2 * E * ry * JA / (0.7 * Fy * S), "mm", f"{F7}.4 (F7-13)")
        t.add("Lb", "laterally unbraced length (the twist length), Cb = 1.0", "Lc,twist", Lb, "mm", f"{F7}.4")
        inelastic = np.minimum(Mp, Mp - (Mp - 0.7 * Fy * S) * _between(Lb, Lp, Lr))
        Mltb = t.add("Mn,LTB", "lateral-torsional buckling strength (HSS, major axis)",
                     "square: none; Lb <= Lp: Mp; Lb <= Lr: Cb [Mp - (Mp - 0.7 Fy Sx)(Lb - Lp)/(Lr - Lp)]"
                     "; else 2 E Cb sqrt(J Ag) / (Lb/ry) <= Mp",
                     np.where(~major | (Lb <= Lp), Mp,
                              np.where(Lb <= Lr, inelastic, np.minimum(Mp, 2 * E * JA / (Lb / ry)))),
                     "N*mm", f"{F7}.4 (F7-10), (F7-11)")
        Mn = np.minimum(Mn, Mltb)
    Mn = np.where(out, np.nan, Mn)
    t.add("Mn", f"nominal flexural strength, {axis} axis (rectangular HSS)",
          "least of yielding, FLB, WLB" + (", LTB" if strong else ""), Mn, "N*mm", F7)
    return Mn, out


def _aisc_round(sec, Fy, E, t):
    Dt, S, Z = sec["lam_flange"], sec["Sx"], sec["Zx"]
    Mp = t.add("Mp", "plastic moment (round HSS)", "Fy Z", Fy * Z, "N*mm", f"{F8}.1 (F8-1)")
    lp = t.add("lp,D/t", "round HSS limit, compact in flexure", "0.07 E/Fy", 0.07 * E / Fy, "", B4B)
    lr = t.add("lr,D/t", "round HSS limit, noncompact in flexure", "0.31 E/Fy", 0.31 * E / Fy, "", B4B)
    out = np.asarray(Dt >= 0.45 * E / Fy)
    Mn = t.add("Mn", "nominal flexural strength (round HSS)",
               "compact: Mp; noncompact: (0.021 E/(D/t) + Fy) S <= Mp; slender: 0.33 E/(D/t) S; "
               "D/t >= 0.45 E/Fy: not covered",
               np.where(out, np.nan,
                        np.where(Dt <= lp, Mp,
                                 np.where(Dt <= lr, np.minimum(Mp, (0.021 * E / Dt + Fy) * S),
                                          0.33 * E / Dt * S))),
               "N*mm", f"{F8}.2 (F8-2), (F8-3), (F8-4)")
    return Mn, out


def elastic_lt_moment(E: np.ndarray, G: np.ndarray, Iz: np.ndarray, Iw: np.ndarray, It: np.ndarray,
                      L: np.ndarray, C1: float = 1.0) -> np.ndarray:
    """Elastic critical moment of a doubly symmetric I with ends free to warp (k = kw = 1):
    Mcr = C1 pi^2 E Iz / L^2 sqrt(Iw/Iz + L^2 G It / (pi^2 E Iz))  (N*mm).

    Example:
        >>> round(float(elastic_lt_moment(210000.0, 81000.0, 1e7, 1e11, 1e5, 5000.0)) / 1e6, 1)
        116.6
    """
    base = np.pi**2 * E * Iz / L**2
    return C1 * base * np.sqrt(Iw / Iz + L**2 * G * It / (np.pi**2 * E * Iz))


def en_moment(kind: str, axis: str, sec: dict[str, np.ndarray], cls: np.ndarray, fy: np.ndarray,
              E: np.ndarray, G: np.ndarray, Lb: np.ndarray, t: Trace,
              Weff: np.ndarray | None = None, *, rolled_case: bool = False,
              psi: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
    """Characteristic moment resistance and lateral-torsional reduction per EN 1993-1-1.

    M_Rk = W_pl fy (Class 1, 2), W_el fy (Class 3) or W_eff fy (Class 4, ``Weff`` given; NaN
    without it) (6.2.5).
    chi_LT per 6.3.2.2 (general case) for an I bent about its strong axis, with Mcr for
    Lb = the twist length and C1 = 1.0 (uniform moment: conservative); 1.0 otherwise (weak-axis
    bending, and hollow sections, which are not susceptible to torsional deformation).
    With ``rolled_case`` chi_LT follows 6.3.2.3 instead (rolled and equivalent welded I: see
    ``chi_lt_rolled``), and ``psi`` (the end-moment ratio over Lb, -1..1; NaN or None: unknown
    diagram) gives C1 in Mcr and k_c in f; unknown diagrams take C1 = k_c = 1.0 (conservative).

    Args:
        kind, axis: section kind and bending axis; sec: section arrays; cls: section class 1..4;
        fy, E, G: MPa; Lb: length between twist restraints (mm); t: trace.
        rolled_case: 6.3.2.3 in place of 6.3.2.2; psi: end-moment ratio per column (EN sign:
            +1 uniform moment).
    Returns:
        (M_Rk N*mm, chi_LT).

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> sec = {k: np.atleast_1d(a) for k, a in vars(from_catalogue("HEB 300")).items()
        ...        if k not in ("kind", "name", "rolled", "notes")} | {"rolled": np.array([True])}
        >>> one = np.ones(1)
        >>> M, chi = en_moment("i", "strong", sec, np.array([1]), 355.0 * one, 2.1e5 * one, 8.1e4 * one,
        ...                    100.0 * one, Trace())
        >>> round(float(M[0]) / 1e6), float(chi[0])
        (663, 1.0)
    """
    strong = axis == "strong"
    Wpl, Wel = (sec["Zx"], sec["Sx"]) if strong else (sec["Zy"], sec["Sy"])
    W4 = np.nan if Weff is None else Weff
    W = t.add("W", f"section modulus used, {axis} axis", "Class 1, 2: W_pl; Class 3: W_el; Class 4: W_eff",
              np.where(cls <= 2, Wpl, np.where(cls == 3, Wel, W4)), "mm^3",
              "EN 1993-1-1 6.2.5 (6.13), (6.14), (6.15)")
    M_Rk = t.add("M_Rk", f"characteristic moment resistance, {axis} axis", "W fy", W * fy, "N*mm",
                 "EN 1993-1-1 6.2.5")
    if not (kind == "i" and strong):
        why = "weak-axis bending" if kind == "i" else "hollow section: not susceptible to torsional deformation"
        chi = t.add("chi_LT", f"lateral-torsional reduction factor ({why})", "1.0", np.ones(M_Rk.shape), "",
                    C6322)
        return M_Rk, chi
    if rolled_case:
        return M_Rk, chi_lt_rolled(sec, M_Rk, E, G, Lb, psi, t)
    Mcr = t.add("Mcr", "elastic critical moment for lateral-torsional buckling",
                "C1 pi^2 E Iz / L^2 sqrt(Iw/Iz + L^2 G It / (pi^2 E Iz)), C1 = 1.0, L = Lc,twist",
                elastic_lt_moment(E, G, sec["Iy"], sec["Cw"], sec["J"], Lb), "N*mm", f"{C6322} (2)")
    lb = t.add("lb,LT", "non-dimensional slenderness for LTB", "sqrt(W fy / Mcr)", np.sqrt(M_Rk / Mcr), "",
               f"{C6322} (6.56)")
    deep = sec["d"] / sec["bf"] > 2.0
    curve = np.where(sec["rolled"], np.where(deep, "b", "a"), np.where(deep, "d", "c"))
    t.add("curve,LT", "lateral-torsional buckling curve", "rolled I: h/b <= 2 a, > 2 b; welded: c, d",
          curve, "", "EN 1993-1-1 Table 6.4")
    alpha = t.add("alpha_LT", "imperfection factor for LTB", "Table 6.3 from the curve",
                  np.select([curve == k for k in ALPHA_LT], list(ALPHA_LT.values()), np.nan), "",
                  "EN 1993-1-1 Table 6.3")
    chi = t.add("chi_LT", "lateral-torsional reduction factor",
                "1 / (Phi_LT + sqrt(Phi_LT^2 - lb,LT^2)) <= 1, Phi_LT = 0.5 (1 + alpha_LT (lb,LT - 0.2) "
                "+ lb,LT^2)", reduction_factor(lb, alpha), "", f"{C6322} (6.56)")
    return M_Rk, chi


# C1 of a doubly symmetric I under linear end moments, k = kw = 1, load at the shear centre, by
# psi = M_small / M_large (+1 uniform moment). Published C1 tables agree for psi >= 0; for reverse
# curvature they differ by up to a tenth, and the lowest of the values recalled is taken here
# (conservative). From memory: the tabulations of C1 for end moments in the design guides to
# EN 1993-1-1 (one is Table C.1 of Steel Buildings in Europe, Single-Storey Part 4, Appendix C;
# its values were not read for this table).
C1_PSI = np.array([-1.0, -0.75, -0.5, -0.25, 0.0, 0.25, 0.5, 0.75, 1.0])
C1_VALUE = np.array([2.55, 2.42, 2.26, 2.05, 1.77, 1.52, 1.31, 1.14, 1.00])
C6323 = "EN 1993-1-1 6.3.2.3"
LT0, BETA = 0.4, 0.75          # 6.3.2.3 (1): recommended values (National Annexes may differ)


def c1_end_moments(psi: np.ndarray) -> np.ndarray:
    """C1 for linear end moments by ``psi`` (-1..1; NaN: unknown diagram, C1 = 1.0), linear between
    the tabulated points (``C1_PSI``, ``C1_VALUE``).

    Example:
        >>> c1_end_moments(np.array([1.0, 0.0, -1.0, np.nan])).tolist()
        [1.0, 1.77, 2.55, 1.0]
    """
    p = np.asarray(psi, dtype=float)
    return np.where(np.isnan(p), 1.0, np.interp(np.nan_to_num(p, nan=1.0), C1_PSI, C1_VALUE))


def chi_lt_rolled(sec: dict[str, np.ndarray], M_Rk: np.ndarray, E: np.ndarray, G: np.ndarray,
                  Lb: np.ndarray, psi: np.ndarray | None, t: Trace) -> np.ndarray:
    """chi_LT,mod of an I bent about its strong axis by EN 1993-1-1 6.3.2.3 (rolled and equivalent
    welded sections).

    Mcr = C1 pi^2 E Iz / L^2 sqrt(Iw/Iz + L^2 G It / (pi^2 E Iz)) with C1 from ``psi``;
    Phi_LT = 0.5 (1 + alpha_LT (lb - lb0) + beta lb^2), lb0 = 0.4, beta = 0.75 (recommended);
    chi_LT = 1 / (Phi_LT + sqrt(Phi_LT^2 - beta lb^2)) <= 1 and <= 1/lb^2 (6.57); curves by
    Table 6.5 (rolled h/b <= 2: b, > 2: c; welded h/b <= 2: c, > 2: d); then
    chi_LT,mod = chi_LT / f <= 1, <= 1/lb^2 (6.58), f = 1 - 0.5 (1 - k_c)(1 - 2 (lb - 0.8)^2) <= 1,
    k_c = 1 / (1.33 - 0.33 psi) (Table 6.6, linear moment; 1.0 for an unknown diagram).

    Args:
        sec: section arrays; M_Rk: W fy (N*mm); E, G: MPa; Lb: twist length (mm);
        psi: end-moment ratio over Lb per column (NaN or None: unknown); t: trace.
    Returns:
        chi_LT,mod per column.

    Example:
        >>> sec = {"Iy": np.array([1676e4]), "Cw": np.array([791e9]), "J": np.array([66.9e4]),
        ...        "d": np.array([450.]), "bf": np.array([190.]), "rolled": np.array([True])}
        >>> chi = chi_lt_rolled(sec, np.array([1702e3 * 355.]), 210000., 81000., np.array([1700.]),
        ...                     np.array([1.0]), Trace())
        >>> round(float(chi[0]), 3)
        0.961
    """
    shape = np.shape(M_Rk)
    p = np.full(shape, np.nan) if psi is None else np.broadcast_to(np.asarray(psi, dtype=float), shape)
    C1 = t.add("C1", "moment-diagram factor for Mcr (linear end moments, k = kw = 1)",
               "tabulated by psi = M_small/M_large, linear between points; unknown diagram: 1.0",
               c1_end_moments(p), "", "EN 1993-1-1 6.3.2.2 (2); C1 for linear end moments "
               "(tabulated; the lower value where tabulations differ)")
    Mcr = t.add("Mcr", "elastic critical moment for lateral-torsional buckling",
                "C1 pi^2 E Iz / L^2 sqrt(Iw/Iz + L^2 G It / (pi^2 E Iz)), L = Lc,twist",
                elastic_lt_moment(E, G, sec["Iy"], sec["Cw"], sec["J"], Lb, C1), "N*mm", f"{C6322} (2)")
    lb = t.add("lb,LT", "non-dimensional slenderness for LTB", "sqrt(W fy / Mcr)", np.sqrt(M_Rk / Mcr), "",
               f"{C6323} (1)")
    deep = sec["d"] / sec["bf"] > 2.0
    curve = np.where(sec["rolled"], np.where(deep, "c", "b"), np.where(deep, "d", "c"))
    t.add("curve,LT", "lateral-torsional buckling curve (rolled and equivalent welded)",
          "rolled I: h/b <= 2 b, > 2 c; welded I: h/b <= 2 c, > 2 d", curve, "", "EN 1993-1-1 Table 6.5")
    alpha = t.add("alpha_LT", "imperfection factor for LTB", "Table 6.3 from the curve",
                  np.select([curve == k for k in ALPHA_LT], list(ALPHA_LT.values()), np.nan), "",
                  "EN 1993-1-1 Table 6.3")
    phi = 0.5 * (1 + alpha * (lb - LT0) + BETA * lb**2)
    t.add("Phi_LT", "Phi_LT (rolled case)", f"0.5 (1 + alpha_LT (lb,LT - {LT0:g}) + {BETA:g} lb,LT^2)", phi, "",
          f"{C6323} (6.57)")
    cap = 1.0 / np.maximum(lb, 1e-12) ** 2
    chi = np.minimum(np.minimum(1.0, cap), 1.0 / (phi + np.sqrt(np.maximum(phi**2 - BETA * lb**2, 0.0))))
    t.add("chi_LT,0", "lateral-torsional reduction factor before f",
          f"1 / (Phi_LT + sqrt(Phi_LT^2 - {BETA:g} lb,LT^2)) <= 1, <= 1/lb,LT^2", chi, "", f"{C6323} (6.57)")
    kc = t.add("k_c", "correction factor for the moment distribution",
               "1 / (1.33 - 0.33 psi) (linear moment); unknown diagram: 1.0",
               np.where(np.isnan(p), 1.0, 1.0 / (1.33 - 0.33 * np.nan_to_num(p, nan=1.0))), "",
               "EN 1993-1-1 Table 6.6")
    f = t.add("f_mod", "modification factor f", "1 - 0.5 (1 - k_c)(1 - 2 (lb,LT - 0.8)^2) <= 1",
              np.minimum(1.0, 1 - 0.5 * (1 - kc) * (1 - 2.0 * (lb - 0.8) ** 2)), "", f"{C6323} (2) (6.58)")
    return t.add("chi_LT", "lateral-torsional reduction factor (rolled case, modified)",
                 "chi_LT / f <= 1, <= 1/lb,LT^2", np.minimum(np.minimum(1.0, cap), chi / f), "",
                 f"{C6323} (6.58)")


def en_effective_modulus(kind: str, axis: str, sec: dict[str, np.ndarray], eps: np.ndarray,
                         t: Trace) -> np.ndarray:
    """Effective elastic section modulus W_eff,min for bending alone (mm^3), EN 1993-1-5 4.3, 4.4.

    The compression flange is reduced first (I outstands: k_sigma 0.43, (4.3); hollow-section
    flange: internal, psi = 1, (4.2)); the web stress ratio psi then follows from the section with
    that effective flange and the gross web(s) (EN 1993-1-5 4.4 (3)), k_sigma = 7.81 - 6.29 psi +
    9.78 psi^2 (Table 4.1), and the ineffective part of the web lies between be1 = 0.4 beff (at the
    flange) and be2 = 0.6 beff (at the neutral axis). One pass, no iteration. An I about its weak
    axis: the web stays effective, the compressed outstands are reduced with k_sigma from Table 4.2
    (largest stress at the free edge). A circular hollow section is not covered (NaN).

    Args:
        kind: ``"i"``, ``"rect"`` or ``"round"``; axis: bending axis; sec: section arrays;
        eps: sqrt(235/fy); t: trace.
    Returns:
        W_eff,min = I_eff / (largest fibre distance), mm^3.

    Example:
        >>> sec = {"d": np.array([600.]), "bf": np.array([250.]), "tf": np.array([10.]), "tw": np.array([5.]),
        ...        "A": np.array([7900.]), "Ix": np.array([5.1646e8]), "ct_flange": np.array([12.25]),
        ...        "ct_web": np.array([116.])}
        >>> round(float(en_effective_modulus("i", "strong", sec, np.array([0.8136]), Trace())[0]) / 1e3)
        1611
    """
    from ._en_class import rho_internal, rho_outstand

    strong = axis == "strong"
    if kind == "round":
        return np.full(np.shape(sec["d"]), np.nan)
    if kind == "i" and not strong:
        return _weak_i_effective_modulus(sec, eps, t)
    if kind == "i":
        H, I, tf, tw = sec["d"], sec["Ix"], sec["tf"], sec["tw"]
        ct_f, ct_w, webs = sec["ct_flange"], sec["ct_web"], 1
        lp_f = ct_f / (28.4 * eps * np.sqrt(0.43))
        rho_f = rho_outstand(lp_f)
        lost_f = 2 * (1 - rho_f) * ct_f * tf * tf          # both outstands of the compression flange
    else:
        H, I = (sec["d"], sec["Ix"]) if strong else (sec["bf"], sec["Iy"])
        tf = tw = sec["tf"]
        ct_f, ct_w = (sec["ct_flange"], sec["ct_web"]) if strong else (sec["ct_web"], sec["ct_flange"])
        webs = 2
        lp_f = ct_f / (28.4 * eps * 2.0)
        rho_f = rho_internal(lp_f, 1.0)
        lost_f = (1 - rho_f) * ct_f * tf * tf
    t.add("rho,flange,M", "reduction factor of the compression flange (bending)",
          "outstand (4.3) k_sigma 0.43 / internal (4.2) k_sigma 4", rho_f, "", "EN 1993-1-5 4.4 (4.2), (4.3)")
    A = sec["A"]
    z_f = (H - tf) / 2
    s1 = lost_f * z_f / (A - lost_f)      # the neutral axis moves away from the compression flange
    hw = ct_w * tw
    psi = t.add("psi,web,M", "web stress ratio in bending (effective flange, gross web)",
                "-(hw/2 - s)/(hw/2 + s)", -(hw / 2 - s1) / (hw / 2 + s1), "", "EN 1993-1-5 4.4 (3)")
    k = 7.81 - 6.29 * psi + 9.78 * psi**2
    lp_w = (hw / tw) / (28.4 * eps * np.sqrt(k))
    rho_w = t.add("rho,web,M", "reduction factor of the web (bending)",
                  "k_sigma = 7.81 - 6.29 psi + 9.78 psi^2; (lp - 0.055 (3 + psi))/lp^2 <= 1",
                  rho_internal(lp_w, psi), "", "EN 1993-1-5 4.4 (4.2), Table 4.1")
    bc = hw / (1 - psi)                   # compressed depth of the web
    beff = rho_w * bc
    hole = bc - beff
    z_h = hw / 2 - 0.4 * beff - hole / 2  # the ineffective zone starts be1 = 0.4 beff below the flange
    lost_w = webs * hole * tw
    A_eff = A - lost_f - lost_w
    zc = -(lost_f * z_f + lost_w * z_h) / A_eff
    I_eff = I - lost_f * (z_f**2 + tf**2 / 12) - lost_w * (z_h**2 + hole**2 / 12) - A_eff * zc**2
    return t.add("W_eff", f"effective section modulus, {axis} axis (Class 4)", "I_eff / (H/2 + |shift|)",
                 I_eff / (H / 2 - zc), "mm^3", "EN 1993-1-5 4.3 (4); EN 1993-1-1 6.2.5 (6.15)")


def _weak_i_effective_modulus(sec: dict[str, np.ndarray], eps: np.ndarray, t: Trace) -> np.ndarray:
    # Weak-axis bending: the web lies on the neutral axis and stays effective; each compressed
    # outstand carries its largest stress at the free edge, psi = root/tip stress (gross section,
    # EN 1993-1-5 4.4 (3)), k_sigma = 0.57 - 0.21 psi + 0.07 psi^2 (Table 4.2, the row with the
    # largest compression at the free edge), ineffective width at the tip.
    from ._en_class import rho_outstand

    bf, tf, Iy, A = sec["bf"], sec["tf"], sec["Iy"], sec["A"]
    # the outstand cannot be wider than half the flange (a plated section's tf is the thickest
    # plate, so ratio x tf can overstate it)
    c = np.minimum(sec["ct_flange"] * tf, bf / 2)
    psi = (bf / 2 - c) / (bf / 2)
    k = 0.57 - 0.21 * psi + 0.07 * psi**2
    rho = t.add("rho,flange,M", "reduction factor of the compressed outstands (weak-axis bending)",
                "k_sigma = 0.57 - 0.21 psi + 0.07 psi^2, psi = root/tip stress; (lp - 0.188)/lp^2 <= 1",
                rho_outstand((c / tf) / (28.4 * eps * np.sqrt(k))), "", "EN 1993-1-5 4.4 (4.3), Table 4.2")
    w = (1 - rho) * c
    lost = 2 * w * tf                     # one compressed outstand in each flange
    x = bf / 2 - w / 2
    xc = -lost * x / (A - lost)
    I_eff = Iy - lost * (x**2 + w**2 / 12) - (A - lost) * xc**2
    # the centroid moves towards the tension edge, and the compressed edge of the effective section
    # is the end of the effective outstand: take the farther of the two
    far = np.maximum(bf / 2 + xc, bf / 2 - w - xc)
    return t.add("W_eff", "effective section modulus, weak axis (Class 4)",
                 "I_eff / max(bf/2 - |shift|, bf/2 - (1 - rho) c + |shift|)",
                 I_eff / far, "mm^3", "EN 1993-1-5 4.3 (4); EN 1993-1-1 6.2.5 (6.15)")


def largest_root(g: Callable[[np.ndarray], np.ndarray], hi: np.ndarray, steps: int = 80) -> np.ndarray:
    """The largest P in [0, hi] with g(P) <= 1, for g non-decreasing in P, by bisection on every
    column at once (no per-column loop).

    The lower end is always a P where g(P) <= 1 (g(0) must be <= 1), so the answer never exceeds a
    true root; a larger g (a larger bow) never gives a larger answer, to the last bit.

    Args:
        g: the interaction value of a batch of loads; hi: the upper end (N); steps: halvings.
    Returns:
        P (N), 0 where even tiny loads fail and NaN where hi is NaN.

    Example:
        >>> float(largest_root(lambda p: p / 4.0, np.array([10.0]))[0])
        4.0
    """
    lo = np.zeros_like(hi)
    top = hi.copy()
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for _ in range(steps):
            mid = 0.5 * (lo + top)
            ok = g(mid) <= 1.0
            lo = np.where(ok, mid, lo)
            top = np.where(ok, top, mid)
        # the last halving may leave lo one step below a hi that itself satisfies g <= 1
        lo = np.where(g(hi) <= 1.0, hi, lo)
    return np.where(np.isnan(hi), np.nan, lo)


__all__ = ["aisc_flexure", "c1_end_moments", "chi_lt_rolled", "elastic_lt_moment", "en_effective_modulus",
           "en_moment", "largest_root"]
