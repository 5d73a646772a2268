"""``fieldcol report``: the PDF report of a site (cover, summary, findings, every column)."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``report`` command to the CLI parser."""
    p = sub.add_parser("report", help="write a site's PDF report",
                       description="Write a site's PDF report: cover with the caution, summary "
                       "of every column, findings with photos, and one section per column "
                       "with its record, latest check, full calculation trace and histories. "
                       "US Letter for a 'us' site, A4 for an 'si' site.")
    p.add_argument("out", metavar="OUT.pdf", help="the PDF file to write")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--site", required=True, help="the site (by name)")
    p.add_argument("--column", action="append", metavar="TAG",
                   help="report only this column (repeat for more; default: every column)")
    p.add_argument("--date", help="the report date, YYYY-MM-DD (default: today, UTC)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Write the report; returns the exit status.

    Example: ``fieldcol report --db site.db --site "Kestrel Lane Print Works" kestrel.pdf``.
    """
    from fieldcol.cli import CAUTION
    from fieldcol.report import site_report
    from fieldcol.store import open_store

    with open_store(args.db, readonly=True) as store:
        site = store.site_by_name(args.site)
        out = site_report(store, site.id, args.out, columns=args.column, report_date=args.date)
    print(f"wrote {out}")
    print(CAUTION)
    return 0
