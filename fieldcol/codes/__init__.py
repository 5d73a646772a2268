"""Axial strength of steel columns under the published codes.

Three checks share one signature and one result record (``CodeResult``):

- ``check_elastic``: classical elastic buckling about each axis, torsional buckling, squash load;
  no resistance factor.
- ``check_aisc360``: AISC 360-22 Chapter E (E3, E4, E7), LRFD or ASD.
- ``check_en1993``: EN 1993-1-1:2005 6.3.1 with Table 6.2 curves, Table 5.2 classes and
  EN 1993-1-5 4.4 effective areas for Class 4.

Every input may be a numpy array: a batch of columns of one section kind; results broadcast.
Units N, mm, MPa. Bad values raise ``fieldcol.errors.InputError`` naming the field.

Example:
    >>> import numpy as np
    >>> from fieldcol.codes import check_aisc360
    >>> from fieldcol.sections._section import Section
    >>> s = Section("round", *[np.array(x) for x in (100., 100., 5., 5., 0., 1492., 1.7e6, 1.7e6,
    ...     3.4e4, 3.4e4, 4.6e4, 4.6e4, 33.8, 33.8, 3.4e6, 0., 95., 20., 20., 20., 20.)])
    >>> r = check_aisc360(s, 250, 200000, 77200, [2000, 4000], 4000, 4000)
    >>> r.governing.tolist()
    ['flexural-weak', 'flexural-strong']
"""

from fieldcol._lazy import lazy_names

_WHERE = {
    'ColumnCurve': '._curve',
    'column_curve': '._curve',
    'MODES': '._result',
    'CodeResult': '._result',
    'ModeResult': '._result',
    'Warning': '._result',
    'check_aisc360': '.aisc360',
    'critical_stress': '.aisc360',
    'BowResult': '.bow',
    'check_bow': '.bow',
    'check_elastic': '.elastic',
    'buckling_curves': '.en1993',
    'check_en1993': '.en1993',
    'reduction_factor': '.en1993',
}

__all__ = ["MODES", "BowResult", "CodeResult", "ColumnCurve", "column_curve", "check_bow", "ModeResult", "Warning", "check_aisc360", "check_elastic",
           "check_en1993", "critical_stress", "buckling_curves", "reduction_factor"]

# each name is imported from its module when first asked for (fieldcol._lazy)
__getattr__, __dir__ = lazy_names(__name__, _WHERE)
