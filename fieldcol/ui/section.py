"""View-models of a column's section: picked from the catalogue, or measured and identified.

A measured section is kept as readings (one per dimension, with the gauge, who and when) and
then either named from the catalogue (a match accepted: the record holds the name and the
catalogue's nominal dimensions count) or kept as measured (the record holds the dimensions and
the readings count). A recorded loss and cover plates stay with the member through either.
No Flet here: functions take an open ``Store`` and are called through ``asyncio.to_thread``.

Public API::

    section_view(store, column_id) -> SectionView
    catalogue_search(text, limit=8) -> list[str]
    find_matches(shape, typed, gauge, system, limit=5) -> list[MatchLine]
    read_dimensions(shape, typed, system) -> dict[str, tuple[str, float]]
    choose_section(store, column_id, name) -> Change
    save_measured(store, column_id, shape, typed, gauge, *, accept, person, visit_id) -> Change
    set_plates(store, column_id, thickness, width, connection, pitch) -> Change
    SHAPES, DIMENSIONS, GAUGE_TOLERANCE
"""

from __future__ import annotations

import bisect
import copy
import functools
import re
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Mapping

from fieldcol import CAUTION
from fieldcol.errors import InputError
from fieldcol.ui.model import Line, loss_lines
from fieldcol.ui.readings import Change, check_now, typed_length, unit_of

if TYPE_CHECKING:
    from fieldcol.store import Store

SHAPES = {"i": "I or H section", "rect": "Rectangular hollow", "round": "Round hollow"}
_SHAPE_WORDS = {"i": "I or H section", "rect": "rectangular hollow section",
                "round": "round hollow section"}
# shape -> (record key, label) of each dimension measured, in the order a person measures them
DIMENSIONS = {
    "i": (("d", "Depth"), ("bf", "Flange width"), ("tf", "Flange thickness"),
          ("tw", "Web thickness")),
    "rect": (("d", "Outside depth"), ("b", "Outside width"), ("t", "Wall thickness")),
    "round": (("D", "Outside diameter"), ("t", "Wall thickness")),
}
# how closely a gauge reads on site steel (mm, either side): typical field accuracy, from
# memory; it widens each rolling-tolerance band when ranking the catalogue
GAUGE_TOLERANCE = {"caliper": 0.25, "ultrasonic thickness gauge": 0.1, "tape": 1.5,
                   "steel rule": 0.5}
_OTHER_GAUGE = 1.0  # a gauge not listed: taken as a rule read to about 1 mm (common practice)


@dataclass(frozen=True)
class DimensionLine:
    """One measured dimension of the column: as typed, with who measured it, how and when."""
    key: str
    label: str
    typed: str
    value: str
    gauge: str
    who: str
    when: str


@dataclass(frozen=True)
class SectionView:
    """What the Section tab shows: the section that counts now and how it is known."""
    column_id: str
    unit: str
    shape: str
    name: str
    source: str
    summary: str
    dimensions: list[Line]
    measured: list[DimensionLine]
    condition: list[Line]
    plates: tuple[str, str] | None
    plates_allowed: bool
    gauge: str
    caution: str = CAUTION
    notes: list[str] = field(default_factory=list)
    plate_joint: tuple[str, str] = ("welded", "")   # cover plates: (connection, pitch as kept)
    code: str | None = None        # the column's code: its catalogue ranks first among the fits

    @property
    def typed(self) -> dict[str, str]:
        """The last reading of each dimension as typed (to start a new measurement from)."""
        return {m.key: m.typed for m in self.measured}


@dataclass(frozen=True)
class MatchLine:
    """One catalogue candidate for the measured dimensions.

    ``deviations`` read e.g. ``"Depth 0.03 in more than listed (25% of the tolerance)"``;
    ``within`` is True when every dimension lies inside its rolling-tolerance band (widened by
    the gauge's).
    """
    name: str
    within: bool
    word: str
    icon: str
    deviations: list[str] = field(default_factory=list)
    score: float = 0.0

    @property
    def label(self) -> str:
        """What a screen reader says: ``"W14X90, within rolling tolerance: Depth 0.03 in more
        than listed ..."``."""
        return f"{self.name}, {self.word}: " + "; ".join(self.deviations)


