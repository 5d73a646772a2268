"""Findings and their full-text search (SQLite FTS5), with tombstones hidden."""

from __future__ import annotations

from pathlib import Path

import pytest

from fieldcol.errors import InputError
from fieldcol.store import Store


@pytest.fixture
def setup(tmp_path: Path):
    with Store(tmp_path / "f.db") as s:
        a = s.add_site("Bus Garage", code="aisc360-22", unit_system="us")
        b = s.add_site("Cold Store", code="en1993-1-1", unit_system="si")
        col = s.add_column(a.id, {"tag": "G/7"})
        yield s, a, b, col


def test_search_words_prefixes_sites_and_tombstones(setup):
    s, a, b, col = setup
    f1 = s.add_finding(a.id, "Heavy corrosion at base plate, flange pitted", category="corrosion",
                       severity="high", column_id=col.id)
    f2 = s.add_finding(a.id, "Brace clip bolts missing", category="bracing", severity="medium")
    f3 = s.add_finding(b.id, "Surface corrosion on cap plate", category="corrosion",
                       severity="low")
    assert {f.id for f in s.search_findings("corrosion")} == {f1.id, f3.id}
    assert [f.id for f in s.search_findings("corro", site_id=a.id)] == [f1.id]
    assert [f.id for f in s.search_findings("base plate")] == [f1.id]
    assert [f.id for f in s.search_findings("bracing")] == [f2.id]  # category is indexed
    assert [f.id for f in s.search_findings('"bolts" (missing) AND OR NEAR*')] == []
    s.update_finding(f2.id, text="Brace clip bolts replaced", status="closed")
    assert [f.id for f in s.search_findings("replaced")] == [f2.id]
    assert s.search_findings("missing") == []  # the index followed the edit
    assert [f.id for f in s.list_findings(a.id, status="open")] == [f1.id]
    s.delete("findings", f1.id)
    assert [f.id for f in s.search_findings("corrosion")] == [f3.id]
    for q in ("", "  ", "?!"):
        with pytest.raises(InputError) as e:
            s.search_findings(q)
        assert e.value.field == "query"


def test_finding_rules(setup):
    s, a, b, col = setup
    for kw, field in [(dict(severity="severe"), "severity"), (dict(status="pending"), "status"),
                      (dict(category=""), "category")]:
        args = dict(category="c", severity="low") | kw
        with pytest.raises(InputError) as e:
            s.add_finding(a.id, "text", **args)
        assert e.value.field == field
    with pytest.raises(InputError) as e:
        s.add_finding(b.id, "wrong site", category="c", severity="low", column_id=col.id)
    assert e.value.field == "column"
    assert s.list_findings(a.id) == [] and s.list_findings(b.id) == []
