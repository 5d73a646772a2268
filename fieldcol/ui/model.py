"""View-models of the field app: plain dataclasses, ready to render, built from a store.

Nothing here imports Flet: every function takes an open ``Store`` (and ids or typed text) and
returns records whose texts already carry their units in the site's unit system. The functions
are synchronous and touch SQLite, so the app calls them through ``asyncio.to_thread``.

Public API::

    site_cards(store) -> list[SiteCard]
    column_page(store, site_id, *, after=None, limit=PAGE, search=None, level=None,
                status=None) -> ColumnPage                      # keyset paging by (tag, id)
    column_detail(store, column_id) -> ColumnDetail
    edit_change(column_id, field, text, *, person=None, visit_id=None) -> (do, undo)
    apply_edit(store, column_id, field, text) -> EditResult
    recheck(store, column_id) -> ColumnDetail
    status_of(utilization, checked, status=None) -> Status
    EDIT_FIELDS, PAGE
"""

from __future__ import annotations

import copy
import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Callable

from fieldcol import CAUTION
from fieldcol.assess import MODE_WORDS
from fieldcol.errors import InputError

if TYPE_CHECKING:
    from fieldcol.store import Store

PAGE = 50  # rows per page of a column list: a phone screen scrolls a page without lag

CODE_NAMES = {"aisc360-22": "AISC 360-22", "en1993-1-1": "EN 1993-1-1", "elastic": "elastic"}
SYSTEM_NAMES = {"us": "US units (ft, in, kip, ksi)", "si": "SI units (mm, kN, MPa)"}
# the one table of mode words lives with the engine
MODE_NAMES = MODE_WORDS
AXIS_NAMES = {"strong": "Strong axis", "weak": "Weak axis", "twist": "Twist"}
END_WORDS = {"pinned": "pinned (free to rotate, held in place)",
             "fixed": "fixed (rotation and position held)",
             "free": "free (neither rotation nor position held)",
             "guided": "guided (rotation held, free to sway)"}



@dataclass(frozen=True)
class Status:
    """A check result as number + word + icon (never colour alone).

    ``tone`` (``ok``, ``over``, ``none``) lets a view pick a colour on top of the word.
    """
    word: str
    icon: str
    tone: str
    number: str | None

    @property
    def label(self) -> str:
        """``"0.84 OK"``, ``"1.12 OVER"`` or just the word when there is no number."""
        return f"{self.number} {self.word}" if self.number else self.word


@dataclass(frozen=True)
class SiteCard:
    """One site on the sites screen."""
    id: str
    name: str
    address: str
    code: str
    unit_system: str
    columns: int
    over: int
    not_checked: int

    @property
    def summary(self) -> str:
        """E.g. ``"24 columns, 5 over capacity"``."""
        text = f"{self.columns} column{'s' if self.columns != 1 else ''}, {self.over} over capacity"
        if self.not_checked:
            text += f", {self.not_checked} not checked"
        return text


@dataclass(frozen=True)
class ColumnLine:
    """One row of a site's column list."""
    id: str
    tag: str
    level: str
    grid: str
    section: str
    length: str
    status: Status
    governing: str


@dataclass(frozen=True)
class ColumnPage:
    """The rows of a site's column list shown so far, and what they were picked by.

    ``after`` is the ``(tag, id)`` of the last row (where the next page starts); ``levels``
    the site's level names (for the level filter); ``search``, ``level``, ``status`` the
    filters in force (``None``: all).
    """
    site: SiteCard
    rows: list[ColumnLine]
    limit: int
    has_more: bool
    levels: tuple[str, ...] = ()
    search: str | None = None
    level: str | None = None
    status: str | None = None

    @property
    def after(self) -> tuple[str, str] | None:
        """Where the next page starts: the last row's ``(tag, id)``."""
        return (self.rows[-1].tag, self.rows[-1].id) if self.rows else None

    @property
    def filtered(self) -> bool:
        """Whether a search or a filter narrows the list."""
        return bool(self.search) or self.level is not None or self.status is not None


#: the status filter's choices: key -> words
STATUS_FILTERS = {"over": "Over capacity", "ok": "OK", "not-checked": "Not checked"}


@dataclass(frozen=True)
class Line:
    """A labelled value of the column screen."""
    label: str
    value: str




