"""The Check tab's view-model: the result right under the status (capacity about each axis and
in torsion, what governs and why, utilization, warnings), the column curve with this column's
points, and the trace in the code's own symbols.

Built from a saved check (the documented JSON of ``Assessment.to_dict``), so the tab, the
report and the command line read the same numbers. Nothing here imports Flet.

Public API::

    check_summary(result, system) -> CheckSummary
    latest_summary(store, column_id) -> CheckSummary | None
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Mapping

from fieldcol import CAUTION
from fieldcol.assess import MODE_WORDS
from fieldcol.units import us_words

if TYPE_CHECKING:
    from fieldcol.store import Store

CODE_TITLES = {"aisc360-22": "AISC 360-22", "en1993-1-1": "EN 1993-1-1",
               "elastic": "Elastic buckling (reference)"}
_AXIS_NAMES = {
    "aisc360-22": {"flexural-strong": "Strong axis (x)", "flexural-weak": "Weak axis (y)",
                   "torsional": "Torsion (z)", "yield": "Squash (yield)"},
    "en1993-1-1": {"flexural-strong": "Strong axis (y-y)", "flexural-weak": "Weak axis (z-z)",
                   "torsional": "Torsion", "yield": "Cross-section (N_c,Rk)"},
}
_AXIS_NAMES["elastic"] = _AXIS_NAMES["aisc360-22"]
_SUFFIX = {"aisc360-22": {"flexural-strong": "x", "flexural-weak": "y", "torsional": "z"},
           "en1993-1-1": {"flexural-strong": "y", "flexural-weak": "z", "torsional": "T"}}
_SUFFIX["elastic"] = _SUFFIX["aisc360-22"]


#: the clause of a step that restates an input (a code check lists the material, the
#: effective lengths and the demand it was given): shown once, where it was worked out
_RESTATED = ("material", "effective length", "demand")


@dataclass(frozen=True)
class Capacity:
    """The design strength of one mode, with what it rests on."""
    mode: str
    name: str              # "Weak axis (z-z)"
    strength: str          # design (or allowable) strength with its unit
    length: str            # buckling length, "" for squash
    slenderness: str       # "Lc/r 86.4" or "λ-bar 1.12"
    governs: bool
    applies: bool = True   # False: reported only (torsion of a closed section)


@dataclass(frozen=True)
class CurvePoint:
    """One mode of this column on the chart."""
    label: str
    x: float
    stress: float          # in the display unit
    governs: bool


@dataclass(frozen=True)
class Chart:
    """The column curve(s) of the check's code and this column's points on them."""
    curves: list[tuple[str, list[tuple[float, float]]]]   # (label, [(x, stress)])
    points: list[CurvePoint]
    x_name: str
    stress_name: str
    stress_unit: str
    x_max: float
    stress_max: float
    caption: str


@dataclass(frozen=True)
class TraceLine:
    """One step of the trace, in the code's symbols."""
    symbol: str
    value: str
    what: str
    formula: str
    clause: str

    @property
    def source(self) -> str:
        """The formula and the clause on one line, said once when they are the same (a value
        from the record read "record · record").

        Example:
            >>> TraceLine("Pr", "120 kip", "required axial strength", "record", "record").source
            'record'
        """
        return " · ".join(dict.fromkeys(x for x in (self.formula, self.clause) if x))


@dataclass(frozen=True)
class CheckSummary:
    """Everything the Check tab shows, in the site's units."""
    title: str                      # "EN 1993-1-1 check"
    status_word: str
    status_icon: str
    status_tone: str
    utilization: str                # "1.11" or "none"
    result_line: str                # "N_Ed 900 kN / N_b,Rd 812 kN = 1.11"
    capacities: list[Capacity]
    governs: str                    # what governs, in words
    why: str                        # why it governs
    warnings: list[str]
    chart: Chart | None
    trace: list[TraceLine]
    checked_at: str
    caution: str = CAUTION
    basis: str = ""
    extra: list[str] = field(default_factory=list)
    interaction: str = ""           # which interaction equation governs, with its moments


def _val(d: Any) -> float | None:
    if isinstance(d, dict):
        v = d.get("value")
        return None if v is None else float(v)
    return None


def _fmt(value: float | None, kind: str, system: str) -> str:
    from fieldcol.units import format_quantity

    if value is None or not math.isfinite(value):
        return "none"
    return format_quantity(value, kind, system)


