"""Rows first seen in a batch of operations (a whole site from a new device), written in bulk.

``write_fresh`` writes them a table at a time, parents first, with a few statements per table
(``executemany``) instead of several per row; a row with a single operation is written straight
from its values. Rows that need a closer look (a field or parent missing, a unique key another
row claims, a value SQLite refuses) are handed back to ``_oplog``'s one-by-one path, which does
the same merge slowly. Both give the same rows, fields and conflicts.
"""

from __future__ import annotations

import json
import sqlite3
from operator import itemgetter
from typing import Any, Callable, Iterable

from fieldcol.store._oplog import (DERIVED, ROW, Entry, Op, Schema, _chunks, _compact_rows, _dump,
                                   _insert_conflicts, _key_index, _marks, _resolve, _row_values)


def _existing(conn: sqlite3.Connection, tbl: str, ids: Iterable[str]) -> set[str]:
    out: set[str] = set()
    for part in _chunks(list(ids)):
        out.update(r[0] for r in conn.execute(
            f"SELECT id FROM {tbl} WHERE id IN ({_marks(part)})", part))
    return out


def _claimed(conn: sqlite3.Connection, tbl: str, key: str, raws: Iterable[str]) -> set[str]:
    """Which of these key values some row here already claims."""
    out: set[str] = set()
    for part in _chunks(list(raws)):
        out.update(r[0] for r in conn.execute(
            f"SELECT value FROM sync_fields INDEXED BY {_key_index(key)} WHERE tbl = ? AND "
            f"field = '{key}' AND value IN ({_marks(part)})", [tbl, *part]))
    return out


