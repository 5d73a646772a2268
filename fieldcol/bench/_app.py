"""The app in a real browser: first screen, a column opened, an edit saved and checked again.

``fieldcol app --demo`` (a demo store in a temporary folder) and a bare Flet page (one text, the
same ``flet_web`` app behind uvicorn) are each served on a free loopback port in a process of
their own, and Debian chromium (headless, driven by playwright, a test extra) opens them:

- ``app_first_screen_s`` / ``bare_flet_first_screen_s``: from navigation to the sites list (the
  bare page's text) on screen, each in a fresh browser context (nothing cached); their ratio is
  ``app_first_screen_ratio`` (goal: at most 1.5).
- ``app_open_column_ms``: a tap on a column row to its result (``status`` and ``result-line``)
  on screen; median over a few columns.
- ``app_save_recheck_ms``: a new length typed and Enter pressed to the save bar saying it was
  saved with the re-checked result ("Saved length 14 ft; checked again: 0.58 OK", sent in the
  same update as the re-checked screen) and the status, where drawn, showing that result;
  median over a few edits.

The clock is read in this process; the screen is polled in the page once per frame
(``requestAnimationFrame``). Without playwright or chromium the case says why it was skipped.
"""

from __future__ import annotations

import contextlib
import os
import shutil
import socket
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path
from typing import Any, Iterator

