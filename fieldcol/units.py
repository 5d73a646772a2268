"""Reading quantities typed in the field and showing them back, in US or SI units.

Inside the engine everything is a plain float (or float64 array) in N, mm, MPa and the units
built from them (``INTERNAL_UNITS``). This module is the edge:

* ``parse_length`` is our own parser for what people write on a tape-measure sheet:
  ``12'-6"``, ``12' 6 1/2"``, ``12 ft 6 in``, ``6-1/2"``, ``3.81 m``, ``150 mm``. pint is never
  handed such a string because it misreads several of them without complaint
  (``12 ft 6 in`` becomes an area, ``3 1/2 in`` becomes 1.5 in).
* ``parse_quantity`` reads one number and one unit (``840 kip``, ``345 N/mm2``, ``1200 cm4``),
  checks the unit is of the right kind and converts once. Common units come from an exact
  table (no pint); anything else goes to the shared pint registry ``ureg``.
* ``format_length`` / ``format_quantity`` / ``to_display`` show values in the site's system:
  ``"us"`` or ``"si"``. ``format_entry`` shows a recorded entry (a brace's typed
  ``"20.00 kip/in"``) by the same rule, so what was typed and what was worked out read alike.

Conventions (documented here once):

* US lengths are feet-inches to the nearest 1/16 in, fractions reduced: ``12'-6 1/16"``,
  ``12'-0"``; below one foot inches only: ``6 1/2"``, ``9/16"``, ``0"``.
* SI lengths are always millimetres (as on SI structural drawings): ``3810 mm``, ``9.5 mm``.
* Numbers show ``digits`` significant digits but the whole-number part is never rounded
  (``12346 kN``, not ``12350 kN``); trailing zeros are dropped (``50 ksi``). From 1e7 up and
  below 0.001 they use engineering notation, the exponent a multiple of 3 as in
  "331.3 x 10^6 mm^4": ``331.3e6 mm^4``. Every formatted value parses back with
  ``parse_quantity`` / ``parse_length``.
* ``ratio`` is dimensionless: ``0.002``, ``0.2%``, ``1/500`` and ``L/500`` all give 0.002.
* ``angle`` is in degrees: ``0.5``, ``0.5 deg``, ``0.5°``, ``0.0087 rad``.
* A bare number (or a Python number) is in ``default_unit``; when that is None it is in the
  internal unit of the kind (mm, N, MPa, ...).
* A comma is refused: it could be a decimal comma or a thousands separator.
* ``lb``/``lbs`` mean pound-force and ``k`` means kip, as in US structural practice. ``t``
  (a mass) and ``ton``/``tonf`` (short ton or tonne?) are refused with a hint; ``tf`` is the
  tonne-force (9.80665 kN).

Example:
    >>> parse_length("12'-6\\"", "length")
    3810.0
    >>> round(parse_quantity("840 kip", "force", "demand"))
    3736506
    >>> format_quantity(3736506.0, "force", "si")
    '3737 kN'
    >>> format_length(3810.0, "us")
    '12\\'-6"'
"""

from __future__ import annotations

import math
import re
from functools import lru_cache
from numbers import Real
from typing import Any

import numpy as np

from fieldcol.errors import InputError

__all__ = [
    "INTERNAL_UNITS",
    "KINDS",
    "SYSTEMS",
    "MM_PER_IN",
    "MM_PER_FT",
    "N_PER_LBF",
    "N_PER_KIP",
    "MPA_PER_KSI",
    "us_words",
    "MPA_PER_PSI",
    "N_PER_TF",
    "get_registry",
    "parse_length",
    "parse_quantity",
    "format_length",
    "format_quantity",
    "format_entry",
    "display_unit",
    "to_display",
    "from_display",
]

# Exact by definition (international inch and pound, 1959; standard gravity): NIST SP 811 App. B.
MM_PER_IN = 25.4
MM_PER_FT = 304.8
N_PER_LBF = 0.45359237 * 9.80665
N_PER_KIP = 1000.0 * N_PER_LBF
MPA_PER_PSI = N_PER_LBF / MM_PER_IN**2
MPA_PER_KSI = N_PER_KIP / MM_PER_IN**2
N_PER_TF = 1000.0 * 9.80665

INTERNAL_UNITS: dict[str, str] = {
    "length": "mm",
    "force": "N",
    "stress": "MPa",
    "area": "mm^2",
    "modulus": "mm^3",
    "inertia": "mm^4",
    "warping": "mm^6",
    "stiffness": "N/mm",
    "rotational_stiffness": "N*mm/rad",
    "moment": "N*mm",
    "angle": "deg",
    "ratio": "",
}
KINDS = tuple(INTERNAL_UNITS)
SYSTEMS = ("us", "si")

# (article + noun, examples) for messages such as "expected a force (e.g. 840 kip, 3700 kN)".
_KIND_WORDS: dict[str, tuple[str, str]] = {
    "length": ("a length", "12'-6\", 3810 mm"),
    "force": ("a force", "840 kip, 3700 kN"),
    "stress": ("a stress", "50 ksi, 345 MPa"),
    "area": ("an area", "21.8 in^2, 14100 mm^2"),
    "modulus": ("a section modulus", "112 in^3, 1840000 mm^3"),
    "inertia": ("a second moment of area", "796 in^4, 331e6 mm^4"),
    "warping": ("a warping constant", "13400 in^6, 3.6e12 mm^6"),
    "stiffness": ("a spring stiffness", "2.5 kip/in, 0.44 kN/mm"),
    "rotational_stiffness": ("a rotational stiffness", "50000 kip*in/rad, 5650 kN*m/rad"),
    "moment": ("a moment", "120 kip*ft, 163 kN*m"),
    "angle": ("an angle", "0.5 deg, 0.0087 rad"),
    "ratio": ("a ratio", "0.002, 0.2%, 1/500"),
}

# Display unit per system and kind: (pint-readable name, internal units per display unit).
_DISPLAY: dict[str, dict[str, tuple[str, float]]] = {
    "us": {
        "length": ("in", MM_PER_IN),
        "force": ("kip", N_PER_KIP),
        "stress": ("ksi", MPA_PER_KSI),
        "area": ("in^2", MM_PER_IN**2),
        "modulus": ("in^3", MM_PER_IN**3),
        "inertia": ("in^4", MM_PER_IN**4),
        "warping": ("in^6", MM_PER_IN**6),
        "stiffness": ("kip/in", N_PER_KIP / MM_PER_IN),
        "rotational_stiffness": ("kip*in/rad", N_PER_KIP * MM_PER_IN),
        "moment": ("kip*ft", N_PER_KIP * MM_PER_FT),
        "angle": ("deg", 1.0),
        "ratio": ("", 1.0),
    },
    "si": {
        "length": ("mm", 1.0),
        "force": ("kN", 1e3),
        "stress": ("MPa", 1.0),
        "area": ("mm^2", 1.0),
        "modulus": ("mm^3", 1.0),
        "inertia": ("mm^4", 1.0),
        "warping": ("mm^6", 1.0),
        "stiffness": ("kN/mm", 1e3),
        "rotational_stiffness": ("kN*m/rad", 1e6),
        "moment": ("kN*m", 1e6),
        "angle": ("deg", 1.0),
        "ratio": ("", 1.0),
    },
}

