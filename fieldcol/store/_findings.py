"""Findings (with full-text search), photos and the links that attach photos to things."""

from __future__ import annotations

import os
import re
import uuid
from pathlib import Path

from fieldcol.errors import InputError
from fieldcol.store import _photos
from fieldcol.store import _validate as v
from fieldcol.store._columns import ColumnsMixin
from fieldcol.store._records import Finding, Photo, PhotoLink, from_row
from fieldcol.store._schema import FACES, FINDING_STATUSES, SEVERITIES

_PHOTO_IDS = uuid.UUID("5b0c6a52-8f1e-4d0a-9c39-f1e1dc0c0a11")

_FINDING_FIELDS = ("text", "category", "severity", "status", "column_id", "face", "height")
_TOKEN = re.compile(r"\w+", re.UNICODE)


def fts_query(text: str) -> str:
    """A safe FTS5 query from what the engineer typed: every word must appear, prefixes match.

    Punctuation is dropped rather than passed to FTS5, whose syntax would reject it.

    Example:
        >>> fts_query('corroded "base" plate?')
        '"corroded"* "base"* "plate"*'
    """
    words = _TOKEN.findall(text or "")
    if not words:
        raise InputError("query", text, "nothing to search for", "type a word, e.g. corrosion")
    return " ".join(f'"{w}"*' for w in words)


