"""Photos, markup, findings and retrofit options in a real browser: `fieldcol app --demo` on
loopback, Debian chromium driven by Playwright, every request leaving the machine refused.

A photo goes in through the browser's own file chooser (the file upload the app makes in web
mode), is kept by the server, marked up with a tap per shape, and the store file is read back
with the standard library's sqlite3 to see what was kept. Screenshots go where
``FIELDCOL_SHOTS`` points (helpers in ``tests/_browser.py``): ``photo-attach.png``,
``photo-markup.png``, ``retrofit-compare.png`` (and ``retrofit-sweep.png``), at 390 px and
820 px wide. Waits poll with a timeout; the only fixed pauses are ~1 s before screenshots.

Outside references: SQLite (via Python's sqlite3) and JSON (RFC 8259, via ``json``) read what
the app saved; Pillow makes the photo and reads the uploaded copy's size back.
"""

from __future__ import annotations

import io
import json
import re
import sqlite3
from pathlib import Path

import pytest
from PIL import Image, ImageDraw

from _browser import (  # noqa: F401  (browser is a fixture)
    SIZES, TIMEOUT, _choose, _click, _find, _offline, _open, _open_column, _poll, _sel, _shot, _tab,
    _type_into,
    _wait, _words, app_server, browser, served,
    server_db as server,
)
from fieldcol import CAUTION


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
    _open_column(page, f"column-{tag}")
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
    _tab(page, "findings")
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
    _type_into(page, "finding-text", words, enter=False)
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
    _type_into(page, "markup-label-text", "crack", enter=False)
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
    _offline(page)
    page.context.close()


@pytest.mark.parametrize("size", ["phone", "tablet"])
def test_build_compare_keep_and_sweep_a_retrofit_option(server, browser, size):
    base, db = server
    page = _open(browser, base, SIZES[size])
    tag = "C/4-G" if size == "phone" else "A/2-G"
    _column(page, tag)
    _tab(page, "retrofit")
    assert CAUTION in _words(page, "caution")
    _choose(page, "option-kind-brace")
    # the axis starts on the one that governs (weak for both columns): nothing to tap
    _find(page, "option-axis-weak")
    assert "(chosen)" in _words(page, "option-axis-weak")
    _type_into(page, "option-at", "90 ft", enter=False)
    _click(page, "option-compare")
    _poll(lambda: _words(page, "retrofit-note"), lambda t: "not between the ends" in t,
          "a height above the top is refused in plain words")
    _type_into(page, "option-at", "7 ft", enter=False)
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
    chart = _find(page, "sweep-chart")  # drawn below the button: scrolled to (a list builds
                                         # only what is near the screen)
    _poll(lambda: _words(page, "sweep-chart"), lambda t: "at most" in t, "the sweep")
    assert chart.bounding_box()["width"] >= 280
    _shot(page, f"retrofit-sweep{'' if size == 'phone' else '-tablet'}.png")
    page.context.close()