@dataclass(frozen=True)
class CheckView:
    """The headline of a column's latest saved check, formatted (its modes, warnings and trace
    in the site's words are ``check_model.CheckSummary``'s: one reading of a result)."""
    checked_at: str
    code: str
    status: Status
    design_strength: str
    demand: str
    utilization: str
    governing: str


@dataclass(frozen=True)
class EditField:
    """One entry of the edit area: the value as saved now and what it accepts."""
    name: str
    label: str
    value: str
    hint: str


@dataclass(frozen=True)
class ColumnDetail:
    """Everything the column screen shows."""
    id: str
    tag: str
    site_id: str
    site_name: str
    unit_system: str
    identity: list[Line]
    record: list[Line]
    restraints: list[Line]
    check: CheckView | None
    fields: list[EditField]
    caution: str = CAUTION
    #: an AISC 360-22 column's basis (``lrfd`` or ``asd``: the record's, else its demand's,
    #: else its site's); ``None`` under another code, where LRFD / ASD mean nothing
    basis: str | None = None


@dataclass(frozen=True)
class EditResult:
    """The outcome of one typed entry: saved and re-checked, or refused with the error."""
    field: str
    text: str
    saved: bool
    error: str | None = None
    error_field: str | None = None
    detail: ColumnDetail | None = None


EDIT_FIELDS = {
    "length": ("Length", "clear length, e.g. 12'-6\" or 3.81 m"),
    "section": ("Section", "catalogue name, e.g. W14X90 or HE 300 B"),
    "material": ("Material", "grade, e.g. A992, A36, A7, S355"),
    "demand": ("Axial demand", "factored axial load, e.g. 840 kip or 3700 kN"),
}


def check_words(detail: "ColumnDetail") -> str:
    """What the save bar says of the check after an edit: the status, or why there is none yet
    (the entries still empty, as labelled): "checked again: not checked" said nothing.

    Example: ``check_words(detail)`` gives ``"checked again: 0.84 OK"``, or ``"not checked
    yet: Length is still empty"`` for a column still being entered.
    """
    if detail.check is not None:
        return f"checked again: {detail.check.status.label}"
    empty = still_empty(detail)
    if empty:
        return f"not checked yet: {' and '.join(empty)} {'is' if len(empty) == 1 else 'are'} " \
               "still empty"
    return "not checked yet: the record is not complete"


def still_empty(detail: "ColumnDetail") -> list[str]:
    """The labels of the edit entries a check needs that are still empty (a column without a
    demand is still checked: its strength is shown).

    Example: ``still_empty(detail)`` gives ``["Length"]`` for a copy whose length is not
    measured yet.
    """
    return [f.label for f in detail.fields if f.name != "demand" and not f.value.strip()]


#: the AISC 360-22 bases a column can be checked on (its ``basis`` choice on the screen)
BASES = {"lrfd": "LRFD (phi Pn)", "asd": "ASD (Pn / Omega)"}


# -- formatting ---------------------------------------------------------------------------
def status_of(utilization: float | None, checked: bool, status: str | None = None) -> Status:
    """The status of a column as number, word and icon.

    Args:
        utilization: demand / design strength, or ``None``.
        checked: whether the column has a saved check at all.
        status: the engine's status word when known (``ok``, ``over``, ``no-demand``,
            ``not-covered``).

    Returns:
        A ``Status``; its ``label`` reads ``"0.84 OK"``, ``"1.12 OVER"`` or ``"not checked"``.

    Example:
        >>> status_of(0.843, True).label, status_of(1.12, True).label, status_of(None, False).label
        ('0.84 OK', '1.12 OVER', 'not checked')
    """
    if not checked:
        return Status("not checked", "help_outline", "none", None)
    if status == "not-covered":
        return Status("not covered", "block", "over", None)
    if utilization is None or not math.isfinite(utilization):
        return Status("no demand", "remove_circle_outline", "none", None)
    number = f"{utilization:.2f}"
    if utilization <= 1.0:
        return Status("OK", "check_circle", "ok", number)
    return Status("OVER", "warning", "over", number)


def _length_text(text: Any, system: str, *, reading: bool = False) -> str:
    from fieldcol.units import format_length, format_reading, parse_length

    if text in (None, ""):
        return "not recorded"
    try:
        return (format_reading if reading else format_length)(parse_length(text, "length"),
                                                               system)
    except InputError:
        return str(text)  # shown as typed: the check will name what is wrong with it


