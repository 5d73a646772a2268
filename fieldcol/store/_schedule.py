"""Column schedules in and out as CSV.

Import reads ``tag, level, grid, section, length, material, demand`` (plus optional
``location`` and ``basis``); units go in the header (``length (ft)``) or in each cell
(``30 ft``). A cell with its own unit keeps it; a bare number with no unit in the header is an
error (a schedule never gets a guessed unit). Importing is all or nothing: any row error
refuses the whole file. Each row is read as the engine reads a record: an unknown section, grade or
basis, a JSON cell with an unknown key, a cell left open by a quote, or a cell too long is a row
error like a bad length. The result columns an export adds (code, utilization, ...) are read
past, so an export can be edited and imported again. Rows match existing columns on site + tag;
only the schedule's own fields are merged into the record (restraints and other entries stay), a
blank cell leaves the field as it was, and a cell equal to what an export shows (the current
record, latest readings included) is no change, so importing an unedited export, or the same file
twice, changes nothing.
"""

from __future__ import annotations

import codecs
import csv
import io
import json
import os
import re
import sqlite3
import tempfile
from array import array
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import IO, TYPE_CHECKING, Any, Iterator

from fieldcol import jsontext
from fieldcol.errors import InputError
from fieldcol.store import _validate as v
from fieldcol.store._columns import overlay
from fieldcol.store._schema import CODES, UNIT_SYSTEMS

if TYPE_CHECKING:
    from fieldcol.store._store import Store

FIELDS = ("tag", "level", "grid", "location", "section", "length", "material", "demand", "basis")
_UNIT_FIELDS = {"length": "length", "demand": "force"}
_HEADER = re.compile(r"\s*([A-Za-z_ ]+?)\s*(?:\(\s*([^)]*?)\s*\))?\s*")
_BARE_NUMBER = re.compile(r"[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?")
EXPORT_FIELDS = ("tag", "level", "grid", "location", "section", "length", "material", "demand",
                 "basis", "code", "utilization", "governing_mode", "checked_at", "app_version")
#: columns an export adds; import reads past them, so an export can be edited and re-imported
IGNORED = tuple(f for f in EXPORT_FIELDS if f not in FIELDS)


@dataclass
class RowError:
    """One problem in one row: spreadsheet row number (header is row 1), field, reason."""
    row: int
    field: str
    text: str
    reason: str
    hint: str | None = None

    def __str__(self) -> str:
        s = f"row {self.row}, {self.field}: cannot use '{self.text}': {self.reason}"
        return s + (f" ({self.hint})" if self.hint else "")


@dataclass
class SchedulePlan:
    """What importing one row would do: ``add``, ``update`` (with the fields changed) or ``unchanged``."""
    row: int
    tag: str
    action: str
    changes: list[str]
    record: dict[str, Any]
    level: str | None = None
    grid: str | None = None
    location: str | None = None


def _encoder(allow_nan: bool) -> Callable[[Any], str]:
    """``json.dumps(value, ensure_ascii=False, allow_nan=allow_nan)``, its C encoder made once.

    Why: ``JSONEncoder.encode`` makes a new C encoder, and a dict to catch cycles, for every
    value; a schedule's rows are 100,000 small values, and that setting up cost more than the
    encoding. No cycle check: a plan holds what was read from a file (trees, never cycles)."""
    plain = json.JSONEncoder(ensure_ascii=False, allow_nan=allow_nan).encode
    c_make = getattr(json.encoder, "c_make_encoder", None)
    if c_make is None:  # (a Python without json's C part)
        return plain
    try:  # a private signature: another Python may change it, and then the plain one serves
        one = c_make(None, json.JSONEncoder().default, json.encoder.encode_basestring, None,
                     ": ", ", ", False, False, allow_nan)
        if "".join(one({"a": [1, "é"]}, 0)) != plain({"a": [1, "é"]}):
            return plain
    except TypeError:
        return plain
    return lambda value: "".join(one(value, 0))


# a plan's line, and a record as the store writes it (v.json_text)
_encode_plan = _encoder(True)
_encode_record = _encoder(False)


def _items(line: bytes) -> list[Any]:
    """A spool's line as kept: its items, a record kept as text in place."""
    head, tab, text = line.partition(b"\t")
    items = json.loads(head)
    if tab:
        items[4] = text.rstrip(b"\n").decode("utf-8")
    return items


def _plan_of(items: list[Any]) -> SchedulePlan:
    """A plan from a spool's line (its record decoded when kept as text)."""
    if type(items[4]) is str:
        items[4] = json.loads(items[4])
    return SchedulePlan(*items)


