"""Loads on the column from the Check tab: beam reactions at an eccentricity, first-order end
moments, the story; each saved into the record's ``demand`` (README, record reference), checked
again, undone, and a bad entry refused in plain words under its entry with the text kept.

Outside references, named at each check:
- AISC 360-22 H1.1 (H1-1a): Pr/Pc >= 0.2 gives Pr/Pc + 8/9 (Mrx/Mcx + Mry/Mcy) <= 1.
- AISC 360-22 Appendix 8 (A-8-3), (A-8-4): B1 = Cm / (1 - alpha Pr/Pe1) >= 1 and
  Cm = 0.6 - 0.4 M1/M2 (M1/M2 positive in reverse curvature).
- AISC Steel Construction Manual Table 1-1 (from memory): W10X49 d = 9.98 in, Zx = 60.4 in^3.
- ASTM A7 (historic, from memory): Fy = 33 ksi.
- The unmeasured eccentricity of a seated or cap-plate beam: the face of the column + 100 mm
  (common practice, from memory; the engine's stated default).
In-process control trees on a real store (the fake session of tests/test_ui_session.py).
"""

from __future__ import annotations

import flet as ft
import pytest

from fieldcol.assess import assess
from fieldcol.errors import InputError
from fieldcol.ui import loads_model as lm
from fieldcol.ui import readings as r
from fieldcol.ui.check_model import latest_summary
from fieldcol.ui.saving import plain_error

from tests.test_ui_session import Screen, _run, demo  # noqa: F401  (the fixture)

TAG = "A/1-G"   # the demo's W10X49 of A7 steel, 16 ft, pinned, 120 kip (LRFD)
KIP, INCH = 4448.2216152605, 25.4


def _check(store, cid):
    return store.latest_check(cid).result


def _engine(store, cid):
    """The engine run afresh on the record the store holds now."""
    return assess(store.current_record(cid)).to_dict()