def _band_text(loss: dict, system: str) -> str:
    """Where a loss band lies, e.g. ``from the bottom to 6" above it`` or ``1'-0" to 2'-0"
    above the bottom``."""
    from fieldcol.units import parse_length

    to = _length_text(loss.get("to", ""), system)
    try:
        at_bottom = parse_length(loss.get("from", ""), "from", allow_zero=True) == 0
    except InputError:
        at_bottom = False
    if at_bottom:
        return f"from the bottom to {to} above it"
    return f"{_length_text(loss.get('from', ''), system)} to {to} above the bottom"


def _q(d: Any, kind: str, system: str) -> str:
    from fieldcol.units import format_quantity

    if not isinstance(d, dict) or d.get("value") is None:
        return "none"
    return format_quantity(float(d["value"]), kind, system)



def _entry_text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, (str, int, float)):
        return str(value)
    if isinstance(value, dict) and "name" in value:
        return str(value["name"])
    if isinstance(value, dict) and "grade" in value:
        return str(value["grade"])
    return ""


def _describe(value: Any) -> str:
    if isinstance(value, dict):
        return ", ".join(f"{k} {_describe(v)}" for k, v in value.items())
    if isinstance(value, list):
        return "; ".join(_describe(v) for v in value)
    return str(value)


# -- sites and columns ----------------------------------------------------------------------
def _card(site: Any, counts: dict[str, int]) -> SiteCard:
    return SiteCard(
        id=site.id, name=site.name, address=site.address or "",
        code=CODE_NAMES.get(site.code, site.code),
        unit_system=SYSTEM_NAMES.get(site.unit_system, site.unit_system),
        columns=counts["columns"], over=counts["over"], not_checked=counts["not_checked"])


def site_card(store: "Store", site_id: str) -> SiteCard:
    """One site's card: its column count and how many columns are over capacity.

    Example: ``site_card(store, site.id).summary`` gives ``'24 columns, 5 over capacity'`` for
    the demo site.
    """
    return _card(store.get_site(site_id), store.site_counts(site_id))


def site_cards(store: "Store") -> list[SiteCard]:
    """Every live site with its column count and how many columns are over capacity.

    Args:
        store: an open store.

    Returns:
        One ``SiteCard`` per site, by name.

    Example: ``[c.summary for c in site_cards(store)]`` gives ``['24 columns, 5 over capacity']``
    for the demo store.
    """
    return [_card(s, store.site_counts(s.id)) for s in store.list_sites()]


def column_page(store: "Store", site_id: str, *, after: tuple[str, str] | None = None,
                limit: int = PAGE, search: str | None = None, level: str | None = None,
                status: str | None = None) -> ColumnPage:
    """One page of a site's columns, by tag, each with its latest check as number + word.

    Args:
        store: an open store.
        site_id: the site.
        after: the ``(tag, id)`` of the last row already shown (``ColumnPage.after``), or
            ``None`` for the first page.
        limit: rows in the page (1..1000).
        search: part of a tag, any case. level: a level name (``""``: no level).
        status: ``over``, ``ok`` or ``not-checked`` (``STATUS_FILTERS``); ``None`` for all.

    Returns:
        A ``ColumnPage`` (``has_more`` when a later page exists).

    Example: ``column_page(store, site.id).rows[0].status.label`` gives ``'0.37 OK'`` for the
    demo's first column; ``column_page(store, site.id, status="over")`` only the five over.
    """
    site = store.get_site(site_id)
    if status is not None and status not in STATUS_FILTERS:
        raise InputError("status", status, "not a status to filter by", "use over, ok or "
                         "not-checked")
    rows = store.page_columns(site_id, after=after, limit=min(limit + 1, 1000), search=search,
                              level=level, status=status)
    more = len(rows) > limit
    rows = rows[:limit]
    lines = [ColumnLine(
        id=r.id, tag=r.tag, level=r.level or "", grid=r.grid or "",
        section=r.section or "no section",
        length=_length_text(r.length, site.unit_system),
        status=status_of(r.utilization, r.checked_at is not None),
        governing=MODE_NAMES.get(r.governing_mode or "", r.governing_mode or ""))
        for r in rows]
    levels = tuple(lv.name for lv in store.list_levels(site_id))
    return ColumnPage(site=_card(site, store.site_counts(site_id)), rows=lines, limit=limit,
                      has_more=more, levels=levels, search=search or None, level=level,
                      status=status)