def _step_text(value: Any, unit: str, system: str, what: str = "") -> str:
    from fieldcol.units import format_reading, format_step

    if value is None:
        return "none"
    if isinstance(value, str):
        return {"True": "yes", "False": "no"}.get(value, value)
    if isinstance(value, bool):
        return "yes" if value else "no"
    if unit == "mm" and what.startswith("measured "):
        # a reading (the bow, the out-of-plumb) as it was recorded and as its warning, the
        # record and the app write it, not to four figures as a worked-out length
        return format_reading(float(value), system)
    return format_step(float(value), unit, system)


def _yes_no(v: Any) -> str:
    return "yes" if v in (1, 1.0, True, "True") else "no" if v in (0, 0.0, False, "False") else str(v)


def design_symbol(code: str, basis: str) -> str:
    """The symbol of the design strength as the code writes it (the Check tab's result line
    and the report's table of modes).

    Example:
        >>> design_symbol("aisc360-22", "lrfd"), design_symbol("en1993-1-1", "en")
        ('φPn', 'N_b,Rd')
    """
    if code == "en1993-1-1":
        return "N_b,Rd"
    if code == "elastic":
        return "Pn"
    return "Pn/Ω" if basis == "asd" else "φPn"


def _demand_symbol(code: str) -> str:
    return "N_Ed" if code == "en1993-1-1" else ("P" if code == "elastic" else "Pr")


def _trace_symbol(step: Mapping[str, Any], code: str) -> str:
    """A step's symbol as the code writes it; a utilization other than the axial one (with the
    bow, the moments, the loss band, the knowledge factor) keeps the plain ``U``: EN's
    ``N_Ed / N_b,Rd`` beside an interaction ratio would name a division that is not the one
    made."""
    from fieldcol.trace import display_symbol

    symbol = str(step.get("symbol", ""))
    if symbol == "U" and not str(step.get("what", "")).startswith("utilization, axial"):
        return "U"
    return display_symbol(symbol, code)


