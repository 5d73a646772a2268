"""Read everything a site report shows from the store, once, before any page is drawn."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Sequence

from fieldcol.errors import InputError
from fieldcol.report._text import SEVERITY_ORDER

if TYPE_CHECKING:
    from fieldcol.store import (
        Check, Column, Finding, Measurement, Photo, RestraintChange, Retrofit, Site, Store,
    Visit,
    )


@dataclass
class ColumnData:
    """One column with its current record, latest check and history."""
    column: "Column"
    level: str | None
    record: dict[str, Any]
    check: "Check | None"
    measurements: list["Measurement"]
    counting: set[str]
    restraint_changes: list["RestraintChange"]
    restraint_photos: dict[str, list["Photo"]]
    photos: list["Photo"]
    findings: list["Finding"] = field(default_factory=list)
    retrofits: list["Retrofit"] = field(default_factory=list)
    #: each change of its checked result, newest first (``ui.notes.result_history``)
    results: list[Any] = field(default_factory=list)

    @property
    def utilization(self) -> float | None:
        """The latest check's utilization (None when unchecked or no demand)."""
        return None if self.check is None else self.check.utilization

    @property
    def status(self) -> str | None:
        """The engine's status word of the latest check, if any."""
        return None if self.check is None else self.check.result.get("status")


@dataclass
class SiteData:
    """The site, the columns reported (in tag order) and its findings with their photos."""
    site: "Site"
    columns: list[ColumnData]
    findings: list["Finding"]
    finding_photos: dict[str, list["Photo"]]
    finding_refs: dict[str, str]
    tags_by_id: dict[str, str]
    site_columns: int
    subset: bool
    visits: list["Visit"] = field(default_factory=list)
    #: every photo once, in the order of the photo grid: (number, photo, what it shows, where)
    photos: list[tuple[str, "Photo", str, str]] = field(default_factory=list)
    photo_refs: dict[str, str] = field(default_factory=dict)

    def refs_of(self, photos: Sequence["Photo"]) -> str:
        """The grid numbers of ``photos`` as text, e.g. ``"P1, P4"`` (``""`` when none)."""
        return ", ".join(self.photo_refs[p.id] for p in photos if p.id in self.photo_refs)


def gather(store: "Store", site_id: str, columns: Sequence[str] | None) -> SiteData:
    """Everything the report needs: the site, its (chosen) columns, findings and photos.

    Args:
        store: an open store.
        site_id: the site's id.
        columns: tags to report (in this order), or None for every live column by tag.

    Returns:
        A ``SiteData``.

    Example: ``gather(store, site.id, ["C/3-G"]).columns[0].column.tag`` gives ``'C/3-G'``.
    """
    from fieldcol.store import latest_readings
    from fieldcol.ui.notes import result_history  # plain data: no Flet

    site = store.get_site(site_id)
    if site.deleted_at is not None:
        raise InputError("site", site.name, "this site was deleted", "choose a live site")
    rows = []
    while True:
        page = store.list_columns(site_id, limit=1000, offset=len(rows))
        rows += page
        if len(page) < 1000:
            break
    by_tag = {r.tag: r for r in rows}
    if columns is None:
        chosen = [r.tag for r in rows]
    else:
        if isinstance(columns, str):
            raise InputError("columns", columns, "expected a list of column tags",
                             'e.g. ["C/3-G", "D/2-G"]')
        chosen = []
        for tag in columns:
            if tag not in by_tag:
                known = ", ".join(sorted(by_tag)[:10])
                raise InputError("columns", str(tag), "no column with this tag on the site",
                                 ("known: " + known) if known else "the site has no columns")
            if tag in chosen:
                raise InputError("columns", str(tag), "this tag is listed twice",
                                 "name each column once")
            chosen.append(tag)
    levels = {lv.id: lv.name for lv in store.list_levels(site_id)}
    findings = store.list_findings(site_id)
    out = []
    for tag in chosen:
        col = store.get_column(by_tag[tag].id)
        ms = store.measurements(col.id)
        rcs = store.restraint_changes(col.id)
        out.append(ColumnData(
            column=col, level=levels.get(col.level_id or ""),
            record=store.current_record(col.id), check=store.latest_check(col.id),
            measurements=ms, counting={m.id for m in latest_readings(ms).values()},
            restraint_changes=rcs,
            restraint_photos={rc.id: store.photos_of(restraint_change_id=rc.id) for rc in rcs},
            photos=store.photos_of(column_id=col.id),
            findings=[f for f in findings if f.column_id == col.id],
            retrofits=store.retrofits(col.id),
            results=result_history(store, col.id, site.unit_system)))
    wanted = {c.column.id for c in out}
    # site-wide findings (no column) always belong in the report; a column's only with it
    shown = [f for f in findings if f.column_id is None or f.column_id in wanted]
    # open before closed, most severe first: the order they are printed and numbered in
    shown.sort(key=lambda f: (f.status != "open", SEVERITY_ORDER.index(f.severity)
                              if f.severity in SEVERITY_ORDER else len(SEVERITY_ORDER)))
    data = SiteData(
        site=site, columns=out, findings=shown,
        finding_photos={f.id: store.photos_of(finding_id=f.id) for f in shown},
        finding_refs={f.id: f"F{i + 1}" for i, f in enumerate(shown)},
        tags_by_id={r.id: r.tag for r in rows}, site_columns=len(rows),
        subset=columns is not None, visits=store.list_visits(site_id))
    _number_photos(data)
    return data


def _number_photos(data: SiteData) -> None:
    """Give every photo one number (P1, P2, ...): findings' first, then columns', then those of
    restraint changes; a photo linked twice keeps its first number."""
    def add(p: "Photo", what: str, where: str) -> None:
        if p.id not in data.photo_refs:
            data.photo_refs[p.id] = f"P{len(data.photos) + 1}"
            data.photos.append((data.photo_refs[p.id], p, what, where))

    from fieldcol.store._schema import FACE_WORDS

    for f in data.findings:
        where = ", ".join([f"column {data.tags_by_id.get(f.column_id, '?')}" if f.column_id
                           else "whole site"]
                          + ([FACE_WORDS.get(f.face, f.face)] if f.face else [])
                          + ([f"{f.height} up"] if f.height else []))
        for p in data.finding_photos.get(f.id, []):
            add(p, f"{data.finding_refs[f.id]} {f.category}", where)
    for c in data.columns:
        for p in c.photos:
            add(p, "column", f"column {c.column.tag}")
        for rc in c.restraint_changes:
            for p in c.restraint_photos.get(rc.id, []):
                add(p, f"{rc.date} {rc.kind.replace('_', ' ')}", f"column {c.column.tag}")
