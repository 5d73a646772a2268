"""Hostile and damaged archives are refused whole: exit 2, a clear reason, nothing written.

Each archive below is a real backup rebuilt with one fault, the way an attacker or a damaged
copy would present it. After each refusal the target folder holds exactly what it held before,
and a store that was there reads back the same.
"""

from __future__ import annotations

import hashlib
import io
import json
import sqlite3
import zipfile
from pathlib import Path

import pytest
from PIL import Image

from fieldcol.cli import main
from fieldcol.errors import InputError
from fieldcol.store import Store, backup, restore
from fieldcol.store._archive import (
    Limits, ManifestShape, check_name, member_path, open_archive, parse_manifest, staged,
)


def _jpeg(colour) -> bytes:
    buf = io.BytesIO()
    Image.new("RGB", (40, 30), colour).save(buf, "JPEG")
    return buf.getvalue()


@pytest.fixture
def good(tmp_path: Path) -> Path:
    """A sound backup of a small store with two photos."""
    with Store(tmp_path / "src" / "site.db") as s:
        site = s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        col = s.add_column(site.id, {"tag": "B/4", "section": "W10X49", "length": "14 ft"})
        f = s.add_finding(site.id, "Web pitting at base", category="corrosion",
                          severity="medium", column_id=col.id)
        s.add_photo(_jpeg((200, 10, 10)), finding_id=f.id)
        s.add_photo(_jpeg((10, 10, 200)), column_id=col.id)
        backup(s, tmp_path / "good.zip")
    return tmp_path / "good.zip"