def check_summary(result: Mapping[str, Any], system: str, checked_at: str = "") -> CheckSummary:
    """The Check tab from a saved check.

    Args:
        result: ``Assessment.to_dict()`` (as the store keeps it).
        system: ``us`` or ``si``.
        checked_at: when it was checked (ISO text), shown under the result.

    Returns:
        A ``CheckSummary``.

    Example:
        >>> from fieldcol.assess import assess
        >>> r = assess({"tag": "C", "section": "HE 200 B", "material": "S355", "length": "6 m",
        ...             "code": "en1993-1-1", "demand": {"axial": "900 kN"}}).to_dict()
        >>> s = check_summary(r, "si")
        >>> s.title, s.result_line.split(" = ")[0]
        ('EN 1993-1-1 check', 'N_Ed 900 kN / N_b,Rd 828.2 kN')
    """
    from fieldcol.trace import display_symbol
    from fieldcol.ui.model import status_of

    code = str(result.get("code", "aisc360-22"))
    basis = str(result.get("basis", ""))
    gov = str(result.get("governing_mode") or "")
    util = _val(result.get("utilization"))
    status = status_of(util, True, result.get("status"))
    design = _val(result.get("design_strength"))
    nominal = _val(result.get("nominal_strength"))
    axial_design = _val(result.get("axial_design_strength"))
    factor = (axial_design / nominal) if axial_design and nominal else 1.0
    demand = _val(result.get("demand"))
    dsym, psym = design_symbol(code, basis), _demand_symbol(code)
    if demand is not None:
        line = (f"{psym} {_fmt(demand, 'force', system)} / {dsym} {_fmt(design, 'force', system)}"
                f" = {util:.2f}" if util is not None and math.isfinite(util)
                else f"{psym} {_fmt(demand, 'force', system)}; no strength given")
        if gov in ("beam-column", "section-band") and util is not None and math.isfinite(util):
            # with bending the utilization is the interaction, not the ratio of two forces
            eq = ((result.get("beam_column") or {}).get("equation") if gov == "beam-column"
                  else (result.get("section_band") or {}).get("equation")) or ""
            line = (f"{psym} {_fmt(demand, 'force', system)} / the section in the loss band "
                    f"{_fmt(design, 'force', system)} = {util:.2f}" if eq == "axial" else
                    f"{psym} {_fmt(demand, 'force', system)} with bending: {eq} = {util:.2f} "
                    f"(capacity {_fmt(design, 'force', system)})")
        comb = (result.get("demand") or {}).get("combination")
        extra = [f"{psym} from {comb}"] if comb not in (None, "given") else []
    else:
        line = f"{dsym} {_fmt(design, 'force', system)} (no demand recorded)"
        extra = []
    modes = result.get("modes") or {}
    names = _AXIS_NAMES.get(code, _AXIS_NAMES["aisc360-22"])
    closed = ((result.get("section") or {}).get("kind") or "i") != "i"
    caps = []
    xname = "λ-bar" if code == "en1993-1-1" else "Lc/r"
    # the four of every column first, then what only some have (a built-up column's tie joints)
    order = [m for m in ("flexural-strong", "flexural-weak", "torsional", "yield") if m in modes]
    for mode in order + [m for m in modes if m not in order]:
        m = modes.get(mode)
        if not m:
            continue
        pn = _val(m.get("nominal_strength"))
        sl = _val(m.get("slenderness"))
        sym = xname + ("" if mode == "yield" else "_" + _SUFFIX.get(code, {}).get(mode, "")) \
            if code == "en1993-1-1" else xname
        name = names.get(mode) or MODE_WORDS.get(mode, mode).capitalize()
        caps.append(Capacity(
            mode, name, _fmt(None if pn is None else pn * factor, "force", system),
            "" if mode == "yield" or m.get("effective_length") is None
            else _fmt(_val(m.get("effective_length")), "length", system),
            "" if sl is None or mode == "yield" else f"{sym} {sl:.3g}" if code == "en1993-1-1"
            else f"{sym} {sl:.1f}",
            mode == gov,
            bool(m.get("applies", not (closed and mode == "torsional")))))
    governs, why = _why(result, gov, code, system)
    warnings = [str(w.get("message", w)) if isinstance(w, dict) else str(w)
                for w in result.get("warnings") or []]
    # the engine writes its own units (mm, MPa) into a step's words: a US site reads inches, ksi
    words = us_words if system == "us" else str
    trace: list[TraceLine] = []
    shown = set()
    for s in result.get("steps") or []:
        step = TraceLine(_trace_symbol(s, code),
                         _yes_no(s.get("value"))
                         if "≤" in display_symbol(str(s.get("symbol", "")), code)
                         or str(s.get("symbol", "")).startswith("slender")
                         else words(_step_text(s.get("value"), str(s.get("unit", "")), system,
                                               str(s.get("what", "")))),
                         words(str(s.get("what", ""))), words(str(s.get("formula", ""))),
                         str(s.get("clause", "")))
        if step.clause in _RESTATED and (step.symbol, step.value) in shown:
            continue  # the code check's own list of its inputs: each was given above
        shown.add((step.symbol, step.value))
        trace.append(step)
    return CheckSummary(
        title=f"{CODE_TITLES.get(code, code)} check" if code != "elastic" else CODE_TITLES[code],
        status_word=status.word, status_icon=status.icon, status_tone=status.tone,
        utilization="none" if util is None else f"{util:.2f}", result_line=line,
        capacities=caps, governs=governs, why=why, warnings=warnings,
        chart=_chart(result, code, system, gov), trace=trace,
        checked_at=checked_at.replace("T", " ")[:16] + " UTC" if checked_at else "",
        basis=f"γ_M1 = {_gamma(result)}" if code.startswith("en") else
        {"lrfd": "LRFD", "asd": "ASD"}.get(basis, ""),
        extra=extra, interaction=interaction_words(result, system))


_EQUATIONS = {
    "H1-1a": "AISC 360-22 (H1-1a) governs: Pr/Pc ≥ 0.2, Pr/Pc + 8/9 (Mrx/Mcx + Mry/Mcy)",
    "H1-1b": "AISC 360-22 (H1-1b) governs: Pr/Pc < 0.2, Pr/(2 Pc) + Mrx/Mcx + Mry/Mcy",
    "6.61": "EN 1993-1-1 (6.61) governs: buckling about the strong axis with bending",
    "6.62": "EN 1993-1-1 (6.62) governs: buckling about the weak axis with bending",
    "first yield": "First yield governs: the amplified bow and moments bring the extreme fibre "
                   "to yield (elastic check)",
}


