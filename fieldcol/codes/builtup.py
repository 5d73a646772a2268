"""Built-up columns: the code checks with the rules for members made of parts.

* Elastic: Euler about each axis; about an open axis (chords apart, joined at points) with
  Engesser's shear-flexible correction 1/Pcr = 1/Pe + 1/Sv, Sv the shear stiffness of the
  lacing or battens.
* AISC 360-22 E6.1: the modified slenderness (Lc/r)m about an open axis (rivets and bolts as
  snug-tight, welds as welded), used in E3 in place of Lc/r; E6.2 spacing limits and the
  lacing and tie plate proportions as warnings; the lacing carries 2 % of the member's
  strength (where it cannot, the strength about that axis is lowered to what it can).
* EN 1993-1-1 6.4: laced and battened members: Ieff, Sv, e0 = L/500, the chord force at
  mid-length checked against the chord's buckling between panel points (6.4.2.1, 6.4.3.1),
  the end panel of a battened member, the battens (moment V_Ed a / 2n, shear V_Ed a / (n h0))
  and the lacing bars; the capacity is the largest N_Ed these checks pass, and the forces in
  the lacing, the battens and their joints at that N_Ed are reported. About a solid axis: 6.3.1 with curve c (riveted built-up members are not
  in Table 6.2: the curve of U, T and solid sections, common practice).

Every part's plate elements are classified (AISC Table B4.1a, EN Table 5.2); a slender
component is not modelled here, so the column is then "not-covered" (no number).
Formulas recalled from the standards are marked "from memory" in the docstrings; the tests
name their checks.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._builtup import Battens, BuiltUp, Lacing, OpenAxis
from fieldcol.trace import Trace

from ._modes import choose
from ._result import CodeResult, ModeResult, Warning
from .aisc360 import check_aisc360
from .elastic import check_elastic
from .en1993 import check_en1993, reduction_factor

E6 = "AISC 360-22 E6"
EN64 = "EN 1993-1-1 6.4"
_MODE = {"strong": "flexural-strong", "weak": "flexural-weak"}
_I = {"strong": "Ix", "weak": "Iy"}


def lacing_geometry(axis: OpenAxis) -> tuple[float, float]:
    """(diagonal length d, panel length along the member per diagonal) of the lacing, mm.

    Single lacing zig-zags: a diagonal spans half the pitch ``a`` along one chord; double
    lacing and lacing with posts put one diagonal in each pitch (common practice geometry).

    Example:
        >>> ax = OpenAxis("weak", 300.0, 1.0, 1.0, 1.0, 800.0, Lacing("single", 40, 8, 800), "c")
        >>> round(lacing_geometry(ax)[0])
        500
    """
    tie = axis.tie
    along = axis.a / 2 if tie.kind == "single" else axis.a
    return float(np.hypot(axis.h0, along)), along


def shear_stiffness(axis: OpenAxis, E: float) -> float:
    """Sv, the shear stiffness of the lacing or battens across an open axis (N).

    Lacing (EN 1993-1-1 Fig. 6.9, from memory; the same follows from the statics of a panel):
    single (zig-zag) n E Ad a h0^2 / (2 d^3); with posts n E Ad a h0^2 / (d^3 (1 + Ad h0^3 /
    (Av d^3))), posts of the diagonals' bar; double (crossed) twice the single-diagonal panel,
    2 n E Ad a h0^2 / d^3, each diagonal taking half the shear. Battens (EN 1993-1-1 (6.73),
    from memory): 24 E Ich / (a^2 (1 + 2 Ich h0 / (n Ib a))), at most 2 pi^2 E Ich / a^2.
    Stitch connectors alone: the battens' upper bound 2 pi^2 E Ich / a^2 (rigid ties).

    Example:
        >>> ax = OpenAxis("weak", 300.0, 5000.0, 2e6, 20.0, 600.0, Battens(600, 200, 10), "c")
        >>> round(shear_stiffness(ax, 210000.0) / 1e3)   # the bound 2 pi^2 E Ich / a^2 governs
        23029
    """
    tie, a, h0 = axis.tie, axis.a, axis.h0
    if isinstance(tie, Lacing):
        n, Ad = tie.planes, tie.area
        d, along = lacing_geometry(axis)
        if tie.kind == "single":
            return n * E * Ad * a * h0**2 / (2 * d**3)
        if tie.kind == "posts":
            return n * E * Ad * a * h0**2 / (d**3 * (1 + h0**3 / d**3))
        return 2 * n * E * Ad * a * h0**2 / d**3
    cap = 2 * np.pi**2 * E * axis.Ich / a**2
    if isinstance(tie, Battens):
        return float(min(24 * E * axis.Ich / (a**2 * (1 + 2 * axis.Ich * h0 / (tie.planes * tie.I * a))),
                         cap))
    return float(cap)


def effective_inertia(axis: OpenAxis, L: float) -> tuple[float, float]:
    """(Ieff, mu) of EN 1993-1-1 6.4.2.1 / 6.4.3.1 (from memory): laced 0.5 h0^2 Ach; battened
    0.5 h0^2 Ach + 2 mu Ich with mu from lambda = L / i0, i0 = sqrt(I1 / (2 Ach)),
    I1 = 0.5 h0^2 Ach + 2 Ich: 1 up to 75, 2 - lambda / 75 up to 150, 0 beyond.

    Example:
        >>> ax = OpenAxis("weak", 300.0, 5000.0, 2e6, 20.0, 600.0, Battens(600, 200, 10), "c")
        >>> [round(v, 3) for v in effective_inertia(ax, 6000.0)]
        [229000000.0, 1.0]
    """
    base = 0.5 * axis.h0**2 * axis.Ach
    if isinstance(axis.tie, Lacing):
        return base, 0.0
    I1 = base + 2 * axis.Ich
    lam = L / np.sqrt(I1 / (2 * axis.Ach))
    mu = 1.0 if lam <= 75 else 0.0 if lam >= 150 else 2 - lam / 75
    return base + 2 * mu * axis.Ich, float(mu)


def modified_slenderness(KLr_o: Any, a: Any, ri: Any, connection: str, Ki: float = 0.86
                         ) -> np.ndarray:
    """AISC 360-22 E6.1 (from memory): snug-tight bolts (and rivets, taken so):
    (Lc/r)m = sqrt((Lc/r)o^2 + (a/ri)^2); welded or pretensioned: (Lc/r)o while a/ri <= 40,
    else sqrt((Lc/r)o^2 + (Ki a/ri)^2), Ki 0.50 angles back to back, 0.75 channels back to
    back, 0.86 otherwise.

    Example:
        >>> round(float(modified_slenderness(80.0, 900.0, 20.0, "riveted")), 2)
        91.79
    """
    o, ar = np.asarray(KLr_o, float), np.asarray(a, float) / np.asarray(ri, float)
    if connection == "welded":
        return np.where(ar <= 40, o, np.sqrt(o**2 + (Ki * ar)**2))
    return np.sqrt(o**2 + ar**2)


def chord_force(axis: OpenAxis, N: float, L: float, E: float) -> tuple[float, float, float]:
    """EN 1993-1-1 6.4.1 (6.69)-(6.71) (from memory): the chord force at mid-length with the
    bow e0 = L/500, (N_ch,Ed, M_Ed, V_Ed) in N, N mm, N.

    M_Ed = N e0 / (1 - N/Ncr - N/Sv), Ncr = pi^2 E Ieff / L^2;
    N_ch,Ed = 0.5 N + M_Ed h0 Ach / (2 Ieff); V_Ed = pi M_Ed / L. Infinite when N reaches the
    shear-flexible critical load.

    Example:
        >>> ax = OpenAxis("weak", 300.0, 5000.0, 2e6, 20.0, 800.0, Lacing("single", 40, 8, 800), "c")
        >>> round(chord_force(ax, 1.0e6, 6000.0, 210000.0)[0])
        544595
    """
    Ieff, _ = effective_inertia(axis, L)
    Ncr = np.pi**2 * E * Ieff / L**2
    amp = 1 - N / Ncr - N / shear_stiffness(axis, E)
    if amp <= 0:
        return np.inf, np.inf, np.inf
    M = N * (L / 500) / amp
    return 0.5 * N + M * axis.h0 * axis.Ach / (2 * Ieff), M, np.pi * M / L


def _limits_aisc(kind: str, name: str, Fy: float, E: float, web_ratio: float) -> float:
    root = np.sqrt(E / Fy)
    if kind == "leg":
        return 0.45 * root
    if kind == "stem":
        return 0.75 * root
    if kind == "outstand":
        if "plate" in name:
            kc = float(np.clip(4 / np.sqrt(max(web_ratio, 1e-9)), 0.35, 0.76))
            return 0.64 * np.sqrt(kc * E / Fy)
        return 0.56 * root
    return (1.40 if "plate" in name else 1.49) * root


def _limits_en(kind: str, fy: float) -> float:
    eps = np.sqrt(235 / fy)
    return {"leg": 15 * eps, "stem": 14 * eps, "outstand": 14 * eps, "internal": 42 * eps}[kind]


def classify(built: BuiltUp, code: str, Fy: float, E: float, t: Trace) -> bool:
    """Trace every component's plate element against its limit; True when one is slender.

    AISC 360-22 Table B4.1a for axial compression (from memory): angle legs 0.45 sqrt(E/Fy),
    rolled outstands 0.56, plate outstands of built-up members 0.64 sqrt(kc E/Fy), tee stems
    0.75, plates between lines of fasteners 1.40, webs 1.49. EN 1993-1-1 Table 5.2, Class 3
    (from memory): outstands 14 eps, angles h/t 15 eps, internal 42 eps.
    """
    web = max([r for n, r, k in built.elements if k == "internal"] or [0.0])
    slender = False
    for name, ratio, kind in built.elements:
        lim = _limits_aisc(kind, name, Fy, E, web) if code == "aisc360-22" else _limits_en(kind, Fy)
        clause = "AISC 360-22 Table B4.1a" if code == "aisc360-22" else "EN 1993-1-1 Table 5.2"
        t.add(f"b/t,{name}", f"{name}: width to thickness (limit {lim:.1f})", "b / t", ratio, "",
              clause)
        slender |= ratio > lim
    return slender


def _rechoose(res: CodeResult, built: BuiltUp, factor: float, clause: str) -> CodeResult:
    exclude = ("torsional",) if built.closed else ()
    if built.closed:
        res.trace.add("note", "laced, battened or boxed: the ties keep the section closed for "
                      "torsion; torsional buckling is reported, not applied", "", "", "",
                      "common practice")
    nominal, gov = choose(res.modes, res.trace, clause, exclude=exclude)
    res.nominal, res.governing = nominal, gov
    res.design = res.trace.add("design", "design strength of the built-up member",
                               "nominal x factor", nominal * factor, "N", clause)
    return res


def _not_covered(res: CodeResult, shape: tuple) -> CodeResult:
    nan = np.full(np.shape(res.nominal), np.nan)
    res.nominal, res.design = nan, nan.copy()
    res.governing = np.full(np.shape(nan), "")
    res.warnings.append(Warning("slender-component", "a component plate of the built-up section "
                                "is slender for compression: local buckling of built-up "
                                "components is not modelled here; no strength is given",
                                np.ones(np.shape(nan), dtype=bool)))
    return res


def check_builtup(code: str, built: BuiltUp, Fy: float, E: float, G: float, Lc_strong: float,
                  Lc_weak: float, Lc_twist: float, *, basis: str = "lrfd",
                  gamma_M1: float = 1.0, Fu: float | None = None) -> CodeResult:
    """Axial strength of a built-up column under ``code`` (``elastic``, ``aisc360-22``,
    ``en1993-1-1``): the code's own check of the composite section, with the open axes
    replaced by the built-up rules (see the module notes).

    Args:
        code: the code. built: the built-up section. Fy, E, G: MPa. Lc_*: effective lengths
            (mm). basis: AISC ``lrfd`` / ``asd``. gamma_M1: EN partial factor. Fu: the
            member steel's tensile strength (MPa), for bearing at the lacing's or battens' end
            fasteners (``codes.tiejoint``; needed only when they are recorded).
    Returns:
        a ``CodeResult`` (a batch of one).

    Example:
        >>> from fieldcol.sections._parts import Part
        >>> from fieldcol.sections._builtup import channels
        >>> b = channels(Part("channel", 300, 100, 16, 10), 100, tie=Battens(600, 200, 10))
        >>> r = check_builtup("aisc360-22", b, 250, 200000, 77200, 6000, 6000, 6000)
        >>> str(r.governing)
        'flexural-weak'
    """
    t = Trace()
    sec = built.section
    slender = classify(built, code, Fy, E, t)
    # the components were classified above; the composite's own I-shape ratios are not meaningful
    plain = replace(sec, lam_flange=np.array(1.0), lam_web=np.array(1.0),
                    ct_flange=np.array(1.0), ct_web=np.array(1.0))
    Lc = {"strong": float(Lc_strong), "weak": float(Lc_weak)}
    r = {"strong": float(sec.rx), "weak": float(sec.ry)}
    warnings: list[Warning] = []
    one = np.ones(1, dtype=bool)
    post = Trace()          # steps that follow the code's own check of the composite
    joints: list[float] = []   # nominal member strengths the end fasteners of the ties allow
    if code == "aisc360-22":
        Lm = dict(Lc)
        worst = max(Lc[ax] / r[ax] for ax in Lc)
        for ax in built.open_axes:
            o = ax.axis
            KLr = t.add(f"(Lc/r)o,{o}", f"slenderness of the built-up member as a unit, {o} axis",
                        "Lc / r", Lc[o] / r[o], "", f"{E6}.1")
            back = ax.back_to_back
            Ki = 0.75 if (back and "angle" not in ax.chord) else 0.5 if back else 0.86
            m = float(modified_slenderness(KLr, ax.a, ax.ri, built.connection, Ki))
            t.add(f"a/ri,{o}", f"connector spacing over the least r of one component, {o} axis",
                  "a / ri", ax.a / ax.ri, "", f"{E6}.1")
            t.add(f"(Lc/r)m,{o}", f"modified slenderness, {o} axis ({built.connection}"
                  + (", taken as snug-tight" if built.connection != "welded" else "") + ")",
                  "sqrt((Lc/r)o^2 + (a/ri)^2)" if built.connection != "welded"
                  else f"a/ri <= 40: (Lc/r)o; else sqrt((Lc/r)o^2 + (Ki a/ri)^2), Ki {Ki}",
                  m, "", f"{E6}.1 (E6-1)")
            Lm[o] = t.add(f"Lc,m,{o}", f"effective length giving (Lc/r)m, {o} axis",
                          "(Lc/r)m r", m * r[o], "mm", f"{E6}.1")
            worst = max(worst, m)
        for ax in built.open_axes:
            if ax.a / ax.ri > 0.75 * worst:
                warnings.append(Warning("connector-spacing", f"a/ri = {ax.a / ax.ri:.0f} of one "
                                        f"component exceeds 3/4 of the member's governing "
                                        f"slenderness ({0.75 * worst:.0f}) ({E6}.2)", one))
            _aisc_ties(ax, warnings, one)
            if isinstance(ax.tie, Battens):
                t.add("note", "end tie plates (not recorded) must be at least as long as the "
                      "distance between the lines of connectors (taken as h0), intermediate "
                      "ones half that, and at least 1/50 of it thick", "", "", "", f"{E6}.2")
        res = check_aisc360(plain, Fy, E, G, Lm["strong"], Lm["weak"], Lc_twist, basis=basis)
        for ax in built.open_axes:
            if isinstance(ax.tie, Lacing):
                _aisc_lacing_shear(ax, res, float(sec.A), Fy, E, post, warnings, one)
        factor = 0.90 if basis == "lrfd" else 1 / 1.67
        clause = "AISC 360-22 E1, E6"
        for ax in built.open_axes:
            if _fasteners(ax, Fu):
                joints.append(_aisc_joint(built, ax, res, factor, float(Fu), basis, post))
    elif code == "en1993-1-1":
        res = check_en1993(plain, Fy, E, G, Lc_strong, Lc_weak, Lc_twist, gamma_M1=gamma_M1)
        A = float(sec.A)
        for o in ("strong", "weak"):
            ax = built.open_axis(o)
            I = float(getattr(sec, _I[o]))
            if ax is None:
                res.modes[_MODE[o]] = _en_solid(o, I, A, Lc[o], Fy, E, post, "solid")
                continue
            integral = None
            if ax.tie is None:
                close = _closely_spaced(ax, post)
                integral = _en_solid(o, I, A, Lc[o], Fy, E, post,
                                     "one integral member, Sv infinite" if close else
                                     "as one integral member, for the bound",
                                     "" if close else "int,")
                if close:
                    res.modes[_MODE[o]] = integral
                    continue
            cap, Neff = _en_open(built, ax, Lc[o], Fy, E, gamma_M1, post, warnings, one)
            if _fasteners(ax, Fu):
                joints.append(_en_joint(built, ax, Lc[o], Fy, E, float(Fu), cap, post) * gamma_M1)
            mode = ModeResult(_MODE[o], np.array(Lc[o]), np.array(np.nan), np.array(Neff),
                              np.array(cap * gamma_M1 / A), np.array(cap * gamma_M1))
            if integral is not None and float(integral.Pn) < float(mode.Pn):
                post.add("note", f"{o} axis: the integral member's resistance is lower and "
                         "governs (a battened treatment never gives more)", "", "", "", EN64)
                mode = integral
            res.modes[_MODE[o]] = mode
        factor, clause = 1 / gamma_M1, f"EN 1993-1-1 6.3.1, {EN64}"
    else:
        res = check_elastic(plain, Fy, E, G, Lc_strong, Lc_weak, Lc_twist)
        for ax in built.open_axes:
            o = ax.axis
            Pe = np.pi**2 * E * float(getattr(sec, _I[o])) / Lc[o]**2
            Sv = post.add(f"Sv,{o}", f"shear stiffness of the {_tie_name(ax)}, {o} axis",
                       _sv_formula(ax), shear_stiffness(ax, E), "N", _sv_clause(ax))
            Pcr = post.add(f"Pcr,{o}", f"elastic buckling load with shear flexibility, {o} axis",
                        "1 / (1/Pe + 1/Sv) (Engesser)", 1 / (1 / Pe + 1 / Sv), "N",
                        "elastic stability (Engesser)")
            A = float(sec.A)
            Fcr = post.add(f"Fcr,{o}", f"critical stress, {o} axis", "min(Pcr / A, Fy)",
                           min(Pcr / A, Fy), "MPa", "elastic stability")
            post.add(f"Pn,{o}", f"strength, {o} axis", "Fcr A", Fcr * A, "N", "elastic stability")
            res.modes[_MODE[o]] = ModeResult(_MODE[o], np.array(Lc[o]),
                                             np.array(Lc[o] / r[o]), np.array(Pcr),
                                             np.array(Fcr), np.array(Fcr * A))
        factor, clause = 1.0, "elastic stability"
    if joints:
        Pj = min(joints)
        res.modes["tie-joint"] = ModeResult("tie-joint", None, None, None,
                                            np.array(Pj / float(sec.A)), np.array(Pj))
    elif code != "elastic" and built.connection != "welded" and any(
            isinstance(ax.tie, (Lacing, Battens)) for ax in built.open_axes):
        post.add("note", "the end rivets or bolts of the lacing or battens are not recorded: not "
                 "checked (record lacing.fasteners or battens.fasteners)", "", "", "",
                 "AISC 360-22 J3; EN 1993-1-8 Table 3.4")
    elif code != "elastic" and built.connection == "welded" and any(
            isinstance(ax.tie, (Lacing, Battens)) for ax in built.open_axes):
        # the bar forces are in the trace above; the welds that carry them are the engineer's
        post.add("note", "the welds at the ends of the lacing or battens are not checked: "
                 "check them for the bar or batten forces above", "", "", "",
                 "AISC 360-22 J2; EN 1993-1-8 4.5")
    t.steps.extend(st for st in res.trace.steps if not _replaced(st.symbol, code, {o.axis for o in built.open_axes}))
    t.extend(post)
    if built.connection != "welded":
        from .coverplates import GROSS, GROSS_CLAUSE
        t.add("note", f"{built.connection} built-up member: {GROSS}", "", "", "", GROSS_CLAUSE)
    res.trace = t
    res = _rechoose(res, built, factor, clause)
    res.warnings.extend(warnings)
    if slender:
        res = _not_covered(res, ())
    return res


_AISC_LOCAL = {"kc", "lr,flange", "lr,web", "slender,flange", "slender,web"}
_EN_LOCAL = {"eps", "class,flange", "class,web", "class", "Aeff", "curve,y", "curve,z"}
_EN_FLEX = ("Ncr", "alpha", "lb", "Phi", "chi", "ignore", "Nb")


def _replaced(symbol: str, code: str, opened: set[str]) -> bool:
    """Steps of the code's own check that the built-up rules replace: its classification of
    the composite as one I shape, its choice of the governing mode, and (EN) its flexural
    modes, which the built-up check computes again with curve c and 6.4."""
    if symbol in ("Pn", "mode", "phiPn", "Pn/Omega", "Nb,Rd", "Pd"):
        return True
    if code == "aisc360-22":
        return symbol in _AISC_LOCAL
    head, _, axis = symbol.partition(",")
    if code == "en1993-1-1":
        return symbol in _EN_LOCAL or (head in _EN_FLEX and axis in ("strong", "weak"))
    return symbol == "P" or (head in ("Pcr", "Fcr", "Pn") and axis in opened)


def _tie_name(ax: OpenAxis) -> str:
    return ("lacing" if isinstance(ax.tie, Lacing) else "battens" if isinstance(ax.tie, Battens)
            else "stitch connectors")


def _sv_formula(ax: OpenAxis) -> str:
    if isinstance(ax.tie, Lacing):
        return {"single": "n E Ad a h0^2 / (2 d^3)", "posts": "n E Ad a h0^2 / (d^3 (1 + h0^3/d^3))",
                "double": "2 n E Ad a h0^2 / d^3"}[ax.tie.kind]
    if isinstance(ax.tie, Battens):
        return "24 E Ich / (a^2 (1 + 2 Ich h0 / (n Ib a))) <= 2 pi^2 E Ich / a^2"
    return "2 pi^2 E Ich / a^2 (rigid ties)"


def _sv_clause(ax: OpenAxis) -> str:
    if isinstance(ax.tie, Lacing):
        return f"{EN64}.2.1, Fig. 6.9" + (" (crossed: statics of the panel)" if ax.tie.kind == "double" else "")
    return f"{EN64}.3.1 (6.73)" if isinstance(ax.tie, Battens) else f"{EN64}.3.1 (6.73) bound"


def _aisc_ties(ax: OpenAxis, warnings: list[Warning], one: np.ndarray) -> None:
    """AISC 360-22 E6.2 lacing and tie plate proportions (from memory), as warnings."""
    tie = ax.tie
    if isinstance(tie, Lacing):
        d, along = lacing_geometry(ax)
        L = 0.7 * d if tie.kind == "double" else d
        slender = L / (tie.thickness / np.sqrt(12))
        limit = 200 if tie.kind == "double" else 140
        if slender > limit:
            warnings.append(Warning("lacing-slender", f"lacing bar L/r = {slender:.0f} exceeds "
                                    f"{limit} ({E6}.2)", one))
        incl = np.degrees(np.arctan2(ax.h0, along))
        need = 45 if tie.kind == "double" else 60
        if incl < need - 1e-6:
            warnings.append(Warning("lacing-angle", f"lacing at {incl:.0f} deg to the member "
                                    f"axis; {E6}.2 asks for at least {need} deg", one))
    elif isinstance(tie, Battens):
        if tie.depth < ax.h0 / 2:
            warnings.append(Warning("tie-plate-short", f"intermediate tie plates "
                                    f"{tie.depth:.0f} mm long, less than half the distance "
                                    f"between the chords ({E6}.2)", one))
        if tie.thickness < ax.h0 / 50:
            warnings.append(Warning("tie-plate-thin", f"tie plates thinner than 1/50 of the "
                                    f"distance between the chords ({E6}.2)", one))


def lacing_bar(ax: OpenAxis) -> tuple[float, float, float]:
    """(unbraced length, radius of gyration, share of the shear per plane) of one lacing bar.

    A flat bar buckles about its thin axis, r = t / sqrt(12); crossed (double) lacing joined at
    its crossing buckles over 0.7 d and each bar takes half the shear (AISC 360-22 E6.2, from
    memory; common practice for EN).

    Example:
        >>> ax = OpenAxis("weak", 300.0, 5000.0, 2e6, 20.0, 800.0, Lacing("double", 40, 8, 800), "c")
        >>> [round(v, 2) for v in lacing_bar(ax)]
        [598.08, 2.31, 2.0]
    """
    d, _ = lacing_geometry(ax)
    double = ax.tie.kind == "double"
    return (0.7 * d if double else d), float(ax.tie.thickness / np.sqrt(12)), (2.0 if double else 1.0)


def _aisc_lacing_shear(ax: OpenAxis, res: CodeResult, A: float, Fy: float, E: float, t: Trace,
                       warnings: list[Warning], one: np.ndarray) -> None:
    """AISC 360-22 E6.2 (from memory): lacing proportioned for a shear normal to the member of
    2 % of its available compressive strength. The bars are E3 struts; where they cannot carry
    that shear, the member strength about this axis is lowered until they can (0.02 phi Pn <=
    phi Pbar holds in nominal terms, so it is the same for LRFD and ASD)."""
    o = ax.axis
    tie = ax.tie
    d, _ = lacing_geometry(ax)
    Lb, rb, share = lacing_bar(ax)
    slender = Lb / rb
    Fe = np.pi**2 * E / slender**2
    Fcr = 0.658 ** (Fy / Fe) * Fy if Fy / Fe <= 2.25 else 0.877 * Fe
    Pbar = t.add(f"Pn,bar,{o}", f"nominal strength of one lacing bar, {o} axis (L/r "
                 f"{slender:.0f})", "Fcr Ad (E3)", Fcr * tie.area, "N", "AISC 360-22 E3, E6.2")
    mode = res.modes[_MODE[o]]
    Pn = float(np.asarray(mode.Pn).reshape(-1)[0])
    V = t.add(f"V,lacing,{o}", f"shear the lacing must carry, {o} axis", "0.02 Pn",
              0.02 * Pn, "N", f"{E6}.2")
    Nbar = t.add(f"N,bar,{o}", f"force in one lacing bar, {o} axis", "V d / (n s h0)",
                 V * d / (tie.planes * share * ax.h0), "N", f"{E6}.2 (statics of the panel)")
    if Nbar > Pbar:
        limit = Pn * Pbar / Nbar
        t.add(f"Pn,lacing,{o}", f"member strength the lacing allows, {o} axis", "Pn Pbar / Nbar",
              limit, "N", f"{E6}.2")
        res.modes[_MODE[o]] = replace(mode, Pn=np.array(limit), Fcr=np.array(limit / A))
        warnings.append(Warning("lacing-shear", f"the lacing bars cannot carry 2 % of the "
                                f"member's strength ({E6}.2): the {o}-axis strength is lowered "
                                "to what they can carry", one))


def _en_ties(ax: OpenAxis, N: float, L: float, E: float, fy: float, t: Trace) -> None:
    """The forces in the lacing or battens and their connections at N (EN 1993-1-1 6.4.1 (7),
    6.4.2.2, 6.4.3.1 (2) and Fig. 6.11, from memory): V_Ed = pi M_Ed / L; a lacing bar
    N_d = V_Ed d / (n s h0); a batten (one of n planes) V_b = V_Ed a / (n h0) and
    M_b = V_Ed a / (2 n); a joint carries the bar force, or the batten's V_b and M_b."""
    o = ax.axis
    _, M, V = chord_force(ax, N, L, E)
    t.add(f"V_Ed,{o}", f"shear across the member at N_Ed = N_b,Rd, {o} axis", "pi M_Ed / L",
          V, "N", f"{EN64}.1 (7)")
    if isinstance(ax.tie, Lacing):
        d, _ = lacing_geometry(ax)
        _, _, share = lacing_bar(ax)
        Nd = t.add(f"N_d,Ed,{o}", f"force in one lacing bar, {o} axis", "V_Ed d / (n s h0)",
                   V * d / (ax.tie.planes * share * ax.h0), "N", f"{EN64}.2.2")
        t.add(f"F_joint,{o}", f"demand on each lacing bar's end connection, {o} axis",
              "N_d,Ed", Nd, "N", f"{EN64}.2.2 (connections: check the rivets or welds)")
    elif isinstance(ax.tie, Battens):
        n = ax.tie.planes
        Vb = t.add(f"V_b,Ed,{o}", f"shear in one batten, {o} axis", "V_Ed a / (n h0)",
                   V * ax.a / (n * ax.h0), "N", f"{EN64}.3.1 (2), Fig. 6.11")
        Mb = t.add(f"M_b,Ed,{o}", f"moment in one batten at the chord, {o} axis",
                   "V_Ed a / (2 n)", V * ax.a / (2 * n), "N*mm", f"{EN64}.3.1 (2), Fig. 6.11")
        t.add(f"F_joint,{o}", f"demand on each batten's connection to a chord, {o} axis: "
              f"shear {Vb / 1e3:.1f} kN with moment {Mb / 1e6:.2f} kN m", "V_b,Ed, M_b,Ed",
              Vb, "N", f"{EN64}.3.1 (2) (connections: check the rivet group or welds)")