# -- the catalogue, indexed once -----------------------------------------------------------
def _squeeze(text: str) -> str:
    return re.sub(r"[\s_\-]", "", text.upper().replace("×", "X").replace("*", "X"))


@dataclass(frozen=True)
class _Index:
    """Every spelling a catalogue name answers to, sorted (prefix look-ups by bisection) and
    joined into one text (a substring look-up is one scan in C)."""
    forms: list[str]
    names: list[str]
    blob: str
    starts: list[int]


@functools.lru_cache(maxsize=1)
def _index() -> _Index:
    """The type-ahead index, built once per process."""
    from fieldcol.sections import catalogue_names

    pairs = []
    for name in catalogue_names():
        forms = {_squeeze(name)}
        m = re.fullmatch(r"HE([ABM])\s*(\d+)", name.upper())
        if m:  # HEB 300 is also written HE 300 B
            forms.add(f"HE{m.group(2)}{m.group(1)}")
        pairs += [(f, name) for f in forms]
    pairs.sort()
    offsets, pos = [], 0
    for f, _ in pairs:
        offsets.append(pos)
        pos += len(f) + 1
    return _Index([f for f, _ in pairs], [n for _, n in pairs],
                  "\n".join(f for f, _ in pairs), offsets)


def catalogue_search(text: str, limit: int = 8) -> list[str]:
    """Catalogue names for a type-ahead: the exact section first (any sensible spelling), then
    names starting with what is typed (shortest first), then names holding it; spaces, dashes
    and case ignored.

    Args:
        text: what is typed so far (``"w14"``, ``"heb3"``, ``"hss8x8"``).
        limit: how many names at most.

    Returns:
        Catalogue designations, best first; empty for empty text.

    Example:
        >>> catalogue_search("w14x9", 3)
        ['W14X90', 'W14X99']
        >>> catalogue_search("w14x90", 3)
        ['W14X90']
        >>> catalogue_search("heb 30", 2), catalogue_search("he 300 b", 2)
        (['HEB 300'], ['HEB 300'])
    """
    from fieldcol.sections import catalogue_name

    key = _squeeze(text or "")
    if not key:
        return []
    exact = catalogue_name(text)
    out: list[str] = [exact] if exact else []
    idx = _index()
    i = bisect.bisect_left(idx.forms, key)
    starts = []
    while i < len(idx.forms) and idx.forms[i].startswith(key):
        starts.append(idx.names[i])
        i += 1
    # the shortest completions first, then in reading order: "W14X9" gives W14X90, W14X99
    starts.sort(key=lambda n: (len(n), n))
    holds = []
    if len(out) + len(starts) < limit:
        at = idx.blob.find(key)
        while at >= 0 and len(holds) < 4 * limit:
            holds.append(idx.names[bisect.bisect_right(idx.starts, at) - 1])
            at = idx.blob.find(key, at + 1)
    for n in starts + holds:
        if n not in out:
            out.append(n)
        if len(out) >= limit:
            break
    return out[:limit]


# -- the tab --------------------------------------------------------------------------------
def _length(mm: float, system: str) -> str:
    if system == "us":
        return f"{mm / 25.4 + 1e-9:.3f}".rstrip("0").rstrip(".") + " in"
    return f"{mm:.1f}".rstrip("0").rstrip(".") + " mm"


def _shape_of(section: Any) -> tuple[str, str]:
    """(shape, catalogue name or "") of a record's section; ("i", "") when unknown."""
    from fieldcol.sections import from_catalogue

    if isinstance(section, dict) and section.get("shape") in SHAPES:
        return str(section["shape"]), ""
    name = section.get("name") if isinstance(section, dict) else section
    if isinstance(name, str) and name.strip():
        try:
            sec = from_catalogue(name)
            return sec.kind, str(sec.name)
        except InputError:
            return "i", name
    return "i", ""


def _nominal(name: str, system: str) -> list[Line]:
    import numpy as np

    from fieldcol.sections._catalogue import catalogue_arrays

    cat = catalogue_arrays()
    rows = np.flatnonzero(cat.names == name)
    if not len(rows):
        return []
    i = int(rows[0])
    kind = str(cat.kind[i])
    if kind == "i":
        vals = (("Depth", cat.d[i]), ("Flange width", cat.bf[i]), ("Flange thickness", cat.tf[i]),
                ("Web thickness", cat.tw[i]))
    elif kind == "rect":
        vals = (("Outside depth", cat.d[i]), ("Outside width", cat.bf[i]),
                ("Wall thickness (nominal)", cat.t[i]))
    else:
        vals = (("Outside diameter", cat.d[i]), ("Wall thickness (nominal)", cat.t[i]))
    return [Line(label, _length(float(v), system)) for label, v in vals]


