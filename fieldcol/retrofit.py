"""Retrofit options: what a new brace, a cable, a changed end, cover plates or a removed brace
would change in the capacity of one column.

An option is a JSON object; values with units are text as typed, like the column record
(README "Column record"). Every option may carry ``"label"`` (text shown with the result).

``{"kind": "brace", "axis": "weak" | "strong" | "both", "at": "12 ft", "stiffness": "20 kip/in",
"strength": "5 kip", "twist": true}``
    a brace point at ``at`` (from the bottom, strictly between the ends) on the axis or both
    axes; ``stiffness`` and ``strength`` are optional (rigid and unknown when absent);
    ``twist: true`` also prevents twisting there (default false).
``{"kind": "cable", "axis": .., "at": .., "cable": {"area": "0.2 in2", "length": "20 ft",
"angle": "45 deg", "E": "29000 ksi"}, "strength": .., "twist": false}``
    a cable or rod brace; its stiffness is (A E / L) cos^2(angle) (``E`` 200000 MPa when absent).
``{"kind": "end", "axis": "strong" | "weak" | "both", "end": "bottom" | "top",
"to": "fixed" | "pinned" | "free" | "guided" | {"rotation": "50000 kip*in/rad"}}``
    a changed end condition (refused on an axis whose K is given by ``k`` or ``alignment``:
    the end would not change it).
``{"kind": "plates", "thickness": "3/8 in", "width": "12 in", "connection": "bolted",
"pitch": "6 in", "holes": {"diameter": "15/16 in", "per_flange": 4}}``
    cover plates on both flanges of an I section (``width``: the flange width when absent);
    applied after any recorded section loss. Welded unless ``connection`` is ``riveted`` or
    ``bolted`` with the fasteners' ``pitch``: then checked as the section's own riveted or bolted
    plates (AISC 360-22 E6.1 modified slenderness and E6.2 spacing; EN 1993-1-8 Table 3.3
    buckling between fasteners); ``holes`` (optional, the holes drilled across a flange and
    its plate) weaken the flange in tension under bending (AISC 360-22 F13.1, EN 1993-1-1
    6.2.5 (4)).
``{"kind": "remove_brace", "axis": .., "at": .., "twist": false}``
    the brace at ``at`` taken out (e.g. for a change of use); an error if there is none there
    (positions match within 2 mm); a twist restraint at the same point goes with it unless
    ``twist: false`` (``twist: true`` insists that there is one).
``{"kind": "combined", "options": [..]}``
    a package of options applied in order.

Every option applies to the ORIGINAL record; errors name the option's field, e.g.
``options[1].at``. A brace added by an option is marked ``"added": "proposed"`` in the record.
"""

from __future__ import annotations

import copy
import math
from dataclasses import dataclass
from collections.abc import Mapping, Sequence
from typing import Any

from fieldcol import CAUTION
from fieldcol.assess import Assessment, assess
from fieldcol.errors import InputError
from fieldcol.record import parse_record, parse_section
from fieldcol.units import parse_length

KINDS = ("brace", "cable", "end", "plates", "remove_brace", "combined")
SWEEP_AXES = ("weak", "strong", "both")
# Positions closer than this are one position: finer than a tape reading on site (common practice).
SAME_POSITION = 2.0   # mm
_KEYS = {
    "brace": {"axis", "at", "stiffness", "strength", "twist"},
    "cable": {"axis", "at", "cable", "strength", "twist"},
    "end": {"axis", "end", "to"},
    "plates": {"thickness", "width", "connection", "pitch", "holes"},
    "remove_brace": {"axis", "at", "twist"},
    "combined": {"options"},
}
_AXES = {"strong": ("strong",), "weak": ("weak",), "both": ("strong", "weak")}


