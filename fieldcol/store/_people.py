"""Who is recording on this device, its settings, and the visit under way.

The person and the device's name live in ``meta`` (this device's own settings: they do not
travel with the records); each new row of a data table carries the person in ``created_by``
(stamped by ``StoreBase._insert``). One visit at a time is open on a device.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from fieldcol.errors import InputError
from fieldcol.store import _validate as v
from fieldcol.store._base import StoreBase
from fieldcol.store._records import Visit, from_row

_INITIALS = re.compile(r"[A-Za-z][A-Za-z.\- ]{0,7}")
#: this device's own settings (kept in ``meta``, never synced): the values a setting takes
#: (its first is the default), or ``None`` for free text with no default
SETTINGS: dict[str, tuple[str, ...] | None] = {"theme": ("light", "dark"), "hub_url": None,
                                               "hub_token": None}


@dataclass(frozen=True)
class Person:
    """The engineer using this device, and the device's name."""
    name: str
    initials: str
    device: str


class PeopleMixin(StoreBase):
    """Store operations on the person, the device's settings and the open visit."""

    def _meta(self, key: str) -> str | None:
        row = self._rows("SELECT value FROM meta WHERE key = ?", [key])
        return row[0]["value"] if row else None

    def _set_meta(self, values: dict[str, str | None]) -> None:
        with self._tx():
            for key, value in values.items():
                if value is None:
                    self.db.execute("DELETE FROM meta WHERE key = ?", [key])
                else:
                    self.db.execute("INSERT INTO meta (key, value) VALUES (?, ?) ON CONFLICT(key) "
                                    "DO UPDATE SET value = excluded.value", [key, value])

    def who(self) -> Person | None:
        """The person recording on this device, or ``None`` before anyone is set.

        Example:
            >>> store.set_who("R. Amadi", "RA", "site tablet 2").initials
            'RA'
            >>> store.who().device
            'site tablet 2'
        """
        name = self._meta("person.name")
        if name is None:
            return None
        return Person(name, self._meta("person.initials") or "", self._meta("device.name") or "")

    def set_who(self, name: str, initials: str, device: str) -> Person:
        """Set who records on this device (name, initials) and the device's name.

        New rows then carry the name in ``created_by``.

        Args:
            name: the engineer's name, e.g. ``"R. Amadi"``.
            initials: one to eight letters, e.g. ``"RA"``.
            device: a name for this phone or tablet.

        Returns:
            The ``Person`` saved.

        Example:
            >>> store.set_who("", "RA", "tablet")
            Traceback (most recent call last):
            ...
            fieldcol.errors.InputError: name: cannot use '': this is required (type a value)
        """
        person = Person(v.text(name, "name"), v.text(initials, "initials"),
                        v.text(device, "device"))
        if not _INITIALS.fullmatch(person.initials):
            raise InputError("initials", person.initials, "letters only, at most eight",
                             "e.g. RA")
        self._set_meta({"person.name": person.name, "person.initials": person.initials,
                        "device.name": person.device})
        self.person = person.name
        return person

    def setting(self, key: str) -> str | None:
        """A setting of this device: ``theme`` (``light`` unless set), ``hub_url`` and
        ``hub_token`` (``None`` unless set). Settings stay on the device; they never sync.

        Example:
            >>> store.setting("theme")
            'light'
            >>> store.setting("hub_url") is None
            True
        """
        choices = self._setting_choices(key)
        value = self._meta(f"setting.{key}")
        return value if value is not None or choices is None else choices[0]

    def set_setting(self, key: str, value: str | None) -> str | None:
        """Change a setting of this device (``None`` forgets it); returns the value kept.

        Example:
            >>> store.set_setting("theme", "dark")
            'dark'
            >>> store.set_setting("hub_url", "http://127.0.0.1:8765")
            'http://127.0.0.1:8765'
        """
        choices = self._setting_choices(key)
        if value is not None:
            value = v.choice(value, key, choices) if choices else v.text(value, key)
        self._set_meta({f"setting.{key}": value})
        return value

    @staticmethod
    def _setting_choices(key: str) -> tuple[str, ...] | None:
        if key not in SETTINGS:
            raise InputError("setting", key, "not a setting of this device", ", ".join(SETTINGS))
        return SETTINGS[key]

    # -- visits -------------------------------------------------------------------------
    def start_visit(self, site_id: str, date: str, *, people: str | None = None,
                    weather: str | None = None, access: str | None = None) -> Visit:
        """Start a visit to a site; it stays open on this device until ended or another starts.

        Args:
            site_id: the site.
            date: ``YYYY-MM-DD``.
            people: who is there (text), weather, access: notes.

        Returns:
            The saved ``Visit``.

        Example:
            >>> store.start_visit(site.id, "2026-12-03", weather="dry, 4 C").weather
            'dry, 4 C'
            >>> store.open_visit().date
            '2026-12-03'
        """
        self._get("sites", site_id, field="site")
        row = {"site_id": site_id, "date": v.iso_date(date, "date"),
               "who": v.text(people, "people", required=False),
               "weather": v.text(weather, "weather", required=False),
               "access": v.text(access, "access", required=False)}
        with self._tx():
            vid = self._insert("visits", row)
            self._set_meta({"visit.open": vid})
        return from_row(Visit, self._get("visits", vid))

    def open_visit(self) -> Visit | None:
        """The visit open on this device (``None`` when none is, or it was deleted).

        Example:
            >>> store.end_visit(); store.open_visit() is None
            True
        """
        vid = self._meta("visit.open")
        if vid is None:
            return None
        rows = self._rows("SELECT * FROM visits WHERE id = ? AND deleted_at IS NULL", [vid])
        return from_row(Visit, rows[0]) if rows else None

    def reopen_visit(self, visit_id: str) -> Visit:
        """Open an ended visit again on this device (the undo of ``end_visit``).

        Example:
            >>> vid = store.start_visit(site.id, "2026-12-03").id; store.end_visit()
            >>> store.reopen_visit(vid).ended_at is None
            True
        """
        self._get("visits", visit_id, field="visit")
        with self._tx():
            self._update("visits", visit_id, {"ended_at": None})
            self._set_meta({"visit.open": visit_id})
        return from_row(Visit, self._get("visits", visit_id))

    def end_visit(self) -> None:
        """End the open visit (nothing recorded later belongs to it).

        Example:
            >>> store.end_visit()
        """
        vid = self._meta("visit.open")
        with self._tx():
            if vid is not None:
                self.db.execute("UPDATE visits SET ended_at = ?, updated_at = ? WHERE id = ? "
                                "AND ended_at IS NULL", [v.now_utc(), v.now_utc(), vid])
            self._set_meta({"visit.open": None})
