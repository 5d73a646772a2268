"""A typo in a column record is refused, naming its full path: it never changes the answer silently.

Every object of the record refuses a key it does not know, with the nearest known key as a hint;
true/false entries must be JSON booleans; an object given as [] / 0 / false / "" is an error,
not "not given". The reference for what each object holds is the README's record table (checked
below against ``fieldcol.record.KEYS``).
"""

import copy
import re
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from fieldcol.assess import assess
from fieldcol.errors import InputError
from fieldcol.record import KEYS

README = Path(__file__).resolve().parents[1] / "README.md"

# One record per family of objects, each valid, together holding every object of the record.
CATALOGUE = {
    "tag": "B/4-L1", "level": "L1", "grid": "B/4", "location": "bay 3", "notes": "paint sound",
    "section": {"name": "W10X49", "loss": {"flange": "0.50 in", "web": "0.30 in"},
                "plates": {"thickness": "3/8 in", "width": "10 in"}},
    "material": {"grade": "A36", "Fy": "40 ksi"}, "length": "16 ft",
    "restraints": {
        "strong": {"bottom": {"rotation": "50000 kip*in/rad", "translation": "held"},
                   "top": "pinned"},
        "weak": {"bottom": "pinned", "top": "pinned",
                 "braces": [{"at": "8 ft", "cable": {"area": "0.2 in2", "length": "12 ft",
                                                     "angle": "45 deg", "E": "29000 ksi",
                                                     "pair": True, "pretensioned": False},
                             "strength": "10 kip", "added": "2019 retrofit", "kind": "cable",
                             "seen_by": "R. Okafor", "note": "turnbuckle tight"}]},
        "twist": {"braces": [{"at": "8 ft", "added": "2019", "seen_by": "R. Okafor",
                              "note": "angle cleat"}], "bottom": "held", "top": "held"}},
    "k_basis": "analysis", "code": "aisc360-22", "units": "us",
    "condition": {"bow": "1/4 in", "bow_axis": "weak", "bow_over": "16 ft", "plumb": "1/2 in",
                  "plumb_axis": "weak", "bow_allowance": "L/1500"},
    "demand": {"axial": "200 kip", "basis": "lrfd", "moments": {"weak": "5 kip*ft"},
               "end_moments": {"strong": {"top": "10 kip*ft", "bottom": "5 kip*ft",
                                          "curvature": "reverse"}},
               "story": {"load": "2000 kip", "buckling_load": "20000 kip", "stiffness": None},
               "reactions": [{"load": "20 kip", "axis": "strong", "eccentricity": "6 in",
                              "side": "+"}]},
    "knowledge": "usual",
}
MEASURED_I = {
    "tag": "C/3-G", "length": "4 m", "code": "en1993-1-1", "gamma_M1": 1.0,
    "section": {"shape": "i", "d": "300 mm", "bf": "300 mm", "tf": "19 mm", "tw": "11 mm",
                "r": "27 mm", "welded": False, "loss": {"uniform": "1 mm"}},
    "material": {"Fy": "235 MPa", "E": "210000 MPa", "G": "81000 MPa", "Fu": "360 MPa",
                 "name": "mild steel (coupon)"},
    "restraints": {"strong": {"alignment": {"Ga": 1.0, "Gb": 10, "sway": False}},
                   "weak": {"k": 1.0, "braces": [{"at": "2 m", "stiffness": "5 kN/mm",
                                                  "strength": "20 kN", "kind": "strut"}]}},
    "demand": {"loads": {"dead": "400 kN", "live": "300 kN", "snow": "50 kN", "roof_live": "0 kN"},
               "basis": "en", "psi0": {"live": 1.0, "snow": 0.7}},
}
RECT = {"tag": "R1", "length": "12 ft", "material": "A500 Gr B",
        "section": {"shape": "rect", "d": "8 in", "b": "6 in", "t": "0.25 in", "r": "0.5 in",
                    "finish": "cold-formed",
                    "loss": {"wall": "0.2 in", "from": "0 in", "to": "6 in", "holes": {"wall": "0.5 in"}}}}
ROUND = {"tag": "P1", "length": "12 ft", "material": "A500 Gr B",
         "section": {"shape": "round", "D": "6.625 in", "t": "0.28 in", "finish": "hot-finished"}}