def _entries(src: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(src) as z:
        return {n: z.read(n) for n in z.namelist()}


def _rebuild(entries: dict[str, bytes], out: Path, *, rehash: bool = True) -> Path:
    """Write ``entries`` as a zip; with ``rehash`` the manifest's hashes match the members."""
    entries = dict(entries)
    if rehash:
        m = json.loads(entries["manifest.json"])
        m["files"] = {n: hashlib.sha256(d).hexdigest() for n, d in entries.items()
                      if n != "manifest.json"}
        entries["manifest.json"] = json.dumps(m).encode()
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as z:
        for n, d in entries.items():
            z.writestr(n, d)
    return out


def _with_manifest(entries: dict[str, bytes], change) -> dict[str, bytes]:
    m = json.loads(entries["manifest.json"])
    m = change(m)
    return dict(entries, **{"manifest.json": json.dumps(m).encode()})


def _with_db(entries: dict[str, bytes], sql: str, tmp: Path) -> dict[str, bytes]:
    f = tmp / "edit.db"
    f.write_bytes(entries["store.db"])
    c = sqlite3.connect(f)
    c.execute(sql)
    c.commit()
    c.close()
    return dict(entries, **{"store.db": f.read_bytes()})


def _tree(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*"))
            if p.is_file()}


def _refused(capsys, archive: Path, db: Path, reason: str, *extra: str) -> None:
    """Restore via the command line: exit 2, the reason named, the folder as it was."""
    before = _tree(db.parent) if db.parent.exists() else None
    capsys.readouterr()
    rc = main(["restore", str(archive), "--db", str(db), *extra])
    err = capsys.readouterr().err
    assert rc == 2, err
    assert err.startswith("error: backup:") and reason in err, err
    assert "Traceback" not in err
    after = _tree(db.parent) if db.parent.exists() else None
    assert after == before  # nothing written, no staging folder left behind


Z = "0" * 64
HOSTILE = {
    # a member listed in the manifest whose name climbs out of the photo folder
    # (source of the attack: the reproduction; the defence is common practice)
    "climbing name": (lambda e, t: dict(e, **{"photos/thumbs/../../../../EVIL.txt": b"owned"}),
                      "leaves its folder"),
    "absolute name": (lambda e, t: dict(e, **{"/tmp/EVIL.txt": b"owned"}), "leaves its folder"),
    "backslash name": (lambda e, t: dict(e, **{"photos\\..\\EVIL.txt": b"owned"}),
                       "leaves its folder"),
    "stranger member": (lambda e, t: dict(e, **{"photos/ab/notes.txt": b"hi"}),
                        "is not a file a fieldcol backup holds"),
    "photo row at /etc/passwd": (
        lambda e, t: _with_db(e, "UPDATE photos SET path = '/etc/passwd' WHERE rowid = 1", t),
        "outside the photo folder"),
    "photo row climbing": (
        lambda e, t: _with_db(e, "UPDATE photos SET thumb_path = '../../../etc/passwd'", t),
        "outside the photo folder"),
    "photo row to a file not in the archive": (
        lambda e, t: _with_db(e, f"UPDATE photos SET sha256 = '{Z}', path = '00/{Z}.jpg', "
                              f"thumb_path = 'thumbs/00/{Z}.jpg' WHERE rowid = 1", t),
        "a file the backup does not hold"),
    "database of another program": (
        lambda e, t: _with_db(e, "DELETE FROM _sqlite_migrations", t),
        "not a fieldcol store"),
    "database from a newer fieldcol": (
        lambda e, t: _with_db(e, "INSERT INTO _sqlite_migrations (migration_set, name, applied_at)"
                              " VALUES ('fieldcol', 'm999_future', '2030-01-01')", t),
        "newer fieldcol"),
}


@pytest.mark.parametrize("case", sorted(HOSTILE))
def test_hostile_members_and_rows_are_refused_whole(case, good: Path, tmp_path: Path, capsys):
    make, reason = HOSTILE[case]
    bad = _rebuild(make(_entries(good), tmp_path), tmp_path / "bad.zip")
    target = tmp_path / "dst" / "site.db"
    _refused(capsys, bad, target, reason)
    assert not target.exists()
    assert not list(tmp_path.rglob("EVIL.txt"))
    assert not (tmp_path / "dst").exists()


MANIFESTS = {
    "a list": (lambda m: [m], "expected a JSON object, found a list"),
    "version as text": (lambda m: dict(m, format_version="1"), "format_version must be a whole"),
    "schema version as text": (lambda m: dict(m, schema_version="2"), "schema_version must be"),
    "version as true": (lambda m: dict(m, format_version=True), "format_version must be"),
    "unknown key": (lambda m: dict(m, run_after="rm -rf /"), "unknown key 'run_after'"),
    "newer format": (lambda m: dict(m, format_version=99), "made by a newer fieldcol"),
    "another format": (lambda m: dict(m, format="something-else"), "not a fieldcol backup"),
    "files not a map": (lambda m: dict(m, files=list(m["files"])), "files must be"),
    "hash not hex": (lambda m: dict(m, files={k: "x" * 64 for k in m["files"]}), "SHA-256"),
    "count as text": (lambda m: dict(m, counts={"columns": "1"}), "counts['columns']"),
    "missing photo outside": (lambda m: dict(m, missing_photos=["/etc/passwd"]),
                              "missing_photos"),
}


@pytest.mark.parametrize("case", sorted(MANIFESTS))
def test_manifests_of_the_wrong_shape_are_refused(case, good: Path, tmp_path: Path, capsys):
    change, reason = MANIFESTS[case]
    bad = _rebuild(_with_manifest(_entries(good), change), tmp_path / "bad.zip", rehash=False)
    _refused(capsys, bad, tmp_path / "dst" / "site.db", reason)


def test_manifest_bad_utf8_and_duplicate_keys(good: Path, tmp_path: Path, capsys):
    e = _entries(good)
    text = e["manifest.json"]
    bad = _rebuild(dict(e, **{"manifest.json": text.replace(b'"format"', b'"form\xffat"')}),
                   tmp_path / "utf.zip", rehash=False)
    _refused(capsys, bad, tmp_path / "dst" / "site.db", "not UTF-8")
    twice = text.replace(b'"format_version": 1', b'"format_version": 1, "format_version": 1')
    assert twice != text
    bad = _rebuild(dict(e, **{"manifest.json": twice}), tmp_path / "dup.zip", rehash=False)
    _refused(capsys, bad, tmp_path / "dst" / "site.db", "appears twice")
    bad = _rebuild(dict(e, **{"manifest.json": b"[" * 100000}), tmp_path / "deep.zip",
                   rehash=False)
    _refused(capsys, bad, tmp_path / "dst" / "site.db", "manifest")


def test_bit_flipped_database_is_refused(good: Path, tmp_path: Path, capsys):
    e = _entries(good)
    flipped = bytearray(e["store.db"])
    flipped[len(flipped) // 2] ^= 0x10
    # the manifest's hash catches it
    bad = _rebuild(dict(e, **{"store.db": bytes(flipped)}), tmp_path / "flip.zip", rehash=False)
    _refused(capsys, bad, tmp_path / "dst" / "site.db", "store.db is damaged")
    # with the hash forged to match, SQLite's integrity check catches a broken page: the
    # first byte of page 2 is its b-tree page type (SQLite file format, section 1.6)
    page = int.from_bytes(e["store.db"][16:18], "big")
    forged = bytearray(e["store.db"])
    forged[page] = 0x07  # not a valid page type
    bad = _rebuild(dict(e, **{"store.db": bytes(forged)}), tmp_path / "forged.zip")
    _refused(capsys, bad, tmp_path / "dst" / "site.db", "database")
    # a flip in the zip's own bytes: the member's CRC catches it while streaming
    raw = bytearray(good.read_bytes())
    with zipfile.ZipFile(good) as z:
        info = z.getinfo("store.db")
    raw[info.header_offset + 30 + len(info.filename) + info.compress_size // 2] ^= 0x01
    (tmp_path / "raw.zip").write_bytes(bytes(raw))
    _refused(capsys, tmp_path / "raw.zip", tmp_path / "dst" / "site.db", "damaged")


def test_zip_bomb_is_refused_before_it_is_inflated(good: Path, tmp_path: Path, capsys):
    e = _entries(good)
    bomb = tmp_path / "bomb.zip"
    sha = "ab" + "0" * 62
    name = f"photos/ab/{sha}.jpg"
    with zipfile.ZipFile(bomb, "w", zipfile.ZIP_DEFLATED, compresslevel=1) as z:
        for n, d in e.items():
            if n != "manifest.json":
                z.writestr(n, d)
        zeros = bytes(1 << 20)
        with z.open(name, "w", force_zip64=True) as w:
            for _ in range(1024):  # 1 GiB of zeros, about 1 MB compressed
                w.write(zeros)
        m = json.loads(e["manifest.json"])
        m["files"][name] = sha
        z.writestr("manifest.json", json.dumps(m))
    with zipfile.ZipFile(bomb) as z:
        info = z.getinfo(name)
    assert info.file_size == 1 << 30 and info.compress_size < 8 << 20
    _refused(capsys, bomb, tmp_path / "dst" / "site.db", "zip bomb")


def test_refused_force_restore_leaves_the_store_as_it_was(good: Path, tmp_path: Path, capsys):
    db = tmp_path / "dst" / "site.db"
    with Store(db) as s:
        site = s.add_site("Gull Quay Warehouse", code="en1993-1-1", unit_system="si")
        s.add_column(site.id, {"tag": "A1", "section": "HEB200", "length": "4 m"})
        s.add_photo(_jpeg((0, 120, 0)))
    bad = _rebuild(_with_db(_entries(good), "UPDATE photos SET path = '/etc/passwd'", tmp_path),
                   tmp_path / "bad.zip")
    _refused(capsys, bad, db, "outside the photo folder", "--force")
    with Store(db) as s:
        assert [x.name for x in s.list_sites()] == ["Gull Quay Warehouse"]
        assert s.integrity_check() == "ok"
    assert not list(db.parent.glob("*.before-restore-*"))


def test_a_sound_backup_still_restores_and_rows_point_inside(good: Path, tmp_path: Path):
    info = restore(good, tmp_path / "dst" / "site.db")
    assert info.photo_files == 4
    with Store(tmp_path / "dst" / "site.db") as s:
        for p in s._rows("SELECT sha256, path, thumb_path FROM photos"):
            f = s.photos_dir / p["path"]
            assert f.resolve().is_relative_to(s.photos_dir.resolve())
            assert hashlib.sha256(f.read_bytes()).hexdigest() == p["sha256"]
    assert not list((tmp_path / "dst").glob(".fieldcol-staging-*"))


def test_backup_never_copies_a_file_outside_the_photo_folder(tmp_path: Path):
    db = tmp_path / "site.db"
    secret = tmp_path / "secret.txt"
    secret.write_text("not a photo")
    with Store(db) as s:
        p = s.add_photo(_jpeg((1, 2, 3)))
        s.db.execute("UPDATE photos SET path = ? WHERE id = ?", [str(secret), p.id])
        s.db.conn.commit()
        backup(s, tmp_path / "b.zip")
    with zipfile.ZipFile(tmp_path / "b.zip") as z:
        assert all(b"not a photo" != z.read(n) for n in z.namelist())
        assert all("secret" not in n for n in z.namelist())


# -- the module on its own (field bundles use it the same way) ------------------------------
SHAPE = ManifestShape("fieldcol-test", 2, required={"made_by": str}, what="test archive")


def _archive(path: Path, files: dict[str, bytes], **extra) -> Path:
    m = {"format": "fieldcol-test", "format_version": 1, "made_by": "t",
         "files": {n: hashlib.sha256(d).hexdigest() for n, d in files.items()}, **extra}
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        for n, d in files.items():
            z.writestr(n, d)
        z.writestr("manifest.json", json.dumps(m))
    return path


def test_staged_extracts_beside_the_target_and_cleans_up(tmp_path: Path):
    arc = open_archive(_archive(tmp_path / "a.zip", {"a/b.txt": b"hello", "c.bin": b"\0" * 10}),
                       SHAPE, field="bundle")
    target = tmp_path / "keep" / "files"
    with staged(arc, target) as folder:
        assert folder.parent == target.parent and folder.name.startswith(".fieldcol-staging-")
        assert (folder / "a" / "b.txt").read_bytes() == b"hello"
    assert not folder.exists()


def test_limits_refuse_before_reading(tmp_path: Path):
    big = _archive(tmp_path / "big.zip", {"x.bin": b"\0" * (3 << 20)})
    with pytest.raises(InputError, match="zip bomb") as e:
        open_archive(big, SHAPE, field="bundle")
    assert e.value.field == "bundle"
    with pytest.raises(InputError, match="more than the"):
        open_archive(big, SHAPE, field="bundle",
                     limits=Limits(max_member_bytes=1 << 20, max_ratio=1e9))
    many = _archive(tmp_path / "many.zip", {f"f{i}": b"x" for i in range(5)})
    with pytest.raises(InputError, match="more than 3 files"):
        open_archive(many, SHAPE, field="bundle", limits=Limits(max_members=3))


def test_a_member_longer_than_declared_is_stopped(tmp_path: Path):
    src = _archive(tmp_path / "a.zip", {"a.txt": b"A" * 1000})
    raw = bytearray(src.read_bytes())
    with zipfile.ZipFile(src) as z:
        info = z.getinfo("a.txt")
    # declare 10 bytes (local header and central directory) where 1000 follow
    for off in (info.header_offset + 22, raw.find(b"PK\x01\x02") + 24):
        raw[off:off + 4] = (10).to_bytes(4, "little")
    (tmp_path / "b.zip").write_bytes(bytes(raw))
    arc = open_archive(tmp_path / "b.zip", SHAPE, field="bundle")
    with pytest.raises(InputError) as e:
        with staged(arc, tmp_path / "t"):
            pass
    assert e.value.field == "bundle"
    assert not list(tmp_path.glob(".fieldcol-staging-*"))


@pytest.mark.parametrize("name", ["../x", "a/../../x", "/x", "a//b", "./a", "a/.", "C:x",
                                  "a\\b", "a\x00b", "a\nb", "dir/", ""])
def test_names_that_are_not_plain_relative_paths_are_refused(name: str, tmp_path: Path):
    with pytest.raises(InputError, match="leaves its folder"):
        check_name(name, "bundle", "b.zip")
    with pytest.raises(InputError):
        member_path(tmp_path, name, "bundle")


def test_member_path_refuses_a_symlink_out(tmp_path: Path):
    (tmp_path / "root").mkdir()
    (tmp_path / "root" / "link").symlink_to(tmp_path)
    with pytest.raises(InputError, match="leaves its folder"):
        member_path(tmp_path / "root", "link/x.txt", "bundle")
    assert member_path(tmp_path / "root", "a/x.txt", "bundle") == tmp_path / "root" / "a" / "x.txt"


def test_parse_manifest_rejects_nan_and_missing_keys():
    with pytest.raises(InputError, match="not valid JSON"):
        parse_manifest(b'{"format": "fieldcol-test", "format_version": NaN}', SHAPE, "b", "b")
    with pytest.raises(InputError, match="made_by is missing"):
        parse_manifest(json.dumps({"format": "fieldcol-test", "format_version": 1,
                                   "files": {}}).encode(), SHAPE, "b", "b")
