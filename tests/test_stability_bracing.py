"""Brace demand, cable stiffness and springs in series (fieldcol.stability)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fieldcol.errors import InputError
from fieldcol.stability import Brace, brace_requirement, buckling_analysis, cable_stiffness, series


def test_point_brace_lrfd_and_asd():
    # AISC 360-22 Appendix 6.2 (from memory): Pbr = 0.01 Pr; beta_br = (1/phi)(8 Pr/Lbr),
    # phi = 0.75 (LRFD), or Omega (8 Pr/Lbr), Omega = 2.00 (ASD).
    Pr, Lbr = 1.2e6, 3000.0  # N, mm
    Pbr, beta = brace_requirement(Pr, Lbr, "lrfd")
    assert Pbr == pytest.approx(12000.0)
    assert beta == pytest.approx(8 * Pr / Lbr / 0.75)  # 4266.7 N/mm
    assert beta == pytest.approx(4266.6667, rel=1e-6)
    Pbr, beta = brace_requirement(Pr, Lbr, "asd")
    assert Pbr == pytest.approx(12000.0)
    assert beta == pytest.approx(2.0 * 8 * Pr / Lbr)  # 6400 N/mm


def test_panel_brace():
    # AISC 360-22 Appendix 6.2 panel bracing (from memory): Vbr = 0.005 Pr, beta = (1/phi)(2 Pr/Lbr).
    Vbr, beta = brace_requirement(1.2e6, 3000.0, "lrfd", kind="panel")
    assert Vbr == pytest.approx(6000.0)
    assert beta == pytest.approx(2 * 1.2e6 / 3000.0 / 0.75)


def test_brace_requirement_broadcasts():
    Pbr, beta = brace_requirement(np.array([1e5, 2e5, 4e5]), 2000.0)
    assert Pbr.shape == beta.shape == (3,)
    assert np.allclose(beta / beta[0], [1, 2, 4])


@pytest.mark.parametrize("args, field", [
    ((-1.0, 3000.0, "lrfd"), "brace.Pr"),
    ((1e5, 0.0, "lrfd"), "brace.Lbr"),
    ((1e5, 3000.0, "LRFD-ish"), "brace.basis"),
    ((float("nan"), 3000.0, "asd"), "brace.Pr"),
])
def test_brace_requirement_errors(args, field):
    with pytest.raises(InputError) as e:
        brace_requirement(*args)
    assert e.value.field == field


def test_cable_stiffness():
    # k = (A E / L) cos^2(theta), theta between the cable and the movement (common practice).
    assert float(cable_stiffness(100.0, 200000.0, 5000.0, 0.0)) == pytest.approx(4000.0)
    assert float(cable_stiffness(100.0, 200000.0, 5000.0, 45.0)) == pytest.approx(2000.0)
    assert float(cable_stiffness(100.0, 200000.0, 5000.0, 60.0)) == pytest.approx(1000.0)
    with pytest.raises(InputError) as e:
        cable_stiffness(100.0, 200000.0, 5000.0, 90.0)
    assert e.value.field == "cable.angle_deg"
    with pytest.raises(InputError) as e:
        cable_stiffness(0.0, 200000.0, 5000.0, 30.0)
    assert e.value.field == "cable.A"


def test_series():
    # Springs in series: 1/k = sum 1/k_i (AISC 360-22 Appendix 6 commentary, from memory).
    assert float(series(1000.0, 1000.0)) == pytest.approx(500.0)
    assert float(series(3000.0, 6000.0, math.inf)) == pytest.approx(2000.0)
    assert float(series(math.inf, math.inf)) == math.inf
    assert float(series(0.0, 5000.0)) == 0.0
    assert np.allclose(series(np.array([1000.0, 2000.0]), 2000.0), [2000 / 3, 1000.0])
    with pytest.raises(InputError) as e:
        series(1000.0, -5.0)
    assert e.value.field == "springs[1]"
    with pytest.raises(InputError):
        series()


def test_brace_meeting_the_requirement_holds_the_column_near_its_braced_load():
    # A mid-height point brace of twice the ideal stiffness: the ideal (Timoshenko & Gere,
    # from memory: 16 pi^2 EI / L^3 = 4 Pe (2/Lbr) for one mid brace) takes a pinned column to
    # the two-half-wave load; Appendix 6 asks 8 Pr/Lbr / phi, i.e. more than that at Pr = 4 Pe.
    L, EI = 6000.0, 2.0e12
    Lbr = L / 2
    Pe2 = math.pi**2 * EI / Lbr**2  # braced (two half-wave) load
    _, beta = brace_requirement(Pe2, Lbr, "lrfd")
    assert beta > 16 * math.pi**2 * EI / L**3
    r = buckling_analysis(L, EI, "pinned", "pinned", [Brace(Lbr, float(beta))])
    assert r.Pcr == pytest.approx(Pe2, rel=1e-4)
    # A cable giving the same stiffness in series with a connection keeps the column there.
    k = series(cable_stiffness(150.0, 200000.0, 4000.0, 30.0), 5.0e4)
    assert float(k) > 16 * math.pi**2 * EI / L**3
