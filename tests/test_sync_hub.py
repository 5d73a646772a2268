"""Devices syncing through a real office hub over HTTP on loopback (uvicorn in a thread).

Every test taking the ``hub`` fixture runs twice: over the SQLite hub and over PostgreSQL (a
real server started by ``tests/conftest.py``).

What is checked is the behaviour every replicated store must show (common practice): replicas
end identical whatever the sync order, nothing is lost to cuts, repeats or replays.
"""

from __future__ import annotations

import hashlib
import io
import itertools
import json
import random
import shutil
from pathlib import Path

import httpx
import pytest
from PIL import Image

from fieldcol.cli import main
from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.sync import client
from fieldcol.sync.client import sync_with_hub

from fieldcol.sync._loopback import RunningHub
from test_sync_oplog import dump

SITE = "Kestrel Lane Print Works"


@pytest.fixture(params=["sqlite", "postgresql"])
def hub(request: pytest.FixtureRequest, tmp_path: Path):
    db = request.getfixturevalue("pg_database") if request.param == "postgresql" else None
    h = RunningHub(tmp_path / "hub", db)
    yield h
    h.stop()


def _held(hub: RunningHub, tmp_path: Path) -> Store:
    """What the hub holds, as a store: the SQLite hub's own merged store, or for PostgreSQL
    (which keeps operations, not records) a new store given every operation the hub holds."""
    if hasattr(hub.hub, "store"):
        return hub.hub.store
    n = len(list(tmp_path.glob("held-*.db")))
    s = Store(tmp_path / f"held-{n}.db")
    s.apply_ops([op for _, op in hub.hub.pull(0, 10**7)], source="hub", max_future_ms=None)
    return s


def _site(s: Store):
    return s.add_site(SITE, code="aisc360-22", unit_system="us")


def _col(s: Store, site_id: str, tag: str):
    return s.add_column(site_id, {"tag": tag, "section": "W10X49", "length": "14 ft"})


def _jpeg(colour: tuple[int, int, int], size: int = 64) -> bytes:
    buf = io.BytesIO()
    rng = random.Random(sum(colour))
    img = Image.new("RGB", (size, size), colour)
    for _ in range(size):  # some noise so the file is not tiny
        img.putpixel((rng.randrange(size), rng.randrange(size)), (rng.randrange(256),) * 3)
    img.save(buf, "JPEG", quality=95)
    return buf.getvalue()


def _devices(tmp_path: Path, hub: RunningHub, n: int) -> list[tuple[Store, str]]:
    return [(Store(tmp_path / f"dev{i}.db"), hub.token(f"dev-{i}")) for i in range(n)]


def _same(stores: list[Store]) -> None:
    first = dump(stores[0])
    for s in stores[1:]:
        assert dump(s) == first


def test_two_devices_offline_then_every_sync_order_end_identical(tmp_path: Path, hub):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    col = _col(a, s.id, "C1")
    sync_with_hub(a, hub.url, ta)
    sync_with_hub(b, hub.url, tb)
    # offline: different fields merge, the same field keeps both values
    a.update_column(col.id, location="by the press")
    b.update_column(col.id, location="by the dock")
    a.update_site(s.id, address="north yard")
    b.add_measurement(col.id, "length", "13 ft 11 in", taken_by="R. Osei")
    for first, second in ((a, b), (b, a)):
        sync_with_hub(first, hub.url, ta if first is a else tb)
        sync_with_hub(second, hub.url, tb if second is b else ta)
    rep = sync_with_hub(a, hub.url, ta)
    _same([a, b, _held(hub, tmp_path)])
    assert a.get_site(s.id).address == "north yard"
    assert len(a.list_measurements(col.id)) == 1 if hasattr(a, "list_measurements") else True
    (c,) = b.conflicts()
    assert {c.value, c.kept} == {"by the press", "by the dock"}
    assert any("conflicts to review" in line for line in rep.lines())
    # the conflict names the column as the engineer knows it, not by its id
    assert any(line.startswith("  column C1 (") and "location" in line for line in rep.lines())
    assert "1 conflict to review" in rep.lines(details=False)


