"""The field app in a real browser: `fieldcol app --demo` served on loopback, Debian chromium
driven by Playwright, every request that leaves the machine refused (the app must work offline).

Selectors are the app's Semantics identifiers (`site-...`, `column-<tag>`, `status`, `caution`,
`field-length`, `save-note`). The shared helpers (server, browser, waits, taps, screenshots to
$FIELDCOL_SHOTS) are in `tests/_browser.py`.
"""

from __future__ import annotations

import re
import time
from urllib.parse import urlparse

from _browser import (  # noqa: F401  (server and browser are fixtures)
    PHONE, STATUS, TABLET, _box, _click, _drawn, _entry, _find, _open, _open_column, _poll,
    _scroll_to,
    _sel, _shot, _tab, _to_top, _type_into, _wait, _words, browser, served, server,
)
from fieldcol import CAUTION


def _title_fits(page, lines: int) -> None:
    """The site's name in the app bar lies between Back and the two buttons, on ``lines``
    lines of its 20 px letters: at 390 px "Kestrel Lane Print Works" wraps onto a second line
    instead of being cut short (seen cut: "Kestrel Lane Print Wor...")."""
    assert "Kestrel Lane Print Works" in _words(page, "site-title")
    title = _poll(lambda: _box(page, "site-title"), bool, "the title measured")
    back, report = _box(page, "back"), _box(page, "site-report")
    assert title["x"] >= back["x"] + back["width"] - 1, (title, back)
    assert title["x"] + title["width"] <= report["x"] + 1, (title, report)
    assert 20 * lines <= title["height"] < 20 * (lines + 1) + 8, (lines, title)


def test_phone_open_an_over_column_and_edit_its_length(server, browser):
    page = _open(browser, server, PHONE)
    site = _wait(page, "site-Kestrel Lane Print Works")
    assert "5 over capacity" in site.inner_text()
    assert "licensed engineer" in _wait(page, "caution").inner_text()
    _shot(page, "phone-sites.png")

    site.click()
    _wait(page, "column-A/1-G")
    rows = page.locator('[flt-semantics-identifier^="column-"]'
                        ':not([flt-semantics-identifier="column-search"])')
    _poll(lambda: rows.count(), lambda n: n >= 6, "column rows")
    texts = [rows.nth(i).inner_text() for i in range(rows.count())]
    over = [t for t in texts if re.search(r"\d\.\d\d OVER", t)]
    assert over and all(STATUS.search(t) for t in texts), texts
    _shot(page, "phone-columns.png")
    _title_fits(page, lines=2)
    boxes = [rows.nth(i).bounding_box() for i in range(rows.count())]
    # a row cut by the screen's bottom edge reports its visible part, ending right at the edge
    whole = [b for b in boxes if b and b["y"] >= 56 and b["y"] + b["height"] < PHONE["height"] - 1]
    # under the search and the filters, still several whole rows on the first screen
    assert len(whole) >= 4 and all(b["height"] >= 48 for b in whole), boxes

    tag = over[0].split(":")[0].strip()
    _click(page, f"column-{tag}", done=lambda: page.locator(_sel("status")).count())
    status = _wait(page, "status")
    before = _poll(lambda: STATUS.search(status.inner_text()).group(0),
                   lambda s: s.endswith("OVER"), "status of the OVER column")
    assert CAUTION in _wait(page, "caution").inner_text()
    assert tag in _wait(page, "column-tag").inner_text()
    _shot(page, "phone-column.png")
    # touch targets usable with gloves: at least 48 px (Material minimum, common practice)
    for ident in ("back", "field-length", "field-demand"):
        if ident != "back":  # the entries sit below the result: scrolled into view first
            _scroll_to(page, ident)
        box = page.locator(_sel(ident)).first.bounding_box()
        assert box and box["height"] >= 48 and box["width"] >= 48, (ident, box)

    # a bad entry: the error names the field, the typed text stays, nothing changes
    _type_into(page, "field-length", "12 fr")
    length = page.locator(f"{_sel('field-length')} input").first
    _poll(lambda: length.get_attribute("aria-description") or "",
          lambda d: d.startswith("Length '12 fr' not understood"), "error at the length field")
    assert "12 fr" in page.locator(_sel("field-length")).first.inner_text() \
        or length.input_value() == "12 fr"
    # the bar says where to look, not the entry's words again
    said = _wait(page, "save-note") and _words(page, "save-note")
    assert "Not saved: check Length" in said and "not understood" not in said, said
    _shot(page, "phone-column-error.png")
    # the result sits above the entries: scrolled back up to read it
    assert STATUS.search(_scroll_to(page, "status", up=True).inner_text()).group(0) == before

    # a good entry: saved at once and checked again
    _type_into(page, "field-length", "12 ft")
    note = (_wait(page, "save-note") and _words(page, "save-note"))
    assert "cannot use" not in (length.get_attribute("aria-description") or "")
    after = _poll(lambda: STATUS.search(_scroll_to(page, "status", up=True).inner_text()).group(0),
                  lambda s: s != before, "status after a good length")
    note = (_wait(page, "save-note") and _words(page, "save-note"))
    assert "Saved length 12 ft" in note and after in note
    _shot(page, "phone-column-saved.png")

    # back on the list, the column shows its new check
    page.locator(_sel("back")).first.click()
    row = _wait(page, f"column-{tag}")
    _poll(lambda: row.inner_text(), lambda t: after in t, "the list shows the new check")
    assert all(urlparse(u).hostname not in ("127.0.0.1", "localhost") for u in page.refused)
    page.context.close()


