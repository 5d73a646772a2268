"""Engine speed: a batch of varied columns through the full AISC and EN checks, against a plain
per-column loop of the same public functions."""

from __future__ import annotations

import time

import numpy as np

from fieldcol.codes import check_aisc360, check_en1993
from fieldcol.sections import i_section


def _columns(n: int, seed: int = 7) -> dict[str, np.ndarray]:
    """Varied rolled I columns, mm and MPa: depths 150-900, stocky to slender, 2-12 m tall."""
    rng = np.random.default_rng(seed)
    d = rng.uniform(150, 900, n)
    bf = d * rng.uniform(0.35, 1.0, n)
    tf = bf * rng.uniform(0.04, 0.09, n)
    tw = np.minimum(tf * rng.uniform(0.5, 0.8, n), bf / 4)
    r = tw * rng.uniform(0.8, 1.5, n)
    L = rng.uniform(2000, 12000, n)
    return {"d": d, "bf": bf, "tf": tf, "tw": tw, "r": r, "L": L,
            "kw": rng.uniform(0.3, 1.0, n), "Fy": rng.choice([250.0, 345.0, 355.0], n)}


def _check(c: dict, sl) -> tuple[np.ndarray, np.ndarray]:
    sec = i_section(c["d"][sl], c["bf"][sl], c["tf"][sl], c["tw"][sl], c["r"][sl])
    L, Fy = c["L"][sl], c["Fy"][sl]
    a = check_aisc360(sec, Fy, 200000.0, 77200.0, L, L * c["kw"][sl], L * c["kw"][sl])
    e = check_en1993(sec, Fy, 210000.0, 81000.0, L, L * c["kw"][sl], L * c["kw"][sl])
    return a.design, e.design


def run(*, quick: bool = False) -> dict[str, float]:
    """Time ``n`` columns as one batch (best of 3) and a per-column loop over a sample.

    Returns:
        batch_columns (n), batch_columns_per_s, loop_columns_per_s, speedup_vs_loop.
    """
    n = 10_000 if quick else 100_000
    n_loop = 200 if quick else 2_000
    c = _columns(n)
    _check(c, slice(0, 10))  # warm caches and imports
    best = np.inf
    for _ in range(1 if quick else 3):
        t0 = time.perf_counter()
        a_batch, e_batch = _check(c, slice(None))
        best = min(best, time.perf_counter() - t0)
    t0 = time.perf_counter()
    for i in range(n_loop):
        a, e = _check(c, slice(i, i + 1))
        # the loop and the batch must agree to the last bit
        assert a[0] == a_batch[i] and e[0] == e_batch[i]
    loop = time.perf_counter() - t0
    batch_rate, loop_rate = n / best, n_loop / loop
    return {"batch_columns": n, "batch_seconds": round(best, 4),
            "batch_columns_per_s": round(batch_rate), "loop_columns_per_s": round(loop_rate),
            "speedup_vs_loop": round(batch_rate / loop_rate, 1)}
