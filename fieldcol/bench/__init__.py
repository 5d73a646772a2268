"""Benchmarks behind ``fieldcol bench``: each case module has ``run(*, quick) -> dict[str, float]``."""

from __future__ import annotations

import importlib
import pkgutil
import platform
from typing import Any

#: every module ``_<case>.py`` of this package is a case (a new case is a new module, no list to
#: edit); the cheap ones first, the long report and import last
_FIRST = ("engine", "store", "sync", "section")
CASES = tuple(sorted((m.name[1:] for m in pkgutil.iter_modules(__path__)  # type: ignore[name-defined]
                      if m.name.startswith("_") and not m.name.startswith("__")),
                     key=lambda c: (_FIRST.index(c) if c in _FIRST else len(_FIRST), c)))


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
