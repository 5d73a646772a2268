"""View-models of a column's readings: thickness by gauge, bow about an axis, out-of-plumb.

Each reading is kept as taken (text as typed, gauge, who, when, visit); a correction is a new
reading pointing at the old one, never an overwrite. Before anything is saved the column is
checked with the new value, so a reading the engine cannot use saves nothing and comes back as
an ``InputError`` naming the entry in plain words. Every save returns a ``Change`` that
``undo_change`` takes back (readings tombstoned, the record as it was), and saves a fresh check.
No Flet here: functions take an open ``Store`` and are called through ``asyncio.to_thread``.

Public API::

    condition_view(store, column_id) -> ConditionView
    add_reading(store, column_id, kind, text, *, element, axis, gauge, note, person,
                visit_id) -> Change
    correct_reading(store, reading_id, text, *, note, person) -> Change
    undo_change(store, change) -> None
    typed_length(text, system, field) -> str
    Change, READING_KINDS, AXIS_CHOICES, ELEMENTS, GAUGES
"""

from __future__ import annotations

import copy
import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Callable

from fieldcol import CAUTION
from fieldcol.errors import InputError

if TYPE_CHECKING:
    from fieldcol.store import Measurement, Store

# kind -> (label, record path or None for thickness, gauge offered first)
READING_KINDS = {
    "bow": ("Bow", "condition.bow", "string line and rule"),
    "plumb": ("Out of plumb", "condition.plumb", "plumb line and rule"),
    "thickness": ("Thickness", None, "ultrasonic thickness gauge"),
}
# the axis a bow bends the column about, in words a person at the column can match
AXIS_CHOICES = {"weak": ("Weak axis", "bows along the flange width (sideways to the web)"),
                "strong": ("Strong axis", "bows along the depth (across the flanges)")}
# thickness element -> (label, record path): flange, web, wall hold what REMAINS; uniform the loss
ELEMENTS = {
    "flange": ("Flange: thickness remaining", "section.loss.flange"),
    "web": ("Web: thickness remaining", "section.loss.web"),
    "wall": ("Wall: thickness remaining", "section.loss.wall"),
    "uniform": ("Loss per exposed face (every plate)", "section.loss.uniform"),
}
_SHAPE_ELEMENTS = {"i": ("flange", "web", "uniform"), "rect": ("wall", "uniform"),
                   "round": ("wall", "uniform")}
# gauges offered, most used first; any other may be typed
GAUGES = ("caliper", "ultrasonic thickness gauge", "tape", "steel rule", "string line and rule",
          "plumb line and rule", "digital level", "laser distance meter")
_CONDITION_QUANTITIES = ("condition.bow", "condition.plumb", "section.loss.flange",
                         "section.loss.web", "section.loss.wall", "section.loss.uniform")


@dataclass(frozen=True)
class Change:
    """One saved change of a column, enough to take it back.

    Args:
        column_id: the column changed.
        label: what was saved, in words (``"bow 1 1/8 in"``).
        readings: ids of the readings it added.
        record_before: the stored record before, when the change rewrote it.
        status: the column's status after the change (``"0.84 OK"``), or ``""`` unchecked.
        note: why the result may not move, when it would puzzle (a braced column's plumb).
    """
    column_id: str
    label: str
    readings: tuple[str, ...] = ()
    record_before: dict[str, Any] | None = None
    status: str = ""
    note: str = ""


@dataclass(frozen=True)
class ReadingItem:
    """A reading that counts now, ready to show and to correct."""
    id: str
    kind: str
    quantity: str
    name: str
    typed: str
    value: str
    who: str
    when: str
    gauge: str
    note: str
    corrects: str

    @property
    def label(self) -> str:
        """E.g. ``"Bow 1.125 in, string line and rule, T. Nguyen, 2026-02-10 10:10 UTC"``."""
        parts = [f"{self.name} {self.value}"] + [x for x in (self.gauge, self.who, self.when) if x]
        return ", ".join(parts)


