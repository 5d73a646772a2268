"""The Restraints tab's view-model: ends, braces and twist points of a column, the live
side-view sketch, and the saves that change them (each writes a dated restraint change).

Nothing here imports Flet. Reading functions take plain records; saving functions take an open
``Store`` and run in a worker thread (``app.saver.save``), each in one transaction: the new
record, the restraint change in the column's history and the new check land together or not
at all.

Public API::

    restraints_view(record, system) -> Restraints
    sketch(record, system) -> Sketch
    brace_record(draft, record) -> tuple[dict, list[tuple[str, int]]]
    save_brace(store, column_id, draft, *, refs=(), who=None, ...) -> Saved
    remove_brace(store, column_id, refs, *, who=None, ...) -> Saved
    set_end(store, column_id, axis, end, draft, *, who=None, ...) -> Saved
    add_twist(store, column_id, at, *, who=None, ...) / remove_twist(store, column_id, i, ...)
    restore(store, saved) -> None        (the undo of any of them)
"""

from __future__ import annotations

import copy
import datetime as _dt
import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Mapping, Sequence

from fieldcol.errors import InputError
from fieldcol.recordkeys import BRACE_KINDS

if TYPE_CHECKING:
    from fieldcol.store import Store

AXES = ("strong", "weak")
AXIS_WORDS = {"strong": "strong axis", "weak": "weak axis", "both": "both axes"}
END_KINDS = ("fixed", "pinned", "free", "guided", "spring")
END_HELP = {"fixed": "rotation and position held", "pinned": "held in place, free to rotate",
            "free": "neither held", "guided": "rotation held, free to sway",
            "spring": "a rotational spring (and position held or a spring)"}
#: the fields of the brace form, in the order they are shown
DRAFT_FIELDS = ("at", "axis", "kind", "stiffness", "strength", "area", "length", "angle",
                "added", "seen_by", "note", "twist")


@dataclass(frozen=True)
class EndView:
    """One end about one axis as the form shows it."""
    axis: str
    end: str          # bottom | top
    kind: str         # one of END_KINDS
    rotation: str     # the spring's rotational stiffness as recorded ("" otherwise)
    translation: str  # "held", or a stiffness as recorded


@dataclass(frozen=True)
class BraceView:
    """One brace as the list shows it; ``refs`` are its places in the record (both axes when
    the same brace holds both)."""
    refs: tuple[tuple[str, int], ...]
    axis: str                 # strong | weak | both
    at: str                   # as recorded
    at_text: str              # in the site's units
    at_mm: float
    kind: str
    summary: str              # e.g. "strut, 20 kip/in, good for 5 kip"
    added: str
    seen_by: str
    note: str
    draft: dict[str, Any]     # the form filled with this brace (to change it)


@dataclass(frozen=True)
class Restraints:
    """Everything the Restraints tab lists."""
    length_mm: float | None
    length_text: str
    ends: dict[tuple[str, str], EndView]
    braces: list[BraceView]
    twist: list[tuple[int, str]]          # (index, height text)


@dataclass(frozen=True)
class AxisSketch:
    """One axis of the side-view sketch, in fractions of the length (0 bottom, 1 top)."""
    axis: str
    bottom: str                          # end kind
    top: str
    braces: list[tuple[float, str, bool]]   # (z/L, kind, counted)
    shape: list[tuple[float, float]]     # (z/L, w) with max |w| = 1
    K: float
    Lc_text: str
    governs: bool
    note: str                            # e.g. "two half-waves: the brace at mid-height holds"


@dataclass(frozen=True)
class Sketch:
    """The side view of both axes, or why it cannot be drawn."""
    axes: list[AxisSketch] = field(default_factory=list)
    governing: str = ""                  # words: "weak axis governs", "torsional buckling governs"
    error: str | None = None
    error_field: str | None = None


