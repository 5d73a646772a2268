"""Photos, markup, findings and retrofit options in a real browser: `fieldcol app --demo` on
loopback, Debian chromium driven by Playwright, every request leaving the machine refused.

A photo goes in through the browser's own file chooser (the file upload the app makes in web
mode), is kept by the server, marked up with a tap per shape, and the store file is read back
with the standard library's sqlite3 to see what was kept. Screenshots go where
``FIELDCOL_SHOTS`` points (default /tmp/fieldcol-shots): ``photo-attach.png``,
``photo-markup.png``, ``retrofit-compare.png`` (and ``retrofit-sweep.png``), at 390 px and
820 px wide. Waits poll with a timeout; the only fixed pauses are ~1 s before screenshots.

Outside references: SQLite (via Python's sqlite3) and JSON (RFC 8259, via ``json``) read what
the app saved; Pillow makes the photo and reads the uploaded copy's size back.
"""

from __future__ import annotations

import io
import json
import os
import re
import shutil
import socket
import sqlite3
import subprocess
import sys
import time
from pathlib import Path
from urllib.parse import urlparse

import pytest
from PIL import Image, ImageDraw

from playwright import sync_api  # noqa: E402  (the test extra installs it)

CHROMIUM = shutil.which("chromium")
if CHROMIUM is None:
    raise RuntimeError("Debian chromium is not installed: apt-get install -y chromium")

from fieldcol import CAUTION  # noqa: E402