def section_view(store: "Store", column_id: str) -> SectionView:
    """The Section tab of a column: its section now, the dimensions measured and the condition.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        A ``SectionView`` (values in the site's units; thicknesses in decimal inches or mm).

    Example: ``section_view(store, c1.id).source`` gives ``'measured'`` for the demo's C/1-G.
    """
    from fieldcol.store import SECTION_DIMENSIONS, quantity_name
    from fieldcol.units import parse_length

    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    rec = store.current_record(column_id)
    section = rec.get("section")
    shape, name = _shape_of(section)
    measured_record = isinstance(section, dict) and section.get("shape") in SHAPES
    if isinstance(section, dict) and isinstance(section.get("built"), dict):
        from fieldcol.ui.builtup_model import ARRANGEMENTS

        arr = dict(ARRANGEMENTS).get(section["built"].get("arrangement"), "parts")
        dims, summary, source = [], f"Built up: {arr.lower()}", "built"
    elif measured_record:
        dims = []
        for key, label in DIMENSIONS[shape]:
            try:
                dims.append(Line(label, _length(parse_length(section.get(key), key), system)))
            except InputError:
                dims.append(Line(label, "not recorded"))
        summary, source = f"Measured {_SHAPE_WORDS[shape]}", "measured"
    elif name:
        dims, summary, source = _nominal(name, system), name, "catalogue"
    else:
        dims, summary, source = [], "No section recorded", "none"
    latest = store.current_measurements(column_id)
    keys = {f"section.{k}": (k, label) for k, label in DIMENSIONS[shape]}
    measured = []
    gauge = ""
    for q in SECTION_DIMENSIONS:
        m = latest.get(q)
        if m is None or q not in keys:
            continue
        measured.append(DimensionLine(
            key=keys[q][0], label=keys[q][1] or quantity_name(q), typed=m.text,
            value=_length(m.value, system), gauge=m.gauge or "", who=m.taken_by or "",
            when=(m.taken_at or "").replace("T", " ")[:16] + " UTC"))
        gauge = gauge or (m.gauge or "")
    notes = []
    if source == "catalogue" and len(measured) == len(DIMENSIONS[shape]):
        note = _misfit(name, shape, {m.key: m.value for m in measured}, gauge, system)
        if note:
            notes.append(note)
    plates = section.get("plates") if isinstance(section, dict) else None
    return SectionView(
        column_id=column_id, unit=unit_of(system), shape=shape, name=name, source=source,
        summary=summary, dimensions=dims, measured=measured,
        condition=loss_lines(section, system),
        plates=(str(plates.get("thickness", "")), str(plates.get("width") or ""))
        if isinstance(plates, dict) else None,
        plates_allowed=shape == "i", gauge=gauge or "caliper", notes=notes,
        plate_joint=(str(plates.get("connection") or "welded"), str(plates.get("pitch") or ""))
        if isinstance(plates, dict) else ("welded", ""),
        code=rec.get("code") if rec.get("code") in ("aisc360-22", "en1993-1-1") else None)


# -- matching -------------------------------------------------------------------------------
def read_dimensions(shape: str, typed: dict[str, str],
                    system: str) -> dict[str, tuple[str, float]]:
    """Read the dimensions typed for a measured section; every one is required.

    Args:
        shape: ``i``, ``rect`` or ``round``.
        typed: dimension key -> text as typed (a bare number is in the site's unit).
        system: ``us`` or ``si``.

    Returns:
        key -> (the text kept, with its unit; the value in mm). An ``InputError`` names the
        dimension in words (``flange width``).

    Example:
        >>> text, mm = read_dimensions("round", {"D": "6.625", "t": "0.28"}, "us")["D"]
        >>> text, round(mm, 3)
        ('6.625 in', 168.275)
    """
    from fieldcol.units import parse_length

    if shape not in DIMENSIONS:
        raise InputError("shape", str(shape), "pick the kind of section",
                         ", ".join(SHAPES.values()))
    out = {}
    for key, label in DIMENSIONS[shape]:
        text = typed_length((typed or {}).get(key, ""), system, label.lower())
        out[key] = (text, parse_length(text, label.lower()))
    t = out.get("t", out.get("tf"))
    outside = out["D" if shape == "round" else "d"]
    if t and 2 * t[1] >= outside[1]:
        label = "wall thickness" if shape != "i" else "flange thickness"
        raise InputError(label, t[0], "two of these fill the whole section",
                         "check the thickness and the outside size")
    return out


