"""The site report made in the app and handed out, in a real browser (Debian chromium via PyPI
playwright, every request that leaves the machine refused), at 390 px and 820 px.

From the demo site's screen: the report screen, a report date typed wrong (named, nothing
made), then the PDF as a download and the register as a second one. Outside reference: pypdf
reads the PDF (pages, the caution's words, the site's name), Python's csv module the register.
Screenshots ``report-*.png`` (``-tablet`` at 820 px) where ``FIELDCOL_SHOTS`` points.
"""

from __future__ import annotations

import csv
import io

import pypdf
import pytest

from _browser import (  # noqa: F401  (browser and served are fixtures)
    SIZES, TIMEOUT, _click, _open, _open_column, _poll, _sel, _shot, _type_into, _wait, _words, browser,
    served, server,
)
from fieldcol import CAUTION

SITE = "Kestrel Lane Print Works"


@pytest.mark.parametrize("size", ["phone", "tablet"])
def test_the_site_report_is_made_in_the_app_and_handed_out(server, browser, tmp_path, size):
    page = _open(browser, server, SIZES[size])
    suffix = "" if size == "phone" else "-tablet"
    _click(page, f"site-{SITE}", done=lambda: page.locator(_sel("site-report")).count() > 0)
    _click(page, "site-report", done=lambda: page.locator(_sel("report-make")).count() > 0)
    _wait(page, "caution")
    _shot(page, f"report{suffix}.png")
    # a date typed wrong: named on its entry, no file made
    _type_into(page, "report-date", "5 Dec", enter=False)
    _click(page, "report-make")
    _poll(lambda: _words(page, "report-status"), lambda t: "Not made: report date" in t,
          "the date refused")
    _type_into(page, "report-date", "2026-12-05", enter=False)
    with page.expect_download(timeout=TIMEOUT * 4 * 1000) as got:
        _click(page, "report-make")
    pdf_path = tmp_path / got.value.suggested_filename
    got.value.save_as(pdf_path)
    assert pdf_path.name == "kestrel-lane-print-works-2026-12-05.pdf"
    _poll(lambda: _words(page, "report-status"), lambda t: "24 columns" in t, "report made")
    pages = pypdf.PdfReader(pdf_path).pages
    first = " ".join(pages[0].extract_text().split())
    assert SITE in first and "2026-12-05" in first
    caution = " ".join(CAUTION.split()[:6])  # the opening words, on every page
    assert all(caution in " ".join(p.extract_text().split()) for p in pages)
    with page.expect_download(timeout=TIMEOUT * 1000) as got:
        _click(page, "report-save-csv")
    csv_path = tmp_path / got.value.suggested_filename
    got.value.save_as(csv_path)
    rows = list(csv.reader(io.StringIO(csv_path.read_text(encoding="utf-8-sig"))))
    assert csv_path.suffix == ".csv" and len(rows) == 1 + 24 + 1  # heading, columns, caution
    assert rows[-1] == [CAUTION]
    _shot(page, f"report-made{suffix}.png")
    assert page.refused == [] or all("rive" in u for u in page.refused)


def test_a_column_s_calculation_sheet_from_its_check_tab(server, browser, tmp_path):
    page = _open(browser, server, SIZES["phone"])
    _click(page, f"site-{SITE}", done=lambda: page.locator(_sel("column-A/1-G")).count() > 0)
    _open_column(page, "column-C/3-G")
    _click(page, "column-sheet", done=lambda: page.locator(_sel("report-make")).count() > 0)
    _wait(page, "caution")
    _shot(page, "report-column.png")
    with page.expect_download(timeout=TIMEOUT * 2 * 1000) as got:
        _click(page, "report-make")
    path = tmp_path / got.value.suggested_filename
    got.value.save_as(path)
    assert path.name.startswith("kestrel-lane-print-works-c-3-g-")
    text = " ".join(" ".join(p.extract_text().split()) for p in pypdf.PdfReader(path).pages)
    assert "Column C/3-G" in text and "Column C/2-G" not in text
    _poll(lambda: _words(page, "report-status"), lambda t: "1 column" in t, "sheet made")
    _click(page, "back", scroll=False,  # back to the column, its result on top
           done=lambda: "C/3-G" in _words(page, "column-tag"))
