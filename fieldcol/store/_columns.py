"""Columns, their measurement history, restraint changes and retrofit options."""

from __future__ import annotations

import contextlib
import copy
import json
import re
import sqlite3
from typing import Any, Iterable

from fieldcol.errors import InputError
from fieldcol.store import _oplog
from fieldcol.store import _validate as v
from fieldcol.store._ids import new_ids
from fieldcol.store._records import (
    Column, ColumnRow, Measurement, RestraintChange, Retrofit, from_row,
)
from fieldcol.store._schema import AXES, RESTRAINT_KINDS, RETROFIT_STATUSES
from fieldcol.store._sites import SitesMixin

_QUANTITY = re.compile(r"[A-Za-z_][A-Za-z0-9_]*(\.([A-Za-z_][A-Za-z0-9_]*|\d+))*")
_BARE_NUMBER = re.compile(r"\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*")
_COLUMN_FIELDS = ("record", "location", "level", "grid")


def section_label(section: Any) -> str | None:
    """A short text for a record's section: the catalogue name or ``measured <shape>``, and
    ``with loss`` when a section loss is recorded.

    Example:
        >>> section_label({"shape": "i", "d": "14 in"})
        'measured I'
    """
    if section is None or isinstance(section, str):
        return section
    if isinstance(section, dict):
        built = section.get("built")
        if isinstance(built, dict):
            return f"built-up {built.get('arrangement', '?')}"
        shape = {"i": "I", "rect": "RHS", "round": "CHS"}.get(section.get("shape"), "section")
        base = section.get("name") or f"measured {shape}"
        return f"{base} with loss" if section.get("loss") else str(base)
    return str(section)


def latest_readings(readings: Iterable[Measurement]) -> dict[str, Measurement]:
    """The reading that counts for each quantity: the latest by time taken, corrections winning.

    A reading that a live correction points at no longer counts; among the rest the latest
    ``taken_at`` wins and, at equal times, the one saved last (so a correction, which keeps the
    time of the reading it corrects, beats the original but not a later reading).

    Example:
        >>> latest_readings([])
        {}
    """
    readings = [m for m in readings if m.deleted_at is None]
    corrected = {m.corrects for m in readings if m.corrects}
    best: dict[str, Measurement] = {}
    for m in readings:
        if m.id in corrected:
            continue
        cur = best.get(m.quantity)
        if cur is None or (m.taken_at, m.created_at) > (cur.taken_at, cur.created_at):
            best[m.quantity] = m
    return best


# the outside dimensions and plates of a section as measured: readings of these identify a
# catalogue section, and a section named from the catalogue takes its own nominal values
SECTION_DIMENSIONS = ("section.d", "section.bf", "section.tf", "section.tw", "section.b",
                      "section.t", "section.D")

QUANTITY_NAMES = {
    "length": "Length",
    "section.d": "Depth", "section.bf": "Flange width", "section.tf": "Flange thickness",
    "section.tw": "Web thickness", "section.b": "Width", "section.t": "Wall thickness",
    "section.D": "Outside diameter",
    "section.loss.flange": "Flange thickness remaining",
    "section.loss.web": "Web thickness remaining",
    "section.loss.wall": "Wall thickness remaining",
    "section.loss.uniform": "Loss per exposed face",
    "section.plates.thickness": "Cover plate thickness",
    "section.plates.width": "Cover plate width",
    "condition.bow": "Bow", "condition.plumb": "Out of plumb",
}


def quantity_name(quantity: str) -> str:
    """A reading's quantity in words, saying what it is (a remaining thickness is never called
    a loss); a path without a name comes back as it is.

    Example:
        >>> quantity_name("section.loss.flange"), quantity_name("section.loss.uniform")
        ('Flange thickness remaining', 'Loss per exposed face')
    """
    return QUANTITY_NAMES.get(quantity, quantity)


