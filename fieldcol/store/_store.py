"""The ``Store``: every table's operations on one SQLite file."""

from __future__ import annotations

from fieldcol.store._notes import NotesMixin
from fieldcol.store._people import PeopleMixin
from fieldcol.store._sync import SyncMixin


class Store(NotesMixin, PeopleMixin, SyncMixin):
    """The site records on this device, in one SQLite file plus a photo folder beside it.

    Every change is committed in its own transaction as it is made (autosave); a failed change
    raises ``InputError`` and leaves what was saved untouched. Rows are never deleted, only
    tombstoned (``delete``), and listings hide tombstones.

    Threading: synchronous; calls are serialised by a lock, so drive it from one worker thread
    (``asyncio.to_thread`` or a dedicated DB thread), never from the UI event loop.

    Args:
        path: the database file; ``None`` uses ``$FIELDCOL_DB`` or the app-data folder.
        create: make a new store when the file does not exist (else ``InputError``).
        readonly: open for reading only (never creates, upgrades or writes).
        busy_timeout: seconds one attempt waits for another writer (default 5, or
            ``$FIELDCOL_BUSY_TIMEOUT``); after three, ``StoreBusyError``.

    Example:
        >>> with Store("other.db") as s:
        ...     s.add_site("Depot", code="aisc360-22", unit_system="us").name
        'Depot'
    """
