"""The report's parts in order: cover, summary table, findings, one section per column."""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from fieldcol.report import _text as tx
from fieldcol.report._layout import GREY, SMALL_PT, PhotoCell, ReportPDF
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
             "demand divided by the design strength of the latest saved check.",
             size=8.5, colour=GREY)


def summary(pdf: ReportPDF, data: "SiteData") -> None:
    """Every column on one table: tag, level, section, length, utilization + word, mode, date."""
    from fieldcol.store import section_label

    system = data.site.unit_system
    pdf.add_page()
    pdf.heading("Summary of columns")
    rows, bold = [], []
    for i, c in enumerate(data.columns):
        rec = c.record
        rows.append([c.column.tag, c.level or "-", section_label(rec.get("section")) or "-",
                     _length(rec.get("length"), system), _util_status(c),
                     tx.MODE_WORDS.get(c.check.governing_mode or "", c.check.governing_mode or "-")
                     if c.check else "-",
                     tx.when(c.check.checked_at)[:10] if c.check else "-"])
        if _status(c) == "OVER":
            bold.append(i)
    pdf.table(["Tag", "Level", "Section", "Length", "Utilization", "Governing mode",
               "Checked"], rows, (16, 18, 28, 16, 22, 46, 19), bold_rows=bold)
    pdf.para("Section and length are the record as it stands now (latest readings); "
             "utilization and mode come from each column's latest saved check.",
             size=SMALL_PT + 1, colour=GREY)


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


def _photo_cells(store: "Store", photos: list["Photo"], label: str) -> list[PhotoCell]:
    cells = []
    for p in photos:
        path = store.photo_path(p, thumbnail=True)
        name = p.original_name or p.sha256[:12]
        marked = f", marked up: {_marks_words(p.markup)}" if p.markup else ""
        cells.append(PhotoCell(path if path.is_file() else None,
                               f"{label}: {name}, {tx.exif_time(p.exif_taken_at)}{marked}",
                               p.markup))
    return cells


def findings(pdf: ReportPDF, store: "Store", data: "SiteData") -> None:
    """Each finding: reference, severity, status, category, column, text and its photos."""
    pdf.add_page()
    pdf.heading("Findings")
    if not data.findings:
        pdf.para("No findings recorded.")
        return
    pdf.para(f"{len(data.findings)} findings, open before closed, most severe first.", size=8,
             colour=GREY)
    for f in data.findings:
        ref = data.finding_refs[f.id]
        where = (f"column {data.tags_by_id.get(f.column_id, '?')}" if f.column_id
                 else "whole site")
        keep = pdf.multi_cell(pdf.epw, 4.2, f.text, dry_run=True, output="HEIGHT") + 8
        if data.finding_photos.get(f.id):
            keep += 56  # the first row of photos stays with its finding
        pdf.heading(f"{ref}  {f.severity.upper()}, {f.status}: {f.category}, {where}", 3,
                    keep=keep)
        pdf.para(f.text)
        if f.face or f.height:
            pdf.para("where: " + ", ".join(
                ([FACE_WORDS.get(f.face, f.face)] if f.face else [])
                + ([f"{_length(f.height, data.site.unit_system)} from the bottom"]
                   if f.height else [])), size=SMALL_PT + 0.5)
        pdf.para(f"noted {tx.when(f.created_at)}", size=SMALL_PT + 0.5, colour=GREY)
        photos = data.finding_photos.get(f.id, [])
        if photos:
            pdf.photos(_photo_cells(store, photos, ref))


def column_section(pdf: ReportPDF, store: "Store", data: "SiteData", c: "ColumnData") -> None:
    """One column: identity, record as entered, latest check, trace, histories, photos."""
    system = data.site.unit_system
    col, rec = c.column, c.record
    pdf.add_page()
    pdf.heading(f"Column {col.tag}   {_util_status(c)}")
    pdf.para(f"Level {c.level or 'not recorded'}   |   grid {col.grid or 'not recorded'}   |   "
             f"{col.location or 'location not recorded'}", size=9.5)

    pdf.heading("Record as entered", 2)
    rows = [("Section", tx.section_text(rec.get("section"))),
            ("Material", tx.material_text(rec.get("material"))),
            ("Length", tx.value_text(rec.get("length")))]
    rows += tx.restraint_lines(rec.get("restraints"))
    rows += [("Condition", tx.condition_text(rec.get("condition"))),
             ("Demand", tx.demand_text(rec.get("demand"))),
             ("K basis", tx.value_text(rec.get("k_basis", "recommended (default)"))),
             ("Code", tx.value_text(rec.get("code", data.site.code)))]
    if "gamma_M1" in rec:
        rows.append(("gamma_M1", tx.value_text(rec["gamma_M1"])))
    pdf.table(None, rows, (38, 130))
    if c.findings:
        pdf.para("Findings on this column: " + "; ".join(
            f"{data.finding_refs.get(f.id, '')} {f.text} ({f.severity}, {f.status})"
            for f in c.findings), size=8.5)

    _check(pdf, c, system)
    _restraint_history(pdf, store, c)
    _measurement_history(pdf, c, system)
    if c.retrofits:
        pdf.heading("Retrofit options", 2)
        pdf.table(["Option", "Status", "Recorded"],
                  [[r.description, r.status, tx.when(r.created_at)] for r in c.retrofits],
                  (120, 22, 34))
    cells = _photo_cells(store, c.photos, col.tag)
    for f in c.findings:  # repeated here so a column's section stands on its own
        cells += _photo_cells(store, data.finding_photos.get(f.id, []),
                              f"finding {data.finding_refs.get(f.id, '')}")
    if cells:
        pdf.heading("Photos", 2, keep=55)
        pdf.photos(cells)


