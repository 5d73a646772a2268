"""Uncertainty speed: one column with moments (a beam reaction and a bow) sampled N times in one
batch through the beam-column check (AISC and EN)."""

from __future__ import annotations

import time

from fieldcol.assess import assess
from fieldcol.uncertainty import run_samples

RECORDS = {
    "aisc": {"tag": "BENCH-1", "section": "W10X49", "material": "A992", "length": "14 ft",
             "demand": {"axial": "200 kip", "reactions": [{"load": "40 kip", "axis": "strong"}]},
             "condition": {"bow": "0.5 in"}},
    "en": {"tag": "BENCH-2", "section": "HE 300 B", "material": "S355", "length": "5 m",
           "code": "en1993-1-1",
           "demand": {"axial": "1500 kN", "reactions": [{"load": "100 kN", "axis": "strong",
                                                        "eccentricity": "1000 mm"}]}},
}


def run(*, quick: bool = False) -> dict[str, float]:
    """Time ``n`` samples of each record (best of 3; the column's own check made beforehand).

    Returns:
        samples, samples_seconds_aisc, samples_seconds_en.
    """
    n = 10_000 if quick else 100_000
    out: dict[str, float] = {"samples": n}
    for name, rec in RECORDS.items():
        a = assess(rec)
        run_samples(rec, 100, check=a)   # warm imports
        best = float("inf")
        for _ in range(1 if quick else 3):
            t0 = time.perf_counter()
            run_samples(rec, n, check=a)
            best = min(best, time.perf_counter() - t0)
        out[f"samples_seconds_{name}"] = round(best, 3)
    return out