@dataclass(frozen=True)
class Saved:
    """What a save did, enough to undo it."""
    column_id: str
    record_before: dict[str, Any]
    change_id: str | None
    label: str
    status: str = ""   # the column's check after the save ("0.84 OK"), for the save bar


# -- reading -------------------------------------------------------------------------------
def _axes(record: Mapping[str, Any]) -> dict[str, Any]:
    r = record.get("restraints")
    return r if isinstance(r, dict) else {}


def _len_text(text: Any, system: str) -> tuple[float | None, str]:
    from fieldcol.units import format_length, parse_length

    try:
        mm = parse_length(text, "length")
    except (InputError, TypeError):
        return None, str(text or "not recorded")
    return mm, format_length(mm, system)


def _end_view(axis: str, name: str, spec: Any) -> EndView:
    if isinstance(spec, dict):
        tr = spec.get("translation", "held")
        return EndView(axis, name, "spring", str(spec.get("rotation", "")), str(tr))
    kind = str(spec or "pinned").strip().lower()
    return EndView(axis, name, kind if kind in END_KINDS else "pinned", "", "held")


def _draft_of(b: Mapping[str, Any], axis: str, twist: bool) -> dict[str, Any]:
    cable = b.get("cable") if isinstance(b.get("cable"), dict) else {}
    kind = b.get("kind") or ("cable" if cable else "strut")
    return {"at": str(b.get("at", "")), "axis": axis, "kind": kind,
            "stiffness": "" if b.get("stiffness") is None else str(b["stiffness"]),
            "strength": "" if b.get("strength") is None else str(b["strength"]),
            "area": str(cable.get("area", "")), "length": str(cable.get("length", "")),
            "angle": str(cable.get("angle", "")), "added": str(b.get("added") or ""),
            "seen_by": str(b.get("seen_by") or ""), "note": str(b.get("note") or ""),
            "twist": twist}


def _summary(b: Mapping[str, Any], kind: str, system: str) -> str:
    """A brace in a line; its stiffness and strength by the one display rule (as the
    trace and the brace requirement beside them write theirs: ``units.format_entry``)."""
    from fieldcol.units import format_entry

    parts = [kind]
    cable = b.get("cable") if isinstance(b.get("cable"), dict) else None
    if cable:
        parts.append(f"{cable.get('area', '?')} at {cable.get('angle', '?')}, "
                     f"{cable.get('length', '?')} long")
    elif b.get("stiffness"):
        parts.append(f"stiffness {format_entry(b['stiffness'], 'stiffness', system)}")
    else:
        parts.append("stiffness not recorded: taken as rigid")
    if b.get("strength"):
        parts.append(f"good for {format_entry(b['strength'], 'force', system)}")
    return ", ".join(parts)


