"""Words and numbers for the report: quantities in the site's units, status words, records in words.

Everything here turns stored data (a check's JSON, a column record as typed) into plain text;
nothing draws. Kept apart from the drawing so the wording can be tested and reused alone.
"""

from __future__ import annotations

import json
import math
from typing import Any

from fieldcol.assess import MODE_WORDS as _MODE_WORDS
from fieldcol.store._schema import FACE_WORDS
from fieldcol.units import STEP_KINDS

# engine unit -> fieldcol.units kind, so each value is shown in the site's unit system
_KIND = STEP_KINDS

END_WORDS = {"pinned": "pinned (free to rotate, held in place)",
             "fixed": "fixed (rotation and position held)",
             "free": "free (neither rotation nor position held)",
             "guided": "guided (rotation held, free to sway)"}

# the one table of mode words lives with the engine (fieldcol.assess.MODE_WORDS)
MODE_WORDS = _MODE_WORDS

RESTRAINT_KIND_WORDS = {"brace_added": "brace added", "brace_removed": "brace removed",
                        "cable_found": "cable found", "end_condition_changed": "end condition changed",
                        "other": "other"}

SEVERITY_ORDER = ("urgent", "high", "medium", "low", "info")


#: the design code in words (the cover, a sheet whose record has no check yet)
CODE_WORDS = {"aisc360-22": "ANSI/AISC 360-22 (Specification for Structural Steel Buildings)",
              "en1993-1-1": "EN 1993-1-1 (Eurocode 3)", "elastic": "elastic reference check"}


def column_status(c: Any) -> str:
    """A column's status word from its latest check (a ``_gather.ColumnData``).

    Example: ``column_status(c)`` gives ``'OVER'`` for the demo's C/3-G.
    """
    return status_word(c.check is not None, c.status, c.utilization)


def util_status(c: Any) -> str:
    """The utilization with its status word, or the word alone when there is no number.

    Example: ``util_status(c)`` gives ``'1.110 OVER'`` for the demo's C/3-G.
    """
    word = column_status(c)
    return f"{utilization_text(c.utilization)} {word}" if word in ("OK", "OVER") else word


def length_text(text: Any, system: str) -> str:
    """A length as typed, shown in the site's units (as typed when it cannot be read: its
    check names what is wrong with it).

    Example: ``length_text("4 ft", "us")`` gives ``'4\'-0"'``.
    """
    from fieldcol.errors import InputError
    from fieldcol.units import format_length, parse_length

    if text in (None, ""):
        return "not recorded"
    try:
        return format_length(parse_length(text, "length"), system)
    except InputError:
        return str(text)


def place_text(f: Any, system: str) -> str:
    """Where on the column a finding is: its face and height, as the register and the
    column's sheet both say it.

    Example: ``place_text(finding, "us")`` gives ``'web, 4\'-0" up'``.
    """
    return ", ".join(([FACE_WORDS.get(f.face, f.face)] if f.face else [])
                     + ([f"{length_text(f.height, system)} up"] if f.height else []))


def quantity(q: dict[str, Any] | None, system: str, digits: int = 4) -> str:
    """A ``{"value", "unit"}`` quantity from the engine's JSON in the display system.

    Args:
        q: the quantity (internal units), or ``None``.
        system: ``"us"`` or ``"si"``.
        digits: significant digits.

    Returns:
        e.g. ``"586 kip"``, ``"24'-0\\""``, ``"6.134 in"``; ``"-"`` when there is no value.

    Example: ``quantity({"value": 4448.2216, "unit": "N"}, "us")`` gives ``'1 kip'``.
    """
    from fieldcol.units import display_unit, format_length, format_quantity, to_display

    if q is None or q.get("value") is None:
        return "-"
    v, unit = q["value"], q.get("unit", "")
    if not isinstance(v, (int, float)):
        return str(v)
    kind = _KIND.get(unit)
    if kind == "length" and system == "us":
        # feet-inches to 1/16 in suit lengths; a radius of gyration needs decimal inches
        if abs(v) >= 300:
            return format_length(v, system)
        return f"{_number(float(to_display(v, 'length', 'us')), digits)} {display_unit('length', 'us')}"
    if kind:
        return format_quantity(v, kind, system, digits)
    return _number(float(v), digits) + (f" {unit}" if unit else "")


