"""A reload at a column's address in a real browser: `fieldcol app --demo` on loopback,
Debian chromium driven by Playwright, every request that leaves the machine refused.

The browser's own reload (a new session at the same address, as on a phone that dropped the
page) shows that column again, on a phone (390 px) and a tablet (820 px); once the column is
deleted (here by another connection to the same store file, as a sync would), the same reload
shows the sites with the reason in the save bar, as does an address that never held a
column. Screenshots `reload-column.png`, `reload-column-tablet.png`,
`reload-deleted.png` go to $FIELDCOL_SHOTS.
"""

from __future__ import annotations

from urllib.parse import urlparse

import pytest

from _browser import (  # noqa: F401  (browser, served and server_db are fixtures)
    PHONE, STATUS, TABLET, TIMEOUT, _answer, _click, _offline, _open, _open_column, _poll,
    _shot, _wait, _words, browser, served, server_db,
)
from fieldcol.store import open_store


def _reload(page) -> None:
    """The browser's reload: a new session at the same address, semantics on again."""
    page.reload(timeout=TIMEOUT * 1000)
    page.wait_for_selector("flt-semantics-placeholder", state="attached",
                           timeout=TIMEOUT * 1000)
    with _answer("turning on semantics"):
        page.evaluate("document.querySelector('flt-semantics-placeholder').click()")


@pytest.mark.parametrize("viewport, shot", [(PHONE, "reload-column.png"),
                                            (TABLET, "reload-column-tablet.png")])
def test_a_reload_at_a_column_shows_that_column(browser, server_db, viewport, shot):
    base, _db = server_db
    page = _open(browser, base, viewport)
    _click(page, "site-Kestrel Lane Print Works")
    _wait(page, "column-A/1-G")
    _open_column(page, "column-A/1-G")
    _poll(lambda: _words(page, "status"), lambda t: STATUS.search(t), "the column's status")
    # the column is drawn at once and the address follows it
    route = _poll(lambda: urlparse(page.url).path, lambda p: p.startswith("/columns/"),
                  "the column's address")
    _reload(page)
    status = _poll(lambda: _words(page, "status"), lambda t: STATUS.search(t),
                   "the column's status after the reload")
    assert STATUS.search(status).group(0) == "0.37 OK"   # the demo's A/1-G
    _poll(lambda: page.get_by_text("A/1-G").count(), lambda n: n > 0, "the column's tag")
    assert urlparse(page.url).path == route
    _shot(page, shot)
    _offline(page)
    page.context.close()


def test_a_reload_at_a_deleted_column_shows_the_sites_and_says_why(browser, server_db):
    base, db = server_db
    with open_store(db) as store:
        site = store.site_by_name("Kestrel Lane Print Works")
        cid = store.find_column(site.id, "A/2-G").id
    page = _open(browser, base, PHONE, f"/columns/{cid}")   # the column's own address
    _poll(lambda: _words(page, "status"), lambda t: STATUS.search(t), "the column's status")
    with open_store(db) as store:
        store.delete("columns", cid)
    _reload(page)
    _poll(lambda: _words(page, "save-note"),
          lambda t: "Column A/2-G was deleted: the sites are shown." in t, "why the sites show")
    _wait(page, "site-Kestrel Lane Print Works")
    assert page.locator('[flt-semantics-identifier="status"]').count() == 0
    _shot(page, "reload-deleted.png")
    # an address this device never held: the sites as well
    page.goto(base + "/columns/00000000-0000-7000-8000-000000000000", timeout=TIMEOUT * 1000)
    page.wait_for_selector("flt-semantics-placeholder", state="attached",
                           timeout=TIMEOUT * 1000)
    with _answer("turning on semantics"):
        page.evaluate("document.querySelector('flt-semantics-placeholder').click()")
    _poll(lambda: _words(page, "save-note"),
          lambda t: "No column at that address on this device" in t, "why the sites show")
    _wait(page, "site-Kestrel Lane Print Works")
    _offline(page)
    page.context.close()