def interaction_words(result: Mapping[str, Any], system: str) -> str:
    """Which interaction equation governs a column with bending, with its ratio and the
    required moments; ``""`` when the check has no bending.

    Example: ``interaction_words(r, "us")`` gives ``"AISC 360-22 (H1-1a) governs: Pr/Pc ≥ 0.2,
    Pr/Pc + 8/9 (Mrx/Mcx + Mry/Mcy) = 0.49 at the demand; Mr about the strong axis 20 kip*ft,
    about the weak axis 0"``.
    """
    bc = result.get("beam_column")
    if not isinstance(bc, Mapping):
        return ""
    eq = str(bc.get("equation") or "")
    head = _EQUATIONS.get(eq, f"Interaction {eq} governs")
    ratio = _val(bc.get("interaction"))
    if ratio is not None and math.isfinite(ratio):
        head += f" = {ratio:.2f} at the demand"
    mr = bc.get("required_moment") or {}
    moments = []
    for ax in ("strong", "weak"):
        if ax in mr:
            val = _val(mr.get(ax))
            moments.append(f"about the {ax} axis "
                           + (_fmt(val, "moment", system) if val else "0"))
    return head + (f"; Mr {', '.join(moments)}" if moments else "")


def _gamma(result: Mapping[str, Any]) -> str:
    g = (result.get("input") or {}).get("gamma_M1", 1.0)
    return f"{float(g):g}"


def _why(result: Mapping[str, Any], gov: str, code: str, system: str) -> tuple[str, str]:
    """What governs, in words, and why (its length, slenderness and what sets the length)."""
    modes = result.get("modes") or {}
    lengths = result.get("lengths") or {}
    words = {"flexural-strong": "Buckling about the strong axis",
             "flexural-weak": "Buckling about the weak axis",
             "torsional": "Twisting (torsional buckling)", "yield": "Squashing (yield)",
             "bow": "The measured bow (bending with the axial load)", "": "No strength"}
    verb = " govern" if gov == "tie-joint" else " governs"  # (the rivets or bolts ...)
    head = words.get(gov, MODE_WORDS.get(gov, gov).capitalize()) + (verb if gov else ": the code gives none for this column")
    if gov in ("flexural-strong", "flexural-weak", "torsional"):
        ax = {"flexural-strong": "strong", "flexural-weak": "weak", "torsional": "twist"}[gov]
        m = modes.get(gov) or {}
        ln = lengths.get(ax) or {}
        K = _val(ln.get("K"))
        seg = _val(ln.get("segment"))
        Lc = _val(m.get("effective_length"))
        sl = _val(m.get("slenderness"))
        method = {"theoretical": "classical K", "recommended": "recommended design K",
                  "analysis": "buckling analysis of the whole column",
                  "override": "K set by the engineer", "alignment": "alignment chart",
                  "common practice K_z": "twist restraints"}.get(str(ln.get("method")), "")
        braces = len(ln.get("braces_counted") or [])
        held = (f"{braces} brace{'s' if braces != 1 else ''} counted" if braces
                else "no brace counted")
        sfx = _SUFFIX.get(code, {}).get(gov, "")
        slen = (f"λ-bar_{sfx} {sl:.3g}" if code == "en1993-1-1" else f"Lc/r {sl:.1f}") if sl else ""
        why = (f"its buckling length {_fmt(Lc, 'length', system)}"
               + (f" (K {K:.2f} x {_fmt(seg, 'length', system)}, {method}; {held})"
                  if K is not None and seg is not None and ax != "twist" else
                  f" ({held}, {method})" if ax == "twist" else "")
               + (f" gives {slen}" if slen else "")
               + ", the lowest strength of the modes.")
        return head, why[0].upper() + why[1:]
    if gov == "yield":
        return head, "Every buckling length is short enough that the full section yields first."
    if gov == "bow":
        allowed = (result.get("bow") or {}).get("allowance") or "L/1000"
        # the heading already says "measured bow": the reason starts with what is new
        return head, (f"The part beyond the curve's allowance ({allowed}), taken as an "
                      "eccentricity of the axial load, lowers the capacity below the axial check.")
    if gov == "beam-column":
        eq = (result.get("beam_column") or {}).get("equation") or ""
        return head, (f"The moments recorded (given, beam reactions, bow, out-of-plumb) with the axial "
                      f"load: the interaction ({eq}) lowers the capacity below the axial check.")
    if gov == "section-band":
        b = result.get("section_band") or {}
        start, to = _val(b.get("from")), _fmt(_val(b.get("to")), "length", system)
        where = (f"From the bottom to {to} above it" if start == 0 else
                 f"From {_fmt(start, 'length', system)} to {to} above the bottom")
        # the heading already names the section where steel was lost: not said twice
        return head, f"{where}, what is left of the section carries less than the whole member buckles at."
    if gov == "tie-joint":
        shear = ("2 % of the axial strength as shear (AISC 360-22 E6.2)" if code == "aisc360-22"
                 else "the shear of EN 1993-1-1 6.4" if code == "en1993-1-1"
                 else "the shear of the bowed member")
        # no warning says this: the trace has the joints' strength and the force on them
        return head, (f"The rivets or bolts at the ends of a lacing bar or batten cannot carry "
                      f"what {shear} puts on them at the member's buckling strength: the "
                      "strength is what they allow (the joint steps of the trace).")
    return head, "See the warnings."