def _batten_ratio(ax: OpenAxis, V: float, fy: float) -> float:
    """Utilization of one batten for its moment (elastic, W = t b^2 / 6) and shear
    (Av = t b, fy / sqrt(3)), gamma_M0 = 1.0 recommended (EN 1993-1-1 6.2.5, 6.2.6)."""
    b = ax.tie
    Mb = V * ax.a / (2 * b.planes)
    Vb = V * ax.a / (b.planes * ax.h0)
    return max(Mb / (b.thickness * b.depth**2 / 6 * fy), Vb / (b.thickness * b.depth * fy / np.sqrt(3)))


def _chord_resistance(ax: OpenAxis, fy: float, E: float, gamma_M1: float, t: Trace,
                      o: str) -> float:
    """N_b,Rd of one chord over the panel length a, about its least axis (conservative)."""
    lam1 = np.pi * np.sqrt(E / fy)
    lb = t.add(f"lb,ch,{o}", f"chord slenderness over a panel, {o} axis", "(a / ri) / lambda1",
               ax.a / ax.ri / lam1, "", f"{EN64}.2.2 / 6.4.3.1")
    alpha = 0.34 if "angle" in ax.chord else 0.49
    chi = float(reduction_factor(lb, alpha))
    return t.add(f"Nb,Rd,ch,{o}", f"chord buckling resistance over a panel, {o} axis "
                 f"(curve {'b' if alpha == 0.34 else 'c'})", "chi Ach fy / gamma_M1",
                 chi * ax.Ach * fy / gamma_M1, "N", "EN 1993-1-1 6.3.1")