def restraints_view(record: Mapping[str, Any], system: str) -> Restraints:
    """The ends, braces and twist points of a column record, ready to list.

    A brace recorded identically on both axes is one brace of axis ``both``.

    Args:
        record: the column record as the engine reads it (``store.current_record``).
        system: ``us`` or ``si`` for the heights shown.

    Returns:
        A ``Restraints``.

    Example:
        >>> r = restraints_view({"length": "24 ft", "restraints": {"weak": {"braces": [
        ...     {"at": "12 ft", "kind": "strut"}]}}}, "us")
        >>> [(b.axis, b.at_text, b.kind) for b in r.braces]
        [('weak', '12\\'-0"', 'strut')]
    """
    length_mm, length_text = _len_text(record.get("length"), system)
    axes = _axes(record)
    ends = {}
    for ax in AXES:
        spec = axes.get(ax) if isinstance(axes.get(ax), dict) else {}
        for name in ("bottom", "top"):
            ends[(ax, name)] = _end_view(ax, name, spec.get(name, "pinned"))
    twist_spec = axes.get("twist") if isinstance(axes.get("twist"), dict) else {}
    twist_at = [t.get("at") for t in twist_spec.get("braces") or [] if isinstance(t, dict)]
    lists = {ax: [b for b in ((axes.get(ax) or {}).get("braces") or []) if isinstance(b, dict)]
             for ax in AXES}
    used: set[tuple[str, int]] = set()
    out: list[BraceView] = []
    for ax in AXES:
        for i, b in enumerate(lists[ax]):
            if (ax, i) in used:
                continue
            refs = [(ax, i)]
            other = "weak" if ax == "strong" else "strong"
            for j, c in enumerate(lists[other]):
                if (other, j) not in used and c == b:
                    refs.append((other, j))
                    break
            used.update(refs)
            axis = "both" if len(refs) == 2 else ax
            mm, text = _len_text(b.get("at"), system)
            kind = str(b.get("kind") or ("cable" if b.get("cable") else "strut"))
            twist = b.get("at") in twist_at
            out.append(BraceView(tuple(refs), axis, str(b.get("at", "")), text,
                                 mm if mm is not None else math.nan, kind,
                                 _summary(b, kind, system),
                                 str(b.get("added") or ""), str(b.get("seen_by") or ""),
                                 str(b.get("note") or ""), _draft_of(b, axis, twist)))
    out.sort(key=lambda x: (x.at_mm if math.isfinite(x.at_mm) else math.inf))
    twist = [(i, _len_text(a, system)[1]) for i, a in enumerate(twist_at)]
    return Restraints(length_mm, length_text, ends, out, twist)


def empty_draft(record: Mapping[str, Any] | None = None, *, who: str | None = None) -> dict:
    """A new brace form: at mid-height (half the recorded length, in the length's own unit),
    weak axis, a strut, added today, seen by ``who``.

    Example:
        >>> d = empty_draft({"length": "24 ft"}, who="R. Amadi")
        >>> d["at"], d["axis"], d["kind"], d["seen_by"]
        ('12 ft', 'weak', 'strut', 'R. Amadi')
    """
    at = ""
    if record is not None:
        at = _half(record.get("length"))
    return {"at": at, "axis": "weak", "kind": "strut", "stiffness": "", "strength": "",
            "area": "", "length": "", "angle": "", "added": _dt.date.today().isoformat(),
            "seen_by": who or "", "note": "", "twist": False}


def _half(length: Any) -> str:
    from fieldcol.units import parse_length

    try:
        mm = parse_length(length, "length")
    except (InputError, TypeError):
        return ""
    text = str(length).strip().lower()
    for unit, per in (("ft", 304.8), ("m", 1000.0), ("mm", 1.0), ("in", 25.4)):
        if text.endswith(unit) and not text.endswith(("mm", "cm")) or text.endswith(" " + unit):
            return f"{mm / 2 / per:g} {unit}"
    return f"{mm / 2:g} mm"


# -- the record with an edit ---------------------------------------------------------------
_DRAFT_TO_RECORD = {"at": "at", "stiffness": "stiffness", "strength": "strength", "kind": "kind",
                    "cable.area": "area", "cable.length": "length", "cable.angle": "angle",
                    "added": "added", "seen_by": "seen_by", "note": "note"}


def draft_field(error_field: str) -> str | None:
    """The brace form field an engine error concerns (``restraints.weak.braces[2].cable.area``
    -> ``area``), or None when it concerns something else.

    Example:
        >>> draft_field("restraints.weak.braces[0].stiffness")
        'stiffness'
    """
    if ".braces[" not in error_field:
        return None
    tail = error_field.split("].", 1)[1] if "]." in error_field else "at"
    for key, name in _DRAFT_TO_RECORD.items():
        if tail == key or tail.startswith(key + "."):
            return name
    return "at" if tail.startswith("at") else None