def gauge_tolerance(gauge: str | None) -> float:
    """How closely a gauge reads (mm, either side): the listed ones, else about 1 mm.

    Example:
        >>> gauge_tolerance("caliper"), gauge_tolerance("folding rule")
        (0.25, 1.0)
    """
    return GAUGE_TOLERANCE.get((gauge or "").strip().lower(), _OTHER_GAUGE)


def find_matches(shape: str, typed: dict[str, str], gauge: str | None, system: str,
                 limit: int = 5, code: str | None = None) -> list[MatchLine]:
    """Catalogue sections that fit the measured dimensions, best first, each with how far every
    dimension lies from its nominal value, in the site's unit and as a share of its rolling
    tolerance (ASTM A6 / A500 / A53, EN 10034: see ``fieldcol.sections.identify``).

    Args:
        shape: ``i``, ``rect`` or ``round``.
        typed: dimension key -> text as typed (a bare number is in the site's unit).
        gauge: the gauge used (widens each band by how closely it reads).
        system: ``us`` or ``si``.
        limit: how many candidates at most.
        code: the column's code (``aisc360-22``, ``en1993-1-1``): its catalogue first among the fits.

    Returns:
        ``MatchLine`` s; when none lies within tolerance, the nearest three, each saying so.

    Example:
        >>> find_matches("i", {"d": "14.02", "bf": "14.52", "tf": "0.71", "tw": "0.44"},
        ...              "caliper", "us")[0].name
        'W14X90'
    """
    from fieldcol.sections import identify

    dims = read_dimensions(shape, typed, system)
    found = identify(**{k: mm for k, (_, mm) in dims.items()}, gauge=gauge_tolerance(gauge),
                     limit=limit, code=code)
    labels = dict(DIMENSIONS[shape])
    out = []
    for mt in found:
        devs = []
        for k, dev in mt.deviation_mm.items():
            share = abs(mt.deviation_frac[k]) * 100
            size = _length(abs(dev), system)
            # in words, not a sign: "Depth 0 in" read as a depth of nothing, "-0.105 in" as
            # a negative depth
            off = "as listed" if size in ("0 in", "0 mm") else \
                f"{size} {'more' if dev >= 0 else 'less'} than listed"
            where = f"{share:.0f}% of the tolerance" if share <= 100 else \
                f"{share / 100:.1f} x the tolerance: outside"
            devs.append(f"{labels.get(k, k)} {off} ({where})")
        out.append(MatchLine(
            name=mt.name, within=mt.within_tolerance,
            word="within rolling tolerance" if mt.within_tolerance else "outside tolerance",
            icon="check_circle" if mt.within_tolerance else "warning", deviations=devs,
            score=mt.score))
    return out


def _misfit(name: str, shape: str, typed: dict[str, str], gauge: str | None,
            system: str) -> str:
    """A warning when the dimensions measured lie outside the named section's rolling
    tolerances (``""`` when they fit, or cannot be compared)."""
    try:
        lines = find_matches(shape, typed, gauge, system, limit=5000)
    except InputError:
        return ""
    line = next((x for x in lines if x.name == name), None)
    if line is not None and line.within:
        return ""
    why = "; ".join(x for x in line.deviations if "outside" in x) if line is not None else \
        "not among the nearest sections"
    return (f"The dimensions measured lie outside the rolling tolerances of {name} ({why}): "
            "check the name, or keep the section as measured.")


# -- saving ---------------------------------------------------------------------------------
def _kept(old: Any) -> dict[str, Any]:
    """What stays with the member when its section is renamed or re-measured."""
    if not isinstance(old, dict):
        return {}
    return {k: copy.deepcopy(old[k]) for k in ("loss", "plates") if old.get(k) not in (None, {})}