def _number(x: float, digits: int) -> str:
    if not math.isfinite(x):
        return "-"
    if x == 0:
        return "0"
    if abs(x) >= 10 ** digits or abs(x) < 1e-3:
        return f"{x:.{digits - 1}e}"
    text = f"{x:.{digits}g}"
    return text


def step_value(step: dict[str, Any], system: str) -> str:
    """The value of one trace step as text with its unit (flags read ``yes`` / ``no``).

    Example: ``step_value({"symbol": "slender,web", "value": 0.0, "unit": ""}, "us")`` gives ``'no'``.
    """
    v = step.get("value")
    if v is None:
        return "-"
    if isinstance(v, str):
        return v
    if str(step.get("symbol", "")).startswith("slender") and v in (0.0, 1.0):
        return "yes" if v else "no"
    return quantity({"value": v, "unit": step.get("unit", "")}, system)


def utilization_text(u: float | None) -> str:
    """A utilization as printed everywhere in the report: three decimals.

    Example: ``utilization_text(1.109992)`` gives ``'1.110'``.
    """
    return "-" if u is None or not math.isfinite(u) else f"{u:.3f}"


def status_word(checked: bool, status: str | None, utilization: float | None) -> str:
    """The status word that always sits beside a check's number (never colour alone).

    Args:
        checked: whether the column has a saved check.
        status: the engine's status (``ok``, ``over``, ``no-demand``, ``not-covered``).
        utilization: the saved utilization.

    Returns:
        ``OK``, ``OVER``, ``not checked``, ``not covered`` or ``no demand``.

    Example: ``status_word(True, "over", 1.11)`` gives ``'OVER'``.
    """
    if not checked:
        return "not checked"
    if status == "not-covered":
        return "not covered"
    if utilization is None or not math.isfinite(utilization):
        return "no demand"
    return "OK" if utilization <= 1.0 else "OVER"


def when(iso: str | None) -> str:
    """A stored UTC timestamp as ``YYYY-MM-DD HH:MM UTC`` (a bare date stays a date).

    Example: ``when("2026-03-03T17:00:00.000000Z")`` gives ``'2026-03-03 17:00 UTC'``.
    """
    if not iso:
        return "-"
    if len(iso) <= 10:
        return iso
    tail = " UTC" if iso.endswith("Z") or iso.endswith("+00:00") else ""
    return f"{iso[:10]} {iso[11:16]}{tail}"


def value_text(v: Any) -> str:
    """A record value as typed: text stays text, anything else as compact JSON.

    Example: ``value_text({"grade": "A7"})`` gives ``'grade A7'``.
    """
    if v is None:
        return "not recorded"
    if isinstance(v, str):
        return v
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, (int, float)):
        return f"{v:g}"
    if isinstance(v, dict):
        return ", ".join(f"{k.replace('_', ' ')} {value_text(x)}" for k, x in v.items())
    if isinstance(v, list):
        return "; ".join(value_text(x) for x in v)
    return json.dumps(v)


def section_text(section: Any) -> str:
    """The record's section in words: a catalogue name, or measured dimensions, loss and plates.

    Example: ``section_text({"shape": "i", "d": "16 in"})`` gives ``'measured I section: d 16 in'``.
    """
    if section is None:
        return "not recorded"
    if isinstance(section, str):
        return section
    if not isinstance(section, dict):
        return value_text(section)
    shape = {"i": "I section", "rect": "rectangular hollow section",
             "round": "round hollow section"}.get(str(section.get("shape")), "section")
    if isinstance(section.get("built"), dict):
        return built_text(section["built"])
    head = str(section["name"]) if section.get("name") else f"measured {shape}"
    dims = [f"{k} {value_text(v)}" for k, v in section.items()
            if k not in ("name", "shape", "loss", "plates", "welded")]
    if section.get("welded"):
        dims.append("welded")
    parts = [head + (": " + ", ".join(dims) if dims else "")]
    loss = section.get("loss")
    if isinstance(loss, dict):
        parts += loss_text(loss)
    plates = section.get("plates")
    if isinstance(plates, dict):
        parts.append(plates_text(plates))
    return "; ".join(parts)


