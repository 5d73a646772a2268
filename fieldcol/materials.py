"""Steel grades and their nominal properties, read from ``data/materials.csv``.

Each row of the table gives E, G, Fy and Fu in the units its source uses (``29000 ksi``,
``355 MPa``); they are converted once to MPa. EN grades carry thickness bands
(``fy_at``/``fu_at``). Historic grades are flagged and say to confirm by coupon tests; a coupon
result replaces the table Fy at every thickness (``with_tested_fy``). Cast iron is recognised
and refused: it is brittle and steel column curves do not apply to it.

Choices (documented here once):

* ASTM grades use E = 29,000 ksi (199,948 MPa) and G = 11,200 ksi, so that a US site shows
  exactly the values it knows; EN grades use 210,000 / 81,000 MPa, CSA grades 200,000 / 77,000.
* A500 round and rectangular HSS differ: two rows. ``get_material("A500 Gr B")`` is the
  rectangular row; ask for ``shape="round"`` (or the name ``"A500 Gr B round"``) for round HSS.
* Beyond the last thickness band the tables say nothing: ``fy_at`` raises ``InputError``
  rather than extrapolate; enter the product-standard or tested value instead.
* ``list_materials`` leaves out refused rows (cast iron).

Example:
    >>> m = get_material("A572 Gr 50")
    >>> round(m.Fy, 2), m.family
    (344.74, 'aisc')
    >>> get_material("s355").fy_at(50.0)
    335.0
"""

from __future__ import annotations

import bisect
import csv
import difflib
import math
import re
from dataclasses import dataclass, replace
from functools import cached_property, lru_cache

import numpy as np

from fieldcol._resources import shipped
from fieldcol.errors import InputError
from fieldcol.units import parse_quantity

__all__ = [
    "Material",
    "get_material",
    "material_from_values",
    "for_code",
    "CODE_MODULI",
    "with_tested_fy",
    "list_materials",
    "DATA_FILE",
]

DATA_FILE = shipped("data") / "materials.csv"
FAMILIES = ("aisc", "en", "csa", "historic", "custom")
SHAPES = ("rect", "round")

# Plausible ranges for steel and wrought iron (MPa). Outside them an entry is almost surely in
# the wrong unit (29000 typed for E means ksi, not MPa): refused, never clamped.
_RANGES = {
    "Fy": (100.0, 1000.0),
    "Fu": (150.0, 1500.0),
    "E": (100_000.0, 250_000.0),
    "G": (40_000.0, 100_000.0),
}


