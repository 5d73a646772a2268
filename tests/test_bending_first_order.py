"""First-order end moments amplified by B1 with Cm from their ratio, and the story's sway
amplifier B2 for a measured out-of-plumb (AISC 360-22 Appendix 8; EN 1993-1-1 Annex B, 5.2.2)."""

import math

import pytest

from fieldcol.assess import assess
from fieldcol.errors import InputError

KIP = 4448.2216152605      # N, NIST SP 811
KIPFT = KIP * 304.8        # N*mm
IN = 25.4
E_KSI = 29000.0            # AISC 360-22 (common practice)
IY_W14X90 = 362.0          # in^4, AISC Manual Table 1-1 (from memory)


def _step(a, symbol):
    return next(s for s in a.trace.steps if s.symbol == symbol)


def _col(**demand):
    return {"tag": "F1", "section": "W14X90", "material": "A992", "length": "20 ft",
            "demand": {"axial": "300 kip", **demand}}


def _b1(Cm, P, Pe1):
    return max(1.0, Cm / (1 - P / Pe1))     # AISC 360-22 (A-8-3), alpha = 1 (LRFD)


@pytest.mark.parametrize("top, bottom, curvature, ratio", [
    (100, 100, "single", -1.0), (100, 50, "single", -0.5), (100, 50, "reverse", 0.5), (100, 0, "single", 0.0)])
def test_b1_with_cm_from_the_end_moments_ratio(top, bottom, curvature, ratio):
    # AISC 360-22 App. 8.2.1: Cm = 0.6 - 0.4 M1/M2, M1/M2 positive in reverse curvature;
    # Pe1 = pi^2 E Iy / L^2 (K1 = 1) by hand from the Manual's Iy (from memory): 1,799 kip.
    Pe1 = math.pi**2 * E_KSI * IY_W14X90 / 240.0**2
    assert Pe1 == pytest.approx(1799, rel=1e-3)
    a = assess(_col(end_moments={"weak": {"top": f"{top} kip*ft", "bottom": f"{bottom} kip*ft",
                                          "curvature": curvature}}))
    Cm = 0.6 - 0.4 * ratio
    assert _step(a, "M1/M2_weak").value == pytest.approx(ratio)
    assert float(_step(a, "Cm_weak").value[0]) == pytest.approx(Cm)
    # the catalogue's Iy (from the rows' dimensions) is within 1 % of the Manual's
    assert float(a.beam.Mr["weak"][0]) == pytest.approx(_b1(Cm, 300, Pe1) * top * KIPFT, rel=0.01)


def test_single_curvature_is_worse_than_reverse():
    single = assess(_col(end_moments={"strong": {"top": "200 kip*ft", "bottom": "200 kip*ft"}}))
    reverse = assess(_col(end_moments={"strong": {"top": "200 kip*ft", "bottom": "200 kip*ft",
                                                  "curvature": "reverse"}}))
    assert single.utilization > reverse.utilization


def test_reaction_moment_adds_to_the_top_end_moment():
    # statics: a beam of 20 kip at 6 in adds 10 kip*ft at the top
    a = assess(_col(end_moments={"strong": {"top": "50 kip*ft", "bottom": "30 kip*ft"}},
                    reactions=[{"load": "20 kip", "axis": "strong", "eccentricity": "6 in"}]))
    assert _step(a, "M2_strong").value == pytest.approx(60 * KIPFT)
    assert _step(a, "M1/M2_strong").value == pytest.approx(-0.5)


def test_en_cm_from_psi_has_its_floor():
    # EN 1993-1-1 Annex B Table B.3: Cm = 0.6 + 0.4 psi >= 0.4; reverse curvature M1/M2 = 1 is
    # psi = -1: 0.2, so 0.4 governs
    a = assess({"tag": "F2", "section": "HE300B", "material": "S355", "length": "5 m",
                "code": "en1993-1-1",
                "demand": {"axial": "1000 kN", "end_moments": {"strong": {
                    "top": "100 kN*m", "bottom": "100 kN*m", "curvature": "reverse"}}}})
    assert float(_step(a, "Cmy").value[0]) == pytest.approx(0.4)


