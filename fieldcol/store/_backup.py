"""Backup and restore of a whole store (database and photos) as one zip file.

The database inside is made with SQLite's online backup API, never by copying the live file
(a copy taken mid-write, or without its WAL, can be torn). A manifest lists the SHA-256 of
every file; restore checks the whole archive (``fieldcol.store._archive``) before it touches
anything, and refuses it whole on any fault.
"""

from __future__ import annotations

import json
import os
import re
import sqlite3
import tempfile
import zipfile
from dataclasses import dataclass, field
from datetime import datetime, timezone
from pathlib import Path
from typing import TYPE_CHECKING, Any

from fieldcol.errors import InputError
from fieldcol.store import _validate as v
from fieldcol.store._archive import Archive, ManifestShape, member_path, open_archive, staged
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.store._paths import photos_dir, resolve_db_path
from fieldcol.store._photos import _fsync_dir, file_sha256
from fieldcol.store._schema import DATA_TABLES

if TYPE_CHECKING:
    from fieldcol.store._store import Store

FORMAT = "fieldcol-backup"
FORMAT_VERSION = 1
DB_ENTRY = "store.db"


@dataclass
class BackupInfo:
    """What a backup or restore handled."""
    path: Path
    schema_version: int
    counts: dict[str, int]
    photo_files: int
    missing_photos: list[str] = field(default_factory=list)
    safety_backup: Path | None = None
    #: on restore: photo rows left out because the backup did not hold their files
    dropped_photos: list[str] = field(default_factory=list)


def backup(store: "Store", out: str | os.PathLike[str]) -> BackupInfo:
    """Write the whole store to one zip file at ``out`` (refuses to overwrite a file).

    Args:
        store: an open store.
        out: the zip file to create.

    Returns:
        A ``BackupInfo`` (row counts, photo files, any photo files that were missing).

    Example:
        >>> backup(store, "site-2026-03-04.zip").photo_files  # the photo and its thumbnail
        2
    """
    from fieldcol import __version__

    out = Path(out).expanduser().absolute()
    if out.exists():
        raise InputError("out", str(out), "a file is already there",
                         "choose a new file name; backups never overwrite")
    if not out.parent.is_dir():
        raise InputError("out", str(out), "the folder does not exist", None)
    with tempfile.TemporaryDirectory(prefix="fieldcol-backup-") as tmp:
        snap = Path(tmp) / DB_ENTRY
        dst = sqlite3.connect(snap)
        try:
            with store._lock:
                store.db.conn.backup(dst)
            dst.execute("PRAGMA journal_mode=DELETE")  # a self-contained file for the zip
            counts = {t: dst.execute(f"SELECT count(*) FROM {t}").fetchone()[0]
                      for t in DATA_TABLES}
            schema = dst.execute("SELECT count(*) FROM _sqlite_migrations "
                                 "WHERE migration_set = 'fieldcol'").fetchone()[0]
            rels = sorted({p for row in dst.execute("SELECT path, thumb_path FROM photos")
                           for p in row})
        finally:
            dst.close()
        files = {DB_ENTRY: file_sha256(snap)}
        missing, present = [], []
        for rel in rels:
            # a row naming a file outside the photo folder is never copied into a backup
            ok = photo_name_ok(rel) or photo_name_ok(rel, thumb=True)
            p = store.photos_dir / rel
            if ok and p.is_file():
                present.append(rel)
                files[f"photos/{rel}"] = file_sha256(p)
            elif ok:
                missing.append(rel)
        manifest = {"format": FORMAT, "format_version": FORMAT_VERSION,
                    "app_version": __version__, "schema_version": schema,
                    "created_at": v.now_utc(), "device_id": store.device_id,
                    "counts": counts, "files": files, "missing_photos": missing}
        part = out.with_name(f".{out.name}.part")
        with zipfile.ZipFile(part, "w") as z:
            z.write(snap, DB_ENTRY, compress_type=zipfile.ZIP_DEFLATED)
            for rel in present:  # photos are compressed already
                z.write(store.photos_dir / rel, f"photos/{rel}", compress_type=zipfile.ZIP_STORED)
            z.writestr("manifest.json", json.dumps(manifest, indent=2))
        with open(part, "rb") as f:
            os.fsync(f.fileno())
        os.replace(part, out)
    return BackupInfo(out, schema, counts, len(present), missing)


