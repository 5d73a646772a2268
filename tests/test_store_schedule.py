"""CSV column schedules: preview, row errors, all-or-nothing apply, idempotence, export.

Unit factors: NIST SP 811 (1 ft = 0.3048 m exactly).
"""

from __future__ import annotations

import csv
from pathlib import Path

import pytest

from fieldcol.cli import CAUTION
from fieldcol.errors import InputError
from fieldcol.store import Store, apply_schedule, export_csv, preview_schedule

GOOD = """tag,level,grid,section,length (ft),material,demand (kip)
A/1-L1,L1,A/1,W14X90,30,A992,840
A/2-L1,L1,A/2,W14X90,30 ft,A992,"610 kip"
B/1-L1,L1,B/1,HSS8X8X1/2,28'-6",A500 Gr B,220
"""


@pytest.fixture
def store(tmp_path: Path):
    with Store(tmp_path / "s.db") as s:
        s.add_site("Wool Exchange", code="aisc360-22", unit_system="us")
        yield s


def _write(tmp_path: Path, text: str, name: str = "sched.csv") -> Path:
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def test_preview_writes_nothing_then_apply_then_idempotent(store: Store, tmp_path: Path):
    src = _write(tmp_path, GOOD)
    before = store.db.conn.execute("SELECT count(*) FROM columns").fetchone()[0]
    pv = preview_schedule(store, "Wool Exchange", src)
    assert pv.ok and pv.counts() == {"add": 3, "update": 0, "unchanged": 0, "errors": 0}
    assert [p.row for p in pv.plans] == [2, 3, 4]
    assert store.db.conn.execute("SELECT count(*) FROM columns").fetchone()[0] == before == 0
    done = apply_schedule(store, "Wool Exchange", src)
    assert done.applied
    site = store.find_site("Wool Exchange")
    a1 = store.find_column(site.id, "A/1-L1")
    assert a1.record == {"tag": "A/1-L1", "code": "aisc360-22", "section": "W14X90",
                         "length": "30 ft", "material": "A992",
                         "demand": {"axial": "840 kip"}}
    assert store.find_column(site.id, "A/2-L1").record["demand"] == {"axial": "610 kip"}
    assert store.find_column(site.id, "B/1-L1").record["length"] == "28'-6\""
    stamp = a1.updated_at
    again = apply_schedule(store, "Wool Exchange", src)
    assert again.counts() == {"add": 0, "update": 0, "unchanged": 3, "errors": 0}
    assert store.find_column(site.id, "A/1-L1").updated_at == stamp
    assert len(store.list_columns(site.id)) == 3


def test_changed_rows_update_and_keep_other_fields(store: Store, tmp_path: Path):
    apply_schedule(store, "Wool Exchange", _write(tmp_path, GOOD))
    site = store.find_site("Wool Exchange")
    col = store.find_column(site.id, "A/1-L1")
    rec = dict(col.record, restraints={"weak": {"bottom": "pinned", "top": "pinned"}})
    store.update_column(col.id, record=rec)
    changed = GOOD.replace("A/1-L1,L1,A/1,W14X90,30,A992,840", "A/1-L1,L1,A/1,W14X109,30,,900")
    pv = apply_schedule(store, "Wool Exchange", _write(tmp_path, changed, "v2.csv"))
    assert pv.counts()["update"] == 1 and pv.plans[0].changes == ["section", "demand"]
    got = store.find_column(site.id, "A/1-L1").record
    assert got["section"] == "W14X109" and got["demand"]["axial"] == "900 kip"
    assert got["material"] == "A992"  # a blank cell leaves the field as it was
    assert got["restraints"] == {"weak": {"bottom": "pinned", "top": "pinned"}}


def test_row_errors_name_row_and_field_and_refuse_everything(store: Store, tmp_path: Path):
    bad = '''tag,section,length,demand (kip)
C/1,W12X65,12 ft,300
C/2,W12X65,12 fr,300
,W12X65,12 ft,300
C/1,W12X65,12 ft,300
C/5,W12X65,12,300
C/6,W12X65,12 ft,3 ft
C/7,"{""shape"": ""i"", ""d"": ""12 in""",12 ft,10
'''
    pv = preview_schedule(store, "Wool Exchange", _write(tmp_path, bad))
    got = [(e.row, e.field) for e in pv.errors]
    assert got == [(3, "length"), (4, "tag"), (5, "tag"), (6, "length"), (7, "demand"),
                   (8, "section")]
    assert "12 fr" in str(pv.errors[0]) and "row 3" in str(pv.errors[0])
    with pytest.raises(InputError) as e:
        apply_schedule(store, "Wool Exchange", _write(tmp_path, bad))
    assert e.value.field == "row 3.length"
    assert store.list_columns() == []  # C/1 was fine but nothing was written


