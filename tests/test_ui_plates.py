"""Cover plates in the Section tab: how they are held (welded, riveted, bolted) and the
fasteners' pitch go into the record's ``section.plates``; a bad entry is named in plain words
at its own field and nothing is saved.

Outside reference: AISC 360-22 E6.1 (from memory): rivets and bolts are taken as snug-tight,
(Lc/r)m = sqrt((Lc/r)o^2 + (a/ri)^2) >= (Lc/r)o, so plates riveted at a pitch are never
stronger than the same plates welded, and a wider pitch never raises the strength. The record
keys are the README's record reference. In-process control trees on a real store (the fake
session of tests/test_ui_session.py).
"""

from __future__ import annotations

import flet as ft
import pytest

from fieldcol.errors import InputError
from fieldcol.ui import readings as r
from fieldcol.ui import section as sx
from fieldcol.ui.saving import plain_error

from tests.test_ui_session import Screen, _run, demo  # noqa: F401  (the fixture)

TAG = "D/2-G"   # the demo's HP10X42, A36, 20 ft, a flange reading of 0.33 in remaining


def _design(store, cid):
    return store.latest_check(cid).result["design_strength"]["value"]


def test_riveted_plates_keep_their_pitch_and_are_never_stronger_than_welded(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    sx.set_plates(store, cid, "3/8", "", "welded")
    welded = _design(store, cid)
    assert store.get_column(cid).record["section"]["plates"] == {"thickness": "3/8 in"}
    ch = sx.set_plates(store, cid, "3/8", "", "riveted", "6")
    assert ch.label == "cover plates 3/8 in, riveted at 6 in"
    assert store.get_column(cid).record["section"]["plates"] == {
        "thickness": "3/8 in", "connection": "riveted", "pitch": "6 in"}
    view = sx.section_view(store, cid)
    assert view.plates == ("3/8 in", "") and view.plate_joint == ("riveted", "6 in")
    assert view.condition[-1].value.endswith("riveted at 6 in pitch")
    riveted6 = _design(store, cid)
    sx.set_plates(store, cid, "3/8", "", "bolted", "12")
    bolted12 = _design(store, cid)
    # AISC 360-22 E6.1 (from memory): snug-tight fasteners never help; more pitch never helps
    assert bolted12 <= riveted6 <= welded
    sx.set_plates(store, cid, None)
    assert "plates" not in store.get_column(cid).record["section"]


def test_undo_puts_welded_plates_back(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    sx.set_plates(store, cid, "3/8", "12")
    ch = sx.set_plates(store, cid, "1/2", "12", "riveted", "5")
    r.undo_change(store, ch)
    assert store.get_column(cid).record["section"]["plates"] == {"thickness": "3/8 in",
                                                                 "width": "12 in"}
    assert sx.section_view(store, cid).plate_joint == ("welded", "")


@pytest.mark.parametrize("args, field, words", [
    (("riveted", ""), "rivet pitch", "Rivet pitch is needed. Type the spacing of the rivets"),
    (("bolted", None), "bolt pitch", "Bolt pitch is needed. Type the spacing of the bolts"),
    (("riveted", "0"), "rivet pitch", "cannot be zero"),
    (("riveted", "-6"), "rivet pitch", "Rivet pitch '-6'"),
    (("bolted", "6 fr"), "bolt pitch", "unknown length unit"),
    (("welded", "6"), "plate pitch", "welded plates have no fastener pitch"),
    (("glued", "6"), "plate connection", "Pick welded, riveted or bolted"),
])
def test_bad_plate_entries_are_named_and_nothing_is_saved(demo, args, field, words):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id
    sx.set_plates(store, cid, "3/8", "")
    before = store.get_column(cid).record
    with pytest.raises(InputError) as e:
        sx.set_plates(store, cid, "1/2", "", *args)
    assert e.value.field == field
    assert words in plain_error(e.value)
    assert store.get_column(cid).record == before


def test_the_tab_offers_how_the_plates_are_held_and_names_a_missing_pitch(demo):  # noqa: F811
    store, site = demo
    cid = store.find_column(site.id, TAG).id

    async def walk():
        s = await Screen.opened(store, cid)
        await s.tap("tab-section")
        assert s.has("plate-connection-welded") and not s.has("plate-pitch")
        await s.type("plate-thickness", "3/8", submit=False)
        await s.tap("plate-connection-riveted")
        assert s.has("plate-pitch")
        await s.tap("save-plates")
        err = s.inner("plate-pitch", ft.TextField).error
        assert err and "Rivet pitch is needed" in str(err)  # named as it is labelled
        assert "plates" not in store.get_column(cid).record["section"]
        await s.type("plate-pitch", "6", submit=False)
        await s.tap("save-plates")
        assert s.text("save-note").startswith("Saved cover plates")
        assert store.get_column(cid).record["section"]["plates"] == {
            "thickness": "3/8 in", "connection": "riveted", "pitch": "6 in"}
        # back to welded: the pitch typed before is not the record's
        await s.tap("plate-connection-welded")
        assert not s.has("plate-pitch")
        await s.tap("save-plates")
        assert store.get_column(cid).record["section"]["plates"] == {"thickness": "3/8 in"}
    _run(walk())
