"""``fieldcol retrofit COLUMN.json --option JSON ...``: what each retrofit option would change."""

from __future__ import annotations

import argparse
import math
from typing import Any

from fieldcol.errors import InputError

_EXAMPLE = '{"kind": "brace", "axis": "weak", "at": "15 ft"}'


def register(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser(
        "retrofit", help="compare retrofit options for one column record (JSON file)",
        description="Check a column record as it stands and with each retrofit option (a brace, "
                    "a cable, a changed end, cover plates, a removed brace, or a combined "
                    "package), each applied to the record as it stands. Options are numbered "
                    "in order: the --option values first, then the entries of --options.")
    p.add_argument("file", help="column record JSON file ('-' reads standard input)")
    p.add_argument("--option", action="append", default=[], metavar="JSON",
                   help=f"one option as JSON, e.g. '{_EXAMPLE}' (repeatable)")
    p.add_argument("--options", metavar="FILE", help="a JSON file holding a list of options")
    p.add_argument("--json", action="store_true", help="print the comparison as JSON")
    p.add_argument("--units", choices=("us", "si"), help="display units (default: the record's)")
    p.add_argument("--sweep", choices=("weak", "strong", "both"),
                   help="instead of options: the design strength with one proposed brace on this "
                        "axis at heights up the column")
    p.add_argument("--points", type=int, default=11, help="heights of --sweep (3 to 41, default 11)")
    p.add_argument("--stiffness", action="append", metavar="TEXT",
                   help="a brace stiffness to sweep, e.g. '10 kip/in' (repeatable; default rigid)")
    p.add_argument("--twist", action="store_true", help="the swept brace also prevents twisting")
    p.set_defaults(func=run)


def _sweep(record: Any, args: argparse.Namespace) -> int:
    """The brace sweep as a table (height, then one column per stiffness) or JSON."""
    from fieldcol import CAUTION
    from fieldcol.retrofit import brace_sweep
    from fieldcol.units import format_length, format_quantity

    s = brace_sweep(record, args.sweep, points=args.points, stiffness=tuple(args.stiffness or ("rigid",)),
                    twist=args.twist)
    if args.json:
        from fieldcol.cli import print_json

        print_json(s.to_dict())
        return 0
    from fieldcol.record import parse_record

    system = args.units or parse_record(record).units
    force = lambda v: "-" if v is None else format_quantity(v, "force", system)  # noqa: E731
    out = [f"One proposed brace on the {s.axis} axis; as it stands {force(s.before)}",
           f"{'height':>12}  " + "  ".join(f"{k:>14}" for k in s.stiffness)]
    for i, h in enumerate(s.heights):
        out.append(f"{format_length(h, system):>12}  " + "  ".join(f"{force(r[i]):>14}" for r in s.strengths))
    if s.best is not None:
        out.append(f"Best: {force(s.best[2])} at {format_length(s.best[0], system)} ({s.stiffness[s.best[1]]})")
    out += ["", CAUTION]
    print("\n".join(out))
    return 0


def run(args: argparse.Namespace) -> int:
    from fieldcol import jsontext
    from fieldcol.cli import read_json
    from fieldcol.retrofit import compare

    record = read_json(args.file)
    if args.sweep:
        return _sweep(record, args)
    options: list[Any] = []
    for i, raw in enumerate(args.option):
        try:
            options.append(jsontext.loads(raw, f"options[{i}]", raw))
        except InputError as e:
            raise InputError(e.field, e.text, e.reason, f"e.g. --option '{_EXAMPLE}'") from None
    if args.options:
        more = read_json(args.options, "--options")
        if not isinstance(more, list):
            raise InputError("--options", args.options, "the file must hold a list of options",
                             f"[{_EXAMPLE}]")
        options += more
    if not options:
        raise InputError("options", "", "no options given",
                         f"--option '{_EXAMPLE}' or --options FILE.json")
    comparisons = compare(record, options)
    if args.json:
        from fieldcol.cli import print_json

        print_json([c.to_dict() for c in comparisons])
        return 0
    system = args.units or comparisons[0].before.column.units
    print(table(comparisons, system))
    return 0


def table(comparisons: list, system: str) -> str:
    """The comparison as text: one row per option, new warnings under it, the caution last.

    Args:
        comparisons: from ``fieldcol.retrofit.compare`` (all of one column).
        system: ``"us"`` or ``"si"`` display units.
    Returns:
        The table as one string.

    Example:
        >>> from fieldcol.retrofit import compare
        >>> rec = {"tag": "C1", "section": "W14X90", "material": "A992", "length": "30 ft",
        ...        "demand": {"axial": "600 kip"}}
        >>> brace = {"kind": "brace", "axis": "weak", "at": "15 ft", "stiffness": "rigid",
        ...          "strength": "10 kip"}
        >>> print(table(compare(rec, [brace]), "us"))
        Column C1  -  ANSI/AISC 360-22 (lrfd), demand 600.0 kip
        <BLANKLINE>
        option                       design strength     change   utilization             governing mode
        as it stands                 594.2 kip                    1.010 OVER              flexural-weak
        brace weak at 15 ft (rigid)  594.2 -> 836.7 kip  +40.8 %  1.010 OVER -> 0.717 OK  flexural-weak -> torsional
        <BLANKLINE>
        fieldcol is an aid to, not a substitute for, the judgement of a licensed engineer; local codes govern.
    """
    from fieldcol import CAUTION
    from fieldcol.assess import EDITIONS
    from fieldcol.units import display_unit, to_display

    first = comparisons[0].before
    col = first.column
    unit = display_unit("force", system)

    def force(v: float) -> str:
        return f"{float(to_display(v, 'force', system)):.1f}" if math.isfinite(v) else "-"

    def util(a: Any) -> str:
        if a.status == "not-covered":
            return "NOT COVERED"
        if a.utilization is None:
            return "-"
        return f"{a.utilization:.3f} {'OK' if a.status == 'ok' else 'OVER'}"

    head = f"Column {col.tag}  -  {EDITIONS[col.code]} ({col.basis})"
    if first.demand is not None:
        head += f", demand {force(first.demand)} {unit}"
    rows = [("option", "design strength", "change", "utilization", "governing mode")]
    rows.append(("as it stands", f"{force(first.design_strength)} {unit}", "",
                 util(first), first.governing_mode))
    notes: dict[int, list[str]] = {}
    for i, c in enumerate(comparisons):
        rows.append((c.label, f"{force(c.design_before)} -> {force(c.design_after)} {unit}",
                     f"{100 * c.gain:+.1f} %" if math.isfinite(c.gain) else "-",
                     "-" if c.before.demand is None else f"{util(c.before)} -> {util(c.after)}",
                     f"{c.governing_before} -> {c.governing_after}"))
        notes[len(rows) - 1] = [f"  new warning [{w['code']}]: {w['message']}" for w in c.new_warnings]
    widths = [max(len(r[k]) for r in rows) for k in range(len(rows[0]))]
    out = [head, ""]
    for n, r in enumerate(rows):
        out.append("  ".join(cell.ljust(w) for cell, w in zip(r, widths)).rstrip())
        out += notes.get(n, [])
    out += ["", CAUTION]
    return "\n".join(out)
