"""Schema versions, applied in order through sqlite-utils' migration sets.

Each migration is a function of the database; sqlite-utils records it in
``_sqlite_migrations`` inside the same transaction, so a crash mid-migration leaves the
previous version intact. Never edit a released migration: add a new one.
"""

from __future__ import annotations

from sqlite_utils import Database
from sqlite_utils.migrations import Migrations

from fieldcol.store import _oplog
from fieldcol.store._schema import V1_SQL, V2_SQL, V4_SQL, V5_SQL, V6_SQL

migrations = Migrations("fieldcol")


def _each(db: Database, sql: str) -> None:
    """Run a step's statements one by one: executescript would commit mid-step."""
    for statement in sql.split(";"):
        if statement.strip():
            db.execute(statement)


@migrations(name="m001_initial")
def _m001_initial(db: Database) -> None:
    db.executescript(V1_SQL)
    # external-content FTS5 kept current by triggers; tombstoned rows stay indexed and the
    # search query filters them out, so a soft delete needs no index surgery
    db["findings"].enable_fts(["text", "category"], create_triggers=True)


@migrations(name="m002_indexes")
def _m002_indexes(db: Database) -> None:
    db.executescript(V2_SQL)


@migrations(name="m003_sync")
def _m003_sync(db: Database) -> None:
    _each(db, _oplog.M003_SQL)
    row = db.execute("SELECT value FROM meta WHERE key = 'device_id'").fetchone()
    _oplog.install(db.conn, row[0] if row else None)


@migrations(name="m004_people")
def _m004_people(db: Database) -> None:
    _each(db, V4_SQL)


@migrations(name="m005_field_notes")
def _m005_field_notes(db: Database) -> None:
    _each(db, V5_SQL)


@migrations(name="m006_row_ops")
def _m006_row_ops(db: Database) -> None:
    # From here a written row is logged as one operation carrying its changed fields (field
    # "*"), which an older fieldcol cannot read: this step makes it refuse the store and makes
    # the hub tell an older device to update. The index over every field's value is replaced by
    # one per unique key field (made by _oplog.install after each step): only keys are looked
    # up by value, and indexing every record's text made each merged row cost several writes.
    db.execute("DROP INDEX IF EXISTS sync_fields_value")


@migrations(name="m007_visits")
def _m007_visits(db: Database) -> None:
    _each(db, V6_SQL)


@migrations(name="m008_compact_winners")
def _m008_compact_winners(db: Database) -> None:
    # From here a row written whole by one operation keeps its winners in one sync_fields row
    # (field "*", see _oplog._compact_rows), which an older fieldcol would read as no winners
    # at all: this step makes it refuse the store. Rows already held stay spelt out (valid).
    # The triggers that note written rows now stand still during a merge (_oplog.QUIET):
    # dropped here, _oplog.install makes them again after the step.
    for (name,) in db.execute("SELECT name FROM sqlite_master WHERE type = 'trigger' AND "
                              "name LIKE 'sync_note_%'").fetchall():
        db.execute(f"DROP TRIGGER {name}")


#: names in order; the schema version is the count applied
MIGRATION_NAMES: tuple[str, ...] = tuple(m.name for m in migrations.pending(Database(memory=True)))
SCHEMA_VERSION = len(MIGRATION_NAMES)


def schema_version(db: Database) -> int:
    """How many of our migrations the database has applied (0 for a new file).

    Example:
        >>> schema_version(Database(memory=True))
        0
    """
    return len(migrations.applied(db))


def unknown_migrations(db: Database) -> list[str]:
    """Migrations recorded in ``db`` that this version of fieldcol does not know (a newer app wrote it).

    Example:
        >>> unknown_migrations(Database(memory=True))
        []
    """
    return [m.name for m in migrations.applied(db) if m.name not in MIGRATION_NAMES]
