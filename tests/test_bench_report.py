"""The report and import bench cases run end to end on a small workload (their timings are
read from `fieldcol bench`, never asserted here: no timed tests)."""

from __future__ import annotations

from pathlib import Path

import pypdf

from fieldcol.bench import CASES
from fieldcol.bench._import import measure
from fieldcol.bench._report import _report, build_site
from fieldcol.store import Store


def test_cases_are_found_by_module():
    assert {"engine", "store", "report", "import"} <= set(CASES)
    assert CASES[0] == "engine"


def test_report_case_builds_a_checked_site_and_reports_it(tmp_path: Path):
    seconds = _report(tmp_path, 12)
    assert seconds > 0
    reader = pypdf.PdfReader(tmp_path / "bench.pdf")
    text = " ".join(p.extract_text() for p in reader.pages)
    assert "Column register" in text and "Photographs" in text
    with Store(tmp_path / "report.db", readonly=True) as s:
        site = s.site_by_name("Bench works 12")
        cols = s.list_columns(site.id, limit=100)
        assert len(cols) == 12 and all(s.latest_check(c.id) for c in cols)
        assert len(s.list_findings(site.id)) == 3  # every fifth column: 0, 5, 10
    assert (tmp_path / "bench.csv").read_text(encoding="utf-8-sig").count("\n") == 1 + 12 + 1


def test_import_case_imports_every_row_in_a_fresh_process():
    res = measure(40)
    assert res["import_rows"] == 40
    assert res["import_100k_s"] >= res["import_apply_s"] > 0
    assert res["import_peak_mb"] > 0
