"""The operations log: every change to a data table as per-field operations, and their merge.

Capture is by construction: triggers on every data table note the id of each row written, and
the store's outermost transaction turns those rows into operations (one per written row,
carrying every field whose value changed: field ``"*"``, value a JSON object) just before it
commits. Operations of one field each (older stores, a settled conflict) stay valid. Any write path, including tables and columns added later, is
covered as long as it runs inside ``Store._tx()``.

Merge is a pure function of the set of operations, so every replica ends the same whatever the
order or repetition of delivery:

* a field's value is that of its operation with the greatest ``(hlc, op_id)``;
* two operations on one field conflict when neither editor had seen the other (``seen`` is the
  row version the editor had in hand); the value that lost is kept in ``sync_conflicts``;
* an edit racing a delete keeps the row alive and the delete is flagged for review;
* a unique key (a site's name, a column's tag on its site) taken by two rows from two devices:
  the row whose key was set first keeps it, the other shows ``"<key> (<first 8 of its id>)"``
  and is flagged; both rows stay and nothing is merged behind the engineer's back.

Timestamps: a hybrid logical clock (``hlc``), milliseconds since 1970 shifted left 16 bits plus
a counter, never going back and always past every clock seen from other devices.
"""

from __future__ import annotations

import json
import math
import re
import sqlite3
import time
from dataclasses import dataclass, field as _field
from datetime import datetime, timezone
from itertools import chain
from contextlib import contextmanager
from typing import Any, Iterable, Iterator

from fieldcol.errors import InputError
from fieldcol.store._gcpause import gc_paused
from fieldcol.store._ids import new_id, new_ids

_encode_text = json.encoder.encode_basestring  # type: ignore[attr-defined]

#: the key travels with every operation, not as a field
DERIVED = ("id",)
#: bookkeeping that changes with every edit: last writer wins, never flagged
UNFLAGGED = ("updated_at", "device_id", "created_at")
BOOK = ("id", "created_at", "updated_at", "device_id", "deleted_at")
#: the field name of an operation carrying several fields of one row (value: a JSON object)
ROW = "*"
#: a ``meta`` key present only inside a merge's own transaction: the triggers that note written
#: rows stand still while it writes (its rows are the merge's, not edits; noting each reading
#: cost twice its own insert)
QUIET = "sync_quiet"
#: the longest value an operation may carry (a row's fields together)
MAX_VALUE_CHARS = 4_000_000
#: an operation stamped further ahead of the receiver's clock than this is refused
FUTURE_TOLERANCE_MS = 15 * 60 * 1000
_SHIFT = 16
_TEXT_OR_NULL = frozenset((str, type(None)))
_FILE_FIELDS = {
    ("photos", "path"): re.compile(r"[0-9a-f]{2}/[0-9a-f]{64}\.(jpg|png|webp)"),
    ("photos", "thumb_path"): re.compile(r"thumbs/[0-9a-f]{2}/[0-9a-f]{64}\.jpg"),
    ("photos", "sha256"): re.compile(r"[0-9a-f]{64}"),
}
_FILE_TABLES = frozenset(t for t, _ in _FILE_FIELDS)

M003_SQL = """
CREATE TABLE sync_ops (
    seq INTEGER PRIMARY KEY AUTOINCREMENT,
    op_id TEXT NOT NULL UNIQUE,
    device_id TEXT NOT NULL,
    hlc INTEGER NOT NULL,
    tbl TEXT NOT NULL,
    row_id TEXT NOT NULL,
    field TEXT NOT NULL,
    value TEXT,
    seen INTEGER NOT NULL DEFAULT 0,
    source TEXT NOT NULL
);
CREATE INDEX sync_ops_row ON sync_ops(tbl, row_id);
CREATE TABLE sync_fields (
    tbl TEXT NOT NULL,
    row_id TEXT NOT NULL,
    field TEXT NOT NULL,
    hlc INTEGER NOT NULL,
    op_id TEXT NOT NULL,
    value TEXT,
    mat TEXT,
    PRIMARY KEY (tbl, row_id, field)
) WITHOUT ROWID;
CREATE INDEX sync_fields_value ON sync_fields(tbl, field, value);
CREATE TABLE sync_rows (
    tbl TEXT NOT NULL,
    row_id TEXT NOT NULL,
    max_hlc INTEGER NOT NULL,
    pending INTEGER NOT NULL DEFAULT 0,
    PRIMARY KEY (tbl, row_id)
) WITHOUT ROWID;
CREATE TABLE sync_conflicts (
    id TEXT PRIMARY KEY NOT NULL,
    kind TEXT NOT NULL CHECK (kind IN ('value', 'delete', 'duplicate')),
    tbl TEXT NOT NULL,
    row_id TEXT NOT NULL,
    field TEXT NOT NULL,
    value TEXT,
    op_id TEXT,
    device_id TEXT,
    hlc INTEGER,
    open INTEGER NOT NULL
);
CREATE INDEX sync_conflicts_row ON sync_conflicts(tbl, row_id);
CREATE TABLE sync_cursors (
    name TEXT PRIMARY KEY NOT NULL,
    value INTEGER NOT NULL
);
CREATE TABLE sync_dirty (
    tbl TEXT NOT NULL,
    row_id TEXT NOT NULL,
    PRIMARY KEY (tbl, row_id)
) WITHOUT ROWID;
"""


@dataclass(frozen=True)
class Op:
    """Fields of one row set by one device at one clock reading.

    ``field`` is one field and ``value`` the JSON text of its stored value, or ``field`` is
    ``ROW`` (``"*"``) and ``value`` a JSON object of field -> value (a whole written row).
    ``seen`` is the row version (greatest ``hlc`` of its operations) the editor had in hand.
    """
    op_id: str
    device_id: str
    hlc: int
    tbl: str
    row_id: str
    field: str
    value: str | None
    seen: int
    #: field -> value as decoded when the operation was read and checked (not its identity)
    decoded: dict[str, Any] | None = _field(default=None, compare=False, repr=False)

    def to_json(self) -> dict[str, Any]:
        """The operation as a JSON object (for bundles and the hub).

        Example:
            >>> Op("o", "d", 5, "sites", "r", "name", '"A"', 0).to_json()["field"]
            'name'
        """
        return {"op_id": self.op_id, "device_id": self.device_id, "hlc": self.hlc,
                "tbl": self.tbl, "row_id": self.row_id, "field": self.field,
                "value": self.value, "seen": self.seen}

    def to_json_text(self) -> str:
        """``to_json()`` as compact JSON text, written without the general encoder (a sync
        writes every operation twice: device to hub, hub to device).

        Example:
            >>> json.loads(Op("o", "d", 5, "sites", "r", "name", '"A"', 0).to_json_text())["value"]
            '"A"'
        """
        e = _encode_ascii
        value = "null" if self.value is None else e(self.value)
        return (f'{{"op_id":{e(self.op_id)},"device_id":{e(self.device_id)},'
                f'"hlc":{int(self.hlc)},"tbl":{e(self.tbl)},"row_id":{e(self.row_id)},'
                f'"field":{e(self.field)},"value":{value},"seen":{int(self.seen)}}}')

    def fields(self) -> dict[str, str | None]:
        """Field -> JSON text of the value it sets (None: SQL NULL), for both shapes.

        Example:
            >>> Op("o", "d", 5, "sites", "r", "*", '{"name": "A", "owner_ref": null}', 0).fields()
            {'name': '"A"', 'owner_ref': None}
        """
        if self.field != ROW:
            return {self.field: self.value}
        return {k: _dump(v) for k, v in json.loads(self.value or "{}").items()}

    @staticmethod
    def from_json(obj: Any, where: str = "op") -> "Op":
        """Check and build an operation from a JSON object; raises InputError naming the field.

        Example:
            >>> Op.from_json({"op_id": "o", "device_id": "d", "hlc": 5, "tbl": "sites",
            ...               "row_id": "r", "field": "name", "value": '"A"', "seen": 0}).hlc
            5
        """
        fast = _fast_op(obj)
        if fast is not None:
            return fast
        if not isinstance(obj, dict):
            raise InputError(where, repr(obj)[:40], "an operation is a JSON object", None)
        out: dict[str, Any] = {}
        for k in ("op_id", "device_id", "tbl", "row_id", "field"):
            val = obj.get(k)
            if not isinstance(val, str) or not 0 < len(val) <= 200:
                raise InputError(f"{where}.{k}", repr(val)[:40], "expected a short text", None)
            out[k] = val
        for k in ("hlc", "seen"):
            val = obj.get(k)
            if isinstance(val, bool) or not isinstance(val, int) or not 0 <= val < 2 ** 62:
                raise InputError(f"{where}.{k}", repr(val)[:40], "expected a clock reading", None)
            out[k] = val
        val = obj.get("value")
        values = {out["field"]: None}
        if val is not None or out["field"] == ROW:
            if not isinstance(val, str) or len(val) > MAX_VALUE_CHARS:
                raise InputError(f"{where}.value", repr(val)[:40], "expected JSON text", None)
            try:
                decoded = json.loads(val)
            except ValueError:
                raise InputError(f"{where}.value", val[:40], "not valid JSON", None) from None
            if out["field"] == ROW:
                if not isinstance(decoded, dict) or not decoded:
                    raise InputError(f"{where}.value", val[:40], "a row's fields are a JSON "
                                     "object of field names and values", None)
                # checked by C-level passes (a sync checks every field of every row); the
                # loop below runs only to name what is wrong
                if not (_SCALARS.issuperset(map(type, decoded.values()))
                        and 0 < min(map(len, decoded)) and max(map(len, decoded)) <= 200):
                    for k, v in decoded.items():
                        if not 0 < len(k) <= 200 or not _scalar(v):
                            raise InputError(f"{where}.value.{k[:40]}", repr(v)[:40],
                                             "a field holds text or a number", None)
                values = decoded
            elif not _scalar(decoded):
                raise InputError(f"{where}.value", val[:40], "a field holds text or a number",
                                 None)
            else:
                values = {out["field"]: decoded}
        out["value"] = val
        return Op(**out, decoded=values)