BUILT = [
    {"tag": "K/7", "length": "18 ft", "material": "A7",
     "section": {"built": {"arrangement": "channels", "connection": "riveted",
                           "channel": {"d": "12 in", "bf": "3 in", "tf": "1/2 in", "tw": "5/16 in",
                                       "r1": "0.4 in", "r2": "0 in", "slope": 0.1667},
                           "gap": "6 in", "toes": "out", "pitch": "24 in",
                           "lacing": {"kind": "single", "width": "2 in", "thickness": "3/8 in",
                                      "pitch": "16 in", "planes": 2,
                                      "fasteners": {"count": 1, "diameter": "5/8 in",
                                                    "Fu": "52 ksi", "edge": "1 in",
                                                    "pitch": "2 in"}}}}},
    {"tag": "K/8", "length": "18 ft", "material": "A7",
     "section": {"built": {"arrangement": "channels", "channel": "C10X15.3", "gap": "5 in",
                           "plates": {"width": "14 in", "thickness": "3/8 in"}}}},
    {"tag": "K/9", "length": "5 m", "material": "S235", "code": "en1993-1-1",
     "section": {"built": {"arrangement": "angles-box",
                           "angle": {"d": "90 mm", "b": "90 mm", "t": "9 mm", "r1": "11 mm",
                                     "r2": "0 mm"},
                           "depth": "420 mm", "width": "300 mm",
                           "battens": {"spacing": "600 mm", "depth": "180 mm",
                                       "thickness": "8 mm", "planes": 2,
                                       "fasteners": {"count": 2, "diameter": "16 mm"}}}}},
    {"tag": "K/10", "length": "16 ft", "material": "A7",
     "section": {"built": {"arrangement": "angles-web", "angle": "L4X4X1/2", "long_leg": "flange",
                           "web": {"depth": "14 in", "thickness": "3/8 in"},
                           "flange_plates": {"width": "10 in", "thickness": "1/2 in"},
                           "holes": {"diameter": "15/16 in", "per_flange": 2}}}},
]
BASES = [CATALOGUE, MEASURED_I, RECT, ROUND, *BUILT]


def _keys(node, path=""):
    """(path to the object, key) for every key of every object in a record."""
    if isinstance(node, dict):
        for k, v in node.items():
            yield path, k
            yield from _keys(v, f"{path}.{k}" if path else k)
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _keys(v, f"{path}[{i}]")


def _renamed(rec, where, old, new):
    out = copy.deepcopy(rec)
    node = out
    for part in re.findall(r"[^.\[\]]+|\[\d+\]", where):
        node = node[int(part[1:-1])] if part.startswith("[") else node[part]
    node[new] = node.pop(old)
    return out


def test_every_base_record_checks():
    for rec in BASES:
        assess(rec).to_dict()


def test_the_bases_hold_every_object_and_every_key():
    # the hypothesis test below covers every key of every object only if the bases hold them
    held = {k for rec in BASES for _, k in _keys(rec)}
    every = {k for keys in KEYS.values() for k in keys}
    assert every - held == set()


ALL_KEYS = {k for keys in KEYS.values() for k in keys}
# a name no object knows: letters, digits, spaces and a few signs (typos as typed)
unknown = st.text(st.characters(min_codepoint=32, max_codepoint=0x2FF), min_size=1,
                  max_size=12).filter(lambda s: s not in ALL_KEYS)


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.sampled_from([(i, w, k) for i, rec in enumerate(BASES) for w, k in _keys(rec)]),
       unknown)
def test_any_key_renamed_to_an_unknown_name_is_refused_with_its_path(choice, new):
    i, where, old = choice
    rec = _renamed(BASES[i], where, old, new)
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == (f"{where}.{new}" if where else new)
    assert "not a known key" in e.value.reason


# -- the typos reported, each with the path and the nearest key -----------------------------

@pytest.mark.parametrize("change, field, near", [
    # the two examples: a lost section loss, a lost tested yield stress
    (lambda r: r["section"].update(Loss=r["section"].pop("loss")), "section.Loss", "loss"),
    (lambda r: r["material"].update(fy=r["material"].pop("Fy")), "material.fy", "Fy"),
    (lambda r: r["section"]["loss"].update(flang="0.3 in"), "section.loss.flang", "flange"),
    (lambda r: r["section"]["plates"].update(thick="1 in"), "section.plates.thick", "thickness"),
    (lambda r: r["restraints"]["weak"]["braces"][0].update(stifness="2 kip/in"),
     "restraints.weak.braces[0].stifness", "stiffness"),
    (lambda r: r["restraints"]["weak"]["braces"][0]["cable"].update(angel="30 deg"),
     "restraints.weak.braces[0].cable.angel", "angle"),
    (lambda r: r["restraints"]["strong"]["bottom"].update(rotaton="1 kip*in/rad"),
     "restraints.strong.bottom.rotaton", "rotation"),
    (lambda r: r["restraints"].update(Weak={}), "restraints.Weak", "weak"),
    (lambda r: r["restraints"]["twist"]["braces"][0].update(att="3 ft"),
     "restraints.twist.braces[0].att", "at"),
    (lambda r: r["condition"].update(bow_axs="strong"), "condition.bow_axs", "bow_axis"),
    (lambda r: r["demand"].update(Axial="100 kip"), "demand.Axial", "axial"),
    (lambda r: r.update(lenght="20 ft"), "lenght", "length"),
])
def test_named_typos_are_refused_with_the_nearest_key(change, field, near):
    rec = copy.deepcopy(CATALOGUE)
    change(rec)
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == field
    assert f"did you mean '{near}'?" in e.value.hint


