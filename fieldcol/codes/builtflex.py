"""Flexural strength of a two-channel column tied by lacing, battens or stitches, for the
beam-column checks (``codes.beamcolumn``).

The two channels are the chords. The composite is not an I shape (it has no web between the
chords), so the I-shape rules of Chapter F and 6.3.2 are not used for it; instead:

* About the solid axis (each channel bends about its own strong axis): the member's strength is
  twice one channel's, AISC 360-22 F2 (which covers channels bent about their major axis;
  compact flanges and web, B4.1b) or EN 1993-1-1 6.2.5 with chi_LT of 6.3.2.2 (curve d, other
  cross-sections, Table 6.4). Unbraced length: the ties hold the channels to each other, not
  against twisting together (no diaphragms are recorded), so each channel is taken as free to
  buckle laterally over the member's twist length, never less than one panel:
  Lb = max(a, Lc,twist), Cb (C1) = 1.0. Conservative: the composite action of the laced faces
  is left out (a judgement, said in the trace).
* About the open axis (the chords apart): the moment is carried by the chord forces,
  M = N_ch h0; the strength is the compressed chord's over one panel: AISC Pn,ch h0 with Pn,ch
  from E3 at a / ri (a statics-based limit, a judgement: AISC gives no rule); EN the chord
  force of 6.4.1 (6.69) with M_Ed^I, checked against N_b,Rd of the chord over a panel.
* Each chord is also checked as a beam-column: its axial force P/2 + M_open / h0 with its half of
  the solid-axis moment (AISC H1-1a/b; EN with k = 1 + 0.8 n, the upper bound of Table B.1,
  covering (6.61) and (6.62) with the chord's least-axis buckling).

Other built-up arrangements under moments: ``angles-web`` is an I (the Chapter F / 6.3.2 I rules
apply); ``angles-box``, ``angles-star`` and boxed channels are not covered (no number, a warning).
Formulas recalled from the standards are from memory; the tests name their checks.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fieldcol.sections._builtup import BuiltUp, OpenAxis
from fieldcol.sections._parts import Part
from fieldcol.trace import Trace

from .builtup import effective_inertia, shear_stiffness
from .en1993 import reduction_factor
from ._flexure import elastic_lt_moment

F2 = "AISC 360-22 F2"
JUDGE = "judgement: statics of the chords"


@dataclass
class ChordFlexure:
    """The flexural strengths of a tied two-channel column.

    Args:
        solid, open: the axis each channel bends about its own strong axis, and the open axis.
        Mn: per axis, AISC the member's nominal flexural strength (N*mm); EN the design moment
            resistance with chi_LT and gamma_M1.
        Pch: AISC the nominal axial strength of one chord over a panel; EN N_b,Rd of one chord
            over a panel (N).
        Mch: one channel's flexural strength about its own strong axis (as Mn).
        h0: distance between the chords' centroids (mm); axis: the open-axis record.
        out: why the strength is not covered ("" when covered).

    Example:
        >>> ChordFlexure("strong", "weak", {"strong": 1.0, "weak": 2.0}, 3.0, 0.5, 100.0, None).h0
        100.0
    """

    solid: str
    open: str
    Mn: dict[str, float]
    Pch: float
    Mch: float
    h0: float
    axis: OpenAxis | None
    out: str = ""


def covered(built: BuiltUp) -> str:
    """Why the engine gives no flexural strength for this built-up section ("" when it does):
    ``channels`` tied at points (lacing, battens, stitches) and ``angles-web`` are covered.

    Example:
        >>> from fieldcol.sections._builtup import angles_star
        >>> covered(angles_star(Part("angle", 100, 100, 10, 10), 10, 600))[:11]
        'angles-star'
    """
    if built.arrangement == "angles-web" or (built.arrangement == "channels" and built.open_axes):
        return ""
    what = {"angles-box": "angles-box (four laced or battened chords)",
            "angles-star": "angles-star (a cross of angles)",
            "channels": "channels boxed by cover plates"}.get(built.arrangement, built.arrangement)
    return (f"{what}: flexural strength of this built-up arrangement is not modelled here "
            "(AISC 360-22 Chapter F / EN 1993-1-1 6.3.2 give no rule for it); no beam-column strength")


def channel_warping(ch: Part) -> float:
    """Warping constant of a channel, Cw = tf b'^3 h'^2 / 12 (3 b' tf + 2 h' tw) / (6 b' tf + h' tw),
    b' = bf - tw/2, h' = d - tf (thin-walled, from memory), mm^6.

    Example:
        >>> round(channel_warping(Part("channel", 12.0, 2.94, 0.501, 0.282)), 1)   # C12X20.7, in^6
        111.0
    """
    b, h = ch.b - ch.tw / 2, ch.d - ch.tf
    return ch.tf * b**3 * h**2 / 12 * (3 * b * ch.tf + 2 * h * ch.tw) / (6 * b * ch.tf + h * ch.tw)


def _channel_props(ch: Part) -> dict[str, float]:
    own = ch.own()
    A, Ix, Iy = own["A"], own["Ix"], own["Iy"]
    # plastic modulus as thin rectangles, fillets left out (on the safe side)
    Zx = ch.b * ch.tf * (ch.d - ch.tf) + ch.tw * (ch.d - 2 * ch.tf) ** 2 / 4
    return {"A": A, "Ix": Ix, "Iy": Iy, "Sx": Ix / (ch.d / 2), "Zx": Zx, "ry": float(np.sqrt(Iy / A)),
            "J": ch.J, "Cw": channel_warping(ch), "ho": ch.d - ch.tf,
            "flange": ch.b / ch.tf, "web": (ch.d - 2 * (ch.tf + ch.r1)) / ch.tw}


def _axes(built: BuiltUp) -> tuple[str, str, OpenAxis]:
    ax = built.open_axes[0]
    return ("weak" if ax.axis == "strong" else "strong"), ax.axis, ax


def _lb(ax: OpenAxis, Lc_twist: float, t: Trace) -> float:
    return t.add("Lb,ch", "unbraced length of one channel for lateral-torsional buckling",
                 "max(a, Lc,twist): the ties hold the channels to each other, not against twisting "
                 "together (no diaphragms recorded): each channel over the member's twist length "
                 "(conservative, composite action left out)", max(ax.a, Lc_twist), "mm",
                 f"{F2}.2; judgement")


def aisc_chord_flexure(built: BuiltUp, Fy: float, E: float, Lc_twist: float, t: Trace) -> ChordFlexure:
    """AISC 360-22: the tied two-channel column's nominal flexural strengths (see the module notes).

    One channel, F2 with Cb = 1.0 (from memory): Mp = Fy Zx; Lp = 1.76 ry sqrt(E/Fy);
    rts^2 = sqrt(Iy Cw) / Sx; c = (ho/2) sqrt(Iy/Cw) (F2-8b); Lr = 1.95 rts E/(0.7 Fy)
    sqrt(Jc/(Sx ho) + sqrt((Jc/(Sx ho))^2 + 6.76 (0.7 Fy/E)^2)); Lp < Lb <= Lr:
    Mp - (Mp - 0.7 Fy Sx)(Lb - Lp)/(Lr - Lp); Lb > Lr: Fcr Sx <= Mp, Fcr = pi^2 E/(Lb/rts)^2
    sqrt(1 + 0.078 Jc/(Sx ho) (Lb/rts)^2). Open axis: Pn,ch h0, Pn,ch = Fcr(a/ri) Ach (E3).

    Example:
        >>> from fieldcol.sections._builtup import Battens, channels
        >>> b = channels(Part("channel", 304.8, 74.7, 12.7, 7.2), 152.4, tie=Battens(610, 203, 9.5))
        >>> cf = aisc_chord_flexure(b, 227.5, 2e5, 5486.4, Trace())
        >>> cf.solid, cf.open, cf.out
        ('strong', 'weak', '')
    """
    solid, op, ax = _axes(built)
    ch = built.parts[0]
    p = _channel_props(ch)
    root = np.sqrt(E / Fy)
    name = ch.name or "channel"
    t.add("rule,flexure", f"two {name} chords: {solid} axis twice one channel's F2 strength; {op} axis "
          "the chord forces, M = Pn,ch h0; each chord also checked as a beam-column", "", "", "",
          f"{F2}; AISC 360-22 E3, H1.1; {JUDGE}")
    lpf = 0.38 * root
    lpw = 3.76 * root
    t.add("bf/tf,ch", f"channel flange, compact in flexure when <= {lpf:.1f}", "bf / tf", p["flange"], "",
          "AISC 360-22 Table B4.1b case 10")
    t.add("h/tw,ch", f"channel web, compact in flexure when <= {lpw:.1f}", "h / tw", p["web"], "",
          "AISC 360-22 Table B4.1b case 15")
    out = ""
    if p["flange"] > lpf or p["web"] > lpw:
        out = ("a channel chord's flange or web is noncompact in flexure: AISC 360-22 F2 covers compact "
               "channels only; no beam-column strength")
    Mp = t.add("Mp,ch", "plastic moment of one channel", "Fy Zx, Zx = bf tf (d - tf) + tw (d - 2 tf)^2 / 4",
               Fy * p["Zx"], "N*mm", f"{F2}.1 (F2-1)")
    Lb = _lb(ax, Lc_twist, t)
    Lp = t.add("Lp,ch", "limiting length, yielding (one channel)", "1.76 ry sqrt(E/Fy)", 1.76 * p["ry"] * root,
               "mm", f"{F2}.2 (F2-5)")
    rts = t.add("rts,ch", "effective radius of gyration (one channel)",
                "sqrt(sqrt(Iy Cw) / Sx), Cw = tf b'^3 h'^2 / 12 (3 b' tf + 2 h' tw)/(6 b' tf + h' tw)",
                float(np.sqrt(np.sqrt(p["Iy"] * p["Cw"]) / p["Sx"])), "mm", f"{F2}.2 (F2-7)")
    c = t.add("c,ch", "channel coefficient", "(ho/2) sqrt(Iy / Cw)", p["ho"] / 2 * np.sqrt(p["Iy"] / p["Cw"]),
              "", f"{F2}.2 (F2-8b)")
    jc = p["J"] * c / (p["Sx"] * p["ho"])
    Lr = t.add("Lr,ch", "limiting length, inelastic LTB (one channel)",
               "1.95 rts E/(0.7 Fy) sqrt(Jc/(Sx ho) + sqrt((Jc/(Sx ho))^2 + 6.76 (0.7 Fy/E)^2))",
               1.95 * rts * E / (0.7 * Fy) * np.sqrt(jc + np.sqrt(jc**2 + 6.76 * (0.7 * Fy / E) ** 2)),
               "mm", f"{F2}.2 (F2-6)")
    My = 0.7 * Fy * p["Sx"]
    if Lb <= Lp:
        M1 = Mp
    elif Lb <= Lr:
        M1 = min(Mp, Mp - (Mp - My) * (Lb - Lp) / (Lr - Lp))
    else:
        Fcr = np.pi**2 * E / (Lb / rts) ** 2 * np.sqrt(1 + 0.078 * jc * (Lb / rts) ** 2)
        M1 = min(Mp, Fcr * p["Sx"])
    Mch = t.add("Mn,ch", "flexural strength of one channel, Cb = 1.0",
                "Lb <= Lp: Mp; Lb <= Lr: Mp - (Mp - 0.7 Fy Sx)(Lb - Lp)/(Lr - Lp); else Fcr Sx <= Mp",
                float(M1), "N*mm", f"{F2}.2 (F2-2), (F2-3), (F2-4)")
    lam = ax.a / ax.ri
    Fe = np.pi**2 * E / lam**2
    Fcr_ch = 0.658 ** (Fy / Fe) * Fy if Fy / Fe <= 2.25 else 0.877 * Fe
    Pch = t.add("Pn,ch", f"nominal strength of one chord over a panel (a/ri {lam:.0f})", "Fcr Ach (E3, K = 1)",
                float(Fcr_ch * ax.Ach), "N", "AISC 360-22 E3, E6.1")
    Mn = {solid: t.add(f"Mn_{solid}", f"nominal flexural strength, {solid} axis (two channels)",
                       "2 Mn,ch", 2 * Mch, "N*mm", F2),
          op: t.add(f"Mn_{op}", f"nominal flexural strength, {op} axis (chord forces)",
                    "Pn,ch h0", Pch * ax.h0, "N*mm", f"AISC 360-22 E3; {JUDGE}")}
    return ChordFlexure(solid, op, Mn, Pch, Mch, ax.h0, ax, out)


def en_chord_flexure(built: BuiltUp, fy: float, E: float, G: float, Lc_twist: float, gamma_M1: float,
                     t: Trace) -> ChordFlexure:
    """EN 1993-1-1: the tied two-channel column's design moment resistances (see the module notes).

    One channel (from memory): Class from Table 5.2 with the flange bf/tf (full width: on the
    safe side) against 10 eps / 14 eps and the web h/tw against 83 eps / 124 eps (bending):
    W_pl (Class 1, 2) or W_el (Class 3); Class 4: not covered. chi_LT by 6.3.2.2 with
    Mcr = pi^2 E Iz / L^2 sqrt(Iw/Iz + L^2 G It / (pi^2 E Iz)), C1 = 1.0, and curve d
    (alpha_LT 0.76, Table 6.4, other cross-sections). Open axis: N_b,Rd,ch h0.

    Example:
        >>> from fieldcol.sections._builtup import Lacing, channels
        >>> b = channels(Part("channel", 300, 100, 16, 10), 150, tie=Lacing("single", 50, 10, 600))
        >>> cf = en_chord_flexure(b, 235.0, 2.1e5, 8.1e4, 5000.0, 1.0, Trace())
        >>> cf.out, round(float(cf.Mn[cf.open] / (cf.Pch * cf.h0)), 6)
        ('', 1.0)
    """
    solid, op, ax = _axes(built)
    ch = built.parts[0]
    p = _channel_props(ch)
    eps = np.sqrt(235.0 / fy)
    name = ch.name or "channel"
    t.add("rule,flexure", f"two {name} chords: {solid} axis twice one channel's resistance (6.2.5, "
          f"6.3.2.2); {op} axis the chord forces of 6.4.1 (6.69) with M_Ed^I; each chord also checked "
          "with its share of the moment", "", "", "", "EN 1993-1-1 6.2.5, 6.3.2.2, 6.4.1")
    f, w = p["flange"], p["web"]
    cls = 2 if (f <= 10 * eps and w <= 83 * eps) else 3 if (f <= 14 * eps and w <= 124 * eps) else 4
    t.add("class,ch", "class of one channel in bending (flange bf/tf, web h/tw)",
          "Table 5.2: outstand 10 eps / 14 eps, web in bending 83 eps / 124 eps", cls, "",
          "EN 1993-1-1 Table 5.2")
    out = "" if cls < 4 else ("a channel chord is Class 4 in bending: effective widths of a chord are "
                              "not modelled here; no beam-column strength")
    W = p["Zx"] if cls <= 2 else p["Sx"]
    MRk = t.add("M_Rk,ch", "characteristic moment resistance of one channel", "W_pl fy (Class 1, 2), W_el fy",
                W * fy, "N*mm", "EN 1993-1-1 6.2.5")
    Lb = _lb(ax, Lc_twist, t)
    Mcr = t.add("Mcr,ch", "elastic critical moment of one channel, C1 = 1.0",
                "pi^2 E Iz / L^2 sqrt(Iw/Iz + L^2 G It / (pi^2 E Iz))",
                float(elastic_lt_moment(E, G, p["Iy"], p["Cw"], p["J"], Lb)), "N*mm", "EN 1993-1-1 6.3.2.2 (2)")
    lb = t.add("lb,LT,ch", "slenderness for LTB (one channel)", "sqrt(M_Rk / Mcr)", float(np.sqrt(MRk / Mcr)),
               "", "EN 1993-1-1 6.3.2.2 (6.56)")
    chi = t.add("chi_LT,ch", "lateral-torsional reduction factor (one channel, curve d, alpha_LT 0.76)",
                "1 / (Phi_LT + sqrt(Phi_LT^2 - lb,LT^2)) <= 1", float(reduction_factor(lb, 0.76)), "",
                "EN 1993-1-1 6.3.2.2, Table 6.4 (other cross-sections: d)")
    Mch = t.add("M_Rd,ch", "design moment resistance of one channel", "chi_LT M_Rk / gamma_M1",
                chi * MRk / gamma_M1, "N*mm", "EN 1993-1-1 6.3.2.1")
    lam1 = np.pi * np.sqrt(E / fy)
    lbc = ax.a / ax.ri / lam1
    alpha = 0.34 if "angle" in ax.chord else 0.49
    Pch = t.add("Nb,Rd,ch", "buckling resistance of one chord over a panel (least axis, curve c)",
                "chi Ach fy / gamma_M1", float(reduction_factor(lbc, alpha)) * ax.Ach * fy / gamma_M1, "N",
                "EN 1993-1-1 6.3.1, 6.4.2.2 / 6.4.3.1")
    Mn = {solid: t.add(f"M_Rd_{solid}", f"design moment resistance, {solid} axis (two channels)", "2 M_Rd,ch",
                       2 * Mch, "N*mm", "EN 1993-1-1 6.3.2"),
          op: t.add(f"M_Rd_{op}", f"design moment resistance, {op} axis (chord forces)", "Nb,Rd,ch h0",
                    Pch * ax.h0, "N*mm", "EN 1993-1-1 6.4.1")}
    return ChordFlexure(solid, op, Mn, Pch, Mch, ax.h0, ax, out)


def en_chord_force(cf: ChordFlexure, N: np.ndarray, M1: np.ndarray, L: float, E: float) -> np.ndarray:
    """EN 1993-1-1 6.4.1 (6.69)-(6.71) (from memory) with the first-order moment M_Ed^I about the
    open axis: N_ch,Ed = 0.5 N + M_Ed h0 Ach / (2 Ieff), M_Ed = (N e0 + M_Ed^I) / (1 - N/Ncr - N/Sv),
    e0 = L / 500; infinite at or past the shear-flexible critical load (N).

    Example:
        >>> from fieldcol.sections._builtup import Lacing, channels
        >>> b = channels(Part("channel", 300, 100, 16, 10), 150, tie=Lacing("single", 50, 10, 600))
        >>> cf = en_chord_flexure(b, 235.0, 2.1e5, 8.1e4, 5000.0, 1.0, Trace())
        >>> float(en_chord_force(cf, np.zeros(1), np.zeros(1), 5000.0, 2.1e5)[0])
        0.0
    """
    ax = cf.axis
    Ieff, _ = effective_inertia(ax, L)
    Ncr = np.pi**2 * E * Ieff / L**2
    den = 1 - N / Ncr - N / shear_stiffness(ax, E)
    M = (N * L / 500 + M1) / np.where(den > 0, den, 1.0)
    return np.where(den > 0, 0.5 * N + M * ax.h0 * ax.Ach / (2 * Ieff), np.inf)


__all__ = ["ChordFlexure", "aisc_chord_flexure", "channel_warping", "covered", "en_chord_flexure",
           "en_chord_force"]