@dataclass(frozen=True)
class ConditionView:
    """What the Condition tab shows: the entry defaults and the readings that count now."""
    column_id: str
    unit: str
    shape: str
    bow_axis: str
    elements: list[tuple[str, str]]
    readings: list[ReadingItem]
    gauges: dict[str, str]
    caution: str = CAUTION
    length: str = ""
    bow_limit: str = ""
    plumb_limit: str = ""
    notes: list[str] = field(default_factory=list)


# -- entries --------------------------------------------------------------------------------
def unit_of(system: str) -> str:
    """The unit a bare number typed on this site is read in: ``in`` (US) or ``mm`` (SI).

    Example:
        >>> unit_of("us"), unit_of("si")
        ('in', 'mm')
    """
    return "in" if system == "us" else "mm"


def typed_length(text: Any, system: str, field: str) -> str:
    """A typed length as it will be kept: with its unit, a bare number taking the site's
    (``1 1/8`` on a US site is kept as ``1 1/8 in``); unreadable text raises ``InputError``.

    Args:
        text: the entry as typed.
        system: ``us`` or ``si``.
        field: the entry's name for the error, in plain words (``bow``).

    Returns:
        The text to keep.

    Example:
        >>> typed_length("1 1/8", "us", "bow"), typed_length("3 mm", "us", "bow")
        ('1 1/8 in', '3 mm')
    """
    from fieldcol.units import parse_length

    if not isinstance(text, str) or not text.strip():
        example = "3/8 (inches) or 10 mm" if system == "us" else "10 (mm) or 3/8 in"
        raise InputError(field, "" if text is None else str(text), "this is required",
                         f"type a value, e.g. {example}")
    t = text.strip()
    as_in = parse_length(t, field, default_unit="in", allow_zero=True)
    as_mm = parse_length(t, field, default_unit="mm", allow_zero=True)
    if as_in != as_mm:  # a bare number: its value depends on the unit assumed
        return f"{t} {unit_of(system)}"
    return t


def _shape(section: Any) -> str:
    if isinstance(section, dict) and section.get("shape") in ("i", "rect", "round"):
        return str(section["shape"])
    name = section.get("name") if isinstance(section, dict) else section
    if isinstance(name, str) and name.strip():
        try:
            from fieldcol.sections import from_catalogue

            return from_catalogue(name).kind
        except InputError:
            pass
    return "i"


def _value_text(m: "Measurement", system: str) -> str:
    from fieldcol.units import format_quantity, format_reading

    if m.kind == "length":  # a thickness off a gauge in its decimals; a bow as recorded
        return format_reading(m.value, system, fraction=m.quantity.startswith("condition."))
    return format_quantity(m.value, m.kind, system)


def _when(stamp: str | None) -> str:
    return (stamp or "").replace("T", " ")[:16] + (" UTC" if stamp else "")


def _kind_of(quantity: str) -> str:
    return {"condition.bow": "bow", "condition.plumb": "plumb"}.get(quantity, "thickness")