def _entry(draft: Mapping[str, Any]) -> dict[str, Any]:
    """The record entry of a brace form (blank entries left out)."""
    def txt(key: str) -> str:
        v = draft.get(key)
        return "" if v is None else str(v).strip()

    if not txt("at"):
        raise InputError("at", "", "type the height of the brace above the bottom of the column",
                         "e.g. 12 ft, 12'-6\" or 3.8 m")
    kind = txt("kind") or "strut"
    if kind not in BRACE_KINDS:
        raise InputError("kind", kind, "pick what the brace is", ", ".join(BRACE_KINDS))
    b: dict[str, Any] = {"at": txt("at"), "kind": kind}
    if kind in ("cable", "rod") and (txt("area") or txt("angle") or txt("length")):
        for key, example in (("area", "0.6 in^2 or 380 mm^2"), ("length", "18 ft or 5.5 m"),
                             ("angle", "40 deg")):
            if not txt(key):
                raise InputError(key, "", f"a {kind} needs its {key} too", "e.g. " + example)
        b["cable"] = {"area": txt("area"), "length": txt("length"), "angle": txt("angle")}
        if txt("stiffness"):
            raise InputError("stiffness", txt("stiffness"),
                             f"give the {kind}'s area, length and angle, or a stiffness, not both",
                             "clear one of them")
    elif txt("stiffness"):
        b["stiffness"] = txt("stiffness")
    for key in ("strength", "added", "seen_by", "note"):
        if txt(key):
            b[key] = txt(key)
    return b


def brace_record(draft: Mapping[str, Any], record: Mapping[str, Any],
                 refs: Sequence[tuple[str, int]] = ()) -> tuple[dict[str, Any], list[tuple[str, int]]]:
    """The column record with the brace of ``draft`` added, or put in place of ``refs``.

    Args:
        draft: the brace form (``DRAFT_FIELDS``; ``axis`` strong, weak or both; ``twist``
            True also holds the column against twisting there).
        record: the column record.
        refs: the (axis, index) places of the brace being changed; empty to add one.

    Returns:
        (the new record, the new brace's places).

    Raises:
        InputError: a form entry that cannot be used, naming the form field.

    Example:
        >>> rec, refs = brace_record({"at": "12 ft", "axis": "both"}, {"length": "24 ft"})
        >>> refs, rec["restraints"]["strong"]["braces"]
        ([('strong', 0), ('weak', 0)], [{'at': '12 ft', 'kind': 'strut'}])
    """
    axis = str(draft.get("axis") or "weak")
    if axis not in ("strong", "weak", "both"):
        raise InputError("axis", axis, "pick the axis the brace holds", "strong, weak or both")
    entry = _entry(draft)
    new = copy.deepcopy(dict(record))
    axes = new.setdefault("restraints", {})
    old_at = None
    for ax, i in sorted(refs, key=lambda r: -r[1]):
        lst = axes.get(ax, {}).get("braces") or []
        if i < len(lst):
            old_at = lst[i].get("at")
            del lst[i]
    if old_at is not None:
        _drop_twist(axes, old_at)
    places = []
    for ax in (AXES if axis == "both" else (axis,)):
        spec = axes.setdefault(ax, {"bottom": "pinned", "top": "pinned"})
        lst = spec.setdefault("braces", [])
        lst.append(dict(entry))
        places.append((ax, len(lst) - 1))
    if draft.get("twist"):
        tw = axes.setdefault("twist", {})
        pts = tw.setdefault("braces", [])
        if not any(p.get("at") == entry["at"] for p in pts if isinstance(p, dict)):
            pts.append({k: entry[k] for k in ("at", "added", "seen_by", "note") if k in entry})
    return new, places


def _drop_twist(axes: dict[str, Any], at: Any) -> None:
    tw = axes.get("twist")
    if isinstance(tw, dict) and tw.get("braces"):
        tw["braces"] = [p for p in tw["braces"] if not (isinstance(p, dict) and p.get("at") == at)]
        if not tw["braces"]:
            del tw["braces"]
        if not tw:
            del axes["twist"]


def _map_error(e: InputError) -> InputError:
    """An engine error about the brace, renamed to the form field it concerns."""
    name = draft_field(e.field)
    if name is None:
        return e
    return InputError(name, e.text, e.reason, e.hint)


