"""JSON in and out, strictly: the one reader for every file, cell and option that holds JSON,
and the one writer for every ``--json`` output.

Reading takes bytes in UTF-8 (with or without a byte-order mark), UTF-16 or UTF-32 (a Windows
shell writes UTF-16 with a mark) and refuses, naming the field: a duplicate key (two ``length``
keys: which one did the engineer mean?), NaN and Infinity (not JSON), numbers too large to be
finite, lone surrogates (text no file can hold), and nesting deeper than ``MAX_DEPTH``.
Writing gives ``null`` for a number that is not finite and can never emit NaN or Infinity.
"""

from __future__ import annotations

import json
import math
from typing import Any

from fieldcol.errors import InputError

#: deepest nesting read: a column record is about 6 levels deep, a retrofit package a few more
MAX_DEPTH = 32


class _Twice(dict):
    """An object in which a key appeared more than once (``twice`` names it)."""

    twice: str = ""


class _NotFinite:
    """Where the text held NaN, Infinity or a number too large for a float."""

    def __init__(self, text: str) -> None:
        self.text = text


def decode(data: bytes, field: str = "file", name: str = "") -> str:
    """Bytes of a JSON file as text: UTF-8 (a byte-order mark is dropped), UTF-16 or UTF-32.

    Args:
        data: the file's bytes.
        field: the field named by an error. name: the file's name, shown in an error.

    Returns:
        The text.

    Raises:
        InputError: the bytes are not text in any of these encodings.

    Example:
        >>> decode('{"tag": "C1"}'.encode("utf-16"))
        '{"tag": "C1"}'
    """
    enc = json.detect_encoding(data)  # by the byte-order mark, else by the pattern of zero bytes
    try:
        return data.decode(enc)
    except UnicodeDecodeError as e:
        raise InputError(field, name or f"{len(data)} bytes",
                         f"not readable as {enc} text ({e.reason} at byte {e.start})",
                         "save the file as UTF-8") from None


def loads(data: bytes | str, field: str = "file", name: str = "") -> Any:
    """Parse JSON strictly (see the module's text for what is refused).

    Args:
        data: the JSON as bytes (any encoding ``decode`` reads) or text.
        field: the field an error names, e.g. ``"file"`` or ``"section"``; a fault inside
            the JSON names its path below it too (``file: ... at restraints.weak.k``).
        name: the file's name or the entry, shown in an error.

    Returns:
        The parsed value (dicts, lists, str, int, float, bool, None).

    Raises:
        InputError: naming the field and, for a fault inside, the path to it.

    Example:
        >>> loads('{"length": "30 ft", "length": "3 ft"}', "file", "c.json")
        Traceback (most recent call last):
        ...
        fieldcol.errors.InputError: file: cannot use 'c.json': the key 'length' appears twice (at length) (keep one)
    """
    text = decode(data, field, name) if isinstance(data, (bytes, bytearray)) else data
    shown = name or _short(text)

    def pairs(items: list[tuple[str, Any]]) -> dict:
        obj: dict = {}
        for k, v in items:
            if k in obj and not isinstance(obj, _Twice):
                obj = _Twice(obj)
                obj.twice = k
            obj[k] = v
        return obj

    def number(s: str) -> Any:
        x = float(s)
        return x if math.isfinite(x) else _NotFinite(s)

    try:
        value = json.loads(text, object_pairs_hook=pairs, parse_float=number,
                           parse_constant=_NotFinite)
    except json.JSONDecodeError as e:
        raise InputError(field, shown, f"not valid JSON: {e.msg} at line {e.lineno} column "
                         f"{e.colno}", None) from None
    except RecursionError:
        raise InputError(field, shown, f"nested too deeply (more than {MAX_DEPTH} levels)",
                         None) from None
    except ValueError as e:  # an integer of thousands of digits
        raise InputError(field, shown, f"not valid JSON: {e}", None) from None
    _walk(value, field, shown)
    return value


def _walk(value: Any, field: str, shown: str) -> None:
    stack: list[tuple[Any, str, int]] = [(value, "", 0)]
    while stack:
        v, path, depth = stack.pop()
        where = f" (at {_safe(path)})" if path else ""
        if depth > MAX_DEPTH:
            raise InputError(field, shown, f"nested too deeply (more than {MAX_DEPTH} levels)"
                             + where, None)
        if isinstance(v, _Twice):
            raise InputError(field, shown, f"the key '{_safe(v.twice)}' appears twice (at "
                             f"{_safe(_join(path, v.twice))})", "keep one")
        if isinstance(v, _NotFinite):
            raise InputError(field, shown, f"{_safe(v.text)} is not a number JSON can hold"
                             + where, "give a finite number")
        if isinstance(v, str):
            _text_ok(v, field, shown, where)
        elif isinstance(v, dict):
            for k, item in reversed(v.items()):
                _text_ok(k, field, shown, f" (in a key at {_safe(path) or 'the top'})")
                stack.append((item, _join(path, k), depth + 1))
        elif isinstance(v, list):
            for i in range(len(v) - 1, -1, -1):
                stack.append((v[i], f"{path}[{i}]", depth + 1))


def _text_ok(s: str, field: str, shown: str, where: str) -> None:
    try:
        s.encode("utf-8")
    except UnicodeEncodeError:
        raise InputError(field, shown, "holds a lone surrogate (\\ud800-\\udfff), which is not "
                         "text" + where, "retype the text") from None


def _join(path: str, key: str) -> str:
    return f"{path}.{key}" if path else key


def _safe(s: str) -> str:
    return s.encode("utf-8", "backslashreplace").decode("utf-8")


def _short(text: str) -> str:
    t = _safe(text.strip())
    return t if len(t) <= 40 else t[:37] + "..."


def dumps(value: Any, *, indent: int | None = 2) -> str:
    """JSON text of ``value``; a number that is not finite becomes ``null``.

    ``null`` where a number belongs means the number does not exist as a finite value (the code
    gives no strength for the column, or a ratio over a zero strength): read the status and the
    warnings beside it. NaN and Infinity can never be written (``allow_nan=False``). numpy
    scalars and arrays become numbers and lists.

    Example:
        >>> dumps({"K": float("inf"), "n": [1.5, float("nan")]}, indent=None)
        '{"K": null, "n": [1.5, null]}'
    """
    return json.dumps(_finite(value), indent=indent, allow_nan=False)


def _finite(v: Any) -> Any:
    if isinstance(v, float):
        return float(v) if math.isfinite(v) else None
    if isinstance(v, dict):
        return {k: _finite(x) for k, x in v.items()}
    if isinstance(v, (list, tuple)):
        return [_finite(x) for x in v]
    if isinstance(v, (str, int, bool)) or v is None:
        return v
    if hasattr(v, "tolist"):  # numpy scalars and arrays, without importing numpy here
        return _finite(v.tolist())
    raise TypeError(f"not JSON serialisable: {type(v).__name__}")
