"""The Section tab's built-up card in a real browser (Debian chromium via Playwright, the app on
loopback with the demo): two channels with battens typed at 390 px, the sketch and the
properties shown, saved and checked again, then undone. Screenshot `section-built-up.png`. Cover plates riveted at a pitch on a rolled
shape (a missing pitch refused at its field first); screenshot `section-plates-riveted.png`.

The properties shown are the engine's, checked against sectionproperties in
tests/test_sections_builtup.py.
"""

from __future__ import annotations

from _browser import (  # noqa: F401  (server and browser are fixtures)
    PHONE, _big_enough, _click, _find, _offline, _open, _poll, _sel, _shot, _tab, _type_into,
    _words, browser, served, server,
)
from test_ui_browser_section import _column


def test_phone_two_channels_battened_typed_shown_and_saved(server, browser):
    page = _open(browser, server, PHONE)
    _column(page, "C/3-G")
    _tab(page, "section")
    _find(page, "built-channels")
    for key, text in (("channel", "C12X20.7"), ("gap", "6"), ("battens.spacing", "24"),
                      ("battens.depth", "8"), ("battens.thickness", "3/8"),
                      ("battens.fasteners.count", "2"), ("battens.fasteners.diameter", "7/8")):
        _find(page, f"built-{key}")
        _type_into(page, f"built-{key}", text, enter=False)
    _big_enough(page, "built-battens.fasteners.count", "built-holes.per_flange")
    _shot(page, "section-built-up-rivets.png")
    _click(page, "built-show")
    _find(page, "built-preview")
    _poll(lambda: _words(page, "built-preview"),
          lambda t: "Area" in t and "Chords apart (weak axis)" in t,
          "the properties of what was typed")
    assert page.locator(_sel("built-sketch")).count() == 1
    _big_enough(page, "built-show", "save-built")
    _shot(page, "section-built-up.png")
    _click(page, "save-built")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved built-up section; checked again:" in t, "the save note")
    _find(page, "section-now")
    _poll(lambda: _words(page, "section-now"), lambda t: "Built up: two channels" in t,
          "the section now")
    _tab(page, "check")   # the battens' end rivets are checked with the rest
    _find(page, "capacity-tie-joint")
    _tab(page, "section")
    _click(page, "save-undo")
    _find(page, "section-now")
    _poll(lambda: _words(page, "section-now"), lambda t: "Built up" not in t, "undone")
    _offline(page)
    page.context.close()


def test_phone_cover_plates_riveted_with_their_pitch(server, browser):
    # the record keys are the README's (section.plates.connection, pitch); a missing pitch is
    # named at its field in plain words and nothing is saved
    page = _open(browser, server, PHONE)
    _column(page, "D/2-G")
    _tab(page, "section")
    _find(page, "plate-connection-riveted")
    _click(page, "plate-connection-riveted", done=lambda: page.locator(
        _sel("plate-pitch")).count() == 1)
    _find(page, "plate-thickness")
    _type_into(page, "plate-thickness", "3/8", enter=False)
    _find(page, "save-plates")
    _click(page, "save-plates")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Not saved: check Rivet pitch" in t, "the missing pitch")
    _poll(lambda: page.locator(f"{_sel('plate-pitch')} input").first.get_attribute(
        "aria-description") or "", lambda d: d.startswith("Rivet pitch is needed"),
        "the error at the pitch")
    _find(page, "plate-pitch")
    _type_into(page, "plate-pitch", "6", enter=False)
    _big_enough(page, "plate-connection-riveted", "plate-pitch", "save-plates")
    _shot(page, "section-plates-riveted.png")
    _click(page, "save-plates")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved cover plates 3/8 in, riveted at 6 in; checked again:" in t,
          "the save note")
    _offline(page)
    page.context.close()
