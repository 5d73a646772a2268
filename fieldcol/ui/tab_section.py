"""The Section tab of the column screen (its content is still to come: a placeholder).

API: ``SectionTab(app)`` with ``name = "section"``; see ``fieldcol.ui._tab``.
"""

from __future__ import annotations

import flet as ft

from fieldcol.ui._tab import Tab, coming


class SectionTab(Tab):
    """The section: catalogue pick or measured dimensions (placeholder until it lands).

    Example: ``SectionTab(app).controls()``.
    """
    name, label, icon = "section", "Section", ft.Icons.VIEW_AGENDA_OUTLINED

    def controls(self) -> list[ft.Control]:
        """The placeholder card.

        Example: ``SectionTab(app).controls()``.
        """
        return coming("Section: pick it from the catalogue or enter what was measured "
                      "(flange, web, depth; wall and outside size for hollow sections), see the "
                      "nearest catalogue matches, and record cover plates. Coming soon: today "
                      "the section name is edited on the Check tab.", "section-coming")