def read_manifest(src: str | os.PathLike[str]) -> dict[str, Any]:
    """The manifest of a backup file, after checking its shape, names, sizes and every hash.

    Raises ``InputError`` (field ``backup``) for anything but an intact fieldcol backup.

    Example:
        >>> _ = backup(store, "site.zip")
        >>> read_manifest("site.zip")["counts"]["columns"]
        1
    """
    arc = _open(src)
    with tempfile.TemporaryDirectory(prefix="fieldcol-verify-") as tmp:
        with staged(arc, Path(tmp) / "x"):
            pass
    return arc.manifest


def restore(src: str | os.PathLike[str], db: str | os.PathLike[str] | None = None, *,
            force: bool = False) -> BackupInfo:
    """Restore a backup into the store at ``db``; a faulty backup is refused whole.

    The archive is checked before anything is written where the store lives: the manifest's
    shape, every member's name (resolved under the photo folder), declared sizes and
    compression ratio, every SHA-256, SQLite's integrity check of the database, and every photo
    row (its file must be one this restore writes, or one the backup lists as missing, under
    our own naming: never a path such as ``/etc/passwd``). Only photo rows whose files this
    restore writes are kept: the rows (and their links) of photos the backup lists as missing
    are left out and named in ``BackupInfo.dropped_photos``, so no row points at nothing. Members are unpacked into a folder
    beside the store and moved into place only when all of it passed.

    A store that holds any row is refused unless ``force``; with ``force`` a safety backup of
    it is written first (``<db>.before-restore-<time>.zip``), so nothing is lost. The restored
    store keeps this device's id (rows keep the device that made them).

    Args:
        src: the backup zip. db: the store path (``None``: ``$FIELDCOL_DB`` or app data).
        force: replace a non-empty store.

    Returns:
        A ``BackupInfo`` for the restored store.

    Example:
        >>> _ = backup(store, "site.zip")
        >>> restore("site.zip", "new.db").counts["columns"]
        1
    """
    from fieldcol.store._store import Store

    db_path = resolve_db_path(db)
    photos = photos_dir(db_path)
    arc = _open(src, space_for=db_path.parent)
    with staged(arc, photos) as folder:
        snap = folder / DB_ENTRY
        _check_database(arc, snap)
        dropped = _drop_photo_rows_without_files(arc, snap)
        target = Store(db_path, create=True)
        try:
            safety = None
            if not target.is_empty():
                if not force:
                    raise InputError("db", str(target.path), "the store already holds records",
                                     "restore into a new file, or use --force "
                                     "(a safety backup of this store is written first)")
                stamp = datetime.now(timezone.utc).strftime("%Y%m%dT%H%M%SZ")
                safety = backup(target, target.path.with_name(
                    f"{target.path.name}.before-restore-{stamp}.zip")).path
            photo_names = [n for n in arc.files if n.startswith("photos/")]
            for name in photo_names:  # files first: rows must never point at nothing
                rel = name[len("photos/"):]
                dest = member_path(target.photos_dir, rel, "backup", str(arc.path))
                if not dest.is_file() or file_sha256(dest) != arc.files[name]:
                    dest.parent.mkdir(parents=True, exist_ok=True)
                    os.replace(folder / name, dest)
                    _fsync_dir(dest.parent)
            device = target.device_id
            source = sqlite3.connect(snap)
            try:
                with target._lock:
                    source.backup(target.db.conn)
            finally:
                source.close()
            with target._tx():
                target.db.execute("UPDATE meta SET value = ? WHERE key = 'device_id'", [device])
        finally:
            target.close()
    # reopen: applies any newer schema steps to an older backup and re-checks the settings
    with Store(db_path, create=False) as s:
        s.rebuild_search()
        counts = {t: s._rows(f"SELECT count(*) AS n FROM {t}")[0]["n"] for t in DATA_TABLES}
        return BackupInfo(s.path, s.schema_version, counts, len(photo_names),
                          list(arc.manifest.get("missing_photos", [])), safety, dropped)


#: what a backup's manifest holds besides format, format_version and files
SHAPE = ManifestShape(FORMAT, FORMAT_VERSION, what="fieldcol backup",
                      required={"schema_version": int, "counts": dict},
                      optional={"app_version": str, "created_at": str, "device_id": str,
                                "missing_photos": list})
_PHOTO = re.compile(r"(?P<d>[0-9a-f]{2})/(?P<sha>[0-9a-f]{64})\.(jpg|png|webp)")
_THUMB = re.compile(r"thumbs/(?P<d>[0-9a-f]{2})/(?P<sha>[0-9a-f]{64})\.jpg")


