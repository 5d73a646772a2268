"""fieldcol: assess existing steel columns on site.

The engineering core (units, sections, materials, stability, codes, assess) is a
library of its own: it imports nothing from the store, sync, report or UI layers.
"""

__version__ = "0.1.0"

CAUTION = (
    "fieldcol is an aid to, not a substitute for, the judgement of a licensed engineer; "
    "local codes govern."
)
