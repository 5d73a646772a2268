"""The Section tab's built-up card in a real browser (Debian chromium via Playwright, the app on
loopback with the demo): two channels with battens typed at 390 px, the sketch and the
properties shown, saved and checked again, then undone. Screenshot `section-built-up.png`.

The properties shown are the engine's, checked against sectionproperties in
tests/test_sections_builtup.py.
"""

from __future__ import annotations

from test_ui_browser import (  # noqa: F401  (server and browser are fixtures)
    PHONE, _open, _poll, _sel, _shot, _tab, _type_into, _words, browser, server,
)
from test_ui_browser_section import _big_enough, _column, _find, _offline


def test_phone_two_channels_battened_typed_shown_and_saved(server, browser):
    page = _open(browser, server, PHONE)
    _column(page, "C/3-G")
    _tab(page, "section")
    _find(page, "built-channels")
    for key, text in (("channel", "C12X20.7"), ("gap", "6"), ("battens.spacing", "24"),
                      ("battens.depth", "8"), ("battens.thickness", "3/8")):
        _find(page, f"built-{key}")
        _type_into(page, f"built-{key}", text, enter=False)
    _find(page, "built-show").click()
    _find(page, "built-preview")
    _poll(lambda: _words(page, "built-preview"),
          lambda t: "Area" in t and "Chords apart (weak axis)" in t,
          "the properties of what was typed")
    assert page.locator(_sel("built-sketch")).count() == 1
    _big_enough(page, "built-show", "save-built")
    _shot(page, "section-built-up.png")
    _find(page, "save-built").click()
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved built-up section; checked again:" in t, "the save note")
    _find(page, "section-now")
    _poll(lambda: _words(page, "section-now"), lambda t: "Built up: two channels" in t,
          "the section now")
    page.locator(_sel("save-undo")).first.click()
    _find(page, "section-now")
    _poll(lambda: _words(page, "section-now"), lambda t: "Built up" not in t, "undone")
    _offline(page)
    page.context.close()
