"""Hostile column records and command lines: every bad entry is an ``InputError`` naming a field
the record (or the command line) really holds, and the command line exits 2 saying so, never
with a Python traceback.

Records are made by mutating valid ones (the demo's, the README's, built-up ones) at any key
path: wrong types, numbers as odd text, NaN, infinities, negative, zero, huge and tiny values,
empty and unicode text, nested junk, unknown keys, a key taken away.

Outside references: RFC 8259 (JSON has no NaN or Infinity); IEEE 754 binary64 (the largest
finite double is about 1.8e308 and a square of 1e200 overflows; below about 2.2e-308 a number
is subnormal, and 1e-320 squared is 0); The Unicode Standard, 3.9 and RFC 3629 (a lone
surrogate such as U+D800 is no Unicode scalar value and has no UTF-8 form).
"""

from __future__ import annotations

import contextlib
import copy
import io
import json
import re
import subprocess
import sys
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from fieldcol import jsontext
from fieldcol.assess import assess
from fieldcol.cli import main
from fieldcol.demo import COLUMNS
from fieldcol.errors import InputError

ROOT = Path(__file__).resolve().parents[1]

README = {"tag": "B/4-L1", "section": "W14X90", "material": "A992", "length": "30 ft",
          "restraints": {"strong": {"bottom": "pinned", "top": "pinned"},
                         "weak": {"bottom": "pinned", "top": "pinned", "braces": [{"at": "15 ft"}]},
                         "twist": {"braces": [{"at": "15 ft"}]}},
          "k_basis": "theoretical", "code": "aisc360-22",
          "demand": {"axial": "840 kip", "basis": "lrfd"}}

# every object of the record at least once, with the keys the README's table lists
RICH = {"tag": "R/1", "level": "L1", "grid": "R/1", "location": "bay 3", "notes": "n",
        "section": {"shape": "i", "d": "14 in", "bf": "14 in", "tf": "0.7 in", "tw": "0.45 in",
                    "r": "0.6 in", "welded": False,
                    "loss": {"flange": "0.6 in", "web": "0.4 in", "from": "0 in", "to": "6 in",
                             "holes": {"flange": "1 in", "web": "2 in"}}},
        "material": {"grade": "A36", "Fy": "38 ksi"}, "length": "20 ft",
        "restraints": {
            "strong": {"bottom": "fixed", "top": "pinned", "k": 0.9},
            "weak": {"bottom": "pinned", "top": "pinned", "braces": [
                {"at": "10 ft", "stiffness": "200 kip/in", "strength": "10 kip", "added": "2019",
                 "kind": "strut", "seen_by": "A. N.", "note": "n"},
                {"at": "15 ft", "cable": {"area": "0.6 in2", "length": "18 ft", "angle": "40 deg",
                                          "E": "29000 ksi", "pair": True, "pretensioned": False}}]},
            "twist": {"braces": [{"at": "10 ft", "added": "2019", "seen_by": "A. N.", "note": "n"}],
                      "bottom": "held", "top": "held"}},
        "k_basis": "theoretical", "code": "aisc360-22", "basis": "lrfd", "units": "us",
        "knowledge": "usual",
        "condition": {"bow": "0.5 in", "bow_axis": "weak", "bow_over": "10 ft",
                      "bow_allowance": "L/1000", "plumb": "0.5 in", "plumb_axis": "weak"},
        "demand": {"axial": "200 kip", "basis": "lrfd",
                   "moments": {"strong": "20 kip*ft", "weak": "5 kip*ft"},
                   "reactions": [{"load": "40 kip", "axis": "strong", "eccentricity": "6 in",
                                  "side": "+"}],
                   "end_moments": {"strong": {"top": "30 kip*ft", "bottom": "10 kip*ft",
                                              "curvature": "reverse"}},
                   "story": {"load": "3000 kip", "buckling_load": "30000 kip"}}}