# ---------------------------------------------------------------------------------------------
# The shared pint registry, built on first use so that importing this module stays cheap
# (pint itself takes ~0.1 s to import; common units never need it).

_UREG: Any = None


def get_registry() -> Any:
    """The one shared pint ``UnitRegistry`` (built on first call, definitions cached on disk).

    Returns:
        the registry; also reachable as ``fieldcol.units.ureg``.

    Example:
        >>> round(get_registry().Quantity(1.0, "kip").m_as("N"), 7)
        4448.2216153
    """
    global _UREG
    if _UREG is None:
        import pint

        try:
            reg = pint.UnitRegistry(cache_folder=":auto:")
        except OSError:
            # A read-only or missing cache folder (some phone sandboxes) must not stop the app.
            reg = pint.UnitRegistry()
        reg.define("@alias force_metric_ton = tonne_force = tonnef")
        _UREG = reg
    return _UREG


def __getattr__(name: str) -> Any:
    if name == "ureg":
        return get_registry()
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


# ---------------------------------------------------------------------------------------------
# Small shared helpers


def _check_system(system: str) -> dict[str, tuple[str, float]]:
    table = _DISPLAY.get(system) if isinstance(system, str) else None
    if table is None:
        raise InputError("units", system, "unknown unit system", "use 'us' or 'si'")
    return table


def _check_kind(kind: str, field: str) -> None:
    if kind not in INTERNAL_UNITS:
        raise InputError(field, kind, "unknown kind of quantity", "one of " + ", ".join(KINDS))


_TRANSLATE = str.maketrans(
    {
        "\u2032": "'",  # prime
        "\u2019": "'",
        "\u2018": "'",
        "\u201b": "'",
        "\u00b4": "'",
        "`": "'",
        "\u2033": '"',  # double prime
        "\u201c": '"',
        "\u201d": '"',
        "\u201e": '"',
        "\u2010": "-",
        "\u2011": "-",
        "\u2012": "-",
        "\u2013": "-",
        "\u2014": "-",
        "\u2212": "-",  # minus sign
        "\u00a0": " ",
        "\u2009": " ",
        "\u202f": " ",
        "\u2044": "/",  # fraction slash
        "\u00bd": " 1/2",
        "\u00bc": " 1/4",
        "\u00be": " 3/4",
        "\u215b": " 1/8",
        "\u215c": " 3/8",
        "\u215d": " 5/8",
        "\u215e": " 7/8",
        "\u00b2": "^2",
        "\u00b3": "^3",
        "\u2074": "^4",
        "\u2076": "^6",
        "\u00b7": "*",
        "\u22c5": "*",
        "\u00d7": "*",
        "\u00b5": "u",
        "\u03bc": "u",
        "\u00b0": " deg",
    }
)


def _clean(text: str) -> str:
    return text.translate(_TRANSLATE).replace("''", '"').strip()


def _comma_error(field: str, text: str, example: str) -> InputError:
    return InputError(
        field,
        text,
        "a comma is ambiguous (decimal comma or thousands separator)",
        f"use a point for decimals and no thousands separator, e.g. {example}",
    )


# Far beyond anything built, in the engine's units (N, MPa, mm^4, ...; a length: 1000 km): such
# a number only overflows the engine's powers and products (a section's depth to the 6th) or
# underflows to a division by zero.
_MIN_SIZE, _MAX_SIZE, _MAX_LENGTH = 1e-12, 1e30, 1e9


def _check_number_value(
    value: float, field: str, text: Any, what: str, allow_zero: bool, allow_negative: bool,
    largest: float = _MAX_SIZE,
) -> float:
    if not math.isfinite(value):
        raise InputError(field, text, f"{what} must be a finite number", "enter a number with its unit")
    if value != 0 and not _MIN_SIZE <= abs(value) <= largest:
        raise InputError(field, text, f"{what} this {'large' if abs(value) > 1 else 'small'} "
                         "cannot be a measured or design value", "check the number and its unit")
    if value < 0 and not allow_negative:
        raise InputError(field, text, f"{what} cannot be negative", "enter the size without a sign")
    if value == 0 and not allow_zero:
        raise InputError(field, text, f"{what} cannot be zero", "enter a value greater than zero")
    return float(value)


def _python_number(text: Any, field: str) -> float | None:
    """The float of a Python/numpy number, None for a string, InputError for anything else."""
    if isinstance(text, str):
        return None
    if isinstance(text, (bool, np.bool_)) or not isinstance(text, Real):
        raise InputError(field, text, f"expected text or a number, got {type(text).__name__}")
    return float(text)


# ---------------------------------------------------------------------------------------------
# Lengths: our own grammar
#
#   entry  := [sign] group [ [-] group ]
#   group  := value [unit]
#   value  := decimal | fraction | whole (space | -) fraction
#   unit   := mm | cm | m | in | " | ft | ' | (long names)
# Two groups are only feet then inches (the inch mark may be left off: 12'-6).

_LEN_UNITS: dict[str, float] = {
    "mm": 1.0,
    "millimeter": 1.0,
    "millimeters": 1.0,
    "millimetre": 1.0,
    "millimetres": 1.0,
    "cm": 10.0,
    "centimeter": 10.0,
    "centimeters": 10.0,
    "centimetre": 10.0,
    "centimetres": 10.0,
    "m": 1000.0,
    "meter": 1000.0,
    "meters": 1000.0,
    "metre": 1000.0,
    "metres": 1000.0,
    "in": MM_PER_IN,
    "inch": MM_PER_IN,
    "inches": MM_PER_IN,
    '"': MM_PER_IN,
    "ft": MM_PER_FT,
    "foot": MM_PER_FT,
    "feet": MM_PER_FT,
    "'": MM_PER_FT,
}
def _did_you_mean(typed: str, units: dict[str, float]) -> str:
    """`` (did you mean 'ft'?)`` when the typed unit is a near miss of known units that all
    mean the same size; nothing when the near misses differ (12 mn: mm or m, a thousandfold
    apart). Only ever said, never applied.

    Example:
        >>> _did_you_mean("fr", _LEN_UNITS), _did_you_mean("mn", _LEN_UNITS)
        (" (did you mean 'ft'?)", '')
    """
    import difflib

    word = typed.strip().rstrip(".").lower()
    near = difflib.get_close_matches(word, [u for u in units if len(u) > 1], n=5, cutoff=0.5)
    if not near or len({units[u] for u in near}) != 1:
        return ""
    return f" (did you mean {near[0]!r}?)"


