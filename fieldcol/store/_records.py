"""The records the store hands back: one dataclass per table, plus the column listing row.

JSON columns (column records, check results, restraint details) come back decoded.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field, fields
from typing import Any, TypeVar


@dataclass(kw_only=True)
class _Row:
    id: str
    created_at: str = ""
    updated_at: str = ""
    device_id: str = ""
    deleted_at: str | None = None
    created_by: str | None = None


@dataclass(kw_only=True)
class Site(_Row):
    """A building or structure under assessment; ``code`` and ``unit_system`` apply to all its columns."""
    name: str
    code: str
    unit_system: str
    address: str | None = None
    owner_ref: str | None = None
    notes: str | None = None
    basis: str | None = None
    gamma_m1: float | None = None
    material: str | None = None


@dataclass(kw_only=True)
class Visit(_Row):
    """One trip to site: its date (ISO ``YYYY-MM-DD``), who went, weather or access notes."""
    site_id: str
    date: str
    who: str | None = None
    notes: str | None = None
    weather: str | None = None
    access: str | None = None
    ended_at: str | None = None


@dataclass(kw_only=True)
class Level(_Row):
    """A floor or level of a site; ``elevation`` is the text as typed, if any."""
    site_id: str
    name: str
    elevation: str | None = None


@dataclass(kw_only=True)
class Column(_Row):
    """A column and the record the engine reads (as stored; see ``Store.current_record``)."""
    site_id: str
    tag: str
    record: dict[str, Any] = field(default_factory=dict)
    location: str | None = None
    level_id: str | None = None
    grid: str | None = None


@dataclass(kw_only=True)
class Measurement(_Row):
    """One reading as taken: ``text`` as typed, ``value`` in ``unit`` (mm, N, MPa ...)."""
    column_id: str
    quantity: str
    kind: str
    text: str
    value: float
    unit: str
    taken_at: str
    gauge: str | None = None
    taken_by: str | None = None
    visit_id: str | None = None
    corrects: str | None = None
    note: str | None = None


@dataclass(kw_only=True)
class RestraintChange(_Row):
    """A dated change to how a column is held (brace added, cable found, end changed)."""
    column_id: str
    date: str
    kind: str
    description: str
    axis: str | None = None
    seen_by: str | None = None
    detail: dict[str, Any] | None = None
    visit_id: str | None = None


@dataclass(kw_only=True)
class Finding(_Row):
    """Something noted on site about a column or the site as a whole."""
    site_id: str
    text: str
    category: str
    severity: str
    status: str
    column_id: str | None = None
    face: str | None = None
    height: str | None = None
    visit_id: str | None = None


@dataclass(kw_only=True)
class Photo(_Row):
    """A photo stored once by content hash; paths are relative to the store's photo folder."""
    sha256: str
    path: str
    thumb_path: str
    format: str
    width: int
    height: int
    bytes: int
    original_name: str | None = None
    exif_taken_at: str | None = None
    latitude: float | None = None
    longitude: float | None = None
    markup: list[dict[str, Any]] | None = None


@dataclass(kw_only=True)
class PhotoLink(_Row):
    """A photo attached to exactly one finding, column or restraint change."""
    photo_id: str
    finding_id: str | None = None
    column_id: str | None = None
    restraint_change_id: str | None = None
    caption: str | None = None
    visit_id: str | None = None


@dataclass(kw_only=True)
class Check(_Row):
    """A saved assessment: the input record, code and edition, app version and full result."""
    column_id: str
    checked_at: str
    record: dict[str, Any]
    code: str
    app_version: str
    result: dict[str, Any]
    edition: str | None = None
    utilization: float | None = None
    governing_mode: str | None = None
    note: str | None = None


@dataclass(frozen=True)
class CheckOutcome:
    """What a saved check concluded, without its trace: for a column's history of results.
    ``design_strength`` in N; ``status`` the engine's word (``ok``, ``over``, ``no-demand``,
    ``not-covered``)."""
    checked_at: str
    utilization: float | None
    governing_mode: str | None
    status: str | None
    design_strength: float | None
    record: dict[str, Any]
    created_by: str | None


@dataclass(kw_only=True)
class Retrofit(_Row):
    """A retrofit option for a column: what would be done and the record it would give."""
    column_id: str
    description: str
    record: dict[str, Any]
    status: str
    option: dict[str, Any] | None = None


@dataclass(kw_only=True)
class ColumnRow:
    """One line of a column listing: what the engineer scans for on a site."""
    id: str
    tag: str
    site: str
    level: str | None
    grid: str | None
    location: str | None
    section: str | None
    length: str | None
    utilization: float | None
    governing_mode: str | None
    checked_at: str | None

    def to_dict(self) -> dict[str, Any]:
        """The row as a plain dict (the ``--json`` form of ``fieldcol columns``).

        Example:
            >>> row = store.list_columns(site.id)[0]
            >>> row.to_dict()["tag"]
            'B/4-L1'
        """
        return {f.name: getattr(self, f.name) for f in fields(self)}


_JSON_FIELDS = {"record", "result", "detail", "markup", "option"}
R = TypeVar("R", bound=_Row)


def from_row(cls: type[R], row: dict[str, Any]) -> R:
    """Build a record from a database row dict, decoding its JSON columns.

    Example:
        >>> from_row(Level, {"id": "x", "site_id": "s", "name": "L1", "elevation": None}).name
        'L1'
    """
    kw = {}
    for f in fields(cls):
        if f.name in row:
            v = row[f.name]
            if f.name in _JSON_FIELDS and isinstance(v, str):
                v = json.loads(v)
            kw[f.name] = v
    return cls(**kw)
