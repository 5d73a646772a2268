"""``fieldcol identify --d ... --bf ...``: which catalogue section was measured."""

from __future__ import annotations

import argparse
import re

NO_MATCH = "no catalogue match: use the measured section"
_DIMS = (("d", "depth (I or box) in any length unit"), ("bf", "I shape flange width"),
         ("tf", "I shape flange thickness"), ("tw", "I shape web thickness"),
         ("b", "box (rectangular hollow) width"), ("t", "hollow section wall"),
         ("D", "round hollow / pipe outside diameter"))


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``identify`` command to the CLI parser.

    Usage: ``fieldcol identify --d 13.9in --bf 14.5in --tf 0.70in --tw 0.45in``.
    """
    p = sub.add_parser(
        "identify", help="rank catalogue sections against site measurements",
        description="Rank catalogue sections against measured dimensions, within rolling "
        "tolerances (ASTM A6 for W/HP/S/M, A500/A53 for HSS/pipe, EN 10034 for IPE/HE) widened by "
        "the gauge tolerance. Give --d --bf --tf --tw for an I shape, --d --b --t for a box, "
        "--D --t for a round section. Values take units (13.9in, 353 mm, 14-1/2\"); a bare "
        "number is refused unless --units says the unit system (us: in, si: mm), and the answer "
        "says so. --code puts that code's catalogue first among the shapes that fit.")
    for name, what in _DIMS:
        p.add_argument(f"--{name}", dest=f"m_{name}", metavar="LENGTH", help=what)
    p.add_argument("--gauge", default="0", metavar="LENGTH",
                   help="the measuring gauge's own tolerance, widening every band (default 0)")
    p.add_argument("--family", action="append",
                   help="only this family (W, HP, S, M, HSS, PIPE, IPE, HE, HEA, HEB, HEM); repeat")
    p.add_argument("--limit", type=int, default=10, help="how many candidates (default 10)")
    p.add_argument("--code", choices=("aisc360-22", "en1993-1-1"),
                   help="the site's code: its catalogue ranks first among the shapes within tolerance")
    p.add_argument("--units", choices=("us", "si"),
                   help="display units, and the unit of a bare number (us: in, si: mm; without "
                        "--units a bare number is refused); default: us when the entries are in "
                        "inches or feet, else si")
    p.add_argument("--json", action="store_true", help="print JSON (each quantity as value + unit)")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Print the ranked matches; returns the exit status (bad entries raise InputError).

    Example:
        >>> from fieldcol.cli import main
        >>> main(["identify", "--d", "13.9in", "--bf", "14.5in", "--tf", "0.70in",
        ...       "--tw", "0.45in", "--units", "us", "--limit", "2"])
        Measured: d 13.900 in, bf 14.500 in, tf 0.700 in, tw 0.450 in
        ...
           1  W14X90                   0.62  yes           d -0.100 in (-80%); ...
           2  W14X99                   2.79  NO            d -0.300 in (-240%); ...
        fieldcol is an aid to, not a substitute for, the judgement ... local codes govern.
        0
    """
    from fieldcol.cli import CAUTION, print_json
    from fieldcol.cli.cmd_section import quantity, show
    from fieldcol.errors import InputError
    from fieldcol.sections import identify
    from fieldcol.units import parse_length

    system = args.units or _system_of([getattr(args, f"m_{n}") for n, _ in _DIMS])
    unit = "in" if system == "us" else "mm"
    measured, bare = {}, []
    for name, _ in _DIMS:
        text = getattr(args, f"m_{name}")
        if text is None:
            continue
        if _BARE.match(text):
            if args.units is None:
                raise InputError(name, text, "a unit is needed (a bare number could be inches or mm)",
                                 f"e.g. {text} in or {text} mm, or say --units us (in) or si (mm)")
            bare.append(name)
        measured[name] = parse_length(text, name, default_unit=unit)
    if _BARE.match(args.gauge) and args.units is None and float(args.gauge or 0) != 0:
        raise InputError("gauge", args.gauge, "a unit is needed", "e.g. 0.02 in or 0.5 mm, or --units")
    gauge = parse_length(args.gauge, "gauge", default_unit=unit, allow_zero=True)
    try:
        matches = identify(**measured, gauge=gauge, family=args.family, limit=args.limit,
                           code=args.code)
    except InputError as e:
        if e.field not in measured and e.field not in ("d", "gauge"):
            raise
        # quote the entry as typed (13.9in), not the millimetres identify was given
        typed = args.gauge if e.field == "gauge" else getattr(args, f"m_{e.field}") or ""
        raise InputError(e.field, typed, e.reason, e.hint) from None
    found = any(m.within_tolerance for m in matches)
    if args.json:
        print_json({
            "units": system,
            "measured": {k: quantity(v, "length", system) for k, v in measured.items()},
            "gauge": quantity(gauge, "length", system),
            "match_found": found,
            "bare_numbers_read_as": unit if bare else None,
            "message": None if found else NO_MATCH,
            "matches": [{
                "name": m.name, "family": m.family, "score": m.score,
                "within_tolerance": m.within_tolerance,
                "deviation": {k: quantity(v, "length", system) for k, v in m.deviation_mm.items()},
                "deviation_of_tolerance": {k: {"value": v, "unit": ""}
                                           for k, v in m.deviation_frac.items()},
            } for m in matches],
            "caution": CAUTION,
        })
        return 0
    lines = ["Measured: " + ", ".join(f"{k} {show(v, 'length', system)}"
                                      for k, v in measured.items())
             + (f" (gauge +-{show(gauge, 'length', system)})" if gauge else "")]
    if bare:
        lines.append(f"Bare numbers ({', '.join(bare)}) read as {unit} (--units {system}).")
    if args.code:
        lines.append(f"Shapes of the {args.code} catalogue first among those within tolerance.")
    lines.append("")
    if not found:
        lines += [NO_MATCH + ".", "Nearest catalogue sections (outside tolerance):"]
    lines.append(f"  {'#':>2}  {'section':<22} {'score':>6}  {'in tolerance':<12}  "
                 "deviation (measured - nominal; share of tolerance)")
    for n, m in enumerate(matches, 1):
        devs = "; ".join(f"{k} {show(v, 'length', system)} ({m.deviation_frac[k]:+.0%})"
                         for k, v in m.deviation_mm.items())
        lines.append(f"  {n:>2}  {m.name:<22} {m.score:>6.2f}  "
                     f"{'yes' if m.within_tolerance else 'NO':<12}  {devs}")
    lines += ["", CAUTION]
    print("\n".join(lines))
    return 0


_BARE = re.compile(r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?\s*$")


def _system_of(entries: list[str | None]) -> str:
    """``us`` when any entry is typed in inches or feet (13.9in, 14-1/2\", 1 ft), else ``si``."""
    imperial = re.compile(r"(in|inch|inches|ft|feet|foot)\s*$|[\"'\u2032\u2033]")
    return "us" if any(e and imperial.search(e.strip()) for e in entries) else "si"