@dataclass(frozen=True)
class Material:
    """A material with nominal properties in MPa.

    Args:
        key: the table key, e.g. ``"A992"``, ``"S355"``; ``"custom"`` for entered values.
        name: the name shown, e.g. ``"ASTM A992"``.
        family: ``"aisc"`` (ASTM grades), ``"en"``, ``"csa"``, ``"historic"`` or ``"custom"``.
        E, G: elastic and shear moduli (MPa).
        Fy, Fu: nominal yield and tensile strength (MPa) of the thinnest band.
        historic: True for old grades and wrought iron (confirm by coupon tests).
        note: what the engineer should know (shown in the trace).
        source: where the values come from.
        tested: True when Fy comes from coupon tests.
        bands: ``(t_max_mm, Fy, Fu)`` rows, ascending; empty when the values hold at any thickness.
        shape: ``"rect"`` or ``"round"`` for grades that depend on the HSS shape, else ``""``.

    Example:
        >>> get_material("S355").bands[0]
        (40.0, 355.0, 490.0)
    """

    key: str
    name: str
    family: str
    E: float
    G: float
    Fy: float
    Fu: float
    historic: bool
    note: str
    source: str
    tested: bool = False
    bands: tuple[tuple[float, float, float], ...] = ()
    shape: str = ""
    moduli_given: bool = False     # E (and G) entered by the engineer: kept under every code

    @cached_property
    def _limits(self) -> list[float]:
        return [float(b[0]) for b in self.bands]

    def fy_at(self, t_mm: float | np.ndarray, *, field: str = "thickness") -> float | np.ndarray:
        """Nominal yield strength (MPa) for element thickness ``t_mm`` (vectorised).

        Args:
            t_mm: thickness in mm (the element's nominal thickness; for a rolled section,
                common practice takes the flange), a float or an array.
            field: field name for errors.

        Returns:
            Fy in MPa, a float for a scalar and an array for an array. A tested Fy applies
            at every thickness.

        Raises:
            InputError: thickness not positive and finite, or beyond the last band.

        Example:
            >>> get_material("S355").fy_at(np.array([10.0, 40.0, 40.1]))
            array([355., 355., 335.])
        """
        return self._at(t_mm, 1, field)

    def fu_at(self, t_mm: float | np.ndarray, *, field: str = "thickness") -> float | np.ndarray:
        """Nominal tensile strength (MPa) for element thickness ``t_mm`` (vectorised).

        Args:
            t_mm: thickness in mm, a float or an array.
            field: field name for errors.

        Returns:
            Fu in MPa, a float for a scalar and an array for an array.

        Raises:
            InputError: thickness not positive and finite, or beyond the last band.

        Example:
            >>> get_material("S275").fu_at(60.0)
            410.0
        """
        return self._at(t_mm, 2, field)

    def _at(self, t_mm: float | np.ndarray, col: int, field: str) -> float | np.ndarray:
        if (type(t_mm) is float or type(t_mm) is np.float64) and 0.0 < t_mm < math.inf:
            # one thickness: the band by bisection, as searchsorted(side="left") finds it
            constant = self.Fy if col == 1 else self.Fu
            if not self.bands or (col == 1 and self.tested):
                return float(constant)
            i = bisect.bisect_left(self._limits, t_mm)
            if i < len(self.bands):
                return float(self.bands[i][col])
        try:
            t = np.asarray(t_mm, dtype=float)
        except (TypeError, ValueError):
            raise InputError(field, t_mm, "a thickness must be a number of mm") from None
        bad = ~np.isfinite(t) | (t <= 0)
        if bad.any():
            first = t[bad].flat[0] if t.ndim else t.item()
            raise InputError(field, f"{first:g} mm", "a thickness must be a positive, finite number of mm")
        constant = self.Fy if col == 1 else self.Fu
        if not self.bands or (col == 1 and self.tested):
            out = np.full(t.shape, constant)
        else:
            table = np.asarray(self.bands, dtype=float)
            idx = np.searchsorted(table[:, 0], t, side="left")
            if (idx >= len(table)).any():
                raise InputError(
                    field,
                    f"{float(t.max()):g} mm",
                    f"{self.name} gives strengths only up to t = {table[-1, 0]:g} mm",
                    "enter Fy from the product standard or coupon tests (a tested or custom material)",
                )
            out = table[idx, col]
        return float(out) if out.ndim == 0 else out


@lru_cache(maxsize=512)  # (a schedule names a few grades on thousands of rows)
def _norm(name: str) -> str:
    """A lookup key that ignores case, spaces, dashes, 'ASTM', 'Gr'/'Grade': 'A572 Gr 50' -> 'a57250'."""
    s = name.strip().lower()
    s = re.sub(r"/a\s*\d+\s*m\b", "", s)  # A992/A992M
    s = re.sub(r"^(astm|csa)\s*", "", s)
    s = re.sub(r"(?<=\d)[\s\-_.]*(?:grade|gr)\.?[\s\-_.]*(?=\d|[a-z](?![a-z])|$)", "", s)
    s = re.sub(r"[\s\-_./]+", "", s)
    # EN toughness qualities and delivery conditions do not change the strength tables
    m = re.fullmatch(r"(s(?:235|275|355|450))(?:jr|j0|j2|k2)?(?:w|h|c)?(?:g\d)?(?:\+(?:n|ar|m))?", s)
    if m:
        return m.group(1)
    m = re.fullmatch(r"(s460)(?:nl|n|ml|m)(?:h)?(?:\+(?:n|ar|m))?", s)
    if m:
        return m.group(1)
    return s