SPRINGS = {"tag": "AL", "length": "14 ft", "k_basis": "analysis", "knowledge": 0.9,
           "section": {"name": "W10X49", "plates": {
               "thickness": "3/8 in", "width": "10 in", "connection": "riveted", "pitch": "6 in",
               "holes": {"diameter": "15/16 in", "per_flange": 4}}},
           "material": {"Fy": "36 ksi", "E": "29000 ksi", "G": "11200 ksi", "Fu": "58 ksi",
                        "name": "mild steel (coupon)"},
           "restraints": {"strong": {"alignment": {"Ga": 1.2, "Gb": 10, "sway": False}},
                          "weak": {"bottom": {"rotation": "50000 kip*in/rad",
                                              "translation": "held"}, "top": "pinned"}},
           "demand": {"axial": "100 kip", "basis": "asd",
                      "end_moments": {"weak": {"top": "5 kip*ft", "bottom": "2 kip*ft"}},
                      "story": {"load": "3000 kip", "stiffness": "200 kip/in"}}}

EN_TUBE = {"tag": "E1", "material": "S355", "length": "4 m", "code": "en1993-1-1",
           "gamma_M1": 1.0,
           "section": {"shape": "rect", "d": "200 mm", "b": "100 mm", "t": "8 mm", "r": "12 mm",
                       "finish": "hot-finished", "loss": {"uniform": "1 mm"}},
           "demand": {"loads": {"dead": "200 kN", "live": "100 kN", "snow": "20 kN",
                                "roof_live": "10 kN"}, "psi0": {"live": 1.0, "snow": 0.7}}}

PIPE_BAND = {"tag": "O1", "material": "A500 Gr B", "length": "12 ft", "code": "elastic",
             "section": {"shape": "round", "D": "6.625 in", "t": "0.28 in",
                         "finish": "cold-formed",
                         "loss": {"wall": "0.25 in", "from": "1 ft", "to": "2 ft",
                                  "holes": {"wall": "1 in"}}},
             "condition": {"bow": "0.5 in"}}

# built-up sections as tests/test_codes_builtup*.py write them
LACED = {"tag": "L/4", "length": "20 ft", "material": "A36", "code": "aisc360-22",
         "section": {"built": {"arrangement": "channels", "channel": "C12X20.7", "gap": "8 in",
                               "toes": "out", "connection": "riveted",
                               "lacing": {"kind": "single", "width": "2 in",
                                          "thickness": "3/8 in", "pitch": "16 in", "planes": 2,
                                          "fasteners": {"count": 1, "diameter": "5/8 in"}}}},
         "demand": {"axial": "150 kip", "moments": {"strong": "20 kip*ft", "weak": "5 kip*ft"}}}
ANGLES_WEB = {"tag": "K/11", "length": "8 ft", "material": "A7", "code": "en1993-1-1",
              "section": {"built": {"arrangement": "angles-web", "angle": "L4X4X1/2",
                                    "long_leg": "flange",
                                    "web": {"depth": "14 in", "thickness": "3/8 in"},
                                    "flange_plates": {"width": "10 in", "thickness": "1/2 in"},
                                    "connection": "riveted",
                                    "holes": {"diameter": "15/16 in", "per_flange": 4}}},
              "demand": {"axial": "150 kN", "moments": {"strong": "80 kN*m"}}}
BOX = {"tag": "BX", "length": "6 m", "material": "S235", "code": "en1993-1-1",
       "section": {"built": {"arrangement": "angles-box", "connection": "bolted",
                             "angle": {"d": "90 mm", "b": "90 mm", "t": "9 mm", "r1": "11 mm",
                                       "r2": "5 mm"},
                             "depth": "420 mm", "width": "300 mm",
                             "battens": {"spacing": "500 mm", "depth": "200 mm",
                                         "thickness": "10 mm", "planes": 2,
                                         "fasteners": {"count": 2, "diameter": "16 mm",
                                                       "grade": "8.8", "pitch": "60 mm",
                                                       "edge": "30 mm"}}}},
       "demand": {"axial": "300 kN"}}
