"""View-model of retrofit options: build one from a form, compare it with the column as it
stands, keep it as its definition, and sweep a proposed brace up the column (no Flet).

A kept option is applied to the column as it stands each time it is shown, so it follows later
changes to the column; rows kept before options had definitions are shown as the snapshots they
are. Slow (each line runs the engine): the app calls these through ``asyncio.to_thread``.

Public API::

    KIND_WORDS, FORM_FIELDS
    option_of(kind, typed) -> dict                  # InputError naming the form's field
    compare_option(store, column_id, option) -> Compared
    saved_options(store, column_id) -> list[Compared]
    keep_option(store, column_id, option, *, status) -> str   # the row's id (undo deletes it)
    brace_sweep(store, column_id, axis, *, points=11) -> Sweep
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from fieldcol import CAUTION
from fieldcol.errors import InputError
from fieldcol.ui.model import MODE_NAMES, Status, status_of

if TYPE_CHECKING:
    from fieldcol.assess import Assessment
    from fieldcol.store import Store

# our words for the kinds of option, in the order the form offers them
KIND_WORDS = {"brace": "Add a brace", "cable": "Add a cable or rod",
              "end": "Change an end", "plates": "Cover plates",
              "remove_brace": "Take out a brace", "combined": "Several together"}
#: the form's fields per kind: (name, label, hint); "axis", "end", "to" are choices
FORM_FIELDS: dict[str, list[tuple[str, str, str]]] = {
    "brace": [("axis", "Axis it holds", "weak, strong or both"),
              ("at", "Height from the bottom", "e.g. 12 ft or 3.6 m"),
              ("stiffness", "Stiffness (blank: taken as rigid)", "e.g. 20 kip/in"),
              ("strength", "Strength (blank: taken as enough)", "e.g. 5 kip")],
    "cable": [("axis", "Axis it holds", "weak, strong or both"),
              ("at", "Height from the bottom", "e.g. 12 ft or 3.6 m"),
              ("area", "Cable area", "e.g. 0.2 in^2"),
              ("length", "Cable length", "e.g. 20 ft"),
              # the engine's angle is to the way the braced point moves (k = A E / L cos^2):
              # "to the floor" is that only for a cable square to the wall in plan
              ("angle", "Cable angle", "to the way the column moves, e.g. 45 deg (0 = in line)"),
              ("strength", "Strength (blank: taken as enough)", "e.g. 5 kip")],
    "end": [("axis", "Axis", "weak, strong or both"), ("end", "Which end", "bottom or top"),
            ("to", "New end condition", "fixed, pinned, free or guided")],
    "plates": [("thickness", "Plate thickness", "e.g. 3/8 in or 10 mm"),
               ("width", "Plate width (blank: flange width)", "e.g. 12 in"),
               ("connection", "How the plates are fixed (none picked: welded)",
                "welded, riveted or bolted"),
               ("pitch", "Rivet or bolt pitch along the column (riveted or bolted)",
                "e.g. 6 in or 150 mm")],
    "remove_brace": [("axis", "Axis", "weak, strong or both"),
                     ("at", "Height of the brace", "e.g. 12 ft")],
}
CHOICES = {"axis": ("weak", "strong", "both"), "end": ("bottom", "top"),
           "to": ("fixed", "pinned", "free", "guided"),
           "connection": ("welded", "riveted", "bolted")}
STATUS_WORDS = {"proposed": "proposed", "chosen": "chosen", "rejected": "rejected",
                "built": "built"}


@dataclass(frozen=True)
class Compared:
    """An option beside the column as it stands: strength, utilization, what governs.

    ``follows`` is True when the option is applied to the column as it stands now; False for
    a snapshot kept before options had definitions. ``error`` says why it could not be checked.
    """
    id: str | None
    description: str
    before: Status
    after: Status
    before_strength: str
    after_strength: str
    demand: str
    governing_before: str
    governing_after: str
    gain: str
    warnings: list[str] = field(default_factory=list)
    status: str = "not kept"
    saved: str = ""
    follows: bool = True
    option: dict[str, Any] | None = None
    error: str | None = None
    caution: str = CAUTION

    @property
    def line(self) -> str:
        """E.g. ``"design strength 586 kip -> 652 kip; 1.11 OVER -> 1.00 OK"``."""
        if self.error:
            return f"not checked: {self.error}"
        return (f"design strength {self.before_strength} -> {self.after_strength}; "
                f"{self.before.label} -> {self.after.label}")


@dataclass(frozen=True)
class SweepPoint:
    """The column's design strength with the proposed brace at one height (N, mm)."""
    at: float
    strength: float | None
    text: str


