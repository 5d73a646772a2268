"""The rivets or bolts at the ends of lacing bars and battens: single shear and bearing.

Formulas as recalled from the standards (from memory), each in the trace with its clause:

* AISC 360-22 J3.6: Rn = Fnv Ab per shear plane, Fnv from Table J3.2 (A307 27 ksi; Group A
  (A325) 54 ksi threads included (N), 68 ksi excluded (X); Group B (A490) 68 / 84 ksi); phi 0.75,
  Omega 2.00. A bolt of unrecorded grade is taken as A307, the weakest common grade (common
  practice). Rivets: AISC 360-22 has none; per Appendix 5.2 their strength comes from the
  documents or tests: Fnv = 0.563 Fu,r on the rivet's nominal area, the form Table J3.2 gives a
  bolt with threads excluded from the shear plane (a judgement), Fu,r = 52 ksi for rivet steel
  not recorded (ASTM A502 Grade 1 minimum, from memory; a judgement).
  J3.10 bearing at a standard hole (J3.3: d + 1/16 in, d + 1/8 in from 1 in; 2 and 3 mm here):
  2.4 d t Fu (deformation considered), tearout 1.2 lc t Fu, lc = e - dh/2 (the end fastener)
  or s - dh (the others); phi 0.75, Omega 2.00.
* EN 1993-1-8 Table 3.4, gamma_M2 = 1.25 recommended: bolts Fv,Rd = alpha_v fub As / gamma_M2
  (threads in the shear plane, on the safe side: alpha_v 0.6 for 4.6, 5.6, 8.8, 0.5 for 10.9;
  As of ISO metric coarse threads, else 0.75 of the shank's area); rivets Fv,Rd = 0.6 fur A0 /
  gamma_M2 (A0 the hole's area); bearing Fb,Rd = k1 alpha_b fu d t / gamma_M2 with alpha_b =
  min(alpha_d, fub/fu, 1), alpha_d = e1/(3 d0) at the end, p1/(3 d0) - 1/4 inside, k1 =
  min(2.8 e2/d0 - 1.7, 2.5); d0 = d + 2 mm up to 24 mm, d + 3 mm above (EN 1090-2 normal
  clearance). A bolt of unrecorded grade is taken as 4.6.

Not recorded: the end distance is taken as 1.5 d and the pitch as 3 d (common practice minimums
for sheared ends and rivet spacing; the trace says so: measure them where the joint governs).
A group resists the sum of its fasteners (bearing and tearout fastener by fastener, AISC J3.10;
EN 1993-1-8 3.7 (1)); a batten's group carries its shear and moment elastically, the most
loaded fastener checked with every distance taken as the end distance (on the safe side).
"""

from __future__ import annotations

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._builtup import TieFasteners
from fieldcol.trace import Trace

KSI = 6.894757
J3 = "AISC 360-22 J3.6, Table J3.2"
J310 = "AISC 360-22 J3.10"
T34 = "EN 1993-1-8 Table 3.4"
GAMMA_M2 = 1.25
#: AISC 360-22 Table J3.2 nominal shear stress Fnv (ksi, from memory)
AISC_BOLTS = {"A307": 27.0, "A325-N": 54.0, "A325-X": 68.0, "A490-N": 68.0, "A490-X": 84.0}
#: EN 1993-1-8 Table 3.1 fub (MPa) and Table 3.4 alpha_v, threads in the shear plane (from memory)
EN_BOLTS = {"4.6": (400.0, 0.6), "5.6": (500.0, 0.6), "8.8": (800.0, 0.6), "10.9": (1000.0, 0.5)}
#: ISO 898-1 tensile stress areas of metric coarse threads, mm^2 (from memory)
STRESS_AREA = {12: 84.3, 16: 157.0, 20: 245.0, 22: 303.0, 24: 353.0, 27: 459.0, 30: 561.0,
               36: 817.0}
