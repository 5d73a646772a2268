"""One column's sheet in the site report: its heading, the record as entered and the latest
check beside the side view and the column curve, every mode, warnings, findings, the
calculation trace, the histories of its result, restraints and readings, and its retrofit
options."""

from __future__ import annotations

import json
import re
from typing import TYPE_CHECKING, Any

from fieldcol.report import _text as tx
from fieldcol.report._layout import GREY, PT_MM, ReportPDF
from fieldcol.store import quantity_name

if TYPE_CHECKING:
    from fieldcol.report._gather import ColumnData, SiteData
    from fieldcol.store import Store

RIGHT_W = 62.0
TOP_BLOCK = 120.0   # mm: the heading, the record and the pictures beside it


def _restraint_rows(restraints: Any) -> list[tuple[str, str]]:
    """The restraints one line per axis: ends, K, braces (the full wording of each end is in
    the status words on the cover; the sketch beside shows them)."""
    rows: dict[str, list[str]] = {}
    for label, words in tx.restraint_lines(restraints):
        axis, _, part = label.partition(", ")
        short = words.split(" (")[0] if part in ("bottom", "top") else words
        if part == "braces" and short == "none recorded":
            rows.setdefault(axis, []).append("no braces recorded")
            continue
        rows.setdefault(axis, []).append(f"{part} {short}" if part else short)
    # labelled as the other rows of the record are: a capital, the axis named in full
    return [(axis[:1].upper() + axis[1:], "; ".join(parts)) for axis, parts in rows.items()]


def column_sheet(pdf: ReportPDF, store: "Store", data: "SiteData", c: "ColumnData") -> None:
    """One column: identity, record, result beside the side view and the column curve, every
    mode, warnings, findings, the trace, histories and retrofit options."""
    from fieldcol.ui.check_model import check_summary
    from fieldcol.ui.restraints_model import sketch

    from fieldcol.report import _drawings

    system = data.site.unit_system
    col, rec = c.column, c.record
    summ = check_summary(c.check.result, system) if c.check is not None else None
    rows = _record_rows(data, c)
    checked, bold = _result_rows(c, system, summ)
    modes = _mode_rows(c, system)
    left_w = pdf.epw - RIGHT_W - 4
    # a sheet starts on a fresh page unless its head, its record, check and modes, and the
    # pictures beside them fit below the last one (a table of modes cut in two, its last rows
    # over the page, away from the pictures, read badly)
    top = TOP_HEAD + max(TOP_BLOCK - TOP_HEAD, _left_height(pdf, c, rows, checked, modes,
                                                            left_w))
    pdf.continued = ""
    # taller than a fresh page: it starts on one of its own
    need = min(top, pdf.page_break_trigger - pdf.t_margin - 10)
    if pdf.page_break_trigger - pdf.get_y() < need or pdf.get_y() <= pdf.t_margin + 1:
        pdf.add_page()
    else:
        pdf.ln(4)
    pdf.start_section(col.tag, level=1)
    pdf.heading(f"Column {col.tag}   {tx.util_status(c)}")
    # every further page of the sheet says whose it is, whatever part of it runs over
    pdf.continued = f"Column {col.tag}, continued"
    pdf.para(f"Level {c.level or 'not recorded'}   |   grid {col.grid or 'not recorded'}   |   "
             f"{col.location or 'location not recorded'}", size=8.5)
    y0, page0 = pdf.get_y(), pdf.page
    rx = pdf.l_margin + left_w + 4
    # columns of one type share their side view: work it out once per record (tag aside)
    key = "sketch " + json.dumps({k: v for k, v in rec.items() if k != "tag"},
                                 sort_keys=True, default=str)
    if key not in pdf.memo:
        pdf.memo[key] = sketch(rec, system)
    used = _drawings.sketch(pdf, pdf.memo[key], rx, y0, RIGHT_W, 56)
    used += _drawings.curve(pdf, summ.chart if summ else None, rx, y0 + used + 2, RIGHT_W, 44)
    right_end = y0 + used + 2
    pdf.set_y(y0)
    pdf.set_font("DejaVu", "B", 8)
    pdf.text(pdf.l_margin, y0 + 2.4, "Record as entered")
    pdf.set_y(y0 + 3.6)
    pdf.table(None, rows, RECORD_WIDTHS, size=7.0, width=left_w)
    _result(pdf, c, checked, bold, left_w)
    _modes(pdf, modes, left_w)
    if pdf.page == page0:  # the pictures stand beside the tables: go on below both
        pdf.set_y(max(pdf.get_y(), right_end))
    _warnings(pdf, c)
    if c.findings:
        frows = [(data.finding_refs.get(f.id, ""),
                  f"{f.text} (" + "".join(f"{x}, " for x in [tx.place_text(f, system)] if x)
                  + f"{f.severity}, {f.status})"
                  + (f"; photos {data.refs_of(data.finding_photos.get(f.id, []))}"
                     if data.finding_photos.get(f.id) else ""))
                 for f in c.findings]
        _column_findings(pdf, frows)
        if any(f.status != "closed" for f in c.findings):
            # a dent or a crack noted here is not in the strength above unless the record
            # holds it: the reader must not take the check as having weighed it
            pdf.para(FINDINGS_NOTE, size=7.2, colour=GREY)
    if c.photos:
        pdf.para(f"Photos of this column: {data.refs_of(c.photos)} (see Photographs).",
                 size=7.5)
    _trace(pdf, summ, col.tag)
    _result_history(pdf, c)
    _restraint_history(pdf, data, c)
    _measurement_history(pdf, c, system)
    if c.retrofits:
        _retrofits(pdf, c, system)