@dataclass(frozen=True)
class Sweep:
    """Design strength against the height of one proposed brace, with the column as it stands.

    Values in N and mm for drawing; ``*_text`` in the site's units. ``best`` is the point of
    greatest strength (the lowest of equal ones).
    """
    axis: str
    length: float
    before: float
    demand: float | None
    points: list[SweepPoint]
    unit: str
    factor: float        # N per display unit (e.g. 4448.2 for kip)
    length_factor: float  # mm per display unit of height (304.8 for ft, 1000 for m)
    length_unit: str
    best: SweepPoint | None
    before_text: str
    demand_text: str
    caution: str = CAUTION

    @property
    def words(self) -> str:
        """A one-line summary a screen reader can say."""
        if self.best is None:
            return "No height gave a result."
        return (f"A brace on the {self.axis} axis gives at most {self.best.text} at "
                f"{self.best.at / self.length_factor:.3g} {self.length_unit} from the bottom; "
                f"as it stands {self.before_text}.")


def option_of(kind: str, typed: dict[str, Any]) -> dict[str, Any]:
    """The option JSON from the form's typed values (blank optional fields left out).

    Args:
        kind: a key of ``FORM_FIELDS``.
        typed: field name -> text as typed (``twist``: a bool).

    Returns:
        The option (``fieldcol.retrofit``); ``InputError`` naming the form field when a required
        one is blank.

    Example:
        >>> option_of("brace", {"axis": "weak", "at": "15 ft", "stiffness": ""})
        {'kind': 'brace', 'axis': 'weak', 'at': '15 ft'}
        >>> option_of("plates", {"thickness": ""})
        Traceback (most recent call last):
        fieldcol.errors.InputError: thickness: cannot use '': type the plate thickness ...
    """
    if kind not in FORM_FIELDS:
        raise InputError("kind", str(kind), "not a kind of option",
                         ", ".join(k for k in KIND_WORDS if k != "combined"))
    val = {k: (v.strip() if isinstance(v, str) else v) for k, v in typed.items()}
    required = {"axis": "pick an axis", "at": "type the height from the bottom",
                "end": "pick an end", "to": "pick the new end condition",
                "thickness": "type the plate thickness", "area": "type the cable's area",
                "length": "type the cable's length", "angle": "type the cable's angle"}
    for name, _label, hint in FORM_FIELDS[kind]:
        if name in required and not val.get(name):
            raise InputError(name, "", required[name], hint)
    opt: dict[str, Any] = {"kind": kind}
    if kind == "cable":
        opt.update(axis=val["axis"], at=val["at"],
                   cable={k: val[k] for k in ("area", "length", "angle") if val.get(k)})
        if val.get("strength"):
            opt["strength"] = val["strength"]
    else:
        opt.update({name: val[name] for name, _l, _h in FORM_FIELDS[kind] if val.get(name)})
    if kind in ("brace", "cable") and val.get("twist"):
        opt["twist"] = True
    return opt


