"""``fieldcol demo``: build the invented demo site (running it again adds nothing)."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``demo`` command to the CLI parser.

    Example:
        >>> register(argparse.ArgumentParser().add_subparsers())  # doctest: +SKIP
    """
    p = sub.add_parser("demo", help="create the demo site (an invented print works)",
                       description="Create a complete demo site of our own invention: columns, "
                       "visits, measurements, restraint changes, findings with photos, "
                       "checks and retrofit options. Running it twice adds nothing.")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Build the demo; returns the exit status.

    Example:
        >>> run(argparse.Namespace(db="/tmp/demo.db"))  # doctest: +SKIP
        0
    """
    from fieldcol.cli import CAUTION
    from fieldcol.demo import SITE_NAME, build_demo
    from fieldcol.store import open_store

    with open_store(args.db) as store:
        s = build_demo(store)
        path = store.path
    print(f"demo site '{SITE_NAME}' in {path}")
    print(f"{s.columns} columns, {s.checks} checks; {s.added} rows added by this run")
    print(f"over capacity ({len(s.over)}): {', '.join(s.over) or 'none'}")
    print(f"within capacity ({len(s.ok)}): {', '.join(s.ok) or 'none'}")
    for tag, codes in s.warnings.items():
        other = [c for c in codes if c != "historic-grade"]
        if other:
            print(f"  {tag}: {', '.join(other)}")
    for tag, why in s.skipped.items():
        print(f"  {tag}: not checked: {why}")
    print("try: fieldcol columns --site '" + SITE_NAME + "'")
    print(CAUTION)
    return 0
