"""The report's parts in order: cover, contents, column register, findings register, one sheet
per column, the photo grid."""

from __future__ import annotations

import json
from typing import TYPE_CHECKING, Any

from fieldcol.report import _text as tx
from fieldcol.report._layout import GREY, PT_MM, SMALL_PT, PhotoCell, ReportPDF
from fieldcol.store._schema import FACE_WORDS
from fieldcol.store import quantity_name

if TYPE_CHECKING:
    from fieldcol.report._gather import ColumnData, SiteData
    from fieldcol.store import Photo, Store

CODE_WORDS = {"aisc360-22": "AISC 360-22 (ANSI/AISC 360-22)",
              "en1993-1-1": "EN 1993-1-1 (Eurocode 3)", "elastic": "elastic reference check"}
UNIT_WORDS = {"us": "US customary (kip, ksi, ft-in)", "si": "SI (kN, MPa, mm)"}


def _status(c: "ColumnData") -> str:
    return tx.status_word(c.check is not None, c.status, c.utilization)


def _util_status(c: "ColumnData") -> str:
    word = _status(c)
    return f"{tx.utilization_text(c.utilization)} {word}" if word in ("OK", "OVER") else word


def cover(pdf: ReportPDF, data: "SiteData", *, report_date: str, version: str,
          caution: str) -> None:
    """The cover: who, where, which code, how many columns and how many over, the caution."""
    s = data.site
    pdf.add_page()
    pdf.ln(14)
    pdf.para("Column assessment report", size=22, bold=True)
    pdf.para(s.name, size=16, bold=True)
    pdf.ln(4)
    over = sum(1 for c in data.columns if _status(c) == "OVER")
    unchecked = sum(1 for c in data.columns if _status(c) == "not checked")
    uncovered = sum(1 for c in data.columns if _status(c) == "not covered")
    count = f"{len(data.columns)}"
    if data.subset:
        count += f" (chosen from the site's {data.site_columns})"
    rows = [("Site", s.name), ("Address", s.address or "not recorded"),
            ("Owner's reference", s.owner_ref or "not recorded"),
            ("Design code", CODE_WORDS.get(s.code, s.code)),
            ("Units", UNIT_WORDS.get(s.unit_system, s.unit_system)),
            ("Report date", report_date), ("Prepared with", f"fieldcol {version}"),
            ("Columns in this report", count),
            ("Over capacity (OVER)", f"{over} of {len(data.columns)}"),
            ("Not checked", str(unchecked))]
    if uncovered:
        rows.append(("Not covered by the code", str(uncovered)))
    if data.visits:
        rows.append(("Visits", "; ".join(
            f"{v.date}" + (f" ({v.who})" if v.who else "") for v in data.visits)))
    if s.notes:
        rows.append(("Site notes", s.notes))
    pdf.table(None, rows, (34, 100), size=10)
    pdf.ln(6)
    pdf.boxed(caution, size=10.5)
    pdf.para("Status words used throughout: OK (utilization 1.000 or less), OVER (utilization "
             "above 1.000), not checked (no saved check), not covered (the code gives no "
             "strength for this column), no demand (design strength only). Utilization is the "
             "demand divided by the design strength of the latest saved check; where moments, "
             "a measured bow or a loss band govern, it is the interaction ratio of the code's "
             "equation, and the design strength the largest axial force that equation allows "
             "with the moments in proportion.",
             size=8.5, colour=GREY)


def _length(text: Any, system: str) -> str:
    from fieldcol.errors import InputError
    from fieldcol.units import format_length, parse_length

    if text in (None, ""):
        return "not recorded"
    try:
        return format_length(parse_length(text, "length"), system)
    except InputError:
        return str(text)  # shown as typed: its check names what is wrong with it


def _marks_words(shapes: list[dict]) -> str:
    labels = [f'"{s["text"]}"' for s in shapes if s.get("kind") == "label"]
    others = sum(s.get("kind") != "label" for s in shapes)
    return ", ".join(labels + ([f"{others} mark{'s' if others > 1 else ''}"] if others else []))


STATUS_RANK = {"OVER": 0, "not covered": 1, "not checked": 2, "OK": 3, "no demand": 4}