def site_defaults(record: dict[str, Any], site: Any) -> dict[str, Any]:
    """The record with what it leaves out taken from its site: the code, the basis of an AISC
    demand (LRFD or ASD) and EN 1993-1-1's gamma_M1. What the record says stands.

    The engine alone would read a record with no ``code`` as AISC 360-22 with LRFD; on a
    site assessed to EN 1993-1-1 (or with ASD) every check reads the record through this.

    Args:
        record: a column record (not changed).
        site: its ``Site`` (``code``, ``basis``, ``gamma_m1``).

    Returns:
        A new dict (the same content when nothing is missing).

    Example:
        >>> class S: code, basis, gamma_m1 = "en1993-1-1", None, 1.1
        >>> site_defaults({"tag": "A1"}, S())
        {'tag': 'A1', 'code': 'en1993-1-1', 'gamma_M1': 1.1}
    """
    out = copy.deepcopy(record)
    if out.get("code") in (None, ""):
        out["code"] = site.code
    demand = out.get("demand")
    if out["code"] == "aisc360-22" and site.code == "aisc360-22" and site.basis \
            and out.get("basis") in (None, ""):
        if isinstance(demand, dict) and demand:
            if demand.get("basis") in (None, ""):
                demand["basis"] = site.basis
        elif site.basis != "lrfd":  # no demand: the design strength still on the site's basis
            out["basis"] = site.basis
    if out["code"] == "en1993-1-1" and "gamma_M1" not in out and site.code == "en1993-1-1" \
            and site.gamma_m1 is not None:
        out["gamma_M1"] = site.gamma_m1
    return out


def overlay(record: dict[str, Any], latest: dict[str, Measurement]) -> tuple[dict[str, Any], list[str]]:
    """The record with each measured quantity's latest reading written at its dotted path.

    Missing objects on the path are created; a path through a value that is not an object
    (e.g. ``section.tf`` on a catalogue name) is left alone and returned in the second item,
    and so is a measured dimension (``SECTION_DIMENSIONS``) of a section named from the
    catalogue (``{"name": "W14X90", ...}``): the readings that identified it stay in the history.
    A built-up section (``{"built": ...}``) takes no section reading at all.

    Example:
        >>> m = Measurement(id="1", column_id="c", quantity="length", kind="length",
        ...                 text="29 ft", value=8839.2, unit="mm", taken_at="t")
        >>> overlay({"tag": "A", "length": "30 ft"}, {"length": m})[0]["length"]
        '29 ft'
    """
    out = copy.deepcopy(record)
    skipped: list[str] = []
    named = isinstance(out.get("section"), dict) and bool(out["section"].get("name"))
    # a built-up section is given by its parts: readings of a plain section's dimensions or
    # loss do not belong in it (they stay in the history)
    built = isinstance(out.get("section"), dict) and "built" in out["section"]
    for quantity, m in sorted(latest.items()):
        if (named and quantity in SECTION_DIMENSIONS) or (built and quantity.startswith("section.")):
            skipped.append(quantity)
            continue
        text = m.text if not _BARE_NUMBER.fullmatch(m.text) else f"{m.value:.10g} {m.unit}".strip()
        node: Any = out
        parts = quantity.split(".")
        ok = True
        for i, part in enumerate(parts[:-1]):
            if isinstance(node, list) and part.isdigit() and int(part) < len(node):
                node = node[int(part)]
            elif isinstance(node, dict) and not part.isdigit():
                if node.get(part) is None:
                    node[part] = {}
                node = node[part]
            else:
                ok = False
                break
            if not isinstance(node, (dict, list)):
                ok = False
                break
        last = parts[-1]
        if ok and isinstance(node, dict) and not last.isdigit():
            node[last] = text
        elif ok and isinstance(node, list) and last.isdigit() and int(last) < len(node):
            node[int(last)] = text
        else:
            skipped.append(quantity)
    return out, skipped


def _refused(e: sqlite3.IntegrityError) -> InputError:
    """The error to show for new columns that SQLite refused (a tag taken on the site)."""
    if "columns_live_tag" in str(e) or "columns.site_id, columns.tag" in str(e):
        return InputError("tag", "", "a column with this tag already exists on the site",
                          "choose another tag or edit that column")
    return InputError("record", "", f"the database refused the change ({e})", None)


