"""Hostile entries behind the app and in schedules: a refused value raises ``InputError`` naming
the entry, and the store's rows stay byte for byte as they were (every table read back from
the SQLite file before and after).

Outside references: RFC 4180 (CSV: a quoted cell may hold commas and line breaks, a quote
inside it written twice); The Unicode Standard, 3.9 and RFC 3629 (a lone surrogate such as
U+D800 has no UTF-8 form: SQLite cannot take it as text); IEEE 754 binary64 (1e300 squared
overflows).
"""

from __future__ import annotations

import contextlib
import csv
import io
import itertools
import re
import shutil
import sqlite3
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from fieldcol.cli import main
from fieldcol.demo import SITE_NAME, build_demo
from fieldcol.errors import InputError
from fieldcol.store import Store, apply_schedule, open_store, preview_schedule
from fieldcol.ui import band_model as bm
from fieldcol.ui import builtup_model as bu
from fieldcol.ui import loads_model as lm
from fieldcol.ui import model
from fieldcol.ui import readings
from fieldcol.ui import restraints_model as rm
from fieldcol.ui import section
from fieldcol.ui import sites


def dump(path: Path) -> list:
    """Every table's rows, read from the file by a connection of its own (what is committed)."""
    con = sqlite3.connect(f"file:{path}?mode=ro", uri=True)
    try:
        names = [r[0] for r in con.execute(
            "SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name")]
        return [(t, sorted(con.execute(f'SELECT * FROM "{t}"').fetchall(), key=repr))
                for t in names]
    finally:
        con.close()


@pytest.fixture(scope="module")
def template(tmp_path_factory):
    """The demo store as built, closed: each example works on a copy of its own, so what an
    earlier example saved never changes what a later one meets."""
    path = tmp_path_factory.mktemp("hostile") / "demo.db"
    store = open_store(path)
    build_demo(store)
    store.close()
    return path


@pytest.fixture
def fresh(tmp_path):
    """The demo store as built (the property tests above keep writing to theirs)."""
    path = tmp_path / "demo.db"
    store = open_store(path)
    build_demo(store)
    yield store, store.site_by_name(SITE_NAME), path
    store.close()


def _refused_leaves_the_store(store, path, change, fields) -> None:
    """Run ``change(store)`` (a ``(do, undo)`` pair's ``do`` is run too); when it is refused,
    the error names one of ``fields`` and every row is as it was."""
    before = dump(path)
    try:
        got = change(store)
        if isinstance(got, tuple) and len(got) == 2 and callable(got[0]):
            got[0](store)
    except InputError as e:
        assert not store.db.conn.in_transaction
        assert dump(path) == before, str(e)
        assert re.fullmatch(fields, e.field), (str(e), fields)


HOSTILE = st.sampled_from(
    ["", " ", "abc", "nan in", "inf ft", "-3 ft", "0", "0 in", "1e300 in", "1e-300 in", "12",
     "１２ ft", "12 kip", "12 ft\x00", "💥", "1/0 in", "nan", "x" * 3000, "\ud800", "a\udfffb",
     "W14X999", "fixed", "'; DROP TABLE columns; --", "2026-13-45", "-5 kip", "1e31 kip",
     "L/0", "{}", "[]"]) | st.text(max_size=8)


