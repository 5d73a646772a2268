"""The field app in a real browser: `fieldcol app --demo` served on loopback, Debian chromium
driven by Playwright, every request that leaves the machine refused (the app must work offline).

Selectors are the app's Semantics identifiers (`site-...`, `column-<tag>`, `status`, `caution`,
`field-length`, `save-note`). Screenshots go to $FIELDCOL_SHOTS (else /tmp/fieldcol-shots/; phone 390x844, tablet
820x1180). Waits poll with a timeout; the only fixed pauses are ~1 s before screenshots.
"""

from __future__ import annotations

import os
import re
import shutil
import socket
import subprocess
import sys
import time
from pathlib import Path
from urllib.parse import urlparse

import pytest

from playwright import sync_api  # noqa: E402  (the test extra installs it)
CHROMIUM = shutil.which("chromium")
if CHROMIUM is None:
    # the README's test command installs it; a browser test that quietly skips proves nothing
    raise RuntimeError("Debian chromium is not installed: apt-get install -y chromium")

from fieldcol import CAUTION  # noqa: E402

SHOTS = Path(os.environ.get("FIELDCOL_SHOTS") or "/tmp/fieldcol-shots")
ARGS = ["--no-sandbox", "--enable-unsafe-swiftshader", "--disable-gpu", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync"]
PHONE = {"width": 390, "height": 844}
TABLET = {"width": 820, "height": 1180}
TIMEOUT = 20.0  # s, for any one thing to appear
STATUS = re.compile(r"\d\.\d\d (OK|OVER)")


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@pytest.fixture(scope="module")
def server(tmp_path_factory):
    """`fieldcol app --db TMP --port FREE --demo` in a subprocess; yields its base URL."""
    port = _free_port()
    db = tmp_path_factory.mktemp("ui") / "ui.db"
    log = open(db.with_suffix(".log"), "w")
    env = {**os.environ, "FLET_FORCE_WEB_SERVER": "true"}
    proc = subprocess.Popen([sys.executable, "-m", "fieldcol", "app", "--db", str(db),
                             "--port", str(port), "--demo"], stdout=log, stderr=subprocess.STDOUT,
                            env=env)
    deadline = time.monotonic() + 60
    try:
        while True:
            assert proc.poll() is None, db.with_suffix(".log").read_text()
            try:
                socket.create_connection(("127.0.0.1", port), timeout=0.5).close()
                break
            except OSError:
                assert time.monotonic() < deadline, "the app did not start listening"
                time.sleep(0.1)
        yield f"http://127.0.0.1:{port}"
    finally:
        proc.terminate()
        try:
            proc.wait(10)
        except subprocess.TimeoutExpired:
            proc.kill()
            proc.wait(10)
        log.close()


@pytest.fixture(scope="module")
def browser():
    with sync_api.sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        yield b
        b.close()


def _open(browser, base: str, viewport: dict, route: str = "/"):
    """A page on the app with every non-loopback request refused and semantics turned on."""
    ctx = browser.new_context(viewport=viewport)
    page = ctx.new_page()
    refused: list[str] = []

    def only_loopback(r):
        if urlparse(r.request.url).hostname in ("127.0.0.1", "localhost"):
            r.continue_()
        else:
            refused.append(r.request.url)
            r.abort()

    page.route("**/*", only_loopback)
    page.goto(base + route)
    page.wait_for_selector("flt-semantics-placeholder", state="attached",
                           timeout=TIMEOUT * 1000)
    page.evaluate("document.querySelector('flt-semantics-placeholder').click()")
    page.refused = refused
    return page


def _sel(identifier: str) -> str:
    return f'[flt-semantics-identifier="{identifier}"]'


def _wait(page, identifier: str):
    loc = page.locator(_sel(identifier)).first
    loc.wait_for(state="attached", timeout=TIMEOUT * 1000)
    return loc


def _poll(read, ok, what: str, timeout: float = TIMEOUT):
    """Read until ``ok(value)`` or fail after ``timeout`` s with the last value read."""
    deadline = time.monotonic() + timeout
    value = None
    while time.monotonic() < deadline:
        try:
            value = read()
        except Exception as e:  # the node may be rebuilt between reads
            value = e
        if not isinstance(value, Exception) and ok(value):
            return value
        time.sleep(0.1)
    raise AssertionError(f"{what}: last seen {value!r}")


def _shot(page, name: str) -> None:
    SHOTS.mkdir(parents=True, exist_ok=True)
    time.sleep(1)  # let the last frame paint
    page.screenshot(path=str(SHOTS / name))


def _entry(page, identifier: str):
    """The text box (``input``, or ``textarea`` for a multi-line entry) inside an entry."""
    return page.locator(f"{_sel(identifier)} input, {_sel(identifier)} textarea").first


def _type_into(page, identifier: str, text: str, *, enter: bool = True) -> None:
    """Replace the text of an entry (and press Enter), once the entry holds exactly ``text``
    (Flutter may swap the focused input element, so keys sent too early can go astray)."""
    field = _entry(page, identifier)
    if not page.locator(_sel(identifier)).count():  # a long tab builds what is near the screen
        _scroll_to(page, identifier, page.viewport_size["width"] - 100)
    box = page.locator(_sel(identifier)).first.bounding_box()
    if box:  # wholly in view first, clear of the save bar
        _scroll_to(page, identifier, box["x"] + 10)
    for _ in range(5):
        field.click(position={"x": 60, "y": 20})  # the top line: the error text sits lower
        _poll(lambda: page.evaluate("document.activeElement && document.activeElement.tagName"),
              lambda tag: tag in ("INPUT", "TEXTAREA"), f"focus in {identifier}")
        page.keyboard.press("Control+A")
        page.keyboard.type(text)
        try:
            _poll(lambda: page.evaluate("document.activeElement.value"), lambda v: v == text,
                  f"{identifier} holds the typed text", timeout=3)
            break
        except AssertionError:
            continue
    else:
        raise AssertionError(f"could not type {text!r} into {identifier}")
    if enter:
        page.keyboard.press("Enter")


def test_phone_open_an_over_column_and_edit_its_length(server, browser):
    page = _open(browser, server, PHONE)
    site = _wait(page, "site-Kestrel Lane Print Works")
    assert "5 over capacity" in site.inner_text()
    assert "licensed engineer" in _wait(page, "caution").inner_text()
    _shot(page, "phone-sites.png")

    site.click()
    _wait(page, "column-A/1-G")
    rows = page.locator('[flt-semantics-identifier^="column-"]')
    _poll(lambda: rows.count(), lambda n: n >= 8, "column rows")
    texts = [rows.nth(i).inner_text() for i in range(rows.count())]
    over = [t for t in texts if re.search(r"\d\.\d\d OVER", t)]
    assert over and all(STATUS.search(t) for t in texts), texts
    _shot(page, "phone-columns.png")
    boxes = [rows.nth(i).bounding_box() for i in range(rows.count())]
    # a row cut by the screen's bottom edge reports its visible part, ending right at the edge
    whole = [b for b in boxes if b and b["y"] >= 56 and b["y"] + b["height"] < PHONE["height"] - 1]
    assert len(whole) >= 5 and all(b["height"] >= 48 for b in whole), boxes

    tag = over[0].split(":")[0].strip()
    page.locator(_sel(f"column-{tag}")).first.click()
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
    assert "not saved" in (_wait(page, "save-note") and _words(page, "save-note"))
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
    page.locator(_sel("column-C/3-G")).first.click()
    status = _wait(page, "status")
    _poll(lambda: status.inner_text(), lambda t: STATUS.search(t) is not None, "status")
    # the list stays beside the column on a tablet
    assert page.locator(_sel("column-A/1-G")).count() == 1
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
def _tab(page, name: str) -> None:
    """Show a tab of the column screen and wait until it says it is shown."""
    tab = _wait(page, f"tab-{name}")
    for _ in range(10):  # the tab row scrolls sideways on a phone: bring the tab on screen
        box = tab.bounding_box()
        if box is None or box["x"] + box["width"] <= page.viewport_size["width"]:
            break
        page.mouse.move(page.viewport_size["width"] / 2, box["y"] + box["height"] / 2)
        page.mouse.wheel(200, 0)
        time.sleep(0.2)
    tab.click()
    try:
        try:
            _poll(lambda: _words(page, f"tab-{name}"), lambda t: "(shown)" in t,
                  f"the {name} tab shown", timeout=8)
        except AssertionError:  # a tap while the column's first tab was still being drawn
            _wait(page, f"tab-{name}").click()
            _poll(lambda: _words(page, f"tab-{name}"), lambda t: "(shown)" in t,
                  f"the {name} tab shown")
    except AssertionError:
        SHOTS.mkdir(parents=True, exist_ok=True)
        page.screenshot(path=str(SHOTS / f"failed-tab-{name}.png"))
        (SHOTS / f"failed-tab-{name}.html").write_text(page.content())
        raise


def _words(page, identifier: str) -> str:
    """Every word a control offers a screen reader: its text and the labels inside it
    (Flutter puts some in ``aria-label``, e.g. on a card holding selectable text)."""
    return page.locator(_sel(identifier)).first.evaluate(
        "e => [e.innerText, ...[e, ...e.querySelectorAll('[aria-label]')]"
        ".map(x => x.getAttribute('aria-label'))].filter(Boolean).join(' ')",
        timeout=2000)  # short: the caller polls, and a node may be rebuilt meanwhile


def _to_top(page, x: float = 195) -> None:
    """Scroll the list under ``x`` back to its top (a list builds only what is near the
    screen, so a control far above is not there to scroll to)."""
    page.mouse.move(x, page.viewport_size["height"] * 0.6)
    for _ in range(8):
        page.mouse.wheel(0, -1500)
        time.sleep(0.15)
    time.sleep(0.5)


def _scroll_to(page, identifier: str, x: float = 195, *, up: bool = False):
    """Scroll the list under ``x`` with the mouse wheel until the control is wholly in view
    (``up``: a control not built yet lies above the screen)."""
    loc = page.locator(_sel(identifier)).first
    height = page.viewport_size["height"]
    page.mouse.move(x, height * 0.6)
    for _ in range(30):
        box = loc.bounding_box() if page.locator(_sel(identifier)).count() else None
        # a margin at the bottom: a row cut by the screen's edge reports only its visible part
        if box and box["y"] >= 56 and box["y"] + box["height"] <= height - 64:
            return loc
        down = (not up) if box is None else box["y"] > 56
        page.mouse.wheel(0, 300 if down else -300)
        time.sleep(0.2)
    raise AssertionError(f"could not scroll {identifier} into view")


def _open_column(page, loc) -> None:
    """Tap a column row until its screen shows: a tap that lands while the list still glides
    after a wheel scroll is taken as part of the scroll, not as a tap."""
    for _ in range(3):
        time.sleep(0.3)  # let the list come to rest
        loc.click()
        try:
            page.locator(_sel("status")).first.wait_for(state="attached", timeout=8000)
            return
        except sync_api.TimeoutError:
            continue
    _wait(page, "status")


def _drawn(page, identifier: str) -> float:
    """How much the pixels inside a control vary (0 for a blank box): an image was drawn."""
    import io

    from PIL import Image, ImageStat

    png = page.locator(_sel(identifier)).first.screenshot()
    return max(ImageStat.Stat(Image.open(io.BytesIO(png)).convert("L")).stddev)


def test_phone_findings_photo_history_and_a_new_finding(server, browser):
    page = _open(browser, server, PHONE)
    _wait(page, "site-Kestrel Lane Print Works").click()
    _wait(page, "column-A/2-G").click()
    _wait(page, "status")
    _tab(page, "findings")
    _wait(page, "finding-0")
    _poll(lambda: _words(page, "finding-0"),
          lambda t: "Base of column heavily corroded" in t and "high" in t and "open" in t,
          "the finding's words")
    photo = _wait(page, "photo-f0-0")
    assert "taken 2026-02-10 11:00" in _words(page, "photo-f0-0")
    box = photo.bounding_box()
    assert box and box["width"] >= 48 and box["height"] >= 48, box
    # the thumbnail is drawn (the demo photo is a grey column on a lighter wall, not a blank)
    _poll(lambda: _drawn(page, "photo-f0-0"), lambda sd: sd > 20, "the thumbnail drawn")
    _shot(page, "phone-findings.png")
    photo.click()
    _wait(page, "photo-large")
    _poll(lambda: _drawn(page, "photo-large"), lambda sd: sd > 20, "the large photo drawn")
    _shot(page, "phone-photo.png")
    _wait(page, "photo-close").click()
    _poll(lambda: page.locator(_sel("photo-large")).count(), lambda k: k == 0, "dialog closed")

    # a bad entry (nothing typed): the error is at the field and nothing is listed
    _wait(page, "new-finding").click()
    _wait(page, "save-finding").click()
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
    _wait(page, "severity-low").click()
    _poll(lambda: _words(page, "severity-low"), lambda t: "(chosen)" in t, "severity chosen")
    _wait(page, "save-finding").click()
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

    # history: the reading as typed, who took it and when
    _tab(page, "history")
    _wait(page, "reading-0")
    _poll(lambda: _words(page, "reading-0"),
          lambda t: "typed 0.48 in" in t and "R. Amadi" in t and "in use" in t, "the reading")
    _shot(page, "phone-history.png")
    box = page.locator(_sel("tab-check")).first.bounding_box()
    assert box and box["height"] >= 48 and box["width"] >= 48, box
    assert all(urlparse(u).hostname not in ("127.0.0.1", "localhost") for u in page.refused)
    page.context.close()


def test_phone_corrected_reading_and_retrofit(server, browser):
    page = _open(browser, server, PHONE)
    _wait(page, "site-Kestrel Lane Print Works").click()
    _wait(page, "column-A/1-G")
    _open_column(page, _scroll_to(page, "column-D/2-G"))
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
    _wait(page, "back").click()
    _wait(page, "column-A/1-G")
    _open_column(page, _scroll_to(page, "column-C/3-G"))
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
    _wait(page, "site-Kestrel Lane Print Works").click()
    page.locator(_sel("column-C/3-G")).first.click()
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