_LEN_HELP = "use mm, cm, m, in, ft or feet-inches such as 12'-6\" or 12 ft 6 1/2 in"

_LEN_TOKEN = re.compile(
    r"""
     (?P<frac>\d+\s*/\s*\d+)
    |(?P<num>(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)
    |(?P<unit>[A-Za-z]+\.?|'|")
    |(?P<dash>-)
    |(?P<plus>\+)
    |(?P<space>\s+)
    |(?P<other>.)
    """,
    re.VERBOSE,
)


def _to_mm(value: float, unit: str | None, default: float) -> float:
    factor = default if unit is None else _length_unit(unit)
    # feet via inches keeps exact results exact: 12.5 ft -> 150 in -> 3810.0 mm
    if factor == MM_PER_FT:
        return value * 12.0 * MM_PER_IN
    return value * factor


def _length_unit(word: str) -> float | None:
    if word in ("'", '"'):
        return _LEN_UNITS[word]
    return _LEN_UNITS.get(word.rstrip(".").lower())


def _is_foot(word: str | None) -> bool:
    return word is not None and _length_unit(word) == MM_PER_FT


def _is_inch(word: str | None) -> bool:
    return word is not None and _length_unit(word) == MM_PER_IN


def _ft_in_hint(feet: float, inches: float) -> str:
    total16 = round((feet * 12 + inches) * 16)
    return f"did you mean {_format_ft_in(total16 / 16 * MM_PER_IN)}?"


def _foreign_unit_reason(word: str, kind: str) -> str:
    """'expected a length, got a force' when ``word`` is a unit of another kind, else ''."""
    try:
        unit = _normalise_unit(word)
    except _UnitProblem:
        return ""
    for other in KINDS:
        if other in (kind, "angle", "ratio", "length"):
            continue
        if unit in _FAST[other]:
            return f"expected {_KIND_WORDS[kind][0]}, got {_KIND_WORDS[other][0]}"
    return ""


#: entries read before (text and how it was read -> the value): a record is checked again
#: and again with the same few entries, and the answer depends on nothing else. Bounded.
_READ: dict[tuple, float] = {}


def _remembered(key: tuple, value: float) -> float:
    if len(_READ) >= 8192:
        _READ.clear()
    _READ[key] = value
    return value


def parse_length(
    text: str | float | int,
    field: str,
    *,
    default_unit: str = "mm",
    allow_zero: bool = False,
    allow_negative: bool = False,
) -> float:
    """Read a length as typed on site and return it in mm.

    Args:
        text: the entry, e.g. ``12'-6"``, ``12' 6 1/2"``, ``12 ft 6 in``, ``6-1/2"``, ``3.81 m``,
            ``150 mm``; a bare number, or a Python number, is in ``default_unit``.
            Unicode primes, smart quotes and the fractions ½ ¼ ¾ ⅛ ⅜ ⅝ ⅞ are understood.
        field: the field name carried by any error.
        default_unit: unit of a bare number: ``mm``, ``cm``, ``m``, ``in`` or ``ft``.
        allow_zero: accept 0 (e.g. an offset); otherwise zero is an error.
        allow_negative: accept a leading minus (e.g. an eccentricity); otherwise an error.

    Returns:
        the length in mm (float).

    Raises:
        InputError: naming ``field`` for anything it cannot read, with a hint.

    Example:
        >>> round(parse_length("12' 6 1/2\\"", "length"), 6)
        3822.7
        >>> parse_length(12.5, "length", default_unit="ft")
        3810.0
    """
    if type(text) is str:
        key = ("parse_length", text, default_unit, allow_zero, allow_negative)
        got = _READ.get(key)
        if got is not None:
            return got
        return _remembered(key, _parse_length(text, field, default_unit=default_unit, allow_zero=allow_zero, allow_negative=allow_negative))
    return _parse_length(text, field, default_unit=default_unit, allow_zero=allow_zero, allow_negative=allow_negative)


def _parse_length(text: str | float | int, field: str, *, default_unit: str = "mm",
                  allow_zero: bool = False, allow_negative: bool = False) -> float:
    default = _LEN_UNITS.get(default_unit.lower()) if isinstance(default_unit, str) else None
    if default is None or default_unit in ("'", '"'):
        raise InputError(field, default_unit, "unknown default unit for a length", _LEN_HELP)
    number = _python_number(text, field)
    if number is not None:
        return _check_number_value(_to_mm(number, None, default), field, text, "a length", allow_zero, allow_negative,
                                   _MAX_LENGTH)

    s = _clean(text)
    if not s:
        raise InputError(field, text, "the entry is empty", "enter a length such as 12'-6\" or 3810 mm")
    if "," in s:
        raise _comma_error(field, text, "3.81 m or 3810 mm")

    tokens: list[tuple[str, str]] = []
    for m in _LEN_TOKEN.finditer(s):
        kind = m.lastgroup or "other"
        if kind == "space":
            continue
        if kind == "other":
            raise InputError(field, text, f"unexpected character {m.group()!r}", _LEN_HELP)
        tokens.append((kind, m.group()))

    sign = 1.0
    if tokens and tokens[0][0] in ("dash", "plus"):
        sign = -1.0 if tokens[0][0] == "dash" else 1.0
        tokens = tokens[1:]

    # values (with their unit word, if any) and the dashes between them
    items: list[tuple[float, str | None, bool] | None] = []  # None marks a dash
    i, n = 0, len(tokens)
    while i < n:
        kind, tok = tokens[i]
        if kind == "dash":
            items.append(None)
            i += 1
            continue
        if kind == "plus":
            raise InputError(field, text, "unexpected '+'", _LEN_HELP)
        if kind == "unit":
            raise InputError(field, text, f"expected a number before {tok!r}", _LEN_HELP)
        whole = kind == "num" and tok.isdigit()
        value = _fraction(tok, field, text) if kind == "frac" else float(tok)
        i += 1
        # a mixed number: 6 1/2 or 6-1/2
        j = i + 1 if (i < n and tokens[i][0] == "dash") else i
        if kind == "num" and j < n and tokens[j][0] == "frac":
            if not whole:
                raise InputError(
                    field, text, "a mixed number needs a whole number before the fraction",
                    "write e.g. 6 1/2\" or 6.5\"",
                )
            frac = _fraction(tokens[j][1], field, text)
            if frac >= 1:
                raise InputError(
                    field, text, f"{tokens[j][1]} is not a proper fraction in a mixed number",
                    "write e.g. 6 1/2\"",
                )
            value += frac
            whole = False
            i = j + 1
        unit = None
        if i < n and tokens[i][0] == "unit":
            unit = tokens[i][1]
            i += 1
            if _length_unit(unit) is None:
                reason = _foreign_unit_reason(unit, "length") or \
                    f"unknown length unit {unit!r}{_did_you_mean(unit, _LEN_UNITS)}"
                raise InputError(field, text, reason, _LEN_HELP)
        items.append((value, unit, whole))

    groups = [g for g in items if g is not None]
    dashes = len(items) - len(groups)
    if not groups:
        raise InputError(field, text, "no number found", "enter a length such as 12'-6\" or 3810 mm")
    if len(groups) > 2 or dashes > 1 or items[0] is None or items[-1] is None:
        raise InputError(field, text, "cannot read it as one length", _LEN_HELP)
    if len(groups) == 1:
        value, unit, _ = groups[0]
        mm = _to_mm(value, unit, default)
    else:
        (v1, u1, whole1), (v2, u2, _) = groups
        if u1 is None:
            raise InputError(
                field, text, "two numbers without a unit on the first are ambiguous",
                _ft_in_hint(v1, v2) + " (feet and inches)",
            )
        if not _is_foot(u1) or not (u2 is None or _is_inch(u2)):
            if _is_inch(u1) and _is_foot(u2):
                raise InputError(field, text, "feet must come before inches", _ft_in_hint(v2, v1))
            raise InputError(
                field, text, "only feet followed by inches can be combined",
                "write a single value, e.g. 3.2 m or 3200 mm",
            )
        if not whole1:
            raise InputError(
                field, text, "feet with a fractional part cannot be followed by inches",
                _ft_in_hint(v1, v2),
            )
        if v2 >= 12:
            raise InputError(field, text, f"{v2:g} in is a foot or more", _ft_in_hint(v1, v2))
        mm = (v1 * 12.0 + v2) * MM_PER_IN
    return _check_number_value(sign * mm, field, text, "a length", allow_zero, allow_negative,
                               _MAX_LENGTH)