@dataclass
class Comparison:
    """One retrofit option with the column's assessment before and after it.

    Fields: ``option`` (the option as given), ``label`` (its label or one made from it),
    ``before``, ``after`` (the Assessments; ``after.record`` is the changed record).
    """

    option: dict
    label: str
    before: Assessment
    after: Assessment

    @property
    def design_before(self) -> float:
        """Design strength before, N."""
        return self.before.design_strength

    @property
    def design_after(self) -> float:
        """Design strength after, N."""
        return self.after.design_strength

    @property
    def utilization_before(self) -> float | None:
        return self.before.utilization

    @property
    def utilization_after(self) -> float | None:
        return self.after.utilization

    @property
    def governing_before(self) -> str:
        return self.before.governing_mode

    @property
    def governing_after(self) -> str:
        return self.after.governing_mode

    @property
    def gain(self) -> float:
        """Relative change of the design strength: after / before - 1 (0.25 = 25 % more);
        NaN where the code gives no strength before or after (see their warnings)."""
        b, a = self.design_before, self.design_after
        if not (math.isfinite(a) and math.isfinite(b)) or b <= 0:
            return math.nan
        return a / b - 1.0

    @property
    def new_warnings(self) -> list[dict[str, str]]:
        """Warnings of the changed column that the column as it stands does not have."""
        old = {(w["code"], w["message"]) for w in self.before.warnings}
        return [w for w in self.after.warnings if (w["code"], w["message"]) not in old]

    def to_dict(self) -> dict[str, Any]:
        """JSON form: before/after quantities as ``{"value", "unit"}`` (N, mm, ratio).

        Example:
            >>> rec = {"tag": "C1", "section": "W14X90", "material": "A992", "length": "30 ft"}
            >>> c = compare(rec, [{"kind": "brace", "axis": "weak", "at": "15 ft"}])[0]
            >>> sorted(c.to_dict()["after"])
            ['design_strength', 'effective_length', 'governing_mode', 'status', 'utilization']
        """
        def side(a: Assessment) -> dict[str, Any]:
            design = a.design_strength
            return {
                "design_strength": {"value": design if math.isfinite(design) else None,
                                    "unit": "N"},
                "utilization": (None if a.utilization is None
                                else {"value": a.utilization, "unit": ""}),
                "status": a.status,
                "governing_mode": a.governing_mode,
                "effective_length": {ax: {"value": L.Lc, "unit": "mm"}
                                     for ax, L in a.lengths.items()},
            }

        gain = self.gain
        return {"label": self.label, "option": self.option, "tag": self.before.column.tag,
                "before": side(self.before), "after": side(self.after),
                "gain": {"value": gain if math.isfinite(gain) else None, "unit": ""},
                "new_warnings": self.new_warnings, "record_after": self.after.record,
                "caution": CAUTION}


def apply_option(record: Mapping[str, Any], option: Mapping[str, Any], *,
                 field: str = "option") -> dict[str, Any]:
    """The column record with one retrofit option applied (the input is left untouched).

    Args:
        record: a column record (README "Column record"); it must be valid on its own.
        option: one option (see the module docstring).
        field: the name errors give the option, e.g. ``"options[1]"``.
    Returns:
        A new record (a deep copy with the change).
    Raises:
        InputError: naming the record's field if the record is bad, else the option's field
            (``options[1].at``).

    Example:
        >>> rec = {"tag": "C1", "section": "W14X90", "material": "A992", "length": "30 ft"}
        >>> new = apply_option(rec, {"kind": "brace", "axis": "weak", "at": "15 ft"})
        >>> new["restraints"]["weak"]["braces"], "restraints" in rec
        ([{'at': '15 ft', 'added': 'proposed'}], False)
    """
    col = parse_record(record)
    new = copy.deepcopy(dict(record))
    renames: dict[str, str] = {}
    _apply(new, option, field, col.length, renames)
    try:
        parse_record(new)
    except InputError as e:
        raise _renamed(e, renames, field) from None
    return new


