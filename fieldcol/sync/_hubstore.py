"""The office hub's storage, behind one narrow interface (``HubStore``).

Today: a fieldcol ``Store`` in ``DIR/hub.db`` (photos in ``DIR/hub-photos/``) holds every
device's operations and the merged records, and ``DIR/devices.db`` the device tokens (hashes
only). Everything the hub's web layer does goes through the methods here, so another database
can stand behind the same methods later.
"""

from __future__ import annotations

import hashlib
import os
import re
import secrets
import sqlite3
import threading
import uuid
from dataclasses import dataclass
from pathlib import Path

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.store._oplog import ApplyResult, Op
from fieldcol.store._photos import MAX_BYTES
from fieldcol.sync._photofiles import photo_file, take_photo

SHA = re.compile(r"[0-9a-f]{64}")
_NAME = re.compile(r"[A-Za-z0-9][A-Za-z0-9 ._-]{0,63}")

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


@dataclass(frozen=True)
class Device:
    """A device allowed to sync: its name, the store id it last used, when it last synced."""
    name: str
    created_at: str
    revoked_at: str | None
    device_id: str | None
    last_sync: str | None


def _hash(token: str) -> str:
    # tokens are 32 random bytes: a plain SHA-256 is enough to keep them unreadable at rest
    return hashlib.sha256(token.encode()).hexdigest()


def _now() -> str:
    from datetime import datetime, timezone
    return datetime.now(timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ")


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
        if not isinstance(name, str) or not _NAME.fullmatch(name):
            raise InputError("name", str(name), "a device name is 1 to 64 letters, digits, "
                             "spaces, dots, dashes or underscores", "e.g. tablet-1")
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
    def push(self, ops: list[Op]) -> ApplyResult:
        """Merge pushed operations (repeats skipped by id); refuses clocks far ahead."""
        return self.store.apply_ops(ops, source="push")

    def pull(self, after: int, limit: int) -> list[tuple[int, Op]]:
        """Operations after hub sequence ``after``, oldest first."""
        return self.store.ops_with_seq(after, limit)

    def max_seq(self) -> int:
        """The hub's newest sequence number."""
        return self.store.last_op_seq()

    def count_from(self, device_id: str) -> int:
        """How many operations made by this store the hub holds."""
        return self.store.count_ops(device_id=device_id)

    # -- photos -------------------------------------------------------------------------------
    def _part(self, sha: str) -> Path:
        if not SHA.fullmatch(sha):
            raise InputError("sha256", sha[:80], "not a content hash", "64 hex digits")
        return self.partial / f"{sha}.part"

    def photo_status(self, sha: str) -> tuple[bool, int]:
        """(held whole, bytes of an unfinished upload)."""
        part = self._part(sha)
        if photo_file(self.store, sha) is not None:
            return True, 0
        return False, part.stat().st_size if part.is_file() else 0

    def photo_append(self, sha: str, offset: int, total: int, data: bytes) -> tuple[bool, int]:
        """Add a piece of an upload at ``offset``; when ``total`` bytes are in, check the hash
        and keep the photo. Returns (held whole, bytes received)."""
        part = self._part(sha)
        if not 0 < total <= MAX_BYTES:
            raise InputError("total", str(total), "a photo is 1 byte to 64 MB", None)
        with self._lock:
            have, got = self.photo_status(sha)
            if have:
                return True, total
            if offset != got:
                raise InputError("offset", str(offset), f"the upload stands at {got} bytes",
                                 f"continue from {got}")
            if got + len(data) > total:
                raise InputError("total", str(total), "more bytes than the photo has", None)
            self.partial.mkdir(parents=True, exist_ok=True)
            with open(part, "ab") as fh:
                fh.write(data)
                fh.flush()
                os.fsync(fh.fileno())
            got += len(data)
            if got < total:
                return False, got
            blob = part.read_bytes()
            part.unlink()
            take_photo(self.store, sha, blob)  # a hash mismatch drops the upload
            return True, total

    def photo_read(self, sha: str, offset: int, size: int) -> bytes | None:
        """Bytes of a held photo from ``offset`` (None when the hub does not hold it)."""
        self._part(sha)
        f = photo_file(self.store, sha)
        if f is None:
            return None
        with open(f, "rb") as fh:
            fh.seek(max(0, offset))
            return fh.read(size)
