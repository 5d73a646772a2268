"""Read a column record (the documented JSON input) into typed engine inputs.

A record is what an engineer recorded for one column. Values with units are strings as typed
(``"30 ft"``, ``"840 kip"``); every error names the field it concerns, e.g.
``restraints.weak.braces[0].at``.
"""

from __future__ import annotations

import json
import math
import re
from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from typing import Any

from fieldcol.errors import InputError
from fieldcol.recordkeys import (BRACE_KINDS, KEYS, LOAD_TYPES, _material_keys, _section_keys,
                                 check_keys, check_record_keys)
from fieldcol.materials import Material, for_code, get_material, material_from_values, with_tested_fy
from fieldcol.sections import (Section, from_catalogue, i_section, rect_hollow, round_hollow,
                               with_loss, with_plates)
from fieldcol.stability import Brace, End, cable_stiffness, end, partial_end
from fieldcol.units import parse_length as _parse_length
from fieldcol.units import parse_quantity as _parse_quantity

CODES = ("elastic", "aisc360-22", "en1993-1-1")
K_BASES = ("theoretical", "recommended", "analysis")
AXES = ("strong", "weak")
_BASES = {"aisc360-22": ("lrfd", "asd"), "en1993-1-1": ("en",), "elastic": ("none",)}
def _object(value: Any, fld: str, example: str) -> Mapping[str, Any]:
    """An optional object: absent or null is "not given" (``{}``); anything else but an object
    (``[]``, ``0``, ``false``, ``""``) is refused, never taken as not given."""
    if value is None:
        return {}
    if not isinstance(value, Mapping):
        raise InputError(fld, value, "must be an object", "e.g. " + example)
    return value


def _flag(spec: Mapping[str, Any], key: str, fld: str) -> bool:
    """A true/false entry: a JSON boolean only (``"false"`` as text is not false)."""
    v = spec.get(key, False)
    if not isinstance(v, bool):
        raise InputError(f"{fld}.{key}", v, "must be true or false (without quotes)")
    return v


def _opt_text(spec: Mapping[str, Any], key: str, fld: str) -> str | None:
    """An optional text entry: absent or null is None; a number or an object is refused."""
    v = spec.get(key)
    if v is None:
        return None
    if not isinstance(v, str):
        raise InputError(f"{fld}.{key}" if fld else key, v, "must be text (in quotes)",
                         f'e.g. "{v}"' if isinstance(v, (int, float)) else None)
    return v


@dataclass(frozen=True)
class BraceInput:
    """A brace point as recorded: where, how stiff, how strong, and when it was added."""

    at: float                       # mm from the bottom
    stiffness: float = math.inf     # N/mm; inf = taken as rigid
    strength: float | None = None   # N, the brace's available strength if known
    added: str | None = None        # date or note, e.g. "2019 retrofit"
    field: str = ""
    stiffness_given: bool = False   # False: no stiffness recorded, taken as rigid
    one_way: bool = False           # a single tension-only cable: holds one direction only

    def brace(self) -> Brace:
        return Brace(self.at, self.stiffness)


@dataclass(frozen=True)
class AxisInput:
    """How one axis of the column is held: the ends, the braces and an optional K override."""

    bottom: End
    top: End
    braces: tuple[BraceInput, ...] = ()
    k: float | None = None
    alignment: tuple[float, float, bool] | None = None   # (Ga, Gb, sway) for the chart K


@dataclass(frozen=True)
class TwistInput:
    """Where twisting is prevented: points along the height and at each end."""

    braces: tuple[float, ...] = ()
    bottom_held: bool = True
    top_held: bool = True


@dataclass(frozen=True)
class Demand:
    """Required axial strength: given directly or from service loads and combinations."""

    axial: float | None                    # N, a factored (or ASD) force given directly
    loads: Mapping[str, float] = field(default_factory=dict)   # N, service loads by type
    basis: str = "lrfd"
    psi0: Mapping[str, float] = field(default_factory=dict)    # EN combination factors set
    moments: Mapping[str, float] = field(default_factory=dict)  # N*mm, second order included
    reactions: tuple[Reaction, ...] = ()
    end_moments: Mapping[str, "EndMoments"] = field(default_factory=dict)  # first order, per axis
    story: "Story | None" = None


@dataclass(frozen=True)
class EndMoments:
    """First-order moments at the two ends of the column about one axis (N*mm, magnitudes) and
    the curvature they bend it in (``single``: M1/M2 < 0; ``reverse``: M1/M2 > 0, AISC signs)."""

    top: float
    bottom: float
    curvature: str

    @property
    def ratio(self) -> float:
        """M1/M2 with the AISC 360-22 App. 8 sign (positive in reverse curvature); 0 with one end
        moment alone.

        Example:
            >>> EndMoments(100.0, 50.0, "single").ratio, EndMoments(100.0, 50.0, "reverse").ratio
            (-0.5, 0.5)
        """
        m2, m1 = max(self.top, self.bottom), min(self.top, self.bottom)
        if m2 == 0:
            return 0.0
        return (m1 / m2) * (1.0 if self.curvature == "reverse" else -1.0)


@dataclass(frozen=True)
class Story:
    """The story the column stands in, for the sway amplifier: its total gravity load (N) and its
    elastic buckling load (N), given or from its lateral stiffness H/Delta_H (N/mm)."""

    load: float
    buckling_load: float | None
    stiffness: float | None


