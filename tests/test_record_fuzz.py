"""Any record, however mangled, either checks or raises InputError naming a field: never a crash."""

import copy

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from fieldcol.assess import assess
from fieldcol.errors import InputError

BASE = {"tag": "B/4-L1", "section": "W14X90", "material": "A992", "length": "30 ft",
        "restraints": {"strong": {"bottom": "pinned", "top": "pinned"},
                       "weak": {"bottom": "pinned", "top": "pinned",
                                "braces": [{"at": "15 ft", "stiffness": "20 kip/in"}]},
                       "twist": {"braces": [{"at": "15 ft"}]}},
        "k_basis": "analysis", "code": "aisc360-22", "condition": {"bow": "1 in"},
        "demand": {"axial": "840 kip", "basis": "lrfd"}}

PATHS = [("tag",), ("section",), ("material",), ("length",), ("restraints",),
         ("restraints", "strong"), ("restraints", "strong", "bottom"), ("restraints", "weak", "top"),
         ("restraints", "weak", "braces"), ("restraints", "weak", "braces", 0),
         ("restraints", "weak", "braces", 0, "at"), ("restraints", "weak", "braces", 0, "stiffness"),
         ("restraints", "twist"), ("restraints", "twist", "braces"), ("k_basis",), ("code",),
         ("condition",), ("condition", "bow"), ("demand",), ("demand", "axial"),
         ("demand", "basis"), ("gamma_M1",), ("units",)]

junk = st.recursive(
    st.none() | st.booleans() | st.integers(-10**6, 10**6)
    | st.floats(allow_nan=True, allow_infinity=True) | st.text(max_size=12)
    | st.sampled_from(["", "0", "-3 ft", "nan in", "1e999 mm", "12'-6\"", "fixed", "W14X90",
                       "HEB300", "A36", "S355", "inf", "kip", "1/0 in", "12 ft 6", "ft"]),
    lambda inner: st.lists(inner, max_size=3) | st.dictionaries(
        st.sampled_from(["at", "bottom", "top", "braces", "k", "shape", "d", "bf", "tf", "tw",
                         "axial", "basis", "rotation", "Fy", "grade", "loss", "name", "bow"]),
        inner, max_size=3),
    max_leaves=6)


def _set(rec, path, value):
    node = rec
    for key in path[:-1]:
        node = node[key]
    node[path[-1]] = value


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(st.tuples(st.sampled_from(PATHS), junk), min_size=1, max_size=3))
def test_mangled_records_raise_input_error_or_check(changes):
    rec = copy.deepcopy(BASE)
    for path, value in changes:
        try:
            _set(rec, path, value)
        except (KeyError, IndexError, TypeError):
            pass  # an earlier change removed the parent: keep what was set
    try:
        a = assess(rec)
    except InputError as e:
        assert e.field and e.reason
        return
    a.to_dict()
