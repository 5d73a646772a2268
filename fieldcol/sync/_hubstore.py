"""The office hub's storage on SQLite (``HubStore``, the default ``HubBackend``).

A fieldcol ``Store`` in ``DIR/hub.db`` (photos in ``DIR/hub-photos/``) holds every device's
operations and the merged records, and ``DIR/devices.db`` the device tokens (hashes only). One
hub process serves it; for several processes over one database see ``_hubstore_pg``.
"""

from __future__ import annotations

import os
import secrets
import sqlite3
import threading
import uuid
from pathlib import Path

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.store._oplog import Op
from fieldcol.store._snapshot import write_snapshot
from fieldcol.sync._hubapi import SHA, Device, PushResult, check_name
from fieldcol.sync._hubapi import now_text as _now
from fieldcol.sync._hubapi import token_hash as _hash
from fieldcol.sync._hubphotos import HubPhotos

__all__ = ["SHA", "Device", "HubStore"]

_DEVICES_SQL = """
CREATE TABLE IF NOT EXISTS devices (
    name TEXT PRIMARY KEY NOT NULL,
    token_hash TEXT NOT NULL UNIQUE,
    created_at TEXT NOT NULL,
    revoked_at TEXT,
    device_id TEXT,
    last_sync TEXT
);
CREATE TABLE IF NOT EXISTS hub (key TEXT PRIMARY KEY NOT NULL, value TEXT NOT NULL);
"""