def _record_text(record: dict[str, Any]) -> str | None:
    """The JSON text a new column's row holds for ``record`` (as ``v.json_text`` writes it),
    or None when the record is kept as it is (no code yet, or not writable as JSON).

    Example:
        >>> _record_text({"tag": "A/1", "code": "aisc360-22"})
        '{"tag": "A/1", "code": "aisc360-22"}'
    """
    if "code" not in record:
        return None
    try:
        return _encode_record(record)
    except (TypeError, ValueError):
        return None


class PlanSpool(Sequence[SchedulePlan]):
    """The plans of a preview, kept in a temporary file rather than in memory: a schedule of
    100,000 rows previews and applies in the same memory as one of a hundred. Reads back as a
    sequence (``len``, index, iteration); each read gives a fresh ``SchedulePlan``.

    Example:
        >>> sp = PlanSpool(); sp.append(SchedulePlan(2, "A/1", "add", [], {"tag": "A/1"}))
        >>> len(sp), sp[0].tag, sp.counts["add"]
        (1, 'A/1', 1)
    """

    def __init__(self) -> None:
        self._file: Any = None
        self._offsets = array("q")
        self._end = 0
        self.counts = {"add": 0, "update": 0, "unchanged": 0}

    def append(self, plan: SchedulePlan, text: str | None = None) -> None:
        """Keep one plan (written at the end of the file). ``text``: a new column's record
        as ``_record_text`` gives it, when the caller has it already."""
        if text is None and plan.action == "add":
            text = _record_text(plan.record)
        head = _encode_plan([plan.row, plan.tag, plan.action, plan.changes,
                             plan.record if text is None else None, plan.level, plan.grid,
                             plan.location])
        # a new column's record is kept as the JSON text its row will hold, after a tab
        # (JSON text holds none): apply writes it as it stands, decoded and encoded never
        line = (head if text is None else f"{head}\t{text}").encode("utf-8") + b"\n"
        if self._file is None:
            self._file = tempfile.TemporaryFile()
        # reads use pread, so the file's position stays at its end: append where it is
        self._offsets.append(self._end)
        self._file.write(line)
        self._end += len(line)
        self.counts[plan.action] += 1

    def __len__(self) -> int:
        return len(self._offsets)

    def _read(self, i: int) -> SchedulePlan:
        self._file.flush()
        end = self._offsets[i + 1] if i + 1 < len(self._offsets) else self._end
        start = self._offsets[i]
        return _plan_of(_items(self._pread(end - start, start)))

    def _pread(self, n: int, at: int) -> bytes:
        """``n`` bytes from ``at``, leaving the file's position (the end) as it is."""
        if hasattr(os, "pread"):
            return os.pread(self._file.fileno(), n, at)
        f = self._file  # a platform without pread (Windows)
        f.seek(at)
        data = f.read(n)
        f.seek(self._end)
        return data

    def __getitem__(self, i: Any) -> Any:  # type: ignore[override]
        if isinstance(i, slice):
            return [self._read(k) for k in range(*i.indices(len(self)))]
        n = len(self)
        if not -n <= i < n:
            raise IndexError("plan index out of range")
        return self._read(i % n)

    def __iter__(self) -> Iterator[SchedulePlan]:
        return map(_plan_of, self.raw())

    def raw(self) -> Iterator[list[Any]]:
        """The plans as kept: ``[row, tag, action, changes, record, level, grid, location]``,
        a new column's record (with its code) as its JSON text.

        Example:
            >>> sp = PlanSpool(); sp.append(SchedulePlan(2, "A/1", "add", [], {"tag": "A/1"}))
            >>> next(sp.raw())[4]
            {'tag': 'A/1'}
        """
        if self._file is None:
            return
        self._file.flush()
        pos, rest = 0, b""
        while True:  # a block at a time: the file's position is left to append
            block = self._pread(min(1 << 20, self._end - pos), pos) if pos < self._end else b""
            if not block:
                break
            pos += len(block)
            lines = (rest + block).split(b"\n")
            rest = lines.pop()
            for line in lines:
                yield _items(line)

    def __eq__(self, other: object) -> bool:
        return isinstance(other, Sequence) and list(self) == list(other)

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        return f"PlanSpool({len(self)} plans)"


