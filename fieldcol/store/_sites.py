"""Sites, visits and levels."""

from __future__ import annotations

from typing import Any

from fieldcol.errors import InputError
from fieldcol.store import _validate as v
from fieldcol.store._base import StoreBase
from fieldcol.store._records import Level, Site, Visit, from_row
from fieldcol.store._schema import BASES, CODES, UNIT_SYSTEMS

_SITE_FIELDS = ("name", "address", "owner_ref", "code", "unit_system", "notes", "basis",
                "gamma_m1", "material")


def _gamma(val: Any) -> float | None:
    """gamma_M1 as typed (text or number), 1.0 to 1.5, or None when blank."""
    if val is None or (isinstance(val, str) and not val.strip()):
        return None
    try:
        g = float(val)
    except (TypeError, ValueError):
        raise InputError("gamma_m1", str(val), "not a number", "e.g. 1.0 or 1.1") from None
    if not 1.0 <= g <= 1.5:
        raise InputError("gamma_m1", str(val), "must be from 1.0 to 1.5",
                         "1.0 is the EN 1993-1-1 recommended value")
    return g


class SitesMixin(StoreBase):
    """Store operations on sites, visits and levels (part of ``Store``)."""

    def _site_fields(self, fields: dict[str, Any], *, current_id: str | None = None) -> dict[str, Any]:
        out: dict[str, Any] = {}
        for k, val in fields.items():
            if k not in _SITE_FIELDS:
                raise InputError(k, repr(val), "not a field of a site", ", ".join(_SITE_FIELDS))
            if k == "name":
                out[k] = v.text(val, "name")
                clash = self._rows("SELECT id FROM sites WHERE name = ? AND deleted_at IS NULL",
                                   [out[k]])
                if clash and clash[0]["id"] != current_id:
                    raise InputError("name", out[k], "a site with this name already exists",
                                     "choose another name")
            elif k == "code":
                out[k] = v.choice(val, "code", CODES)
            elif k == "unit_system":
                out[k] = v.choice(val, "unit_system", UNIT_SYSTEMS)
            elif k == "basis":
                out[k] = v.choice(val, "basis", BASES, required=False)
            elif k == "gamma_m1":
                out[k] = _gamma(val)
            else:
                out[k] = v.text(val, k, required=False)
        return out

    def add_site(self, name: str, *, code: str, unit_system: str, address: str | None = None,
                 owner_ref: str | None = None, notes: str | None = None,
                 site_id: str | None = None) -> Site:
        """Create a site.

        Args:
            name: unique among live sites.
            code: ``"aisc360-22"`` or ``"en1993-1-1"``.
            unit_system: ``"us"`` or ``"si"`` (how values are shown for this site).
            address, owner_ref, notes: optional text.
            site_id: a fixed id (the demo uses uuid5 ids); a new UUID when omitted.

        Returns:
            The saved ``Site``.

        Example:
            >>> store.add_site("Annex", code="en1993-1-1", unit_system="si").name
            'Annex'
        """
        row = self._site_fields(dict(name=name, code=code, unit_system=unit_system,
                                     address=address, owner_ref=owner_ref, notes=notes))
        return self.get_site(self._insert("sites", row, row_id=site_id))

    def update_site(self, site_id: str, **fields: Any) -> Site:
        """Change some fields of a site (``name=``, ``code=``, ...); returns the saved site.

        Example:
            >>> store.update_site(site.id, notes="gate B").notes
            'gate B'
        """
        self._get("sites", site_id, field="site")
        self._update("sites", site_id, self._site_fields(fields, current_id=site_id))
        return self.get_site(site_id)

    def get_site(self, site_id: str) -> Site:
        """The site with this id (tombstoned sites too, with ``deleted_at`` set).

        Example:
            >>> store.get_site(site.id).code
            'aisc360-22'
        """
        return from_row(Site, self._get("sites", site_id, live=False, field="site"))

    def find_site(self, name: str) -> Site | None:
        """The live site with exactly this name, or ``None``.

        Example:
            >>> store.find_site("no such place") is None
            True
        """
        rows = self._rows("SELECT * FROM sites WHERE name = ? AND deleted_at IS NULL",
                          [v.text(name, "site")])
        return from_row(Site, rows[0]) if rows else None

    def site_by_name(self, name: str) -> Site:
        """Like ``find_site`` but an unknown name is an ``InputError`` on field ``site``.

        Example:
            >>> store.site_by_name("Depot").unit_system
            'us'
        """
        site = self.find_site(name)
        if site is None:
            known = [r["name"] for r in self._rows(
                "SELECT name FROM sites WHERE deleted_at IS NULL ORDER BY name LIMIT 10")]
            raise InputError("site", name, "no site with this name",
                             ("known: " + ", ".join(known)) if known else "the store has no sites")
        return site

    def list_sites(self) -> list[Site]:
        """Live sites by name.

        Example:
            >>> [s.name for s in store.list_sites()]
            ['Depot']
        """
        return [from_row(Site, r) for r in
                self._rows("SELECT * FROM sites WHERE deleted_at IS NULL ORDER BY name")]

    # -- visits --------------------------------------------------------------------------
    def add_visit(self, site_id: str, date: str, *, who: str | None = None,
                  notes: str | None = None, visit_id: str | None = None) -> Visit:
        """Record a visit to a site on ``date`` (``YYYY-MM-DD``); returns the saved visit.

        Example:
            >>> store.add_visit(site.id, "2026-03-04", who="R. Amadi").date
            '2026-03-04'
        """
        self._get("sites", site_id, field="site")
        row = {"site_id": site_id, "date": v.iso_date(date, "date"),
               "who": v.text(who, "who", required=False),
               "notes": v.text(notes, "notes", required=False)}
        return from_row(Visit, self._get("visits", self._insert("visits", row, row_id=visit_id)))

    def list_visits(self, site_id: str) -> list[Visit]:
        """Live visits of a site, oldest first.

        Example:
            >>> _ = store.add_visit(site.id, "2026-03-04")
            >>> [v.date for v in store.list_visits(site.id)]
            ['2026-03-04']
        """
        return [from_row(Visit, r) for r in self._rows(
            "SELECT * FROM visits WHERE site_id = ? AND deleted_at IS NULL ORDER BY date, created_at",
            [site_id])]

    # -- levels --------------------------------------------------------------------------
    def level(self, site_id: str, name: str, *, elevation: str | None = None) -> Level:
        """The live level of this name on the site, created if new.

        Example:
            >>> store.level(site.id, "L1").name
            'L1'
        """
        name = v.text(name, "level")
        rows = self._rows("SELECT * FROM levels WHERE site_id = ? AND name = ? "
                          "AND deleted_at IS NULL", [site_id, name])
        if rows:
            return from_row(Level, rows[0])
        self._get("sites", site_id, field="site")
        row = {"site_id": site_id, "name": name,
               "elevation": v.text(elevation, "elevation", required=False)}
        return from_row(Level, self._get("levels", self._insert("levels", row)))

    def list_levels(self, site_id: str) -> list[Level]:
        """Live levels of a site by name.

        Example:
            >>> _ = store.level(site.id, "L2")
            >>> [lv.name for lv in store.list_levels(site.id)]
            ['L1', 'L2']
        """
        return [from_row(Level, r) for r in self._rows(
            "SELECT * FROM levels WHERE site_id = ? AND deleted_at IS NULL ORDER BY name",
            [site_id])]
