"""The report screen's view-model (``fieldcol.ui.report_view``): the demo site's report made in
memory as the app hands it out, a bad date named, file names from the site and the date.

A real store holding the invented demo site; pypdf (an outside PDF reader) reads the result.
The browser walk (downloads at 390 px and 820 px) is in tests/test_ui_browser_report.py.
"""

from __future__ import annotations

import io

import pypdf
import pytest

from fieldcol import CAUTION
from fieldcol.errors import InputError
from fieldcol.ui.report_view import make_report, report_name, report_words

from tests.test_ui_session import demo  # noqa: F401  (the fixture)


def test_the_report_is_made_in_memory_with_its_register(demo):  # noqa: F811
    store, site = demo
    made = make_report(store, site.id, "2026-12-05")
    assert made.name == "kestrel-lane-print-works-2026-12-05.pdf"
    assert made.csv_name == "kestrel-lane-print-works-2026-12-05.csv"
    reader = pypdf.PdfReader(io.BytesIO(made.pdf))
    assert len(reader.pages) > made.columns == 24
    assert CAUTION.split(";")[0] in " ".join(reader.pages[0].extract_text().split())
    assert made.csv.decode("utf-8-sig").splitlines()[0].startswith("Tag,")
    assert report_words(made).startswith(f"Report {made.name}: 24 columns, ")


@pytest.mark.parametrize("date", ["5 Dec", "2026-13-01", "2026-12-05; DROP"])
def test_a_bad_report_date_is_named(demo, date):  # noqa: F811
    store, site = demo
    with pytest.raises(InputError) as e:
        make_report(store, site.id, date)
    assert e.value.field == "report_date"


def test_file_names_keep_to_safe_characters():
    # a site name with slashes or dots never makes a path of its own
    assert report_name("../Unit 4/Bay 2", "2026-12-05") == "unit-4-bay-2-2026-12-05.pdf"
    assert report_name("///", "2026-12-05") == "site-2026-12-05.pdf"


def test_one_column_s_calculation_sheet(demo):  # noqa: F811
    store, site = demo
    made = make_report(store, site.id, "2026-12-05", "C/3-G")
    assert made.name == "kestrel-lane-print-works-c-3-g-2026-12-05.pdf" and made.columns == 1
    text = " ".join(" ".join(p.extract_text().split())
                    for p in pypdf.PdfReader(io.BytesIO(made.pdf)).pages)
    assert "Column C/3-G" in text and "Column C/2-G" not in text
    assert CAUTION.split(";")[0] in text
    rows = made.csv.decode("utf-8-sig").splitlines()
    assert rows[1].startswith("C/3-G,") and len(rows) == 3  # heading, the column, the caution