@dataclass(frozen=True)
class ColumnInput:
    """Everything the engine needs about one column, in N, mm, MPa."""

    tag: str
    section: Section
    material: Material
    length: float
    axes: Mapping[str, AxisInput]
    twist: TwistInput
    k_basis: str
    code: str
    basis: str
    demand: Demand | None
    gamma_M1: float
    units: str
    bow: float | None = None       # mm, measured out-of-straightness
    plumb: float | None = None     # mm, measured out-of-plumb over the length
    bow_axis: str = "weak"         # the axis the bow bends the column about
    bow_over: float | None = None  # mm, the length the bow was measured over (default: the span)
    plumb_axis: str = "weak"       # the axis the out-of-plumb bends the column about
    band: "LossBand | None" = None  # section loss over a band of height (the member stays gross)
    knowledge: float = 1.0         # knowledge factor on every capacity (1.0: not applied)
    knowledge_label: str = "not given"
    built: Any = None              # a fieldcol.sections BuiltUp when the section is built up
    moduli: str = ""               # where E and G come from (the code being applied, or as entered)
    bow_allowance: float = 1000.0  # n of the L/n of bow already in the column curve
    plate_joint: Any = None        # a codes.coverplates.PlateJoint: cover plates riveted or bolted
    flange_holes: Any = None       # a codes.netflange.FlangeHoles: fastener holes across a flange


@dataclass(frozen=True)
class Reaction:
    """A beam bearing on the column at an eccentricity about one axis (N, mm)."""

    load: float
    axis: str
    eccentricity: float | None     # None: not measured, the default is taken (face + 100 mm)
    side: int                      # +1 or -1: reactions on opposite sides cancel
    field: str


@dataclass(frozen=True)
class LossBand:
    """Section loss over part of the height: the section there, and where it lies (mm)."""

    section: Section
    start: float
    end: float
    field: str
    holes: Mapping[str, float] = field(default_factory=dict)   # mm of width lost across a plate


def parse_record(record: Mapping[str, Any]) -> ColumnInput:
    """Read a column record into a ``ColumnInput`` (see ``_read_record``).

    A record of plain JSON read before (the same text) gives the same ``ColumnInput`` again,
    read once: the app checks a column again after each edit elsewhere on it, a report and a
    schedule's rows read the same records over. ``ColumnInput`` is frozen, so it is shared.

    Example:
        >>> c = parse_record({"tag": "C1", "section": "W14X90", "material": "A992",
        ...                   "length": "30 ft"})
        >>> round(c.length, 1), c.code, c.k_basis
        (9144.0, 'aisc360-22', 'recommended')
    """
    return record_and_text(record)[0]


def record_and_text(record: Mapping[str, Any]) -> tuple[ColumnInput, str | None]:
    """``parse_record`` and the record's JSON text (None for a record that is not plain JSON:
    only dicts with text keys, lists, texts, numbers, booleans and nulls).

    Example:
        >>> record_and_text({"tag": "C1", "section": "W14X90", "material": "A992",
        ...                  "length": "30 ft"})[1][:13]
        '{"tag": "C1",'
    """
    text = None
    if _plain(record):
        try:
            text = json.dumps(record)
        except (TypeError, ValueError):
            text = None
    if text is not None:
        hit = _READ.get(text)
        if hit is not None:
            return hit, text
    col = _read_record(record)
    if text is not None:
        if len(_READ) >= 256:
            _READ.clear()
        _READ[text] = col
    return col, text


#: records read, by their JSON text (bounded)
_READ: dict[str, ColumnInput] = {}


def _plain(value: Any) -> bool:
    """True for plain JSON values only: a tuple, a number type of its own or a key that is not
    text could read otherwise than the JSON text it writes."""
    kind = type(value)
    if kind is dict:
        return all(type(k) is str and _plain(x) for k, x in value.items())
    if kind is list:
        return all(map(_plain, value))
    return kind is str or kind is float or kind is int or kind is bool or value is None


