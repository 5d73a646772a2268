"""Retrofit cover plates bolted or riveted, not only welded: the option carries the connection
and the pitch and is checked as the section's own fastened plates.

Hand-worked from the clauses as recalled (from memory): AISC 360-22 E6.1 (E6-1) with bolts
snug-tight, ri = tp / sqrt(12), E3; EN 1993-1-8 3.5 Table 3.3 (a plate between fasteners need
not be checked while p1 / t < 9 eps; beyond, it buckles over 0.6 p1, EN 1993-1-1 6.3.1 curve c).
The column is invented.
"""

from __future__ import annotations

import math

import pytest

from fieldcol.assess import assess
from fieldcol.errors import InputError
from fieldcol.retrofit import apply_option, compare, label

IN = 25.4
KSI = 6.894757
FY, E = 36 * KSI, 29000 * KSI          # ASTM A36 and AISC E (common practice), MPa


def _rec(code="aisc360-22"):
    return {"tag": "R/9", "length": "24 ft", "material": "A36", "code": code, "section": "W14X90",
            # weak axis and twist held at third points: the strong axis governs once plated
            "restraints": {"weak": {"braces": [{"at": "8 ft"}, {"at": "16 ft"}]},
                           "twist": {"braces": [{"at": "8 ft"}, {"at": "16 ft"}]}},
            "demand": {"axial": "700 kip"}}


PLATES = {"kind": "plates", "thickness": "1/2 in", "width": "14 in"}


def _step(a, symbol):
    return next(s["value"] for s in a.to_dict()["steps"] if s["symbol"] == symbol)


def test_bolted_retrofit_plates_use_the_modified_slenderness_by_hand():
    # E6.1 (E6-1): ri = 12.7 / sqrt(12) = 3.666 mm, a = 6 in = 152.4 mm: a/ri = 41.57;
    # (Lc/r)m = sqrt((Lc/rx)^2 + 41.57^2), then E3 with Fy 36 ksi
    welded, bolted = compare(_rec(), [PLATES, {**PLATES, "connection": "bolted", "pitch": "6 in"}])
    a = bolted.after
    assert _step(a, "a/ri") == pytest.approx(41.569, abs=1e-3)
    rx = float(a.column.section.rx)
    m = math.hypot(24 * 12 * IN / rx, 152.4 / (12.7 / math.sqrt(12)))
    assert _step(a, "(Lc/r)m") == pytest.approx(m, rel=1e-9)
    Fe = math.pi**2 * E / m**2
    assert float(a.result.nominal) == pytest.approx(0.658 ** (FY / Fe) * FY * float(a.column.section.A),
                                                    rel=1e-3)
    # bolted plates help less than welded ones, but they help (common practice)
    assert bolted.design_before < bolted.design_after < welded.design_after
    assert label(bolted.option) == "plates 1/2 in x 14 in, bolted at 6 in"
    # the option's record is the section's own bolted plates: the same check
    same = assess(apply_option(_rec(), bolted.option))
    assert same.design_strength == pytest.approx(a.design_strength, rel=1e-12)


def test_riveted_retrofit_plates_under_en_buckle_between_fasteners_by_hand():
    # EN 1993-1-8 Table 3.3: A36 fy 248.2 MPa (36 ksi) under EN: eps = sqrt(235 / 248.2) = 0.9730,
    # 9 eps = 8.757; p1 / t = 152.4 / 12.7 = 12.0 >= 9 eps: the plate buckles over 0.6 p1:
    # lambda = (0.6 x 152.4 / (12.7 / sqrt(12))) / (93.9 eps) = 24.94 / 91.37 = 0.2730
    (c,) = compare(_rec("en1993-1-1"), [{**PLATES, "connection": "riveted", "pitch": "6 in"}])
    a = c.after
    eps = math.sqrt(235 / FY)
    assert _step(a, "p1/tp") == pytest.approx(12.0, rel=1e-9)
    lb = (0.6 * 152.4 / (12.7 / math.sqrt(12))) / (93.9 * eps)
    assert _step(a, "lb,plate") == pytest.approx(lb, rel=1e-6)
    # curve c (alpha 0.49), EN 1993-1-1 (6.49)
    phi = 0.5 * (1 + 0.49 * (lb - 0.2) + lb**2)
    chi = 1 / (phi + math.sqrt(phi**2 - lb**2))
    assert _step(a, "chi,plate") == pytest.approx(chi, rel=1e-6)


def test_retrofit_holes_reach_the_bending_check():
    # AISC 360-22 F13.1 with holes drilled for the retrofit's bolts (A992 would trip F13-1; A36
    # does not: Fu Afn >= Fy Afg, the step says so)
    rec = _rec()
    rec["demand"]["moments"] = {"strong": "150 kip*ft"}
    (c,) = compare(rec, [{**PLATES, "connection": "bolted", "pitch": "6 in",
                          "holes": {"diameter": "15/16 in", "per_flange": 4}}])
    assert _step(c.after, "FuAfn/YtFyAfg") > 0


@pytest.mark.parametrize("opt, field", [
    ({**PLATES, "connection": "bolted"}, "option.pitch"),
    ({**PLATES, "connection": "glued", "pitch": "6 in"}, "option.connection"),
    ({**PLATES, "pitch": "6 in"}, "option.pitch"),
    ({**PLATES, "connection": "bolted", "pitch": "6"}, "option.pitch"),
    ({**PLATES, "connection": "welded", "holes": {"diameter": "1 in", "per_flange": 2}}, "option.holes"),
    ({**PLATES, "connection": "bolted", "pitch": "6 in", "holes": {"diameter": "1 in", "per_flange": 0}},
     "option.holes.per_flange"),
    ({**PLATES, "bolts": "4"}, "option.bolts"),
])
def test_bad_bolted_plates_name_the_option_field(opt, field):
    with pytest.raises(InputError) as e:
        apply_option(_rec(), opt)
    assert e.value.field == field