def ops_from_json(objs: list[Any], where: str = "ops") -> list[Op]:
    """``Op.from_json`` of each item, named ``where[i]`` when one is refused.

    Example:
        >>> ops_from_json([Op("o", "d", 5, "sites", "r", "name", '"A"', 0).to_json()])[0].tbl
        'sites'
    """
    out = []
    for obj in objs:
        op = _fast_op(obj)
        out.append(op if op is not None else Op.from_json(obj, f"{where}[{len(out)}]"))
    return out


def _fast_op(obj: Any) -> Op | None:
    """A row operation built when every check passes at once (the usual case), else None:
    ``Op.from_json`` then checks it again step by step and names what is wrong."""
    if type(obj) is not dict:
        return None
    g = obj.get
    op_id, dev, tbl, rid, fld = g("op_id"), g("device_id"), g("tbl"), g("row_id"), g("field")
    hlc, seen, val = g("hlc"), g("seen"), g("value")
    if not (type(op_id) is str and type(dev) is str and type(tbl) is str and type(rid) is str
            and fld == ROW and type(val) is str and type(hlc) is int and type(seen) is int
            and 0 < len(op_id) <= 200 and 0 < len(dev) <= 200 and 0 < len(tbl) <= 200
            and 0 < len(rid) <= 200 and 0 <= hlc < _CLOCK_END and 0 <= seen < _CLOCK_END
            and len(val) <= MAX_VALUE_CHARS):
        return None
    try:
        decoded, end = _raw_decode(val)
    except ValueError:
        return None
    if end != len(val) or type(decoded) is not dict or not decoded or not (
            _SCALARS.issuperset(map(type, decoded.values()))
            and 0 < min(map(len, decoded)) and max(map(len, decoded)) <= 200):
        return None
    return Op(op_id, dev, hlc, tbl, rid, fld, val, seen, decoded)


_CLOCK_END = 2 ** 62
_raw_decode = json.JSONDecoder().raw_decode
_encode_ascii = json.encoder.encode_basestring_ascii  # type: ignore[attr-defined]

#: the kinds of value a field holds (bool: a JSON true or false, read as before)
_SCALARS = frozenset({type(None), str, int, float, bool})


def _scalar(v: Any) -> bool:
    return v is None or isinstance(v, (str, int, float))


def row_op(op_id: str, device_id: str, hlc: int, tbl: str, row_id: str,
           values: dict[str, Any], seen: int) -> Op:
    """One operation setting several fields of a row (``values``: field -> stored value).

    Example:
        >>> row_op("o", "d", 5, "sites", "r", {"name": "A"}, 0).fields()
        {'name': '"A"'}
    """
    return Op(op_id, device_id, hlc, tbl, row_id, ROW, _encode_row(values), seen)


# json.dumps(values, ensure_ascii=False, sort_keys=True) without making an encoder each call
_encode_row = json.JSONEncoder(ensure_ascii=False, sort_keys=True).encode


@dataclass(frozen=True)
class ApplyResult:
    """What applying a batch of operations did: ``new`` operations kept (repeats are skipped),
    ``rows`` rows written, ``pending`` rows waiting for operations not yet received;
    ``seqs``: the local sequence numbers the new operations took, first and last (they are
    numbered one after another in one statement), None when nothing was new."""
    new: int
    rows: int
    pending: int
    seqs: tuple[int, int] | None = None


@dataclass(frozen=True)
class Conflict:
    """A value that lost to a concurrent edit, a delete that lost to an edit, or a duplicate key.

    ``value`` is the other value (JSON text), ``kept`` the value the row shows now.
    """
    id: str
    kind: str
    tbl: str
    row_id: str
    field: str
    value: Any
    kept: Any
    device_id: str | None
    open: bool


# -- the clock -----------------------------------------------------------------------------
def wall_ms() -> int:
    """This device's clock in milliseconds since 1970 (UTC).

    Example:
        >>> wall_ms() > 1_700_000_000_000
        True
    """
    return time.time_ns() // 1_000_000


def hlc_ms(hlc: int) -> int:
    """The wall-clock part of a clock reading, in milliseconds.

    Example:
        >>> hlc_ms((1_700_000_000_000 << 16) + 3)
        1700000000000
    """
    return hlc >> _SHIFT


def hlc_iso(hlc: int) -> str:
    """A clock reading as a UTC timestamp like the store's others.

    Example:
        >>> hlc_iso(1_700_000_000_000 << 16)
        '2023-11-14T22:13:20.000000Z'
    """
    return datetime.fromtimestamp(hlc_ms(hlc) / 1000, timezone.utc).strftime(
        "%Y-%m-%dT%H:%M:%S.%fZ")


def _hlc_state(conn: sqlite3.Connection) -> int:
    row = conn.execute("SELECT value FROM meta WHERE key = 'sync_hlc'").fetchone()
    return int(row[0]) if row else 0


def _hlc_save(conn: sqlite3.Connection, value: int) -> None:
    conn.execute("INSERT INTO meta (key, value) VALUES ('sync_hlc', ?) "
                 "ON CONFLICT(key) DO UPDATE SET value = excluded.value", [str(value)])


def hlc_tick(conn: sqlite3.Connection) -> int:
    """The next clock reading on this device (later than every one it made or saw).

    Example:
        >>> a = hlc_tick(store.db.conn); b = hlc_tick(store.db.conn); b > a
        True
    """
    new = max(wall_ms() << _SHIFT, _hlc_state(conn) + 1)
    _hlc_save(conn, new)
    return new


