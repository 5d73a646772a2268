"""Elastic buckling by finite elements (fieldcol.stability.buckling_analysis / buckling_batch)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from fieldcol.errors import InputError
from fieldcol.stability import (Brace, End, buckling_analysis, buckling_batch, end, k_alignment,
                                k_table, kind, partial_end)
from fieldcol.stability._fe import _mesh
from fieldcol.trace import Trace

# Exact buckling loads of the classical cases, P = (pi / K)^2 EI / L^2 (Timoshenko & Gere,
# Theory of Elastic Stability, from memory): fixed-pinned from tan(x) = x, x = 4.493409,
# i.e. P = 20.19 EI/L^2 and K = 0.6992 (the tables round it to 0.7).
X_FP = 4.493409457909064
EXACT_K = {
    frozenset(["fixed"]): 0.5,
    frozenset(["fixed", "pinned"]): math.pi / X_FP,
    frozenset(["fixed", "guided"]): 1.0,
    frozenset(["pinned"]): 1.0,
    frozenset(["fixed", "free"]): 2.0,
    frozenset(["pinned", "guided"]): 2.0,
}
NAMES = ["fixed", "pinned", "free", "guided"]
lengths = st.floats(500.0, 20000.0)
rigidities = st.floats(1.0e10, 1.0e15)  # N*mm^2: from a small angle to a heavy built-up column


def test_tan_root():
    # The fixed-pinned root really solves tan x = x.
    assert math.tan(X_FP) == pytest.approx(X_FP, rel=1e-12)


@pytest.mark.parametrize("pair", list(EXACT_K))
def test_classical_cases_to_0_05_percent(pair):
    a, b = sorted(pair) if len(pair) == 2 else (next(iter(pair)),) * 2
    for lo, hi in ((a, b), (b, a)):
        r = buckling_analysis(3600.0, 3.0e12, lo, hi, n_el=20)
        assert r.K == pytest.approx(EXACT_K[pair], rel=5e-4)
        assert r.n_el == 20
        # The table value (rounded to two figures) agrees within its rounding.
        assert k_table(end(lo, "b"), end(hi, "t"), "theoretical", "w") == pytest.approx(r.K, rel=2e-3)


@settings(max_examples=80, deadline=None)
@given(pair=st.sampled_from(list(EXACT_K)), L=lengths, EI=rigidities, flip=st.booleans())
def test_fe_matches_table_for_random_length_and_rigidity(pair, L, EI, flip):
    a, b = sorted(pair) if len(pair) == 2 else (next(iter(pair)),) * 2
    if flip:
        a, b = b, a
    r = buckling_analysis(L, EI, a, b)
    assert r.K == pytest.approx(EXACT_K[pair], rel=1e-3)
    assert r.Pcr == pytest.approx(math.pi**2 * EI / (r.K * L) ** 2, rel=1e-12)


def test_pinned_mode_is_a_half_sine():
    # Pinned-pinned buckles in one half sine wave (Euler; common practice).
    r = buckling_analysis(5000.0, 1.0e12, "pinned", "pinned")
    assert np.max(np.abs(r.shape - np.sin(np.pi * r.z / 5000.0))) < 1e-6
    assert r.z[0] == 0.0 and r.z[-1] == pytest.approx(5000.0)
    assert np.max(np.abs(r.shape)) == 1.0


# --- end types: a finite positive K or InputError, and the FE agrees ---------------------------

def _reduced_stiffness(bottom: End, top: End) -> np.ndarray:
    """Dimensionless stiffness after the supports, assembled here from the element matrices."""
    xi, K0, _, _ = _mesh((), 20)
    nd = K0.shape[0]
    S = np.zeros(nd)
    S[[0, 1, nd - 2, nd - 1]] = [bottom.translation, bottom.rotation, top.translation, top.rotation]
    free = ~np.isinf(S)
    return K0[np.ix_(free, free)] + np.diag(S[free])


springs = st.one_of(st.just(0.0), st.floats(0.1, 1000.0))  # dimensionless: k L^3/EI, r L/EI
ends = st.one_of(
    st.sampled_from(NAMES).map(lambda n: end(n, "e")),
    st.builds(lambda r: partial_end(r), springs),
    st.builds(lambda r, t: partial_end(r, t), springs, springs),
)


@settings(max_examples=150, deadline=None)
@given(b=ends, t=ends)
def test_every_end_pair_gives_k_or_input_error_and_fe_agrees(b, t):
    # Springs are drawn dimensionless (EI = L = 1), so they go in as drawn.
    Kred = _reduced_stiffness(b, t)
    ev = np.linalg.eigvalsh(Kred)
    singular = ev[0] <= 1e-10 * ev[-1]
    try:
        fe = buckling_analysis(1.0, 1.0, b, t)
    except InputError as e:
        assert singular, "FE refused a stiffness that is not singular"
        assert "mechanism" in e.reason
        fe = None
    else:
        assert not singular
        assert math.isfinite(fe.K) and fe.K > 0 and fe.Pcr > 0
    if kind(b) != "partial" and kind(t) != "partial":
        try:
            k = k_table(b, t, "theoretical", "restraints.weak")
        except InputError as e:
            assert e.field == "restraints.weak" and fe is None
        else:
            assert fe is not None and k > 0
            assert fe.K == pytest.approx(EXACT_K[frozenset([kind(b), kind(t)])], rel=1e-3)


def test_springs_too_soft_to_count_are_refused():
    # A rotational spring of 1e-3 N*mm/rad on EI = 1e12 N*mm^2 is no restraint at all.
    with pytest.raises(InputError) as e:
        buckling_analysis(4000.0, 1e12, "pinned", partial_end(1e-3, 0.0), field="restraints.weak")
    assert e.value.field == "restraints.weak" and "too soft" in e.value.reason
    # ... but it does no harm where the column is held anyway.
    r = buckling_analysis(4000.0, 1e12, "pinned", partial_end(1e-3), field="restraints.weak")
    assert r.K == pytest.approx(1.0, rel=1e-3)


def test_mechanism_messages():
    with pytest.raises(InputError) as e:
        buckling_analysis(4000.0, 1e12, "guided", "guided", field="restraints.weak")
    assert e.value.field == "restraints.weak"
    assert "sway" in e.value.reason
    with pytest.raises(InputError) as e:
        buckling_analysis(4000.0, 1e12, "pinned", "free", field="restraints.weak")
    assert "rotate freely" in e.value.reason
    # A brace cures guided-guided: each half is pinned-guided, K = 2 on L/2, i.e. 1.0 on L.
    r = buckling_analysis(4000.0, 1e12, "guided", "guided", [Brace(2000.0)])
    assert r.K == pytest.approx(1.0, rel=1e-3)


# --- spring at mid-height --------------------------------------------------------------------

def _mid_spring_reference(u: float) -> tuple[float, float]:
    """(k L^3/EI, P/Pe) of the symmetric mode of a pinned column with a mid-height spring.

    From the deflection equation EI w'' + P w = (F/2) z on each half, w(0) = 0, w'(L/2) = 0,
    F = k w(L/2), with u = (L/2) sqrt(P/EI): k L^3/EI = 16 u^3 / (u - tan u), P = 4 u^2 EI/L^2.
    At u = pi it gives the threshold 16 pi^2 EI/L^3 of Timoshenko & Gere (from memory).
    """
    return 16 * u**3 / (u - math.tan(u)), 4 * u**2 / math.pi**2


def test_mid_height_spring_reaches_two_half_waves_at_threshold():
    # Timoshenko & Gere (from memory): at k = 16 pi^2 EI / L^3 the load reaches 4 Pe and stays.
    L, EI = 5000.0, 2.0e12
    Pe = math.pi**2 * EI / L**2
    k_th = 16 * math.pi**2 * EI / L**3
    for f in (1.0, 1.5, 10.0, 1e4):
        r = buckling_analysis(L, EI, "pinned", "pinned", [Brace(L / 2, f * k_th)])
        assert r.Pcr / Pe == pytest.approx(4.0, rel=5e-5)
    rigid = buckling_analysis(L, EI, "pinned", "pinned", [Brace(L / 2)])
    assert rigid.Pcr / Pe == pytest.approx(4.0, rel=5e-5)
    below = buckling_analysis(L, EI, "pinned", "pinned", [Brace(L / 2, 0.9 * k_th)])
    assert below.Pcr < 4.0 * Pe * (1 - 1e-3)


@settings(max_examples=40, deadline=None)
@given(u=st.floats(math.pi / 2 + 0.02, math.pi - 0.02))
def test_mid_height_spring_below_threshold_matches_closed_form(u):
    k_nd, p_ratio = _mid_spring_reference(u)
    L, EI = 4000.0, 1.0e12
    r = buckling_analysis(L, EI, "pinned", "pinned", [Brace(L / 2, k_nd * EI / L**3)])
    assert r.Pcr / (math.pi**2 * EI / L**2) == pytest.approx(p_ratio, rel=2e-4)


# --- monotone: stiffer or more braces never lower the load -------------------------------------

stable_pairs = [tuple(sorted(p)) if len(p) == 2 else (next(iter(p)),) * 2 for p in EXACT_K]


@settings(max_examples=60, deadline=None)
@given(pair=st.sampled_from(stable_pairs), fr=st.floats(0.05, 0.95),
       k1=st.floats(1e-2, 1e4), factor=st.floats(1.0, 1e3))
def test_pcr_never_drops_as_brace_stiffens(pair, fr, k1, factor):
    L, EI = 6000.0, 1.0e12
    scale = EI / L**3
    a = buckling_analysis(L, EI, *pair, [Brace(fr * L, k1 * scale)])
    b = buckling_analysis(L, EI, *pair, [Brace(fr * L, k1 * factor * scale)])
    c = buckling_analysis(L, EI, *pair, [Brace(fr * L)])
    assert b.Pcr >= a.Pcr * (1 - 1e-9)
    assert c.Pcr >= b.Pcr * (1 - 1e-9)


@settings(max_examples=60, deadline=None)
@given(pair=st.sampled_from(stable_pairs), fr=st.lists(st.floats(0.05, 0.95), max_size=2),
       new=st.floats(0.05, 0.95), k=st.one_of(st.just(math.inf), st.floats(1e-1, 1e4)))
def test_pcr_never_drops_when_a_brace_is_added(pair, fr, new, k):
    pts = sorted(fr + [new])
    assume(all(b - a > 1e-3 for a, b in zip(pts, pts[1:])))  # closer points must be one brace
    L, EI = 6000.0, 1.0e12
    old = [Brace(f * L) for f in fr]
    before = buckling_analysis(L, EI, *pair, old)
    after = buckling_analysis(L, EI, *pair, old + [Brace(new * L, k * EI / L**3)])
    # The new brace adds a node and changes the mesh; the computed load may then drop by the
    # discretisation error (the solver is accurate to 0.05 % at 20 elements), never by the brace.
    assert after.Pcr >= before.Pcr * (1 - 5e-4)


# --- partial ends against the alignment-chart equations --------------------------------------

@settings(max_examples=50, deadline=None)
@given(Ga=st.floats(0.05, 50.0), Gb=st.floats(0.05, 50.0))
def test_spring_ends_reproduce_alignment_chart_equations(Ga, Gb):
    # The chart equations (AISC 360-22 Commentary App. 7, from memory) are the buckling
    # condition of a column whose ends have rotational springs 2 EI/(L G) (braced frame, beams
    # in single curvature) or 6 EI/(L G) with one end free to sway (sway frame, double
    # curvature); two independent solutions of one problem.
    L, EI = 3600.0, 5.0e12
    braced = buckling_analysis(L, EI, partial_end(2 * EI / (L * Ga)), partial_end(2 * EI / (L * Gb)))
    assert braced.K == pytest.approx(float(k_alignment(Ga, Gb, sway=False)), rel=2e-5)
    sway = buckling_analysis(L, EI, partial_end(6 * EI / (L * Ga)), partial_end(6 * EI / (L * Gb), 0.0))
    assert sway.K == pytest.approx(float(k_alignment(Ga, Gb, sway=True)), rel=2e-5)


# --- batch ---------------------------------------------------------------------------------------

def test_batch_equals_single_solves():
    rng = np.random.default_rng(7)
    n = 25
    L = rng.uniform(2500.0, 9000.0, n)
    EI = rng.uniform(1e11, 1e13, n)
    rot = rng.uniform(1e8, 1e11, n)
    tops = [partial_end(r) if i % 3 else end("pinned", "t") for i, r in enumerate(rot)]
    kb = np.where(np.arange(n)[:, None] % 4 == 0, np.inf, rng.uniform(10.0, 1e4, (n, 2)))
    r = buckling_batch(L, EI, "fixed", tops, [0.3, 0.7], kb)
    assert r.Pcr.shape == (n,) and r.shape.shape == r.z.shape
    for i in range(n):
        one = buckling_analysis(L[i], EI[i], "fixed", tops[i],
                                [Brace(0.3 * L[i], kb[i, 0]), Brace(0.7 * L[i], kb[i, 1])])
        assert r.Pcr[i] == pytest.approx(one.Pcr, rel=1e-9)
        assert np.allclose(r.at(i).shape, one.shape, atol=1e-7)


def test_batch_rigid_supports_scale_as_ei_over_l_squared():
    L = np.array([3000.0, 4500.0, 6000.0])
    EI = np.array([1e12, 4e12, 9e12])
    r = buckling_batch(L, EI, "fixed", "free")
    assert np.allclose(r.K, 2.0, rtol=1e-6)
    assert np.allclose(r.Pcr * L**2 / EI, r.Pcr[0] * L[0] ** 2 / EI[0], rtol=1e-12)


def test_batch_errors_name_the_column():
    with pytest.raises(InputError) as e:
        buckling_batch([3000.0, -1.0], 1e12, "pinned", "pinned", field="group")
    assert e.value.field == "group.L[1]"
    with pytest.raises(InputError) as e:
        buckling_batch([3000.0, 3000.0], 1e12, "pinned", ["pinned", "free"], field="group")
    assert e.value.field == "group[1]"
    with pytest.raises(InputError) as e:
        buckling_batch(3000.0, 1e12, "pinned", "pinned", [1.2])
    assert e.value.field == "columns.braces[0].at"


@pytest.mark.parametrize("n_el", [0, 1, 501, 2.5, True])
def test_bad_element_count(n_el):
    with pytest.raises(InputError) as e:
        buckling_analysis(3000.0, 1e12, "pinned", "pinned", n_el=n_el)
    assert e.value.field == "column.n_el"


@pytest.mark.parametrize("EI", [0.0, -1e12, math.inf, float("nan")])
def test_bad_rigidity(EI):
    with pytest.raises(InputError) as e:
        buckling_analysis(3000.0, EI, "pinned", "pinned")
    assert e.value.field == "column.EI"


def test_braces_a_hair_apart_are_refused():
    with pytest.raises(InputError) as e:
        buckling_analysis(6000.0, 1e12, "pinned", "pinned", [Brace(3000.0), Brace(3000.3)],
                          field="restraints.weak")
    assert e.value.field == "restraints.weak.braces[1].at"
    with pytest.raises(InputError) as e:
        buckling_analysis(6000.0, 1e12, "fixed", "free", [Brace(5999.9)], field="restraints.weak")
    assert e.value.field == "restraints.weak.braces[0].at" and "other end" in e.value.reason


def test_braces_get_nodes_and_duplicates_add():
    r = buckling_analysis(6000.0, 1e12, "pinned", "pinned", [Brace(1234.5), Brace(4000.0)])
    assert np.any(np.isclose(r.z, 1234.5, rtol=0, atol=1e-9))
    assert np.any(np.isclose(r.z, 4000.0, rtol=0, atol=1e-9))
    # Two braces at one point act as one with the sum of their stiffnesses (springs in parallel).
    two = buckling_analysis(6000.0, 1e12, "pinned", "pinned", [Brace(3000.0, 300.0), Brace(3000.0, 200.0)])
    one = buckling_analysis(6000.0, 1e12, "pinned", "pinned", [Brace(3000.0, 500.0)])
    assert two.Pcr == pytest.approx(one.Pcr, rel=1e-12)


def test_trace():
    t = Trace()
    r = buckling_analysis(3000.0, 1e12, "pinned", "pinned", trace=t)
    assert [s.symbol for s in t.steps] == ["Pcr", "K"] and t.steps[0].value == r.Pcr
