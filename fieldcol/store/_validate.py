"""Checks on what the engineer hands the store; each failure names its field."""

from __future__ import annotations

import json
import math
import re
import time
from datetime import date, datetime, timezone
from typing import Any

from fieldcol.errors import InputError
from fieldcol.recordkeys import check_record_keys


def text(value: Any, field: str, *, required: bool = True) -> str | None:
    """A trimmed text entry; ``None`` or blank is refused when ``required``.

    Example:
        >>> text("  Bay 3 ", "location")
        'Bay 3'
    """
    if value is None:
        if required:
            raise InputError(field, "", "this is required", "type a value")
        return None
    if not isinstance(value, str):
        raise InputError(field, value, "expected text", None)
    _utf8(value, field)
    v = value.strip()
    if not v:
        if required:
            raise InputError(field, value, "this is required", "type a value")
        return None
    return v


#: C0 control characters and DEL, but tab, line feed and carriage return (notes keep lines)
CONTROL = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\x7f]")


def _utf8(value: str, field: str) -> None:
    """A lone surrogate (``"\\ud800"``: JSON escapes can carry one) is no character: SQLite
    cannot take it as UTF-8, so it is refused here, named, before anything is written."""
    try:
        value.encode("utf-8")
    except UnicodeEncodeError as e:
        raise InputError(field, value.encode("utf-8", "backslashreplace").decode("utf-8"),
                         f"holds a code that is no character at position {e.start + 1}",
                         "type the text again") from None
    bad = CONTROL.search(value)
    if bad:  # a NUL ends the text early in C, a CSV reader or a PDF; the others print nothing
        raise InputError(field, value.encode("unicode_escape").decode("ascii")[:80],
                         f"holds a control character (U+{ord(bad.group()):04X}) at position "
                         f"{bad.start() + 1}", "type the text again")


def choice(value: Any, field: str, allowed: tuple[str, ...], *, required: bool = True) -> str | None:
    """One of ``allowed`` exactly (no case folding: stored vocabularies are lower case).

    Example:
        >>> choice("open", "status", ("open", "closed"))
        'open'
    """
    if value is None and not required:
        return None
    if value not in allowed:
        raise InputError(field, value if isinstance(value, str) else repr(value),
                         "not one of the accepted values", "one of: " + ", ".join(allowed))
    return value


def iso_date(value: Any, field: str) -> str:
    """A calendar date as ``YYYY-MM-DD`` (a ``datetime.date`` is accepted).

    Example:
        >>> iso_date("2026-03-04", "date")
        '2026-03-04'
    """
    if isinstance(value, date) and not isinstance(value, datetime):
        return value.isoformat()
    if not isinstance(value, str) or not re.fullmatch(r"\d{4}-\d{2}-\d{2}", value.strip()):
        raise InputError(field, value if isinstance(value, str) else repr(value),
                         "not a date written YYYY-MM-DD", "e.g. 2026-03-04")
    try:
        return date.fromisoformat(value.strip()).isoformat()
    except ValueError:
        raise InputError(field, value, "no such date", "e.g. 2026-03-04") from None


def utc_timestamp(value: Any, field: str) -> str:
    """An instant with a time zone, returned as UTC ``YYYY-MM-DDTHH:MM:SS.ffffffZ``.

    A time without a zone is refused rather than guessed: phones cross time zones.

    Example:
        >>> utc_timestamp("2026-03-04T10:00:00+01:00", "taken_at")
        '2026-03-04T09:00:00.000000Z'
    """
    if isinstance(value, datetime):
        dt = value
    elif isinstance(value, str):
        try:
            dt = datetime.fromisoformat(value.strip().replace("Z", "+00:00"))
        except ValueError:
            raise InputError(field, value, "not an ISO 8601 time",
                             "e.g. 2026-03-04T10:00:00Z") from None
    else:
        raise InputError(field, repr(value), "not a time", "e.g. 2026-03-04T10:00:00Z")
    if dt.tzinfo is None:
        raise InputError(field, str(value), "the time has no time zone",
                         "add Z for UTC or an offset such as +01:00")
    return format_utc(dt)


