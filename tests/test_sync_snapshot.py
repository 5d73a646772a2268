"""An empty device's first sync takes the hub's records whole (``store/_snapshot``).

Checked against the other way to the same place: a device that pulls every operation one by
one (``take_whole=False``) must end with the same rows, conflicts and merge state, and both
must go on syncing as before. A snapshot file is checked before anything is written; each
hostile or damaged file below is refused with a reason naming it, and the store stays empty.
Real parts: a hub over HTTP on loopback, real SQLite files.
"""

from __future__ import annotations

import sqlite3
from pathlib import Path

import httpx
import pytest

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.store._snapshot import apply_snapshot, write_snapshot
from fieldcol.sync._loopback import RunningHub
from fieldcol.sync.client import sync_with_hub
from test_sync_hub import _col, _held, _jpeg, _same, _site


class _Paths(httpx.HTTPTransport):
    """Deliver requests, noting each path asked."""

    def __init__(self) -> None:
        super().__init__()
        self.paths: list[str] = []

    def handle_request(self, request: httpx.Request) -> httpx.Response:
        self.paths.append(request.url.path)
        return super().handle_request(request)


class _CutSnapshot(httpx.HTTPTransport):
    """Deliver requests, but cut the snapshot's download half way."""

    def handle_request(self, request: httpx.Request) -> httpx.Response:
        resp = super().handle_request(request)
        if request.url.path != "/v1/snapshot":
            return resp
        body = resp.read()

        def half():
            yield body[: len(body) // 2]
            raise httpx.ReadError("connection cut", request=request)

        return httpx.Response(200, headers=resp.headers, stream=_Stream(half()),
                              request=request)


class _Stream(httpx.SyncByteStream):
    def __init__(self, it):
        self.it = it

    def __iter__(self):
        yield from self.it


def _state(s: Store) -> dict[str, list]:
    """The merge's own state: every operation and every field's winner."""
    q = s.db.conn.execute
    return {"ops": sorted(q("SELECT op_id, device_id, hlc, tbl, row_id, field, value, seen "
                            "FROM sync_ops").fetchall()),
            "rows": sorted(q("SELECT tbl, row_id, max_hlc, pending FROM sync_rows").fetchall())}


def _busy_site(tmp_path: Path, hub: RunningHub) -> tuple[Store, str, Store, str]:
    """Two devices' records on the hub: columns, an edit each of one field (a conflict), a
    reading, a finding with a photo, a deleted column."""
    a, ta = Store(tmp_path / "a.db"), hub.token("a")
    b, tb = Store(tmp_path / "b.db"), hub.token("b")
    s = _site(a)
    col = _col(a, s.id, "C1")
    gone = _col(a, s.id, "C2")
    sync_with_hub(a, hub.url, ta)
    sync_with_hub(b, hub.url, tb)
    a.update_column(col.id, location="by the press")
    b.update_column(col.id, location="by the dock")
    b.add_measurement(col.id, "bow", "3/8 in", taken_by="R. Osei")
    f = a.add_finding(s.id, "flange pitted at the base plate", category="corrosion",
                      severity="medium", column_id=col.id)
    a.add_photo(_jpeg((120, 60, 30)), finding_id=f.id)
    a.delete("columns", gone.id)
    for dev, tok in ((a, ta), (b, tb), (a, ta)):
        sync_with_hub(dev, hub.url, tok)
    return a, ta, b, tb


def test_an_empty_device_takes_the_hubs_records_whole_and_ends_as_one_pulling_each_op(
        tmp_path: Path):
    hub = RunningHub(tmp_path / "hub")
    try:
        a, ta, b, tb = _busy_site(tmp_path, hub)
        whole, by_ops = Store(tmp_path / "whole.db"), Store(tmp_path / "ops.db")
        tw, to = hub.token("whole"), hub.token("ops")
        seen, steps = _Paths(), []
        rep = sync_with_hub(whole, hub.url, tw, transport=seen,
                            progress=lambda *step: steps.append(step))
        assert "/v1/snapshot" in seen.paths and rep.received == hub.hub.max_seq()
        assert rep.whole and "first sync: the hub's records came whole" in rep.lines()[1]
        # the download says how far it is, in bytes, to the whole file
        got = [(done, total) for step, done, total in steps if step == "records"]
        assert got and got[-1][0] == got[-1][1] > 10_000
        assert rep.photos_received == 1
        seen = _Paths()
        sync_with_hub(by_ops, hub.url, to, take_whole=False, transport=seen)
        assert "/v1/snapshot" not in seen.paths
        _same([a, b, whole, by_ops, _held(hub, tmp_path)])
        assert _state(whole) == _state(by_ops)
        assert len(whole.conflicts()) == 1  # the hub's conflict comes to review here too
        # the copied findings are in the full-text index (its triggers ran on the copy)
        assert [f.text for f in whole.search_findings("pitted")] == \
            ["flange pitted at the base plate"]
        # every operation arrived as the hub's: none goes back at the next push
        assert whole.db.conn.execute("SELECT DISTINCT source FROM sync_ops").fetchall() == \
            [("hub",)]
        cursor = f"pull:{hub.hub.hub_id}"
        assert whole.cursor(cursor) == hub.hub.max_seq()
        # and later syncs go operation by operation, both ways
        site = whole.list_sites()[0]
        whole.update_site(site.id, address="12 Kestrel Lane")
        c1 = [c for c in a.list_columns(site.id) if c.tag == "C1"][0]
        a.add_measurement(c1.id, "bow", "1/2 in", taken_by="R. Osei")
        seen = _Paths()
        sync_with_hub(whole, hub.url, tw, transport=seen)
        assert "/v1/snapshot" not in seen.paths
        for dev, tok in ((a, ta), (b, tb), (by_ops, to), (whole, tw)):
            sync_with_hub(dev, hub.url, tok)
        _same([a, b, whole, by_ops, _held(hub, tmp_path)])
        assert a.get_site(site.id).address == "12 Kestrel Lane"
        # the photo file came with its row, checked against its hash
        (p,) = whole.db.conn.execute("SELECT path FROM photos").fetchall()
        assert (whole.photos_dir / p[0]).is_file()
    finally:
        hub.stop()


def test_a_device_holding_records_pulls_operations_not_a_snapshot(tmp_path: Path):
    hub = RunningHub(tmp_path / "hub")
    try:
        a, ta, b, tb = _busy_site(tmp_path, hub)
        c = Store(tmp_path / "c.db")
        c.add_site("Gannet Quay Sheds", code="en1993-1-1", unit_system="si")
        seen = _Paths()
        sync_with_hub(c, hub.url, hub.token("c"), transport=seen)
        assert "/v1/snapshot" not in seen.paths
        assert {s.name for s in c.list_sites()} == {"Gannet Quay Sheds", a.list_sites()[0].name}
    finally:
        hub.stop()


def test_a_snapshot_cut_half_way_leaves_the_store_empty_and_the_next_sync_takes_it(
        tmp_path: Path):
    hub = RunningHub(tmp_path / "hub")
    try:
        a, ta, b, tb = _busy_site(tmp_path, hub)
        c, tc = Store(tmp_path / "c.db"), hub.token("c")
        with pytest.raises(InputError) as e:
            sync_with_hub(c, hub.url, tc, transport=_CutSnapshot())
        assert e.value.field == "hub" and "cannot reach" in e.value.reason
        assert c.holds_nothing() and c.cursor(f"pull:{hub.hub.hub_id}") == 0
        assert not list(tmp_path.glob(".fieldcol-snapshot-*"))  # the partial file is gone
        assert not list((tmp_path / "hub" / "snapshots").iterdir())  # and the hub's copy
        sync_with_hub(c, hub.url, tc)
        _same([a, b, c])
    finally:
        hub.stop()


# -- the file checked before anything is written ------------------------------------------------
@pytest.fixture
def snap(tmp_path: Path) -> Path:
    """A real snapshot of a store holding a site, columns, a reading, a photo."""
    with Store(tmp_path / "src.db") as s:
        site = _site(s)
        col = _col(s, site.id, "C1")
        s.add_measurement(col.id, "bow", "1/4 in", taken_by="R. Osei")
        s.add_photo(_jpeg((10, 80, 160)), column_id=col.id)
    write_snapshot(tmp_path / "src.db", tmp_path / "snap.db", hub_id="hub-1")
    return tmp_path / "snap.db"


def _edit(path: Path, *sql: str) -> None:
    con = sqlite3.connect(path)
    for q in sql:
        con.execute(q)
    con.commit()
    con.close()


def _refused(tmp_path: Path, snap: Path, *, hub_id: str = "hub-1") -> InputError:
    with Store(tmp_path / "dest.db") as d:
        with pytest.raises(InputError) as e:
            apply_snapshot(d, snap, hub_id=hub_id, cursor="pull:hub-1")
        assert d.holds_nothing() and d.cursor("pull:hub-1") == 0  # nothing written
    return e.value


def test_a_good_snapshot_is_taken_whole(tmp_path: Path, snap: Path):
    with Store(tmp_path / "dest.db") as d:
        got = apply_snapshot(d, snap, hub_id="hub-1", cursor="pull:hub-1")
        assert got.rows == 5 and got.ops == 5 and d.cursor("pull:hub-1") == got.seq == 5
        with Store(tmp_path / "src.db") as s:
            _same([s, d])


@pytest.mark.parametrize("sql, words", [
    (["CREATE VIEW odd AS SELECT 1"], "view odd"),
    (["CREATE TRIGGER t AFTER INSERT ON sites BEGIN SELECT 1; END"], "trigger t"),
    (["CREATE TABLE extra (x)"], "table extra"),
    (["ALTER TABLE sites ADD COLUMN x AS (upper(name))"], "table sites"),
    (["DROP TABLE visits", "CREATE VIRTUAL TABLE visits USING fts5(x)"], "table visits"),
    (["DROP TABLE sync_fields"], "no table sync_fields"),
    (["UPDATE snapshot_info SET value = '2' WHERE key = 'format'"], "of format ['2']"),
    (["UPDATE snapshot_info SET value = 'x' WHERE key = 'seq'"], "sequence number 'x'"),
    (["UPDATE photos SET path = '../../../etc/passwd'"], "not a photo file name"),
    (["UPDATE sync_ops SET value = '{\"colour\": \"red\"}' WHERE tbl = 'sites'"], "colour"),
    (["UPDATE sync_ops SET value = 'not json' WHERE tbl = 'columns'"], "JSON"),
    (["UPDATE sync_ops SET tbl = 'secrets' WHERE tbl = 'sites'"], "not a synced table"),
    (["DELETE FROM sites"], "do not fit this store"),  # its columns' site is missing
])
def test_a_hostile_or_damaged_snapshot_is_refused_and_nothing_written(tmp_path: Path,
                                                                      snap: Path, sql, words):
    _edit(snap, *sql)
    e = _refused(tmp_path, snap)
    assert words in str(e) and e.field.startswith("snap"), str(e)


def test_a_snapshot_from_another_hub_or_a_newer_fieldcol_is_refused(tmp_path: Path, snap: Path):
    assert "another hub" in _refused(tmp_path, snap, hub_id="hub-2").reason
    _edit(snap, "INSERT INTO snapshot_info VALUES ('schema', 'm999_from_the_future')")
    e = _refused(tmp_path, snap)
    assert e.field == "schema" and "older than the hub's" in e.reason


def test_a_truncated_or_foreign_file_is_refused(tmp_path: Path, snap: Path):
    data = snap.read_bytes()
    snap.write_bytes(data[: len(data) // 3])
    assert _refused(tmp_path, snap).field == "snapshot"
    snap.write_bytes(b"PK\x03\x04 not a database at all")
    assert "not a snapshot" in _refused(tmp_path, snap).reason


def test_a_store_holding_records_never_takes_a_snapshot(tmp_path: Path, snap: Path):
    with Store(tmp_path / "dest.db") as d:
        _site(d)
        with pytest.raises(InputError) as e:
            apply_snapshot(d, snap, hub_id="hub-1", cursor="pull:hub-1")
        assert "holds records already" in e.value.reason and len(d.list_sites()) == 1


def test_a_row_waiting_for_its_parent_on_the_hub_waits_on_the_device_and_lands_with_it(
        tmp_path: Path):
    hub = RunningHub(tmp_path / "hub")
    try:
        with Store(tmp_path / "a.db") as a:
            site = _site(a)
            _col(a, site.id, "C1")
            ops = a.ops_after(0, 100)
        site_ops = [o for o in ops if o.tbl == "sites"]
        rest = [o for o in ops if o.tbl != "sites"]
        held = hub.hub.store
        assert held.apply_ops(rest, source="bundle").pending == 1  # the column waits
        d, td = Store(tmp_path / "d.db"), hub.token("d")
        seen = _Paths()
        sync_with_hub(d, hub.url, td, transport=seen)
        assert "/v1/snapshot" in seen.paths
        assert d.list_sites() == [] and d.db.conn.execute(
            "SELECT count(*) FROM sync_rows WHERE pending = 1").fetchone()[0] == 1
        held.apply_ops(site_ops, source="bundle")  # the site arrives at the hub
        sync_with_hub(d, hub.url, td)
        assert [c.tag for c in d.list_columns(d.list_sites()[0].id)] == ["C1"]
        _same([d, held])
    finally:
        hub.stop()
