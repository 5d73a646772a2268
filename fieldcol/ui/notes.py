"""View-model of a column's history: restraint changes with their photos, every reading (no
Flet). Findings are in ``fieldcol.ui.findings``, photos in ``fieldcol.ui.photos``, retrofit
options in ``fieldcol.ui.retrofits``.

Like ``fieldcol.ui.model``, every function takes an open ``Store`` and returns plain records
whose texts carry their units in the site's unit system; they touch SQLite, so the app calls
them through ``asyncio.to_thread``.

Public API::

    column_history(store, column_id) -> History
    CHANGE_WORDS, AXIS_WORDS
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from fieldcol.errors import InputError
from fieldcol.ui.photos import PhotoThumb, thumbs

if TYPE_CHECKING:
    from fieldcol.store import Store

CHANGE_WORDS = {"brace_added": ("brace added", "add_link"),
                "brace_removed": ("brace removed", "link_off"),
                "cable_found": ("cable found", "cable"),
                "end_condition_changed": ("end changed", "swap_vert"),
                "other": ("other change", "edit_note")}
AXIS_WORDS = {"strong": "strong axis", "weak": "weak axis", "twist": "twist"}


@dataclass(frozen=True)
class ChangeLine:
    """A dated restraint change in words, with its photos."""
    id: str
    date: str
    kind_word: str
    icon: str
    axis: str
    description: str
    seen_by: str
    details: str
    photos: list[PhotoThumb] = field(default_factory=list)


@dataclass(frozen=True)
class ReadingLine:
    """One reading as it was typed, its value in the site's units, who took it and when.

    ``state`` is ``"in use"`` (the reading the record reads), ``"corrected"`` (a later reading
    corrects it: shown, never hidden) or ``"earlier"`` (a later reading of the same quantity).
    """
    id: str
    quantity: str
    typed: str
    value: str
    who: str
    when: str
    gauge: str
    note: str
    state: str
    corrects: str


@dataclass(frozen=True)
class ResultLine:
    """One change of a column's saved result: when, the new result and what had changed."""
    when: str
    label: str
    governs: str
    strength: str
    who: str
    changed: str


@dataclass(frozen=True)
class History:
    """A column's restraint changes and measurement history, oldest first; ``results``: each
    change of its checked result, newest first."""
    changes: list[ChangeLine]
    readings: list[ReadingLine]
    results: list[ResultLine] = field(default_factory=list)


#: a record's top-level entries in words, for "what changed" between two results
RECORD_WORDS = {"demand": "loads", "condition": "loss and bow", "k_basis": "K basis",
                "gamma_M1": "gamma_M1", "knowledge": "knowledge factor", "basis": "LRFD / ASD"}
#: how many changes of result the History tab lists
RESULTS_SHOWN = 20


# -- formatting ---------------------------------------------------------------------------
def _when(stamp: str | None) -> str:
    """``2026-02-10T10:15:00.000Z`` -> ``2026-02-10 10:15 UTC`` (the store keeps UTC)."""
    if not stamp:
        return ""
    return stamp.replace("T", " ")[:16] + " UTC"


def _reading_value(value: float, kind: str, system: str, quantity: str = "") -> str:
    from fieldcol.units import format_quantity

    if kind == "length" and system == "us" and (abs(value) < 304.8 or quantity.startswith(
            ("section.", "condition."))):
        # a thickness, a bow or a section's size reads in decimal inches, as gauges and
        # tapes show it (feet-inches to 1/16 in would hide what was measured)
        return f"{value / 25.4:.3f}".rstrip("0").rstrip(".") + " in"
    return format_quantity(value, kind, system)


def _detail_text(detail: Any, system: str) -> str:
    from fieldcol.units import format_length, parse_length

    if not isinstance(detail, dict):
        return ""
    parts = []
    for k, val in detail.items():
        text = str(val)
        if k == "at":
            try:
                text = format_length(parse_length(val, "at"), system)
            except InputError:
                pass
        parts.append(f"{k} {text}")
    return "; ".join(parts)