def test_typos_in_loads_psi0_alignment_and_measured_sections():
    cases = [
        (lambda r: r["demand"]["loads"].update(Dead="1 kN"), "demand.loads.Dead", "dead"),
        (lambda r: r["demand"]["psi0"].update(lve=0.5), "demand.psi0.lve", "live"),
        (lambda r: r["restraints"]["strong"]["alignment"].update(ga=1), 
         "restraints.strong.alignment.ga", "Ga"),
        (lambda r: r["section"].update(b="300 mm"), "section.b", "bf"),
        (lambda r: r["material"].update(fu="400 MPa"), "material.fu", "Fu"),
    ]
    for change, field, near in cases:
        rec = copy.deepcopy(MEASURED_I)
        change(rec)
        with pytest.raises(InputError) as e:
            assess(rec)
        assert (e.value.field, near in e.value.hint) == (field, True)


def test_a_shape_refuses_the_dimensions_of_another_shape():
    rec = copy.deepcopy(ROUND)
    rec["section"]["d"] = "6 in"      # lower-case d is the I and box depth; a tube has D
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == "section.d" and "'D'" in e.value.hint


def test_a_grade_keeps_its_table_values():
    # with a grade, only a tested Fy may be given: an E beside it would be silently lost
    with pytest.raises(InputError) as e:
        assess({**ROUND, "material": {"grade": "A500 Gr B", "E": "25000 ksi"}})
    assert e.value.field == "material.E"


def test_the_correct_key_changes_the_answer_the_typo_would_have_hidden():
    rec = {"tag": "A/1", "section": "W10X49", "material": "A992", "length": "14 ft"}
    whole = assess(rec).design_strength
    lossy = assess({**rec, "section": {"name": "W10X49", "loss": {"flange": "0.30 in"}}})
    assert lossy.design_strength < 0.8 * whole  # W10X49 tf = 0.560 in (AISC Manual Table 1-1)
    with pytest.raises(InputError):
        assess({**rec, "section": {"name": "W10X49", "Loss": {"flange": "0.30 in"}}})


# -- wrong types ---------------------------------------------------------------------------

@pytest.mark.parametrize("value", [[], 0, False, "", "pinned", 1])
def test_an_axis_given_as_no_object_is_refused(value):
    rec = {**ROUND, "restraints": {"weak": value}}
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == "restraints.weak"


@pytest.mark.parametrize("key", ["restraints", "condition"])
@pytest.mark.parametrize("value", [[], 0, False, "", "none"])
def test_optional_objects_given_as_something_else_are_refused(key, value):
    with pytest.raises(InputError) as e:
        assess({**ROUND, key: value})
    assert e.value.field == key


def test_null_means_not_given():
    a = assess({**ROUND, "restraints": {"weak": None, "twist": None}, "condition": None})
    b = assess(ROUND)
    assert a.design_strength == b.design_strength


@pytest.mark.parametrize("change, field", [
    (lambda r: r["section"].update(welded="false"), "section.welded"),
    (lambda r: r["section"].update(welded=0), "section.welded"),
    (lambda r: r["restraints"]["strong"]["alignment"].update(sway="no"),
     "restraints.strong.alignment.sway"),
    (lambda r: r["restraints"]["weak"]["braces"][0].update(kind="wire"),
     "restraints.weak.braces[0].kind"),
    (lambda r: r["restraints"]["weak"]["braces"][0].update(added=2019),
     "restraints.weak.braces[0].added"),
    (lambda r: r["restraints"]["weak"]["braces"][0].update(seen_by=7),
     "restraints.weak.braces[0].seen_by"),
    (lambda r: r["demand"].update(psi0=[]), "demand.psi0"),
    (lambda r: r["demand"].update(psi0=0), "demand.psi0"),
    (lambda r: r["demand"].update(loads=False), "demand.loads"),
    (lambda r: r["material"].update(name=5), "material.name"),
    (lambda r: r.update(notes=["x"]), "notes"),
    (lambda r: r.update(grid=4), "grid"),
])
def test_wrong_types_are_refused(change, field):
    rec = copy.deepcopy(MEASURED_I)
    change(rec)
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == field


