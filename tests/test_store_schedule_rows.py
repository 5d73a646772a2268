"""A CSV schedule row is read as the engine reads a record: what the engine would refuse is a row
error, and nothing is written; an unedited export imports as no change.

Outside reference: RFC 4180 (CSV): a quoted field ends at its closing quote, and a quote inside
a quoted field is written twice. Section names from the AISC Shapes Database v15.0.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from fieldcol.cli import main
from fieldcol.demo import SITE_NAME, build_demo
from fieldcol.errors import InputError
from fieldcol.store import Store, apply_schedule, export_csv, open_store, preview_schedule

HEAD = "tag,level,grid,section,length,material,demand,basis\n"


@pytest.fixture
def store(tmp_path: Path):
    with Store(tmp_path / "s.db") as s:
        s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        yield s


def _errors(store, tmp_path, text):
    p = tmp_path / "in.csv"
    p.write_text(text, encoding="utf-8")
    pv = preview_schedule(store, "Kestrel Lane Print Works", p)
    with pytest.raises(InputError):
        apply_schedule(store, "Kestrel Lane Print Works", p)
    assert store.list_columns() == []
    return [(e.row, e.field) for e in pv.errors], pv


def test_unknown_sections_grades_and_bases_are_row_errors(store, tmp_path):
    got, pv = _errors(store, tmp_path, HEAD + (
        "A/1,L1,A/1,W14X90,30 ft,A992,800 kip,lrfd\n"
        "A/2,L1,A/2,NOT_A_SECTION,30 ft,A992,800 kip,lrfd\n"
        "A/3,L1,A/3,W14X90,30 ft,A9999,800 kip,lrfd\n"
        "A/4,L1,A/4,W14X90,30 ft,A992,800 kip,whatever\n"
        "A/5,L1,A/5,W14X90,30 ft,A992,800 kip,en\n"           # EN basis on an AISC site
        'A/6,L1,A/6,"{""name"": ""W10X49"", ""Loss"": {""flange"": ""0.3 in""}}",30 ft,A992,,\n'
        'A/7,L1,A/7,W10X49,30 ft,"{""grade"": ""A7"", ""fy"": ""25 ksi""}",,\n'
        'A/8,L1,A/8,"{""name"": ""W10X49"", ""name"": ""W12X65""}",30 ft,A992,,\n'
        "A/9,L1,A/9,W14X90,30 ft,A992,800 kip,LRFD\n"))
    assert got == [(3, "section"), (4, "material"), (5, "basis"), (6, "basis"),
                   (7, "section.Loss"), (8, "material.fy"), (9, "section"), (10, "basis")]
    assert "did you mean 'loss'?" in str(pv.errors[4])
    assert "appears twice" in str(pv.errors[6])


def test_a_row_is_checked_with_the_record_it_joins(store, tmp_path):
    site = store.find_site("Kestrel Lane Print Works")
    store.add_column(site.id, {"tag": "B/4", "section": "W14X90", "material": "A992",
                               "length": "30 ft",
                               "restraints": {"weak": {"braces": [{"at": "20 ft"}]}}})
    p = tmp_path / "in.csv"
    p.write_text(HEAD + "B/4,,,,16 ft,,,\n")      # shorter than where the brace stands
    pv = preview_schedule(store, "Kestrel Lane Print Works", p)
    assert [(e.row, e.field) for e in pv.errors] == [(2, "restraints.weak.braces[0].at")]


def test_an_unclosed_quote_is_a_row_error_not_a_merged_row(store, tmp_path):
    got, pv = _errors(store, tmp_path, HEAD + (
        "A/1,L1,A/1,W14X90,30 ft,A992,800 kip,lrfd\n"
        'A/2,L1,"A/2,W14X90,30 ft,A992,800 kip,lrfd\n'   # the quote never closes
        "A/3,L1,A/3,W14X90,30 ft,A992,800 kip,lrfd\n"))
    assert got == [(3, "row")] and "quote" in pv.errors[0].reason
    # closed much later by another quote: still not one row merged into grid
    got, pv = _errors(store, tmp_path, HEAD + (
        'A/2,L1,"A/2,W14X90,30 ft,A992,800 kip,lrfd\n'
        'A/3,L1,A/3,W14X90,30 ft,A992,"800 kip",lrfd\n'
        "A/4,L1,A/4,W14X90,30 ft,A992,800 kip,lrfd\n"))
    assert got[0] == (2, "row") and "quote" in pv.errors[0].reason
    got, _ = _errors(store, tmp_path, HEAD + 'A/2,L1,"A/2"x,W14X90,30 ft,A992,800 kip,lrfd\n')
    assert got == [(2, "row")]


def test_a_huge_cell_is_a_row_error(store, tmp_path):
    got, pv = _errors(store, tmp_path, HEAD + "A/1,L1," + "x" * 10_000_000 +
                      ",W14X90,30 ft,A992,800 kip,lrfd\nA/2,L1,A/2,W14X90,30 ft,A992,,\n")
    assert got == [(2, "grid")] and "longer than" in pv.errors[0].reason


def test_reimporting_an_unedited_export_of_the_demo_changes_nothing(tmp_path):
    with open_store(tmp_path / "demo.db") as store:
        build_demo(store)
        site = store.site_by_name(SITE_NAME)
        before = {c.tag: store.get_column(c.id).record for c in store.list_columns(site.id,
                                                                                 limit=1000)}
        out = tmp_path / "demo.csv"
        export_csv(store, SITE_NAME, out)
        pv = preview_schedule(store, SITE_NAME, out)
        assert pv.counts() == {"add": 0, "update": 0, "unchanged": len(before), "errors": 0}
        apply_schedule(store, SITE_NAME, out)
        after = {c.tag: store.get_column(c.id).record for c in store.list_columns(site.id,
                                                                                limit=1000)}
        assert json.dumps(after, sort_keys=True) == json.dumps(before, sort_keys=True)
        # an edited cell is a change, and only that cell
        rows = out.read_text().splitlines()
        i = next(i for i, r in enumerate(rows) if r.startswith("A/1-G,"))
        rows[i] = rows[i].replace(",A7,", ",A36,", 1)
        out.write_text("\n".join(rows) + "\n")
        pv = preview_schedule(store, SITE_NAME, out)
        assert [(p.tag, p.changes) for p in pv.plans if p.action == "update"] == [
            ("A/1-G", ["material"])]


def test_a_refused_apply_leaves_no_store_file(tmp_path, capsys):
    db = tmp_path / "new.db"
    bad = tmp_path / "bad.csv"
    bad.write_text(HEAD + "A/1,L1,A/1,NOT_A_SECTION,30 ft,A992,800 kip,lrfd\n")
    good = tmp_path / "good.csv"
    good.write_text(HEAD + "A/1,L1,A/1,W14X90,30 ft,A992,800 kip,lrfd\n")
    args = ["import-schedule", "--db", str(db), "--site", "Kestrel Lane Print Works"]
    assert main([*args, str(bad), "--apply", "--create-site", "--code", "aisc360-22"]) == 2
    assert main([*args, str(good), "--apply"]) == 2                 # no --create-site
    assert main([*args, str(good), "--apply", "--create-site"]) == 2  # no --code
    assert main([*args, str(good), "--apply", "--create-site", "--code", "en1993-1-1"]) == 2
    assert "row 2.basis" in capsys.readouterr().err                 # lrfd is not EN's basis
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bad.csv", "good.csv"]
    assert main([*args, str(good), "--apply", "--create-site", "--code", "aisc360-22"]) == 0
    with open_store(db) as store:
        assert [c.tag for c in store.list_columns()] == ["A/1"]


# -- a long import does not hold the write lock while it reads its rows ----------------------

def _rows(n: int) -> str:
    return HEAD + "".join(f"Z/{i},L1,Z/{i},W14X90,30 ft,A992,800 kip,lrfd\n" for i in range(n))


def test_planning_needs_no_write_lock(store, tmp_path):
    import sqlite3

    src = tmp_path / "long.csv"
    src.write_text(_rows(40))
    other = sqlite3.connect(store.path, timeout=0)   # another program, holding the write lock
    other.execute("BEGIN IMMEDIATE")
    try:
        pv = preview_schedule(store, "Kestrel Lane Print Works", src)   # reads only: no wait
        assert pv.counts()["add"] == 40
    finally:
        other.rollback()
        other.close()
    done = apply_schedule(store, "Kestrel Lane Print Works", src, preview=pv)
    assert done.applied and len(store.list_columns(limit=100)) == 40


def test_a_write_between_plan_and_apply_is_seen_and_planned_again(store, tmp_path):
    src = tmp_path / "long.csv"
    src.write_text(_rows(5))
    pv = preview_schedule(store, "Kestrel Lane Print Works", src)
    assert pv.counts()["add"] == 5
    # meanwhile the app (another connection) adds one of the columns, and changes nothing else
    with Store(store.path) as app:
        site = app.find_site("Kestrel Lane Print Works")
        app.add_column(site.id, {"tag": "Z/3", "section": "W12X65"})
    done = apply_schedule(store, "Kestrel Lane Print Works", src, preview=pv)
    assert done.counts() == {"add": 4, "update": 1, "unchanged": 0, "errors": 0}
    tags = sorted(c.tag for c in store.list_columns(limit=100))
    assert tags == ["Z/0", "Z/1", "Z/2", "Z/3", "Z/4"]          # no second Z/3
    site = store.find_site("Kestrel Lane Print Works")
    assert store.find_column(site.id, "Z/3").record["section"] == "W14X90"


def test_a_long_schedule_keeps_every_plan_and_repeated_rows_read_alike(store, tmp_path):
    """2,500 rows of a few sections and loads (as a real schedule repeats them): each row's plan
    comes back in order from the preview's file, a bad entry repeated on many rows is an error
    on each of them, and a tag used twice names the row that used it first."""
    rows = [f"G/{i}-L1,L1,G/{i},{('W14X90', 'W12X65')[i % 2]},{12 + i % 3} ft,A992,"
            f"{100 + i % 5} kip,lrfd" for i in range(2500)]
    rows[700] = "G/700-L1,L1,G/700,W14X90,12 fr,A992,100 kip,lrfd"
    rows[1400] = "G/1400-L1,L1,G/1400,W14X90,12 fr,A992,100 kip,lrfd"
    rows.append("G/3-L1,L1,G/3,W14X90,12 ft,A992,100 kip,lrfd")
    p = tmp_path / "long.csv"
    p.write_text(HEAD + "\n".join(rows) + "\n", encoding="utf-8")
    pv = preview_schedule(store, "Kestrel Lane Print Works", p)
    assert [(e.row, e.field) for e in pv.errors] == [(702, "length"), (1402, "length"),
                                                     (2502, "tag")]
    assert "row 5" in pv.errors[-1].reason  # G/3-L1 first stood on spreadsheet row 5
    assert len(pv.plans) == 2498 == pv.counts()["add"]
    assert [q.row for q in pv.plans][:3] == [2, 3, 4] and pv.plans[-1].tag == "G/2499-L1"
    assert pv.plans[1].record == {"tag": "G/1-L1", "code": "aisc360-22", "section": "W12X65",
                                  "length": "13 ft", "material": "A992",
                                  "demand": {"axial": "101 kip", "basis": "lrfd"}}
    good = tmp_path / "good.csv"
    good.write_text(HEAD + "\n".join(r for i, r in enumerate(rows[:2500])
                                     if i not in (700, 1400)) + "\n", encoding="utf-8")
    done = apply_schedule(store, "Kestrel Lane Print Works", good)
    site = store.site_by_name("Kestrel Lane Print Works")
    assert done.counts()["add"] == 2498
    col = store.find_column(site.id, "G/2499-L1")
    assert col.record["section"] == "W12X65" and col.grid == "G/2499"
    assert apply_schedule(store, "Kestrel Lane Print Works", good).counts()["unchanged"] == 2498