def next_page(store: "Store", page: ColumnPage, *, limit: int = PAGE) -> ColumnPage:
    """The list with its next page added (same filters), for "Show more".

    Args:
        store: an open store.
        page: the list shown so far.
        limit: rows to add.

    Returns:
        A ``ColumnPage`` holding the rows so far and the next ones.

    Example: ``page = next_page(store, page)``.
    """
    nxt = column_page(store, page.site.id, after=page.after, limit=limit, search=page.search,
                      level=page.level, status=page.status)
    return ColumnPage(site=nxt.site, rows=page.rows + nxt.rows, limit=page.limit,
                      has_more=nxt.has_more, levels=nxt.levels, search=page.search,
                      level=page.level, status=page.status)


def same_page_again(store: "Store", page: ColumnPage) -> ColumnPage:
    """The rows shown so far read again (a check may have changed), as many as before, so the
    list can come back where it was scrolled to.

    Example: ``page = same_page_again(store, page)``.
    """
    fresh = column_page(store, page.site.id, limit=min(1000, max(PAGE, len(page.rows))),
                        search=page.search, level=page.level, status=page.status)
    return ColumnPage(site=fresh.site, rows=fresh.rows, limit=page.limit,
                      has_more=fresh.has_more, levels=fresh.levels, search=page.search,
                      level=page.level, status=page.status)


# -- one column --------------------------------------------------------------------------
def _spring_words(spec: Any, system: str) -> str:
    """A spring end in words, its stiffnesses by the one display rule (``format_entry``)."""
    from fieldcol.units import format_entry

    if not isinstance(spec, dict):
        return _describe(spec)
    kinds = {"rotation": "rotational_stiffness", "translation": "stiffness"}
    return ", ".join(f"{k} {format_entry(v, kinds[k], system)}" if k in kinds
                     else f"{k} {_describe(v)}" for k, v in spec.items())


def _restraint_lines(rec: dict[str, Any], system: str) -> list[Line]:
    from fieldcol.units import format_entry

    out = []
    restraints = rec.get("restraints") if isinstance(rec.get("restraints"), dict) else {}
    for axis in ("strong", "weak", "twist"):
        spec = restraints.get(axis) or {}
        if not isinstance(spec, dict):
            continue
        parts = []
        for end in ("bottom", "top"):
            if end in spec:
                e = spec[end]
                parts.append(f"{end}: " + (END_WORDS.get(e, str(e)) if isinstance(e, str)
                                            else "spring " + _spring_words(e, system)))
        if axis == "twist" and not parts:
            parts.append("held at both ends")
        if "k" in spec:
            parts.append(f"K set to {spec['k']}")
        for b in spec.get("braces") or []:
            if not isinstance(b, dict):
                continue
            text = "brace at " + _length_text(b.get("at"), system)
            if b.get("cable"):
                text = "cable at " + _length_text(b.get("at"), system)
            if b.get("stiffness"):  # as the trace and the brace requirement write it
                text += f", stiffness {format_entry(b['stiffness'], 'stiffness', system)}"
            if b.get("added"):
                text += f" (added: {b['added']})"
            parts.append(text)
        if axis != "twist" or parts:
            out.append(Line(AXIS_NAMES[axis], "; ".join(parts) or "not recorded"))
    return out


def _check_view(chk: Any, system: str) -> CheckView:
    res = chk.result
    util = chk.utilization
    gov = res.get("governing_mode") or chk.governing_mode or ""
    demand = res.get("demand")
    dem_text = _q(demand, "force", system)
    if isinstance(demand, dict) and demand.get("combination") not in (None, "given"):
        dem_text += f" ({demand['combination']})"
    return CheckView(
        checked_at=chk.checked_at.replace("T", " ")[:16] + " UTC",
        code=res.get("edition") or CODE_NAMES.get(chk.code, chk.code),
        status=status_of(util, True, res.get("status")),
        design_strength=_q(res.get("design_strength"), "force", system),
        demand=dem_text,
        utilization="none" if util is None else f"{util:.2f}",
        governing=MODE_NAMES.get(gov, gov))