#: under a column's open findings: what the check above did and did not take into account
FINDINGS_NOTE = ("The check above takes only what the record holds (section, loss, bow, plumb, "
                 "restraints, loads): an open finding is not in its strength until the engineer "
                 "records its effect.")


def _column_findings(pdf: ReportPDF, rows: list) -> None:
    """The findings on a column under their heading; a long first finding goes over with its
    heading, never leaving it alone at the foot of a page."""
    pdf.heading("Findings on this column", 3, keep=pdf.first_rows(None, rows, (10, 160),
                                                                   size=7.2))
    pdf.table(None, rows, (10, 160), size=7.2)


RECORD_WIDTHS = (22, 94)
#: mm above the record: the sheet's heading and its level / grid line
TOP_HEAD = 17.0


def _left_height(pdf: ReportPDF, c: "ColumnData", rows: list, checked: list,
                 modes: tuple | None, width: float) -> float:
    """The height (mm) of the record, the latest check and the table of modes as drawn."""
    h = 3.6 + sum(pdf.row_heights(rows, RECORD_WIDTHS, size=7.0, width=width)) + 1.6
    h += 1 + 3.6 + sum(pdf.row_heights(checked, RECORD_WIDTHS, size=7.0, width=width)) + 1.6
    if c.check is None:  # one bold line, as write_block sets it
        h += 8.5 * PT_MM * 1.18
    elif c.check.record != c.record:
        pdf.font("B", 8)
        h += len(pdf.wrap(CHANGED, width)) * 8 * PT_MM * 1.18
    if modes is not None:
        heads, mrows, _ = modes
        h += 3.6 + sum(pdf.row_heights([heads], MODE_WIDTHS, size=MODE_PT, width=width,
                                       style="B"))
        h += sum(pdf.row_heights(mrows, MODE_WIDTHS, size=MODE_PT, width=width)) + 1.6
    return h


def _record_rows(data: "SiteData", c: "ColumnData") -> list:
    """The record as entered, a row per item (the restraints one row per axis)."""
    rec = c.record
    rows = [("Section", tx.section_text(rec.get("section"))),
            ("Material", tx.material_text(rec.get("material"))),
            ("Length", tx.value_text(rec.get("length")))]
    rows += _restraint_rows(rec.get("restraints"))
    rows += [("Condition", tx.condition_text(rec.get("condition"),
                                                 data.site.unit_system)),
             ("Demand", tx.demand_text(rec.get("demand")))]
    from fieldcol.ui.loads_model import load_lines  # plain data: no Flet

    rows += [("Loads", line) for line in load_lines(rec.get("demand"))]
    if c.check is None or c.check.record != rec:  # else the check below says both
        rows += [("K basis", tx.value_text(rec.get("k_basis", "recommended (default)"))),
                 ("Code", tx.CODE_WORDS.get(str(rec.get("code", data.site.code)),
                                         tx.value_text(rec.get("code", data.site.code))))]
    if "gamma_M1" in rec:
        rows.append(("gamma_M1", tx.value_text(rec["gamma_M1"])))
    return rows


