"""Bench case: the Section and Condition tabs' work behind one tap, on a real store.

A type-ahead keystroke (catalogue search), the catalogue matches of a measured section, and a
bow reading saved with the column checked again (the save's share of the app's tap-to-status).
"""

from __future__ import annotations

import statistics
import tempfile
import time
from pathlib import Path


def _ms(fn, repeat: int) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return round(statistics.median(times) * 1000, 3)


def run(*, quick: bool = False) -> dict[str, float]:
    """Median times in ms.

    Returns:
        section_search_ms (one keystroke of the type-ahead), section_match_ms (catalogue
        matches of four measured dimensions), reading_save_ms (a bow reading kept, the column
        checked again and the check saved).
    """
    from fieldcol.demo import SITE_NAME, build_demo
    from fieldcol.store import open_store
    from fieldcol.ui import readings as r
    from fieldcol.ui import section as sx

    repeat = 5 if quick else 30
    sx.catalogue_search("w")  # the index is built once per process, as in the app
    prefixes = ["w", "w1", "w14", "w14x", "w14x9", "hss8x", "heb3", "pipe6"]
    search = _ms(lambda: [sx.catalogue_search(p, 6) for p in prefixes], repeat) / len(prefixes)
    typed = {"d": "14.02", "bf": "14.52", "tf": "0.71", "tw": "0.44"}
    match = _ms(lambda: sx.find_matches("i", typed, "caliper", "us"), repeat)
    with tempfile.TemporaryDirectory() as tmp:
        with open_store(Path(tmp) / "bench.db") as store:
            build_demo(store)
            cid = store.find_column(store.site_by_name(SITE_NAME).id, "A/1-G").id
            values = iter(f"{i % 7 + 1}/8" for i in range(10_000))
            save = _ms(lambda: r.add_reading(store, cid, "bow", next(values), axis="weak",
                                             person="bench"), repeat)
    return {"section_search_ms": round(search, 3), "section_match_ms": match,
            "reading_save_ms": save}