# -- history -------------------------------------------------------------------------------
def column_history(store: "Store", column_id: str) -> History:
    """Restraint changes and every reading of a column, oldest first, corrections marked.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        A ``History``; each reading keeps its text as typed beside its value in site units.

    Example: ``[r.state for r in column_history(store, d2.id).readings]`` gives
    ``['corrected', 'in use']`` for the demo's D/2-G.
    """
    from fieldcol.store import latest_readings, quantity_name

    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    changes = []
    for rc in store.restraint_changes(column_id):
        word, icon = CHANGE_WORDS.get(rc.kind, (rc.kind, "edit_note"))
        changes.append(ChangeLine(
            id=rc.id, date=rc.date, kind_word=word, icon=icon,
            axis=AXIS_WORDS.get(rc.axis or "", "axis not recorded"), description=rc.description,
            seen_by=f"seen by {rc.seen_by}" if rc.seen_by else "who saw it: not recorded",
            details=_detail_text(rc.detail, system),
            photos=thumbs(store, store.photos_of(restraint_change_id=rc.id))))
    readings = store.measurements(column_id)
    in_use = {m.id for m in latest_readings(readings).values()}
    corrected = {m.corrects for m in readings if m.corrects}
    by_id = {m.id: m for m in readings}
    lines = []
    for m in readings:
        state = "in use" if m.id in in_use else "corrected" if m.id in corrected else "earlier"
        old = by_id.get(m.corrects or "")
        lines.append(ReadingLine(
            id=m.id, quantity=quantity_name(m.quantity), typed=m.text,
            value=_reading_value(m.value, m.kind, system, m.quantity),
            who=m.taken_by or "not recorded",
            when=_when(m.taken_at), gauge=m.gauge or "", note=m.note or "", state=state,
            corrects=f"corrects the reading typed {old.text}" if old else ""))
    return History(changes, lines, result_history(store, column_id, system))


def result_history(store: "Store", column_id: str, system: str) -> list[ResultLine]:
    """Each change of a column's checked result (status, utilization to two places, governing
    mode), newest first, with what its record changed since the result before it.

    Why: every save checks the column again; the checks that gave the same answer are kept
    (each reproducible) but only a change of answer tells the engineer something.

    Args:
        store: an open store.
        column_id: the column.
        system: ``"us"`` or ``"si"``: the units of the design strength.

    Returns:
        At most ``RESULTS_SHOWN`` lines, newest first.

    Example: ``result_history(store, c3.id, "us")[0].label`` gives ``'1.11 OVER'`` for the
    demo's C/3-G.
    """
    from fieldcol.assess import MODE_WORDS
    from fieldcol.ui.model import status_of
    from fieldcol.units import format_quantity

    out: list[ResultLine] = []
    last_key, last_record = None, None
    for chk in store.check_outcomes(column_id):
        label = status_of(chk.utilization, True, chk.status).label
        gov = chk.governing_mode or ""
        key = (label, gov)
        if key == last_key:
            continue
        changed = ""
        if last_record is not None:
            keys = sorted(k for k in set(chk.record) | set(last_record)
                          if chk.record.get(k) != last_record.get(k))
            changed = ", ".join(RECORD_WORDS.get(k, k.replace("_", " ")) for k in keys)
            changed = (f"changed: {changed}" if changed else
                       "same record (the site's settings or fieldcol's version changed)")
        ds = chk.design_strength
        out.append(ResultLine(
            when=_when(chk.checked_at), label=label,
            governs=MODE_WORDS.get(gov, gov) if gov else "no mode governs",
            strength=format_quantity(ds, "force", system) if isinstance(ds, (int, float)) else "",
            who=chk.created_by or "", changed=changed))
        last_key, last_record = key, chk.record
    return out[::-1][:RESULTS_SHOWN]


__all__ = ["History", "ChangeLine", "ReadingLine", "PhotoThumb", "column_history",
           "CHANGE_WORDS", "AXIS_WORDS"]