def write_fresh(conn: sqlite3.Connection, schema: Schema,
                fresh: dict[tuple[str, str], list[tuple[Op, dict[str, Any]]]],
                entries: Callable[[tuple[str, str]], list[Entry]],
                seq_of: dict[int, int] | None = None) -> tuple[int, list[tuple[str, str]]]:
    """Write rows first seen in this batch, a table at a time (parents first), with a few
    statements per table. Returns (rows written, rows left for the one-by-one path): those
    missing a field or a parent, claiming a key some other row claims, or refused by SQLite.
    Their fields are stored (not yet shown) so that path finds them.

    ``fresh``: each row's operations with their decoded values; ``entries(key)``: its fields
    as ``_resolve`` takes them (for a row with several operations); ``seq_of``: the local
    sequence number of each operation stored just now (by ``id(op)``). A row written whole by
    one such operation is read by SQLite itself from ``sync_ops`` (``_from_log``)."""
    seq_of = seq_of or {}
    by_tbl: dict[str, dict[str, list[tuple[Op, dict[str, Any]]]]] = {}
    for (t, r), lst in fresh.items():
        by_tbl.setdefault(t, {})[r] = lst
    written: dict[str, set[str]] = {}
    slow: list[tuple[str, str]] = []
    count = 0
    for tbl in (t for t in schema.tables if t in by_tbl):
        cols = [c for c in schema.columns[tbl] if c not in DERIVED]
        required = schema.required[tbl]
        keys = [u[0] for u in schema.uniques[tbl]]
        # (row_id, values by field, raw texts, sync_fields rows, conflicts, sequence or None)
        ready: list[tuple] = []
        for row_id, lst in by_tbl[tbl].items():
            if len(lst) == 1:  # one operation: its values are the row, nothing to weigh
                op, values = lst[0]
                # (Schema.check let only this table's fields in)
                if None in map(values.get, required):
                    slow.append((tbl, row_id))
                    continue
                if op.field == ROW:  # kept compact: one row of winners, keys spelt out
                    raw = {k: _dump(values[k]) for k in keys if k in values} if keys else {}
                    seq = seq_of.get(id(op))
                    if seq is None:
                        frows = _compact_rows(schema, tbl, row_id, op, raw)
                    else:  # (its "*" row is written with it by _from_log)
                        frows = [(tbl, row_id, k, op.hlc, op.op_id, j, j)
                                 for k, j in raw.items()] if raw else []
                    ready.append((row_id, values, raw, frows, [], seq))
                    continue
                raw = {f: _dump(v) for f, v in values.items()}
                frows = [(tbl, row_id, f, op.hlc, op.op_id, j, j) for f, j in raw.items()]
                ready.append((row_id, values, raw, frows, [], None))
                continue
            win, deleted, conflicts = _resolve(entries((tbl, row_id)))
            row = _row_values(schema, tbl, row_id, win, deleted)
            if row is None:
                slow.append((tbl, row_id))
                continue
            frows = [(tbl, row_id, f, e[0], e[1], e[2],
                      e[2] if f != "deleted_at" else _dump(row["deleted_at"]))
                     for f, e in win.items()]
            ready.append((row_id, row, {f: e[2] for f, e in win.items()}, frows, conflicts,
                          None))
        for col, parent in schema.fks[tbl]:
            if parent not in schema.columns or not ready:
                continue
            refs = {x[1].get(col) for x in ready}
            refs.discard(None)
            refs -= written.get(parent, set())
            missing = refs - _existing(conn, parent, refs)
            if missing:  # (rare: a child before its parent) the rest pass untouched
                slow += [(tbl, x[0]) for x in ready if x[1].get(col) in missing]
                ready = [x for x in ready if x[1].get(col) not in missing]
        for key, _scope, _live in schema.uniques[tbl]:
            raws = [x[2][key] for x in ready if x[2].get(key) is not None]
            twice = {r for r in raws if raws.count(r) > 1} if len(set(raws)) < len(raws) else set()
            busy = twice | _claimed(conn, tbl, key, set(raws))
            keep = []
            for x in ready:
                (slow.append((tbl, x[0])) if x[2].get(key) in busy else keep.append(x))
            ready = keep
        if not ready:
            continue
        logged = [x[5] for x in ready if x[5]]
        conn.execute("SAVEPOINT sync_bulk")
        try:
            if logged:
                _from_log(conn, tbl, cols, logged)
            if len(logged) < len(ready):
                names = ["id", *cols]
                rows = sorted(([x[0]] + [x[1].get(c) for c in cols] for x in ready
                               if not x[5]), key=itemgetter(0))
                conn.executemany(f"INSERT INTO {tbl} ({', '.join(names)}) VALUES "
                                 f"({_marks(names)})", rows)
        except sqlite3.IntegrityError:  # e.g. a key shown suffixed elsewhere: look closer
            conn.execute("ROLLBACK TO sync_bulk")
            conn.execute("RELEASE sync_bulk")
            slow += [(tbl, x[0]) for x in ready]
            continue
        conn.execute("RELEASE sync_bulk")
        frows = [r for x in ready for r in x[3]]
        frows.sort(key=lambda r: (r[1], r[2]))
        conn.executemany("INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id, value, mat) "
                         "VALUES (?, ?, ?, ?, ?, ?, ?)", frows)
        _insert_conflicts(conn, [(c[0], c[1], tbl, x[0], c[2], c[3], c[4], c[5], c[6], c[7])
                                 for x in ready for c in x[4]])
        written[tbl] = {x[0] for x in ready}
        count += len(ready)
    rows = []
    for tbl, row_id in slow:
        win, _, _ = _resolve(entries((tbl, row_id)))
        rows += [(tbl, row_id, f, e[0], e[1], e[2]) for f, e in win.items()]
    conn.executemany("INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id, value, mat) "
                     "VALUES (?, ?, ?, ?, ?, ?, NULL)", rows)
    return count, slow


def _from_log(conn: sqlite3.Connection, tbl: str, cols: list[str], seqs: list[int]) -> None:
    """Write the rows that these logged row operations carry whole, and their one winner row
    each (field ``"*"``, see ``_compact_rows``), read by SQLite straight from ``sync_ops``.

    Why: handing 20,000 rows of 17 fields each from Python to SQLite, value by value, cost more
    than SQLite's own inserts; SQLite reads the same fields from the JSON it already holds
    (``json_extract`` gives text, numbers and null as the decoder does, true and false as 1
    and 0 as the driver stores them). The operations were checked before they were stored."""
    # the listed numbers drive the join (CROSS JOIN keeps that order): a lookup each, never a
    # pass over the whole log
    source = ("FROM json_each(?) AS k CROSS JOIN sync_ops AS o ON o.seq = k.value "
              "ORDER BY o.row_id")
    picked = json.dumps(seqs)
    conn.execute(f"INSERT INTO {tbl} (id, {', '.join(cols)}) SELECT o.row_id, "
                 + ", ".join(f"json_extract(o.value, '$.{c}')" for c in cols) + f" {source}",
                 [picked])
    conn.execute("INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id, value, mat) "
                 f"SELECT o.tbl, o.row_id, '{ROW}', o.hlc, o.op_id, NULL, NULL {source}",
                 [picked])