# -- the tab --------------------------------------------------------------------------------
def condition_view(store: "Store", column_id: str) -> ConditionView:
    """The Condition tab: the readings that count now and what a new entry starts from.

    The bow axis starts at the one recorded for the column (else the weak axis, about which a
    rolled I column bows most readily: common practice); each kind's gauge starts at the one
    last used on the column for it, else the usual one.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        A ``ConditionView``.

    Example: ``condition_view(store, b2.id).readings[0].name`` gives ``'Bow'`` for the
    demo's B/2-G.
    """
    from fieldcol.store import quantity_name
    from fieldcol.units import format_length, parse_length

    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    rec = store.current_record(column_id)
    shape = _shape(rec.get("section"))
    cond = rec.get("condition") if isinstance(rec.get("condition"), dict) else {}
    axis = cond.get("bow_axis") if cond.get("bow_axis") in AXIS_CHOICES else "weak"
    latest = store.current_measurements(column_id)
    by_id = {m.id: m for m in store.measurements(column_id)}
    items = []
    gauges = {k: g for k, (_, _, g) in READING_KINDS.items()}
    for m in sorted(by_id.values(), key=lambda m: (m.taken_at, m.created_at)):
        if m.quantity in _CONDITION_QUANTITIES and m.gauge:
            gauges[_kind_of(m.quantity)] = m.gauge
    for q in _CONDITION_QUANTITIES:
        m = latest.get(q)
        if m is None:
            continue
        old = by_id.get(m.corrects or "")
        items.append(ReadingItem(
            id=m.id, kind=_kind_of(q), quantity=q, name=quantity_name(q), typed=m.text,
            value=_value_text(m, system), who=m.taken_by or "who: not recorded",
            when=_when(m.taken_at), gauge=m.gauge or "", note=m.note or "",
            corrects=f"corrects {old.text}" if old else ""))
    length, limit, plumb = "", "", ""
    try:
        mm = parse_length(rec.get("length"), "length")
        length = format_length(mm, system)
        # straightness tolerance between supports L/1000 (AISC 303 6.4.1, from memory)
        limit = _value_text_mm(mm / 1000, system)
        # plumb 1/500 of the height (AISC 303-16 7.13.1.1): the bow's hint has its tolerance,
        # the plumb's had none to weigh a reading against
        plumb = _value_text_mm(mm / 500, system)
    except InputError:
        pass
    return ConditionView(column_id=column_id, unit=unit_of(system), shape=shape, bow_axis=axis,
                         elements=[(k, ELEMENTS[k][0]) for k in _SHAPE_ELEMENTS[shape]],
                         readings=items, gauges=gauges, length=length, bow_limit=limit,
                         plumb_limit=plumb)


def _value_text_mm(mm: float, system: str) -> str:
    if system == "us":
        return f"{mm / 25.4:.2f} in"
    return f"{mm:.0f} mm" if mm >= 10 else f"{mm:.1f} mm"


# -- saving ---------------------------------------------------------------------------------
def check_now(store: "Store", column_id: str, known: tuple[dict, Any] | None = None) -> str:
    """Check the column as it stands and save the check; its status label, ``""`` when the
    record cannot be checked (the check that stands stays the last one saved).

    Args:
        store: an open store.
        column_id: the column.
        known: (record, assessment) already worked out for the record expected now: used
            when the record is that one, so a save checks the column once, not twice.

    Returns:
        The status label, e.g. ``"0.84 OK"``.

    Example: ``check_now(store, b2.id)`` gives ``'1.18 OVER'`` for the demo's B/2-G.
    """
    from fieldcol.assess import assess
    from fieldcol.ui.model import status_of

    rec = store.current_record(column_id)
    if known is not None and known[0] == rec and known[1] is not None:
        res = known[1]
    else:
        try:
            res = assess(rec)
        except InputError:
            return ""
    d = res.to_dict()
    chk = store.save_check(column_id, d, record=rec)
    return status_of(chk.utilization, True, d.get("status")).label


def _try(store: "Store", column_id: str, record: dict[str, Any], field: str,
         typed: str) -> tuple[dict, Any]:
    """Check the record with the new value: (record, assessment), the assessment ``None``
    when the column could not be checked before either (e.g. no length yet): such a column
    still takes the reading, kept as taken, and is checked once its record is complete. A
    value that itself makes the column uncheckable is refused naming the entry."""
    from fieldcol.assess import assess

    try:
        return record, assess(record)
    except InputError as e:
        try:
            assess(store.current_record(column_id))
        except InputError:
            return record, None
        raise InputError(field, typed, e.reason, e.hint) from None


