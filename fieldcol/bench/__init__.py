"""Benchmarks behind ``fieldcol bench``: each case module has ``run(*, quick) -> dict[str, float]``."""

from __future__ import annotations

import importlib
import platform
from typing import Any

CASES = ("engine", "store", "sync", "section", "hub")


def run(cases: tuple[str, ...] = CASES, *, quick: bool = False) -> dict[str, Any]:
    """Run the benchmark cases and merge their measurements into one flat dict.

    Args:
        cases: which case modules to run (``fieldcol.bench._<case>``).
        quick: a smaller workload (for a smoke test), same measurements.

    Returns:
        ``{"machine": ..., "<measurement>": value, ...}``.

    Example:
        >>> "batch_columns_per_s" in run(("engine",), quick=True)
        True
    """
    out: dict[str, Any] = {"machine": f"{platform.machine()} {platform.python_version()}",
                           "quick": quick}
    for case in cases:
        out.update(importlib.import_module(f"fieldcol.bench._{case}").run(quick=quick))
    return out