def plain(e: InputError) -> str:
    """An input error in plain words, without the internal field path.

    Example:
        >>> plain(InputError("restraints.weak.braces[0].at", "30 m", "outside the column length",
        ...                  "measure from the bottom end"))
        "Can't use 30 m: outside the column length (measure from the bottom end)."
    """
    text = f"Can't use {e.text}: " if str(e.text or "").strip() else ""
    reason = e.reason if text else e.reason[:1].upper() + e.reason[1:]
    return text + reason + (f" ({e.hint})" if e.hint else "") + "."


# -- sketch --------------------------------------------------------------------------------
def sketch(record: Mapping[str, Any], system: str) -> Sketch:
    """The side view of both axes: ends, braces (counted or not) and the first buckled shape
    of each, with the governing axis marked. A record that cannot be checked gives the error.

    Args:
        record: the column record (the saved one, or one with a brace being typed).
        system: ``us`` or ``si``.

    Returns:
        A ``Sketch``.

    Example:
        >>> s = sketch({"tag": "C", "section": "W14X90", "material": "A992", "length": "24 ft",
        ...             "restraints": {"weak": {"braces": [{"at": "12 ft"}]}}}, "us")
        >>> [(a.axis, a.note) for a in s.axes]
        [('strong', 'one half-wave'), ('weak', '2 half-waves')]
    """
    from fieldcol.assess import assess
    from fieldcol.stability import Brace, mode_shape
    from fieldcol.units import format_length

    try:
        a = assess(record)
    except InputError as e:
        return Sketch(error=plain(e), error_field=e.field)
    col = a.column
    L = col.length
    gov = a.governing_mode
    out = []
    for ax in AXES:
        spec = col.axes[ax]
        length = a.lengths[ax]
        counted = set(length.braces_used)
        EI = col.material.E * float(getattr(col.section, "Ix" if ax == "strong" else "Iy"))
        if length.shape is not None:
            z, w = length.shape
            pts = [(float(zi) / L, float(wi)) for zi, wi in zip(z, w)]
        else:
            braces = [Brace(spec.braces[i].at) for i in sorted(counted)]
            try:
                ms = mode_shape(L, EI, spec.bottom, spec.top, braces,
                                field=f"restraints.{ax}")
                pts = [(float(zi) / L, float(wi)) for zi, wi in zip(ms.z, ms.w)]
            except InputError:
                pts = []
        rec_braces = ((_axes(record).get(ax) or {}).get("braces") or [])
        bl = []
        for i, b in enumerate(spec.braces):
            rb = rec_braces[i] if i < len(rec_braces) and isinstance(rec_braces[i], dict) else {}
            kind = str(rb.get("kind") or ("cable" if rb.get("cable") else "strut"))
            bl.append((b.at / L, kind, i in counted))
        half_waves = _half_waves(pts)
        note = ("one half-wave" if half_waves == 1 else f"{half_waves} half-waves") \
            if pts else "shape not drawn"
        out.append(AxisSketch(ax, spec.bottom.label if spec.bottom.label != "partial" else "spring",
                              spec.top.label if spec.top.label != "partial" else "spring",
                              bl, pts, float(length.K), format_length(length.Lc, system),
                              gov == f"flexural-{ax}", note))
    words = {"flexural-strong": "buckling about the strong axis governs",
             "flexural-weak": "buckling about the weak axis governs",
             "torsional": "twisting (torsional buckling) governs",
             "yield": "squashing (yield) governs: neither axis buckles first",
             "bow": "the measured bow governs"}
    from fieldcol.assess import MODE_WORDS

    return Sketch(out, words.get(gov, MODE_WORDS.get(gov, gov) + " governs"))


def _half_waves(pts: list[tuple[float, float]]) -> int:
    """Half-waves of a shape: sign changes between the supports, counted away from zero."""
    signs = [1 if w > 0.02 else -1 for _, w in pts if abs(w) > 0.02]
    return 1 + sum(1 for a, b in zip(signs, signs[1:]) if a != b) if signs else 0