def _check(pdf: ReportPDF, c: "ColumnData", system: str) -> None:
    pdf.heading("Latest check", 2)
    k = c.check
    if k is None:
        pdf.para("not checked: there is no saved check of this column.", bold=True)
        return
    d = k.result
    if k.record != c.record:
        pdf.para("The record has changed since this check (the check below used the record "
                 "as it was then): check the column again.", bold=True)
    word = _status(c)
    util = (f"{tx.utilization_text(k.utilization)} {word}" if word in ("OK", "OVER")
            else word)
    dem = d.get("demand")
    rows = [("Checked", f"{tx.when(k.checked_at)} with fieldcol {k.app_version}"),
            ("Code", f"{k.edition or k.code}, {str(d.get('basis', '')).upper()}, "
                     f"K basis {d.get('k_basis', '-')}"),
            ("Material", f"{d.get('material', {}).get('name', '-')}, Fy "
                         f"{tx.quantity(d.get('material', {}).get('Fy'), system)}"),
            ("Design strength", tx.quantity(d.get("design_strength"), system)),
            ("Nominal strength", tx.quantity(d.get("nominal_strength"), system)),
            ("Demand", "none recorded" if not dem else
             f"{tx.quantity(dem, system)} ({dem.get('combination', '-')})"),
            ("Utilization", util),
            ("Governing mode", tx.MODE_WORDS.get(d.get("governing_mode") or "",
                                                 d.get("governing_mode") or "-"))]
    bow = d.get("bow")
    if bow:
        rows.append(("Measured bow", f"{bow.get('axis')} axis, excess "
                     f"{tx.quantity(bow.get('excess'), system)}; capacity with the bow "
                     f"{tx.quantity(bow.get('capacity'), system)} (axial alone "
                     f"{tx.quantity(d.get('axial_design_strength'), system)})"))
    if k.note:
        rows.append(("Note", k.note))
    pdf.table(None, rows, (38, 130), bold_rows=[6] if word == "OVER" else ())

    pdf.heading("Every mode", 3)
    mrows = [[tx.MODE_WORDS.get(name, name), tx.quantity(m.get("effective_length"), system),
              tx.quantity(m.get("slenderness"), system),
              tx.quantity(m.get("critical_stress"), system),
              tx.quantity(m.get("nominal_strength"), system)]
             for name, m in (d.get("modes") or {}).items()]
    gov = [i for i, name in enumerate(d.get("modes") or {}) if name == d.get("governing_mode")]
    pdf.table(["Mode", "Effective length", "Slenderness", "Critical stress",
               "Nominal strength"], mrows, (50, 30, 24, 30, 30), bold_rows=gov)

    warnings = d.get("warnings") or []
    if warnings:
        pdf.heading("Warnings", 3)
        for w in warnings:
            pdf.para(f"- {w.get('message', w)}", size=8.5)

    pdf.heading("Calculation trace", 3, keep=30)
    srows = []
    for st in d.get("steps") or []:
        what, value = st.get("what", ""), tx.step_value(st, system)
        formula = st.get("formula") or ""
        if formula:
            # a word (record, table, measured) says where the value came from; else an equation
            what += f" = {formula}" if any(ch in formula for ch in "=()+-*/^<>0123456789") \
                else f" ({formula})"
        if isinstance(st.get("value"), str) and " " in value:
            what, value = f"{what}: {value}", "(text)"  # long text reads better in the wide column
        srows.append([st.get("symbol", ""), value, what, st.get("clause", "")])
    pdf.table(["Symbol", "Value", "What", "Clause"], srows, (27, 26, 82, 40))


def _restraint_history(pdf: ReportPDF, store: "Store", c: "ColumnData") -> None:
    pdf.heading("Restraint history", 2)
    if not c.restraint_changes:
        pdf.para("No restraint changes recorded.", size=8.5)
        return
    rows = [[rc.date, tx.RESTRAINT_KIND_WORDS.get(rc.kind, rc.kind), rc.axis or "-",
             rc.description + (f" ({tx.value_text(rc.detail)})" if rc.detail else ""),
             rc.seen_by or "-"] for rc in c.restraint_changes]
    pdf.table(["Date", "Change", "Axis", "What", "Seen by"], rows, (20, 24, 14, 94, 22))
    cells = []
    for rc in c.restraint_changes:
        cells += _photo_cells(store, c.restraint_photos.get(rc.id, []),
                              f"{rc.date} {tx.RESTRAINT_KIND_WORDS.get(rc.kind, rc.kind)}")
    if cells:
        pdf.photos(cells)


def _measurement_history(pdf: ReportPDF, c: "ColumnData", system: str) -> None:
    pdf.heading("Measurement history", 2)
    if not c.measurements:
        pdf.para("No readings recorded: the record holds the values as entered.", size=8.5)
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
        rows.append([quantity_name(m.quantity), m.text, shown, f"{m.taken_by or '-'}, {tx.when(m.taken_at)}",
                     note or "-", state])
    pdf.table(["Quantity", "As typed", "Value", "Who, when", "Gauge, note", "Status"], rows,
              (28, 18, 18, 34, 46, 30))