def _fraction(tok: str, field: str, text: str) -> float:
    num, den = (int(p) for p in tok.split("/"))
    if den == 0:
        raise InputError(field, text, f"{tok.replace(' ', '')} divides by zero", "write e.g. 1/2")
    return num / den


# ---------------------------------------------------------------------------------------------
# Other quantities: one number, one unit


class _UnitProblem(Exception):
    def __init__(self, reason: str, hint: str | None = None):
        super().__init__(reason)
        self.reason = reason
        self.hint = hint


# Token spellings mapped to the one name we use (and that pint reads the same way).
_ALIASES: dict[str, str] = {
    "k": "kip",
    "K": "kip",
    "kips": "kip",
    "Kips": "kip",
    "KIP": "kip",
    "KIPS": "kip",
    "lb": "lbf",
    "lbs": "lbf",
    "LB": "lbf",
    "LBS": "lbf",
    "pound": "lbf",
    "pounds": "lbf",
    "kN": "kN",
    "KN": "kN",
    "kn": "kN",
    "Kn": "kN",
    "tf": "tonne_force",
    "tonnef": "tonne_force",
    "inch": "in",
    "inches": "in",
    "IN": "in",
    "feet": "ft",
    "foot": "ft",
    "FT": "ft",
    "MM": "mm",
    "degree": "deg",
    "degrees": "deg",
    "radian": "rad",
    "radians": "rad",
    "kNm": "kN*m",
    "KNm": "kN*m",
    "knm": "kN*m",
    "Nmm": "N*mm",
    "Nm": "N*m",
}
# Spellings whose case nobody means (millipascal, millinewton-per-... are never meant here).
_ALIASES_ANY_CASE: dict[str, str] = {
    "mpa": "MPa",
    "gpa": "GPa",
    "kpa": "kPa",
    "ksi": "ksi",
    "psi": "psi",
    "kip": "kip",
    "lbf": "lbf",
    "kgf": "kgf",
}
_REFUSED: dict[str, tuple[str, str]] = {
    "t": ("'t' is a mass (metric tonne), not a force", "for tonne-force write tf; or use kN"),
    "ton": ("'ton' is ambiguous: short ton (2000 lbf) or tonne (9.807 kN)?", "write kip, lbf, tf or kN"),
    "tons": ("'tons' is ambiguous: short ton (2000 lbf) or tonne (9.807 kN)?", "write kip, lbf, tf or kN"),
    "tonf": ("'tonf' is ambiguous: short ton-force or tonne-force?", "write 2000 lbf, tf or kN"),
    "ton_force": ("'ton_force' is ambiguous: short ton or tonne?", "write 2000 lbf, tf or kN"),
    "T": ("'T' is ambiguous (tesla, ton, tonne)", "write kip, tf or kN"),
    "kg": ("'kg' is a mass, not a force", "for kilogram-force write kgf; or use N"),
    "g": ("'g' is a mass (gram)", "use N or lbf"),
}

_UNIT_TOKEN = re.compile(
    r"""
     (?P<ident>[A-Za-z_]+)
    |(?P<pow>(?:\^|\*\*)\s*[+-]?\d+)
    |(?P<digits>\d+)
    |(?P<op>[*/])
    |(?P<paren>[()])
    |(?P<pct>%)
    |(?P<sep>[-.\s]+)
    |(?P<other>.)
    """,
    re.VERBOSE,
)


