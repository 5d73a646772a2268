"""Hub throughput: operations stored per second with 20 devices pushing at once.

``hub_pg_ops_per_s``: two ``fieldcol hub serve`` processes over one PostgreSQL database (a
server of our own in a temporary folder, fsync on), the devices split between them.
``hub_sqlite_ops_per_s``: one hub process over SQLite (the default hub), the same pushes, in
the same run. Each device pushes its own site (100 columns, 400 readings: one operation per
row) in batches of 500 over
HTTP on loopback; the clock runs from the first push to the last acknowledgement. Without
PostgreSQL's server programs ``hub_pg_ops_per_s`` is null.
"""

from __future__ import annotations

import json
import tempfile
import threading
import time
from pathlib import Path
from typing import Any

DEVICES = 20
BATCH = 500


def _bodies(root: Path, n_cols: int, n_read: int) -> list[list[bytes]]:
    """Each device's push requests, JSON already encoded (the devices' own work is not timed)."""
    from fieldcol.bench._sync import _site
    from fieldcol.store import Store
    from fieldcol.store._migrations import MIGRATION_NAMES

    out = []
    for i in range(DEVICES):
        with Store(root / f"dev{i}.db") as s:
            _site(s, n_cols, n_read)
            s.update_site(s.list_sites()[0].id, name=f"Bench hub site {i}")
            ops = [o.to_json() for o in s.ops_after(0, 10**7)]
            out.append([json.dumps({"device": s.device_id, "schema": list(MIGRATION_NAMES),
                                    "ops": ops[k:k + BATCH]}).encode()
                        for k in range(0, len(ops), BATCH)])
    return out


def _push_all(urls: list[str], tokens: list[str], bodies: list[list[bytes]]) -> float:
    """Operations stored per second, every device pushing at once (device i to urls[i % n])."""
    import httpx

    start = threading.Barrier(DEVICES + 1)
    stored = [0] * DEVICES
    errors: list[str] = []

    def device(i: int) -> None:
        with httpx.Client(timeout=300, headers={"Authorization": f"Bearer {tokens[i]}",
                                                "Content-Type": "application/json"}) as h:
            start.wait()
            for body in bodies[i]:
                r = h.post(f"{urls[i % len(urls)]}/v1/push", content=body)
                if r.status_code != 200:
                    errors.append(r.text[:200])
                    return
                stored[i] += r.json()["new"]

    threads = [threading.Thread(target=device, args=(i,)) for i in range(DEVICES)]
    for t in threads:
        t.start()
    start.wait()
    t0 = time.perf_counter()
    for t in threads:
        t.join()
    elapsed = time.perf_counter() - t0
    if errors:
        raise RuntimeError(f"a push failed: {errors[0]}")
    return sum(stored) / elapsed


def run(*, quick: bool = False) -> dict[str, Any]:
    """Operations stored per second by the hub over PostgreSQL (two processes) and SQLite (one).

    Example:
        >>> sorted(run(quick=True))
        ['hub_ops_pushed', 'hub_pg_ops_per_s', 'hub_sqlite_ops_per_s']
    """
    from fieldcol.sync._hubapi import open_hub
    from fieldcol.sync._loopback import HubProcess
    from fieldcol.sync._pgserver import TempPostgres, server_programs

    n_cols, n_read = (5, 20) if quick else (100, 400)
    out: dict[str, Any] = {}
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        bodies = _bodies(root, n_cols, n_read)
        out["hub_ops_pushed"] = sum(len(json.loads(b)["ops"]) for bs in bodies for b in bs)
        hub = open_hub(root / "sqlite-hub")
        tokens = [hub.add_device(f"dev-{i}") for i in range(DEVICES)]
        hub.close()
        proc = HubProcess(root / "sqlite-hub")
        try:
            out["hub_sqlite_ops_per_s"] = round(_push_all([proc.url], tokens, bodies))
        finally:
            proc.stop()
        out["hub_pg_ops_per_s"] = None
        if server_programs() is not None:
            pg = TempPostgres(durable=True)
            try:
                url = pg.create("hub")
                hub = open_hub(root / "pg-hub", url)
                tokens = [hub.add_device(f"dev-{i}") for i in range(DEVICES)]
                hub.close()
                procs = [HubProcess(root / "pg-hub", url), HubProcess(root / "pg-hub", url)]
                try:
                    out["hub_pg_ops_per_s"] = round(_push_all([p.url for p in procs], tokens,
                                                              bodies))
                finally:
                    for p in procs:
                        p.stop()
            finally:
                pg.close()
    return out
