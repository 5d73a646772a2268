"""Store speed on a large device: open, list a site's columns, search findings.

Builds (in a temporary folder) 50 sites, 20,000 columns, 100,000 measurements, 20,000 checks,
5,000 findings and 5,000 photo rows, then times the three things an engineer waits for.
Targets: open < 0.5 s, one page of 100 columns < 50 ms, a findings search < 50 ms.
"""

from __future__ import annotations

import hashlib
import io
import json
import random
import statistics
import tempfile
import time
import uuid
from pathlib import Path


def _book(device: str, now: str) -> dict:
    return {"id": str(uuid.uuid4()), "created_at": now, "updated_at": now,
            "device_id": device, "deleted_at": None}


_WORDS = ("corrosion", "pitting", "flange", "web", "base plate", "splice", "bolt", "weld",
          "dent", "bow", "paint", "brace", "cable", "anchor", "grout", "crack", "rust", "scale")


def build(folder: Path, *, scale: float = 1.0, seed: int = 7) -> Path:
    """Fill a new store in ``folder`` with ``scale`` times the full bench data; returns its path.

    Rows go in through sqlite-utils' ``insert_all`` in a few large transactions (uniform keys
    in every row), which is how a bulk load must be done; the app itself commits each change.

    Example:
        >>> build(Path("."), scale=0.001).name
        'bench.db'
    """
    from PIL import Image

    from fieldcol.store import Store
    from fieldcol.store._validate import now_utc

    rnd = random.Random(seed)
    n_sites, n_cols = max(1, int(50 * scale)), int(20_000 * scale)
    n_meas, n_find, n_photo = int(100_000 * scale), int(5_000 * scale), int(5_000 * scale)
    path = folder / "bench.db"
    with Store(path) as s:
        dev, now = s.device_id, now_utc()
        real = []
        for i in range(5):  # a few real image files that the photo rows share
            buf = io.BytesIO()
            Image.new("RGB", (120, 90), (40 * i, 80, 200 - 30 * i)).save(buf, "JPEG")
            real.append(s.add_photo(buf.getvalue(), original_name=f"bench-{i}.jpg"))
        sites = [dict(_book(dev, now), name=f"Bench site {i:02d}", address=None, owner_ref=None,
                      code=rnd.choice(("aisc360-22", "en1993-1-1")),
                      unit_system=rnd.choice(("us", "si")), notes=None) for i in range(n_sites)]
        cols, checks = [], []
        for i in range(n_cols):
            site = sites[i % n_sites]
            tag = f"{chr(65 + (i // n_sites) % 26)}/{i // n_sites // 26 + 1}-L{i % 4 + 1}"
            rec = {"tag": tag, "section": rnd.choice(("W14X90", "W12X65", "HSS8X8X1/2")),
                   "material": "A992", "length": f"{rnd.randint(10, 40)} ft",
                   "demand": {"axial": f"{rnd.randint(100, 900)} kip", "basis": "lrfd"}}
            cols.append(dict(_book(dev, now), site_id=site["id"], tag=tag, location=None,
                             level_id=None, grid=tag.split("-")[0], record=json.dumps(rec)))
            util = rnd.uniform(0.2, 1.3)
            checks.append(dict(_book(dev, now), column_id=cols[-1]["id"], checked_at=now,
                               record=json.dumps(rec), code="aisc360-22", edition="2022",
                               app_version="bench", utilization=util,
                               governing_mode="flexural buckling (weak)",
                               result=json.dumps({"utilization": {"value": util}}), note=None))
        meas = []
        for i in range(n_meas):
            col = cols[i % n_cols]
            inches = rnd.uniform(0.3, 1.0)
            meas.append(dict(_book(dev, now), column_id=col["id"], visit_id=None,
                             quantity=rnd.choice(("length", "section.tf", "section.tw")),
                             kind="length", text=f"{inches:.3f} in", value=inches * 25.4,
                             unit="mm", gauge="caliper", taken_by="bench",
                             taken_at=now, corrects=None, note=None))
        finds = [dict(_book(dev, now), site_id=sites[i % n_sites]["id"],
                      column_id=cols[i % n_cols]["id"] if n_cols else None,
                      text=" ".join(rnd.choice(_WORDS) for _ in range(12)),
                      category=rnd.choice(("corrosion", "damage", "bracing", "other")),
                      severity=rnd.choice(("info", "low", "medium", "high")),
                      status=rnd.choice(("open", "closed"))) for i in range(n_find)]
        photos = []
        for i in range(max(0, n_photo - len(real))):
            p = real[i % len(real)]
            photos.append(dict(_book(dev, now),
                               sha256=hashlib.sha256(f"bench-{i}".encode()).hexdigest(),
                               path=p.path, thumb_path=p.thumb_path, format="JPEG",
                               width=p.width, height=p.height, bytes=p.bytes,
                               original_name=None, exif_taken_at=None, latitude=None,
                               longitude=None))
        for table, rows in (("sites", sites), ("columns", cols), ("checks", checks),
                            ("measurements", meas), ("findings", finds), ("photos", photos)):
            with s.db.atomic():
                s.db[table].insert_all(rows, batch_size=2000)
        with s.db.atomic():
            s.db.execute("ANALYZE")
    return path