def loss_text(loss: dict[str, Any]) -> list[str]:
    """A section loss in words: how much, where up the column, and any open holes there.

    Example: ``loss_text({"uniform": "1 mm", "from": "0 mm", "to": "300 mm"})`` gives
    ``['section loss 1 mm per exposed face, from 0 mm to 300 mm above the base']``.
    """
    where = ""
    if "from" in loss or "to" in loss:
        where = (f", from {value_text(loss.get('from', 'the base'))} to "
                 f"{value_text(loss.get('to', 'the top'))} above the base")
    else:
        where = " over the full length"
    parts = []
    if "uniform" in loss:
        parts.append(f"section loss {value_text(loss['uniform'])} per exposed face")
    measured = {k: x for k, x in loss.items() if k not in ("uniform", "from", "to", "holes")}
    if measured:
        parts.append("remaining thickness measured: " + ", ".join(
            f"{k} {value_text(x)}" for k, x in measured.items()))
    if parts:
        parts[-1] += where
    holes = loss.get("holes")
    if isinstance(holes, dict) and holes:
        parts.append("open holes at one height in that band, width lost: " + ", ".join(
            f"{'each flange' if k == 'flange' else 'one wall' if k == 'wall' else k} "
            f"{value_text(x)}" for k, x in holes.items()))
    elif holes is not None:
        parts.append(f"open holes {value_text(holes)}")
    return parts


def _holes_text(holes: Any, fasteners: str) -> str:
    if not isinstance(holes, dict):
        return f"{fasteners} holes {value_text(holes)}"
    n, dia = holes.get("per_flange"), holes.get("diameter")
    rest = {k: x for k, x in holes.items() if k not in ("per_flange", "diameter")}
    text = (f"{value_text(n) if n is not None else 'the'} {fasteners} hole"
            f"{'' if n in (1, '1') else 's'} of {value_text(dia)} across each flange")
    return text + (f" ({value_text(rest)})" if rest else "")


def plates_text(plates: dict[str, Any]) -> str:
    """Cover plates in words.

    Example: ``plates_text({"width": "10 in", "thickness": "1/2 in"})`` gives
    ``'cover plates 10 in x 1/2 in on both flanges'``.
    """
    conn = plates.get("connection")
    fasteners = "bolt" if conn == "bolted" else "rivet"
    text = (f"cover plates {value_text(plates.get('width'))} x "
            f"{value_text(plates.get('thickness'))} on both flanges")
    if conn:
        text += f", {value_text(conn)}"
    if "pitch" in plates:
        text += f", {fasteners}s at {value_text(plates['pitch'])} pitch"
    if "holes" in plates:
        text += ", " + _holes_text(plates["holes"], fasteners)
    rest = {k: x for k, x in plates.items()
            if k not in ("width", "thickness", "connection", "pitch", "holes")}
    return text + (f" ({value_text(rest)})" if rest else "")


def _parts(count: str, part: Any, kind: str) -> str:
    """``two C12X20.7 channels``, or ``four angles (measured: d 90 mm, ...)``."""
    if isinstance(part, dict):
        return f"{count} {kind}s (measured: {value_text(part)})"
    return f"{count} {value_text(part)} {kind}s"


def _tie_fasteners(f: Any, fasteners: str) -> str:
    if not isinstance(f, dict):
        return f"{fasteners}s {value_text(f)}"
    n = f.get("count")
    text = (f"{value_text(n) if n is not None else 'the'} {fasteners}"
            f"{'' if n in (1, '1') else 's'} of {value_text(f.get('diameter'))} at each end")
    rest = {k: x for k, x in f.items() if k not in ("count", "diameter")}
    return text + (f" ({value_text(rest)})" if rest else "")