def _basis_words(d: dict, summ: Any) -> str:
    """LRFD or ASD for AISC; the partial factor for EN (its checks have no LRFD/ASD basis:
    the record's ``en`` printed as "EN" beside the edition read as a slip); nothing for the
    elastic reference."""
    basis = str(d.get("basis", ""))
    if basis in ("lrfd", "asd"):
        return f"{basis.upper()}, "
    if str(d.get("code")) == "en1993-1-1" and summ is not None and summ.basis:
        return f"{summ.basis}, "
    return ""


CHANGED = ("The record has changed since this check (the check below used the record as it "
           "was then): check the column again.")


def _result(pdf: ReportPDF, c: "ColumnData", rows: list, bold: list[int], width: float) -> None:
    """The latest check under its label (rows from ``_result_rows``)."""
    pdf.ln(1)
    pdf.set_font("DejaVu", "B", 8)
    y = pdf.get_y()
    pdf.text(pdf.l_margin, y + 2.4, "Latest check")
    pdf.set_y(y + 3.6)
    if c.check is None:
        pdf.write_block("not checked: there is no saved check of this column.", bold=True,
                        width=width, size=8.5)
        return
    if c.check.record != c.record:
        pdf.write_block(CHANGED, bold=True, width=width, size=8)
    pdf.table(None, rows, (22, 94), bold_rows=bold, size=7.0, width=width)


def _after_colon(text: str) -> str:
    """A sentence run on after a colon: its first word in lower case, unless it is an
    abbreviation (``EN``, ``K``)."""
    if len(text) > 1 and text[0].isupper() and text[1].islower():
        return text[0].lower() + text[1:]
    return text


#: the equations a measured bow is checked by (codes/bow.py; its result names none)
_BOW_EQUATION = {"aisc360-22": "H1-1", "en1993-1-1": "6.61, 6.62", "elastic": "Perry-Robertson"}


def _result_rows(c: "ColumnData", system: str, summ: Any) -> tuple[list, list[int]]:
    """The latest check's rows and the rows in bold (the utilization when OVER)."""
    k = c.check
    if k is None:
        return [], []
    d = k.result
    word = tx.column_status(c)
    util = (f"{tx.utilization_text(k.utilization)} {word}" if word in ("OK", "OVER")
            else word)
    gov = d.get("governing_mode")
    if word in ("OK", "OVER") and gov in _WITH:
        # not the demand over the design strength (the equation is not linear in the force)
        eq = (d.get(dict(INTERACTIONS)[gov]) or {}).get("equation") or (
            _BOW_EQUATION.get(str(d.get("code"))) if gov == "bow" else None)
        util += f": interaction ratio ({eq})" if eq else ": interaction ratio"
    dem = d.get("demand")
    rows = [("Checked", f"{tx.when(k.checked_at)} with fieldcol {k.app_version}"),
            ("Code", f"{k.edition or k.code}, {_basis_words(d, summ)}"
                     f"K basis {d.get('k_basis', '-')}; "
                     f"{d.get('material', {}).get('name', '-')}, Fy "
                     f"{tx.quantity(d.get('material', {}).get('Fy'), system)}"),
            ("Design strength", _design_text(d, system)),
            ("Demand", "none recorded" if not dem else
             f"{tx.quantity(dem, system)} ({dem.get('combination', '-')})"),
            ("Utilization", util),
            ("Governing mode", (tx.MODE_WORDS.get(d.get("governing_mode") or "",
                                                  d.get("governing_mode") or "")
                                + (f": {_after_colon(summ.why)}"
                                   if summ is not None and summ.why else ""))
             if d.get("governing_mode") else "none: no mode has a strength")]
    bow = d.get("bow")
    if bow:
        rows.append(("Measured bow", _bow_text(bow, k.record, d, system)))
    if k.note:
        rows.append(("Note", k.note))
    return rows, [4] if word == "OVER" else []


