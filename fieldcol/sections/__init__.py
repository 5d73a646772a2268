"""Cross-sections: constructors, the catalogue, identification from site measurements, section loss.

Public API:
    Section                      the record (see ``_section.py`` for field definitions)
    i_section, rect_hollow, round_hollow   vectorised constructors (mm)
    from_catalogue, catalogue_names        published sections by designation
    catalogue_name                         a typed name to its designation, or None
    identify, Match                        rank catalogue sections against measurements
    with_loss                              the section left after corrosion
    with_plates                            cover plates welded to both flanges of an I
"""

from fieldcol.sections._catalogue import catalogue_name, catalogue_names, from_catalogue
from fieldcol.sections._condition import with_loss
from fieldcol.sections._geometry import i_section, rect_hollow, round_hollow
from fieldcol.sections._identify import Match, identify
from fieldcol.sections._plates import with_plates
from fieldcol.sections._section import Section

__all__ = [
    "Section", "i_section", "rect_hollow", "round_hollow", "from_catalogue", "catalogue_names",
    "catalogue_name",
    "identify", "Match", "with_loss", "with_plates",
]