def test_tablet_two_panes(server, browser):
    page = _open(browser, server, TABLET)
    site = _wait(page, "site-Kestrel Lane Print Works")
    _shot(page, "tablet-sites.png")
    site.click()
    _wait(page, "column-A/1-G")
    _shot(page, "tablet-columns.png")
    _title_fits(page, lines=1)
    _click(page, "column-C/3-G", x=200, done=lambda: page.locator(_sel("status")).count())
    status = _wait(page, "status")
    _poll(lambda: status.inner_text(), lambda t: STATUS.search(t) is not None, "status")
    # the list stays beside the column on a tablet
    assert page.locator(_sel("column-C/3-G")).count() == 1
    assert CAUTION in _wait(page, "caution").inner_text()
    _shot(page, "tablet-column.png")
    for ident, x in (("back", 0), ("column-C/3-G", 200), ("field-length", 600),
                     ("check-again", 600)):
        if x:  # scrolled wholly into view first: a row cut by the screen's edge reads short
            _scroll_to(page, ident, x)
        box = page.locator(_sel(ident)).first.bounding_box()
        assert box and box["height"] >= 48 and box["width"] >= 48, (ident, box)
    page.locator(_sel("check-again")).first.click()
    _poll(lambda: _words(page, "save-note"),
          lambda t: t.startswith("Checked again: ") and STATUS.search(t) is not None,
          "check again")
    # narrowed to a phone, the same column fills the screen alone, the typed text kept
    _type_into(page, "field-demand", "9 parsecs")
    demand = page.locator(f"{_sel('field-demand')} input").first
    _poll(lambda: demand.get_attribute("aria-description") or "",
          lambda d: d.startswith("Axial demand '9 parsecs' not understood"),
          "error at the demand")
    page.set_viewport_size(PHONE)
    _poll(lambda: page.locator(_sel("column-A/1-G")).count(), lambda n: n == 0,
          "the list pane goes on a phone")
    assert STATUS.search(_wait(page, "status").inner_text())
    _scroll_to(page, "field-demand")   # below the result on a phone
    demand = page.locator(f"{_sel('field-demand')} input").first
    _poll(lambda: demand.get_attribute("aria-description") or "",
          lambda d: "9 parsecs" in d, "the refused entry and its error survive the resize")
    page.context.close()