RIVET_FU = 52 * KSI


def _hole(d: float) -> float:
    return d + (2.0 if d <= 24.0 + 1e-9 else 3.0)


def _spacing(f: TieFasteners, t: Trace, tag: str) -> tuple[float, float]:
    """(end distance, pitch), the trace saying which were not recorded."""
    e = f.edge
    if e is None:
        e = t.add(f"e,{tag}", "end distance of the fasteners, not recorded", "1.5 d",
                  1.5 * f.diameter, "mm", "common practice (sheared end); measure it")
    p = f.pitch
    if p is None and f.count > 1:
        p = t.add(f"p,{tag}", "pitch of the fasteners, not recorded", "3 d", 3 * f.diameter,
                  "mm", "common practice (AISC 360-22 J3.3 preferred 3 d); measure it")
    return float(e), float(p or 0.0)


def _rivet_fu(f: TieFasteners, t: Trace, tag: str) -> float:
    if f.Fu is not None:
        return t.add(f"Fu,r,{tag}", "tensile strength of the rivet steel (recorded)", "record",
                     f.Fu, "MPa", "record")
    return t.add(f"Fu,r,{tag}", "tensile strength of the rivet steel, not recorded: ASTM A502 "
                 "Grade 1 minimum (from memory), a judgement", "52 ksi", RIVET_FU, "MPa",
                 "judgement; AISC 360-22 App. 5.2 (strength from documents or tests)")


def _grade(f: TieFasteners, table: dict, default: str) -> tuple[str, bool]:
    if f.grade is None:
        return default, False
    if f.grade not in table:
        raise InputError(f"{f.field}.grade", f.grade, "not a bolt grade of this code",
                         "one of " + ", ".join(table))
    return f.grade, True