@lru_cache(maxsize=1024)
def _normalise_unit(unit: str) -> str:
    """Rewrite a unit as typed into one spelling pint reads as meant: ``N/mm2`` -> ``N/mm**2``.

    Digits glued to a name are a power (``in4``, ``mm2``); a dash, dot or space between names is
    a product (``kip-ft``, ``kN.m``); ``in.`` loses its dot; ``%`` is ``percent``.
    """
    if unit.strip() in _REFUSED:  # alone; inside a compound pint's dimension check decides
        raise _UnitProblem(*_REFUSED[unit.strip()])
    # "sq in", "sq. ft" are areas
    unit = re.sub(r"\bsq\.?\s*([A-Za-z]+)\.?", r"\1^2", unit)
    out: list[str] = []
    last = ""  # kind of the last token written: ident, pow, close, op, open
    glued = False  # the previous token was a name with nothing after it yet
    for m in _UNIT_TOKEN.finditer(unit.strip()):
        kind, tok = m.lastgroup, m.group()
        if kind == "ident":
            name = _ALIASES.get(tok) or _ALIASES_ANY_CASE.get(tok.lower()) or tok
            if last in ("ident", "pow", "close"):
                out.append("*")
            out.append(name)
            last, glued = "ident", True
            continue
        if kind == "digits":
            if not glued:
                raise _UnitProblem(f"a number inside the unit {unit!r}", "write one number, then the unit")
            out.append("**" + tok)
            last, glued = "pow", False
            continue
        glued = False
        if kind == "pow":
            if last not in ("ident", "close"):
                raise _UnitProblem(f"a power without a unit in {unit!r}")
            out.append("**" + re.sub(r"^(\^|\*\*)\s*", "", tok))
            last = "pow"
        elif kind == "op":
            if last in ("op", "open", ""):
                raise _UnitProblem(f"cannot read the unit {unit!r}")
            out.append(tok)
            last = "op"
        elif kind == "paren":
            if tok == "(" and last in ("ident", "pow", "close"):
                out.append("*")
            out.append(tok)
            last = "open" if tok == "(" else "close"
        elif kind == "pct":
            if last in ("ident", "pow", "close"):
                out.append("*")
            out.append("percent")
            last = "ident"
        elif kind == "sep":
            continue
        else:
            raise _UnitProblem(f"unexpected character {tok!r} in the unit")
    return "".join(out)


def _fast_table() -> dict[str, dict[str, float]]:
    ksi, psi, kip, lbf, inch, ft = MPA_PER_KSI, MPA_PER_PSI, N_PER_KIP, N_PER_LBF, MM_PER_IN, MM_PER_FT
    spelled: dict[str, list[tuple[str, float]]] = {
        # lengths are read by parse_length; listed so that messages can name a length
        "length": [("mm", 1.0), ("cm", 10.0), ("m", 1e3), ("in", inch), ("ft", ft)],
        "force": [
            ("N", 1.0), ("kN", 1e3), ("MN", 1e6), ("lbf", lbf), ("kip", kip), ("tonne_force", N_PER_TF),
            ("kgf", 9.80665),
        ],
        "stress": [
            ("MPa", 1.0), ("N/mm^2", 1.0), ("kN/mm^2", 1e3), ("GPa", 1e3), ("kPa", 1e-3), ("Pa", 1e-6),
            ("kN/m^2", 1e-3), ("N/m^2", 1e-6), ("kN/cm^2", 10.0), ("MN/m^2", 1.0), ("ksi", ksi), ("psi", psi),
            ("kip/in^2", ksi), ("lbf/in^2", psi),
        ],
        "area": [("mm^2", 1.0), ("cm^2", 1e2), ("m^2", 1e6), ("in^2", inch**2), ("ft^2", ft**2)],
        "modulus": [("mm^3", 1.0), ("cm^3", 1e3), ("m^3", 1e9), ("in^3", inch**3)],
        "inertia": [("mm^4", 1.0), ("cm^4", 1e4), ("m^4", 1e12), ("in^4", inch**4)],
        "warping": [("mm^6", 1.0), ("cm^6", 1e6), ("m^6", 1e18), ("in^6", inch**6)],
        "stiffness": [
            ("N/mm", 1.0), ("kN/mm", 1e3), ("kN/m", 1.0), ("N/m", 1e-3), ("MN/m", 1e3), ("kip/in", kip / inch),
            ("lbf/in", lbf / inch), ("kip/ft", kip / ft),
        ],
        "rotational_stiffness": [
            ("N*mm/rad", 1.0), ("kN*mm/rad", 1e3), ("N*m/rad", 1e3), ("kN*m/rad", 1e6), ("MN*m/rad", 1e9),
            ("kip*in/rad", kip * inch), ("kip*ft/rad", kip * ft), ("lbf*in/rad", lbf * inch),
        ],
        "moment": [
            ("N*mm", 1.0), ("kN*mm", 1e3), ("N*m", 1e3), ("kN*m", 1e6), ("MN*m", 1e9), ("kip*in", kip * inch),
            ("kip*ft", kip * ft), ("lbf*in", lbf * inch), ("lbf*ft", lbf * ft), ("in*kip", kip * inch),
            ("ft*kip", kip * ft), ("ft*lbf", lbf * ft), ("in*lbf", lbf * inch),
        ],
        "angle": [("deg", 1.0), ("rad", 180.0 / math.pi)],
        "ratio": [("", 1.0), ("percent", 0.01)],
    }
    # The rotational spring may be typed without "/rad" (pint treats the radian as a pure number).
    spelled["rotational_stiffness"] += [(u.replace("/rad", ""), f) for u, f in spelled["rotational_stiffness"]]
    return {k: {_normalise_unit(u): f for u, f in v} for k, v in spelled.items()}


_FAST = _fast_table()
# Angle and ratio take only their own units: pint would turn "5%" into an angle without a word.
_CLOSED_KINDS = ("angle", "ratio")


@lru_cache(maxsize=1024)
def _pint_factor(unit: str, kind: str) -> float:
    return float(get_registry().Quantity(1.0, unit).m_as(INTERNAL_UNITS[kind]))


# moment before rotational stiffness: "kN*m" should be named a moment in messages
_NAMING_ORDER = tuple(k for k in KINDS if k != "rotational_stiffness") + ("rotational_stiffness",)


def _kind_of_unit(unit: str) -> str | None:
    for k in _NAMING_ORDER:
        if unit in _FAST[k]:
            return k
    try:
        reg = get_registry()
        q = reg.Quantity(1.0, unit)
        for k in _NAMING_ORDER:
            if k in _CLOSED_KINDS:
                continue
            if q.is_compatible_with(reg.Quantity(1.0, INTERNAL_UNITS[k])):
                return k
        return "a quantity of dimension " + str(q.dimensionality)
    except Exception:
        return None


def _unit_factor(unit_text: str, kind: str, field: str, text: Any) -> float:
    """Internal units per one ``unit_text`` for ``kind``; InputError naming ``field`` otherwise."""
    noun, examples = _KIND_WORDS[kind]
    try:
        unit = _normalise_unit(unit_text)
    except _UnitProblem as p:
        raise InputError(field, text, p.reason, p.hint or f"e.g. {examples}") from None
    fast = _FAST[kind].get(unit)
    if fast is not None:
        return fast
    if kind in _CLOSED_KINDS:
        raise InputError(field, text, f"unknown unit {unit_text!r} for {noun}", f"e.g. {examples}")
    try:
        return _pint_factor(unit, kind)
    except Exception as e:
        other = _kind_of_unit(unit)
        hint = f"e.g. {examples}"
        if other in _KIND_WORDS:
            reason = f"expected {noun} (e.g. {examples}), got {_KIND_WORDS[other][0]}"
            hint = f"enter {noun} with its unit"
        elif other:
            reason = f"expected {noun} (e.g. {examples}), got {other}"
            hint = f"enter {noun} with its unit"
        elif type(e).__name__ == "UndefinedUnitError":
            reason = f"unknown unit {unit_text.strip()!r}{_did_you_mean(unit_text, _FAST[kind])}"
        else:
            reason = f"cannot read the unit {unit_text.strip()!r}"
        raise InputError(field, text, reason, hint) from None