def _read_record(record: Mapping[str, Any]) -> ColumnInput:
    """Read a column record into a ``ColumnInput``.

    Args:
        record: the JSON object (see README "Column record"); ``tag``, ``section``,
            ``material`` and ``length`` are required.

    Returns:
        ColumnInput with every value in N, mm, MPa.

    Raises:
        InputError: naming the field that cannot be used.

    Example:
        >>> c = parse_record({"tag": "C1", "section": "W14X90", "material": "A992",
        ...                   "length": "30 ft"})
        >>> round(c.length, 1), c.code, c.k_basis
        (9144.0, 'aisc360-22', 'recommended')
    """
    if not isinstance(record, Mapping):
        raise InputError("record", record, "a column record must be a JSON object")
    check_record_keys(record)  # every typo first, wherever it is, before any value is read
    for key in ("notes", "level", "grid", "location"):
        _opt_text(record, key, "")
    for key in ("tag", "section", "material", "length"):
        if record.get(key) in (None, ""):
            raise InputError(key, "", "required", None)
    tag = record["tag"]
    if not isinstance(tag, str) or not tag.strip():
        raise InputError("tag", tag, "the column tag must be text, e.g. B/4-L2")
    code = _choice(record.get("code", "aisc360-22"), CODES, "code")
    length = parse_length(record["length"], "length")
    spec = record["section"]
    built, holes = None, None
    if isinstance(spec, Mapping) and "built" in spec:
        from fieldcol.builtrecord import built_holes, parse_built
        _section_keys(spec, "section")
        built = parse_built(spec["built"])
        holes = built_holes(spec["built"], built)
    section = built.section if built is not None else parse_section(spec)
    material, moduli = for_code(parse_material(record["material"], shape=section.kind), code)
    restraints = _object(record.get("restraints"), "restraints",
                         '{"strong": {..}, "weak": {..}, "twist": {..}}')
    check_keys(restraints, "restraints", "restraints")
    axes = {ax: _axis(_object(restraints.get(ax), f"restraints.{ax}",
                              '{"bottom": "pinned", "top": "pinned"}'), length, f"restraints.{ax}")
            for ax in AXES}
    twist = _twist(_object(restraints.get("twist"), "restraints.twist",
                           '{"braces": [{"at": "15 ft"}]}'), length, axes)
    own = _own_basis(record, code)
    demand = _demand(record.get("demand"), code, own)
    basis = demand.basis if demand else (own or _BASES[code][0])
    gamma = record.get("gamma_M1", 1.0)
    if not isinstance(gamma, (int, float)) or isinstance(gamma, bool) or not 1.0 <= gamma <= 1.5:
        raise InputError("gamma_M1", gamma, "must be a number from 1.0 to 1.5",
                         "1.0 is recommended by EN 1993-1-1; National Annexes may differ")
    units = _choice(record.get("units", "si" if code == "en1993-1-1" else "us"), ("us", "si"),
                    "units")
    condition = _object(record.get("condition"), "condition", '{"bow": "3/8 in"}')
    check_keys(condition, "condition", "condition")
    bow_over = (None if condition.get("bow_over") in (None, "")
                else parse_length(condition["bow_over"], "condition.bow_over"))
    bow = _opt_length(condition.get("bow"), "condition.bow")
    plumb = _opt_length(condition.get("plumb"), "condition.plumb")
    bow_axis = _choice(condition.get("bow_axis", "weak"), AXES, "condition.bow_axis")
    plumb_axis = _choice(condition.get("plumb_axis", "weak"), AXES, "condition.plumb_axis")
    allowance = _bow_allowance(condition.get("bow_allowance"))
    band = parse_band(record["section"], length)
    kappa, kappa_label = parse_knowledge(record.get("knowledge"))
    joint = _record_plate_joint(spec, section)
    if joint is not None and joint.bare is not None:
        holes = _plate_holes(spec["plates"], joint)
    return ColumnInput(tag.strip(), section, material, length, axes, twist,
                       _choice(record.get("k_basis", "recommended"), K_BASES, "k_basis"),
                       code, basis, demand, float(gamma), units, bow, plumb, bow_axis, bow_over,
                       plumb_axis, band, kappa, kappa_label, built, moduli, allowance,
                       joint, holes)


def _plate_holes(plates: Mapping[str, Any], joint: Any) -> Any:
    """The fastener holes across a flange and its riveted or bolted cover plate
    (``section.plates.holes``), as a ``codes.netflange.FlangeHoles``, or None."""
    if plates.get("holes") is None:
        return None
    from fieldcol.builtrecord import parse_holes
    from fieldcol.codes.netflange import HOLE_ALLOWANCE, FlangeHoles

    fld = "section.plates.holes"
    d, n = parse_holes(plates["holes"], fld)
    bf, tf = float(joint.bare.bf), float(joint.bare.tf)
    width = min(bf, joint.width)
    if n * (d + HOLE_ALLOWANCE) >= width:
        raise InputError(f"{fld}.per_flange", n, f"{n} holes of {d:.1f} mm take the whole width "
                         f"of the flange and plate ({width:.0f} mm)", "count the holes across one flange")
    return FlangeHoles(d, n, joint.thickness + tf, joint.width * joint.thickness + bf * tf,
                       "strong", "flange and cover plate")


def _record_plate_joint(spec: Any, section: Section) -> Any:
    """The cover plates' fasteners of a record's section (already read once by parse_section)."""
    plates = spec.get("plates") if isinstance(spec, Mapping) else None
    if not isinstance(plates, Mapping) or plates.get("connection", "welded") == "welded":
        return None
    tp = parse_length(plates.get("thickness", ""), "section.plates.thickness")
    bp = (None if plates.get("width") in (None, "")
          else parse_length(plates["width"], "section.plates.width"))
    # the plated section's bf is the flange width (with_plates keeps it); the shape without
    # the plates is kept too: plates never make the column weaker than the shape alone
    bare = parse_section({k: v for k, v in spec.items() if k != "plates"})
    return replace(_plate_joint(plates, "section", tp, bp, section), bare=bare)


#: Knowledge settings of the kind used in existing-building assessment (ASCE 41 data collection
#: levels; values from memory): the factor multiplies every capacity.
KNOWLEDGE = {"minimum": 0.75, "usual": 1.0, "comprehensive": 1.0}


def parse_knowledge(value: Any, fld: str = "knowledge") -> tuple[float, str]:
    """The knowledge factor: a setting (``minimum``, ``usual``, ``comprehensive``) or a number
    from 0.5 to 1.0; absent: 1.0, not applied.

    Example:
        >>> parse_knowledge("minimum"), parse_knowledge(0.9)
        ((0.75, 'minimum'), (0.9, 'given'))
    """
    if value is None:
        return 1.0, "not given"
    if isinstance(value, str):
        key = _choice(value, tuple(KNOWLEDGE), fld)
        return KNOWLEDGE[key], key
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not 0.5 <= value <= 1.0:
        raise InputError(fld, value, "must be minimum, usual, comprehensive or a number from 0.5 to 1.0",
                         "the factor multiplies every capacity: less known, lower")
    return float(value), "given"


