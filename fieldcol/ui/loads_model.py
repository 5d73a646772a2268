"""View-models of the loads on a column beyond its axial force: beams bearing at an eccentricity
(``demand.reactions``), first-order end moments per axis (``demand.end_moments``) and the story
the column stands in (``demand.story``).

Each change is checked with the whole column before anything is saved: an entry the engine
cannot use saves nothing and comes back as an ``InputError`` named as the entry is labelled on
the screen (``reaction 2 eccentricity``, ``strong axis moment at the top``, ``story load``).
A bare number takes the site's unit (kip or kN, kip*ft or kN*m, in or mm, kip/in or kN/mm).
Every save returns a ``Change`` that ``fieldcol.ui.readings.undo_change`` takes back.
No Flet here: functions take an open ``Store`` and are called through ``asyncio.to_thread``.

Public API::

    loads_view(store, column_id) -> LoadsView
    add_reaction(store, column_id, load, axis="strong", eccentricity="", side="+") -> Change
    remove_reaction(store, column_id, index) -> Change
    set_end_moments(store, column_id, axis, top, bottom, curvature="single") -> Change
    set_story(store, column_id, load, buckling_load="", stiffness="") -> Change
    save_record_key(store, column_id, path, value, what, name) -> Change
    typed_quantity(text, kind, system, field) -> str
    load_lines(demand, system="") -> list[str]  # the record's loads in words (screen, report)
    AXES, SIDES, CURVATURES
"""

from __future__ import annotations

import copy
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Callable

from fieldcol.errors import InputError
from fieldcol.ui.readings import Change, check_now, typed_length

if TYPE_CHECKING:
    from fieldcol.store import Store

# the unit a bare number is read in, per kind and site system; and the other system's (a bare
# number reads differently in the two: that is how a bare number is told from one with a unit)
_UNITS = {"force": ("kip", "kN"), "moment": ("kip*ft", "kN*m"), "stiffness": ("kip/in", "kN/mm")}
_EXAMPLES = {"force": ("40 kip", "180 kN"), "moment": ("80 kip*ft", "110 kN*m"),
             "stiffness": ("200 kip/in", "35 kN/mm"), "length": ("6 in", "150 mm")}

#: axis a reaction or end moment bends the column about -> (word, what it looks like on site)
AXES = {"strong": ("Strong axis", "a beam on a flange: the load sits off the web, along the "
                   "depth"),
        "weak": ("Weak axis", "a beam on the web: the load sits off the web, across the "
                 "flanges")}
#: side of the column a beam bears on -> (word, the record's sign)
SIDES = {"plus": ("+ side", "+"), "minus": ("\u2212 side", "-")}
#: how the two end moments bend the column -> (word, what it means)
CURVATURES = {"single": ("Single curvature", "both ends turn the column the same way (a C "
                         "shape): the worse case, and the one taken when unsure"),
              "reverse": ("Reverse curvature", "the ends turn it opposite ways (an S shape)")}


def _example(kind: str, system: str) -> str:
    us, si = _EXAMPLES[kind]
    return f"{us} or {si}" if system == "us" else f"{si} or {us}"


def typed_quantity(text: Any, kind: str, system: str, field: str) -> str:
    """A typed force, moment or stiffness as it will be kept: with its unit, a bare number
    taking the site's (``40`` on a US site is kept as ``40 kip``); unreadable text raises
    ``InputError`` naming ``field``.

    Args:
        text: the entry as typed.
        kind: ``force``, ``moment`` or ``stiffness``.
        system: ``us`` or ``si``.
        field: the entry's name, as labelled (``reaction 1 load``).

    Returns:
        The text to keep.

    Example:
        >>> typed_quantity("40", "force", "us", "load"), typed_quantity("180 kN", "force", "us", "x")
        ('40 kip', '180 kN')
    """
    from fieldcol.units import parse_quantity

    hint = f"type {'a force' if kind == 'force' else 'a ' + kind}, e.g. {_example(kind, system)}"
    if not isinstance(text, str) or not text.strip():
        raise InputError(field, "", "this is required", hint)
    t = text.strip()
    us, si = _UNITS[kind]
    try:
        a = parse_quantity(t, kind, field, default_unit=us, allow_zero=True)
        b = parse_quantity(t, kind, field, default_unit=si, allow_zero=True)
    except InputError as e:
        raise InputError(field, t, e.reason, hint) from None
    return f"{t} {us if system == 'us' else si}" if a != b else t