class _TagBook:
    """The tags met so far in a file and the row of each, kept in a private temporary SQLite
    database (on disk, its page cache bounded): a file's rows never accumulate in memory.

    A tag is asked of the database only when a filter of fixed size (a Bloom filter, 2**23
    bits, two of them set per tag) says it may have been met: most tags are new, and those
    are written a thousand at a time."""

    _MASK = (1 << 23) - 1

    def __init__(self) -> None:
        self._db = sqlite3.connect("")  # "": a temporary database of this connection only
        self._db.execute("CREATE TABLE tags (tag TEXT PRIMARY KEY, row INTEGER) WITHOUT ROWID")
        self._bits = bytearray(1 << 20)
        self._pending: dict[str, int] = {}

    def first_row(self, tag: str, row: int) -> int | None:
        """The row that used ``tag`` first, or None (and ``row`` is noted as its first)."""
        h = hash(tag)
        a, b = h & self._MASK, (h >> 23) & self._MASK
        bits = self._bits
        if not (bits[a >> 3] >> (a & 7) & 1 and bits[b >> 3] >> (b & 7) & 1):
            bits[a >> 3] |= 1 << (a & 7)
            bits[b >> 3] |= 1 << (b & 7)
            self._pending[tag] = row
            if len(self._pending) >= 1000:
                self._write()
            return None
        if tag in self._pending:
            return self._pending[tag]
        self._write()
        if self._db.execute("INSERT OR IGNORE INTO tags VALUES (?, ?)", (tag, row)).rowcount:
            return None
        return int(self._db.execute("SELECT row FROM tags WHERE tag = ?", (tag,)).fetchone()[0])

    def _write(self) -> None:
        # in key order: the B-tree takes a sorted thousand a page at a time
        self._db.executemany("INSERT INTO tags VALUES (?, ?)", sorted(self._pending.items()))
        self._pending.clear()


@dataclass
class SchedulePreview:
    """The preview of an import: a plan per row (kept on disk, ``PlanSpool``) and every row
    error."""
    site: str
    site_exists: bool
    plans: Sequence[SchedulePlan] = field(default_factory=PlanSpool)
    errors: list[RowError] = field(default_factory=list)
    applied: bool = False
    # the store and its data version the plan was read from (apply writes it only if unchanged)
    _store: Any = field(default=None, repr=False, compare=False)
    _version: int | None = field(default=None, repr=False, compare=False)

    @property
    def ok(self) -> bool:
        """True when no row has an error.

        Example:
            >>> preview_schedule(store, "Depot", "cols.csv").ok
            True
        """
        return not self.errors

    def counts(self) -> dict[str, int]:
        """How many rows would be added, updated, left unchanged, and how many errors.

        Example:
            >>> preview_schedule(store, "Depot", "cols.csv").counts()
            {'add': 1, 'update': 1, 'unchanged': 0, 'errors': 0}
        """
        if isinstance(self.plans, PlanSpool):
            out = dict(self.plans.counts)
        else:
            out = {"add": 0, "update": 0, "unchanged": 0}
            for p in self.plans:
                out[p.action] += 1
        out["errors"] = len(self.errors)
        return out

    def refusal(self) -> InputError:
        """The error that refuses the file: its first row error, with the count of the others.

        Example: ``raise preview.refusal()`` gives ``row 3.length: cannot use '12 fr': unknown
        length unit 'fr' (and 1 more row errors)``.
        """
        e = self.errors[0]
        more = f" (and {len(self.errors) - 1} more row errors)" if len(self.errors) > 1 else ""
        return InputError(f"row {e.row}.{e.field}", e.text, e.reason + more, e.hint)

    def lines(self) -> list[str]:
        """The preview as text lines for a terminal.

        Example:
            >>> preview_schedule(store, "Depot", "cols.csv").lines()[-1]
            '1 to add, 1 to update, 0 unchanged, 0 row errors'
        """
        return list(self.each_line())

    def each_line(self) -> Iterator[str]:
        """The lines of ``lines()`` one at a time (a long preview is printed as it is read).

        Example:
            >>> next(preview_schedule(store, "Depot", "cols.csv").each_line())
            'site Depot'
        """
        yield f"site {self.site}" + ("" if self.site_exists else " (new)")
        for p in self.plans:
            detail = f" ({', '.join(p.changes)})" if p.action == "update" else ""
            yield f"  row {p.row:>4}  {p.action:<9} {p.tag}{detail}"
        for e in self.errors:
            yield f"  {e}"
        c = self.counts()
        yield (f"{c['add']} to add, {c['update']} to update, {c['unchanged']} unchanged, "
               f"{c['errors']} row errors")


def _open_text(source: str | os.PathLike[str]) -> IO[str]:
    """The file opened as text for ``csv`` (read as it goes: never held whole), after a pass
    that proves it UTF-8 and names the first byte that is not."""
    p = Path(source)
    if not p.is_file():
        raise InputError("file", str(p), "no such file", None)
    dec = codecs.getincrementaldecoder("utf-8-sig")()
    at = 0
    with open(p, "rb") as f:
        while True:
            chunk = f.read(1 << 20)
            try:
                dec.decode(chunk, final=not chunk)
            except UnicodeDecodeError as e:
                raise InputError("file", str(p), f"not UTF-8 text ({e.reason} at byte "
                                 f"{at + e.start})", "save the sheet as CSV UTF-8") from None
            if not chunk:
                break
            at += len(chunk)
    # lines end at "\n" only, as csv reads a str: a lone "\r" stays inside its line
    return open(p, encoding="utf-8-sig", newline="\n")


