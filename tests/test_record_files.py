"""Column record files as they arrive: any encoding a shell writes is read; a file that is not
plain JSON is refused with a clear error and exit status 2, never a traceback; ``--json`` output
is always JSON.

Outside references: RFC 8259 (JSON): numbers are finite (no NaN or Infinity, section 6), object
names SHOULD be unique (section 4), text is Unicode without lone surrogates (section 8.2), and
UTF-8 is the encoding to write (section 8.1). From memory, common practice: Windows PowerShell
5.1 redirection (``>``) writes UTF-16 LE with a byte-order mark; Notepad's "UTF-8 with BOM" adds
EF BB BF.
"""

import json
import subprocess
import sys

import numpy as np
import pytest

from fieldcol import jsontext
from fieldcol.cli import main
from fieldcol.errors import InputError

RECORD = {"tag": "B/4-L1", "section": "W14X90", "material": "A992", "length": "30 ft",
          "restraints": {"weak": {"braces": [{"at": "15 ft"}]}},
          "demand": {"axial": "840 kip", "basis": "lrfd"}}
TEXT = json.dumps(RECORD, indent=1, ensure_ascii=False)


def _strict(out: str):
    def refuse(name):
        raise AssertionError(f"{name} in --json output")
    return json.loads(out, parse_constant=refuse)


def _check(tmp_path, data: bytes, capsys, *extra):
    f = tmp_path / "c.json"
    f.write_bytes(data)
    code = main(["check", str(f), *extra])
    return code, capsys.readouterr()


@pytest.mark.parametrize("encoding, data", [
    ("utf-8", TEXT.encode("utf-8")),
    ("utf-8 with BOM", TEXT.encode("utf-8-sig")),
    ("utf-16 LE with BOM (Windows shell)", TEXT.encode("utf-16")),
    ("utf-16 BE with BOM", b"\xfe\xff" + TEXT.encode("utf-16-be")),
    ("utf-16 LE without BOM", TEXT.encode("utf-16-le")),
    ("utf-32 with BOM", TEXT.encode("utf-32")),
])
def test_records_in_every_shell_encoding_are_read(tmp_path, capsys, encoding, data):
    code, out = _check(tmp_path, data, capsys, "--json")
    assert code == 0, (encoding, out.err)
    assert _strict(out.out)["tag"] == "B/4-L1"


@pytest.mark.parametrize("data, words", [
    (TEXT.replace('"length": "30 ft"', '"length": "30 ft", "length": "3 ft"').encode(),
     "the key 'length' appears twice (at length)"),
    (b'{"tag": "A", "restraints": {"weak": {"braces": [{"at": "1 ft", "at": "2 ft"}]}}}',
     "the key 'at' appears twice (at restraints.weak.braces[0].at)"),
    (b'{"tag": "A", "gamma_M1": NaN}', "NaN is not a number JSON can hold (at gamma_M1)"),
    (b'{"tag": "A", "restraints": {"weak": {"k": Infinity}}}',
     "Infinity is not a number JSON can hold (at restraints.weak.k)"),
    (b'{"tag": "A", "gamma_M1": -Infinity}', "-Infinity is not a number"),
    (b'{"tag": "A", "gamma_M1": 1e999}', "1e999 is not a number JSON can hold"),
    (b'{"tag": "A\\ud800"}', "lone surrogate"),
    (b'{"tag": "A", "\\udc00": 1}', "lone surrogate"),
    (b'{"tag": "\xed\xa0\x80"}', "not readable as utf-8"),        # a surrogate encoded raw
    (b'\xff\xfe{\x00"', "not readable as utf-16"),                 # UTF-16 cut short
    (b"[" * 100_000 + b"]" * 100_000, "nested too deeply"),
    (b'{"tag": "A", "notes": ' + b"[" * 40 + b"]" * 40 + b"}", "nested too deeply"),
    (b'{"tag": 1' + b"0" * 5000 + b"}", "not valid JSON"),
    (b"", "not valid JSON"),
    (b'{"tag": "A",}', "not valid JSON"),
])
def test_files_that_are_not_plain_json_are_refused_by_name(tmp_path, capsys, data, words):
    code, out = _check(tmp_path, data, capsys)
    assert code == 2
    assert out.err.startswith("error: file: cannot use '") and str(tmp_path) in out.err
    assert words in out.err


