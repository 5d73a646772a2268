"""``fieldcol columns``: list the columns in the store with their latest check."""

from __future__ import annotations

import argparse
import sys


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``columns`` command to the CLI parser."""
    p = sub.add_parser("columns", help="list columns with their latest utilization",
                       description="List the columns in the store (tag, site, level, section, "
                       "length, latest utilization and governing mode).")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--site", help="only this site (by name)")
    p.add_argument("--json", action="store_true", help="print a JSON list of objects")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """List the columns; returns the exit status.

    Example: ``fieldcol columns --db site.db --site "Kestrel Lane Print Works" --json``.
    """
    from fieldcol.cli import CAUTION, print_json
    from fieldcol.store import open_store

    with open_store(args.db, readonly=True) as store:
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
    print_table(rows)
    print(f"{len(rows)} columns")
    print(CAUTION)
    return 0


def status_word(utilization: float | None, checked: bool) -> str:
    """The status as a word (never colour alone): ``OK``, ``OVER`` or ``not checked``.

    Example:
        >>> status_word(1.05, True), status_word(0.4, True), status_word(None, False)
        ('OVER', 'OK', 'not checked')
    """
    if utilization is None:
        return "no demand" if checked else "not checked"
    return "OK" if utilization <= 1.0 else "OVER"


def print_table(rows: list) -> None:
    """Print column rows (``fieldcol.store`` ``ColumnRow``) as an aligned table."""
    head = ("tag", "site", "level", "section", "length", "util.", "status", "governing")
    table = [head] + [(r.tag, r.site, r.level or "", r.section or "", r.length or "",
                       "" if r.utilization is None else f"{r.utilization:.2f}",
                       status_word(r.utilization, r.checked_at is not None),
                       r.governing_mode or "")
                      for r in rows]
    widths = [max(len(str(row[i])) for row in table) for i in range(len(head))]
    for row in table:
        print("  ".join(str(c).ljust(w) for c, w in zip(row, widths)).rstrip())