# -- tables ----------------------------------------------------------------------------------
class Schema:
    """What the merge needs to know of the synced tables, read from SQLite itself."""

    def __init__(self, conn: sqlite3.Connection):
        names = [r[0] for r in conn.execute(
            "SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY rowid")]
        self.columns: dict[str, list[str]] = {}
        self.required: dict[str, set[str]] = {}
        self.fks: dict[str, list[tuple[str, str]]] = {}
        self.uniques: dict[str, list[tuple[str, tuple[str, ...], bool]]] = {}
        for t in names:
            if t.startswith(("sync_", "sqlite_", "_")) or t == "meta":
                continue
            info = conn.execute(f"PRAGMA table_info({t})").fetchall()
            cols = [r[1] for r in info]
            if not set(BOOK) <= set(cols):
                continue
            self.columns[t] = cols
            self.required[t] = {r[1] for r in info if r[3] and r[1] not in DERIVED}
            self.fks[t] = [(r[3], r[2]) for r in conn.execute(f"PRAGMA foreign_key_list({t})")]
            self.uniques[t] = self._uniques(conn, t, info)
        self.tables = self._ordered()
        # columns whose values are stored exactly as given when text (or null) is given
        self._text_cols = {t: frozenset(r[1] for r in conn.execute(f"PRAGMA table_info({t})")
                                        if (r[2] or "").upper() == "TEXT")
                           for t in self.columns}
        self._settable = {t: frozenset(c) - frozenset(DERIVED) for t, c in self.columns.items()}

    def as_given(self, tbl: str, names: list[str], rows: list[tuple]) -> bool:
        """True when rows inserted with these values read back the same: every field of the
        table named, of type TEXT, each value a text or null (no default, no conversion).

        Example:
            >>> Schema(store.db.conn).as_given("levels", ["id"], [("x",)])
            False
        """
        cols = self.columns[tbl]
        if len(names) != len(cols) or set(names) != set(cols) or \
                not self._text_cols[tbl].issuperset(names):
            return False
        # (the types gathered in C: a schedule's batch is 12,000 values)
        return set(map(type, chain.from_iterable(rows))) <= _TEXT_OR_NULL

    @staticmethod
    def _uniques(conn: sqlite3.Connection, t: str,
                 info: list[Any]) -> list[tuple[str, tuple[str, ...], bool]]:
        """(renameable text key, scope columns, partial on live rows) of each unique index."""
        types = {r[1]: (r[2] or "").upper() for r in info}
        out = []
        for idx in conn.execute(f"PRAGMA index_list({t})").fetchall():
            if not idx[2] or idx[3] == "pk":
                continue
            cols = [r[2] for r in conn.execute(f"PRAGMA index_info({idx[1]})")]
            keys = [c for c in cols if c and types.get(c) == "TEXT"
                    and not c.endswith("_id") and c not in ("id", "sha256")]
            if not keys or None in cols:
                continue
            sql = conn.execute("SELECT sql FROM sqlite_master WHERE name = ?", [idx[1]]).fetchone()
            live = bool(sql and sql[0] and "deleted_at IS NULL" in sql[0])
            out.append((keys[-1], tuple(c for c in cols if c != keys[-1]), live))
        return out

    def _ordered(self) -> list[str]:
        """Tables parents first (a row's references are written before it)."""
        done: list[str] = []
        todo = list(self.columns)
        while todo:
            for t in todo:
                if all(p == t or p in done or p not in self.columns for _, p in self.fks[t]):
                    done.append(t)
                    todo.remove(t)
                    break
            else:  # a cycle: keep the file's order for the rest
                done += todo
                break
        return done

    def check_all(self, ops: list[Op], where: str = "ops") -> dict[int, dict[str, Any]]:
        """``check`` of every operation (named ``where[i]`` when one is refused), by ``id(op)``.

        Example:
            >>> Schema(store.db.conn).check_all([])
            {}
        """
        settable = self._settable
        out = {}
        for i, op in enumerate(ops):
            d = op.decoded
            # the usual row operation, checked at once as in ``check``
            if d is not None and op.field == ROW and op.tbl not in _FILE_TABLES and \
                    op.tbl in settable and settable[op.tbl].issuperset(d):
                out[id(op)] = d
            else:
                out[id(op)] = self.check(op, f"{where}[{i}]")
        return out

    def check(self, op: Op, where: str = "op") -> dict[str, Any]:
        """Refuse an operation naming a table or field this store does not have; returns the
        values it sets (field -> stored value), decoded once for the merge.

        Example:
            >>> Schema(store.db.conn).check(Op("o", "d", 1, "sites", "r", "colour", None, 0))
            Traceback (most recent call last):
            fieldcol.errors.InputError: op.field: cannot use 'colour': sites has no such field (update fieldcol if the other device is newer)
        """
        if op.tbl not in self.columns:
            raise InputError(f"{where}.tbl", op.tbl, "not a synced table of this store",
                             "update fieldcol if the other device is newer")
        if op.decoded is not None and op.field == ROW and op.tbl not in _FILE_TABLES and \
                self._settable[op.tbl].issuperset(op.decoded):
            return op.decoded  # every field known, none naming a file: nothing more to check
        if op.decoded is not None:
            values = op.decoded
            at = f"{where}.value" if op.field == ROW else f"{where}.field"
        elif op.field == ROW:
            try:
                values = json.loads(op.value or "")
            except ValueError:
                values = None
            if not isinstance(values, dict):
                raise InputError(f"{where}.value", str(op.value)[:40], "a row's fields are a "
                                 "JSON object of field names and values", None)
            at = f"{where}.value"
        else:
            values = {op.field: None if op.value is None else _Raw(op.value)}
            at = f"{where}.field"
        cols = self.columns[op.tbl]
        for field, value in values.items():
            if field not in cols or field in DERIVED:
                raise InputError(at, field, f"{op.tbl} has no such field",
                                 "update fieldcol if the other device is newer")
            if isinstance(value, _Raw):
                try:
                    value = values[field] = json.loads(value)
                except ValueError:
                    raise InputError(f"{where}.value", value[:40], "not valid JSON",
                                     None) from None
            if (op.tbl, field) in _FILE_FIELDS and value is not None:
                # a row naming a file: only our own content-addressed layout, never a path out
                if not isinstance(value, str) or not _FILE_FIELDS[(op.tbl, field)].fullmatch(value):
                    raise InputError(f"{where}.value", str(value)[:80],
                                     "not a photo file name of this store", None)
        return values


class _Raw(str):
    """JSON text still to be decoded (an operation of one field)."""


def install(conn: sqlite3.Connection, device_id: str | None) -> None:
    """Create the triggers that note written rows, and log rows that have no operations yet.

    Run after every schema step (new tables and columns are picked up); rows with no
    operations become operations of the device that last wrote them, at that time.
    """
    schema = Schema(conn)
    # every merge asks for the rows still waiting (almost always none): without this it read
    # every row's note, a pass over the whole store for each batch
    conn.execute("CREATE INDEX IF NOT EXISTS sync_rows_pending ON sync_rows(tbl, row_id) "
                 "WHERE pending = 1")
    for key in sorted({u[0] for t in schema.tables for u in schema.uniques[t]}):
        # the claims to a unique key are looked up by value: index only those fields' values
        conn.execute(f"CREATE INDEX IF NOT EXISTS {_key_index(key)} ON sync_fields(tbl, value) "
                     f"WHERE field = '{key}'")
    for t in schema.tables:
        for when in ("INSERT", "UPDATE"):
            conn.execute(
                f"CREATE TRIGGER IF NOT EXISTS sync_note_{t}_{when.lower()} AFTER {when} ON {t} "
                f"WHEN NOT EXISTS (SELECT 1 FROM meta WHERE key = '{QUIET}') "
                f"BEGIN INSERT INTO sync_dirty (tbl, row_id) SELECT '{t}', NEW.id WHERE NOT EXISTS "
                f"(SELECT 1 FROM sync_dirty WHERE tbl = '{t}' AND row_id = NEW.id); END")
        # (not INSERT OR IGNORE: an upsert's conflict rule would override the trigger's)
        conn.execute(f"INSERT OR IGNORE INTO sync_dirty (tbl, row_id) SELECT '{t}', id FROM {t} "
                     f"WHERE id NOT IN (SELECT row_id FROM sync_rows WHERE tbl = '{t}')")
    flush(conn, device_id or "", schema, backfill=True)


def _key_index(key: str) -> str:
    return f"sync_fields_key_{key}"


# -- capture ---------------------------------------------------------------------------------
def _dump(value: Any) -> str | None:
    """The JSON text of a stored value, as ``json.dumps(value, ensure_ascii=False)`` writes it
    (the common kinds without its general machinery: a merge writes hundreds of thousands)."""
    if value is None:
        return None
    kind = type(value)
    if kind is str:
        return _encode_text(value)
    if kind is int:
        return int.__repr__(value)
    if kind is float and math.isfinite(value):
        return float.__repr__(value)
    return json.dumps(value, ensure_ascii=False)


def _iso_ms(text: Any) -> int:
    try:
        return int(datetime.fromisoformat(str(text).replace("Z", "+00:00")).timestamp() * 1000)
    except ValueError:
        return 0


def _chunks(items: list[Any], n: int = 500) -> Iterable[list[Any]]:
    for i in range(0, len(items), n):
        yield items[i:i + n]


def _marks(part: list[Any]) -> str:
    return ", ".join("?" for _ in part)


