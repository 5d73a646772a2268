"""Bench case: a large column schedule imported (preview, then apply) into a new site.

Run in a fresh process so its peak memory (``VmHWM``) is the import's own; its processor time
(``import_cpu_s``, preview and apply) is given beside the wall time, which on a shared machine
also counts the time other work held the processor. Goal from the
issue: 100,000 rows in under 10 s, memory that does not grow with the file: the case imports
20,000 rows and 100,000 rows, each in a process of its own, and reports the peak of both
(``import_peak_mb_20k`` against ``import_peak_mb``).
"""

from __future__ import annotations

import json
import subprocess
import sys
import tempfile
from pathlib import Path

SECTIONS = ("W14X90", "W12X65", "W10X49", "W8X31", "W14X120", "W12X40")

_CHILD = r"""
import json, resource, sys, time
from fieldcol.store import Store, apply_schedule, preview_schedule

def peak_mb():
    # this process's own high-water mark (VmHWM); ru_maxrss keeps the parent's from before exec
    try:
        with open("/proc/self/status") as f:
            for line in f:
                if line.startswith("VmHWM:"):
                    return int(line.split()[1]) / 1024
    except OSError:
        pass
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024

db, csv = sys.argv[1], sys.argv[2]
with Store(db) as s:
    base = peak_mb()
    t0, c0 = time.perf_counter(), time.process_time()
    p = preview_schedule(s, "Import bench", csv, code="aisc360-22")
    t1 = time.perf_counter()
    apply_schedule(s, "Import bench", csv, create_site={"code": "aisc360-22",
                   "unit_system": "us"}, preview=p)
    t2, c2 = time.perf_counter(), time.process_time()
    peak = peak_mb()
print(json.dumps({"preview": t1 - t0, "apply": t2 - t1, "cpu": c2 - c0, "peak_mb": peak,
                  "start_mb": base}))
"""


def write_schedule(path: Path, n: int) -> None:
    """``n`` rows of a plain schedule: tag, level, grid, section, length, material, demand."""
    with open(path, "w", newline="") as f:
        f.write("tag,level,grid,section,length (ft),material,demand\n")
        for i in range(n):
            grid = f"{chr(65 + i % 26)}/{i // 26 + 1}"
            f.write(f"{grid}-L{i % 7 + 1},L{i % 7 + 1},{grid},{SECTIONS[i % len(SECTIONS)]},"
                    f"{12 + i % 15},A992,{100 + i % 400} kip\n")


def run(*, quick: bool = False) -> dict[str, float]:
    """Returns import_rows, import_100k_s (preview + apply), its parts and the peak memory,
    and the same file's first fifth alone (``..._20k``: time and peak memory), so the two
    peaks show whether memory grows with the file."""
    n = 5_000 if quick else 100_000
    small = measure(n // 5)
    out = measure(n)
    out.update({"import_rows_20k": small["import_rows"], "import_20k_s": small["import_100k_s"],
                "import_cpu_s_20k": small["import_cpu_s"],
                "import_peak_mb_20k": small["import_peak_mb"],
                "import_growth_mb_20k": small["import_growth_mb"]})
    return out


def measure(n: int) -> dict[str, float]:
    """Import an ``n``-row schedule in a fresh process; the measurements of ``run``.

    Example: ``measure(100)["import_rows"]`` gives ``100``.
    """
    with tempfile.TemporaryDirectory(prefix="fieldcol-bench-import-") as tmp:
        csv = Path(tmp) / "schedule.csv"
        write_schedule(csv, n)
        out = subprocess.run([sys.executable, "-c", _CHILD, str(Path(tmp) / "i.db"), str(csv)],
                             check=True, capture_output=True, text=True).stdout
    r = json.loads(out.strip().splitlines()[-1])
    return {"import_rows": n, "import_100k_s": round(r["preview"] + r["apply"], 2),
            "import_preview_s": round(r["preview"], 2), "import_apply_s": round(r["apply"], 2),
            "import_cpu_s": round(r["cpu"], 2),
            "import_peak_mb": round(r["peak_mb"], 1),
            "import_growth_mb": round(r["peak_mb"] - r["start_mb"], 1)}
