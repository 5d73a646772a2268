"""PDF site reports: every column's check, the findings with their photos, the histories.

Public API::

    site_report(store, site_id, out_path, *, columns=None, report_date=None) -> Path
    REPORT_CAUTION   # the caution printed on the cover (the footer of every page holds CAUTION)

The report reads the store and the engine's saved results; the engine never imports it.
Pages are A4 portrait for an ``si`` site and US Letter portrait for a ``us`` site; the fonts are
the DejaVu Sans files bundled under ``assets/fonts``.
"""

from __future__ import annotations

import datetime as _dt
import os
from pathlib import Path
from typing import TYPE_CHECKING, Sequence

from fieldcol import CAUTION, __version__
from fieldcol.errors import InputError

if TYPE_CHECKING:
    from fieldcol.store import Store

REPORT_CAUTION = (
    CAUTION + " The checks in this report rest on the data recorded on site: measured "
    "dimensions, assumed grades and restraints must be confirmed by the engineer responsible, "
    "and historic or unknown steels need coupon tests before their yield stress is relied on."
)

PAPER = {"us": "Letter", "si": "A4"}


def site_report(store: "Store", site_id: str, out_path: str | os.PathLike[str], *,
                columns: Sequence[str] | None = None,
                report_date: str | None = None) -> Path:
    """Write the PDF report of a site and the column register as CSV beside it.

    The PDF holds the cover with the caution, the contents, the column register (worst first),
    the findings register, one sheet per column (record, result, side view, column curve,
    every mode, trace, histories) and the photo grid; the CSV (``<out>.csv``, same name) holds
    the register's rows for a spreadsheet.

    Args:
        store: an open store.
        site_id: the site's id (``store.site_by_name(name).id``).
        out_path: the PDF file to write (its folder must exist; an existing file is replaced
            only once the new report is complete).
        columns: the tags to report, in this order; ``None`` reports every live column by tag.
        report_date: the date printed on the report (``YYYY-MM-DD``; default today, UTC).

    Returns:
        The path of the PDF written (the CSV is ``path.with_suffix(".csv")``).

    Raises:
        InputError: on field ``site``, ``columns``, ``report_date`` or ``out``.

    Example: ``site_report(store, store.site_by_name("Kestrel Lane Print Works").id,
    "kestrel.pdf")`` writes the demo site's report and returns ``Path("kestrel.pdf")``.
    """
    from fieldcol.report import _column_sheet, _pages
    from fieldcol.report._gather import gather
    from fieldcol.report._layout import MISSING_MARK, ReportPDF

    out = Path(out_path)
    if out.suffix.lower() != ".pdf":
        raise InputError("out", str(out), "the report file must end in .pdf", "e.g. site.pdf")
    if not out.parent.is_dir():
        raise InputError("out", str(out), "the folder does not exist", "create it first")
    if report_date is None:
        report_date = _dt.datetime.now(_dt.timezone.utc).date().isoformat()
    else:
        try:
            _dt.date.fromisoformat(report_date)
        except (TypeError, ValueError):
            raise InputError("report_date", str(report_date), "not a date YYYY-MM-DD",
                             "e.g. 2026-03-10") from None
    data = gather(store, site_id, columns)
    pdf = ReportPDF(paper=PAPER.get(data.site.unit_system, "A4"), site_name=data.site.name,
                    report_date=report_date, caution=CAUTION)
    _pages.cover(pdf, data, report_date=report_date, version=__version__,
                 caution=REPORT_CAUTION)
    pdf.add_page()
    pdf.insert_toc_placeholder(_pages.render_contents,
                               pages=_pages.contents_pages(len(data.columns)))
    _pages.register(pdf, data)
    _pages.findings_register(pdf, data)
    for c in data.columns:
        _column_sheet.column_sheet(pdf, store, data, c)
    _pages.photo_grid(pdf, store, data)
    if pdf.missing:
        pdf.para(f"{len(pdf.missing)} character(s) in the records cannot be shown in this "
                 f"report's font and are printed as {MISSING_MARK}: "
                 + " ".join(f"U+{ord(ch):04X}" for ch in sorted(pdf.missing)[:40])
                 + ". The store keeps the text as entered.", size=7.5)
    # write beside the targets and rename, so a failed run never leaves half a report
    csv_out = out.with_suffix(".csv")
    tmp = out.with_name(f".{out.name}.{os.getpid()}.tmp")
    tmp_csv = csv_out.with_name(f".{csv_out.name}.{os.getpid()}.tmp")
    try:
        pdf.output(str(tmp))
        _write_csv(tmp_csv, *_pages.register_rows(data))
        os.replace(tmp, out)
        os.replace(tmp_csv, csv_out)
    except OSError as e:
        tmp.unlink(missing_ok=True)
        tmp_csv.unlink(missing_ok=True)
        raise InputError("out", str(out), e.strerror or "cannot write the file", None) from None
    return out


def _write_csv(path: Path, headings: list[str], rows: list[list[str]]) -> None:
    """The register as CSV (UTF-8 with BOM so spreadsheets read non-Latin text), every cell
    guarded against formulas, the caution as the last line."""
    import csv

    from fieldcol.store._schedule import guard_cell

    with open(path, "w", newline="", encoding="utf-8-sig") as f:
        w = csv.writer(f)
        w.writerow(headings)
        for r in rows:
            # a lone "-" (nothing recorded) is no formula: guarded, its apostrophe showed
            w.writerow([x if x == "-" else guard_cell(x) for x in r])
        w.writerow([CAUTION])


__all__ = ["site_report", "REPORT_CAUTION", "PAPER"]
