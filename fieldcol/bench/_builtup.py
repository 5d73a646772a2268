"""Bench case: a built-up column, from the card's "Show it" to a check under each code.

The properties of two battened channels composed from their outlines (the card's preview),
and one assessment per code (AISC 360-22 E6, EN 1993-1-1 6.4 with its bisection, elastic with
Engesser's correction).
"""

from __future__ import annotations

import statistics
import time

_RECORD = {"tag": "K/7", "length": "18 ft", "material": "A7",
           "section": {"built": {"arrangement": "channels", "channel": "C12X20.7", "gap": "6 in",
                                 "toes": "out", "battens": {"spacing": "24 in", "depth": "8 in",
                                                            "thickness": "3/8 in"}}}}
_TYPED = {"channel": "C12X20.7", "gap": "6", "battens.spacing": "24", "battens.depth": "8",
          "battens.thickness": "3/8"}


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
        builtup_preview_ms (the card's properties and sketch), builtup_check_<code>_ms (one
        assessment of a battened column: aisc, en, elastic).

    Example:
        >>> sorted(run(quick=True))[0]
        'builtup_check_aisc_ms'
    """
    from fieldcol.assess import assess
    from fieldcol.ui import builtup_model as bm

    repeat = 3 if quick else 20
    out = {"builtup_preview_ms": _ms(lambda: bm.built_preview("channels", "battens", _TYPED,
                                                               "us"), repeat)}
    for short, code, basis in (("aisc", "aisc360-22", "lrfd"), ("en", "en1993-1-1", "en"),
                               ("elastic", "elastic", "none")):
        rec = {**_RECORD, "code": code, "demand": {"axial": "150 kip", "basis": basis}}
        out[f"builtup_check_{short}_ms"] = _ms(lambda: assess(rec), repeat)
    return out