def sketch_with(record: Mapping[str, Any], draft: Mapping[str, Any] | None,
                refs: Sequence[tuple[str, int]], system: str) -> Sketch:
    """The sketch of the record with the brace being typed in place (live, before saving); a
    form entry that cannot be used yet leaves the saved record's sketch with its error.

    Example:
        >>> rec = {"tag": "C", "section": "W14X90", "material": "A992", "length": "24 ft"}
        >>> s = sketch_with(rec, {"at": "12 ft", "axis": "weak"}, (), "us")
        >>> [a.note for a in s.axes]
        ['one half-wave', '2 half-waves']
    """
    if draft is None:
        return sketch(record, system)
    try:
        new, _ = brace_record(draft, record, refs)
    except InputError as e:
        base = sketch(record, system)
        return Sketch(base.axes, base.governing, plain(e), e.field)
    s = sketch(new, system)
    if s.error_field is not None:
        mapped = draft_field(s.error_field)
        if mapped is not None:
            base = sketch(record, system)
            return Sketch(base.axes, base.governing, s.error, mapped)
    return s


# -- saving --------------------------------------------------------------------------------
def _save(store: "Store", column_id: str, new_record: dict[str, Any], change: dict[str, Any],
          label: str) -> Saved:
    """Check the new record, then save it, its restraint change and its check in one go."""
    from fieldcol.assess import assess
    from fieldcol.store import site_defaults
    from fieldcol.ui.model import status_of

    col = store.get_column(column_id)
    before = copy.deepcopy(col.record)
    current = store.current_record(column_id)
    # the engine reads the stored record with the latest readings on top
    # (and what the record leaves out taken from its site: code, basis, gamma_M1)
    candidate = site_defaults(new_record, store.get_site(col.site_id))
    for key in ("length", "condition"):
        if key in current:
            candidate[key] = current[key]
    try:
        result = assess(candidate)
    except InputError as e:
        raise _map_error(e) from None
    with store.transaction():
        store.update_column(column_id, record=new_record)
        rc = store.add_restraint_change(column_id, change["date"], change["kind"],
                                        change["description"], axis=change.get("axis"),
                                        seen_by=change.get("seen_by"),
                                        detail=change.get("detail"))
        if change.get("photo_id"):
            store.attach_photo(change["photo_id"], restraint_change_id=rc.id)
        d = result.to_dict()
        chk = store.save_check(column_id, d, record=store.current_record(column_id))
    return Saved(column_id, before, rc.id, label,
                 status_of(chk.utilization, True, d.get("status")).label)


def _today() -> str:
    return _dt.date.today().isoformat()


def _change_axis(axis: str) -> str | None:
    return axis if axis in ("strong", "weak", "twist") else None


def save_brace(store: "Store", column_id: str, draft: Mapping[str, Any], *,
               refs: Sequence[tuple[str, int]] = (), who: str | None = None,
               photo_id: str | None = None) -> Saved:
    """Add a brace (``refs`` empty) or change one, and log it in the column's history.

    Args:
        store: an open store.
        column_id: the column.
        draft: the brace form (see ``brace_record``).
        refs: the places of the brace being changed.
        who: the engineer (``app.person``): the change's ``seen_by`` unless the form names
            someone else.
        photo_id: a photo to attach to the restraint change.

    Returns:
        ``Saved`` (for the undo).

    Raises:
        InputError: naming the form field (``at``, ``stiffness``, ``area`` ...).

    Example: ``save_brace(store, col.id, {"at": "12 ft", "axis": "weak"}, who="R. Amadi")``.
    """
    col = store.get_column(column_id)
    new, places = brace_record(draft, col.record, refs)
    entry = new["restraints"][places[0][0]]["braces"][places[0][1]]
    axis = str(draft.get("axis") or "weak")
    what = entry.get("kind", "brace")
    changed = bool(refs)
    desc = (f"{what} at {entry['at']} ({AXIS_WORDS[axis]}) "
            + ("changed" if changed else "added"))
    if entry.get("note"):
        desc += f": {entry['note']}"
    kind = "other" if changed else ("cable_found" if what == "cable" else "brace_added")
    date = _date_of(entry.get("added")) if not changed else _today()
    change = {"date": date, "kind": kind, "description": desc, "axis": _change_axis(axis),
              "seen_by": entry.get("seen_by") or who,
              "detail": {"brace": entry, "axis": axis, "by": who,
                         "change": "changed" if changed else "added"},
              "photo_id": photo_id}
    return _save(store, column_id, new, change, desc)