def _length(text: Any, system: str, field: str) -> str:
    """A typed length kept with its unit; the error's hint says what would do."""
    try:
        return typed_length(text, system, field)
    except InputError as e:
        raise InputError(field, e.text, e.reason, f"type a length, e.g. "
                         f"{_example('length', system)}") from None


@dataclass(frozen=True)
class ReactionLine:
    """One beam bearing on the column, as recorded."""
    index: int
    load: str
    axis: str
    eccentricity: str       # as recorded; "" when not measured (the engine's default applies)
    side: str               # "+" or "-"

    @property
    def words(self) -> str:
        """E.g. ``"Reaction 1: 40 kip, strong axis, 6 in off the centre, + side"``."""
        ecc = (f"{self.eccentricity} off the centre" if self.eccentricity else
               "eccentricity not measured (face of the column + 100 mm taken)")
        side = SIDES["plus" if self.side == "+" else "minus"][0]
        return (f"Reaction {self.index + 1}: {self.load}, {AXES[self.axis][0].lower()}, {ecc}, "
                f"{side}")


@dataclass(frozen=True)
class MomentLine:
    """First-order end moments about one axis, as recorded."""
    axis: str
    top: str
    bottom: str
    curvature: str

    @property
    def words(self) -> str:
        """E.g. ``"Strong axis: 80 kip*ft at the top, 40 kip*ft at the bottom, reverse
        curvature"``."""
        return (f"{AXES[self.axis][0]}: {self.top or '0'} at the top, {self.bottom or '0'} at "
                f"the bottom, {self.curvature} curvature")


@dataclass(frozen=True)
class LoadsView:
    """What the loads card shows: what is recorded, and the units a bare number takes."""
    column_id: str
    system: str
    force_unit: str
    moment_unit: str
    stiffness_unit: str
    length_unit: str
    has_axial: bool
    reactions: list[ReactionLine]
    moments: dict[str, MomentLine]
    story: dict[str, str]
    notes: list[str] = field(default_factory=list)

    @property
    def default_offset_words(self) -> str:
        """What is added to the face for a reaction's eccentricity not measured, in the site's
        unit first: a US site's entry reads inches, so "100 mm" alone beside "bare numbers in
        inches" read as a slip. E.g. ``"about 4 in (100 mm)"`` or ``"100 mm"``."""
        from fieldcol.bending import DEFAULT_OFFSET

        if self.length_unit == "in":
            return f"about {DEFAULT_OFFSET / 25.4:.0f} in ({DEFAULT_OFFSET:.0f} mm)"
        return f"{DEFAULT_OFFSET:.0f} mm"

    @property
    def story_words(self) -> str:
        """E.g. ``"Story: 3000 kip gravity load, buckling load 30000 kip"``, or ``""``."""
        if not self.story:
            return ""
        from fieldcol.units import format_entry

        def shown(key: str, kind: str) -> str:  # the one display rule, as the trace writes;
            text = self.story.get(key, "")     # with no site system (the report) as typed
            return format_entry(text, kind, self.system) if self.system in ("us", "si") \
                else str(text)
        other = (f"buckling load {shown('buckling_load', 'force')}"
                 if self.story.get("buckling_load")
                 else f"lateral stiffness {shown('stiffness', 'stiffness')}")
        return f"Story: {shown('load', 'force')} gravity load, {other}"


def _demand(record: dict[str, Any]) -> dict[str, Any]:
    d = record.get("demand")
    return copy.deepcopy(d) if isinstance(d, dict) else {}


def _parts(d: dict[str, Any]) -> tuple[list[ReactionLine], dict[str, MomentLine], dict[str, str]]:
    reactions = []
    for i, r in enumerate(d.get("reactions") or []):
        if isinstance(r, dict):
            axis = r.get("axis") if r.get("axis") in AXES else "strong"
            reactions.append(ReactionLine(i, str(r.get("load", "")), axis,
                                          str(r.get("eccentricity") or ""),
                                          "-" if r.get("side") == "-" else "+"))
    moments = {}
    for ax, e in (d.get("end_moments") or {}).items():
        if ax in AXES and isinstance(e, dict):
            moments[ax] = MomentLine(ax, str(e.get("top") or ""), str(e.get("bottom") or ""),
                                     "reverse" if e.get("curvature") == "reverse" else "single")
    story = {k: str(v) for k, v in (d.get("story") or {}).items() if v not in (None, "")}
    return reactions, moments, story


