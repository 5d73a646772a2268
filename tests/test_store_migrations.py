"""Schema migrations through sqlite-utils' migration sets, from every earlier version, with data."""

from __future__ import annotations

import io
from pathlib import Path

import pytest
from PIL import Image

from fieldcol.errors import InputError
from fieldcol.store import SCHEMA_VERSION, Store
from fieldcol.store._migrations import MIGRATION_NAMES


def _fill(s: Store) -> dict:
    """A little of everything, written through the API at the older schema version."""
    site = s.add_site("Signal Works", code="aisc360-22", unit_system="us")
    visit = s.add_visit(site.id, "2025-11-20", who="J. Park")
    col = s.add_column(site.id, {"tag": "K/3", "section": "W10X49", "length": "14 ft"},
                       level="Ground")
    m = s.add_measurement(col.id, "length", "13 ft 11 in", visit_id=visit.id)
    s.correct_measurement(m.id, "13 ft 10 in")
    rc = s.add_restraint_change(col.id, "2024-02-02", "brace_added", "knee brace", axis="weak")
    f = s.add_finding(site.id, "Rust staining at splice", category="corrosion",
                      severity="low", column_id=col.id)
    buf = io.BytesIO()
    Image.new("RGB", (20, 20), (10, 200, 10)).save(buf, "JPEG")
    s.add_photo(buf.getvalue(), finding_id=f.id)
    s.save_check(col.id, {"governing_mode": "yielding", "utilization": {"value": 0.5, "unit": ""}})
    s.add_retrofit(col.id, "plate the flanges", {"tag": "K/3", "section": "W10X60"})
    s.delete("restraint_changes", rc.id)
    counts = {t: s.db.conn.execute(f"SELECT count(*) FROM {t}").fetchone()[0]
              for t in ("sites", "visits", "levels", "columns", "measurements",
                        "restraint_changes", "findings", "photos", "photo_links", "checks",
                        "retrofits")}
    return {"site": site.id, "col": col.id, "counts": counts}


@pytest.mark.parametrize("start", range(1, SCHEMA_VERSION))
def test_migrate_from_each_earlier_version_with_data(tmp_path: Path, start: int):
    db = tmp_path / "old.db"
    with Store(db, _stop_before=MIGRATION_NAMES[start]) as old:
        assert old.schema_version == start
        before = _fill(old)
        device = old.device_id
    with Store(db) as s:
        assert s.schema_version == SCHEMA_VERSION
        assert s.integrity_check() == "ok"
        assert s.device_id == device
        counts = {t: s.db.conn.execute(f"SELECT count(*) FROM {t}").fetchone()[0]
                  for t in before["counts"]}
        assert counts == before["counts"]
        assert s.current_record(before["col"])["length"] == "13 ft 10 in"
        assert [f.text for f in s.search_findings("splice")] == ["Rust staining at splice"]
        row = s.list_columns(before["site"])[0]
        assert (row.level, row.utilization, row.governing_mode) == ("Ground", 0.5, "yielding")
        assert s.restraint_changes(before["col"]) == []
        indexes = {r[0] for r in s.db.conn.execute(
            "SELECT name FROM sqlite_master WHERE type = 'index'")}
        assert {"columns_site_tag", "measurements_column", "checks_column",
                "findings_visit", "photo_links_visit"} <= indexes


def test_version_two_adds_the_indexes(tmp_path: Path):
    with Store(tmp_path / "v1.db", _stop_before="m002_indexes") as s:
        names = {r[0] for r in s.db.conn.execute("SELECT name FROM sqlite_master")}
        assert "measurements_column" not in names and "findings_fts" in names
    with Store(tmp_path / "v1.db") as s:
        plan = " ".join(str(r) for r in s.db.conn.execute(
            "EXPLAIN QUERY PLAN SELECT * FROM measurements WHERE column_id = ? AND quantity = ?",
            ["x", "length"]))
        assert "measurements_column" in plan  # SQLite's planner uses the new index


def test_reopening_applies_nothing_twice(tmp_path: Path):
    with Store(tmp_path / "a.db") as s:
        applied = s.db.conn.execute("SELECT name FROM _sqlite_migrations").fetchall()
    with Store(tmp_path / "a.db") as s:
        assert s.db.conn.execute("SELECT name FROM _sqlite_migrations").fetchall() == applied
    assert [a[0] for a in applied] == list(MIGRATION_NAMES)


def test_a_newer_store_is_refused_untouched(tmp_path: Path):
    with Store(tmp_path / "new.db") as s:
        s.add_site("Future", code="aisc360-22", unit_system="us")
        s.db.execute("INSERT INTO _sqlite_migrations (migration_set, name, applied_at) "
                     "VALUES ('fieldcol', 'm999_from_the_future', 'now')")
    with pytest.raises(InputError, match="newer fieldcol") as e:
        Store(tmp_path / "new.db")
    assert e.value.field == "db"
