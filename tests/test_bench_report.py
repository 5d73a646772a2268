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
    # timings rounded to 0.01 s: 40 rows may apply in under 5 ms (the row count shows it ran)
    assert res["import_100k_s"] >= res["import_apply_s"] >= 0
    assert res["import_peak_mb"] > 0 and res["import_cpu_s"] > 0


def test_contents_over_two_pages_points_at_the_right_pages(tmp_path: Path):
    import re

    from fieldcol.report import site_report
    from fieldcol.report._pages import contents_pages

    n = 170  # more sheets than the first contents page lists (3 x 52)
    assert contents_pages(n) == 2 and contents_pages(156) == 1
    path, name = build_site(tmp_path, n)
    with Store(path, readonly=True) as s:
        out = site_report(s, s.site_by_name(name).id, tmp_path / "big.pdf",
                          report_date="2026-03-10")
    pages = [re.sub(r"\s+", " ", p.extract_text()) for p in pypdf.PdfReader(out).pages]
    toc = pages[1] + " " + pages[2]
    assert "Contents" in pages[1] and "Column register" in pages[3]
    for tag in ("A/1-G", "Z/2-G", "N/7-G", "J/6-G"):  # first, middle, on the second page, last
        page = int(re.search(re.escape(tag) + r" (\d+)", toc).group(1))
        assert f"Column {tag} " in pages[page - 1], tag
