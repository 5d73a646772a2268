"""Bench case: what the engineer waits for around a check and a report.

- ``check_one_ms``: one column record checked (``assess``), warm, median.
- ``check_cli_s``: ``fieldcol check FILE`` as a new process, wall time, best of 5 (start-up and
  imports included: what a person at a terminal waits); ``check_cli_cpu_s`` its processor time,
  best of the same 5 (on a shared machine the wall time also counts others' work).
- ``report_500_s``: a 500-column site with findings and photos reported to PDF (and its CSV).
"""

from __future__ import annotations

import io
import json
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

RECORD = {"tag": "B1", "section": "W14X90", "material": "A992", "length": "24 ft",
          "demand": {"axial": "650 kip", "basis": "lrfd"},
          "restraints": {"weak": {"braces": [{"at": "12 ft", "stiffness": "80 kip/in",
                                              "strength": "10 kip"}]}}}
SECTIONS = ("W14X90", "W12X65", "W10X49", "W8X31", "W14X120", "HSS8X8X1/2", "W12X40")


def _check_one(repeat: int) -> float:
    from fieldcol.assess import assess

    assess(RECORD)
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        assess(RECORD)
        times.append(time.perf_counter() - t0)
    return round(statistics.median(times) * 1000, 3)


def _check_cli(folder: Path, repeat: int) -> tuple[float, float]:
    import os

    f = folder / "column.json"
    f.write_text(json.dumps(RECORD))
    # as installed: the modules' bytecode compiled once (pip does it at install), here into a
    # folder of the bench's own so the checkout stays clean
    env = dict(os.environ, PYTHONPYCACHEPREFIX=str(folder / "pyc"))
    env.pop("PYTHONDONTWRITEBYTECODE", None)
    subprocess.run([sys.executable, "-m", "fieldcol", "check", str(f)], check=True,
                   stdout=subprocess.DEVNULL, env=env)
    best = best_cpu = float("inf")
    for _ in range(repeat):
        t0, c0 = time.perf_counter(), _children_cpu()
        subprocess.run([sys.executable, "-m", "fieldcol", "check", str(f)], check=True,
                       stdout=subprocess.DEVNULL, env=env)
        best = min(best, time.perf_counter() - t0)
        best_cpu = min(best_cpu, _children_cpu() - c0)
    return round(best, 3), round(best_cpu, 3)


def _children_cpu() -> float:
    """Processor time of the finished child processes so far (user and system)."""
    import resource

    r = resource.getrusage(resource.RUSAGE_CHILDREN)
    return r.ru_utime + r.ru_stime


def build_site(folder: Path, n: int) -> tuple[Path, str]:
    """A store with one ``n``-column site: every column checked, a finding with a photo on
    every fifth, a measurement on every third; returns (store path, site name)."""
    from PIL import Image

    from fieldcol.assess import assess
    from fieldcol.store import Store

    path, name = folder / "report.db", f"Bench works {n}"
    with Store(path) as s, s.transaction():
        site = s.add_site(name, code="aisc360-22", unit_system="us", address="1 Bench Road")
        photos = []
        for i in range(6):
            buf = io.BytesIO()
            Image.new("RGB", (640, 480), (30 * i, 90, 200 - 25 * i)).save(buf, "JPEG")
            photos.append(buf.getvalue())
        for i in range(n):
            tag = f"{chr(65 + i % 26)}/{i // 26 + 1}-G"
            rec = dict(RECORD, tag=tag, section=SECTIONS[i % len(SECTIONS)],
                       length=f"{12 + i % 14} ft")
            col = s.add_column(site.id, rec, grid=tag[:-2])
            s.save_check(col.id, assess(rec).to_dict(), record=rec)
            if i % 5 == 0:
                f = s.add_finding(site.id, f"Flange pitting near the base of {tag}, about "
                                  "1/16 in deep over 6 in", category="corrosion",
                                  severity=("high", "medium", "low")[i % 3], column_id=col.id)
                s.add_photo(photos[i % len(photos)], original_name=f"{i}.jpg",
                            finding_id=f.id)
    return path, name


def _report(folder: Path, n: int) -> float:
    from fieldcol.report import site_report
    from fieldcol.store import Store

    path, name = build_site(folder, n)
    with Store(path, readonly=True) as s:
        site = s.site_by_name(name)
        t0 = time.perf_counter()
        site_report(s, site.id, folder / "bench.pdf", report_date="2026-03-10")
        return round(time.perf_counter() - t0, 2)


def run(*, quick: bool = False) -> dict[str, float]:
    """Returns check_one_ms, check_cli_s, check_cli_cpu_s, report_columns and report_500_s
    (the report of ``report_columns`` columns: 500, or 50 with ``quick``)."""
    n = 50 if quick else 500
    with tempfile.TemporaryDirectory(prefix="fieldcol-bench-report-") as tmp:
        folder = Path(tmp)
        one = _check_one(50 if quick else 500)
        cli, cli_cpu = _check_cli(folder, 2 if quick else 5)
        return {"check_one_ms": one, "check_cli_s": cli, "check_cli_cpu_s": cli_cpu,
                "report_columns": n, "report_500_s": _report(folder, n)}