def column_detail(store: "Store", column_id: str) -> ColumnDetail:
    """The column screen: identity, the record in words, the latest check, the edit entries.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        A ``ColumnDetail``; values carry units in the site's unit system.

    Example: ``column_detail(store, col.id).check.status.label`` gives ``'1.11 OVER'`` for
    the demo's C/3-G.
    """
    col = store.get_column(column_id)
    site = store.get_site(col.site_id)
    system = site.unit_system
    rec = store.current_record(column_id)
    level = next((lv.name for lv in store.list_levels(site.id) if lv.id == col.level_id), "")
    identity = [Line("Tag", col.tag), Line("Site", site.name), Line("Level", level or "none"),
                Line("Grid", col.grid or "none"), Line("Location", col.location or "none")]
    from fieldcol.store import section_label

    demand = rec.get("demand") if isinstance(rec.get("demand"), dict) else {}
    axial = demand.get("axial")
    demand_text = "none"
    if axial not in (None, ""):
        code = str(rec.get("code") or site.code)
        # LRFD / ASD are AISC's bases: an EN site's demand is a design value, said without one
        basis = "" if code.startswith("en") else \
            f" ({str(demand.get('basis', 'lrfd')).upper()})"
        demand_text = f"{_demand_text(axial, system)}{basis}"
    elif demand.get("loads"):
        demand_text = "loads: " + _describe(demand["loads"])
    record = [Line("Section", section_label(rec.get("section")) or "none"),
              Line("Material", _entry_text(rec.get("material")) or _describe(rec.get("material"))),
              Line("Length", _length_text(rec.get("length"), system)),
              Line("Axial demand", demand_text),
              Line("Code", CODE_NAMES.get(rec.get("code") or site.code, str(rec.get("code"))))]
    from fieldcol.ui.loads_model import load_lines

    record += [Line("Loads", x) for x in load_lines(demand, system)]
    cond = rec.get("condition")
    if isinstance(cond, dict) and cond:
        parts = []
        # a reading as its warning and the report write it (units.format_reading)
        if cond.get("bow") not in (None, ""):
            parts.append(f"bow {_length_text(cond['bow'], system, reading=True)}"
                         + (f" about the {cond['bow_axis']} axis" if cond.get("bow_axis") else ""))
        if cond.get("plumb") not in (None, ""):
            parts.append(f"out of plumb {_length_text(cond['plumb'], system, reading=True)}")
        if parts:
            record.append(Line("Condition", ", ".join(parts)))
    record += loss_lines(rec.get("section"), system)
    chk = store.latest_check(column_id)
    fields = [EditField(name, label, _entry_text(rec.get(name) if name != "demand" else axial),
                        hint) for name, (label, hint) in EDIT_FIELDS.items()]
    basis = None
    if str(rec.get("code") or site.code) == "aisc360-22":
        basis = str(rec.get("basis") or demand.get("basis") or "lrfd")
        if basis == "asd":  # ASD compares the service load with Pn / Omega
            fields = [EditField(f.name, f.label, f.value, "service (ASD) axial load, e.g. "
                                "600 kip") if f.name == "demand" else f for f in fields]
    return ColumnDetail(
        id=col.id, tag=col.tag, site_id=site.id, site_name=site.name, unit_system=system,
        identity=identity, record=record, restraints=_restraint_lines(rec, system),
        check=None if chk is None else _check_view(chk, system), fields=fields, basis=basis)


_ELEMENT_WORDS = {"flange": "flange", "web": "web", "wall": "wall"}


def loss_lines(section: Any, system: str) -> list[Line]:
    """A section's recorded loss and cover plates in words that say what each value is.

    ``loss.flange`` / ``web`` / ``wall`` hold the REMAINING thickness measured; ``loss.uniform``
    holds the loss per exposed face: they are never shown under one label.

    Args:
        section: the record's ``section`` (a name or an object).
        system: ``us`` or ``si``.

    Returns:
        ``Line`` s, none when nothing is recorded.

    Example:
        >>> [(x.label, x.value) for x in loss_lines({"name": "HP10X42",
        ...     "loss": {"flange": "0.33 in"}}, "us")]
        [('Remaining thickness measured', 'flange 0.33 in')]
    """
    if not isinstance(section, dict):
        return []
    out = []
    loss = section.get("loss") if isinstance(section.get("loss"), dict) else {}
    remaining = [f"{_ELEMENT_WORDS[k]} {_thickness_text(x, system)}" for k, x in loss.items()
                 if k in _ELEMENT_WORDS]
    if remaining:
        out.append(Line("Remaining thickness measured", ", ".join(remaining)))
    if loss.get("uniform") not in (None, ""):
        out.append(Line("Loss per exposed face", _thickness_text(loss["uniform"], system)))
    if loss.get("from") not in (None, "") or loss.get("to") not in (None, ""):
        out.append(Line("Over a band of height", _band_text(loss, system)))
    holes = loss.get("holes") if isinstance(loss.get("holes"), dict) else {}
    if any(x not in (None, "") for x in holes.values()):
        out.append(Line("Holes in the band (width lost)", ", ".join(
            f"{k} {_thickness_text(x, system)}" for k, x in holes.items() if x not in (None, ""))))
    plates = section.get("plates")
    if isinstance(plates, dict):
        width = plates.get("width")
        out.append(Line("Cover plates, both flanges",
                        f"{_thickness_text(plates.get('thickness'), system)} thick, "
                        + (f"{_thickness_text(width, system)} wide" if width not in (None, "")
                           else "as wide as the flange")
                        + (f", {plates['connection']} at {plates.get('pitch', '')} pitch"
                           if plates.get("connection") not in (None, "", "welded")
                           else ", welded")))
    return out


