"""A whole store's synced records in one SQLite file: how an empty device takes a hub's records.

An empty device pulling a hub's operations one by one merges each of them in Python; a hub's
records are already merged. ``write_snapshot`` copies a store's synced tables, its operations
and its merge state (which operation won each field, rows waiting, conflicts) into a new file
with SQLite's own ``INSERT ... SELECT``; ``apply_snapshot`` checks such a file and copies it
into an empty store the same way, in one transaction with the pull cursor. The device then
holds what pulling every operation would have given it, and later syncs go operation by
operation from the snapshot's sequence number on.

The file is checked before anything is written: only plain tables of the names expected, a
format and schema this fieldcol reads, the hub it came from, every operation through the same
checks a pulled operation passes (in a thread beside the copy: SQLite releases the
interpreter while it copies), every photo row naming a file of our own layout; SQLite's own
constraints (types, foreign keys, unique keys) hold for every row copied. A refusal rolls
back: nothing is written.
"""

from __future__ import annotations

import json
import sqlite3
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from fieldcol.errors import InputError
from fieldcol.store._gcpause import gc_paused
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.store._oplog import (_CLOCK_END, _FILE_FIELDS, _FILE_TABLES, _SCALARS,
                                   MAX_VALUE_CHARS, QUIET, ROW, Schema, ops_from_json)

#: the format of a snapshot file; a reader refuses any other
FORMAT = 1
#: the merge's own tables copied with the records (the operations, the winners, the rows'
#: notes, the conflicts); cursors, settings and pending local notes stay with each store
STATE_TABLES = ("sync_ops", "sync_rows", "sync_fields", "sync_conflicts")
_INFO = "snapshot_info"
_OP_FIELDS = ("op_id", "device_id", "hlc", "tbl", "row_id", "field", "value", "seen")


@dataclass(frozen=True)
class SnapshotResult:
    """What a snapshot brought: the hub sequence number it covers, operations and rows."""
    seq: int
    ops: int
    rows: int


def write_snapshot(db_path: str | Path, dest: str | Path, *, hub_id: str) -> int:
    """Copy the store at ``db_path`` into a new snapshot file ``dest`` in one read transaction.

    Args:
        db_path: the store (a hub's ``hub.db``), read over a connection of its own.
        dest: the new file (must not exist).
        hub_id: written into the file, so a device takes it only from the hub it asked.

    Returns:
        The last sequence number of the operations it holds (0 for none).

    Example:
        >>> write_snapshot(store.path, "snap.db", hub_id="h1") >= 0
        True
    """
    dest = Path(dest)
    if dest.exists():
        raise InputError("snapshot", str(dest), "the file exists", None)
    conn = sqlite3.connect(str(db_path), isolation_level=None)
    try:
        tables = Schema(conn).tables
        conn.execute("ATTACH DATABASE ? AS snap", [str(dest)])
        # a scratch file, read once and removed: no journal and no syncs to disk
        conn.execute("PRAGMA snap.journal_mode = OFF")
        conn.execute("PRAGMA snap.synchronous = OFF")
        conn.execute("BEGIN")  # one read snapshot of the store for every table (WAL)
        try:
            seq = conn.execute("SELECT coalesce(max(seq), 0) FROM main.sync_ops").fetchone()[0]
            for t in (*tables, *STATE_TABLES):
                conn.execute(f"CREATE TABLE snap.{t} AS SELECT * FROM main.{t}")
            conn.execute(f"CREATE TABLE snap.{_INFO} (key TEXT NOT NULL, value TEXT NOT NULL)")
            conn.executemany(f"INSERT INTO snap.{_INFO} VALUES (?, ?)",
                             [("format", str(FORMAT)), ("hub_id", hub_id), ("seq", str(seq)),
                              *(("schema", s) for s in MIGRATION_NAMES)])
            conn.execute("COMMIT")
        except BaseException:
            conn.execute("ROLLBACK")
            raise
        conn.execute("DETACH DATABASE snap")
    finally:
        conn.close()
    return int(seq)


