"""Open holes in a loss band: yield on the net area, the flexural strength without the holes."""

import pytest

from fieldcol.assess import assess
from fieldcol.errors import InputError
from fieldcol.sections import from_catalogue

IN = 25.4
KIP = 4448.2216152605   # N, NIST SP 811
KSI = 6.894757293168361


def _col(holes, **more):
    return {"tag": "H", "section": {"name": "W10X49", "loss": {"holes": holes, "from": "0 in", "to": "6 in"}},
            "material": "A992", "length": "12 ft", "demand": {"axial": "300 kip"}, **more}


def _step(a, symbol):
    return next(s for s in a.trace.steps if s.symbol == symbol)


def test_net_area_by_hand():
    # W10X49 (AISC Shapes Database v15.0: A 14.4 in2, tf 0.560 in, tw 0.340 in): a 1 in hole in
    # each flange and a 2 in hole in the web leave 14.4 - 2 x 1 x 0.560 - 2 x 0.340 = 12.60 in2;
    # compact, no member buckling at the band: phi Pn = 0.9 x 50 x 12.60 = 567 kips (AISC 360-22
    # E3 at Lc -> 0; holes deducted, common practice)
    a = assess(_col({"flange": "1 in", "web": "2 in"}))
    pc = _step(a, "Pc_band").value / KIP
    assert pc == pytest.approx(567, rel=0.015)       # the catalogue's A within 1.5 % of the database
    s = from_catalogue("W10X49")
    net = float(s.A) - (2 * 1 * float(s.tf) + 2 * float(s.tw)) * IN
    assert _step(a, "Pc_band").value == pytest.approx(0.9 * 50 * KSI * net, rel=1e-4)
    assert a.to_dict()["section_band"]["section_strength"]["value"] == pytest.approx(pc * KIP)


def test_flange_hole_lowers_the_bending_strength_in_the_band():
    # with a moment the band's flexural strength drops with a flange hole at the tip:
    # dZy = tf w (bf - w) of 2 flanges' tf bf^2 / 4 each (plastic modulus by hand)
    moment = {"axial": "150 kip", "moments": {"weak": "40 kip*ft"}}
    plain = assess({**_col({}), "demand": moment})
    holed = assess({**_col({"flange": "2 in"}), "demand": moment})
    s = from_catalogue("W10X49")
    tf, bf = float(s.tf), float(s.bf)
    f = 1 - tf * 2 * IN * (bf - 2 * IN) / float(s.Zy)
    assert _step(holed, "f_holes_weak").value <= f + 1e-12
    assert holed.to_dict()["section_band"]["capacity"]["value"] < plain.to_dict()["section_band"]["capacity"]["value"]


def test_holes_need_a_band_and_room():
    with pytest.raises(InputError) as e:
        assess({"tag": "H", "section": {"name": "W10X49", "loss": {"holes": {"web": "2 in"}}},
                "material": "A992", "length": "12 ft"})
    assert e.value.field == "section.loss.holes"
    with pytest.raises(InputError) as e:
        assess(_col({"flange": "11 in"}))
    assert e.value.field == "section.loss.holes.flange" and e.value.text == "11 in"
    with pytest.raises(InputError) as e:
        assess(_col({"wall": "1 in"}))
    assert e.value.field == "section.loss.holes.wall"
