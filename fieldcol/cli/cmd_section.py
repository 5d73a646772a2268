"""``fieldcol section NAME``: a catalogue section's dimensions and properties."""

from __future__ import annotations

import argparse
from typing import Any

# (attribute, unit kind, what it is)
DIMENSIONS = (
    ("d", "length", "depth (hollow: outside depth / diameter)"),
    ("bf", "length", "flange width (hollow: outside width)"),
    ("tf", "length", "flange thickness (hollow: design wall)"),
    ("tw", "length", "web thickness (hollow: design wall)"),
    ("r", "length", "root fillet radius (rect hollow: outside corner radius)"),
)
PROPERTIES = (
    ("A", "area", "gross area"),
    ("Ix", "inertia", "second moment of area, strong axis"),
    ("Iy", "inertia", "second moment of area, weak axis"),
    ("Sx", "modulus", "elastic section modulus, strong axis"),
    ("Sy", "modulus", "elastic section modulus, weak axis"),
    ("Zx", "modulus", "plastic section modulus, strong axis"),
    ("Zy", "modulus", "plastic section modulus, weak axis"),
    ("rx", "length", "radius of gyration, strong axis"),
    ("ry", "length", "radius of gyration, weak axis"),
    ("J", "inertia", "torsional constant"),
    ("Cw", "warping", "warping constant"),
    ("ho", "length", "distance between flange centroids"),
)
RATIOS = (
    ("lam_flange", "flange slenderness (AISC b/t)"),
    ("lam_web", "web slenderness (AISC h/tw)"),
    ("ct_flange", "flange c/t (EN 1993-1-1 Table 5.2)"),
    ("ct_web", "web c/t (EN 1993-1-1 Table 5.2)"),
)
KIND_WORDS = {"i": "I / H shape", "rect": "rectangular hollow", "round": "round hollow"}


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``section`` command to the CLI parser.

    Usage: ``fieldcol section W14X90 --units si``.
    """
    p = sub.add_parser("section", help="show a catalogue section's dimensions and properties",
                       description="Show the dimensions and derived properties of a catalogue "
                       "section (AISC W, HP, S, M, HSS, Pipe; EN IPE, HEA, HEB, HEM). Names "
                       "ignore case and spaces: W14X90, 'HE 300 B', HSS8X8X1/2, Pipe6STD.")
    p.add_argument("name", nargs="+", help="the designation, e.g. W14X90 or HE 300 B")
    p.add_argument("--units", choices=("us", "si"),
                   help="display units (default: us for AISC shapes, si for EN shapes)")
    p.add_argument("--json", action="store_true", help="print JSON (each quantity as value + unit)")
    p.set_defaults(func=run)


def quantity(value: Any, kind: str, system: str) -> dict[str, Any]:
    """A value in internal units as ``{"value": ..., "unit": ...}`` in display units.

    Args:
        value: number in mm-based internal units; kind: a ``fieldcol.units`` kind or ``"ratio"``.
        system: ``"us"`` or ``"si"``.
    Returns:
        dict with a float value and a pint-readable unit (``""`` for a pure number).

    Example:
        >>> quantity(25.4, "length", "us")
        {'value': 1.0, 'unit': 'in'}
    """
    from fieldcol.units import display_unit, to_display

    if kind == "ratio":
        return {"value": float(value), "unit": ""}
    return {"value": float(to_display(float(value), kind, system)),
            "unit": display_unit(kind, system)}


def show(value: Any, kind: str, system: str) -> str:
    """A value as text in display units; section lengths in decimal inches or mm.

    Args:
        value: number in internal units; kind: unit kind; system: ``"us"`` or ``"si"``.
    Returns:
        e.g. ``"0.710 in"``, ``"18.03 mm"``, ``"999 in^4"``.

    Example:
        >>> show(18.034, "length", "us")
        '0.710 in'
    """
    from fieldcol.units import format_quantity

    if kind == "length":  # a section dimension reads better as 0.710 in than as 11/16"
        q = quantity(value, kind, system)
        return f"{q['value']:.3f} in" if system == "us" else f"{q['value']:.2f} mm"
    return format_quantity(float(value), kind, system)


def default_system(family: str) -> str:
    """The display system a family is published in.

    Args:
        family: catalogue family, e.g. ``"W"`` or ``"HEB"``.
    Returns:
        ``"us"`` for AISC families, ``"si"`` for EN ones.

    Example:
        >>> default_system("HEB")
        'si'
    """
    from fieldcol.sections._catalogue import EN_FAMILIES

    return "si" if family in EN_FAMILIES else "us"


def section_dict(s: Any, system: str, family: str | None = None) -> dict[str, Any]:
    """A Section as JSON-ready dict (dimensions, properties, plate ratios, notes).

    Args:
        s: the Section; system: ``"us"`` or ``"si"``; family: catalogue family or None.
    Returns:
        dict whose quantities are ``{"value": float, "unit": pint-readable str}``.

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> section_dict(from_catalogue("W14X90"), "us")["properties"]["A"]["unit"]
        'in^2'
    """
    return {
        "name": s.name,
        "family": family,
        "kind": s.kind,
        "rolled": s.rolled,
        "units": system,
        "dimensions": {k: quantity(getattr(s, k), kind, system) for k, kind, _ in DIMENSIONS},
        "properties": {k: quantity(getattr(s, k), kind, system) for k, kind, _ in PROPERTIES},
        "plate_ratios": {k: quantity(getattr(s, k), "ratio", system) for k, _ in RATIOS},
        "notes": list(s.notes),
    }


def run(args: argparse.Namespace) -> int:
    """Print one catalogue section; returns the exit status (bad names raise InputError).

    Example:
        >>> from fieldcol.cli import main
        >>> main(["section", "W14X90"])
        W14X90  (W, I / H shape, hot-rolled)
        ...
          A          26.43 in^2  gross area
        ...
        fieldcol is an aid to, not a substitute for, the judgement ... local codes govern.
        0
    """
    from fieldcol.cli import CAUTION, print_json
    from fieldcol.sections import from_catalogue
    from fieldcol.sections._catalogue import catalogue_arrays

    s = from_catalogue(" ".join(args.name))
    cat = catalogue_arrays()
    family = str(cat.family[list(cat.names).index(s.name)])
    system = args.units or default_system(family)
    if args.json:
        out = section_dict(s, system, family)
        out["caution"] = CAUTION
        print_json(out)
        return 0
    lines = [f"{s.name}  ({family}, {KIND_WORDS[s.kind]}, "
             f"{'hot-rolled' if s.rolled else 'cold-formed / welded'})", "", "Dimensions"]
    lines += [f"  {k:<4} {show(getattr(s, k), kind, system):>16}  {what}"
              for k, kind, what in DIMENSIONS]
    lines += ["", "Properties"]
    lines += [f"  {k:<4} {show(getattr(s, k), kind, system):>16}  {what}"
              for k, kind, what in PROPERTIES]
    lines += ["", "Plate slenderness"]
    lines += [f"  {k:<10} {float(getattr(s, k)):>10.2f}  {what}" for k, what in RATIOS]
    if s.notes:
        lines += ["", "Notes"] + [f"  - {n}" for n in s.notes]
    lines += ["", CAUTION]
    print("\n".join(lines))
    return 0