def _header(cells: list[str]) -> list[tuple[str, str | None]]:
    cols: list[tuple[str, str | None]] = []
    seen = set()
    for cell in cells:
        m = _HEADER.fullmatch(cell)
        name = m.group(1).strip().lower().replace(" ", "_") if m else cell.strip()
        unit = (m.group(2) or None) if m else None
        if not m or (name not in FIELDS and name not in IGNORED):
            raise InputError("header", cell, "not a schedule column",
                             "columns: " + ", ".join(FIELDS) + "; units like length (ft)")
        if unit is not None and name not in _UNIT_FIELDS:
            raise InputError("header", cell, f"{name} takes no unit", None)
        if name in seen:
            raise InputError("header", cell, "this column appears twice", None)
        seen.add(name)
        cols.append((name, unit))
    if "tag" not in seen:
        raise InputError("header", ",".join(cells), "no tag column", "the first row names "
                         "the columns: tag, level, grid, section, length, material, demand")
    return cols


class _Held:
    """The lines of the record being read, kept so that a cell too long for ``csv`` can be
    found in them (``csv`` says only that one was)."""

    def __init__(self, lines: Iterable[str]):
        self._it = iter(lines)
        self.lines: list[str] = []

    def __iter__(self) -> "_Held":
        return self

    def __next__(self) -> str:
        line = next(self._it)
        self.lines.append(line)
        return line


def _long_cell(text: str, limit: int) -> int:
    """The index of the first cell of one CSV record longer than ``limit`` characters
    (quotes as RFC 4180 writes them), counted as ``csv`` counts them."""
    cell, size, quoted = 0, 0, False
    for ch in text:
        if ch == '"':
            quoted = not quoted
            continue
        if ch == "," and not quoted:
            cell, size = cell + 1, 0
            continue
        size += 1
        if size > limit:
            return cell
    return cell


def _records(lines: Iterable[str]) -> Iterator[tuple[int, list[str] | RowError]]:
    """(spreadsheet row where the record starts, its cells or the error reading it); a cell
    too long is a ``RowError`` whose ``field`` is ``cell <index>`` (named by the header)."""
    held = _Held(lines)
    reader = csv.reader(held, strict=True)
    while True:
        start = reader.line_num + 1
        held.lines.clear()
        try:
            cells = next(reader)
        except StopIteration:
            return
        except csv.Error as e:
            if "field limit" in str(e):
                limit = csv.field_size_limit()
                where = _long_cell("".join(held.lines), limit)
                held.lines.clear()
                yield start, RowError(start, f"cell {where}", "",
                                      f"a cell longer than {limit} characters", None)
            elif "new-line character" in str(e):  # lines ended by a lone CR (old Mac files)
                yield start, RowError(start, "row", "", "a line ends in a lone carriage return",
                                      "save the sheet as CSV UTF-8 (lines end LF or CR LF)")
            else:
                yield start, RowError(start, "row", "", f"a quote is not closed ({e})",
                                      'close it, or write a quote inside a cell as ""')
            continue
        # a schedule cell is one line: a cell spanning lines is a quote left open
        joined = "".join(cells)
        if "\n" in joined or "\r" in joined:
            where = next(i for i, c in enumerate(cells) if "\n" in c or "\r" in c)
            yield start, RowError(start, f"cell {where}", "", "a quote opened on this row is "
                                  f"not closed before row {reader.line_num}",
                                  "close it on its own row")
            continue
        yield start, cells


def _parse(lines: Iterable[str]) -> tuple[list[tuple[str, str | None]],
                                          Iterator[tuple[int, dict[str, str] | RowError]]]:
    """The header (read at once: its errors come before any row's) and the rows after it,
    read one at a time as they are asked for."""
    records = _records(lines)
    header = None
    for n, cells in records:
        if isinstance(cells, RowError):
            raise InputError("header", "", cells.reason, cells.hint)
        if not any(c.strip() for c in cells) or cells[0].lstrip().startswith("#"):
            continue
        header = _header(cells)
        break
    if header is None:
        raise InputError("file", "", "the file holds no header row", "first row: tag,section,...")
    return header, _rows_after(records, header)


