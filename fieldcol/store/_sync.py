"""The store's side of sync: merging operations, cursors, conflicts, device-local settings."""

from __future__ import annotations

import json
import uuid
from typing import Any, Iterable

from fieldcol.errors import InputError
from fieldcol.store import _oplog, _snapshot
from fieldcol.store._base import StoreBase
from fieldcol.store._oplog import ApplyResult, Conflict, Op

#: settings that belong to this device and never travel


class SyncMixin(StoreBase):
    """Operations in and out, sync cursors, conflicts to review, device-local settings."""

    def _schema(self) -> _oplog.Schema:
        if self._sync_schema is None:
            raise InputError("db", str(self.path), "this store has no operations log yet",
                             "open it with this version of fieldcol once to update it")
        return self._sync_schema

    def apply_ops(self, ops: Iterable[Op], *, source: str,
                  max_future_ms: int | None = _oplog.FUTURE_TOLERANCE_MS) -> ApplyResult:
        """Merge operations from another device, the hub or a bundle, in one transaction.

        Args:
            ops: the operations (repeats are skipped by id).
            source: ``"hub"``, ``"bundle"`` or ``"push"``.
            max_future_ms: refuse operations stamped further ahead of this clock.

        Returns:
            An ``ApplyResult`` (new operations, rows written, rows waiting).

        Example:
            >>> store.apply_ops(store.ops_after(0, 10), source="bundle").new  # all known
            0
        """
        with self._tx():
            return _oplog.apply(self.db.conn, ops, self._schema(), source=source,
                                max_future_ms=max_future_ms)

    def ops_after(self, seq: int, limit: int = 1000, *,
                  exclude_source: str | None = None) -> list[Op]:
        """Operations logged here after local sequence ``seq``, oldest first.

        Example:
            >>> len(store.ops_after(0, 3))
            3
        """
        return [op for _, op in self.ops_with_seq(seq, limit, exclude_source=exclude_source)]

    def ops_with_seq(self, seq: int, limit: int = 1000, *, exclude_source: str | None = None,
                     skip: tuple[str, list[tuple[int, int]]] | None = None
                     ) -> list[tuple[int, Op]]:
        """Like ``ops_after`` with each operation's local sequence number; ``skip``: (device
        id, spans of sequence numbers) whose operations of that device are left out.

        Example:
            >>> store.ops_with_seq(0, 1)[0][0] >= 1
            True
        """
        with self._lock:
            return _oplog.ops_after(self.db.conn, seq, limit, exclude_source=exclude_source,
                                    skip=skip)

    def ops_json_with_seq(self, seq: int, limit: int = 1000, *,
                          exclude_source: str | None = None,
                          skip: tuple[str, list[tuple[int, int]]] | None = None
                          ) -> list[tuple[int, str, str]]:
        """Like ``ops_with_seq``, each operation as (sequence, table, its JSON text).

        Example:
            >>> seq, tbl, text = store.ops_json_with_seq(0, 1)[0]; text.startswith('{"op_id"')
            True
        """
        with self._lock:
            return _oplog.ops_json_after(self.db.conn, seq, limit, exclude_source=exclude_source,
                                         skip=skip)

    def holds_nothing(self) -> bool:
        """True when this store holds no synced row and no operation (a device's first sync
        may then take the hub's records whole).

        Example:
            >>> store.holds_nothing()
            False
        """
        with self._lock:
            return _snapshot.is_empty(self.db.conn, self._schema())

    def held_ops(self, op_ids: Iterable[str]) -> set[str]:
        """Which of these operation ids are logged here already.

        Example:
            >>> first = store.ops_after(0, 1)[0].op_id
            >>> store.held_ops([first, "no-such"]) == {first}
            True
        """
        ids = [i for i in dict.fromkeys(op_ids) if isinstance(i, str)]
        with self._lock:
            return _oplog.held_op_ids(self.db.conn, ids)

    def last_op_seq(self) -> int:
        """The local sequence number of the newest operation (0 when none).

        Example:
            >>> store.last_op_seq() > 0
            True
        """
        with self._lock:
            return self.db.conn.execute("SELECT coalesce(max(seq), 0) FROM sync_ops").fetchone()[0]

    def count_ops(self, *, device_id: str | None = None) -> int:
        """How many operations are logged here (made by ``device_id`` when given).

        Example:
            >>> store.count_ops() >= store.count_ops(device_id=store.device_id)
            True
        """
        sql, params = "SELECT count(*) FROM sync_ops", []
        if device_id is not None:
            sql += " WHERE device_id = ?"
            params.append(device_id)
        with self._lock:
            return self.db.conn.execute(sql, params).fetchone()[0]

    # -- cursors and settings -----------------------------------------------------------------
    def cursor(self, name: str) -> int:
        """A sync cursor's value (0 when never moved).

        Example:
            >>> store.cursor("hub-pull")
            0
        """
        with self._lock:
            row = self.db.conn.execute("SELECT value FROM sync_cursors WHERE name = ?",
                                       [name]).fetchone()
            return row[0] if row else 0

    def set_cursor(self, name: str, value: int) -> None:
        """Move a sync cursor (inside the caller's transaction when there is one).

        Example:
            >>> store.set_cursor("hub-pull", 7); store.cursor("hub-pull")
            7
        """
        with self._tx():
            self.db.execute("INSERT INTO sync_cursors (name, value) VALUES (?, ?) ON CONFLICT(name) "
                            "DO UPDATE SET value = excluded.value", [name, int(value)])

    def own_spans(self, hub_id: str) -> list[tuple[int, int]]:
        """Spans of the hub's sequence numbers (first, last) that hold only operations this
        store pushed there itself (so holds), oldest first; see ``note_own_span``.

        Example:
            >>> store.own_spans("hub-1")
            []
        """
        prefix = _own_prefix(hub_id)
        with self._lock:
            rows = self.db.conn.execute(
                "SELECT name, value FROM sync_cursors WHERE substr(name, 1, ?) = ?",
                [len(prefix), prefix]).fetchall()
        return sorted((int(name[len(prefix):]), value) for name, value in rows)

    def note_own_span(self, hub_id: str, first: int, last: int) -> None:
        """Remember that hub sequence numbers ``first``..``last`` hold only operations this
        store pushed (inside the caller's transaction, with the push cursor it moves).

        Why here, in the store: a store restored from an older copy forgets the spans of the
        pushes it forgot with them, so it never asks to be spared operations it lacks.

        Example:
            >>> store.note_own_span("hub-1", 5, 9); store.own_spans("hub-1")
            [(5, 9)]
        """
        with self._tx():
            self.db.execute("INSERT INTO sync_cursors (name, value) VALUES (?, ?) ON "
                            "CONFLICT(name) DO UPDATE SET value = excluded.value",
                            [f"{_own_prefix(hub_id)}{int(first)}", int(last)])

    def forget_own_spans(self, hub_id: str, upto: int | None = None) -> None:
        """Drop the spans that end at or before ``upto`` (all of them when None: the hub's
        numbers no longer mean what they did).

        Example:
            >>> store.note_own_span("hub-1", 5, 9); store.forget_own_spans("hub-1", 9)
            >>> store.own_spans("hub-1")
            []
        """
        prefix = _own_prefix(hub_id)
        with self._tx():
            self.db.execute("DELETE FROM sync_cursors WHERE substr(name, 1, ?) = ? AND value <= ?",
                            [len(prefix), prefix, 2 ** 62 if upto is None else int(upto)])

    # -- conflicts ------------------------------------------------------------------------------
    def conflicts(self, *, open_only: bool = True) -> list[Conflict]:
        """Values kept for review: concurrent edits that lost, deletes that lost to an edit,
        duplicate keys (see ``fieldcol.store._oplog``).

        Example:
            >>> store.conflicts()
            []
        """
        with self._lock:
            return _oplog.list_conflicts(self.db.conn, open_only=open_only)

    def resolve_conflict(self, conflict_id: str, keep: str) -> None:
        """Settle a conflict: ``keep="shown"`` keeps the value the row shows now, ``"other"``
        takes the value that lost. Either way a new operation records the decision, made with
        both values in view, so it travels and closes the conflict everywhere; both values stay
        in the operations log.

        Example:
            >>> store.resolve_conflict("no-such", "shown")
            Traceback (most recent call last):
            fieldcol.errors.InputError: conflict: cannot use 'no-such': no such conflict (list them with store.conflicts())
        """
        if keep not in ("shown", "other"):
            raise InputError("keep", keep, "keep the shown value or the other one", "shown or other")
        with self._tx():
            found = [c for c in _oplog.list_conflicts(self.db.conn, open_only=False)
                     if c.id == conflict_id]
            if not found:
                raise InputError("conflict", conflict_id, "no such conflict",
                                 "list them with store.conflicts()")
            c = found[0]
            if c.kind == "duplicate":
                # keeping both: the shown, suffixed key becomes the row's own
                value = c.kept if keep == "shown" else c.value
            elif c.kind == "delete":
                value = None if keep == "shown" else c.value
            else:
                value = c.kept if keep == "shown" else c.value
            seen = self.db.conn.execute("SELECT max_hlc FROM sync_rows WHERE tbl = ? AND row_id = ?",
                                        [c.tbl, c.row_id]).fetchone()
            op = Op(str(uuid.uuid4()), self.device_id, _oplog.hlc_tick(self.db.conn), c.tbl,
                    c.row_id, c.field, None if value is None else json.dumps(value),
                    seen[0] if seen else 0)
            _oplog.apply(self.db.conn, [op], self._schema(), source="local")

    def row_label(self, tbl: str, row_id: str) -> str:
        """A synced row named as the engineer knows it: a column by its tag and site, a reading
        or finding by its column, a site or level by its name (a deleted row too); a row not
        held here (its parent still to come) by its table and the start of its id.

        Example:
            >>> store.row_label("columns", "0123456789")
            'column 01234567'
        """
        word = _ROW_WORDS.get(tbl, tbl.replace("_", " "))
        with self._lock:
            conn = self.db.conn
            if tbl in _NAMED:
                row = conn.execute(f"SELECT {_NAMED[tbl]} FROM {tbl} WHERE id = ?",
                                   [row_id]).fetchone()
                return f"{word} {row[0]}" if row and row[0] else f"{word} {row_id[:8]}"
            if tbl == "columns":
                row = conn.execute("SELECT c.tag, s.name FROM columns c LEFT JOIN sites s "
                                   "ON s.id = c.site_id WHERE c.id = ?", [row_id]).fetchone()
            elif tbl in _OF_COLUMN:
                row = conn.execute(f"SELECT c.tag, s.name FROM {tbl} t JOIN columns c ON "
                                   "c.id = t.column_id LEFT JOIN sites s ON s.id = c.site_id "
                                   "WHERE t.id = ?", [row_id]).fetchone()
                word = f"{word} on column"
            else:
                row = None
        if not row or not row[0]:
            return f"{_ROW_WORDS.get(tbl, word)} {row_id[:8]}"
        return f"{word} {row[0]}" + (f" ({row[1]})" if row[1] else "")

    def sync_summary(self) -> dict[str, Any]:
        """Counts for the sync screen: operations logged, made here, rows waiting, open conflicts.

        Example:
            >>> sorted(store.sync_summary())
            ['conflicts', 'ops', 'ops_here', 'waiting']
        """
        with self._lock:
            c = self.db.conn
            return {"ops": c.execute("SELECT count(*) FROM sync_ops").fetchone()[0],
                    "ops_here": c.execute("SELECT count(*) FROM sync_ops WHERE device_id = ?",
                                          [self.device_id]).fetchone()[0],
                    "waiting": c.execute("SELECT count(*) FROM sync_rows WHERE pending = 1")
                    .fetchone()[0],
                    "conflicts": c.execute("SELECT count(*) FROM sync_conflicts WHERE open = 1")
                    .fetchone()[0]}


#: a synced table's rows in words
_ROW_WORDS = {"sites": "site", "columns": "column", "findings": "finding",
              "measurements": "reading", "photos": "photo", "visits": "visit", "levels": "level",
              "restraint_changes": "restraint change", "retrofits": "retrofit option",
              "checks": "check", "photo_links": "photo link"}
#: tables whose rows carry their own name: the field that names one
_NAMED = {"sites": "name", "levels": "name", "visits": "date", "photos": "original_name"}
#: tables whose rows belong to a column (named by its tag)
_OF_COLUMN = ("findings", "measurements", "restraint_changes", "retrofits", "checks",
              "photo_links")


def _own_prefix(hub_id: str) -> str:
    return f"own:{hub_id}:"
