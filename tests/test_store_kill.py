"""Crash safety: a writing process is killed (SIGKILL) at random points, again and again.

After every kill the database must open, pass SQLite's ``PRAGMA integrity_check`` and hold every
change whose commit had returned (the child prints each id only after the call returns), and
no photo row may point at a missing or damaged file.
"""

from __future__ import annotations

import hashlib
import os
import random
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from fieldcol.store import Store

KILLS = 25

CHILD = r"""
import io, random, sys
from PIL import Image
from fieldcol.store import Store

db, seed = sys.argv[1], int(sys.argv[2])
rnd = random.Random(seed)
s = Store(db)
site = s.find_site("Kiln Yard") or s.add_site("Kiln Yard", code="aisc360-22", unit_system="us")
print("sites", site.id, flush=True)
cols = [r["id"] for r in s._rows("SELECT id FROM columns WHERE deleted_at IS NULL")]
n = 0
while True:
    n += 1
    op = rnd.random()
    if op < 0.3 or not cols:
        c = s.add_column(site.id, {"tag": f"T{seed}-{n}", "section": "W12X65", "length": "12 ft"},
                         level=f"L{n % 3}")
        cols.append(c.id)
        print("columns", c.id, flush=True)
    elif op < 0.6:
        m = s.add_measurement(rnd.choice(cols), "length", f"{rnd.randint(100, 500)} in")
        print("measurements", m.id, flush=True)
    elif op < 0.8:
        f = s.add_finding(site.id, f"pitting seen on run {seed} step {n}", category="corrosion",
                          severity="low", column_id=rnd.choice(cols))
        print("findings", f.id, flush=True)
    elif op < 0.9:
        buf = io.BytesIO()
        Image.new("RGB", (64, 48), (seed % 256, n % 256, rnd.randint(0, 255))).save(buf, "JPEG")
        p = s.add_photo(buf.getvalue(), column_id=rnd.choice(cols))
        print("photos", p.id, flush=True)
    else:
        victim = cols.pop(rnd.randrange(len(cols)))
        s.delete("columns", victim)
        print("deleted", victim, flush=True)
"""


@pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs POSIX signals")
def test_killed_writer_loses_nothing_committed(tmp_path: Path):
    db = tmp_path / "kill.db"
    rnd = random.Random(20260304)
    committed: dict[str, set[str]] = {}
    deleted: set[str] = set()
    env = dict(os.environ, PYTHONUNBUFFERED="1")
    for run in range(KILLS):
        proc = subprocess.Popen([sys.executable, "-c", CHILD, str(db), str(run)],
                                stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                                env=env)
        first = proc.stdout.readline()  # the child is in its write loop from here on
        assert first, proc.stderr.read()
        time.sleep(rnd.uniform(0.0, 0.25))
        proc.send_signal(signal.SIGKILL)
        rest, err = proc.communicate()
        assert proc.returncode == -signal.SIGKILL, err
        lines = (first + rest).split("\n")[:-1]  # a cut-off last line was never confirmed
        for line in lines:
            table, row_id = line.split()
            if table == "deleted":
                deleted.add(row_id)
            else:
                committed.setdefault(table, set()).add(row_id)
        with Store(db) as s:
            assert s.integrity_check() == "ok"
            for table, ids in committed.items():
                have = {r["id"] for r in s._rows(f"SELECT id FROM {table}")}
                assert ids <= have, f"run {run}: lost {len(ids - have)} committed {table}"
            if deleted:
                marks = ",".join("?" * len(deleted))
                alive = s._rows(f"SELECT id FROM columns WHERE id IN ({marks}) "
                                "AND deleted_at IS NULL", list(deleted))
                assert alive == [], f"run {run}: a committed deletion came undone"
            for p in s._rows("SELECT sha256, path FROM photos"):
                data = (s.photos_dir / p["path"]).read_bytes()
                assert hashlib.sha256(data).hexdigest() == p["sha256"]
    total = sum(len(v) for v in committed.values())
    print(f"{KILLS} kills, {total} committed rows checked, {len(deleted)} deletions")
    assert total > KILLS  # the children really wrote