STAR = {"tag": "ST", "length": "10 ft", "material": "A36",
        "section": {"built": {"arrangement": "angles-star", "angle": "L3X3X3/8", "gap": "3/8 in",
                              "pitch": "30 in"}}}
BOXED_CHANNELS = {"tag": "CM", "length": "18 ft", "material": "A7",
                  "section": {"built": {"arrangement": "channels", "gap": "6 in",
                                        "channel": {"d": "12 in", "bf": "3 in", "tf": "0.5 in",
                                                    "tw": "0.3 in", "r1": "0.3 in",
                                                    "r2": "0.1 in", "slope": 0.1667},
                                        "plates": {"width": "14 in", "thickness": "3/8 in"}}}}

BASES = {"readme": README, "rich": RICH, "springs": SPRINGS, "en-tube": EN_TUBE,
         "pipe-band": PIPE_BAND, "laced": LACED, "angles-web": ANGLES_WEB, "box": BOX,
         "star": STAR, "boxed-channels": BOXED_CHANNELS,
         **{f"demo {tag}": {"tag": tag, **rec} for tag, (_, _, _, rec) in COLUMNS.items()
            if tag in ("A/2-G", "C/1-G", "C/4-G", "E/1-M", "E/4-M", "F/3-M")}}

GONE = object()  # a key taken away


def _paths(node, pre=()):
    if pre:
        yield pre
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _paths(v, pre + (k,))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _paths(v, pre + (i,))


PATHS = [(name, path) for name, base in BASES.items() for path in _paths(base)]

_UNITS = ("in", "mm", "ft", "kip", "kN", "ksi", "kip/in", "kip*ft", "in2", "kip*in/rad", "deg")
odd_text = st.sampled_from(
    ["", " ", "abc", "nan in", "inf ft", "-inf ft", "-3 ft", "0", "0 in", "-0 in", "1e999 mm",
     "1e300 in", "1e-300 in", "1e29 mm", "1e-13 mm", "12", "１２ ft", "12 ft\n", "12 ft\x00",
     "é", "💥", "1/0 in", "0/0 in", "12 ft 6", "ft", "nan", "3 ft*ft", "12 degC", "L/0", "L/-5",
     "fixed", "W14X90", "A36", "lrfd", "\ud800", "x" * 300]) \
    | st.builds(lambda m, u: f"{m} {u}", st.sampled_from(["1e29", "9e29", "1.1e-12", "1e20",
                                                           "1e-9", "-2", "1e308"]),
                st.sampled_from(_UNITS)) \
    | st.text(max_size=10)
junk = st.recursive(
    st.none() | st.booleans() | st.integers(-2**64, 2**64)
    | st.floats(allow_nan=True, allow_infinity=True) | odd_text,
    lambda inner: st.lists(inner, max_size=3)
    | st.dictionaries(st.sampled_from(["at", "zz", "d", "name", "axial", "", "loss"]), inner,
                      max_size=3),
    max_leaves=5) | st.just(GONE)

_TOKEN = re.compile(r"\.?([^.\[\]]+)|\[(\d+)\]")


def _field_path(field: str) -> list:
    return [m.group(1) if m.group(1) is not None else int(m.group(2))
            for m in _TOKEN.finditer(field)]


def _holds(record, path: list) -> bool:
    node = record
    for key in path:
        if isinstance(node, dict) and isinstance(key, str) and key in node:
            node = node[key]
        elif isinstance(node, list) and isinstance(key, int) and key < len(node):
            node = node[key]
        else:
            return False
    return True


def _named_in(record, field: str) -> bool:
    """The field is a path of the record, or a key missing from an object the record holds
    (a required entry left out)."""
    if field == "record":  # the record itself (a key of it with no name)
        return True
    path = _field_path(field)
    return bool(path) and (_holds(record, path) or _holds(record, path[:-1]))