def test_cable_flags_and_ends_need_the_right_type():
    rec = copy.deepcopy(CATALOGUE)
    rec["restraints"]["weak"]["braces"][0]["cable"]["pair"] = "true"
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == "restraints.weak.braces[0].cable.pair"
    rec = copy.deepcopy(CATALOGUE)
    rec["restraints"]["weak"]["braces"][0]["cable"] = {}
    with pytest.raises(InputError) as e:   # an empty cable is not "no cable"
        assess(rec)
    assert e.value.field.startswith("restraints.weak.braces[0]")
    rec = copy.deepcopy(CATALOGUE)
    rec["restraints"]["strong"]["bottom"]["translation"] = 0
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == "restraints.strong.bottom.translation"
    rec = copy.deepcopy(CATALOGUE)
    rec["section"]["name"] = 10
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == "section.name"


def test_psi0_beside_an_axial_force_is_refused():
    with pytest.raises(InputError) as e:
        assess({**ROUND, "code": "en1993-1-1",
                "demand": {"axial": "100 kN", "psi0": {"live": 1.0}}})
    assert e.value.field == "demand.psi0"


# -- the README's record reference lists every key -----------------------------------------

def test_the_readme_lists_every_key_of_every_object():
    text = README.read_text()
    rows = {}
    for line in text[text.index("| object | keys |"):].splitlines()[2:]:
        if not line.startswith("|"):
            break
        obj, keys = [c.strip() for c in line.strip("|").split("|")]
        rows[obj] = tuple(k.strip().strip("`") for k in keys.split(","))
    assert rows == KEYS


# -- the store and the app's edit path refuse the same typos --------------------------------

def test_the_store_refuses_a_record_with_an_unknown_key(tmp_path):
    from fieldcol.store import open_store

    with open_store(tmp_path / "s.db") as store:
        site = store.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        col = store.add_column(site.id, {"tag": "A/1", "section": "W10X49"})  # incomplete is fine
        with pytest.raises(InputError) as e:
            store.add_column(site.id, {"tag": "A/2", "section": {"name": "W10X49",
                                                                 "Loss": {"flange": "0.3 in"}}})
        assert e.value.field == "section.Loss"
        with pytest.raises(InputError) as e:
            store.update_column(col.id, record={"tag": "A/1", "demand": {"axail": "10 kip"}})
        assert e.value.field == "demand.axail"
        assert store.get_column(col.id).record == {"tag": "A/1", "section": "W10X49"}
        assert [c.tag for c in store.list_columns(site.id)] == ["A/1"]


def test_the_app_edit_refuses_a_typo_and_saves_nothing(tmp_path):
    import json
    import sqlite3

    from fieldcol.store import open_store
    from fieldcol.ui import model as m

    with open_store(tmp_path / "s.db") as store:
        site = store.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        col = store.add_column(site.id, {"tag": "A/1", "section": "W10X49", "material": "A992",
                                         "length": "14 ft"})
        assert m.apply_edit(store, col.id, "demand", "100 kip").saved
        # a record written before these checks (straight into the file) with a typo in it
        bad = {**store.get_column(col.id).record, "material": {"grade": "A7", "fy": "25 ksi"}}
        with sqlite3.connect(tmp_path / "s.db") as db:
            db.execute("UPDATE columns SET record = ? WHERE id = ?", [json.dumps(bad), col.id])
        db.close()
        n_checks = len(store.checks(col.id))
        res = m.apply_edit(store, col.id, "demand", "120 kip")
        assert not res.saved and res.error_field == "material.fy"
        assert "did you mean 'Fy'?" in res.error
        assert store.get_column(col.id).record == bad and len(store.checks(col.id)) == n_checks
        # a typed entry that is not a catalogue name is refused at its field
        res = m.apply_edit(store, col.id, "section", "W10X4g")
        assert not res.saved and res.error_field == "section"


def test_an_axial_demand_typed_in_the_app_replaces_loads_and_their_psi0(tmp_path):
    from fieldcol.store import open_store
    from fieldcol.ui import model as m

    with open_store(tmp_path / "s.db") as store:
        site = store.add_site("Kestrel Lane Print Works", code="en1993-1-1", unit_system="si")
        col = store.add_column(site.id, {**MEASURED_I, "tag": "C/3-G"})
        res = m.apply_edit(store, col.id, "demand", "900 kN")
        assert res.saved
        assert store.get_column(col.id).record["demand"] == {"basis": "en", "axial": "900 kN"}