def _rows_after(records: Iterator[tuple[int, list[str] | RowError]],
                header: list[tuple[str, str | None]]
                ) -> Iterator[tuple[int, dict[str, str] | RowError]]:
    width = len(header)
    names = [name for name, _ in header]
    for n, cells in records:
        if isinstance(cells, RowError):
            if cells.field.startswith("cell "):  # a cell too long: named by its column
                i = int(cells.field[5:])
                cells.field = names[i] if i < width else "row"
            yield n, cells
            continue
        if not any(c.strip() for c in cells) or cells[0].lstrip().startswith("#"):
            continue
        if len(cells) > width and any(c.strip() for c in cells[width:]):
            yield n, RowError(n, "row", ",".join(cells[width:])[:80],
                              "more cells than header columns", None)
            continue
        if v.CONTROL.search("".join(cells)):  # (one search a row; the cell found after)
            i, bad = next((i, m) for i, c in enumerate(cells) if (m := v.CONTROL.search(c)))
            yield n, RowError(n, names[i] if i < width else "row",
                              cells[i].encode("unicode_escape").decode("ascii")[:80],
                              f"holds a control character (U+{ord(bad.group()):04X})",
                              "type the cell again")
            continue
        got = len(cells)
        row = {}
        for i, name in enumerate(names):
            c = cells[i].strip() if i < got else ""
            row[name] = unguard_cell(c) if c.startswith("'") else c
        yield n, row


def _with_unit(cell: str, unit: str | None, fld: str) -> str:
    if _BARE_NUMBER.fullmatch(cell):
        if unit is None:
            raise InputError(fld, cell, "a number with no unit",
                             f"write e.g. '{cell} ft' or put the unit in the header: {fld} (ft)")
        return f"{cell} {unit}"
    return cell


def _json_or_text(cell: str, fld: str) -> Any:
    if cell.startswith("{"):
        try:
            obj = jsontext.loads(cell, fld, cell)
        except InputError as e:
            raise InputError(fld, cell, f"looks like a JSON object but is not ({e.reason})",
                             None) from None
        if not isinstance(obj, dict):
            raise InputError(fld, cell, "expected a JSON object", None)
        return obj
    return cell


def _row_fields(cells: dict[str, str], units_by: dict[str, str | None]) -> dict[str, Any]:
    """The row's values checked and ready for the record (only non-blank cells)."""
    from fieldcol import units

    out: dict[str, Any] = {}
    for name, cell in cells.items():
        if not cell or name in IGNORED:
            continue
        if name in ("length", "demand"):
            unit = units_by.get(name)
            typed = _READ_OK.get((name, cell, unit))
            if typed is None:  # a schedule repeats its lengths and loads: each read once
                typed = _with_unit(cell, unit, name)
                if name == "length":
                    units.parse_length(typed, name)
                else:
                    units.parse_quantity(typed, "force", name)
                _remember(_READ_OK, (name, cell, unit), typed)
            out[name] = typed
        elif name in ("section", "material"):
            out[name] = _json_or_text(cell, name)
        else:
            out[name] = cell
    return out


#: entries read once already (a schedule repeats them), and whole rows read by the engine,
#: by their JSON text without the tag: ``None`` (fine) or the error; bounded
_READ_OK: dict[Any, Any] = {}
_ROW_READ: dict[str, InputError | None] = {}
#: a new column's record text after its tag, by its row's memo key (``_new_key``); bounded
_NEW_TEXT: dict[Any, str] = {}
_MEMO_MAX = 4096


def _remember(memo: dict[Any, Any], key: Any, value: Any) -> None:
    if len(memo) >= _MEMO_MAX:
        memo.clear()
    memo[key] = value


def _copy(value: Any) -> Any:
    """A deep copy of a JSON value (dicts, lists and scalars), without ``copy.deepcopy``'s
    bookkeeping."""
    if isinstance(value, dict):
        return {k: _copy(x) for k, x in value.items()}
    if isinstance(value, list):
        return [_copy(x) for x in value]
    return value


def _merge(record: dict[str, Any], vals: dict[str, Any]) -> dict[str, Any]:
    rec = _copy(record)
    for k in ("section", "length", "material"):
        if k in vals:
            rec[k] = vals[k]
    if "demand" in vals or "basis" in vals:
        demand = dict(rec["demand"]) if isinstance(rec.get("demand"), dict) else {}
        if "demand" in vals:
            # an axial force replaces the loads (and the psi0 that combines them)
            demand = {k: v for k, v in demand.items() if k not in ("loads", "psi0")}
            demand["axial"] = vals["demand"]
        if "basis" in vals:
            demand["basis"] = vals["basis"]
        rec["demand"] = demand
    return rec


def _shown(current: dict[str, Any], name: str) -> Any:
    """What an export shows in column ``name`` for a record (readings included)."""
    demand = current.get("demand") if isinstance(current.get("demand"), dict) else {}
    if name == "demand":
        return demand.get("axial")
    if name == "basis":
        return demand.get("basis")
    return current.get(name)


def _new_key(code: str | None, vals: dict[str, Any]) -> tuple[str | None, ...] | None:
    """The memo key of a new column's row, when its entries are all text: its record but for
    the tag is ``_merge({"tag": ..., "code": code}, vals)``, so these say all of it."""
    key = (code, *map(vals.get, ("section", "length", "material", "demand", "basis")))
    return key if all(x is None or type(x) is str for x in key) else None


