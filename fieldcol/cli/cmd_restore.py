"""``fieldcol restore``: put a backup back, after checking every file's hash."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``restore`` command to the CLI parser.

    Usage: ``fieldcol restore site.zip --db new.db``.
    """
    p = sub.add_parser("restore", help="restore a backup into an empty store",
                       description="Restore a backup file made by 'fieldcol backup'. Every "
                       "file's hash is checked first. A store that already holds records is "
                       "refused unless --force, which first writes a safety backup of it.")
    p.add_argument("backup", metavar="IN")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--force", action="store_true", help="replace a store that holds records")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Restore; returns the exit status.

    Example:
        >>> from fieldcol.cli import main
        >>> from fieldcol.store import backup
        >>> _ = backup(store, "site.zip")
        >>> main(["restore", "site.zip", "--db", "new.db"])
        restored 7 rows and 2 photo files into .../new.db (schema version ...)
        0
    """
    from fieldcol.store import restore

    info = restore(args.backup, args.db, force=args.force)
    if info.dropped_photos:
        print(f"warning: {len(info.dropped_photos)} photo(s) left out: the backup listed their "
              f"files as missing: " + ", ".join(info.dropped_photos))
    if info.safety_backup:
        print(f"the store's previous contents were saved to {info.safety_backup}")
    print(f"restored {sum(info.counts.values())} rows and {info.photo_files} photo files "
          f"into {info.path} (schema version {info.schema_version})")
    return 0
