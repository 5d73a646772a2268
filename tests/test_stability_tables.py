"""Table K, braced segments and twist length of fieldcol.stability."""

from __future__ import annotations

import math

import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from fieldcol.errors import InputError
from fieldcol.stability import (Brace, End, buckling_analysis, effective_length, end, k_table,
                                k_table_many, kind, partial_end, twist_length)
from fieldcol.trace import Trace

# Theoretical K (Timoshenko & Gere, Theory of Elastic Stability) / recommended design K
# (AISC 360 Commentary Table C-A-7.1), both from memory.
CLASSICAL = [
    ("fixed", "fixed", 0.5, 0.65),
    ("fixed", "pinned", 0.7, 0.80),
    ("fixed", "guided", 1.0, 1.2),
    ("pinned", "pinned", 1.0, 1.0),
    ("fixed", "free", 2.0, 2.1),
    ("pinned", "guided", 2.0, 2.0),
]
MECHANISMS = [("pinned", "free"), ("free", "pinned"), ("free", "free"), ("guided", "free"),
              ("free", "guided"), ("guided", "guided")]
NAMES = ["fixed", "pinned", "free", "guided"]


@pytest.mark.parametrize("a, b, k_th, k_rec", CLASSICAL)
def test_classical_k_both_bases_both_orders(a, b, k_th, k_rec):
    for lo, hi in ((a, b), (b, a)):
        assert k_table(end(lo, "b"), end(hi, "t"), "theoretical", "restraints.weak") == k_th
        assert k_table(end(lo, "b"), end(hi, "t"), "recommended", "restraints.weak") == k_rec


@pytest.mark.parametrize("a, b", MECHANISMS)
def test_mechanisms_refused_naming_axis_and_missing_restraint(a, b):
    with pytest.raises(InputError) as e:
        k_table(end(a, "b"), end(b, "t"), "theoretical", "restraints.strong")
    assert e.value.field == "restraints.strong"
    assert "mechanism" in e.value.reason
    assert e.value.hint and ("sway" in e.value.hint or "brace" in e.value.hint)


def test_pinned_free_message_says_what_to_hold():
    with pytest.raises(InputError) as e:
        k_table(end("pinned", "b"), end("free", "t"), "recommended", "restraints.weak")
    assert "sway and rotate freely at the top" in e.value.reason
    assert e.value.hint == "hold the top against sway or fix the bottom"


def test_partial_end_has_no_table_value():
    with pytest.raises(InputError) as e:
        k_table(partial_end(1e9), end("pinned", "t"), "theoretical", "restraints.weak")
    assert e.value.field == "restraints.weak.bottom"
    assert "analysis" in e.value.hint


def test_end_names_and_bad_entries():
    assert end(" Fixed ", "x") == End(math.inf, math.inf, "fixed")
    assert end("guided", "x") == End(0.0, math.inf, "guided")
    for bad in ("clamped", "", 3, None):
        with pytest.raises(InputError) as e:
            end(bad, "restraints.weak.top")
        assert e.value.field == "restraints.weak.top"
    with pytest.raises(InputError) as e:
        end(End(math.inf, 5e9, "fixed"), "restraints.weak.top")  # label disagrees with springs
    assert e.value.field == "restraints.weak.top"
    with pytest.raises(InputError) as e:
        end(End(-1.0, 0.0, "partial"), "restraints.weak.top")
    assert e.value.field == "restraints.weak.top.translation"
    with pytest.raises(InputError):
        partial_end(float("nan"))
    assert kind(End(math.inf, 0.0, "partial")) == "pinned"


def test_bad_basis_and_many():
    with pytest.raises(InputError) as e:
        k_table(end("fixed", "b"), end("fixed", "t"), "design", "restraints.weak")
    assert e.value.field == "restraints.weak.basis"
    assert k_table_many(["fixed", "pinned"], ["free", "guided"], "recommended", "w").tolist() == [2.1, 2.0]
    with pytest.raises(InputError) as e:
        k_table_many(["fixed", "free"], ["free", "free"], "recommended", "restraints.weak")
    assert e.value.field == "restraints.weak[1]"


# --- braced segments -------------------------------------------------------------------------

def test_rigid_brace_at_mid_height_halves_pinned_column():
    # A rigid brace at mid-height of a pinned-pinned column: K = 0.5 relative to the full length
    # (two pinned half-lengths, Timoshenko & Gere, from memory).
    r = effective_length(6000.0, "pinned", "pinned", [Brace(3000.0)], "theoretical", "restraints.weak")
    assert r.Lc == pytest.approx(3000.0)
    assert r.Lc / 6000.0 == pytest.approx(0.5)
    assert [s.length for s in r.segments] == [3000.0, 3000.0]
    fe = effective_length(6000.0, "pinned", "pinned", [Brace(3000.0)], "analysis", "restraints.weak")
    assert fe.K == pytest.approx(0.5, rel=1e-3)