def _check_row(merged: dict[str, Any], vals: dict[str, Any], code: str | None,
               key: Any = None) -> None:
    """Read the row's entries as the engine would; the whole record when it is complete.

    A schedule repeats its sections, lengths, grades and loads: a row equal to one read
    before but for its tag (a non-blank text here: the engine reads nothing else from it)
    gives the same answer, so it is read once. ``key``: the row's memo key when the caller
    has one (``_new_key``), else its JSON text is."""
    if key is None:
        try:
            key = json.dumps([{k: x for k, x in merged.items() if k != "tag"},
                              {k: vals[k] for k in ("section", "material", "basis") if k in vals},
                              code], sort_keys=True, allow_nan=False)
        except (TypeError, ValueError):
            key = None
    if key is not None and key in _ROW_READ:
        err = _ROW_READ[key]
        if err is not None:
            raise InputError(err.field, err.text, err.reason, err.hint)
        return
    try:
        _read_row(merged, vals, code)
    except InputError as e:
        if key is not None:
            _remember(_ROW_READ, key, e)
        raise
    if key is not None:
        _remember(_ROW_READ, key, None)


def _read_row(merged: dict[str, Any], vals: dict[str, Any], code: str | None) -> None:
    from fieldcol.record import _BASES, check_record_keys, parse_material, parse_record, \
        parse_section

    check_record_keys(merged)
    kind = None
    if "section" in vals:
        kind = parse_section(vals["section"], "section").kind
    if "material" in vals:
        if kind is None and merged.get("section") not in (None, ""):
            try:
                kind = parse_section(merged["section"], "section").kind
            except InputError:
                kind = None  # the record's own section is read with the whole record below
        parse_material(vals["material"], "material", shape=kind)
    if "basis" in vals:
        allowed = _BASES.get(code or "", tuple(b for bs in _BASES.values() for b in bs))
        v.choice(vals["basis"], "basis", allowed)
    if all(merged.get(k) not in (None, "") for k in ("section", "material", "length")):
        if code is None and "code" not in merged and "basis" in vals:
            # a site yet to be named a code: read the row under the code its basis belongs to
            merged = {**merged, "code": next(c for c, bs in _BASES.items()
                                             if vals["basis"] in bs)}
        parse_record(merged)


def preview_schedule(store: "Store", site: str, source: str | os.PathLike[str], *,
                     code: str | None = None) -> SchedulePreview:
    """What importing the CSV file ``source`` into ``site`` (a name) would do. Writes nothing.

    ``code`` is the design code of a site still to be created (an existing site's own code is
    used otherwise): rows are read under it (a basis it does not know is a row error).

    Example:
        >>> print(Path("cols.csv").read_text(), end="")
        tag,level,grid,section,length (ft)
        A/1-L1,L1,A/1,W10X49,16
        B/4-L1,L1,B/4,W14X90,29.5
        >>> print("\\n".join(preview_schedule(store, "Depot", "cols.csv").lines()))
        site Depot
          row    2  add       A/1-L1
          row    3  update    B/4-L1 (length)
        1 to add, 1 to update, 0 unchanged, 0 row errors
    """
    site_name = v.text(site, "site")
    with _open_text(source) as lines:
        header, rows = _parse(lines)
        return _plan(store, site_name, header, rows, code)