def test_three_devices_every_order_end_identical(tmp_path: Path, hub):
    devs = _devices(tmp_path, hub, 3)
    a = devs[0][0]
    s = _site(a)
    sync_with_hub(a, hub.url, devs[0][1])
    for st, tok in devs[1:]:
        sync_with_hub(st, hub.url, tok)
    for round_, order in enumerate(itertools.permutations(range(3))):
        for i, (st, _) in enumerate(devs):
            _col(st, s.id, f"R{round_}-D{i}")
            st.update_site(s.id, notes=f"round {round_} by device {i}")
        for i in order:
            sync_with_hub(devs[i][0], hub.url, devs[i][1])
    for st, tok in devs:  # one more pass so everyone has everything
        sync_with_hub(st, hub.url, tok)
    _same([st for st, _ in devs] + [_held(hub, tmp_path)])
    assert len(a.list_columns(s.id)) == 18


def test_one_tag_from_two_devices_is_kept_twice_and_recorded(tmp_path: Path, hub):
    """Two engineers each add column "C9" to the same site offline: both columns reach every
    replica, the first tagged keeps "C9", the other shows it with a suffix, and a duplicate
    record says so on every replica (nothing dropped, nothing merged behind anyone's back)."""
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    sync_with_hub(a, hub.url, ta)
    sync_with_hub(b, hub.url, tb)
    ca = _col(a, s.id, "C9")
    cb = _col(b, s.id, "C9")
    for st, tok in ((a, ta), (b, tb), (a, ta)):
        sync_with_hub(st, hub.url, tok)
    held = _held(hub, tmp_path)
    _same([a, b, held])
    for st in (a, b, held):
        rows = {r.id: r.tag for r in st.list_columns(s.id)}
        assert set(rows) == {ca.id, cb.id}
        first, second = sorted(rows.values())
        assert first == "C9" and second.startswith("C9 (") and second.endswith(")")
        (c,) = st.conflicts()
        assert (c.kind, c.field, c.value) == ("duplicate", "tag", "C9")
        assert rows[c.row_id] == second


class _CutAfter(httpx.HTTPTransport):
    """Deliver requests, but lose the answer to the n-th one whose path matches."""

    def __init__(self, path: str, n: int = 1):
        super().__init__()
        self.path, self.left = path, n

    def handle_request(self, request: httpx.Request) -> httpx.Response:
        resp = super().handle_request(request)
        if request.url.path == self.path:
            self.left -= 1
            if self.left == 0:
                resp.read()
                raise httpx.ReadError("connection cut", request=request)
        return resp


def test_push_cut_after_the_hub_committed_then_resumed(tmp_path: Path, hub):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    _col(a, s.id, "C1")
    with pytest.raises(InputError) as e:
        sync_with_hub(a, hub.url, ta, transport=_CutAfter("/v1/push"))
    assert e.value.field == "hub"
    held = hub.hub.max_seq()
    assert held > 0 and a.cursor(f"push:{hub.hub.hub_id}") == 0  # no ack, cursor unmoved
    sync_with_hub(a, hub.url, ta)
    assert hub.hub.max_seq() == held  # the repeat added nothing
    sync_with_hub(b, hub.url, tb)
    _same([a, b, _held(hub, tmp_path)])


def test_pull_cut_midway_then_resumed(tmp_path: Path, hub, monkeypatch):
    monkeypatch.setattr(client, "PULL_BATCH", 1)  # a row per operation: 5 in all
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    for i in range(4):
        _col(a, s.id, f"C{i}")
    sync_with_hub(a, hub.url, ta)
    with pytest.raises(InputError):
        sync_with_hub(b, hub.url, tb, transport=_CutAfter("/v1/pull", 3), take_whole=False)
    got = b.cursor(f"pull:{hub.hub.hub_id}")
    assert 0 < got < hub.hub.max_seq()  # two batches applied with their cursor, no more
    sync_with_hub(b, hub.url, tb)
    _same([a, b])


def test_duplicate_delivery_and_a_whole_replay_change_nothing(tmp_path: Path, hub):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    _col(a, s.id, "C1")
    sync_with_hub(a, hub.url, ta)
    sync_with_hub(b, hub.url, tb)
    before, seq = dump(b), hub.hub.max_seq()
    for st in (a, b):  # forget every cursor: everything is sent and fetched again
        st.db.execute("DELETE FROM sync_cursors")
        st.db.conn.commit()
    rep_a = sync_with_hub(a, hub.url, ta)
    rep_b = sync_with_hub(b, hub.url, tb)
    assert rep_a.received == rep_b.received == 0
    assert hub.hub.max_seq() == seq and dump(b) == before


