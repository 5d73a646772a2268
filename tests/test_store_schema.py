"""The store's tables: round trips, tombstones, validation and the connection's settings.

Invented data throughout (a made-up site); checks are against SQLite's own answers.
"""

from __future__ import annotations

import sqlite3
import threading
from pathlib import Path

import pytest

from fieldcol.errors import InputError
from fieldcol.store import SCHEMA_VERSION, Store, data_dir, open_store, resolve_db_path


@pytest.fixture
def store(tmp_path: Path):
    with Store(tmp_path / "site.db") as s:
        yield s


@pytest.fixture
def site(store: Store):
    return store.add_site("Harbour Mill", code="aisc360-22", unit_system="us",
                          address="1 Quay Lane", owner_ref="HM-7", notes="access via gate B")


REC = {"tag": "B/4-L1", "section": "W14X90", "material": "A992", "length": "30 ft",
       "restraints": {"strong": {"bottom": "pinned", "top": "pinned"},
                      "weak": {"bottom": "pinned", "top": "pinned", "braces": [{"at": "15 ft"}]},
                      "twist": {"braces": [{"at": "15 ft"}]}},
       "k_basis": "theoretical", "code": "aisc360-22",
       "demand": {"axial": "840 kip", "basis": "lrfd"}}


def test_connection_settings(store: Store):
    # SQLite's own PRAGMA answers: WAL, synchronous FULL (2), foreign keys on, busy timeout
    c = store.db.conn
    assert c.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
    assert c.execute("PRAGMA synchronous").fetchone()[0] == 2
    assert c.execute("PRAGMA foreign_keys").fetchone()[0] == 1
    assert c.execute("PRAGMA busy_timeout").fetchone()[0] >= 1000
    assert store.schema_version == SCHEMA_VERSION
    assert store.integrity_check() == "ok"


def test_device_id_made_once_and_kept(tmp_path: Path):
    with Store(tmp_path / "a.db") as s:
        first = s.device_id
        site = s.add_site("Depot", code="en1993-1-1", unit_system="si")
    with Store(tmp_path / "a.db") as s:
        assert s.device_id == first
        assert s.get_site(site.id).device_id == first
    with Store(tmp_path / "b.db") as other:
        assert other.device_id != first


def test_paths(tmp_path: Path, monkeypatch):
    env = {"HOME": "/home/eng"}
    assert data_dir(env) == Path("/home/eng/.local/share/fieldcol")
    assert data_dir({**env, "XDG_DATA_HOME": "/x"}) == Path("/x/fieldcol")
    assert data_dir({**env, "FLET_APP_STORAGE_DATA": "/app/data"}) == Path("/app/data")
    assert resolve_db_path(None, {**env, "FIELDCOL_DB": "/tmp/f.db"}) == Path("/tmp/f.db")
    assert resolve_db_path("rel.db", env) == Path("rel.db").absolute()
    with pytest.raises(InputError) as e:
        resolve_db_path("  ", env)
    assert e.value.field == "db"
    monkeypatch.setenv("FIELDCOL_DB", str(tmp_path / "env.db"))
    with open_store() as s:
        assert s.path == tmp_path / "env.db"


def test_open_refuses_missing_foreign_and_folder(tmp_path: Path):
    with pytest.raises(InputError) as e:
        open_store(tmp_path / "none.db", create=False)
    assert e.value.field == "db" and not (tmp_path / "none.db").exists()
    other = tmp_path / "other.db"
    c = sqlite3.connect(other)
    c.execute("CREATE TABLE stuff (x)")
    c.execute("INSERT INTO stuff VALUES (1)")
    c.commit()
    c.close()
    with pytest.raises(InputError, match="not a fieldcol store"):
        Store(other)
    # another program's sqlite-utils migrations are not ours either
    theirs = tmp_path / "theirs.db"
    from sqlite_utils import Database
    from sqlite_utils.migrations import Migrations
    m = Migrations("someone-else")

    @m()
    def m001(db):
        db["notes"].insert({"x": 1})

    with Database(theirs) as tdb:
        m.apply(tdb)
    with pytest.raises(InputError, match="not a fieldcol store"):
        Store(theirs)
    junk = tmp_path / "junk.db"
    junk.write_bytes(b"this is not sqlite at all" * 100)
    with pytest.raises(InputError) as e:
        Store(junk)
    assert e.value.field == "db"
    with pytest.raises(InputError):
        Store(tmp_path)