class HubStore:
    """The hub's records, photos and devices in one folder.

    Args:
        data_dir: the hub's folder (made when missing).

    Example:
        >>> hub = HubStore("hubdata"); token = hub.add_device("tablet-1")
        >>> hub.device_for_token(token).name, hub.device_for_token("nope")
        ('tablet-1', None)
        >>> hub.close()
    """

    def __init__(self, data_dir: str | os.PathLike[str]):
        self.dir = Path(data_dir)
        if self.dir.exists() and not self.dir.is_dir():
            raise InputError("data", str(self.dir), "this is a file, not a folder", None)
        self.dir.mkdir(parents=True, exist_ok=True)
        self.store = Store(self.dir / "hub.db")
        self.partial = self.dir / "partial"
        self.photos = HubPhotos(self.store.photos_dir, self.partial)
        self.snapshots = self.dir / "snapshots"
        self.snapshots.mkdir(exist_ok=True)
        for old in self.snapshots.glob("*.db"):  # left by a hub stopped while making one
            old.unlink(missing_ok=True)
        self._lock = threading.RLock()
        self._dev = sqlite3.connect(str(self.dir / "devices.db"), check_same_thread=False,
                                    timeout=10)
        with self._lock, self._dev:
            self._dev.executescript(_DEVICES_SQL)
            self._dev.execute("INSERT OR IGNORE INTO hub (key, value) VALUES ('hub_id', ?)",
                              [str(uuid.uuid4())])

    def close(self) -> None:
        """Close both databases."""
        with self._lock:
            self._dev.close()
            self.store.close()

    @property
    def hub_id(self) -> str:
        """This hub's id (devices keep their cursors per hub)."""
        with self._lock:
            return self._dev.execute("SELECT value FROM hub WHERE key = 'hub_id'").fetchone()[0]

    @property
    def schema(self) -> list[str]:
        """The schema steps this hub knows."""
        return list(MIGRATION_NAMES)

    # -- devices ------------------------------------------------------------------------------
    def add_device(self, name: str) -> str:
        """Allow a new device; returns its token (shown once: only its hash is kept).

        Example:
            >>> len(HubStore("hub2").add_device("phone-2")) > 30
            True
        """
        check_name(name)
        token = secrets.token_hex(32)  # hex: a token never starts with "-", which a shell or argparse reads as an option
        with self._lock, self._dev:
            try:
                self._dev.execute("INSERT INTO devices (name, token_hash, created_at) "
                                  "VALUES (?, ?, ?)", [name, _hash(token), _now()])
            except sqlite3.IntegrityError:
                raise InputError("name", name, "a device with this name exists",
                                 "choose another name, or revoke that one first") from None
        return token

    def revoke_device(self, name: str) -> None:
        """Refuse this device's token from now on (its changes already received stay)."""
        with self._lock, self._dev:
            cur = self._dev.execute("UPDATE devices SET revoked_at = ? WHERE name = ? "
                                    "AND revoked_at IS NULL", [_now(), name])
            if cur.rowcount != 1:
                raise InputError("name", name, "no such device (or revoked already)",
                                 "list them with: fieldcol hub devices")

    def devices(self) -> list[Device]:
        """Every device ever added, revoked ones too."""
        with self._lock:
            return [Device(*r) for r in self._dev.execute(
                "SELECT name, created_at, revoked_at, device_id, last_sync FROM devices "
                "ORDER BY name")]

    def device_for_token(self, token: str | None) -> Device | None:
        """The live device holding this token, or None (missing, wrong or revoked)."""
        if not token or len(token) > 200:
            return None
        with self._lock:
            r = self._dev.execute("SELECT name, created_at, revoked_at, device_id, last_sync "
                                  "FROM devices WHERE token_hash = ? AND revoked_at IS NULL",
                                  [_hash(token)]).fetchone()
        return Device(*r) if r else None

    def touch(self, name: str, device_id: str | None) -> None:
        """Note that a device synced just now (as store ``device_id``)."""
        with self._lock, self._dev:
            self._dev.execute("UPDATE devices SET last_sync = ?, device_id = coalesce(?, device_id) "
                              "WHERE name = ?", [_now(), device_id, name])

    # -- operations ---------------------------------------------------------------------------
    def push(self, ops: list[Op]) -> PushResult:
        """Merge pushed operations (repeats skipped by id); refuses clocks far ahead."""
        result = self.store.apply_ops(ops, source="push")
        return PushResult(result.new, result.seqs)

    def pull(self, after: int, limit: int,
             skip: tuple[str, list[tuple[int, int]]] | None = None) -> list[tuple[int, Op]]:
        """Operations after hub sequence ``after``, oldest first; ``skip``: (device id, spans)
        whose operations of that device are left out."""
        return self.store.ops_with_seq(after, limit, skip=skip)

    def pull_json(self, after: int, limit: int,
                  skip: tuple[str, list[tuple[int, int]]] | None = None
                  ) -> list[tuple[int, str]]:
        """``pull``, each operation as its JSON text (``Op.to_json()``'s fields)."""
        return [(seq, text) for seq, _, text in
                self.store.ops_json_with_seq(after, limit, skip=skip)]

    def snapshot(self) -> Path | None:
        """A new file of the hub's merged records, their operations and merge state (for a
        device's first sync; ``fieldcol.store._snapshot``), in ``DIR/snapshots/``; the caller
        removes it (the web layer as soon as it has it open)."""
        dest = self.snapshots / f"{uuid.uuid4().hex}.db"
        write_snapshot(self.store.path, dest, hub_id=self.hub_id)
        return dest

    def max_seq(self) -> int:
        """The hub's newest sequence number."""
        return self.store.last_op_seq()

    def count_from(self, device_id: str) -> int:
        """How many operations made by this store the hub holds."""
        return self.store.count_ops(device_id=device_id)

    # -- photos -------------------------------------------------------------------------------
    def photo_status(self, sha: str) -> tuple[bool, int]:
        """(held whole, bytes of an unfinished upload)."""
        return self.photos.status(sha)

    def photo_append(self, sha: str, offset: int, total: int, data: bytes) -> tuple[bool, int]:
        """Add a piece of an upload at ``offset`` (see ``HubPhotos.append``)."""
        return self.photos.append(sha, offset, total, data)

    def photo_read(self, sha: str, offset: int, size: int) -> bytes | None:
        """Bytes of a held photo from ``offset`` (None when the hub does not hold it)."""
        return self.photos.read(sha, offset, size)
