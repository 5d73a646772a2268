"""The invented demo site: complete, varied, and built only once however often it is run."""

from __future__ import annotations

from pathlib import Path

import pytest
from PIL import Image

from fieldcol.cli import CAUTION, main
from fieldcol.store import Store

pytest.importorskip("fieldcol.assess")
from fieldcol.assess import assess  # noqa: E402
from fieldcol.demo import SITE_NAME, build_demo  # noqa: E402


def _counts(s: Store) -> dict[str, int]:
    return {t: s.db.conn.execute(f"SELECT count(*) FROM {t}").fetchone()[0]
            for t in ("sites", "visits", "levels", "columns", "measurements",
                      "restraint_changes", "findings", "photos", "photo_links", "checks",
                      "retrofits")}


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    path = tmp_path_factory.mktemp("demo") / "demo.db"
    with Store(path) as s:
        first = build_demo(s)
        counts = _counts(s)
        second = build_demo(s)
        yield s, first, second, counts


def test_twice_adds_nothing(demo):
    s, first, second, counts = demo
    assert first.added > 50 and second.added == 0
    assert _counts(s) == counts
    assert len(s.list_sites()) == 1 and s.list_sites()[0].name == SITE_NAME


def test_varied_columns_and_results(demo):
    s, first, _, _ = demo
    rows = s.list_columns(first.site_id)
    assert 20 <= len(rows) <= 30 and first.skipped == {}
    sections = {r.section for r in rows}
    for prefix in ("W", "HP", "HSS", "Pipe", "measured I"):
        assert any(x.startswith(prefix) for x in sections), prefix
    assert any(x.endswith("with loss") for x in sections)
    records = [s.current_record(r.id) for r in rows]
    assert any(r["material"] in ("A7", "A9") for r in records)
    assert any(isinstance(r["section"], dict) and r["section"].get("welded") for r in records)
    utils = [r.utilization for r in rows]
    assert all(u is not None for u in utils)
    assert any(u < 0.5 for u in utils) and any(u > 1.0 for u in utils)
    assert sum("brace-not-qualified" in w for w in first.warnings.values()) == 1
    assert any("bow-over-tolerance" in w for w in first.warnings.values())


def test_history_photos_and_checks(demo):
    s, first, _, _ = demo
    site = first.site_id
    kinds = {rc.kind for r in s.list_columns(site) for rc in s.restraint_changes(r.id)}
    assert {"brace_added", "cable_found", "end_condition_changed"} <= kinds
    d2 = s.find_column(site, "D/2-G")
    history = s.measurements(d2.id, "section.loss.flange")
    assert len(history) == 2 and history[1].corrects == history[0].id
    assert s.current_record(d2.id)["section"]["loss"]["flange"] == "0.33 in"
    bowed = s.find_column(site, "B/2-G")
    assert "condition" in s.current_record(bowed.id)
    assert s.list_findings(site, column_id=bowed.id)[0].category == "bow"
    assert s.search_findings("corroded", site_id=site)
    with_photos = [f for f in s.list_findings(site) if s.photos_of(finding_id=f.id)]
    assert len(with_photos) >= 5
    p = s.photos_of(finding_id=with_photos[0].id)[0]
    assert p.exif_taken_at and p.exif_taken_at.startswith("2026-")
    with Image.open(s.photo_path(p)) as img:
        assert img.format == "JPEG"
    assert s.retrofits(s.find_column(site, "C/3-G").id)
    # a saved check holds what it needs to be reproduced
    chk = s.latest_check(s.find_column(site, "C/3-G").id)
    assert chk.code == "aisc360-22" and chk.edition and chk.app_version
    again = assess(chk.record).to_dict()
    assert again["utilization"]["value"] == pytest.approx(chk.utilization, rel=1e-12)
    assert again["governing_mode"] == chk.governing_mode


def test_demo_command(tmp_path: Path, capsys):
    db = str(tmp_path / "d.db")
    assert main(["demo", "--db", db]) == 0
    out = capsys.readouterr().out
    assert SITE_NAME in out and CAUTION in out and "over capacity" in out
    assert main(["demo", "--db", db]) == 0
    assert "0 rows added" in capsys.readouterr().out
