"""The Check tab's loads card in a real browser: `fieldcol app --demo` on loopback, Debian
chromium driven by Playwright, every request that leaves the machine refused.

A beam reaction added on a phone (390 px): a bad eccentricity refused under its entry with the
text kept, then saved; the check becomes a beam-column one and says which interaction equation
governs; Undo takes it back. The same on a tablet (820 px). On a phone, a loss band with a
hole (Section tab) and the bow allowance (Condition tab). Screenshots `loads.png`,
`loads-tablet.png`, `loads-band.png`, `loads-allowance.png` go to $FIELDCOL_SHOTS.

Outside references: AISC 360-22 H1.1 (H1-1a applies when Pr/Pc >= 0.2); the touch-target
minimum of 48 px is common practice (Material design guidance).
"""

from __future__ import annotations

import time

from _browser import (  # noqa: F401  (server and browser are fixtures)
    PHONE, STATUS, TABLET, _big_enough, _choose, _click, _find, _offline, _open, _open_column,
    _poll, _sel, _shot, _tab, _type_into, _wait, _words, browser, served, server,
)


def _roomy(page, *identifiers: str) -> None:
    """Touch targets of at least 48 px (common practice), each measured clear of the save bar:
    a save note of three lines makes the bar taller than ``_find`` allows for, so a control
    found right above it may be cut by the list's lower edge and read short."""
    for ident in identifiers:
        box = _find(page, ident).bounding_box()
        if box and box["y"] > page.viewport_size["height"] * 0.5:
            page.mouse.move(page.viewport_size["width"] / 2, page.viewport_size["height"] * 0.5)
            page.mouse.wheel(0, 200)
            time.sleep(0.5)
            box = page.locator(_sel(ident)).first.bounding_box()
        assert box and box["height"] >= 48 and box["width"] >= 48, (ident, box)


def _column(page, tag: str) -> None:
    _click(page, "site-Kestrel Lane Print Works")
    _wait(page, "column-A/1-G")
    _open_column(page, f"column-{tag}")
    _wait(page, "status")


def _status(page) -> str:
    return STATUS.search(_words(page, "status")).group(0)


def _add_reaction(page, shot: str) -> None:
    before = _poll(lambda: _status(page), lambda s: s.endswith("OK"), "status before")
    _big_enough(page, "loads-part-reactions", "reaction-axis-strong", "reaction-side-plus",
                "add-reaction")
    _type_into(page, "reaction-load", "40", enter=False)
    _type_into(page, "reaction-eccentricity", "6 inn", enter=False)
    _click(page, "add-reaction")
    _poll(lambda: page.locator(f"{_sel('reaction-eccentricity')} input").first
          .get_attribute("aria-description") or "",
          lambda d: "Reaction 1 eccentricity '6 inn' not understood" in d,
          "the error under the entry")
    assert page.locator(f"{_sel('reaction-eccentricity')} input").first.input_value() == "6 inn"
    _type_into(page, "reaction-eccentricity", "6", enter=False)
    _click(page, "add-reaction")
    note = _poll(lambda: _words(page, "save-note"),
                 lambda t: "Saved reaction 1: 40 kip, strong axis, 6 in off the centre" in t
                 and "checked again" in t, "the save note")
    after = STATUS.search(note.split("checked again")[1]).group(0)
    assert after != before   # the bending raised the utilization
    _find(page, "reaction-0")
    _roomy(page, "remove-reaction-0")
    _find(page, "reaction-0")
    _shot(page, shot)
    # the result says which interaction equation governs
    _find(page, "interaction", up=True)
    _poll(lambda: _words(page, "interaction"), lambda t: "(H1-1a) governs" in t,
          "the interaction equation under the result")
    _shot(page, shot.replace(".png", "-result.png"))
    _click(page, "save-undo")
    _poll(lambda: _words(page, "save-note"), lambda t: "Undone: reaction 1" in t, "undone")
    _find(page, "status", up=True)
    _poll(lambda: _status(page), lambda s: s == before, "the check as it was")


def test_phone_adds_a_beam_reaction(server, browser):
    page = _open(browser, server, PHONE)
    _column(page, "A/1-G")
    _add_reaction(page, "loads.png")
    # the other parts of the card, one at a time
    _choose(page, "loads-part-moments")
    _roomy(page, "moment-axis-strong", "curvature-single", "curvature-reverse", "save-moments")
    _find(page, "moment-top")
    _shot(page, "loads-moments.png")
    _choose(page, "loads-part-story")
    _find(page, "save-story")
    _shot(page, "loads-story.png")
    _offline(page)
    page.context.close()


def test_tablet_adds_a_beam_reaction(server, browser):
    page = _open(browser, server, TABLET)
    _column(page, "A/3-G")
    _add_reaction(page, "loads-tablet.png")
    _offline(page)
    page.context.close()


def test_phone_loss_band_and_bow_allowance(server, browser):
    page = _open(browser, server, PHONE)
    _column(page, "A/2-G")   # W10X49 with a flange reading of 0.48 in remaining
    _tab(page, "section")
    _choose(page, "loss-where-band")
    _type_into(page, "band-from", "0", enter=False)
    _type_into(page, "band-to", "6", enter=False)
    _type_into(page, "hole-web", "1", enter=False)
    _big_enough(page, "loss-where-full", "loss-where-band", "save-band")
    _click(page, "save-band")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved loss band 0 to 6 in, hole across the web 1 in; checked again" in t,
          "the band saved")
    _find(page, "band-card")
    _shot(page, "loads-band.png")
    _tab(page, "condition")
    _roomy(page, "bow-allowance-1000", "bow-allowance-1500")
    _choose(page, "bow-allowance-1500")
    _poll(lambda: _words(page, "save-note"), lambda t: "Saved bow allowance L/1500" in t,
          "the allowance saved")
    _find(page, "bow-allowance-card")
    _shot(page, "loads-allowance.png")
    _offline(page)
    page.context.close()