def test_a_reaction_with_eccentricity_makes_a_beam_column_by_h1_1a(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    before = _check(store, cid)
    assert before["governing_mode"] != "beam-column"
    pc = before["design_strength"]["value"]
    ch = lm.add_reaction(store, cid, "40", "strong", "6")
    assert ch.label == "reaction 1: 40 kip, strong axis, 6 in off the centre, + side"
    assert store.get_column(cid).record["demand"]["reactions"] == [
        {"load": "40 kip", "axis": "strong", "eccentricity": "6 in", "side": "+"}]
    after = _check(store, cid)
    assert after["governing_mode"] == "beam-column"
    assert after["utilization"]["value"] == pytest.approx(_engine(store, cid)["utilization"]["value"])
    assert after["design_strength"]["value"] < pc   # bending lowers the axial capacity
    bc = after["beam_column"]
    # by hand: Mr = 40 kip x 6 in = 240 kip*in; B1 = 1 (A-8-3: Cm 0.6 over 1 - Pr/Pe1 < 1)
    mr = bc["required_moment"]["strong"]["value"]
    assert mr == pytest.approx(240 * KIP * INCH, rel=1e-6)
    # Mc cannot pass phi Mp = 0.9 x 33 ksi x 60.4 in^3 = 1794 kip*in (Manual Table 1-1)
    mc = bc["flexural_strength"]["strong"]["value"]
    assert mc <= 0.9 * 33 * 60.4 * KIP * INCH * 1.001
    # H1-1a with Pr/Pc >= 0.2, Pc the axial design strength (unchanged by the reaction)
    pr = 120 * KIP
    assert pr / pc >= 0.2 and bc["equation"] == "H1-1a"
    assert bc["interaction"]["value"] == pytest.approx(pr / pc + 8 / 9 * mr / mc, rel=1e-3)
    # and never under the bound phi Mp gives: 0.3685 + 8/9 x 240/1794 = 0.487
    assert bc["interaction"]["value"] >= pr / pc + 8 / 9 * 240 / (0.9 * 33 * 60.4) - 1e-3
    words = latest_summary(store, cid).interaction
    assert words.startswith("AISC 360-22 (H1-1a) governs") and "strong axis 20 kip*ft" in words
    # the record in words on the column screen says the reaction too
    from fieldcol.ui.model import column_detail
    assert ("Loads", "Reaction 1: 40 kip, strong axis, 6 in off the centre, + side") in [
        (x.label, x.value) for x in column_detail(store, cid).record]
    r.undo_change(store, ch)
    assert "reactions" not in store.get_column(cid).record["demand"]
    assert _check(store, cid)["utilization"]["value"] == pytest.approx(
        before["utilization"]["value"])


def test_an_unmeasured_eccentricity_takes_the_stated_default_and_the_trace_says_so(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    lm.add_reaction(store, cid, "40 kip", "strong", "")
    assert "eccentricity" not in store.get_column(cid).record["demand"]["reactions"][0]
    step = next(s for s in _check(store, cid)["steps"] if s["symbol"] == "e_R")
    assert "not measured" in step["what"] and "face of the column + 100 mm" in step["formula"]
    # W10X49: d / 2 = 9.98 / 2 in (Manual Table 1-1, from memory) + 100 mm
    assert step["value"] == pytest.approx(9.98 / 2 * INCH + 100, abs=1.0)
    assert "not measured" in lm.loads_view(store, cid).reactions[0].words
    # the entry's hint says it in the site's unit first (100 mm = 3.94 in: 25.4 mm to the
    # inch, exact by definition), beside "bare numbers in inches"
    assert lm.loads_view(store, cid).default_offset_words == "about 4 in (100 mm)"


def test_reactions_on_opposite_sides_cancel_and_remove_keeps_the_others(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    axial_only = _check(store, cid)["design_strength"]["value"]
    lm.add_reaction(store, cid, "40", "strong", "6", "+")
    lm.add_reaction(store, cid, "40", "strong", "6", "-")
    bc = _check(store, cid)["beam_column"]
    assert bc is None or bc["required_moment"]["strong"]["value"] == pytest.approx(0, abs=1)
    assert _check(store, cid)["design_strength"]["value"] == pytest.approx(axial_only, rel=1e-6)
    ch = lm.remove_reaction(store, cid, 0)
    assert ch.label == "reaction 1 removed"
    assert [x.side for x in lm.loads_view(store, cid).reactions] == ["-"]


def test_end_moments_in_reverse_curvature_take_cm_by_a_8_4(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    ch = lm.set_end_moments(store, cid, "strong", "80", "40", "reverse")
    assert ch.label == "strong axis end moments 80 kip*ft top, 40 kip*ft bottom, reverse curvature"
    res = _check(store, cid)
    cm = next(s for s in res["steps"] if s["symbol"] == "Cm_strong")["value"]
    assert cm == pytest.approx(0.6 - 0.4 * 40 / 80)          # (A-8-4)
    # B1 = Cm / (1 - Pr/Pe1) < 1 here, so B1 = 1 and Mr is M2 = 80 kip*ft
    assert res["beam_column"]["required_moment"]["strong"]["value"] == pytest.approx(
        80 * 12 * KIP * INCH, rel=1e-6)
    assert res["utilization"]["value"] == pytest.approx(_engine(store, cid)["utilization"]["value"])
    single = lm.set_end_moments(store, cid, "strong", "80", "40", "single")
    cm = next(s for s in _check(store, cid)["steps"] if s["symbol"] == "Cm_strong")["value"]
    assert cm == pytest.approx(0.6 + 0.4 * 40 / 80)           # (A-8-4), M1/M2 negative
    r.undo_change(store, single)
    assert store.get_column(cid).record["demand"]["end_moments"]["strong"]["curvature"] == \
        "reverse"
    lm.set_end_moments(store, cid, "strong", "", "")
    assert "end_moments" not in store.get_column(cid).record["demand"]


def test_the_story_is_kept_and_removed(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    ch = lm.set_story(store, cid, "3000", "", "200")
    assert ch.label == "story 3000 kip, stiffness 200 kip/in"
    assert store.get_column(cid).record["demand"]["story"] == {"load": "3000 kip",
                                                               "stiffness": "200 kip/in"}
    assert lm.loads_view(store, cid).story_words == \
        "Story: 3000 kip gravity load, lateral stiffness 200 kip/in"
    lm.set_story(store, cid, "", "", "")
    assert "story" not in store.get_column(cid).record["demand"]


@pytest.mark.parametrize("call, field, words", [
    (lambda s, c: lm.add_reaction(s, c, "40", "strong", "6 inn"), "reaction 1 eccentricity",
     "Reaction 1 eccentricity '6 inn' not understood: unknown length unit 'inn' (did you mean 'in'?). "
     "Type a length, "
     "e.g. 6 in or 150 mm."),
    (lambda s, c: lm.add_reaction(s, c, "", "strong", "6"), "reaction 1 load",
     "Reaction 1 load is needed. Type a force, e.g. 40 kip or 180 kN."),
    (lambda s, c: lm.add_reaction(s, c, "40 kpi", "weak", ""), "reaction 1 load",
     "Reaction 1 load '40 kpi' not understood"),
    (lambda s, c: lm.set_end_moments(s, c, "weak", "80 kip*fr", "", "single"),
     "weak axis moment at the top", "Weak axis moment at the top '80 kip*fr' not understood"),
    (lambda s, c: lm.set_story(s, c, "3000", "", ""), "story buckling load",
     "Story buckling load is needed"),
    (lambda s, c: lm.set_story(s, c, "3000", "30000", "200"), "story stiffness",
     "not both"),
])
def test_bad_load_entries_are_named_as_labelled_and_nothing_is_saved(demo, call, field, words):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    before = store.get_column(cid).record
    with pytest.raises(InputError) as e:
        call(store, cid)
    assert e.value.field == field
    assert words in plain_error(e.value)
    assert store.get_column(cid).record == before


def test_a_reaction_needs_the_axial_demand_first(tmp_path):
    from fieldcol.store import open_store

    store = open_store(tmp_path / "a.db")
    site = store.add_site("Pell Street Depot", code="aisc360-22", unit_system="us")
    col = store.add_column(site.id, {"tag": "P/1", "section": "W8X31", "material": "A992",
                                     "length": "12 ft"})
    with pytest.raises(InputError) as e:
        lm.add_reaction(store, col.id, "40", "strong", "6")
    assert plain_error(e.value) == ("Axial demand is needed. Type the axial force in the Edit "
                                    "card above first, then add the reaction.")
    assert store.get_column(col.id).record.get("demand") is None
    store.close()


def test_the_check_tab_adds_a_reaction_shows_the_equation_and_undoes_it(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id

    async def walk():
        s = await Screen.opened(store, cid)
        assert s.has("loads-card") and s.find("loads-part-reactions").selected
        assert not s.has("interaction")
        await s.type("reaction-load", "40", submit=False)
        assert "the face + about 4 in (100 mm) is taken" in \
            s.inner("reaction-eccentricity", ft.TextField).helper
        await s.type("reaction-eccentricity", "6 inn", submit=False)
        await s.tap("add-reaction")
        tf = s.inner("reaction-eccentricity", ft.TextField)
        assert tf.value == "6 inn"   # the text kept
        assert "Reaction 1 eccentricity '6 inn' not understood" in str(tf.error)
        assert "reactions" not in store.get_column(cid).record["demand"]
        await s.type("reaction-eccentricity", "6", submit=False)
        assert not s.inner("reaction-eccentricity", ft.TextField).error  # gone once changed
        await s.tap("add-reaction")
        assert s.text("save-note").startswith("Saved reaction 1: 40 kip, strong axis, 6 in")
        assert "checked again" in s.text("save-note")
        assert s.has("reaction-0") and s.inner("reaction-load", ft.TextField).value == ""
        assert "H1-1a" in s.text("interaction")
        assert "beam-column" in s.text("governing") or "bending" in s.text("governing")
        await s.tap("save-undo")
        assert not s.has("reaction-0") and not s.has("interaction")
        assert "reactions" not in store.get_column(cid).record["demand"]
        # end moments: another part of the same card
        await s.tap("loads-part-moments")
        await s.tap("curvature-reverse")
        await s.type("moment-top", "80", submit=False)
        await s.type("moment-bottom", "40", submit=False)
        await s.tap("save-moments")
        assert s.has("end-moments-strong")
        assert store.get_column(cid).record["demand"]["end_moments"] == {
            "strong": {"top": "80 kip*ft", "bottom": "40 kip*ft", "curvature": "reverse"}}
        await s.tap("remove-end-moments-strong")
        assert "end_moments" not in store.get_column(cid).record["demand"]
        # the story, refused then kept
        await s.tap("loads-part-story")
        await s.type("story-load", "3000", submit=False)
        await s.tap("save-story")
        assert "Story buckling load is needed" in str(
            s.inner("story-buckling", ft.TextField).error)
        await s.type("story-buckling", "30000")   # Enter saves, as the button does
        assert s.has("story") and "3000 kip" in s.text("story")
    _run(walk())


def test_an_en_column_takes_a_reaction_in_kn_and_mm_by_6_3_3(tmp_path):
    """EN 1993-1-1 6.3.3: the first-order moment of a beam at an eccentricity enters (6.61) and
    (6.62) as M_z,Ed (no amplifier of its own: the k factors of Annex B carry it)."""
    from fieldcol.store import open_store

    store = open_store(tmp_path / "en.db")
    site = store.add_site("Harrow Quay Grain Store", code="en1993-1-1", unit_system="si")
    col = store.add_column(site.id, {
        "tag": "K/1", "section": "HE 200 B", "material": "S355", "length": "4 m",
        "demand": {"axial": "900 kN"}})
    r.check_now(store, col.id)
    assert lm.loads_view(store, col.id).default_offset_words == "100 mm"
    axial = _check(store, col.id)["design_strength"]["value"]
    ch = lm.add_reaction(store, col.id, "100", "weak", "150")
    assert store.get_column(col.id).record["demand"]["reactions"] == [
        {"load": "100 kN", "axis": "weak", "eccentricity": "150 mm", "side": "+"}]
    assert ch.label.startswith("reaction 1: 100 kN, weak axis, 150 mm off the centre")
    res = _check(store, col.id)
    bc = res["beam_column"]
    # by hand: M_z,Ed = 100 kN x 0.150 m = 15 kN*m
    assert bc["required_moment"]["weak"]["value"] == pytest.approx(15e6, rel=1e-6)
    assert bc["equation"] in ("6.61", "6.62") and res["governing_mode"] == "beam-column"
    assert res["design_strength"]["value"] < axial
    assert res["utilization"]["value"] == pytest.approx(_engine(store, col.id)["utilization"]["value"])
    words = latest_summary(store, col.id).interaction
    assert words.startswith(f"EN 1993-1-1 ({bc['equation']}) governs")
    assert "weak axis 15 kN*m" in words
    view = lm.loads_view(store, col.id)
    assert (view.force_unit, view.moment_unit, view.length_unit) == ("kN", "kN*m", "mm")
    store.close()
