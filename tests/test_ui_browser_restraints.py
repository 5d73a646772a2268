"""The Restraints and Check tabs in a real browser (Debian chromium driven by Playwright, every
request that leaves the machine refused): add a brace at mid-height and see the governing mode
change, then read the check's capacity per axis, its column curve and its trace.

The engineering behind what is asserted: a rigid brace at mid-height of a pinned column halves
its weak-axis buckling length (Timoshenko & Gere, Theory of Elastic Stability), so weak-axis
buckling stops governing the demo's A/1-G (W10X49, 16 ft, pinned). Screenshots go to
$FIELDCOL_SHOTS (``restraint-brace.png``, ``check.png``; ``-tablet`` at 820 px).
"""

from __future__ import annotations

import time

from _browser import (PHONE, TABLET, _click, _find, _open, _open_column, _poll, _sel, _shot,  # noqa: F401
                      _wait, _words,
                      browser, served, server)


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