def group_strength(code: str, f: TieFasteners, t_ply: float, fu_ply: float, e2: float | None,
                   basis: str, t: Trace, tag: str) -> tuple[float, float]:
    """Design (LRFD, EN) or allowable (ASD) strength of the fasteners at one end, in single
    shear and bearing: (the whole group along the force, one fastener with every distance the
    end distance) in N. e2: the edge distance across the force (EN k1; None: the end distance).

    Example:
        >>> f = TieFasteners(2, 19.05, "bolt", "A325-N")
        >>> round(group_strength("aisc360-22", f, 9.5, 400.0, None, "lrfd", Trace(), "x")[0])
        141320
    """
    d, n = f.diameter, f.count
    e, p = _spacing(f, t, tag)
    who = f"{n} {f.kind}{'s' if n > 1 else ''} of {d:.1f} mm"
    if code == "aisc360-22":
        lrfd = basis != "asd"
        k = 0.75 if lrfd else 1 / 2.00
        how = "phi = 0.75" if lrfd else "Omega = 2.00"
        Ab = np.pi * d**2 / 4
        if f.kind == "rivet":
            Fnv = t.add(f"Fnv,{tag}", "nominal shear stress of a rivet: as a bolt with threads "
                        "excluded (a judgement: AISC 360-22 has no rivets)", "0.563 Fu,r",
                        0.563 * _rivet_fu(f, t, tag), "MPa", f"judgement; form of {J3}")
        else:
            g, given = _grade(f, AISC_BOLTS, "A307")
            Fnv = t.add(f"Fnv,{tag}", f"nominal shear stress, bolt {g}"
                        + ("" if given else " (grade not recorded: the weakest common grade)"),
                        "Table J3.2", AISC_BOLTS[g] * KSI, "MPa",
                        J3 + ("" if given else "; common practice"))
        shear = t.add(f"Rn,v,{tag}", f"single shear of one fastener ({who})", "Fnv Ab", Fnv * Ab,
                      "N", J3)
        dh = _hole(d)
        bear = 2.4 * d * t_ply * fu_ply
        end = min(bear, 1.2 * (e - dh / 2) * t_ply * fu_ply)
        inner = min(bear, 1.2 * (p - dh) * t_ply * fu_ply) if n > 1 else 0.0
        t.add(f"Rn,b,{tag}", f"bearing and tearout of the end fastener (t {t_ply:.1f} mm, Fu "
              f"{fu_ply:.0f} MPa)", "min(2.4 d t Fu, 1.2 (e - dh/2) t Fu)", end, "N", f"{J310} (J3-6a), (J3-6c)")
        one = min(shear, end)
        group = min(shear, end) + (n - 1) * min(shear, inner)
        R = t.add(f"R,joint,{tag}", f"{'design' if lrfd else 'allowable'} strength of the "
                  f"fasteners at one end ({who})", f"sum of min(shear, bearing, tearout), {how}",
                  k * group, "N", f"{J3}; {J310}")
        return float(R), float(k * one)
    d0 = _hole(d)
    if f.kind == "rivet":
        fur = _rivet_fu(f, t, tag)
        Fv = t.add(f"Fv,Rd,{tag}", f"single shear of one rivet ({who}, hole {d0:.0f} mm)",
                   "0.6 fur A0 / gamma_M2", 0.6 * fur * np.pi * d0**2 / 4 / GAMMA_M2, "N", T34)
        fub = fur
    else:
        g, given = _grade(f, EN_BOLTS, "4.6")
        fub, av = EN_BOLTS[g]
        As = STRESS_AREA.get(int(round(d)), 0.75 * np.pi * d**2 / 4) \
            if abs(d - round(d)) < 1e-6 else 0.75 * np.pi * d**2 / 4
        Fv = t.add(f"Fv,Rd,{tag}", f"single shear of one bolt {g}"
                   + ("" if given else " (grade not recorded: 4.6 taken)")
                   + f", threads in the shear plane ({who})", "alpha_v fub As / gamma_M2",
                   av * fub * As / GAMMA_M2, "N", T34 + ("" if given else "; common practice"))
    e2 = e if e2 is None else e2
    k1 = min(2.8 * e2 / d0 - 1.7, 2.5)
    fb = lambda ad: max(k1, 0.0) * min(ad, fub / fu_ply, 1.0) * fu_ply * d * t_ply / GAMMA_M2  # noqa: E731
    end = t.add(f"Fb,Rd,{tag}", f"bearing of the end fastener (t {t_ply:.1f} mm, fu "
                f"{fu_ply:.0f} MPa, e1 {e:.0f} mm, e2 {e2:.0f} mm)",
                "k1 alpha_b fu d t / gamma_M2, alpha_d = e1 / (3 d0)", fb(e / (3 * d0)), "N", T34)
    inner = fb(p / (3 * d0) - 0.25) if n > 1 else 0.0
    one = min(Fv, end)
    group = one + (n - 1) * min(Fv, inner)
    R = t.add(f"R,joint,{tag}", f"design resistance of the fasteners at one end ({who}), "
              "gamma_M2 = 1.25", "sum of min(Fv,Rd, Fb,Rd)", group, "N",
              f"{T34}; EN 1993-1-8 3.7 (1)")
    return float(R), float(one)


def batten_force(f: TieFasteners, V_b: float, M_b: float) -> float:
    """Force on the most loaded fastener of a batten's end (N): the shear V_b shared equally,
    the moment M_b elastically over a row along the column (pitch p; 3 d when not recorded).

    Example:
        >>> round(batten_force(TieFasteners(2, 20.0, pitch=60.0), 10e3, 1.2e6))
        20616
    """
    n, p = f.count, f.pitch if f.pitch is not None else 3 * f.diameter
    sum_y2 = p**2 * n * (n**2 - 1) / 12
    return float(np.hypot(V_b / n, M_b * p * (n - 1) / 2 / sum_y2))


__all__ = ["AISC_BOLTS", "EN_BOLTS", "batten_force", "group_strength"]
