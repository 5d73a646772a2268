"""Restraints and effective length of a column axis: end conditions, brace points, table and
alignment-chart K, elastic buckling by finite elements, twist length and brace demand.

Units: N, mm, MPa; EI in N*mm^2, translational springs N/mm, rotational springs N*mm/rad.
Pure numpy; nothing here reads or writes files.

Example:
    >>> from fieldcol.stability import end, k_table
    >>> k_table(end("fixed", "b"), end("free", "t"), "theoretical", "restraints.weak")
    2.0
"""

from fieldcol._lazy import lazy_names

_WHERE = {
    'k_alignment': '._alignment',
    'brace_requirement': '._bracing',
    'cable_stiffness': '._bracing',
    'series': '._bracing',
    'Brace': '._ends',
    'End': '._ends',
    'end': '._ends',
    'kind': '._ends',
    'partial_end': '._ends',
    'Buckling': '._fe',
    'buckling_analysis': '._fe',
    'buckling_batch': '._fe',
    'ModeShape': '._mode',
    'mode_shape': '._mode',
    'band_factor': '._stepped',
    'EffectiveLength': '._tables',
    'Segment': '._tables',
    'effective_length': '._tables',
    'k_table': '._tables',
    'k_table_many': '._tables',
    'twist_length': '._tables',
}

__all__ = [
    "Brace", "Buckling", "EffectiveLength", "End", "ModeShape", "Segment", "band_factor",
    "brace_requirement", "buckling_analysis", "buckling_batch", "cable_stiffness",
    "effective_length", "end", "k_alignment", "k_table", "k_table_many", "kind", "mode_shape",
    "partial_end", "series", "twist_length",
]

# each name is imported from its module when first asked for (fieldcol._lazy)
__getattr__, __dir__ = lazy_names(__name__, _WHERE)