def _en_solid(o: str, I: float, A: float, L: float, fy: float, E: float, t: Trace,
              how: str, tag: str = "") -> ModeResult:
    """Flexural buckling about an axis of the whole section (6.3.1), curve c: riveted
    built-up members are not in Table 6.2; curve c is that of U, T and solid sections
    (common practice)."""
    Ncr = t.add(f"Ncr,{tag}{o}", f"elastic critical load, {o} axis ({how})", "pi^2 E I / Lc^2",
                np.pi**2 * E * I / L**2, "N", "EN 1993-1-1 6.3.1.2")
    lb = t.add(f"lb,{tag}{o}", f"slenderness, {o} axis ({how})", "sqrt(A fy / Ncr)",
               np.sqrt(A * fy / Ncr), "", "EN 1993-1-1 6.3.1.3")
    chi = t.add(f"chi,{tag}{o}", f"reduction factor, {o} axis, curve c (built-up, common practice)",
                "(6.49), alpha 0.49", float(reduction_factor(lb, 0.49)), "",
                "EN 1993-1-1 6.3.1.2")
    return ModeResult(_MODE[o], np.array(L), np.array(lb), np.array(Ncr), np.array(chi * fy),
                      np.array(chi * A * fy))


#: EN 1993-1-1 Table 6.9 (from memory): largest spacing of the interconnections of a closely
#: spaced built-up member, in radii of gyration imin of one chord: 15 for chords in contact or
#: on packing plates (Fig. 6.12); 70 for star-battened angles with battens in pairs (Fig. 6.13).
#: A cross of four angles on packings is taken with 15 (each pair is back to back on packings).
CLOSE_SPACING = 15.0