# -- findings, photos, history, retrofit options ---------------------------------------------
def test_phone_findings_photo_history_and_a_new_finding(server, browser):
    page = _open(browser, server, PHONE)
    _click(page, "site-Kestrel Lane Print Works")
    _open_column(page, "column-A/2-G")
    _wait(page, "status")
    _tab(page, "findings")
    _wait(page, "finding-0")
    _poll(lambda: _words(page, "finding-0"),
          lambda t: "Base of column heavily corroded" in t and "high" in t and "open" in t,
          "the finding's words")
    photo = _wait(page, "photo-f0-0")
    assert "taken 2026-02-10 10:20" in _words(page, "photo-f0-0")  # taken as its finding was noted
    box = photo.bounding_box()
    assert box and box["width"] >= 48 and box["height"] >= 48, box
    # the thumbnail is drawn (the demo photo is a grey column on a lighter wall, not a blank)
    _poll(lambda: _drawn(page, "photo-f0-0"), lambda sd: sd > 20, "the thumbnail drawn")
    _shot(page, "phone-findings.png")
    photo.click()
    _wait(page, "photo-large")
    _poll(lambda: _drawn(page, "photo-large"), lambda sd: sd > 20, "the large photo drawn")
    _shot(page, "phone-photo.png")
    _click(page, "photo-close")
    _poll(lambda: page.locator(_sel("photo-large")).count(), lambda k: k == 0, "dialog closed")

    # a bad entry (nothing typed): the error is at the field and nothing is listed
    _click(page, "new-finding")
    _click(page, "save-finding")
    # each error in plain words at its field, never the internal form ("text: cannot use")
    _poll(lambda: _entry(page, "finding-text").get_attribute("aria-description") or "",
          lambda d: d.startswith("Say what was found"), "the error at the finding's text")
    _poll(lambda: _entry(page, "finding-category").get_attribute("aria-description") or "",
          lambda d: d.startswith("Give a category"), "the error at the category")
    assert _wait(page, "severity-error").inner_text().startswith("Pick a severity")
    assert "Not saved" in _wait(page, "finding-note").inner_text()
    assert page.locator(_sel("finding-1")).count() == 0
    _shot(page, "phone-finding-error.png")

    # a good entry: saved at once, listed first, still there after a reload
    words = f"Paint blistered at the splice, check {time.monotonic_ns() % 100000}"
    _type_into(page, "finding-text", words, enter=False)
    _type_into(page, "finding-category", "coating", enter=False)
    _click(page, "severity-low")
    _poll(lambda: _words(page, "severity-low"), lambda t: "(chosen)" in t, "severity chosen")
    _click(page, "save-finding")
    _poll(lambda: _wait(page, "finding-note").inner_text(), lambda t: "Saved finding" in t,
          "the save note")
    _poll(lambda: _words(page, "finding-0"),
          lambda t: words in t and "low, open, coating" in t, "the new finding first")
    _shot(page, "phone-finding-saved.png")
    # opened again in a new session at the column's own address (a reload): read from the store
    route = urlparse(page.url).path
    assert route.startswith("/columns/"), page.url
    assert all(urlparse(u).hostname not in ("127.0.0.1", "localhost") for u in page.refused)
    page.context.close()
    page = _open(browser, server, PHONE, route)
    _wait(page, "status")
    _tab(page, "findings")
    _poll(lambda: _words(page, "finding-0") + " " + _words(page, "finding-1"),
          lambda t: words in t and "Base of column" in t, "both findings after a reload")

    # history: the reading as typed, who took it and when; then each change of the result
    _tab(page, "history")
    _wait(page, "reading-0")
    _poll(lambda: _words(page, "reading-0"),
          lambda t: "typed 0.48 in" in t and "R. Amadi" in t and "in use" in t, "the reading")
    _shot(page, "phone-history.png")
    _find(page, "result-0")
    _poll(lambda: _words(page, "result-0"), lambda t: "flexural buckling" in t, "the result")
    _shot(page, "phone-history-results.png")
    _find(page, "tab-check", up=True)
    box = page.locator(_sel("tab-check")).first.bounding_box()
    assert box and box["height"] >= 48 and box["width"] >= 48, box
    assert all(urlparse(u).hostname not in ("127.0.0.1", "localhost") for u in page.refused)
    page.context.close()


