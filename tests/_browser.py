"""What every browser test shares: the app served on loopback, Debian chromium driven by PyPI
playwright, every request that leaves the machine refused, and waits that hold on a busy
machine while the app redraws.

Selectors are the app's Semantics identifiers (``[flt-semantics-identifier="..."]``).
Screenshots go where ``FIELDCOL_SHOTS`` points (default /tmp/fieldcol-shots); phone 390x844,
tablet 820x1180. Waits poll with a timeout; the only fixed pauses are ~1 s before screenshots
and a few tenths of a second while a list glides.

Every call to the browser that has no deadline of its own (``count()``, ``bounding_box()``'s
measure, ``evaluate``, the mouse and the keyboard) is made under ``_answer``: headless
chromium's software renderer has been seen to go silent for minutes, and such a call would
then hold the test until pytest-timeout's 420 s. Under ``_answer`` it ends with ``Silent``
after ``ANSWER`` s, which no helper or test catches (a new page, the rerun, is what helps).

Taps go through ``_click``: Flutter rebuilds a semantics node when the app redraws the control,
so a tap may meet a node that moves or goes ("element is not stable", "element was detached
from the DOM"). ``_click`` finds the control again and taps again until the tap took (``done``)
or the control is gone because what it was for already happened.
"""

from __future__ import annotations

import contextlib
import os
import re
import shutil
import signal
import socket
import subprocess
import sys
import threading
import time
from pathlib import Path
from typing import Any, Callable, Iterator
from urllib.parse import urlparse

import pytest

from playwright import sync_api  # noqa: E402  (the test extra installs it)

CHROMIUM = shutil.which("chromium")
if CHROMIUM is None:
    # the README's test command installs it; a browser test that quietly skips proves nothing
    raise RuntimeError("Debian chromium is not installed: apt-get install -y chromium")

SHOTS = Path(os.environ.get("FIELDCOL_SHOTS") or "/tmp/fieldcol-shots")
ARGS = ["--no-sandbox", "--enable-unsafe-swiftshader", "--disable-gpu", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync"]
PHONE = {"width": 390, "height": 844}
TABLET = {"width": 820, "height": 1180}
SIZES = {"phone": PHONE, "tablet": TABLET}
WIDE = 768       # from this width up the app shows the list and the column side by side
LIST_W = 400     # the list pane's width on a tablet
TIMEOUT = 30.0   # s, for any one thing to appear (the machine is shared)
STATUS = re.compile(r"\d\.\d\d (OK|OVER)")
TOP, BOTTOM = 56, 64  # the app bar above, the save bar below: a control wholly between
# fixed at the foot of a screen, under which the scrolling pane ends: the column screen's
# "Next like this" strip and the save bar (taller with a long message)
FOOT = ("duplicate-column", "save-note")
# s: the longest one call to the browser may go unanswered (a DOM query takes milliseconds, a
# busy frame a second or two) before its renderer counts as silent
ANSWER = 15.0


class Silent(BaseException):
    """The browser gave no answer within the time allowed: its renderer has gone silent.

    A BaseException, like pytest's own failures: the helpers' retry loops and a test's
    ``except Exception`` let it through, so the test fails at once and runs again on a new
    page instead of tapping on at a page that will not answer."""


@contextlib.contextmanager
def _answer(what: str, seconds: float | None = None) -> Iterator[None]:
    """Hold the calls to the browser inside the block to ``seconds`` (``ANSWER``), then raise
    ``Silent``.

    Playwright's ``count()``, ``evaluate``, mouse and keyboard send no deadline of their own,
    so a silent renderer holds them for ever. A SIGALRM raised while the sync API waits is
    thrown into the waiting call (playwright's dispatcher is built for it: pytest-timeout's
    signal method does the same), the call's future is cancelled and the connection lives on.
    The alarm repeats each second until the block ends: asyncio swallows an exception raised
    inside one of its callbacks, and the next alarm then lands in the wait. An alarm already
    set (pytest-timeout's, or an enclosing ``_answer``) is set again as it was, less the time
    spent; if it is due first, its own handler runs. Off the main thread (no signals there)
    the block runs unguarded.

    Example: ``with _answer("counting rows"): n = page.locator(sel).count()``
    """
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    seconds = ANSWER if seconds is None else seconds
    outer = signal.getsignal(signal.SIGALRM)
    if outer is None:  # a handler set outside Python: leave it as the system has it
        outer = signal.SIG_DFL
    outer_left, outer_every = signal.getitimer(signal.ITIMER_REAL)
    start = time.monotonic()
    mine = not outer_left or seconds < outer_left
    outer_fired = False

    def on_alarm(signum, frame):
        nonlocal outer_fired
        if not mine:  # the enclosing deadline comes first: it speaks
            outer_fired = True
            if callable(outer):
                outer(signum, frame)
            return
        raise Silent(f"{what}: the browser gave no answer in {seconds:g} s")

    signal.signal(signal.SIGALRM, on_alarm)
    signal.setitimer(signal.ITIMER_REAL, seconds if mine else outer_left, 1.0)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, outer)
        if outer_left and not outer_fired:
            left = outer_left - (time.monotonic() - start)
            signal.setitimer(signal.ITIMER_REAL, max(left, 0.001), outer_every)


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@contextlib.contextmanager
def app_server(db: Path, *, demo: bool = True, env: dict[str, str] | None = None
               ) -> Iterator[str]:
    """`fieldcol app --db DB --port FREE [--demo]` in a subprocess; yields its base URL."""
    port = _free_port()
    log = open(db.with_suffix(".log"), "w")
    env = {**os.environ, "FLET_FORCE_WEB_SERVER": "true", **(env or {})}
    cmd = [sys.executable, "-m", "fieldcol", "app", "--db", str(db), "--port", str(port)]
    proc = subprocess.Popen(cmd + (["--demo"] if demo else []), stdout=log,
                            stderr=subprocess.STDOUT, env=env)
    deadline = time.monotonic() + 90
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


