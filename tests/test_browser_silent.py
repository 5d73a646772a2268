"""The browser helpers end a test when the renderer goes silent, instead of holding it.

Headless chromium's software renderer has been seen to stop answering on this shared machine;
a helper that then waited on a call with no deadline (``count()`` inside ``_box``) held the
test until pytest-timeout's 420 s. Here a page's main thread is made to spin for ever (a
JavaScript loop that never yields: every DOM query, measure, evaluation and input event then
goes unanswered, as with a silent renderer) and each helper must end with ``Silent``, or with
its own timeout where playwright keeps one. The checks are on what is raised, not on how long
it took: a helper that still waited for ever would fail here by pytest-timeout.
"""

from __future__ import annotations

import signal
import time

import pytest

import _browser
from _browser import (  # noqa: F401  (browser is a fixture)
    PHONE, Silent, _answer, _box, _click, _find, _poll, _sel, _true, _type_into, _wait,
    _words, browser, sync_api,
)

PAGE = """<!doctype html><body style="margin:0">
<div flt-semantics-identifier="here" role="button" aria-label="here (shown)"
     style="position:absolute; left:20px; top:200px; width:120px; height:60px">Here</div>
<div flt-semantics-identifier="entry" style="position:absolute; left:20px; top:300px;
     width:200px; height:60px"><input style="width:180px"></div>
</body>"""


def test_an_answer_guard_gives_back_the_alarm_around_it():
    """An enclosing deadline (pytest-timeout's, or another guard) is set again as it was."""
    handler = signal.getsignal(signal.SIGALRM)
    with _answer("outer", 60):
        outer = signal.getsignal(signal.SIGALRM)
        with pytest.raises(Silent, match="inner"):
            with _answer("inner", 0.2):
                time.sleep(10)  # cut short by the alarm
        assert signal.getsignal(signal.SIGALRM) is outer
        left = signal.getitimer(signal.ITIMER_REAL)[0]
        assert 0 < left <= 60
    assert signal.getsignal(signal.SIGALRM) is handler
    # the enclosing deadline due first speaks, not the longer one inside it
    with pytest.raises(Silent, match="outer"):
        with _answer("outer", 0.2):
            with _answer("inner", 60):
                time.sleep(10)
    assert signal.getsignal(signal.SIGALRM) is handler


@pytest.fixture
def still_page(browser, monkeypatch):
    """A page whose main thread never yields again, with short deadlines for the helpers."""
    monkeypatch.setattr(_browser, "ANSWER", 2.0)
    monkeypatch.setattr(_browser, "TIMEOUT", 2.0)
    page = browser.new_context(viewport=PHONE).new_page()
    page.set_content(PAGE)
    # the helpers read this page while it answers: what fails later is the silence
    assert _box(page, "here")["height"] == 60
    assert "here (shown)" in _words(page, "here")
    assert _box(page, "nowhere") is None
    page.evaluate("setTimeout(() => { for (;;) {} }, 50)")
    time.sleep(0.5)  # the loop has started
    return page


def test_reads_end_with_silent(still_page):
    page = still_page
    with pytest.raises(Silent, match="measuring here"):
        _box(page, "here")
    with pytest.raises(Silent, match="reading the words"):
        _words(page, "here")
    # a test's own read inside a wait (a raw count() has no deadline)
    with pytest.raises(Silent, match="rows"):
        _poll(lambda: page.locator(_sel("here")).count(), lambda n: n > 3, "rows", timeout=1)
    with pytest.raises(Silent):
        _true(lambda: page.evaluate("1"))


def test_waits_and_taps_end_with_silent(still_page):
    page = still_page
    with pytest.raises(Silent):
        _find(page, "here")
    with pytest.raises(Silent):
        _click(page, "here", done=lambda: False)
    with pytest.raises(Silent):
        _type_into(page, "entry", "12 ft")
    # a wait with playwright's own deadline keeps it
    with pytest.raises(sync_api.TimeoutError):
        _wait(page, "elsewhere", 1)
