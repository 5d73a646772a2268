"""The hub over PostgreSQL: several hub processes, one database, a real server (see conftest).

What is checked is what any replicated store behind several stateless servers must show
(common practice): devices converge whatever process they reach, each operation is stored once
however often it arrives, a reader following the sequence never skips a late commit, a crash
leaves no half-stored batch, and an outage of the database is waited out.
"""

from __future__ import annotations

import random
import threading
import time
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

import httpx
import psycopg
import pytest

from fieldcol.cli import main
from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.sync import client
from fieldcol.sync._hubstore_pg import PgHubStore
from fieldcol.sync._loopback import HubProcess, RunningHub, free_port
from fieldcol.sync.client import sync_with_hub
from test_sync_hub import _jpeg
from test_sync_oplog import dump

SITE = "Harrow Mill Dye House"


def _site(s: Store):
    return s.add_site(SITE, code="aisc360-22", unit_system="us")


def _col(s: Store, site_id: str, tag: str):
    return s.add_column(site_id, {"tag": tag, "section": "W10X49", "length": "14 ft"})


def _same(stores: list[Store]) -> None:
    first = dump(stores[0])
    for s in stores[1:]:
        assert dump(s) == first


def _held(url: str) -> list[tuple[int, str]]:
    with psycopg.connect(url) as c:
        return c.execute("SELECT seq, op_id FROM hub_ops ORDER BY seq").fetchall()


@pytest.fixture
def two_hubs(tmp_path: Path, pg_database: str):
    """Two ``fieldcol hub serve`` processes over one database and one photo folder, and a
    ``PgHubStore`` of the test's own for tokens."""
    data = tmp_path / "hubdata"
    admin = PgHubStore(data, pg_database)
    procs = [HubProcess(data, pg_database), HubProcess(data, pg_database)]
    yield admin, procs
    for p in procs:
        p.stop()
    admin.close()


def test_hub_commands_take_a_database_and_exit_2_when_it_is_out_of_reach(
        tmp_path: Path, pg_database: str, capsys):
    data = str(tmp_path / "hubdata")
    db = ["--data", data, "--database", pg_database]
    assert main(["hub", "add-device", "tablet-1", *db]) == 0
    token = capsys.readouterr().out.strip().splitlines()[-1]
    assert main(["hub", "add-device", "tablet-1", *db]) == 2
    assert main(["hub", "devices", *db]) == 0
    assert "tablet-1\tallowed\tlast sync never" in capsys.readouterr().out
    with psycopg.connect(pg_database) as c:  # only the token's hash is kept
        (row,) = c.execute("SELECT * FROM hub_devices").fetchall()
    assert token not in repr(row)
    assert main(["hub", "revoke-device", "tablet-1", *db]) == 0
    assert main(["hub", "revoke-device", "tablet-1", *db]) == 2
    capsys.readouterr()
    nobody = f"postgresql://fieldcol@127.0.0.1:{free_port()}/hub"
    assert main(["hub", "serve", "--data", data, "--database", nobody,
                 "--port", str(free_port())]) == 2
    err = capsys.readouterr().err
    assert "database" in err and "cannot reach the database" in err
    assert main(["hub", "devices", "--data", data, "--database", "mysql://x@h/db"]) == 2
    assert "not a PostgreSQL address" in capsys.readouterr().err
    # the office view reads the SQLite hub's merged records; a PostgreSQL hub keeps operations
    assert main(["hub", "serve", *db, "--port", str(free_port()),
                 "--office-port", str(free_port())]) == 2
    assert "office" in capsys.readouterr().err
    # the schema is made once and known by name: a second start changes nothing
    PgHubStore(data, pg_database).close()
    with psycopg.connect(pg_database) as c:
        assert [r[0] for r in c.execute("SELECT name FROM hub_steps")] == ["p001_hub"]
        c.execute("INSERT INTO hub_steps (name) VALUES ('p999_from_the_future')")
    assert main(["hub", "devices", *db]) == 2  # a database a newer hub upgraded is refused
    assert "newer fieldcol hub" in capsys.readouterr().err