def compare(record: Mapping[str, Any], options: Sequence[Mapping[str, Any]]) -> list[Comparison]:
    """Assess the column once as it stands and once with each option (each on the original).

    Args:
        record: a column record.
        options: retrofit options (see the module docstring); use ``{"kind": "combined", ..}``
            for a package.
    Returns:
        One Comparison per option, in order.
    Raises:
        InputError: naming the record's field, or ``options[i]...`` for a bad option (also when
            the changed column cannot be checked, e.g. an end change that makes a mechanism).

    Example:
        >>> rec = {"tag": "C1", "section": "W14X90", "material": "A992", "length": "30 ft"}
        >>> c = compare(rec, [{"kind": "brace", "axis": "weak", "at": "15 ft"}])[0]
        >>> c.label, c.governing_before, c.gain > 0.3
        ('brace weak at 15 ft', 'flexural-weak', True)
    """
    if isinstance(options, (str, bytes, Mapping)) or not isinstance(options, Sequence):
        raise InputError("options", options, "must be a list of options",
                         '[{"kind": "brace", "axis": "weak", "at": "12 ft"}]')
    if not options:
        raise InputError("options", "[]", "no options given",
                         '[{"kind": "brace", "axis": "weak", "at": "12 ft"}]')
    before = assess(record)
    out = []
    for i, opt in enumerate(options):
        fld = f"options[{i}]"
        new = apply_option(record, opt, field=fld)
        try:
            after = assess(new)
        except InputError as e:
            raise InputError(_primary(opt, fld), e.text, "the changed column cannot be checked: "
                             f"{e.field}: {e.reason}", e.hint) from None
        out.append(Comparison(copy.deepcopy(dict(opt)), label(opt), before, after))
    return out


@dataclass(frozen=True)
class BraceSweep:
    """The column's design strength against the height (and stiffness) of one proposed brace.

    Fields: ``axis``; ``length`` (mm); ``heights`` (mm from the bottom); ``stiffness`` (the
    stiffnesses swept as typed, ``"rigid"`` for a rigid brace); ``strengths[j][i]`` (N: the
    design strength with the brace of stiffness j at height i; None where the check gives
    none); ``modes[j][i]`` (what governs there); ``before`` (N, as it stands); ``best`` (the
    (height, stiffness index, strength) of the highest strength, the lowest height of equal ones,
    or None).
    """

    axis: str
    length: float
    heights: tuple[float, ...]
    stiffness: tuple[str, ...]
    strengths: tuple[tuple[float | None, ...], ...]
    modes: tuple[tuple[str, ...], ...]
    before: float
    demand: float | None
    best: tuple[float, int, float] | None
    caution: str = CAUTION

    def to_dict(self) -> dict[str, Any]:
        """The JSON form (N and mm).

        Example:
            >>> s = brace_sweep({"tag": "C", "section": "W10X49", "material": "A992",
            ...                  "length": "14 ft"}, "weak", points=3)
            >>> sorted(s.to_dict())[:3]
            ['axis', 'before', 'best']
        """
        return {"axis": self.axis, "length": self.length, "heights": list(self.heights),
                "stiffness": list(self.stiffness),
                "strengths": [list(r) for r in self.strengths], "modes": [list(r) for r in self.modes],
                "before": self.before, "demand": self.demand,
                "best": None if self.best is None else {"at": self.best[0], "stiffness": self.stiffness[self.best[1]],
                                                        "strength": self.best[2]},
                "caution": self.caution}


def brace_sweep(record: Mapping[str, Any], axis: str, *, points: int = 11,
                stiffness: Sequence[str] = ("rigid",), twist: bool = False) -> BraceSweep:
    """Design strength with one proposed brace at ``points`` heights ``i L / (points + 1)`` and
    each of the ``stiffness`` values (text as typed, ``"rigid"`` for a rigid brace), from the
    full check (the stability analysis when the record asks for it: the best height is not
    mid-height when the ends differ). A height where the axis already has a brace gives None.

    Args:
        record: the column record; axis: ``weak``, ``strong`` or ``both``; points: 3 to 41;
        stiffness: the brace stiffnesses to sweep (e.g. ``["2 kip/in", "10 kip/in", "rigid"]``);
        twist: the brace also prevents twisting.
    Returns:
        a ``BraceSweep``.
    Raises:
        InputError: a bad axis, count or stiffness (named), or a record that cannot be checked.

    Example:
        >>> s = brace_sweep({"tag": "C", "section": "W14X90", "material": "A992", "length": "30 ft",
        ...                  "restraints": {"strong": {"k": 0.5}}}, "weak", points=5, twist=True)
        >>> round(s.best[0] / s.length, 2)
        0.5
    """
    if not isinstance(axis, str) or axis not in SWEEP_AXES:
        raise InputError("axis", str(axis), "not an axis", "weak, strong or both")
    if isinstance(points, bool) or not isinstance(points, int) or not 3 <= points <= 41:
        raise InputError("points", repr(points), "3 to 41 heights", None)
    if isinstance(stiffness, str) or not stiffness or len(stiffness) > 10:
        raise InputError("stiffness", repr(stiffness), "give a list of 1 to 10 stiffnesses",
                         '["5 kip/in", "rigid"]')
    before = assess(record)
    length = before.column.length
    heights = tuple(length * i / (points + 1) for i in range(1, points + 1))
    rows, modes = [], []
    for j, k in enumerate(stiffness):
        row, mrow = [], []
        for at in heights:
            opt: dict[str, Any] = {"kind": "brace", "axis": axis, "at": f"{at:.1f} mm", "twist": twist}
            if k != "rigid":
                opt["stiffness"] = k
            try:
                a = assess(apply_option(record, opt))
                v: float | None = a.design_strength
                mode = a.governing_mode
            except InputError as e:
                if e.field.endswith(".stiffness"):
                    raise InputError(f"stiffness[{j}]", k, e.reason, e.hint) from None
                v, mode = None, ""
            row.append(v if v is not None and math.isfinite(v) else None)
            mrow.append(mode)
        rows.append(tuple(row))
        modes.append(tuple(mrow))
    good = [(h, j, v) for j, r in enumerate(rows) for h, v in zip(heights, r) if v is not None]
    best = max(good, key=lambda x: (x[2], -x[0], -x[1])) if good else None
    return BraceSweep(axis, length, heights, tuple(stiffness), tuple(rows), tuple(modes),
                      before.design_strength, before.demand, best)