def is_empty(conn: sqlite3.Connection, schema: Schema) -> bool:
    """True when the store holds no operation and no synced row (a device's first sync).

    Example:
        >>> is_empty(store.db.conn, Schema(store.db.conn))
        False
    """
    if conn.execute("SELECT 1 FROM sync_ops LIMIT 1").fetchone():
        return False
    return not any(conn.execute(f"SELECT 1 FROM {t} LIMIT 1").fetchone() for t in schema.tables)


def apply_snapshot(store: Any, src: str | Path, *, hub_id: str, cursor: str) -> SnapshotResult:
    """Check the snapshot file ``src`` and copy it into the empty ``store``, moving the pull
    cursor named ``cursor`` to the snapshot's sequence number in the same transaction.

    Args:
        store: a ``Store`` that holds nothing synced yet (``is_empty``).
        src: the file, as the hub sent it.
        hub_id: the hub asked (the file must name it).
        cursor: this store's pull cursor for that hub.

    Returns:
        A ``SnapshotResult``. Raises ``InputError`` (field ``snapshot``, or ``schema`` when the
        hub's fieldcol is newer) with nothing written when the file is refused.

    Example:
        >>> from fieldcol.store import Store
        >>> seq = write_snapshot(store.path, "snap.db", hub_id="h1")
        >>> with Store("new.db") as new:
        ...     apply_snapshot(new, "snap.db", hub_id="h1", cursor="pull:h1").seq == seq
        True
    """
    src = Path(src)
    schema: Schema = store._schema()
    where = str(src.name)
    conn: sqlite3.Connection = store.db.conn
    with store._lock:
        mine = {**schema.columns, **{t: _table_columns(conn, t) for t in STATE_TABLES}}
    try:
        seq, columns = _check_file(src, mine, schema, hub_id, where)
    except sqlite3.DatabaseError as e:
        raise InputError("snapshot", where, f"not a snapshot this fieldcol reads ({e})",
                         "sync again") from None
    with store._lock, ThreadPoolExecutor(max_workers=1,
                                         thread_name_prefix="fieldcol-snapshot") as pool:
        # the operations are checked beside the copy; the copy commits only if they pass
        checked = pool.submit(_check_ops_paused, src, schema, where)
        # (a plain path: the store's connection does not read URIs, and nothing here writes
        # to the file)
        conn.execute("ATTACH DATABASE ? AS snap", [str(src)])
        try:
            with store._tx():
                # asked under the write lock: another program may have written since
                if not is_empty(conn, schema):
                    raise InputError("snapshot", where, "this store holds records already",
                                     None)
                conn.execute("INSERT OR IGNORE INTO meta (key, value) VALUES (?, '1')", [QUIET])
                rows = 0
                for t in schema.tables:  # parents first: foreign keys hold row by row
                    names = ", ".join(columns[t])
                    rows += conn.execute(f"INSERT INTO main.{t} ({names}) SELECT {names} "
                                         f"FROM snap.{t}").rowcount
                names = ", ".join(_OP_FIELDS)
                ops = conn.execute(f"INSERT INTO main.sync_ops ({names}, source) SELECT {names}, "
                                   f"'hub' FROM snap.sync_ops ORDER BY seq").rowcount
                for t in STATE_TABLES[1:]:
                    names = ", ".join(columns[t])
                    conn.execute(f"INSERT INTO main.{t} ({names}) SELECT {names} FROM snap.{t}")
                conn.execute("DELETE FROM meta WHERE key = ?", [QUIET])
                checked.result()
                store.set_cursor(cursor, seq)
        except sqlite3.DatabaseError as e:
            raise InputError("snapshot", where, f"its rows do not fit this store ({e})",
                             "sync again; if it persists, tell the office") from None
        finally:
            checked.cancel()
            conn.execute("DETACH DATABASE snap")
    return SnapshotResult(seq, ops, rows)