def _median_ms(fn, repeat: int) -> float:
    times = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append((time.perf_counter() - t) * 1000)
    return statistics.median(times)


_FRESH = """
import sys, time
t = time.perf_counter()
from fieldcol.store import Store
Store(sys.argv[1], create=False).close()
print(time.perf_counter() - t)
"""


def _fresh_process_open_s(path: Path) -> float:
    """Import of the store package plus one open, timed inside a new Python process."""
    import subprocess
    import sys

    out = subprocess.run([sys.executable, "-c", _FRESH, str(path)], capture_output=True,
                         text=True, check=True, timeout=120)
    return float(out.stdout.strip())


def run(*, quick: bool = False) -> dict[str, float]:
    """Build the bench store and time open, list and search.

    Args:
        quick: use a tenth of the data.

    Returns:
        ``store_build_s``, ``store_open_s`` (median of 5 opens), ``store_import_and_open_s``
        (a new process importing the store and opening it once), ``store_list_ms`` (one site,
        page of 100, median of 20), ``store_search_ms`` (two-word findings search, median of
        20) and the row counts built.

    Example:
        >>> run(quick=True)["store_columns"]
        2000.0
    """
    from fieldcol.store import Store

    scale = 0.1 if quick else 1.0
    with tempfile.TemporaryDirectory(prefix="fieldcol-bench-") as tmp:
        t0 = time.perf_counter()
        path = build(Path(tmp), scale=scale)
        build_s = time.perf_counter() - t0
        opens = []
        for _ in range(5):
            t = time.perf_counter()
            s = Store(path, create=False)
            opens.append(time.perf_counter() - t)
            s.close()
        fresh = _fresh_process_open_s(path)
        with Store(path, create=False) as s:
            sites = s.list_sites()
            site = sites[len(sites) // 2]
            list_ms = _median_ms(lambda: s.list_columns(site.id, limit=100, offset=100), 20)
            search_ms = _median_ms(lambda: s.search_findings("corrosion flange", limit=50), 20)
            counts = {t: float(s.db.conn.execute(f"SELECT count(*) FROM {t}").fetchone()[0])
                      for t in ("sites", "columns", "measurements", "findings", "photos")}
    return {"store_build_s": build_s, "store_open_s": statistics.median(opens),
            "store_import_and_open_s": fresh,
            "store_list_ms": list_ms, "store_search_ms": search_ms,
            **{f"store_{k}": v for k, v in counts.items()}}


if __name__ == "__main__":  # pragma: no cover
    import sys

    for k, val in run(quick="--quick" in sys.argv).items():
        print(f"{k:24s} {val:12.3f}")