# (what, the change for one typed text, the fields its refusal may name: a pattern, as the
# entries are labelled on the screen); the change gets the
# text, the store, `C` (C/3-G: a demo W14X90 with a weak-axis brace at 12 ft), `H` (E/1-M: an
# HSS), the site's id `S`, the site's form values `V` and a new brace form `D`
CHANGES = [
    ("length", lambda s, st, C, H, S, V, D: model.edit_change(C, "length", s),
     r"length|restraints\..*"),
    ("section", lambda s, st, C, H, S, V, D: model.edit_change(C, "section", s), "section"),
    ("material", lambda s, st, C, H, S, V, D: model.edit_change(C, "material", s), "material"),
    ("demand", lambda s, st, C, H, S, V, D: model.edit_change(C, "demand", s), r"demand(\..*)?"),
    ("basis", lambda s, st, C, H, S, V, D: model.edit_change(C, "basis", s), "basis"),
    ("site name", lambda s, st, C, H, S, V, D: sites.site_change(S, {**V, "name": s}), "name"),
    ("site address", lambda s, st, C, H, S, V, D: sites.site_change(S, {**V, "address": s}),
     "address"),
    ("site material", lambda s, st, C, H, S, V, D: sites.site_change(S, {**V, "material": s}),
     "material"),
    ("new EN site gamma", lambda s, st, C, H, S, V, D: sites.site_change(None, {
        **V, "name": "Annex " + s[:8], "code": "en1993-1-1/", "gamma_m1": s}), "gamma_m1|name"),
    ("new site units", lambda s, st, C, H, S, V, D: sites.site_change(None, {
        **V, "name": "Yard " + s[:8], "unit_system": s}), "unit_system|name"),
    ("column tag", lambda s, st, C, H, S, V, D: sites.add_column_change(S, {"tag": s}), "tag"),
    ("column grid", lambda s, st, C, H, S, V, D: sites.add_column_change(S, {
        "tag": "Z/9 " + s[:6], "grid": s}), "tag|grid"),
    ("who", lambda s, st, C, H, S, V, D: sites.who_change(s, s[:3], s), "name|initials|device"),
    ("visit date", lambda s, st, C, H, S, V, D: sites.visit_change(S, {"date": s}), "date"),
    ("visit people", lambda s, st, C, H, S, V, D: sites.visit_change(
        S, {"date": "2026-12-04", "people": s}), "people"),
    ("thickness", lambda s, st, C, H, S, V, D: readings.add_reading(
        st, C, "thickness", s, element="flange"), r"reading|thickness.*|flange.*|section\..*"),
    ("bow", lambda s, st, C, H, S, V, D: readings.add_reading(st, C, "bow", s, axis="weak"),
     r"reading|bow.*|condition\..*"),
    ("plumb note", lambda s, st, C, H, S, V, D: readings.add_reading(
        st, C, "plumb", "1/2 in", note=s), "note"),
    ("pick section", lambda s, st, C, H, S, V, D: section.choose_section(st, C, s), "section"),
    ("measured d", lambda s, st, C, H, S, V, D: section.save_measured(st, C, "i", {
        "d": s, "bf": "14.5 in", "tf": "0.7 in", "tw": "0.45 in"}, None), r"depth|section(\..*)?"),
    ("plate thickness", lambda s, st, C, H, S, V, D: section.set_plates(st, C, s, "12 in"),
     "plate thickness|cover plates"),  # empty: take the plates away
    ("rivet pitch", lambda s, st, C, H, S, V, D: section.set_plates(
        st, C, "3/8 in", "12 in", "riveted", s), "rivet pitch"),
    ("brace at", lambda s, st, C, H, S, V, D: rm.save_brace(st, C, {**D, "at": s}), "at"),
    ("brace stiffness", lambda s, st, C, H, S, V, D: rm.save_brace(st, C, {**D, "stiffness": s}),
     "stiffness"),
    ("brace note", lambda s, st, C, H, S, V, D: rm.save_brace(st, C, {**D, "note": s}),
     r"note|restraints\.weak\.braces\[\d+\]\.note"),
    ("spring end", lambda s, st, C, H, S, V, D: rm.set_end(st, C, "weak", "bottom", "spring",
                                                           rotation=s),
     r"rotation|restraints\.weak\.bottom(\..*)?"),
    ("twist at", lambda s, st, C, H, S, V, D: rm.add_twist(st, C, s), "twist|at"),
    ("reaction load", lambda s, st, C, H, S, V, D: lm.add_reaction(st, C, s), r"reaction \d+ load"),
    ("reaction eccentricity", lambda s, st, C, H, S, V, D: lm.add_reaction(
        st, C, "40 kip", "strong", s), r"reaction \d+ eccentricity"),
    ("end moment", lambda s, st, C, H, S, V, D: lm.set_end_moments(
        st, C, "strong", s, "10 kip*ft"), "strong axis moment at the (top|bottom)"),
    ("story load", lambda s, st, C, H, S, V, D: lm.set_story(st, C, s, "30000 kip"),
     "story (buckling )?load"),
    ("band from", lambda s, st, C, H, S, V, D: bm.set_band(st, C, s, "2 ft"),
     "loss band (from|to)"),
    ("band hole", lambda s, st, C, H, S, V, D: bm.set_band(st, C, "0 in", "2 ft", {"flange": s}),
     "hole across each flange"),
    ("finish", lambda s, st, C, H, S, V, D: bm.set_finish(st, H, s), "finish"),
    ("bow allowance", lambda s, st, C, H, S, V, D: bm.set_bow_allowance(st, C, s),
     "bow allowance"),
    ("built gap", lambda s, st, C, H, S, V, D: bu.save_built(st, C, "channels", "battens", {
        "channel": "C12X20.7", "gap": s, "battens.spacing": "24 in", "battens.depth": "8 in",
        "battens.thickness": "3/8 in"}), "clear gap"),
    ("built arrangement", lambda s, st, C, H, S, V, D: bu.save_built(st, C, s, "battens", {}),
     "arrangement"),
]


