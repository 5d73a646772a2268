"""View-model of a column's findings: words, severity, where on the column, photos (no Flet).

Every function takes an open ``Store``; the app calls them through ``asyncio.to_thread`` or
``app.saver.save``.

Public API::

    column_findings(store, column_id) -> list[FindingLine]
    Draft (the form's typed values), draft_of(line) -> Draft
    check_draft(store, column_id, draft) -> dict[str, str]     # field -> plain words
    save_finding(store, column_id, draft, finding_id=None) -> Saved
    undo_saved(store, saved) -> None
    set_status(store, column_id, finding_id, status) -> str    # the status before
    SEVERITIES, SEVERITY_WORDS, STATUS_WORDS, FACES, FACE_WORDS
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from fieldcol.errors import InputError
from fieldcol.store._schema import FACE_WORDS, FACES
from fieldcol.ui.photos import QUICK_TEXT, PhotoThumb, thumbs

if TYPE_CHECKING:
    from fieldcol.store import Store

SEVERITIES = ("info", "low", "medium", "high", "urgent")
# (word shown, icon name): the word always travels with the icon, colour comes on top
SEVERITY_WORDS = {"info": ("info", "info_outline"), "low": ("low", "low_priority"),
                  "medium": ("medium", "report_outlined"), "high": ("high", "warning"),
                  "urgent": ("URGENT", "dangerous")}
STATUS_WORDS = {"open": ("open", "radio_button_unchecked"), "closed": ("closed", "task_alt")}


@dataclass(frozen=True)
class FindingLine:
    """One finding of a column, its words, where it is and its photos."""
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
    face: str = ""
    height: str = ""
    where: str = ""
    photos: list[PhotoThumb] = field(default_factory=list)

    @property
    def needs_words(self) -> bool:
        """True for a finding made from a photo whose words are still to be typed."""
        return self.text == QUICK_TEXT

    @property
    def label(self) -> str:
        """What a screen reader says: ``"high, open, corrosion, web at 4 ft: ..."``."""
        where = f", {self.where}" if self.where else ""
        return f"{self.severity_word}, {self.status_word}, {self.category}{where}: {self.text}"


@dataclass
class Draft:
    """The typed values of the finding form (kept as typed: nothing is lost on an error)."""
    text: str = ""
    category: str = ""
    severity: str = ""
    face: str = ""
    height: str = ""


@dataclass(frozen=True)
class Saved:
    """What a save did: the finding's id, whether it was new, and its fields before."""
    finding_id: str
    new: bool
    before: dict[str, Any] = field(default_factory=dict)


def _when(stamp: str | None) -> str:
    return (stamp.replace("T", " ")[:16] + " UTC") if stamp else ""


def where_words(face: str | None, height: str | None, system: str) -> str:
    """Where on the column, in words: ``"web at 4'-0\\""``, ``"all faces"``, ``""``.

    Args:
        face: a key of ``FACE_WORDS`` or None.
        height: the height as typed, or None.
        system: the site's unit system (``us`` / ``si``).

    Returns:
        The words, with the height in the site's units.

    Example:
        >>> where_words("web", "1200 mm", "si")
        'web at 1200 mm from the bottom'
    """
    from fieldcol.units import format_length, parse_length

    parts = [FACE_WORDS.get(face or "", face or "")] if face else []
    if height:
        try:
            shown = format_length(parse_length(height, "height", allow_zero=True), system)
        except InputError:
            shown = height
        parts.append(f"at {shown} from the bottom")
    return " ".join(parts)


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
    system = store.get_site(col.site_id).unit_system
    found = store.list_findings(col.site_id, column_id=column_id)
    found.sort(key=lambda f: f.created_at, reverse=True)
    found.sort(key=lambda f: f.status != "open")  # stable: open first, newest first in each
    out = []
    for f in found:
        sev_word, sev_icon = SEVERITY_WORDS.get(f.severity, (f.severity, "info_outline"))
        st_word, st_icon = STATUS_WORDS.get(f.status, (f.status, "radio_button_unchecked"))
        out.append(FindingLine(
            id=f.id, text=f.text, category=f.category, severity=f.severity,
            severity_word=sev_word, severity_icon=sev_icon, status=f.status,
            status_word=st_word, status_icon=st_icon, date=_when(f.created_at),
            face=f.face or "", height=f.height or "",
            where=where_words(f.face, f.height, system),
            photos=thumbs(store, store.photos_of(finding_id=f.id))))
    return out


