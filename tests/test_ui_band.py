"""Where the loss lies (a band of height with holes), how a hollow section was made, and the
bow the column curves allow for: saved into the record (README, record reference:
``section.loss`` ``from`` / ``to`` / ``holes``, ``finish``, ``condition.bow_allowance``),
checked again, undone; a bad entry refused in plain words under its entry, text kept.

Outside references, named at each check:
- AISC Steel Construction Manual Table 1-1 (from memory): W10X49 A = 14.4 in^2,
  bf = 10.0 in, tf = 0.560 in, tw = 0.340 in. ASTM A7 (historic, from memory): Fy = 33 ksi.
- AISC 360-22 E3 / J4.4 (from memory): a short length in compression yields at Fy on its
  net area, phi = 0.90.
- EN 1993-1-1 Table 6.2: hot-finished hollow sections curve a, cold-formed curve c; Table 6.1:
  alpha 0.21 and 0.49; 6.3.1.2 (6.49): chi = 1 / (Phi + sqrt(Phi^2 - lambda^2)),
  Phi = 0.5 (1 + alpha (lambda - 0.2) + lambda^2).
- AISC 303 6.4.1 / EN 1090-2 (common practice): a new column may be out of straight by L/1000.
In-process control trees on a real store (the fake session of tests/test_ui_session.py).
"""

from __future__ import annotations

import math

import flet as ft
import pytest

from fieldcol.assess import assess
from fieldcol.errors import InputError
from fieldcol.ui import band_model as bm
from fieldcol.ui import readings as r
from fieldcol.ui.saving import plain_error

from tests.test_ui_session import Screen, _run, demo  # noqa: F401  (the fixture)

KIP, INCH = 4448.2216152605, 25.4
LOSS = "A/2-G"   # the demo's W10X49 of A7, 16 ft; a flange reading of 0.48 in remaining
BOW = "B/2-G"    # the demo's W12X65 of A7, 16 ft; a bow of 1 1/8 in about the weak axis


def _check(store, cid):
    return store.latest_check(cid).result


def test_a_loss_band_with_a_hole_is_checked_on_its_net_area(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, LOSS).id
    full = _check(store, cid)["design_strength"]["value"]
    ch = bm.set_band(store, cid, "0", "6", {"web": "1", "flange": ""})
    assert ch.label == "loss band 0 to 6 in, hole across the web 1 in"
    assert store.get_column(cid).record["section"]["loss"] == {
        "from": "0", "to": "6 in", "holes": {"web": "1 in"}}
    res = _check(store, cid)
    band = res["section_band"]
    assert band["to"]["value"] == pytest.approx(6 * INCH)
    # by hand: A_net = 14.4 - 2 (0.560 - 0.48) 10.0 - 1 x 0.340 = 12.46 in^2;
    # phi Fy A_net = 0.9 x 33 x 12.46 = 370.1 kip (the catalogue's area from its dimensions
    # differs from Table 1-1's by under 1 %)
    assert band["section_strength"]["value"] == pytest.approx(0.9 * 33 * 12.46 * KIP, rel=0.01)
    # the loss now lies in 6 in only: the member buckles as if it were (nearly) whole
    assert res["design_strength"]["value"] >= full
    assert res["utilization"]["value"] == pytest.approx(
        assess(store.current_record(cid)).to_dict()["utilization"]["value"])
    view = bm.band_view(store, cid)
    assert (view.start, view.end, view.holes) == ("0", "6 in", {"web": "1 in"})
    r.undo_change(store, ch)
    assert store.get_column(cid).record["section"] == {"name": "W10X49"}
    assert _check(store, cid)["design_strength"]["value"] == pytest.approx(full)
    bm.set_band(store, cid, "0", "6")
    bm.set_band(store, cid, None)
    assert "loss" not in store.get_column(cid).record["section"]


@pytest.mark.parametrize("args, field, words", [
    (("0", "6 fr", {}), "loss band to", "Loss band to '6 fr' not understood: unknown length "
     "unit 'fr' (did you mean 'ft'?). Type a length, e.g. 6 in or 150 mm."),
    (("", "6", {}), "loss band from", "Loss band from is needed"),
    (("0", "300 ft", {}), "loss band to", "the band must lie within the column"),
    (("0", "6", {"web": "12"}), "hole across the web", "the hole is as wide as the plate"),
    (("0", "6", {"wall": "1"}), "hole", "not a plate of this section"),
])
def test_bad_band_entries_are_named_as_labelled_and_nothing_is_saved(demo, args, field, words):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, LOSS).id
    before = store.get_column(cid).record
    with pytest.raises(InputError) as e:
        bm.set_band(store, cid, *args)
    assert e.value.field == field
    assert words in plain_error(e.value)
    assert store.get_column(cid).record == before


def _chi(lam: float, alpha: float) -> float:
    phi = 0.5 * (1 + alpha * (lam - 0.2) + lam ** 2)       # EN 1993-1-1 6.3.1.2
    return 1 / (phi + math.sqrt(phi ** 2 - lam ** 2))       # (6.49)


