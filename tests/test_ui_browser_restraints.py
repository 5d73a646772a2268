"""The Restraints and Check tabs in a real browser (Debian chromium driven by Playwright, every
request that leaves the machine refused): add a brace at mid-height and see the governing mode
change, then read the check's capacity per axis, its column curve and its trace.

The engineering behind what is asserted: a rigid brace at mid-height of a pinned column halves
its weak-axis buckling length (Timoshenko & Gere, Theory of Elastic Stability), so weak-axis
buckling stops governing the demo's A/1-G (W10X49, 16 ft, pinned). Screenshots go to
$FIELDCOL_SHOTS (``restraint-brace.png``, ``check.png``; ``-tablet`` at 820 px;
``restraint-end.png``, ``restraint-cable-refused.png``, ``restraint-cable.png``).
"""

from __future__ import annotations

import time

from _browser import (  # noqa: F401  (browser, served, server are fixtures)
    PHONE, TABLET, _click, _find, _open, _open_column, _poll, _sel, _shot, _type_into,
    _wait, _words, browser, served, server)


def _column(page, tag: str) -> None:
    _click(page, "site-Kestrel Lane Print Works")
    _open_column(page, f"column-{tag}")
    _wait(page, "status")


def _walk(page, suffix: str, tag: str) -> None:
    _column(page, tag)
    # the Check tab first: capacity per axis right under the status, the curve, the trace
    for mode in ("flexural-strong", "flexural-weak", "torsional", "yield"):
        _wait(page, f"capacity-{mode}")
    gov = _wait(page, "governing")
    before = _poll(lambda: gov.inner_text(), lambda t: "governs" in t, "what governs")
    assert "weak axis" in before, before
    status_box = page.locator(_sel("status")).first.bounding_box()
    cap_box = page.locator(_sel("capacity-flexural-weak")).first.bounding_box()
    # right under the status: within the first screen of a phone
    assert cap_box["y"] - status_box["y"] < PHONE["height"] * 0.6, (status_box, cap_box)
    _shot(page, f"check{suffix}.png")
    _find(page, "column-curve")
    _shot(page, f"check-curve{suffix}.png")
    # the full trace one tap away (its symbols are checked in tests/test_ui_restraints_model.py)
    # its steps are made when it opens: a tap shows them (their words are aria labels)
    _click(page, "trace", done=lambda: " = " in _words(page, "trace"))
    time.sleep(1)
    _shot(page, f"check-trace{suffix}.png")

    # Restraints: add a brace at mid-height in two taps and see what governs change
    _click(page, "tab-restraints", up=True)
    told = _wait(page, "restraint-governs")
    _poll(lambda: told.inner_text(), lambda t: "weak axis governs" in t, "weak axis governs")
    _click(page, "add-brace")
    _wait(page, "brace-at")   # filled with mid-height (tests/test_ui_restraints_model.py)
    # the sketch follows the brace being typed, before it is saved
    _poll(lambda: _find(page, "restraint-governs", up=True).inner_text(),
          lambda t: "weak axis" not in t, "sketch follows the form")
    _shot(page, f"restraint-form{suffix}.png")
    _click(page, "save-brace")
    _wait(page, "save-undo")   # saved, with Undo offered
    _find(page, "brace-0")
    _poll(lambda: _find(page, "restraint-governs", up=True).inner_text(),
          lambda t: "governs" in t and "weak axis" not in t, "governing mode changed")
    _find(page, "restraint-sketch", up=True)
    page.mouse.wheel(0, -2000)   # the side view and what governs at the top of the shot
    _shot(page, f"restraint-brace{suffix}.png")
    assert not page.refused or all("rive" in u for u in page.refused), page.refused

    # the history holds the dated restraint change
    _click(page, "tab-history", up=True)
    _poll(lambda: page.locator("body").inner_text(), lambda t: "brace at 8 ft" in t.lower()
          or "strut at 8 ft" in t.lower(), "restraint change in the history")
    # undo puts it back
    _click(page, "tab-restraints", up=True)
    _click(page, "save-undo")
    _poll(lambda: page.locator(_sel("restraint-governs")).first.inner_text(),
          lambda t: "weak axis governs" in t, "undone")


def test_phone_brace_and_check(server, browser):
    page = _open(browser, server, PHONE)
    _walk(page, "", "A/1-G")
    page.context.close()


def test_tablet_brace_and_check(server, browser):
    page = _open(browser, server, TABLET)
    _walk(page, "-tablet", "A/3-G")
    page.context.close()


def test_phone_end_per_axis_and_a_dated_cable(server, browser):
    """An end chosen about one axis: the box shows the kind, its meaning in full below (it was
    cut off mid-word at 390 px), and the bar the check saved with it. A cable without its
    length: the bar names the entry as labelled ("Length" alone reads as the column's), what
    was typed stays, and once given the cable is kept with the date it was added."""
    page = _open(browser, server, PHONE)
    _column(page, "A/4-G")
    _click(page, "tab-restraints", up=True)
    _click(page, "end-weak-top", done=lambda: page.get_by_text(
        "fixed: rotation and position held").count() > 0)
    page.get_by_text("fixed: rotation and position held").first.click()
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved top end, weak axis: fixed; checked again: " in t and " OK" in t,
          "the end saved and checked again")
    # the box holds the kind alone (nothing left to cut off), its meaning whole below it
    _poll(lambda: _words(page, "end-weak-top-means"), lambda t: t == "rotation and position held",
          "the meaning under the box")
    assert _words(page, "end-weak-bottom-means") == "held in place, free to rotate"
    _find(page, "end-weak-top")
    _shot(page, "restraint-end.png")

    _click(page, "add-brace")
    _click(page, "brace-kind-cable", done=lambda: page.locator(_sel("brace-area")).count() > 0)
    _type_into(page, "brace-area", "0.2 in2", enter=False)
    _type_into(page, "brace-added", "2024-06-01", enter=False)
    _click(page, "save-brace", done=lambda: "Not saved" in _words(page, "save-note"))
    said = _words(page, "save-note")
    assert "check Cable or rod length" in said, said
    _find(page, "brace-length")
    _shot(page, "restraint-cable-refused.png")
    _type_into(page, "brace-length", "12 ft", enter=False)
    _type_into(page, "brace-angle", "40 deg", enter=False)
    _click(page, "save-brace", done=lambda: page.locator(_sel("brace-0")).count() > 0)
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved a brace at 8 ft; checked again: " in t, "the cable saved")
    # the area and the date typed before the refusal were kept: not typed again, yet saved
    _find(page, "brace-0", up=True)
    words = _words(page, "brace-0")
    assert "cable, 0.2 in2" in words and "added 2024-06-01" in words, words
    _shot(page, "restraint-cable.png")
    page.context.close()