def _with(obj: dict, path: tuple, value) -> dict:
    """A copy of ``obj`` with ``value`` at ``path`` (``GONE``: the key taken away)."""
    out = copy.deepcopy(obj)
    node = out
    for key in path[:-1]:
        node = node[key]
    if value is GONE:
        del node[path[-1]]
    else:
        node[path[-1]] = copy.deepcopy(value)
    return out


def _mutated(name: str, path: tuple, value) -> dict:
    return _with(BASES[name], path, value)


def _outcome(rec) -> InputError | None:
    """None when the record checks (and its result writes as JSON), else its InputError; any
    other exception fails the test."""
    try:
        a = assess(rec)
    except InputError as e:
        return e
    jsontext.dumps(a.to_dict())  # RFC 8259: no NaN or Infinity written
    return None


def test_every_base_record_checks():
    for name, rec in BASES.items():
        assert _outcome(rec) is None, name


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(where=st.sampled_from(PATHS), value=junk)
def test_a_mutated_record_checks_or_names_a_field_it_holds(where, value):
    name, path = where
    rec = _mutated(name, path, value)
    e = _outcome(rec)
    if e is not None:
        assert e.reason and _named_in(rec, e.field), (name, path, value, str(e))
        assert "Traceback" not in str(e) and "object at 0x" not in str(e)


def _at(rec, path):
    for k in path:
        rec = rec[k]
    return rec


OBJECTS = [(n, p) for n, base in BASES.items() for p in [(), *_paths(base)]
           if isinstance(_at(base, p), dict)]


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(where=st.sampled_from(OBJECTS), key=st.sampled_from(["zz", "Loss", "AT", "", "at ", "ß"]))
def test_an_unknown_key_anywhere_is_named(where, key):
    name, path = where
    rec = copy.deepcopy(BASES[name])
    node = _at(rec, path)
    if key in node:
        return
    node[key] = "1 in"
    with pytest.raises(InputError) as e:
        assess(rec)
    assert _named_in(rec, e.value.field), str(e.value)


# -- regressions: each was a crash or a wrong name before --------------------------------------

@pytest.mark.parametrize("name, path, typed", [
    # IEEE 754: these squared, or to the 4th / 6th power in a section's properties, overflow
    # to inf or underflow to 0 (an OverflowError, a ZeroDivisionError or a NaN cast to int)
    ("rich", ("length",), "1e300 in"),
    ("rich", ("section", "d"), "1e29 mm"),
    ("springs", ("length",), "1e300 in"),
    ("laced", ("section", "built", "lacing", "thickness"), "1e-300 in"),
    ("laced", ("section", "built", "lacing", "pitch"), "1e-300 in"),
    ("laced", ("section", "built", "lacing", "fasteners", "diameter"), "1e300 in"),
    ("angles-web", ("length",), "1e-300 in"),
    ("angles-web", ("section", "built", "flange_plates", "thickness"), "1e300 in"),
    ("box", ("section", "built", "battens", "spacing"), "1e300 in"),
    ("box", ("section", "built", "battens", "depth"), "1e-300 in"),
    ("box", ("section", "built", "battens", "fasteners", "pitch"), "1e-300 in"),
    ("boxed-channels", ("section", "built", "channel", "d"), "1e300 in"),
    ("rich", ("demand", "axial"), "1e31 N"),
    ("rich", ("restraints", "weak", "braces", 0, "stiffness"), "1e-13 N/mm"),
])
def test_a_number_beyond_anything_built_is_refused_by_name(name, path, typed):
    rec = _mutated(name, path, typed)
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == ".".join(str(p) for p in path).replace(".0.", "[0].") \
        and e.value.text == typed and "cannot be a measured or design value" in e.value.reason