def _bow_text(bow: dict, record: Any, d: dict, system: str) -> str:
    """The measured bow and its excess as the app shows the reading and the warning beside
    writes them (``format_reading``: on a US site a reading as recorded, ``1 1/8 in``), then the
    capacity with it."""
    from fieldcol.errors import InputError
    from fieldcol.units import format_reading, parse_length

    cond = record.get("condition") if isinstance(record, dict) else None
    try:
        bow_mm = parse_length(cond.get("bow"), "bow") if isinstance(cond, dict) else None
    except InputError:
        bow_mm = None  # not readable: its check's warning names it
    excess = _val(bow.get("excess"))
    return (f"{bow.get('axis')} axis: "
            + (f"bow {format_reading(bow_mm, system)} measured, " if bow_mm is not None else "")
            + f"excess over {bow.get('allowance', 'L/1000')} "
            + ("-" if excess is None else format_reading(excess, system))
            + f"; capacity with the bow {tx.quantity(bow.get('capacity'), system)} (axial alone "
            f"{tx.quantity(d.get('axial_design_strength'), system)})")


#: each code's own symbols under the words of the table of modes (AISC 360-22 E3; EN 1993-1-1
#: 6.3.1.2, 6.3.1.3; the elastic reference check speaks as AISC does)
MODE_SYMBOLS = {"aisc360-22": ("Lc", "Lc/r", "Fcr", "Pn"),
                "en1993-1-1": ("L_cr", "λ-bar", "χ f_y", "χ A f_y"),
                "elastic": ("Lc", "Lc/r", "Fcr", "Pn")}
#: the checks beside the axial modes that can govern, where the result keeps each
INTERACTIONS = (("bow", "bow"), ("beam-column", "beam_column"), ("section-band", "section_band"))


def _val(q: Any) -> float | None:
    v = q.get("value") if isinstance(q, dict) else None
    return float(v) if isinstance(v, (int, float)) else None


#: how the design strength was found when more than the axial force governs it
_WITH = {"beam-column": "with the moments", "bow": "with the measured bow",
         "section-band": "at the loss band"}


def _design_text(d: dict, system: str) -> str:
    """The design strength with what it stands for: the nominal axial strength beside it, and
    where moments, a bow or a loss band govern, the axial strength alone as well (else a
    design strength below the nominal times the resistance factor reads as a slip)."""
    if (d.get("design_strength") or {}).get("value") is None:
        return "none: the code gives no strength for this column (see the warning)"
    shown = tx.quantity(d.get("design_strength"), system)
    nominal = tx.quantity(d.get("nominal_strength"), system)
    with_ = _WITH.get(str(d.get("governing_mode")))
    if with_ is None:
        return f"{shown} (nominal {nominal})"
    kappa = _val(d.get("knowledge_factor")) or 1.0
    axial = _val(d.get("axial_design_strength"))
    alone = tx.quantity(None if axial is None else {"value": axial * kappa, "unit": "N"}, system)
    return f"{shown} {with_} (axial force alone {alone}, nominal {nominal})"


MODE_WIDTHS, MODE_PT = (29, 17, 19, 18, 16, 15), 6.6


def _modes(pdf: ReportPDF, table: tuple | None, width: float) -> None:
    """The table of modes under its label (from ``_mode_rows``)."""
    if table is None:
        return
    heads, mrows, gov_rows = table
    pdf.set_font("DejaVu", "B", 8)
    y = pdf.get_y()
    pdf.text(pdf.l_margin, y + 2.4, "Every mode")
    pdf.set_y(y + 3.6)
    pdf.table(heads, mrows, MODE_WIDTHS, bold_rows=gov_rows, size=MODE_PT, width=width)