def photo_name_ok(rel: str, *, thumb: bool = False) -> bool:
    """True when ``rel`` is a photo file name as the store writes it (``ab/<sha256>.jpg``).

    Example:
        >>> photo_name_ok("/etc/passwd"), photo_name_ok("ab/" + "ab" * 32 + ".jpg")
        (False, True)
    """
    m = (_THUMB if thumb else _PHOTO).fullmatch(rel) if isinstance(rel, str) else None
    return bool(m) and m["sha"][:2] == m["d"]


def _open(src: str | os.PathLike[str], space_for: Path | None = None) -> Archive:
    arc = open_archive(src, SHAPE, field="backup", space_for=space_for)
    if DB_ENTRY not in arc.files:
        raise arc.refuse(f"it holds no {DB_ENTRY}")
    for name, digest in arc.files.items():
        if name == DB_ENTRY:
            continue
        rel = name[len("photos/"):] if name.startswith("photos/") else None
        if rel is None or not (photo_name_ok(rel) or photo_name_ok(rel, thumb=True)):
            raise arc.refuse(f"{name!r} is not a file a fieldcol backup holds")
        if photo_name_ok(rel) and Path(rel).stem != digest:
            raise arc.refuse(f"{name} does not hold the photo its name says")
    missing = arc.manifest.get("missing_photos", [])
    if not all(isinstance(m, str) and (photo_name_ok(m) or photo_name_ok(m, thumb=True))
               for m in missing):
        raise arc.refuse("manifest: missing_photos must list photo file names")
    for table, n in arc.manifest["counts"].items():
        if not isinstance(n, int) or isinstance(n, bool) or n < 0:
            raise arc.refuse(f"manifest: counts[{table!r}] must be a whole number")
    return arc


def _drop_photo_rows_without_files(arc: Archive, snap: Path) -> list[str]:
    """Delete from the staged database the photo rows (and their links) whose files the
    archive does not hold; return their file names. The store's delete is a tombstone, but
    here the row never existed on this device: a row naming a missing file would show a
    broken photo and be copied into every later backup."""
    have = {n[len("photos/"):] for n in arc.files if n.startswith("photos/")}
    conn = sqlite3.connect(snap)
    try:
        gone = [(pid, path) for pid, path, thumb in
                conn.execute("SELECT id, path, thumb_path FROM photos ORDER BY path")
                if path not in have or thumb not in have]
        if gone:
            with conn:
                ids = [(pid,) for pid, _ in gone]
                conn.executemany("DELETE FROM photo_links WHERE photo_id = ?", ids)
                conn.executemany("DELETE FROM photos WHERE id = ?", ids)
    finally:
        conn.close()
    return [path for _, path in gone]


def _check_database(arc: Archive, snap: Path) -> None:
    """The staged database must be sound, of a schema we know, and name only photo files
    this restore writes (or the backup lists as missing)."""
    have = {n[len("photos/"):] for n in arc.files if n.startswith("photos/")}
    allowed = have | set(arc.manifest.get("missing_photos", []))
    try:
        check = sqlite3.connect(f"file:{snap}?mode=ro", uri=True)
    except sqlite3.Error as e:
        raise arc.refuse(f"its database is unreadable ({e})") from None
    try:
        check.execute("PRAGMA trusted_schema=OFF")
        ok = check.execute("PRAGMA integrity_check").fetchone()[0]
        if ok != "ok":
            raise arc.refuse(f"its database is damaged ({ok})", "use another copy")
        applied = [r[0] for r in check.execute(
            "SELECT name FROM _sqlite_migrations WHERE migration_set = 'fieldcol'")]
        if [n for n in applied if n not in MIGRATION_NAMES]:
            raise arc.refuse("made by a newer fieldcol", "update fieldcol to restore it")
        if not applied:
            raise arc.refuse("its database is not a fieldcol store")
        for sha, path, thumb in check.execute("SELECT sha256, path, thumb_path FROM photos"):
            if not (photo_name_ok(path) and photo_name_ok(thumb, thumb=True)
                    and Path(path).stem == sha and Path(thumb).stem == sha):
                raise arc.refuse(f"a photo row names a file outside the photo folder "
                                 f"({str(path)[:80]!r})")
            if path not in allowed or thumb not in allowed:
                raise arc.refuse(f"a photo row names a file the backup does not hold ({path})")
    except sqlite3.DatabaseError as e:
        raise arc.refuse(f"its database is unreadable ({e})") from None
    finally:
        check.close()