class Served:
    """``app_server`` for a test module, on a fresh store again when a test runs again: a failed
    attempt may have changed the store half way (a finding added, a reading corrected), and the
    next attempt must find it as the first did. The tests of a module do not build on each
    other's changes, so those after a rerun run on the fresh store as well."""

    def __init__(self, folder: Path, **kw: Any) -> None:
        self.folder, self.kw, self.n = folder, kw, 0
        self._stack = contextlib.ExitStack()
        self._attempt: tuple[str, int] | None = None
        self._start()

    def _start(self) -> None:
        self._stack.close()
        self.n += 1
        self.db = self.folder / f"ui{self.n}.db"
        self.base = self._stack.enter_context(app_server(self.db, **self.kw))

    def for_test(self, request: pytest.FixtureRequest) -> "Served":
        """The server for this test: started afresh on a rerun's first use."""
        attempt = (request.node.nodeid, getattr(request.node, "execution_count", 1))
        if attempt[1] > 1 and attempt != self._attempt:
            self._start()
        self._attempt = attempt
        return self

    def close(self) -> None:
        self._stack.close()


@pytest.fixture(scope="module")
def served(tmp_path_factory):
    """The demo site served for one test module (see ``Served``)."""
    s = Served(tmp_path_factory.mktemp("ui"))
    yield s
    s.close()


@pytest.fixture
def server(served, request):
    """The demo site's base URL for this test."""
    return served.for_test(request).base


@pytest.fixture
def server_db(served, request):
    """(base URL, database path) of the demo site for this test (a module that reads the store
    itself imports it as its ``server``)."""
    s = served.for_test(request)
    return s.base, s.db


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

    with _answer("routing the page's requests"):
        page.route("**/*", only_loopback)
    page.goto(base + route, timeout=TIMEOUT * 1000)
    page.wait_for_selector("flt-semantics-placeholder", state="attached",
                           timeout=TIMEOUT * 1000)
    with _answer("turning on semantics"):
        page.evaluate("document.querySelector('flt-semantics-placeholder').click()")
    page.refused = refused
    return page


def _offline(page) -> None:
    """Nothing but loopback was asked for (what was refused was never on this machine)."""
    assert all(urlparse(u).hostname not in ("127.0.0.1", "localhost") for u in page.refused)


def _sel(identifier: str) -> str:
    return f'[flt-semantics-identifier="{identifier}"]'