def format_utc(dt: datetime) -> str:
    """``dt`` in UTC as fixed-width ISO 8601, so text order is time order.

    Example:
        >>> format_utc(datetime(2026, 3, 4, tzinfo=timezone.utc))
        '2026-03-04T00:00:00.000000Z'
    """
    return dt.astimezone(timezone.utc).strftime("%Y-%m-%dT%H:%M:%S.%fZ")


def now_utc() -> str:
    """The current instant, formatted like every stored timestamp.

    Example:
        >>> len(now_utc())
        27
    """
    global _SECOND
    us = time.time_ns() // 1000
    sec, frac = divmod(us, 1_000_000)
    cached = _SECOND
    if cached[0] != sec:  # the date and time to the second, formatted once a second
        cached = _SECOND = (sec, time.strftime("%Y-%m-%dT%H:%M:%S", time.gmtime(sec)))
    return f"{cached[1]}.{frac:06d}Z"


_SECOND: tuple[int, str] = (-1, "")


def record(value: Any, field: str = "record") -> dict[str, Any]:
    """A column record: a JSON object with a non-empty ``tag`` and no key that
    ``fieldcol.recordkeys.KEYS`` does not list, at any depth (a record may be incomplete: its values
    are the engine's to read).

    Example:
        >>> record({"tag": "A/1"})["tag"]
        'A/1'
    """
    if not isinstance(value, dict):
        raise InputError(field, repr(value), "a column record must be a JSON object",
                         '{"tag": "B/4-L1", ...}')
    tag = value.get("tag")
    if not isinstance(tag, str) or not tag.strip():
        raise InputError(f"{field}.tag", repr(tag), "the column tag is required", "e.g. B/4-L1")
    check_record_keys(value)
    try:
        out = json_text(value, field)
    except InputError:
        _json_entries(value, "")  # the entry JSON cannot hold, named by its path in the record
        raise
    if "\\u00" in out or "\\b" in out or "\\f" in out:  # JSON escapes a control character so
        _json_entries(value, "")  # (or a backslash was typed): find it, named by its path
    return value


def _json_entries(value: Any, path: str) -> None:
    """Refuse the first entry of a record that JSON text cannot hold (a lone surrogate in a
    key or a text, NaN or an infinity, a value of no JSON type), naming its path as the
    record's own errors do (``restraints.weak.braces[0].note``)."""
    fld = path or "record"
    if isinstance(value, str):
        _utf8(value, fld)
    elif isinstance(value, float) and not math.isfinite(value):
        raise InputError(fld, repr(value), "not a finite number", "JSON has no NaN or Infinity")
    elif isinstance(value, dict):
        for k, item in value.items():
            sub = f"{path}.{k}" if path else str(k)
            if not isinstance(k, str):
                raise InputError(sub, repr(k), "a key must be text", None)
            _utf8(k, sub)
            _json_entries(item, sub)
    elif isinstance(value, (list, tuple)):
        for i, item in enumerate(value):
            _json_entries(item, f"{path}[{i}]")
    elif value is not None and not isinstance(value, (bool, int, float)):
        raise InputError(fld, repr(value)[:80], f"a value of type {type(value).__name__} cannot "
                         "be kept as JSON",
                         "text, a number, true or false, a list or an object")


# json.dumps(value, allow_nan=False, ensure_ascii=False) without making an encoder each call
_encode_json = json.JSONEncoder(allow_nan=False, ensure_ascii=False).encode


def json_text(value: Any, field: str) -> str:
    """``value`` as JSON text; NaN, infinities and non-JSON types are refused, not coerced.

    Example:
        >>> json_text({"a": 1}, "record")
        '{"a": 1}'
    """
    try:
        out = _encode_json(value)
    except (TypeError, ValueError) as e:
        raise InputError(field, repr(value)[:80], f"cannot be saved as JSON ({e})", None) from None
    if not out.isascii():  # only then can it hold a lone surrogate
        _utf8(out, field)
    return out


def finite(value: Any, field: str) -> float | None:
    """A finite number or ``None``.

    Example:
        >>> finite(2, "utilization")
        2.0
    """
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise InputError(field, repr(value), "not a finite number", None)
    return float(value)
