"""Sync speed: a site's records and photos from one device through a hub on loopback to another.

``sync_2000_columns_s``: a site of 2,000 columns and 20,000 readings, held by a real hub over
HTTP on 127.0.0.1, synced to an empty device (its first sync: the hub's records taken whole,
``store/_snapshot``). ``sqlite_copy_2000_columns_s``: the same rows copied into a new SQLite
file with plain inserts, in the same run (the floor a sync is compared with; goal: sync within
3 times of it). Both also in processor seconds of this process (``..._cpu_s``; the hub runs in
a thread of it): on a machine shared with other work the wall-clock pair moves with the load,
their ratio with it.
``sync_push_2000_columns_s``: the device that recorded the site pushing it to the hub first
(every operation checked and merged into the hub's records, which the office view shows).
``sync_ops_2000_columns_s``: the same site pulled operation by operation by a device that
holds records of its own already (every later sync goes this way).
``store_writes_2000_columns_s`` (and ``_cpu_s``): what one replica must write at the least, the
same rows with their operations, row notes and winners put straight into a new fieldcol store
(its indexes, foreign keys and triggers) by ``executemany``: no merge, no JSON, no network.
``sync_photos_mb_per_s``: 200 photos of 2 MB uploaded by one device and
downloaded by another, megabytes moved per second over both legs.
``bundle_import_5000_rows_s``: a field bundle of a site of 500 columns and 4,500 readings (5,001
rows) imported into an empty store: checked whole, then merged in one transaction
(``quick``: a hundredth of the rows, 2 photos of 0.2 MB).
"""

from __future__ import annotations

import io
import json
import random
import sqlite3
import tempfile
import time
import uuid
from pathlib import Path
from typing import Any


def _site(store: Any, n_cols: int, n_read: int) -> None:
    """One site of ``n_cols`` columns and ``n_read`` readings, written in one transaction."""
    from fieldcol.store._validate import now_utc

    rnd = random.Random(3)
    now, dev = now_utc(), store.device_id
    site = store.add_site("Bench sync site", code="aisc360-22", unit_system="us")
    cols = []
    for i in range(n_cols):
        rec = {"tag": f"C{i:04d}", "section": rnd.choice(("W10X49", "W12X65", "W14X90")),
               "length": f"{rnd.randint(10, 30)} ft"}
        cols.append((str(uuid.uuid4()), now, now, dev, site.id, rec["tag"], json.dumps(rec)))
    reads = []
    for i in range(n_read):
        c = cols[i % n_cols][0]
        val = round(rnd.uniform(0.2, 3.0), 2)
        reads.append((str(uuid.uuid4()), now, now, dev, c, "bow", "measured", f"{val} in", val,
                      "in", "R. Osei", now))
    with store._tx():  # a bulk load; the log is made at its commit like any other write
        store.db.conn.executemany(
            "INSERT INTO columns (id, created_at, updated_at, device_id, site_id, tag, record) "
            "VALUES (?, ?, ?, ?, ?, ?, ?)", cols)
        store.db.conn.executemany(
            "INSERT INTO measurements (id, created_at, updated_at, device_id, column_id, "
            "quantity, kind, text, value, unit, taken_by, taken_at) "
            "VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)", reads)


def _copy(src: Path, dst: Path) -> tuple[float, float]:
    """Seconds (wall clock, processor) to copy the site's rows into a new SQLite file with
    plain inserts."""
    t0, c0 = time.perf_counter(), time.process_time()
    a = sqlite3.connect(str(src))
    b = sqlite3.connect(str(dst))
    b.execute("PRAGMA journal_mode=WAL")
    b.execute("PRAGMA synchronous=FULL")
    for t in ("sites", "columns", "measurements"):
        sql = a.execute("SELECT sql FROM sqlite_master WHERE name = ?", [t]).fetchone()[0]
        b.execute(sql)
        rows = a.execute(f"SELECT * FROM {t}").fetchall()
        marks = ", ".join("?" for _ in rows[0]) if rows else ""
        if rows:
            b.executemany(f"INSERT INTO {t} VALUES ({marks})", rows)
    b.commit()
    a.close()
    b.close()
    return time.perf_counter() - t0, time.process_time() - c0