def parse_band(spec: Any, length: float, fld: str = "section") -> "LossBand | None":
    """The loss band of a section entry: its ``loss`` with ``from`` and ``to`` (mm from the
    bottom), else None (a loss without them is over the full length).

    Example:
        >>> b = parse_band({"name": "W10X49", "loss": {"flange": "0.4 in", "from": "0 in",
        ...                 "to": "6 in"}}, 4000.0)
        >>> round(b.end, 1), round(float(b.section.tf), 2)
        (152.4, 10.16)
    """
    if not isinstance(spec, Mapping) or not isinstance(spec.get("loss"), Mapping):
        return None
    loss = spec["loss"]
    if loss.get("from") in (None, "") and loss.get("to") in (None, ""):
        if loss.get("holes") not in (None, {}, ""):
            raise InputError(f"{fld}.loss.holes", str(loss["holes"]), "holes are local: give the band they lie in",
                             '"from": "0 in", "to": "6 in" beside the holes')
        return None
    lf = f"{fld}.loss"
    for key in ("from", "to"):
        if loss.get(key) in (None, ""):
            raise InputError(f"{lf}.{key}", "", "a loss band needs both from and to",
                             '{"flange": "0.30 in", "from": "0 in", "to": "6 in"}')
    z0 = parse_length(loss["from"], f"{lf}.from", allow_zero=True)
    z1 = parse_length(loss["to"], f"{lf}.to")
    if not 0 <= z0 < z1 <= length:
        raise InputError(f"{lf}.to", loss["to"], "the band must lie within the column, 'from' below 'to'",
                         "heights measured from the bottom end")
    sec = parse_section(spec, fld, band=True)
    return LossBand(sec, z0, z1, lf, _holes(loss.get("holes"), sec, f"{lf}.holes"))


def _holes(spec: Any, sec: Section, fld: str) -> dict[str, float]:
    """Holes through the plates at one height in the band: the width lost across each flange,
    the web, or a wall (mm), each less than the plate it pierces."""
    spec = _object(spec, fld, '{"flange": "1 in", "web": "2 in"}')
    check_keys(spec, "holes", fld)
    plates = {"i": {"flange": "bf", "web": "d"}, "rect": {"wall": "bf"}, "round": {"wall": "d"}}[sec.kind]
    out = {}
    for key, v in spec.items():
        if v in (None, ""):
            continue
        if key not in plates:
            raise InputError(f"{fld}.{key}", str(v), f"a {sec.kind} section has no {key}",
                             " or ".join(plates))
        w = parse_length(v, f"{fld}.{key}")
        across = float(getattr(sec, plates[key]))
        if key == "web":
            across -= 2 * float(sec.tf)
        if w >= across:
            raise InputError(f"{fld}.{key}", str(v), "the hole is as wide as the plate",
                             "a plate with nothing left cannot be assessed; replace or strengthen it")
        out[key] = w
    return out


def parse_section(spec: Any, fld: str = "section", *, band: bool = False) -> Section:
    """A section from a catalogue name or an object of measured dimensions (with optional loss,
    then optional cover plates ``"plates": {"thickness": .., "width": ..}`` on an I section).
    A loss with ``from`` and ``to`` is a band: the member's section stays as built, and
    ``band=True`` gives the section inside the band.

    Example:
        >>> parse_section({"shape": "round", "D": "168.3 mm", "t": "7.1 mm"}).kind
        'round'
    """
    if isinstance(spec, str):
        return from_catalogue(spec)
    if not isinstance(spec, Mapping):
        raise InputError(fld, spec, "give a catalogue name or an object of dimensions",
                         'e.g. "W14X90" or {"shape": "i", "d": "14 in", ...}')
    _section_keys(spec, fld)
    if "built" in spec:
        from fieldcol.builtrecord import parse_built
        return parse_built(spec["built"], f"{fld}.built").section
    if "name" in spec:
        name = spec["name"]
        if not isinstance(name, str) or not name.strip():
            raise InputError(f"{fld}.name", name, "must be a catalogue name (text)",
                             'e.g. "W14X90"')
        sec = from_catalogue(name)
    else:
        shape = _choice(spec.get("shape"), ("i", "rect", "round"), f"{fld}.shape")

        def dim(key: str, required: bool = True) -> float | None:
            if spec.get(key) in (None, ""):
                if required:
                    raise InputError(f"{fld}.{key}", "", "required for shape " + shape)
                return None
            return parse_length(spec[key], f"{fld}.{key}")

        try:
            if shape == "i":
                welded = _flag(spec, "welded", fld)
                r = 0.0 if spec.get("r") in (None, "") else parse_length(spec["r"], f"{fld}.r", allow_zero=True)
                sec = i_section(dim("d"), dim("bf"), dim("tf"), dim("tw"), r, rolled=not welded)
            elif shape == "rect":
                r_out = dim("r", required=False)
                sec = rect_hollow(dim("d"), dim("b"), dim("t"), r_out, rolled=_hot_finished(spec, fld))
            else:
                sec = round_hollow(dim("D"), dim("t"), rolled=_hot_finished(spec, fld))
        except InputError as e:
            if e.field.startswith(fld + "."):
                raise
            # the constructors speak mm and their own argument names
            raise _as_typed(e, spec, fld) from None
    loss = _object(spec.get("loss"), f"{fld}.loss",
                   '{"flange": "0.55 in"} (remaining) or {"uniform": "1 mm"}')
    if loss:
        check_keys(loss, "section loss", f"{fld}.loss")
        is_band = any(loss.get(k) not in (None, "") for k in ("from", "to"))
        vals = {k: parse_length(v, f"{fld}.loss.{k}") for k, v in loss.items()
                if k not in ("from", "to", "holes")}
        if (band or not is_band) and vals:
            try:
                sec = with_loss(sec, **vals)
            except InputError as e:
                # the engine speaks mm and its own argument names: name the record's full field
                # and quote the entry as typed
                raise _as_typed(e, loss, f"{fld}.loss") from None
    plates = spec.get("plates")
    if plates is not None:
        # after the loss: plates are welded to the steel that remains
        plates = _object(plates, f"{fld}.plates", '{"thickness": "3/8 in", "width": "12 in"}')
        check_keys(plates, "cover plates", f"{fld}.plates")
        tp = parse_length(plates.get("thickness", ""), f"{fld}.plates.thickness")
        bp = (None if plates.get("width") in (None, "")
              else parse_length(plates["width"], f"{fld}.plates.width"))
        how = _plate_joint(plates, fld, tp, bp, sec)
        try:
            sec = with_plates(sec, tp, bp, field=f"{fld}.plates",
                              how="welded" if how is None else how.connection)
        except InputError as e:
            raise _as_typed(e, plates, f"{fld}.plates") from None
    return sec