def test_a_clock_a_year_ahead_is_refused_and_kept(tmp_path: Path, hub):
    (a, ta), = _devices(tmp_path, hub, 1)
    year = 365 * 24 * 3600 * 1000
    with a._tx():  # the device's clock jumped a year ahead before this edit
        a.db.execute("INSERT OR REPLACE INTO meta (key, value) VALUES ('sync_hlc', ?)",
                     [str((client.wall_ms() + year) << 16)])
    _site(a)
    with pytest.raises(InputError) as e:
        sync_with_hub(a, hub.url, ta)
    assert e.value.field == "clock" and "check the clock" in str(e.value)
    assert hub.hub.max_seq() == 0 and a.count_ops() > 0  # kept on the device
    code = main(["sync", "--db", str(a.path), "--hub", hub.url, "--token", ta])
    assert code == 2


def test_a_clock_a_year_behind_syncs_and_loses_only_to_newer_edits(tmp_path: Path, hub,
                                                                     monkeypatch):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    sync_with_hub(a, hub.url, ta)
    sync_with_hub(b, hub.url, tb)
    b.update_site(s.id, address="from the office")
    real = client.wall_ms
    year = 365 * 24 * 3600 * 1000
    import fieldcol.store._oplog as oplog
    monkeypatch.setattr(oplog, "wall_ms", lambda: real() - year)
    a.update_site(s.id, address="from site, old clock")  # stamped after b's? no: b's is newer
    monkeypatch.setattr(oplog, "wall_ms", real)
    sync_with_hub(b, hub.url, tb)
    sync_with_hub(a, hub.url, ta)
    sync_with_hub(b, hub.url, tb)
    _same([a, b])
    # the device had seen the site before it edited: its clock reading still comes after
    # what it had seen, so both values stand in the log and one is flagged
    assert a.count_ops() == b.count_ops()


def test_a_hub_restored_from_an_older_backup_gets_everything_again(tmp_path: Path):
    h = RunningHub(tmp_path / "hub")
    (a, ta), (b, tb) = _devices(tmp_path, h, 2)
    s = _site(a)
    sync_with_hub(a, h.url, ta)
    h.stop()
    shutil.copytree(tmp_path / "hub", tmp_path / "hub-backup")
    h = RunningHub(tmp_path / "hub")
    _col(a, s.id, "C2")
    sync_with_hub(a, h.url, ta)
    h.stop()
    shutil.rmtree(tmp_path / "hub")
    shutil.copytree(tmp_path / "hub-backup", tmp_path / "hub")  # the office restores
    h = RunningHub(tmp_path / "hub")
    try:
        rep = sync_with_hub(a, h.url, ta)
        assert any("restored" in w for w in rep.warnings)
        sync_with_hub(b, h.url, tb)
        assert sorted(c.tag for c in b.list_columns(s.id)) == ["C2"]
        _same([a, b, h.hub.store])
    finally:
        h.stop()


class _Counting(httpx.HTTPTransport):
    """Deliver requests and count the operations each pull answer carries."""

    def __init__(self) -> None:
        super().__init__()
        self.pulled: list[int] = []

    def handle_request(self, request: httpx.Request) -> httpx.Response:
        resp = super().handle_request(request)
        if request.url.path == "/v1/pull":
            resp.read()
            self.pulled.append(len(resp.json()["ops"]))
        return resp


def test_a_device_is_not_sent_back_what_it_pushed(tmp_path: Path, hub):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    for i in range(7):
        _col(a, s.id, f"C{i}")
    seen = _Counting()
    rep = sync_with_hub(a, hub.url, ta, transport=seen)
    assert rep.sent == a.count_ops() and sum(seen.pulled) == 0
    assert a.cursor(f"pull:{hub.hub.hub_id}") == hub.hub.max_seq()  # passed its own span
    assert a.own_spans(hub.hub.hub_id) == []  # spans behind the cursor are dropped
    sync_with_hub(b, hub.url, tb)
    b.update_site(s.id, address="from the office")
    sync_with_hub(b, hub.url, tb)
    seen = _Counting()
    assert sync_with_hub(a, hub.url, ta, transport=seen).received == 1 and seen.pulled == [1]
    _same([a, b, _held(hub, tmp_path)])


def test_a_device_restored_from_an_older_copy_gets_back_what_it_pushed_since(tmp_path: Path,
                                                                           hub):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    sync_with_hub(a, hub.url, ta)
    with a._lock:  # the phone's backup, taken now
        a.db.conn.execute("VACUUM INTO ?", [str(tmp_path / "copy.db")])
    _col(a, s.id, "C2")
    sync_with_hub(a, hub.url, ta)  # C2 went to the hub, and a noted that it holds it
    with Store(tmp_path / "copy.db") as old:  # the phone restored from its backup
        assert old.device_id == a.device_id and old.list_columns(s.id) == []
        sync_with_hub(old, hub.url, ta)
        assert [c.tag for c in old.list_columns(s.id)] == ["C2"]
        _col(old, s.id, "C3")
        sync_with_hub(old, hub.url, ta)
        sync_with_hub(a, hub.url, ta)
        sync_with_hub(b, hub.url, tb)
        _same([a, b, old, _held(hub, tmp_path)])