def worst_first(columns: list["ColumnData"]) -> list["ColumnData"]:
    """The columns worst first: OVER, not covered, not checked, OK, no demand; within each,
    the highest utilization first, then by tag.

    Example: ``[c.column.tag for c in worst_first(data.columns)][0]`` gives ``'C/3-G'``.
    """
    def key(c: "ColumnData") -> tuple:
        u = c.utilization if c.utilization is not None and c.utilization == c.utilization else -1
        return (STATUS_RANK.get(_status(c), 5), -u, c.column.tag)
    return sorted(columns, key=key)


def _mode(c: "ColumnData") -> str:
    if c.check is None:
        return "-"
    m = c.check.governing_mode or ""
    return tx.MODE_WORDS.get(m, m or "-")


def register_rows(data: "SiteData") -> tuple[list[str], list[list[str]]]:
    """The column register as plain rows, worst first (the PDF table and the CSV beside it).

    Returns:
        (headings, rows): tag, level, grid, section, governing mode, utilization, status, checked.

    Example: ``register_rows(data)[0][0]`` gives ``'Tag'``.
    """
    from fieldcol.store import section_label

    rows = []
    for c in worst_first(data.columns):
        section = c.record.get("section")
        built = section.get("built") if isinstance(section, dict) else None
        rows.append([c.column.tag, c.level or "-", c.column.grid or "-",
                     # a built-up section in words, not its arrangement's key ("angles-web")
                     tx.built_label(built) if isinstance(built, dict)
                     else section_label(section) or "-", _mode(c),
                     tx.utilization_text(c.utilization), _status(c),
                     tx.when(c.check.checked_at)[:10] if c.check else "-"])
    return (["Tag", "Level", "Grid", "Section", "Governing mode", "Utilization", "Status",
             "Checked"], rows)


# -- contents ---------------------------------------------------------------------------------
TOC_ROWS_FIRST, TOC_ROWS, TOC_COLS = 52, 66, 3


