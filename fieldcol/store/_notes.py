"""Photo markup, photo links taken back, and retrofit options kept as their definitions."""

from __future__ import annotations

import copy
from typing import Any

from fieldcol.errors import InputError
from fieldcol.store import _validate as v
from fieldcol.store._checks import ChecksMixin
from fieldcol.store._markup import check_markup
from fieldcol.store._records import Photo, PhotoLink, Retrofit, from_row
from fieldcol.store._schema import RETROFIT_STATUSES


class NotesMixin(ChecksMixin):
    """Store operations on photo markup and retrofit option definitions (part of ``Store``)."""

    # -- photo markup -----------------------------------------------------------------------
    def set_markup(self, photo_id: str, shapes: list[dict[str, Any]] | None) -> Photo:
        """Keep the arrows, circles and labels drawn over a photo (the file is left as taken).

        Args:
            photo_id: the photo.
            shapes: the shapes (``fieldcol.store._markup``), normalised to the upright photo;
                ``[]`` or None takes the markup away.

        Returns:
            The ``Photo`` with its ``markup``.

        Example:
            >>> store.set_markup(photo.id, [{"kind": "circle", "at": [0.5, 0.5], "r": 0.1}]).markup
            [{'kind': 'circle', 'at': [0.5, 0.5], 'r': 0.1}]
        """
        self._get("photos", photo_id, field="photo")
        clean = check_markup([] if shapes is None else shapes)
        self._update("photos", photo_id,
                     {"markup": v.json_text(clean, "markup") if clean else None})
        return self.get_photo(photo_id)

    def photo_links(self, photo_id: str) -> list[PhotoLink]:
        """The live links of a photo (what it is attached to), oldest first.

        Example:
            >>> [link.finding_id == finding.id for link in store.photo_links(photo.id)]
            [True]
        """
        self._get("photos", photo_id, field="photo", live=False)
        return [from_row(PhotoLink, r) for r in self._rows(
            "SELECT * FROM photo_links WHERE photo_id = ? AND deleted_at IS NULL "
            "ORDER BY created_at", [photo_id])]

    # -- retrofit options as definitions ---------------------------------------------------
    def add_retrofit_option(self, column_id: str, option: dict[str, Any], *,
                            description: str | None = None, status: str = "proposed",
                            retrofit_id: str | None = None) -> Retrofit:
        """Keep a retrofit option as its definition, to be applied to the column as it stands.

        The option is tried on the column now (a bad option names its field, e.g.
        ``option.at``); the record it gives today is kept too, for readers that only know
        snapshots, but a checker applies ``option`` to ``current_record`` each time.

        Args:
            column_id: the column.
            option: a ``fieldcol.retrofit`` option (README "Retrofit options").
            description: the words shown; made from the option when None.
            status: ``proposed``, ``chosen``, ``rejected`` or ``built``.

        Returns:
            The ``Retrofit`` row, its ``option`` set.

        Example:
            >>> opt = {"kind": "brace", "axis": "weak", "at": "15 ft"}
            >>> r = store.add_retrofit_option(col.id, opt)
            >>> r.description, r.option["at"]
            ('brace weak at 15 ft', '15 ft')
        """
        from fieldcol.retrofit import apply_option, label

        self._get("columns", column_id, field="column")
        if not isinstance(option, dict):
            raise InputError("option", repr(option)[:60], "an option is an object",
                             '{"kind": "brace", "axis": "weak", "at": "12 ft"}')
        record = apply_option(self.current_record(column_id), option, field="option")
        row = {"column_id": column_id,
               "description": v.text(description if description is not None
                                     else label(option), "description"),
               "record": v.json_text(v.record(record), "record"),
               "option": v.json_text(copy.deepcopy(option), "option"),
               "status": v.choice(status, "status", RETROFIT_STATUSES)}
        return from_row(Retrofit, self._get("retrofits",
                                            self._insert("retrofits", row, row_id=retrofit_id)))

    def restore_retrofit(self, retrofit_id: str) -> Retrofit:
        """Bring back a dropped (tombstoned) retrofit option: the undo of dropping it.

        Example:
            >>> r = store.add_retrofit_option(col.id, {"kind": "brace", "axis": "weak",
            ...                                        "at": "15 ft"})
            >>> store.delete("retrofits", r.id)
            >>> store.restore_retrofit(r.id).deleted_at is None
            True
        """
        self._get("retrofits", retrofit_id, field="retrofit", live=False)
        self._update("retrofits", retrofit_id, {"deleted_at": None})
        return from_row(Retrofit, self._get("retrofits", retrofit_id))


__all__ = ["NotesMixin"]