def _explode(conn: sqlite3.Connection, tbl: str, ids: list[str]) -> None:
    """Spell out, a field a row, the winners of rows kept compact (see ``_compact_rows``)
    before anything reads or writes their fields one by one."""
    for part in _chunks(ids):
        got = conn.execute(f"SELECT f.row_id, f.hlc, f.op_id, o.value FROM sync_fields f "
                           f"JOIN sync_ops o ON o.op_id = f.op_id WHERE f.tbl = ? AND "
                           f"f.field = '{ROW}' AND f.row_id IN ({_marks(part)})",
                           [tbl, *part]).fetchall()
        if not got:
            continue
        rows = []
        for rid, hlc, op_id, value in got:
            for f, v in json.loads(value).items():
                j = _dump(v)
                rows.append((tbl, rid, f, hlc, op_id, j, j))
        # a key field is spelt out already (its shown value may carry a suffix): it stays
        conn.executemany("INSERT OR IGNORE INTO sync_fields (tbl, row_id, field, hlc, op_id, "
                         "value, mat) VALUES (?, ?, ?, ?, ?, ?, ?)", rows)
        conn.executemany(f"DELETE FROM sync_fields WHERE tbl = ? AND row_id = ? AND "
                         f"field = '{ROW}'", [(tbl, r[0]) for r in got])


def _compact_rows(schema: Schema, tbl: str, row_id: str, op: Op,
                  raw: dict[str, str | None]) -> list[tuple]:
    """The ``sync_fields`` rows of a row that one row operation wrote whole.

    Why: a row written once and never edited (most of a site) would otherwise keep a winner
    per field, ten rows for each reading, which was most of a sync's cost. Its winners are
    that operation for every field it carries, shown as sent, so one row (field ``"*"``, no
    value: the operation in ``sync_ops`` holds them) stands for them all; only its unique key
    fields are spelt out, for the claims index. ``_explode`` spells out the rest before the
    row is edited or merged again. ``raw``: the JSON text of (at least) its key fields."""
    out = [(tbl, row_id, ROW, op.hlc, op.op_id, None, None)]
    for key, _scope, _live in schema.uniques[tbl]:
        if key in raw:
            out.append((tbl, row_id, key, op.hlc, op.op_id, raw[key], raw[key]))
    return out


def flush(conn: sqlite3.Connection, device_id: str, schema: Schema, *,
          backfill: bool = False) -> int:
    """Turn the rows noted as written into operations (one per row, carrying the fields that
    changed); returns how many fields changed.

    Called inside the writing transaction, so a change and its operations commit together.
    Rows are read, and their operations written, 500 at a time a table at a time: a bulk
    write of 100,000 rows costs a few statements per 500 rows and the memory of 500.
    With ``backfill`` rows keep the device and time of their last write (first logging).
    """
    if conn.execute("SELECT 1 FROM sync_dirty LIMIT 1").fetchone() is None:
        return 0
    hlc = hlc_tick(conn)
    settle: dict[tuple, None] = {}
    count = 0
    for tbl in schema.tables:
        after = ""
        while True:
            part = [r[0] for r in conn.execute(
                "SELECT row_id FROM sync_dirty WHERE tbl = ? AND row_id > ? ORDER BY row_id "
                "LIMIT 500", [tbl, after])]
            if not part:
                break
            after = part[-1]
            count += _flush_part(conn, device_id, schema, tbl, part, hlc, backfill, settle)
    for args in settle:  # in the order first noted
        _settle_key(conn, *args)
    conn.execute("DELETE FROM sync_dirty")
    return count


def _flush_part(conn: sqlite3.Connection, device_id: str, schema: Schema, tbl: str,
                part: list[str], hlc: int, backfill: bool, settle: dict[tuple, None]) -> int:
    """The operations of up to 500 written rows of one table, written at once; the unique
    key values they touch that need more than ``_settle_plain`` are added to ``settle``.
    Returns how many fields changed."""
    touched: dict[tuple, None] = {}
    ops: list[Op] = []
    fields_rows: list[tuple] = []
    new_rows: list[tuple] = []
    n_fields = 0
    rows_rows: list[tuple] = []
    cur = conn.execute(f"SELECT * FROM {tbl} WHERE id IN ({_marks(part)})", part)
    names = [d[0] for d in cur.description]
    now_rows = {}
    for r in cur:
        row = dict(zip(names, r))
        now_rows[row["id"]] = row
    _explode(conn, tbl, part)
    known: dict[str, dict[str, tuple]] = {}
    for rid, f, mat, value in conn.execute(
            f"SELECT row_id, field, mat, value FROM sync_fields WHERE tbl = ? AND row_id "
            f"IN ({_marks(part)})", [tbl, *part]):
        known.setdefault(rid, {})[f] = (mat, value)
    seen_of = dict(conn.execute(f"SELECT row_id, max_hlc FROM sync_rows WHERE tbl = ? "
                                f"AND row_id IN ({_marks(part)})", [tbl, *part]).fetchall())
    for row_id in part:
        now = now_rows.get(row_id)
        if now is None:
            continue
        have = known.get(row_id, {})
        seen = seen_of.get(row_id, 0)
        at, dev = hlc, device_id
        if backfill:
            at = max(_iso_ms(now.get("updated_at")) << _SHIFT, seen + 1)
            dev = now.get("device_id") or device_id
        changed: dict[str, Any] = {}
        texts: dict[str, str | None] = {}
        for k, val in now.items():
            if k in DERIVED:
                continue
            j = _dump(val)
            if have.get(k, (None,))[0] != j:
                changed[k] = val
                texts[k] = j
        if not changed:
            continue
        n_fields += len(texts)
        op = row_op(new_id(), dev, at, tbl, row_id, changed, seen)
        ops.append(op)
        if have:
            fields_rows += [(tbl, row_id, k, at, op.op_id, j, j) for k, j in texts.items()]
        else:  # a row first written: its one operation is every field's winner
            new_rows += _compact_rows(schema, tbl, row_id, op, texts)
        rows_rows.append((tbl, row_id, at))
        for key, scope, live in schema.uniques[tbl]:
            if set(changed) & {key, "deleted_at", *scope}:
                for raw in {have.get(key, (None, None))[1], _dump(now.get(key))}:
                    if raw is not None:
                        touched[(tbl, key, scope, live, raw)] = None
    _write_logged(conn, [(o.op_id, o.device_id, o.hlc, o.tbl, o.row_id, o.field, o.value,
                          o.seen, "local") for o in ops], fields_rows, new_rows, rows_rows)
    # a row's conflicts depend on its own operations only, all written just above
    _recheck_conflicts(conn, [(o.tbl, o.row_id) for o in ops])
    for args in _settle_plain(conn, touched):
        settle[args] = None
    return n_fields


def _write_logged(conn: sqlite3.Connection, op_rows: list[tuple], fields_rows: list[tuple],
                  new_rows: list[tuple], rows_rows: list[tuple]) -> None:
    """Write local operations (``op_rows``: ``sync_ops`` rows, ids made here just now) with
    their winners (``fields_rows`` over known ones, ``new_rows`` of rows first written) and
    their rows' versions."""
    conn.executemany(
        "INSERT INTO sync_ops (op_id, device_id, hlc, tbl, row_id, field, value, seen, source) "
        "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)", op_rows)
    if fields_rows:
        conn.executemany(
            "INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id, value, mat) "
            "VALUES (?, ?, ?, ?, ?, ?, ?) ON CONFLICT(tbl, row_id, field) DO UPDATE SET "
            "hlc = excluded.hlc, op_id = excluded.op_id, value = excluded.value, "
            "mat = excluded.mat", fields_rows)
    new_rows.sort(key=lambda r: (r[0], r[1], r[2]))  # B-tree inserts in key order
    conn.executemany("INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id, value, mat) "
                     "VALUES (?, ?, ?, ?, ?, ?, ?)", new_rows)
    conn.executemany("INSERT INTO sync_rows (tbl, row_id, max_hlc) VALUES (?, ?, ?) "
                     "ON CONFLICT(tbl, row_id) DO UPDATE SET max_hlc = max(max_hlc, "
                     "excluded.max_hlc)", rows_rows)


@contextmanager
def unnoted_inserts(conn: sqlite3.Connection, tbl: str) -> Iterator[None]:
    """Inside a transaction: rows inserted into ``tbl`` while the block runs are not noted
    for ``flush``; the caller logs them (``log_new_rows``). The table's insert trigger is
    dropped for the block and made again from its own text as it ends (both in the
    transaction: a rollback keeps it as it was, and no other connection sees it missing).

    Why: even when it only checks ``QUIET``, a trigger costs more per row than the insert
    of a schedule's column itself.

    Example:
        >>> with store.transaction(), unnoted_inserts(store.db.conn, "levels"):
        ...     pass
    """
    if not conn.in_transaction:
        raise RuntimeError("unnoted_inserts needs the writing transaction")
    name = f"sync_note_{tbl}_insert"
    row = conn.execute("SELECT sql FROM sqlite_master WHERE type = 'trigger' AND name = ?",
                       [name]).fetchone()
    if row is None:
        yield
        return
    conn.execute(f"DROP TRIGGER {name}")
    try:
        yield
    finally:
        conn.execute(row[0])


