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
    """Write the PDF report of a site: cover, summary, findings, one section per column.

    Args:
        store: an open store.
        site_id: the site's id (``store.site_by_name(name).id``).
        out_path: the PDF file to write (its folder must exist; an existing file is replaced
            only once the new report is complete).
        columns: the tags to report, in this order; ``None`` reports every live column by tag.
        report_date: the date printed on the report (``YYYY-MM-DD``; default today, UTC).

    Returns:
        The path written.

    Raises:
        InputError: on field ``site``, ``columns``, ``report_date`` or ``out``.

    Example: ``site_report(store, store.site_by_name("Kestrel Lane Print Works").id,
    "kestrel.pdf")`` writes the demo site's report and returns ``Path("kestrel.pdf")``.
    """
    from fieldcol.report import _pages
    from fieldcol.report._gather import gather
    from fieldcol.report._layout import ReportPDF

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
    _pages.summary(pdf, data)
    _pages.findings(pdf, store, data)
    for c in data.columns:
        _pages.column_section(pdf, store, data, c)
    # write beside the target and rename, so a failed run never leaves half a report
    tmp = out.with_name(f".{out.name}.{os.getpid()}.tmp")
    try:
        pdf.output(str(tmp))
        os.replace(tmp, out)
    except OSError as e:
        tmp.unlink(missing_ok=True)
        raise InputError("out", str(out), e.strerror or "cannot write the file", None) from None
    return out


__all__ = ["site_report", "REPORT_CAUTION", "PAPER"]