def test_hub_processes_starting_together_make_the_schema_once(tmp_path: Path,
                                                              pg_database: str):
    with ThreadPoolExecutor(4) as pool:
        hubs = list(pool.map(lambda i: PgHubStore(tmp_path / "hubdata", pg_database), range(4)))
    try:
        assert len({h.hub_id for h in hubs}) == 1
        with psycopg.connect(pg_database) as c:
            assert c.execute("SELECT count(*) FROM hub_meta").fetchone()[0] == 1
    finally:
        for h in hubs:
            h.close()


def test_devices_syncing_through_either_process_in_any_order_converge(tmp_path: Path, two_hubs):
    admin, procs = two_hubs
    devs = [(Store(tmp_path / f"dev{i}.db"), admin.add_device(f"dev-{i}")) for i in range(4)]
    a = devs[0][0]
    s = _site(a)
    sync_with_hub(a, procs[0].url, devs[0][1])
    rng = random.Random(5)
    for round_ in range(4):
        for i, (st, tok) in enumerate(devs):
            if st is not a and round_ == 0:
                sync_with_hub(st, procs[1].url, tok)
            _col(st, s.id, f"R{round_}-D{i}")
            st.update_site(s.id, notes=f"round {round_} by device {i}")
        for i in rng.sample(range(4), 4):
            sync_with_hub(devs[i][0], rng.choice(procs).url, devs[i][1])
    f = a.add_finding(s.id, "Web pitting at the dye vats", category="corrosion",
                      severity="medium")
    photo = a.add_photo(_jpeg((30, 90, 150)), finding_id=f.id)
    sync_with_hub(a, procs[0].url, devs[0][1])
    for st, tok in devs:
        sync_with_hub(st, procs[1].url, tok)
    _same([st for st, _ in devs])
    assert len(devs[3][0].list_columns(s.id)) == 16
    (got,) = devs[2][0].photos_of(finding_id=f.id)
    assert got.sha256 == photo.sha256 and devs[2][0].photo_path(got).is_file()


def test_overlapping_pushes_through_both_processes_store_each_operation_once(
        tmp_path: Path, two_hubs, pg_database: str):
    admin, procs = two_hubs
    devs = []
    for i in range(3):
        st = Store(tmp_path / f"dev{i}.db")
        site = st.add_site(f"{SITE} {i}", code="aisc360-22", unit_system="us")
        for k in range(12):
            _col(st, site.id, f"C{k}")
        devs.append((st, admin.add_device(f"dev-{i}")))
    # every window of 40 operations, windows overlapping by half, sent through both processes
    jobs = []
    for st, tok in devs:
        ops = [o.to_json() for o in st.ops_after(0, 10**6)]
        for start in range(0, len(ops), 20):
            body = {"device": st.device_id, "schema": list(MIGRATION_NAMES),
                    "ops": ops[start:start + 40]}
            jobs += [(p.url, tok, body) for p in procs]
    random.Random(3).shuffle(jobs)
    every = {o.op_id for st, _ in devs for o in st.ops_after(0, 10**6)}

    seen: list[tuple[int, str]] = []
    stop = threading.Event()

    def follow() -> None:  # a reader moving its cursor as pushes commit, through either process
        after, n = 0, 0
        with httpx.Client(headers={"Authorization": f"Bearer {devs[0][1]}"}) as h:
            while True:
                done = stop.is_set()
                r = h.get(f"{procs[n % 2].url}/v1/pull", params={"after": after, "limit": 50})
                rows = r.json()["ops"]
                n += 1
                seen.extend((seq, o["op_id"]) for seq, o in rows)
                if rows:
                    after = rows[-1][0]
                elif done:
                    return

    def send(job: tuple[str, str, dict]) -> int:
        url, tok, body = job
        r = httpx.post(f"{url}/v1/push", json=body, timeout=60,
                       headers={"Authorization": f"Bearer {tok}"})
        assert r.status_code == 200, r.text
        return r.json()["new"]

    reader = threading.Thread(target=follow)
    reader.start()
    with ThreadPoolExecutor(8) as pool:
        new = sum(pool.map(send, jobs))
    stop.set()
    reader.join(60)
    held = _held(pg_database)
    assert new == len(held) == len(every) == len({op for _, op in held})
    assert {op for _, op in held} == every
    # the reader followed the sequence while pushes committed: nothing skipped, nothing twice
    assert [op for _, op in seen] == [op for _, op in held]
    for st, tok in devs:
        sync_with_hub(st, procs[0].url, tok)
    for st, tok in devs:
        sync_with_hub(st, procs[1].url, tok)
    _same([st for st, _ in devs])