_NUMBER = re.compile(
    r"""^\s*(?P<sign>[+-])?\s*
    (?:(?P<fn>\d+)\s*/\s*(?P<fd>\d+(?:\.\d+)?)
      |(?P<dec>(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?))
    (?P<rest>.*)$""",
    re.VERBOSE | re.DOTALL,
)
_SPAN_RATIO = re.compile(r"^\s*[LlHh]\s*/\s*(?P<den>\d+(?:\.\d+)?)\s*$")


def parse_quantity(
    text: str | float | int,
    kind: str,
    field: str,
    *,
    default_unit: str | None = None,
    allow_zero: bool = False,
    allow_negative: bool = False,
) -> float:
    """Read one quantity (number and unit) and return it in the internal unit of ``kind``.

    Args:
        text: the entry, e.g. ``"840 kip"``, ``"3700 kN"``, ``"345 N/mm2"``, ``"1200 cm4"``,
            ``"2.5 kip/in"``, ``"0.2%"``; a Python number or a bare number string is in
            ``default_unit``.
        kind: one of ``KINDS``; ``INTERNAL_UNITS[kind]`` is the unit of the result.
            ``length`` is read by ``parse_length`` (feet-inches allowed).
        field: the field name carried by any error.
        default_unit: unit of a bare number; None means the internal unit of ``kind``.
        allow_zero: accept 0.
        allow_negative: accept a value below zero (a moment, an eccentricity).

    Returns:
        the value in ``INTERNAL_UNITS[kind]`` (float).

    Raises:
        InputError: naming ``field``: unreadable text, unknown unit, a unit of another kind
            ("expected a force (e.g. 840 kip, 3700 kN), got a length"), zero, negative, NaN, inf.

    Example:
        >>> parse_quantity("345 N/mm2", "stress", "Fy")
        345.0
        >>> round(parse_quantity("50 ksi", "stress", "Fy"), 3)
        344.738
        >>> parse_quantity("1/500", "ratio", "bow")
        0.002
    """
    if type(text) is str:
        key = ("parse_quantity", kind, text, default_unit, allow_zero, allow_negative)
        got = _READ.get(key)
        if got is not None:
            return got
        return _remembered(key, _parse_quantity(text, kind, field, default_unit=default_unit, allow_zero=allow_zero, allow_negative=allow_negative))
    return _parse_quantity(text, kind, field, default_unit=default_unit, allow_zero=allow_zero, allow_negative=allow_negative)


def _parse_quantity(text: str | float | int, kind: str, field: str, *,
                    default_unit: str | None = None, allow_zero: bool = False,
                    allow_negative: bool = False) -> float:
    _check_kind(kind, field)
    if kind == "length":
        return parse_length(
            text, field, default_unit=default_unit or "mm", allow_zero=allow_zero, allow_negative=allow_negative
        )
    noun, examples = _KIND_WORDS[kind]
    unit_default = INTERNAL_UNITS[kind] if default_unit is None else default_unit
    number = _python_number(text, field)
    if number is not None:
        value = number * _unit_factor(unit_default, kind, field, text)
        return _check_number_value(value, field, text, noun, allow_zero, allow_negative)

    s = _clean(text)
    if not s:
        raise InputError(field, text, "the entry is empty", f"enter {noun}, e.g. {examples}")
    if "," in s:
        raise _comma_error(field, text, examples.split(",")[0])
    if kind == "ratio" and (m := _SPAN_RATIO.match(s)):
        value = _divide(1.0, float(m["den"]), field, text)
        return _check_number_value(value, field, text, noun, allow_zero, allow_negative)
    m = _NUMBER.match(s)
    if m is None:
        raise InputError(field, text, "no number at the start", f"enter {noun}, e.g. {examples}")
    if m["dec"] is not None:
        number = float(m["dec"])
    else:
        number = _divide(float(m["fn"]), float(m["fd"]), field, text)
    if m["sign"] == "-":
        number = -number
    rest = m["rest"].strip()
    factor = _unit_factor(rest if rest else unit_default, kind, field, text)
    return _check_number_value(number * factor, field, text, noun, allow_zero, allow_negative)


def _divide(num: float, den: float, field: str, text: Any) -> float:
    if den == 0:
        raise InputError(field, text, "division by zero", "write e.g. 1/500")
    return num / den


# ---------------------------------------------------------------------------------------------
# Display


def _fmt_number(x: float, digits: int, plain_below: float = 1e7) -> str:
    """``digits`` significant digits; whole part never rounded below ``plain_below``; else
    ``123.5e6``, but a round number of six digits (no more than ``digits`` significant, as a
    code states E = 210000 MPa) stays whole."""
    if not math.isfinite(x):
        return str(x)
    if x == 0:
        return "0"
    ax = abs(x)
    e = math.floor(math.log10(ax))
    if ax < 1e-3 or (ax >= plain_below
                     and not (ax < 1e6 and float(f"{x:.{digits}g}") == x)):
        # engineering notation (exponent a multiple of 3) reads like "x 10^6 mm^4"
        e3 = 3 * math.floor(e / 3)
        mant = x / 10.0**e3
        if abs(float(f"{mant:.{max(0, digits - 1 - (e - e3))}f}")) >= 1000:
            e3 += 3
            mant = x / 10.0**e3
        me = math.floor(math.log10(abs(mant)))
        return f"{_fixed(mant, max(0, digits - 1 - me))}e{e3}"
    return _fixed(x, max(0, digits - 1 - e))


def _fixed(x: float, decimals: int) -> str:
    s = f"{x:.{decimals}f}"
    if "." in s:
        s = s.rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def _format_ft_in(mm: float) -> str:
    n16 = math.floor(abs(mm) / MM_PER_IN * 16 + 0.5)  # whole sixteenths, half rounds up
    sign = "-" if mm < 0 and n16 else ""
    feet, rem = divmod(n16, 192)
    inches, sixteenths = divmod(rem, 16)
    g = math.gcd(sixteenths, 16)
    frac = f"{sixteenths // g}/{16 // g}" if sixteenths else ""
    if feet:
        inch_txt = f"{inches} {frac}" if frac else f"{inches}"
        return f"{sign}{feet}'-{inch_txt}\""
    if not inches and frac:
        return f"{sign}{frac}\""
    return f"{sign}{inches} {frac}\"" if frac else f"{sign}{inches}\""