def log_new_rows(conn: sqlite3.Connection, device_id: str, schema: Schema, tbl: str,
                 names: list[str], rows: list[tuple]) -> int:
    """Log rows just inserted (``names``: their columns, the id first) under ids never used
    before, written unnoted (``unnoted_inserts``): the operations ``flush``
    would make of them (one a row, its non-null fields; winners kept compact), without
    noting each row, reading it back and looking up what is known of it (nothing, for a new
    id). Call inside the writing transaction; returns how many fields were logged.

    Why: a schedule's new columns are a hundred thousand rows of one table; the note a
    trigger writes per row and the lookups per row cost as much as the rows themselves.

    Example:
        >>> log_new_rows(store.db.conn, store.device_id, Schema(store.db.conn), "columns",
        ...              ["id"], [])
        0
    """
    if not rows:
        return 0
    if not schema.as_given(tbl, names, rows):  # stored otherwise than given: read them back
        cur = conn.execute(f"SELECT * FROM {tbl} WHERE id IN ({_marks(rows)})",
                           [r[0] for r in rows])
        names = [d[0] for d in cur.description]
        rows = cur.fetchall()
    hlc = hlc_tick(conn)
    at_id = names.index("id")
    # row_op's text written straight (every value is a text here, as_given): its fields in
    # sorted order, each key's text made once
    order = [(i, f"{_encode_text(k)}: ") for k, i in sorted(
        (k, i) for i, k in enumerate(names) if k not in DERIVED)]
    keys = [(names.index(key), key, scope, live) for key, scope, live in schema.uniques[tbl]
            if key in names]
    settle: dict[tuple, None] = {}
    count = 0
    for part in _chunks(rows):
        op_rows, new_rows, touched = [], [], {}
        for r, op_id in zip(part, new_ids(len(part))):
            row_id = r[at_id]
            fields = [k + _encode_text(r[i]) for i, k in order if r[i] is not None]
            count += len(fields)
            op_rows.append((op_id, device_id, hlc, tbl, row_id, ROW,
                            "{" + ", ".join(fields) + "}", 0, "local"))
            # its winners kept compact (as _compact_rows writes them), its keys spelt out
            new_rows.append((tbl, row_id, ROW, hlc, op_id, None, None))
            for i, key, scope, live in keys:
                if r[i] is not None:
                    raw = _encode_text(r[i])
                    new_rows.append((tbl, row_id, key, hlc, op_id, raw, raw))
                    touched[(tbl, key, scope, live, raw)] = None
        _write_new_logged(conn, op_rows, new_rows)
        for args in _settle_plain(conn, touched, fresh=True):
            settle[args] = None
    for args in settle:
        _settle_key(conn, *args)
    return count


def _write_new_logged(conn: sqlite3.Connection, op_rows: list[tuple],
                      new_rows: list[tuple]) -> None:
    """Write the row operations of rows first written (``op_rows``: ``sync_ops`` rows, one a
    row, ids made here just now) with their winners (``new_rows``, kept compact:
    ``_compact_rows``) and their rows' versions.

    Why: a row's version repeats what its operation holds; SQLite copies it from the
    operations just written (``seq`` above the largest before: AUTOINCREMENT never gives a
    smaller one) instead of taking it from Python a value at a time. (The winners stay in
    Python: their two rows a column go in together in key order; copied apart, the second
    would split every page the first filled.)"""
    before = conn.execute("SELECT max(seq) FROM sync_ops").fetchone()[0] or 0
    conn.executemany(
        "INSERT INTO sync_ops (op_id, device_id, hlc, tbl, row_id, field, value, seen, source) "
        "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)", op_rows)
    new_rows.sort(key=lambda r: (r[0], r[1], r[2]))  # B-tree inserts in key order
    conn.executemany("INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id, value, mat) "
                     "VALUES (?, ?, ?, ?, ?, ?, ?)", new_rows)
    # (in the order written: the rows' ids, made in order, sort the same way)
    conn.execute("INSERT INTO sync_rows (tbl, row_id, max_hlc) SELECT tbl, row_id, hlc "
                 "FROM sync_ops WHERE seq > ? ORDER BY seq ON CONFLICT(tbl, row_id) "
                 "DO UPDATE SET max_hlc = max(max_hlc, excluded.max_hlc)", [before])


def _settle_plain(conn: sqlite3.Connection, touched: dict[tuple, None], *,
                  fresh: bool = False) -> list[tuple]:
    """Settle at once the unique key values with one claim, held by a row that shows it
    already (no other row can show it: the table's unique index holds); returns the others,
    for ``_settle_key``. Found with a few statements per 500 values, not several per row.
    ``fresh``: the values were claimed just now by new rows showing them as claimed (with
    their winners' shown value written as claimed, and no conflicts): one claim is settled.

    A value settled here whose claims change later in the same flush (a row further on that
    takes or leaves it) is noted again there, and settled then with every claim it has."""
    by_key: dict[tuple, list[str]] = {}
    for tbl, key, scope, live, raw in touched:
        by_key.setdefault((tbl, key, scope, live), []).append(raw)
    plain: set[tuple] = set()
    for (tbl, key, scope, live), raws in by_key.items():
        claims: dict[str, list[str]] = {}
        for raw, row_id in conn.execute(
                f"SELECT value, row_id FROM sync_fields INDEXED BY {_key_index(key)} "
                f"WHERE tbl = ? AND field = '{key}' AND value IN ({_marks(raws)})",
                [tbl, *raws]):
            claims.setdefault(raw, []).append(row_id)
        single = {c[0]: raw for raw, c in claims.items() if len(c) == 1}
        if fresh:
            plain.update((tbl, key, scope, live, raw) for raw in single.values())
            continue
        if not single:
            continue
        ids = list(single)
        shows = dict(conn.execute(f"SELECT id, {key} FROM {tbl} WHERE id IN ({_marks(ids)})",
                                  ids).fetchall())
        done = [(row_id, raw) for row_id, raw in single.items()
                if row_id in shows and _dump(shows[row_id]) == raw
                and _dump(json.loads(raw)) == raw]
        conn.executemany("UPDATE sync_fields SET mat = ? WHERE tbl = ? AND row_id = ? AND "
                         f"field = '{key}' AND mat IS NOT ?",
                         [(raw, tbl, row_id, raw) for row_id, raw in done])
        conn.executemany("DELETE FROM sync_conflicts WHERE id = ?",
                         [(f"duplicate:{tbl}:{row_id}:{key}",) for row_id, _ in done])
        plain.update((tbl, key, scope, live, raw) for _, raw in done)
    return [args for args in touched if args not in plain]


def _recheck_conflicts(conn: sqlite3.Connection, keys: list[tuple[str, str]]) -> None:
    """Work out again the conflicts of edited rows that had some: an edit made having seen
    both values settles them here exactly as on a replica that receives it later."""
    for tbl, ids in _by_table(keys).items():
        for part in _chunks(ids):
            had = [r[0] for r in conn.execute(
                f"SELECT DISTINCT row_id FROM sync_conflicts WHERE tbl = ? AND kind != "
                f"'duplicate' AND row_id IN ({_marks(part)})", [tbl, *part])]
            for row_id in had:
                ops = [e for r in conn.execute(
                    "SELECT op_id, device_id, hlc, tbl, row_id, field, value, seen FROM sync_ops "
                    "WHERE tbl = ? AND row_id = ?", [tbl, row_id]) for e in _entries(Op(*r))]
                conn.execute("DELETE FROM sync_conflicts WHERE tbl = ? AND row_id = ? "
                             "AND kind != 'duplicate'", [tbl, row_id])
                _insert_conflicts(conn, [(c[0], c[1], tbl, row_id, c[2], c[3], c[4], c[5], c[6],
                                          c[7]) for c in _resolve(ops)[2]])


def held_op_ids(conn: sqlite3.Connection, op_ids: list[str]) -> set[str]:
    """Which of these operation ids ``sync_ops`` holds.

    Example:
        >>> held_op_ids(store.db.conn, ["no-such"])
        set()
    """
    held: set[str] = set()
    for part in _chunks(op_ids):
        held.update(r[0] for r in conn.execute(
            f"SELECT op_id FROM sync_ops WHERE op_id IN ({_marks(part)})", part))
    return held


