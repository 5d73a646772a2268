"""View-models and changes for sites, new columns, duplicates, deletions and who is recording.

No Flet here. Each ``*_change`` function returns ``(do, undo)`` for ``Saver.save``: ``do(store)``
raises ``InputError`` naming the field for a bad entry and saves nothing; ``undo(store)`` takes
the change back (a tombstone for something new, the old values for an edit).

Public API::

    CODE_CHOICES, SYSTEM_CHOICES
    site_values(store, site_id=None) -> dict[str, str]
    site_change(site_id, values) -> (do -> site id, undo)
    next_tag(store, site_id, tag) -> str
    add_column_change(site_id, values) -> (do -> column id, undo)
    duplicate_change(column_id) -> (do -> column id, undo)
    delete_change(column_id) -> (do -> site id, undo)
    who_change(name, initials, device) -> (do, undo)
"""

from __future__ import annotations

import copy
import re
from typing import TYPE_CHECKING, Any, Callable

from fieldcol.errors import InputError

if TYPE_CHECKING:
    from fieldcol.store import Store

Change = tuple[Callable[["Store"], Any], Callable[["Store"], None]]

#: the code and basis choices of a site: (value, words)
CODE_CHOICES = [("aisc360-22/lrfd", "AISC 360-22 LRFD"), ("aisc360-22/asd", "AISC 360-22 ASD"),
                ("en1993-1-1/", "EN 1993-1-1")]
SYSTEM_CHOICES = [("us", "US (ft, in, kip)"), ("si", "SI (mm, kN)")]
_BLANK = {"name": "", "address": "", "owner_ref": "", "code": "aisc360-22/lrfd",
          "gamma_m1": "1.0", "unit_system": "us", "material": "A992"}


def site_values(store: "Store", site_id: str | None = None) -> dict[str, str]:
    """A site's fields as the form shows them (a new site's defaults when ``site_id`` is None).

    Args:
        store: an open store.
        site_id: the site, or None for a new one.

    Returns:
        ``name, address, owner_ref, code ("<code>/<basis>"), gamma_m1, unit_system, material``.

    Example: ``site_values(store)["code"]`` gives ``'aisc360-22/lrfd'``.
    """
    if site_id is None:
        return dict(_BLANK)
    s = store.get_site(site_id)
    basis = "" if s.code == "en1993-1-1" else (s.basis or "lrfd")
    return {"name": s.name, "address": s.address or "", "owner_ref": s.owner_ref or "",
            "code": f"{s.code}/{basis}", "gamma_m1": "" if s.gamma_m1 is None else f"{s.gamma_m1:g}",
            "unit_system": s.unit_system, "material": s.material or ""}


def _fields(values: dict[str, str]) -> dict[str, Any]:
    code, _, basis = (values.get("code") or "").partition("/")
    en = code == "en1993-1-1"
    return {"name": values.get("name", ""), "address": values.get("address") or None,
            "owner_ref": values.get("owner_ref") or None, "code": code,
            "basis": None if en else (basis or "lrfd"),
            "gamma_m1": (values.get("gamma_m1") or "1.0") if en else None,
            "unit_system": values.get("unit_system", ""),
            "material": values.get("material") or None}


def site_change(site_id: str | None, values: dict[str, str]) -> Change:
    """Create a site (``site_id`` None) or change one, from the form's values.

    Code, basis, gamma_M1 and material are the defaults for columns added from then on.

    Args:
        site_id: the site edited, or None for a new one.
        values: as ``site_values`` gives them.

    Returns:
        ``(do, undo)``; ``do`` returns the site's id.

    Example: ``do, undo = site_change(None, {**site_values(store), "name": "Annex"})``.
    """
    kept: dict[str, Any] = {}

    def do(store: "Store") -> str:
        fields = _fields(values)
        if site_id is None:
            # one transaction: a default refused by update_site (gamma_M1, material) must not
            # leave the new site half made
            with store.transaction():
                site = store.add_site(fields.pop("name"), code=fields.pop("code"),
                                      unit_system=fields.pop("unit_system"),
                                      address=fields.pop("address"),
                                      owner_ref=fields.pop("owner_ref"))
                store.update_site(site.id, **fields)
            kept["new"] = site.id
            return site.id
        old = store.get_site(site_id)
        kept["old"] = {k: getattr(old, k) for k in fields}
        store.update_site(site_id, **fields)
        return site_id

    def undo(store: "Store") -> None:
        if "new" in kept:
            store.delete("sites", kept["new"])
        elif site_id is not None and "old" in kept:
            store.update_site(site_id, **kept["old"])

    return do, undo


def next_tag(store: "Store", site_id: str, tag: str) -> str:
    """The tag a column after ``tag`` most likely has: its last number plus one, the first free.

    Args:
        store: an open store.
        site_id: the site.
        tag: the tag before.

    Returns:
        A tag not used by a live column of the site.

    Example: ``next_tag(store, site.id, "B/3-G")`` gives ``'B/4-G'`` when B/4-G is free.
    """
    numbers = list(re.finditer(r"\d+", tag))
    for step in range(1, 1000):
        if numbers:
            last = numbers[-1]
            width = len(last.group())
            cand = tag[:last.start()] + str(int(last.group()) + step).zfill(width) \
                + tag[last.end():]
        else:
            cand = f"{tag}-{step + 1}"
        if store.find_column(site_id, cand) is None:
            return cand
    return f"{tag} copy"


