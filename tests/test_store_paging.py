"""A site's column list in pages by (tag, id), searched by tag and filtered by level and status,
on a site of a few thousand columns.

Outside reference: Python's own ``sorted`` and ``str`` operations give the expected order and
matches (a tag search ignores ASCII case, as SQLite's LIKE does); "over capacity" is a
utilization above 1.0 (demand / design strength, common practice).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.ui import model as m

N = 2400


@pytest.fixture(scope="module")
def big(tmp_path_factory):
    path = tmp_path_factory.mktemp("paging") / "big.db"
    with Store(path) as s:
        site = s.add_site("Gantry Yard Store", code="aisc360-22", unit_system="us")
        expected = []
        with s.transaction():  # one transaction: a few thousand rows in a second or two
            for i in range(N):
                tag = f"{'ABCDEFGH'[i % 8]}/{i // 8 + 1}-{'L1' if i % 3 else 'L2'}"
                col = s.add_column(site.id, {"tag": tag, "section": "W10X49", "length": "14 ft"},
                                   level="L1" if i % 3 else "L2")
                u = None if i % 5 == 0 else (1.2 if i % 7 == 0 else 0.6)
                if u is not None:
                    s.save_check(col.id, {"utilization": u, "governing_mode": "flexural-weak"})
                expected.append((tag, col.id, "L1" if i % 3 else "L2", u))
        yield s, site, expected


def _walk(store, site_id, limit, **filters):
    seen, after = [], None
    while True:
        rows = store.page_columns(site_id, after=after, limit=limit, **filters)
        seen += [(r.tag, r.id) for r in rows]
        if len(rows) < limit:
            return seen
        after = (rows[-1].tag, rows[-1].id)


def test_keyset_pages_cover_every_column_once_in_order(big):
    store, site, expected = big
    want = sorted((t, i) for t, i, _, _ in expected)
    assert _walk(store, site.id, 100) == want
    assert _walk(store, site.id, 1000) == want


def test_search_level_and_status_filters(big):
    store, site, expected = big
    assert _walk(store, site.id, 300, search="c/1") == sorted(
        (t, i) for t, i, _, _ in expected if "c/1" in t.lower())
    assert _walk(store, site.id, 300, level="L2") == sorted(
        (t, i) for t, i, lv, _ in expected if lv == "L2")
    assert _walk(store, site.id, 300, status="over") == sorted(
        (t, i) for t, i, _, u in expected if u is not None and u > 1.0)
    assert _walk(store, site.id, 300, status="ok") == sorted(
        (t, i) for t, i, _, u in expected if u is not None and u <= 1.0)
    assert _walk(store, site.id, 300, status="not-checked", level="L1") == sorted(
        (t, i) for t, i, lv, u in expected if u is None and lv == "L1")
    # a typed % or _ is a character of the tag, not a pattern
    assert store.page_columns(site.id, search="%") == []
    assert store.page_columns(site.id, search="_") == []


def test_the_app_list_pages_and_filters(big):
    store, site, expected = big
    page = m.column_page(store, site.id, limit=50)
    assert len(page.rows) == 50 and page.has_more and page.levels == ("L1", "L2")
    page = m.next_page(store, page, limit=50)
    want = sorted((t, i) for t, i, _, _ in expected)
    assert [(r.tag, r.id) for r in page.rows] == want[:100]
    over = m.column_page(store, site.id, status="over", limit=1000)
    assert all(r.status.word == "OVER" for r in over.rows) and over.filtered
    again = m.same_page_again(store, page)
    assert [r.id for r in again.rows] == [r.id for r in page.rows]


def test_bad_paging_requests_name_the_field(big):
    store, site, _ = big
    for kwargs, field in (({"limit": 0}, "limit"), ({"after": ("A/1",)}, "after"),
                          ({"status": "red"}, "status")):
        with pytest.raises(InputError) as e:
            store.page_columns(site.id, **kwargs)
        assert e.value.field == field


def test_an_empty_store_pages_to_nothing(tmp_path: Path):
    with Store(tmp_path / "e.db") as s:
        site = s.add_site("Empty Shed", code="aisc360-22", unit_system="us")
        assert s.page_columns(site.id) == []
        assert m.column_page(s, site.id).rows == []