def _store_ops(conn: sqlite3.Connection, ops: list[Op], source: str, *,
               all_new: bool = False) -> list[Op]:
    """Insert operations, skipping ids already held (or repeated); returns those that were new.
    ``all_new``: ids made here just now (nothing to look up)."""
    held = set() if all_new else held_op_ids(conn, list({o.op_id for o in ops}))
    new = []
    for o in ops:
        if o.op_id not in held:
            held.add(o.op_id)
            new.append(o)
    conn.executemany(
        "INSERT INTO sync_ops (op_id, device_id, hlc, tbl, row_id, field, value, seen, source) "
        "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)",
        [(o.op_id, o.device_id, o.hlc, o.tbl, o.row_id, o.field, o.value, o.seen, source)
         for o in new])
    return new


# -- merge -----------------------------------------------------------------------------------
#: one field as one operation set it:
#: (hlc, op_id, JSON text, seen, device_id, field, from a row operation, the value itself)
Entry = tuple


def _entries(op: Op, values: dict[str, Any] | None = None) -> list[Entry]:
    """The fields an operation sets (``values``: as ``Schema.check`` decoded them)."""
    if op.field != ROW:
        v = values[op.field] if values else json.loads(op.value) if op.value is not None else None
        return [(op.hlc, op.op_id, op.value, op.seen, op.device_id, op.field, False, v)]
    h, i, s, d = op.hlc, op.op_id, op.seen, op.device_id
    if values is None:
        values = json.loads(op.value or "{}")
    return [(h, i, _dump(v), s, d, f, True, v) for f, v in values.items()]


def apply(conn: sqlite3.Connection, ops: Iterable[Op], schema: Schema, *, source: str,
          max_future_ms: int | None = FUTURE_TOLERANCE_MS) -> ApplyResult:
    """Merge operations from elsewhere into this store (call inside one transaction).

    Repeats are skipped by operation id, so applying the same batch twice changes nothing.
    Rows first seen in the batch (a new device's whole site) are merged in bulk, a table at a
    time; rows already held, and any new row whose key or parent needs a closer look, one by one.

    Args:
        conn: the store's connection, inside a transaction.
        ops: the operations, in any order.
        schema: ``Schema(conn)``.
        source: where they came from (``"hub"``, ``"bundle"``, ``"push"``, ``"local"``).
        max_future_ms: refuse operations stamped further ahead of this clock (None: accept).

    Returns:
        An ``ApplyResult``.

    Example:
        >>> r = apply(store.db.conn, [], Schema(store.db.conn), source="bundle"); r.new
        0
    """
    ops = list(ops)
    decoded = schema.check_all(ops)
    if ops and max_future_ms is not None:
        latest = max(ops, key=lambda o: o.hlc)
        if hlc_ms(latest.hlc) > wall_ms() + max_future_ms:
            raise InputError("clock", hlc_iso(latest.hlc),
                             f"an operation from device {latest.device_id} is stamped ahead of "
                             "this clock", "check the clock of that device, then sync again")
    flush(conn, _local_device(conn), schema)  # local edits first: what follows is not ours
    conn.execute("INSERT OR IGNORE INTO meta (key, value) VALUES (?, '1')", [QUIET])
    try:
        with gc_paused():
            return _merge(conn, ops, decoded, schema, source)
    finally:
        conn.execute("DELETE FROM meta WHERE key = ?", [QUIET])


def _merge(conn: sqlite3.Connection, ops: list[Op], decoded: dict[int, dict[str, Any]],
           schema: Schema, source: str) -> ApplyResult:
    """``apply`` once local edits are logged, with the triggers standing still."""
    new = _store_ops(conn, ops, source)
    seqs = None
    if new:
        _hlc_save(conn, max(_hlc_state(conn), max(o.hlc for o in new)))
        seqs = _seq_span(conn, new)
    by_ops: dict[tuple[str, str], list[tuple[Op, dict[str, Any]]]] = {}
    for o in new:
        by_ops.setdefault((o.tbl, o.row_id), []).append((o, decoded[id(o)]))
    known = _known_rows(conn, list(by_ops))

    def entries(key: tuple[str, str]) -> list[Entry]:
        return [e for o, values in by_ops[key] for e in _entries(o, values)]

    by_row = {k: entries(k) for k in by_ops if k in known}
    for t, ids in _by_table(by_row).items():
        _explode(conn, t, ids)
    current = _current_fields(conn, list(by_row))
    old_raw: dict[tuple[str, str, str], str | None] = {}
    unique_fields = {(t, u[0]) for t in schema.uniques for u in schema.uniques[t]}
    fields_rows = []
    seq_of = {id(o): seqs[0] + i for i, o in enumerate(new)} if seqs else {}
    # a row first seen here, by one logged operation: SQLite notes it from the log itself
    first_seen = []
    rows_rows = []
    for key, lst in by_ops.items():
        seq = seq_of.get(id(lst[0][0])) if len(lst) == 1 and key not in known else None
        if seq is None:
            rows_rows.append((*key, max(o.hlc for o, _ in lst)))
        else:
            first_seen.append(seq)
    for (tbl, row_id), lst in by_row.items():  # rows held already; new ones are written whole
        best: dict[str, Entry] = {}
        for e in lst:
            b = best.get(e[5])
            if b is None or e[:2] > b[:2]:
                best[e[5]] = e
        cur = current.get((tbl, row_id), {})
        for f, e in best.items():
            c = cur.get(f)
            if c is None or e[:2] > c[:2]:
                if (tbl, f) in unique_fields and c is not None:
                    old_raw[(tbl, row_id, f)] = c[2]
                fields_rows.append((tbl, row_id, f, e[0], e[1], e[2]))
    conn.executemany(
        "INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id, value, mat) "
        "VALUES (?, ?, ?, ?, ?, ?, NULL) ON CONFLICT(tbl, row_id, field) DO UPDATE SET "
        "hlc = excluded.hlc, op_id = excluded.op_id, value = excluded.value", fields_rows)
    conn.executemany(
        "INSERT INTO sync_rows (tbl, row_id, max_hlc) VALUES (?, ?, ?) "
        "ON CONFLICT(tbl, row_id) DO UPDATE SET max_hlc = max(max_hlc, excluded.max_hlc)",
        rows_rows)
    if first_seen:
        conn.execute("INSERT INTO sync_rows (tbl, row_id, max_hlc) SELECT o.tbl, o.row_id, "
                     "o.hlc FROM json_each(?) AS k CROSS JOIN sync_ops AS o ON o.seq = k.value "
                     "ORDER BY o.tbl, o.row_id", [json.dumps(first_seen)])
    fresh = {k: lst for k, lst in by_ops.items() if k not in known}
    from fieldcol.store._opbulk import write_fresh  # (it builds on this module)

    written, slow = write_fresh(conn, schema, fresh, entries, seq_of)
    touched = dict.fromkeys(slow)
    touched.update(dict.fromkeys(by_row))
    for r in conn.execute("SELECT tbl, row_id FROM sync_rows WHERE pending = 1").fetchall():
        touched[(r[0], r[1])] = None
    written += _materialize(conn, schema, list(touched), old_raw,
                            {k: entries(k) for k in slow})
    conn.execute("DELETE FROM sync_dirty")  # rows written here are the merge's, not edits
    pending = conn.execute("SELECT count(*) FROM sync_rows WHERE pending = 1").fetchone()[0]
    return ApplyResult(len(new), written, pending, seqs)


def _seq_span(conn: sqlite3.Connection, new: list[Op]) -> tuple[int, int] | None:
    """The first and last local sequence numbers of operations just stored by one statement;
    None unless they run one after another with nothing else between them."""
    first, last = (conn.execute("SELECT seq FROM sync_ops WHERE op_id = ?", [o.op_id]).fetchone()
                   for o in (new[0], new[-1]))
    if first is None or last is None or last[0] - first[0] + 1 != len(new):
        return None
    return first[0], last[0]


def _local_device(conn: sqlite3.Connection) -> str:
    row = conn.execute("SELECT value FROM meta WHERE key = 'device_id'").fetchone()
    return row[0] if row else ""


def _by_table(keys: Iterable[tuple[str, str]]) -> dict[str, list[str]]:
    out: dict[str, list[str]] = {}
    for t, r in keys:
        out.setdefault(t, []).append(r)
    return out


def _known_rows(conn: sqlite3.Connection, keys: list[tuple[str, str]]) -> set[tuple[str, str]]:
    """Which of these rows already had operations here."""
    out: set[tuple[str, str]] = set()
    for t, ids in _by_table(keys).items():
        for part in _chunks(ids):
            out.update((t, r[0]) for r in conn.execute(
                f"SELECT row_id FROM sync_rows WHERE tbl = ? AND row_id IN ({_marks(part)})",
                [t, *part]))
    return out


