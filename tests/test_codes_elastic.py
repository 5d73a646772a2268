"""Classical elastic buckling check against the closed-form solutions of elastic stability."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fieldcol.codes import MODES, check_elastic
from fieldcol.codes.elastic import NOTE

try:
    from tests.test_codes_shapes import E_US, G_US, IN, KSI, aisc_w, tube
except ImportError:  # tests/ run as a plain directory
    from test_codes_shapes import E_US, G_US, IN, KSI, aisc_w, tube

FT = 12 * IN


def test_euler_loads_w14x74():
    # Euler: Pcr = pi^2 E I / Lc^2 (Timoshenko & Gere, Theory of Elastic Stability), in kips with
    # the AISC Shapes Database v15.0 row of W14x74 (Ix 795, Iy 134 in^4), 20 ft, E 29,000 ksi
    s = aisc_w("W14X74")
    L = 20 * FT
    r = check_elastic(s, 36 * KSI, E_US, G_US, L, L, L)
    kip = 4448.2216152605  # N, exact
    assert float(r.modes["flexural-strong"].Pe) / kip == pytest.approx(math.pi**2 * 29000 * 795 / 240**2)
    assert float(r.modes["flexural-weak"].Pe) / kip == pytest.approx(math.pi**2 * 29000 * 134 / 240**2)
    # 665.9 kips / 21.8 in^2 = 30.5 ksi < 36: elastic buckling about the weak axis governs
    assert str(r.governing) == "flexural-weak"
    assert float(r.design) == float(r.nominal) == pytest.approx(float(r.modes["flexural-weak"].Pe))
    assert r.basis == "none" and r.code == "elastic"


def test_torsional_buckling_load_w14x74():
    # Timoshenko & Gere: Pcr,T = (G J + pi^2 E Cw / Lz^2) / r0^2, r0^2 = (Ix + Iy)/A for a doubly
    # symmetric section; AISC Shapes Database v15.0: J 3.87 in^4, Cw 5990 in^6, A 21.8 in^2
    s = aisc_w("W14X74")
    r = check_elastic(s, 50 * KSI, E_US, G_US, 5 * FT, 5 * FT, 30 * FT)
    kip = 4448.2216152605
    Lz = 360.0
    expected = (11200 * 3.87 + math.pi**2 * 29000 * 5990 / Lz**2) / ((795 + 134) / 21.8)
    assert float(r.modes["torsional"].Pe) / kip == pytest.approx(expected, rel=1e-9)


def test_thin_tube_twists_at_g():
    # a circular tube has J = Ix + Iy, so its elastic torsional buckling stress is G (closed form)
    s = tube(200.0, 5.0)
    r = check_elastic(s, 250.0, 200000.0, 77200.0, 3000.0, 3000.0, 3000.0)
    assert float(r.modes["torsional"].Pe) / float(s.A) == pytest.approx(77200.0)
    assert str(r.governing) != "torsional"


def test_short_column_reaches_the_squash_load():
    # Pcr/A above Fy: the capacity is A Fy and the elastic result is marked as beyond its range
    s = tube(300.0, 10.0)
    r = check_elastic(s, 250.0, 200000.0, 77200.0, np.array([500.0, 20000.0]), 500.0, 500.0)
    assert r.governing.tolist() == ["yield", "flexural-strong"]
    assert r.nominal[0] == pytest.approx(250.0 * float(s.A))
    assert r.warning("beyond-elastic").mask.tolist() == [True, False]


def test_trace_says_no_factor():
    s = tube(300.0, 10.0)
    r = check_elastic(s, 250.0, 200000.0, 77200.0, 4000.0, 4000.0, 4000.0)
    assert r.trace.steps[0].what == NOTE
    assert "no resistance factor" in NOTE and "Pcr/A < Fy" in NOTE
    assert set(r.modes) == set(MODES)
    assert r.modes["yield"].Pe is None