def test_large_and_small_values_in_use_still_read():
    # a rotational spring typed to stand for a rigid joint, a 1000 ft length (questioned, not
    # refused) and a 0.001 in lacing gap: far inside the limits
    rec = _mutated("springs", ("restraints", "weak", "bottom", "rotation"), "1e12 kip*in/rad")
    assert _outcome(rec) is None
    long = _mutated("readme", ("length",), "1000 ft")
    long["restraints"] = {}
    a = assess(long)
    assert any(w["code"] == "length-implausible" for w in a.warnings)


def test_angles_and_web_without_the_web_names_the_web():
    for value in (GONE, None, [], 0, False, ""):
        rec = _mutated("angles-web", ("section", "built", "web"), value)
        with pytest.raises(InputError) as e:
            assess(rec)
        assert e.value.field == "section.built.web", value


def test_a_basis_typed_alike_twice_is_one_basis_and_a_bad_one_is_named():
    rec = {**README, "basis": "LRFD", "demand": {"axial": "840 kip", "basis": "LRFD "}}
    assert assess(rec).column.basis == "lrfd"
    with pytest.raises(InputError) as e:
        assess({**README, "basis": "lrfd", "demand": {"axial": "840 kip", "basis": True}})
    assert e.value.field == "demand.basis"
    with pytest.raises(InputError) as e:
        assess({**README, "basis": "lrfd", "demand": {"axial": "840 kip", "basis": "asd"}})
    assert e.value.field == "basis" and "differs from demand.basis" in e.value.reason


# -- the command line ---------------------------------------------------------------------------

