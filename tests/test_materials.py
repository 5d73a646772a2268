"""Materials table: grades against their published minimums, thickness bands, names, tests.

Sources named beside each check: ASTM specified minimums (common practice of the trade),
EN 1993-1-1:2005 Table 3.1 and 3.2.6, EN 10025-2:2004 Table 7, NIST SP 811 for ksi -> MPa.
Values recalled rather than read from a source at hand say "from memory".
"""

from __future__ import annotations

import csv
import doctest

import numpy as np
import pytest

import fieldcol.materials as materials
from fieldcol.errors import InputError
from fieldcol.materials import Material, get_material, list_materials, material_from_values, with_tested_fy

# NIST SP 811 Appendix B: 1 lbf = 4.4482216152605 N, 1 in = 25.4 mm (exact); ksi from lbf/in^2
KSI = 4448.2216152605 / 25.4**2


# ----------------------------------------------------------------------------- ASTM grades

# ASTM specified minimum Fy, Fu in ksi (common practice; A500 round/rect per editions before 2018)
ASTM = [
    ("A36", 36, 58),
    ("A572-50", 50, 65),
    ("A992", 50, 65),
    ("A500B", 46, 58),
    ("A500B-round", 42, 58),
    ("A500C", 50, 62),
    ("A500C-round", 46, 62),
    ("A53B", 35, 60),
]


@pytest.mark.parametrize("key, fy, fu", ASTM)
def test_astm_minimums(key, fy, fu):
    m = get_material(key)
    assert m.family == "aisc" and not m.historic
    assert m.Fy == pytest.approx(fy * KSI, rel=1e-12)
    assert m.Fu == pytest.approx(fu * KSI, rel=1e-12)
    # E = 29,000 ksi, G = 11,200 ksi (AISC 360-22; common practice)
    assert m.E == pytest.approx(29000 * KSI, rel=1e-12)
    assert m.G == pytest.approx(11200 * KSI, rel=1e-12)
    assert m.fy_at(np.array([5.0, 100.0])).tolist() == pytest.approx([m.Fy, m.Fy])  # no bands


def test_aisc_e_in_mpa():
    # 29,000 ksi is 199,948 MPa (documented choice; AISC SI editions round to 200,000 MPa)
    assert round(get_material("A992").E) == 199948


# ----------------------------------------------------------------------------- EN grades

# EN 1993-1-1:2005 Table 3.1, EN 10025-2 rows: fy, fu for t <= 40 mm and 40 < t <= 80 mm (MPa)
EN_TABLE_3_1 = [
    ("S235", 235, 360, 215, 360),
    ("S275", 275, 430, 255, 410),
    ("S355", 355, 490, 335, 470),
    ("S450", 440, 550, 410, 550),
    # EN 10025-3 S460 N/NL row of Table 3.1 (from memory: confirm)
    ("S460", 460, 540, 430, 540),
]


@pytest.mark.parametrize("key, fy1, fu1, fy2, fu2", EN_TABLE_3_1)
def test_en_table_3_1(key, fy1, fu1, fy2, fu2):
    m = get_material(key)
    assert m.family == "en"
    assert (m.Fy, m.Fu) == (fy1, fu1)
    t = np.array([3.0, 16.0, 40.0, 40.001, 63.0, 80.0])
    assert m.fy_at(t).tolist() == [fy1, fy1, fy1, fy2, fy2, fy2]
    assert m.fu_at(t).tolist() == [fu1, fu1, fu1, fu2, fu2, fu2]
    # E = 210,000 MPa and G = 81,000 MPa: EN 1993-1-1 3.2.6
    assert (m.E, m.G) == (210000.0, 81000.0)


# EN 10025-2:2004 Table 7 minimum ReH by nominal thickness (<=16, 40, 63, 80, 100, 150 mm)
EN_10025_2 = [
    ("S235-EN10025", [235, 225, 215, 215, 215, 195], [360] * 5 + [350]),
    ("S275-EN10025", [275, 265, 255, 245, 235, 225], [410] * 5 + [400]),
    ("S355-EN10025", [355, 345, 335, 325, 315, 295], [470] * 5 + [450]),
]


@pytest.mark.parametrize("key, fy, fu", EN_10025_2)
def test_en_10025_2_bands(key, fy, fu):
    m = get_material(key)
    t_max = [16, 40, 63, 80, 100, 150]
    assert m.fy_at(np.array(t_max, float)).tolist() == fy
    assert m.fy_at(np.array(t_max, float) - 0.5).tolist() == fy
    assert m.fu_at(np.array(t_max, float)).tolist() == fu
    with pytest.raises(InputError):
        m.fy_at(150.5)


