"""EN 1993-1-1 6.3.1 checks against the Eurocode text, published chi values and EN 10365 rows."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fieldcol.codes import buckling_curves, check_en1993, reduction_factor
from fieldcol.errors import InputError

try:
    from tests.test_codes_shapes import E_EN, G_EN, box, en_i, tube, welded_i
except ImportError:  # tests/ run as a plain directory
    from test_codes_shapes import E_EN, G_EN, box, en_i, tube, welded_i

ALPHA = {"a0": 0.13, "a": 0.21, "b": 0.34, "c": 0.49, "d": 0.76}  # EN 1993-1-1 Table 6.1

# chi of EN 1993-1-1 6.3.1.2 (6.49) worked to four places by hand with the Table 6.1 alphas; they
# agree with the chi tables printed in design handbooks for curves b and c (from memory; a0, a and d
# at lb = 1.0 from the formula only)
CHI = [("b", 0.5, 0.8842), ("b", 1.0, 0.5970), ("b", 1.5, 0.3422), ("b", 2.0, 0.2095),
       ("c", 0.5, 0.8430), ("c", 1.0, 0.5399), ("c", 1.5, 0.3145), ("c", 2.0, 0.1962),
       ("a0", 1.0, 0.7253), ("a", 1.0, 0.6656), ("d", 1.0, 0.4671)]


@pytest.mark.parametrize("curve, lb, chi", CHI)
def test_reduction_factor_matches_published_chi(curve, lb, chi):
    assert round(float(reduction_factor(lb, ALPHA[curve])), 4) == chi


def test_plateau_below_0_2():
    # EN 1993-1-1 6.3.1.2 (4): for lb <= 0.2 buckling effects may be ignored (chi = 1)
    for alpha in ALPHA.values():
        assert reduction_factor(np.array([0.0, 0.1, 0.2]), alpha).tolist() == pytest.approx([1, 1, 1])


# EN 1993-1-1 Table 6.2: (kind, rolled, h/b, tf mm, S460) -> (y-y, z-z)
TABLE_6_2 = [
    ("i", True, 2.0, 10.7, False, "a", "b"),    # IPE 300
    ("i", True, 2.0, 10.7, True, "a0", "a0"),
    ("i", True, 2.0, 50.0, False, "b", "c"),
    ("i", True, 2.0, 50.0, True, "a", "a"),
    ("i", True, 0.97, 14.0, False, "b", "c"),   # HEA 300
    ("i", True, 0.97, 14.0, True, "a", "a"),
    ("i", True, 1.0, 110.0, False, "d", "d"),
    ("i", True, 1.0, 110.0, True, "c", "c"),
    ("i", False, 2.0, 20.0, False, "b", "c"),   # welded I
    ("i", False, 2.0, 20.0, True, "b", "c"),
    ("i", False, 2.0, 45.0, False, "c", "d"),
    ("rect", True, 1.5, 8.0, False, "a", "a"),  # hot-finished hollow
    ("rect", True, 1.5, 8.0, True, "a0", "a0"),
    ("rect", False, 1.5, 8.0, False, "c", "c"),  # cold-formed hollow
    ("round", True, 1.0, 8.0, False, "a", "a"),
    ("round", False, 1.0, 8.0, True, "c", "c"),
]


@pytest.mark.parametrize("kind, rolled, hb, tf, hs, y, z", TABLE_6_2)
def test_curve_selection_table_6_2(kind, rolled, hb, tf, hs, y, z):
    cy, cz, assumed = buckling_curves(kind, rolled, hb, tf, hs)
    assert (str(cy), str(cz)) == (y, z)
    assert not bool(assumed)


def test_curve_selection_vectorised_and_off_table_rows_flagged():
    y, z, assumed = buckling_curves("i", True, np.array([2.0, 2.0]), np.array([10.0, 120.0]), False)
    assert y.tolist() == ["a", "d"] and z.tolist() == ["b", "d"]
    assert assumed.tolist() == [False, True]  # h/b > 1.2 with tf > 100 mm has no row in Table 6.2


def test_lambda_bar_equals_lcr_over_i_lambda1():
    # EN 1993-1-1 6.3.1.3 (6.50): lb = Lcr / (i lambda1), lambda1 = pi sqrt(E/fy) = 93.9 eps
    s = en_i("HEA 300")  # EN 10365 row via steel-sections
    L = 4000.0
    r = check_en1993(s, 235.0, E_EN, G_EN, L, L, L)
    lam1 = 93.9  # eps = 1 for S235 (EN 1993-1-1 6.3.1.3)
    assert float(r.modes["flexural-weak"].slenderness) == pytest.approx(L / float(s.ry) / lam1, rel=1e-3)
    assert float(r.modes["flexural-strong"].slenderness) == pytest.approx(L / float(s.rx) / lam1, rel=1e-3)


def test_hea300_s235_by_hand():
    # EN 1993-1-1 6.3.1.2 (6.49) by hand for HEA 300 (EN 10365 via steel-sections: A 112.53 cm^2,
    # Iz 6308 cm^4), S235, Lcr 6 m: h/b = 0.97 -> z-z curve c (Table 6.2).
    s = en_i("HEA 300")
    L = 6000.0
    r = check_en1993(s, 235.0, E_EN, G_EN, L, L, 1000.0)
    A, Iz = 112.528e2, 6308e4
    Ncr = math.pi**2 * 210000 * Iz / L**2
    lb = math.sqrt(A * 235 / Ncr)
    phi = 0.5 * (1 + 0.49 * (lb - 0.2) + lb**2)
    chi = 1 / (phi + math.sqrt(phi**2 - lb**2))
    assert str(r.governing) == "flexural-weak"
    assert float(r.design) == pytest.approx(chi * A * 235, rel=1e-9)
    assert r.basis == "en" and r.code == "en1993-1-1"
    r11 = check_en1993(s, 235.0, E_EN, G_EN, L, L, 1000.0, gamma_M1=1.1)
    assert float(r11.design) == pytest.approx(float(r.design) / 1.1)


# Table 5.2 classes in pure compression (classes from memory; c/t from the EN 10365 rows):
# IPE 300 web c/t 35.0, flange 5.3; HE 300 A web 24.5, flange 8.5.
CLASSES = [("IPE 300", 235.0, 2), ("IPE 300", 355.0, 4), ("HEA 300", 235.0, 1), ("HEA 300", 355.0, 3)]


@pytest.mark.parametrize("name, fy, cls", CLASSES)
def test_section_class_table_5_2(name, fy, cls):
    r = check_en1993(en_i(name), fy, E_EN, G_EN, 3000.0, 3000.0, 3000.0)
    steps = {st.symbol: st for st in r.trace.steps}
    assert int(steps["class"].value) == cls
    assert (r.warning("class-4") is not None) == (cls == 4)


def test_class_4_effective_area_ipe300_s355():
    # EN 1993-1-5 4.4 (4.2), psi = 1, k_sigma = 4, by hand for the IPE 300 web in S355
    s = en_i("IPE 300")
    fy = 355.0
    eps = math.sqrt(235 / fy)
    c, tw = 300 - 2 * 10.7 - 2 * 15, 7.1  # EN 10365 dimensions
    lp = (c / tw) / (28.4 * eps * 2)
    rho = (lp - 0.055 * 4) / lp**2
    Aeff = 53.812e2 - (1 - rho) * c * tw
    L = 2500.0
    r = check_en1993(s, fy, E_EN, G_EN, L, L, L)
    steps = {st.symbol: st for st in r.trace.steps}
    assert float(steps["Aeff"].value) == pytest.approx(Aeff, rel=1e-9)
    assert float(r.modes["yield"].Pn) == pytest.approx(Aeff * fy, rel=1e-9)
    # (6.51): lb = sqrt(Aeff fy / Ncr) for Class 4
    Ncr = math.pi**2 * 210000 * 603.6e4 / L**2
    assert float(r.modes["flexural-weak"].slenderness) == pytest.approx(math.sqrt(Aeff * fy / Ncr), rel=1e-9)
    assert r.warning("class-4").mask.all()


def test_class_4_outstand_welded_flange():
    # EN 1993-1-5 4.4 (4.3): outstand, k_sigma = 0.43, rho = (lp - 0.188)/lp^2; by hand
    s = welded_i(d=400.0, bf=400.0, tf=10.0, tw=12.0)  # c/t = 19.4 > 14 eps (S235)
    r = check_en1993(s, 235.0, E_EN, G_EN, 2000.0, 2000.0, 2000.0)
    ct = (400 - 12) / 2 / 10
    lp = ct / (28.4 * 1.0 * math.sqrt(0.43))
    rho = (lp - 0.188) / lp**2
    web_ct = 380 / 12  # 31.7 <= 33: web fully effective
    assert web_ct < 33
    Aeff = float(s.A) - 4 * (1 - rho) * ct * 10 * 10
    assert float(r.modes["yield"].Pn) == pytest.approx(Aeff * 235, rel=1e-9)


def test_class_4_chs_is_refused_per_column():
    # EN 1993-1-1 Table 5.2: CHS d/t > 90 eps^2 is Class 4, designed to EN 1993-1-6 (not here)
    s = tube(np.array([300.0, 600.0]), np.array([10.0, 5.0]))  # d/t 30 and 120 > 90 (S235)
    r = check_en1993(s, 235.0, E_EN, G_EN, 3000.0, 3000.0, 3000.0)
    w = r.warning("class-4-chs")
    assert w is not None and w.mask.tolist() == [False, True]
    assert np.isfinite(r.design[0]) and np.isnan(r.design[1])


def test_rhs_class_4_both_walls():
    # EN 1993-1-5 4.4 (4.2) for both pairs of walls of a cold-formed box, by hand; curve c
    s = box(300.0, 200.0, 4.0, rolled=False)  # c/t = 72 and 47 > 42 eps (S355)
    fy = 355.0
    eps = math.sqrt(235 / fy)
    loss = 0.0
    for c in (300 - 12, 200 - 12):
        lp = (c / 4) / (28.4 * eps * 2)
        loss += 2 * (1 - min(1.0, (lp - 0.22) / lp**2)) * c * 4
    r = check_en1993(s, fy, E_EN, G_EN, 3000.0, 3000.0, 3000.0)
    assert float(r.modes["yield"].Pn) == pytest.approx((float(s.A) - loss) * fy, rel=1e-9)
    assert str(r.governing) == "flexural-weak"


def test_torsional_mode_uses_weak_curve_and_ncr_t():
    # EN 1993-1-1 6.3.1.4: Ncr,T = (G It + pi^2 E Iw / lT^2) / i0^2, i0^2 = iy^2 + iz^2
    s = en_i("IPE 300")
    r = check_en1993(s, 235.0, E_EN, G_EN, 1000.0, 1000.0, 8000.0)
    A, Iy, Iz, It, Iw = (float(x) for x in (s.A, s.Ix, s.Iy, s.J, s.Cw))
    NcrT = (G_EN * It + math.pi**2 * E_EN * Iw / 8000.0**2) / ((Iy + Iz) / A)
    m = r.modes["torsional"]
    assert float(m.Pe) == pytest.approx(NcrT, rel=1e-12)
    lb = math.sqrt(A * 235 / NcrT)
    assert float(m.Fcr) == pytest.approx(float(reduction_factor(lb, 0.34)) * 235, rel=1e-12)  # curve b


def test_high_strength_flag_per_column():
    s = en_i("IPE 300")
    r = check_en1993(s, np.array([460.0, 460.0]), E_EN, G_EN, 5000.0, 5000.0, 5000.0,
                     high_strength=np.array([False, True]))
    assert r.design[1] > r.design[0]  # curve a0 instead of b about z-z


@pytest.mark.parametrize("field, kwargs", [
    ("fy", dict(fy=0.0)), ("gamma_M1", dict(gamma_M1=0.9)), ("gamma_M1", dict(gamma_M1=float("nan"))),
    ("high_strength", dict(high_strength="yes")), ("Lc_twist", dict(Lc_twist=-5.0)),
])
def test_bad_input_names_its_field(field, kwargs):
    args = dict(fy=355.0, E=E_EN, G=G_EN, Lc_strong=3000.0, Lc_weak=3000.0, Lc_twist=3000.0)
    args.update(kwargs)
    with pytest.raises(InputError) as e:
        check_en1993(en_i("IPE 300"), **args)
    assert e.value.field == field