@dataclass(frozen=True)
class _Table:
    rows: dict[str, Material]  # by key, in file order
    index: dict[str, str]  # normalised name -> key
    refused: dict[str, str]  # key -> reason
    notes: dict[str, str]  # key -> note (for refused rows)
    variants: dict[tuple[str, str], str]  # (base key, shape) -> key


def _parse_bands(text: str, where: str) -> tuple[tuple[float, float, float], ...]:
    bands = []
    for part in text.split(";"):
        m = re.fullmatch(r"\s*<=\s*(.+?):\s*(.+?)\s*/\s*(.+?)\s*", part)
        if not m:
            raise InputError(f"{where}.bands", part, "expected '<=40 mm: 355 MPa / 490 MPa'")
        t = parse_quantity(m[1], "length", f"{where}.bands")
        fy = parse_quantity(m[2], "stress", f"{where}.bands")
        fu = parse_quantity(m[3], "stress", f"{where}.bands")
        bands.append((t, fy, fu))
    if [b[0] for b in bands] != sorted({b[0] for b in bands}):
        raise InputError(f"{where}.bands", text, "thickness bands must ascend")
    return tuple(bands)


@lru_cache(maxsize=1)
def _table() -> _Table:
    rows: dict[str, Material] = {}
    index: dict[str, str] = {}
    refused: dict[str, str] = {}
    notes: dict[str, str] = {}
    variants: dict[tuple[str, str], str] = {}
    with DATA_FILE.open(newline="", encoding="utf-8") as f:
        for rec in csv.DictReader(f):
            key = rec["key"].strip()
            where = f"materials.csv:{key}"
            names = [key, rec["name"]] + [a for a in rec["aliases"].split(";") if a.strip()]
            for n in names:
                k = _norm(n)
                if index.get(k, key) != key:
                    raise InputError(where, n, f"name also used by {index[k]}")
                index[k] = key
            if rec["refused"].strip():
                refused[key] = rec["refused"].strip()
                notes[key] = rec["note"].strip()
                continue
            vals = {c: parse_quantity(rec[c], "stress", f"{where}.{c}") for c in ("E", "G", "Fy", "Fu")}
            bands = _parse_bands(rec["bands"], where) if rec["bands"].strip() else ()
            if bands and (bands[0][1], bands[0][2]) != (vals["Fy"], vals["Fu"]):
                raise InputError(f"{where}.Fy", rec["Fy"], "Fy and Fu must be those of the first band")
            if rec["family"] not in FAMILIES or rec["shape"] not in ("",) + SHAPES:
                raise InputError(f"{where}.family", rec["family"], "unknown family or shape")
            rows[key] = Material(
                key=key,
                name=rec["name"].strip(),
                family=rec["family"],
                E=vals["E"],
                G=vals["G"],
                Fy=vals["Fy"],
                Fu=vals["Fu"],
                historic=rec["historic"].strip() == "yes",
                note=rec["note"].strip(),
                source=rec["source"].strip(),
                bands=bands,
                shape=rec["shape"],
            )
            if rec["shape"]:
                variants[(rec["variant_of"].strip() or key, rec["shape"])] = key
    return _Table(rows, index, refused, notes, variants)