def test_phone_corrected_reading_and_retrofit(server, browser):
    page = _open(browser, server, PHONE)
    _click(page, "site-Kestrel Lane Print Works")
    _wait(page, "column-A/1-G")
    _open_column(page, "column-D/2-G")
    _tab(page, "history")
    _wait(page, "reading-1")
    _poll(lambda: _words(page, "reading-0"),
          lambda t: "typed 0.23 in" in t and "CORRECTED" in t, "the corrected reading, marked")
    assert "corrects the reading typed 0.23 in" in _words(page, "reading-1")
    _shot(page, "phone-history-corrected.png")
    _tab(page, "retrofit")
    assert "licensed engineer" in _wait(page, "caution").inner_text()
    assert page.locator(_sel("retrofit-0")).count() == 0  # D/2-G has no saved option
    # C/3-G has one: before -> after on a phone, with the caution
    _click(page, "back")
    _wait(page, "column-D/2-G")  # Back: the list where it was left
    _open_column(page, "column-C/3-G")
    _tab(page, "retrofit")
    _scroll_to(page, "retrofit-0-line")  # kept options come after the builder and the sweep
    _poll(lambda: _words(page, "retrofit-0-line"),
          lambda t: re.search(r"Utilization 1\.11 OVER -> \d\.\d\d OK", t) is not None,
          "the before -> after line")
    _shot(page, "phone-retrofit.png")
    _to_top(page)
    assert "licensed engineer" in _wait(page, "caution").inner_text()
    page.context.close()


def test_tablet_retrofit_before_after_and_findings(server, browser):
    page = _open(browser, server, TABLET)
    _click(page, "site-Kestrel Lane Print Works")
    _click(page, "column-C/3-G", x=200, done=lambda: page.locator(_sel("status")).count())
    _wait(page, "status")
    _tab(page, "retrofit")
    _scroll_to(page, "retrofit-0-line", 600)
    text = _poll(lambda: _words(page, "retrofit-0-line"), lambda t: "->" in t,
                 "the before -> after line")
    m = re.search(r"Design strength (\d+(\.\d+)?) kip -> (\d+(\.\d+)?) kip", text)
    assert m and float(m.group(3)) > float(m.group(1)), text
    assert re.search(r"Utilization 1\.11 OVER -> \d\.\d\d OK for demand 650 kip", text), text
    _shot(page, "tablet-retrofit.png")
    _to_top(page, 600)  # the caution and the row of tabs are at the top of the pane
    assert CAUTION in _wait(page, "caution").inner_text()
    _tab(page, "findings")
    _wait(page, "finding-0")
    _poll(lambda: _words(page, "finding-0"), lambda t: "Strap brace" in t, "the finding")
    _poll(lambda: _drawn(page, "photo-f0-0"), lambda sd: sd > 20, "the thumbnail drawn")
    _shot(page, "tablet-findings.png")
    _tab(page, "history")
    _wait(page, "change-0")
    _poll(lambda: _words(page, "change-0"),
          lambda t: "2008-09-01" in t and "brace added" in t and "R. Amadi" in t, "the change")
    _shot(page, "tablet-history.png")
    for ident in ("tab-check", "tab-findings", "tab-history", "tab-retrofit"):
        box = page.locator(_sel(ident)).first.bounding_box()
        assert box and box["height"] >= 48 and box["width"] >= 48, (ident, box)
    page.context.close()