def _with_reading(store: "Store", column_id: str, record: dict[str, Any], quantity: str,
                  text: str, corrects: str | None = None) -> dict[str, Any]:
    """The record the engine would read with one more reading (and its correction rule)."""
    from fieldcol.store import Measurement, latest_readings, overlay, site_defaults

    new = Measurement(id="(new)", column_id=column_id, quantity=quantity, kind="length",
                      text=text, value=0.0, unit="mm", taken_at="9999", created_at="9999",
                      corrects=corrects)
    readings = store.measurements(column_id)
    if corrects is not None:
        old = next(m for m in readings if m.id == corrects)
        new = Measurement(**{**new.__dict__, "taken_at": old.taken_at})
    site = store.get_site(store.get_column(column_id).site_id)
    return site_defaults(overlay(record, latest_readings([*readings, new]))[0], site)


def add_reading(store: "Store", column_id: str, kind: str, text: str, *,
                element: str | None = None, axis: str | None = None, gauge: str | None = None,
                note: str | None = None, person: str | None = None,
                visit_id: str | None = None) -> Change:
    """Keep one reading as taken, after checking the column with it; then check it again.

    Args:
        store: an open store.
        column_id: the column.
        kind: ``bow``, ``plumb`` or ``thickness``.
        text: the value as typed (a bare number is in the site's unit: in or mm).
        element: for a thickness: ``flange``, ``web``, ``wall`` (remaining thickness) or
            ``uniform`` (loss per exposed face).
        axis: for a bow: ``weak`` or ``strong``, the axis it bends the column about.
        gauge, note: optional text. person: who took it. visit_id: the open visit.

    Returns:
        The ``Change`` (undo with ``undo_change``); an ``InputError`` naming the entry saves
        nothing.

    Example: ``add_reading(store, cid, "bow", "1/2", axis="weak", person="R. Amadi").label``
    gives ``'bow 1/2 in about the weak axis'``.
    """
    if kind not in READING_KINDS:
        raise InputError("reading", str(kind), "not a kind of reading", ", ".join(READING_KINDS))
    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    stored = copy.deepcopy(col.record)
    current = store.current_record(column_id)
    name = READING_KINDS[kind][0].lower()
    if kind == "thickness":
        if isinstance(current.get("section"), dict) and "built" in current["section"]:
            # the check reads a built-up section from its parts: a thickness kept here would
            # not count, and a reading that does not count must not look as if it did
            raise InputError("element", str(element), "a built-up section is checked from its "
                             "parts", "enter the parts as they are now in the Section tab's "
                             "built-up card")
        shape = _shape(current.get("section"))
        if element not in _SHAPE_ELEMENTS[shape]:
            raise InputError("element", str(element), "pick what was measured",
                             ", ".join(ELEMENTS[k][0] for k in _SHAPE_ELEMENTS[shape]))
        name = ("loss per exposed face" if element == "uniform"
                else f"{element} thickness remaining")
        quantity = ELEMENTS[element][1]
    else:
        quantity = READING_KINDS[kind][1]
    typed = typed_length(text, system, name)
    changed = False
    if kind == "bow":
        axis = axis or "weak"
        if axis not in AXIS_CHOICES:
            raise InputError("axis", str(axis), "pick the axis the bow bends the column about",
                             "weak or strong")
        # the axis belongs with the record: the engine reads it beside the bow
        cond = stored.get("condition") if isinstance(stored.get("condition"), dict) else {}
        if cond.get("bow_axis") != axis:
            stored["condition"] = {**cond, "bow_axis": axis}
            changed = True
        cond = current.get("condition") if isinstance(current.get("condition"), dict) else {}
        current["condition"] = {**cond, "bow_axis": axis}
    if quantity.startswith("section.") and isinstance(stored.get("section"), str):
        # a loss reading needs an object to sit in: the name is kept as {"name": ...}
        stored["section"] = {"name": stored["section"]}
        current["section"] = {"name": current["section"]} if isinstance(
            current.get("section"), str) else current["section"]
        changed = True
    before = copy.deepcopy(col.record)
    known = _try(store, column_id, _with_reading(store, column_id, current, quantity, typed),
                 name, typed)
    if changed:
        store.update_column(column_id, record=stored)
    try:
        m = store.add_measurement(column_id, quantity, typed, kind="length", gauge=gauge or None,
                                  taken_by=person or None, visit_id=visit_id, note=note or None)
    except BaseException:
        if changed:  # nothing half-saved: the record goes back as it was
            store.update_column(column_id, record=before)
        raise
    label = f"{name} {typed}" + (f" about the {axis} axis" if kind == "bow" else "")
    return Change(column_id, label, (m.id,), before if changed else None,
                  check_now(store, column_id, known),
                  _plumb_note(current) if kind == "plumb" else "")