def _wait(page, identifier: str, timeout: float = TIMEOUT):
    loc = page.locator(_sel(identifier)).first
    loc.wait_for(state="attached", timeout=timeout * 1000)
    return loc


def _poll(read: Callable[[], Any], ok: Callable[[Any], bool], what: str,
          timeout: float = TIMEOUT):
    """Read until ``ok(value)`` or fail after ``timeout`` s with the last value read.

    A read the browser does not answer ends the wait with ``Silent``: a read may itself be a
    wait (``_find`` holds up to TIMEOUT), so each is held to the longer of TIMEOUT and
    ``timeout``, and one ANSWER more. A wait thus outlasts its timeout by at most one read,
    however still the renderer lies."""
    deadline = time.monotonic() + timeout
    value = None
    while time.monotonic() < deadline:
        try:
            with _answer(f"{what} (reading)", max(TIMEOUT, timeout) + ANSWER):
                value = read()
        except Exception as e:  # the node may be rebuilt between reads
            value = e
        if not isinstance(value, Exception) and ok(value):
            return value
        time.sleep(0.1)
    raise AssertionError(f"{what}: last seen {value!r}")


def _true(check: Callable[[], Any]) -> bool:
    try:
        with _answer("a check", TIMEOUT + ANSWER):  # a check may be a wait, as in _poll
            return bool(check())
    except Exception:  # a node rebuilt while read: not yet
        return False


def _shot(page, name: str) -> None:
    SHOTS.mkdir(parents=True, exist_ok=True)
    time.sleep(1)  # let the last frame paint
    page.screenshot(path=str(SHOTS / name), timeout=TIMEOUT * 1000)


def _words(page, identifier: str) -> str:
    """Every word a control offers a screen reader: its text and the labels inside it
    (Flutter puts some in ``aria-label``, e.g. on a card holding selectable text)."""
    # the timeout bounds only the wait for the node; the evaluation has none of its own
    with _answer(f"reading the words of {identifier}"):
        return page.locator(_sel(identifier)).first.evaluate(
            "e => [e.innerText, ...[e, ...e.querySelectorAll('[aria-label]')]"
            ".map(x => x.getAttribute('aria-label'))].filter(Boolean).join(' ')",
            timeout=2000)  # short: the caller polls, and a node may be rebuilt meanwhile


def _pane_x(page) -> float:
    """Where the scrolling screen lies across: the whole phone, right of the list on a tablet."""
    width = page.viewport_size["width"]
    return width / 2 if width < WIDE else LIST_W + (width - LIST_W) / 2


def _box(page, identifier: str):
    """Where the control lies on the page (None while it is not there): ``count()`` has no
    deadline and ``bounding_box``'s covers only the wait for the node, so both are held by
    ``_answer``: a silent renderer ends the test with ``Silent`` instead of holding it."""
    try:
        with _answer(f"measuring {identifier}"):
            if not page.locator(_sel(identifier)).count():
                return None
            return page.locator(_sel(identifier)).first.bounding_box(timeout=2000)
    except sync_api.Error:  # rebuilt while measured
        return None


def _floor(page, identifier: str) -> float:
    """How far down a control may reach and be wholly on screen: above the foot's strip and
    the save bar where they show (a control cut by the pane's bottom edge reports its visible
    part, ending right at the edge, so a few pixels clear of it), else BOTTOM above the
    screen's edge. A part of the foot itself is measured against the screen's edge."""
    height = page.viewport_size["height"]
    if identifier in FOOT + ("save-undo", "save-retry"):
        return height
    tops = [b["y"] - 8 for b in (_box(page, f) for f in FOOT) if b and b["height"] > 0]
    return min(tops + [height - BOTTOM])


def _wheel(page, x: float, y: float, dx: float, dy: float) -> None:
    """Turn the mouse wheel at (x, y): the mouse's calls have no deadline of their own."""
    with _answer("turning the mouse wheel"):
        page.mouse.move(x, y)
        page.mouse.wheel(dx, dy)


def _keys(page, *, press: str = "", text: str = "") -> None:
    """Type ``text`` or press a key: the keyboard's calls have no deadline of their own."""
    with _answer(f"typing {press or text!r}"):
        if text:
            page.keyboard.type(text)
        if press:
            page.keyboard.press(press)


