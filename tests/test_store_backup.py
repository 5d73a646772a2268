"""Backup and restore: SQLite's online backup API plus photos, every file checked by SHA-256."""

from __future__ import annotations

import io
import json
import zipfile
from pathlib import Path

import pytest
from PIL import Image

from fieldcol.errors import InputError
from fieldcol.store import Store, backup, restore


def _jpeg(colour) -> bytes:
    buf = io.BytesIO()
    Image.new("RGB", (40, 30), colour).save(buf, "JPEG")
    return buf.getvalue()


@pytest.fixture
def filled(tmp_path: Path):
    db = tmp_path / "src" / "site.db"
    with Store(db) as s:
        site = s.add_site("Lamp Factory", code="en1993-1-1", unit_system="si")
        col = s.add_column(site.id, {"tag": "3/C", "section": "HEB200", "length": "4.2 m"})
        f = s.add_finding(site.id, "Flange dented by forklift", category="damage",
                          severity="medium", column_id=col.id)
        s.add_photo(_jpeg((255, 0, 0)), finding_id=f.id)
        s.add_photo(_jpeg((0, 0, 255)), column_id=col.id)
        s.add_measurement(col.id, "length", "4150 mm")
        gone = s.add_finding(site.id, "duplicate note", category="misc", severity="info")
        s.delete("findings", gone.id)
        yield s, site, col


def test_round_trip_keeps_everything(filled, tmp_path: Path):
    s, site, col = filled
    info = backup(s, tmp_path / "b.zip")
    assert info.photo_files == 4 and info.missing_photos == []  # two photos, two thumbnails
    assert info.counts["findings"] == 2  # tombstones are history: they travel too
    with zipfile.ZipFile(tmp_path / "b.zip") as z:
        manifest = json.loads(z.read("manifest.json"))
        assert set(manifest["files"]) == set(z.namelist()) - {"manifest.json"}
    with pytest.raises(InputError) as e:
        backup(s, tmp_path / "b.zip")  # never overwrites
    assert e.value.field == "out"
    new_db = tmp_path / "dst" / "restored.db"
    with Store(new_db) as fresh:
        own_device = fresh.device_id
    got = restore(tmp_path / "b.zip", new_db)
    assert got.counts == info.counts
    with Store(new_db) as r:
        assert r.integrity_check() == "ok"
        assert r.device_id == own_device and r.device_id != s.device_id
        assert r.current_record(col.id)["length"] == "4150 mm"
        assert [f.text for f in r.search_findings("forklift")] == ["Flange dented by forklift"]
        assert r.search_findings("duplicate") == []
        for p in r._rows("SELECT * FROM photos"):
            assert (r.photos_dir / p["path"]).read_bytes() == (s.photos_dir / p["path"]).read_bytes()
        assert r.db.conn.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
        # the restored store keeps working
        r.add_finding(site.id, "checked after restore", category="misc", severity="info")


def test_restore_refuses_non_empty_unless_forced(filled, tmp_path: Path):
    s, site, _ = filled
    backup(s, tmp_path / "b.zip")
    other = tmp_path / "other.db"
    with Store(other) as o:
        o.add_site("Someone Else's Site", code="aisc360-22", unit_system="us")
    with pytest.raises(InputError) as e:
        restore(tmp_path / "b.zip", other)
    assert e.value.field == "db"
    with Store(other) as o:
        assert [x.name for x in o.list_sites()] == ["Someone Else's Site"]
    info = restore(tmp_path / "b.zip", other, force=True)
    assert info.safety_backup is not None and info.safety_backup.exists()
    with Store(other) as o:
        assert [x.name for x in o.list_sites()] == ["Lamp Factory"]
    # the safety backup holds what was replaced
    back = tmp_path / "back.db"
    restore(info.safety_backup, back)
    with Store(back) as b:
        assert [x.name for x in b.list_sites()] == ["Someone Else's Site"]


def test_damaged_or_foreign_backups_are_refused(filled, tmp_path: Path):
    s, _, _ = filled
    backup(s, tmp_path / "b.zip")
    target = tmp_path / "t.db"
    # flip one byte of one photo inside the zip
    with zipfile.ZipFile(tmp_path / "b.zip") as z:
        entries = {n: z.read(n) for n in z.namelist()}
    name = next(n for n in entries if n.startswith("photos/") and "thumbs" not in n)
    bad = bytearray(entries[name])
    bad[len(bad) // 2] ^= 0xFF
    with zipfile.ZipFile(tmp_path / "bad.zip", "w") as z:
        for n, data in entries.items():
            z.writestr(n, bytes(bad) if n == name else data)
    with pytest.raises(InputError, match="damaged") as e:
        restore(tmp_path / "bad.zip", target)
    assert e.value.field == "backup"
    assert not target.exists()  # nothing was touched
    with zipfile.ZipFile(tmp_path / "plain.zip", "w") as z:
        z.writestr("hello.txt", "hi")
    with pytest.raises(InputError, match="not a fieldcol backup"):
        restore(tmp_path / "plain.zip", target)
    (tmp_path / "not.zip").write_text("nope")
    with pytest.raises(InputError) as e:
        restore(tmp_path / "not.zip", target)
    assert e.value.field == "backup"
    with zipfile.ZipFile(tmp_path / "extra.zip", "w") as z:
        for n, data in entries.items():
            z.writestr(n, data)
        z.writestr("photos/zz/sneaky.jpg", b"x")
    with pytest.raises(InputError, match="do not match"):
        restore(tmp_path / "extra.zip", target)


def test_backup_while_another_connection_writes(filled, tmp_path: Path):
    s, site, _ = filled
    with Store(s.path) as writer:  # a second connection, as the UI thread pool might hold
        writer.add_column(site.id, {"tag": "late"})
        info = backup(s, tmp_path / "live.zip")
    assert info.counts["columns"] == 2


def test_restore_keeps_only_photo_rows_whose_files_it_wrote(filled, tmp_path: Path, capsys):
    """A photo whose file was gone at backup time is listed missing; restore leaves its row and
    links out (a row naming no file would show a broken photo and travel into every later
    backup) and says which."""
    from fieldcol.cli import main

    s, site, col = filled
    lost = s._rows("SELECT id, path, thumb_path FROM photos ORDER BY path")[0]
    (s.photos_dir / lost["path"]).unlink()
    info = backup(s, tmp_path / "b.zip")
    assert info.missing_photos == [lost["path"]]
    got = restore(tmp_path / "b.zip", tmp_path / "dst" / "r.db")
    assert got.dropped_photos == [lost["path"]]
    with Store(tmp_path / "dst" / "r.db") as r:
        rows = r._rows("SELECT id, path, thumb_path FROM photos")
        assert lost["id"] not in {p["id"] for p in rows} and len(rows) == 1
        assert r._rows("SELECT count(*) AS n FROM photo_links WHERE photo_id = ?",
                       [lost["id"]])[0]["n"] == 0
        for p in rows:
            assert (r.photos_dir / p["path"]).is_file() and (r.photos_dir / p["thumb_path"]).is_file()
        assert r.integrity_check() == "ok"
    assert main(["restore", str(tmp_path / "b.zip"), "--db", str(tmp_path / "d2" / "r.db")]) == 0
    assert f"1 photo(s) left out" in capsys.readouterr().out
