"""The section catalogue: published nominal dimensions read from ``data/`` once, looked up by name.

The catalogue files hold dimensions only (see ``data/SOURCES.md``); every property is derived by
the same constructors a hand-entered section goes through.
"""

from __future__ import annotations

import csv
import difflib
import functools
import re
from dataclasses import dataclass, replace

import numpy as np

from fieldcol._resources import shipped
from fieldcol.errors import InputError
from fieldcol.sections._geometry import S_SLOPE, i_section, rect_hollow, round_hollow
from fieldcol.sections._section import Section

DATA_DIR = shipped("data")
_FILES = (("sections_aisc.csv", 25.4), ("sections_en.csv", 1.0))  # (file, mm per file unit)

FAMILIES = ("W", "HP", "S", "M", "HSS", "PIPE", "IPE", "HEA", "HEB", "HEM")
AISC_FAMILIES = ("W", "HP", "S", "M", "HSS", "PIPE")
EN_FAMILIES = ("IPE", "HEA", "HEB", "HEM")


@dataclass(frozen=True)
class CatalogueArrays:
    """The whole catalogue as parallel arrays (mm), for vectorised searches.

    ``t`` is the nominal wall (hollow) and ``tdes`` the design wall used for properties; both are
    NaN for I shapes, and tf, tw, r are NaN for hollow sections.
    """

    names: np.ndarray
    family: np.ndarray
    kind: np.ndarray
    d: np.ndarray
    bf: np.ndarray
    tf: np.ndarray
    tw: np.ndarray
    r: np.ndarray
    t: np.ndarray
    tdes: np.ndarray


def _num(text: str, scale: float) -> float:
    return float(text) * scale if text.strip() else float("nan")


@functools.lru_cache(maxsize=1)
def catalogue_arrays() -> CatalogueArrays:
    """Read the catalogue files once (cached) into arrays in mm.

    Returns:
        CatalogueArrays with one row per catalogue section.

    Example:
        >>> cat = catalogue_arrays()
        >>> "W14X90" in set(cat.names)
        True
    """
    fields = (("names", "designation"), ("family", "family"), ("kind", "kind"), ("d", "d"),
              ("bf", "bf"), ("tf", "tf"), ("tw", "tw"), ("r", "r"), ("t", "tnom"),
              ("tdes", "tdes"))
    cols: dict[str, list] = {k: [] for k, _ in fields}
    for fname, scale in _FILES:
        with (DATA_DIR / fname).open(newline="", encoding="utf-8") as fh:
            # read by position, a column at a time (the first check of a command line
            # reads the whole catalogue: a dict per row cost most of it)
            rows = list(csv.reader(line for line in fh if not line.startswith("#")))
        at = {name: i for i, name in enumerate(rows[0])}
        body = rows[1:]
        for key, col in fields:
            i = at[col]
            if key in ("names", "family", "kind"):
                cols[key] += [row[i] for row in body]
            else:
                cols[key] += [_num(row[i], scale) for row in body]
    arrays = {k: np.array(v, dtype=str if k in ("names", "family", "kind") else float)
              for k, v in cols.items()}
    return CatalogueArrays(**arrays)


# ---- names -----------------------------------------------------------------------------------

_MIXED = re.compile(r"(\d)\s*[- ]\s*(\d+/\d+)")  # 5-1/2 or 5 1/2 -> 5+1/2
_PREFIX = re.compile(r"^(PIPE|HSS|HP|HE|IPE|W|S|M)(.*)$")
_NUMBER = re.compile(r"^(\d+(?:\.\d*)?|\.\d+)$|^(\d+)/(\d+)$|^(\d+)\+(\d+)/(\d+)$")


def _number(tok: str) -> float | None:
    m = _NUMBER.match(tok)
    if not m:
        return None
    if m.group(1):
        return float(m.group(1))
    if m.group(2):
        return int(m.group(2)) / int(m.group(3)) if int(m.group(3)) else None
    return int(m.group(4)) + int(m.group(5)) / int(m.group(6)) if int(m.group(6)) else None