def _date_of(added: Any) -> str:
    """The restraint change's date: the brace's ``added`` when it is a date, else today."""
    try:
        return _dt.date.fromisoformat(str(added)).isoformat()
    except ValueError:
        return _today()


def remove_brace(store: "Store", column_id: str, refs: Sequence[tuple[str, int]], *,
                 who: str | None = None, photo_id: str | None = None) -> Saved:
    """Remove a brace (from both axes when it holds both) and its twist point, and log it.

    Example: ``remove_brace(store, col.id, [("weak", 0)], who="R. Amadi")``.
    """
    col = store.get_column(column_id)
    new = copy.deepcopy(col.record)
    axes = new.get("restraints") or {}
    removed = None
    if not refs or any(not _index(i) for _, i in refs):
        raise InputError("brace", ", ".join(f"{ax} {i}" for ax, i in refs),
                         "that brace is no longer recorded",
                         "the list was changed meanwhile: look again")
    for ax, i in sorted(refs, key=lambda r: -r[1]):
        lst = (axes.get(ax) or {}).get("braces") if isinstance(axes.get(ax), dict) else None
        lst = lst or []
        if not 0 <= i < len(lst):
            raise InputError("brace", f"{ax} {i}", "that brace is no longer recorded",
                             "the list was changed meanwhile: look again")
        removed = lst.pop(i)
        if not lst:
            del axes[ax]["braces"]
    assert removed is not None
    _drop_twist(axes, removed.get("at"))
    axis = "both" if len(refs) == 2 else refs[0][0]
    desc = f"{removed.get('kind', 'brace')} at {removed.get('at')} ({AXIS_WORDS[axis]}) removed"
    change = {"date": _today(), "kind": "brace_removed", "description": desc,
              "axis": _change_axis(axis), "seen_by": who,
              "detail": {"brace": removed, "axis": axis, "by": who, "change": "removed"},
              "photo_id": photo_id}
    return _save(store, column_id, new, change, desc)


def end_spec(kind: str, rotation: str = "", translation: str = "") -> Any:
    """The record entry of an end from the form.

    Example:
        >>> end_spec("spring", "50000 kip*in/rad")
        {'rotation': '50000 kip*in/rad', 'translation': 'held'}
    """
    if kind not in END_KINDS:
        raise InputError("end", kind, "pick how the end is held", ", ".join(END_KINDS))
    if kind != "spring":
        return kind
    if not str(rotation).strip():
        raise InputError("rotation", "", "a spring end needs its rotational stiffness",
                         "e.g. 50000 kip*in/rad or 5000 kN*m/rad")
    tr = str(translation).strip() or "held"
    return {"rotation": str(rotation).strip(), "translation": tr}