def test_header_and_site_problems(store: Store, tmp_path: Path):
    for text, field in [("section,length\nW8X31,10 ft\n", "header"),
                        ("tag,colour\nA,red\n", "header"),
                        ("tag,section (ft)\nA,W8X31\n", "header"),
                        ("tag,tag\nA,B\n", "header"),
                        ("", "file")]:
        with pytest.raises(InputError) as e:
            preview_schedule(store, "Wool Exchange", _write(tmp_path, text))
        assert e.value.field == field, text
    (tmp_path / "latin.csv").write_bytes("tag\nS\xe4ule\n".encode("latin-1"))
    with pytest.raises(InputError) as e:
        preview_schedule(store, "Wool Exchange", tmp_path / "latin.csv")
    assert e.value.field == "file"
    src = _write(tmp_path, GOOD)
    pv = preview_schedule(store, "New Place", src)
    assert not pv.site_exists and pv.counts()["add"] == 3
    with pytest.raises(InputError) as e:
        apply_schedule(store, "New Place", src)
    assert e.value.field == "site" and store.find_site("New Place") is None
    with pytest.raises(InputError) as e:
        apply_schedule(store, "New Place", src, create_site={"code": "bs449"})
    assert e.value.field == "code" and store.find_site("New Place") is None  # rolled back
    apply_schedule(store, "New Place", src, create_site={"code": "en1993-1-1",
                                                         "unit_system": "si"})
    site = store.find_site("New Place")
    assert site.code == "en1993-1-1"
    assert store.find_column(site.id, "A/1-L1").record["code"] == "en1993-1-1"


def test_export_then_reimport_changes_nothing(store: Store, tmp_path: Path):
    apply_schedule(store, "Wool Exchange", _write(tmp_path, GOOD))
    site = store.find_site("Wool Exchange")
    col = store.find_column(site.id, "B/1-L1")
    store.save_check(col.id, {"governing_mode": "flexural buckling",
                              "utilization": {"value": 0.9125, "unit": ""}})
    m = store.add_measurement(col.id, "length", "28 ft 4 in")
    out = tmp_path / "out.csv"
    assert export_csv(store, "Wool Exchange", out) == 3
    rows = list(csv.reader(out.open(encoding="utf-8")))
    assert rows[0][0].startswith("#") and CAUTION in rows[0][0]
    table = [dict(zip(rows[1], r)) for r in rows[2:]]
    b1 = next(r for r in table if r["tag"] == "B/1-L1")
    assert (b1["utilization"], b1["governing_mode"], b1["length"]) == (
        "0.9125", "flexural buckling", "28 ft 4 in")
    assert b1["section"] == "HSS8X8X1/2" and b1["code"] == "aisc360-22"
    pv = preview_schedule(store, "Wool Exchange", out)
    # the export shows the measured length; importing it back is no change, and the reading
    # stays a reading (the record keeps its own length)
    assert pv.ok and pv.counts() == {"add": 0, "update": 0, "unchanged": 3, "errors": 0}
    apply_schedule(store, "Wool Exchange", out)
    assert store.get_column(col.id).record["length"] == "28'-6\""
    assert m.text == "28 ft 4 in"
    with pytest.raises(InputError) as e:
        export_csv(store, "Nowhere", out)
    assert e.value.field == "site"


def test_imported_columns_travel_and_later_edits_are_still_logged(store: Store, tmp_path: Path):
    # a schedule's new columns are logged in bulk (one operation a column, its insert
    # trigger set aside meanwhile): another store merging the log shows the same columns,
    # and edits after the import are logged as ever
    other = store.add_site("Annex", code="aisc360-22", unit_system="us")
    store.add_column(other.id, {"tag": "A/1-L1"})  # the same tag on another site is no clash
    apply_schedule(store, "Wool Exchange", _write(tmp_path, GOOD))
    site = store.find_site("Wool Exchange")
    ids = {c.id for c in store.list_columns(site.id)}
    mine = [o for o in store.ops_after(0, 1000) if o.tbl == "columns" and o.row_id in ids]
    assert len(mine) == 3 and {o.field for o in mine} == {"*"}
    assert store.conflicts() == []
    n = store.count_ops()
    store.update_column(store.find_column(site.id, "A/1-L1").id, grid="C/9")
    store.add_column(site.id, {"tag": "C/9-L1"})
    assert store.count_ops() == n + 2
    with Store(tmp_path / "replica.db") as replica:
        replica.apply_ops(store.ops_after(0, 1000), source="bundle")
        got = {(c.tag, c.grid) for c in replica.list_columns(replica.find_site("Wool Exchange").id)}
    assert got == {("A/1-L1", "C/9"), ("A/2-L1", "A/2"), ("B/1-L1", "B/1"), ("C/9-L1", None)}