def _mode_rows(c: "ColumnData", system: str) -> tuple | None:
    """Every mode with its design strength, the interactions (bow, moments, loss band) as rows
    of their own, and the one that governs marked in words as well as bold: (headings, rows,
    governing rows), or None without a check."""
    from fieldcol.ui.check_model import design_symbol  # plain data: no Flet

    if c.check is None:
        return None
    d = c.check.result
    code = str(d.get("code", "aisc360-22"))
    gov = d.get("governing_mode")
    kappa = _val(d.get("knowledge_factor")) or 1.0
    nominal, axial = _val(d.get("nominal_strength")), _val(d.get("axial_design_strength"))
    # as the Design strength above: the axial design strength over the nominal, times kappa
    factor = (axial / nominal if axial and nominal else 1.0) * kappa

    def design(v: float | None) -> str:
        if v is None or v != v:
            return "none"
        return tx.quantity({"value": v, "unit": "N"}, system)

    def mode_cell(name: str, words: str) -> str:
        return words + (" (governs)" if name == gov else "")

    mrows, gov_rows = [], []
    for name, m in (d.get("modes") or {}).items():
        if name == gov:
            gov_rows.append(len(mrows))
        pn = _val(m.get("nominal_strength"))
        mrows.append([mode_cell(name, tx.MODE_WORDS.get(name, name)
                                + ("" if m.get("applies", True) else " (reported only)")),
                      tx.quantity(m.get("effective_length"), system),
                      tx.quantity(m.get("slenderness"), system),
                      tx.quantity(m.get("critical_stress"), system),
                      tx.quantity(m.get("nominal_strength"), system),
                      design(None if pn is None else pn * factor)
                      if m.get("applies", True) else "-"])
    for name, key in INTERACTIONS:
        part = d.get(key)
        if not isinstance(part, dict):
            continue
        eq = part.get("equation")
        cap = _val(part.get("capacity"))
        if name == gov:
            gov_rows.append(len(mrows))
        mrows.append([mode_cell(name, tx.MODE_WORDS.get(name, name)
                                + (f", {eq}" if eq else "")),
                      "-", "-", "-", "-",
                      "not covered" if cap is None or cap != cap else design(cap * kappa)])
    sym = MODE_SYMBOLS.get(code, MODE_SYMBOLS["aisc360-22"])
    heads = ["Mode", f"Eff. length\n{sym[0]}", f"Slenderness\n{sym[1]}",
             f"Crit. stress\n{sym[2]}", f"Nominal\n{sym[3]}",
             f"Design\n{design_symbol(code, str(d.get('basis', '')))}"]
    return heads, mrows, gov_rows


def _warnings(pdf: ReportPDF, c: "ColumnData") -> None:
    if c.check is None:
        return
    warnings = c.check.result.get("warnings") or []
    if warnings:
        pdf.table(None, [("Warning", str(w.get("message", w)) if isinstance(w, dict) else str(w))
                         for w in warnings], (14, 156), size=7.0)


TRACE_PT = 5.8
#: mm: the trace's symbol and value columns are as wide as their widest entry, within these
TRACE_SYMBOL_MM, TRACE_VALUE_MM = (11.0, 18.0), (12.0, 19.0)


def _trace_widths(pdf: ReportPDF, rows: list[list[str]], gap: float = 4.0) -> tuple[float, ...]:
    """The trace's column widths (mm of one of its two columns): a symbol (``slender,flange``,
    ``λ-bar_z ≤ 0.2``) or value (``1.892e6 mm^4``) on one line where it can be, the rest for
    the words."""
    from fieldcol.report._layout import PAD_X

    pdf.font("", TRACE_PT)
    half = (pdf.epw - gap) / 2
    fit = []
    for col, (lo, hi) in ((0, TRACE_SYMBOL_MM), (1, TRACE_VALUE_MM)):
        pdf.font("B", TRACE_PT)  # the heading row is bold
        head = pdf.width_of(("Symbol", "Value")[col])
        pdf.font("", TRACE_PT)
        widest = max([head] + [pdf.width_of(r[col]) for r in rows])
        fit.append(min(hi, max(lo, widest + 2 * PAD_X + 0.3)))
    return fit[0], fit[1], half - fit[0] - fit[1]