def _plumb_note(record: dict[str, Any]) -> str:
    """Why an out-of-plumb reading leaves a braced column's result as it was (the engine's
    trace says the same: statics, no moment in a column held at both ends)."""
    from fieldcol.record import parse_record

    try:
        col = parse_record(record)
    except InputError:
        return ""
    spec = col.axes[col.plumb_axis]
    if math.isinf(spec.bottom.translation) and math.isinf(spec.top.translation):
        return (f"both ends held against sway about the {col.plumb_axis} axis: the tilt puts "
                "no moment in this column, the bracing takes its push")
    return ""


def correct_reading(store: "Store", reading_id: str, text: str, *, note: str | None = None,
                    person: str | None = None) -> Change:
    """Correct a reading: a new reading that points at it (the old one is kept and shown).

    Args:
        store: an open store.
        reading_id: the reading corrected.
        text: the right value as typed (a bare number in the site's unit).
        note: why (e.g. ``"misread the gauge"``). person: who corrects it.

    Returns:
        The ``Change``; an ``InputError`` naming the entry saves nothing.

    Example: ``correct_reading(store, m.id, "0.33", note="typed 0.23").label`` gives
    ``'correction of flange thickness remaining: 0.33 in'``.
    """
    from fieldcol.store import quantity_name

    old = store.get_measurement(reading_id)
    col = store.get_column(old.column_id)
    system = store.get_site(col.site_id).unit_system
    name = quantity_name(old.quantity).lower()
    typed = typed_length(text, system, name) if old.kind == "length" else str(text).strip()
    if typed == old.text:
        raise InputError(name, typed, "the same as the reading it corrects",
                         "type the right value")
    known = _try(store, old.column_id,
                 _with_reading(store, old.column_id, col.record, old.quantity, typed, old.id),
                 name, typed)
    m = store.correct_measurement(old.id, typed, note=note or None, taken_by=person or None)
    return Change(old.column_id, f"correction of {name}: {typed}", (m.id,), None,
                  check_now(store, old.column_id, known))


def undoable(change: Callable[["Store"], Change], after_undo: Callable[[], None] | None = None
             ) -> tuple[Callable[["Store"], Change], Callable[["Store"], None]]:
    """``(do, undo)`` for ``Saver.save`` from a change: ``undo`` takes back what ``do`` made
    (by ``undo_change``), then runs ``after_undo`` (e.g. a card forgetting what was typed).

    Example: ``do, undo = undoable(lambda s: add_reading(s, cid, "bow", "1/2"))``.
    """
    done: list[Change] = []

    def do(store: "Store") -> Change:
        ch = change(store)
        done.append(ch)
        return ch

    def undo(store: "Store") -> None:
        if done:
            undo_change(store, done[-1])
        if after_undo is not None:
            after_undo()
    return do, undo


def undo_change(store: "Store", change: Change) -> None:
    """Take back a ``Change``: its readings tombstoned (kept in the file), the record as it
    was; then the column is checked again.

    Example: ``undo_change(store, add_reading(store, cid, "bow", "1/2"))`` leaves the column
    as it stood.
    """
    for rid in change.readings:
        store.delete("measurements", rid)
    if change.record_before is not None:
        store.update_column(change.column_id, record=change.record_before)
    check_now(store, change.column_id)