def _closely_spaced(ax: OpenAxis, t: Trace) -> bool:
    """EN 1993-1-1 6.4.4 (1): chords in contact or on packings, joined at most 15 imin apart
    (Table 6.9): one integral member (Sv infinite); otherwise (2): treated as battened."""
    o = ax.axis
    ratio = t.add(f"a/imin,{o}", f"interconnection spacing over the least radius of one "
                  f"chord, {o} axis (limit {CLOSE_SPACING:.0f})", "a / imin", ax.a / ax.ri, "",
                  f"{EN64}.4 Table 6.9")
    close = ax.back_to_back and ratio <= CLOSE_SPACING
    if close:
        t.add("note", f"{o} axis: closely spaced chords within the Table 6.9 spacing: buckling "
              "checked as one integral member, shear stiffness ignored", "", "", "", f"{EN64}.4 (1)")
    else:
        why = ("the chords stand apart (not in contact or on packings)" if not ax.back_to_back
               else f"the interconnections are more than {CLOSE_SPACING:.0f} imin apart")
        t.add("note", f"{o} axis: {why}: treated as a battened member, the interconnections "
              "taken as rigid battens", "", "", "", f"{EN64}.4 (2)")
    return close


def _en_open(built: BuiltUp, ax: OpenAxis, L: float, fy: float, E: float, gamma_M1: float,
             t: Trace, warnings: list[Warning], one: np.ndarray) -> tuple[float, float]:
    """The largest N_Ed that the chord, end panel and lacing checks of 6.4 pass, and the
    effective critical load (N)."""
    o = ax.axis
    Ieff, mu = effective_inertia(ax, L)
    t.add(f"Ieff,{o}", f"effective second moment, {o} axis" + (f" (mu {mu:.2f})" if mu else ""),
          "0.5 h0^2 Ach" + (" + 2 mu Ich" if isinstance(ax.tie, Battens) else ""), Ieff, "mm^4",
          f"{EN64}.2.1 (6.72)" if isinstance(ax.tie, Lacing) else f"{EN64}.3.1 (6.74)")
    Sv = t.add(f"Sv,{o}", f"shear stiffness of the {_tie_name(ax)}, {o} axis", _sv_formula(ax),
               shear_stiffness(ax, E), "N", _sv_clause(ax))
    Ncr = t.add(f"Ncr,{o}", f"critical load of the built-up member, {o} axis", "pi^2 E Ieff / L^2",
                np.pi**2 * E * Ieff / L**2, "N", f"{EN64}.1 (6.70)")
    e0 = t.add("e0", "equivalent initial bow", "L / 500", L / 500, "mm", f"{EN64}.1 (1)")
    Nb_ch = _chord_resistance(ax, fy, E, gamma_M1, t, o)
    W = ax.Ich / ax.cmax if ax.cmax > 0 else np.inf
    lam_bar = ax.a / ax.ri / (np.pi * np.sqrt(E / fy))
    lacing_Rd = None
    if isinstance(ax.tie, Lacing):
        # the whole diagonal, crossed or not: EN gives no shorter length (on the safe side)
        Lb, _ = lacing_geometry(ax)
        i_bar = ax.tie.thickness / np.sqrt(12)
        lb_d = Lb / i_bar / (np.pi * np.sqrt(E / fy))
        lacing_Rd = t.add(f"Nb,Rd,d,{o}", f"lacing bar buckling resistance, {o} axis (curve c, "
                          f"over {Lb:.0f} mm)",
                          "chi Ad fy / gamma_M1", float(reduction_factor(lb_d, 0.49)) *
                          ax.tie.area * fy / gamma_M1, "N", "EN 1993-1-1 6.3.1")

    def ratio(N: float) -> float:
        Nch, M, V = chord_force(ax, N, L, E)
        if not np.isfinite(Nch):
            return np.inf
        worst = Nch / Nb_ch
        if isinstance(ax.tie, Battens):
            k = 1 + 0.6 * min(lam_bar, 1.0) * (0.5 * N / Nb_ch)
            worst = max(worst, 0.5 * N / Nb_ch + k * (V * ax.a / 4) / (W * fy / gamma_M1),
                        _batten_ratio(ax, V, fy))
        if lacing_Rd is not None:
            d, _ = lacing_geometry(ax)
            _, _, share = lacing_bar(ax)
            worst = max(worst, V * d / (ax.tie.planes * share * ax.h0) / lacing_Rd)
        return worst

    lo, hi = 0.0, float(built.section.A) * fy / gamma_M1
    for _ in range(60):
        mid = (lo + hi) / 2
        lo, hi = (mid, hi) if ratio(mid) <= 1 else (lo, mid)
    cap = lo
    t.add(f"Nb,Rd,{o}", f"largest N_Ed the chord" + (", end panel" if isinstance(ax.tie, Battens)
                                                      else "") + (" and lacing" if lacing_Rd else "")
          + f" checks pass, {o} axis", "N_ch,Ed = 0.5 N_Ed + M_Ed h0 Ach / (2 Ieff), "
          "M_Ed = N_Ed e0 / (1 - N_Ed/Ncr - N_Ed/Sv)", cap, "N", f"{EN64}.1 (6.69), (6.70)")
    _en_ties(ax, cap, L, E, fy, t)
    return cap, 1 / (1 / Ncr + 1 / Sv)


