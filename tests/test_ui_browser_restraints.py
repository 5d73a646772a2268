"""The Restraints and Check tabs in a real browser (Debian chromium driven by Playwright, every
request that leaves the machine refused): add a brace at mid-height and see the governing mode
change, then read the check's capacity per axis, its column curve and its trace.

The engineering behind what is asserted: a rigid brace at mid-height of a pinned column halves
its weak-axis buckling length (Timoshenko & Gere, Theory of Elastic Stability), so weak-axis
buckling stops governing the demo's A/1-G (W10X49, 16 ft, pinned). Screenshots go to
$FIELDCOL_SHOTS (``restraint-brace.png``, ``check.png``; ``-tablet`` at 820 px).
"""

from __future__ import annotations

from test_ui_browser import (PHONE, TABLET, _open, _poll, _sel, _shot, _wait, browser,  # noqa: F401
                             server)


def _find(page, identifier: str, *, down: bool = True):
    """The element with this identifier, scrolled onto the screen (a long list builds only
    what is near the screen, and a tap must land on the screen)."""
    loc = page.locator(_sel(identifier)).first
    height = page.viewport_size["height"]
    page.mouse.move(page.viewport_size["width"] / 2, height / 2)
    for _ in range(40):
        if loc.count():
            box = loc.bounding_box()
            if box and 60 <= box["y"] and box["y"] + min(box["height"], height - 80) <= height:
                return loc
            if box:
                down = box["y"] > 60
        page.mouse.wheel(0, 250 if down else -250)
        page.wait_for_timeout(200)
    return _wait(page, identifier)


def _column(page, tag: str) -> None:
    _wait(page, "site-Kestrel Lane Print Works").click()
    _wait(page, f"column-{tag}").click()
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
    _find(page, "trace").click()
    _shot(page, f"check-trace{suffix}.png")

    # Restraints: add a brace at mid-height in two taps and see what governs change
    _find(page, "tab-restraints", down=False).click()
    told = _wait(page, "restraint-governs")
    _poll(lambda: told.inner_text(), lambda t: "weak axis governs" in t, "weak axis governs")
    _find(page, "add-brace").click()
    _wait(page, "brace-at")   # filled with mid-height (tests/test_ui_restraints_model.py)
    # the sketch follows the brace being typed, before it is saved
    _poll(lambda: _find(page, "restraint-governs", down=False).inner_text(),
          lambda t: "weak axis" not in t, "sketch follows the form")
    _shot(page, f"restraint-form{suffix}.png")
    _find(page, "save-brace").click()
    _wait(page, "save-undo")   # saved, with Undo offered
    _find(page, "brace-0")
    _poll(lambda: _find(page, "restraint-governs", down=False).inner_text(),
          lambda t: "governs" in t and "weak axis" not in t, "governing mode changed")
    _find(page, "restraint-sketch", down=False)
    page.mouse.wheel(0, -2000)   # the side view and what governs at the top of the shot
    _shot(page, f"restraint-brace{suffix}.png")
    assert not page.refused or all("rive" in u for u in page.refused), page.refused

    # the history holds the dated restraint change
    _find(page, "tab-history", down=False).click()
    _poll(lambda: page.locator("body").inner_text(), lambda t: "brace at 8 ft" in t.lower()
          or "strut at 8 ft" in t.lower(), "restraint change in the history")
    # undo puts it back
    _find(page, "tab-restraints", down=False).click()
    _wait(page, "save-undo").click()
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