def label(option: Mapping[str, Any]) -> str:
    """The option's ``label``, or a short description made from it.

    Args:
        option: a retrofit option (see the module docstring).
    Returns:
        The label text, e.g. ``"brace weak at 15 ft + twist"``.

    Example:
        >>> label({"kind": "end", "axis": "weak", "end": "bottom", "to": "fixed"})
        'weak bottom -> fixed'
    """
    if not isinstance(option, Mapping):
        return str(option)
    if isinstance(option.get("label"), str) and option["label"].strip():
        return option["label"].strip()
    kind, ax, at = option.get("kind"), option.get("axis"), option.get("at")
    twist = " + twist" if option.get("twist") is True else ""
    if kind == "brace":
        stiff = f" ({option['stiffness']})" if option.get("stiffness") not in (None, "") else ""
        return f"brace {ax} at {at}{stiff}{twist}"
    if kind == "cable":
        return f"cable {ax} at {at}{twist}"
    if kind == "end":
        to = option.get("to")
        to = ", ".join(f"{k} {v}" for k, v in to.items()) if isinstance(to, Mapping) else to
        return f"{ax} {option.get('end')} -> {to}"
    if kind == "plates":
        how = option.get("connection")
        how = f", {how} at {option.get('pitch')}" if how in ("riveted", "bolted") else ""
        return f"plates {option.get('thickness')} x {option.get('width') or 'flange width'}{how}"
    if kind == "remove_brace":
        return f"remove {ax} brace at {at}{twist}"
    if kind == "combined" and isinstance(option.get("options"), list):
        return " + ".join(label(o) for o in option["options"])
    return str(kind)


# -- applying options ---------------------------------------------------------------------------

def _apply(new: dict, opt: Any, fld: str, length: float, renames: dict[str, str]) -> None:
    """Apply ``opt`` to ``new`` in place; ``renames`` maps record paths to option fields."""
    if not isinstance(opt, Mapping):
        raise InputError(fld, opt, "an option must be an object",
                         '{"kind": "brace", "axis": "weak", "at": "12 ft"}')
    kind = opt.get("kind")
    if kind not in KINDS:
        raise InputError(f"{fld}.kind", "" if kind is None else kind, "not a kind of option",
                         "use " + ", ".join(KINDS))
    bad = sorted(set(opt) - _KEYS[kind] - {"kind", "label"})
    if bad:
        raise InputError(f"{fld}.{bad[0]}", opt[bad[0]], f"not a field of a {kind} option",
                         "fields: " + ", ".join(sorted(_KEYS[kind] | {"label"})))
    if "label" in opt and not isinstance(opt["label"], str):
        raise InputError(f"{fld}.label", opt["label"], "a label must be text")
    if kind in ("brace", "cable"):
        _add_brace(new, opt, kind, fld, length, renames)
    elif kind == "remove_brace":
        _remove_brace(new, opt, fld)
    elif kind == "end":
        _set_end(new, opt, fld, renames)
    elif kind == "plates":
        _add_plates(new, opt, fld, renames)
    else:
        subs = opt.get("options")
        if not isinstance(subs, list) or not subs:
            raise InputError(f"{fld}.options", subs, "a combined option needs a list of options",
                             '[{"kind": "brace", ..}, {"kind": "plates", ..}]')
        for j, sub in enumerate(subs):
            _apply(new, sub, f"{fld}.options[{j}]", length, renames)