def _fasteners(ax: OpenAxis, Fu: float | None) -> bool:
    """True when the ties' end fasteners are recorded (and so checked); the member's Fu is
    then needed for bearing."""
    f = getattr(ax.tie, "fasteners", None)
    if f is None:
        return False
    if Fu is None or not np.isfinite(Fu):
        raise InputError("material.Fu", "", "the tensile strength is needed for bearing at the "
                         "lacing's or battens' end fasteners", "give Fu with the material's values, "
                         "or a grade")
    return True


def _ply(built: BuiltUp, ax: OpenAxis) -> float:
    """The thinner of the tie and the chord's plate the fasteners pass through (mm)."""
    return float(min(ax.tie.thickness, built.parts[0].tf))


def _per_unit_shear(ax: OpenAxis) -> tuple[float, float]:
    """(bar force, batten end (shear, moment) folded to the most loaded fastener) per unit of
    the shear V across the member: a lacing bar V d / (n s h0); a batten V a / (n h0) and
    V a / (2 n) (EN 1993-1-1 Fig. 6.11 statics, from memory)."""
    from .tiejoint import batten_force

    tie = ax.tie
    if isinstance(tie, Lacing):
        d, _ = lacing_geometry(ax)
        _, _, share = lacing_bar(ax)
        return d / (tie.planes * share * ax.h0), 0.0
    return 0.0, batten_force(tie.fasteners, ax.a / (tie.planes * ax.h0), ax.a / (2 * tie.planes))


