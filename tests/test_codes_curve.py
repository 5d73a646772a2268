"""The column curves drawn on the Check tab, against published values."""

import math

import numpy as np
import pytest

from fieldcol.codes import column_curve
from fieldcol.errors import InputError

KSI = 6.894757  # MPa


def test_aisc_curve_matches_the_handbook_table():
    # AISC Manual 14th ed. Table 4-22 (values from memory, see notes/engineering.md):
    # Fy 36 ksi, Lc/r 25: phi Fcr = 31.4 ksi, i.e. Fcr = 34.9 ksi
    c = column_curve("aisc360-22", 36 * KSI, 29000 * KSI, x_max=200, points=201)
    at25 = float(np.interp(25.0, c.x, c.stress)) / KSI
    assert 0.9 * at25 == pytest.approx(31.4, abs=0.05)
    assert c.stress[0] == pytest.approx(36 * KSI)
    # AISC 360-22 E3-3 beyond 4.71 sqrt(E/Fy): 0.877 Fe
    assert c.stress[-1] == pytest.approx(0.877 * math.pi**2 * 29000 * KSI / 200**2, rel=1e-9)
    assert (np.diff(c.stress) <= 1e-9).all()


def test_en_curves_match_the_reduction_factor_table():
    # EN 1993-1-1 6.3.1.2 (6.49), chi at lambda-bar 1.0: curve b 0.5970, curve c 0.5399
    # (published chi tables, see notes/engineering.md)
    for letter, chi in (("b", 0.5970), ("c", 0.5399)):
        c = column_curve("en1993-1-1", 275.0, 210000.0, curve=letter, x_max=2.0, points=11)
        assert float(c.stress[5]) / 275.0 == pytest.approx(chi, abs=5e-5)
        assert c.x_name == "λ-bar" and letter in c.label


def test_elastic_curve_is_euler_capped_at_yield():
    # Euler: pi^2 E / (Lc/r)^2 (Timoshenko & Gere), the squash stress below
    c = column_curve("elastic", 250.0, 200000.0, x_max=200, points=5)
    assert c.stress[0] == 250.0
    assert c.stress[-1] == pytest.approx(math.pi**2 * 200000.0 / 200**2)


def test_bad_entries_name_the_field():
    with pytest.raises(InputError) as e:
        column_curve("en1993-1-1", 275.0, 210000.0, curve="e")
    assert e.value.field == "curve"
    with pytest.raises(InputError) as e:
        column_curve("aisc360-22", -1.0, 210000.0)
    assert e.value.field == "fy"
