"""The uncertainty run: seeded, vectorised, and it agrees with the deterministic check as the
spreads go to zero; its percentiles against the closed-form lognormal quantile."""

import json
import math
import subprocess
import sys

import pytest

from fieldcol.assess import assess
from fieldcol.errors import InputError
from fieldcol.uncertainty import Spreads, run_samples

BENT = {"tag": "U1", "section": "W10X49", "material": "A992", "length": "14 ft",
        "demand": {"axial": "200 kip", "reactions": [{"load": "40 kip", "axis": "strong"}]},
        "condition": {"bow": "0.5 in"}}


def test_no_spread_gives_the_deterministic_value_in_every_percentile():
    u = run_samples(BENT, 500, spreads=Spreads(0.0, 0.0, 0.0))
    for p in u.percentiles.values():
        assert p == pytest.approx(u.deterministic, rel=1e-9)
    assert u.p_exceed == 0.0


@pytest.mark.parametrize("scale", [0.1, 0.01])
def test_the_median_converges_to_the_deterministic_value(scale):
    u = run_samples(BENT, 4000, spreads=Spreads(0.1 * scale, 1.0 * scale, 0.07 * scale))
    assert u.percentiles[50] == pytest.approx(u.deterministic, rel=0.02 * scale)
    assert u.percentiles[5] < u.percentiles[50] < u.percentiles[95]


def test_the_same_seed_gives_the_same_answer():
    assert run_samples(BENT, 1000, seed=7).percentiles == run_samples(BENT, 1000, seed=7).percentiles
    assert run_samples(BENT, 1000, seed=7).percentiles != run_samples(BENT, 1000, seed=8).percentiles


def test_yield_only_follows_the_lognormal_quantile():
    # A stub column under the elastic reference check is A Fy exactly, so with Fy lognormal (median
    # Fy, CoV 0.07) and no dimensional spread the 5th percentile is A Fy exp(-1.6449 sigma),
    # sigma = sqrt(ln(1 + CoV^2)) (closed form of the lognormal quantile).
    rec = {"tag": "U2", "section": "W14X90", "material": "A992", "length": "2 ft", "code": "elastic"}
    det = assess(rec)
    assert det.governing_mode == "yield"
    u = run_samples(rec, 200_000, spreads=Spreads(0.0, 0.0, 0.07))
    sigma = math.sqrt(math.log(1 + 0.07**2))
    assert u.percentiles[5] == pytest.approx(det.design_strength * math.exp(-1.6449 * sigma), rel=0.003)
    assert u.percentiles[95] == pytest.approx(det.design_strength * math.exp(1.6449 * sigma), rel=0.003)


def test_demand_at_the_median_is_exceeded_about_half_the_time():
    plain = {k: v for k, v in BENT.items() if k not in ("demand", "condition")}
    det = assess(plain).design_strength
    u = run_samples({**plain, "demand": {"axial": f"{det / 1000:.3f} kN"}}, 20000)
    assert 0.4 < u.p_exceed < 0.6


def test_bad_sample_counts_and_spreads_name_the_option():
    with pytest.raises(InputError) as e:
        run_samples(BENT, 10)
    assert e.value.field == "samples"
    with pytest.raises(InputError) as e:
        run_samples(BENT, 1000, spreads=Spreads(-1.0))
    assert e.value.field == "thickness-sd"
    with pytest.raises(InputError) as e:
        run_samples(BENT, 1000, spreads=Spreads(fy_cov=2.0))
    assert e.value.field == "fy-cov"


def test_the_check_command_reports_the_distribution(tmp_path):
    f = tmp_path / "c.json"
    f.write_text(json.dumps(BENT))
    out = subprocess.run([sys.executable, "-m", "fieldcol", "check", str(f), "--samples", "2000", "--json"],
                         capture_output=True, text=True, check=True).stdout
    u = json.loads(out)["uncertainty"]
    assert u["samples"] == 2000 and u["median"]["unit"] == "N"
    assert u["percentile_5"]["value"] < u["median"]["value"] < u["percentile_95"]["value"]
    text = subprocess.run([sys.executable, "-m", "fieldcol", "check", str(f), "--samples", "2000"],
                          capture_output=True, text=True, check=True).stdout
    assert "5th percentile" in text and "licensed engineer" in text
    bad = subprocess.run([sys.executable, "-m", "fieldcol", "check", str(f), "--samples", "5"],
                         capture_output=True, text=True)
    assert bad.returncode == 2 and "samples" in bad.stderr


FRAME = {"tag": "U2", "section": "W14X90", "material": "A992", "length": "14 ft",
         "restraints": {"weak": {"bottom": "fixed", "top": "free"}},
         "demand": {"axial": "300 kip",
                    "end_moments": {"strong": {"top": "120 kip*ft", "bottom": "60 kip*ft",
                                               "curvature": "reverse"}},
                    "story": {"load": "3000 kip", "buckling_load": "30000 kip"}},
         "condition": {"plumb": "0.5 in", "plumb_axis": "weak"}}


def test_the_median_error_shrinks_with_the_spreads_on_every_path():
    # end moments (B1 with Cm from their ratio) and the story's sway amplifier sampled too: as the
    # spreads shrink tenfold the median's error shrinks with them (first-order: in proportion)
    errs = []
    for scale in (0.1, 0.01, 0.001):
        u = run_samples(FRAME, 4000, spreads=Spreads(0.1 * scale, 1.0 * scale, 0.07 * scale))
        errs.append(abs(u.percentiles[50] / u.deterministic - 1))
        assert errs[-1] <= 0.02 * scale
    assert errs[2] < errs[1] < errs[0] or errs[2] <= 1e-4
    none = run_samples(FRAME, 200, spreads=Spreads(0.0, 0.0, 0.0))
    assert none.percentiles[50] == pytest.approx(assess(FRAME).design_strength, rel=1e-9)


def test_a_built_up_column_is_refused_not_sampled_as_a_rolled_shape():
    # the sampled path knows rolled shapes only: a battened pair of channels is refused by name
    rec = {"tag": "K/7", "length": "18 ft", "material": "A7",
           "section": {"built": {"arrangement": "channels", "channel": "C12X20.7", "gap": "6 in",
                                 "toes": "out", "battens": {"spacing": "24 in", "depth": "8 in",
                                                            "thickness": "3/8 in"}}},
           "demand": {"axial": "150 kip", "basis": "lrfd"}}
    with pytest.raises(InputError) as e:
        run_samples(rec, 1000)
    assert e.value.field == "samples" and "built-up" in e.value.reason