class ColumnsMixin(SitesMixin):
    """Store operations on columns, measurements, restraint changes, retrofits (part of ``Store``)."""

    # -- columns -------------------------------------------------------------------------
    def add_column(self, site_id: str, record: dict[str, Any], *, location: str | None = None,
                   level: str | None = None, grid: str | None = None,
                   column_id: str | None = None) -> Column:
        """Create a column from its engine record; the tag comes from ``record["tag"]``.

        Args:
            site_id: the site it stands in.
            record: the column record (JSON object; only ``tag`` is checked here).
            location, grid: optional text; level: a level name, created on the site if new.
            column_id: a fixed id; a new UUID when omitted.

        Returns:
            The saved ``Column``.

        Example:
            >>> store.add_column(site.id, {"tag": "B/5-L1", "section": "W14X90"}, level="L1").tag
            'B/5-L1'
        """
        self._get("sites", site_id, field="site")
        rec = v.record(record)
        tag = rec["tag"].strip()
        self._tag_free(site_id, tag)
        with self._tx():
            row = {"site_id": site_id, "tag": tag, "record": v.json_text(rec, "record"),
                   "location": v.text(location, "location", required=False),
                   "grid": v.text(grid, "grid", required=False),
                   "level_id": self._level_id(site_id, level)}
            new_id = self._insert("columns", row, row_id=column_id)
        return self.get_column(new_id)

    def _add_columns(self, site_id: str,
                     items: Iterable[tuple[dict[str, Any], str | None, str | None, str | None]],
                     expected: int = 0) -> int:
        """Create many columns at once (a schedule's new rows): ``items`` of (record, level,
        grid, location), records already read through ``check_record_keys`` by the caller; a
        record is a JSON object, or (its tag, its JSON text) as a schedule's plan keeps it.
        Written with ``executemany`` in batches inside one transaction (the caller's, or one
        of its own); a tag taken on the site refuses the whole call. Returns how many.
        ``expected``: about how many items there are; when they are many and at least as many
        as the columns already stored, the table's site-and-tag index is made again once they
        are all in (``_tag_indexes_later``) instead of taking them one by one.

        Example:
            >>> store._add_columns(site.id, [({"tag": "B/6-L1"}, "L1", "B/6", None)])
            1
        """
        self._get("sites", site_id, field="site")
        levels: dict[str, str] = {}
        names = ("id", "created_at", "updated_at", "device_id", "deleted_at", "site_id", "tag",
                 "record", "location", "grid", "level_id", "created_by")
        sql = (f"INSERT INTO columns ({', '.join(names)}) "
               f"VALUES ({', '.join('?' for _ in names)})")
        count = 0
        with self._tx(), self._unnoted():
            later = self._tag_indexes_later(expected)
            batch: list[tuple[Any, ...]] = []
            for record, level, grid, location in items:
                if type(record) is tuple:
                    tag, text = record
                else:
                    tag, text = record.get("tag"), None
                if not isinstance(tag, str) or not tag.strip():
                    raise InputError("record.tag", repr(tag), "the column tag is required",
                                     "e.g. B/4-L1")
                name = v.text(level, "level", required=False)
                level_id = None
                if name is not None:
                    level_id = levels.get(name)
                    if level_id is None:
                        level_id = levels[name] = self.level(site_id, name).id
                if text is None:
                    text = v.json_text(record, "record")
                now = v.now_utc()
                batch.append(("", now, now, self.device_id, None, site_id, tag.strip(), text,
                              v.text(location, "location", required=False),
                              v.text(grid, "grid", required=False), level_id, self.person))
                if len(batch) >= 1000:
                    count += self._insert_many(sql, names, batch)
            count += self._insert_many(sql, names, batch)
            for text in later:
                try:
                    self.db.conn.execute(text)
                except sqlite3.IntegrityError as e:
                    raise _refused(e) from None
        return count

    #: a column's tag index that only speeds reads (a schedule's batches, each in tag order,
    #: land all over it); the unique one stays: a taken tag must be refused as its row comes,
    #: before the log's claims see two rows with one tag and settle them as a sync would
    _TAG_INDEXES = ("columns_site_tag",)

    def _tag_indexes_later(self, expected: int) -> list[str]:
        """Inside the writing transaction: drop the ``_TAG_INDEXES`` of ``columns`` when
        about ``expected`` new rows are to come and they outnumber the rows there (a large
        schedule into a store not much larger); returns the statements that make them again,
        to run once the rows are in (``[]``: nothing dropped). An error before then rolls the
        transaction back, and the indexes with it.

        Why: a schedule's rows, a thousand at a time in tag order, land all over the index,
        and the pages each batch touches are soon pushed out of SQLite's page cache, written,
        read back and written again by the next; made again, it is sorted once and written
        once. Where the table already holds more rows than come (it is read whole to make
        it), the rows are better added one by one.

        Example:
            >>> with store._tx():
            ...     store._tag_indexes_later(0)
            []
        """
        conn = self.db.conn
        if expected < 10_000 or not conn.in_transaction:
            return []
        held = conn.execute("SELECT max(rowid) FROM columns").fetchone()[0] or 0
        if held > expected:  # (rowids only grow: at least as many rows as there are)
            return []
        marks = ", ".join("?" for _ in self._TAG_INDEXES)
        texts = [r[0] for r in conn.execute(
            f"SELECT sql FROM sqlite_master WHERE type = 'index' AND tbl_name = 'columns' AND "
            f"name IN ({marks}) ORDER BY name", self._TAG_INDEXES)]
        for name in self._TAG_INDEXES:
            conn.execute(f"DROP INDEX IF EXISTS {name}")
        return texts

    def _unnoted(self) -> Any:
        """The block's inserts into ``columns`` go unnoted by the trigger (``_insert_many``
        logs them itself), or noted as usual in a store without an operations log."""
        if self._sync_schema is None:
            return contextlib.nullcontext()
        return _oplog.unnoted_inserts(self.db.conn, "columns")

    def _insert_many(self, sql: str, names: tuple[str, ...], batch: list[tuple[Any, ...]]) -> int:
        """Insert a batch of new columns (each row's id still to be given, first) and empty it,
        with their operations; a unique key refused is the caller's error."""
        conn, schema = self.db.conn, self._sync_schema
        # in tag order, ids given in that order: the tag indexes (the column's own two, its
        # claim's) take the batch a page at a time, and the id indexes at their end
        batch.sort(key=lambda r: r[6])
        batch[:] = [(i, *r[1:]) for i, r in zip(new_ids(len(batch)), batch)]
        try:
            conn.executemany(sql, batch)
            if schema is not None:
                _oplog.log_new_rows(conn, self.device_id, schema, "columns", list(names),
                                    batch)
        except sqlite3.IntegrityError as e:
            raise _refused(e) from None
        n = len(batch)
        batch.clear()
        return n

    def _tag_free(self, site_id: str, tag: str, current_id: str | None = None) -> None:
        clash = self._rows("SELECT id FROM columns WHERE site_id = ? AND tag = ? "
                           "AND deleted_at IS NULL", [site_id, tag])
        if clash and clash[0]["id"] != current_id:
            raise InputError("tag", tag, "a column with this tag already exists on the site",
                             "choose another tag or edit that column")

    def _level_id(self, site_id: str, level: str | None) -> str | None:
        name = v.text(level, "level", required=False)
        return None if name is None else self.level(site_id, name).id

    def update_column(self, column_id: str, **fields: Any) -> Column:
        """Change ``record=``, ``location=``, ``level=`` (a name) or ``grid=`` of a column.

        A new record may change the tag (it must stay unique on the site).

        Example:
            >>> store.update_column(col.id, grid="C/5").grid
            'C/5'
        """
        cur = self._get("columns", column_id, field="column")
        changes: dict[str, Any] = {}
        with self._tx():
            for k, val in fields.items():
                if k not in _COLUMN_FIELDS:
                    raise InputError(k, repr(val), "not a field of a column",
                                     ", ".join(_COLUMN_FIELDS))
                if k == "record":
                    rec = v.record(val)
                    tag = rec["tag"].strip()
                    self._tag_free(cur["site_id"], tag, column_id)
                    changes["record"] = v.json_text(rec, "record")
                    changes["tag"] = tag
                elif k == "level":
                    changes["level_id"] = self._level_id(cur["site_id"], val)
                else:
                    changes[k] = v.text(val, k, required=False)
            self._update("columns", column_id, changes)
        return self.get_column(column_id)

    def get_column(self, column_id: str) -> Column:
        """The column with this id (tombstoned too, with ``deleted_at`` set).

        Example:
            >>> store.get_column(col.id).tag
            'B/4-L1'
        """
        return from_row(Column, self._get("columns", column_id, live=False, field="column"))

    def find_column(self, site_id: str, tag: str) -> Column | None:
        """The live column with this tag on the site, or ``None``.

        Example:
            >>> store.find_column(site.id, "B/4-L1").grid
            'B/4'
        """
        rows = self._rows("SELECT * FROM columns WHERE site_id = ? AND tag = ? "
                          "AND deleted_at IS NULL", [site_id, v.text(tag, "tag")])
        return from_row(Column, rows[0]) if rows else None

    def site_counts(self, site_id: str) -> dict[str, int]:
        """How many live columns a site has, how many are over capacity and how many have no
        check yet, by their latest checks (one query, for a site of any size).

        Example:
            >>> store.site_counts(site.id)
            {'columns': 1, 'over': 0, 'not_checked': 0}
        """
        row = self._rows("""
            SELECT COUNT(*) AS columns,
                   COALESCE(SUM(CASE WHEN k.utilization > 1.0 THEN 1 ELSE 0 END), 0) AS over,
                   COALESCE(SUM(CASE WHEN k.id IS NULL THEN 1 ELSE 0 END), 0) AS not_checked
            FROM columns c
            LEFT JOIN checks k ON k.id = (
                SELECT id FROM checks WHERE column_id = c.id AND deleted_at IS NULL
                ORDER BY checked_at DESC, created_at DESC LIMIT 1)
            WHERE c.site_id = ? AND c.deleted_at IS NULL""", [site_id])[0]
        return {k: int(row[k]) for k in ("columns", "over", "not_checked")}

    def list_columns(self, site_id: str | None = None, *, limit: int = 100,
                     offset: int = 0) -> list[ColumnRow]:
        """One page of live columns (all sites, or one), by site name then tag.

        Section and length reflect the latest measurements; utilization and governing mode
        come from the column's latest saved check.

        Args:
            site_id: restrict to one site.
            limit, offset: the page (limit 1..1000).

        Example:
            >>> _ = store.add_column(site.id, {"tag": "A/1-L1"})
            >>> [r.tag for r in store.list_columns(site.id, limit=2)]
            ['A/1-L1', 'B/4-L1']
        """
        if isinstance(limit, bool) or not isinstance(limit, int) or not 1 <= limit <= 1000:
            raise InputError("limit", repr(limit), "a page holds 1 to 1000 rows", None)
        if isinstance(offset, bool) or not isinstance(offset, int) or offset < 0:
            raise InputError("offset", repr(offset), "must be a whole number >= 0", None)
        where, params = "c.deleted_at IS NULL AND s.deleted_at IS NULL", []
        if site_id is not None:
            where += " AND c.site_id = ?"
            params.append(site_id)
        return self._column_rows(where, params, "s.name, c.tag", limit, offset)

    def page_columns(self, site_id: str, *, after: tuple[str, str] | None = None,
                     limit: int = 50, search: str | None = None, level: str | None = None,
                     status: str | None = None) -> list[ColumnRow]:
        """One page of a site's live columns by (tag, id), starting after a row (keyset
        paging: the next page costs the same on a site of any size, unlike an offset).

        Args:
            site_id: the site.
            after: ``(tag, id)`` of the last row of the previous page, or ``None`` for the first.
            limit: rows in the page (1..1000).
            search: part of a tag, any case (``b/4`` finds ``B/4-L1``).
            level: a level's name, exactly; ``""`` for columns with no level.
            status: ``over`` (latest check over capacity), ``ok`` (within capacity) or
                ``not-checked`` (no check yet); ``None`` for all.

        Returns:
            Up to ``limit`` rows, by tag then id.

        Example:
            >>> first = store.page_columns(site.id, limit=1)
            >>> [r.tag for r in first], store.page_columns(site.id, after=(first[0].tag, first[0].id))
            (['B/4-L1'], [])
        """
        if isinstance(limit, bool) or not isinstance(limit, int) or not 1 <= limit <= 1000:
            raise InputError("limit", repr(limit), "a page holds 1 to 1000 rows", None)
        where = "c.deleted_at IS NULL AND s.deleted_at IS NULL AND c.site_id = ?"
        params: list[Any] = [site_id]
        if after is not None:
            if not (isinstance(after, (tuple, list)) and len(after) == 2
                    and all(isinstance(x, str) for x in after)):
                raise InputError("after", repr(after), "give the (tag, id) of the last row", None)
            where += " AND (c.tag > ? OR (c.tag = ? AND c.id > ?))"
            params += [after[0], after[0], after[1]]
        if search is not None and search.strip():
            # LIKE with our own escape: a typed % or _ is a character of the tag, not a pattern
            text = search.strip().replace("\\", "\\\\").replace("%", "\\%").replace("_", "\\_")
            where += " AND c.tag LIKE ? ESCAPE '\\'"
            params.append(f"%{text}%")
        if level is not None:
            if level == "":
                where += " AND c.level_id IS NULL"
            else:
                where += " AND l.name = ?"
                params.append(level)
        if status is not None:
            test = {"over": "k.utilization > 1.0", "ok": "k.utilization <= 1.0",
                    "not-checked": "k.id IS NULL"}.get(status)
            if test is None:
                raise InputError("status", status, "not a status to filter by",
                                 "use over, ok or not-checked")
            where += f" AND {test}"
        return self._column_rows(where, params, "c.tag, c.id", limit, 0)

    def _column_rows(self, where: str, params: list[Any], order: str, limit: int,
                     offset: int) -> list[ColumnRow]:
        rows = self._rows(f"""
            SELECT c.id, c.tag, c.record, c.location, c.grid, s.name AS site, l.name AS level,
                   k.id AS check_id, k.utilization, k.governing_mode, k.checked_at
            FROM columns c
            JOIN sites s ON s.id = c.site_id
            LEFT JOIN levels l ON l.id = c.level_id
            LEFT JOIN checks k ON k.id = (
                SELECT id FROM checks WHERE column_id = c.id AND deleted_at IS NULL
                ORDER BY checked_at DESC, created_at DESC LIMIT 1)
            WHERE {where}
            ORDER BY {order} LIMIT ? OFFSET ?""", [*params, limit, offset])
        latest = self._latest_for([r["id"] for r in rows])
        out = []
        for r in rows:
            rec, _ = overlay(json.loads(r["record"]), latest.get(r["id"], {}))
            length = rec.get("length")
            out.append(ColumnRow(
                id=r["id"], tag=r["tag"], site=r["site"], level=r["level"], grid=r["grid"],
                location=r["location"], section=section_label(rec.get("section")),
                length=length if isinstance(length, str) or length is None else str(length),
                utilization=r["utilization"], governing_mode=r["governing_mode"],
                checked_at=r["checked_at"]))
        return out

    def _latest_for(self, column_ids: list[str]) -> dict[str, dict[str, Measurement]]:
        by_col: dict[str, list[Measurement]] = {}
        for i in range(0, len(column_ids), 500):  # older SQLite builds allow 999 parameters
            chunk = column_ids[i:i + 500]
            marks = ", ".join("?" for _ in chunk)
            for r in self._rows(f"SELECT * FROM measurements WHERE column_id IN ({marks}) "
                                "AND deleted_at IS NULL", chunk):
                by_col.setdefault(r["column_id"], []).append(from_row(Measurement, r))
        return {c: latest_readings(ms) for c, ms in by_col.items()}

    def current_record(self, column_id: str) -> dict[str, Any]:
        """The record the engine should read now: the stored record with the latest readings,
        and what it leaves out taken from its site (``site_defaults``: code, basis, gamma_M1).

        Example:
            >>> _ = store.add_measurement(col.id, "length", "29 ft 10 in")
            >>> store.current_record(col.id)["length"]
            '29 ft 10 in'
        """
        col = self.get_column(column_id)
        rec, _ = overlay(col.record, self._latest_for([column_id]).get(column_id, {}))
        return site_defaults(rec, self.get_site(col.site_id))

    # -- measurements ---------------------------------------------------------------------
    def add_measurement(self, column_id: str, quantity: str, text: str, *, kind: str = "length",
                        gauge: str | None = None, taken_by: str | None = None,
                        taken_at: str | None = None, visit_id: str | None = None,
                        note: str | None = None, corrects: str | None = None,
                        measurement_id: str | None = None) -> Measurement:
        """Keep one reading as taken, with its canonical value in the internal unit of ``kind``.

        Args:
            column_id: the column measured.
            quantity: dotted path of the record value it measures, e.g. ``"length"``,
                ``"section.tf"``, ``"section.loss.flange"``, ``"condition.bow"``.
            text: the entry as typed (``"0.56 in"``, ``"29'-10\\""``); a bare number means mm
                (or the internal unit of ``kind``).
            kind: a ``fieldcol.units`` kind (``length``, ``force``, ``stress``, ...).
            gauge, taken_by, note: optional text; taken_at: ISO 8601 with zone (default now).
            visit_id: the visit it was taken on. corrects: id of a reading this one corrects.

        Returns:
            The saved ``Measurement``.

        Example:
            >>> store.add_measurement(col.id, "section.tf", "0.62 in", gauge="caliper").value
            15.748
        """
        from fieldcol import units

        col = self._get("columns", column_id, field="column")
        if not isinstance(quantity, str) or not _QUANTITY.fullmatch(quantity) or quantity == "tag":
            raise InputError("quantity", repr(quantity), "not a path into the column record",
                             "e.g. length, section.tf, section.loss.flange")
        if kind not in units.INTERNAL_UNITS:
            raise InputError("kind", repr(kind), "not a kind of quantity",
                             ", ".join(units.INTERNAL_UNITS))
        typed = v.text(text, quantity)
        if kind == "length":
            value = units.parse_length(typed, quantity, allow_zero=True)
        else:
            value = units.parse_quantity(typed, kind, quantity, allow_zero=True)
        if visit_id is not None:
            visit = self._get("visits", visit_id, field="visit")
            if visit["site_id"] != col["site_id"]:
                raise InputError("visit", visit_id, "that visit is to another site", None)
        when = v.now_utc() if taken_at is None else v.utc_timestamp(taken_at, "taken_at")
        if corrects is not None:
            old = self._get("measurements", corrects, field="corrects")
            if old["column_id"] != column_id or old["quantity"] != quantity:
                raise InputError("corrects", corrects,
                                 "a correction must be of the same column and quantity", None)
            if taken_at is None:
                when = old["taken_at"]
        row = {"column_id": column_id, "visit_id": visit_id, "quantity": quantity, "kind": kind,
               "text": typed, "value": float(value), "unit": units.INTERNAL_UNITS[kind],
               "gauge": v.text(gauge, "gauge", required=False),
               "taken_by": v.text(taken_by, "taken_by", required=False), "taken_at": when,
               "corrects": corrects, "note": v.text(note, "note", required=False)}
        new_id = self._insert("measurements", row, row_id=measurement_id)
        return from_row(Measurement, self._get("measurements", new_id))

    def correct_measurement(self, measurement_id: str, text: str, *, note: str | None = None,
                            taken_by: str | None = None) -> Measurement:
        """Correct a reading by adding a new one that points at it; the old one is kept.

        Example:
            >>> m = store.add_measurement(col.id, "section.tf", "0.62 in")
            >>> store.correct_measurement(m.id, "0.52 in", note="misread").corrects == m.id
            True
        """
        old = from_row(Measurement, self._get("measurements", measurement_id, field="corrects"))
        return self.add_measurement(old.column_id, old.quantity, text, kind=old.kind,
                                    gauge=old.gauge, taken_by=taken_by or old.taken_by,
                                    visit_id=old.visit_id, note=note, corrects=old.id)

    def get_measurement(self, measurement_id: str) -> Measurement:
        """One live reading by its id (an ``InputError`` on field ``reading`` if gone).

        Example:
            >>> m = store.add_measurement(col.id, "condition.bow", "3/8 in", gauge="string line")
            >>> store.get_measurement(m.id).gauge
            'string line'
        """
        return from_row(Measurement, self._get("measurements", measurement_id, field="reading"))

    def measurements(self, column_id: str, quantity: str | None = None) -> list[Measurement]:
        """Every live reading of a column (optionally one quantity), oldest first.

        Example:
            >>> _ = store.add_measurement(col.id, "length", "30 ft", taken_at="2026-02-10T10:00Z")
            >>> _ = store.add_measurement(col.id, "length", "29'-10\\"",
            ...                           taken_at="2026-03-04T10:00Z")
            >>> for m in store.measurements(col.id, "length"):
            ...     print(m.taken_at[:10], m.text)
            2026-02-10 30 ft
            2026-03-04 29'-10"
        """
        sql = "SELECT * FROM measurements WHERE column_id = ? AND deleted_at IS NULL"
        params = [column_id]
        if quantity is not None:
            sql += " AND quantity = ?"
            params.append(quantity)
        return [from_row(Measurement, r) for r in
                self._rows(sql + " ORDER BY taken_at, created_at", params)]

    def current_measurements(self, column_id: str) -> dict[str, Measurement]:
        """The reading that counts for each quantity of a column (see ``latest_readings``).

        Example:
            >>> _ = store.add_measurement(col.id, "length", "29 ft 10 in")
            >>> store.current_measurements(col.id)["length"].text
            '29 ft 10 in'
        """
        return latest_readings(self.measurements(column_id))

    # -- restraint changes ----------------------------------------------------------------
    def add_restraint_change(self, column_id: str, date: str, kind: str, description: str, *,
                             axis: str | None = None, seen_by: str | None = None,
                             detail: dict[str, Any] | None = None,
                             change_id: str | None = None) -> RestraintChange:
        """Log a dated change to how a column is held.

        Args:
            kind: ``brace_added``, ``brace_removed``, ``cable_found``, ``end_condition_changed``
                or ``other``. axis: ``strong``, ``weak``, ``twist`` or None.
            detail: optional JSON object (e.g. ``{"at": "15 ft", "member": "L3x3x1/4"}``).

        Example:
            >>> store.add_restraint_change(col.id, "2026-03-04", "brace_added", "angle to wall",
            ...                            axis="weak").kind
            'brace_added'
        """
        self._get("columns", column_id, field="column")
        if detail is not None and not isinstance(detail, dict):
            raise InputError("detail", repr(detail), "expected a JSON object", None)
        row = {"column_id": column_id, "date": v.iso_date(date, "date"),
               "kind": v.choice(kind, "kind", RESTRAINT_KINDS),
               "axis": v.choice(axis, "axis", AXES, required=False),
               "description": v.text(description, "description"),
               "seen_by": v.text(seen_by, "seen_by", required=False),
               "detail": None if detail is None else v.json_text(detail, "detail")}
        new_id = self._insert("restraint_changes", row, row_id=change_id)
        return from_row(RestraintChange, self._get("restraint_changes", new_id))

    def restraint_changes(self, column_id: str) -> list[RestraintChange]:
        """Live restraint changes of a column, oldest first.

        Example:
            >>> _ = store.add_restraint_change(col.id, "2026-03-04", "brace_added", "strut")
            >>> [rc.kind for rc in store.restraint_changes(col.id)]
            ['brace_added']
        """
        return [from_row(RestraintChange, r) for r in self._rows(
            "SELECT * FROM restraint_changes WHERE column_id = ? AND deleted_at IS NULL "
            "ORDER BY date, created_at", [column_id])]

    # -- retrofit options -----------------------------------------------------------------
    def add_retrofit(self, column_id: str, description: str, record: dict[str, Any], *,
                     status: str = "proposed", retrofit_id: str | None = None) -> Retrofit:
        """Save a retrofit option: what would be done and the column record it would give.

        Example:
            >>> braced = store.current_record(col.id)
            >>> braced["restraints"]["weak"]["braces"] = [{"at": "15 ft"}]
            >>> store.add_retrofit(col.id, "add weak-axis brace at mid-height", braced).status
            'proposed'
        """
        self._get("columns", column_id, field="column")
        row = {"column_id": column_id, "description": v.text(description, "description"),
               "record": v.json_text(v.record(record), "record"),
               "status": v.choice(status, "status", RETROFIT_STATUSES)}
        new_id = self._insert("retrofits", row, row_id=retrofit_id)
        return from_row(Retrofit, self._get("retrofits", new_id))

    def set_retrofit_status(self, retrofit_id: str, status: str) -> Retrofit:
        """Mark a retrofit option ``proposed``, ``chosen``, ``rejected`` or ``built``.

        Example:
            >>> opt = store.add_retrofit(col.id, "add weak-axis brace at mid-height", rec)
            >>> store.set_retrofit_status(opt.id, "chosen").status
            'chosen'
        """
        self._get("retrofits", retrofit_id, field="retrofit")
        self._update("retrofits", retrofit_id,
                     {"status": v.choice(status, "status", RETROFIT_STATUSES)})
        return from_row(Retrofit, self._get("retrofits", retrofit_id))

    def retrofits(self, column_id: str) -> list[Retrofit]:
        """Live retrofit options of a column, oldest first.

        Example:
            >>> _ = store.add_retrofit(col.id, "add weak-axis brace at mid-height", rec)
            >>> len(store.retrofits(col.id))
            1
        """
        return [from_row(Retrofit, r) for r in self._rows(
            "SELECT * FROM retrofits WHERE column_id = ? AND deleted_at IS NULL "
            "ORDER BY created_at", [column_id])]
