"""View-models of a column's findings, photos, history and retrofit options (no Flet).

Like ``fieldcol.ui.model``, every function takes an open ``Store`` and returns plain records
whose texts carry their units in the site's unit system; they touch SQLite (and the retrofit
options run the engine), so the app calls them through ``asyncio.to_thread``.

Public API::

    column_findings(store, column_id) -> list[FindingLine]
    add_finding(store, column_id, text, category, severity) -> FindingResult
    set_finding_status(store, column_id, finding_id, status) -> FindingResult
    photo_bytes(store, photo_id, *, thumbnail=False) -> bytes
    column_history(store, column_id) -> History
    retrofit_options(store, column_id) -> list[RetrofitLine]
    SEVERITIES, SEVERITY_WORDS, STATUS_WORDS, CHANGE_WORDS
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from fieldcol import CAUTION
from fieldcol.errors import InputError
from fieldcol.ui.model import MODE_NAMES, Status, status_of

if TYPE_CHECKING:
    from fieldcol.store import Store

SEVERITIES = ("info", "low", "medium", "high", "urgent")
# (word shown, icon name): the word always travels with the icon, colour comes on top
SEVERITY_WORDS = {"info": ("info", "info_outline"), "low": ("low", "low_priority"),
                  "medium": ("medium", "report_outlined"), "high": ("high", "warning"),
                  "urgent": ("URGENT", "dangerous")}
STATUS_WORDS = {"open": ("open", "radio_button_unchecked"), "closed": ("closed", "task_alt")}
CHANGE_WORDS = {"brace_added": ("brace added", "add_link"),
                "brace_removed": ("brace removed", "link_off"),
                "cable_found": ("cable found", "cable"),
                "end_condition_changed": ("end changed", "swap_vert"),
                "other": ("other change", "edit_note")}
AXIS_WORDS = {"strong": "strong axis", "weak": "weak axis", "twist": "twist"}
RETROFIT_WORDS = {"proposed": "proposed", "chosen": "chosen", "rejected": "rejected",
                  "built": "built"}


@dataclass(frozen=True)
class PhotoThumb:
    """One photo as a thumbnail: its JPEG bytes, when it was taken (EXIF) and its size."""
    id: str
    thumb: bytes
    taken: str
    caption: str
    size: str
    name: str


@dataclass(frozen=True)
class FindingLine:
    """One finding of a column, its words and its photos."""
    id: str
    text: str
    category: str
    severity: str
    severity_word: str
    severity_icon: str
    status: str
    status_word: str
    status_icon: str
    date: str
    photos: list[PhotoThumb] = field(default_factory=list)

    @property
    def label(self) -> str:
        """What a screen reader says: ``"high, open, corrosion: Base of column ..."``."""
        return f"{self.severity_word}, {self.status_word}, {self.category}: {self.text}"


@dataclass(frozen=True)
class FindingResult:
    """The outcome of adding a finding or changing its status: saved (with the findings as
    they now stand) or refused, with the error and the field it names."""
    saved: bool
    findings: list[FindingLine]
    error: str | None = None
    error_field: str | None = None
    errors: dict[str, str] = field(default_factory=dict)


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
class History:
    """A column's restraint changes and measurement history, oldest first."""
    changes: list[ChangeLine]
    readings: list[ReadingLine]


@dataclass(frozen=True)
class RetrofitLine:
    """A saved retrofit option with the column before and after it.

    ``error`` is set (and the numbers are ``""``) when the changed record cannot be checked.
    """
    id: str
    description: str
    status: str
    saved: str
    before: Status
    after: Status
    before_strength: str
    after_strength: str
    demand: str
    governing_before: str
    governing_after: str
    gain: str
    warnings: list[str]
    error: str | None = None
    caution: str = CAUTION

    @property
    def line(self) -> str:
        """E.g. ``"design strength 586 kip -> 652 kip; 1.11 OVER -> 1.00 OK"``."""
        if self.error:
            return f"not checked: {self.error}"
        return (f"design strength {self.before_strength} -> {self.after_strength}; "
                f"{self.before.label} -> {self.after.label}")