def _plan(store: "Store", site_name: str, header: list[tuple[str, str | None]],
          rows: Iterator[tuple[int, dict[str, str] | RowError]],
          code: str | None) -> SchedulePreview:
    """The preview of the rows as they are read (a plan kept on disk per row)."""
    units_by = dict(header)
    version = store._data_version()  # before the first read: a write after it is seen
    found = store.find_site(site_name)
    if found is not None:
        code = found.code
    preview = SchedulePreview(site_name, found is not None, _store=store, _version=version)
    seen = _TagBook()
    for n, cells in rows:
        if isinstance(cells, RowError):
            preview.errors.append(cells)
            continue
        tag = cells.get("tag", "")
        if not tag:
            preview.errors.append(RowError(n, "tag", "", "the column tag is required", None))
            continue
        first = seen.first_row(tag, n)
        if first is not None:
            preview.errors.append(RowError(n, "tag", tag, f"tag already used on row {first}",
                                           None))
            continue
        col = store.find_column(found.id, tag) if found else None
        key = None
        try:
            vals = _row_fields(cells, units_by)
            if col is None:
                key = _new_key(code, vals)
                rest = _NEW_TEXT.get(key) if key is not None else None
                if rest is not None and key in _ROW_READ and _ROW_READ[key] is None:
                    # a row read before but for its tag (fine): its record is that row's
                    # with this tag, so its text is too (neither merged nor written again)
                    preview.plans.append(
                        SchedulePlan(n, tag, "add", [], {}, vals.get("level"), vals.get("grid"),
                                     vals.get("location")),
                        f"{{\"tag\": {_encode_plan(tag)}{rest}")
                    continue
                base: dict[str, Any] = {"tag": tag}
                if code is not None:
                    base["code"] = code
                # a new column: the record checked is the record kept (the reading copies
                # nothing into it), so it is merged once
                rec = _merge(base, vals)
                _check_row(rec, vals, code, key)
            else:
                base, current = col.record, store.current_record(col.id)
                # a cell showing what an export shows is no change: an unedited export
                # must not write the latest readings into the record
                vals = {k: x for k, x in vals.items()
                        if k in ("level", "grid", "location") or x != _shown(current, k)}
                _check_row(_merge(current, vals), vals, current.get("code") or code)
                rec = _merge(base, vals)
        except InputError as e:
            preview.errors.append(RowError(n, e.field, e.text, e.reason, e.hint))
            continue
        if col is None:
            text = _record_text(rec)
            head = f"{{\"tag\": {_encode_plan(tag)}"
            if key is not None and text is not None and text.startswith(head):
                _remember(_NEW_TEXT, key, text[len(head):])
            preview.plans.append(SchedulePlan(n, tag, "add", [], rec, vals.get("level"),
                                              vals.get("grid"), vals.get("location")), text)
            continue
        level_name = None
        if col.level_id:
            level_name = store._get("levels", col.level_id, live=False)["name"]
        changes = [k for k in ("section", "length", "material") if rec.get(k) != col.record.get(k)]
        if rec.get("demand") != col.record.get("demand"):
            changes.append("demand")
        for k, cur in (("level", level_name), ("grid", col.grid), ("location", col.location)):
            if k in vals and vals[k] != cur:
                changes.append(k)
        preview.plans.append(SchedulePlan(
            n, tag, "update" if changes else "unchanged", changes, rec,
            vals.get("level", level_name), vals.get("grid", col.grid),
            vals.get("location", col.location)))
    return preview


#: plans made outside the write lock before one is made inside it (others kept writing meanwhile)
PLAN_TRIES = 3


def apply_schedule(store: "Store", site: str, source: str | os.PathLike[str], *,
                   create_site: dict[str, str] | None = None,
                   preview: SchedulePreview | None = None) -> SchedulePreview:
    """Import the CSV into ``site`` all or nothing; refuses the whole file on any row error.

    Reading every row through the engine is the long part of an import, so it is planned
    without holding the store's write lock (other writers, the app or a sync, carry on), then
    written in one short transaction, and only if no other connection wrote in between (SQLite's
    ``data_version``); otherwise it is planned again, and after ``PLAN_TRIES`` plans inside
    the write lock. Either way the rows written are exactly the rows planned, all or none.

    Args:
        store: the open store. site: the site's name. source: the CSV file.
        create_site: when the site does not exist, create it with these fields
            (``{"code": "aisc360-22", "unit_system": "us"}``); otherwise a missing site is an
            ``InputError``.
        preview: a preview of the same file made on this store (``preview_schedule``), written
            as it stands when nothing changed since it was made (no second reading of the file).

    Returns:
        The preview that was applied (``applied=True``).

    Example:
        >>> apply_schedule(store, "Depot", "cols.csv").counts()
        {'add': 1, 'update': 1, 'unchanged': 0, 'errors': 0}
        >>> store.find_column(site.id, "B/4-L1").record["length"]
        '29.5 ft'
    """
    new_code = None
    if create_site is not None and store.find_site(v.text(site, "site")) is None:
        new_code = v.choice(create_site.get("code"), "code", CODES)
    plan = preview if preview is not None and preview._store is store else None
    for _ in range(PLAN_TRIES):
        if plan is None:
            plan = preview_schedule(store, site, source, code=new_code)
        if plan.errors:
            raise plan.refusal()
        with store._tx():
            if store._data_version() == plan._version:
                return _write(store, plan, create_site)
        plan = None  # another connection wrote meanwhile: what the plan read may be stale
    with store._tx():  # still busy around us: plan and write under the lock
        plan = preview_schedule(store, site, source, code=new_code)
        if plan.errors:
            raise plan.refusal()
        return _write(store, plan, create_site)