def _plate_joint(plates: Mapping[str, Any], fld: str, tp: float, bp: float | None,
                 sec: Section) -> Any:
    """The cover plates' fasteners (a ``codes.coverplates.PlateJoint``), None when welded."""
    from fieldcol.codes.coverplates import CONNECTIONS, PlateJoint

    how = _choice(plates.get("connection", "welded"), CONNECTIONS, f"{fld}.plates.connection")
    if how == "welded" and plates.get("holes") is not None:
        raise InputError(f"{fld}.plates.holes", "welded", "welded plates have no fastener holes",
                         "give the connection: riveted or bolted")
    if how == "welded":
        if plates.get("pitch") not in (None, ""):
            raise InputError(f"{fld}.plates.pitch", plates["pitch"], "welded plates have no "
                             "fastener pitch", "give the connection: riveted or bolted")
        return None
    if plates.get("pitch") in (None, ""):
        raise InputError(f"{fld}.plates.pitch", "", f"required for {how} plates",
                         "the spacing of the rivets or bolts along the column, e.g. 6 in")
    pitch = parse_length(plates["pitch"], f"{fld}.plates.pitch")
    return PlateJoint(how, pitch, float(tp), float(sec.bf if bp is None else bp))


def parse_material(spec: Any, fld: str = "material", *, shape: str | None = None) -> Material:
    """A material from a grade name, or an object: ``{"grade": "A7", "Fy": "35 ksi"}`` (a tested
    yield stress overrides the grade) or ``{"Fy": "50 ksi", "E": "29000 ksi"}``. ``shape``
    (a section kind) picks the round or rectangular row of a shape-dependent grade (A500).

    Example:
        >>> parse_material({"grade": "A36", "Fy": "40 ksi"}).tested
        True
    """
    shape = shape if shape in ("rect", "round") else None
    if isinstance(spec, str):
        return get_material(spec, shape=shape, field=fld)
    if not isinstance(spec, Mapping):
        raise InputError(fld, spec, "give a grade name or an object", 'e.g. "A992" or {"Fy": "50 ksi"}')
    _material_keys(spec, fld)
    if "grade" in spec:
        grade = spec["grade"]
        if not isinstance(grade, str) or not grade.strip():
            raise InputError(f"{fld}.grade", grade, "must be a grade name (text)", 'e.g. "A36"')
        mat = get_material(grade, shape=shape, field=f"{fld}.grade")
        if spec.get("Fy") not in (None, ""):
            mat = with_tested_fy(mat, parse_quantity(spec["Fy"], "stress", f"{fld}.Fy"))
        return mat
    kw = {k: spec[k] for k in ("Fy", "E", "G", "Fu") if spec.get(k) not in (None, "")}
    if "Fy" not in kw:
        raise InputError(f"{fld}.Fy", "", "required when no grade is given", 'e.g. "36 ksi"')
    name = _opt_text(spec, "name", fld)
    return material_from_values(**kw, name=name or "as measured", field=fld)


# A record is what was typed on site: a number without its unit is ambiguous (30 what?), so every
# dimensional value needs one; only zero may stand alone.
_BARE = re.compile(r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?(\s*-?\s*\d+\s*/\s*\d+)?\s*$"
                   r"|^\s*\d+\s*/\s*\d+\s*$")
#: texts seen to carry more than a bare number (bounded)
_WITH_UNIT: set[str] = set()
_EXAMPLES = {"length": "30 ft, 12'-6\", 9.1 m or 150 mm", "force": "840 kip or 3700 kN",
             "moment": "120 kip*ft or 163 kN*m",
             "stress": "50 ksi or 345 MPa", "area": "0.2 in2 or 130 mm2",
             "stiffness": "20 kip/in or 3.5 kN/mm",
             "rotational_stiffness": "50000 kip*in/rad or 5000 kN*m/rad"}


def _unit_required(text: Any, kind: str, fld: str) -> None:
    if type(text) is str and text in _WITH_UNIT:  # a record's texts repeat: matched once
        return
    if isinstance(text, bool):
        return
    bare = isinstance(text, (int, float)) or (isinstance(text, str) and _BARE.match(text))
    if not bare:
        if type(text) is str:
            if len(_WITH_UNIT) >= 4096:
                _WITH_UNIT.clear()
            _WITH_UNIT.add(text)
        return
    try:
        if float(text) == 0:
            return
    except (TypeError, ValueError):
        pass
    raise InputError(fld, str(text), "a unit is needed", "e.g. " + _EXAMPLES[kind])


def parse_length(text: Any, fld: str, *, allow_zero: bool = False) -> float:
    """A length in mm from an entry that carries its unit (``"30 ft"``, ``12'-6\"``, ``"3.81 m"``).

    Example:
        >>> parse_length("12 ft 6 in", "length")
        3810.0
    """
    _unit_required(text, "length", fld)
    return _parse_length(text, fld, allow_zero=allow_zero)


def parse_quantity(text: Any, kind: str, fld: str, *, allow_zero: bool = False) -> float:
    """A quantity in the engine's unit of ``kind`` from an entry that carries its unit.

    Example:
        >>> round(parse_quantity("840 kip", "force", "demand.axial"))
        3736506
    """
    if kind != "angle":  # an angle typed alone is in degrees
        _unit_required(text, kind, fld)
    return _parse_quantity(text, kind, fld, allow_zero=allow_zero)