def _waiting_insert(url: str, deadline_s: float = 30) -> int:
    """The server process of a hub session waiting on a row lock inside its INSERT."""
    end = time.monotonic() + deadline_s
    with psycopg.connect(url, autocommit=True) as c:
        while time.monotonic() < end:
            row = c.execute("SELECT pid FROM pg_stat_activity WHERE wait_event_type = 'Lock' "
                            "AND query LIKE '%%INSERT INTO hub_ops%%'").fetchone()
            if row:
                return row[0]
            time.sleep(0.05)
    raise AssertionError("the hub's push never reached the blocked operation")


def _gone(url: str, pid: int, deadline_s: float = 30) -> None:
    end = time.monotonic() + deadline_s
    with psycopg.connect(url, autocommit=True) as c:
        while c.execute("SELECT 1 FROM pg_stat_activity WHERE pid = %s", [pid]).fetchone():
            assert time.monotonic() < end, "the killed hub's session stayed"
            time.sleep(0.05)


def _blocked_push(a: Store, url: str, token: str, pg_url: str, last_op: str):
    """Start a sync of ``a`` whose push stops half way in the database: another session holds
    the batch's last operation id, uncommitted, so the hub's INSERT has stored the ones before
    it in its open transaction and waits there. Returns (blocker, hub session pid, thread,
    outcome)."""
    blocker = psycopg.connect(pg_url)
    blocker.execute("INSERT INTO hub_ops (op_id, device_id, hlc, tbl, row_id, field, value, "
                    "seen) VALUES (%s, 'blocker', 0, 'x', 'x', 'x', NULL, 0)", [last_op])
    out: dict[str, object] = {}

    def sync() -> None:
        try:
            sync_with_hub(a, url, token)
        except InputError as e:
            out["error"] = e

    t = threading.Thread(target=sync)
    t.start()
    return blocker, _waiting_insert(pg_url), t, out


