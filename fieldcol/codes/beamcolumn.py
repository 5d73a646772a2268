"""Axial force with bending about both axes: AISC 360-22 Chapter H (H1-1a, H1-1b) with Chapter F
flexure, EN 1993-1-1 6.3.3 (6.61), (6.62) with the Annex B (method 2) interaction factors, and a
first-yield check for the ``elastic`` reference.

Under EN the section is classified under the actual N + M (Table 5.2: the web of an I by the
plastic alpha for Class 1/2 and the elastic psi for Class 3, at every trial load of the capacity),
Class 1-3 take A and W_pl / W_el, Class 4 Aeff and Weff (Table 6.7); chi_LT of an I follows 6.3.2.3
with C1 and k_c from the end moments where those are the only moments (C1 = k_c = 1 otherwise). Two
channels tied by lacing or battens (``built=``) keep their class in compression and take the chords'
moment resistances and the built-up slenderness instead (``codes.builtflex``).

The moments on a column as it stands come from four sources, each with its own second-order
treatment (N*mm, per axis):

- ``given``: required moments that already include second-order effects (AISC H1 expects
  them so); used as they are. Under EN they enter 6.3.3 as M_Ed as well: the k factors then
  amplify them again (conservative, said in the trace).
- ``ends``: the larger first-order end moment M2 (a beam reaction at an eccentricity at the top,
  end moments from a frame analysis): AISC B1 with Cm = 0.6 - 0.4 M1/M2 (``end_ratio``: M1/M2,
  positive in reverse curvature; 0, so Cm = 0.6, with one end moment alone); EN Cm = 0.6 + 0.4
  psi >= 0.4 with psi = -M1/M2 (Table B.3).
- ``bow``: an eccentricity e (mm) at mid-height, moment P e, Cm = 1.0 (AISC B1 exact for a
  half-sine bow; EN Cm 1.0, conservative).
- ``sway``: a measured out-of-plumb D (mm) of a column free to sway about that axis, moment
  P D at the held end, amplified by AISC B2 = 1/(1 - alpha P/Pe,story) (App. 8.2.2) or EN
  1/(1 - N/Ncr) (5.2.2 (5)B). With the story given (``sway_Pe``: the story's buckling load times
  the column's share of the story's gravity load) the amplifier is the story's; else the column's
  own load on Pe,story = pi^2 EI / Lc^2 of the column alone (said in the trace).

The largest moments of the four sources are added although they may act at different heights
(conservative). All moments scale with the axial force: the ``capacity`` is the largest axial
force, with every moment in proportion, at which the interaction equals 1.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from collections.abc import Mapping
from typing import Any

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._section import Section
from fieldcol.trace import Trace

from ._en_class import classify, web_thresholds, web_under_bending
from ._flexure import aisc_flexure, en_effective_modulus, en_moment, largest_root
from .en1993 import reduction_factor
from ._inputs import prepare
from .netflange import FlangeHoles, aisc_tension_flange, en_tension_flange
from ._result import CodeResult, Warning

AXES = ("strong", "weak")
SOURCES = ("given", "ends", "bow", "sway")
H1 = "AISC 360-22 H1.1"
APP8 = "AISC 360-22 App. 8.2"
C633 = "EN 1993-1-1 6.3.3"
ANNEX_B = "EN 1993-1-1 Annex B"
_FY = "first yield (classical)"


@dataclass
class BeamColumnResult:
    """The interaction check of a batch of columns under axial force and bending.

    Args:
        ratio: interaction value at the demand (H1-1a/b, max of (6.61), (6.62), or first yield),
            never below the axial ratio; NaN where the code gives no flexural strength.
        equation: which equation governs per column (``"H1-1a"``, ``"H1-1b"``, ``"6.61"``,
            ``"6.62"``, ``"first yield"``).
        capacity: the largest axial force (N) with the moments in proportion at which the
            interaction reaches 1.
        Mc: available flexural strength per axis (N*mm).
        Mr: required moment per axis at the demand (N*mm; EN: first-order M_Ed).
        trace, warnings: every step with its clause; conditions for some columns.

    Example:
        >>> r = BeamColumnResult(np.ones(1), np.array(["H1-1a"]), np.ones(1), {}, {}, Trace())
        >>> str(r.equation[0])
        'H1-1a'
    """

    ratio: np.ndarray
    equation: np.ndarray
    capacity: np.ndarray
    Mc: dict[str, np.ndarray]
    Mr: dict[str, np.ndarray]
    trace: Trace
    warnings: list[Warning] = field(default_factory=list)


def _pair(name: str, value: Any, n: int) -> dict[str, np.ndarray]:
    """Per-axis non-negative arrays from a mapping ``{"strong": .., "weak": ..}`` (missing: 0)."""
    value = value or {}
    if not isinstance(value, Mapping):
        raise InputError(name, repr(value), "must map strong / weak to values", '{"strong": 1e8}')
    out = {}
    for ax in AXES:
        a = np.asarray(value.get(ax, 0.0), dtype=float)
        if not np.all(np.isfinite(a)) or np.any(a < 0):
            raise InputError(f"{name}.{ax}", repr(value.get(ax)), "must be zero or a positive, finite number")
        out[ax] = np.broadcast_to(a, (n,)).astype(float) if a.ndim <= 1 else a
    return out


def check_beam_column(code: str, section: Section, Fy: Any, E: Any, G: Any, Pr: Any, axial: CodeResult,
                      *, span: Mapping[str, Any], Lc: Mapping[str, Any], moments: Mapping[str, Any],
                      basis: str = "lrfd", gamma_M1: float = 1.0, end_ratio: Mapping[str, Any] | None = None,
                      sway_Pe: Mapping[str, Any] | None = None, member_length: Any = None,
                      holes: FlangeHoles | None = None, Fu: float | None = None,
                      built: Any = None) -> BeamColumnResult:
    """Axial force with bending about both axes under the code of ``axial``.

    Args:
        code: ``"aisc360-22"``, ``"en1993-1-1"`` or ``"elastic"``.
        section: the cross-section(s); Fy, E, G: MPa (one value or one per column).
        Pr: the axial demand (N, > 0) on the basis of the check.
        axial: the axial ``CodeResult`` of the same columns (Pc, chi, slenderness).
        span: ``{"strong": mm, "weak": mm}`` length between points held against sway for B1 / Pe1.
        Lc: ``{"strong", "weak", "twist": mm}``: effective lengths (twist: the unbraced length for
            lateral-torsional buckling, Cb = 1.0); also Pe,story for the sway amplifier.
        moments: ``{"given" | "ends" | "bow" | "sway": {"strong": .., "weak": ..}}``: given and end
            moments in N*mm, bow eccentricity and out-of-plumb in mm (see the module notes).
        basis: AISC ``"lrfd"`` or ``"asd"``; gamma_M1: the EN partial factor.
        end_ratio: M1/M2 of the end moments per axis (positive in reverse curvature, -1..1);
            missing: 0 (one end moment, Cm = 0.6).
        sway_Pe: per axis, the buckling load the sway amplifier divides the column's force by (N);
            missing: the column's own (Pe,story = pi^2 EI / Lc^2).
        member_length: the length (mm) the end moments act over, for the EN moment diagram between
            twist restraints (psi of the worst segment, C1, k_c); missing: the twist length.
        holes: fastener holes across the tension flange of a riveted or bolted section
            (``netflange.FlangeHoles``): AISC 360-22 F13.1 / EN 1993-1-1 6.2.5 (4) cap the
            flexural strength about ``holes.axis``; Fu (MPa) is then required.
        built: the ``BuiltUp`` the section was composed from, if any: two channels tied at
            points get the chord rules of ``codes.builtflex``; an arrangement it does not cover
            gets no flexural strength (NaN, warning ``flexure-not-covered``).
    Returns:
        a ``BeamColumnResult`` with arrays of shape (n,).
    Raises:
        InputError: an unknown code or source, a negative value, no axial demand.

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> from fieldcol.codes import check_aisc360
        >>> s, L = from_catalogue("W14X99"), 14 * 304.8
        >>> ax = check_aisc360(s, 345.0, 2e5, 77200.0, L, L, L)
        >>> r = check_beam_column("aisc360-22", s, 345.0, 2e5, 77200.0, 400 * 4448.2, ax,
        ...     span={"strong": L, "weak": L}, Lc={"strong": L, "weak": L, "twist": L},
        ...     moments={"given": {"strong": 250 * 1.3558e6, "weak": 80 * 1.3558e6}})
        >>> str(r.equation[0]), round(float(r.ratio[0]), 2)
        ('H1-1a', 0.92)
    """
    unknown = set(moments) - set(SOURCES)
    if unknown:
        raise InputError("moments", ", ".join(sorted(unknown)), "unknown source of moment", ", ".join(SOURCES))
    sec, v, shape = prepare(section, Fy=Fy, E=E, G=G, Pr=Pr, **{f"span_{a}": span[a] for a in AXES},
                            **{f"Lc_{a}": Lc[a] for a in (*AXES, "twist")})
    n = int(np.prod(shape or (1,)))
    sec = {k: a.reshape(n) for k, a in sec.items()}
    v = {k: a.reshape(n) for k, a in v.items()}
    for name in ("Sx", "Sy", "Zx", "Zy", "ho"):
        sec[name] = np.broadcast_to(np.asarray(getattr(section, name), dtype=float), shape).reshape(n)
    M = {src: _pair(f"moments.{src}", moments.get(src), n) for src in SOURCES}
    ratio = {}
    for ax in AXES:
        r = np.broadcast_to(np.asarray((end_ratio or {}).get(ax, 0.0), dtype=float), (n,))
        if not np.all((r >= -1) & (r <= 1)):
            raise InputError(f"end_ratio.{ax}", repr((end_ratio or {}).get(ax)), "M1/M2 must lie from -1 to 1")
        ratio[ax] = r
    sway = None if not sway_Pe else {ax: np.broadcast_to(np.asarray(sway_Pe[ax], dtype=float), (n,))
                                     for ax in AXES}
    kind = section.kind
    t = Trace()
    Pr_ = t.add("Pr", "required axial strength", "demand", v["Pr"], "N", "demand")
    for src, what in (("given", "given moment (second order included)"), ("ends", "first-order end moment"),
                      ("bow", "eccentricity from the bow excess"), ("sway", "out-of-plumb of a sway column")):
        for ax in AXES:
            if np.any(M[src][ax] > 0):
                t.add(f"{src}_{ax}", f"{what}, {ax} axis", "record", M[src][ax],
                      "N*mm" if src in ("given", "ends") else "mm", "record")
    design = np.broadcast_to(np.asarray(axial.design, dtype=float), shape).reshape(n)
    if code in ("aisc360-22", "en1993-1-1") and built is not None:
        from .builtflex import covered

        why = covered(built)
        if why:
            return _not_covered(why, M, v, design, n, t)
    if code == "aisc360-22":
        return _aisc(kind, sec, v, M, design, Pr_, basis, t, ratio, sway, holes, Fu, built)
    if code == "en1993-1-1":
        return _en(kind, sec, v, M, axial, shape, n, Pr_, gamma_M1, design, t, ratio, sway, member_length,
                   holes, Fu, built)
    if code == "elastic":
        if holes is not None:
            t.add("note", "fastener holes in the tension flange: the first-yield reference uses the "
                  "gross section (rupture at the holes is a check of the codes)", "", "", "", _FY)
        return _elastic(sec, v, M, axial, shape, n, Pr_, design, t)
    raise InputError("code", code, "unknown code", "aisc360-22, en1993-1-1 or elastic")


def _I(sec: dict, ax: str) -> np.ndarray:
    return sec["Ix"] if ax == "strong" else sec["Iy"]


def _solve(g, Pr: np.ndarray, design: np.ndarray, Mc_nan: np.ndarray, t: Trace, formula: str,
           clause: str) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        # 64 halvings leave the bracket below one ulp of any capacity above 1e-4 of the axial one
        val, eq = g(Pr)
        # an interaction the rules cannot evaluate (NaN) is not covered: never a capacity of 0
        Mc_nan = Mc_nan | np.isnan(val)
        cap = np.where(Mc_nan, np.nan, largest_root(lambda P: g(P)[0], design, steps=64))
        ratio = np.where(Mc_nan, np.nan, np.maximum(val, Pr / design))
    t.add("P", "axial capacity with the moments in proportion", formula, cap, "N", clause)
    return cap, ratio, eq


def _aisc(kind, sec, v, M, Pc, Pr, basis, t, ratio, sway, holes=None, Fu=None, built=None):
    Fy, E = v["Fy"], v["E"]
    lrfd = basis == "lrfd"
    alpha = t.add("alpha", "force level adjustment factor", "1.0 LRFD, 1.6 ASD", 1.0 if lrfd else 1.6, "",
                  APP8)
    Mc, Pe1, Pe2, out = {}, {}, {}, np.zeros(Pc.shape, bool)
    cf = None
    if built is not None and built.arrangement == "channels":
        from .builtflex import aisc_chord_flexure

        cf = aisc_chord_flexure(built, float(Fy[0]), float(E[0]), float(v["Lc_twist"][0]), t)
    for ax in AXES:
        if cf is not None:
            Mn, o = np.full(Pc.shape, np.nan if cf.out else cf.Mn[ax]), np.full(Pc.shape, bool(cf.out))
        else:
            sub = Trace()
            Mn, o = aisc_flexure(kind, ax, sec, Fy, E, v["Lc_twist"], sub)
            t.steps += [s.__class__(f"{s.symbol}_{ax}" if s.symbol in ("Mn", "Mp") else s.symbol, s.what,
                                    s.formula, s.value, s.unit, s.clause) for s in sub.steps]
        out |= o & ((M["given"][ax] + M["ends"][ax] + M["bow"][ax] + M["sway"][ax]) > 0)
        if holes is not None and holes.axis == ax:
            Mn = aisc_tension_flange(holes, Fy, Fu, sec["Sx" if ax == "strong" else "Sy"], Mn, t)
        Mc[ax] = t.add(f"Mc_{ax}", f"available flexural strength, {ax} axis",
                       "phi_b Mn, phi_b = 0.90" if lrfd else "Mn / Omega_b, Omega_b = 1.67",
                       0.90 * Mn if lrfd else Mn / 1.67, "N*mm", "AISC 360-22 F1")
        Pe1[ax] = np.pi**2 * E * _I(sec, ax) / v[f"span_{ax}"] ** 2
        Pe2[ax] = np.pi**2 * E * _I(sec, ax) / v[f"Lc_{ax}"] ** 2 if sway is None else sway[ax]
        if cf is not None and ax == cf.open:
            # the ties' shear flexibility lowers the critical load the amplifiers divide by
            from .builtup import shear_stiffness

            Sv = t.add(f"Sv_{ax}", f"shear stiffness of the ties, {ax} (open) axis, for the amplifiers",
                       "EN 1993-1-1 6.4 Sv (as in the axial check)", shear_stiffness(cf.axis, float(E[0])), "N",
                       "elastic stability (Engesser)")
            Pe1[ax] = 1 / (1 / Pe1[ax] + 1 / Sv)
            if sway is None:
                Pe2[ax] = 1 / (1 / Pe2[ax] + 1 / Sv)
        # the amplifiers' loads are shown only where a moment they amplify is present
        if np.any(M["ends"][ax] + M["bow"][ax] > 0):
            t.add(f"Pe1_{ax}", f"elastic critical load in the plane of bending, {ax} axis",
                  "pi^2 EI / (K1 L)^2, K1 = 1, L between points held against sway (open axis of "
                  "tied chords: 1 / (1/Pe + 1/Sv))", Pe1[ax], "N",
                  f"{APP8}.1 (A-8-5)")
        if np.any(M["sway"][ax] > 0) and sway is None:
            t.add(f"Pe2_{ax}", f"story buckling load taken as the column's own, {ax} axis",
                  "pi^2 EI / Lc^2 (the story's other columns left out: conservative)", Pe2[ax], "N",
                  f"{APP8}.2 (A-8-7)")
    t.add("Pc", "available axial strength (governing mode)", "phi_c Pn or Pn / Omega_c", Pc, "N", "AISC 360-22 E1")
    Cm = {}
    for ax in AXES:
        Cm[ax] = 0.6 - 0.4 * ratio[ax]
        if np.any(M["ends"][ax] > 0):
            t.add(f"Cm_{ax}", f"equivalent uniform moment factor for the end moments, {ax} axis (bow: 1.0)",
                  "0.6 - 0.4 M1/M2 (M1/M2 > 0 in reverse curvature)", Cm[ax], "", f"{APP8}.1 (A-8-4)")

    def amp(P, Pe, Cm):
        den = 1.0 - alpha * P / Pe
        return np.where(den > 0, np.maximum(1.0, Cm / np.where(den > 0, den, 1.0)), np.inf)

    used = {(src, ax): bool(np.any(M[src][ax] > 0)) for src in SOURCES for ax in AXES}

    def Mr(P, ax):
        # only the sources this batch has: the bisection calls this some 160 times
        lam = P / Pr
        out = lam * M["given"][ax] if used[("given", ax)] else np.zeros(P.shape)
        if used[("ends", ax)]:
            out = out + amp(P, Pe1[ax], Cm[ax]) * lam * M["ends"][ax]
        if used[("bow", ax)]:
            out = out + np.where(M["bow"][ax] > 0, amp(P, Pe1[ax], 1.0) * P * M["bow"][ax], 0.0)
        if used[("sway", ax)]:
            out = out + np.where(M["sway"][ax] > 0, amp(P, Pe2[ax], 1.0) * P * M["sway"][ax], 0.0)
        return out

    def member(P):
        m = Mr(P, "strong") / Mc["strong"] + Mr(P, "weak") / Mc["weak"]
        p = P / Pc
        a = p >= 0.2
        return np.where(a, p + 8.0 / 9.0 * m, p / 2.0 + m), np.where(a, "H1-1a", "H1-1b")

    if cf is None:
        g = member
    else:
        factor = 0.90 if lrfd else 1 / 1.67
        Pch = t.add("Pc,ch", "available strength of one chord over a panel",
                    "phi_c Pn,ch" if lrfd else "Pn,ch / Omega_c", factor * cf.Pch, "N", "AISC 360-22 E1, E3")

        def chord(P):
            # the compressed chord: P/2 + M_open / h0 with half the solid-axis moment
            p = (P / 2 + Mr(P, cf.open) / cf.h0) / Pch
            m = Mr(P, cf.solid) / Mc[cf.solid]
            a = p >= 0.2
            return np.where(a, p + 8.0 / 9.0 * m, p / 2.0 + m)

        def g(P):
            val, eq = member(P)
            c = chord(P)
            return np.maximum(val, c), np.where(c > val, "H1-1 chord", eq)

        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            t.add("chord", "interaction of the compressed chord at the demand",
                  "p = (Pr/2 + Mr,open/h0)/Pc,ch, m = Mr,solid/Mc,solid (half the moment on half the strength); "
                  "p >= 0.2: p + 8/9 m; else p/2 + m", chord(Pr), "", f"{H1} (H1-1a), (H1-1b); judgement")

    nan = np.isnan(Mc["strong"]) | np.isnan(Mc["weak"])
    cap, ratio, eq = _solve(g, Pr, Pc, nan, t, "largest P with H1-1 <= 1, moments in proportion (bisection)",
                            f"{H1} (H1-1a), (H1-1b)")
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        Mr_d = {ax: t.add(f"Mr_{ax}", f"required flexural strength at the demand, {ax} axis",
                          "given + B1 M2 + B1 (Cm 1) Pr e + B2 Pr D", Mr(Pr, ax), "N*mm",
                          f"{APP8} (A-8-1)") for ax in AXES}
        t.add("Pr/Pc", "axial ratio", "Pr / Pc", Pr / Pc, "", H1)
    t.add("ratio", "interaction ratio", "Pr/Pc >= 0.2: Pr/Pc + 8/9 (Mrx/Mcx + Mry/Mcy) (H1-1a); "
          "else Pr/(2 Pc) + Mrx/Mcx + Mry/Mcy (H1-1b)", ratio, "", f"{H1} (H1-1a), (H1-1b)")
    warnings = []
    if out.any():
        warnings.append(Warning("flexure-not-covered", cf.out if cf is not None and cf.out else
                                "flexural strength not covered for this section and "
                                "axis (AISC 360-22 F5 slender web, HSS slender web, round HSS D/t >= 0.45 E/Fy): "
                                "no beam-column strength", out))
    if cf is not None:
        _tie_shear_warning(M, cf, warnings)
    return BeamColumnResult(ratio, eq, cap, Mc, Mr_d, t, warnings)


def _tie_shear_warning(M, cf, warnings) -> None:
    moved = (M["given"][cf.open] + M["ends"][cf.open] + M["sway"][cf.open]) > 0
    if moved.any():
        warnings.append(Warning("tie-shear-from-moment", f"the shear of a moment varying along the member "
                                f"about the {cf.open} (open) axis must be carried by the lacing or battens: "
                                "it is not added to their forces here (check them by hand)", moved))


def _not_covered(why, M, v, design, n, t) -> BeamColumnResult:
    nan = np.full(n, np.nan)
    t.add("note", why, "", "", "", "AISC 360-22 Chapter F; EN 1993-1-1 6.3.2")
    carried = np.zeros(n, bool)
    for ax in AXES:
        carried |= (M["given"][ax] + M["ends"][ax] + M["bow"][ax] + M["sway"][ax]) > 0
    return BeamColumnResult(nan, np.full(n, "not covered"), nan.copy(), {ax: nan.copy() for ax in AXES},
                            {ax: nan.copy() for ax in AXES}, t,
                            [Warning("flexure-not-covered", why, carried | (n > 0))])


def _trace_value(trace: Trace, symbol: str, shape: tuple, n: int) -> np.ndarray | None:
    """The value of the last step named ``symbol`` in ``trace`` as an array of n, or None."""
    for s in reversed(trace.steps):
        if s.symbol == symbol:
            return np.broadcast_to(np.asarray(s.value, dtype=float), shape).reshape(n)
    return None


def _en(kind, sec, v, M, axial, shape, n, N_Ed, gamma, design, t, ratio, sway, member_length,
        holes=None, fu=None, built=None):
    fy, E, G = v["Fy"], v["E"], v["G"]
    A = sec["A"]
    cf = None
    if built is not None and built.arrangement == "channels":
        from .builtflex import en_chord_flexure

        cf = en_chord_flexure(built, float(fy[0]), float(E[0]), float(G[0]), float(v["Lc_twist"][0]), gamma, t)
    # a laced, battened or boxed section is closed for torsion: Table B.1 (not susceptible), and
    # its torsional buckling is reported by the axial check, not applied
    open_i = kind == "i" and not (built is not None and built.closed)

    def mode(name, attr):
        return np.broadcast_to(np.asarray(getattr(axial.modes[name], attr), dtype=float), shape).reshape(n)

    eps = np.sqrt(235.0 / fy)
    comp = Trace()
    cls_c, _ = classify(kind, sec, eps, comp)
    cls_flange = _trace_value(comp, "class,flange", (n,), n)
    used = {(src, ax): bool(np.any(M[src][ax] > 0)) for src in SOURCES for ax in AXES}
    has = {ax: any(used[(src, ax)] for src in SOURCES) for ax in AXES}
    Ncr = {"strong": mode("flexural-strong", "Pe"), "weak": mode("flexural-weak", "Pe")}
    Ncr_own = dict(Ncr)
    if sway is not None:
        Ncr = {ax: sway[ax] for ax in AXES}

    def M_Ed(N, ax):
        # only the sources this batch has: the bisection calls this some 130 times
        lam = N / N_Ed
        out = np.zeros(N.shape)
        if used[("given", ax)] or used[("ends", ax)]:
            out = out + lam * (M["given"][ax] + M["ends"][ax])
        if used[("bow", ax)]:
            out = out + N * M["bow"][ax]
        if used[("sway", ax)]:
            with np.errstate(divide="ignore", invalid="ignore"):
                sway_amp = np.where(N < Ncr[ax], 1.0 / (1.0 - N / Ncr[ax]), np.inf)
            out = out + np.where(M["sway"][ax] > 0, sway_amp * N * M["sway"][ax], 0.0)
        return out

    # Table 5.2 under the actual N and M: the web of an I bent about its strong axis takes the
    # plastic alpha (Class 1, 2) and the elastic psi (Class 3); flanges, webs of hollow sections
    # and weak-axis bending keep the class in compression (conservative). The class can only
    # improve on the class in compression, and worsens as N grows with the moments in proportion.
    # Tied channels take the chords' own resistances (codes.builtflex): no refinement.
    refine = kind == "i" and cf is None and has["strong"] and cls_flange is not None
    if refine:
        a1, a2, p3 = web_thresholds(sec["ct_web"], eps)
        c_web = sec["ct_web"] * sec["tw"]
        half_c = 0.5 * c_web / sec["Ix"]

    def section_class(N):
        # the same classes as web_under_bending, by the turned-round limits (three comparisons)
        if not refine:
            return cls_c
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            Ms = M_Ed(N, "strong")
            Ms = np.where(np.isfinite(Ms), Ms, 0.0)
            bent = Ms > 0
            alpha = np.where(bent, np.minimum(1.0, 0.5 * (1 + N / (c_web * sec["tw"] * fy))), 1.0)
            s_n, s_m = N / A, Ms * half_c
            psi = np.where(bent, (s_n - s_m) / np.maximum(s_n + s_m, 1e-300), 1.0)
        cw = np.select([alpha <= a1, alpha <= a2, psi <= p3], [1, 2, 3], 4)
        return np.maximum(cls_flange, cw)

    if refine:
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            Ms_d = M_Ed(N_Ed, "strong")
            Ms_d = np.where(np.isfinite(Ms_d), Ms_d, 0.0)
            cw_d, a_d, p_d = web_under_bending(sec["ct_web"], sec["tw"], fy, eps, N_Ed, Ms_d, A, sec["Ix"])
        cls_d = np.maximum(cls_flange, cw_d)
    else:
        cls_d = cls_c
    if refine:
        t.add("alpha,web", "compressed share of the web, plastic distribution under N_Ed and M_y,Ed",
              "(1 + N_Ed / (c tw fy)) / 2 <= 1 (the web carries N)", a_d, "", "EN 1993-1-1 Table 5.2 (sheet 1)")
        t.add("psi,web", "end-stress ratio of the web, elastic distribution under N_Ed and M_y,Ed",
              "(N/A - M c/(2 Iy)) / (N/A + M c/(2 Iy))", p_d, "", "EN 1993-1-1 Table 5.2 (sheet 1)")
        t.add("class", "section class under N + M (web: alpha for Class 1, 2 by 396/456 eps/(13 alpha - 1), "
              "psi for Class 3 by 42 eps/(0.67 + 0.33 psi); flanges in compression)",
              "worst of the parts", cls_d, "", "EN 1993-1-1 Table 5.2")
    else:
        t.add("class", "section class in compression (used for bending: conservative)", "Table 5.2", cls_c, "",
              "EN 1993-1-1 Table 5.2")

    # moment resistances for each class the section can take under N + M (<= its class in compression)
    psi = np.full(n, np.nan)
    only_ends = {ax: (M["ends"][ax] > 0) & (M["given"][ax] + M["bow"][ax] + M["sway"][ax] == 0) for ax in AXES}
    if kind == "i":
        # the worst segment between twist restraints lies at the larger end moment:
        # psi_seg = 1 - (1 - psi)(L_T / L) for a linear diagram over the member length L
        L = v["Lc_twist"] if member_length is None else np.broadcast_to(
            np.asarray(member_length, dtype=float), (n,))
        share = np.minimum(1.0, v["Lc_twist"] / L)
        psi = np.where(only_ends["strong"], 1.0 - (1.0 - (-ratio["strong"])) * share, np.nan)
    candidates = [1, 3] + ([4] if (cls_c == 4).any() else [])
    MRk = {ax: {} for ax in AXES}
    chiLT = {ax: {} for ax in AXES}
    shown: dict[str, Trace] = {}
    for ax in AXES:
        Weff = en_effective_modulus(kind, ax, sec, eps, Trace()) if 4 in candidates else None
        for c in candidates:
            sub = Trace()
            MRk[ax][c], chiLT[ax][c] = en_moment(kind, ax, sec, np.full(n, c), fy, E, G, v["Lc_twist"], sub,
                                                 Weff, rolled_case=kind == "i" and built is None, psi=psi)
            shown[f"{ax},{c}"] = sub

    def pick(d, cls):
        out = d[1]
        for c in (3, 4):
            if c in d:
                out = np.where(cls == c, d[c], out)
        return out

    # trace at the demand: C1, Mcr, k_c do not depend on the class; W, lb,LT, chi_LT and f do
    by_class = ("M_Rk", "lb,LT", "chi_LT,0", "f_mod", "chi_LT")
    for ax in AXES:
        for s in shown[f"{ax},1"].steps:
            if s.symbol not in ("M_Rk", "C1", "Mcr", "lb,LT", "curve,LT", "chi_LT,0", "k_c", "f_mod", "chi_LT"):
                continue
            value = s.value
            if s.symbol in by_class:
                value = pick({c: next(x.value for x in shown[f"{ax},{c}"].steps if x.symbol == s.symbol)
                              for c in candidates}, cls_d)
            t.steps.append(s.__class__(f"{s.symbol}_{ax}", s.what, s.formula, value, s.unit, s.clause))

    # axial terms: gross area for Class 1-3 under N + M, the effective area (pure compression) for Class 4
    NRk4 = mode("yield", "Pn")
    NRkg = fy * A
    lb4 = {"strong": mode("flexural-strong", "slenderness"), "weak": mode("flexural-weak", "slenderness"),
           "torsion": mode("torsional", "slenderness")}
    chi4 = {"strong": mode("flexural-strong", "Pn") / NRk4, "weak": mode("flexural-weak", "Pn") / NRk4,
            "torsion": mode("torsional", "Pn") / NRk4}
    lbg, chig = dict(lb4), dict(chi4)
    if (cls_c == 4).any():
        for tag, name in (("strong", "flexural-strong"), ("weak", "flexural-weak"), ("torsion", "torsional")):
            alpha = _trace_value(axial.trace, f"alpha,{tag}", shape, n)
            if alpha is None:   # no imperfection factor to redo chi with: keep the effective area's
                continue
            with np.errstate(divide="ignore", invalid="ignore"):
                lb = np.sqrt(NRkg / mode(name, "Pe"))
            lbg[tag] = np.where(cls_c == 4, lb, lb4[tag])
            chig[tag] = np.where(cls_c == 4, reduction_factor(lb, alpha), chi4[tag])

    def axial_terms(cls):
        c4 = cls == 4
        NRk = np.where(c4, NRk4, NRkg)
        chi_y = np.where(c4, chi4["strong"], chig["strong"])
        cz4, czg = chi4["weak"], chig["weak"]
        if open_i:
            cz4, czg = np.minimum(cz4, chi4["torsion"]), np.minimum(czg, chig["torsion"])
        chi_z = np.where(c4, cz4, czg)
        lb_y = np.where(c4, lb4["strong"], lbg["strong"])
        lb_z = np.where(c4, lb4["weak"], lbg["weak"])
        if built is not None:
            # a laced or battened axis has no slenderness of its own in 6.4: sqrt(N_Rk / Ncr,eff)
            # with the shear-flexible critical load the built-up check reports
            with np.errstate(divide="ignore", invalid="ignore"):
                lb_y, lb_z = (np.where(np.isnan(lb), np.sqrt(NRk / Ncr_own[ax]), lb)
                              for ax, lb in (("strong", lb_y), ("weak", lb_z)))
        return NRk, chi_y, chi_z, lb_y, lb_z

    NRk, chi_y, chi_z, lb_yd, lb_zd = axial_terms(cls_d)
    if built is not None:
        for ax, lb in (("strong", lb_yd), ("weak", lb_zd)):
            t.add(f"lb_{ax}", f"slenderness, {ax} axis (built-up)", "sqrt(N_Rk / Ncr)", lb, "",
                  "EN 1993-1-1 6.3.1.2")
    t.add("N_Rk", "characteristic axial resistance", "A fy (Aeff fy for Class 4 under N + M)", NRk, "N",
          "EN 1993-1-1 6.3.3, Table 6.7")
    t.add("chi_y", "flexural buckling factor, strong axis", "6.3.1.2 with A (Aeff for Class 4)", chi_y, "",
          "EN 1993-1-1 6.3.1.2")
    t.add("chi_z", "buckling factor, weak axis (open sections: or torsional, the lower)",
          "min(chi_z, chi_T), A (Aeff for Class 4)", chi_z, "", "EN 1993-1-1 6.3.1.2, 6.3.1.4")
    Cmy = t.add("Cmy", "equivalent uniform moment factor, strong axis (CmLT the same)",
                "end moments only: 0.6 + 0.4 psi >= 0.4, psi = -M1/M2; otherwise 1.0 (conservative)",
                np.where(only_ends["strong"], np.maximum(0.6 - 0.4 * ratio["strong"], 0.4), 1.0), "",
                f"{ANNEX_B} Table B.3")
    Cmz = t.add("Cmz", "equivalent uniform moment factor, weak axis",
                "end moments only: 0.6 + 0.4 psi >= 0.4, psi = -M1/M2; otherwise 1.0 (conservative)",
                np.where(only_ends["weak"], np.maximum(0.6 - 0.4 * ratio["weak"], 0.4), 1.0), "",
                f"{ANNEX_B} Table B.3")

    def resist(cls, trace=None):
        My = pick({c: chiLT["strong"][c] * MRk["strong"][c] for c in candidates}, cls) / gamma
        Mz = pick({c: MRk["weak"][c] for c in candidates}, cls) / gamma
        if trace is not None:
            trace.add("Mc_strong", "design moment resistance, strong axis", "chi_LT M_y,Rk / gamma_M1", My,
                      "N*mm", f"{C633} (6.61), (6.62)")
            trace.add("Mc_weak", "design moment resistance, weak axis", "M_z,Rk / gamma_M1", Mz, "N*mm",
                      f"{C633} (6.61), (6.62)")
        if cf is not None:  # tied channels: the chords' resistances, whatever the class of the whole
            My, Mz = (np.full(n, np.nan if cf.out else cf.Mn[ax]) for ax in AXES)
            if trace is not None:
                for ax, m in (("strong", My), ("weak", Mz)):
                    trace.add(f"Mc_{ax}", f"design moment resistance, {ax} axis (two tied channels, "
                              "replaces the above)", "see M_Rd of the chords", m, "N*mm", "EN 1993-1-1 6.3.2, 6.4.1")
                if cf.out:
                    trace.add("note", cf.out, "", "", "", "EN 1993-1-1 Table 5.2")
        if holes is not None:  # the cap at the holes does not depend on the class: said once, at N_Ed
            quiet = Trace() if trace is None else trace
            if holes.axis == "strong":
                My = en_tension_flange(holes, fy, fu, sec["Sx"], My, quiet)
            else:
                Mz = en_tension_flange(holes, fy, fu, sec["Sy"], Mz, quiet)
        return My, Mz

    My_Rd, Mz_Rd = resist(cls_d, t)

    def factors(N, cls, Ny, Nz, lb_y, lb_z):
        c12 = cls <= 2
        ny, nz = N / Ny, N / Nz
        zero = np.zeros(N.shape)
        kyy = kzy = kyz = kzz = zero
        if has["strong"]:
            kyy = np.where(c12, Cmy * np.minimum(1 + (lb_y - 0.2) * ny, 1 + 0.8 * ny),
                           Cmy * np.minimum(1 + 0.6 * lb_y * ny, 1 + 0.6 * ny))
            if open_i:
                d = Cmy - 0.25          # CmLT = Cmy
                k12 = np.where(lb_z < 0.4, np.minimum(0.6 + lb_z, 1 - 0.1 * lb_z * nz / d),
                               np.maximum(1 - 0.1 * lb_z * nz / d, 1 - 0.1 * nz / d))
                k3 = np.maximum(1 - 0.05 * lb_z * nz / d, 1 - 0.05 * nz / d)
                kzy = np.where(c12, k12, k3)
            else:
                kzy = np.where(c12, 0.6 * kyy, 0.8 * kyy)
        if has["weak"]:
            kzz12 = (Cmz * np.minimum(1 + (2 * lb_z - 0.6) * nz, 1 + 1.4 * nz) if open_i
                     else Cmz * np.minimum(1 + (lb_z - 0.2) * nz, 1 + 0.8 * nz))
            kzz = np.where(c12, kzz12, Cmz * np.minimum(1 + 0.6 * lb_z * nz, 1 + 0.6 * nz))
            kyz = np.where(c12, 0.6 * kzz, kzz)
        return kyy, kyz, kzy, kzz

    def terms(cls):
        NRk, chi_y, chi_z, lb_y, lb_z = axial_terms(cls)
        return (cls, chi_y * NRk / gamma, chi_z * NRk / gamma, lb_y, lb_z, *resist(cls))

    # the bracket: the pure-compression resistance, or the gross one where N + M leaves Class 4
    gross = np.minimum(chig["strong"], np.minimum(chig["weak"], chig["torsion"]) if open_i else chig["weak"])
    top = np.where(cls_c == 4, np.maximum(design, gross * NRkg / gamma), design)
    fixed = split = None
    if not refine:
        fixed = terms(cls_c)
    elif not any(used[("sway", ax)] for ax in AXES):
        # every moment grows in proportion to N (given, end moments, N e): psi does not change with N
        # and alpha rises with it, so the web is Class 1/2 up to N2 (alpha = a2) and takes the class
        # psi gives above; one class over the whole bracket is computed once
        lo_c, hi_c = section_class(top * 1e-9), section_class(top)
        if np.array_equal(lo_c, hi_c):
            fixed = terms(hi_c)
        else:
            split = ((2 * a2 - 1) * c_web * sec["tw"] * fy, terms(lo_c), terms(hi_c))

    def both(N):
        if fixed is not None:
            T = fixed
        elif split is not None:
            low = N <= split[0]
            T = tuple(np.where(low, a, b) for a, b in zip(split[1], split[2]))
        else:
            T = terms(section_class(N))
        cls, Ny, Nz, lb_y, lb_z, My, Mz = T
        kyy, kyz, kzy, kzz = factors(N, cls, Ny, Nz, lb_y, lb_z)
        a, b = N / Ny, N / Nz
        if has["strong"]:
            my = M_Ed(N, "strong") / My
            a, b = a + kyy * my, b + kzy * my
        if has["weak"]:
            mz = M_Ed(N, "weak") / Mz
            a, b = a + kyz * mz, b + kzz * mz
        return a, b, (kyy, kyz, kzy, kzz)

    def member(N):
        a, b, _ = both(N)
        return np.maximum(a, b), np.where(a >= b, "6.61", "6.62")

    g = member
    if cf is not None:
        from .builtflex import en_chord_force

        L_open = float(v[f"Lc_{cf.open}"][0])

        def chord(N):
            # 6.4.1 (6.69) with M_Ed^I; the chord's half of the solid-axis moment with
            # k = 1 + 0.8 n, the upper bound of Annex B Table B.1 (covers (6.61) and (6.62))
            c = en_chord_force(cf, N, M_Ed(N, cf.open), L_open, float(E[0])) / cf.Pch
            return c + (1 + 0.8 * c) * (M_Ed(N, cf.solid) / 2) / cf.Mch

        def g(N):
            val, eq = member(N)
            c = chord(N)
            return np.maximum(val, c), np.where(c > val, "6.4 chord", eq)

        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            t.add("chord", "interaction of the compressed chord at N_Ed",
                  "N_ch,Ed / Nb,Rd,ch + (1 + 0.8 n) (M_Ed,solid / 2) / M_Rd,ch, N_ch,Ed = 0.5 N + "
                  "(N e0 + M_Ed^I) / (1 - N/Ncr - N/Sv) h0 Ach / (2 Ieff)", chord(N_Ed), "",
                  "EN 1993-1-1 6.4.1 (6.69); Annex B Table B.1 (upper bound of k, a judgement)")

    t.add("k", "interaction factors", "Annex B method 2: Table B.1 (kyy, kyz, kzz; kzy hollow), "
          "Table B.2 kzy (I members susceptible to torsional deformation)", "", "", f"{ANNEX_B} Tables B.1, B.2")
    nan = np.isnan(My_Rd) | np.isnan(Mz_Rd)
    cap, ratio_, eq = _solve(g, N_Ed, top, nan, t, "largest N with (6.61), (6.62) <= 1, moments in proportion "
                             "(bisection)", f"{C633} (6.61), (6.62)")
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        Mr = {ax: t.add(f"M_Ed_{ax}", f"design moment, {ax} axis (first order; sway: 1/(1 - N/Ncr))",
                        "given + end + N e + N D/(1 - N/Ncr)", M_Ed(N_Ed, ax), "N*mm", C633) for ax in AXES}
        u61, u62, ks = both(N_Ed)
        for name, k, ax in zip(("kyy", "kyz", "kzy", "kzz"), ks, ("strong", "weak", "strong", "weak")):
            if has[ax]:    # a factor on a moment the column does not carry is not shown
                t.add(name, f"interaction factor {name} at N_Ed", "Annex B", k, "", ANNEX_B)
    t.add("(6.61)", "interaction, strong-axis buckling",
          "N/(chi_y N_Rk/gM1) + kyy My/(chi_LT My,Rk/gM1) + kyz Mz/(Mz,Rk/gM1)", u61, "", f"{C633} (6.61)")
    t.add("(6.62)", "interaction, weak-axis buckling",
          "N/(chi_z N_Rk/gM1) + kzy My/(chi_LT My,Rk/gM1) + kzz Mz/(Mz,Rk/gM1)", u62, "", f"{C633} (6.62)")
    t.add("ratio", "interaction ratio", "max((6.61), (6.62))", ratio_, "", C633)
    warnings = []
    if (np.asarray(M["given"]["strong"] + M["given"]["weak"]) > 0).any():
        warnings.append(Warning("given-moments-amplified", "moments given with second-order effects are "
                                "taken as M_Ed in EN 1993-1-1 6.3.3, whose k factors amplify them again "
                                "(conservative)", np.ones(n, bool)))
    if nan.any():
        warnings.append(Warning("flexure-not-covered", cf.out if cf is not None and cf.out else
                                "no moment resistance for this section under "
                                "EN 1993-1-1 (a Class 4 circular hollow section): no beam-column strength", nan))
    if cf is not None:
        _tie_shear_warning(M, cf, warnings)
    return BeamColumnResult(ratio_, eq, cap, {"strong": My_Rd, "weak": Mz_Rd}, Mr, t, warnings)


def _elastic(sec, v, M, axial, shape, n, Pr, design, t):
    Fy, A = v["Fy"], sec["A"]
    Pe = {ax: np.broadcast_to(np.asarray(axial.modes[f"flexural-{ax}"].Pe, dtype=float), shape).reshape(n)
          for ax in AXES}
    My = {"strong": t.add("My_strong", "first-yield moment, strong axis", "Fy Sx", Fy * sec["Sx"], "N*mm", _FY),
          "weak": t.add("My_weak", "first-yield moment, weak axis", "Fy Sy", Fy * sec["Sy"], "N*mm", _FY)}

    def Mr(P, ax):
        with np.errstate(divide="ignore", invalid="ignore"):
            a = np.where(P < Pe[ax], 1.0 / (1.0 - P / Pe[ax]), np.inf)
        lam = P / Pr
        m = lam * (M["given"][ax] + M["ends"][ax]) + P * (M["bow"][ax] + M["sway"][ax])
        return np.where(m > 0, a * m, 0.0)

    def g(P):
        return P / (Fy * A) + Mr(P, "strong") / My["strong"] + Mr(P, "weak") / My["weak"], \
            np.full(P.shape, "first yield")

    cap, ratio, eq = _solve(g, Pr, design, np.zeros(n, bool), t,
                            "largest P with P/(A Fy) + sum M/(1 - P/Pe)/My <= 1 (bisection)", _FY)
    Mr_d = {ax: Mr(Pr, ax) for ax in AXES}
    t.add("ratio", "first-yield ratio", "max(P/(A Fy) + sum M amplified / My, P / axial capacity)", ratio, "", _FY)
    return BeamColumnResult(ratio, eq, cap, My, Mr_d, t, [])


__all__ = ["AXES", "SOURCES", "BeamColumnResult", "check_beam_column"]
