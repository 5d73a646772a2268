"""Section loss over a band of height (most often at the base): the member and the section there.

Two checks, both conservative:

- The member: its bending stiffness drops inside the band. The elastic buckling load of each
  axis with the stepped stiffness (finite elements, the record's ends and counted braces) is
  compared with the column as built; the effective length grows by 1/sqrt(factor), and the
  member is checked with the section as built over that longer length. Torsional buckling keeps
  the section as built (a short band adds little to the twist of the whole member; a band of
  more than a quarter of the length is flagged).
- The section in the band: its axial strength with no member buckling (the code's check at an
  effective length of 1 mm: yielding of what remains, with the local buckling of thinned plates by
  AISC 360-22 E7 or EN 1993-1-5 effective widths), together with every moment of the record at
  its largest, amplified by 1/(1 - P/Pe) of the member (Cm = 1) wherever it stands along the
  height (conservative): AISC H1-1a/b with the band's flexural strength (Chapter F, the member's
  unbraced length); EN 1993-1-1 6.2.1 (7) linear sum (conservative); elastic: first yield.
- Holes through the plates at one height in the band (``section.loss.holes``: the width lost across
  each flange, the web, or one wall): open holes (corrosion, not filled by fasteners) are taken
  out of the area (yield on the net area) and out of the flexural strength by the larger of the
  plastic-modulus and second-moment losses, each hole where it costs most (at a flange tip, at
  the end of the web, in the wall farthest from the axis): common practice, conservative. The
  member's stepped stiffness leaves the holes out (they are short against the band).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any, Callable, Mapping

import numpy as np

from fieldcol.codes import CodeResult
from fieldcol.codes._en_class import classify
from fieldcol.codes._flexure import aisc_flexure, en_effective_modulus, en_moment, largest_root
from fieldcol.codes._inputs import prepare
from fieldcol.record import AXES, ColumnInput
from fieldcol.stability import Brace, band_factor
from fieldcol.trace import Trace

_I = {"strong": "Ix", "weak": "Iy"}
TINY = 1.0   # mm: an effective length at which no member buckling is left


@dataclass
class BandResult:
    """The section check in the loss band.

    Fields: ``axial`` (the code check of the band's section at TINY lengths), ``capacity`` (N: the
    axial force, with the moments in proportion, the band's section holds), ``ratio`` (at the
    demand, or None), ``equation`` (what governs there), ``factors`` (per axis: how much the band
    lowers the member's buckling load).
    """

    axial: CodeResult
    capacity: float
    ratio: float | None
    equation: str
    factors: dict[str, float] = field(default_factory=dict)
    section_strength: float | None = None   # N: the axial strength there (holes deducted)


def _one(v: Any) -> float:
    return float(np.asarray(v, dtype=float).reshape(-1)[0])


def member_factors(col: ColumnInput, braces: Mapping[str, tuple[tuple[int, float], ...]],
                   trace: Trace) -> dict[str, float]:
    """Per axis, the factor by which the band lowers the elastic buckling load.

    Args:
        col: the parsed record (``col.band`` set); braces: per axis the (index, stiffness) of the
            braces counted; trace: the steps go here.
    Returns:
        ``{"strong": f, "weak": f}``, 0 < f <= 1.

    Example:
        >>> from fieldcol.record import parse_record
        >>> c = parse_record({"tag": "C", "section": {"name": "W10X49", "loss": {"flange": "0.3 in",
        ...     "from": "0 in", "to": "12 in"}}, "material": "A992", "length": "14 ft"})
        >>> f = member_factors(c, {"strong": (), "weak": ()}, Trace())
        >>> 0.99 < f["weak"] <= 1.0
        True
    """
    b = col.band
    out = {}
    for ax in AXES:
        Ig = _one(getattr(col.section, _I[ax]))
        Ib = _one(getattr(b.section, _I[ax]))
        spec = col.axes[ax]
        br = [Brace(spec.braces[i].at, k) for i, k in braces[ax]]
        f = band_factor(col.length, col.material.E * Ig, spec.bottom, spec.top, br, b.start, b.end,
                        min(1.0, Ib / Ig), field=b.field)
        out[ax] = f
        trace.add(f"I_band/I_{ax}", f"stiffness left in the loss band, {ax} axis", "I band / I as built",
                  Ib / Ig, "", "section")
        trace.add(f"f_band_{ax}", f"elastic buckling load with the band over that as built, {ax} axis",
                  "finite elements, stepped EI, the record's ends and counted braces", f, "", "elastic stability")
    if (b.end - b.start) > col.length / 4:
        trace.add("band", "a band longer than L/4: torsional buckling still uses the section as built", "",
                  b.end - b.start, "mm", "common practice")
    return out


def check_band(col: ColumnInput, Fy: float, code_check: Callable[..., CodeResult], member: CodeResult,
               Lc_twist: float, demand: float | None, sources: Mapping[str, Mapping[str, float]],
               trace: Trace, warnings: list[dict[str, str]], factors: dict[str, float]) -> BandResult:
    """The section in the band under the axial force and the record's moments.

    Args:
        col: the parsed record; Fy: MPa; code_check: ``(section, Fy, Lc_strong, Lc_weak, Lc_twist)
            -> CodeResult`` under the record's code; member: the member's axial check (Pe per axis);
        Lc_twist: the member's unbraced length for lateral-torsional buckling (mm);
        demand: N or None; sources: ``bending.moment_sources``; factors: ``member_factors``.
    Returns:
        a ``BandResult``.

    Example:
        >>> from fieldcol.assess import assess
        >>> a = assess({"tag": "C", "section": {"name": "W10X49", "loss": {"flange": "0.2 in",
        ...     "from": "0 in", "to": "6 in"}}, "material": "A992", "length": "14 ft"})
        >>> a.governing_mode
        'section-band'
    """
    b = col.band
    sec = b.section
    t = Trace()
    ax_res = code_check(sec, Fy, TINY, TINY, TINY)
    fA, fM = hole_factors(sec, b.holes, t)
    Pc = t.add("Pc_band", f"axial strength of the section in the band ({b.start:.0f} to {b.end:.0f} mm), no member "
               "buckling (local buckling of the thinned plates included)"
               + ("; holes: times A_net / A" if b.holes else ""), "the code's check at Lc = 1 mm",
               _one(ax_res.design) * fA, "N", {"aisc360-22": "AISC 360-22 E3, E7", "en1993-1-1":
                                               "EN 1993-1-1 6.2.4; EN 1993-1-5 4.4"}.get(col.code, "squash load"))
    moments = any(v > 0 for s in sources.values() for v in s.values())
    if not moments:
        ratio = None if demand is None else t.add("ratio_band", "axial ratio in the band", "Pr / Pc,band",
                                                  demand / Pc if Pc > 0 else math.inf, "", "")
        trace.extend(t)
        return BandResult(ax_res, Pc, ratio, "axial", factors, Pc)
    s, v, _ = prepare(sec, Fy=Fy, E=col.material.E, G=col.material.G, Lb=Lc_twist)
    for name in ("Sx", "Sy", "Zx", "Zy", "ho"):
        s[name] = np.asarray(getattr(sec, name), dtype=float).reshape(1)
    Mc = {}
    for ax in AXES:
        sub = Trace()
        if col.code == "aisc360-22":
            Mn, _ = aisc_flexure(sec.kind, ax, s, v["Fy"], v["E"], v["Lb"], sub)
            Mc[ax] = _one(0.90 * Mn if col.basis != "asd" else Mn / 1.67)
            how, clause = "phi_b Mn or Mn / Omega_b of the band's section", "AISC 360-22 F1"
        elif col.code == "en1993-1-1":
            eps = np.sqrt(235.0 / v["Fy"])
            cls, _ = classify(sec.kind, s, eps, Trace())
            Weff = en_effective_modulus(sec.kind, ax, s, eps, Trace()) if (cls == 4).any() else None
            M, chi = en_moment(sec.kind, ax, s, cls, v["Fy"], v["E"], v["G"], v["Lb"], sub, Weff)
            Mc[ax] = _one(chi * M) / col.gamma_M1
            how, clause = "chi_LT M_Rk / gamma_M1 of the band's section", "EN 1993-1-1 6.2.5, 6.3.2"
        else:
            Mc[ax] = Fy * _one(getattr(sec, "Sx" if ax == "strong" else "Sy"))
            how, clause = "Fy S of the band's section", "first yield (classical)"
        Mc[ax] *= fM[ax]
        t.add(f"Mc_band_{ax}", f"flexural strength of the section in the band, {ax} axis", how
              + (", times the holes' factor" if b.holes else ""), Mc[ax], "N*mm", clause)
    Pe = {ax: _one(member.modes[f"flexural-{ax}"].Pe) for ax in AXES}
    Pr = demand or 0.0
    alpha = 1.6 if col.basis == "asd" else 1.0

    def Mr(P: np.ndarray, ax: str) -> np.ndarray:
        with np.errstate(divide="ignore", invalid="ignore"):
            amp = np.where(alpha * P < Pe[ax], 1.0 / (1.0 - alpha * P / Pe[ax]), np.inf)
        lam = P / Pr if Pr > 0 else 0.0
        first = lam * sources["ends"][ax] + P * (sources["bow"][ax] + sources["sway"][ax])
        return lam * sources["given"][ax] + np.where(first > 0, amp * first, 0.0)

    def g(P: np.ndarray) -> np.ndarray:
        m = Mr(P, "strong") / Mc["strong"] + Mr(P, "weak") / Mc["weak"]
        p = P / Pc
        if col.code == "aisc360-22":
            return np.where(p >= 0.2, p + 8.0 / 9.0 * m, p / 2.0 + m)
        return p + m

    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        cap = _one(largest_root(g, np.array([Pc]))) if Pr > 0 else Pc
        ratio = None
        eq = {"aisc360-22": "H1-1 (band)", "en1993-1-1": "6.2.1 (7) (band)"}.get(col.code, "first yield (band)")
        if Pr > 0:
            for ax in AXES:
                t.add(f"Mr_band_{ax}", f"largest moment taken at the band, {ax} axis",
                      "given + (end + P e + P D) / (1 - alpha P/Pe) (Cm = 1, conservative)", _one(Mr(np.array([Pr]), ax)),
                      "N*mm", "AISC 360-22 App. 8; EN 1993-1-1 5.2.2")
            ratio = max(_one(g(np.array([Pr]))), Pr / Pc)
            t.add("ratio_band", "interaction in the band",
                  "AISC H1-1a/b; EN N/N_Rd + My/My,Rd + Mz/Mz,Rd (6.2.1 (7)); elastic: first yield", ratio, "", eq)
    t.add("P_band", "axial capacity of the band's section with the moments in proportion", "bisection", cap, "N", eq)
    trace.extend(t)
    return BandResult(ax_res, cap, ratio, eq, factors, Pc)


def hole_factors(sec: Any, holes: Mapping[str, float], trace: Trace | None = None
                 ) -> tuple[float, dict[str, float]]:
    """What open holes at one height leave of the band's section: A_net / A, and per axis the
    smaller of Z_net / Z and I_net / I (each hole where it costs most; see the module notes).

    Args:
        sec: the band's section; holes: width lost (mm) across each ``flange`` and the ``web`` of an
            I, or one ``wall`` of a hollow section.
    Returns:
        (area factor, {"strong": f, "weak": f}); (1.0, 1.0 each) without holes.

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> fA, fM = hole_factors(from_catalogue("W10X49"), {"web": 50.8})
        >>> round(fA, 3), round(fM["weak"], 4)
        (0.953, 0.998)
    """
    one = {ax: 1.0 for ax in AXES}
    if not holes:
        return 1.0, one
    g = {k: float(np.asarray(getattr(sec, k)).reshape(-1)[0])
         for k in ("A", "Ix", "Iy", "Zx", "Zy", "d", "bf", "tf", "tw")}
    d, bf, tf, tw = g["d"], g["bf"], g["tf"], g["tw"]
    dA = dZx = dZy = dIx = dIy = 0.0
    if sec.kind == "i":
        wf, ww, h = holes.get("flange", 0.0), holes.get("web", 0.0), d - 2 * tf
        dA = 2 * wf * tf + ww * tw
        dZx = wf * tf * (d - tf) + tw * ww * (h - ww) / 2
        dZy = tf * wf * (bf - wf) + tw**2 * ww / 4
        dIx = 2 * wf * tf * ((d - tf) / 2) ** 2 + tw * ww * ((h - ww) / 2) ** 2 + tw * ww**3 / 12
        dIy = 2 * (tf * wf * ((bf - wf) / 2) ** 2 + tf * wf**3 / 12) + ww * tw**3 / 12
    else:
        w, t = holes.get("wall", 0.0), tf
        dA = w * t
        dZx, dZy = w * t * (d - t) / 2, w * t * (bf - t) / 2
        dIx, dIy = w * t * ((d - t) / 2) ** 2, w * t * ((bf - t) / 2) ** 2
    fA = 1 - dA / g["A"]
    fM = {"strong": min(1 - dZx / g["Zx"], 1 - dIx / g["Ix"]), "weak": min(1 - dZy / g["Zy"], 1 - dIy / g["Iy"])}
    if trace is not None:
        rule = "open holes deducted, each where it costs most (common practice)"
        trace.add("A_net/A", "area left by the holes in the band", "1 - sum w t / A", fA, "", rule)
        for ax in AXES:
            trace.add(f"f_holes_{ax}", f"flexural strength left by the holes, {ax} axis",
                      "min(1 - dZ/Z, 1 - dI/I)", fM[ax], "", rule)
    return fA, fM


__all__ = ["BandResult", "TINY", "check_band", "hole_factors", "member_factors"]
