"""Saved checks: an assessment kept with everything needed to reproduce and compare it."""

from __future__ import annotations

import json
from typing import Any

from fieldcol.errors import InputError
from fieldcol.store import _validate as v
from fieldcol.store._findings import FindingsMixin
from fieldcol.store._records import Check, CheckOutcome, from_row


def _utilization(result: dict[str, Any]) -> float | None:
    u = result.get("utilization")
    if isinstance(u, dict):
        u = u.get("value")
    return v.finite(u, "result.utilization")


class ChecksMixin(FindingsMixin):
    """Store operations on saved checks (part of ``Store``)."""

    def save_check(self, column_id: str, result: dict[str, Any], *,
                   record: dict[str, Any] | None = None, code: str | None = None,
                   edition: str | None = None, note: str | None = None,
                   checked_at: str | None = None, check_id: str | None = None) -> Check:
        """Keep an assessment of a column.

        Args:
            column_id: the column assessed.
            result: ``Assessment.to_dict()`` (JSON object; ``utilization`` and
                ``governing_mode`` are lifted out of it for listings).
            record: the exact input record assessed (default: the column's current record).
            code: the design code (default: the result's, else the record's, else the site's).
            edition: the code edition (default: the result's ``edition``, if any).
            note: optional text; checked_at: ISO 8601 with zone (default now).

        Returns:
            The saved ``Check`` (with ``app_version`` = ``fieldcol.__version__``).

        Example:
            >>> from fieldcol.assess import assess
            >>> saved = store.save_check(col.id, assess(rec).to_dict(), record=rec)
            >>> saved.code, saved.governing_mode
            ('aisc360-22', 'flexural-weak')
        """
        from fieldcol import __version__

        col = self._get("columns", column_id, field="column")
        if not isinstance(result, dict):
            raise InputError("result", repr(result)[:60], "expected the assessment as a JSON object",
                             None)
        rec = self.current_record(column_id) if record is None else v.record(record)
        site = self._get("sites", col["site_id"], live=False, field="site")
        code = code or result.get("code") or rec.get("code") or site["code"]
        row = {"column_id": column_id,
               "checked_at": v.now_utc() if checked_at is None
               else v.utc_timestamp(checked_at, "checked_at"),
               "record": v.json_text(rec, "record"),
               "code": v.text(code, "code"),
               "edition": v.text(edition or _text_or_none(result.get("edition")), "edition",
                                 required=False),
               "app_version": __version__,
               "utilization": _utilization(result),
               "governing_mode": _text_or_none(result.get("governing_mode")),
               "result": v.json_text(result, "result"),
               "note": v.text(note, "note", required=False)}
        return self.get_check(self._insert("checks", row, row_id=check_id))

    def get_check(self, check_id: str) -> Check:
        """The check with this id (tombstoned too).

        Example:
            >>> store.get_check(chk.id).governing_mode
            'flexural-weak'
        """
        return from_row(Check, self._get("checks", check_id, live=False, field="check"))

    def checks(self, column_id: str) -> list[Check]:
        """Live checks of a column, oldest first.

        Example:
            >>> len(store.checks(col.id))
            1
        """
        return [from_row(Check, r) for r in self._rows(
            "SELECT * FROM checks WHERE column_id = ? AND deleted_at IS NULL "
            "ORDER BY checked_at, created_at", [column_id])]

    def check_outcomes(self, column_id: str) -> list[CheckOutcome]:
        """What each live check of a column concluded, oldest first, without reading its trace
        (a column saved a hundred times keeps a hundred checks).

        Example:
            >>> store.check_outcomes(col.id)[0].governing_mode
            'flexural-weak'
        """
        rows = self._rows(
            "SELECT checked_at, utilization, governing_mode, json_extract(result, '$.status') "
            "AS status, json_extract(result, '$.design_strength.value') AS strength, record, "
            "created_by FROM checks WHERE column_id = ? AND deleted_at IS NULL "
            "ORDER BY checked_at, created_at", [column_id])
        return [CheckOutcome(r["checked_at"], r["utilization"], r["governing_mode"], r["status"],
                             r["strength"], json.loads(r["record"]) if r["record"] else {},
                             r["created_by"]) for r in rows]

    def latest_check(self, column_id: str) -> Check | None:
        """The column's most recent live check, or ``None``.

        Example:
            >>> round(store.latest_check(col.id).utilization, 2)
            0.84
        """
        rows = self._rows("SELECT * FROM checks WHERE column_id = ? AND deleted_at IS NULL "
                          "ORDER BY checked_at DESC, created_at DESC LIMIT 1", [column_id])
        return from_row(Check, rows[0]) if rows else None


def _text_or_none(x: Any) -> str | None:
    if x is None:
        return None
    return x if isinstance(x, str) else json.dumps(x)