def load_lines(demand: Any, system: str = "") -> list[str]:
    """The loads a demand holds beyond its axial force, one line each in words: moments given
    (second order), first-order end moments, beam reactions, the story. For the column's
    record in words on the screen and in the report.

    Args:
        demand: a record's ``demand`` (anything else gives no line).
        system: the site's ``us`` or ``si``: the story's loads and stiffness by the one display
            rule (``units.format_entry``); empty (the report's record in words): as typed.

    Returns:
        The lines, e.g. ``["Reaction 1: 40 kip, strong axis, 6 in off the centre, + side"]``.

    Example:
        >>> load_lines({"axial": "120 kip", "moments": {"strong": "20 kip*ft"},
        ...             "story": {"load": "3000 kip", "buckling_load": "30000 kip"}})
        ['Moments given (second order): strong axis 20 kip*ft', 'Story: 3000 kip gravity load, buckling load 30000 kip']
    """
    if not isinstance(demand, dict):
        return []
    reactions, moments, story = _parts(demand)
    out = []
    given = demand.get("moments")
    if isinstance(given, dict) and any(v not in (None, "") for v in given.values()):
        out.append("Moments given (second order): " + ", ".join(
            f"{AXES[ax][0].lower() if ax in AXES else ax} {v}" for ax, v in given.items()
            if v not in (None, "")))
    out += [m.words for m in moments.values()]
    out += [r.words for r in reactions]
    if story:
        out.append(LoadsView("", system, "", "", "", "", False, [], {}, story).story_words)
    return out


def loads_view(store: "Store", column_id: str) -> LoadsView:
    """The loads on a column as its record holds them.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        A ``LoadsView``.

    Example: ``loads_view(store, cid).reactions`` gives ``[]`` for a column with none.
    """
    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    d = _demand(col.record)
    reactions, moments, story = _parts(d)
    i = 0 if system == "us" else 1
    return LoadsView(column_id, system, _UNITS["force"][i], _UNITS["moment"][i],
                     _UNITS["stiffness"][i], "in" if system == "us" else "mm",
                     any(d.get(k) not in (None, "", {}) for k in ("axial", "loads")),
                     reactions, moments, story)


# -- saving ---------------------------------------------------------------------------------
def save_record_key(store: "Store", column_id: str, path: tuple[str, ...], value: Any,
                    what: str, name: Callable[[InputError], InputError]) -> Change:
    """Set one key of the column's record (``None``: remove it), after checking the column
    with it; then check it again.

    Args:
        store: an open store.
        column_id: the column.
        path: the key, e.g. ``("demand", "story")`` or ``("condition", "bow_allowance")``.
        value: its new value, or ``None`` to remove it.
        what: the change in words, for the save bar (``"story 3000 kip"``).
        name: turns the engine's error into one named as the screen labels the entry.

    Returns:
        The ``Change`` (undo with ``fieldcol.ui.readings.undo_change``). A column that could
        not be checked before either (still being entered) takes the change unchecked.

    Example: ``save_record_key(store, cid, ("condition", "bow_allowance"), "L/1500",
    "bow allowance L/1500", lambda e: e)``.
    """
    from fieldcol.assess import assess
    from fieldcol.store import latest_readings, overlay, site_defaults

    col = store.get_column(column_id)
    before = copy.deepcopy(col.record)
    stored = copy.deepcopy(col.record)
    box = stored
    for key in path[:-1]:
        if not isinstance(box.get(key), dict):
            box[key] = {"name": box[key]} if key == "section" and isinstance(box.get(key), str) \
                else {}
        box = box[key]
    if value is None:
        box.pop(path[-1], None)
    else:
        box[path[-1]] = value
    latest = latest_readings(store.measurements(column_id))
    current = site_defaults(overlay(stored, latest)[0], store.get_site(col.site_id))
    try:
        known: tuple[dict, Any] | None = (current, assess(current))
    except InputError as e:
        try:
            assess(store.current_record(column_id))
        except InputError:
            known = None   # not checkable before either: the entry is still recorded
        else:
            raise name(e) from None
    with store.transaction():
        store.update_column(column_id, record=stored)
        status = check_now(store, column_id, known)
    return Change(column_id, what, (), before, status)


