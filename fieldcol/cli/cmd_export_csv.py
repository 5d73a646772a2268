"""``fieldcol export-csv``: a site's columns with their latest checks, as CSV."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``export-csv`` command to the CLI parser.

    Usage: ``fieldcol export-csv depot.csv --db site.db --site Depot``.
    """
    p = sub.add_parser("export-csv", help="export a site's columns and latest checks to CSV")
    p.add_argument("out", metavar="OUT.csv")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--site", required=True, help="the site's name")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Write the CSV; returns the exit status.

    Example:
        >>> from fieldcol.cli import main
        >>> main(["export-csv", "depot.csv", "--db", "site.db", "--site", "Depot"])
        1 columns written to depot.csv
        fieldcol is an aid to, not a substitute for, the judgement ... local codes govern.
        0
    """
    from fieldcol.cli import CAUTION
    from fieldcol.store import export_csv, open_store

    with open_store(args.db, readonly=True) as store:
        n = export_csv(store, args.site, args.out)
    print(f"{n} columns written to {args.out}")
    print(CAUTION)
    return 0
