"""Alignment-chart K (fieldcol.stability.k_alignment)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fieldcol.errors import InputError
from fieldcol.stability import k_alignment

INF = math.inf
X_FP = 4.493409457909064  # root of tan x = x (fixed-pinned, Timoshenko & Gere, from memory)


@pytest.mark.parametrize("Ga, Gb, sway, K", [
    # Classical limits of the chart equations (AISC 360-22 Commentary App. 7, from memory):
    # G = 0 is a fixed end, G = inf a pinned one.
    (0.0, 0.0, False, 0.5),
    (INF, INF, False, 1.0),
    (0.0, INF, False, math.pi / X_FP),  # 0.699, the "0.7" of the tables
    (INF, 0.0, False, math.pi / X_FP),
    (0.0, 0.0, True, 1.0),
    (0.0, INF, True, 2.0),
    (INF, 0.0, True, 2.0),
])
def test_classical_limits(Ga, Gb, sway, K):
    assert float(k_alignment(Ga, Gb, sway)) == pytest.approx(K, rel=1e-9)


def test_chart_readings():
    # Readings off the alignment charts (AISC 360 Commentary Figures C-A-7.1 and C-A-7.2,
    # from memory); the tolerance is that of reading a chart, not of the solution.
    assert float(k_alignment(1.0, 1.0, sway=False)) == pytest.approx(0.77, abs=0.01)
    assert float(k_alignment(1.0, 1.0, sway=True)) == pytest.approx(1.32, abs=0.02)
    # Common practice G = 10 for a pinned base, 1 for a fixed base: a fixed-base sway column
    # with a stiff beam over it sits a little above K = 1.
    assert 1.0 < float(k_alignment(1.0, 0.0, sway=True)) < 1.2


def _braced_residual(Ga, Gb, K):
    x = math.pi / K
    return (Ga * Gb / 4 * x * x + (Ga + Gb) / 2 * (1 - x / math.tan(x))
            + 2 * math.tan(x / 2) / x - 1)


def _sway_residual(Ga, Gb, K):
    x = math.pi / K
    return (Ga * Gb * x * x - 36) / (6 * (Ga + Gb)) - x / math.tan(x)


@settings(max_examples=200, deadline=None)
@given(Ga=st.floats(0.01, 100.0), Gb=st.floats(0.01, 100.0))
def test_root_satisfies_the_printed_equations(Ga, Gb):
    Kb = float(k_alignment(Ga, Gb, sway=False))
    Ks = float(k_alignment(Ga, Gb, sway=True))
    assert 0.5 <= Kb <= 1.0 and Ks >= 1.0
    # The residual of the equations as printed, scaled by their size near the root.
    h = 1e-7
    for res, K in ((_braced_residual, Kb), (_sway_residual, Ks)):
        slope = abs(res(Ga, Gb, K * (1 + h)) - res(Ga, Gb, K * (1 - h))) / (2 * h * K)
        assert abs(res(Ga, Gb, K)) <= 1e-9 * max(1.0, slope * K)


@pytest.mark.parametrize("sway", [False, True])
def test_single_root_in_the_range(sway):
    # A dense scan of the printed equation finds exactly one sign change in the K range.
    for Ga, Gb in [(0.1, 0.1), (1.0, 1.0), (0.5, 20.0), (10.0, 10.0), (50.0, 0.2)]:
        Ks = np.linspace(0.5005, 0.9995, 4000) if not sway else np.linspace(1.0005, 30.0, 20000)
        f = _sway_residual if sway else _braced_residual
        v = np.array([f(Ga, Gb, k) for k in Ks])
        # tan poles give sign flips through infinity: count only finite-valued crossings
        flips = np.flatnonzero((np.sign(v[:-1]) != np.sign(v[1:])) & (np.abs(v[:-1]) < 1e3)
                               & (np.abs(v[1:]) < 1e3))
        assert flips.size == 1
        K = float(k_alignment(Ga, Gb, sway))
        assert Ks[flips[0]] <= K <= Ks[flips[0] + 1]


def test_vectorised_and_symmetric():
    Ga = np.array([[0.0], [0.5], [2.0], [INF]])
    Gb = np.array([0.0, 1.0, 10.0])
    K = k_alignment(Ga, Gb, sway=False)
    assert K.shape == (4, 3)
    for i in range(4):
        for j in range(3):
            assert K[i, j] == pytest.approx(float(k_alignment(Ga[i, 0], Gb[j], False)), rel=1e-12)
            assert K[i, j] == pytest.approx(float(k_alignment(Gb[j], Ga[i, 0], False)), rel=1e-12)


def test_monotone_in_g():
    G = np.geomspace(1e-3, 1e3, 200)
    for sway in (False, True):
        K = k_alignment(G, 2.0, sway)
        assert np.all(np.diff(K) > 0)


def test_large_g_sway_goes_to_infinity_smoothly():
    # Both ends nearly pinned in a sway frame: K grows like pi sqrt(G / 12) (expand the sway
    # equation for small pi/K).
    G = np.array([1e2, 1e4, 1e6])
    K = k_alignment(G, G, sway=True)
    assert np.all(np.isfinite(K))
    assert K[-1] == pytest.approx(math.pi * math.sqrt(1e6 / 12), rel=1e-3)


def test_bad_input():
    with pytest.raises(InputError) as e:
        k_alignment(-1.0, 1.0, False, field="frame")
    assert e.value.field == "frame.Ga"
    with pytest.raises(InputError) as e:
        k_alignment([1.0, float("nan")], 1.0, False, field="frame")
    assert e.value.field == "frame.Gb[1]" or e.value.field == "frame.Ga[1]"
    with pytest.raises(InputError) as e:
        k_alignment([1.0, INF], [INF, INF], True, field="frame")
    assert e.value.field == "frame[1]" and "mechanism" in e.value.reason
    with pytest.raises(InputError):
        k_alignment("stiff", 1.0, False)