def _check_file(src: Path, mine: dict[str, list[str]], schema: Schema, hub_id: str,
                where: str) -> tuple[int, dict[str, list[str]]]:
    """The file's shape: (its sequence number, the columns to copy of each table)."""
    expected = {*schema.tables, *STATE_TABLES, _INFO}
    conn = _read_only(src)
    try:
        objects = conn.execute("SELECT type, name, sql FROM sqlite_master").fetchall()
        # plain tables only: no view, trigger or index, no virtual table, no column computed
        # when read (nothing of the file's own runs when this store reads it)
        odd = [f"{kind} {name}" for kind, name, sql in objects
               if kind != "table" or name not in expected
               or str(sql).upper().startswith("CREATE VIRTUAL")
               or any(c[6] for c in conn.execute(f"PRAGMA table_xinfo({_quote(name)})"))]
        if odd:
            raise InputError("snapshot", where, f"holds what a snapshot never does ({odd[0]})",
                             None)
        missing = expected - {name for _, name, _ in objects}
        if missing:
            raise InputError("snapshot", where, f"has no table {sorted(missing)[0]}", None)
        info: dict[str, list[str]] = {}
        for key, value in conn.execute(f"SELECT key, value FROM {_INFO}"):
            info.setdefault(str(key), []).append(str(value))
        if info.get("format") != [str(FORMAT)]:
            raise InputError("snapshot", where, f"of format {info.get('format')}, not {FORMAT}",
                             "update fieldcol on this device and on the hub")
        if info.get("hub_id") != [hub_id]:
            raise InputError("snapshot", where, "made by another hub than the one asked", None)
        newer = [s for s in info.get("schema", []) if s not in MIGRATION_NAMES]
        if newer:
            raise InputError("schema", "this device", "this device's fieldcol is older than "
                             "the hub's", "update fieldcol on this device, then sync")
        seq = info.get("seq", [""])[0]
        if not seq.isdigit() or len(seq) > 18:
            raise InputError("snapshot", where, f"its sequence number {seq!r} is not a whole "
                             "number", None)
        columns = {}
        for t in (*schema.tables, *STATE_TABLES):
            theirs = set(_table_columns(conn, t))
            # a column the hub's store lacks (a schema step it has not taken) keeps its default
            columns[t] = [c for c in mine[t] if c in theirs]
            if t in schema.tables and "id" not in columns[t]:
                raise InputError("snapshot", where, f"its table {t} has no id", None)
        _check_files(conn, where)
        return int(seq), columns
    finally:
        conn.close()


def _quote(name: str) -> str:
    return '"' + str(name).replace('"', '""') + '"'


def _table_columns(conn: sqlite3.Connection, table: str) -> list[str]:
    return [r[1] for r in conn.execute(f"PRAGMA table_info({table})")]


def snapshot_photos(src: str | Path) -> dict[str, str]:
    """Content hash -> file name (in the photo folder) of every photo row of a snapshot file,
    each name checked to be of this store's own layout.

    Example:
        >>> _ = write_snapshot(store.path, "snap.db", hub_id="h1")
        >>> [name == f"{sha[:2]}/{sha}.jpg" for sha, name in snapshot_photos("snap.db").items()]
        [True]
    """
    src = Path(src)
    conn = _read_only(src)
    try:
        return _check_files(conn, src.name)
    except sqlite3.DatabaseError as e:
        raise InputError("snapshot", src.name, f"not a snapshot this fieldcol reads ({e})",
                         "sync again") from None
    finally:
        conn.close()


def _check_files(conn: sqlite3.Connection, where: str) -> dict[str, str]:
    """Every photo row names a file of this store's own layout (never a path out)."""
    names = [f for t, f in _FILE_FIELDS if t == "photos"]
    out = {}
    for row in conn.execute(f"SELECT {', '.join(names)} FROM photos"):
        values = dict(zip(names, row))
        for name, value in values.items():
            if not (isinstance(value, str) and _FILE_FIELDS[("photos", name)].fullmatch(value)):
                raise InputError("snapshot", where, f"a photo's {name} {str(value)[:80]!r} is "
                                 "not a photo file name of this store", None)
        out[values["sha256"]] = values["path"]
    return out


