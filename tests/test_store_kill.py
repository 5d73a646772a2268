"""Crash safety: a writing process is killed (SIGKILL) at random points, again and again.

After every kill the database must open, pass SQLite's ``PRAGMA integrity_check`` and hold every
change whose commit had returned (the child prints each id only after the call returns), and
no photo row may point at a missing or damaged file. Edits are checked by content: each field
holds the last value confirmed, or the value of the one edit in flight when the kill came.
A multi-row transaction is all there or not at all. Killing a program while it creates or
upgrades a store leaves a store the next program opens and finishes.
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
BATCH = 4
OPENS = 6

CHILD = r"""
import io, random, sys
from PIL import Image
from fieldcol.store import Store

db, seed = sys.argv[1], int(sys.argv[2])
BATCH = 4
rnd = random.Random(seed)
s = Store(db)
site = s.find_site("Kiln Yard") or s.add_site("Kiln Yard", code="aisc360-22", unit_system="us")
print("sites", site.id, flush=True)
cols = [r["id"] for r in s._rows("SELECT id FROM columns WHERE deleted_at IS NULL "
                                  "AND tag NOT LIKE 'B%'")]
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
    # every step also edits (content checked) and writes one multi-row transaction
    if cols:
        target = rnd.choice(cols)
        length = f"{rnd.randint(100, 900)} in"
        print("try", target, "length", length, flush=True)
        rec = s.get_column(target).record
        s.update_column(target, record=dict(rec, length=length), grid=f"G{n}")
        print("ok", flush=True)
    print("try-batch", f"B{seed}-{n}", BATCH, flush=True)
    with s._tx():
        for i in range(BATCH):
            s.add_column(site.id, {"tag": f"B{seed}-{n}-{i}", "section": "W8X31",
                                   "length": "10 ft"})
    print("ok", flush=True)
"""


@pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs POSIX signals")
def test_killed_writer_loses_nothing_committed(tmp_path: Path):
    db = tmp_path / "kill.db"
    rnd = random.Random(20260304)
    committed: dict[str, set[str]] = {}
    deleted: set[str] = set()
    lengths: dict[str, str] = {}  # column id -> last confirmed length
    batches: dict[str, bool] = {}  # confirmed multi-row transactions
    env = dict(os.environ, PYTHONUNBUFFERED="1")
    for run in range(KILLS):
        proc = subprocess.Popen([sys.executable, "-c", CHILD, str(db), str(run)],
                                stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                                env=env)
        first = proc.stdout.readline()  # the child is in its write loop from here on
        assert first, proc.stderr.read()
        time.sleep(rnd.uniform(0.0, 0.25))
        proc.send_signal(signal.SIGKILL)
        proc.wait()
        # read through the same buffered stream readline() used (communicate() would skip
        # what it had buffered already)
        rest, err = proc.stdout.read(), proc.stderr.read()
        assert proc.returncode == -signal.SIGKILL, err
        lines = (first + rest).split("\n")[:-1]  # a cut-off last line was never confirmed
        pending = None
        in_flight_batch = None
        for line in lines:
            word, *more = line.split(" ", 3)
            if word == "try":
                pending = (more[0], more[2])  # column id, length
            elif word == "try-batch":
                pending = ("batch", more[0])
            elif word == "ok":
                kind, value = pending
                if kind == "batch":
                    batches[value] = True
                else:
                    lengths[kind] = value
                pending = None
            elif word == "deleted":
                deleted.add(more[0])
            else:
                committed.setdefault(word, set()).add(more[0])
        if pending and pending[0] == "batch":
            in_flight_batch = pending[1]
        with Store(db) as s:
            # edits: each column's length is the last confirmed, or the one in flight
            for col_id, want in lengths.items():
                got = s.get_column(col_id).record["length"]
                allowed = {want}
                if pending and pending[0] == col_id:
                    allowed.add(pending[1])
                assert got in allowed, f"run {run}: {col_id} length {got}, confirmed {want}"
            if pending and pending[0] != "batch":  # the edit in flight: whichever landed
                lengths[pending[0]] = s.get_column(pending[0]).record["length"]
            # multi-row transactions: all four rows or none
            counts: dict[str, int] = {}
            for r in s._rows("SELECT tag FROM columns WHERE tag LIKE 'B%-%-%'"):
                counts[r["tag"].rsplit("-", 1)[0]] = counts.get(r["tag"].rsplit("-", 1)[0], 0) + 1
            for batch, n in counts.items():
                assert n == BATCH, f"run {run}: batch {batch} holds {n} of {BATCH} rows"
            for batch in batches:
                assert counts.get(batch) == BATCH, f"run {run}: confirmed batch {batch} lost"
            if in_flight_batch and counts.get(in_flight_batch):
                batches[in_flight_batch] = True
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
    print(f"{KILLS} kills, {total} committed rows checked, {len(deleted)} deletions, "
          f"{len(lengths)} edited columns, {len(batches)} transactions")
    assert total > KILLS and lengths and batches  # the children really wrote


OPENER = r"""
import sys
from fieldcol.store import Store
print("opening", flush=True)
with Store(sys.argv[1]) as s:
    print("open", s.schema_version, flush=True)
"""


@pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs POSIX signals")
@pytest.mark.parametrize("kind", ["create", "upgrade"])
def test_killed_while_creating_or_upgrading(tmp_path: Path, kind: str):
    from fieldcol.store import SCHEMA_VERSION
    from fieldcol.store._migrations import MIGRATION_NAMES

    rnd = random.Random(20261203)
    env = dict(os.environ, PYTHONUNBUFFERED="1")
    old = tmp_path / "old.db"
    with Store(old, _stop_before=MIGRATION_NAMES[1]) as s:  # the first schema version
        site = s.add_site("Kiln Yard", code="aisc360-22", unit_system="us")
        s.add_column(site.id, {"tag": "K1", "section": "W12X65", "length": "12 ft"})
    killed = 0
    for run in range(OPENS):
        db = tmp_path / f"{kind}-{run}.db"
        if kind == "upgrade":
            db.write_bytes(old.read_bytes())
        proc = subprocess.Popen([sys.executable, "-c", OPENER, str(db)],
                                stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=env)
        assert proc.stdout.readline().strip() == "opening", proc.stderr.read()
        time.sleep(rnd.uniform(0.0, 0.06))
        proc.send_signal(signal.SIGKILL)
        out, _ = proc.communicate()
        killed += "open" not in out
        with Store(db) as s:  # the next program finishes the job
            assert s.integrity_check() == "ok" and s.schema_version == SCHEMA_VERSION
            applied = [r["name"] for r in s._rows("SELECT name FROM _sqlite_migrations")]
            assert applied == list(MIGRATION_NAMES)
            if kind == "upgrade":
                site = s.find_site("Kiln Yard")
                assert site and s.find_column(site.id, "K1").record["length"] == "12 ft"
    print(f"{kind}: {killed} of {OPENS} programs killed before the store was open")
