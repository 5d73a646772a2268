"""View-models of where a column lost steel and how its steel was made: a loss band over part of
the height (``section.loss`` ``from`` / ``to``) with open holes at one height in it
(``section.loss.holes``), a hollow section's ``finish`` (EN 1993-1-1 Table 6.2: hot-finished
curve a, cold-formed curve c), and the bow already allowed for in the column curves
(``condition.bow_allowance``).

Each change is checked with the whole column before it is saved (``loads_model.save_record_key``)
and comes back as a ``Change`` that ``fieldcol.ui.readings.undo_change`` takes back; a bad entry
raises ``InputError`` named as the screen labels it (``loss band from``, ``hole across the web``).
No Flet here.

Public API::

    band_view(store, column_id) -> BandView
    set_band(store, column_id, start, end, holes=None) -> Change   # start None: full length
    set_finish(store, column_id, finish) -> Change
    set_bow_allowance(store, column_id, choice) -> Change
    HOLE_WORDS, FINISH_WORDS, ALLOWANCE_WORDS
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from fieldcol.errors import InputError
from fieldcol.ui.loads_model import _length, save_record_key
from fieldcol.ui.readings import Change, _shape

if TYPE_CHECKING:
    from fieldcol.store import Store

#: the plate a hole goes through -> the entry's label
HOLE_WORDS = {"flange": "Hole across each flange", "web": "Hole across the web",
              "wall": "Hole across one wall"}
_HOLES = {"i": ("flange", "web"), "rect": ("wall",), "round": ("wall",)}
#: a hollow section's finish -> (word, what it means for the check)
FINISH_WORDS = {"hot-finished": ("Hot-finished", "EN 10210: buckling curve a"),
                "cold-formed": ("Cold-formed", "EN 10219: buckling curve c, the safe choice "
                                "when not known")}
#: the bow the column curves already hold -> (word, what it means)
ALLOWANCE_WORDS = {
    "L/1000": ("L/1000 (usual)", "only the bow beyond L/1000 is checked as bending: the "
               "straightness a new column may have, which the column curves already cover"),
    "L/1500": ("L/1500 (conservative)", "the bow beyond L/1500 is checked: a smaller allowance, "
               "so more of the measured bow counts against the column")}


@dataclass(frozen=True)
class BandView:
    """The loss band, the holes, the finish and the bow allowance as recorded."""
    column_id: str
    unit: str
    shape: str
    start: str                 # "" when the loss is over the full length
    end: str
    holes: dict[str, str]
    elements: tuple[str, ...]  # the plates a hole may go through
    finish: str
    finish_offered: bool       # a measured hollow section checked to EN 1993-1-1
    allowance: str
    notes: list[str] = field(default_factory=list)


def band_view(store: "Store", column_id: str) -> BandView:
    """The Section and Condition tabs' band, holes, finish and allowance of a column.

    Example: ``band_view(store, cid).start`` gives ``''`` for a column with no band.
    """
    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    rec = store.current_record(column_id)
    sec = rec.get("section")
    loss = sec.get("loss") if isinstance(sec, dict) and isinstance(sec.get("loss"), dict) else {}
    holes = loss.get("holes") if isinstance(loss.get("holes"), dict) else {}
    shape = _shape(sec)
    measured_hollow = isinstance(sec, dict) and sec.get("shape") in ("rect", "round")
    cond = rec.get("condition") if isinstance(rec.get("condition"), dict) else {}
    allowance = str(cond.get("bow_allowance") or "L/1000").replace(" ", "").upper()
    return BandView(column_id, "in" if system == "us" else "mm", shape,
                    str(loss.get("from") or ""), str(loss.get("to") or ""),
                    {k: str(v) for k, v in holes.items() if v not in (None, "")},
                    _HOLES[shape],
                    str(sec.get("finish") or "cold-formed") if measured_hollow else "",
                    measured_hollow and rec.get("code") == "en1993-1-1",
                    allowance if allowance in ALLOWANCE_WORDS else "L/1000")


def _band_name(e: InputError) -> InputError:
    """An engine error about the band, named as the entries are labelled."""
    f = e.field
    for key, words in (("loss.from", "loss band from"), ("loss.to", "loss band to")):
        if f.endswith(key):
            return InputError(words, e.text, e.reason, e.hint)
    if ".holes." in f:
        k = f.rsplit(".", 1)[-1]
        return InputError(HOLE_WORDS.get(k, "hole").lower(), e.text, e.reason, e.hint)
    return InputError("loss band to", e.text, f"{e.reason} (field {f})", e.hint)


def set_band(store: "Store", column_id: str, start: str | None, end: str | None = None,
             holes: dict[str, str] | None = None) -> Change:
    """Put the column's recorded loss over a band of height (measured from the bottom), with
    open holes at one height in it; ``start`` None: the loss is over the full length again
    (holes go with the band).

    Args:
        store: an open store.
        column_id: the column.
        start, end: heights as typed (a bare number in the site's unit: in or mm).
        holes: plate (``flange``, ``web``, ``wall``) -> width lost across it, as typed; empty
            entries are left out.

    Returns:
        The ``Change``; an ``InputError`` named ``loss band from``, ``loss band to`` or
        ``hole across the web`` (...) saves nothing.

    Example: ``set_band(store, cid, "0", "6", {"web": "1"}).label`` gives
    ``'loss band 0 to 6 in, hole across the web 1 in'``.
    """
    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    sec = col.record.get("section")
    if sec in (None, ""):
        raise InputError("loss band from", "", "record the section first", None)
    if isinstance(sec, dict) and "built" in sec:
        raise InputError("loss band from", "", "a built-up section is checked from its parts",
                         "enter the parts as they are now in the built-up card")
    old = sec.get("loss") if isinstance(sec, dict) and isinstance(sec.get("loss"), dict) else {}
    loss = {k: v for k, v in old.items() if k not in ("from", "to", "holes")}
    if start is None:
        return save_record_key(store, column_id, ("section", "loss"), loss or None,
                               "loss over the full length", _band_name)
    loss["from"] = _length(start, system, "loss band from")
    loss["to"] = _length(end, system, "loss band to")
    shape = _shape(sec)
    kept = {}
    for k, text in (holes or {}).items():
        if str(text or "").strip():
            if k not in _HOLES[shape]:
                raise InputError("hole", str(k), "not a plate of this section",
                                 " or ".join(_HOLES[shape]))
            kept[k] = _length(text, system, HOLE_WORDS[k].lower())
    if kept:
        loss["holes"] = kept
    what = f"loss band {loss['from']} to {loss['to']}" + "".join(
        f", {HOLE_WORDS[k].lower()} {v}" for k, v in kept.items())
    return save_record_key(store, column_id, ("section", "loss"), loss, what, _band_name)


def set_finish(store: "Store", column_id: str, finish: str) -> Change:
    """Record how a measured hollow section was made: ``hot-finished`` or ``cold-formed``.

    Example: ``set_finish(store, cid, "hot-finished").label`` gives ``'finish hot-finished'``.
    """
    sec = store.get_column(column_id).record.get("section")
    if not (isinstance(sec, dict) and sec.get("shape") in ("rect", "round")):
        raise InputError("finish", str(finish), "only a measured hollow section has a finish",
                         "measure the section first")
    if finish not in FINISH_WORDS:
        raise InputError("finish", str(finish), "not one of the choices",
                         "hot-finished or cold-formed")
    return save_record_key(store, column_id, ("section", "finish"), finish, f"finish {finish}",
                           lambda e: InputError("finish", finish, e.reason, e.hint))


def set_bow_allowance(store: "Store", column_id: str, choice: str) -> Change:
    """Record the bow the column curves already hold: ``L/1000`` (the engine's default) or
    ``L/1500`` (conservative).

    Example: ``set_bow_allowance(store, cid, "L/1500").label`` gives
    ``'bow allowance L/1500'``.
    """
    if choice not in ALLOWANCE_WORDS:
        raise InputError("bow allowance", str(choice), "not one of the choices",
                         "L/1000 or L/1500")
    return save_record_key(store, column_id, ("condition", "bow_allowance"), choice,
                           f"bow allowance {choice}",
                           lambda e: InputError("bow allowance", choice, e.reason, e.hint))
