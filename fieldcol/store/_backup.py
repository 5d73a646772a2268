"""Backup and restore of a whole store (database and photos) as one zip file.

The database inside is made with SQLite's online backup API, never by copying the live file
(a copy taken mid-write, or without its WAL, can be torn). A manifest lists the SHA-256 of
every file; restore checks each before it touches anything.
"""

from __future__ import annotations

import json
import os
import sqlite3
import tempfile
import zipfile
from dataclasses import dataclass, field
from datetime import datetime, timezone
from pathlib import Path
from typing import TYPE_CHECKING, Any

from fieldcol.errors import InputError
from fieldcol.store import _validate as v
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.store._photos import file_sha256, write_atomic
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
            p = store.photos_dir / rel
            if p.is_file():
                present.append(rel)
                files[f"photos/{rel}"] = file_sha256(p)
            else:
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
    """The manifest of a backup file, after checking every file in it against its hash.

    Raises ``InputError`` (field ``backup``) for anything but an intact fieldcol backup.

    Example:
        >>> _ = backup(store, "site.zip")
        >>> read_manifest("site.zip")["counts"]["columns"]
        1
    """
    import hashlib

    src = Path(src)
    if not src.is_file():
        raise InputError("backup", str(src), "no such file", None)
    try:
        with zipfile.ZipFile(src) as z:
            try:
                manifest = json.loads(z.read("manifest.json"))
            except KeyError:
                raise InputError("backup", str(src), "no manifest: not a fieldcol backup",
                                 None) from None
            if manifest.get("format") != FORMAT or not isinstance(manifest.get("files"), dict):
                raise InputError("backup", str(src), "not a fieldcol backup", None)
            if manifest.get("format_version", 0) > FORMAT_VERSION:
                raise InputError("backup", str(src), "made by a newer fieldcol",
                                 "update fieldcol to restore it")
            names = set(z.namelist()) - {"manifest.json"}
            listed = set(manifest["files"])
            if names != listed:
                raise InputError("backup", str(src), "the files do not match the manifest "
                                 f"(extra {sorted(names - listed)[:3]}, "
                                 f"missing {sorted(listed - names)[:3]})", None)
            for name, want in manifest["files"].items():
                h = hashlib.sha256()
                with z.open(name) as f:
                    for chunk in iter(lambda: f.read(1 << 20), b""):
                        h.update(chunk)
                if h.hexdigest() != want:
                    raise InputError("backup", str(src), f"{name} is damaged (hash differs)",
                                     "use another copy of the backup")
                if name.startswith("photos/") and not name.startswith("photos/thumbs/"):
                    if Path(name).stem != want:
                        raise InputError("backup", str(src),
                                         f"{name} does not hold the photo its name says", None)
    except (zipfile.BadZipFile, json.JSONDecodeError, OSError) as e:
        raise InputError("backup", str(src), f"cannot read it as a backup ({e})", None) from None
    return manifest


def restore(src: str | os.PathLike[str], db: str | os.PathLike[str] | None = None, *,
            force: bool = False) -> BackupInfo:
    """Restore a backup into the store at ``db``, after verifying every hash.

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

    manifest = read_manifest(src)
    with tempfile.TemporaryDirectory(prefix="fieldcol-restore-") as tmp:
        with zipfile.ZipFile(src) as z:
            z.extract(DB_ENTRY, tmp)
            snap = Path(tmp) / DB_ENTRY
            check = sqlite3.connect(snap)
            try:
                ok = check.execute("PRAGMA integrity_check").fetchone()[0]
                applied = [r[0] for r in check.execute(
                    "SELECT name FROM _sqlite_migrations WHERE migration_set = 'fieldcol'")]
            except sqlite3.DatabaseError as e:
                raise InputError("backup", str(src), f"its database is unreadable ({e})",
                                 None) from None
            finally:
                check.close()
            if ok != "ok":
                raise InputError("backup", str(src), f"its database is damaged ({ok})", None)
            newer = [n for n in applied if n not in MIGRATION_NAMES]
            if newer:
                raise InputError("backup", str(src), "made by a newer fieldcol",
                                 "update fieldcol to restore it")
            target = Store(db, create=True)
            try:
                safety = None
                if not target.is_empty():
                    if not force:
                        raise InputError("db", str(target.path),
                                         "the store already holds records",
                                         "restore into a new file, or use --force "
                                         "(a safety backup of this store is written first)")
                    stamp = datetime.now(timezone.utc).strftime("%Y%m%dT%H%M%SZ")
                    safety = backup(target, target.path.with_name(
                        f"{target.path.name}.before-restore-{stamp}.zip")).path
                photo_names = [n for n in manifest["files"] if n.startswith("photos/")]
                for name in photo_names:  # files first: rows must never point at nothing
                    dest = target.photos_dir / name[len("photos/"):]
                    if not dest.is_file() or file_sha256(dest) != manifest["files"][name]:
                        write_atomic(dest, z.read(name))
                device = target.device_id
                source = sqlite3.connect(snap)
                try:
                    with target._lock:
                        source.backup(target.db.conn)
                finally:
                    source.close()
                with target._tx():
                    target.db.execute("UPDATE meta SET value = ? WHERE key = 'device_id'",
                                      [device])
            finally:
                target.close()
    # reopen: applies any newer schema steps to an older backup and re-checks the settings
    with Store(db, create=False) as s:
        s.rebuild_search()
        counts = {t: s._rows(f"SELECT count(*) AS n FROM {t}")[0]["n"] for t in DATA_TABLES}
        return BackupInfo(s.path, s.schema_version, counts, len(photo_names),
                          list(manifest.get("missing_photos", [])), safety)
