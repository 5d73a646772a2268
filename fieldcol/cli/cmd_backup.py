"""``fieldcol backup``: the whole store (database and photos) to one verified zip file."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``backup`` command to the CLI parser.

    Usage: ``fieldcol backup site.zip --db site.db``.
    """
    p = sub.add_parser("backup", help="back up the store and its photos to one file")
    p.add_argument("out", metavar="OUT", help="the backup file to create (never overwritten)")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Write the backup; returns the exit status.

    Example:
        >>> from fieldcol.cli import main
        >>> main(["backup", "site.zip", "--db", "site.db"])
        backed up 7 rows and 2 photo files to .../site.zip
        0
    """
    from fieldcol.store import backup, open_store

    with open_store(args.db, create=False) as store:
        info = backup(store, args.out)
    rows = sum(info.counts.values())
    print(f"backed up {rows} rows and {info.photo_files} photo files to {info.path}")
    for rel in info.missing_photos:
        print(f"warning: photo file missing from the store folder: {rel}")
    return 0