#: values shown before (a check writes the same few lengths and forces into its messages again
#: and again); bounded
_SHOWN: dict[tuple, str] = {}
_PLAIN = (float, int, np.float64)


def format_length(mm: float, system: str) -> str:
    """A length for display in the site's system.

    Args:
        mm: the length in mm.
        system: ``"us"`` (feet-inches to the nearest 1/16 in; below a foot inches only) or
            ``"si"`` (mm, 4 significant digits, whole millimetres never rounded).

    Returns:
        text that ``parse_length`` reads back, e.g. ``12'-6 1/16"``, ``6 1/2"``, ``3810 mm``.

    Example:
        >>> format_length(3811.6, "us"), format_length(165.1, "us"), format_length(3810.2, "si")
        ('12\\'-6 1/16"', '6 1/2"', '3810 mm')
    """
    if type(mm) not in _PLAIN or not mm:  # (0.0 and -0.0 are one key: shown each time)
        return _format_length(mm, system)
    key = ("length", type(mm), mm, system)
    got = _SHOWN.get(key)
    if got is None:
        got = _format_length(mm, system)
        if len(_SHOWN) >= 8192:
            _SHOWN.clear()
        _SHOWN[key] = got
    return got


def _format_length(mm: float, system: str) -> str:
    _check_system(system)
    mm = float(mm)
    if system == "us" and math.isfinite(mm):
        return _format_ft_in(mm)
    return f"{_fmt_number(mm, 4)} mm"


def format_reading(mm: float, system: str, *, fraction: bool = True) -> str:
    """A length read on site (a bow or an out-of-plumb off a string line and a rule, a
    thickness left off a gauge) as the engineer records it: the one writer of such a value
    wherever it shows (the app's readings and record, the engine's warnings, the report's
    rows and trace).

    On a US site, under a foot: a bow or a plumb reading that is a whole number of sixteenths
    as the fraction an engineer writes on site (to the nearest 1/16 or 1/8 in: ``1 1/8 in``),
    any other value in decimal inches to 0.001 in (``0.933 in``), so a reading comes back as
    it was recorded and a value worked out from it (an excess, an allowance) is not rounded
    to a sixteenth it is not; a gauge's reading (``fraction=False``: a thickness) always in
    decimals, as the gauge shows it (``0.5 in``). Else as ``format_length``.

    Args:
        mm: the length in mm.
        system: ``"us"`` or ``"si"``.
        fraction: False for a gauge's reading (a thickness left), never written as a fraction.

    Returns:
        e.g. ``"1 1/8 in"``, ``"0.933 in"``, ``"3/16 in"``, ``"28.6 mm"``, ``"12'-6\""``.

    Example:
        >>> format_reading(28.575, "us"), format_reading(23.7, "us"), format_reading(28.6, "si")
        ('1 1/8 in', '0.933 in', '28.6 mm')
        >>> format_reading(12.7, "us", fraction=False)
        '0.5 in'
    """
    if system == "us" and type(mm) in _PLAIN and math.isfinite(mm) and abs(mm) < MM_PER_FT:
        inches = abs(mm) / MM_PER_IN
        n16 = round(inches * 16)
        if fraction and n16 and abs(inches * 16 - n16) < 1e-6:
            whole, part = divmod(n16, 16)
            g = math.gcd(part, 16)
            frac = f"{part // g}/{16 // g}" if part else ""
            sign = "-" if mm < 0 else ""
            return f"{sign}{' '.join(x for x in (str(whole) if whole else '', frac) if x)} in"
        # (a nudge so that 0.0005 in rounds up, as a person rounds it)
        return f"{_fixed(mm / MM_PER_IN + math.copysign(1e-9, mm), 3)} in"
    return format_length(mm, system)


def format_quantity(value: float, kind: str, system: str, digits: int = 4) -> str:
    """A quantity in internal units, as text in the site's display unit.

    Args:
        value: the value in ``INTERNAL_UNITS[kind]``.
        kind: one of ``KINDS`` (``length`` uses ``format_length`` in US units).
        system: ``"us"`` or ``"si"``.
        digits: significant digits (the whole-number part is never rounded).

    Returns:
        e.g. ``"840 kip"``, ``"3736 kN"``, ``"50 ksi"``, ``"0.002"`` for a ratio.

    Example:
        >>> format_quantity(3736506.3, "force", "us"), format_quantity(3736506.3, "force", "si")
        ('840 kip', '3737 kN')
    """
    if type(value) not in _PLAIN or not value:
        return _format_quantity(value, kind, system, digits)
    key = (kind, type(value), value, system, digits)
    got = _SHOWN.get(key)
    if got is None:
        got = _format_quantity(value, kind, system, digits)
        if len(_SHOWN) >= 8192:
            _SHOWN.clear()
        _SHOWN[key] = got
    return got


def format_entry(entry: Any, kind: str, system: str) -> str:
    """A recorded entry of ``kind`` as the app shows it: read, then written by
    ``format_quantity`` in the site's system. A stiffness typed ``20.00 kip/in``, ``20 kip/in``
    or in kN/mm on a US site then reads as the brace requirement and the trace beside it
    (``20 kip/in``; four significant figures, the one rule), never in the typist's own
    notation. An entry that is not a quantity (``rigid``, ``held``) or does not read is shown
    as typed: the check names its fault.

    Args:
        entry: the record's value as typed.
        kind: one of ``KINDS``.
        system: ``"us"`` or ``"si"``.

    Returns:
        the text, e.g. ``"20 kip/in"``, ``"3.5 kN/mm"``, ``"rigid"``.

    Example:
        >>> format_entry("20.00 kip/in", "stiffness", "us")
        '20 kip/in'
        >>> format_entry("3.5 kN/mm", "stiffness", "us")
        '19.99 kip/in'
        >>> format_entry("rigid", "stiffness", "si")
        'rigid'
    """
    if not isinstance(entry, str):  # a bare number has no unit to show it in: as typed
        return str(entry)
    try:
        float(entry)
        return entry
    except ValueError:
        pass
    try:
        value = parse_quantity(entry, kind, "entry", allow_zero=True)
    except InputError:
        return str(entry)
    return format_quantity(value, kind, system)


def _format_quantity(value: float, kind: str, system: str, digits: int = 4,
                     plain_below: float = 1e7) -> str:
    table = _check_system(system)
    _check_kind(kind, "kind")
    if kind == "length" and system == "us":
        return format_length(value, system)
    unit, factor = table[kind]
    number = _fmt_number(float(value) / factor, digits, plain_below)
    return f"{number} {unit}" if unit else number