def _save_record(store: "Store", column_id: str, section: Any, what: str,
                 fresh: bool = False, entries: Mapping[str, str] | None = None) -> Change:
    """Check the column with the new section, then save it (nothing saved when refused);
    ``fresh``: the section holds dimensions just measured, which earlier readings must not
    overrule in the check. A refusal names the entry (``entries``: record path -> the entry
    as labelled, ``section.plates.thickness`` -> ``plate thickness``), else the record's
    own field, with ``what`` was being saved."""
    from fieldcol.assess import assess
    from fieldcol.store import SECTION_DIMENSIONS, latest_readings, overlay, site_defaults

    col = store.get_column(column_id)
    before = copy.deepcopy(col.record)
    stored = {**copy.deepcopy(col.record), "section": section}
    latest = latest_readings(store.measurements(column_id))
    if fresh:
        latest = {q: m for q, m in latest.items() if q not in SECTION_DIMENSIONS}
    current = site_defaults(overlay(stored, latest)[0], store.get_site(col.site_id))
    try:
        known = (current, assess(current))
    except InputError as e:
        try:
            assess(store.current_record(column_id))
        except InputError:  # not checkable before either: the section is still recorded
            known = None
        else:
            for path, label in (entries or {}).items():
                if e.field == path or e.field.startswith((path + ".", path + "[")):
                    raise InputError(label, e.text, e.reason, e.hint) from None
            raise InputError(e.field, e.text, f"{e.reason} (with {what})", e.hint) from None
    store.update_column(column_id, record=stored)
    return Change(column_id, what, (), before, check_now(store, column_id, known))


def choose_section(store: "Store", column_id: str, name: str) -> Change:
    """Name the column's section from the catalogue (a recorded loss and plates stay).

    Args:
        store: an open store.
        column_id: the column.
        name: a catalogue name, any sensible spelling (``w14x90``, ``HEB 300``).

    Returns:
        The ``Change`` (undo with ``fieldcol.ui.readings.undo_change``).

    Example: ``choose_section(store, cid, "w14x90").label`` gives ``'section W14X90'``.
    """
    from fieldcol.sections import from_catalogue

    try:
        sec = from_catalogue(name)
    except InputError as e:
        raise InputError("section", e.text, e.reason, e.hint) from None
    section = _named(store, column_id, str(sec.name))
    return _save_record(store, column_id, section, f"section {sec.name}")


def _named(store: "Store", column_id: str, name: str) -> Any:
    """The record's section named ``name``: an object when it carries a loss or plates, or
    when loss readings need one to sit in; else the name alone."""
    old = store.get_column(column_id).record.get("section")
    kept = _kept(old)
    loss_read = any(m.quantity.startswith("section.loss.") for m in store.measurements(column_id))
    if kept or isinstance(old, dict) or loss_read:
        return {"name": name, **kept}
    return name


def save_measured(store: "Store", column_id: str, shape: str, typed: dict[str, str],
                  gauge: str | None, *, accept: str | None = None, person: str | None = None,
                  visit_id: str | None = None) -> Change:
    """Keep each measured dimension as a reading, then name the section from the catalogue
    (``accept``) or keep it as measured.

    Args:
        store: an open store.
        column_id: the column.
        shape: ``i``, ``rect`` or ``round``.
        typed: dimension key -> text as typed (a bare number in the site's unit).
        gauge: the gauge used. person: who measured. visit_id: the open visit.
        accept: a catalogue name to take, or ``None`` to keep the section as measured.

    Returns:
        The ``Change``; an ``InputError`` naming the dimension saves nothing.

    Example: ``save_measured(store, cid, "i", {"d": "14.02", ...}, "caliper",
    accept="W14X90").label`` gives ``'section W14X90 (measured, 4 readings)'``.
    """
    from fieldcol.sections import from_catalogue

    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    dims = read_dimensions(shape, typed, system)
    kept = _kept(col.record.get("section"))
    if accept:
        try:
            name = from_catalogue(accept).name
        except InputError as e:
            raise InputError("section", e.text, e.reason, e.hint) from None
        section: Any = _named(store, column_id, str(name))
        what = f"section {name} (measured, {len(dims)} readings)"
    else:
        old = col.record.get("section")
        welded = bool(isinstance(old, dict) and old.get("shape") == shape and old.get("welded"))
        section = {"shape": shape, **{k: text for k, (text, _) in dims.items()},
                   **({"welded": True} if welded else {}), **kept}
        what = f"measured {_SHAPE_WORDS[shape]} ({len(dims)} readings)"
    # the section, its readings and the check in one transaction: a reading refused (its
    # gauge, who took it) leaves every row as it was, not a record put back and tombstones
    with store.transaction():
        change = _save_record(store, column_id, section, what, fresh=True)
        ids = [store.add_measurement(
                   column_id, f"section.{key}", text, kind="length", gauge=gauge or None,
                   taken_by=person or None, visit_id=visit_id,
                   note="measured to identify the section").id
               for key, (text, _) in dims.items()]
        return Change(column_id, what, tuple(ids), change.record_before,
                      check_now(store, column_id))