def _as_typed(e: InputError, typed: Mapping[str, Any], fld: str) -> InputError:
    """``e`` with its field under ``fld`` (``flange`` -> ``section.loss.flange``) and the entry
    quoted as typed (``0.9 in``), not as the millimetres the engine received."""
    key = e.field.rsplit(".", 1)[-1] if e.field.startswith(fld) else e.field
    key = key.rstrip("0123456789") if key.rstrip("0123456789") in typed else key
    if key in typed:
        return InputError(f"{fld}.{key}", str(typed[key]), e.reason, e.hint)
    return InputError(fld if e.field in ("section", "") else f"{fld}.{e.field}"
                      if not e.field.startswith(fld) else e.field, e.text, e.reason, e.hint)


FINISHES = ("cold-formed", "hot-finished")


def _hot_finished(spec: Mapping[str, Any], fld: str) -> bool:
    """A hollow section's ``finish``: ``hot-finished`` (EN 10210; EN 1993-1-1 Table 6.2 curve a)
    or ``cold-formed`` (EN 10219, ASTM A500; curve c), the default when not recorded."""
    return _choice(spec.get("finish", "cold-formed"), FINISHES, f"{fld}.finish") == "hot-finished"


def _bow_allowance(value: Any, fld: str = "condition.bow_allowance") -> float:
    """n of the L/n of bow the column curve already holds: ``L/1000`` (the default: the
    straightness tolerance the curves cover) or ``L/1500`` (conservative)."""
    if value in (None, ""):
        return 1000.0
    text = value.replace(" ", "").upper() if isinstance(value, str) else None
    if text in ("L/1000", "L/1500"):
        return float(text[2:])
    raise InputError(fld, value, "not one of the choices",
                     "L/1000 (default: the straightness tolerance the column curves cover) or "
                     "L/1500 (conservative)")


def _choice(value: Any, allowed: tuple[str, ...], fld: str) -> str:
    if isinstance(value, str) and value.strip().lower() in allowed:
        return value.strip().lower()
    raise InputError(fld, value, "not one of the choices", "use " + ", ".join(allowed))


def _opt_length(value: Any, fld: str) -> float | None:
    if value in (None, ""):
        return None
    return parse_length(value, fld, allow_zero=True)


def _end(spec: Any, fld: str) -> End:
    if isinstance(spec, str):
        return end(spec.strip().lower(), fld)
    if isinstance(spec, Mapping):
        check_keys(spec, "spring end", fld)
        rot = spec.get("rotation")
        if rot in (None, ""):
            raise InputError(f"{fld}.rotation", "", "a partial end needs its rotational stiffness",
                             'e.g. {"rotation": "50000 kip*in/rad"}')
        k_rot = parse_quantity(rot, "rotational_stiffness", f"{fld}.rotation", allow_zero=True)
        tr = spec.get("translation", "held")
        if not isinstance(tr, str):
            raise InputError(f"{fld}.translation", tr, "must be held, free or a stiffness (text)",
                             'e.g. "held" or "20 kip/in"')
        tr = tr.strip().lower() if tr.strip().lower() in ("held", "free") else tr
        k_tr = math.inf if tr == "held" else (0.0 if tr == "free" else
                                              parse_quantity(tr, "stiffness", f"{fld}.translation",
                                                             allow_zero=True))
        return partial_end(k_rot, k_tr, fld)
    raise InputError(fld, spec, "unknown end condition",
                     'fixed, pinned, free, guided or {"rotation": "..."}')


def _axis(spec: Any, length: float, fld: str) -> AxisInput:
    if not isinstance(spec, Mapping):
        raise InputError(fld, spec, "must be an object with bottom, top, braces")
    check_keys(spec, "axis", fld)
    bottom = _end(spec.get("bottom", "pinned"), f"{fld}.bottom")
    top = _end(spec.get("top", "pinned"), f"{fld}.top")
    braces = tuple(_brace(b, length, f"{fld}.braces[{i}]")
                   for i, b in enumerate(_list(spec.get("braces"), f"{fld}.braces")))
    k = spec.get("k")
    if k is not None:
        if isinstance(k, bool) or not isinstance(k, (int, float)) or not 0.1 <= k <= 10:
            raise InputError(f"{fld}.k", k, "K must be a number from 0.1 to 10")
        k = float(k)
    return AxisInput(bottom, top, braces, k, _alignment(spec.get("alignment"), f"{fld}.alignment"))


def _alignment(spec: Any, fld: str) -> tuple[float, float, bool] | None:
    """``{"Ga": 1.2, "Gb": 10, "sway": false}``: end stiffness ratios for the alignment chart."""
    if spec is None:
        return None
    if isinstance(spec, Mapping):
        check_keys(spec, "alignment", fld)
    if not isinstance(spec, Mapping) or "Ga" not in spec or "Gb" not in spec:
        raise InputError(fld, spec, "needs Ga and Gb", '{"Ga": 1.2, "Gb": 10, "sway": false}')
    vals = []
    for key in ("Ga", "Gb"):
        g = spec[key]
        if g == "inf":
            g = math.inf
        if isinstance(g, bool) or not isinstance(g, (int, float)) or not g >= 0:
            raise InputError(f"{fld}.{key}", g, "G must be a number >= 0 (0 fixed, \"inf\" pinned)",
                             "common practice: 10 for a pinned base, 1 for a fixed base")
        vals.append(float(g))
    return vals[0], vals[1], _flag(spec, "sway", fld)


def _list(value: Any, fld: str) -> list:
    if value is None:
        return []
    if not isinstance(value, list):
        raise InputError(fld, value, "must be a list", '[{"at": "15 ft"}]')
    return value


