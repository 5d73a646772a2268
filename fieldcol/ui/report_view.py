"""The report screen of a site (``/sites/<id>/report``) or of one column
(``/columns/<id>/report``, its calculation sheet): the PDF report and its column register (CSV)
made in the app and handed out (the platform's save dialog; a download in a browser), the same
files as ``fieldcol report`` (``--column TAG`` for one column).

``make_report(store, site_id, date)`` and ``report_words`` are the plain view-model (tested
without Flet); ``ReportScreen(page, store, site_id)`` builds the controls and makes the report
in a worker thread.

Identifiers: ``report-date``, ``report-make``, ``report-status``, ``report-save-csv``.
"""

from __future__ import annotations

import asyncio
import datetime as dt
import re
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

import flet as ft

from fieldcol.errors import InputError
from fieldcol.ui import views as v

if TYPE_CHECKING:
    from fieldcol.store import Store

_UNSAFE = re.compile(r"[^A-Za-z0-9]+")


@dataclass(frozen=True)
class MadeReport:
    """A site report made for saving: the PDF and the CSV register, each with its file name."""
    name: str
    pdf: bytes
    csv_name: str
    csv: bytes
    columns: int


def report_name(site_name: str, date: str, tag: str | None = None) -> str:
    """The file name a report is offered under: the site (and the column) and the date.

    Example:
        >>> report_name("Kestrel Lane Print Works", "2026-12-05")
        'kestrel-lane-print-works-2026-12-05.pdf'
        >>> report_name("Kestrel Lane Print Works", "2026-12-05", "C/3-G")
        'kestrel-lane-print-works-c-3-g-2026-12-05.pdf'
    """
    stem = _UNSAFE.sub("-", site_name.lower()).strip("-")[:60] or "site"
    if tag:
        stem += "-" + (_UNSAFE.sub("-", tag.lower()).strip("-")[:30] or "column")
    return f"{stem}-{date}.pdf"


def today() -> str:
    """Today's date (UTC), as a report is dated by default.

    Example:
        >>> len(today()) == 10
        True
    """
    return dt.datetime.now(dt.timezone.utc).date().isoformat()


def make_report(store: "Store", site_id: str, date: str, tag: str | None = None) -> MadeReport:
    """Write the report and register to a private temporary folder and read them back.

    Args:
        store: the open store.
        site_id: the site.
        date: the date printed on the report, ``YYYY-MM-DD``.
        tag: one column's tag (its sheet alone); every column of the site when None.

    Returns:
        A ``MadeReport``. Raises ``InputError`` naming the field (``report_date`` for a bad date).

    Example:
        >>> made = make_report(store, site.id, "2026-12-05")
        >>> made.pdf[:5], made.csv_name
        (b'%PDF-', 'depot-2026-12-05.csv')
    """
    from fieldcol.report import site_report

    site = store.get_site(site_id)
    date = (date or "").strip() or today()
    with tempfile.TemporaryDirectory(prefix="fieldcol-report-") as tmp:
        out = site_report(store, site_id, Path(tmp) / "report.pdf", report_date=date,
                          columns=[tag] if tag else None)
        pdf, csv = out.read_bytes(), out.with_suffix(".csv").read_bytes()
    columns = 1 if tag else store.site_counts(site_id)["columns"]  # a sheet each
    name = report_name(site.name, date, tag)
    return MadeReport(name, pdf, name[:-4] + ".csv", csv, columns)


def report_words(made: MadeReport) -> str:
    """What a made report is, in a line.

    Example:
        >>> report_words(MadeReport("a.pdf", b"x" * 2_500_000, "a.csv", b"", 12))
        'Report a.pdf: 12 columns, 2.5 MB. The caution is on every page.'
    """
    size = len(made.pdf) / 1e6
    return (f"Report {made.name}: {made.columns} column{'s' if made.columns != 1 else ''}, "
            f"{size:.1f} MB. The caution is on every page.")


class ReportScreen:
    """The report screen's controls and handlers over one site."""

    def __init__(self, page: ft.Page, store: "Store", site_id: str,
                 tag: str | None = None) -> None:
        from fieldcol.ui.intake import intake_for

        self.page, self.store, self.site_id, self.tag = page, store, site_id, tag
        self.made: MadeReport | None = None
        self.date = ft.TextField(label="Report date", value=today(), hint_text="YYYY-MM-DD",
                                 text_size=17, keyboard_type=ft.KeyboardType.DATETIME,
                                 error_max_lines=3)
        self.status = ft.Text("", size=16, color=v.INK)
        self.busy = ft.ProgressRing(width=22, height=22, visible=False)
        self.make = ft.FilledButton("Make the report (PDF)", icon=ft.Icons.PICTURE_AS_PDF,
                                    height=v.TAP, on_click=self.make_report)
        self.csv = ft.OutlinedButton("Save the register (CSV)", icon=ft.Icons.TABLE_CHART,
                                     height=v.TAP, on_click=self.save_csv, disabled=True)
        intake_for(page)  # the picker is a service: in the page before its first use

    def controls(self, counts: str) -> list[ft.Control]:
        """The screen's body; ``counts`` says what the site holds (``SiteCard.summary``)."""
        what = (f"Column {self.tag}: its sheet (the record, the latest check with every mode "
                "and the trace, the histories), its findings and their photos."
                if self.tag else
                f"Every column of the site ({counts}), worst first: the register, the "
                "findings, one sheet per column with its check and trace, and the photos.")
        return [
            v._card([
                v.text_line(what + " The register also comes as a CSV for a spreadsheet.",
                            size=16),
                ft.Semantics(identifier="report-date", content=self.date),
                ft.Row([ft.Semantics(identifier="report-make", button=True, content=self.make),
                        ft.Semantics(identifier="report-save-csv", button=True,
                                     content=self.csv), self.busy], wrap=True, spacing=8,
                       run_spacing=8),
                ft.Semantics(identifier="report-status", live_region=True,
                             content=self.status)],
                    title=f"Calculation sheet of {self.tag}" if self.tag else "Site report"),
            v.caution_box()]

    def _show(self, words: str, *, busy: bool = False) -> None:
        self.status.value = words
        self.busy.visible = busy
        self.make.disabled = busy
        self.csv.disabled = busy or self.made is None
        self.page.update()

    async def make_report(self, _e: Any = None) -> None:
        """Make the PDF and the CSV off the UI loop, then hand the PDF out."""
        from fieldcol.ui.intake import intake_for

        self.date.error = None
        self._show("Making the report...", busy=True)
        try:
            self.made = await asyncio.to_thread(make_report, self.store, self.site_id,
                                                self.date.value or "", self.tag)
            await intake_for(self.page).save(self.made.name, self.made.pdf)
            self._show(report_words(self.made))
        except InputError as e:
            if e.field == "report_date":
                self.date.error = f"{e.reason} ({e.hint})" if e.hint else e.reason
            self._show(f"Not made: {e.field.replace('_', ' ')}: {e.reason}")

    async def save_csv(self, _e: Any = None) -> None:
        """Hand out the register of the report made last."""
        from fieldcol.ui.intake import intake_for

        if self.made is not None:
            await intake_for(self.page).save(self.made.csv_name, self.made.csv)
            self._show(f"Register {self.made.csv_name}: {self.made.columns} columns, worst "
                       "first, the caution on its last line.")
