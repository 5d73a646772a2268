"""CSV export opened in a spreadsheet: text that a spreadsheet would run as a formula is
written as text (a leading apostrophe: common practice against formula injection, the
characters being those spreadsheets start a formula with: = + - @, and tab / carriage return),
and the export still reads back unchanged.
"""

from __future__ import annotations

import csv
from pathlib import Path

import pytest

from fieldcol.cli import main
from fieldcol.store import Store, apply_schedule, export_csv, preview_schedule
from fieldcol.store._schedule import guard_cell, unguard_cell

HOSTILE = {
    "tag": "=HYPERLINK(\"http://example.invalid\",\"open\")",
    "grid": "+A/1",
    "location": "@SUM(A1:A9)",
    "level": "-L1 mezzanine",
}


@pytest.fixture
def store(tmp_path: Path):
    with Store(tmp_path / "s.db") as s:
        site = s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        s.add_column(site.id, {"tag": HOSTILE["tag"], "section": "W10X49", "length": "14 ft",
                               "demand": {"axial": "120 kip"}},
                     level=HOSTILE["level"], grid=HOSTILE["grid"], location=HOSTILE["location"])
        s.add_column(site.id, {"tag": "C/7", "section": "W8X31", "length": "12 ft"},
                     location="+ plate added 2019")
        s.add_column(site.id, {"tag": "B/4", "section": "W12X65", "length": "16 ft"},
                     location="-12.5")
        yield s


@pytest.mark.parametrize("text", ["=1+1", "+1", "-A", "@x", "\tx", "\rx", "-", "-1-1", "-inf"])
def test_triggers_get_an_apostrophe(text: str):
    assert guard_cell(text) == "'" + text
    assert unguard_cell(guard_cell(text)) == text


@pytest.mark.parametrize("text", ["-12.5", "-3", "-.5", "-1e3", "B/4", "", "'plain", "12 ft"])
def test_plain_text_and_negative_numbers_are_left_alone(text: str):
    assert guard_cell(text) == text


def test_no_exported_cell_starts_a_formula(store: Store, tmp_path: Path):
    out = tmp_path / "out.csv"
    assert export_csv(store, "Kestrel Lane Print Works", out) == 3
    rows = list(csv.reader(out.open(encoding="utf-8", newline="")))
    for row in rows[1:]:
        for cell in row:
            assert not cell.startswith(("=", "+", "@", "\t", "\r")), cell
            assert not cell.startswith("-") or cell == "-12.5", cell
    table = {r[0]: dict(zip(rows[1], r)) for r in rows[2:]}
    hostile = table["'" + HOSTILE["tag"]]
    for key in ("grid", "location", "level"):
        assert hostile[key] == "'" + HOSTILE[key]
    assert table["B/4"]["location"] == "-12.5"
    assert table["C/7"]["location"] == "'+ plate added 2019"


def test_the_export_reads_back_as_the_same_columns(store: Store, tmp_path: Path):
    out = tmp_path / "out.csv"
    export_csv(store, "Kestrel Lane Print Works", out)
    pv = preview_schedule(store, "Kestrel Lane Print Works", out)
    assert pv.counts()["add"] == 0 and pv.counts()["errors"] == 0, pv.plans
    tags = sorted(p.tag for p in pv.plans)
    assert HOSTILE["tag"] in tags and "B/4" in tags
    site = store.find_site("Kestrel Lane Print Works")
    before = {c.tag for c in store.list_columns(site.id)}
    apply_schedule(store, "Kestrel Lane Print Works", out)
    col = store.find_column(site.id, HOSTILE["tag"])
    assert col is not None and col.grid == HOSTILE["grid"] and col.location == HOSTILE["location"]
    assert {c.tag for c in store.list_columns(site.id)} == before and len(before) == 3
    assert store.find_column(site.id, "C/7").location == "+ plate added 2019"


def test_export_command_output_is_guarded(store: Store, tmp_path: Path, capsys):
    out = tmp_path / "cli.csv"
    store.close()
    assert main(["export-csv", str(out), "--db", str(tmp_path / "s.db"),
                 "--site", "Kestrel Lane Print Works"]) == 0
    assert "'=HYPERLINK" in out.read_text(encoding="utf-8")