def plates_refused(record: dict[str, Any]) -> str | None:
    """Why cover plates cannot be an option for this column, or None when they can.

    The engine is asked with a trial plate, so the form offers exactly what a comparison takes
    (a built-up or hollow section, or one already plated, takes no cover plates).

    Args:
        record: the column record as it stands.

    Returns:
        The engine's reason in words, or None (also when the record itself cannot be checked:
        its own error is shown where the column is).

    Example:
        >>> plates_refused({"tag": "C1", "section": "HSS8X8X1/4", "material": "A500B",
        ...                 "length": "12 ft"})
        'plates on hollow sections are not modelled'
        >>> plates_refused({"tag": "C1", "section": "W14X90", "material": "A992",
        ...                 "length": "12 ft"}) is None
        True
    """
    from fieldcol.retrofit import apply_option

    try:
        apply_option(record, {"kind": "plates", "thickness": "10 mm"})
    except InputError as e:
        return e.reason if e.field.startswith("option") else None
    return None


def form_field(e: InputError) -> str:
    """The form field an engine error on an option names (``option.cable.area`` -> ``area``).

    Example:
        >>> form_field(InputError("option.at", "40 ft", "not between the ends", None))
        'at'
    """
    parts = e.field.split(".")
    if parts[0].startswith("option"):
        parts = parts[1:]
    while parts and parts[0].startswith("options["):
        parts = parts[1:]
    if parts and parts[0] == "cable":
        parts = parts[1:]
    return parts[0] if parts else "kind"


def _force(x: float | None, system: str) -> str:
    from fieldcol.units import format_quantity

    if x is None or not math.isfinite(x):
        return "none"
    return format_quantity(x, "force", system)


def _compared(before: "Assessment", after: "Assessment", system: str, **common: Any) -> Compared:
    from fieldcol.retrofit import Comparison

    c = Comparison(common.get("option") or {}, common["description"], before, after)
    gain = c.gain
    demand = before.demand
    return Compared(
        **common,
        before=status_of(c.utilization_before, True, before.status),
        after=status_of(c.utilization_after, True, after.status),
        before_strength=_force(c.design_before, system),
        after_strength=_force(c.design_after, system),
        demand=_force(demand, system),
        governing_before=MODE_NAMES.get(c.governing_before, c.governing_before),
        governing_after=MODE_NAMES.get(c.governing_after, c.governing_after),
        gain="no strength to compare" if not math.isfinite(gain) else f"{gain * 100:+.0f}%",
        warnings=[w.get("message", str(w)) for w in c.new_warnings])


def _failed(description: str, e: InputError, **common: Any) -> Compared:
    none = status_of(None, False)
    return Compared(description=description, before=none, after=none, before_strength="",
                    after_strength="", demand="", governing_before="", governing_after="",
                    gain="", error=str(e), **common)


def _system(store: "Store", column_id: str) -> str:
    return store.get_site(store.get_column(column_id).site_id).unit_system


def compare_option(store: "Store", column_id: str, option: dict[str, Any]) -> Compared:
    """The option beside the column as it stands (nothing is saved).

    Args:
        store: an open store.
        column_id: the column.
        option: a ``fieldcol.retrofit`` option.

    Returns:
        A ``Compared``. Raises ``InputError`` naming ``option...`` when the option does not
        fit the column (e.g. a height above the top), or the record's field when the column
        itself cannot be checked.

    Example: ``compare_option(store, cid, {"kind": "brace", "axis": "weak", "at": "15 ft"})``.
    """
    from fieldcol.assess import assess
    from fieldcol.retrofit import apply_option, label

    record = store.current_record(column_id)
    before = assess(record)
    new = apply_option(record, option, field="option")
    try:
        after = assess(new)
    except InputError as e:
        raise InputError("option", e.text, f"the changed column cannot be checked: {e.reason}",
                         e.hint) from None
    return _compared(before, after, _system(store, column_id), id=None, description=label(option),
                     option=option)