def _axes(opt: Mapping, fld: str) -> tuple[str, ...]:
    ax = opt.get("axis")
    if not isinstance(ax, str) or ax.strip().lower() not in _AXES:
        raise InputError(f"{fld}.axis", "" if ax is None else ax, "not an axis",
                         "strong, weak or both")
    return _AXES[ax.strip().lower()]


def _flag(opt: Mapping, key: str, fld: str) -> bool:
    v = opt.get(key, False)
    if not isinstance(v, bool):
        raise InputError(f"{fld}.{key}", v, "must be true or false")
    return v


def _restraint(new: dict, ax: str) -> dict:
    """The record's restraint object for ``ax``, created (empty: pinned ends) when absent."""
    restraints = new.get("restraints")
    if restraints is None:
        restraints = new["restraints"] = {}
    spec = restraints.get(ax)
    if spec is None:
        spec = restraints[ax] = {}
    return spec


def _braces(spec: dict) -> list:
    if spec.get("braces") is None:
        spec["braces"] = []
    return spec["braces"]


def _find(braces: list, at: float, path: str) -> int | None:
    for i, b in enumerate(braces):
        pos = parse_length(b["at"], f"{path}[{i}].at")
        if abs(pos - at) <= SAME_POSITION:
            return i
    return None


def _add_brace(new: dict, opt: Mapping, kind: str, fld: str, length: float,
               renames: dict[str, str]) -> None:
    axes = _axes(opt, fld)
    if opt.get("at") in (None, ""):
        raise InputError(f"{fld}.at", "", "required: where the brace would be",
                         'measured from the bottom, e.g. "12 ft"')
    at = parse_length(opt["at"], f"{fld}.at")
    if not at < length - SAME_POSITION:
        raise InputError(f"{fld}.at", opt["at"], "not between the ends of the column",
                         f"measure from the bottom; the column is {length:.0f} mm long")
    twist = _flag(opt, "twist", fld)
    entry: dict[str, Any] = {"at": opt["at"]}
    if kind == "cable":
        if not isinstance(opt.get("cable"), Mapping):
            raise InputError(f"{fld}.cable", opt.get("cable", ""), "a cable option needs the cable",
                             '{"area": "0.2 in2", "length": "20 ft", "angle": "45 deg"}')
        entry["cable"] = copy.deepcopy(dict(opt["cable"]))
    elif opt.get("stiffness") not in (None, ""):
        entry["stiffness"] = opt["stiffness"]
    if opt.get("strength") not in (None, ""):
        entry["strength"] = opt["strength"]
    entry["added"] = "proposed"
    for ax in axes:
        braces = _braces(_restraint(new, ax))
        if _find(braces, at, f"restraints.{ax}.braces") is not None:
            raise InputError(f"{fld}.at", opt["at"], f"the {ax} axis already has a brace there",
                             "to change it, combine a remove_brace option with the new brace")
        renames[f"restraints.{ax}.braces[{len(braces)}]"] = fld
        braces.append(copy.deepcopy(entry))
    if twist:
        braces = _braces(_restraint(new, "twist"))
        # twisting already prevented there: the new brace holds it too, nothing to add
        if _find(braces, at, "restraints.twist.braces") is None:
            renames[f"restraints.twist.braces[{len(braces)}]"] = fld
            braces.append({"at": opt["at"], "added": "proposed"})


