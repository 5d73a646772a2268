"""A measured bow beyond the straightness tolerance, checked as a beam-column.

The column curves already allow for some out-of-straightness between supports. The default
allowance is L/1000 under every code: the AISC curve covers members within the L/1000
straightness tolerance of the standard of practice (AISC 303 6.4.1, from memory), and the
European curves were calibrated with an initial bow of L/1000 (common practice). A conservative
option takes L/1500 (the AISC Commentary to E3 relates its curve to a mean initial crookedness
near L/1470; from memory). Only the excess e = bow - L/n is then an eccentricity of the axial load
at mid-height, and the column is checked with the code's interaction equations:

- ``aisc360-22``: Mr = Pr e B1 with B1 = Cm / (1 - alpha Pr / Pe1) (Appendix 8, (A-8-3)) and
  Cm = 1.0 (for a half-sine initial bow the amplification 1/(1 - P/Pe) is exact: Timoshenko &
  Gere; there are no end moments to reduce it). Pe1 = pi^2 E I / L^2 with K1 = 1 on the member
  length and EI* = EI: the axial strength Pc comes from Chapter E with effective lengths, the
  method for which Appendix 8 takes EI* = EI (0.8 tau_b EI belongs to the direct analysis method).
  Mc from Chapter F (F2, F3, F4, F6, F7, F8; Cb = 1.0 and Lb = the twist length; I shapes with
  slender webs (F5) are refused with a warning). Interaction H1-1.
- ``en1993-1-1``: 6.3.3 (6.61) and (6.62) with the Annex B (method 2) factors: Table B.1 for hollow
  sections and weak-axis bending, Table B.2 (kzy) for an I bent about its strong axis;
  Cmy = Cmz = CmLT = 1.0 (conservative). M_Ed = N e is the first-order moment: the k factors and
  chi already carry the second-order amplification, so no separate 1/(1 - N/Ncr) is applied
  (it would count the effect twice). M_Rk = W_pl fy (Class 1, 2), W_el fy (Class 3) or W_eff fy
  (Class 4: EN 1993-1-5 effective widths under bending alone, the Class 3 factors of Annex B, and
  N_Rk = A_eff fy from the axial check; no shift moment, the sections being doubly symmetric).
  The class is that of the section in pure compression (conservative). A Class 4 circular hollow
  section is outside EN 1993-1-1 (NaN and a warning). In (6.62) chi_z is the lower of the
  weak-axis and the torsional buckling factors for open sections, so that with no excess the
  capacity is the axial resistance Nb,Rd.
- ``elastic``: the Perry-Robertson first-yield load with the whole measured bow as the
  imperfection (the method has none built in): sigma = fy se / (0.5 B + sqrt(0.25 B^2 - fy se)),
  B = fy + (1 + eta) se, eta = bow c / r^2, se = Pe/A with Pe about the bow axis from the elastic
  check (this is the classical formula rearranged so that it does not lose digits when eta is
  small).

In every code the capacity never exceeds the axial design strength of the same column, and it
equals it where there is no excess (elastic: no bow).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Any, Callable

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._section import Section
from fieldcol.trace import Trace

from ._en_class import classify
from ._flexure import aisc_flexure, en_effective_modulus, en_moment, largest_root
from .netflange import aisc_tension_flange, en_tension_flange
from ._inputs import non_negative, positive, prepare
from ._result import CodeResult, Warning
from .aisc360 import check_aisc360
from .elastic import check_elastic
from .en1993 import check_en1993

CODES = ("aisc360-22", "en1993-1-1", "elastic")
AXES = ("strong", "weak")
_BASES = ("lrfd", "asd")
# L/n of bow already inside each code's column curve by default (see the module notes)
TOLERANCE = {"aisc360-22": 1000.0, "en1993-1-1": 1000.0, "elastic": 1000.0}
#: the allowances a record may choose (``condition.bow_allowance``): the default and the
#: conservative option
ALLOWANCES = (1000.0, 1500.0)
H1 = "AISC 360-22 H1.1"
APP8 = "AISC 360-22 App. 8.2.1"
C633 = "EN 1993-1-1 6.3.3"
ANNEX_B = "EN 1993-1-1 Annex B"
_PR = "Perry-Robertson first yield (classical)"


@dataclass
class BowResult:
    """The beam-column check of a batch of bowed columns.

    Args:
        axis: ``"strong"`` or ``"weak"``, the axis about which the bow bends the column.
        excess: e = bow - L/n (mm; n = 1000 by default, 1500 the conservative option), 0 within it.
        Mc: available flexural strength about that axis (N*mm): phi_b Mn or Mn/Omega_b (AISC),
            chi_LT M_Rk / gamma_M1 (EN), first-yield moment Fy S (elastic).
        capacity: the largest axial force (N) that satisfies the interaction with the bow;
            NaN where the code gives none (with a warning).
        ratio: the interaction ratio at the demand Pr (None without a demand); <= 1 passes.
        trace: every step with its clause.
        warnings: conditions that apply to some columns.

    Example:
        >>> r = BowResult("weak", np.zeros(1), np.ones(1), np.ones(1), None, Trace())
        >>> r.axis, r.warnings
        ('weak', [])
    """

    axis: str
    excess: np.ndarray
    Mc: np.ndarray
    capacity: np.ndarray
    ratio: np.ndarray | None
    trace: Trace
    warnings: list[Warning] = field(default_factory=list)

    def warning(self, code: str) -> Warning | None:
        """The warning with this ``code``, or None.

        Example:
            >>> BowResult("weak", np.zeros(1), np.ones(1), np.ones(1), None, Trace()).warning("x") is None
            True
        """
        return next((w for w in self.warnings if w.code == code), None)


def check_bow(code: str, section: Section, Fy: Any, E: Any, G: Any, L: Any, Lc_strong: Any,
              Lc_weak: Any, Lc_twist: Any, bow: Any, axis: str = "weak", *, basis: str = "lrfd",
              gamma_M1: float = 1.0, Pr: Any = None, axial: CodeResult | None = None,
              allowance: float | None = None, holes: Any = None, Fu: float | None = None) -> BowResult:
    """Axial capacity of columns bowed beyond what the column curve allows for (L/1000 by
    default, L/1500 as the conservative option), by the code's beam-column interaction.

    Args:
        code: ``"aisc360-22"``, ``"en1993-1-1"`` or ``"elastic"``.
        section: cross-section(s), mm. Fy: yield stress (MPa; EN fy for the thickness).
        E, G: moduli (MPa). L: member length between supports over which the bow is measured (mm).
        Lc_strong, Lc_weak, Lc_twist: effective lengths (mm), as for the axial check; Lc_twist is
            also the laterally unbraced length for lateral-torsional buckling.
        bow: measured mid-height out-of-straightness (mm, >= 0).
        axis: ``"weak"`` (default) or ``"strong"``: the axis the bow bends the column about.
        basis: AISC ``"lrfd"`` (phi_b 0.90, alpha 1.0) or ``"asd"`` (Omega_b 1.67, alpha 1.6);
            no effect for EN and elastic.
        gamma_M1: EN partial factor (single value >= 1).
        Pr: axial demand (N, >= 0) on the same basis, or None.
        axial: the ``CodeResult`` of the same columns under the same code (reused for Pc, chi,
            Pe); computed here when None (EN: without the S460 curves, pass it for S460).
        allowance: n of the L/n already in the column curve (1000 default, 1500 conservative).
    Returns:
        a ``BowResult``; arrays take the batch shape of the inputs.
    Raises:
        InputError: bad values, unknown code/axis/basis, an ``axial`` that does not match,
            naming the field.

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> s = from_catalogue("W14X90")
        >>> r = check_bow("aisc360-22", s, 345.0, 200000.0, 77200.0, 4877.0, 4877.0, 4877.0, 4877.0,
        ...               [0.0, 28.6])
        >>> [round(float(c) / 1e3) for c in r.capacity]
        [4346, 3252]
    """
    if not isinstance(code, str) or code not in CODES:
        raise InputError("code", code, "unknown code", ", ".join(CODES))
    if not isinstance(axis, str) or axis not in AXES:
        raise InputError("axis", axis, "unknown axis", "strong or weak: the axis the bow bends the column about")
    if not isinstance(basis, str) or basis not in _BASES:
        raise InputError("basis", basis, "unknown design basis", "lrfd or asd")
    g = positive("gamma_M1", gamma_M1, "a partial factor such as 1.0 or 1.1")
    if g.ndim or g < 1.0:
        raise InputError("gamma_M1", repr(gamma_M1), "must be a single factor of at least 1.0",
                         "1.0 recommended by EN 1993-1-1 6.1; see the National Annex")
    gamma = float(g)

    sec, v, shape0 = prepare(section, Fy=Fy, E=E, G=G, L=L, Lc_strong=Lc_strong, Lc_weak=Lc_weak,
                             Lc_twist=Lc_twist)
    bow_a = non_negative("bow", bow, "give the measured out-of-straightness in mm (0 or more)")
    Pr_a = None if Pr is None else non_negative("Pr", Pr, "give the axial demand in N (0 or more)")
    full = shape0
    for name, a in (("bow", bow_a), ("Pr", Pr_a)):
        if a is None:
            continue
        try:
            full = np.broadcast_shapes(full, a.shape)
        except ValueError:
            raise InputError(name, f"array of shape {a.shape}", f"does not match the batch of shape {full}",
                             "give one value per column, or a single value for all") from None
    inner = full or (1,)

    sec = {k: _spread(a, shape0, full) for k, a in sec.items()}
    v = {k: _spread(a, shape0, full) for k, a in v.items()}
    bow_b = np.broadcast_to(bow_a, full).reshape(inner)
    Pr_b = None if Pr_a is None else np.broadcast_to(Pr_a, full).reshape(inner)
    kind = section.kind
    # the bending properties this check uses must be real numbers: a NaN would pass unseen
    for name in _bending_properties(code, kind, axis):
        a = positive(f"section.{name}", getattr(section, name))
        sec[name] = np.broadcast_to(a, full).reshape(inner)

    if axial is None:
        axial = _axial(code, section, Fy, E, G, Lc_strong, Lc_weak, Lc_twist, basis, gamma)
    _match(axial, code, basis, gamma)

    def ax(a: Any, what: str) -> np.ndarray:
        try:
            return np.broadcast_to(np.asarray(a, dtype=float), full).reshape(inner)
        except ValueError:
            raise InputError("axial", f"{what} of shape {np.shape(a)}", f"does not match the batch of shape {full}",
                             "pass the axial check of the same columns") from None

    t = Trace()
    Lm = v["L"]
    t.add("L", "member length between supports (bow measured over it)", "", Lm, "mm", "record")
    t.add("bow", f"measured out-of-straightness at mid-height, bending about the {axis} axis", "measured",
          bow_b, "mm", "record")
    n = TOLERANCE[code] if allowance is None else float(allowance)
    if n not in ALLOWANCES:
        raise InputError("condition.bow_allowance", f"L/{n:g}", "unknown allowance",
                         "L/1000 (default) or L/1500 (conservative)")
    tol = t.add("e_tol", "out-of-straightness already in the column curve"
                + (" (default: the straightness tolerance)" if n == 1000 else " (conservative option)"),
                f"L/{n:g}", Lm / n, "mm",
                "AISC 303 6.4.1 straightness tolerance L/1000" if n == 1000
                else "AISC 360-22 Commentary E3, crookedness near L/1470")
    e = t.add("e", "excess bow: eccentricity of the axial load at mid-height", f"max(bow - L/{n:g}, 0)",
              np.maximum(bow_b - tol, 0.0), "mm", "common practice")
    warnings: list[Warning] = []
    big = np.asarray(bow_b > Lm / 20)
    if big.any():
        warnings.append(Warning("bow-very-large", "measured bow exceeds L/20: check the entry (units?); "
                                "the formulas assume a nearly straight member", big))

    if code == "aisc360-22":
        Mn_cap = None
        if holes is not None and holes.axis == axis:
            Mn_cap = lambda Mn: aisc_tension_flange(holes, v["Fy"], Fu, sec["Sx" if axis == "strong" else "Sy"],  # noqa: E731
                                                    Mn, t)
        Mc, capacity, ratio, out = _aisc(kind, axis, sec, v, e, Pr_b, basis, ax(axial.design, "design"), t,
                                         Mn_cap)
        if (out & (e > 0)).any():
            warnings.append(Warning("flexure-not-covered",
                                    "flexural strength not covered here for this section and axis "
                                    "(I with a slender web: AISC 360-22 F5; rectangular HSS with a slender web; "
                                    "round HSS D/t >= 0.45 E/Fy): no capacity with the bow", out & (e > 0)))
    elif code == "en1993-1-1":
        modes = {k: (ax(m.Pn, f"modes[{k}].Pn"), None if m.slenderness is None else ax(m.slenderness, k))
                 for k, m in axial.modes.items()}
        Mc_cap = None
        if holes is not None and holes.axis == axis:
            Mc_cap = lambda Mc: en_tension_flange(holes, v["Fy"], Fu, sec["Sx" if axis == "strong" else "Sy"],  # noqa: E731
                                                  Mc, t)
        Mc, capacity, ratio, cls4 = _en(kind, axis, sec, v, e, Pr_b, gamma, modes,
                                       ax(axial.design, "design"), t, Mc_cap)
        if (cls4 & (e > 0)).any():
            warnings.append(Warning("class-4", "Class 4 circular hollow section: outside EN 1993-1-1 "
                                    "(EN 1993-1-6); no capacity with the bow", cls4 & (e > 0)))
    else:
        Pe = ax(axial.modes[f"flexural-{axis}"].Pe, "Pe")
        Mc, capacity, ratio = _elastic(axis, sec, v, bow_b, Pr_b, Pe, ax(axial.design, "design"), t)

    for w in warnings:
        w.mask = _out(np.asarray(w.mask), full)
    return BowResult(axis, _out(e, full), _out(Mc, full), _out(capacity, full),
                     None if ratio is None else _out(ratio, full), _shaped(t, full), warnings)


# ---- the three codes ---------------------------------------------------------------------------

def _aisc(kind, axis, sec, v, e, Pr, basis, Pc, t, Mn_cap=None):
    Fy, E = v["Fy"], v["E"]
    Mn, out = aisc_flexure(kind, axis, sec, Fy, E, v["Lc_twist"], t)
    if Mn_cap is not None:      # fastener holes in the tension flange (AISC 360-22 F13.1)
        Mn = Mn_cap(Mn)
    lrfd = basis == "lrfd"
    Mc = t.add("Mc", "available flexural strength", "phi_b Mn, phi_b = 0.90" if lrfd else
               "Mn / Omega_b, Omega_b = 1.67", 0.90 * Mn if lrfd else Mn / 1.67, "N*mm", "AISC 360-22 F1")
    t.add("Pc", "available axial strength (governing mode)", "phi_c Pn or Pn / Omega_c", Pc, "N",
          "AISC 360-22 E1")
    I = sec["Ix"] if axis == "strong" else sec["Iy"]
    Pe1 = t.add("Pe1", "elastic critical load in the plane of the bow", "pi^2 EI* / (K1 L)^2, EI* = EI, K1 = 1",
                np.pi**2 * E * I / v["L"] ** 2, "N", f"{APP8} (A-8-5)")
    t.add("Cm", "equivalent uniform moment factor", "1.0 (half-sine initial bow: 1/(1 - P/Pe) is exact)", 1.0,
          "", f"{APP8} (A-8-4)")
    alpha = t.add("alpha", "force level adjustment factor", "1.0 LRFD, 1.6 ASD", 1.0 if lrfd else 1.6, "",
                  APP8)
    bent = e > 0

    def B1(P):
        # past alpha P = Pe1 the member is unstable in the plane of the bow: no finite amplifier
        den = 1.0 - alpha * P / Pe1
        return np.where(den > 0, 1.0 / np.where(den > 0, den, 1.0), np.inf)

    def interaction(P):
        Mr = np.where(bent, P * e * B1(P), 0.0)
        m = np.where(bent, Mr / Mc, 0.0)
        p = P / Pc
        return np.where(p >= 0.2, p + 8.0 / 9.0 * m, p / 2.0 + m)

    capacity = _capacity(interaction, Pc, bent, Mc, t,
                         "largest Pr with H1-1 <= 1, Mr = Pr e B1(Pr) (bisection)", f"{H1} (H1-1a), (H1-1b)")
    with np.errstate(divide="ignore", invalid="ignore"):
        B1c = t.add("B1@cap", "amplifier at the capacity", "Cm / (1 - alpha P / Pe1)", B1(capacity), "",
                    f"{APP8} (A-8-3)")
        t.add("Mr@cap", "second-order moment at the capacity", "P e B1", capacity * e * B1c, "N*mm",
              f"{APP8} (A-8-1)")
        ratio = None
        if Pr is not None:
            t.add("Pr", "required axial strength", "given", Pr, "N", "demand")
            b1 = t.add("B1", "P-delta amplifier at the demand", "Cm / (1 - alpha Pr / Pe1) >= 1", B1(Pr), "",
                       f"{APP8} (A-8-3)")
            t.add("Mr", "required flexural strength from the bow", "Pr e B1", np.where(bent, Pr * e * b1, 0.0),
                  "N*mm", f"{APP8} (A-8-1)")
            t.add("Pr/Pc", "axial ratio", "Pr / Pc", Pr / Pc, "", H1)
            ratio = t.add("ratio", "interaction ratio",
                          "Pr/Pc >= 0.2: Pr/Pc + 8/9 Mr/Mc; else Pr/(2 Pc) + Mr/Mc; >= Pr/Pc",
                          _ratio(interaction, Pr, bent, Mc, Pc), "", f"{H1} (H1-1a), (H1-1b)")
    return Mc, capacity, ratio, out


def _en(kind, axis, sec, v, e, Pr, gamma, modes, design, t, Mc_cap=None):
    fy, E, G = v["Fy"], v["E"], v["G"]
    eps = np.sqrt(235.0 / fy)
    cls, _ = classify(kind, sec, eps, Trace())
    t.add("class", "section class in compression (used for bending: conservative)", "Table 5.2", cls, "",
          "EN 1993-1-1 Table 5.2")
    cls4 = np.asarray(cls == 4)
    Weff = en_effective_modulus(kind, axis, sec, eps, t) if cls4.any() else None
    M_Rk, chi_LT = en_moment(kind, axis, sec, cls, fy, E, G, v["Lc_twist"], t, Weff)
    cls4 = cls4 & np.isnan(M_Rk)          # Class 4 left without an effective modulus
    Mc = t.add("Mc", "design moment resistance used in 6.3.3", "chi_LT M_Rk / gamma_M1", chi_LT * M_Rk / gamma,
               "N*mm", f"{C633} (6.61), (6.62)")
    if Mc_cap is not None:      # fastener holes in the tension flange (EN 1993-1-1 6.2.5 (4))
        Mc = Mc_cap(Mc)
    NRk = t.add("N_Rk", "characteristic axial resistance", "A fy (Aeff fy for Class 4)", modes["yield"][0], "N",
                "EN 1993-1-1 6.3.3")
    chi_y = t.add("chi_y", "flexural buckling factor, strong axis", "Nb,strong / N_Rk",
                  modes["flexural-strong"][0] / NRk, "", "EN 1993-1-1 6.3.1.2")
    chi_z = modes["flexural-weak"][0] / NRk
    if kind == "i":
        chi_z = np.minimum(chi_z, modes["torsional"][0] / NRk)
    chi_z = t.add("chi_z", "buckling factor, weak axis (open sections: or torsional, the lower)",
                  "min(Nb,weak, Nb,torsion) / N_Rk", chi_z, "", "EN 1993-1-1 6.3.1.2, 6.3.1.4")
    lb_y, lb_z = modes["flexural-strong"][1], modes["flexural-weak"][1]
    t.add("Cm", "equivalent uniform moment factors Cmy = Cmz = CmLT", "1.0 (conservative)", 1.0, "",
          f"{ANNEX_B} Table B.3")
    Ny, Nz = chi_y * NRk / gamma, chi_z * NRk / gamma
    c12 = cls <= 2
    torsion = kind == "i" and axis == "strong"     # Table B.2: I members that can twist laterally
    bent = e > 0

    def factors(N):
        ny, nz = N / Ny, N / Nz
        kyy = np.where(c12, np.minimum(1 + (lb_y - 0.2) * ny, 1 + 0.8 * ny),
                       np.minimum(1 + 0.6 * lb_y * ny, 1 + 0.6 * ny))
        if kind == "i":
            kzz12 = np.minimum(1 + (2 * lb_z - 0.6) * nz, 1 + 1.4 * nz)
        else:
            kzz12 = np.minimum(1 + (lb_z - 0.2) * nz, 1 + 0.8 * nz)
        kzz = np.where(c12, kzz12, np.minimum(1 + 0.6 * lb_z * nz, 1 + 0.6 * nz))
        if axis == "strong":
            if torsion:
                # CmLT = 1.0: 1/(CmLT - 0.25) = 4/3
                k12 = np.where(lb_z < 0.4, np.minimum(0.6 + lb_z, 1 - 0.1 * lb_z * nz / 0.75),
                               np.maximum(1 - 0.1 * lb_z * nz / 0.75, 1 - 0.1 * nz / 0.75))
                k3 = np.maximum(1 - 0.05 * lb_z * nz / 0.75, 1 - 0.05 * nz / 0.75)
                kzy = np.where(c12, k12, k3)
            else:
                kzy = np.where(c12, 0.6 * kyy, 0.8 * kyy)
            return kyy, kzy        # (6.61), (6.62) factors on My
        kyz = np.where(c12, 0.6 * kzz, kzz)
        return kyz, kzz            # (6.61), (6.62) factors on Mz

    def both(N):
        k61, k62 = factors(N)
        m = np.where(bent, N * e / Mc, 0.0)
        return N / Ny + k61 * m, N / Nz + k62 * m

    def interaction(N):
        a, b = both(N)
        return np.maximum(a, b)

    k1, k2 = ("kyy", "kzy") if axis == "strong" else ("kyz", "kzz")
    t.add("k", f"interaction factors {k1}, {k2}",
          ("Table B.1 kyy; Table B.2 kzy (I), Table B.1 0.6/0.8 kyy (hollow)" if axis == "strong" else
           "Table B.1 kzz (I: 2 lb_z - 0.6; hollow: lb_z - 0.2), kyz = 0.6 kzz (Class 1, 2) or kzz (Class 3)"),
          "", "", f"{ANNEX_B} Tables B.1, B.2")
    capacity = _capacity(interaction, design, bent, Mc, t,
                         "largest N with (6.61) and (6.62) <= 1, M_Ed = N e (bisection)", f"{C633} (6.61), (6.62)")
    capacity = np.where(bent & cls4, np.nan, capacity)
    ratio = None
    if Pr is not None:
        t.add("N_Ed", "design axial force", "given", Pr, "N", "demand")
        t.add("M_Ed", "first-order moment from the excess bow", "N_Ed e", Pr * e, "N*mm", C633)
        ka, kb = factors(Pr)
        t.add(k1, f"interaction factor {k1} at N_Ed", "Annex B", ka, "", f"{ANNEX_B}")
        t.add(k2, f"interaction factor {k2} at N_Ed", "Annex B", kb, "", f"{ANNEX_B}")
        u61, u62 = both(Pr)
        t.add("(6.61)", "interaction, strong-axis buckling", "N/(chi_y N_Rk/gM1) + k M/Mc", u61, "",
              f"{C633} (6.61)")
        t.add("(6.62)", "interaction, weak-axis buckling", "N/(chi_z N_Rk/gM1) + k M/Mc", u62, "",
              f"{C633} (6.62)")
        r = np.where(bent & (cls4 | np.isnan(Mc)), np.nan, np.maximum(u61, u62))
        ratio = t.add("ratio", "interaction ratio", "max((6.61), (6.62))", np.maximum(r, Pr / design), "",
                      C633)
    return Mc, capacity, ratio, cls4


def _elastic(axis, sec, v, bow, Pr, Pe, design, t):
    Fy = v["Fy"]
    A = sec["A"]
    strong = axis == "strong"
    c = t.add("c", f"extreme fibre distance, {axis} axis", "d/2" if strong else "bf/2",
              (sec["d"] if strong else sec["bf"]) / 2, "mm", "section")
    r = sec["rx"] if strong else sec["ry"]
    S = sec["Sx"] if strong else sec["Sy"]
    Mc = t.add("My", f"first-yield moment, {axis} axis", "Fy S", Fy * S, "N*mm", _PR)
    eta = t.add("eta", "imperfection parameter (whole measured bow)", "bow c / r^2", bow * c / r**2, "", _PR)
    se = t.add("se", f"Euler stress, {axis} axis", "Pe / A", Pe / A, "MPa", _PR)
    B = Fy + (1 + eta) * se
    sigma = t.add("sigma", "first-yield mean stress",
                  "0.5 [fy + (1 + eta) se] - sqrt(0.25 [fy + (1 + eta) se]^2 - fy se) "
                  "(computed as fy se / (0.5 B + sqrt(0.25 B^2 - fy se)))",
                  Fy * se / (0.5 * B + np.sqrt(np.maximum(0.25 * B**2 - Fy * se, 0.0))), "MPa", _PR)
    # no bow: the elastic check itself (sigma A would repeat Pe/A x A with a rounding of its own)
    capacity = t.add("P", "capacity with the bow", "min(sigma A, axial capacity of the other modes); no bow: "
                     "the axial capacity", np.where(bow > 0, np.minimum(sigma * A, design), design), "N", _PR)
    ratio = None
    if Pr is not None:
        t.add("P_d", "axial demand", "given", Pr, "N", "demand")
        with np.errstate(divide="ignore", invalid="ignore"):
            amp = np.where(Pr < Pe, 1.0 / (1.0 - Pr / np.where(Pr < Pe, Pe, 1.0)), np.inf)
            fibre = t.add("sigma_max", "extreme fibre stress at mid-height", "P/A (1 + eta / (1 - P/Pe))",
                          Pr / A * (1 + np.where(eta > 0, eta * amp, 0.0)), "MPa", _PR)
            ratio = t.add("ratio", "first-yield ratio", "max(sigma_max / Fy, P / axial capacity)",
                          np.maximum(np.where(Pr > 0, fibre / Fy, 0.0), Pr / design), "", _PR)
    return Mc, capacity, ratio


# ---- shared pieces ------------------------------------------------------------------------------

def _capacity(interaction: Callable, Pc: np.ndarray, bent: np.ndarray, Mc: np.ndarray, t: Trace,
              formula: str, clause: str) -> np.ndarray:
    found = largest_root(interaction, Pc)
    # no excess: no moment, the axial strength itself; excess without a flexural strength: none
    cap = np.where(bent, np.where(np.isnan(Mc), np.nan, found), Pc)
    t.add("P", "axial capacity with the bow", formula + "; no excess: Pc", cap, "N", clause)
    return cap


def _ratio(interaction: Callable, P: np.ndarray, bent: np.ndarray, Mc: np.ndarray, Pc: np.ndarray) -> np.ndarray:
    # never below the axial ratio: (H1-1b) alone would report Pr/(2 Pc) for a straight column
    return np.where(bent & np.isnan(Mc), np.nan, np.maximum(interaction(P), P / Pc))


def _bending_properties(code: str, kind: str, axis: str) -> tuple[str, ...]:
    if code == "elastic":
        return ("Sx",) if axis == "strong" else ("Sy",)
    if kind == "round" and code == "aisc360-22":
        return ("Sx", "Zx")
    if kind == "i" and code == "aisc360-22" and axis == "strong":
        return ("Sx", "Zx", "ho")     # ho enters Lr and Fcr (F2-4), (F2-6)
    return ("Sx", "Zx") if axis == "strong" else ("Sy", "Zy")


def _axial(code, section, Fy, E, G, Lc_strong, Lc_weak, Lc_twist, basis, gamma) -> CodeResult:
    args = (section, Fy, E, G, Lc_strong, Lc_weak, Lc_twist)
    if code == "aisc360-22":
        return check_aisc360(*args, basis=basis)
    if code == "en1993-1-1":
        return check_en1993(*args, gamma_M1=gamma)
    return check_elastic(*args)


def _match(axial: Any, code: str, basis: str, gamma: float) -> None:
    if not isinstance(axial, CodeResult):
        raise InputError("axial", repr(type(axial).__name__), "is not a CodeResult",
                         "pass the result of check_aisc360 / check_en1993 / check_elastic, or None")
    if axial.code != code:
        raise InputError("axial", axial.code, f"is an axial check under another code than {code}",
                         "pass the axial check made under the same code")
    if code == "aisc360-22" and axial.basis != basis:
        raise InputError("axial", axial.basis, f"was made on the {axial.basis} basis, not {basis}",
                         "use the same design basis for both checks")
    if code == "en1993-1-1":
        with np.errstate(invalid="ignore"):
            ok = np.isclose(np.asarray(axial.design) * gamma, np.asarray(axial.nominal), rtol=1e-12)
        if not (ok | np.isnan(np.asarray(axial.nominal))).all():
            raise InputError("gamma_M1", repr(gamma), "differs from the factor of the axial check given",
                             "use the same gamma_M1 for both checks")


def _spread(a: np.ndarray, shape0: tuple, full: tuple) -> np.ndarray:
    """An array prepared for batch ``shape0`` (stored as (1,) for one column) spread to ``full``."""
    return np.broadcast_to(np.asarray(a).reshape(shape0), full).reshape(full or (1,))


def _out(a: np.ndarray, full: tuple) -> np.ndarray:
    return np.asarray(a).reshape(full) if not full else np.asarray(a)


def _shaped(t: Trace, full: tuple) -> Trace:
    if full:
        return t
    t.steps[:] = [replace(st, value=st.value.reshape(()) if isinstance(st.value, np.ndarray)
                          and st.value.shape == (1,) else st.value) for st in t.steps]
    return t


__all__ = ["AXES", "CODES", "BowResult", "check_bow"]