def _key(text: str) -> tuple | None:
    """(prefix, grade, numbers) for a designation typed any sensible way, or None.

    Example:
        >>> _key("HSS 5 1/2 x 5-1/2 x .375")
        ('HSS', '', (5.5, 5.5, 0.375))
        >>> _key("HE 300 B") == _key("heb300")
        True
    """
    s = text.upper().replace("×", "X").replace("*", "X").strip()
    s = _MIXED.sub(r"\1+\2", s)
    s = re.sub(r"[\s_,-]", "", s)
    m = _PREFIX.match(s)
    if not m:
        return None
    prefix, rest = m.groups()
    grade = ""
    if prefix == "HE":  # HEB300, HE300B
        m2 = re.fullmatch(r"([ABM])(\d+)|(\d+)([ABM])", rest)
        if not m2:
            return None
        letter = m2.group(1) or m2.group(4)
        return ("HE" + letter, "", (float(m2.group(2) or m2.group(3)),))
    if prefix == "PIPE":
        m2 = re.fullmatch(r"(.+?)(XXS|XS|STD)", rest)
        if not m2:
            return None
        rest, grade = m2.groups()
    if prefix == "W" and rest.startswith("T"):  # WT shapes are not in the catalogue
        return None
    parts = rest.split("X")
    nums = tuple(_number(p) for p in parts)
    if not parts or any(n is None for n in nums):
        return None
    return (prefix, grade, nums)


@functools.lru_cache(maxsize=1)
def _index() -> dict[tuple, list[tuple[int, tuple[float, ...]]]]:
    """(prefix, grade, count of numbers) -> [(row, its numbers)], every name parsed once."""
    idx: dict[tuple, list[tuple[int, tuple[float, ...]]]] = {}
    for i, name in enumerate(catalogue_arrays().names):
        k = _key(name)
        assert k is not None, name
        idx.setdefault((k[0], k[1], len(k[2])), []).append((i, k[2]))
    return idx


@functools.lru_cache(maxsize=1)
def _by_name() -> dict[str, int]:
    """Designation as printed -> row: a name given as the catalogue prints it (most records)
    is found without parsing every name of the catalogue (the command line's first check)."""
    return {str(n): i for i, n in enumerate(catalogue_arrays().names)}


@functools.lru_cache(maxsize=4096)
def _find(name: str) -> int | None:
    # every designation, read as typed, finds its own row (tests/test_sections_catalogue.py)
    exact = _by_name().get(name.strip())
    if exact is not None:
        return exact
    k = _key(name)
    if k is None:
        return None
    for i, ref in _index().get((k[0], k[1], len(k[2])), []):
        # 0.0011 in lets a typed .188 stand for 3/16 and .313 for 5/16
        if all(abs(a - b) <= 0.0011 for a, b in zip(k[2], ref)):
            return i
    return None


def catalogue_name(text: str) -> str | None:
    """The catalogue designation of a name typed any sensible way, or ``None`` (no error, no
    suggestions: cheap enough for every keystroke of a type-ahead).

    Example:
        >>> catalogue_name("w 14 x 90"), catalogue_name("W14X91")
        ('W14X90', None)
    """
    if not isinstance(text, str) or not text.strip():
        return None
    i = _find(text)
    return None if i is None else str(catalogue_arrays().names[i])


def _close_names(name: str, n: int = 5) -> list[str]:
    names = list(catalogue_arrays().names)
    squeezed = {re.sub(r"[\s_-]", "", x.upper()): x for x in names}
    typed = re.sub(r"[\s_-]", "", name.upper())
    hits = difflib.get_close_matches(typed, list(squeezed), n=n, cutoff=0.6)
    return [squeezed[h] for h in hits]


