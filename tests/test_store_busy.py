"""Several programs on one store, with real processes: a store held by another writer, many
programs creating or upgrading the same new store at once, read-only commands.

SQLite facts relied on (sqlite.org, "Write-Ahead Logging" and "File Locking"): one writer at a
time; in WAL mode readers do not wait for the writer; ``BEGIN IMMEDIATE`` takes the write lock.
"""

from __future__ import annotations

import os
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest

from fieldcol.cli import main
from fieldcol.errors import StoreBusyError
from fieldcol.store import SCHEMA_VERSION, Store
from fieldcol.store._migrations import MIGRATION_NAMES

HOLDER = r"""
import sqlite3, sys, time
c = sqlite3.connect(sys.argv[1], isolation_level=None)
c.execute("BEGIN IMMEDIATE")
c.execute("INSERT INTO meta (key, value) VALUES ('held', 'yes')")
print("locked", flush=True)
time.sleep(float(sys.argv[2]))
c.execute("ROLLBACK")
print("released", flush=True)
"""

OPENER = r"""
import os, sys, time
from fieldcol.store import Store
db, go, me = sys.argv[1], sys.argv[2], sys.argv[3]
while not os.path.exists(go):
    time.sleep(0.002)
with Store(db) as s:
    site = s.add_site(f"Bay {me}", code="aisc360-22", unit_system="us")
    print(s.schema_version, site.id, flush=True)
"""


def _env(**extra: str) -> dict[str, str]:
    return dict(os.environ, PYTHONUNBUFFERED="1", **extra)


def _hold(db: Path, seconds: float) -> subprocess.Popen:
    p = subprocess.Popen([sys.executable, "-c", HOLDER, str(db), str(seconds)],
                         stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=_env())
    assert p.stdout.readline().strip() == "locked", p.stderr.read()
    return p


@pytest.fixture
def db(tmp_path: Path) -> Path:
    path = tmp_path / "site.db"
    with Store(path) as s:
        site = s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        s.add_column(site.id, {"tag": "B/4", "section": "W10X49", "length": "14 ft"})
    return path


def test_a_store_held_too_long_is_reported_busy_and_nothing_is_half_saved(db: Path):
    holder = _hold(db, 30)
    try:
        with Store(db, busy_timeout=0.2) as s:
            assert [x.name for x in s.list_sites()] == ["Kestrel Lane Print Works"]  # reads go on
            with pytest.raises(StoreBusyError) as e:
                s.add_site("Gull Quay Warehouse", code="en1993-1-1", unit_system="si")
            assert e.value.field == "db" and "busy" in str(e.value)
    finally:
        holder.kill()
        holder.wait()
    with Store(db) as s:
        assert [x.name for x in s.list_sites()] == ["Kestrel Lane Print Works"]
        s.add_site("Gull Quay Warehouse", code="en1993-1-1", unit_system="si")  # works again


def test_a_short_hold_is_waited_out_by_retrying(db: Path):
    # each wait (1 s) is shorter than the hold (2 s); the retries together are longer
    holder = _hold(db, 2.0)
    try:
        with Store(db, busy_timeout=1.0) as s:
            s.add_site("Gull Quay Warehouse", code="en1993-1-1", unit_system="si")
    finally:
        out, err = holder.communicate(timeout=30)
    assert "released" in out, err
    with Store(db) as s:
        assert len(s.list_sites()) == 2


def test_the_command_line_says_busy_and_exits_2(db: Path, tmp_path: Path):
    csv = tmp_path / "s.csv"
    csv.write_text("tag,section,length\nC/1,W8X31,12 ft\n", encoding="utf-8")
    holder = _hold(db, 60)
    try:
        env = _env(FIELDCOL_BUSY_TIMEOUT="0.2")
        r = subprocess.run([sys.executable, "-m", "fieldcol", "import-schedule", str(csv),
                            "--db", str(db), "--site", "Kestrel Lane Print Works", "--apply"],
                           capture_output=True, text=True, env=env, timeout=120)
        assert r.returncode == 2, r.stderr
        assert "the store is busy" in r.stderr and "Traceback" not in r.stderr
        # a read-only command is not held up by the writer
        r = subprocess.run([sys.executable, "-m", "fieldcol", "columns", "--db", str(db)],
                           capture_output=True, text=True, env=env, timeout=120)
        assert r.returncode == 0 and "B/4" in r.stdout, r.stderr
    finally:
        holder.kill()
        holder.wait()