def _joint_strength(code: str, built: BuiltUp, ax: OpenAxis, Fu: float, basis: str,
                    t: Trace) -> float:
    """The strength the end fasteners offer against their force: the group along a lacing
    bar, the most loaded fastener of a batten (N)."""
    from .tiejoint import group_strength

    o, tie = ax.axis, ax.tie
    if isinstance(tie, Battens) and tie.fasteners.count < 2:
        raise InputError(f"{tie.fasteners.field}.count", 1, "a single rivet or bolt cannot carry "
                         "the batten's moment (battens are rigid frames with the chords)",
                         "record the fasteners at one end of one batten, at least 2")
    group, one = group_strength(code, tie.fasteners, _ply(built, ax), Fu,
                                tie.width / 2 if isinstance(tie, Lacing) else None, basis, t,
                                f"{'bar' if isinstance(tie, Lacing) else 'batten'},{o}")
    if isinstance(tie, Lacing):
        return group
    return t.add(f"R,one,batten,{o}", "strength of the most loaded fastener of a batten's end "
                 "(every distance taken as the end distance, on the safe side)",
                 "min(shear, bearing at the end distance)", one, "N",
                 "AISC 360-22 J3.6, J3.10" if code == "aisc360-22" else "EN 1993-1-8 Table 3.4")