def saved_options(store: "Store", column_id: str) -> list[Compared]:
    """The column's kept options, oldest first, each applied to the column as it stands.

    A row kept before options had definitions is compared as the snapshot it is (marked
    ``follows=False``: it does not see later changes to the column).

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        One ``Compared`` per live option (``error`` set where it cannot be checked now, e.g. a
        brace taken out that is no longer there).

    Example: ``saved_options(store, c3.id)[0].after.word`` gives ``'OK'`` for the demo's C/3-G.
    """
    from fieldcol.assess import assess
    from fieldcol.retrofit import apply_option

    rows = store.retrofits(column_id)
    if not rows:
        return []
    system = _system(store, column_id)
    record = store.current_record(column_id)
    before = assess(record)
    out = []
    for r in rows:
        common = dict(id=r.id, status=STATUS_WORDS.get(r.status, r.status),
                      saved=(r.created_at.replace("T", " ")[:16] + " UTC"),
                      follows=r.option is not None, option=r.option)
        try:
            after = assess(apply_option(record, r.option, field="option")
                           if r.option is not None else r.record)
        except InputError as e:
            out.append(_failed(r.description, e, **common))
            continue
        out.append(_compared(before, after, system, description=r.description, **common))
    return out


def keep_option(store: "Store", column_id: str, option: dict[str, Any], *,
                status: str = "proposed") -> str:
    """Keep an option as its definition; gives the row's id (undo tombstones it).

    Example: ``keep_option(store, cid, {"kind": "brace", "axis": "weak", "at": "15 ft"})``.
    """
    return store.add_retrofit_option(column_id, option, status=status).id


def drop_option(store: "Store", retrofit_id: str) -> None:
    """Tombstone a kept option (the row stays in the file and in backups).

    Example: ``drop_option(store, rid)``.
    """
    store.delete("retrofits", retrofit_id)


def governing_axis(store: "Store", column_id: str) -> str:
    """The axis the Retrofit tab's axis choices start on (the option's and the sweep's): the
    one whose buckling governs the column's result, else the weak axis (yielding, twisting
    or a column not yet checkable: a brace usually goes there first). The engineer can pick
    another.

    Example: ``governing_axis(store, cid)`` gives ``'weak'`` for a W shape pinned both ways.
    """
    from fieldcol.assess import assess

    try:
        mode = assess(store.current_record(column_id)).governing_mode
    except InputError:
        return "weak"
    return "strong" if mode == "flexural-strong" else "weak"


def brace_sweep(store: "Store", column_id: str, axis: str, *, points: int = 11,
                twist: bool = False) -> Sweep:
    """The design strength with one rigid brace on ``axis`` at heights up the column.

    Heights are ``i L / (points + 1)`` for i = 1 .. points; a height where the column already
    has a brace on that axis gives no point.

    Args:
        store: an open store.
        column_id: the column.
        axis: ``weak``, ``strong`` or ``both``.
        points: how many heights (3 to 41).
        twist: the brace also prevents twisting.

    Returns:
        A ``Sweep``.

    Example: ``brace_sweep(store, cid, "weak").best.at`` is near mid-height for a column
    pinned at both ends.
    """
    from fieldcol.retrofit import brace_sweep as sweep_heights
    from fieldcol.units import format_quantity

    if axis not in CHOICES["axis"]:
        raise InputError("axis", str(axis), "not an axis", "weak, strong or both")
    system = _system(store, column_id)
    record = store.current_record(column_id)
    res = sweep_heights(record, axis, points=points, twist=twist)
    length = res.length
    length_unit, length_factor = ("ft", 304.8) if system == "us" else ("m", 1000.0)
    out = [SweepPoint(at, v, _force(v, system)) for at, v in zip(res.heights, res.strengths[0])]
    good = [p for p in out if p.strength is not None]
    best = max(good, key=lambda p: (p.strength, -p.at)) if good else None
    unit_text = format_quantity(1.0, "force", system).split(" ", 1)[-1]
    factor = 4448.2216 if unit_text == "kip" else 1000.0
    return Sweep(axis=axis, length=length, before=res.before,
                 demand=res.demand, points=out, unit=unit_text, factor=factor,
                 length_factor=length_factor, length_unit=length_unit, best=best,
                 before_text=_force(res.before, system),
                 demand_text=_force(res.demand, system))


__all__ = ["plates_refused", "KIND_WORDS", "FORM_FIELDS", "CHOICES", "Compared", "Sweep", "SweepPoint",
           "option_of", "form_field", "compare_option", "saved_options", "keep_option",
           "drop_option", "governing_axis", "brace_sweep"]
