"""``fieldcol demo``: build the invented demo site (running it again adds nothing)."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``demo`` command to the CLI parser."""
    p = sub.add_parser("demo", help="create the demo site (an invented print works)",
                       description="Create a complete demo site of our own invention: columns, "
                       "visits, measurements, restraint changes, findings with photos, "
                       "checks and retrofit options. Running it twice adds nothing.")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Build the demo; returns the exit status.

    Example: ``fieldcol demo --db /tmp/demo.db``.
    """
    from fieldcol.cli import CAUTION
    from fieldcol.cli.cmd_columns import print_table
    from fieldcol.demo import SITE_NAME, build_demo
    from fieldcol.store import open_store

    with open_store(args.db) as store:
        s = build_demo(store)
        path = store.path
        rows = store.list_columns(store.site_by_name(SITE_NAME).id, limit=1000)
    print(f"demo site '{SITE_NAME}' in {path}")
    print(f"{s.columns} columns, {s.checks} checks; {s.added} rows added by this run")
    print()
    print_table(rows)
    print()
    print(f"over capacity ({len(s.over)}): {', '.join(s.over) or 'none'}")
    for tag, codes in s.warnings.items():
        other = [c for c in codes if c != "historic-grade"]
        if other:
            print(f"  {tag}: {', '.join(other)}")
    for tag, why in s.skipped.items():
        print(f"  {tag}: not checked: {why}")
    print(f"more: fieldcol columns --db '{path}' --json; fieldcol --help")
    print(CAUTION)
    return 0