def _aisc_joint(built: BuiltUp, ax: OpenAxis, res: CodeResult, factor: float, Fu: float,
                basis: str, t: Trace) -> float:
    """AISC: the lacing carries 2 % of the available strength (E6.2); the end fasteners of a
    bar (J3.6, J3.10) limit the member to the strength whose 2 % they carry. AISC gives no
    force for tie plates (E6.2 sets their proportions): the same 2 % with the batten's statics
    is used for their fasteners (a judgement). Returns the nominal strength allowed (N)."""
    o = ax.axis
    R = _joint_strength("aisc360-22", built, ax, Fu, basis, t)
    bar, batten = _per_unit_shear(ax)
    per = bar or batten
    Pc = float(np.asarray(res.modes[_MODE[o]].Pn).reshape(-1)[0]) * factor
    what = "one lacing bar's end" if bar else "the most loaded fastener of a batten's end"
    t.add(f"F,joint,{o}", f"force on {what} at 2 % of the available strength, {o} axis",
          "0.02 Pc d / (n s h0)" if bar else "0.02 Pc with V a / (n h0), V a / (2 n) on the group",
          0.02 * Pc * per, "N", f"{E6}.2" + ("" if bar else "; judgement (AISC gives no tie plate force)"))
    limit = t.add(f"Pc,joint,{o}", f"available member strength the end fasteners allow, {o} axis",
                  "R_joint / (0.02 F per unit shear)", R / (0.02 * per), "N",
                  f"{E6}.2; AISC 360-22 J3")
    return limit / factor