def _with_axial(store: "Store", column_id: str, what: str) -> tuple[dict[str, Any], str]:
    col = store.get_column(column_id)
    d = _demand(col.record)
    if all(d.get(k) in (None, "", {}) for k in ("axial", "loads")):
        # named as the axial demand ("Axial demand is needed"); the card shows it under the
        # entry of ``what``
        raise InputError("axial demand", "", "this is required", "type the axial force in the Edit "
                         f"card above first, then {what}")
    return d, store.get_site(col.site_id).unit_system


def _renamed(prefix: str, words: Callable[[str], str], fallback: str) -> Callable[
        [InputError], InputError]:
    """Name an engine error under ``prefix`` as the entry it came from, else ``fallback``."""
    def name(e: InputError) -> InputError:
        if e.field.startswith(prefix + "."):
            return InputError(words(e.field[len(prefix) + 1:]), e.text, e.reason, e.hint)
        return InputError(fallback, e.text, f"{e.reason} (field {e.field})", e.hint)
    return name


def add_reaction(store: "Store", column_id: str, load: str, axis: str = "strong",
                 eccentricity: str | None = "", side: str = "+") -> Change:
    """Record a beam bearing on the column: its reaction, the axis it bends the column about,
    its eccentricity from the column's centre (empty: not measured, the engine takes the face of
    the column + 100 mm and the trace says so) and the side it bears on (``+`` or ``-``).

    Args:
        store: an open store.
        column_id: the column.
        load, eccentricity: as typed (a bare number in the site's unit).
        axis: ``strong`` or ``weak``. side: ``+`` or ``-`` (opposite sides cancel).

    Returns:
        The ``Change``; an ``InputError`` named ``reaction <n> load`` (``eccentricity``,
        ``axis``, ``side``) saves nothing.

    Example: ``add_reaction(store, cid, "40", "strong", "6").label`` gives
    ``'reaction 1: 40 kip, strong axis, 6 in off the centre, + side'``.
    """
    d = _demand(store.get_column(column_id).record)
    n = len(d.get("reactions") or []) + 1
    d, system = _with_axial(store, column_id, "add the reaction")
    spec: dict[str, Any] = {"load": typed_quantity(load, "force", system, f"reaction {n} load")}
    if axis not in AXES:
        raise InputError(f"reaction {n} axis", str(axis), "pick the axis it bends the column "
                         "about", "strong or weak")
    spec["axis"] = axis
    if eccentricity not in (None, "") and str(eccentricity).strip():
        spec["eccentricity"] = _length(eccentricity, system, f"reaction {n} eccentricity")
    if side not in ("+", "-"):
        raise InputError(f"reaction {n} side", str(side), "pick the side the beam bears on",
                         "+ or -")
    spec["side"] = side
    reactions = [*(d.get("reactions") or []), spec]
    line = ReactionLine(n - 1, spec["load"], axis, spec.get("eccentricity", ""), side)
    name = _renamed(f"demand.reactions[{n - 1}]", lambda k: f"reaction {n} {k}",
                    f"reaction {n} load")
    return save_record_key(store, column_id, ("demand", "reactions"), reactions,
                           line.words[0].lower() + line.words[1:], name)


def remove_reaction(store: "Store", column_id: str, index: int) -> Change:
    """Take one recorded reaction off (the others keep their order).

    Example: ``remove_reaction(store, cid, 0).label`` gives ``'reaction 1 removed'``.
    """
    d = _demand(store.get_column(column_id).record)
    reactions = list(d.get("reactions") or [])
    if isinstance(index, bool) or not isinstance(index, int) or not 0 <= index < len(reactions):
        shown = str(index + 1) if isinstance(index, int) else repr(index)
        raise InputError("reaction", shown, "no such reaction is recorded", None)
    del reactions[index]
    return save_record_key(store, column_id, ("demand", "reactions"), reactions or None,
                           f"reaction {index + 1} removed", lambda e: e)


