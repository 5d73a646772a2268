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

from fieldcol._lazy import lazy_names

_WHERE = {
    'catalogue_name': 'fieldcol.sections._catalogue',
    'catalogue_names': 'fieldcol.sections._catalogue',
    'from_catalogue': 'fieldcol.sections._catalogue',
    'with_loss': 'fieldcol.sections._condition',
    'i_section': 'fieldcol.sections._geometry',
    'rect_hollow': 'fieldcol.sections._geometry',
    'round_hollow': 'fieldcol.sections._geometry',
    'Match': 'fieldcol.sections._identify',
    'identify': 'fieldcol.sections._identify',
    'with_plates': 'fieldcol.sections._plates',
    'Section': 'fieldcol.sections._section',
}

__all__ = [
    "Section", "i_section", "rect_hollow", "round_hollow", "from_catalogue", "catalogue_names",
    "catalogue_name",
    "identify", "Match", "with_loss", "with_plates",
]

# each name is imported from its module when first asked for (fieldcol._lazy)
__getattr__, __dir__ = lazy_names(__name__, _WHERE)