def _new_record(store: "Store", site_id: str, tag: str) -> dict[str, Any]:
    site = store.get_site(site_id)
    rec: dict[str, Any] = {"tag": tag, "code": site.code}
    if site.material:
        rec["material"] = site.material
    if site.code == "en1993-1-1" and site.gamma_m1 is not None:
        rec["gamma_M1"] = site.gamma_m1
    return rec


def add_column_change(site_id: str, values: dict[str, str]) -> Change:
    """Add a column from the form: tag (required), level, grid, location note.

    The record takes the site's code, material and gamma_M1.

    Args:
        site_id: the site.
        values: ``tag, level, grid, location`` as typed.

    Returns:
        ``(do, undo)``; ``do`` returns the new column's id, ``undo`` tombstones it.

    Example: ``do, undo = add_column_change(site.id, {"tag": "D/5-G", "level": "Ground"})``.
    """
    kept: dict[str, str] = {}

    def do(store: "Store") -> str:
        tag = (values.get("tag") or "").strip()
        if not tag:
            raise InputError("tag", "", "this is required", None)
        col = store.add_column(site_id, _new_record(store, site_id, tag),
                               level=values.get("level") or None, grid=values.get("grid") or None,
                               location=values.get("location") or None)
        kept["id"] = col.id
        return col.id

    def undo(store: "Store") -> None:
        if "id" in kept:
            store.delete("columns", kept["id"])

    return do, undo


def duplicate_change(column_id: str) -> Change:
    """A new column like this one, with the next free tag: section (without its loss), length,
    restraints, material, code; not its demand, readings, findings, photos or checks.

    Args:
        column_id: the column copied.

    Returns:
        ``(do, undo)``; ``do`` returns the new column's id, ``undo`` tombstones it.

    Example: ``do, undo = duplicate_change(col.id); new_id = do(store)``.
    """
    kept: dict[str, str] = {}

    def do(store: "Store") -> str:
        col = store.get_column(column_id)
        current = store.current_record(column_id)
        tag = next_tag(store, col.site_id, col.tag)
        rec = _new_record(store, col.site_id, tag)
        for key in ("section", "length", "restraints", "material", "code", "gamma_M1",
                    "k_basis", "units"):
            if key in current:
                rec[key] = copy.deepcopy(current[key])
        if isinstance(rec.get("section"), dict):
            rec["section"].pop("loss", None)  # a loss is a reading of that column only
        level = next((lv.name for lv in store.list_levels(col.site_id) if lv.id == col.level_id),
                     None)
        new = store.add_column(col.site_id, rec, level=level, grid=None,
                               location=None)
        kept["id"] = new.id
        return new.id

    def undo(store: "Store") -> None:
        if "id" in kept:
            store.delete("columns", kept["id"])

    return do, undo


def delete_change(column_id: str) -> Change:
    """Delete a column (a tombstone: it stays in the file) and bring it back on undo.

    Args:
        column_id: the column.

    Returns:
        ``(do, undo)``; ``do`` returns the column's site id.

    Example: ``do, undo = delete_change(col.id); do(store); undo(store)``.
    """
    def do(store: "Store") -> str:
        site_id = store.get_column(column_id).site_id
        store.delete("columns", column_id)
        return site_id

    def undo(store: "Store") -> None:
        store.undelete("columns", column_id)

    return do, undo


def who_change(name: str, initials: str, device: str) -> Change:
    """Set who records on this device; undo puts back who was set before (if anyone).

    Example: ``do, undo = who_change("R. Amadi", "RA", "site tablet 2")``.
    """
    kept: dict[str, Any] = {}

    def do(store: "Store") -> Any:
        kept["old"] = store.who()
        return store.set_who(name, initials, device)

    def undo(store: "Store") -> None:
        old = kept.get("old")
        if old is not None:
            store.set_who(old.name, old.initials, old.device)

    return do, undo


def visit_change(site_id: str, values: dict[str, str]) -> Change:
    """Start a visit to a site (date, people, weather, access); while it is open, what is
    recorded on the site belongs to it. Undo deletes the visit (tombstone) and closes it.

    Args:
        site_id: the site.
        values: ``date`` (YYYY-MM-DD), ``people``, ``weather``, ``access`` as typed.

    Example: ``do, undo = visit_change(sid, {"date": "2026-12-04", "people": "R. Amadi"})``.
    """
    kept: dict[str, Any] = {}

    def do(store: "Store") -> Any:
        visit = store.start_visit(site_id, (values.get("date") or "").strip(),
                                  people=values.get("people", "").strip() or None,
                                  weather=values.get("weather", "").strip() or None,
                                  access=values.get("access", "").strip() or None)
        kept["id"] = visit.id
        return visit

    def undo(store: "Store") -> None:
        with store.transaction():
            store.end_visit()
            store.delete("visits", kept["id"])

    return do, undo


def end_visit_change(visit_id: str) -> Change:
    """End the open visit; undo opens it again.

    Example: ``do, undo = end_visit_change(visit.id)``.
    """
    def do(store: "Store") -> Any:
        store.end_visit()
        return visit_id

    def undo(store: "Store") -> None:
        store.reopen_visit(visit_id)

    return do, undo