class FindingsMixin(ColumnsMixin):
    """Store operations on findings, their search, and photos (part of ``Store``)."""

    # -- findings --------------------------------------------------------------------------
    def add_finding(self, site_id: str, text: str, *, category: str, severity: str,
                    column_id: str | None = None, status: str = "open",
                    face: str | None = None, height: str | None = None,
                    noted_at: str | None = None, noted_by: str | None = None,
                    visit_id: str | None = None, finding_id: str | None = None) -> Finding:
        """Note a finding about a site or one of its columns.

        Args:
            text: what was found. category: free text such as ``corrosion``, ``bow``, ``brace``.
            severity: ``info``, ``low``, ``medium``, ``high`` or ``urgent``.
            status: ``open`` or ``closed``.
            face: which face of the column (``FACES``: ``all``, ``north`` .. ``web``, ``base``,
                ``top``), or None when not said.
            height: where up the column, as typed (``"4 ft"``, ``"1.2 m"``), measured from the
                bottom; not above the top of the column; None when not said.
            noted_at: when it was seen (ISO 8601 with a time zone), for a finding written up
                after the visit from notes taken on it; now when None.
            noted_by: who saw it; the person recording on this device when None.
            visit_id: the visit it was seen on; the visit open on this device when None.

        Example:
            >>> store.add_finding(site.id, "Web dented at 4 ft", category="damage",
            ...                   severity="medium", column_id=col.id).status
            'open'
        """
        self._get("sites", site_id, field="site")
        given = dict(text=text, category=category, severity=severity, status=status,
                     column_id=column_id)
        # where on the column only when said: a store not yet migrated has no such columns
        given.update({k: val for k, val in (("face", face), ("height", height))
                      if val is not None})
        row = {"site_id": site_id, **self._finding_fields(given, site_id)}
        if noted_at is not None:
            # the register dates a finding by when it was seen, not when it was typed in
            row["created_at"] = v.utc_timestamp(noted_at, "noted_at")
        if noted_by is not None:
            row["created_by"] = v.text(noted_by, "noted_by")
        if visit_id is not None:
            if self._get("visits", visit_id, field="visit")["site_id"] != site_id:
                raise InputError("visit", visit_id, "that visit is to another site", None)
            row["visit_id"] = visit_id
        return self.get_finding(self._insert("findings", row, row_id=finding_id))

    def _finding_fields(self, fields: dict, site_id: str) -> dict:
        out = {}
        for k, val in fields.items():
            if k not in _FINDING_FIELDS:
                raise InputError(k, repr(val), "not a field of a finding", ", ".join(_FINDING_FIELDS))
            if k in ("text", "category"):
                out[k] = v.text(val, k)
            elif k == "severity":
                out[k] = v.choice(val, k, SEVERITIES)
            elif k == "status":
                out[k] = v.choice(val, k, FINDING_STATUSES)
            elif k == "face":
                out[k] = v.choice(val or None, k, FACES, required=False)
            elif k == "height":
                out[k] = self._finding_height(val, fields.get("column_id"), site_id)
            elif val is not None:
                col = self._get("columns", val, field="column")
                if col["site_id"] != site_id:
                    raise InputError("column", val, "that column is on another site", None)
                out[k] = val
            else:
                out[k] = None
        return out

    def _finding_height(self, value: object, column_id: str | None,
                        site_id: str) -> str | None:
        """The height as typed, checked: a length from the bottom, within the column."""
        from fieldcol.units import format_length, parse_length

        typed = v.text(value, "height", required=False)
        if typed is None:
            return None
        at = parse_length(typed, "height", allow_zero=True)
        if column_id is None:
            return typed
        try:
            length = parse_length(self.current_record(column_id).get("length"), "length")
        except InputError:
            return typed  # the column's own length is not readable: its check says so
        if at > length + 2.0:  # 2 mm: finer than a tape reading (common practice)
            raise InputError("height", typed, "above the top of the column",
                             f"measure from the bottom; the column is "
                             f"{format_length(length, self.get_site(site_id).unit_system)} long")
        return typed

    def check_height(self, column_id: str, height: str | None) -> str | None:
        """A finding's height as it would be kept: a length from the bottom, within the column.

        Args:
            column_id: the column.
            height: as typed (``"4 ft"``, ``"1.2 m"``) or None.

        Returns:
            The trimmed text, or None; ``InputError`` on field ``height`` when refused.

        Example:
            >>> store.check_height(col.id, "31 ft")
            Traceback (most recent call last):
            fieldcol.errors.InputError: height: cannot use '31 ft': above the top of the column ...
        """
        col = self.get_column(column_id)
        return self._finding_height(height, column_id, col.site_id)

    def update_finding(self, finding_id: str, **fields: object) -> Finding:
        """Change ``text=``, ``category=``, ``severity=``, ``status=``, ``column_id=``,
        ``face=`` or ``height=``.

        Example:
            >>> store.update_finding(finding.id, status="closed").status
            'closed'
        """
        cur = self._get("findings", finding_id, field="finding")
        if "height" in fields and "column_id" not in fields:
            fields = {**fields, "column_id": cur["column_id"]}  # the height is checked on it
        self._update("findings", finding_id, self._finding_fields(dict(fields), cur["site_id"]))
        return self.get_finding(finding_id)

    def get_finding(self, finding_id: str) -> Finding:
        """The finding with this id (tombstoned too).

        Example:
            >>> store.get_finding(finding.id).severity
            'high'
        """
        return from_row(Finding, self._get("findings", finding_id, live=False, field="finding"))

    def list_findings(self, site_id: str, *, status: str | None = None,
                      column_id: str | None = None) -> list[Finding]:
        """Live findings of a site, optionally by status or column, oldest first.

        Example:
            >>> [f.text for f in store.list_findings(site.id, status="open")]
            ['Base plate corroded']
        """
        sql, params = "SELECT * FROM findings WHERE site_id = ? AND deleted_at IS NULL", [site_id]
        if status is not None:
            sql += " AND status = ?"
            params.append(v.choice(status, "status", FINDING_STATUSES))
        if column_id is not None:
            sql += " AND column_id = ?"
            params.append(column_id)
        return [from_row(Finding, r) for r in self._rows(sql + " ORDER BY created_at", params)]

    def search_findings(self, query: str, *, site_id: str | None = None,
                        limit: int = 50) -> list[Finding]:
        """Live findings whose text or category hold every word of ``query``, best first.

        Example:
            >>> [f.text for f in store.search_findings("corro")]
            ['Base plate corroded']
        """
        sql = ("SELECT f.* FROM findings_fts JOIN findings f ON f.rowid = findings_fts.rowid "
               "WHERE findings_fts MATCH ? AND f.deleted_at IS NULL")
        params: list[object] = [fts_query(query)]
        if site_id is not None:
            sql += " AND f.site_id = ?"
            params.append(site_id)
        if isinstance(limit, bool) or not isinstance(limit, int) or not 1 <= limit <= 1000:
            raise InputError("limit", repr(limit), "1 to 1000 results", None)
        params.append(limit)
        return [from_row(Finding, r) for r in
                self._rows(sql + " ORDER BY findings_fts.rank LIMIT ?", params)]

    # -- photos ---------------------------------------------------------------------------
    def add_photo(self, source: bytes | str | os.PathLike[str], *,
                  original_name: str | None = None, finding_id: str | None = None,
                  column_id: str | None = None, restraint_change_id: str | None = None,
                  caption: str | None = None, taken_by: str | None = None) -> Photo:
        """Keep a photo (once per content) and optionally attach it to one thing.

        Args:
            source: a file path or the image bytes (JPEG, PNG, WebP).
            original_name: the name to remember (defaults to the file's name).
            finding_id / column_id / restraint_change_id: attach to this (at most one).
            caption: the attachment's caption.
            taken_by: who took it (default: the person recording on this device); kept with a
                photo stored for the first time.

        Returns:
            The ``Photo`` (the existing one when the same bytes were stored before).

        Example:
            >>> again = store.add_photo(jpeg, original_name="IMG_0043.jpg", finding_id=finding.id)
            >>> again.format, again.id == photo.id  # the same bytes are kept once
            ('JPEG', True)
        """
        data, name = _photos.read_bytes(source)
        pf = _photos.ingest(self.photos_dir, data)
        with self._tx():
            rows = self._rows("SELECT * FROM photos WHERE sha256 = ?", [pf.sha256])
            if rows:
                photo_id = rows[0]["id"]
                if rows[0]["deleted_at"] is not None:  # taken again: bring it back
                    self._update("photos", photo_id, {"deleted_at": None})
            else:
                row = {k: getattr(pf, k) for k in (
                    "sha256", "path", "thumb_path", "format", "width", "height", "bytes",
                    "exif_taken_at", "latitude", "longitude")}
                row["original_name"] = v.text(original_name or name, "original_name",
                                              required=False)
                if taken_by is not None:
                    row["created_by"] = v.text(taken_by, "taken_by")
                # the id follows the content, so the same photo taken in on two devices is
                # one row when they sync, never two rows fighting over one hash
                photo_id = self._insert("photos", row,
                                        row_id=str(uuid.uuid5(_PHOTO_IDS, pf.sha256)))
            if finding_id or column_id or restraint_change_id:
                self.attach_photo(photo_id, finding_id=finding_id, column_id=column_id,
                                  restraint_change_id=restraint_change_id, caption=caption)
        return self.get_photo(photo_id)

    def attach_photo(self, photo_id: str, *, finding_id: str | None = None,
                     column_id: str | None = None, restraint_change_id: str | None = None,
                     caption: str | None = None) -> PhotoLink:
        """Attach a stored photo to exactly one finding, column or restraint change.

        Example:
            >>> store.attach_photo(photo.id, column_id=col.id).column_id == col.id
            True
        """
        self._get("photos", photo_id, field="photo")
        targets = {"finding_id": ("findings", finding_id), "column_id": ("columns", column_id),
                   "restraint_change_id": ("restraint_changes", restraint_change_id)}
        given = [k for k, (_, val) in targets.items() if val is not None]
        if len(given) != 1:
            raise InputError("attach_to", ", ".join(given) or "nothing",
                             "a photo link names exactly one thing",
                             "give one of finding_id, column_id, restraint_change_id")
        table, target = targets[given[0]]
        self._get(table, target, field=given[0])
        existing = self._rows(f"SELECT * FROM photo_links WHERE photo_id = ? AND {given[0]} = ? "
                              "AND deleted_at IS NULL", [photo_id, target])
        if existing:
            return from_row(PhotoLink, existing[0])
        row = {"photo_id": photo_id, given[0]: target,
               "caption": v.text(caption, "caption", required=False)}
        return from_row(PhotoLink, self._get("photo_links", self._insert("photo_links", row)))

    def get_photo(self, photo_id: str) -> Photo:
        """The photo row with this id (tombstoned too).

        Example:
            >>> store.get_photo(photo.id).format
            'JPEG'
        """
        return from_row(Photo, self._get("photos", photo_id, live=False, field="photo"))

    def photos_of(self, *, finding_id: str | None = None, column_id: str | None = None,
                  restraint_change_id: str | None = None) -> list[Photo]:
        """Live photos attached to one finding, column or restraint change.

        Example:
            >>> len(store.photos_of(finding_id=finding.id))
            1
        """
        given = {k: val for k, val in dict(finding_id=finding_id, column_id=column_id,
                 restraint_change_id=restraint_change_id).items() if val is not None}
        if len(given) != 1:
            raise InputError("attach_to", ", ".join(given) or "nothing", "name exactly one thing",
                             None)
        (key, target), = given.items()
        return [from_row(Photo, r) for r in self._rows(
            f"SELECT p.* FROM photo_links l JOIN photos p ON p.id = l.photo_id "
            f"WHERE l.{key} = ? AND l.deleted_at IS NULL AND p.deleted_at IS NULL "
            "ORDER BY l.created_at", [target])]

    def photo_path(self, photo: Photo, *, thumbnail: bool = False) -> Path:
        """The file of a photo (or its thumbnail) on this device.

        Example:
            >>> store.photo_path(photo, thumbnail=True).suffix
            '.jpg'
        """
        return self.photos_dir / (photo.thumb_path if thumbnail else photo.path)