SITE = "Kestrel Lane Print Works"
PHONE = {"width": 390, "height": 844}
ARGS = ["--no-sandbox", "--enable-unsafe-swiftshader", "--disable-gpu", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync"]
TIMEOUT_MS = 60_000  # for any one thing to appear: the machine is shared

#: a bare Flet page served as ``fieldcol app`` serves the app (flet_web's app under uvicorn)
BARE = """
import sys
import flet as ft
import flet_web.fastapi as flet_fastapi
import uvicorn

async def main(page: ft.Page) -> None:
    page.add(ft.Semantics(identifier="bare", content=ft.Text("Hello")))

web = flet_fastapi.app(main, no_cdn=True)
uvicorn.Server(uvicorn.Config(web, host="127.0.0.1", port=int(sys.argv[1]),
                              ws="websockets-sansio", log_level="warning",
                              access_log=False)).run()
"""


def _sel(identifier: str) -> str:
    return f'[flt-semantics-identifier="{identifier}"]'


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@contextlib.contextmanager
def _served(cmd: list[str], port: int, log: Path) -> Iterator[str]:
    """``cmd`` in a process of its own until it listens on ``port``; yields its base URL."""
    env = {**os.environ, "FLET_FORCE_WEB_SERVER": "true"}
    with open(log, "w") as out:
        proc = subprocess.Popen(cmd, stdout=out, stderr=subprocess.STDOUT, env=env)
        try:
            deadline = time.monotonic() + 90
            while True:
                if proc.poll() is not None:
                    raise RuntimeError(f"{cmd[2:4]} stopped: {log.read_text()[-500:]}")
                try:
                    socket.create_connection(("127.0.0.1", port), timeout=0.5).close()
                    break
                except OSError:
                    if time.monotonic() > deadline:
                        raise RuntimeError(f"{cmd[2:4]} did not start listening")
                    time.sleep(0.1)
            yield f"http://127.0.0.1:{port}"
        finally:
            proc.terminate()
            try:
                proc.wait(10)
            except subprocess.TimeoutExpired:
                proc.kill()
                proc.wait(10)


def _page(browser: Any, base: str):
    """A fresh context (nothing cached) on a phone, every request beyond loopback refused."""
    from urllib.parse import urlparse

    page = browser.new_context(viewport=PHONE).new_page()
    page.route("**/*", lambda r: r.continue_() if urlparse(r.request.url).hostname
               in ("127.0.0.1", "localhost") else r.abort())
    return page


def _until(page: Any, js: str, arg: Any = None) -> None:
    """Wait, checking once per frame in the page, until ``js`` (a function of ``arg``) holds."""
    page.wait_for_function(js, arg=arg, polling="raf", timeout=TIMEOUT_MS)


def _first_screen(browser: Any, base: str, identifier: str) -> float:
    """Seconds from navigation to the control ``identifier`` on screen (semantics turned on as
    soon as Flutter offers it: that is how the selectors become visible)."""
    page = _page(browser, base)
    t0 = time.perf_counter()
    page.goto(base, wait_until="commit")
    page.wait_for_selector("flt-semantics-placeholder", state="attached", timeout=TIMEOUT_MS)
    page.evaluate("document.querySelector('flt-semantics-placeholder').click()")
    _until(page, "s => !!document.querySelector(s)", _sel(identifier))
    seconds = time.perf_counter() - t0
    page.context.close()
    return seconds


_SHOWN = """([ids, words]) => ids.every(i => {
    const e = document.querySelector(`[flt-semantics-identifier="${i}"]`);
    return e && e.getBoundingClientRect().height > 0;
}) && (!words || [...document.querySelectorAll('[flt-semantics-identifier="save-note"]')]
       .some(e => [e.innerText, ...[e, ...e.querySelectorAll('[aria-label]')]
                   .map(x => x.getAttribute('aria-label'))].join(' ').includes(words)))"""

#: the save bar says the length was saved and checked again ("Saved length 14 ft; checked
#: again: 0.58 OK"), and the status, where it is drawn, shows that same result: the bar's words
#: go in the same update as the re-checked screen, so this is the redraw done
_RECHECKED = """value => {
    const words = e => [e.innerText, ...[e, ...e.querySelectorAll('[aria-label]')]
                        .map(x => x.getAttribute('aria-label'))].join(' ');
    const note = [...document.querySelectorAll('[flt-semantics-identifier="save-note"]')]
        .map(words).join(' ');
    const at = note.indexOf('Saved length ' + value + '; checked again: ');
    if (at < 0) return false;
    const m = note.slice(at).match(/checked again: ([0-9.]+ [A-Z]+)/);
    if (!m) return false;
    const st = document.querySelector('[flt-semantics-identifier="status"]');
    return !st || words(st).includes(m[1]);
}"""


def _center(page: Any, identifier: str) -> tuple[float, float]:
    box = page.locator(_sel(identifier)).first.bounding_box(timeout=TIMEOUT_MS)
    return box["x"] + min(box["width"] / 2, 60), box["y"] + box["height"] / 2


def _open_columns(page: Any, n: int) -> list[float]:
    """Milliseconds from a tap on a column row to its result on screen, for ``n`` rows."""
    rows = page.locator('[flt-semantics-identifier^="column-"]'
                        ':not([flt-semantics-identifier="column-search"])')
    _until(page, "() => document.querySelectorAll('[flt-semantics-identifier^=\"column-\"]')"
                 ".length > 5")
    tags = [rows.nth(i).get_attribute("flt-semantics-identifier") for i in range(4)]
    out = []
    for i in range(n):
        ident = tags[i % len(tags)]
        _until(page, "s => !!document.querySelector(s)", _sel(ident))
        time.sleep(0.5)  # the list at rest, the last frame drawn
        x, y = _center(page, ident)
        t0 = time.perf_counter()
        page.mouse.click(x, y)
        _until(page, _SHOWN, [["status", "result-line"], ""])
        out.append((time.perf_counter() - t0) * 1000)
        if i < n - 1:
            time.sleep(0.3)
            page.locator(_sel("back")).first.click(timeout=TIMEOUT_MS)
    return out


def _save_lengths(page: Any, n: int) -> list[float]:
    """Milliseconds from Enter on a new length to "Saved length ...; checked again: ..."."""
    field = page.locator(f"{_sel('field-length')} input").first
    out = []
    for i in range(n):
        value = f"{14 + i} ft"
        # the entry is below the result: scroll it into view with the wheel
        for _ in range(40):
            box = page.locator(_sel("field-length")).first.bounding_box() \
                if page.locator(_sel("field-length")).count() else None
            if box and 56 < box["y"] and box["y"] + box["height"] < PHONE["height"] - 64:
                break
            page.mouse.move(PHONE["width"] / 2, PHONE["height"] * 0.55)
            page.mouse.wheel(0, 200)
            time.sleep(0.2)
        for _ in range(5):  # Flutter may swap the focused input: type until it holds the text
            field.click(position={"x": 60, "y": 20}, timeout=TIMEOUT_MS)
            time.sleep(0.3)
            page.keyboard.press("Control+A")
            page.keyboard.type(value)
            time.sleep(0.3)
            if page.evaluate("document.activeElement && document.activeElement.value") == value:
                break
        else:  # say so now rather than wait a minute for a save that was never asked for
            raise RuntimeError(f"the length entry would not hold {value!r}")
        t0 = time.perf_counter()
        page.keyboard.press("Enter")
        _until(page, _RECHECKED, value)
        out.append((time.perf_counter() - t0) * 1000)
        time.sleep(0.5)
    return out


def _skipped() -> str | None:
    """Why the case cannot run here, or None."""
    try:
        import playwright.sync_api  # noqa: F401
    except ImportError:
        return "skipped: playwright is not installed (pip install -e '.[test]')"
    if not Path("/usr/bin/chromium").exists() and shutil.which("chromium") is None:
        return "skipped: Debian chromium is not installed (apt-get install -y chromium)"
    return None


def run(*, quick: bool = False) -> dict[str, Any]:
    """The app's first screen against a bare Flet page, a column opened, an edit re-checked.

    Example:
        >>> sorted(run(quick=True))  # doctest: +SKIP
        ['app_first_screen_ratio', 'app_first_screen_s', 'app_open_column_ms',
         'app_save_recheck_ms', 'bare_flet_first_screen_s']
    """
    why = _skipped()
    if why:
        return {"app": why}
    from playwright import sync_api

    chromium = "/usr/bin/chromium" if Path("/usr/bin/chromium").exists() \
        else shutil.which("chromium")
    loads, taps = (1, 3) if quick else (3, 7)
    out: dict[str, Any] = {}
    with tempfile.TemporaryDirectory() as tmp, sync_api.sync_playwright() as p:
        root = Path(tmp)
        browser = p.chromium.launch(executable_path=chromium, args=ARGS)
        try:
            port = _free_port()
            with _served([sys.executable, "-c", BARE, str(port)], port, root / "bare.log") as b:
                _first_screen(browser, b, "bare")  # warm: the server's first files from disk
                bare = [_first_screen(browser, b, "bare") for _ in range(loads)]
            port = _free_port()
            app = [sys.executable, "-m", "fieldcol", "app", "--db", str(root / "demo.db"),
                   "--port", str(port), "--demo"]
            with _served(app, port, root / "app.log") as a:
                _first_screen(browser, a, f"site-{SITE}")
                first = [_first_screen(browser, a, f"site-{SITE}") for _ in range(loads)]
                page = _page(browser, a)
                page.goto(a)
                page.wait_for_selector("flt-semantics-placeholder", state="attached",
                                       timeout=TIMEOUT_MS)
                page.evaluate("document.querySelector('flt-semantics-placeholder').click()")
                page.locator(_sel(f"site-{SITE}")).first.click(timeout=TIMEOUT_MS)
                opened = _open_columns(page, taps)
                saved = _save_lengths(page, taps)
        finally:
            browser.close()
    out["bare_flet_first_screen_s"] = round(statistics.median(bare), 3)
    out["app_first_screen_s"] = round(statistics.median(first), 3)
    out["app_first_screen_ratio"] = round(out["app_first_screen_s"]
                                          / out["bare_flet_first_screen_s"], 2)
    out["app_open_column_ms"] = round(statistics.median(opened), 1)
    out["app_save_recheck_ms"] = round(statistics.median(saved), 1)
    return out