def _failed_shot(page, name: str) -> None:
    """A picture of the screen for a failure, short of time: it must not hide the failure."""
    SHOTS.mkdir(parents=True, exist_ok=True)
    try:
        page.screenshot(path=str(SHOTS / name), timeout=10_000)
    except sync_api.Error:
        pass


def _find(page, identifier: str, x: float | None = None, *, up: bool = False,
          timeout: float = TIMEOUT):
    """The control, scrolled wholly into view with the mouse wheel: a list builds only what
    is near the screen, so one not built yet is looked for below (``up``: above), then the
    other way. A control that does not move with the wheel (the save bar) is taken where it is.
    One the wheel moved is taken once it lies still: a tap on a list still gliding is taken
    as part of the scroll, and a tap with no ``done`` check is made only once.
    """
    height = page.viewport_size["height"]
    deadline = time.monotonic() + timeout
    before = None
    turned = 0
    down = not up
    wheeled = False
    while time.monotonic() < deadline:
        box = _box(page, identifier)
        # strictly below the bar: a control cut by the list's top edge reports its visible
        # part, starting right at the edge; and as strictly above what is fixed at the foot.
        # A card taller than the room between them (a long message in the save bar leaves
        # less) is as much in view as it gets with its top in the upper part of the pane (a
        # window as tall as one turn of the wheel, so the turns cannot step over it) and
        # its rest down to the foot (cut there: it reports only what shows)
        floor = _floor(page, identifier) if box else 0.0
        if box and box["y"] > TOP and (box["y"] + box["height"] <= floor or (
                box["y"] <= TOP + 200 and box["y"] + box["height"] >= floor)):
            if not wheeled:
                return page.locator(_sel(identifier)).first
            time.sleep(0.15)
            again = _box(page, identifier)
            if again and again["y"] == box["y"]:
                return page.locator(_sel(identifier)).first
            before = again
            continue
        if box and before and box["y"] == before["y"] and box["y"] >= 0 \
                and box["y"] + box["height"] <= height:
            return page.locator(_sel(identifier)).first  # fixed, or the list's very end
        at_x = x if x is not None else (box["x"] + min(box["width"] / 2, 40) if box
                                        else _pane_x(page))
        if box is None:
            turned += 1
            if turned % 25 == 0:  # not below: look above (and so on)
                down = not down
            step = 300 if down else -300
        else:
            step = 200 if box["y"] > TOP else -200
        before = box
        _wheel(page, at_x, height * 0.55, 0, step)
        wheeled = True
        time.sleep(0.2)
    _failed_shot(page, f"failed-find-{identifier.replace('/', '_')}.png")
    raise AssertionError(f"could not bring {identifier} into view")


_scroll_to = _find  # the older name


def _to_top(page, x: float | None = None) -> None:
    """Scroll the list under ``x`` back to its top."""
    at = (x if x is not None else _pane_x(page), page.viewport_size["height"] * 0.6)
    for _ in range(8):
        _wheel(page, *at, 0, -1500)
        time.sleep(0.15)
    time.sleep(0.5)


def _click(page, identifier: str, *, done: Callable[[], Any] | None = None,
           x: float | None = None, scroll: bool = True, up: bool = False,
           tries: int = 5) -> None:
    """Tap a control until the tap took.

    The control is found again before each tap (scrolled into view unless ``scroll`` is
    false; ``up``: look above first); a tap refused because the node moved or was replaced while the app redrew it is
    made again. With ``done`` (a check that the tap did its job) the tap is repeated until
    ``done()`` holds, and a control gone because ``done()`` already holds is fine.
    """
    last: Exception | None = None
    for attempt in range(tries):
        if done is not None and attempt and _true(done):
            return
        try:
            loc = _find(page, identifier, x, up=up, timeout=8) if scroll \
                else _wait(page, identifier, 8)
            loc.click(timeout=5000)
        except (sync_api.Error, AssertionError) as e:  # moved, replaced, or gone for now
            last = e
            time.sleep(0.3)
            continue
        if done is None:
            return
        try:
            _poll(done, bool, f"after tapping {identifier}", timeout=8)
            return
        except AssertionError as e:
            last = e
    if done is not None and _true(done):
        return
    raise AssertionError(f"tapping {identifier} did not take: {last}")