def _write(store: "Store", preview: SchedulePreview,
           create_site: dict[str, str] | None) -> SchedulePreview:
    """Write a plan (inside the caller's transaction)."""
    if not preview.site_exists and create_site is None:
        raise InputError("site", preview.site, "no site with this name",
                         "create it with --create-site --code aisc360-22|en1993-1-1")
    found = store.find_site(preview.site)
    if found is None:
        cs = dict(create_site or {})
        code = v.choice(cs.pop("code", None), "code", CODES)
        units = v.choice(cs.pop("unit_system", None), "unit_system", UNIT_SYSTEMS)
        found = store.add_site(preview.site, code=code, unit_system=units, **cs)
    site_code = found.code

    def added() -> Iterator[tuple[Any, str | None, str | None, str | None]]:
        plans = preview.plans
        for _row, tag, action, _c, record, level, grid, location in (
                plans.raw() if isinstance(plans, PlanSpool)
                else ([p.row, p.tag, p.action, p.changes, p.record, p.level, p.grid,
                       p.location] for p in plans)):
            if action == "add":
                if type(record) is str:  # kept as its text, code and all
                    yield (tag, record), level, grid, location
                    continue
                record.setdefault("code", site_code)
                yield record, level, grid, location

    # new columns in batches (each record was read whole by the preview); updates one by one
    store._add_columns(found.id, added(), expected=preview.counts()["add"])
    updates = preview.counts()["update"]
    for p in preview.plans if updates else ():
        if p.action == "update":
            col = store.find_column(found.id, p.tag)
            assert col is not None
            store.update_column(col.id, record=p.record, level=p.level, grid=p.grid,
                                location=p.location)
    preview.applied = True
    return preview


def _cell(x: Any) -> str:
    if x is None:
        return ""
    return guard_cell(json.dumps(x) if isinstance(x, (dict, list)) else str(x))


_TRIGGERS = ("=", "+", "-", "@", "\t", "\r")
_NEGATIVE = re.compile(r"-(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?")


def guard_cell(text: str) -> str:
    """A cell a spreadsheet shows as text, never runs as a formula: text that begins with
    ``=``, ``+``, ``-`` (unless a plain number), ``@``, a tab or a carriage return gets a
    leading apostrophe (common practice against formula injection; import removes it).

    Example:
        >>> guard_cell("=HYPERLINK(1)"), guard_cell("-12.5"), guard_cell("-A"), guard_cell("B/4")
        ("'=HYPERLINK(1)", '-12.5', "'-A", 'B/4')
    """
    if text.startswith(_TRIGGERS) and not _NEGATIVE.fullmatch(text):
        return "'" + text
    return text


def unguard_cell(text: str) -> str:
    """The cell as it was before ``guard_cell`` (an apostrophe before a trigger goes).

    Example:
        >>> unguard_cell("'=SUM(1)"), unguard_cell("'quoted")
        ('=SUM(1)', "'quoted")
    """
    if text.startswith("'") and text[1:].startswith(_TRIGGERS):
        return text[1:]
    return text


def export_csv(store: "Store", site: str, out: str | os.PathLike[str]) -> int:
    """Write the site's live columns (current records) with their latest checks to CSV.

    The first row is the usual caution as a ``#`` comment (import skips it).

    Returns:
        The number of columns written.

    Example:
        >>> export_csv(store, "Depot", "depot.csv")
        1
        >>> Path("depot.csv").read_text().splitlines()[2]
        'B/4-L1,L1,B/4,,W14X90,30 ft,A992,500 kip,lrfd,aisc360-22,0.841462,flexural-weak,...'
    """
    from fieldcol import CAUTION
    from fieldcol.store._photos import write_atomic

    found = store.site_by_name(site)
    out = Path(out)
    if out.is_dir() or not out.parent.is_dir():
        raise InputError("out", str(out), "not a file path in an existing folder", None)
    rows = store._rows("""
        SELECT c.id, c.tag, c.record, c.location, c.grid, l.name AS level,
               k.code, k.utilization, k.governing_mode, k.checked_at, k.app_version
        FROM columns c
        LEFT JOIN levels l ON l.id = c.level_id
        LEFT JOIN checks k ON k.id = (
            SELECT id FROM checks WHERE column_id = c.id AND deleted_at IS NULL
            ORDER BY checked_at DESC, created_at DESC LIMIT 1)
        WHERE c.site_id = ? AND c.deleted_at IS NULL ORDER BY c.tag""", [found.id])
    latest = store._latest_for([r["id"] for r in rows])
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow([f"# fieldcol export of {found.name}. {CAUTION}"])
    w.writerow(EXPORT_FIELDS)
    for r in rows:
        rec, _ = overlay(json.loads(r["record"]), latest.get(r["id"], {}))
        demand = rec.get("demand") if isinstance(rec.get("demand"), dict) else {}
        util = "" if r["utilization"] is None else f"{r['utilization']:.6g}"
        w.writerow([_cell(r["tag"]), _cell(r["level"]), _cell(r["grid"]), _cell(r["location"]),
                    _cell(rec.get("section")), _cell(rec.get("length")), _cell(rec.get("material")),
                    _cell(demand.get("axial")), _cell(demand.get("basis")),
                    _cell(r["code"] or rec.get("code")), util, _cell(r["governing_mode"]),
                    _cell(r["checked_at"]), _cell(r["app_version"])])
    write_atomic(out, buf.getvalue().encode("utf-8"))
    return len(rows)