_LACING = {"single": "single lacing", "double": "double lacing",
           "posts": "lacing with posts"}


def built_text(built: dict[str, Any]) -> str:
    """A built-up section in the words of the trade: its parts, how they are arranged and
    tied, and how they are joined.

    Example: ``built_text({"arrangement": "channels", "channel": "C12X20.7", "gap": "6 in",
    "toes": "out", "battens": {"spacing": "24 in", "depth": "8 in", "thickness": "3/8 in"}})``
    gives ``'built-up: two C12X20.7 channels, toes out, 6 in clear between them; battens 8 in
    deep x 3/8 in at 24 in centres'``.
    """
    arr = built.get("arrangement")
    conn = built.get("connection")
    fasteners = "bolt" if conn == "bolted" else "rivet"
    used = {"arrangement", "connection", "angle", "channel", "web", "flange_plates", "long_leg",
            "pitch", "gap", "toes", "plates", "depth", "width", "lacing", "battens", "holes"}
    if arr == "channels":
        head = (_parts("two", built.get("channel"), "channel")
                + (f", toes {value_text(built['toes'])}" if "toes" in built else "")
                + (f", {value_text(built['gap'])} clear between them" if "gap" in built else ""))
    elif arr == "angles-web":
        web = built.get("web")
        head = (_parts("four", built.get("angle"), "angle") + " on a web plate "
                + (f"{value_text(web.get('depth'))} x {value_text(web.get('thickness'))}"
                   if isinstance(web, dict) else value_text(web)))
        if "long_leg" in built:
            head += f", long legs to the {value_text(built['long_leg'])}"
        fp = built.get("flange_plates")
        if isinstance(fp, dict):
            head += (f", flange plates {value_text(fp.get('width'))} x "
                     f"{value_text(fp.get('thickness'))}")
    elif arr == "angles-box":
        head = (_parts("four", built.get("angle"), "angle") + " at the corners of a box "
                f"{value_text(built.get('depth'))} deep x {value_text(built.get('width'))} wide")
    elif arr == "angles-star":
        head = (_parts("four", built.get("angle"), "angle") + " heel to heel in a cross"
                + (f", on {value_text(built['gap'])} packings" if "gap" in built else "")
                + (f" at {value_text(built['pitch'])} pitch" if "pitch" in built else ""))
    else:
        return "built-up section: " + value_text(built)
    parts = [head]
    lacing = built.get("lacing")
    if isinstance(lacing, dict):
        text = (f"{_LACING.get(str(lacing.get('kind')), value_text(lacing.get('kind')))} "
                f"of {value_text(lacing.get('width'))} x {value_text(lacing.get('thickness'))} "
                f"bars at {value_text(lacing.get('pitch'))} pitch")
        if "planes" in lacing:
            text += f", {value_text(lacing['planes'])} planes"
        if "fasteners" in lacing:
            text += ", " + _tie_fasteners(lacing["fasteners"], fasteners)
        parts.append(text)
    battens = built.get("battens")
    if isinstance(battens, dict):
        text = (f"battens {value_text(battens.get('depth'))} deep x "
                f"{value_text(battens.get('thickness'))} at {value_text(battens.get('spacing'))}"
                " centres")
        if "planes" in battens:
            text += f", {value_text(battens['planes'])} planes"
        if "fasteners" in battens:
            text += ", " + _tie_fasteners(battens["fasteners"], fasteners)
        parts.append(text)
    if "pitch" in built and arr != "angles-star":
        parts.append(f"stitch {fasteners}s at {value_text(built['pitch'])} pitch")
    plates = built.get("plates")
    if isinstance(plates, dict):
        parts.append(f"boxed by cover plates {value_text(plates.get('width'))} x "
                     f"{value_text(plates.get('thickness'))}")
    if conn:
        parts.append(str(value_text(conn)))
    if "holes" in built:
        parts.append(_holes_text(built["holes"], fasteners))
    rest = {k: x for k, x in built.items() if k not in used}
    if rest:
        parts.append(value_text(rest))
    return "built-up: " + "; ".join(parts)