def test_a_hot_finished_tube_takes_curve_a(tmp_path):
    from fieldcol.store import open_store

    store = open_store(tmp_path / "en.db")
    site = store.add_site("Harrow Quay Grain Store", code="en1993-1-1", unit_system="si")
    col = store.add_column(site.id, {
        "tag": "T/1", "section": {"shape": "rect", "d": "200 mm", "b": "200 mm", "t": "10 mm"},
        "material": "S355", "length": "4 m", "demand": {"axial": "1000 kN"}})
    r.check_now(store, col.id)
    view = bm.band_view(store, col.id)
    assert view.finish_offered and view.finish == "cold-formed"
    cold = _check(store, col.id)
    ch = bm.set_finish(store, col.id, "hot-finished")
    assert ch.label == "finish hot-finished"
    hot = _check(store, col.id)
    steps = {s["symbol"]: s["value"] for s in hot["steps"]}
    assert steps["curve,y"] == "a" and steps["alpha,strong"] == 0.21    # Tables 6.2, 6.1
    lam = steps["lb,strong"]  # lambda-bar = sqrt(A fy / Ncr), the same for either finish
    assert lam == pytest.approx(math.sqrt(steps["A"] * 355 / steps["Ncr,strong"]))
    assert hot["design_strength"]["value"] / cold["design_strength"]["value"] == \
        pytest.approx(_chi(lam, 0.21) / _chi(lam, 0.49), rel=1e-3)
    r.undo_change(store, ch)
    assert "finish" not in store.get_column(col.id).record["section"]
    store.close()


def test_the_bow_allowance_sets_how_much_of_the_bow_is_checked(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, BOW).id
    usual = _check(store, cid)
    # by hand: 1 1/8 in = 28.575 mm; L/1000 of 16 ft = 4.877 mm; L/1500 = 3.251 mm
    assert usual["bow"]["allowance"] == "L/1000"
    assert usual["bow"]["excess"]["value"] == pytest.approx(28.575 - 16 * 12 * INCH / 1000)
    ch = bm.set_bow_allowance(store, cid, "L/1500")
    strict = _check(store, cid)
    assert strict["bow"]["allowance"] == "L/1500"
    assert strict["bow"]["excess"]["value"] == pytest.approx(28.575 - 16 * 12 * INCH / 1500)
    assert strict["design_strength"]["value"] < usual["design_strength"]["value"]
    assert bm.band_view(store, cid).allowance == "L/1500"
    r.undo_change(store, ch)
    assert "bow_allowance" not in (store.get_column(cid).record.get("condition") or {})
    with pytest.raises(InputError) as e:
        bm.set_bow_allowance(store, cid, "L/500")
    assert "Bow allowance 'L/500' not understood" in plain_error(e.value)


def test_the_section_tab_saves_a_band_refuses_a_bad_height_and_undoes(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, LOSS).id

    async def walk():
        s = await Screen.opened(store, cid)
        await s.tap("tab-section")
        assert s.find("loss-where-full").selected and not s.has("band-from")
        await s.tap("loss-where-band")
        await s.type("band-from", "0", submit=False)
        await s.type("band-to", "6 fr", submit=False)
        await s.type("hole-web", "1", submit=False)
        await s.tap("save-band")
        tf = s.inner("band-to", ft.TextField)
        assert tf.value == "6 fr" and "Loss band to '6 fr' not understood" in str(tf.error)
        assert "loss" not in store.get_column(cid).record["section"]
        await s.type("band-to", "6", submit=False)
        await s.tap("save-band")
        assert s.text("save-note").startswith("Saved loss band 0 to 6 in, hole across the web")
        assert store.get_column(cid).record["section"]["loss"]["to"] == "6 in"
        assert s.find("loss-where-band").selected
        assert 'from the bottom to 6" above it' in s.text("section-card")
        await s.tap("save-undo")
        assert "loss" not in store.get_column(cid).record["section"]
        assert s.find("loss-where-full").selected
        assert not s.has("finish-card")   # a rolled I section has no finish to choose
    _run(walk())


def test_the_condition_tab_chooses_the_bow_allowance_and_undoes(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, BOW).id

    async def walk():
        s = await Screen.opened(store, cid)
        await s.tap("tab-condition")
        assert s.find("bow-allowance-1000").selected
        assert "straightness a new column may have" in s.text("bow-allowance-card")
        await s.tap("bow-allowance-1500")
        assert s.text("save-note").startswith("Saved bow allowance L/1500; checked again")
        assert s.find("bow-allowance-1500").selected
        assert "more of the measured bow counts" in s.text("bow-allowance-card")
        assert store.get_column(cid).record["condition"]["bow_allowance"] == "L/1500"
        await s.tap("save-undo")
        assert s.find("bow-allowance-1000").selected
    _run(walk())


def test_the_section_tab_offers_the_finish_of_a_measured_en_tube(tmp_path):
    from fieldcol.store import open_store

    async def walk():
        store = open_store(tmp_path / "en.db")
        site = store.add_site("Harrow Quay Grain Store", code="en1993-1-1", unit_system="si")
        col = store.add_column(site.id, {
            "tag": "T/2", "section": {"shape": "round", "D": "168.3 mm", "t": "8 mm"},
            "material": "S355", "length": "3.5 m", "demand": {"axial": "800 kN"}})
        s = await Screen.opened(store, col.id)
        await s.tap("tab-section")
        assert s.find("finish-cold-formed").selected and "curve c" in s.text("finish-card")
        await s.tap("finish-hot-finished")
        assert s.text("save-note").startswith("Saved finish hot-finished; checked again")
        assert store.get_column(col.id).record["section"]["finish"] == "hot-finished"
        assert s.find("finish-hot-finished").selected and "curve a" in s.text("finish-card")
        await s.tap("save-undo")
        assert "finish" not in store.get_column(col.id).record["section"]
        store.close()
    _run(walk())


def test_a_band_reads_from_the_bottom_or_between_two_heights():
    from fieldcol.ui.model import _band_text

    assert _band_text({"from": "0", "to": "6 in"}, "us") == 'from the bottom to 6" above it'
    assert _band_text({"from": "0 mm", "to": "150 mm"}, "si") == "from the bottom to 150 mm above it"
    assert _band_text({"from": "1 ft", "to": "2 ft"}, "us") == "1'-0\" to 2'-0\" above the bottom"