def _remove_brace(new: dict, opt: Mapping, fld: str) -> None:
    axes = _axes(opt, fld)
    if opt.get("at") in (None, ""):
        raise InputError(f"{fld}.at", "", "required: where the brace to remove is",
                         'measured from the bottom, e.g. "12 ft"')
    at = parse_length(opt["at"], f"{fld}.at")
    where = [(ax, f"braces on the {ax} axis") for ax in axes]
    # a brace taken out takes its hold against twisting with it, unless told otherwise
    explicit = "twist" in opt
    if _flag({"twist": True, **opt}, "twist", fld):
        where.append(("twist", "twist restraints"))
    found = []
    for ax, what in where:
        braces = ((new.get("restraints") or {}).get(ax) or {}).get("braces") or []
        i = _find(braces, at, f"restraints.{ax}.braces")
        if i is None and ax == "twist" and not explicit:
            continue
        if i is None:
            there = ", ".join(str(b.get("at")) for b in braces)
            raise InputError(f"{fld}.at", opt["at"], f"none of the {what} is there",
                             f"{what}: {there}" if there else f"there are no {what}")
        found.append((braces, i))
    for braces, i in found:
        del braces[i]


def _set_end(new: dict, opt: Mapping, fld: str, renames: dict[str, str]) -> None:
    axes = _axes(opt, fld)
    which = opt.get("end")
    if which not in ("bottom", "top"):
        raise InputError(f"{fld}.end", "" if which is None else which, "not an end",
                         "bottom or top")
    to = opt.get("to")
    if to in (None, ""):
        raise InputError(f"{fld}.to", "", "required: the new end condition",
                         'fixed, pinned, free, guided or {"rotation": "50000 kip*in/rad"}')
    for ax in axes:
        spec = _restraint(new, ax)
        for key in ("k", "alignment"):
            if spec.get(key) is not None:
                raise InputError(f"{fld}.axis", opt["axis"],
                                 f"the record gives the {ax} axis K by restraints.{ax}.{key}, "
                                 "so a changed end would change nothing",
                                 f"remove restraints.{ax}.{key} from the record first")
        spec[which] = copy.deepcopy(to)
        renames[f"restraints.{ax}.{which}"] = f"{fld}.to"


def _add_plates(new: dict, opt: Mapping, fld: str, renames: dict[str, str]) -> None:
    if opt.get("thickness") in (None, ""):
        raise InputError(f"{fld}.thickness", "", "required: the plate thickness", 'e.g. "3/8 in"')
    spec = new["section"]
    spec = {"name": spec} if isinstance(spec, str) else copy.deepcopy(dict(spec))
    if spec.get("built") is not None:
        # said here: the section parser would only call "plates" an unknown key of a built-up one
        raise InputError(f"{fld}.kind", "plates", "this column is built up; cover plates are "
                         "added to a rolled or welded I section",
                         "a built-up section takes its flange plates in section.built: "
                         "check a copy of the record with them")
    if spec.get("plates") is not None:
        raise InputError(fld, opt.get("thickness"), "the section already carries cover plates",
                         "plates on plates are not modelled")
    plates = {"thickness": opt["thickness"]}
    for key in ("width", "connection", "pitch", "holes"):
        if opt.get(key) not in (None, ""):
            plates[key] = copy.deepcopy(opt[key])
    spec["plates"] = plates
    # parse here so that a bad plate names the option, not the record
    try:
        parse_section(spec)
    except InputError as e:
        raise _renamed(e, {"section.plates": fld, "section": fld}, fld) from None
    new["section"] = spec
    renames["section.plates"] = fld


def _primary(opt: Mapping[str, Any], fld: str) -> str:
    """The option field a failure of the changed column is most likely due to."""
    key = {"brace": "at", "cable": "at", "remove_brace": "at", "end": "to"}.get(opt.get("kind"))
    return f"{fld}.{key}" if key else fld


def _renamed(e: InputError, renames: Mapping[str, str], fld: str) -> InputError:
    """``e`` with its record path replaced by the option field that put the value there."""
    for path in sorted(renames, key=len, reverse=True):
        if e.field == path or e.field.startswith(path + ".") or e.field.startswith(path + "["):
            return InputError(renames[path] + e.field[len(path):], e.text, e.reason, e.hint)
    return InputError(fld, e.text, f"{e.field}: {e.reason}", e.hint)


__all__ = ["BraceSweep", "brace_sweep", "Comparison", "KINDS", "SAME_POSITION", "apply_option", "compare", "label"]