SWAY = {"tag": "S1", "section": "W14X90", "material": "A992", "length": "14 ft",
        "restraints": {"weak": {"bottom": "fixed", "top": "free"},
                       "strong": {"bottom": "pinned", "top": "pinned"}},
        "condition": {"plumb": "1 in", "plumb_axis": "weak"}}


def test_story_gravity_load_drives_b2():
    # AISC 360-22 App. 8.2.2 (A-8-6): B2 = 1 / (1 - alpha P_story / Pe_story) >= 1; P_story
    # 3000 kip, Pe_story 30000 kip: B2 = 1.111; the column's own P-delta Pr D = 300 kip x 1 in.
    a = assess({**SWAY, "demand": {"axial": "300 kip",
                                   "story": {"load": "3000 kip", "buckling_load": "30000 kip"}}})
    B2 = 1 / (1 - 3000 / 30000)
    assert float(a.beam.Mr["weak"][0]) == pytest.approx(B2 * 300 * KIP * IN, rel=1e-9)
    assert _step(a, "Pe_sway").value == pytest.approx(30000 * KIP * 300 / 3000)


def test_story_from_its_lateral_stiffness():
    # (A-8-7): Pe_story = RM H L / Delta_H, RM = 0.85 taken (conservative)
    a = assess({**SWAY, "demand": {"axial": "300 kip",
                                   "story": {"load": "3000 kip", "stiffness": "200 kip/in"}}})
    Pe = 0.85 * 200 * 168
    assert _step(a, "Pe_story").value == pytest.approx(Pe * KIP, rel=1e-9)
    B2 = 1 / (1 - 3000 / Pe)
    assert float(a.beam.Mr["weak"][0]) == pytest.approx(B2 * 300 * KIP * IN, rel=1e-9)


def test_without_the_story_the_column_alone_is_said():
    a = assess({**SWAY, "demand": {"axial": "300 kip"}})
    st = _step(a, "Pe_sway")
    assert "column alone" in st.what


def test_story_needs_its_stiffness_or_buckling_load():
    with pytest.raises(InputError) as e:
        assess({**SWAY, "demand": {"axial": "300 kip", "story": {"load": "3000 kip"}}})
    assert e.value.field == "demand.story"
    with pytest.raises(InputError) as e:
        assess(_col(end_moments={"weak": {"top": "10 kip*ft", "curvature": "double"}}))
    assert e.value.field == "demand.end_moments.weak.curvature"


def test_en_story_amplifier_from_its_stiffness():
    # EN 1993-1-1 5.2.1 (4)B (5.2): alpha_cr = (H_Ed / delta) (h / V_Ed), so Ncr,story = (H/delta) h;
    # 5.2.2 (5)B: the sway moment amplified by 1 / (1 - 1/alpha_cr) = 1 / (1 - V/Ncr,story)
    rec = {"tag": "S2", "section": "HE300B", "material": "S355", "length": "4 m", "code": "en1993-1-1",
           "restraints": {"weak": {"bottom": "fixed", "top": "free"}},
           "condition": {"plumb": "12 mm", "plumb_axis": "weak"},
           "demand": {"axial": "800 kN", "story": {"load": "6000 kN", "stiffness": "30 kN/mm"}}}
    a = assess(rec)
    Ncr = 30e3 * 4000                       # N: 30 kN/mm x 4000 mm = 120,000 kN
    amp = 1 / (1 - 6000e3 / Ncr)
    assert _step(a, "Pe_story").value == pytest.approx(Ncr)
    assert float(a.beam.Mr["weak"][0]) == pytest.approx(amp * 800e3 * 12, rel=1e-9)