#: a step's formula that is a statement with its own symbol ("E = 29,000 ksi, G = 11,200 ksi
#: as AISC 360-22 states them"): "elastic modulus = E = ..." read as one equation
_STATEMENT = re.compile(r"^[A-Za-z_,]+ = ")
#: a formula that is a sentence ("... under EN; AISC E3 makes no difference"): not an equation
_PROSE = re.compile(r"\b[a-z]{2,} [a-z]{2,} [a-z]{2,}\b")


def _with_formula(what: str, formula: str, clause: str) -> str:
    """A step's words and its formula as one reads them: a word (record, table, measured)
    says where the value came from, in brackets; a statement (``E = 29,000 ksi, G = ...``), a
    sentence or a list of values (``minimum 0.75, usual 1.0``) follows a colon; an equation an
    equals sign, before what was given (``...; given: 0.6 kip/in``); a formula that only
    repeats the source (``record``) is left out.

    Example: ``_with_formula("required axial strength (given)", "record", "record")`` gives
    ``'required axial strength (given)'``.
    """
    if not formula or formula == clause:
        return what
    head, given, tail = what.partition("; given: ")
    if given:  # what the step needs, by its formula; then what was recorded
        return f"{_with_formula(head, formula, clause)}{given}{tail}"
    if _STATEMENT.match(formula) or _PROSE.search(formula):
        return f"{what}: {formula}"
    if any(ch in formula for ch in "=()+-*/^<>"):
        return f"{what} = {formula}"
    if any(ch.isdigit() for ch in formula):
        return f"{what}: {formula}"
    return f"{what} ({formula})"


def _trace(pdf: ReportPDF, summ: Any, tag: str) -> None:
    """The trace in two columns, its values and words as the Check tab shows them
    (``check_model`` wrote them in the site's units)."""
    if summ is None or not summ.trace:
        return
    rows = []
    for t in summ.trace:
        what = _with_formula(t.what, t.formula, t.clause)
        value = t.value
        if value in tx.MODE_WORDS:  # the governing mode's key: its words, as the tables say it
            what, value = f"{what}: {tx.MODE_WORDS[value]}", ""
        elif " " in value and not any(ch.isdigit() for ch in value.split(" ")[0]):
            # long text reads better in the wide column
            what, value = f"{what}: {value}", ""
        rows.append([t.symbol, value, f"{what} [{t.clause}]" if t.clause else what])
    heads, widths = ["Symbol", "Value", "What [clause]"], _trace_widths(pdf, rows)
    # the heading stays on the page of the trace's first rows
    pdf.heading("Calculation trace", 3,
                keep=pdf.first_rows(heads, rows, widths, size=TRACE_PT, flow=True))
    pdf.table_flow(heads, rows, widths, size=TRACE_PT,
                   continued=f"Calculation trace of column {tag}, continued")


def _result_history(pdf: ReportPDF, c: "ColumnData") -> None:
    if len(c.results) < 2:  # the one result is the check above
        return
    rows = [[r.when, r.label, r.governs, r.strength or "-", r.changed or "first check",
             r.who or "-"] for r in c.results]
    heads = ["Checked", "Result", "Governs", "Design strength", "What had changed", "By"]
    widths = (26, 18, 36, 22, 52, 16)
    pdf.heading("Result over time (newest first)", 3,
                keep=pdf.first_rows(heads, rows, widths, size=7.0))
    pdf.table(heads, rows, widths, size=7.0)


def _change_text(description: str, detail: Any) -> str:
    """A restraint change in words, its recorded details after it, less those the words
    already give ("at 12 ft (at 12 ft, ...)" read as two places)."""
    if isinstance(detail, dict):
        detail = {k: v for k, v in detail.items()
                  if not (isinstance(v, str) and v.strip() and v.strip() in description)}
    return description + (f" ({tx.value_text(detail)})" if detail else "")