def test_a_real_process_exits_2_without_a_traceback(tmp_path):
    for i, data in enumerate([b'{"tag": "A\\ud800", "gamma_M1": NaN}', b"[" * 200_000,
                              '{"tag": "C\udc00"}'.encode("utf-8", "surrogatepass")]):
        f = tmp_path / f"bad{i}.json"
        f.write_bytes(data)
        p = subprocess.run([sys.executable, "-m", "fieldcol", "check", str(f), "--json"],
                           capture_output=True)
        assert p.returncode == 2 and b"Traceback" not in p.stderr, p.stderr
        assert p.stderr.startswith(b"error: file:") and p.stdout == b""


def test_standard_input_is_read_the_same_way():
    p = subprocess.run([sys.executable, "-m", "fieldcol", "check", "-", "--json"],
                       input=TEXT.encode("utf-16"), capture_output=True)
    assert p.returncode == 0, p.stderr
    assert _strict(p.stdout.decode())["tag"] == "B/4-L1"
    p = subprocess.run([sys.executable, "-m", "fieldcol", "check", "-"],
                       input=b'{"tag": "A", "tag": "B"}', capture_output=True)
    assert p.returncode == 2 and b"standard input" in p.stderr and b"'tag' appears twice" in p.stderr


def test_retrofit_options_are_read_strictly_too(tmp_path, capsys):
    f = tmp_path / "c.json"
    f.write_text(TEXT)
    code = main(["retrofit", str(f), "--option", '{"kind": "brace", "at": NaN}'])
    err = capsys.readouterr().err
    assert code == 2 and "options[0]" in err and "NaN is not a number" in err


# -- --json output never holds NaN or Infinity ----------------------------------------------

def test_check_json_gives_null_where_the_code_gives_no_number(tmp_path, capsys):
    # A round tube with D/t >= 0.45 E/Fy lies outside AISC 360-22 E7 (Table B4.1a scope): no
    # strength, so NaN inside the engine.
    rec = {"tag": "T", "section": {"shape": "round", "D": "500 mm", "t": "1 mm"},
           "material": "A500 Gr B", "length": "3 m", "demand": {"axial": "10 kN"}}
    code, out = _check(tmp_path, json.dumps(rec).encode(), capsys, "--json")
    assert code == 0
    assert "NaN" not in out.out and "Infinity" not in out.out
    doc = _strict(out.out)
    assert doc["status"] == "not-covered" and doc["design_strength"]["value"] is None


def test_alignment_and_retrofit_json_are_strict_json(tmp_path, capsys):
    assert main(["alignment", "--ga", "inf", "--gb", "1", "--json"]) == 0
    _strict(capsys.readouterr().out)
    f = tmp_path / "c.json"
    f.write_text(TEXT)
    assert main(["retrofit", str(f), "--option", '{"kind": "brace", "axis": "weak", '
                 '"at": "10 ft"}', "--json"]) == 0
    _strict(capsys.readouterr().out)


def test_dumps_writes_null_for_every_number_that_is_not_finite():
    out = jsontext.dumps({"a": float("nan"), "b": [np.float64("inf"), np.float32("-inf")],
                          "c": np.array([1.0, np.nan]), "d": np.int64(3), "e": True})
    assert json.loads(out) == {"a": None, "b": [None, None], "c": [1.0, None], "d": 3, "e": True}


def test_loads_names_the_field_it_was_given():
    with pytest.raises(InputError) as e:
        jsontext.loads('{"Fy": NaN}', "material", '{"Fy": NaN}')
    assert e.value.field == "material" and "(at Fy)" in e.value.reason
