"""The keys each object of a column record may hold, and the check that refuses any other.

Kept apart from ``fieldcol.record`` (which reads the values) because it imports nothing heavy:
the store checks every record it saves with ``check_record_keys``.
"""

from __future__ import annotations

import difflib
from collections.abc import Mapping
from typing import Any

from fieldcol.errors import InputError

AXES = ("strong", "weak")
LOAD_TYPES = ("dead", "live", "snow", "roof_live")
_SECTION_COMMON = ("loss", "plates")

#: The keys each object of a column record may hold: one entry per object, so a new key is one
#: line here (and one line in the README's record reference). Any other key is refused with its
#: full path and the nearest known key: a mistyped key must never be read as "not given".
KEYS: dict[str, tuple[str, ...]] = {
    "column record": ("tag", "section", "material", "length", "restraints", "k_basis", "code",
               "demand", "gamma_M1", "units", "condition", "notes", "level", "grid", "location",
               "knowledge", "basis"),
    "section by name": ("name", *_SECTION_COMMON),
    "section of shape i": ("shape", "d", "bf", "tf", "tw", "r", "welded", *_SECTION_COMMON),
    "section of shape rect": ("shape", "d", "b", "t", "r", "finish", *_SECTION_COMMON),
    "section of shape round": ("shape", "D", "t", "finish", *_SECTION_COMMON),
    "section built up": ("built",),
    "built-up section": ("arrangement", "connection", "angle", "channel", "web", "flange_plates",
                         "long_leg", "pitch", "gap", "toes", "plates", "depth", "width", "lacing",
                         "battens", "holes"),
    "measured angle": ("d", "b", "t", "r1", "r2"),
    "measured channel": ("d", "bf", "tf", "tw", "r1", "r2", "slope"),
    "plate": ("width", "thickness"),
    "web plate": ("depth", "thickness"),
    "lacing": ("kind", "width", "thickness", "pitch", "planes", "fasteners"),
    "battens": ("spacing", "depth", "thickness", "planes", "fasteners"),
    "tie fasteners": ("count", "diameter", "grade", "Fu", "pitch", "edge"),
    "section loss": ("flange", "web", "wall", "uniform", "from", "to", "holes"),
    "holes": ("flange", "web", "wall"),
    "cover plates": ("thickness", "width", "connection", "pitch", "holes"),
    "fastener holes": ("diameter", "per_flange"),
    "material by grade": ("grade", "Fy"),
    "material by values": ("Fy", "E", "G", "Fu", "name"),
    "restraints": ("strong", "weak", "twist"),
    "axis": ("bottom", "top", "braces", "k", "alignment"),
    "spring end": ("rotation", "translation"),
    "brace": ("at", "stiffness", "strength", "added", "cable", "kind", "seen_by", "note"),
    "cable": ("area", "length", "angle", "E", "pair", "pretensioned"),
    "alignment": ("Ga", "Gb", "sway"),
    "twist": ("braces", "bottom", "top"),
    "twist restraint": ("at", "added", "seen_by", "note"),
    "condition": ("bow", "bow_axis", "bow_over", "bow_allowance", "plumb", "plumb_axis"),
    "demand": ("axial", "loads", "basis", "psi0", "moments", "reactions", "end_moments", "story"),
    "moments": AXES,
    "end moments": AXES,
    "end moments of an axis": ("top", "bottom", "curvature"),
    "story": ("load", "buckling_load", "stiffness"),
    "reaction": ("load", "axis", "eccentricity", "side"),
    "loads": LOAD_TYPES,
    "psi0": ("live", "snow"),
}
#: what a brace is, as recorded (a tie runs to a wall or a floor)
BRACE_KINDS = ("strut", "rod", "cable", "tie")


def check_keys(spec: Mapping[str, Any], obj: str, fld: str) -> None:
    """Refuse any key of ``spec`` that ``KEYS[obj]`` does not list, naming its full path.

    Args:
        spec: the object as given.
        obj: its entry in ``KEYS`` (e.g. ``"loss"``).
        fld: its path in the record (``""`` for the record itself).

    Raises:
        InputError: field ``fld.key``, with the nearest known key as the hint.

    Example:
        >>> check_keys({"flange": "0.3 in", "Web": "0.2 in"}, "section loss", "section.loss")
        Traceback (most recent call last):
        ...
        fieldcol.errors.InputError: section.loss.Web: cannot use 'Web': not a known key of the section loss (did you mean 'web'? known keys: flange, web, wall, uniform, from, to, holes)
    """
    _known_only(spec, KEYS[obj], obj, fld)


def _known_only(spec: Mapping[str, Any], allowed: tuple[str, ...], obj: str, fld: str) -> None:
    for key in spec:
        if key in allowed:
            continue
        name = str(key)
        if not name:  # a key with no name: named by the object holding it
            raise InputError(fld or "record", name, f"a key of the {obj} has no name",
                             "known keys: " + ", ".join(allowed))
        hint = "known keys: " + ", ".join(allowed)
        near = suggest(name, allowed)
        if near:
            hint = f"did you mean '{near}'? " + hint
        path = f"{fld}.{name}" if fld else name
        raise InputError(path, name, f"not a known key of the {obj}", hint)


