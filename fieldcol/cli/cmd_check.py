"""``fieldcol check COLUMN.json`` (or ``--db --site --column``): the capacity of one column
record, as a calculation sheet, plain text or JSON, and with ``--samples`` its spread from what
is uncertain."""

from __future__ import annotations

import argparse
import json


def register(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser("check", help="axial capacity of one column record (JSON file or store)",
                       description="Check the axial capacity of one column record: every mode, "
                                   "the governing one, the utilization and the full trace. The "
                                   "record is a JSON file, or a column kept in a store "
                                   "(--db, --site, --column: its record as it stands now).")
    p.add_argument("file", nargs="?", help="column record JSON file ('-' reads standard input)")
    out = p.add_mutually_exclusive_group()
    out.add_argument("--json", action="store_true", help="print the result as JSON")
    out.add_argument("--text", action="store_true",
                     help="print plain text within --width characters: result, modes, warnings "
                          "and the trace with its clauses, for a terminal or a calculation "
                          "package")
    p.add_argument("--width", type=int, default=100, help="line width for --text (default 100)")
    p.add_argument("--units", choices=("us", "si"), help="display units (default: the record's)")
    p.add_argument("--samples", type=int, metavar="N",
                   help="also sample the design strength N times from the spread of the "
                        "measurements and the yield stress (100 to 1000000), e.g. 10000")
    p.add_argument("--seed", type=int, default=20261204, help="random seed of --samples (same seed, same answer)")
    p.add_argument("--fy-cov", type=float, metavar="X",
                   help="coefficient of variation of the yield stress (default 0.07; 0.05 coupon-tested, "
                        "0.10 untested historic grade)")
    p.add_argument("--thickness-sd", type=float, default=0.1, metavar="MM",
                   help="standard deviation of plate thicknesses, mm (default 0.1)")
    p.add_argument("--size-sd", type=float, default=1.0, metavar="MM",
                   help="standard deviation of depth and width, mm (default 1.0)")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--site", help="the site (by name) of --column")
    p.add_argument("--column", metavar="TAG", help="check this stored column instead of a file")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Check one record and print it; returns the exit status.

    Example: ``fieldcol check --db site.db --site "Kestrel Lane Print Works" --column C/3-G
    --text``.
    """
    from fieldcol.assess import assess
    from fieldcol.errors import InputError

    if args.column is not None or args.site is not None:
        if args.file is not None:
            raise InputError("file", args.file, "give a record file or a stored column, not both",
                             "drop the file, or --site and --column")
        if not args.site or not args.column:
            missing = "site" if not args.site else "column"
            raise InputError(missing, "", f"--{missing} is needed to check a stored column",
                             '--site "Site name" --column TAG')
        record, source, system = _stored(args)
    elif args.file is None:
        raise InputError("file", "", "no column record given",
                         "a JSON file ('-' for standard input), or --site and --column")
    else:
        from fieldcol.cli import read_json

        source = "record from standard input" if args.file == "-" else f"record {args.file}"
        record, system = read_json(args.file), None
    a = assess(record)
    system = args.units or system or a.column.units
    d = a.to_dict()
    if args.samples is not None:
        from fieldcol.uncertainty import Spreads, run_samples

        d["uncertainty"] = run_samples(record, args.samples, seed=args.seed, check=a, spreads=Spreads(
            args.thickness_sd, args.size_sd, args.fy_cov)).to_dict()
    if args.json:
        from fieldcol.cli import print_json

        print_json(d)
    elif args.text:
        from fieldcol.report._plain import column_text

        if args.width < 60:
            raise InputError("width", str(args.width), "too narrow for the trace", "60 or more")
        print(column_text(d, system, width=args.width, source=source))
    else:
        print(sheet(d, system))
    return 0


def _stored(args: argparse.Namespace) -> tuple[dict, str, str]:
    """The stored column's record as it stands now (latest readings), where it came from and
    the site's units."""
    from fieldcol.errors import InputError
    from fieldcol.store import open_store

    with open_store(args.db, readonly=True) as store:
        site = store.site_by_name(args.site)
        col = store.find_column(site.id, args.column)
        if col is None:
            known = ", ".join(r.tag for r in store.list_columns(site.id, limit=10))
            raise InputError("column", args.column, "no column with this tag on the site",
                             ("known: " + known) if known else "the site has no columns")
        record, path = store.current_record(col.id), store.path
    return record, f"store {path}, site {site.name}, column {col.tag}", site.unit_system


def show(q: dict | None, system: str, digits: int = 4) -> str:
    """A ``{"value", "unit"}`` quantity in the display system, e.g. ``"1121 kip"``."""
    from fieldcol.units import STEP_KINDS, format_length, format_quantity

    if q is None or q.get("value") is None:
        return "-"
    v, unit = q["value"], q["unit"]
    kind = STEP_KINDS.get(unit)
    if kind == "length":
        return format_length(v, system) if system == "us" and v > 300 else format_quantity(v, kind, system, digits)
    if kind:
        return format_quantity(v, kind, system, digits)
    return f"{v:.{digits}g}" if isinstance(v, float) else str(v)


def _built_or_measured(section: dict) -> str:
    if section.get("built"):
        return f"built-up ({section['built']})"
    return "measured " + section["kind"]


def sheet(d: dict, system: str) -> str:
    """The calculation sheet of an assessment's JSON form."""
    from fieldcol import CAUTION
    from fieldcol.units import format_step, us_words

    out = [f"Column {d['tag']}  -  {d['edition']} ({d['basis']}), K basis: {d['k_basis']}",
           f"Section {d['section']['name'] or _built_or_measured(d['section'])}, "
           f"{d['material']['name']}, Fy {show(d['material']['Fy'], system)}",
           f"fieldcol {d['app_version']}", ""]
    out += ["Input"] + [f"  {line}" for line in _input_lines(d["input"])] + ["", "Calculation"]
    # the engine writes its own units (mm, MPa) into a step's words: a US site reads inches, ksi
    words = us_words if system == "us" else str
    for st in d["steps"]:
        if not isinstance(st["value"], float) and st["symbol"] == "section":
            out.append(f"  {'section':<14} {words(str(st['value']))}")
            continue
        val = (format_step(st["value"], st["unit"], system) if isinstance(st["value"], float)
               else words(str(st["value"])))
        formula = f" = {words(st['formula'])}" if st["formula"] else ""
        out.append(f"  {st['symbol']:<14} {val:>16}  {words(st['what'])}{formula}  "
                   f"[{st['clause']}]")
    out += ["", "Modes"]
    for name, m in d["modes"].items():
        out.append(f"  {name:<16} Lc {show(m['effective_length'], system):>14}  "
                   f"slenderness {show(m['slenderness'], system):>8}  "
                   f"Fcr {show(m['critical_stress'], system):>10}  Pn {show(m['nominal_strength'], system)}")
    if d["bow"]:
        b = d["bow"]
        out += ["", f"Measured bow, {b['axis']} axis: excess over {b.get('allowance', 'L/1000')} "
                f"{show(b['excess'], system)}; "
                f"capacity with the bow {show(b['capacity'], system)} "
                f"(axial alone {show(d['axial_design_strength'], system)})"]
    if d.get("beam_column"):
        b = d["beam_column"]
        out += ["", f"Axial force with bending ({b['equation']}): interaction "
                f"{show(b['interaction'], system)}; capacity with the moments in proportion "
                f"{show(b['capacity'], system)}; Mc strong {show(b['flexural_strength']['strong'], system)}, "
                f"weak {show(b['flexural_strength']['weak'], system)}"]
    if d.get("section_band"):
        b = d["section_band"]
        out += ["", f"Loss band {show(b['from'], system)} to {show(b['to'], system)}: section strength "
                f"{show(b['section_strength'], system)}, capacity {show(b['capacity'], system)}"]
    out += ["", f"Governing mode:    {d['governing_mode']} ({d.get('governing_words', '')})",
            f"Nominal strength:  {show(d['nominal_strength'], system)}",
            f"Design strength:   {show(d['design_strength'], system)}"]
    if d["demand"]:
        out.append(f"Demand:            {show(d['demand'], system)} ({d['demand']['combination']})")
        if d["utilization"] is None:
            out.append("Utilization:       none: the code gives no strength here (see warnings)")
        else:
            word = "OK" if d["status"] == "ok" else "OVER CAPACITY"
            out.append(f"Utilization:       {d['utilization']['value']:.3f}  {word}")
    u = d.get("uncertainty")
    if u:
        sp = u["spreads"]
        out += ["", f"Uncertainty ({u['samples']} samples, seed {u['seed']}; thickness sd "
                f"{sp['thickness_sd_mm']:g} mm, size sd {sp['size_sd_mm']:g} mm, Fy CoV {sp['fy_cov']:g} "
                f"({sp['fy_cov_basis']})):",
                f"  design strength 5th percentile {show(u['percentile_5'], system)}, median "
                f"{show(u['median'], system)}, 95th percentile {show(u['percentile_95'], system)}"]
        if u["probability_demand_exceeds_capacity"] is not None:
            out.append(f"  probability that the demand exceeds the capacity: "
                       f"{u['probability_demand_exceeds_capacity']:.4f}")
        out += [f"  ({n})" for n in u["notes"]]
    for w in d["warnings"]:
        out.append(f"WARNING [{w['code']}]: {w['message']}")
    out += ["", CAUTION]
    return "\n".join(out)


def _input_lines(rec: dict) -> list[str]:
    """The record as entered, one line per part, so the sheet shows what was assumed."""
    lines = [f"length {rec.get('length')}", f"section {json.dumps(rec.get('section'))}",
             f"material {json.dumps(rec.get('material'))}"]
    for axis, spec in (rec.get("restraints") or {}).items():
        lines.append(f"{axis}: {json.dumps(spec)}")
    for key in ("k_basis", "code", "demand", "condition", "gamma_M1"):
        if key in rec:
            lines.append(f"{key} {json.dumps(rec[key])}")
    return lines
