"""``fieldcol report``: the PDF report of a site (cover, summary, findings, every column)."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``report`` command to the CLI parser."""
    p = sub.add_parser("report", help="write a site's PDF report",
                       description="Write a site's PDF report and its column register as CSV "
                       "beside it (same name, .csv): cover with the caution, contents, column "
                       "register worst first, findings register, one sheet per column (record, "
                       "latest check, side view and column curve, every mode, full trace, "
                       "histories) and a captioned photo grid. US Letter for a 'us' site, A4 "
                       "for an 'si' site.")
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
    print(f"wrote {out} and {out.with_suffix('.csv')}")
    print(CAUTION)
    return 0
