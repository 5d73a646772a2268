"""The brace sweep of the engine: capacity against the height and stiffness of one proposed brace."""

import pytest

from fieldcol.errors import InputError
from fieldcol.retrofit import brace_sweep

PINNED = {"tag": "S1", "section": "W14X90", "material": "A992", "length": "30 ft",
          "restraints": {"strong": {"k": 0.5}}, "k_basis": "analysis"}
FIXED_PINNED = {**PINNED, "restraints": {"strong": {"k": 0.5},
                                         "weak": {"bottom": "fixed", "top": "pinned"}}}


def test_a_rigid_brace_is_best_at_mid_height_of_a_pinned_column():
    # symmetry (classical): the two halves are equal only with the brace at mid-height
    s = brace_sweep(PINNED, "weak", points=9, twist=True)
    assert s.best[0] == pytest.approx(s.length / 2)
    row = s.strengths[0]
    assert row == pytest.approx(row[::-1], rel=1e-9)
    assert max(row) > s.before


def test_a_soft_brace_is_best_above_mid_height_when_the_base_is_fixed():
    # the first buckled shape of a fixed-pinned column peaks above mid-height (about 0.6 L from the
    # fixed end; Timoshenko & Gere, from memory): a soft brace does most there
    s = brace_sweep(FIXED_PINNED, "weak", points=11, stiffness=["10 kip/in"], twist=True)
    assert s.best[0] > 0.5 * s.length


def test_a_softer_brace_never_gives_more():
    s = brace_sweep(FIXED_PINNED, "weak", points=7, stiffness=["2 kip/in", "10 kip/in", "rigid"], twist=True)
    for soft, stiff in zip(s.strengths, s.strengths[1:]):
        for a, b in zip(soft, stiff):
            assert a <= b * (1 + 1e-9)
    d = s.to_dict()
    assert d["best"]["stiffness"] == "rigid" and "licensed engineer" in d["caution"]


def test_bad_sweeps_name_the_field():
    with pytest.raises(InputError) as e:
        brace_sweep(PINNED, "sideways")
    assert e.value.field == "axis"
    with pytest.raises(InputError) as e:
        brace_sweep(PINNED, "weak", points=2)
    assert e.value.field == "points"
    with pytest.raises(InputError) as e:
        brace_sweep(PINNED, "weak", stiffness=["10"])
    assert e.value.field == "stiffness[0]"


def test_the_retrofit_command_sweeps(tmp_path):
    import json
    import subprocess
    import sys

    f = tmp_path / "c.json"
    f.write_text(json.dumps(FIXED_PINNED))
    out = subprocess.run([sys.executable, "-m", "fieldcol", "retrofit", str(f), "--sweep", "weak", "--points", "3",
                          "--stiffness", "10 kip/in", "--stiffness", "rigid", "--twist", "--json"],
                         capture_output=True, text=True, check=True).stdout
    d = json.loads(out)
    assert d["stiffness"] == ["10 kip/in", "rigid"] and len(d["strengths"][1]) == 3
    text = subprocess.run([sys.executable, "-m", "fieldcol", "retrofit", str(f), "--sweep", "weak", "--points", "3"],
                          capture_output=True, text=True, check=True).stdout
    assert "Best:" in text and "licensed engineer" in text