def _index_sql(store: Store) -> dict[str, str]:
    return dict(store.db.conn.execute(
        "SELECT name, sql FROM sqlite_master WHERE type = 'index' AND tbl_name = 'columns' "
        "AND sql IS NOT NULL").fetchall())


def test_many_new_columns_make_the_tag_indexes_again_and_still_refuse_a_taken_tag(
        store: Store, tmp_path: Path):
    # a large batch into a small table drops the site-and-tag index and makes it again at the
    # end (expected: the size the caller announces); the rows, their log and the unique tag
    # must come out as one by one (a taken tag refused, never settled as a sync's duplicate)
    site = store.find_site("Wool Exchange")
    before = _index_sql(store)
    assert {"columns_live_tag", "columns_site_tag"} <= set(before)
    items = [({"tag": f"Z/{i}-L1", "section": "W14X90"}, "L1", f"Z/{i}", None)
             for i in range(5)]
    assert store._add_columns(site.id, items, expected=10_000) == 5
    assert _index_sql(store) == before
    plan = store.db.conn.execute("EXPLAIN QUERY PLAN SELECT id FROM columns WHERE site_id = ? "
                                 "AND tag = ? AND deleted_at IS NULL",
                                 [site.id, "Z/3-L1"]).fetchall()
    assert "columns_live_tag" in str(plan) or "columns_site_tag" in str(plan)
    plan = store.db.conn.execute("EXPLAIN QUERY PLAN SELECT id FROM columns WHERE site_id = ? "
                                 "AND tag = ?", [site.id, "Z/3-L1"]).fetchall()
    assert "columns_site_tag" in str(plan)
    with Store(tmp_path / "replica.db") as replica:
        replica.apply_ops(store.ops_after(0, 1000), source="bundle")
        got = {c.tag for c in replica.list_columns(replica.find_site("Wool Exchange").id)}
    assert got == {f"Z/{i}-L1" for i in range(5)}
    # a tag already on the site: refused, nothing kept, the index as it was
    n_ops = store.count_ops()
    with pytest.raises(InputError) as e:
        store._add_columns(site.id, [({"tag": "Z/9-L1"}, None, None, None),
                                     ({"tag": "Z/2-L1"}, None, None, None)], expected=10_000)
    assert e.value.field == "tag"
    assert _index_sql(store) == before
    assert store.find_column(site.id, "Z/9-L1") is None
    assert store.count_ops() == n_ops
    assert len(store.list_columns(site.id)) == 5


def test_many_new_columns_into_a_larger_table_keep_the_indexes(store: Store):
    # more rows held than announced, or no writing transaction: nothing dropped
    site = store.find_site("Wool Exchange")
    store._add_columns(site.id, [({"tag": f"Y/{i}"}, None, None, None) for i in range(3)])
    before = _index_sql(store)
    assert store._tag_indexes_later(10_000) == []  # (outside a transaction)
    with pytest.raises(RuntimeError):
        with store._tx():
            store.db.conn.execute("UPDATE columns SET rowid = 20000 WHERE rowid = "
                                  "(SELECT max(rowid) FROM columns)")
            assert store._tag_indexes_later(10_000) == []
            assert store._tag_indexes_later(9_999) == []  # (a small batch)
            raise RuntimeError("roll back")
    assert _index_sql(store) == before


def test_rows_alike_but_for_their_tags_keep_each_tag_in_their_record(store: Store,
                                                                      tmp_path: Path):
    # a row like one read before but for its tag reuses that row's record text: each stored
    # record must still be exactly its own, written as the store writes any record
    # (json.dumps with ensure_ascii=False: the standard library as the reference)
    import json
    import sqlite3

    tags = ['Q/1 "north"', "Q/2 \\ back", "Qé/3", "Q/4 €", "'=Q/5"]
    lines = ["tag,section,length (ft),material,demand (kip)"]
    for i, t in enumerate(tags * 2):
        quoted = '"' + (t + f"-{i}").replace('"', '""') + '"'
        lines.append(f"{quoted},W14X90,{12 + i % 2},A992,{300 + i % 2}")
    apply_schedule(store, "Wool Exchange", _write(tmp_path, "\n".join(lines) + "\n"))
    site = store.find_site("Wool Exchange")
    conn = sqlite3.connect(store.path)
    texts = dict(conn.execute("SELECT tag, record FROM columns WHERE site_id = ?", [site.id]))
    conn.close()
    assert len(texts) == 10
    for i, t in enumerate(tags * 2):
        tag = (t + f"-{i}").removeprefix("'")  # the leading apostrophe guards a cell only
        want = {"tag": tag, "code": "aisc360-22", "section": "W14X90",
                "length": f"{12 + i % 2} ft", "material": "A992",
                "demand": {"axial": f"{300 + i % 2} kip"}}
        assert texts[tag] == json.dumps(want, ensure_ascii=False)
        assert store.find_column(site.id, tag).record == want