@functools.lru_cache(maxsize=1024)
def section_at(i: int) -> Section:
    """The Section for catalogue row ``i`` (with its source notes), made once per row: a
    schedule or a site names the same few sections again and again. The Section is frozen and
    its arrays are read-only, so the one shared copy cannot be changed by a caller.

    Args:
        i: row index into ``catalogue_arrays()``.
    Returns:
        Section named with the catalogue designation.

    Example:
        >>> section_at(0).name
        'W44X408'
    """
    cat = catalogue_arrays()
    fam, kind, name = str(cat.family[i]), str(cat.kind[i]), str(cat.names[i])
    aisc = fam in AISC_FAMILIES
    source = ("AISC Shapes Database v15.0 nominal dimensions" if aisc
              else "EN 10365 nominal dimensions")
    if kind == "i":
        slope = S_SLOPE if fam == "S" else 0.0
        s = i_section(cat.d[i], cat.bf[i], cat.tf[i], cat.tw[i], cat.r[i], rolled=True, name=name,
                      flange_slope=slope)
        notes = [source]
        if aisc and fam in ("HP", "M"):
            notes.append("root fillet r = k_des - tf, or the radius that reproduces the "
                         "tabulated area where k_des - tf overstates it")
        elif aisc:
            notes.append("root fillet r = k_des - tf (common practice approximation)")
    elif kind == "rect":
        s = rect_hollow(cat.d[i], cat.bf[i], cat.tdes[i], rolled=False, name=name)
        notes = [source, f"design wall tdes = {cat.tdes[i]:.2f} mm used (nominal "
                 f"{cat.t[i]:.2f} mm)", "outside corner radius 2 tdes (AISC convention)"]
    else:
        s = round_hollow(cat.d[i], cat.tdes[i], rolled=False, name=name)
        notes = [source, f"design wall tdes = {cat.tdes[i]:.2f} mm used (nominal "
                 f"{cat.t[i]:.2f} mm)"]
    s = replace(s, notes=tuple(notes) + s.notes)
    for v in vars(s).values():
        if isinstance(v, np.ndarray):
            v.flags.writeable = False
    return s


def from_catalogue(name: str) -> Section:
    """The catalogue section called ``name``, ignoring case, spaces and trivial punctuation.

    Accepted forms include ``W14x90``, ``W 14 X 90``, ``HEB300``, ``HE 300 B``, ``IPE 300``,
    ``HSS8x8x1/2``, ``HSS8X8X.500``, ``HSS5-1/2X5-1/2X3/8``, ``HSS6.625X.280``, ``Pipe6STD``.
    AISC HSS and pipe properties use the design wall thickness (0.93 tnom).

    Args:
        name: the designation as typed.
    Returns:
        Section carrying the catalogue designation as ``name`` and its source in ``notes``.
    Raises:
        InputError: field ``"section"`` when no catalogue section has that name (hint: close names).

    Example:
        >>> from_catalogue("w 14 x 90").name
        'W14X90'
    """
    if not isinstance(name, str) or not name.strip():
        raise InputError("section", name, "no section name given", "e.g. W14X90 or HEB 300")
    i = _find(name)
    if i is None:
        close = _close_names(name)
        hint = ("did you mean " + ", ".join(close) + "?") if close else \
            "families: " + ", ".join(FAMILIES)
        raise InputError("section", name, "not in the catalogue", hint)
    return section_at(i)


def catalogue_names(family: str | None = None) -> list[str]:
    """Catalogue designations, optionally of one family (``"W"``, ``"HSS"``, ``"HEB"``, ...).

    Args:
        family: family name (case ignored) or None for all.
    Returns:
        Designations in catalogue order.
    Raises:
        InputError: field ``"family"`` for an unknown family.

    Example:
        >>> catalogue_names("HEB")[0]
        'HEB 100'
    """
    cat = catalogue_arrays()
    if family is None:
        return list(map(str, cat.names))
    fam = family.strip().upper()
    if fam not in FAMILIES:
        raise InputError("family", family, "unknown family", "one of " + ", ".join(FAMILIES))
    return [str(n) for n, f in zip(cat.names, cat.family) if f == fam]