def get_material(name: str, *, shape: str | None = None, field: str = "material") -> Material:
    """Look up a grade by name, ignoring case, spaces, dashes, "ASTM" and "Gr"/"Grade".

    Args:
        name: e.g. ``"A572 Gr 50"``, ``"a572-50"``, ``"A572 Grade 50"``, ``"s355"``, ``"S355J2"``,
            ``"A500 Gr B round"``, ``"wrought iron"``.
        shape: ``"rect"`` or ``"round"`` picks the HSS variant of a shape-dependent grade
            (A500); ignored for other grades. None keeps the named row (A500 -> rectangular).
        field: field name for errors.

    Returns:
        the ``Material``.

    Raises:
        InputError: unknown name (the hint lists close names), cast iron (refused), bad shape.

    Example:
        >>> get_material("A500 Gr B", shape="round").name
        'ASTM A500 Gr B round'
    """
    table = _table()
    if not isinstance(name, str) or not name.strip():
        raise InputError(field, name, "no material named", "e.g. A992, A36, S355")
    key = table.index.get(_norm(name))
    if key is None:
        names = {_norm(m.name): m.name for m in table.rows.values()}
        names.update({_norm(k): k for k in table.rows})
        close = difflib.get_close_matches(_norm(name), list(names), n=4, cutoff=0.5)
        hint = "did you mean " + " or ".join(dict.fromkeys(names[c] for c in close)) + "?" if close else (
            "known: " + ", ".join(m.key for m in table.rows.values())
        )
        raise InputError(field, name, "unknown material", hint)
    if key in table.refused:
        raise InputError(field, name, table.refused[key], table.notes[key])
    mat = table.rows[key]
    if shape is not None:
        if shape not in SHAPES:
            raise InputError(f"{field}.shape", shape, "unknown HSS shape", "use 'rect' or 'round'")
        base = next((b for (b, s), k in table.variants.items() if k == key), None)
        if base is not None:
            mat = table.rows[table.variants.get((base, shape), key)]
    return mat


def list_materials() -> list[Material]:
    """All usable materials in table order (refused rows such as cast iron left out).

    Returns:
        a new list of ``Material``.

    Example:
        >>> "A992" in [m.key for m in list_materials()]
        True
    """
    return list(_table().rows.values())


def _stress(value: str | float | int, name: str, field: str) -> float:
    v = parse_quantity(value, "stress", f"{field}.{name}")
    lo, hi = _RANGES[name]
    if not lo <= v <= hi:
        raise InputError(
            f"{field}.{name}",
            value,
            f"{v:.6g} MPa is outside {lo:g}-{hi:g} MPa, implausible for steel",
            "check the unit, e.g. 50 ksi or 345 MPa; 29000 ksi or 200000 MPa for E",
        )
    return v


def material_from_values(
    *,
    Fy: str | float,
    E: str | float | None = None,
    G: str | float | None = None,
    Fu: str | float | None = None,
    name: str = "as measured",
    field: str = "material",
    tested: bool = False,
) -> Material:
    """A custom material from entered values (text with units, or floats in MPa).

    Args:
        Fy: yield strength, e.g. ``"50 ksi"``, ``"345 MPa"`` or ``345.0``.
        E: elastic modulus; None takes 200,000 MPa (common practice).
        G: shear modulus; None takes E / 2.6 (Poisson's ratio 0.3).
        Fu: tensile strength; None leaves it unknown (NaN, noted): not used for compression.
        name: the name shown.
        field: field name prefix for errors (``material.Fy``).
        tested: True when Fy comes from coupon tests.

    Returns:
        a ``Material`` of family ``"custom"`` without thickness bands.

    Raises:
        InputError: unreadable or implausible values (outside the steel ranges), Fu below Fy.

    Example:
        >>> m = material_from_values(Fy="50 ksi", E="29000 ksi")
        >>> round(m.Fy, 1), round(m.E), round(m.G)
        (344.7, 199948, 76903)
    """
    notes = []
    fy = _stress(Fy, "Fy", field)
    if E is None:
        e = 200_000.0
        notes.append("E not given: the code's value is taken (200000 MPa for the elastic reference)")
    else:
        e = _stress(E, "E", field)
    if G is None:
        g = e / 2.6
        notes.append("G not given: the code's value is taken (E / 2.6, Poisson's ratio 0.3, for the elastic reference)")
    else:
        g = _stress(G, "G", field)
    if Fu is None:
        fu = float("nan")
        notes.append("Fu not given")
    else:
        fu = _stress(Fu, "Fu", field)
        if fu < fy:
            raise InputError(f"{field}.Fu", Fu, "tensile strength below the yield strength", "check Fu and Fy")
    if tested:
        notes.append("Fy from coupon tests")
    return Material(
        key="custom",
        name=name,
        family="custom",
        E=e,
        G=g,
        Fy=fy,
        Fu=fu,
        historic=False,
        note="; ".join(notes),
        source="entered",
        tested=tested,
        moduli_given=E is not None,
    )