def set_end_moments(store: "Store", column_id: str, axis: str, top: str | None,
                    bottom: str | None, curvature: str = "single") -> Change:
    """Record the first-order moments at the column's ends about one axis (both empty: remove
    them); the engine amplifies them by B1 with Cm from their ratio and the curvature.

    Args:
        store: an open store.
        column_id: the column.
        axis: ``strong`` or ``weak``.
        top, bottom: as typed (a bare number in kip*ft or kN*m); an empty one is zero.
        curvature: ``single`` (the default: the worse case) or ``reverse``.

    Returns:
        The ``Change``; an ``InputError`` named ``<axis> axis moment at the top`` (``at the
        bottom``, ``curvature``) saves nothing.

    Example: ``set_end_moments(store, cid, "strong", "80", "40", "reverse").label`` gives
    ``'strong axis end moments 80 kip*ft top, 40 kip*ft bottom, reverse curvature'``.
    """
    if axis not in AXES:
        raise InputError("moment axis", str(axis), "pick the axis", "strong or weak")
    words = {"top": f"{axis} axis moment at the top", "bottom": f"{axis} axis moment at the bottom",
             "curvature": f"{axis} axis curvature"}
    d, system = _with_axial(store, column_id, "the end moments")
    ends = dict(d.get("end_moments") or {})
    if not any(str(x or "").strip() for x in (top, bottom)):
        if axis not in ends:
            raise InputError(words["top"], "", "this is required", f"type the moment, e.g. "
                             f"{_example('moment', system)}")
        ends.pop(axis)
        return save_record_key(store, column_id, ("demand", "end_moments"), ends or None,
                               f"{axis} axis end moments removed", lambda e: e)
    if curvature not in CURVATURES:
        raise InputError(words["curvature"], str(curvature), "not one of the choices",
                         "single or reverse")
    spec = {k: typed_quantity(v, "moment", system, words[k])
            for k, v in (("top", top), ("bottom", bottom)) if str(v or "").strip()}
    spec["curvature"] = curvature
    ends[axis] = spec
    said = ", ".join(f"{spec[k]} {k}" for k in ("top", "bottom") if k in spec)
    return save_record_key(store, column_id, ("demand", "end_moments"), ends,
                           f"{axis} axis end moments {said}, {curvature} curvature",
                           _renamed(f"demand.end_moments.{axis}", lambda k: words.get(k, k),
                                    words["top"]))


def set_story(store: "Store", column_id: str, load: str | None,
              buckling_load: str | None = "", stiffness: str | None = "") -> Change:
    """Record the story the column stands in (all empty: remove it): its total gravity load and
    either its buckling load or its lateral stiffness (H / Delta_H), for the sway amplifier of
    a measured out-of-plumb.

    Returns:
        The ``Change``; an ``InputError`` named ``story load``, ``story buckling load`` or
        ``story stiffness`` saves nothing.

    Example: ``set_story(store, cid, "3000", "30000").label`` gives
    ``'story 3000 kip, buckling load 30000 kip'``.
    """
    typed = {k: str(v or "").strip() for k, v in (("load", load), ("buckling_load", buckling_load),
                                                  ("stiffness", stiffness))}
    words = {"load": "story load", "buckling_load": "story buckling load",
             "stiffness": "story stiffness"}
    d, system = _with_axial(store, column_id, "the story")
    if not any(typed.values()):
        if not d.get("story"):
            raise InputError(words["load"], "", "this is required",
                             f"type the story's total gravity load, e.g. "
                             f"{_example('force', system)}")
        return save_record_key(store, column_id, ("demand", "story"), None, "story removed",
                               lambda e: e)
    spec = {"load": typed_quantity(typed["load"], "force", system, words["load"])}
    if typed["buckling_load"] and typed["stiffness"]:
        raise InputError(words["stiffness"], typed["stiffness"], "give the buckling load or "
                         "the stiffness, not both", "clear one of them")
    if typed["buckling_load"]:
        spec["buckling_load"] = typed_quantity(typed["buckling_load"], "force", system,
                                               words["buckling_load"])
    elif typed["stiffness"]:
        spec["stiffness"] = typed_quantity(typed["stiffness"], "stiffness", system,
                                           words["stiffness"])
    else:
        raise InputError(words["buckling_load"], "", "this is required",
                         "type the story's buckling load, or its lateral stiffness instead")
    other = (f"buckling load {spec['buckling_load']}" if "buckling_load" in spec
             else f"stiffness {spec['stiffness']}")
    return save_record_key(store, column_id, ("demand", "story"), spec,
                           f"story {spec['load']}, {other}",
                           _renamed("demand.story", lambda k: words.get(k, "story load"),
                                    words["load"]))
