"""`fieldcol check --text` and `fieldcol check --db --site --column` on a real store.

The numbers are the engine's own (checked against published values in test_codes_*); here the
plain text must carry the same result as the JSON form, fit its width, and keep the caution.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from fieldcol import CAUTION
from fieldcol.cli import main
from fieldcol.demo import SITE_NAME, build_demo
from fieldcol.store import Store

RECORD = {"tag": "C1", "section": "W14X90", "material": "A992", "length": "24 ft",
          "demand": {"axial": "650 kip", "basis": "lrfd"},
          "restraints": {"weak": {"braces": [{"at": "12 ft"}]}}}


@pytest.fixture(scope="module")
def demo_db(tmp_path_factory):
    db = tmp_path_factory.mktemp("check") / "demo.db"
    with Store(db) as store:
        build_demo(store)
    return str(db)


def test_text_fits_its_width_and_matches_the_json(tmp_path: Path, capsys):
    f = tmp_path / "c1.json"
    f.write_text(json.dumps(RECORD))
    assert main(["check", str(f), "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert main(["check", str(f), "--text", "--width", "80"]) == 0
    out = capsys.readouterr().out
    lines = out.splitlines()
    assert all(len(line) <= 80 for line in lines), max(lines, key=len)
    assert lines[0].startswith("Column C1: AISC 360-22 check, LRFD")
    assert f"= {d['utilization']['value']:.2f}   OK" in out
    flat = " ".join(out.split())
    for step in ("Lc,y", "φPn", "AISC 360-22 E3 (E3-1)"):
        assert step in flat, step
    assert " ".join(out.split()).endswith(CAUTION)


def test_stored_column_checked_as_it_stands(demo_db, capsys):
    assert main(["check", "--db", demo_db, "--site", SITE_NAME, "--column", "C/3-G",
                 "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    with Store(demo_db, readonly=True) as store:
        site = store.site_by_name(SITE_NAME)
        saved = store.latest_check(store.find_column(site.id, "C/3-G").id)
    # the record has not changed since the demo's check: the same utilization
    assert d["utilization"]["value"] == pytest.approx(saved.utilization, rel=1e-12)
    assert main(["check", "--db", demo_db, "--site", SITE_NAME, "--column", "C/3-G",
                 "--text"]) == 0
    out = capsys.readouterr().out
    assert "site Kestrel Lane Print Works, column C/3-G" in out and "OVER" in out
    assert "does not qualify" in out


@pytest.mark.parametrize("argv, field", [
    (["check"], "file"),
    (["check", "--site", SITE_NAME], "column"),
    (["check", "--column", "C/3-G"], "site"),
    (["check", "--site", SITE_NAME, "--column", "Z/9-Q"], "column"),
    (["check", "--site", "Nowhere", "--column", "C/3-G"], "site"),
])
def test_bad_requests_name_the_field(demo_db, argv, field, capsys):
    assert main(argv + ["--db", demo_db]) == 2
    assert capsys.readouterr().err.startswith(f"error: {field}")


def test_a_named_command_builds_only_its_own_parser_and_the_same_one():
    import argparse

    from fieldcol.cli import _named_command, build_parser

    def subs(parser):
        return next(a for a in parser._actions
                    if isinstance(a, argparse._SubParsersAction)).choices

    every = subs(build_parser())
    for name, full in every.items():
        assert _named_command([name, "x"]) == name
        alone = subs(build_parser(name))
        assert list(alone) == [name]
        assert alone[name].format_help() == full.format_help()
    assert _named_command(["--db", "x", "check"]) is None  # options first: the full parser
    assert _named_command(["../check"]) is None and _named_command(["nope"]) is None
