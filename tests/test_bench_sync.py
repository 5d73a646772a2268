"""The sync bench's measurements: each one is taken, and the floor it compares with is real."""

from __future__ import annotations

import sqlite3

from fieldcol.bench import _sync
from fieldcol.store import Store


def test_quick_sync_bench_gives_every_measurement():
    res = _sync.run(quick=True)
    for key in ("sync_2000_columns_s", "sqlite_copy_2000_columns_s", "store_writes_2000_columns_s",
                "sync_2000_columns_cpu_s", "store_writes_2000_columns_cpu_s",
                "sync_push_2000_columns_s", "sync_ops_2000_columns_s",
                "sync_photos_mb_per_s", "bundle_import_5000_rows_s"):
        assert res[key] >= 0, key


def test_store_writes_leave_a_store_that_reads_like_the_source(tmp_path):
    # the floor writes the very rows and log a merge would: the copy opens as a store and
    # lists the same columns, readings and operations
    with Store(tmp_path / "a.db") as a:
        _sync._site(a, 12, 60)
        site = a.list_sites()[0].id
        tags = [c.tag for c in a.list_columns(site)]
    _sync._store_writes(tmp_path / "a.db", tmp_path / "b.db")
    with Store(tmp_path / "b.db") as b:
        assert [c.tag for c in b.list_columns(site)] == tags
    counts = []
    for name in ("a.db", "b.db"):
        con = sqlite3.connect(tmp_path / name)
        counts.append([con.execute(f"SELECT count(*) FROM {t}").fetchone()[0]
                       for t in ("measurements", "sync_ops", "sync_rows")])
        con.close()
    assert counts[0] == counts[1] == [60, 73, 73]
