"""Restraints and effective length of a column axis: end conditions, brace points, table and
alignment-chart K, elastic buckling by finite elements, twist length and brace demand.

Units: N, mm, MPa; EI in N*mm^2, translational springs N/mm, rotational springs N*mm/rad.
Pure numpy; nothing here reads or writes files.

Example:
    >>> from fieldcol.stability import end, k_table
    >>> k_table(end("fixed", "b"), end("free", "t"), "theoretical", "restraints.weak")
    2.0
"""

from ._alignment import k_alignment
from ._bracing import brace_requirement, cable_stiffness, series
from ._ends import Brace, End, end, kind, partial_end
from ._fe import Buckling, buckling_analysis, buckling_batch
from ._mode import ModeShape, mode_shape
from ._stepped import band_factor
from ._tables import (EffectiveLength, Segment, effective_length, k_table, k_table_many,
                      twist_length)

__all__ = [
    "Brace", "Buckling", "EffectiveLength", "End", "ModeShape", "Segment", "band_factor",
    "brace_requirement", "buckling_analysis", "buckling_batch", "cable_stiffness",
    "effective_length", "end", "k_alignment", "k_table", "k_table_many", "kind", "mode_shape",
    "partial_end", "series", "twist_length",
]