def contents_pages(n_columns: int) -> int:
    """How many pages the contents takes for ``n_columns`` column sheets (three across)."""
    first = TOC_ROWS_FIRST * TOC_COLS
    if n_columns <= first:
        return 1
    return 1 + -(-(n_columns - first) // (TOC_ROWS * TOC_COLS))


def render_contents(pdf: ReportPDF, outline: list) -> None:
    """The contents: the parts with their page, then every column sheet, three across."""
    pdf.heading("Contents")
    parts = [s for s in outline if s.level == 0]
    cols = [s for s in outline if s.level == 1]
    pdf.set_font("DejaVu", "", 9)
    for s in parts:
        y = pdf.get_y()
        pdf.text(pdf.l_margin, y + 3.2, s.name)
        num = str(s.page_number)
        pdf.text(pdf.w - pdf.r_margin - pdf.width_of(num), y + 3.2, num)
        pdf.set_draw_color(200, 200, 200)
        pdf.set_dash_pattern(dash=0.4, gap=0.8)
        pdf.line(pdf.l_margin + pdf.width_of(s.name) + 2, y + 3.0,
                 pdf.w - pdf.r_margin - pdf.width_of(num) - 2, y + 3.0)
        pdf.set_dash_pattern()
        pdf.set_y(y + 4.6)
    if not cols:
        return
    pdf.ln(2)
    pdf.para("Column sheets (page)", size=8.5, bold=True)
    lh = 3.3
    colw = pdf.epw / TOC_COLS
    i = 0
    rows = TOC_ROWS_FIRST
    while i < len(cols):
        room = min(rows, int((pdf.page_break_trigger - pdf.get_y()) // lh))
        y0 = pdf.get_y()
        pdf.set_font("DejaVu", "", 7.6)
        chunk = cols[i:i + room * TOC_COLS]
        per = -(-len(chunk) // TOC_COLS)
        for k, s in enumerate(chunk):
            x = pdf.l_margin + (k // per) * colw
            y = y0 + (k % per) * lh
            num = str(s.page_number)
            name = s.name
            while pdf.width_of(name) > colw - 14 and len(name) > 4:
                name = name[:-2] + "…"
            pdf.text(x, y + 2.6, name)
            pdf.text(x + colw - 4 - pdf.width_of(num), y + 2.6, num)
        i += len(chunk)
        pdf.set_y(y0 + per * lh)
        if i < len(cols):
            pdf.add_page()
            # its header was drawn before the contents were known: name the page here
            pdf.write_block("Contents, continued", size=8, bold=True)
            pdf.ln(0.8)
            pdf.set_font("DejaVu", "", 7.6)
            rows = TOC_ROWS


# -- registers ---------------------------------------------------------------------------------
def register(pdf: ReportPDF, data: "SiteData") -> None:
    """Every column on one line, worst first (on the page the contents placeholder opened)."""
    pdf.heading("Column register")
    pdf.start_section("Column register")  # after the heading: on the page it landed on
    pdf.continued = "Column register, continued"
    heads, rows = register_rows(data)
    if not rows:
        pdf.para("This site has no columns yet: there is nothing to check.")
        return
    bold = [i for i, r in enumerate(rows) if r[6] == "OVER"]
    pdf.table(heads, rows, (15, 17, 10, 26, 40, 17, 13, 18), bold_rows=bold)
    pdf.para("Worst first: over capacity, not covered by the code, not checked, then the rest "
             "by utilization. Section is the record as it stands now (latest readings); "
             "utilization and mode come from each column's latest saved check. The same table "
             "is written as CSV beside this report.", size=SMALL_PT + 0.5, colour=GREY)


def _place(f: Any, system: str) -> str:
    """Where on the column a finding is: its face and height, as the register and the
    column's sheet both say it."""
    return ", ".join(([FACE_WORDS.get(f.face, f.face)] if f.face else [])
                     + ([f"{_length(f.height, system)} up"] if f.height else []))


def findings_register(pdf: ReportPDF, data: "SiteData") -> None:
    """All findings on one table, open before closed and most severe first."""
    pdf.continued = ""
    pdf.heading("Findings register", keep=30)
    pdf.start_section("Findings register")
    pdf.continued = "Findings register, continued"
    if not data.findings:
        pdf.para("No findings recorded.")
        return
    rows, bold = [], []
    for i, f in enumerate(data.findings):
        where = (data.tags_by_id.get(f.column_id, "?") if f.column_id else "whole site")
        place = _place(f, data.site.unit_system)
        text = f.text + (f" ({place})" if place else "")
        rows.append([data.finding_refs[f.id], f.severity, f.status, where, f.category, text,
                     f"{tx.when(f.created_at)[:10]}" + (f", {f.created_by}" if f.created_by
                                                        else ""),
                     data.refs_of(data.finding_photos.get(f.id, [])) or "-"])
        if f.status == "open" and f.severity in ("urgent", "high"):
            bold.append(i)
    # a category of the trade (corrosion, housekeeping) stays whole on its line
    pdf.table(["Ref", "Severity", "Status", "Column", "Category", "Finding", "Noted",
               "Photos"], rows, (7, 14, 11, 14, 21, 66, 19, 12), bold_rows=bold)


def photo_grid(pdf: ReportPDF, store: "Store", data: "SiteData") -> None:
    """Every photo once, four across, captioned with what, where, who and when."""
    pdf.continued = ""
    if not data.photos:
        return
    pdf.add_page()
    pdf.heading("Photographs")
    pdf.start_section("Photographs")
    pdf.continued = "Photographs, continued"
    cells = []
    for ref, p, what, where in data.photos:
        path = store.photo_path(p, thumbnail=True)
        marked = f"; marked: {_marks_words(p.markup)}" if p.markup else ""
        who = f", by {p.created_by}" if p.created_by else ", photographer not recorded"
        name = p.original_name or p.sha256[:12]
        cells.append(PhotoCell(path if path.is_file() else None,
                               f"{ref}  {what}, {where}{marked}. {name}, "
                               f"{tx.exif_time(p.exif_taken_at)}{who}", p.markup))
    pdf.photos(cells)


# -- one column --------------------------------------------------------------------------------
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
    pdf.heading(f"Column {col.tag}   {_util_status(c)}")
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
                  f"{f.text} (" + "".join(f"{x}, " for x in [_place(f, system)] if x)
                  + f"{f.severity}, {f.status})"
                  + (f"; photos {data.refs_of(data.finding_photos.get(f.id, []))}"
                     if data.finding_photos.get(f.id) else ""))
                 for f in c.findings]
        _column_findings(pdf, frows)
    if c.photos:
        pdf.para(f"Photos of this column: {data.refs_of(c.photos)} (see Photographs).",
                 size=7.5)
    _trace(pdf, summ, col.tag)
    _result_history(pdf, c)
    _restraint_history(pdf, data, c)
    _measurement_history(pdf, c, system)
    if c.retrofits:
        _retrofits(pdf, c, system)


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
    rows += [("Condition", tx.condition_text(rec.get("condition"))),
             ("Demand", tx.demand_text(rec.get("demand")))]
    from fieldcol.ui.loads_model import load_lines  # plain data: no Flet

    rows += [("Loads", line) for line in load_lines(rec.get("demand"))]
    if c.check is None or c.check.record != rec:  # else the check below says both
        rows += [("K basis", tx.value_text(rec.get("k_basis", "recommended (default)"))),
                 ("Code", CODE_WORDS.get(str(rec.get("code", data.site.code)),
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


def _result_rows(c: "ColumnData", system: str, summ: Any) -> tuple[list, list[int]]:
    """The latest check's rows and the rows in bold (the utilization when OVER)."""
    k = c.check
    if k is None:
        return [], []
    d = k.result
    word = _status(c)
    util = (f"{tx.utilization_text(k.utilization)} {word}" if word in ("OK", "OVER")
            else word)
    gov = d.get("governing_mode")
    if word in ("OK", "OVER") and gov in _WITH:
        # not the demand over the design strength (the equation is not linear in the force)
        eq = (d.get(dict(INTERACTIONS)[gov]) or {}).get("equation")
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
    """The measured bow and its excess as the warning beside it and the app's record write a
    bow (``format_length``: to the 1/16 in on a US site), then the capacity with it."""
    from fieldcol.units import format_length

    cond = record.get("condition") if isinstance(record, dict) else None
    typed = cond.get("bow") if isinstance(cond, dict) else None
    excess = _val(bow.get("excess"))
    return (f"{bow.get('axis')} axis: "
            + (f"bow {_length(typed, system)} measured, " if typed else "")
            + f"excess over {bow.get('allowance', 'L/1000')} "
            + ("-" if excess is None else format_length(excess, system))
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


def _trace(pdf: ReportPDF, summ: Any, tag: str) -> None:
    """The trace in two columns, its values and words as the Check tab shows them
    (``check_model`` wrote them in the site's units)."""
    if summ is None or not summ.trace:
        return
    rows = []
    for t in summ.trace:
        what = t.what
        if t.formula:
            # a word (record, table, measured) says where the value came from; else an equation
            what += f" = {t.formula}" if any(ch in t.formula for ch in "=()+-*/^<>0123456789") \
                else f" ({t.formula})"
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


def _restraint_history(pdf: ReportPDF, data: "SiteData", c: "ColumnData") -> None:
    if not c.restraint_changes:
        return
    rows = [[rc.date, tx.RESTRAINT_KIND_WORDS.get(rc.kind, rc.kind), rc.axis or "-",
             rc.description + (f" ({tx.value_text(rc.detail)})" if rc.detail else ""),
             rc.seen_by or "-", data.refs_of(c.restraint_photos.get(rc.id, [])) or "-"]
            for rc in c.restraint_changes]
    heads, widths = ["Date", "Change", "Axis", "What", "Seen by", "Photos"], (18, 22, 12, 90, 20, 12)
    pdf.heading("Restraint history", 3, keep=pdf.first_rows(heads, rows, widths, size=7.0))
    pdf.table(heads, rows, widths, size=7.0)


def _measurement_history(pdf: ReportPDF, c: "ColumnData", system: str) -> None:
    if not c.measurements:
        return
    by_id = {m.id: m for m in c.measurements}
    corrected = {m.corrects for m in c.measurements if m.corrects}
    rows = []
    for m in c.measurements:
        kind = tx._KIND.get(m.unit)  # the reading's canonical value, shown in the site's units
        shown = tx.quantity({"value": m.value, "unit": m.unit}, system) if kind else \
            f"{m.value:g} {m.unit}"
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