def _restraint_history(pdf: ReportPDF, data: "SiteData", c: "ColumnData") -> None:
    if not c.restraint_changes:
        return
    rows = [[rc.date, tx.RESTRAINT_KIND_WORDS.get(rc.kind, rc.kind), rc.axis or "-",
             _change_text(rc.description, rc.detail),
             rc.seen_by or "-", data.refs_of(c.restraint_photos.get(rc.id, [])) or "-"]
            for rc in c.restraint_changes]
    heads, widths = ["Date", "Change", "Axis", "What", "Seen by", "Photos"], (18, 22, 12, 90, 20, 12)
    pdf.heading("Restraint history", 3, keep=pdf.first_rows(heads, rows, widths, size=7.0))
    pdf.table(heads, rows, widths, size=7.0)


def _measurement_history(pdf: ReportPDF, c: "ColumnData", system: str) -> None:
    from fieldcol.units import format_reading

    if not c.measurements:
        return
    by_id = {m.id: m for m in c.measurements}
    corrected = {m.corrects for m in c.measurements if m.corrects}
    rows = []
    for m in c.measurements:
        kind = tx._KIND.get(m.unit)  # the reading's canonical value, shown in the site's units
        shown = (format_reading(m.value, system, fraction=m.quantity.startswith("condition."))
                 if kind == "length"  # as the app shows it
                 else tx.quantity({"value": m.value, "unit": m.unit}, system) if kind
                 else f"{m.value:g} {m.unit}")
        if m.id in corrected:
            state = "corrected by a later entry"
        elif m.id in c.counting:
            state = "counts"
        else:
            state = "superseded"
        if m.corrects and m.corrects in by_id:
            state += f"; corrects '{by_id[m.corrects].text}'"
        note = "; ".join(x for x in (m.gauge, m.note) if x)
        rows.append([quantity_name(m.quantity), m.text, shown,
                     f"{m.taken_by or '-'}, {tx.when(m.taken_at)}", note or "-", state])
    heads = ["Quantity", "As typed", "Value", "Who, when", "Gauge, note", "Status"]
    widths = (28, 18, 18, 34, 46, 30)
    pdf.heading("Readings", 3, keep=pdf.first_rows(heads, rows, widths, size=7.0))
    pdf.table(heads, rows, widths, size=7.0)


def _outcome(d: dict, system: str, checked: bool = True) -> list[str]:
    """Design strength, utilization with its word, and what governs, of a check's JSON."""
    u = (d.get("utilization") or {}).get("value")
    word = tx.status_word(checked, d.get("status"), u)
    gov = d.get("governing_mode") or ""
    return [tx.quantity(d.get("design_strength"), system),
            f"{tx.utilization_text(u)} {word}" if word in ("OK", "OVER") else word,
            tx.MODE_WORDS.get(gov, gov or "-")]


def _retrofits(pdf: ReportPDF, c: "ColumnData", system: str) -> None:
    """Each retrofit option checked against the column as it stands: design strength,
    utilization, what governs, and what a new brace must resist and how stiff it must be."""
    from fieldcol.assess import assess
    from fieldcol.errors import InputError

    rows = [["as it stands (latest check)", "-",
             *(_outcome(c.check.result, system) if c.check else ["-", "not checked", "-"]), "-"]]
    for r in c.retrofits:
        try:
            d = assess(r.record).to_dict()
        except InputError as e:
            rows.append([r.description, r.status, f"cannot be checked: {e}", "", "", ""])
            continue
        needs: dict[str, list[str]] = {}
        for st in d.get("steps") or []:
            sym = st.get("symbol")
            if sym not in ("beta_br", "P_br"):
                continue
            # "stiffness the brace at 12'-0", weak axis needs ...": where, then what and how much
            what = str(st.get("what", ""))
            where = what.split("the brace ", 1)[-1].split(" needs", 1)[0]
            needs.setdefault(where, []).append(
                f"{'stiffness' if sym == 'beta_br' else 'strength'} {tx.step_value(st, system)}")
        rows.append([r.description, r.status, *_outcome(d, system),
                     "; ".join(f"{w}: {', '.join(v)}" for w, v in needs.items()) or "-"])
    heads = ["Option", "Status", "Design strength", "Utilization", "Governs", "A brace must give"]
    widths = (58, 14, 18, 18, 28, 46)
    pdf.heading("Retrofit options", 3, keep=pdf.first_rows(heads, rows, widths, size=6.8))
    pdf.table(heads, rows, widths, size=6.8)