def set_end(store: "Store", column_id: str, axis: str, end: str, kind: str, *,
            rotation: str = "", translation: str = "", who: str | None = None) -> Saved:
    """Change how one end is held about one axis, and log it.

    Example: ``set_end(store, col.id, "strong", "bottom", "fixed", who="R. Amadi")``.
    """
    if axis not in AXES:
        raise InputError("axis", axis, "pick an axis", "strong or weak")
    if end not in ("bottom", "top"):
        raise InputError("end", end, "pick an end", "bottom or top")
    spec = end_spec(kind, rotation, translation)
    col = store.get_column(column_id)
    new = copy.deepcopy(col.record)
    ax = new.setdefault("restraints", {}).setdefault(axis, {})
    old = ax.get(end, "pinned")
    ax.setdefault("bottom" if end == "top" else "top", "pinned")
    ax[end] = spec
    words = spec if isinstance(spec, str) else f"spring {spec['rotation']}"
    desc = f"{end} end, {axis} axis: {old if isinstance(old, str) else 'spring'} -> {words}"
    if not isinstance(spec, str) and new.get("k_basis") != "analysis":
        # a spring has no table K: only the buckling analysis of the whole column can use it
        new["k_basis"] = "analysis"
        desc += "; checked by buckling analysis from now on (a spring end has no table K)"
    change = {"date": _today(), "kind": "end_condition_changed", "description": desc,
              "axis": axis, "seen_by": who,
              "detail": {"end": end, "from": old, "to": spec, "by": who}}
    return _save(store, column_id, new, change, f"{end} end, {axis} axis")


def add_twist(store: "Store", column_id: str, at: str, *, who: str | None = None) -> Saved:
    """Add a point held against twisting, and log it.

    Example: ``add_twist(store, col.id, "12 ft", who="R. Amadi")``.
    """
    at = str(at or "").strip()
    if not at:
        raise InputError("twist", "", "type the height of the twist restraint",
                         "e.g. 12 ft or 3.6 m")
    col = store.get_column(column_id)
    new = copy.deepcopy(col.record)
    tw = new.setdefault("restraints", {}).setdefault("twist", {})
    tw.setdefault("braces", []).append({"at": at, "added": _today(),
                                        **({"seen_by": who} if who else {})})
    change = {"date": _today(), "kind": "brace_added",
              "description": f"twist restraint at {at} added", "axis": "twist",
              "seen_by": who, "detail": {"twist": at, "by": who, "change": "added"}}
    try:
        return _save(store, column_id, new, change, f"twist restraint at {at}")
    except InputError as e:
        raise InputError("twist", e.text, e.reason, e.hint) from None


def _index(i: object) -> bool:
    """A position in a list as the screen gives it: a whole number (not True / False)."""
    return isinstance(i, int) and not isinstance(i, bool)


def remove_twist(store: "Store", column_id: str, index: int, *, who: str | None = None) -> Saved:
    """Remove a twist restraint point, and log it.

    Example: ``remove_twist(store, col.id, 0, who="R. Amadi")``.
    """
    col = store.get_column(column_id)
    new = copy.deepcopy(col.record)
    tw = (new.get("restraints") or {}).get("twist") or {}
    pts = tw.get("braces") or []
    if not _index(index) or not 0 <= index < len(pts):
        raise InputError("twist", str(index), "that twist restraint is no longer recorded",
                         "look again")
    gone = pts.pop(index)
    if not pts:
        del tw["braces"]
    change = {"date": _today(), "kind": "brace_removed",
              "description": f"twist restraint at {gone.get('at')} removed", "axis": "twist",
              "seen_by": who, "detail": {"twist": gone.get("at"), "by": who, "change": "removed"}}
    return _save(store, column_id, new, change, f"removed twist restraint at {gone.get('at')}")


def restore(store: "Store", saved: Saved) -> None:
    """Undo a save: the record as it was, the restraint change tombstoned, checked again.

    Example: ``restore(store, save_brace(store, col.id, draft))``.
    """
    from fieldcol.assess import assess

    with store.transaction():
        store.update_column(saved.column_id, record=saved.record_before)
        if saved.change_id is not None:
            store.delete("restraint_changes", saved.change_id)
        rec = store.current_record(saved.column_id)
        try:
            result = assess(rec)
        except InputError:
            return
        store.save_check(saved.column_id, result.to_dict(), record=rec)
