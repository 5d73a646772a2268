"""``fieldcol columns``: list the columns in the store with their latest check."""

from __future__ import annotations

import argparse
import sys


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``columns`` command to the CLI parser.

    Example:
        >>> register(argparse.ArgumentParser().add_subparsers())  # doctest: +SKIP
    """
    p = sub.add_parser("columns", help="list columns with their latest utilization",
                       description="List the columns in the store (tag, site, level, section, "
                       "length, latest utilization and governing mode).")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--site", help="only this site (by name)")
    p.add_argument("--json", action="store_true", help="print a JSON list of objects")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """List the columns; returns the exit status.

    Example:
        >>> run(argparse.Namespace(db="site.db", site=None, json=True))  # doctest: +SKIP
        0
    """
    from fieldcol.cli import CAUTION, print_json
    from fieldcol.store import open_store

    with open_store(args.db, create=False) as store:
        site_id = store.site_by_name(args.site).id if args.site else None
        rows, offset = [], 0
        while True:
            page = store.list_columns(site_id, limit=500, offset=offset)
            rows += page
            if len(page) < 500:
                break
            offset += 500
    if args.json:
        print_json([r.to_dict() for r in rows])
        print(CAUTION, file=sys.stderr)
        return 0
    head = ("tag", "site", "level", "section", "length", "util.", "governing")
    table = [head] + [(r.tag, r.site, r.level or "", r.section or "", r.length or "",
                       "" if r.utilization is None else f"{r.utilization:.2f}",
                       r.governing_mode or ("not checked" if r.checked_at is None else ""))
                      for r in rows]
    widths = [max(len(str(row[i])) for row in table) for i in range(len(head))]
    for row in table:
        print("  ".join(str(c).ljust(w) for c, w in zip(row, widths)).rstrip())
    print(f"{len(rows)} columns")
    print(CAUTION)
    return 0