def test_a_bad_busy_timeout_setting_is_named(db: Path, monkeypatch, capsys):
    monkeypatch.setenv("FIELDCOL_BUSY_TIMEOUT", "soon")
    assert main(["columns", "--db", str(db)]) == 2
    assert "FIELDCOL_BUSY_TIMEOUT" in capsys.readouterr().err


def _race(tmp_path: Path, db: Path, n: int) -> list[str]:
    go = tmp_path / f"go-{db.stem}"
    procs = [subprocess.Popen([sys.executable, "-c", OPENER, str(db), str(go), str(i)],
                              stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                              env=_env(FIELDCOL_BUSY_TIMEOUT="20"))
             for i in range(n)]
    time.sleep(1.5)  # let every interpreter start and wait at the line
    go.touch()
    outs = []
    for p in procs:
        out, err = p.communicate(timeout=180)
        assert p.returncode == 0, err
        outs.append(out)
    return outs


@pytest.mark.parametrize("round_", range(3))
def test_many_programs_create_the_same_new_store_at_once(tmp_path: Path, round_: int):
    db = tmp_path / f"new-{round_}.db"
    outs = _race(tmp_path, db, 6)
    assert all(o.split()[0] == str(SCHEMA_VERSION) for o in outs)
    with Store(db) as s:
        assert len(s.list_sites()) == 6 and s.integrity_check() == "ok"
        applied = [r["name"] for r in s._rows("SELECT name FROM _sqlite_migrations")]
        assert applied == list(MIGRATION_NAMES)  # each step once


def test_many_programs_upgrade_the_same_old_store_at_once(tmp_path: Path):
    db = tmp_path / "old.db"
    with Store(db, _stop_before=MIGRATION_NAMES[-1]) as s:
        s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        assert s.schema_version == SCHEMA_VERSION - 1
    outs = _race(tmp_path, db, 5)
    assert all(o.split()[0] == str(SCHEMA_VERSION) for o in outs)
    with Store(db) as s:
        assert len(s.list_sites()) == 6
        applied = [r["name"] for r in s._rows("SELECT name FROM _sqlite_migrations")]
        assert applied == list(MIGRATION_NAMES)


def test_read_only_commands_never_create_or_upgrade(tmp_path: Path, capsys):
    missing = tmp_path / "none.db"
    for argv in (["columns"], ["export-csv", str(tmp_path / "o.csv"), "--site", "X"],
                 ["report", str(tmp_path / "o.pdf"), "--site", "X"]):
        assert main([*argv, "--db", str(missing)]) == 2
        assert "no fieldcol store there" in capsys.readouterr().err
        assert not missing.exists() and not (tmp_path / "none-photos").exists()
    old = tmp_path / "old.db"
    with Store(old, _stop_before=MIGRATION_NAMES[-1]) as s:
        s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
    before = old.read_bytes()
    for argv in (["columns"], ["export-csv", str(tmp_path / "o.csv"),
                               "--site", "Kestrel Lane Print Works"],
                 ["report", str(tmp_path / "o.pdf"), "--site", "Kestrel Lane Print Works"]):
        assert main([*argv, "--db", str(old)]) == 2
        err = capsys.readouterr().err
        assert "older fieldcol" in err and "Traceback" not in err
    assert old.read_bytes() == before
    c = sqlite3.connect(old)
    assert len(c.execute("SELECT * FROM _sqlite_migrations").fetchall()) == SCHEMA_VERSION - 1
    c.close()


def test_read_only_open_refuses_writes(db: Path):
    with Store(db, readonly=True) as s:
        assert [x.name for x in s.list_sites()] == ["Kestrel Lane Print Works"]
        with pytest.raises(Exception):
            s.add_site("Gull Quay Warehouse", code="en1993-1-1", unit_system="si")