def test_site_round_trip_and_rules(store: Store, site):
    got = store.get_site(site.id)
    assert (got.name, got.address, got.owner_ref, got.code, got.unit_system, got.notes) == (
        "Harbour Mill", "1 Quay Lane", "HM-7", "aisc360-22", "us", "access via gate B")
    assert got.created_at.endswith("Z") and got.created_at == got.updated_at
    assert len(got.id) == 36 and got.deleted_at is None
    for kw, fld in [(dict(code="aisc"), "code"), (dict(unit_system="metric"), "unit_system"),
                    (dict(name=" "), "name")]:
        args = dict(name="Other", code="aisc360-22", unit_system="us") | kw
        with pytest.raises(InputError) as e:
            store.add_site(args.pop("name"), **args)
        assert e.value.field == fld
    with pytest.raises(InputError) as e:
        store.add_site("Harbour Mill", code="aisc360-22", unit_system="us")
    assert e.value.field == "name"
    upd = store.update_site(site.id, notes="gate code 1234")
    assert upd.notes == "gate code 1234" and upd.updated_at >= upd.created_at
    with pytest.raises(InputError) as e:
        store.update_site(site.id, colour="red")
    assert e.value.field == "colour"
    assert store.get_site(site.id).notes == "gate code 1234"  # the bad update lost nothing


def test_column_round_trip_levels_and_listing(store: Store, site):
    col = store.add_column(site.id, REC, level="L1", grid="B/4", location="north bay")
    assert store.get_column(col.id).record == REC
    assert [lv.name for lv in store.list_levels(site.id)] == ["L1"]
    store.add_column(site.id, {"tag": "A/1-L1", "section": "HP12X53", "length": "28 ft"},
                     level="L1")
    rows = store.list_columns(site.id)
    assert [r.tag for r in rows] == ["A/1-L1", "B/4-L1"]
    r = rows[1]
    assert (r.site, r.level, r.section, r.length, r.grid, r.utilization) == (
        "Harbour Mill", "L1", "W14X90", "30 ft", "B/4", None)
    assert len(store.list_levels(site.id)) == 1  # the level was found, not duplicated
    with pytest.raises(InputError) as e:
        store.add_column(site.id, dict(REC))
    assert e.value.field == "tag"
    with pytest.raises(InputError) as e:
        store.add_column(site.id, {"section": "W14X90"})
    assert e.value.field == "record.tag"
    with pytest.raises(InputError) as e:
        store.add_column(site.id, {"tag": "X", "length": float("nan")})
    assert e.value.field == "length"  # the entry JSON cannot hold (RFC 8259: no NaN)
    moved = store.update_column(col.id, grid="C/5", level="L2")
    assert moved.grid == "C/5" and store.list_columns(site.id)[1].level == "L2"
    assert [r.tag for r in store.list_columns(site.id, limit=1, offset=1)] == ["B/4-L1"]
    with pytest.raises(InputError) as e:
        store.list_columns(site.id, limit=0)
    assert e.value.field == "limit"


def test_soft_delete_hides_but_keeps(store: Store, site):
    col = store.add_column(site.id, {"tag": "C/1"})
    store.delete("columns", col.id)
    assert store.list_columns(site.id) == []
    assert store.find_column(site.id, "C/1") is None
    kept = store.get_column(col.id)
    assert kept.deleted_at is not None and kept.updated_at == kept.deleted_at
    assert store.db.conn.execute("SELECT count(*) FROM columns").fetchone()[0] == 1
    again = store.add_column(site.id, {"tag": "C/1"})  # the tag is free again
    assert again.id != col.id
    with pytest.raises(InputError):
        store.delete("columns", col.id)  # already a tombstone
    with pytest.raises(InputError) as e:
        store.delete("sqlite_master", col.id)
    assert e.value.field == "table"
    store.delete("sites", site.id)
    assert store.list_sites() == [] and store.list_columns() == []