def set_plates(store: "Store", column_id: str, thickness: str | None,
               width: str | None = None, connection: str = "welded",
               pitch: str | None = None) -> Change:
    """Record cover plates on both flanges of an I section, or remove them (``None``).

    Args:
        store: an open store.
        column_id: the column.
        thickness: plate thickness as typed (a bare number in the site's unit), or ``None``.
        width: plate width as typed; empty: as wide as the flange.
        connection: ``welded`` (default), ``riveted`` or ``bolted``.
        pitch: riveted or bolted: the fasteners' spacing along the column, as typed
            (required then; refused for welded plates).

    Returns:
        The ``Change``. A bad entry raises ``InputError`` naming ``plate thickness``,
        ``plate width``, ``plate connection``, ``rivet pitch`` / ``bolt pitch`` (or ``plate
        pitch`` given for welded plates); nothing is saved then.

    Example: ``set_plates(store, cid, "3/8", "12", "riveted", "6").label`` gives
    ``'cover plates 3/8 in x 12 in, riveted at 6 in'``.
    """
    from fieldcol.codes.coverplates import CONNECTIONS
    from fieldcol.units import parse_length

    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    old = col.record.get("section")
    if old in (None, ""):
        raise InputError("cover plates", "", "record the section first", None)
    section = copy.deepcopy(old) if isinstance(old, dict) else {"name": old}
    if thickness in (None, ""):
        if not section.pop("plates", None):
            raise InputError("cover plates", "", "no cover plates are recorded", None)
        if set(section) == {"name"}:
            section = section["name"]
        return _save_record(store, column_id, section, "cover plates removed")
    how = str(connection or "welded").strip().lower()
    if how not in CONNECTIONS:
        raise InputError("plate connection", str(connection), "not a way plates are held",
                         "pick welded, riveted or bolted")
    plates = {"thickness": typed_length(thickness, system, "plate thickness")}
    if width not in (None, "") and str(width).strip():
        plates["width"] = typed_length(width, system, "plate width")
    typed_pitch = "" if pitch is None else str(pitch).strip()
    what = f"cover plates {plates['thickness']}" + (f" x {plates['width']}"
                                                     if "width" in plates else "")
    if how == "welded":
        if typed_pitch:
            raise InputError("plate pitch", typed_pitch, "welded plates have no fastener pitch",
                             "pick riveted or bolted, or clear the pitch")
    else:
        # named as the entry is labelled: "Rivet pitch" or "Bolt pitch"
        fld = "rivet pitch" if how == "riveted" else "bolt pitch"
        example = "6 (inches) or 150 mm" if system == "us" else "150 (mm) or 6 in"
        if not typed_pitch:
            raise InputError(fld, "", "this is required",
                             f"type the spacing of the {fld.split()[0]}s along the column, "
                             f"e.g. {example}")
        kept = typed_length(typed_pitch, system, fld)
        parse_length(kept, fld)   # refuses a zero or negative spacing
        plates.update(connection=how, pitch=kept)
        what += f", {how} at {kept}"
    section["plates"] = plates
    pitch_word = {"riveted": "rivet pitch", "bolted": "bolt pitch"}.get(how, "plate pitch")
    return _save_record(store, column_id, section, what, entries={
        "section.plates.thickness": "plate thickness", "section.plates.width": "plate width",
        "section.plates.pitch": pitch_word, "section.plates.connection": "plate connection"})
