"""The hub's storage interface (``HubBackend``) and what both implementations share.

The web layer (``fieldcol.sync.hub``) talks to storage only through these methods, so the hub
runs the same over SQLite (``_hubstore.HubStore``, one process, the default) or PostgreSQL
(``_hubstore_pg.PgHubStore``, any number of processes over one database). ``open_hub`` picks
one from the command line's ``--data`` and ``--database``.
"""

from __future__ import annotations

import hashlib
import os
import re
from dataclasses import dataclass
from datetime import datetime, timezone
from pathlib import Path
from typing import Protocol

from fieldcol.errors import InputError
from fieldcol.store._oplog import FUTURE_TOLERANCE_MS, Op, Schema, hlc_iso, hlc_ms, wall_ms

SHA = re.compile(r"[0-9a-f]{64}")
NAME = re.compile(r"[A-Za-z0-9][A-Za-z0-9 ._-]{0,63}")


class HubUnavailable(Exception):
    """The hub's database cannot be reached just now (the web layer answers 503)."""


@dataclass(frozen=True)
class Device:
    """A device allowed to sync: its name, the store id it last used, when it last synced."""
    name: str
    created_at: str
    revoked_at: str | None
    device_id: str | None
    last_sync: str | None


@dataclass(frozen=True)
class PushResult:
    """What a push stored: ``new`` operations (repeats by id are skipped); ``seqs``: the first
    and last hub sequence numbers they took, a span holding nothing else (None when nothing was
    new, or when the backend cannot say so for sure)."""
    new: int
    seqs: tuple[int, int] | None = None


class HubBackend(Protocol):
    """What the hub's web layer needs from storage (devices, operations, photos)."""

    @property
    def hub_id(self) -> str: ...
    @property
    def schema(self) -> list[str]: ...

    def close(self) -> None: ...
    def add_device(self, name: str) -> str: ...
    def revoke_device(self, name: str) -> None: ...
    def devices(self) -> list[Device]: ...
    def device_for_token(self, token: str | None) -> Device | None: ...
    def touch(self, name: str, device_id: str | None) -> None: ...
    def push(self, ops: list[Op]) -> PushResult: ...
    def pull(self, after: int, limit: int,
             skip: tuple[str, list[tuple[int, int]]] | None = None) -> list[tuple[int, Op]]: ...
    def pull_json(self, after: int, limit: int,
                  skip: tuple[str, list[tuple[int, int]]] | None = None
                  ) -> list[tuple[int, str]]: ...
    def max_seq(self) -> int: ...
    def snapshot(self) -> Path | None: ...
    def count_from(self, device_id: str) -> int: ...
    def photo_status(self, sha: str) -> tuple[bool, int]: ...
    def photo_append(self, sha: str, offset: int, total: int,
                     data: bytes) -> tuple[bool, int]: ...
    def photo_read(self, sha: str, offset: int, size: int) -> bytes | None: ...


def open_hub(data_dir: str | os.PathLike[str], database: str | None = None) -> HubBackend:
    """The hub's storage: SQLite in ``data_dir``, or PostgreSQL at ``database`` (photos still in
    ``data_dir``, which every hub process must reach).

    Raises ``InputError`` (field ``database``) when the database cannot be reached or is not a
    ``postgresql://`` address.

    Example:
        >>> hub = open_hub("hubdata"); type(hub).__name__
        'HubStore'
        >>> hub.close()
    """
    if database is None:
        from fieldcol.sync._hubstore import HubStore
        return HubStore(data_dir)
    from fieldcol.sync._hubstore_pg import PgHubStore
    return PgHubStore(data_dir, database)


def check_name(name: str) -> None:
    """Refuse a device name we would not print safely.

    Example:
        >>> check_name("tablet-1")
    """
    if not isinstance(name, str) or not NAME.fullmatch(name):
        raise InputError("name", str(name), "a device name is 1 to 64 letters, digits, "
                         "spaces, dots, dashes or underscores", "e.g. tablet-1")


def token_hash(token: str) -> str:
    """The stored form of a device token.

    Example:
        >>> len(token_hash("abc"))
        64
    """
    # tokens are 32 random bytes: a plain SHA-256 is enough to keep them unreadable at rest
    return hashlib.sha256(token.encode()).hexdigest()


def now_text() -> str:
    """UTC now as ``YYYY-MM-DDTHH:MM:SSZ``.

    Example:
        >>> now_text().endswith("Z")
        True
    """
    return datetime.now(timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ")


def check_pushed(ops: list[Op], schema: Schema,
                 max_future_ms: int = FUTURE_TOLERANCE_MS) -> None:
    """Refuse a pushed batch whole: an unknown table or field, or a clock far ahead of ours
    (the same rules the device store applies when it merges).

    Example:
        >>> check_pushed([], None)
    """
    for i, o in enumerate(ops):
        schema.check(o, f"ops[{i}]")
    if ops:
        latest = max(ops, key=lambda o: o.hlc)
        if hlc_ms(latest.hlc) > wall_ms() + max_future_ms:
            raise InputError("clock", hlc_iso(latest.hlc),
                             f"an operation from device {latest.device_id} is stamped ahead of "
                             "this clock", "check the clock of that device, then sync again")