@settings(max_examples=200, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(which=st.sampled_from(range(len(CHANGES))), typed=HOSTILE)
def test_a_refused_entry_is_named_and_leaves_every_row(template, which, typed):
    path = template.with_name(f"copy-{next(_COPIES)}.db")
    shutil.copyfile(template, path)
    store = open_store(path)
    try:
        site = store.site_by_name(SITE_NAME)
        cid = store.find_column(site.id, "C/3-G").id
        hss = store.find_column(site.id, "E/1-M").id
        values = sites.site_values(store, site.id)
        draft = rm.empty_draft(store.current_record(cid), who="R. Amadi")
        _, build, fields = CHANGES[which]
        _refused_leaves_the_store(
            store, path, lambda st_: build(typed, st_, cid, hss, site.id, values, draft), fields)
    finally:
        store.close()


_COPIES = itertools.count()


# -- regressions: each changed the store, crashed, or named no entry before ---------------------

@pytest.mark.parametrize("make, field, words", [
    # a lone surrogate: before, UnicodeEncodeError from SQLite's UTF-8 binding (RFC 3629: U+D800
    # has no UTF-8 form)
    (lambda st, C, S: sites.add_column_change(S, {"tag": "Z/\ud800"})[0](st), "tag",
     "no character"),
    (lambda st, C, S: sites.visit_change(S, {"date": "2026-12-04", "people": "R.\udfff"})[0](st),
     "people", "no character"),
    (lambda st, C, S: readings.add_reading(st, C, "plumb", "1/2 in", note="\ud800"), "note",
     "no character"),
    (lambda st, C, S: rm.save_brace(st, C, {**rm.empty_draft(st.current_record(C)),
                                            "note": "strut \ud800"}),
     "restraints.weak.braces[1].note", "no character"),
    # a control character: a NUL ends a text early in C strings, CSV readers and PDF text
    # (ISO/IEC 646 C0 controls U+0000-U+001F and U+007F; tab and line breaks stay allowed)
    (lambda st, C, S: sites.add_column_change(S, {"tag": "Z/\x001"})[0](st), "tag",
     "control character"),
    (lambda st, C, S: readings.add_reading(st, C, "plumb", "1/2 in", note="bay\x07 3"), "note",
     "control character"),
    (lambda st, C, S: rm.save_brace(st, C, {**rm.empty_draft(st.current_record(C)),
                                            "note": "strut\x00"}),
     "restraints.weak.braces[1].note", "control character"),
])
def test_text_that_cannot_be_kept_is_named_and_nothing_is_written(fresh, make, field, words):
    store, site, path = fresh
    cid = store.find_column(site.id, "C/3-G").id
    before = dump(path)
    with pytest.raises(InputError) as e:
        make(store, cid, site.id)
    assert e.value.field == field and words in e.value.reason
    assert dump(path) == before
    if store.open_visit() is not None:
        store.end_visit()


def test_tab_and_line_breaks_stay_in_a_note(fresh):
    store, site, _ = fresh
    cid = store.find_column(site.id, "C/3-G").id
    readings.add_reading(store, cid, "plumb", "1/2 in", note="line 1\n\tline 2\r\n")
    assert any(m.note and "\tline 2" in m.note for m in store.measurements(cid))


def test_a_new_site_refused_for_its_gamma_leaves_no_site(fresh):
    # before: the site was added, then its defaults refused: a site half made
    store, _, path = fresh
    before = dump(path)
    do, _ = sites.site_change(None, {**sites.site_values(store), "name": "Annex",
                                     "code": "en1993-1-1/", "gamma_m1": "abc"})
    with pytest.raises(InputError) as e:
        do(store)
    assert e.value.field == "gamma_m1" and dump(path) == before


def test_a_measured_section_refused_for_its_gauge_leaves_every_row(fresh):
    # before: the record was saved, then put back, and the readings taken were tombstoned
    store, site, path = fresh
    cid = store.find_column(site.id, "C/3-G").id
    before = dump(path)
    with pytest.raises(InputError) as e:
        section.save_measured(store, cid, "i", {"d": "14 in", "bf": "14.5 in", "tf": "0.7 in",
                                                "tw": "0.45 in"}, "caliper \ud800")
    assert e.value.field == "gauge" and dump(path) == before


@pytest.mark.parametrize("thickness, width, field", [("0 in", "12 in", "plate thickness"),
                                                     ("1e300 in", "12 in", "plate thickness")])
def test_plates_the_column_refuses_are_named_as_the_entry(fresh, thickness, width, field):
    # before: the field was the save's label, "cover plates 0 in x 12 in"
    store, site, path = fresh
    cid = store.find_column(site.id, "C/3-G").id
    before = dump(path)
    with pytest.raises(InputError) as e:
        section.set_plates(store, cid, thickness, width)
    assert e.value.field == field and e.value.text == thickness and dump(path) == before


@pytest.mark.parametrize("arrangement, tie, field", [("star", "none", "arrangement"),
                                                     ("channels", "none", "ties"),
                                                     ("angles-web", "lacing", "ties")])
def test_the_built_up_card_names_an_unknown_arrangement_or_tie(arrangement, tie, field):
    # before: KeyError
    with pytest.raises(InputError) as e:
        bu.entries(arrangement, tie)
    assert e.value.field == field


# -- schedules --------------------------------------------------------------------------------

HEAD = ["tag", "level", "grid", "location", "section", "length", "material", "demand", "basis"]
ROWS = [["A/1", "L1", "A/1", "west wall", "W14X90", "30 ft", "A992", "800 kip", "lrfd"],
        ["A/2", "L1", "A/2", "", '{"name": "W10X49", "loss": {"flange": "0.4 in"}}', "16 ft",
         '{"grade": "A7", "Fy": "30 ksi"}', "100 kip", "asd"],
        ["B/4", "L2", "B/4", "", "W14X90", "12'-6\"", "A992", "", ""]]
CELL = st.sampled_from(
    ["", " ", "nan", "nan ft", "inf kip", "-3 ft", "0", "0 ft", "1e300 ft", "1e-300 in", "12",
     "１２ ft", "12 kip", "💥", "{", "{}", "[]", '{"name": "W14X90", "name": "W10X49"}',
     '{"name": NaN}', '{"a": 1}', "W14X999", "A9999", "en", "\x00", "a\nb", "a,b", '"',
     "{" * 40 + "}" * 40, "null", '{"name": "W14X90", "loss": {"flange": "1e300 in"}}',
     '{"shape": "i", "d": "14 in"}', "1/0 in", "=1+1", "x" * 140_000]) | st.text(max_size=6)


@pytest.fixture(scope="module")
def depot(tmp_path_factory):
    path = tmp_path_factory.mktemp("schedule") / "s.db"
    with Store(path) as s:
        s.add_site("Depot", code="aisc360-22", unit_system="us")
        s.add_column(s.find_site("Depot").id, {"tag": "B/4", "section": "W12X65",
                                               "material": "A36", "length": "20 ft"})
    return path


def _write(path: Path, rows) -> None:
    with open(path, "w", encoding="utf-8", newline="") as f:
        w = csv.writer(f)
        w.writerow(HEAD)
        w.writerows(rows)


@settings(max_examples=120, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(row=st.sampled_from(range(len(ROWS))), col=st.sampled_from(range(len(HEAD))), cell=CELL)
def test_a_mutated_cell_is_named_by_row_and_column_and_nothing_is_applied(depot, tmp_path_factory,
                                                                        row, col, cell):
    rows = [list(r) for r in ROWS]
    rows[row][col] = cell
    csv_path = depot.with_name("in.csv")
    _write(csv_path, rows)
    before = dump(depot)
    with Store(depot) as s:
        pv = preview_schedule(s, "Depot", csv_path)
        if pv.ok:
            return  # a cell the engine takes (the file is never applied here)
        name = HEAD[col]
        assert any(e.row == row + 2 and re.fullmatch(rf"{name}([.\[].*)?", e.field)
                   for e in pv.errors), [str(e) for e in pv.errors]
        with pytest.raises(InputError):
            apply_schedule(s, "Depot", csv_path)
    assert dump(depot) == before


def _cli(argv):
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main(argv)
        except SystemExit as e:
            code = e.code
    return code, out.getvalue(), err.getvalue()


@pytest.mark.parametrize("row, col, cell", [(0, 5, "1e300 ft"), (1, 4, '{"name": NaN}'),
                                            (2, 2, "x" * 140_000), (0, 6, "a\nb"),
                                            (1, 7, "nan kip"), (0, 0, "A/\x001"),
                                            (2, 3, "west\x1bwall")])
def test_import_schedule_refuses_with_row_and_column_and_exit_2(depot, row, col, cell):
    rows = [list(r) for r in ROWS]
    rows[row][col] = cell
    csv_path = depot.with_name("cli.csv")
    _write(csv_path, rows)
    before = dump(depot)
    code, _, err = _cli(["import-schedule", str(csv_path), "--db", str(depot), "--site", "Depot",
                         "--apply"])
    assert code == 2 and "Traceback" not in err
    assert err.startswith(f"error: row {row + 2}.{HEAD[col]}: cannot use"), err
    assert dump(depot) == before


@pytest.mark.parametrize("remove, field", [
    (lambda st, C: rm.remove_twist(st, C, "0"), "twist"),
    (lambda st, C: rm.remove_twist(st, C, None), "twist"),
    (lambda st, C: rm.remove_twist(st, C, True), "twist"),   # not the point at 1
    (lambda st, C: lm.remove_reaction(st, C, None), "reaction"),
    (lambda st, C: rm.remove_brace(st, C, [("weak", "0")]), "brace"),
    (lambda st, C: rm.remove_brace(st, C, []), "brace"),      # before: AssertionError
])
def test_a_position_that_is_no_whole_number_is_named(fresh, remove, field):
    # before: TypeError comparing the index, or an AssertionError for no brace at all
    store, site, path = fresh
    cid = store.find_column(site.id, "C/2-G").id    # a weak-axis brace and a twist point
    before = dump(path)
    with pytest.raises(InputError) as e:
        remove(store, cid)
    assert e.value.field == field and dump(path) == before


@pytest.mark.parametrize("record, field", [
    ({"tag": "A", "length": float("nan")}, "length"),             # RFC 8259: no NaN
    ({"tag": "A", "restraints": {"weak": {"braces": [{"at": float("inf")}]}}},
     "restraints.weak.braces[0].at"),
    ({"tag": "A", "notes": b"x"}, "notes"),
    ({"tag": "A", "notes": "\ud800"}, "notes"),
])
def test_a_record_the_store_cannot_keep_names_the_entry(tmp_path, record, field):
    # before: the field was "record", whatever entry it was
    path = tmp_path / "s.db"
    with Store(path) as s:
        site = s.add_site("Depot", code="aisc360-22", unit_system="us")
        before = dump(path)
        with pytest.raises(InputError) as e:
            s.add_column(site.id, record)
        assert e.value.field == field and dump(path) == before


def test_lines_ended_by_a_lone_carriage_return_are_said_so(depot):
    # before: "a quote is not closed (new-line character seen in unquoted field ...)": there was
    # no quote. RFC 4180 ends a record with CR LF; a lone CR is an old Mac line end.
    csv_path = depot.with_name("cr.csv")
    csv_path.write_bytes(b"tag,section,length\nA/1,W14X90,30 ft\rA/2,W14X90,30 ft\n")
    with Store(depot) as s:
        pv = preview_schedule(s, "Depot", csv_path)
    assert [(e.row, e.field) for e in pv.errors] == [(2, "row")]
    assert "lone carriage return" in pv.errors[0].reason and "quote" not in pv.errors[0].reason
