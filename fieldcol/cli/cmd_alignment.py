"""``fieldcol alignment``: effective length factor K from the alignment-chart equations."""

from __future__ import annotations

import argparse
import math


def _g(text: str) -> float:
    return math.inf if text.strip().lower() in ("inf", "pinned") else float(text)


def register(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser("alignment", help="K from end stiffness ratios G (alignment charts)",
                       description="Solve the alignment-chart equations (AISC 360-22 Commentary "
                                   "App. 7) for K. G = sum(EI/L) of the columns / sum(EI/L) of "
                                   "the beams at a joint; 'inf' for a pinned end, 0 for fixed "
                                   "(common practice: 10 for a pinned base, 1 for a fixed base).")
    p.add_argument("--ga", required=True, type=_g, help="G at end A")
    p.add_argument("--gb", required=True, type=_g, help="G at end B")
    p.add_argument("--sway", action="store_true", help="sway (unbraced) frame; default braced")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    from fieldcol import CAUTION
    from fieldcol.cli import print_json
    from fieldcol.stability import k_alignment

    k = float(k_alignment(args.ga, args.gb, args.sway, field="G"))
    if args.json:
        print_json({"Ga": args.ga if math.isfinite(args.ga) else "inf",
                    "Gb": args.gb if math.isfinite(args.gb) else "inf",
                    "sway": args.sway, "K": k})
    else:
        print(f"K = {k:.3f} ({'sway' if args.sway else 'braced'} frame, Ga {args.ga:g}, Gb {args.gb:g})")
        print(CAUTION)
    return 0