def _brace(spec: Any, length: float, fld: str) -> BraceInput:
    if not isinstance(spec, Mapping):
        raise InputError(fld, spec, "a brace must be an object", '{"at": "15 ft"}')
    check_keys(spec, "brace", fld)
    if spec.get("at") in (None, ""):
        raise InputError(f"{fld}.at", spec, "a brace needs its position", '{"at": "15 ft"}')
    at = _position(spec["at"], length, f"{fld}.at")
    kind = spec.get("kind")
    if kind is not None:
        _choice(kind, BRACE_KINDS, f"{fld}.kind")
    _opt_text(spec, "seen_by", fld)
    _opt_text(spec, "note", fld)
    stiffness, given, one_way = math.inf, False, False
    if spec.get("stiffness") == "rigid":  # the engineer's judgement, e.g. a floor beam framing in
        given = True
    elif spec.get("stiffness") not in (None, ""):
        stiffness, given = parse_quantity(spec["stiffness"], "stiffness", f"{fld}.stiffness"), True
    if spec.get("cable") is not None:
        if given:
            raise InputError(f"{fld}.stiffness", spec["stiffness"],
                             "give either a stiffness or a cable, not both",
                             "the cable's stiffness follows from its area, length and angle")
        stiffness, one_way = _cable(spec["cable"], f"{fld}.cable")
        given = True
    strength = None
    if spec.get("strength") not in (None, ""):
        strength = parse_quantity(spec["strength"], "force", f"{fld}.strength")
    added = _opt_text(spec, "added", fld)
    return BraceInput(at, stiffness, strength, added, fld, given, one_way)


def _position(text: Any, length: float, fld: str) -> float:
    at = parse_length(text, fld)
    if not 0 < at <= length:
        raise InputError(fld, text, "outside the column length",
                         "measure from the bottom end; it must lie within the length")
    return at


def _cable(c: Any, fld: str) -> tuple[float, bool]:
    """Stiffness (A E / L) cos^2(theta) of a cable or rod brace (common practice), and whether
    it holds one direction only (a single tension-only member, neither paired nor pretensioned)."""
    if not isinstance(c, Mapping):
        raise InputError(fld, c, "must be an object with area, length, angle")
    check_keys(c, "cable", fld)
    if c.get("angle") in (None, ""):
        raise InputError(f"{fld}.angle", "", "required: the angle between the cable and the "
                         "direction the braced point moves", 'e.g. "45 deg" (0 = in line)')
    area = parse_quantity(c.get("area", ""), "area", f"{fld}.area")
    clen = parse_length(c.get("length", ""), f"{fld}.length")
    angle = parse_quantity(c["angle"], "angle", f"{fld}.angle", allow_zero=True)
    # a steel rod; wire rope is softer: give its E
    E = parse_quantity(c.get("E", "200000 MPa"), "stress", f"{fld}.E")
    flags = {key: _flag(c, key, fld) for key in ("pair", "pretensioned")}
    k = float(cable_stiffness(area, E, clen, angle, field=fld))
    return k, not (flags["pair"] or flags["pretensioned"])


def _twist(spec: Any, length: float, axes: Mapping[str, AxisInput]) -> TwistInput:
    fld = "restraints.twist"
    if not isinstance(spec, Mapping):
        raise InputError(fld, spec, "must be an object with braces, bottom, top")
    check_keys(spec, "twist", fld)
    at = []
    for i, b in enumerate(_list(spec.get("braces"), f"{fld}.braces")):
        bf = f"{fld}.braces[{i}]"
        if not isinstance(b, Mapping):
            raise InputError(bf, b, "a twist restraint must be an object", '{"at": "15 ft"}')
        for key in b:
            if key in ("stiffness", "strength", "cable"):
                raise InputError(f"{bf}.{key}", key, "a twist restraint is taken as rigid: no "
                                 "stiffness, strength or cable", ", ".join(KEYS["twist restraint"]))
        check_keys(b, "twist restraint", bf)
        if b.get("at") in (None, ""):
            raise InputError(f"{bf}.at", b, "a twist restraint needs its position", '{"at": "15 ft"}')
        for key in ("added", "seen_by", "note"):
            _opt_text(b, key, bf)
        at.append(_position(b["at"], length, f"{bf}.at"))
    ends = {}
    for name in ("bottom", "top"):
        # an end free to sway and rotate about both axes cannot hold the section against
        # twisting either, unless the record says so
        free_both = all(axes[ax].__getattribute__(name).label == "free" for ax in AXES)
        default = "free" if free_both else "held"
        ends[name] = _choice(spec.get(name, default), ("held", "free"), f"{fld}.{name}") == "held"
    return TwistInput(tuple(at), ends["bottom"], ends["top"])


def _own_basis(record: Mapping[str, Any], code: str) -> str | None:
    """The record's own ``basis`` (a column with no demand still shows phi Pn or Pn / Omega);
    a demand's own ``basis`` must agree with it."""
    given = record.get("basis")
    if given in (None, ""):
        return None
    own = _choice(given, _BASES[code], "basis")
    spec = record.get("demand")
    if isinstance(spec, Mapping) and spec.get("basis") not in (None, "") \
            and _choice(spec["basis"], _BASES[code], "demand.basis") != own:  # read as typed
        raise InputError("basis", given, f"differs from demand.basis ({spec['basis']})",
                         "give the basis once, or the same in both")
    return own


