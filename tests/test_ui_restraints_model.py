"""The Restraints and Check tabs' view-models on a real store holding the invented demo site.

Outside references: Timoshenko & Gere, Theory of Elastic Stability (a rigid support at
mid-height of a pinned column halves its buckling length: two half-waves); AISC 360-22 E3 and
App. 6.2; EN 1993-1-1 6.3.1 (symbols N_b,Rd, chi, lambda-bar).
"""

from __future__ import annotations

import pytest

from fieldcol.demo import SITE_NAME, build_demo
from fieldcol.errors import InputError
from fieldcol.store import open_store
from fieldcol.ui import check_model as cm
from fieldcol.ui import model as m
from fieldcol.ui import restraints_model as rm

FT = 304.8  # mm per foot, exact by definition


@pytest.fixture
def demo(tmp_path):
    store = open_store(tmp_path / "demo.db")
    build_demo(store)
    site = store.site_by_name(SITE_NAME)
    yield store, site
    store.close()


def _col(store, site, tag):
    return store.find_column(site.id, tag).id


def test_adding_a_brace_at_mid_height_logs_it_and_changes_what_governs(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")    # W10X49, 16 ft, pinned, no braces: weak axis governs
    before = cm.latest_summary(store, cid)
    assert before.governs == "Buckling about the weak axis governs"
    n0 = len(store.restraint_changes(cid))
    draft = rm.empty_draft(store.current_record(cid), who="T. Nguyen")
    assert draft["at"] == "8 ft" and draft["axis"] == "weak"
    saved = rm.save_brace(store, cid, {**draft, "stiffness": "rigid", "twist": True},
                          who="T. Nguyen")
    changes = store.restraint_changes(cid)
    assert len(changes) == n0 + 1
    rc = changes[-1]
    assert rc.kind == "brace_added" and rc.axis == "weak" and rc.seen_by == "T. Nguyen"
    assert "8 ft" in rc.description and rc.detail["brace"]["kind"] == "strut"
    after = cm.latest_summary(store, cid)
    # Timoshenko & Gere: the weak-axis length halves, so the strong axis now governs
    assert after.governs == "Buckling about the strong axis governs"
    weak = next(c for c in after.capacities if c.mode == "flexural-weak")
    assert weak.length == "8'-0\""
    view = rm.restraints_view(store.current_record(cid), "us")
    (b,) = view.braces
    assert (b.axis, b.at_text, b.kind, b.seen_by) == ("weak", "8'-0\"", "strut", "T. Nguyen")
    # undo: the record as it was, the change gone from the history, checked again
    rm.restore(store, saved)
    assert len(store.restraint_changes(cid)) == n0
    assert rm.restraints_view(store.current_record(cid), "us").braces == []
    assert cm.latest_summary(store, cid).governs == before.governs


def test_a_brace_on_both_axes_is_one_brace_and_goes_away_whole(demo):
    store, site = demo
    cid = _col(store, site, "D/1-G")
    rm.save_brace(store, cid, {"at": "10 ft", "axis": "both", "kind": "tie",
                               "twist": True}, who="R. Amadi")
    rec = store.get_column(cid).record
    assert rec["restraints"]["strong"]["braces"] == rec["restraints"]["weak"]["braces"]
    assert rec["restraints"]["twist"]["braces"][0]["at"] == "10 ft"
    (b,) = rm.restraints_view(rec, "us").braces
    assert b.axis == "both" and len(b.refs) == 2 and b.draft["twist"] is True
    rm.remove_brace(store, cid, b.refs, who="R. Amadi")
    rec = store.get_column(cid).record
    assert "braces" not in rec["restraints"]["strong"] and "twist" not in rec["restraints"]
    assert store.restraint_changes(cid)[-1].kind == "brace_removed"


def test_changing_a_brace_keeps_one_entry_and_logs_the_change(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")   # the 0.6 kip/in strap that does not qualify
    (b,) = rm.restraints_view(store.current_record(cid), "us").braces
    rm.save_brace(store, cid, {**b.draft, "stiffness": "60 kip/in", "strength": "10 kip"},
                  refs=b.refs, who="R. Amadi")
    (b2,) = rm.restraints_view(store.current_record(cid), "us").braces
    assert b2.draft["stiffness"] == "60 kip/in"
    assert "changed" in store.restraint_changes(cid)[-1].description
    s = cm.latest_summary(store, cid)
    # AISC 360-22 App. 6.2: 60 kip/in > 48.15 kip/in needed: the strap now counts
    assert not any("does not qualify" in w for w in s.warnings)


def test_a_bad_entry_names_the_form_field_and_saves_nothing(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    rec0 = store.get_column(cid).record
    n0 = len(store.restraint_changes(cid))
    for draft, name in (({"at": "30 ft", "axis": "weak"}, "at"),
                        ({"at": "", "axis": "weak"}, "at"),
                        ({"at": "8 ft", "axis": "weak", "stiffness": "20"}, "stiffness"),
                        ({"at": "8 ft", "axis": "weak", "kind": "cable", "area": "0.2 in2"},
                         "length")):
        with pytest.raises(InputError) as e:
            rm.save_brace(store, cid, draft, who="x")
        assert e.value.field == name, (draft, e.value.field)
        assert "[" not in rm.plain(e.value)
    assert store.get_column(cid).record == rec0 and len(store.restraint_changes(cid)) == n0


def test_ends_and_twist_points_are_saved_and_logged(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    rm.set_end(store, cid, "weak", "bottom", "fixed", who="R. Amadi")
    assert store.get_column(cid).record["restraints"]["weak"]["bottom"] == "fixed"
    assert store.restraint_changes(cid)[-1].kind == "end_condition_changed"
    rm.set_end(store, cid, "strong", "top", "spring", rotation="50000 kip*in/rad")
    assert store.get_column(cid).record["k_basis"] == "analysis"
    assert "buckling analysis" in store.restraint_changes(cid)[-1].description
    view = rm.restraints_view(store.current_record(cid), "us")
    assert view.ends[("strong", "top")].kind == "spring"
    with pytest.raises(InputError) as e:
        rm.set_end(store, cid, "strong", "top", "spring")
    assert e.value.field == "rotation"
    rm.add_twist(store, cid, "8 ft", who="R. Amadi")
    assert rm.restraints_view(store.current_record(cid), "us").twist == [(0, "8'-0\"")]
    rm.remove_twist(store, cid, 0)
    assert rm.restraints_view(store.current_record(cid), "us").twist == []


def test_an_end_change_says_the_check_it_saved(demo):
    """The save bar's "checked again: ..." after an end change comes from the check saved with
    it. A7 (Fy 33 ksi, the historic ASTM A7 minimum, from memory), W10X49
    (A 14.4 in2, ry 2.54 in: AISC Shapes Database v15.0, from memory), 16 ft: fixing one
    weak-axis end of a pinned column takes K from 1.0 to the recommended design 0.80 (AISC
    360-22 Commentary Table C-A-7.1, from memory), so by AISC 360-22 E3 by hand Lc/r 60.5,
    Fe 78.3 ksi, Fcr 27.7 ksi, phi Pn 358 kip and 120 kip / 358 kip = 0.335."""
    store, site = demo
    cid = _col(store, site, "A/1-G")
    saved = rm.set_end(store, cid, "weak", "top", "fixed", who="R. Amadi")
    chk = store.latest_check(cid)
    assert saved.status == f"{chk.utilization:.2f} OK"
    assert chk.utilization == pytest.approx(120 / 358.5, rel=0.01)
    # the twist restraint and the removal say theirs too
    assert rm.add_twist(store, cid, "8 ft").status.endswith("OK")


def test_sketch_follows_the_brace_being_typed(demo):
    store, site = demo
    rec = store.current_record(_col(store, site, "A/1-G"))
    s0 = rm.sketch(rec, "us")
    assert [a.note for a in s0.axes] == ["one half-wave", "one half-wave"]
    assert [a.governs for a in s0.axes] == [False, True]
    live = rm.sketch_with(rec, {"at": "8 ft", "axis": "weak", "twist": True}, (), "us")
    weak = live.axes[1]
    # Timoshenko & Gere: a rigid brace at mid-height gives two half-waves, zero at the brace
    assert weak.note == "2 half-waves" and weak.braces == [(0.5, "strut", True)]
    assert min(abs(w) for z, w in weak.shape if abs(z - 0.5) < 1e-9) < 1e-9
    assert [a.governs for a in live.axes] == [True, False]
    bad = rm.sketch_with(rec, {"at": "40 ft", "axis": "weak"}, (), "us")
    assert bad.error_field == "at" and bad.axes == s0.axes


def test_check_summary_speaks_the_code(demo):
    store, site = demo
    s = cm.latest_summary(store, _col(store, site, "C/3-G"))
    assert s.title == "AISC 360-22 check" and s.status_word == "OVER"
    assert [c.name for c in s.capacities] == ["Strong axis (x)", "Weak axis (y)", "Torsion (z)",
                                              "Squash (yield)"]
    assert s.result_line.startswith("Pr 650 kip / φPn ")
    assert not any("[" in t.symbol for t in s.trace)
    assert s.chart is not None and s.chart.x_name == "Lc/r" and s.chart.stress_unit == "ksi"
    gov = [p for p in s.chart.points if p.governs]
    assert len(gov) == 1 and gov[0].label.startswith("weak")
    # the point sits on the AISC 360-22 E3 curve (a compact section: Pn / Ag = Fcr)
    (label, pts), = s.chart.curves
    import numpy as np
    xs, ys = zip(*pts)
    assert float(np.interp(gov[0].x, xs, ys)) == pytest.approx(gov[0].stress, rel=2e-3)


def test_en_check_summary_uses_en_symbols():
    from fieldcol.assess import assess

    r = assess({"tag": "C", "section": "HE 200 B", "material": "S355", "length": "6 m",
                "code": "en1993-1-1", "demand": {"axial": "900 kN"}}).to_dict()
    s = cm.check_summary(r, "si")
    assert s.title == "EN 1993-1-1 check" and "(en)" not in s.title.lower()
    assert s.result_line.startswith("N_Ed 900 kN / N_b,Rd ")
    assert s.capacities[1].name == "Weak axis (z-z)" and s.capacities[1].slenderness.startswith("λ-bar_z")
    syms = {t.symbol for t in s.trace}
    assert {"χ_z", "λ-bar_z", "N_b,Rd", "N_cr,z"} <= syms
    assert s.chart.x_name == "λ-bar" and [c[0] for c in s.chart.curves] == ["curve b (y-y)",
                                                                          "curve c (z-z)"]
    assert "λ-bar_z" in s.why


def test_both_cable_forms_ask_for_the_angle_the_engine_takes(demo):
    """The cable's stiffness is (A E / L) cos^2(theta), theta between the cable and the way the
    braced point moves (common practice): the Restraints form asked for that, the Retrofit form
    for the angle "to the floor", which is the same only for a cable square to the wall in
    plan (a level cable skewed 60 deg in plan gives a quarter of the stiffness, not all)."""
    from fieldcol.ui import retrofits
    from fieldcol.ui.tab_restraints import _FORM_LABELS

    retro = {name: (label, hint) for name, label, hint in retrofits.FORM_FIELDS["cable"]}
    for label, hint in (retro["angle"], _FORM_LABELS["angle"]):
        assert "angle" in label.lower() and "floor" not in label.lower()
        assert hint.startswith("to the way the column moves") and "(0 = in line)" in hint
    # a blank stiffness or strength means the same on both forms: what the engine takes then
    # (rigid and strong enough; the kept option's warning says so), not "not known"
    brace = {name: label for name, label, _hint in retrofits.FORM_FIELDS["brace"]}
    assert (brace["stiffness"], brace["strength"]) == (_FORM_LABELS["stiffness"][0],
                                                       _FORM_LABELS["strength"][0])
    assert {label for name, label, _h in retrofits.FORM_FIELDS["cable"] if name == "strength"} \
        == {_FORM_LABELS["strength"][0]}
    # and the engine's own refusal of a cable without it speaks of the same angle
    from fieldcol.assess import assess

    store, site = demo
    rec = store.current_record(_col(store, site, "A/1-G"))
    rec["restraints"]["weak"]["braces"] = [{"at": "8 ft", "cable": {"area": "0.2 in2",
                                                                     "length": "12 ft"}}]
    with pytest.raises(InputError) as e:
        assess(rec)
    assert "direction the braced point moves" in e.value.reason


def test_a_stiffness_reads_alike_wherever_the_app_shows_it(demo):
    """One display rule for a quantity (``units.format_entry`` = ``format_quantity``: the
    site's unit, four significant figures): a brace stiffness typed "3.50 kN/mm" on a US site
    reads the same in the brace's line, the column's record and the check's trace, which
    works it out from the parsed value. 3.5 kN/mm = 3500 N/mm x 0.0057101471 kip/in per N/mm
    (NIST SP 811 factors: 1 kip = 4448.2216 N, 1 in = 25.4 mm) = 19.99 kip/in."""
    store, site = demo
    cid = _col(store, site, "A/1-G")
    draft = rm.empty_draft(store.current_record(cid), who="T. Nguyen")
    rm.save_brace(store, cid, {**draft, "stiffness": "3.50 kN/mm", "strength": "5.000 kip"},
                  who="T. Nguyen")
    (b,) = rm.restraints_view(store.current_record(cid), "us").braces
    assert "stiffness 19.99 kip/in" in b.summary and "good for 5 kip" in b.summary, b.summary
    lines = " ".join(x.value for x in m.column_detail(store, cid).restraints)
    assert "stiffness 19.99 kip/in" in lines and "3.50" not in lines, lines
    trace = " ".join(f"{s.what} {s.value}" for s in cm.latest_summary(store, cid).trace)
    assert "given: 19.99 kip/in" in trace, trace
    # the story's lateral stiffness in the record's lines follows the same rule:
    # 35 kN/mm x 5.7101471 (kip/in)/(kN/mm) = 199.86 kip/in
    from fieldcol.ui import loads_model as lm
    lm.set_story(store, cid, "3000.0 kip", "", "35.0 kN/mm")
    lines = " ".join(x.value for x in m.column_detail(store, cid).record)
    assert "Story: 3000 kip gravity load, lateral stiffness 199.9 kip/in" in lines, lines
    # an SI site: the same brace in kN/mm, typed notation dropped the same way
    assert "stiffness 3.5 kN/mm" in rm.restraints_view(store.current_record(cid), "si"
                                                       ).braces[0].summary