def _run(argv: list[str]) -> tuple[int, str, str]:
    """``fieldcol ARGS`` in this process: (status, stdout, stderr); an exception escaping
    ``main`` (a traceback on a terminal) fails the test."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main(argv)
        except SystemExit as e:  # argparse's own refusals
            code = e.code
    return code, out.getvalue(), err.getvalue()


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    d = tmp_path_factory.mktemp("hostile")
    return d


@settings(max_examples=80, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(where=st.sampled_from([(n, p) for n, p in PATHS if n in ("readme", "rich", "laced")]),
       value=junk)
def test_check_exits_2_naming_the_field(files, where, value):
    rec = _mutated(*where, value)
    try:
        text = json.dumps(rec, allow_nan=False, ensure_ascii=False)
        data = text.encode("utf-8")
    except (ValueError, UnicodeEncodeError):
        return  # no JSON file can hold it (RFC 8259, RFC 3629): jsontext's own tests cover it
    path = files / "c.json"
    path.write_bytes(data)
    code, out, err = _run(["check", str(path), "--json"])
    if code == 0:
        assert json.loads(out)
        return
    assert code == 2 and err.startswith("error: ") and "Traceback" not in err
    field = err[len("error: "):].split(": cannot use", 1)[0]
    assert _named_in(rec, field), err


def test_check_in_its_own_process_prints_no_traceback(tmp_path):
    # the number that overflowed the engine before, through the installed entry point
    rec = _mutated("laced", ("section", "built", "lacing", "fasteners", "diameter"), "1e300 in")
    p = tmp_path / "c.json"
    p.write_text(json.dumps(rec), encoding="utf-8")
    r = subprocess.run([sys.executable, "-m", "fieldcol", "check", str(p)], capture_output=True,
                       text=True, cwd=ROOT, timeout=120)
    assert r.returncode == 2 and "Traceback" not in r.stderr
    assert r.stderr.startswith(
        "error: section.built.lacing.fasteners.diameter: cannot use '1e300 in'")


OPTIONS = [
    {"kind": "brace", "axis": "weak", "at": "12 ft", "stiffness": "10 kip/in",
     "strength": "5 kip", "twist": True, "label": "strut"},
    {"kind": "cable", "axis": "both", "at": "10 ft",
     "cable": {"area": "0.2 in2", "length": "20 ft", "angle": "45 deg", "pair": True}},
    {"kind": "end", "axis": "strong", "end": "bottom", "to": "fixed"},
    {"kind": "plates", "thickness": "3/8 in", "width": "12 in", "connection": "bolted",
     "pitch": "6 in", "holes": {"diameter": "15/16 in", "per_flange": 2}},
    {"kind": "remove_brace", "axis": "weak", "at": "15 ft", "twist": False},
    {"kind": "combined", "options": [{"kind": "remove_brace", "axis": "weak", "at": "15 ft"},
                                     {"kind": "brace", "axis": "weak", "at": "10 ft"}]},
]
OPTION_PATHS = [(i, p) for i, o in enumerate(OPTIONS) for p in _paths(o)]


@settings(max_examples=120, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(where=st.sampled_from(OPTION_PATHS), value=junk)
def test_a_mutated_retrofit_option_is_named_under_options(files, where, value):
    i, path = where
    opt = _with(OPTIONS[i], path, value)
    try:
        text = json.dumps(opt, allow_nan=False)
    except ValueError:
        return
    rec = files / "readme.json"
    rec.write_text(json.dumps(README), encoding="utf-8")
    code, out, err = _run(["retrofit", str(rec), "--option", text, "--json"])
    if code == 0:
        assert json.loads(out)
        return
    assert code == 2 and err.startswith("error: options[0]") and "Traceback" not in err, err


@pytest.mark.parametrize("argv, field", [
    (["--sweep", "weak", "--points", "0"], "points"),
    (["--sweep", "weak", "--points", "42"], "points"),
    (["--sweep", "weak", "--stiffness", "nan kip/in"], "stiffness[0]"),
    (["--sweep", "weak", "--stiffness", "-1 kip/in"], "stiffness[0]"),
    (["--sweep", "weak", "--stiffness", "1e40 kip/in"], "stiffness[0]"),
    (["--sweep", "both", "--stiffness", "rigid", "--stiffness", "10 ft"], "stiffness[1]"),
    (["--option", "{\"kind\": \"brace\", \"axis\": \"weak\", \"at\": NaN}"], "options[0]"),
])
def test_a_bad_sweep_or_option_exits_2_naming_it(tmp_path, argv, field):
    rec = tmp_path / "c.json"
    rec.write_text(json.dumps(README), encoding="utf-8")
    code, _, err = _run(["retrofit", str(rec), *argv])
    assert code == 2 and err.startswith(f"error: {field}"), err


@pytest.mark.parametrize("ga, said", [
    ("nan", "ga: cannot use 'nan'"), ("-1", "ga: cannot use '-1'"),
    ("abc", "ga: cannot use 'abc'"), ("", "ga: cannot use ''"), ("1e400", "ga: cannot use '1e400'"),
])
def test_alignment_names_the_g_as_typed(ga, said):
    # before: 'G.Ga: cannot use -1.0' or argparse's "invalid _g value"
    code, _, err = _run(["alignment", "--ga", ga, "--gb", "1"])
    assert code == 2 and err.startswith(f"error: {said}"), err


def test_alignment_still_reads_pinned_ends():
    # AISC 360-22 Commentary App. 7 (from memory): braced, Ga = inf, Gb = 1 gives K of about
    # 0.875; G = inf (a pinned end) written inf, infinity or pinned
    for word in ("inf", "infinity", "pinned", "INF"):
        code, out, _ = _run(["alignment", "--ga", word, "--gb", "1", "--json"])
        assert code == 0 and json.loads(out)["K"] == pytest.approx(0.875, abs=0.001)
    code, _, err = _run(["alignment", "--ga", "inf", "--gb", "pinned", "--sway"])
    assert code == 2 and err.startswith("error: gb: ") and "mechanism" in err, err
    assert "--sway" in err  # how to get out of it


@pytest.mark.parametrize("argv, said", [
    (["--D", "6in", "--d", "13.9in", "--t", "0.3in"], "d: cannot use '13.9in'"),
    (["--d", "13.9in"], "d: cannot use '13.9in'"),
    ([], "d: cannot use ''"),
    (["--d", "13.9in", "--bf", "nan in", "--tf", "0.7in", "--tw", "0.45in"],
     "bf: cannot use 'nan in'"),
    (["--d", "1e300 in", "--bf", "14.5in", "--tf", "0.7in", "--tw", "0.45in"],
     "d: cannot use '1e300 in'"),
    (["--d", "13.9in", "--bf", "14.5in", "--tf", "0.7in", "--tw", "0.45in", "--limit", "0"],
     "limit: cannot use '0'"),
])
def test_identify_quotes_a_refused_dimension_as_typed(argv, said):
    # before: d: cannot use '353.06' (the millimetres it was read as)
    code, _, err = _run(["identify", *argv])
    assert code == 2 and err.startswith(f"error: {said}"), err


@pytest.mark.parametrize("name", ["", "W14X999", "é" * 40, "\x00", "../W14X90"])
def test_section_names_the_section(name):
    code, _, err = _run(["section", name])
    assert code == 2 and err.startswith("error: section: cannot use"), err


def test_every_junk_text_is_reported_without_a_traceback_by_the_cli(tmp_path):
    # a lone surrogate cannot reach a JSON file (RFC 3629), but a terminal may show any entry:
    # printed escaped, never as a UnicodeEncodeError
    code, _, err = _run(["section", "W14X\udc80"])
    assert code == 2 and err.startswith("error: section") and "\\udc80" in err


@pytest.mark.parametrize("path, field", [
    ((), "record"), (("section",), "section"), (("section", "loss"), "section.loss"),
    (("restraints", "weak", "braces", 0), "restraints.weak.braces[0]")])
def test_a_key_with_no_name_is_named_by_its_object(path, field):
    # before: the field was '' (or 'section.loss.'), naming nothing
    rec = copy.deepcopy(RICH)
    node = _at(rec, path)
    node[""] = "1 in"
    with pytest.raises(InputError) as e:
        assess(rec)
    assert e.value.field == field and "has no name" in e.value.reason


@pytest.mark.parametrize("extra, said", [
    (["--seed", "-1"], "seed: cannot use '-1'"),                   # before: numpy's ValueError
    (["--size-sd", "1e300"], "size-sd: cannot use"),                # before: named thickness-sd
    (["--size-sd", "100"], "size-sd: cannot use"),                  # before: named r[157]
    (["--thickness-sd", "6"], "thickness-sd: cannot use '6.0'"),
    (["--fy-cov", "nan"], "fy-cov: cannot use 'nan'"),
])
def test_check_samples_name_the_option_that_is_wrong(tmp_path, extra, said):
    # W14X90 (AISC Shapes Database v15.0): d = 13.9 in, tf = 0.710 in; a depth spread of
    # 100 mm gives samples whose web has no room for its fillets
    p = tmp_path / "c.json"
    p.write_text(json.dumps(README), encoding="utf-8")
    code, _, err = _run(["check", str(p), "--samples", "200", *extra])
    assert code == 2 and err.startswith(f"error: {said}"), err


def test_cover_plates_on_a_built_up_column_are_refused_in_words():
    # before: "cannot use 'plates': not a known key of the section built up (known keys: built)"
    from fieldcol.retrofit import apply_option

    rec = {"tag": "K/7", "length": "18 ft", "material": "A7",
           "section": {"built": {"arrangement": "channels", "channel": "C12X20.7", "gap": "6 in",
                                 "battens": {"spacing": "24 in", "depth": "8 in",
                                             "thickness": "3/8 in"}}}}
    with pytest.raises(InputError) as e:
        apply_option(rec, {"kind": "plates", "thickness": "3/8 in"}, field="options[0]")
    assert e.value.field == "options[0].kind" and "built up" in e.value.reason