# -- formatting ---------------------------------------------------------------------------
def _when(stamp: str | None) -> str:
    """``2026-02-10T10:15:00.000Z`` -> ``2026-02-10 10:15 UTC`` (the store keeps UTC)."""
    if not stamp:
        return ""
    return stamp.replace("T", " ")[:16] + " UTC"


def _exif_time(stamp: str | None) -> str:
    """The EXIF time as the camera recorded it, with its offset when the photo gives one."""
    if not stamp:
        return "no time in the photo"
    text = stamp.replace("T", " ")[:16]
    offset = stamp[19:]
    return f"taken {text}" + (f" {offset}" if offset else " (camera clock)")


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


def _thumbs(store: "Store", photos: list[Any]) -> list[PhotoThumb]:
    out = []
    for p in photos:
        try:
            data = store.photo_path(p, thumbnail=True).read_bytes()
        except OSError:
            data = b""  # the file is missing on this device: the row still says what it was
        out.append(PhotoThumb(id=p.id, thumb=data, taken=_exif_time(p.exif_taken_at),
                              caption=p.original_name or "", size=f"{p.width} x {p.height} px",
                              name=p.original_name or p.sha256[:12]))
    return out


# -- findings ------------------------------------------------------------------------------
def _finding_line(store: "Store", f: Any) -> FindingLine:
    sev_word, sev_icon = SEVERITY_WORDS.get(f.severity, (f.severity, "info_outline"))
    st_word, st_icon = STATUS_WORDS.get(f.status, (f.status, "radio_button_unchecked"))
    return FindingLine(id=f.id, text=f.text, category=f.category, severity=f.severity,
                       severity_word=sev_word, severity_icon=sev_icon, status=f.status,
                       status_word=st_word, status_icon=st_icon, date=_when(f.created_at),
                       photos=_thumbs(store, store.photos_of(finding_id=f.id)))


def column_findings(store: "Store", column_id: str) -> list[FindingLine]:
    """The findings of one column, open ones first, newest first within each, with photos.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        One ``FindingLine`` per live finding.

    Example: ``column_findings(store, c3.id)[0].severity_word`` gives ``'high'`` for the
    demo's C/3-G.
    """
    col = store.get_column(column_id)
    found = store.list_findings(col.site_id, column_id=column_id)
    found.sort(key=lambda f: f.created_at, reverse=True)
    found.sort(key=lambda f: f.status != "open")  # stable: open first, newest first in each
    return [_finding_line(store, f) for f in found]


def add_finding(store: "Store", column_id: str, text: str, category: str,
                severity: str) -> FindingResult:
    """Save a new open finding on a column at once, or refuse it naming the field.

    Args:
        store: an open store.
        column_id: the column.
        text: what was found (required).
        category: free text, e.g. ``corrosion`` (required).
        severity: one of ``SEVERITIES``.

    Returns:
        A ``FindingResult``; when refused nothing is saved, ``error_field`` names the first
        field refused and ``errors`` holds every field refused (so all are shown at once).

    Example: ``add_finding(store, cid, "", "damage", "low").error_field`` gives ``'text'``.
    """
    col = store.get_column(column_id)
    # every field is looked at before the store is asked, so one tap shows every problem;
    # the store checks them again and stays the authority
    errors: dict[str, str] = {}
    for name, value in (("text", text), ("category", category)):
        if not isinstance(value, str) or not value.strip():
            errors[name] = str(InputError(name, value if isinstance(value, str) else repr(value),
                                          "this is required", "type a value"))
    if severity not in SEVERITIES:
        errors["severity"] = str(InputError(
            "severity", severity if isinstance(severity, str) else repr(severity),
            "pick one of the choices" if severity in ("", None) else "not one of the choices",
            ", ".join(SEVERITIES)))
    try:
        if not errors:
            store.add_finding(col.site_id, text, category=category, severity=severity,
                              column_id=column_id)
    except InputError as e:
        errors[e.field] = str(e)
    if errors:
        first = next(iter(errors))
        return FindingResult(False, column_findings(store, column_id), errors[first], first,
                             errors)
    return FindingResult(True, column_findings(store, column_id))