def test_bands_vectorised_and_shape_kept():
    m = get_material("S355")
    t = np.array([[10.0, 50.0], [40.0, 80.0]])
    out = m.fy_at(t)
    assert isinstance(out, np.ndarray) and out.shape == (2, 2)
    assert out.tolist() == [[355.0, 335.0], [355.0, 335.0]]
    assert isinstance(m.fy_at(12.0), float)


@pytest.mark.parametrize("t", [80.01, 120.0, np.array([20.0, 95.0])])
def test_beyond_last_band_is_an_error(t):
    with pytest.raises(InputError) as info:
        get_material("S355").fy_at(t, field="section.tf")
    assert info.value.field == "section.tf"
    assert "80 mm" in info.value.reason


@pytest.mark.parametrize("t", [0.0, -5.0, float("nan"), float("inf"), np.array([10.0, 0.0]), "ten"])
def test_bad_thickness(t):
    with pytest.raises(InputError) as info:
        get_material("S275").fy_at(t)
    assert info.value.field == "thickness"


# ----------------------------------------------------------------------------- historic


# Historic grades (values from memory unless marked): Fy, Fu in ksi
HISTORIC = [
    ("A7", 33, 60),
    ("A9", 30, 55),  # Fy = Fu/2 >= 30 ksi (AISC "Iron and Steel Beams 1873-1952"); Fu from memory
    ("A373", 32, 58),
    ("wrought-iron", 24, 48),
]


@pytest.mark.parametrize("key, fy, fu", HISTORIC)
def test_historic(key, fy, fu):
    m = get_material(key)
    assert m.historic and m.family == "historic"
    assert m.Fy == pytest.approx(fy * KSI)
    assert m.Fu == pytest.approx(fu * KSI)
    assert "coupon" in m.note.lower()


def test_wrought_iron_modulus():
    # E = 25,000 ksi for wrought iron (from memory; the low end of 25,000-28,000 ksi)
    assert get_material("wrought iron").E == pytest.approx(25000 * KSI)


def test_older_canadian_steel():
    # Fy 210 MPa, Fu 380 MPa (CISC "Historical structural steels", as quoted)
    m = get_material("older Canadian steel")
    assert (m.Fy, m.Fu, m.historic) == (210.0, 380.0, True)


# ----------------------------------------------------------------------------- names


@pytest.mark.parametrize(
    "name, key",
    [
        ("A572 Gr 50", "A572-50"),
        ("a572-50", "A572-50"),
        ("A572 Grade 50", "A572-50"),
        ("ASTM A572 Gr. 50", "A572-50"),
        ("A572Gr50", "A572-50"),
        ("a 36", "A36"),
        ("ASTM A992/A992M", "A992"),
        ("s355", "S355"),
        ("S355J2", "S355"),
        ("S355 JR", "S355"),
        ("S355J2H", "S355"),
        ("S275J0+N", "S275"),
        ("S460NL", "S460"),
        ("A500 Gr B", "A500B"),
        ("a500b", "A500B"),
        ("A500 Grade C", "A500C"),
        ("A500 Gr B round", "A500B-round"),
        ("a53 grade b", "A53B"),
        ("Wrought Iron", "wrought-iron"),
        ("44W", "300W"),
        ("350 W", "350W"),
        ("S355 product standard", "S355-EN10025"),
    ],
)
def test_aliases(name, key):
    assert get_material(name).key == key


def test_a500_round_by_shape():
    assert get_material("A500 Gr B", shape="round").key == "A500B-round"
    assert get_material("A500 Gr B", shape="rect").key == "A500B"
    assert get_material("A500 Gr B round", shape="rect").key == "A500B"
    assert get_material("A500 Gr C", shape="round").Fy == pytest.approx(46 * KSI)
    assert get_material("A992", shape="round").key == "A992"  # not shape-dependent
    with pytest.raises(InputError) as info:
        get_material("A500 Gr B", shape="oval")
    assert info.value.field == "material.shape"