def material_text(material: Any) -> str:
    """The record's material in words.

    Example: ``material_text({"grade": "A7", "Fy": "35 ksi"})`` gives ``'A7, tested Fy 35 ksi'``.
    """
    if isinstance(material, dict):
        grade = material.get("grade")
        rest = [f"{'tested ' if grade and k == 'Fy' else ''}{k} {value_text(x)}"
                for k, x in material.items() if k != "grade"]
        return ", ".join(([str(grade)] if grade else []) + rest) or "not recorded"
    return value_text(material)


def _end_text(end: Any) -> str:
    if end is None:
        return "not recorded"
    if isinstance(end, str):
        return END_WORDS.get(end, end)
    if isinstance(end, dict):
        return "spring: " + value_text(end)
    return value_text(end)


def brace_text(brace: dict[str, Any]) -> str:
    """One brace point in words: where, what it is, and whether and when it was added.

    Example: ``brace_text({"at": "12 ft"})`` gives ``'at 12 ft; original (no date of addition recorded)'``.
    """
    if not isinstance(brace, dict):
        return value_text(brace)
    parts = [f"at {value_text(brace.get('at'))}"]
    cable = brace.get("cable")
    if isinstance(cable, dict):
        parts.append("cable: " + value_text(cable))
    for key in ("stiffness", "strength"):
        if key in brace:
            parts.append(f"{key} {value_text(brace[key])}")
    for key in ("pair", "pretensioned"):
        if brace.get(key):
            parts.append(key)
    parts.append(f"added: {value_text(brace['added'])}" if brace.get("added")
                 else "original (no date of addition recorded)")
    return "; ".join(parts)


def restraint_lines(restraints: Any) -> list[tuple[str, str]]:
    """Each axis's restraints as (label, words): ends, K override, alignment chart, braces.

    Example: ``restraint_lines({"weak": {"bottom": "pinned"}})[0]`` gives
    ``('weak axis, bottom', 'pinned (free to rotate, held in place)')``.
    """
    out: list[tuple[str, str]] = []
    if restraints is None or restraints == {}:
        restraints = {}  # the check takes an end not recorded as pinned (record.py): say so
    elif not isinstance(restraints, dict):
        return [("restraints", value_text(restraints))]
    for axis in ("strong", "weak", "twist"):
        spec = restraints.get(axis)
        if spec is None and axis != "twist":
            out.append((f"{axis} axis", "not recorded: both ends taken as pinned"))
            continue
        if spec is None:
            continue
        if not isinstance(spec, dict):
            out.append((f"{axis} axis", value_text(spec)))
            continue
        label = "twist" if axis == "twist" else f"{axis} axis"
        for end in ("bottom", "top"):
            if end in spec:
                out.append((f"{label}, {end}", _end_text(spec[end])))
            elif axis != "twist":
                out.append((f"{label}, {end}", "taken as pinned (not recorded)"))
        if "k" in spec:
            out.append((f"{label}, K", f"K taken as {value_text(spec['k'])} (override)"))
        if "alignment" in spec:
            out.append((f"{label}, K", "from the alignment chart: " + value_text(spec["alignment"])))
        braces = spec.get("braces") or []
        if axis == "twist":
            for b in braces:
                out.append((f"{label}, held", brace_text(b)))
        else:
            for i, b in enumerate(braces):
                out.append((f"{label}, brace {i + 1}", brace_text(b)))
            if not braces:
                out.append((f"{label}, braces", "none recorded"))
        for k, v in spec.items():
            if k not in ("bottom", "top", "k", "alignment", "braces"):
                out.append((f"{label}, {k}", value_text(v)))
    return out


