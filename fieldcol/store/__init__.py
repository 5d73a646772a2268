"""The site records store: one SQLite file on the device (via sqlite-utils) plus its photos.

Public API::

    Store(path=None, *, create=True)        # open (and migrate) a store; see Store's methods
    open_store(path=None, *, create=True, readonly=False)   # the same, as a function
    resolve_db_path(db=None) / data_dir()   # where the file lives (--db, $FIELDCOL_DB, app data)
    backup(store, out) / restore(src, db, *, force=False)
    preview_schedule(store, site_name, csv) / apply_schedule(store, site_name, csv,
                                                             *, create_site=None)
    export_csv(store, site_name, out)
    SCHEMA_VERSION, records: Site, Visit, Level, Column, Measurement, RestraintChange,
    Finding, Photo, PhotoLink, Check, CheckOutcome, Retrofit, ColumnRow
    quantity_name(path), QUANTITY_NAMES     # a reading's quantity in words

The database lives in the platform's app-data folder (``$FLET_APP_STORAGE_DATA`` on mobile,
else ``$XDG_DATA_HOME/fieldcol`` or ``~/.local/share/fieldcol``), never in the app's own folder;
photos go in a folder beside it named after it (``fieldcol.db`` -> ``fieldcol-photos/``).
WAL, ``synchronous=FULL``, foreign keys on, a busy timeout; each change is its own transaction.
Calls are synchronous and serialised by a lock: drive a ``Store`` from one worker thread
(``asyncio.to_thread`` or a single DB thread), never from the UI event loop.
"""

from __future__ import annotations

import os

from fieldcol.store._backup import backup, restore
from fieldcol.store._columns import (
    QUANTITY_NAMES, SECTION_DIMENSIONS, latest_readings, overlay, quantity_name, section_label,
    site_defaults,
)
from fieldcol.store._migrations import SCHEMA_VERSION
from fieldcol.store._paths import data_dir, photos_dir, resolve_db_path
from fieldcol.store._records import (
    Check, CheckOutcome, Column, ColumnRow, Finding, Level, Measurement, Photo, PhotoLink,
    RestraintChange, Retrofit, Site, Visit,
)
from fieldcol.store._schedule import (
    RowError, SchedulePreview, SchedulePlan, apply_schedule, export_csv, preview_schedule,
)
from fieldcol.store._schema import CODES, SEVERITIES, UNIT_SYSTEMS
from fieldcol.store._store import Store


def open_store(path: str | os.PathLike[str] | None = None, *, create: bool = True,
               readonly: bool = False) -> Store:
    """Open the store at ``path`` (``None``: ``$FIELDCOL_DB`` or the app-data folder).

    Args:
        path: the database file.
        create: make a new store if the file does not exist; otherwise a missing file is an
            ``InputError`` on field ``db``.
        readonly: open for reading only (listings, exports, reports): never creates,
            upgrades or writes; a store from an older fieldcol is an ``InputError``.

    Returns:
        An open ``Store`` (close it, or use it as a context manager).

    Example:
        >>> with open_store("fieldcol.db") as s:
        ...     s.list_sites()
        []
    """
    return Store(path, create=create, readonly=readonly)


__all__ = [
    "Store", "open_store", "resolve_db_path", "data_dir", "photos_dir", "backup", "restore",
    "preview_schedule", "apply_schedule", "export_csv", "SchedulePreview", "SchedulePlan",
    "RowError", "SCHEMA_VERSION", "CODES", "UNIT_SYSTEMS", "SEVERITIES", "Site", "Visit",
    "Level", "Column", "Measurement", "RestraintChange", "Finding", "Photo", "PhotoLink",
    "Check", "CheckOutcome", "Retrofit", "ColumnRow", "latest_readings", "overlay", "section_label",
    "quantity_name", "QUANTITY_NAMES", "SECTION_DIMENSIONS", "site_defaults",
]