def _thickness_text(text: Any, system: str) -> str:
    """A thickness as decimal inches (as a gauge shows it) or mm; as typed if unreadable."""
    from fieldcol.units import format_quantity, parse_length

    try:
        mm = parse_length(text, "thickness", allow_zero=True)
    except InputError:
        return str(text)
    if system == "us":
        return f"{mm / 25.4 + 1e-9:.3f}".rstrip("0").rstrip(".") + " in"
    return format_quantity(mm, "length", system)


def _demand_text(axial: Any, system: str) -> str:
    from fieldcol.units import format_quantity, parse_quantity

    try:
        return format_quantity(parse_quantity(axial, "force", "demand.axial"), "force", system)
    except InputError:
        return str(axial)


# -- edits -------------------------------------------------------------------------------
def _candidate(store: "Store", column_id: str, name: str, text: str) -> tuple[dict, dict]:
    """The stored record changed by one entry, and the record the engine would then read."""
    from fieldcol.record import parse_material, parse_section
    from fieldcol.units import parse_length, parse_quantity

    stored = copy.deepcopy(store.get_column(column_id).record)
    current = store.current_record(column_id)
    if name == "length":
        parse_length(text, "length")
        current["length"] = text  # saved as a measurement: the stored record keeps its value
    elif name == "section":
        parse_section(text, "section")
        for rec in (stored, current):
            old = rec.get("section")
            # a recorded loss or plates stay with the member when its name is corrected
            rec["section"] = {**old, "name": text} if isinstance(old, dict) and "name" in old \
                else text
    elif name == "material":
        parse_material(text, "material")
        for rec in (stored, current):
            old = rec.get("material")
            rec["material"] = {**old, "grade": text} if isinstance(old, dict) and "grade" in old \
                else text
    elif name == "demand":
        parse_quantity(text, "force", "demand.axial")
        for rec in (stored, current):
            old = rec.get("demand") if isinstance(rec.get("demand"), dict) else {}
            rec["demand"] = {**{k: v for k, v in old.items() if k not in ("loads", "psi0")},
                             "axial": text}  # psi0 combines loads: it goes with them
    elif name == "basis":
        if text not in BASES:
            raise InputError("basis", text, "expected lrfd or asd", "lrfd, asd")
        for rec in (stored, current):
            rec["basis"] = text
            # the demand's own basis must agree with the record's: both follow the choice
            if isinstance(rec.get("demand"), dict) and rec["demand"]:
                rec["demand"] = {**rec["demand"], "basis": text}
    else:
        raise InputError("field", name, "not an entry of the column screen",
                         ", ".join([*EDIT_FIELDS, "basis"]))
    return stored, current


def _entry_word(name: str) -> str:
    return EDIT_FIELDS[name][0].lower() if name in EDIT_FIELDS else name