SHOTS = Path(os.environ.get("FIELDCOL_SHOTS") or "/tmp/fieldcol-shots")
ARGS = ["--no-sandbox", "--enable-unsafe-swiftshader", "--disable-gpu", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync"]
SIZES = {"phone": {"width": 390, "height": 844}, "tablet": {"width": 820, "height": 1180}}
TIMEOUT = 30.0  # s, for any one thing to appear (the machine is shared)


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@pytest.fixture(scope="module")
def server(tmp_path_factory):
    """`fieldcol app --db TMP --port FREE --demo` in a subprocess; yields (base URL, db)."""
    port = _free_port()
    db = tmp_path_factory.mktemp("photos") / "ui.db"
    log = open(db.with_suffix(".log"), "w")
    env = {**os.environ, "FLET_FORCE_WEB_SERVER": "true"}
    proc = subprocess.Popen([sys.executable, "-m", "fieldcol", "app", "--db", str(db),
                             "--port", str(port), "--demo"], stdout=log, stderr=subprocess.STDOUT,
                            env=env)
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
        yield f"http://127.0.0.1:{port}", db
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


def _open(browser, base: str, viewport: dict):
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
    page.goto(base + "/")
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


def _words(page, identifier: str) -> str:
    return page.locator(_sel(identifier)).first.evaluate(
        "e => [e.innerText, ...[e, ...e.querySelectorAll('[aria-label]')]"
        ".map(x => x.getAttribute('aria-label'))].filter(Boolean).join(' ')", timeout=2000)


def _shot(page, name: str) -> None:
    SHOTS.mkdir(parents=True, exist_ok=True)
    time.sleep(1)  # let the last frame paint
    page.screenshot(path=str(SHOTS / name))


def _find(page, identifier: str):
    """The control, scrolled wholly into view: a list builds only what is near the screen, so
    the mouse wheel goes down (then up) until it is there."""
    loc = page.locator(_sel(identifier)).first
    height = page.viewport_size["height"]
    page.mouse.move(page.viewport_size["width"] / 2, height * 0.6)
    deadline = time.monotonic() + TIMEOUT
    step = 250
    while time.monotonic() < deadline:
        box = loc.bounding_box() if page.locator(_sel(identifier)).count() else None
        if box and box["y"] >= 56 and box["y"] + box["height"] <= height:
            return loc
        if box is not None:
            step = 150 if box["y"] > 56 else -150
        page.mouse.wheel(0, step)
        time.sleep(0.25)
    raise AssertionError(f"{identifier} not found on screen")


def _click(page, identifier: str) -> None:
    _find(page, identifier).click()


def _choose(page, identifier: str) -> None:
    """Tap a choice and wait until the screen says it is chosen."""
    _click(page, identifier)
    _poll(lambda: _words(page, identifier), lambda t: "(chosen)" in t, f"{identifier} chosen")


def _type_into(page, identifier: str, text: str) -> None:
    _find(page, identifier)
    field = page.locator(f"{_sel(identifier)} input, {_sel(identifier)} textarea").first
    for _ in range(5):
        field.click(position={"x": 60, "y": 20})
        _poll(lambda: page.evaluate("document.activeElement && document.activeElement.tagName"),
              lambda tag: tag in ("INPUT", "TEXTAREA"), f"focus in {identifier}")
        page.keyboard.press("Control+A")
        page.keyboard.type(text)
        try:
            _poll(lambda: page.evaluate("document.activeElement.value"), lambda v: v == text,
                  f"{identifier} holds the typed text", timeout=3)
            return
        except AssertionError:
            continue
    raise AssertionError(f"could not type {text!r} into {identifier}")


def _photo(path: Path, shade: int) -> Path:
    """A photo of a steel flange with a dark crack across it, made with Pillow (``shade``
    makes each test's photo its own: the store keeps a photo once by its content)."""
    img = Image.new("RGB", (800, 600), (188, 190, shade))
    d = ImageDraw.Draw(img)
    d.rectangle([300, 0, 500, 600], fill=(84, 88, 94))
    d.line([(330, 380), (420, 330), (470, 350)], fill=(20, 20, 20), width=6)
    img.save(path, "JPEG", quality=90)
    return path


def _column(page, tag: str) -> None:
    _click(page, "site-Kestrel Lane Print Works")
    _click(page, f"column-{tag}")
    _wait(page, "status")


def _db_rows(db: Path, sql: str, params=()):
    with sqlite3.connect(f"file:{db}?mode=ro", uri=True, timeout=10) as c:
        return c.execute(sql, params).fetchall()


@pytest.mark.parametrize("size", ["phone", "tablet"])
def test_photo_of_a_defect_then_marked_up(server, browser, tmp_path, size):
    base, db = server
    page = _open(browser, base, SIZES[size])
    tag = "A/1-G" if size == "phone" else "B/1-G"
    _column(page, tag)
    _click(page, "tab-findings")
    _wait(page, "photo-defect")
    # no error box anywhere on the tab (a hidden note inside a Semantics drew one)
    assert "must be provided" not in page.locator("body").inner_text()
    photo = _photo(tmp_path / f"IMG_{size}.jpg", 180 if size == "phone" else 200)
    with page.expect_file_chooser(timeout=TIMEOUT * 1000) as chooser:
        _click(page, "photo-defect")
    chooser.value.set_files(str(photo))
    _poll(lambda: _words(page, "save-note"), lambda t: "Saved" in t, "the photo finding saved")
    _wait(page, "finding-text")  # the new finding opens for its one line of words
    words = f"Crack at the weld toe ({size})"
    _type_into(page, "finding-text", words)
    _click(page, "save-finding")
    card = _wait(page, "finding-0")
    _poll(lambda: _words(page, "finding-0"), lambda t: words in t, "the finding with its words")
    _wait(page, "photo-f0-0")
    _shot(page, f"photo-attach{'' if size == 'phone' else '-tablet'}.png")
    rows = _db_rows(db, "SELECT f.text, p.original_name, p.width FROM findings f "
                        "JOIN photo_links l ON l.finding_id = f.id JOIN photos p "
                        "ON p.id = l.photo_id WHERE f.text = ?", [words])
    assert rows == [(words, photo.name, 800)], rows
    assert card is not None

    # mark it up: an arrow and a circle where tapped, and a label
    _click(page, "photo-f0-0")
    _wait(page, "photo-large")
    _click(page, "photo-markup")
    surface = _wait(page, "markup-surface")
    box = surface.bounding_box()
    surface.click(position={"x": box["width"] * 0.5, "y": box["height"] * 0.58})
    _poll(lambda: _words(page, "markup-note"), lambda t: "1 arrow" in t, "an arrow drawn")
    _choose(page, "markup-circle")
    surface = _wait(page, "markup-surface")
    surface.click(position={"x": box["width"] * 0.5, "y": box["height"] * 0.58})
    _poll(lambda: _words(page, "markup-note"), lambda t: "1 circle" in t, "a circle drawn")
    _choose(page, "markup-label")
    _type_into(page, "markup-label-text", "crack")
    surface = _wait(page, "markup-surface")
    surface.click(position={"x": box["width"] * 0.15, "y": box["height"] * 0.2})
    _poll(lambda: _words(page, "markup-note"), lambda t: '"crack"' in t, "a label drawn")
    _shot(page, f"photo-markup-editing{'' if size == 'phone' else '-tablet'}.png")
    _click(page, "markup-save")
    _poll(lambda: _words(page, "photo-large"), lambda t: "1 arrow" in t, "markup saved")
    _shot(page, f"photo-markup{'' if size == 'phone' else '-tablet'}.png")
    (raw,) = _db_rows(db, "SELECT p.markup FROM photos p WHERE p.original_name = ?",
                      [photo.name])[0:1]
    shapes = json.loads(raw[0])
    assert [s["kind"] for s in shapes] == ["arrow", "circle", "label"]
    assert shapes[1]["at"] == pytest.approx([0.5, 0.58], abs=0.08)  # where it was tapped
    assert shapes[0]["to"] == shapes[1]["at"] and shapes[2]["text"] == "crack"
    assert shapes[2]["at"] == pytest.approx([0.15, 0.2], abs=0.08), shapes
    # the photo kept is the file sent, untouched
    (path,) = _db_rows(db, "SELECT path FROM photos WHERE original_name = ?", [photo.name])
    kept = db.parent / f"{db.stem}-photos" / path[0]
    assert kept.read_bytes() == photo.read_bytes()
    with Image.open(io.BytesIO(kept.read_bytes())) as im:
        assert im.size == (800, 600)
    assert all(urlparse(u).hostname not in ("127.0.0.1", "localhost") for u in page.refused)
    page.context.close()


@pytest.mark.parametrize("size", ["phone", "tablet"])
def test_build_compare_keep_and_sweep_a_retrofit_option(server, browser, size):
    base, db = server
    page = _open(browser, base, SIZES[size])
    tag = "C/4-G" if size == "phone" else "A/2-G"
    _column(page, tag)
    _click(page, "tab-retrofit")
    assert CAUTION in _words(page, "caution")
    _click(page, "option-kind-brace")
    _click(page, "option-axis-weak")
    _type_into(page, "option-at", "90 ft")
    _click(page, "option-compare")
    _poll(lambda: _words(page, "retrofit-note"), lambda t: "not between the ends" in t,
          "a height above the top is refused in plain words")
    _type_into(page, "option-at", "7 ft")
    _click(page, "option-compare")
    compared = _wait(page, "retrofit-compare")
    words = _poll(lambda: _words(page, "retrofit-compare"),
                  lambda t: "As it stands" in t and "With the option" in t, "side by side")
    assert re.search(r"\d+ kip", words) and "governs" in words.lower()
    assert compared is not None
    _shot(page, f"retrofit-compare{'' if size == 'phone' else '-tablet'}.png")
    _click(page, "option-keep")
    _poll(lambda: _words(page, "save-note"), lambda t: "Saved" in t, "option kept")
    assert page.locator(_sel("retrofit-compare")).count() == 1  # still side by side
    _find(page, "retrofit-0-line")
    (row,) = _db_rows(db, "SELECT r.option FROM retrofits r JOIN columns c "
                          "ON c.id = r.column_id WHERE c.tag = ? AND r.deleted_at IS NULL", [tag])
    assert json.loads(row[0]) == {"kind": "brace", "axis": "weak", "at": "7 ft"}
    _click(page, "sweep-run")
    _wait(page, "sweep-chart")
    chart = _find(page, "sweep-chart")
    _poll(lambda: _words(page, "sweep-chart"), lambda t: "at most" in t, "the sweep")
    assert chart.bounding_box()["width"] >= 280
    _shot(page, f"retrofit-sweep{'' if size == 'phone' else '-tablet'}.png")
    page.context.close()