def demand_text(demand: Any) -> str:
    """The record's demand in words.

    Example: ``demand_text({"axial": "650 kip", "basis": "lrfd"})`` gives ``'650 kip (LRFD)'``.
    """
    if not isinstance(demand, dict):
        return "none recorded (design strength only)" if demand is None else value_text(demand)
    if "axial" in demand:
        basis = str(demand.get("basis", "")).upper()
        return f"{value_text(demand['axial'])}" + (f" ({basis})" if basis else "")
    if "loads" in demand:
        extra = {k: v for k, v in demand.items() if k != "loads"}
        text = "loads: " + value_text(demand["loads"])
        return text + ("; " + value_text(extra) if extra else "")
    return value_text(demand)


def condition_text(condition: Any, system: str = "si") -> str:
    """The record's measured condition (bow, plumb) in words, each reading as every other
    place writes it (``units.format_reading``: ``1.125 in`` typed on a US site reads
    ``1 1/8 in``, as the check's warning and the app write it); a reading the check cannot
    read stays as typed (the check names it).

    Example: ``condition_text({"bow": "1.125 in", "bow_axis": "weak"}, "us")`` gives
    ``'bow 1 1/8 in about the weak axis'``.
    """
    if not isinstance(condition, dict) or not condition:
        return "no bow or out-of-plumb recorded"

    def reading(text: Any) -> str:
        from fieldcol.errors import InputError
        from fieldcol.record import parse_length  # as the check reads it (a unit needed)
        from fieldcol.units import format_reading

        try:
            return format_reading(parse_length(text, "condition", allow_zero=True), system)
        except InputError:
            return value_text(text)

    parts = []
    if "bow" in condition:
        axis = condition.get("bow_axis")
        parts.append(f"bow {reading(condition['bow'])}"
                     + (f" about the {axis} axis" if axis else ""))
    if "plumb" in condition:
        parts.append(f"out of plumb {reading(condition['plumb'])}")
    parts += [f"{k.replace('_', ' ')} {value_text(v)}" for k, v in condition.items()
              if k not in ("bow", "bow_axis", "plumb")]
    return "; ".join(parts)


def measured_label(section: dict[str, Any]) -> str:
    """A section measured on site in a few words, for the register: its shape and main sizes
    as typed ("measured I" alone left the reader to find which I).

    Example: ``measured_label({"shape": "i", "d": "16 in", "bf": "12 in", "welded": True})``
    gives ``'measured welded I 16 in x 12 in'``.
    """
    shape = str(section.get("shape", "")).strip().lower()
    head = {"i": "welded I" if section.get("welded") else "I", "rect": "RHS",
            "round": "CHS"}.get(shape, "section")
    sizes = " x ".join(value_text(section[k])
                       for k in {"i": ("d", "bf"), "rect": ("d", "b", "t"),
                                 "round": ("D", "t")}.get(shape, ()) if k in section)
    return (f"measured {head}" + (f" {sizes}" if sizes else "")
            + (" with loss" if section.get("loss") else ""))


def built_label(built: dict[str, Any]) -> str:
    """A built-up section in a few words, for the register: its parts, how many, how tied.

    Example: ``built_label({"arrangement": "channels", "channel": "C12X20.7",
    "battens": {"spacing": "24 in"}})`` gives ``'2 C12X20.7 channels, battened'``.
    """
    arr = built.get("arrangement")
    part = built.get("channel" if arr == "channels" else "angle")
    name = "measured" if isinstance(part, dict) else value_text(part)
    tie = ("laced" if "lacing" in built else "battened" if "battens" in built
           else "boxed by plates" if "plates" in built
           else "stitched" if "pitch" in built and arr == "channels" else "")
    head = {"channels": f"2 {name} channels",
            "angles-web": f"4 {name} angles on a web plate",
            "angles-box": f"4 {name} angles, boxed",
            "angles-star": f"4 {name} angles in a cross"}.get(str(arr))
    if head is None:
        return f"built-up {value_text(arr)}"
    return head + (f", {tie}" if tie else "")