def _demand(spec: Any, code: str, basis: str | None = None) -> Demand | None:
    if spec in (None, {}):
        return None
    if not isinstance(spec, Mapping):
        raise InputError("demand", spec, "must be an object", '{"axial": "840 kip", "basis": "lrfd"}')
    check_keys(spec, "demand", "demand")
    loads = _object(spec.get("loads"), "demand.loads", '{"dead": "200 kip", "live": "150 kip"}')
    check_keys(loads, "loads", "demand.loads")
    psi0 = _object(spec.get("psi0"), "demand.psi0", '{"live": 1.0}')
    check_keys(psi0, "psi0", "demand.psi0")
    basis = _choice(spec.get("basis", basis or _BASES[code][0]), _BASES[code], "demand.basis")
    bending = _bending(spec)
    if spec.get("axial") not in (None, ""):
        if loads:
            raise InputError("demand.loads", spec["loads"], "give either axial or loads, not both")
        if psi0:
            raise InputError("demand.psi0", psi0, "psi0 combines loads; the axial force given "
                             "is used as it stands", "leave out psi0, or give loads instead")
        return Demand(parse_quantity(spec["axial"], "force", "demand.axial"), {}, basis, {}, *bending,
                      *_first_order(spec))
    if not loads:
        raise InputError("demand", spec, "give axial or loads",
                         '{"axial": "840 kip"} or {"loads": {"dead": "200 kip", "live": "150 kip"}}')
    vals = {k: parse_quantity(v, "force", f"demand.loads.{k}", allow_zero=True)
            for k, v in loads.items()}
    if psi0:
        if code != "en1993-1-1":
            raise InputError("demand.psi0", psi0, "psi0 factors apply to EN 1990 combinations",
                             '{"live": 1.0} for storage (category E), {"snow": 0.7} above 1000 m')
        for k, v in psi0.items():
            if isinstance(v, bool) or not isinstance(v, (int, float)) or not 0 <= v <= 1:
                raise InputError(f"demand.psi0.{k}", v, "must be a number from 0 to 1",
                                 "EN 1990 Table A1.1")
    return Demand(None, vals, basis, {k: float(v) for k, v in psi0.items()}, *bending, *_first_order(spec))


def _first_order(spec: Mapping[str, Any]) -> tuple[dict[str, EndMoments], "Story | None"]:
    """``end_moments`` (first order, per axis: ``top``, ``bottom``, ``curvature``) and ``story``
    (``load`` with ``buckling_load`` or ``stiffness``) for the amplifiers B1 and B2."""
    ends = _object(spec.get("end_moments"), "demand.end_moments",
                   '{"strong": {"top": "80 kip*ft", "bottom": "40 kip*ft", "curvature": "reverse"}}')
    check_keys(ends, "end moments", "demand.end_moments")
    out = {}
    for ax, e in ends.items():
        ef = f"demand.end_moments.{ax}"
        e = _object(e, ef, '{"top": "80 kip*ft", "bottom": "40 kip*ft", "curvature": "reverse"}')
        check_keys(e, "end moments of an axis", ef)
        top, bottom = (0.0 if e.get(k) in (None, "") else
                       abs(parse_quantity(e[k], "moment", f"{ef}.{k}", allow_zero=True)) for k in ("top", "bottom"))
        curv = _choice(e.get("curvature", "single"), ("single", "reverse"), f"{ef}.curvature")
        out[ax] = EndMoments(top, bottom, curv)
    story = _object(spec.get("story"), "demand.story", '{"load": "2400 kip", "stiffness": "60 kip/in"}')
    check_keys(story, "story", "demand.story")
    if not story:
        return out, None
    if story.get("load") in (None, ""):
        raise InputError("demand.story.load", "", "required: the story's total gravity load",
                         '"2400 kip", on the basis of the axial demand')
    load = parse_quantity(story["load"], "force", "demand.story.load")
    pe = (None if story.get("buckling_load") in (None, "")
          else parse_quantity(story["buckling_load"], "force", "demand.story.buckling_load"))
    k = (None if story.get("stiffness") in (None, "")
         else parse_quantity(story["stiffness"], "stiffness", "demand.story.stiffness"))
    if (pe is None) == (k is None):
        raise InputError("demand.story", story, "give the story's buckling_load or its lateral stiffness "
                         "(H / Delta_H), one of them", '{"load": "2400 kip", "stiffness": "60 kip/in"}')
    return out, Story(load, pe, k)


def _bending(spec: Mapping[str, Any]) -> tuple[dict[str, float], tuple[Reaction, ...]]:
    """``moments`` (second order included, per axis) and ``reactions`` (beams bearing at an
    eccentricity), on the same basis as the axial demand."""
    given = _object(spec.get("moments"), "demand.moments", '{"strong": "120 kip*ft"}')
    check_keys(given, "moments", "demand.moments")
    moments = {ax: parse_quantity(v, "moment", f"demand.moments.{ax}", allow_zero=True)
               for ax, v in given.items() if v not in (None, "")}
    reactions = []
    for i, r in enumerate(_list(spec.get("reactions"), "demand.reactions")):
        rf = f"demand.reactions[{i}]"
        if not isinstance(r, Mapping):
            raise InputError(rf, r, "a reaction must be an object", '{"load": "40 kip", "axis": "strong"}')
        check_keys(r, "reaction", rf)
        if r.get("load") in (None, ""):
            raise InputError(f"{rf}.load", "", "required: the beam's reaction on the column",
                             '"40 kip"')
        load = parse_quantity(r["load"], "force", f"{rf}.load", allow_zero=True)
        axis = _choice(r.get("axis", "strong"), AXES, f"{rf}.axis")
        ecc = (None if r.get("eccentricity") in (None, "")
               else parse_length(r["eccentricity"], f"{rf}.eccentricity", allow_zero=True))
        side = _choice(r.get("side", "+"), ("+", "-"), f"{rf}.side")
        reactions.append(Reaction(load, axis, ecc, 1 if side == "+" else -1, rf))
    return moments, tuple(reactions)