def _en_joint(built: BuiltUp, ax: OpenAxis, L: float, fy: float, E: float, Fu: float,
              cap: float, t: Trace) -> float:
    """EN: the largest N_Ed whose lacing bar force or batten shear and moment (6.4.2.2,
    6.4.3.1 (2)) the end fasteners resist (EN 1993-1-8 Table 3.4), by bisection (N)."""
    o = ax.axis
    R = _joint_strength("en1993-1-1", built, ax, Fu, "lrfd", t)
    bar, batten = _per_unit_shear(ax)
    per = bar or batten

    def force(N: float) -> float:
        V = chord_force(ax, N, L, E)[2]
        return V * per

    t.add(f"F,joint,{o}", f"force on {'one lacing bar' if bar else 'the most loaded fastener of a batten'}"
          f"'s end at the member's other checks' N_Ed, {o} axis", "V_Ed d / (n s h0)" if bar
          else "V_Ed a / (n h0), V_Ed a / (2 n) on the group", force(cap), "N",
          f"{EN64}.2.2" if bar else f"{EN64}.3.1 (2)")
    lo, hi = 0.0, float(built.section.A) * fy
    for _ in range(60):
        mid = (lo + hi) / 2
        lo, hi = (mid, hi) if force(mid) <= R else (lo, mid)
    return t.add(f"Nb,Rd,joint,{o}", f"largest N_Ed the end fasteners resist, {o} axis",
                 "F(N_Ed) <= R_joint (bisection)", lo, "N", f"{EN64}; EN 1993-1-8 Table 3.4")