def _check_ops_paused(src: Path, schema: Schema, where: str) -> None:
    # tens of thousands of small dicts, none in a cycle (see ``_gcpause``)
    with gc_paused():
        _check_ops(src, schema, where)


def _check_ops(src: Path, schema: Schema, where: str) -> None:
    """Every operation of the file through a pulled operation's checks.

    The usual row operation is checked in bulk: its shape in SQL (kinds, lengths, a JSON
    object), its values decoded in one call for the table, its fields against the table's; any
    other operation (one of a single field, of a photo, or one that fails the bulk check) goes
    through ``Op.from_json`` and ``Schema.check``, which name what is wrong.
    """
    conn = _read_only(src)
    try:
        usual: dict[str, list[str]] = {}
        odd = False
        for tbl, value, ok in conn.execute(f"SELECT tbl, value, {_USUAL} FROM sync_ops"):
            if ok == 1:
                usual.setdefault(tbl, []).append(value)
            else:
                odd = True
        others = [dict(zip(_OP_FIELDS, row)) for row in conn.execute(
            f"SELECT {', '.join(_OP_FIELDS)} FROM sync_ops WHERE NOT ({_USUAL}) "
            f"ORDER BY seq")] if odd else []
    finally:
        conn.close()
    settable = schema._settable
    for tbl, texts in usual.items():
        values = _decode_all(texts)
        if tbl not in settable or tbl in _FILE_TABLES or values is None:
            others += _ops_of(src, tbl)
            continue
        fields = settable[tbl]
        for d in values:
            if not (type(d) is dict and d and fields.issuperset(d)
                    and _SCALARS.issuperset(map(type, d.values()))
                    and max(map(len, d)) <= 200):
                others += _ops_of(src, tbl)
                break
    if others:
        schema.check_all(ops_from_json(others, f"{where}.ops"), f"{where}.ops")


#: an operation of the usual kind, as SQL can see it (the bulk check's first half)
_USUAL = (f"typeof(op_id) = 'text' AND length(op_id) BETWEEN 1 AND 200 "
          f"AND typeof(device_id) = 'text' AND length(device_id) BETWEEN 1 AND 200 "
          f"AND typeof(tbl) = 'text' AND length(tbl) BETWEEN 1 AND 200 "
          f"AND typeof(row_id) = 'text' AND length(row_id) BETWEEN 1 AND 200 "
          f"AND typeof(hlc) = 'integer' AND hlc BETWEEN 0 AND {_CLOCK_END - 1} "
          f"AND typeof(seen) = 'integer' AND seen BETWEEN 0 AND {_CLOCK_END - 1} "
          f"AND field = '{ROW}' AND typeof(value) = 'text' "
          f"AND length(value) <= {MAX_VALUE_CHARS} AND json_valid(value) "
          f"AND json_type(value) = 'object'")


def _decode_all(texts: list[str]) -> list[Any] | None:
    """Each text decoded, in one call (None when Python's reader refuses them: each is one
    JSON object to SQLite, so joined they make a list of exactly as many)."""
    try:
        values = json.loads(f"[{','.join(texts)}]")
    except ValueError:
        return None
    return values if len(values) == len(texts) else None


def _ops_of(src: Path, tbl: str) -> list[dict[str, Any]]:
    """The usual operations of one table, for the full check."""
    conn = _read_only(src)
    try:
        return [dict(zip(_OP_FIELDS, row)) for row in conn.execute(
            f"SELECT {', '.join(_OP_FIELDS)} FROM sync_ops WHERE tbl = ? AND {_USUAL} "
            f"ORDER BY seq", [tbl])]
    finally:
        conn.close()


def _read_only(src: Path) -> sqlite3.Connection:
    conn = sqlite3.connect(f"file:{src}?mode=ro", uri=True, check_same_thread=False)
    # a file from elsewhere: no function of its schema runs (it may hold only tables anyway)
    conn.execute("PRAGMA trusted_schema = OFF")
    return conn