def edit_change(column_id: str, name: str, text: str, *, person: str | None = None,
                visit_id: str | None = None) -> tuple[Callable[["Store"], ColumnDetail],
                                                      Callable[["Store"], None]]:
    """One typed entry of the column screen as a change and its undo, for ``Saver.save``.

    ``do(store)`` reads the entry as typed (units accepted), checks the whole column with it
    before anything is saved (a bad entry raises ``InputError`` and saves nothing; when the
    clash lies deeper, e.g. a brace beyond a new length, the reason names the entry), then
    saves it and the new check and returns the refreshed ``ColumnDetail``. A length is kept as
    a new measurement (who took it, on which visit); the others change the record.
    A column still being entered (not checkable before the entry either) takes the entry
    without a check. ``undo(store)`` puts back what ``do`` changed (the measurement tombstoned, or the record
    as it was) and checks the column again.

    Args:
        column_id: the column.
        name: ``length``, ``section``, ``material``, ``demand``, or ``basis`` (an AISC
            column's ``lrfd`` or ``asd``: the record's and its demand's).
        text: the entry as typed, e.g. ``12'-6"``, ``3.81 m``, ``840 kip``, ``asd``.
        person, visit_id: who typed it and on which visit (kept with a measurement).

    Returns:
        ``(do, undo)``.

    Example: ``do, undo = edit_change(col.id, "length", "12 ft"); do(store); undo(store)``.
    """
    from fieldcol.assess import assess

    kept: dict[str, Any] = {}

    def do(store: "Store") -> ColumnDetail:
        typed = text.strip() if isinstance(text, str) else text
        if not isinstance(typed, str):
            raise InputError(name, typed, "expected typed text", None)
        stored, current = _candidate(store, column_id, name, typed)
        try:
            result = assess(current)
        except InputError as e:
            if e.field.startswith(name):
                raise
            try:
                assess(store.current_record(column_id))
            except InputError:
                result = None  # not checkable before either (a column still being entered)
            else:
                # the entry makes a checkable column uncheckable: say which value clashes
                raise InputError(e.field, e.text, f"{e.reason} (with "
                                 f"{_entry_word(name)} {typed})", e.hint) from None
        # the entry and its check in one transaction: saved together (one write to disk,
        # not two), or neither
        with store.transaction():
            if name == "length":
                kept["measurement"] = store.add_measurement(
                    column_id, "length", typed, kind="length", taken_by=person,
                    visit_id=visit_id, note="typed on the column screen").id
            else:
                kept["record"] = copy.deepcopy(store.get_column(column_id).record)
                store.update_column(column_id, record=stored)
            if result is not None:
                store.save_check(column_id, result.to_dict(),
                                 record=store.current_record(column_id))
        return column_detail(store, column_id)

    def undo(store: "Store") -> None:
        with store.transaction():
            if "measurement" in kept:
                store.delete("measurements", kept["measurement"])
            elif "record" in kept:
                store.update_column(column_id, record=kept["record"])
            rec = store.current_record(column_id)
            try:
                store.save_check(column_id, assess(rec).to_dict(), record=rec)
            except InputError:
                pass  # the record as it was could not be checked either: the undo stands

    return do, undo


def apply_edit(store: "Store", column_id: str, name: str, text: str) -> EditResult:
    """Save one typed entry of the column screen and check the column again.

    The same change as ``edit_change`` (run at once), its outcome as a record.

    Args:
        store: an open store.
        column_id: the column.
        name: ``length``, ``section``, ``material``, ``demand``, or ``basis`` (an AISC
            column's ``lrfd`` or ``asd``: the record's and its demand's).
        text: the entry as typed, e.g. ``12'-6"``, ``3.81 m``, ``840 kip``, ``asd``.

    Returns:
        An ``EditResult``: ``saved`` with the refreshed ``detail``, or the ``error`` text
        (its ``error_field`` names the field, which may lie deeper).

    Example: ``apply_edit(store, col.id, "length", "12 fr").error`` gives
    ``"length: cannot use '12 fr': unknown length unit 'fr' (...)"`` and saves nothing.
    """
    do, _undo = edit_change(column_id, name, text)
    try:
        detail = do(store)
    except InputError as e:
        return EditResult(name, str(text), False, str(e), e.field)
    return EditResult(name, text.strip(), True, detail=detail)


def recheck(store: "Store", column_id: str) -> ColumnDetail:
    """Check the column's current record again, save the check and return the refreshed screen.

    Args:
        store: an open store.
        column_id: the column.

    Returns:
        The ``ColumnDetail`` with the new check; an ``InputError`` from the record is raised.

    Example: ``recheck(store, col.id).check.status.word`` gives ``'OVER'`` for the demo's C/3-G.
    """
    from fieldcol.assess import assess

    rec = store.current_record(column_id)
    store.save_check(column_id, assess(rec).to_dict(), record=rec)
    return column_detail(store, column_id)
