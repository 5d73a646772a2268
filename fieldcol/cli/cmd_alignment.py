"""``fieldcol alignment``: effective length factor K from the alignment-chart equations."""

from __future__ import annotations

import argparse
import math


def _g(text: str, name: str) -> float:
    """G as typed after ``--ga`` / ``--gb``: a number >= 0, or ``inf`` / ``pinned``."""
    from fieldcol.errors import InputError

    word = text.strip().lower()
    if word in ("inf", "infinity", "pinned"):
        return math.inf
    try:
        g = float(word)
    except ValueError:
        g = math.nan
    if not (g >= 0 and math.isfinite(g)):  # float() also reads "nan", "-3", "1e999"
        raise InputError(name, text, "G must be a number >= 0 (0 fixed, inf pinned)",
                         "G = sum(EI/L columns) / sum(EI/L beams); common practice: 10 for a "
                         "pinned base, 1 for a fixed base")
    return g


def register(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser("alignment", help="K from end stiffness ratios G (alignment charts)",
                       description="Solve the alignment-chart equations (AISC 360-22 Commentary "
                                   "App. 7) for K. G = sum(EI/L) of the columns / sum(EI/L) of "
                                   "the beams at a joint; 'inf' for a pinned end, 0 for fixed "
                                   "(common practice: 10 for a pinned base, 1 for a fixed base).")
    p.add_argument("--ga", required=True, metavar="G", help="G at end A")
    p.add_argument("--gb", required=True, metavar="G", help="G at end B")
    p.add_argument("--sway", action="store_true", help="sway (unbraced) frame; default braced")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    from fieldcol import CAUTION
    from fieldcol.cli import print_json
    from fieldcol.stability import k_alignment

    from fieldcol.errors import InputError

    args.ga, args.gb = _g(args.ga, "ga"), _g(args.gb, "gb")
    if args.sway and math.isinf(args.ga) and math.isinf(args.gb):
        # named here: the engine's own words ("Ga = Gb = inf") are not what was typed
        raise InputError("gb", "pinned (with ga pinned too)",
                         "mechanism: a sway column pinned at both ends",
                         "give one end a finite G, or leave out --sway for a braced frame")
    k = float(k_alignment(args.ga, args.gb, args.sway, field="ga, gb"))
    if args.json:
        print_json({"Ga": args.ga if math.isfinite(args.ga) else "inf",
                    "Gb": args.gb if math.isfinite(args.gb) else "inf",
                    "sway": args.sway, "K": k})
    else:
        print(f"K = {k:.3f} ({'sway' if args.sway else 'braced'} frame, Ga {args.ga:g}, Gb {args.gb:g})")
        print(CAUTION)
    return 0
