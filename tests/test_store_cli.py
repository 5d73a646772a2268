"""The store's commands end to end: columns, import-schedule, export-csv, backup, restore."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from fieldcol.cli import CAUTION, main
from fieldcol.store import Store

SCHED = """tag,level,grid,section,length (ft),material,demand (kip),basis
A/1-L1,L1,A/1,W14X90,30,A992,840,lrfd
A/2-L1,L1,A/2,W12X65,30,A992,400,lrfd
"""


@pytest.fixture
def csv_file(tmp_path: Path) -> Path:
    p = tmp_path / "sched.csv"
    p.write_text(SCHED)
    return p


def test_import_preview_apply_list_export(tmp_path: Path, csv_file: Path, capsys):
    db = str(tmp_path / "cli.db")
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(csv_file)]) == 0
    out = capsys.readouterr().out
    assert "add" in out and "nothing written" in out and "(new)" in out
    assert not Path(db).exists()  # a preview creates nothing
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(csv_file),
                 "--apply"]) == 2
    assert "--create-site" in capsys.readouterr().err
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(csv_file),
                 "--apply", "--create-site"]) == 2
    assert "code" in capsys.readouterr().err
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(csv_file),
                 "--apply", "--create-site", "--code", "aisc360-22"]) == 0
    assert "2 added" in capsys.readouterr().out
    with Store(db) as s:
        assert s.find_site("Print Hall").unit_system == "us"
    assert main(["columns", "--db", db, "--json"]) == 0
    cap = capsys.readouterr()
    rows = json.loads(cap.out)
    assert CAUTION in cap.err
    assert [r["tag"] for r in rows] == ["A/1-L1", "A/2-L1"]
    for key in ("tag", "site", "level", "section", "length", "utilization", "governing_mode"):
        assert key in rows[0]
    assert (rows[0]["site"], rows[0]["level"], rows[0]["section"], rows[0]["length"]) == (
        "Print Hall", "L1", "W14X90", "30 ft")
    assert main(["columns", "--db", db, "--site", "Print Hall"]) == 0
    text = capsys.readouterr().out
    assert "A/2-L1" in text and "not checked" in text and CAUTION in text
    assert main(["columns", "--db", db, "--site", "Nowhere"]) == 2
    assert "site" in capsys.readouterr().err
    out_csv = tmp_path / "out.csv"
    assert main(["export-csv", "--db", db, "--site", "Print Hall", str(out_csv)]) == 0
    assert CAUTION in capsys.readouterr().out
    assert "W12X65" in out_csv.read_text()
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(out_csv),
                 "--apply"]) == 0
    assert "0 added, 0 updated, 2 unchanged" in capsys.readouterr().out


def test_import_row_errors_exit_2_and_write_nothing(tmp_path: Path, capsys):
    db = str(tmp_path / "e.db")
    with Store(db) as s:
        s.add_site("Print Hall", code="aisc360-22", unit_system="us")
    bad = tmp_path / "bad.csv"
    bad.write_text("tag,length\nA,30\nB,30 ft\n")
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(bad)]) == 2
    assert "row 2, length" in capsys.readouterr().out
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(bad), "--apply"]) == 2
    assert "row 2.length" in capsys.readouterr().err
    with Store(db) as s:
        assert s.list_columns() == []


def test_backup_restore_commands(tmp_path: Path, csv_file: Path, capsys):
    db = str(tmp_path / "a.db")
    # (an lrfd basis belongs to AISC: under en1993-1-1 the rows would be refused)
    assert main(["import-schedule", "--db", db, "--site", "Print Hall", str(csv_file), "--apply",
                 "--create-site", "--code", "aisc360-22"]) == 0
    zip_path = str(tmp_path / "a.zip")
    assert main(["backup", "--db", db, zip_path]) == 0
    assert "backed up" in capsys.readouterr().out
    assert main(["backup", "--db", db, zip_path]) == 2  # never overwrites
    capsys.readouterr()
    new = str(tmp_path / "b.db")
    assert main(["restore", "--db", new, zip_path]) == 0
    assert main(["restore", "--db", new, zip_path]) == 2
    assert "--force" in capsys.readouterr().err
    assert main(["restore", "--db", new, zip_path, "--force"]) == 0
    assert "previous contents were saved" in capsys.readouterr().out
    assert main(["columns", "--db", new, "--json"]) == 0
    assert len(json.loads(capsys.readouterr().out)) == 2
    assert main(["columns", "--db", str(tmp_path / "missing.db")]) == 2
    assert not (tmp_path / "missing.db").exists()


def test_as_a_real_process_with_env_db(tmp_path: Path, csv_file: Path):
    env = dict(os.environ, FIELDCOL_DB=str(tmp_path / "env.db"))
    run = lambda *a: subprocess.run([sys.executable, "-m", "fieldcol", *a], env=env,
                                    capture_output=True, text=True, timeout=120)
    r = run("import-schedule", "--site", "Print Hall", str(csv_file), "--apply",
            "--create-site", "--code", "aisc360-22")
    assert r.returncode == 0, r.stderr
    r = run("columns", "--json")
    assert r.returncode == 0 and len(json.loads(r.stdout)) == 2
    assert (tmp_path / "env.db").exists()