def _current_fields(conn: sqlite3.Connection, keys: list[tuple[str, str]]
                    ) -> dict[tuple[str, str], dict[str, tuple]]:
    """The winning (hlc, op_id, value) of every field of these rows."""
    out: dict[tuple[str, str], dict[str, tuple]] = {}
    for t, ids in _by_table(keys).items():
        for part in _chunks(ids):
            for rid, f, hlc, op_id, value in conn.execute(
                    f"SELECT row_id, field, hlc, op_id, value FROM sync_fields WHERE tbl = ? "
                    f"AND row_id IN ({_marks(part)})", [t, *part]):
                out.setdefault((t, rid), {})[f] = (hlc, op_id, value)
    return out


def _resolve(entries: list[Entry]) -> tuple[dict[str, Entry], str | None, list[tuple]]:
    """A row's winners per field, the delete it shows (JSON text or None) and its conflicts.

    A pure function of the row's operations: every replica derives the same. Fields set by one
    operation together were seen together: they never conflict with each other.
    """
    if all(e[1] == entries[0][1] for e in entries):  # one operation (a row first written)
        win = {e[5]: e for e in entries}
        d = win.get("deleted_at")
        return win, (d[2] if d else None), []
    by_field: dict[str, list[Entry]] = {}
    for e in entries:
        by_field.setdefault(e[5], []).append(e)
    for lst in by_field.values():
        lst.sort()
    win = {f: lst[-1] for f, lst in by_field.items()}
    conflicts: list[tuple] = []
    # same field, neither editor saw the other: the loser's value is kept for review
    for f, lst in by_field.items():
        if f in UNFLAGGED or len(lst) < 2:
            continue
        w = lst[-1]
        for i, x in enumerate(lst[:-1]):
            for y in lst[i + 1:]:
                if y[3] < x[0] and y[2] != x[2]:
                    cid = f"value:{x[1]}:{f}" if x[6] else f"value:{x[1]}"
                    conflicts.append((cid, "value", f, x[2], x[1], x[4], x[0], int(w[3] < x[0])))
                    break
    deleted = win["deleted_at"][2] if "deleted_at" in win else None
    if deleted is not None:
        d = win["deleted_at"]
        edits = [e for f, lst in by_field.items() if f not in ("deleted_at", *UNFLAGGED)
                 for e in lst]
        racing = any(_concurrent(e, d) for e in edits if e[1] != d[1])
        if racing:
            deleted = None
        conflicts += [(f"delete:{x[1]}", "delete", "deleted_at", x[2], x[1], x[4], x[0],
                       int(racing and x is d))
                      for x in by_field["deleted_at"] if x[2] is not None
                      and any(_concurrent(e, x) for e in edits if e[1] != x[1])]
    return win, deleted, conflicts


def _row_values(schema: Schema, tbl: str, row_id: str, win: dict[str, Entry],
                deleted: str | None) -> dict[str, Any] | None:
    """The row to write, or None while a required field has no value yet."""
    vals = {f: e[7] for f, e in win.items()}
    vals["deleted_at"] = json.loads(deleted) if deleted is not None else None
    if any(vals.get(c) is None for c in schema.required[tbl]):
        return None
    row = {c: vals.get(c) for c in schema.columns[tbl] if c not in DERIVED}
    row["id"] = row_id
    return row


def _insert_conflicts(conn: sqlite3.Connection, rows: list[tuple]) -> None:
    conn.executemany(
        "INSERT INTO sync_conflicts (id, kind, tbl, row_id, field, value, op_id, device_id, hlc, "
        "open) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)", rows)


def _materialize(conn: sqlite3.Connection, schema: Schema, rows: list[tuple[str, str]],
                 old_raw: dict[tuple[str, str, str], str | None],
                 preloaded: dict[tuple[str, str], list[Entry]] | None = None) -> int:
    rank = {t: i for i, t in enumerate(schema.tables)}
    todo = sorted(rows, key=lambda r: (rank.get(r[0], 99), r[1]))
    written = 0
    while todo:
        left = []
        for tbl, row_id in todo:
            if _write_row(conn, schema, tbl, row_id, old_raw,
                          (preloaded or {}).get((tbl, row_id))):
                written += 1
            else:
                left.append((tbl, row_id))
        if len(left) == len(todo):
            break
        todo = left
    conn.executemany("UPDATE sync_rows SET pending = 1 WHERE tbl = ? AND row_id = ?", todo)
    return written


def _concurrent(a: tuple, b: tuple) -> bool:
    """Neither editor had seen the other's operation (a, b: (hlc, op_id, value, seen, ...))."""
    return a[3] < b[0] and b[3] < a[0]


def _write_row(conn: sqlite3.Connection, schema: Schema, tbl: str, row_id: str,
               old_raw: dict[tuple[str, str, str], str | None],
               ops: list[Entry] | None = None) -> bool:
    """Write one row as its operations say; False when it must wait (parent or field missing,
    or a value this schema refuses: its operations stay and it is tried again on every apply)."""
    conn.execute("SAVEPOINT sync_row")
    try:
        ok = _write_row_inner(conn, schema, tbl, row_id, old_raw, ops)
    except sqlite3.IntegrityError:
        ok = False
    if not ok:
        conn.execute("ROLLBACK TO sync_row")
    conn.execute("RELEASE sync_row")
    return ok


def _write_row_inner(conn: sqlite3.Connection, schema: Schema, tbl: str, row_id: str,
                     old_raw: dict[tuple[str, str, str], str | None],
                     ops: list[Entry] | None) -> bool:
    fresh = ops is not None
    if ops is None:
        ops = []
        for r in conn.execute("SELECT op_id, device_id, hlc, tbl, row_id, field, value, seen "
                              "FROM sync_ops WHERE tbl = ? AND row_id = ?", [tbl, row_id]):
            ops += _entries(Op(*r))
    win, deleted, conflicts = _resolve(ops)
    row = _row_values(schema, tbl, row_id, win, deleted)
    if row is None:
        return False
    for col, parent in schema.fks[tbl]:
        ref = row.get(col)
        if ref is not None and parent in schema.columns and (parent, ref) != (tbl, row_id) and \
                conn.execute(f"SELECT 1 FROM {parent} WHERE id = ?", [ref]).fetchone() is None:
            return False
    raw = {f: e[2] for f, e in win.items()}
    mats = {f: _dump(row.get(f)) for f in raw}
    dup_groups = []
    for key, scope, live in schema.uniques[tbl]:
        groups = {raw.get(key)}
        if (tbl, row_id, key) in old_raw:
            groups.add(old_raw[(tbl, row_id, key)])
        dup_groups += [(key, scope, live, g) for g in groups if g is not None]
    # free this row's keys first, so neither a rename nor a duplicate trips the unique index
    for key, _, _, _ in dup_groups:
        if conn.execute(f"SELECT 1 FROM {tbl} WHERE id = ?", [row_id]).fetchone():
            conn.execute(f"UPDATE {tbl} SET {key} = ? WHERE id = ?", [_parked(row_id), row_id])
        row[key] = _parked(row_id)
    names = list(row)
    conn.execute(
        f"INSERT INTO {tbl} ({', '.join(names)}) VALUES ({', '.join('?' for _ in names)}) "
        f"ON CONFLICT(id) DO UPDATE SET "
        + ", ".join(f"{c} = excluded.{c}" for c in names if c != "id"),
        [row[c] for c in names])
    for key, scope, live, g in dup_groups:
        _settle_key(conn, tbl, key, scope, live, g)
    conn.executemany("UPDATE sync_fields SET mat = ? WHERE tbl = ? AND row_id = ? AND field = ?",
                     [(m, tbl, row_id, f) for f, m in mats.items()
                      if f not in {k for k, *_ in dup_groups}])
    if not fresh:
        conn.execute("UPDATE sync_rows SET pending = 0 WHERE tbl = ? AND row_id = ?",
                     [tbl, row_id])
        conn.execute("DELETE FROM sync_conflicts WHERE tbl = ? AND row_id = ? "
                     "AND kind != 'duplicate'", [tbl, row_id])
    _insert_conflicts(conn, [(c[0], c[1], tbl, row_id, c[2], c[3], c[4], c[5], c[6], c[7])
                             for c in conflicts])
    return True


def _parked(row_id: str) -> str:
    """A stand-in key no engineer types, held while claims to one key are re-dealt."""
    return f"~parked~{row_id}"