def _chart(result: Mapping[str, Any], code: str, system: str, gov: str) -> Chart | None:
    from fieldcol.codes import column_curve

    mat = result.get("material") or {}
    fy, E = _val(mat.get("Fy")), _val(mat.get("E"))
    A = _val((result.get("section") or {}).get("A"))
    if not fy or not E or not A or code not in _SUFFIX:
        return None
    unit = "ksi" if system == "us" else "MPa"

    def stress(v: float) -> float:
        return v / _KSI if system == "us" else v

    modes = result.get("modes") or {}
    pts: list[CurvePoint] = []
    letters = {}
    if code == "en1993-1-1":
        for s in result.get("steps") or []:
            if s.get("symbol") in ("curve,y", "curve,z"):
                letters[s["symbol"][-1]] = str(s.get("value"))
    for mode in ("flexural-strong", "flexural-weak", "torsional"):
        m = modes.get(mode) or {}
        sl, pn = _val(m.get("slenderness")), _val(m.get("nominal_strength"))
        if sl is None or pn is None or not math.isfinite(sl):
            continue
        sfx = _SUFFIX[code][mode]
        label = {"flexural-strong": "strong", "flexural-weak": "weak", "torsional": "twist"}[mode]
        pts.append(CurvePoint(f"{label} ({sfx})", sl, stress(pn / A), mode == gov))
    default_max = 3.0 if code == "en1993-1-1" else 200.0
    x_max = max([default_max] + [p.x * 1.1 for p in pts if p.x < 10 * default_max])
    curves = []
    if code == "en1993-1-1":
        seen = []
        for axis, letter in sorted(letters.items()):
            if letter in ALPHA_LETTERS and letter not in seen:
                seen.append(letter)
                c = column_curve(code, fy, E, curve=letter, x_max=x_max, points=61)
                curves.append((f"curve {letter} ({'y-y' if axis == 'y' else 'z-z'})",
                               [(float(x), stress(float(y))) for x, y in zip(c.x, c.stress)]))
        if not curves:
            return None
        cap = "χ f_y against λ-bar, EN 1993-1-1 6.3.1.2; points: this column (χ A f_y / A)"
        xn, sn = "λ-bar", "χ f_y"
    else:
        c = column_curve(code, fy, E, x_max=x_max, points=61)
        curves.append((c.label, [(float(x), stress(float(y))) for x, y in zip(c.x, c.stress)]))
        cap = ("Fcr against Lc/r, AISC 360-22 E3; points: this column (Pn / Ag)"
               if code == "aisc360-22" else "Pcr / A against Lc/r, capped at Fy")
        xn, sn = "Lc/r", "Fcr"
    pts = [p for p in pts if p.x <= x_max]
    return Chart(curves, pts, xn, sn, unit, x_max, stress(fy) * 1.05, cap)


ALPHA_LETTERS = ("a0", "a", "b", "c", "d")
_KSI = 6.894757293168361  # MPa per ksi


def latest_summary(store: "Store", column_id: str) -> CheckSummary | None:
    """The Check tab of a column from its latest saved check (None when never checked).

    Example: ``latest_summary(store, col.id).governs`` gives ``'Buckling about the weak axis
    governs'`` for the demo's C/3-G.
    """
    chk = store.latest_check(column_id)
    if chk is None:
        return None
    site = store.get_site(store.get_column(column_id).site_id)
    return check_summary(chk.result, site.unit_system, chk.checked_at)