def test_visits_restraints_retrofits_checks(store: Store, site):
    visit = store.add_visit(site.id, "2026-03-04", who="R. Osei", notes="light rain, roof leaks")
    assert store.list_visits(site.id)[0].notes == "light rain, roof leaks"
    with pytest.raises(InputError) as e:
        store.add_visit(site.id, "04/03/2026")
    assert e.value.field == "date"
    col = store.add_column(site.id, REC)
    rc = store.add_restraint_change(col.id, "2019-06-01", "brace_added", "L3x3 angle to wall",
                                    axis="weak", seen_by="R. Osei", detail={"at": "15 ft"})
    assert store.restraint_changes(col.id)[0].detail == {"at": "15 ft"}
    for kw, fld in [(dict(kind="nailed"), "kind"), (dict(axis="x"), "axis"),
                    (dict(date="yesterday"), "date")]:
        args = dict(date="2019-06-01", kind="brace_added", description="d") | kw
        with pytest.raises(InputError) as e:
            store.add_restraint_change(col.id, args.pop("date"), args.pop("kind"),
                                       args.pop("description"), **args)
        assert e.value.field == fld
    assert rc.kind == "brace_added" and visit.date == "2026-03-04"
    rec2 = dict(REC, section="W14X109")
    opt = store.add_retrofit(col.id, "replace with heavier section", rec2)
    assert store.set_retrofit_status(opt.id, "chosen").status == "chosen"
    assert store.retrofits(col.id)[0].record["section"] == "W14X109"
    with pytest.raises(InputError) as e:
        store.set_retrofit_status(opt.id, "maybe")
    assert e.value.field == "status"
    result = {"governing_mode": "flexural buckling (weak)", "utilization": {"value": 0.83, "unit": ""},
              "steps": [{"symbol": "Pn", "value": 1.0}], "warnings": []}
    chk = store.save_check(col.id, result, edition="2022")
    assert (chk.utilization, chk.governing_mode, chk.code, chk.edition) == (
        0.83, "flexural buckling (weak)", "aisc360-22", "2022")
    assert chk.record == REC and chk.result == result
    from fieldcol import __version__
    assert chk.app_version == __version__
    later = store.save_check(col.id, dict(result, utilization=None, governing_mode="yielding"))
    assert store.latest_check(col.id).id == later.id
    row = store.list_columns(site.id)[0]
    assert row.utilization is None and row.governing_mode == "yielding"
    with pytest.raises(InputError) as e:
        store.save_check(col.id, dict(result, utilization={"value": float("inf")}))
    assert e.value.field == "result.utilization"
    assert len(store.checks(col.id)) == 2


def test_schema_refuses_what_the_api_would(store: Store, site):
    # the CHECK constraints hold even against a write that skips the API
    with pytest.raises(sqlite3.IntegrityError):
        store.db.execute("UPDATE sites SET code = 'bs5950' WHERE id = ?", [site.id])
    with pytest.raises(sqlite3.IntegrityError):
        store.db.execute("INSERT INTO columns (id, created_at, updated_at, device_id, site_id, "
                         "tag, record) VALUES ('x', 't', 't', 'd', 'no-such-site', 'T', '{}')")


def test_usable_from_a_worker_thread(store: Store, site):
    out = []
    t = threading.Thread(target=lambda: out.append(store.add_column(site.id, {"tag": "W/1"})))
    t.start()
    t.join()
    assert out and store.find_column(site.id, "W/1") is not None


def test_two_connections_writing_at_once(tmp_path: Path):
    # SQLite serialises writers; the busy timeout and BEGIN IMMEDIATE make both succeed
    db = tmp_path / "two.db"
    with Store(db) as a, Store(db) as b:
        site = a.add_site("Twin Sheds", code="aisc360-22", unit_system="us")
        errors = []

        def work(s: Store, prefix: str) -> None:
            try:
                for i in range(40):
                    s.add_column(site.id, {"tag": f"{prefix}{i}"}, level=f"L{i % 3}")
            except Exception as e:  # pragma: no cover - reported below
                errors.append(e)

        threads = [threading.Thread(target=work, args=(s, p)) for s, p in ((a, "A"), (b, "B"))]
        for t in threads:
            t.start()
        for t in threads:
            t.join()
        assert errors == []
        assert len(a.list_columns(site.id, limit=1000)) == 80
        assert len(b.list_levels(site.id)) == 3