def _settle_key(conn: sqlite3.Connection, tbl: str, key: str, scope: tuple[str, ...],
                live: bool, raw_value: str, _busy: frozenset[str] = frozenset()) -> None:
    """Give every row claiming one unique key its shown value: the first claim keeps it, the
    others show it with a suffix and are recorded as duplicates (never dropped). A row that
    still shows the value but claims another now is given its own claim's value first."""
    # the planner, without statistics, takes the primary key (tbl, ...) and scans every field
    # of every row of the table; the key's own partial index finds the claims directly
    claims = conn.execute(
        f"SELECT row_id, hlc, op_id FROM sync_fields INDEXED BY {_key_index(key)} "
        f"WHERE tbl = ? AND field = '{key}' AND value = ?", [tbl, raw_value]).fetchall()
    groups: dict[tuple, list[tuple]] = {}
    scope_of: dict[str, tuple | None] = {}  # a claim's scope values (None: a dead row)
    for row_id, hlc, op_id in claims:
        cur = conn.execute(f"SELECT {', '.join(('deleted_at',) + scope) or 'id'} FROM {tbl} "
                           "WHERE id = ?", [row_id]).fetchone()
        if cur is None:
            continue
        if live and cur[0] is not None:
            groups.setdefault(("dead", row_id), []).append((hlc, op_id, row_id))
            scope_of[row_id] = None
            continue
        groups.setdefault(tuple(cur[1:]), []).append((hlc, op_id, row_id))
        scope_of[row_id] = tuple(cur[1:])
    value = json.loads(raw_value)
    for members in groups.values():
        members.sort()
        for _, _, row_id in members:  # park every claim first: a swap never trips the index
            conn.execute(f"UPDATE {tbl} SET {key} = ? WHERE id = ?", [_parked(row_id), row_id])
        for i, (hlc, op_id, row_id) in enumerate(members):
            shown = value if i == 0 else f"{value} ({row_id[:8]})"
            if not (live and scope_of[row_id] is None):
                _free_shown(conn, tbl, key, scope, live, shown, scope_of[row_id],
                            _busy | {raw_value})
            conn.execute(f"UPDATE {tbl} SET {key} = ? WHERE id = ?", [shown, row_id])
            conn.execute("UPDATE sync_fields SET mat = ? WHERE tbl = ? AND row_id = ? AND field = ?",
                         [_dump(shown), tbl, row_id, key])
            conn.execute("DELETE FROM sync_dirty WHERE tbl = ? AND row_id = ?", [tbl, row_id])
            cid = f"duplicate:{tbl}:{row_id}:{key}"
            if i == 0:
                # the record follows the state, not the path: a collision seen only while
                # operations arrived in some order leaves nothing once it is gone
                conn.execute("DELETE FROM sync_conflicts WHERE id = ?", [cid])
            else:
                dev = conn.execute("SELECT device_id FROM sync_ops WHERE op_id = ?",
                                   [op_id]).fetchone()
                conn.execute(
                    "INSERT INTO sync_conflicts (id, kind, tbl, row_id, field, value, op_id, "
                    "device_id, hlc, open) VALUES (?, 'duplicate', ?, ?, ?, ?, ?, ?, ?, 1) "
                    "ON CONFLICT(id) DO UPDATE SET value = excluded.value, op_id = excluded.op_id, "
                    "open = 1", [cid, tbl, row_id, key, raw_value, op_id, dev[0] if dev else None,
                                 hlc])


def _free_shown(conn: sqlite3.Connection, tbl: str, key: str, scope: tuple[str, ...],
                live: bool, shown: str, scope_values: tuple, busy: frozenset[str]) -> None:
    """Free a key value about to be shown from rows that show it but claim another now.

    Why: a batch can move keys round a ring (A->B, B->C, C->A). Such a row's own write comes
    later in the merge; until then it holds the value it used to claim, and writing the row
    that claims it now tripped the unique index. That write was rolled back, its conflict
    records with it, and a ring left every row in it waiting for good: what a replica showed
    (and recorded) then hung on the order of arrival. Settling the holder's own claim first
    gives the one result whatever the order."""
    # (this group's own claims are parked already: a row found here claims another value)
    where = " AND ".join([f"{key} = ?", *(f"{c} IS ?" for c in scope)]
                         + (["deleted_at IS NULL"] if live else []))
    for (holder,) in conn.execute(f"SELECT id FROM {tbl} WHERE {where}",
                                  [shown, *scope_values]).fetchall():
        conn.execute(f"UPDATE {tbl} SET {key} = ? WHERE id = ?", [_parked(holder), holder])
        conn.execute("DELETE FROM sync_dirty WHERE tbl = ? AND row_id = ?", [tbl, holder])
        got = conn.execute("SELECT value FROM sync_fields WHERE tbl = ? AND row_id = ? AND "
                           "field = ?", [tbl, holder, key]).fetchone()
        if got and got[0] is not None and got[0] not in busy:
            _settle_key(conn, tbl, key, scope, live, got[0], busy)


# -- reading back ----------------------------------------------------------------------------
def list_conflicts(conn: sqlite3.Connection, *, open_only: bool = True) -> list[Conflict]:
    """The conflicts kept for review (open ones, or all with ``open_only=False``).

    Example:
        >>> list_conflicts(store.db.conn)
        []
    """
    sql = ("SELECT c.id, c.kind, c.tbl, c.row_id, c.field, c.value, f.mat, c.device_id, c.open "
           "FROM sync_conflicts c LEFT JOIN sync_fields f ON f.tbl = c.tbl AND f.row_id = c.row_id "
           "AND f.field = c.field")
    if open_only:
        sql += " WHERE c.open = 1"
    out = []
    for r in conn.execute(sql + " ORDER BY c.tbl, c.row_id, c.field, c.id"):
        out.append(Conflict(r[0], r[1], r[2], r[3], r[4],
                            json.loads(r[5]) if r[5] is not None else None,
                            json.loads(r[6]) if r[6] is not None else None, r[7], bool(r[8])))
    return out


#: the most sequence spans a pull may leave out (see ``ops_after``)
MAX_SKIP_SPANS = 64


def ops_after(conn: sqlite3.Connection, seq: int, limit: int, *,
              exclude_source: str | None = None,
              skip: tuple[str, list[tuple[int, int]]] | None = None) -> list[tuple[int, Op]]:
    """Operations with a local sequence after ``seq``, oldest first, at most ``limit``.

    ``skip``: (device id, spans of sequence numbers): operations of that device within those
    spans are left out (a device's own operations, which it holds: see ``sync.client``).

    Example:
        >>> ops_after(store.db.conn, 10**9, 5)
        []
    """
    sql, params = _after_sql("seq, op_id, device_id, hlc, tbl, row_id, field, value, seen", seq,
                             limit, exclude_source, skip)
    return [(r[0], Op(*r[1:])) for r in conn.execute(sql, params)]


#: an operation as JSON text, made by SQLite: the fields of ``Op.to_json`` in its order
_OP_JSON = ("json_object('op_id', op_id, 'device_id', device_id, 'hlc', hlc, 'tbl', tbl, "
            "'row_id', row_id, 'field', field, 'value', value, 'seen', seen)")


def ops_json_after(conn: sqlite3.Connection, seq: int, limit: int, *,
                   exclude_source: str | None = None,
                   skip: tuple[str, list[tuple[int, int]]] | None = None
                   ) -> list[tuple[int, str, str]]:
    """Like ``ops_after``, each operation as (sequence, table, JSON text of ``Op.to_json()``).

    Why: what goes over the wire is text; SQLite writes it from the stored fields without an
    ``Op`` made and encoded again for each (a sync sends every operation twice).

    Example:
        >>> ops_json_after(store.db.conn, 10**9, 5)
        []
    """
    sql, params = _after_sql(f"seq, tbl, {_OP_JSON}", seq, limit, exclude_source, skip)
    return conn.execute(sql, params).fetchall()


def _after_sql(columns: str, seq: int, limit: int, exclude_source: str | None,
               skip: tuple[str, list[tuple[int, int]]] | None) -> tuple[str, list[Any]]:
    sql = f"SELECT {columns} FROM sync_ops WHERE seq > ?"
    params: list[Any] = [seq]
    if exclude_source:
        sql += " AND source != ?"
        params.append(exclude_source)
    if skip and skip[1]:
        spans = skip[1][:MAX_SKIP_SPANS]
        sql += (" AND NOT (device_id = ? AND ("
                + " OR ".join("seq BETWEEN ? AND ?" for _ in spans) + "))")
        params += [skip[0], *(n for span in spans for n in span)]
    return sql + " ORDER BY seq LIMIT ?", [*params, limit]