def _entry(page, identifier: str):
    """The text box (``input``, or ``textarea`` for a multi-line entry) inside an entry."""
    return page.locator(f"{_sel(identifier)} input, {_sel(identifier)} textarea").first


def _type_into(page, identifier: str, text: str, *, enter: bool = True) -> None:
    """Replace the text of an entry (and press Enter), once the entry holds exactly ``text``
    (Flutter may swap the focused input element, so keys sent too early can go astray)."""
    _find(page, identifier)
    field = _entry(page, identifier)
    for _ in range(5):
        try:
            field.click(position={"x": 60, "y": 20}, timeout=5000)  # the top line: the error
        except sync_api.Error:                                    # text sits lower
            _find(page, identifier)
            continue
        # the keyboard in this entry's own box: an entry typed into just before can still hold
        # the focus for a moment, and keys sent then would replace its text instead
        try:
            _poll(lambda: page.evaluate(
                "s => { const a = document.activeElement; return !!a && "
                "['INPUT', 'TEXTAREA'].includes(a.tagName) && !!a.closest(s); }", _sel(identifier)),
                bool, f"focus in {identifier}", 5)
        except AssertionError:
            continue
        _keys(page, press="Control+A")
        if text:
            _keys(page, text=text)
        else:  # emptied: the selection deleted
            _keys(page, press="Delete")
        try:
            _poll(lambda: page.evaluate("document.activeElement.value"), lambda v: v == text,
                  f"{identifier} holds the typed text", timeout=3)
            break
        except AssertionError:
            continue
    else:
        raise AssertionError(f"could not type {text!r} into {identifier}")
    if enter:
        _keys(page, press="Enter")


def _choose(page, identifier: str) -> None:
    """Tap a choice until the screen says it is chosen (no tap if it already is: a tap on a
    chosen choice unchooses it)."""
    _find(page, identifier)
    if _true(lambda: "(chosen)" in _words(page, identifier)):
        return
    _click(page, identifier, done=lambda: "(chosen)" in _words(page, identifier))


def _tab(page, name: str) -> None:
    """Show a tab of the column screen and wait until it says it is shown."""
    box = _box(page, f"tab-{name}")
    for _ in range(10):  # a tab row that scrolls sideways: bring the tab on screen
        if box is None or box["x"] + box["width"] <= page.viewport_size["width"]:
            break
        _wheel(page, page.viewport_size["width"] / 2, box["y"] + box["height"] / 2, 200, 0)
        time.sleep(0.2)
        box = _box(page, f"tab-{name}")
    try:
        # the tabs head the column screen: scrolled down past them, Flutter has dropped their
        # nodes, so look above first
        _click(page, f"tab-{name}", up=True,
               done=lambda: "(shown)" in _words(page, f"tab-{name}"))
    except AssertionError:
        _failed_shot(page, f"failed-tab-{name}.png")
        raise


def _open_column(page, identifier: str) -> None:
    """Tap a column row until its screen shows (a tap while the list still glides after a
    wheel scroll is taken as part of the scroll)."""
    time.sleep(0.3)  # let the list come to rest
    # a row not built yet is looked for with the wheel over the list (left of the column on a
    # tablet), not over the pane beside it
    x = LIST_W / 2 if page.viewport_size["width"] >= WIDE else None
    _click(page, identifier, x=x, done=lambda: page.locator(_sel("status")).count() > 0)


def _drawn(page, identifier: str) -> float:
    """How much the pixels inside a control vary (0 for a blank box): an image was drawn."""
    import io

    from PIL import Image, ImageStat

    png = page.locator(_sel(identifier)).first.screenshot(timeout=TIMEOUT * 1000)
    return max(ImageStat.Stat(Image.open(io.BytesIO(png)).convert("L")).stddev)


def _big_enough(page, *identifiers: str) -> None:
    """Touch targets usable with gloves: at least 48 px (Material guidance, common practice)."""
    for ident in identifiers:  # each wholly in view first: a control cut by an edge reads short
        _find(page, ident)
        box = _box(page, ident)
        assert box and box["height"] >= 48 and box["width"] >= 48, (ident, box)