def test_a_hub_killed_mid_push_leaves_nothing_half_stored_and_the_retry_completes(
        tmp_path: Path, two_hubs, pg_database: str):
    admin, procs = two_hubs
    a, b = Store(tmp_path / "a.db"), Store(tmp_path / "b.db")
    ta, tb = admin.add_device("a"), admin.add_device("b")
    push_cursor = f"push:{admin.hub_id}"
    s = _site(a)
    for k in range(15):
        _col(a, s.id, f"C{k}")
    ops = a.ops_after(0, 10**6)
    assert len(ops) < client.PUSH_BATCH  # one push carries them all

    # 1. the hub process dies half way and its database session with it: nothing is kept
    blocker, backend, t, out = _blocked_push(a, procs[0].url, ta, pg_database, ops[-1].op_id)
    assert _held(pg_database) == []  # the half written so far is seen by nobody
    procs[0].kill()
    t.join(60)
    assert isinstance(out.get("error"), InputError) and out["error"].field == "hub"
    with psycopg.connect(pg_database, autocommit=True) as c:
        c.execute("SELECT pg_terminate_backend(%s)", [backend])
    blocker.rollback()
    blocker.close()
    _gone(pg_database, backend)
    assert _held(pg_database) == [] and admin.max_seq() == 0
    assert a.cursor(push_cursor) == 0  # no acknowledgement: the device still holds it to send
    rep = sync_with_hub(a, procs[1].url, ta)  # the device's next sync, through the other one
    assert rep.sent == len(ops)
    assert sorted(op for _, op in _held(pg_database)) == sorted(o.op_id for o in ops)

    # 2. the hub process dies half way but its session finishes the one-statement push: the
    # whole batch is kept, never a part, and the device's repeat adds nothing twice
    third = HubProcess(tmp_path / "hubdata", pg_database)
    for k in range(15, 25):
        _col(a, s.id, f"C{k}")
    batch = [o for _, o in a.ops_with_seq(a.cursor(push_cursor), 10**6, exclude_source="hub")]
    before = _held(pg_database)
    blocker, backend, t, out = _blocked_push(a, third.url, ta, pg_database, batch[-1].op_id)
    assert _held(pg_database) == before
    third.kill()
    t.join(60)
    assert isinstance(out.get("error"), InputError)
    blocker.rollback()
    blocker.close()
    _gone(pg_database, backend)
    held = [op for _, op in _held(pg_database)]
    assert held == [op for _, op in before] + [o.op_id for o in batch]
    rep = sync_with_hub(a, procs[1].url, ta)
    assert rep.sent == len(batch) and [op for _, op in _held(pg_database)] == held
    sync_with_hub(b, procs[1].url, tb)
    _same([a, b])
    assert len(b.list_columns(s.id)) == 25


def test_a_database_lost_while_running_gives_503_and_the_device_waits_it_out(
        tmp_path: Path, pg_server, monkeypatch):
    from fieldcol.sync._pgserver import TempPostgres

    from fieldcol.sync import _hubstore_pg

    monkeypatch.setattr(_hubstore_pg, "POOL_WAIT_S", 1.0)  # answer 503 sooner than 5 s
    pg = TempPostgres()  # a server of its own: this test stops it
    try:
        hub = RunningHub(tmp_path / "hub", pg.create("hub"))
        try:
            a = Store(tmp_path / "a.db")
            tok = hub.token("a")
            s = _site(a)
            sync_with_hub(a, hub.url, tok)
            pg.stop()
            r = httpx.get(f"{hub.url}/v1/hello", headers={"Authorization": f"Bearer {tok}"},
                          timeout=60)
            assert r.status_code == 503 and r.json()["field"] == "database"
            assert r.headers["retry-after"].isdigit()
            _col(a, s.id, "C1")
            monkeypatch.setattr(client, "RETRY_503_S", (0.1, 0.1))
            with pytest.raises(InputError) as e:  # a long outage: a plain message, exit 2
                sync_with_hub(a, hub.url, tok)
            assert "cannot reach its database" in str(e.value)
            monkeypatch.setattr(client, "RETRY_503_S", (0.5,) * 120)
            threading.Timer(1.0, pg.start).start()  # back within the device's patience
            rep = sync_with_hub(a, hub.url, tok)
            assert rep.sent > 0 and hub.hub.count_from(a.device_id) == a.count_ops()
        finally:
            hub.stop()
    finally:
        pg.close()


def test_one_photo_sent_through_both_processes_at_once_is_stored_once(tmp_path: Path, two_hubs):
    admin, procs = two_hubs
    tok = admin.add_device("a")
    data = _jpeg((10, 200, 60), 300)
    import hashlib
    sha = hashlib.sha256(data).hexdigest()

    def put(url: str) -> dict:
        r = httpx.put(f"{url}/v1/photos/{sha}", params={"offset": 0, "total": len(data)},
                      content=data, headers={"Authorization": f"Bearer {tok}"}, timeout=60)
        assert r.status_code == 200, r.text
        return r.json()

    with ThreadPoolExecutor(6) as pool:
        got = list(pool.map(put, [p.url for p in procs] * 3))
    assert all(g["have"] for g in got)
    folder = tmp_path / "hubdata" / "hub-photos"
    files = [p for p in folder.rglob("*") if p.is_file()]
    assert sorted(p.name for p in files) == [f"{sha}.jpg", f"{sha}.jpg"]  # photo and thumbnail
    assert not any(p.name.endswith(".tmp") for p in folder.rglob("*"))
    assert list((tmp_path / "hubdata" / "partial").glob("*")) == []  # no upload or lock left


