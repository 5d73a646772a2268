"""``fieldcol bench``: measured speed of the engine and the store."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    from fieldcol.bench import CASES

    p = sub.add_parser("bench", help="measure the speed of the engine and the store",
                       description="Time a batch of 100,000 varied columns through the AISC and "
                                   "EN checks against a per-column loop, the store's open, "
                                   "list and search on a large site database, one column "
                                   "checked (in process and as a command), a 500-column site "
                                   "reported, and a 100,000-row schedule imported.")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.add_argument("--quick", action="store_true", help="a smaller workload (smoke test)")
    p.add_argument("--case", action="append", choices=CASES,
                   help="run only this case (repeatable)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    from fieldcol.bench import CASES
    from fieldcol.bench import run as bench
    from fieldcol.cli import print_json

    res = bench(tuple(args.case or CASES), quick=args.quick)
    if args.json:
        print_json(res)
    else:
        for k, v in res.items():
            print(f"{k:<28} {v}")
    return 0