def test_segments_take_real_end_outside_and_pinned_at_brace():
    r = effective_length(9000.0, "fixed", "guided", [Brace(3000.0), Brace(5000.0)],
                         "recommended", "restraints.weak")
    assert [(s.bottom_end, s.top_end, s.K) for s in r.segments] == [
        ("fixed", "pinned", 0.8), ("pinned", "pinned", 1.0), ("pinned", "guided", 2.0)]
    assert r.Lc == pytest.approx(8000.0)  # 2.0 x 4000 over the top segment governs
    assert r.K == 2.0


def test_brace_at_free_top_holds_it():
    # fixed-free with a brace at the top becomes fixed-pinned (common practice).
    r = effective_length(4000.0, "fixed", "free", [Brace(4000.0)], "theoretical", "restraints.weak")
    assert r.K == 0.7 and r.Lc == pytest.approx(2800.0)
    r = effective_length(4000.0, "fixed", "guided", [Brace(4000.0)], "recommended", "restraints.weak")
    assert r.K == 0.65


def test_free_end_beyond_a_brace_points_to_analysis():
    with pytest.raises(InputError) as e:
        effective_length(6000.0, "fixed", "free", [Brace(3000.0)], "theoretical", "restraints.weak")
    assert "analysis" in e.value.hint
    # The analysis takes it: a cantilever over a braced column is stable.
    r = effective_length(6000.0, "fixed", "free", [Brace(3000.0)], "analysis", "restraints.weak")
    assert 0 < r.K < 2.0


def test_finite_brace_needs_explicit_rigid_assumption():
    braces = [Brace(3000.0, 500.0)]
    with pytest.raises(InputError) as e:
        effective_length(6000.0, "pinned", "pinned", braces, "theoretical", "restraints.weak")
    assert e.value.field == "restraints.weak.braces[0].stiffness"
    r = effective_length(6000.0, "pinned", "pinned", braces, "theoretical", "restraints.weak",
                         assume_rigid=True)
    assert r.Lc == pytest.approx(3000.0)
    with pytest.raises(InputError) as e:  # a spring in the analysis needs EI
        effective_length(6000.0, "pinned", "pinned", braces, "analysis", "restraints.weak")
    assert e.value.field == "restraints.weak.EI"


@pytest.mark.parametrize("braces, field", [
    ([Brace(-1.0)], "restraints.weak.braces[0].at"),
    ([Brace(6001.0)], "restraints.weak.braces[0].at"),
    ([Brace(100.0), Brace(200.0, 0.0)], "restraints.weak.braces[1].stiffness"),
    ([Brace(float("nan"))], "restraints.weak.braces[0].at"),
])
def test_bad_braces_name_their_field(braces, field):
    with pytest.raises(InputError) as e:
        effective_length(6000.0, "pinned", "pinned", braces, "theoretical", "restraints.weak")
    assert e.value.field == field


@pytest.mark.parametrize("L", [0.0, -5.0, math.inf, float("nan"), "6 m", True])
def test_bad_length(L):
    with pytest.raises(InputError) as e:
        effective_length(L, "pinned", "pinned", [], "theoretical", "restraints.weak")
    assert e.value.field == "restraints.weak.L"


def test_trace_steps():
    t = Trace()
    effective_length(6000.0, "fixed", "pinned", [], "recommended", "restraints.weak", trace=t)
    assert [s.symbol for s in t.steps] == ["K", "Lc"]
    assert t.steps[0].clause == "AISC 360-22 Commentary Table C-A-7.1"
    assert t.steps[1].value == pytest.approx(4800.0)


@settings(max_examples=60, deadline=None)
@given(a=st.sampled_from(NAMES), b=st.sampled_from(NAMES),
       L=st.floats(1000.0, 12000.0),
       fr=st.lists(st.floats(0.05, 0.95), min_size=0, max_size=3))
def test_segment_table_never_above_analysis(a, b, L, fr):
    # Each segment with a pinned end at a rigid brace is a weaker problem than the continuous
    # column (the column's mode restricted to a segment is admissible for it), so the
    # theoretical-table load pi^2 EI / Lc^2 never exceeds the elastic buckling load.
    pts = sorted(fr)
    assume(all(b - a > 1e-3 for a, b in zip(pts, pts[1:])))  # closer points must be one brace
    EI = 1.0e12
    braces = [Brace(f * L) for f in fr]
    try:
        tab = effective_length(L, a, b, braces, "theoretical", "w")
    except InputError:
        return
    fe = buckling_analysis(L, EI, a, b, braces)
    assert fe.Pcr >= math.pi**2 * EI / tab.Lc**2 * (1 - 1e-9)


# --- twist ----------------------------------------------------------------------------------

def test_twist_length():
    # Longest length between points where twisting is prevented, ends included (common practice).
    assert twist_length(6000.0, []) == 6000.0
    assert twist_length(6000.0, [2000.0]) == 4000.0
    assert twist_length(6000.0, [4500.0, 1500.0, 6000.0]) == 3000.0
    with pytest.raises(InputError) as e:
        twist_length(6000.0, [7000.0])
    assert e.value.field == "restraints.twist.braces_at[0]"