def draft_of(line: FindingLine) -> Draft:
    """The form's values for editing a finding (a placeholder text comes back empty).

    Example: ``draft_of(lines[0]).severity``.
    """
    return Draft(text="" if line.needs_words else line.text, category=line.category,
                 severity=line.severity, face=line.face, height=line.height)


def plain(e: InputError) -> str:
    """An error in plain words for the line under a field: the reason, then the hint.

    Example:
        >>> plain(InputError("height", "4 fz", "not a length", "e.g. 4 ft or 1.2 m"))
        'not a length: e.g. 4 ft or 1.2 m'
    """
    return e.reason + (f": {e.hint}" if e.hint else "")


_WORDS = {"text": "Say what was found, e.g. web pitted 3 mm deep",
          "category": "Give a category, e.g. corrosion, bow, damage",
          "severity": "Pick a severity"}


def check_draft(store: "Store", column_id: str, draft: Draft) -> dict[str, str]:
    """Every problem of the form at once, in plain words by field (empty when it can be saved).

    Args:
        store: an open store.
        column_id: the column.
        draft: the typed values.

    Returns:
        ``{field: words}``, e.g. ``{"height": "above the top of the column: ..."}``.

    Example: ``check_draft(store, cid, Draft())["text"]`` asks for the words.
    """
    errors = {k: words for k, words in _WORDS.items()
              if not str(getattr(draft, k) or "").strip()}
    if draft.severity and draft.severity not in SEVERITIES:
        errors["severity"] = "Pick one of: " + ", ".join(SEVERITIES)
    if draft.face and draft.face not in FACES:
        errors["face"] = "Pick one of the faces"
    if draft.height.strip():
        try:
            store.check_height(column_id, draft.height)
        except InputError as e:
            errors["height"] = plain(e)
    return errors


def save_finding(store: "Store", column_id: str, draft: Draft,
                 finding_id: str | None = None) -> Saved:
    """Save the form: a new finding on the column, or the changes to ``finding_id``.

    Args:
        store: an open store.
        column_id: the column.
        draft: the typed values (checked again by the store, which stays the authority).
        finding_id: the finding edited, or None for a new one.

    Returns:
        A ``Saved`` for undo. Raises ``InputError`` naming the field when refused.

    Example: ``save_finding(store, cid, Draft("Web pitted", "corrosion", "medium"))``.
    """
    fields = dict(text=draft.text, category=draft.category, severity=draft.severity,
                  face=draft.face or None, height=draft.height.strip() or None)
    if finding_id is None:
        col = store.get_column(column_id)
        f = store.add_finding(col.site_id, column_id=column_id, **fields)
        return Saved(f.id, True)
    old = store.get_finding(finding_id)
    if old.column_id != column_id:
        raise InputError("finding", finding_id, "not a finding of this column", None)
    before = {k: getattr(old, k) for k in fields}
    store.update_finding(finding_id, **fields)
    return Saved(finding_id, False, before)


def undo_saved(store: "Store", saved: Saved) -> None:
    """Take back a ``save_finding``: a new finding is tombstoned, an edit is put back.

    Example: ``undo_saved(store, saved)``.
    """
    if saved.new:
        store.delete("findings", saved.finding_id)
    else:
        store.update_finding(saved.finding_id, **saved.before)


def set_status(store: "Store", column_id: str, finding_id: str, status: str) -> str:
    """Close or reopen a finding of this column; gives the status it had (for undo).

    Example: ``set_status(store, cid, fid, "closed")`` gives ``'open'``.
    """
    f = store.get_finding(finding_id)
    if f.column_id != column_id:
        raise InputError("finding", finding_id, "not a finding of this column", None)
    before = f.status
    store.update_finding(finding_id, status=status)
    return before


__all__ = ["FindingLine", "Draft", "Saved", "column_findings", "draft_of", "check_draft",
           "save_finding", "undo_saved", "set_status", "where_words", "plain", "SEVERITIES",
           "SEVERITY_WORDS", "STATUS_WORDS", "FACES", "FACE_WORDS"]