def test_unknown_grade_names_field_and_close_names():
    with pytest.raises(InputError) as info:
        get_material("A99")
    e = info.value
    assert e.field == "material" and e.reason == "unknown material"
    assert "A992" in e.hint
    with pytest.raises(InputError) as info:
        get_material("S460Q", field="columns[3].material")  # quenched and tempered: not in the table
    assert info.value.field == "columns[3].material"
    for bad in ("", "   ", None, 355):
        with pytest.raises(InputError):
            get_material(bad)


@pytest.mark.parametrize("name", ["cast iron", "Cast-Iron", "grey iron", "CI"])
def test_cast_iron_refused(name):
    with pytest.raises(InputError) as info:
        get_material(name)
    e = info.value
    assert e.field == "material"
    assert "brittle" in e.reason and "column curves do not apply" in e.reason
    assert "cast iron" in e.hint


def test_list_materials():
    mats = list_materials()
    keys = [m.key for m in mats]
    assert "cast-iron" not in keys
    assert len(keys) == len(set(keys))
    assert {"A36", "A992", "S355", "A7", "wrought-iron"} <= set(keys)
    for m in mats:
        assert isinstance(m, Material) and m.source
        assert m.family in materials.FAMILIES
        assert 0 < m.Fy <= m.Fu and 0 < m.G < m.E
        for (t1, fy1, _), (t2, fy2, _) in zip(m.bands, m.bands[1:]):
            assert t1 < t2 and fy1 >= fy2  # thicker never stronger


def test_csv_rows_cite_a_source():
    with materials.DATA_FILE.open(newline="", encoding="utf-8") as f:
        rows = list(csv.DictReader(f))
    for r in rows:
        s = r["source"].lower()
        assert any(w in s for w in ("astm", "en 1993", "en 10025", "cisc", "csa", "aisc", "from memory",
                                    "common practice")), r["key"]


# ----------------------------------------------------------------------------- tested and custom


def test_tested_fy_overrides_all_thicknesses():
    base = get_material("S355")
    m = with_tested_fy(base, "300 MPa")
    assert m.tested and m.Fy == 300.0
    assert m.fy_at(np.array([10.0, 60.0, 200.0])).tolist() == [300.0, 300.0, 300.0]
    assert m.fu_at(60.0) == 470.0  # the table Fu is kept
    assert "coupon" in m.note
    assert base.Fy == 355.0 and not base.tested  # the table material is unchanged
    m2 = with_tested_fy(get_material("A7"), 38.5 * KSI, Fu="62 ksi")
    assert m2.Fu == pytest.approx(62 * KSI) and m2.fu_at(500.0) == pytest.approx(62 * KSI)


def test_tested_fy_rejects_bad_values():
    with pytest.raises(InputError) as info:
        with_tested_fy(get_material("A36"), "36")  # 36 MPa: the ksi was left off
    assert info.value.field == "material.Fy"
    with pytest.raises(InputError) as info:
        with_tested_fy(get_material("A36"), "40 ksi", Fu="38 ksi")
    assert info.value.field == "material.Fu"


def test_material_from_values():
    m = material_from_values(Fy="50 ksi", E="29000 ksi", Fu="65 ksi", name="coupon B/4")
    assert m.family == "custom" and m.name == "coupon B/4"
    assert m.Fy == pytest.approx(50 * KSI) and m.E == pytest.approx(29000 * KSI)
    assert m.G == pytest.approx(29000 * KSI / 2.6)  # G = E / (2 (1 + 0.3)), common practice
    d = material_from_values(Fy=250.0)
    assert (d.E, d.Fy) == (200000.0, 250.0) and np.isnan(d.Fu)
    assert "E not given" in d.note and "Fu not given" in d.note
    assert material_from_values(Fy="36 ksi", tested=True).tested


@pytest.mark.parametrize(
    "kwargs, field",
    [
        (dict(Fy="50"), "material.Fy"),  # 50 MPa: implausible, the unit was left off
        (dict(Fy="50 ksi", E="29000"), "material.E"),
        (dict(Fy="50 ksi", G="11200"), "material.G"),
        (dict(Fy="345 MPa", Fu="300 MPa"), "material.Fu"),
        (dict(Fy="50 kip"), "material.Fy"),
        (dict(Fy="-345 MPa"), "material.Fy"),
        (dict(Fy=float("nan")), "material.Fy"),
    ],
)
def test_material_from_values_rejects(kwargs, field):
    with pytest.raises(InputError) as info:
        material_from_values(**kwargs)
    assert info.value.field == field


def test_module_examples():
    assert doctest.testmod(materials).failed == 0
