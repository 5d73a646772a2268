"""Opening the SQLite file safely and the few primitives every table shares.

Threading: a ``Store`` owns one connection opened with ``check_same_thread=False`` and
serialises every call with a re-entrant lock, so it may be driven from any thread, one call at a
time. The UI should call it from a worker (``asyncio.to_thread`` or one dedicated DB thread),
never on the event loop: a commit with ``synchronous=FULL`` waits for the disk.
"""

from __future__ import annotations

import os
import random
import sqlite3
import threading
import time
import uuid
from contextlib import contextmanager
from pathlib import Path
from typing import Any, Callable, Iterator, Self, TypeVar

from sqlite_utils import Database

from fieldcol.errors import InputError, StoreBusyError
from fieldcol.store import _oplog
from fieldcol.store import _validate as v
from fieldcol.store._migrations import (
    MIGRATION_NAMES, SCHEMA_VERSION, migrations, schema_version, unknown_migrations,
)
from fieldcol.store._archive import clean_staging
from fieldcol.store._ids import new_id
from fieldcol.store._paths import photos_dir, resolve_db_path
from fieldcol.store._photos import clean_temporary
from fieldcol.store._schema import DATA_TABLES, VISIT_TABLES

#: how long one attempt waits for another writer (``$FIELDCOL_BUSY_TIMEOUT`` overrides it)
T = TypeVar("T")

BUSY_TIMEOUT_S = 5.0
#: attempts before giving up with ``StoreBusyError`` (so about 15 s in all by default)
BUSY_ATTEMPTS = 3


def busy_timeout(env: dict[str, str] | None = None) -> float:
    """Seconds one attempt waits for the write lock: ``$FIELDCOL_BUSY_TIMEOUT`` or 5.

    Example:
        >>> busy_timeout({"FIELDCOL_BUSY_TIMEOUT": "0.5"}), busy_timeout({})
        (0.5, 5.0)
    """
    env = dict(os.environ) if env is None else env
    text = env.get("FIELDCOL_BUSY_TIMEOUT", "").strip()
    if not text:
        return BUSY_TIMEOUT_S
    try:
        value = float(text)
    except ValueError:
        value = -1.0
    if not 0 < value <= 3600:
        raise InputError("FIELDCOL_BUSY_TIMEOUT", text, "expected seconds, more than 0",
                         "e.g. 5")
    return value


def is_busy(e: BaseException) -> bool:
    """True for SQLite's "database is locked / busy" (another connection holds the lock).

    Example:
        >>> is_busy(sqlite3.OperationalError("database is locked"))
        True
    """
    if not isinstance(e, sqlite3.OperationalError):
        return False
    code = getattr(e, "sqlite_errorcode", None)
    if code is not None:
        return code & 0xFF in (sqlite3.SQLITE_BUSY, sqlite3.SQLITE_LOCKED)
    text = str(e).lower()
    return "database is locked" in text or "database is busy" in text


def _busy_setting(given: float | None) -> float:
    if given is None:
        return busy_timeout()
    if not isinstance(given, (int, float)) or not 0 < given <= 3600:
        raise InputError("busy_timeout", repr(given), "expected seconds, more than 0", "e.g. 5")
    return float(given)


