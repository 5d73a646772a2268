"""Section loss: remaining thickness and uniform loss.

The remaining sections are checked against plate arithmetic and against a fresh section built
from the reduced dimensions; finite-element checks of thinned sections are in
test_sections_fe.py (sectionproperties).
"""

from __future__ import annotations

import numpy as np
import pytest

from fieldcol.errors import InputError
from fieldcol.sections import from_catalogue, i_section, rect_hollow, round_hollow, with_loss


def test_measured_flange_keeps_the_name_and_notes_it():
    s = from_catalogue("W14X90")
    t = with_loss(s, flange=12.1)
    assert t.name == "W14X90"
    assert "flange remaining 12.1 mm measured" in t.notes
    assert all(n in t.notes for n in s.notes)
    # loss split over both flange faces: depth falls by the loss, bf kept
    assert float(t.d) == pytest.approx(float(s.d) - (float(s.tf) - 12.1))
    assert float(t.bf) == pytest.approx(float(s.bf))
    assert float(t.A) < float(s.A) and float(t.Iy) < float(s.Iy)
    assert float(t.lam_flange) == pytest.approx(float(s.bf) / (2 * 12.1))


def test_uniform_loss_on_a_welded_i_is_plate_arithmetic():
    # plates exposed on both faces: 400 x 300 x 20 x 10 with 1 mm per face -> 398 x 298 x 18 x 8
    s = i_section(400.0, 300.0, 20.0, 10.0, rolled=False)
    t = with_loss(s, uniform=1.0)
    assert float(t.A) == pytest.approx(2 * 298 * 18 + (398 - 36) * 8)
    assert (float(t.d), float(t.bf), float(t.tf), float(t.tw)) == (398.0, 298.0, 18.0, 8.0)
    assert float(t.r) == 0.0 and not t.rolled


def test_uniform_loss_grows_a_rolled_fillet():
    s = from_catalogue("HEB 300")
    t = with_loss(s, uniform=1.5)
    assert float(t.r) == pytest.approx(27 + 1.5)
    assert float(t.tf) == pytest.approx(19 - 3) and float(t.tw) == pytest.approx(11 - 3)


def test_measured_plates_take_precedence_over_uniform():
    s = from_catalogue("HEB 300")
    t = with_loss(s, flange=17.0, uniform=0.5)
    assert float(t.tf) == 17.0 and float(t.tw) == pytest.approx(10.0)


def test_hollow_walls_corrode_from_outside_unless_told():
    s = rect_hollow(200.0, 100.0, 8.0)
    out = with_loss(s, wall=6.0)
    assert (float(out.d), float(out.bf), float(out.tf)) == (196.0, 96.0, 6.0)
    assert float(out.r) == pytest.approx(16.0 - 2.0)
    inside = with_loss(s, wall=6.0, from_inside=True)
    assert (float(inside.d), float(inside.bf), float(inside.r)) == (200.0, 100.0, 16.0)
    # the same loss from outside removes more stiffness than from inside
    assert float(out.Ix) < float(inside.Ix)
    c = with_loss(round_hollow(168.3, 7.1), uniform=1.0)
    assert float(c.d) == pytest.approx(166.3) and float(c.tf) == pytest.approx(6.1)
    # exact tube: A = pi/4 (D^2 - Di^2)
    assert float(c.A) == pytest.approx(np.pi / 4 * (166.3**2 - 154.1**2))


def test_reduced_section_equals_a_fresh_one():
    s = from_catalogue("W14X90")
    t = with_loss(s, flange=15.0, web=9.0)
    fresh = i_section(float(s.d) - (float(s.tf) - 15.0), float(s.bf), 15.0, 9.0, float(s.r))
    for attr in ("A", "Ix", "Iy", "Zx", "Zy", "J", "Cw", "lam_flange", "lam_web"):
        assert float(getattr(t, attr)) == pytest.approx(float(getattr(fresh, attr))), attr


def test_s_shape_keeps_its_sloped_flanges():
    s = from_catalogue("S24X121")
    t = with_loss(s, web=15.0)
    web_loss = (float(s.tw) - 15.0) * (float(s.d) - 2 * float(s.tf))
    assert float(t.A) == pytest.approx(float(s.A) - web_loss, rel=0.01)
    assert sum("S shape" in n for n in t.notes) == 1


def test_batches_broadcast():
    s = from_catalogue("W14X90")
    t = with_loss(s, flange=np.array([17.0, 15.0, 12.0]))
    assert t.A.shape == (3,)
    assert np.all(np.diff(t.A) < 0)


@pytest.mark.parametrize("kwargs, field", [
    (dict(flange=0.0), "flange"),
    (dict(flange=-1.0), "flange"),
    (dict(web=30.0), "web"),
    (dict(flange="thin"), "flange"),
    (dict(uniform=-0.5), "uniform"),
    (dict(uniform=6.0), "uniform"),
    (dict(wall=5.0), "wall"),
    (dict(from_inside=True, uniform=1.0), "from_inside"),
])
def test_bad_losses_on_an_i_shape_name_their_field(kwargs, field):
    with pytest.raises(InputError) as e:
        with_loss(from_catalogue("W14X90"), **kwargs)
    assert e.value.field == field


@pytest.mark.parametrize("kwargs, field", [
    (dict(flange=5.0), "flange"), (dict(web=5.0), "web"), (dict(wall=0.0), "wall"),
    (dict(uniform=20.0), "uniform"),
])
def test_bad_losses_on_a_hollow_section_name_their_field(kwargs, field):
    with pytest.raises(InputError) as e:
        with_loss(from_catalogue("HSS8X8X1/2"), **kwargs)
    assert e.value.field == field


def test_measured_wall_above_design_thickness_is_used_and_noted():
    # an AISC HSS wall may measure up to 1.1 tnom = 1.18 tdes (A500 +-10 %, from memory)
    s = from_catalogue("HSS8X8X1/2")
    t = with_loss(s, wall=12.5)
    assert float(t.tf) == 12.5
    assert any("measured value used" in n for n in t.notes)


def test_loss_keeps_the_as_built_thickness_for_the_thickness_rules():
    # EN 1993-1-1 Table 3.1 (fy by the product's thickness): a 42 mm S355 flange is in the
    # 40-80 mm band (335 MPa) and stays there when corrosion takes 1.5 mm off each face.
    from fieldcol.materials import get_material

    s = i_section(400.0, 400.0, 42.0, 25.0, 27.0)
    worn = with_loss(s, uniform=1.5)
    assert float(worn.tf) == pytest.approx(39.0)
    assert float(worn.tf_nominal) == 42.0 and float(worn.tmax_nominal) == 42.0
    assert float(get_material("S355").fy_at(worn.tmax_nominal)) == 335.0
    twice = with_loss(worn, uniform=0.5)
    assert float(twice.tmax_nominal) == 42.0


def test_hss_wall_measured_thicker_keeps_the_outside_size():
    # a wall measured above the design wall (tdes = 0.93 tnom, AISC) adds steel inside
    s = from_catalogue("HSS8X8X3/16")
    thick = with_loss(s, wall=4.76)
    assert float(thick.d) == pytest.approx(float(s.d)) and float(thick.bf) == pytest.approx(float(s.bf))
    assert float(thick.A) > float(s.A)


def test_rect_hollow_depth_must_be_the_larger_side():
    from fieldcol.errors import InputError
    from fieldcol.sections import rect_hollow

    with pytest.raises(InputError) as e:
        rect_hollow(100.0, 200.0, 6.0)
    assert e.value.field == "d"
