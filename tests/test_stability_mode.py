"""The first buckled shape of a column axis against the closed-form mode shapes of the
classical cases (Timoshenko & Gere, Theory of Elastic Stability, Ch. 2)."""

import math

import numpy as np
import pytest

from fieldcol.errors import InputError
from fieldcol.stability import Brace, mode_shape

L, EI = 5000.0, 2.0e12


def _same(shape, expected):
    """Equal up to sign, both scaled to a largest deflection of 1."""
    e = expected / np.max(np.abs(expected))
    return min(float(np.max(np.abs(shape.w - e))), float(np.max(np.abs(shape.w + e))))


def test_pinned_column_is_a_sine_half_wave():
    # Timoshenko & Gere: pinned-pinned, w = sin(pi z / L), Pcr = pi^2 EI / L^2
    s = mode_shape(L, EI, "pinned", "pinned")
    assert _same(s, np.sin(np.pi * s.z / L)) < 1e-6
    assert s.Pcr == pytest.approx(math.pi**2 * EI / L**2, rel=1e-4)
    assert s.z[0] == 0.0 and s.z[-1] == L


def test_cantilever_is_a_quarter_wave():
    # Timoshenko & Gere: fixed base, free top, w = 1 - cos(pi z / 2L), K = 2
    s = mode_shape(L, EI, "fixed", "free")
    assert _same(s, 1 - np.cos(np.pi * s.z / (2 * L))) < 1e-6
    assert s.K == pytest.approx(2.0, rel=1e-4)


def test_fixed_fixed_is_a_full_cosine_wave():
    # Timoshenko & Gere: both ends fixed, w = 1 - cos(2 pi z / L), K = 0.5
    s = mode_shape(L, EI, "fixed", "fixed")
    assert _same(s, 1 - np.cos(2 * np.pi * s.z / L)) < 1e-6


def test_fixed_pinned_follows_tan_kl_equals_kl():
    # Timoshenko & Gere: fixed at z = 0, pinned at z = L: tan kL = kL, kL = 4.4934,
    # w = tan kL (1 - cos kz) - kz + sin kz
    kl = 4.493409457909064
    s = mode_shape(L, EI, "fixed", "pinned")
    kz = kl * s.z / L
    assert _same(s, math.tan(kl) * (1 - np.cos(kz)) - kz + np.sin(kz)) < 1e-5
    assert s.K == pytest.approx(math.pi / kl, rel=1e-4)


def test_rigid_brace_at_mid_height_gives_two_half_waves():
    # Timoshenko & Gere: a rigid support at mid-height of a pinned column: w = sin(2 pi z / L)
    s = mode_shape(L, EI, "pinned", "pinned", [Brace(L / 2)])
    assert _same(s, np.sin(2 * np.pi * s.z / L)) < 1e-6
    assert s.at(L / 2) == pytest.approx(0.0, abs=1e-9)
    assert L / 2 in s.z


def test_soft_brace_keeps_the_single_half_wave():
    # Timoshenko & Gere: below k = 16 pi^2 EI / L^3 the pinned column still buckles in one
    # half wave, the brace point moving
    k = 0.5 * 16 * math.pi**2 * EI / L**3
    s = mode_shape(L, EI, "pinned", "pinned", [Brace(L / 2, k)])
    assert s.at(L / 2) == pytest.approx(1.0, abs=1e-6)
    assert (s.w >= -1e-9).all()


def test_mechanism_names_the_field():
    with pytest.raises(InputError) as e:
        mode_shape(L, EI, "pinned", "free", field="restraints.weak")
    assert e.value.field.startswith("restraints.weak")