_KSI = 6.894757293168361
#: E and G as each code states them (MPa): a grade's table values give way to the code's, so that
#: a European grade under AISC takes 29,000 ksi and an ASTM grade under EN 210,000 MPa.
CODE_MODULI = {
    "aisc360-22": (29000 * _KSI, 11200 * _KSI,
                   "E = 29,000 ksi, G = 11,200 ksi as AISC 360-22 states them (Symbols; common practice)"),
    "en1993-1-1": (210_000.0, 81_000.0, "E = 210,000 MPa, G = 81,000 MPa as EN 1993-1-1 3.2.6 states them"),
}
#: materials that are not structural steel keep their own moduli under every code
_OWN_MODULI = ("wrought-iron",)


def for_code(mat: Material, code: str) -> tuple[Material, str]:
    """The material with E and G of the code being applied, and a sentence saying where they
    came from (for the trace).

    Entered moduli (``material_from_values`` with E) and materials that are not steel (wrought
    iron) keep their own; the ``elastic`` reference keeps the table's.

    Args:
        mat: the material as read from the record.
        code: ``"aisc360-22"``, ``"en1993-1-1"`` or ``"elastic"``.

    Returns:
        (the material, the source of E and G).

    Example:
        >>> m, why = for_code(get_material("S355"), "aisc360-22")
        >>> round(m.E), round(m.G)
        (199948, 77221)
    """
    if mat.moduli_given:
        return mat, "E and G as entered"
    if mat.key in _OWN_MODULI:
        return mat, f"E and G of {mat.name} from the materials table (not steel: the code's values do not apply)"
    if code not in CODE_MODULI:
        return mat, f"E and G of {mat.name} from the materials table"
    E, G, why = CODE_MODULI[code]
    if mat.family == "custom":
        why += " (not entered)"
    return replace(mat, E=E, G=G), why


def with_tested_fy(
    mat: Material, Fy: str | float, *, Fu: str | float | None = None, field: str = "material.Fy"
) -> Material:
    """The same material with Fy from coupon tests, applying at every thickness.

    Args:
        mat: the table (or custom) material.
        Fy: the tested yield strength, text with unit or a float in MPa.
        Fu: the tested tensile strength, if any (then it too applies at every thickness).
        field: field name for errors.

    Returns:
        a new ``Material`` with ``tested=True``; E and G are kept.

    Raises:
        InputError: unreadable or implausible values.

    Example:
        >>> m = with_tested_fy(get_material("A7"), "38.5 ksi")
        >>> m.tested, round(m.fy_at(100.0), 1)
        (True, 265.4)
    """
    parent = field.rsplit(".", 1)[0] if "." in field else field
    fy = _stress(Fy, "Fy", parent)
    note = f"Fy = {fy:.4g} MPa from coupon tests replaces the table value at every thickness"
    changes: dict = {"Fy": fy, "tested": True}
    if Fu is not None:
        fu = _stress(Fu, "Fu", parent)
        if fu < fy:
            raise InputError(f"{parent}.Fu", Fu, "tensile strength below the yield strength", "check Fu and Fy")
        changes.update(Fu=fu, bands=())
        note += f"; Fu = {fu:.4g} MPa tested"
    return replace(mat, note=f"{mat.note} {note}.".strip(), **changes)
