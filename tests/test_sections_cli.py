"""``fieldcol section`` and ``fieldcol identify`` through the real command line entry point."""

from __future__ import annotations

import json

import pint
import pytest

from fieldcol.cli import CAUTION, main


def _run(capsys, *argv):
    code = main(list(argv))
    out = capsys.readouterr()
    return code, out.out, out.err


def test_section_prints_properties_and_the_caution(capsys):
    code, out, _ = _run(capsys, "section", "W14X90")
    assert code == 0
    assert "W14X90" in out and "in^4" in out and "torsional constant" in out
    assert out.rstrip().endswith(CAUTION)


def test_section_json_quantities_are_pint_readable(capsys):
    # AISC Shapes Database v15.0 W14X90: A = 26.5 in^2, Ix = 999 in^4 (within 1.5 %)
    code, out, _ = _run(capsys, "section", "w", "14", "x", "90", "--json")
    assert code == 0
    data = json.loads(out)
    ureg = pint.UnitRegistry()
    for group in ("dimensions", "properties", "plate_ratios"):
        for q in data[group].values():
            ureg.Quantity(q["value"], q["unit"])  # raises if pint cannot read the unit
    a = ureg.Quantity(data["properties"]["A"]["value"], data["properties"]["A"]["unit"])
    assert a.to("in**2").magnitude == pytest.approx(26.5, rel=0.015)
    ix = data["properties"]["Ix"]
    ix_in4 = ureg.Quantity(ix["value"], ix["unit"]).to("in**4").magnitude
    assert ix_in4 == pytest.approx(999, rel=0.015)
    assert data["caution"] == CAUTION


def test_section_in_si_units(capsys):
    code, out, _ = _run(capsys, "section", "HE", "300", "B", "--json")
    data = json.loads(out)
    assert code == 0 and data["units"] == "si" and data["properties"]["A"]["unit"] == "mm^2"
    # EN 10365 HEB 300 (steel-sections): A = 149.08 cm^2
    assert data["properties"]["A"]["value"] == pytest.approx(14908, rel=0.005)


def test_unknown_section_exits_2_naming_the_field(capsys):
    code, _, err = _run(capsys, "section", "W14X91")
    assert code == 2 and err.startswith("error: section:") and "W14X90" in err


def test_identify_ranks_the_measured_w14x90(capsys):
    code, out, _ = _run(capsys, "identify", "--d", "13.9in", "--bf", "14.5in", "--tf", "0.70in",
                        "--tw", "0.45in", "--gauge", "0.02in", "--units", "us")
    assert code == 0
    first = [line for line in out.splitlines() if line.strip().startswith("1 ")][0]
    assert "W14X90" in first and "yes" in first
    assert out.rstrip().endswith(CAUTION)


def test_identify_json(capsys):
    code, out, _ = _run(capsys, "identify", "--D", "6.625 in", "--t", "0.26 in", "--family",
                        "PIPE", "--json")
    data = json.loads(out)
    assert code == 0 and data["match_found"] and data["matches"][0]["name"] == "Pipe6STD"
    ureg = pint.UnitRegistry()
    for m in data["matches"]:
        for q in m["deviation"].values():
            ureg.Quantity(q["value"], q["unit"])


def test_identify_says_plainly_when_nothing_matches(capsys):
    code, out, _ = _run(capsys, "identify", "--d", "1000", "--bf", "20", "--tf", "5", "--tw", "3",
                        "--units", "si")
    assert code == 0
    assert "Bare numbers (d, bf, tf, tw) read as mm (--units si)." in out
    assert "no catalogue match: use the measured section" in out
    code, out, _ = _run(capsys, "identify", "--d", "1000mm", "--bf", "20mm", "--tf", "5mm", "--tw", "3mm",
                        "--json")
    data = json.loads(out)
    assert not data["match_found"] and data["message"].startswith("no catalogue match")


@pytest.mark.parametrize("argv, field", [
    (("--d", "14fr", "--bf", "300"), "d"),
    (("--d", "300mm", "--bf=-3mm"), "bf"),
    (("--d", "300mm",), "d"),
    (("--d", "14",), "d"),
    (("--d", "300", "--bf", "300", "--tf", "19", "--tw", "11", "--units", "si", "--family", "ZZ"), "family"),
])
def test_identify_bad_entries_exit_2_naming_the_field(capsys, argv, field):
    code, _, err = _run(capsys, "identify", *argv)
    assert code == 2 and err.startswith(f"error: {field}:")


def test_identify_answers_in_the_units_the_entries_were_typed_in(capsys):
    assert main(["identify", "--d", "13.9in", "--bf", "14.5in", "--tf", "0.70in",
                 "--tw", "0.45in", "--limit", "1"]) == 0
    assert "d 13.900 in" in capsys.readouterr().out
    assert main(["identify", "--d", "353mm", "--bf", "368mm", "--tf", "17.8mm", "--tw", "11.4mm",
                 "--limit", "1"]) == 0
    assert "d 353.00 mm" in capsys.readouterr().out