def _store_writes(src: Path, dst: Path) -> tuple[float, float]:
    """Seconds (wall clock, processor) to write the site's rows and their log into a new store
    with plain inserts, the values read beforehand (the floor of one replica's merge)."""
    from fieldcol.store import Store
    from fieldcol.store._oplog import QUIET, ROW

    a = sqlite3.connect(str(src))
    tables = ("sites", "columns", "measurements")
    data = {t: (a.execute(f"SELECT * FROM {t}").fetchall(),
                [r[1] for r in a.execute(f"PRAGMA table_info({t})")]) for t in tables}
    ops = a.execute("SELECT op_id, device_id, hlc, tbl, row_id, field, value, seen "
                    "FROM sync_ops").fetchall()
    a.close()
    Store(dst).close()  # the schema, indexes and triggers of a device's store
    b = sqlite3.connect(str(dst), isolation_level=None)
    b.execute("PRAGMA synchronous=FULL")
    b.execute("PRAGMA foreign_keys=ON")
    t0, c0 = time.perf_counter(), time.process_time()
    b.execute("BEGIN")
    b.execute("INSERT INTO meta (key, value) VALUES (?, '1')", [QUIET])  # as a merge does
    for t, (rows, names) in data.items():
        b.executemany(f"INSERT INTO {t} ({', '.join(names)}) "
                      f"VALUES ({', '.join('?' for _ in names)})", rows)
    b.executemany("INSERT INTO sync_ops (op_id, device_id, hlc, tbl, row_id, field, value, seen, "
                  "source) VALUES (?, ?, ?, ?, ?, ?, ?, ?, 'hub')", ops)
    b.executemany("INSERT INTO sync_rows (tbl, row_id, max_hlc) VALUES (?, ?, ?)",
                  [(o[3], o[4], o[2]) for o in ops])
    b.executemany("INSERT INTO sync_fields (tbl, row_id, field, hlc, op_id) VALUES (?, ?, ?, ?, ?)",
                  [(o[3], o[4], ROW, o[2], o[0]) for o in ops])
    b.execute("DELETE FROM meta WHERE key = ?", [QUIET])
    b.execute("COMMIT")
    t, c = time.perf_counter() - t0, time.process_time() - c0
    b.close()
    return t, c


def _photo(base: bytes, i: int) -> bytes:
    # one noisy JPEG made distinct by bytes after its end marker (readers stop at the marker)
    return base + f"bench photo {i:06d}".encode()


def _base_jpeg(mb: float) -> bytes:
    import os

    from PIL import Image

    side = int(900 * mb ** 0.5)
    img = Image.frombytes("RGB", (side, side), os.urandom(side * side * 3))
    buf = io.BytesIO()
    img.save(buf, "JPEG", quality=90)
    return buf.getvalue()


def run(*, quick: bool = False) -> dict[str, float]:
    """Time the sync of a 2,000-column site and of 200 photos through a loopback hub.

    Example:
        >>> sorted(run(quick=True))[:2]
        ['bundle_import_5000_rows_s', 'sqlite_copy_2000_columns_cpu_s']
    """
    from fieldcol.store import Store
    from fieldcol.sync._bundle import export_bundle, import_bundle
    from fieldcol.sync._loopback import RunningHub
    from fieldcol.sync.client import sync_with_hub

    n_cols, n_read = (20, 200) if quick else (2_000, 20_000)
    n_photos, photo_mb = (2, 0.2) if quick else (200, 2.0)
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        hub = RunningHub(root / "hub")
        try:
            with Store(root / "a.db") as a, Store(root / "b.db") as b:
                ta, tb, tc = hub.token("a"), hub.token("b"), hub.token("c")
                _site(a, n_cols, n_read)
                t0 = time.perf_counter()
                sync_with_hub(a, hub.url, ta)
                t_push = time.perf_counter() - t0
                t0, c0 = time.perf_counter(), time.process_time()
                sync_with_hub(b, hub.url, tb)
                t_sync, c_sync = time.perf_counter() - t0, time.process_time() - c0
                assert len(b.list_columns(b.list_sites()[0].id, limit=5)) == 5
                with Store(root / "c.db") as c:
                    c.add_site("Bench own site", code="aisc360-22", unit_system="us")
                    t0 = time.perf_counter()
                    sync_with_hub(c, hub.url, tc)
                    t_ops = time.perf_counter() - t0
                    assert len(c.list_sites()) == 2
                t_copy, c_copy = _copy(root / "a.db", root / "copy.db")
                t_floor, c_floor = _store_writes(root / "a.db", root / "floor.db")
                base = _base_jpeg(photo_mb)
                for i in range(n_photos):
                    a.add_photo(_photo(base, i))
                size_mb = n_photos * len(base) / 1e6
                t0 = time.perf_counter()
                sync_with_hub(a, hub.url, ta)
                sync_with_hub(b, hub.url, tb)
                t_photos = time.perf_counter() - t0
        finally:
            hub.stop()
        with Store(root / "e.db") as e, Store(root / "d.db") as d:
            _site(e, n_cols // 4, n_read * 9 // 40)
            export_bundle(e, root / "site.zip")
            t0 = time.perf_counter()
            info = import_bundle(d, root / "site.zip")
            t_bundle = time.perf_counter() - t0
            assert info.new == info.ops and info.pending == 0
    return {"bundle_import_5000_rows_s": round(t_bundle, 3),
            "sync_2000_columns_s": round(t_sync, 3),
            "sqlite_copy_2000_columns_s": round(t_copy, 3),
            "sync_2000_columns_cpu_s": round(c_sync, 3),
            "sync_push_2000_columns_s": round(t_push, 3),
            "sync_ops_2000_columns_s": round(t_ops, 3),
            "sqlite_copy_2000_columns_cpu_s": round(c_copy, 3),
            "store_writes_2000_columns_s": round(t_floor, 3),
            "store_writes_2000_columns_cpu_s": round(c_floor, 3),
            "sync_photos_mb_per_s": round(2 * size_mb / t_photos, 1)}