def test_a_pull_names_at_most_so_many_spans_each_a_span(tmp_path: Path, hub):
    (a, ta), = _devices(tmp_path, hub, 1)
    auth = {"Authorization": f"Bearer {ta}"}
    for skip in ("9-3", "x-4", ",".join(["1-2"] * 65)):
        r = httpx.get(f"{hub.url}/v1/pull", params={"device": a.device_id, "skip": skip},
                      headers=auth)
        assert r.status_code == 422 and r.json()["field"] == "skip"


def test_photos_cut_at_random_offsets_resume_and_arrive_whole(tmp_path: Path, hub):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    f = a.add_finding(s.id, "Flange pitting at base", category="corrosion", severity="medium")
    data = _jpeg((120, 80, 40), 400)
    photo = a.add_photo(data, finding_id=f.id)
    sha = photo.sha256
    rng = random.Random(7)
    auth = {"Authorization": f"Bearer {ta}"}
    offset = 0
    for _ in range(3):  # pieces sent, then the link drops
        piece = rng.randrange(1, max(2, (len(data) - offset) // 2))
        r = httpx.put(f"{hub.url}/v1/photos/{sha}", params={"offset": offset, "total": len(data)},
                      content=data[offset:offset + piece], headers=auth)
        assert r.status_code == 200
        offset += piece
    r = httpx.get(f"{hub.url}/v1/photos/{sha}/status", headers=auth).json()
    assert r == {"have": False, "received": offset}
    # a piece at the wrong offset is refused, naming where the upload stands
    r = httpx.put(f"{hub.url}/v1/photos/{sha}", params={"offset": 0, "total": len(data)},
                  content=data[:10], headers=auth)
    assert r.status_code == 409 and str(offset) in r.json()["reason"]
    sync_with_hub(a, hub.url, ta)  # continues from where it stopped
    sync_with_hub(b, hub.url, tb)
    got = b.photos_of(finding_id=f.id)
    assert [p.sha256 for p in got] == [sha]
    assert hashlib.sha256(b.photo_path(got[0]).read_bytes()).hexdigest() == sha
    assert b.photo_path(got[0], thumbnail=True).is_file()


def test_a_photo_whose_bytes_do_not_match_is_refused(tmp_path: Path, hub):
    tok = hub.token("x")
    data = _jpeg((1, 2, 3))
    wrong = "0" * 64
    r = httpx.put(f"{hub.url}/v1/photos/{wrong}", params={"offset": 0, "total": len(data)},
                  content=data, headers={"Authorization": f"Bearer {tok}"})
    assert r.status_code == 422 and r.json()["field"] == "photo"
    assert list((tmp_path / "hub").glob("hub-photos/**/*.jpg")) == []


def test_one_photo_from_two_devices_is_stored_once(tmp_path: Path, hub):
    (a, ta), (b, tb) = _devices(tmp_path, hub, 2)
    s = _site(a)
    sync_with_hub(a, hub.url, ta)
    sync_with_hub(b, hub.url, tb)
    data = _jpeg((200, 10, 10))
    a.add_photo(data)
    b.add_photo(data)
    for st, tok in ((a, ta), (b, tb), (a, ta)):
        sync_with_hub(st, hub.url, tok)
    files = [p for p in (tmp_path / "hub" / "hub-photos").rglob("*.jpg") if "thumbs" not in p.parts]
    assert len(files) == 1
    assert _held(hub, tmp_path).db.conn.execute("SELECT count(*) FROM photos").fetchone()[0] == 1
    _same([a, b])
    assert s.id


def test_tokens_sizes_and_bad_json_are_refused(tmp_path: Path, hub):
    tok = hub.token("tablet-1")
    hub.token("tablet-2")
    url = hub.url
    for headers in ({}, {"Authorization": "Bearer nope"}, {"Authorization": tok}):
        r = httpx.get(f"{url}/v1/hello", headers=headers)
        assert r.status_code == 401 and r.json()["field"] == "token"
    auth = {"Authorization": f"Bearer {tok}"}
    assert httpx.get(f"{url}/v1/hello", headers=auth).status_code == 200
    r = httpx.post(f"{url}/v1/push", content=b"{not json", headers=auth)
    assert r.status_code == 400 and r.json()["field"] == "body"
    r = httpx.post(f"{url}/v1/push", content=b"x" * (17 << 20), headers=auth)
    assert r.status_code == 413
    r = httpx.post(f"{url}/v1/push", json={"schema": [], "ops": []}, headers=auth)
    assert r.status_code == 426  # an older device is told to update
    r = httpx.get(f"{url}/v1/photos/..%2F..%2Fhub.db", headers=auth)
    assert r.status_code in (404, 422)
    r = httpx.get(f"{url}/v1/pull", params={"after": "-1"}, headers=auth)
    assert r.status_code == 422 and r.json()["field"] == "after"
    hub.hub.revoke_device("tablet-1")
    assert httpx.get(f"{url}/v1/hello", headers=auth).status_code == 401
    assert hub.hub.max_seq() == 0


def test_a_token_or_access_key_never_reads_as_a_command_line_option(tmp_path: Path):
    # A token starting with "-" made `fieldcol sync --token <token>` fail in argparse.
    from fieldcol.sync._hubstore import HubStore
    from fieldcol.ui._access import new_key
    hs = HubStore(tmp_path / "h")
    toks = [hs.add_device(f"d{i}") for i in range(200)] + [new_key() for _ in range(2000)]
    assert all(t[0].isalnum() for t in toks)


def test_sync_command_prints_what_moved_and_exits_2_on_bad_token_or_no_hub(tmp_path: Path, hub,
                                                                            capsys):
    (a, ta), = _devices(tmp_path, hub, 1)
    _site(a)
    a.close()
    db = str(tmp_path / "dev0.db")
    assert main(["sync", "--db", db, "--hub", hub.url, "--token", ta, "--remember"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("sent ")
    assert main(["sync", "--db", db]) == 0  # the kept address and token
    assert main(["sync", "--db", db, "--hub", hub.url, "--token", "wrong"]) == 2
    assert "token" in capsys.readouterr().err
    assert main(["sync", "--db", db, "--hub", "http://127.0.0.1:9", "--token", ta]) == 2
    assert "cannot reach the hub" in capsys.readouterr().err


def test_hub_device_commands(tmp_path: Path, capsys):
    data = str(tmp_path / "hubdata")
    assert main(["hub", "add-device", "tablet-1", "--data", data]) == 0
    token = capsys.readouterr().out.strip().splitlines()[-1]
    assert len(token) > 30
    assert token not in (tmp_path / "hubdata" / "devices.db").read_bytes().decode("latin-1")
    assert main(["hub", "add-device", "tablet-1", "--data", data]) == 2
    assert main(["hub", "devices", "--data", data]) == 0
    assert "tablet-1\tallowed\tlast sync never" in capsys.readouterr().out
    assert main(["hub", "revoke-device", "tablet-1", "--data", data]) == 0
    assert main(["hub", "serve", "--data", data, "--host", "0.0.0.0", "--port", "8765"]) == 2
    assert "TLS" in capsys.readouterr().err


def test_the_office_view_is_refused_beyond_loopback_without_tls_or_on_the_hubs_port(
        tmp_path: Path, capsys):
    data = str(tmp_path / "hub")
    assert main(["hub", "serve", "--data", data, "--host", "0.0.0.0", "--tls-cert", "c.pem",
                 "--tls-key", "k.pem", "--office-port", "8766"]) == 2
    assert "office-port" in capsys.readouterr().err
    assert main(["hub", "serve", "--data", data, "--port", "8765", "--office-port", "8765"]) == 2
    assert "other than the hub's" in capsys.readouterr().err


def test_row_label_names_rows_as_the_engineer_knows_them(tmp_path: Path):
    # a column by its tag and site, a reading or finding by its column, a site by its name,
    # a deleted column still by its tag, a row not held by its table and id
    with Store(tmp_path / "a.db") as a:
        s = _site(a)
        col = _col(a, s.id, "B/2-G")
        m = a.add_measurement(col.id, "length", "13 ft 11 in", taken_by="R. Osei")
        name = a.get_site(s.id).name
        assert a.row_label("columns", col.id) == f"column B/2-G ({name})"
        assert a.row_label("measurements", m.id) == f"reading on column B/2-G ({name})"
        assert a.row_label("sites", s.id) == f"site {name}"
        a.delete("columns", col.id)
        assert a.row_label("columns", col.id) == f"column B/2-G ({name})"
        assert a.row_label("findings", "f0e1d2c3b4a5") == "finding f0e1d2c3"