def test_a_field_bundle_imported_into_the_hub_reaches_every_device(tmp_path: Path,
                                                                   pg_database: str, capsys):
    a, b = Store(tmp_path / "a.db"), Store(tmp_path / "b.db")
    s = _site(a)
    f = a.add_finding(s.id, "Cap plate weld cracked", category="damage", severity="high")
    photo = a.add_photo(_jpeg((90, 40, 200)), finding_id=f.id)
    _col(a, s.id, "C1")
    assert main(["bundle", "export", str(tmp_path / "a.zip"), "--db", str(a.path)]) == 0
    data = tmp_path / "hubdata"
    imp = ["bundle", "import", str(tmp_path / "a.zip"), "--data", str(data),
           "--database", pg_database]
    capsys.readouterr()
    assert main(imp) == 0
    assert f"{a.count_ops()} operations ({a.count_ops()} new here)" in capsys.readouterr().out
    assert main(imp) == 0  # twice: nothing new
    assert "(0 new here)" in capsys.readouterr().out
    assert sorted(op for _, op in _held(pg_database)) == sorted(o.op_id for o in
                                                                 a.ops_after(0, 10**6))
    hub = RunningHub(data, pg_database)
    try:
        sync_with_hub(b, hub.url, hub.token("b"))
    finally:
        hub.stop()
    _same([a, b])
    (got,) = b.photos_of(finding_id=f.id)
    assert got.sha256 == photo.sha256 and b.photo_path(got).is_file()
    assert main(["bundle", "import", str(tmp_path / "a.zip"), "--database", pg_database]) == 2


def test_a_reader_never_skips_a_push_that_commits_late(tmp_path: Path, two_hubs,
                                                       pg_database: str):
    # push A stops half way in the database (numbers taken, nothing committed) while push B
    # arrives at the other process; a reader pulling meanwhile must not move its cursor past
    # A's numbers, or A's operations would never reach it
    admin, procs = two_hubs
    a, b, c = (Store(tmp_path / f"{n}.db") for n in "abc")
    ta, tb, tc = (admin.add_device(n) for n in "abc")
    for st, name in ((a, "A"), (b, "B")):
        site = st.add_site(f"{SITE} {name}", code="aisc360-22", unit_system="us")
        for k in range(5):
            _col(st, site.id, f"{name}{k}")
    blocker, backend_a, t_a, out_a = _blocked_push(a, procs[0].url, ta, pg_database,
                                                   a.ops_after(0, 10**6)[-1].op_id)
    t_b = threading.Thread(target=sync_with_hub, args=(b, procs[1].url, tb))
    t_b.start()
    time.sleep(1.0)  # B has had every chance to commit ahead of A
    auth = {"Authorization": f"Bearer {tc}"}
    cursor, got = 0, []
    for url in (procs[0].url, procs[1].url):  # a reader during the stall, through both
        rows = httpx.get(f"{url}/v1/pull", params={"after": cursor}, headers=auth,
                         timeout=60).json()["ops"]
        got += [o["op_id"] for _, o in rows]
        cursor = rows[-1][0] if rows else cursor
    blocker.rollback()
    blocker.close()
    t_a.join(60)
    t_b.join(60)
    assert "error" not in out_a
    rows = httpx.get(f"{procs[1].url}/v1/pull", params={"after": cursor, "limit": 5000},
                     headers=auth, timeout=60).json()["ops"]
    got += [o["op_id"] for _, o in rows]
    every = {o.op_id for st in (a, b) for o in st.ops_after(0, 10**6)}
    assert sorted(got) == sorted(every)  # all, each once
    sync_with_hub(c, procs[0].url, tc)
    assert len(c.list_sites()) == 2