#: a trace writes a value of 1e5 or more as an engineer does, in engineering notation
#: (``1.892e6 mm^4``, ``224.6e3 mm^4``): six whole digits claim more than the check knows;
#: E = 29000 ksi or A = 14908 mm^2 below it, and a round E = 210000 MPa, stay as the codes and
#: tables print them
TRACE_PLAIN_BELOW = 1e5
#: the engine's unit of a trace step -> its kind (``N mm``: checks saved before the built-up
#: batten moment was written in N*mm)
STEP_KINDS: dict[str, str] = {u: k for k, u in INTERNAL_UNITS.items() if u} | {"N mm": "moment"}


def format_step(value: float, unit: str, system: str) -> str:
    """A calculation step's value, in the engine's ``unit``, as every trace writes it (the
    app's Check tab, the report, ``fieldcol check``).

    Four significant figures, from ``TRACE_PLAIN_BELOW`` up in engineering notation (the
    exponent a multiple of 3); on a US site a length under a foot in decimal inches (a radius
    of gyration to the nearest 1/16 in does not give back the Lc/r beside it), a longer one
    in feet-inches; a unit the engine does not use for a kind is kept as written.

    Args:
        value: the step's number in ``unit``.
        unit: the engine's unit (``"mm^4"``, ``"N"``, ``""`` for a pure number).
        system: ``"us"`` or ``"si"``.

    Returns:
        the text, e.g. ``"1.892e6 mm^4"``, ``"2.544 in"``, ``"16'-0\""``, ``"0.3685"``.

    Example:
        >>> format_step(1891784.0, "mm^4", "si"), format_step(64.6, "mm", "us")
        ('1.892e6 mm^4', '2.543 in')
    """
    key = ("step", type(value), value, unit, system)
    got = _SHOWN.get(key)
    if got is None:
        got = _format_step(value, unit, system)
        if len(_SHOWN) >= 8192:
            _SHOWN.clear()
        _SHOWN[key] = got
    return got


def _format_step(value: float, unit: str, system: str) -> str:
    kind = STEP_KINDS.get(unit)
    if kind == "length" and system == "us" and abs(value) < MM_PER_FT:
        return f"{_fmt_number(float(value) / MM_PER_IN, 4, TRACE_PLAIN_BELOW)} in"
    if kind is not None:
        return _format_quantity(value, kind, system, 4, TRACE_PLAIN_BELOW)
    number = _fmt_number(float(value), 4, TRACE_PLAIN_BELOW)
    return f"{number} {unit}" if unit else number


def display_unit(kind: str, system: str) -> str:
    """The unit values of ``kind`` are shown in (pint-readable).

    Args:
        kind: one of ``KINDS``.
        system: ``"us"`` or ``"si"``.

    Returns:
        e.g. ``"kip"``, ``"kN*m/rad"``, ``"in^4"``; ``""`` for a ratio; ``"in"`` for US lengths.

    Example:
        >>> display_unit("stress", "us"), display_unit("inertia", "si")
        ('ksi', 'mm^4')
    """
    table = _check_system(system)
    _check_kind(kind, "kind")
    return table[kind][0]


def to_display(value: float | np.ndarray, kind: str, system: str) -> float | np.ndarray:
    """Convert internal values to numbers in ``display_unit(kind, system)`` (no pint per call).

    Args:
        value: a float or an array in ``INTERNAL_UNITS[kind]``.
        kind: one of ``KINDS``.
        system: ``"us"`` or ``"si"``.

    Returns:
        a float for a scalar, an array for an array.

    Example:
        >>> to_display(3810.0, "length", "us")
        150.0
    """
    table = _check_system(system)
    _check_kind(kind, "kind")
    factor = table[kind][1]
    if isinstance(value, np.ndarray) or np.ndim(value) > 0:
        return np.asarray(value, dtype=float) / factor
    return float(value) / factor


def from_display(value: float | np.ndarray, kind: str, system: str) -> float | np.ndarray:
    """The inverse of ``to_display``: numbers in the display unit back to internal units.

    Args:
        value: a float or an array in ``display_unit(kind, system)``.
        kind: one of ``KINDS``.
        system: ``"us"`` or ``"si"``.

    Returns:
        a float for a scalar, an array for an array.

    Example:
        >>> from_display(50.0, "stress", "us") == 50 * MPA_PER_KSI
        True
    """
    table = _check_system(system)
    _check_kind(kind, "kind")
    factor = table[kind][1]
    if isinstance(value, np.ndarray) or np.ndim(value) > 0:
        return np.asarray(value, dtype=float) * factor
    return float(value) * factor


# a length or stress the engine wrote into a step's words in its own units ("356 x 9.5 mm",
# "2 rivets of 15.9 mm", "Fu 414 MPa"): a number not glued to a symbol, a power or a ratio
_WORD_MM = re.compile(r"(?<![\w.^/])(\d+(?:\.\d+)?)(?:( x | to )(\d+(?:\.\d+)?))? mm\b(?![\^\w])")
_WORD_MPA = re.compile(r"(?<![\w.^/])(\d+(?:\.\d+)?) MPa\b")


def _inches(number: str) -> str:
    """``number`` mm in inches: to the sixteenth where the millimetres, as rounded, are one,
    else in decimals (``"9.5"`` gives ``'3/8'``, ``"12.2"`` gives ``'0.48'``, ``"2"`` gives
    ``'0.0787'``)."""
    mm = float(number)
    places = len(number.partition(".")[2])
    sixteenths = round(mm / 25.4 * 16)
    # within the rounding of the millimetres as written, and within 2 % (2 mm is no 1/16 in)
    if sixteenths and abs(sixteenths * 25.4 / 16 - mm) <= min(0.5 * 10 ** -places,
                                                             0.02 * mm) + 1e-9:
        whole, part = divmod(sixteenths, 16)
        if not part:
            return str(whole)
        g = math.gcd(part, 16)
        frac = f"{part // g}/{16 // g}"
        return f"{whole} {frac}" if whole else frac
    return f"{mm / 25.4:.3g}"


def us_words(text: str) -> str:
    """A step's words with the lengths and stresses the engine wrote in mm and MPa shown in
    inches and ksi, for a US site.

    Example:
        >>> us_words("a web plate 356 x 9.5 mm, Fu 414 MPa")
        'a web plate 14 x 3/8 in, Fu 60 ksi'
    """
    if "mm" not in text and "MPa" not in text:
        return text

    def length(m: re.Match) -> str:
        first = _inches(m.group(1))
        if m.group(2):
            return f"{first}{m.group(2)}{_inches(m.group(3))} in"
        return f"{first} in"

    text = _WORD_MM.sub(length, text)
    return _WORD_MPA.sub(lambda m: f"{float(m.group(1)) / MPA_PER_KSI:.3g} ksi", text)
