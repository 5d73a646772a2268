"""The report's parts around the column sheets, in order: cover, contents, column register,
findings register, then (after the sheets of ``_column_sheet``) the photo grid."""

from __future__ import annotations

from typing import TYPE_CHECKING

from fieldcol.report import _text as tx
from fieldcol.report._layout import GREY, SMALL_PT, PhotoCell, ReportPDF
# a photo's time and markup as the app's photo views write them (plain data: no Flet)
from fieldcol.ui.photos import exif_time, markup_words

if TYPE_CHECKING:
    from fieldcol.report._gather import ColumnData, SiteData
    from fieldcol.store import Photo, Store

UNIT_WORDS = {"us": "US customary (kip, ksi, ft-in)", "si": "SI (kN, MPa, mm)"}


def cover(pdf: ReportPDF, data: "SiteData", *, report_date: str, version: str,
          caution: str) -> None:
    """The cover: who, where, which code, how many columns and how many over, the caution."""
    s = data.site
    pdf.add_page()
    pdf.ln(14)
    pdf.para("Column assessment report", size=22, bold=True)
    pdf.para(s.name, size=16, bold=True)
    pdf.ln(4)
    over = sum(1 for c in data.columns if tx.column_status(c) == "OVER")
    unchecked = sum(1 for c in data.columns if tx.column_status(c) == "not checked")
    uncovered = sum(1 for c in data.columns if tx.column_status(c) == "not covered")
    count = f"{len(data.columns)}"
    if data.subset:
        count += f" (chosen from the site's {data.site_columns})"
    rows = [("Site", s.name), ("Address", s.address or "not recorded"),
            ("Owner's reference", s.owner_ref or "not recorded"),
            ("Design code", tx.CODE_WORDS.get(s.code, s.code)),
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


STATUS_RANK = {"OVER": 0, "not covered": 1, "not checked": 2, "OK": 3, "no demand": 4}


def worst_first(columns: list["ColumnData"]) -> list["ColumnData"]:
    """The columns worst first: OVER, not covered, not checked, OK, no demand; within each,
    the highest utilization first, then by tag.

    Example: ``[c.column.tag for c in worst_first(data.columns)][0]`` gives ``'C/3-G'``.
    """
    def key(c: "ColumnData") -> tuple:
        u = c.utilization if c.utilization is not None and c.utilization == c.utilization else -1
        return (STATUS_RANK.get(tx.column_status(c), 5), -u, c.column.tag)
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
                     else tx.measured_label(section)
                     if isinstance(section, dict) and not section.get("name")
                     else section_label(section) or "-", _mode(c),
                     tx.utilization_text(c.utilization), tx.column_status(c),
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
        place = tx.place_text(f, data.site.unit_system)
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
        marked = f"; marked: {markup_words(p.markup)}" if p.markup else ""
        who = f", by {p.created_by}" if p.created_by else ", photographer not recorded"
        name = p.original_name or p.sha256[:12]
        cells.append(PhotoCell(path if path.is_file() else None,
                               f"{ref}  {what}, {where}{marked}. {name}, "
                               f"{exif_time(p.exif_taken_at)}{who}", p.markup))
    pdf.photos(cells)