class StoreBase:
    """The connection, its settings, and insert / update / tombstone helpers."""

    def __init__(self, path: str | os.PathLike[str] | None = None, *, create: bool = True,
                 readonly: bool = False, busy_timeout: float | None = None,
                 _stop_before: str | None = None):
        self.path: Path = resolve_db_path(path)
        if self.path.is_dir():
            raise InputError("db", str(self.path), "this is a folder, not a database file",
                             "give a file path such as site.db")
        if not self.path.exists() and (readonly or not create):
            raise InputError("db", str(self.path), "no fieldcol store there",
                             "check the path, or create one (fieldcol demo, import-schedule)")
        self.photos_dir: Path = photos_dir(self.path)
        self.readonly = readonly
        self._busy_s = _busy_setting(busy_timeout)
        self._lock = threading.RLock()
        try:
            if readonly:
                conn = sqlite3.connect(f"{self.path.as_uri()}?mode=ro", uri=True,
                                       timeout=self._busy_s, check_same_thread=False)
            else:
                self.path.parent.mkdir(parents=True, exist_ok=True)
                conn = sqlite3.connect(str(self.path), timeout=self._busy_s,
                                       check_same_thread=False)
        except (OSError, sqlite3.Error) as e:
            raise InputError("db", str(self.path), f"cannot open or create it ({e})",
                             "check the folder exists and may be written") from None
        try:
            self.db = Database(conn, execute_plugins=False)
            self._configure()
            self._sync_schema: _oplog.Schema | None = None
            stepped = self._migrate(_stop_before)
            self.device_id: str = self._ensure_device_id()
            self._start_oplog(stepped)
            if not readonly:
                # leftovers of a photo intake or a restore that a killed process never finished
                clean_temporary(self.photos_dir)
                clean_staging(self.path.parent)
            row = self.db.conn.execute(
                "SELECT value FROM meta WHERE key = 'person.name'").fetchone()
            #: the person new rows are stamped with (``created_by``); set by ``set_who``
            self.person: str | None = row[0] if row else None
        except BaseException:
            conn.close()
            raise

    # -- opening -------------------------------------------------------------------------
    def _configure(self) -> None:
        try:
            with self.db.ensure_autocommit_on():
                self.db.conn.execute(f"PRAGMA busy_timeout={int(self._busy_s * 1000)}")
                self.db.conn.execute("PRAGMA foreign_keys=ON")
                if self.readonly:
                    mode = self.db.conn.execute("PRAGMA journal_mode").fetchone()[0]
                else:
                    # switching a new file to WAL can be refused at once while another
                    # program is creating it (no busy wait): retried like a write
                    mode = self._retry_busy(lambda: self.db.conn.execute(
                        "PRAGMA journal_mode=WAL").fetchone()[0])
                    self.db.conn.execute("PRAGMA synchronous=FULL")
        except StoreBusyError:
            raise
        except sqlite3.DatabaseError as e:
            raise InputError("db", str(self.path), f"SQLite cannot use this file ({e})",
                             "choose a fieldcol store file in a folder that may be written") from None
        if str(mode).lower() != "wal" and not (self.readonly and self._is_new_file()):
            raise InputError("db", str(self.path), f"the file system refused WAL mode ({mode})",
                             "put the store on a local disk")

    def _is_new_file(self) -> bool:
        return not self.db.table_names()

    def _migrate(self, stop_before: str | None) -> bool:
        """Bring the schema up to date. Only one program does it: the check and every step
        run in one write transaction, so others wait, then find the work done."""
        if self._schema_state(stop_before) == "current":
            return False
        if self.readonly:
            if not self.db.table_names():
                raise InputError("db", str(self.path), "this SQLite file is not a fieldcol store",
                                 "choose another path")
            raise InputError("db", str(self.path), "the store was written by an older fieldcol "
                             "and is upgraded only when it is opened for writing",
                             "open it once in the app, or run fieldcol backup on it")
        with self._tx():
            if self._schema_state(stop_before) == "pending":
                migrations.apply(self.db, stop_before=stop_before)
        return True

    def _start_oplog(self, stepped: bool) -> None:
        """Read the synced tables; after a schema step, log what the step wrote and note new tables."""
        if "sync_ops" not in self.db.table_names():
            return
        if stepped:
            with self._tx():
                _oplog.install(self.db.conn, self.device_id)
        self._sync_schema = _oplog.Schema(self.db.conn)

    def _schema_state(self, stop_before: str | None) -> str:
        names = set(self.db.table_names())
        ours = schema_version(self.db) > 0
        if names and not ours and not (names <= {"_sqlite_migrations"}):
            # never 'upgrade' somebody else's database into ours
            raise InputError("db", str(self.path), "this SQLite file is not a fieldcol store",
                             "choose another path")
        newer = unknown_migrations(self.db)
        if newer:
            raise InputError("db", str(self.path),
                             f"made by a newer fieldcol (schema steps {', '.join(newer)})",
                             "update fieldcol before opening this store")
        pending = [m.name for m in migrations.pending(self.db)]
        if stop_before in pending:
            pending = pending[:pending.index(stop_before)]
        return "pending" if pending else "current"

    def _retry_busy(self, attempt: "Callable[[], T]") -> "T":
        """Run ``attempt`` (which waits up to the busy timeout itself) a bounded number of
        times while SQLite reports the store busy; then ``StoreBusyError``."""
        for n in range(BUSY_ATTEMPTS):
            try:
                return attempt()
            except sqlite3.OperationalError as e:
                if not is_busy(e):
                    raise
                if n + 1 < BUSY_ATTEMPTS:  # a short, uneven pause so waiters do not collide
                    time.sleep(random.uniform(0.01, 0.1) * (n + 1))
        raise StoreBusyError(str(self.path), f"still locked after {BUSY_ATTEMPTS} waits "
                             f"of {self._busy_s:g} s")

    def _ensure_device_id(self) -> str:
        row = self.db.conn.execute("SELECT value FROM meta WHERE key = 'device_id'").fetchone()
        if row:
            return row[0]
        if self.readonly:
            return ""
        device = str(uuid.uuid4())
        with self._tx():
            self.db.execute("INSERT OR IGNORE INTO meta (key, value) VALUES ('device_id', ?)",
                            [device])
            self.db.execute("INSERT OR IGNORE INTO meta (key, value) VALUES ('created_at', ?)",
                            [v.now_utc()])
        return self.db.conn.execute("SELECT value FROM meta WHERE key = 'device_id'").fetchone()[0]

    # -- life cycle ----------------------------------------------------------------------
    def close(self) -> None:
        """Close the connection (every change was already committed as it was made).

        Example:
            >>> store.close()
        """
        with self._lock:
            self.db.close()

    def __enter__(self) -> Self:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    @property
    def schema_version(self) -> int:
        """The number of schema versions applied (``SCHEMA_VERSION`` once open).

        Example:
            >>> store.schema_version == SCHEMA_VERSION
            True
        """
        with self._lock:
            return schema_version(self.db)

    def integrity_check(self) -> str:
        """``PRAGMA integrity_check`` (``'ok'`` when the file is sound).

        Example:
            >>> store.integrity_check()
            'ok'
        """
        with self._lock:
            return self.db.conn.execute("PRAGMA integrity_check").fetchone()[0]

    def is_empty(self) -> bool:
        """True when no table holds a row (tombstones count as rows: they are history).

        Example:
            >>> store.is_empty()
            False
        """
        with self._lock:
            return not any(self.db.conn.execute(f"SELECT 1 FROM {t} LIMIT 1").fetchone()
                           for t in DATA_TABLES)

    def rebuild_search(self) -> None:
        """Rebuild the findings full-text index from the findings table.

        The index follows rowids, which SQLite may renumber on ``VACUUM`` (the tables have text
        keys); the store never vacuums, and restore rebuilds the index anyway.

        Example:
            >>> store.rebuild_search()
            >>> [f.text for f in store.search_findings("plate")]
            ['Base plate corroded']
        """
        with self._tx():
            self.db.execute("INSERT INTO findings_fts(findings_fts) VALUES('rebuild')")

    # -- primitives ----------------------------------------------------------------------
    @contextmanager
    def _tx(self) -> Iterator[Database]:
        """One transaction, committed when the block ends (autosave) or rolled back whole.

        The outermost block takes the write lock up front (``BEGIN IMMEDIATE``): a deferred
        transaction that reads and then writes can fail at once with "database is locked" when
        another connection wrote in between, whatever the busy timeout. Taking the lock waits
        the busy timeout, ``BUSY_ATTEMPTS`` times, then raises ``StoreBusyError`` (nothing
        saved). Nested blocks are savepoints (sqlite-utils' ``atomic``).
        """
        with self._lock:
            if self.db.conn.in_transaction:
                with self.db.atomic():
                    yield self.db
                return
            self._retry_busy(lambda: self.db.conn.execute("BEGIN IMMEDIATE"))
            try:
                yield self.db
            except BaseException as e:
                self.db.rollback()
                if is_busy(e):
                    raise StoreBusyError(str(self.path)) from None
                raise
            try:
                if self._sync_schema is not None:
                    # the change and its operations commit together
                    _oplog.flush(self.db.conn, self.device_id, self._sync_schema)
                self.db.conn.execute("COMMIT")
            except BaseException as e:
                self.db.rollback()
                if is_busy(e):
                    raise StoreBusyError(str(self.path)) from None
                raise

    def _data_version(self) -> int:
        """SQLite's ``data_version``: it changes when another connection commits a write."""
        with self._lock:
            return int(self.db.conn.execute("PRAGMA data_version").fetchone()[0])

    @contextmanager
    def transaction(self) -> Iterator[None]:
        """Several store calls as one transaction: all of them are saved, or none.

        Example:
            >>> with store.transaction():
            ...     _ = store.update_column(col.id, grid="C/5")
            ...     _ = store.add_restraint_change(col.id, "2026-03-04", "other", "regridded")
        """
        with self._tx():
            yield

    def _rows(self, sql: str, params: Any = ()) -> list[dict[str, Any]]:
        def read() -> list[dict[str, Any]]:
            cur = self.db.conn.execute(sql, params)
            names = [d[0] for d in cur.description]
            return [dict(zip(names, r)) for r in cur.fetchall()]

        with self._lock:
            if self.db.conn.in_transaction:
                return read()
            return self._retry_busy(read)  # WAL readers rarely wait (a checkpoint, a recovery)

    def _book(self) -> dict[str, Any]:
        now = v.now_utc()
        return {"id": new_id(), "created_at": now, "updated_at": now,
                "device_id": self.device_id, "deleted_at": None}

    def _insert(self, table: str, row: dict[str, Any], *, row_id: str | None = None) -> str:
        full = self._book()
        if row_id is not None:
            full["id"] = row_id
        if self.person is not None and "created_by" not in row:
            full["created_by"] = self.person
        full.update(row)
        if table in VISIT_TABLES and full.get("visit_id") is None:
            visit = self._visit_for(table, full)
            if visit is not None:
                full["visit_id"] = visit
        cols = ", ".join(full)
        marks = ", ".join("?" for _ in full)
        with self._tx():
            self._execute_checked(f"INSERT INTO {table} ({cols}) VALUES ({marks})",
                                  list(full.values()))
        return full["id"]

    def _visit_for(self, table: str, row: dict[str, Any]) -> str | None:
        """The visit open on this device, when it is to the site the new row belongs to: what
        is recorded during a visit belongs to it (m007_visits; older schemas have no column)."""
        if table not in self._visit_tables():
            return None
        got = self.db.execute("SELECT value FROM meta WHERE key = 'visit.open'").fetchone()
        vid = got[0] if got else None
        if vid is None:
            return None
        found = self.db.execute("SELECT site_id FROM visits WHERE id = ? AND deleted_at IS NULL "
                                "AND ended_at IS NULL", [vid]).fetchone()
        if found is None:
            return None
        if row.get("site_id"):
            site = row["site_id"]
        elif row.get("column_id"):
            site = self._site_of("columns", row["column_id"])
        elif row.get("finding_id"):
            site = self._site_of("findings", row["finding_id"])
        elif row.get("restraint_change_id"):
            got = self.db.execute("SELECT c.site_id FROM restraint_changes r JOIN columns c ON "
                                  "c.id = r.column_id WHERE r.id = ?",
                                  [row["restraint_change_id"]]).fetchone()
            site = got[0] if got else None
        else:
            site = None
        return vid if site == found[0] else None

    def _site_of(self, table: str, row_id: str) -> str | None:
        got = self.db.execute(f"SELECT site_id FROM {table} WHERE id = ?", [row_id]).fetchone()
        return got[0] if got else None

    def _visit_tables(self) -> frozenset[str]:
        cached = getattr(self, "_visit_cols", None)
        if cached is None:
            cached = frozenset(t for t in VISIT_TABLES if any(
                r[1] == "visit_id" for r in self.db.execute(f"PRAGMA table_info({t})")))
            self._visit_cols = cached
        return cached

    def _update(self, table: str, row_id: str, changes: dict[str, Any]) -> None:
        if not changes:
            return
        changes = dict(changes, updated_at=v.now_utc(), device_id=self.device_id)
        sets = ", ".join(f"{k} = ?" for k in changes)
        with self._tx():
            cur = self._execute_checked(f"UPDATE {table} SET {sets} WHERE id = ?",
                                        [*changes.values(), row_id])
            if cur.rowcount != 1:
                raise InputError("id", row_id, f"no such row in {table}", None)

    def _execute_checked(self, sql: str, params: list[Any]) -> sqlite3.Cursor:
        try:
            return self.db.execute(sql, params)
        except sqlite3.IntegrityError as e:
            msg = str(e)
            if "columns_live_tag" in msg or "columns.site_id, columns.tag" in msg:
                raise InputError("tag", "", "a column with this tag already exists on the site",
                                 "choose another tag or edit that column") from None
            if "sites.name" in msg:
                raise InputError("name", "", "a site with this name already exists",
                                 "choose another name") from None
            if "levels.site_id, levels.name" in msg:
                raise InputError("level", "", "this level already exists on the site", None) from None
            raise InputError("record", "", f"the database refused the change ({msg})", None) from None

    def _get(self, table: str, row_id: str, *, live: bool = True,
             field: str = "id") -> dict[str, Any]:
        if not isinstance(row_id, str) or not row_id:
            raise InputError(field, repr(row_id), "expected the id of a row", None)
        rows = self._rows(f"SELECT * FROM {table} WHERE id = ?", [row_id])
        if not rows or (live and rows[0]["deleted_at"] is not None):
            what = "deleted" if rows else "not found"
            raise InputError(field, row_id, f"{table[:-1].replace('_', ' ')} {what}", None)
        return rows[0]

    def has_row(self, table: str, row_id: str) -> bool:
        """True when ``table`` holds a row with this id, tombstoned or not.

        Example:
            >>> store.has_row("sites", site.id), store.has_row("sites", "no-such-id")
            (True, False)
        """
        if table not in DATA_TABLES:
            raise InputError("table", table, "not a table of the store", ", ".join(DATA_TABLES))
        return bool(self._rows(f"SELECT 1 FROM {table} WHERE id = ?", [row_id]))

    def delete(self, table: str, row_id: str) -> None:
        """Tombstone a row: it stays in the file (and in backups) but leaves every listing.

        Args:
            table: one of the data tables, e.g. ``"findings"``.
            row_id: the row's id.

        Example:
            >>> store.delete("findings", finding.id)
            >>> store.list_findings(site.id), store.has_row("findings", finding.id)
            ([], True)
        """
        if table not in DATA_TABLES:
            raise InputError("table", table, "not a table of the store", ", ".join(DATA_TABLES))
        self._get(table, row_id)
        now = v.now_utc()
        with self._tx():
            self.db.execute(f"UPDATE {table} SET deleted_at = ?, updated_at = ?, device_id = ? "
                            "WHERE id = ?", [now, now, self.device_id, row_id])

    def undelete(self, table: str, row_id: str) -> None:
        """Bring back a tombstoned row (the undo of ``delete``).

        Example:
            >>> store.delete("findings", finding.id); store.undelete("findings", finding.id)
            >>> [f.text for f in store.list_findings(site.id)]
            ['Base plate corroded']
        """
        if table not in DATA_TABLES:
            raise InputError("table", table, "not a table of the store", ", ".join(DATA_TABLES))
        self._get(table, row_id, live=False)
        with self._tx():
            self._execute_checked(f"UPDATE {table} SET deleted_at = NULL, updated_at = ?, "
                                  "device_id = ? WHERE id = ?",
                                  [v.now_utc(), self.device_id, row_id])


__all__ = ["StoreBase", "SCHEMA_VERSION", "MIGRATION_NAMES"]