def set_finding_status(store: "Store", column_id: str, finding_id: str,
                       status: str) -> FindingResult:
    """Close or reopen a finding of this column.

    Args:
        store: an open store.
        column_id: the column the finding belongs to.
        finding_id: the finding.
        status: ``open`` or ``closed``.

    Returns:
        A ``FindingResult`` with the column's findings as they now stand.

    Example: ``set_finding_status(store, cid, fid, "closed").findings[-1].status_word``
    gives ``'closed'``.
    """
    try:
        f = store.get_finding(finding_id)
        if f.column_id != column_id:
            raise InputError("finding", finding_id, "not a finding of this column", None)
        store.update_finding(finding_id, status=status)
    except InputError as e:
        return FindingResult(False, column_findings(store, column_id), str(e), e.field)
    return FindingResult(True, column_findings(store, column_id))


def photo_bytes(store: "Store", photo_id: str, *, thumbnail: bool = False) -> bytes:
    """The bytes of a stored photo (or its thumbnail), to show it larger.

    Args:
        store: an open store.
        photo_id: the photo.
        thumbnail: the 320 px thumbnail instead of the photo.

    Returns:
        The image file's bytes; an ``InputError`` on field ``photo`` if the file is missing.

    Example: ``photo_bytes(store, pid)[:2]`` gives ``b'\\xff\\xd8'`` for a JPEG.
    """
    p = store.get_photo(photo_id)
    path = store.photo_path(p, thumbnail=thumbnail)
    try:
        return path.read_bytes()
    except OSError as e:
        raise InputError("photo", p.original_name or p.id, f"the file is missing ({e})",
                         "restore the photos folder from a backup") from None


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
            photos=_thumbs(store, store.photos_of(restraint_change_id=rc.id))))
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
            value=_reading_value(m.value, m.kind, system, m.quantity), who=m.taken_by or "not recorded",
            when=_when(m.taken_at), gauge=m.gauge or "", note=m.note or "", state=state,
            corrects=f"corrects the reading typed {old.text}" if old else ""))
    return History(changes, lines)


# -- retrofit options ----------------------------------------------------------------------
def retrofit_options(store: "Store", column_id: str) -> list[RetrofitLine]:
    """The column's saved retrofit options, each checked against the column as it stands.

    Each option is saved as the column record it would give; the engine checks the current
    record and that record, and ``fieldcol.retrofit.Comparison`` gives the gain and the new
    warnings. Slow (one check per option and one for the column): call it off the UI loop.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        One ``RetrofitLine`` per live option, oldest first.

    Example: ``retrofit_options(store, c3.id)[0].after.word`` gives ``'OK'`` for the demo's
    C/3-G.
    """
    from fieldcol.assess import assess
    from fieldcol.retrofit import Comparison
    from fieldcol.units import format_quantity

    col = store.get_column(column_id)
    system = store.get_site(col.site_id).unit_system
    options = store.retrofits(column_id)
    if not options:
        return []
    before = assess(store.current_record(column_id))

    def force(x: float) -> str:
        return format_quantity(x, "force", system) if math.isfinite(x) else "none"

    out = []
    for r in options:
        common = dict(id=r.id, description=r.description,
                      status=RETROFIT_WORDS.get(r.status, r.status), saved=_when(r.created_at))
        try:
            after = assess(r.record)
        except InputError as e:
            none = status_of(None, False)
            out.append(RetrofitLine(**common, before=none, after=none, before_strength="",
                                    after_strength="", demand="", governing_before="",
                                    governing_after="", gain="", warnings=[], error=str(e)))
            continue
        c = Comparison({"saved": r.id}, r.description, before, after)
        gain = c.gain
        demand = before.demand
        out.append(RetrofitLine(
            **common,
            before=status_of(c.utilization_before, True, before.status),
            after=status_of(c.utilization_after, True, after.status),
            before_strength=force(c.design_before), after_strength=force(c.design_after),
            demand=force(demand) if demand is not None and math.isfinite(demand) else "none",
            governing_before=MODE_NAMES.get(c.governing_before, c.governing_before),
            governing_after=MODE_NAMES.get(c.governing_after, c.governing_after),
            gain="no strength to compare" if not math.isfinite(gain) else f"{gain * 100:+.0f}%",
            warnings=[w.get("message", str(w)) for w in c.new_warnings]))
    return out
