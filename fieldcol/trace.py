"""Calculation trace: the ordered steps an engineer checks line by line."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np


@dataclass(frozen=True)
class Step:
    """One line of a calculation sheet.

    Args:
        symbol: the symbol as printed, e.g. ``"Fe"``.
        what: what the quantity is, e.g. ``"elastic buckling stress, weak axis"``.
        formula: the formula as printed, e.g. ``"pi^2 E / (Lc/r)^2"``.
        value: a float, or a numpy array for a batch (one value per column).
        unit: a unit pint can read (``"MPa"``, ``"N"``, ``"mm"``, ``""`` for pure numbers).
        clause: the clause it comes from, e.g. ``"AISC 360-22 E3"``.

    Example:
        >>> Step("Fe", "elastic buckling stress", "pi^2 E/(Lc/r)^2", 210.0, "MPa", "AISC 360-22 E3").unit
        'MPa'
    """

    symbol: str
    what: str
    formula: str
    value: Any
    unit: str
    clause: str

    def at(self, i: int | tuple) -> "Step":
        """The step for one column ``i`` of a batch (scalars pass through)."""
        v = np.asarray(self.value)
        value = v.item() if v.ndim == 0 else v[i].item()
        return Step(self.symbol, self.what, self.formula, value, self.unit, self.clause)


@dataclass
class Trace:
    """An ordered list of steps; ``add`` returns the value so formulas read naturally.

    Example:
        >>> t = Trace()
        >>> a = t.add("A", "gross area", "", 100.0, "mm^2", "")
        >>> len(t.steps), a
        (1, 100.0)
    """

    steps: list[Step] = field(default_factory=list)

    def add(self, symbol: str, what: str, formula: str, value: Any, unit: str, clause: str) -> Any:
        self.steps.append(Step(symbol, what, formula, value, unit, clause))
        return value

    def extend(self, other: "Trace") -> None:
        self.steps.extend(other.steps)