def check_record_keys(record: Mapping[str, Any]) -> None:
    """Only the keys ``KEYS`` lists, anywhere in a record that may be incomplete (a column just
    added, a schedule row): values are not read here (``parse_record`` reads them).

    Raises:
        InputError: naming the first unknown key's full path.

    Example:
        >>> check_record_keys({"tag": "A/1", "restraints": {"weak": {"braces": [{"at": "2 m",
        ...                    "stifness": "5 kN/mm"}]}}})
        Traceback (most recent call last):
        ...
        fieldcol.errors.InputError: restraints.weak.braces[0].stifness: cannot use 'stifness': not a known key of the brace (did you mean 'stiffness'? known keys: at, stiffness, strength, added, cable, kind, seen_by, note)
    """
    def obj(value: Any) -> Mapping[str, Any]:
        # (a record read from JSON holds dicts and plain values: those answered at once)
        kind = type(value)
        if kind is dict:
            return value
        if kind is str or value is None:
            return {}
        return value if isinstance(value, Mapping) else {}

    def items(value: Any) -> list[tuple[int, Mapping[str, Any]]]:
        return [(i, b) for i, b in enumerate(value) if isinstance(b, Mapping)] \
            if isinstance(value, list) else []

    check_keys(record, "column record", "")
    sec = obj(record.get("section"))
    if sec:
        _section_keys(sec, "section")
        for key, table in (("loss", "section loss"), ("plates", "cover plates")):
            check_keys(obj(sec.get(key)), table, f"section.{key}")
        check_keys(obj(obj(sec.get("plates")).get("holes")), "fastener holes", "section.plates.holes")
        check_keys(obj(obj(sec.get("loss")).get("holes")), "holes", "section.loss.holes")
    _material_keys(obj(record.get("material")), "material")
    res = obj(record.get("restraints"))
    check_keys(res, "restraints", "restraints")
    for ax in AXES:
        spec, fld = obj(res.get(ax)), f"restraints.{ax}"
        check_keys(spec, "axis", fld)
        for e in ("bottom", "top"):
            check_keys(obj(spec.get(e)), "spring end", f"{fld}.{e}")
        check_keys(obj(spec.get("alignment")), "alignment", f"{fld}.alignment")
        for i, b in items(spec.get("braces")):
            check_keys(b, "brace", f"{fld}.braces[{i}]")
            check_keys(obj(b.get("cable")), "cable", f"{fld}.braces[{i}].cable")
    twist = obj(res.get("twist"))
    check_keys(twist, "twist", "restraints.twist")
    for i, b in items(twist.get("braces")):
        check_keys(b, "twist restraint", f"restraints.twist.braces[{i}]")
    check_keys(obj(record.get("condition")), "condition", "condition")
    demand = obj(record.get("demand"))
    check_keys(demand, "demand", "demand")
    check_keys(obj(demand.get("loads")), "loads", "demand.loads")
    check_keys(obj(demand.get("psi0")), "psi0", "demand.psi0")
    check_keys(obj(demand.get("moments")), "moments", "demand.moments")
    ends = obj(demand.get("end_moments"))
    check_keys(ends, "end moments", "demand.end_moments")
    for ax in AXES:
        check_keys(obj(ends.get(ax)), "end moments of an axis", f"demand.end_moments.{ax}")
    check_keys(obj(demand.get("story")), "story", "demand.story")
    for i, r in items(demand.get("reactions")):
        check_keys(r, "reaction", f"demand.reactions[{i}]")


def _section_keys(spec: Mapping[str, Any], fld: str) -> None:
    """The keys of a section object: by name, or of its shape (every shape's while the shape
    itself is not readable, so a mistyped ``shape`` or ``name`` is named as such)."""
    if "built" in spec:
        check_keys(spec, "section built up", fld)
        _built_keys(spec["built"], f"{fld}.built")
        return
    if "name" in spec:
        check_keys(spec, "section by name", fld)
        return
    given = spec.get("shape")
    given = given.strip().lower() if isinstance(given, str) else None
    if given in ("i", "rect", "round"):
        check_keys(spec, f"section of shape {given}", fld)
    else:
        every = tuple(dict.fromkeys(k for obj, keys in KEYS.items()
                                    if obj.startswith(("section by", "section of")) for k in keys))
        _known_only(spec, every, "section", fld)


def _built_keys(spec: Any, fld: str) -> None:
    if not isinstance(spec, Mapping):
        return
    check_keys(spec, "built-up section", fld)
    for key, table in (("angle", "measured angle"), ("channel", "measured channel"),
                       ("web", "web plate"), ("flange_plates", "plate"), ("plates", "plate"),
                       ("lacing", "lacing"), ("battens", "battens"), ("holes", "fastener holes")):
        if isinstance(spec.get(key), Mapping):
            check_keys(spec[key], table, f"{fld}.{key}")
            if key in ("lacing", "battens") and isinstance(spec[key].get("fasteners"), Mapping):
                check_keys(spec[key]["fasteners"], "tie fasteners", f"{fld}.{key}.fasteners")


def _material_keys(spec: Mapping[str, Any], fld: str) -> None:
    if "grade" not in spec:
        check_keys(spec, "material by values", fld)
        return
    for key in spec:
        if key in KEYS["material by values"] and key not in KEYS["material by grade"]:
            # the grade's table gives E, G and Fu: a second value would be silently lost
            raise InputError(f"{fld}.{key}", key, "a grade's " + key + " comes from its table",
                             "give the grade with a tested Fy only, or leave out grade and "
                             "give Fy, E, G, Fu")
    check_keys(spec, "material by grade", fld)


def suggest(word: str, known: tuple[str, ...]) -> str | None:
    """The known word nearest to ``word`` (case ignored first), or None if none is close.

    Example:
        >>> suggest("stifness", ("at", "stiffness", "strength"))
        'stiffness'
    """
    by_lower = {k.lower(): k for k in known}
    if word.lower() in by_lower:
        return by_lower[word.lower()]
    near = difflib.get_close_matches(word.lower(), list(by_lower), n=1, cutoff=0.6)
    return by_lower[near[0]] if near else None
