"""The Restraints tab of the column screen (its content is still to come: a placeholder).

API: ``RestraintsTab(app)`` with ``name = "restraints"``; see ``fieldcol.ui._tab``.
"""

from __future__ import annotations

import flet as ft

from fieldcol.ui._tab import Tab, coming


class RestraintsTab(Tab):
    """Ends, braces, cables and twist restraints per axis (placeholder until it lands).

    Example: ``RestraintsTab(app).controls()``.
    """
    name, label, icon = "restraints", "Restraints", ft.Icons.ALIGN_VERTICAL_CENTER

    def controls(self) -> list[ft.Control]:
        """The placeholder card.

        Example: ``RestraintsTab(app).controls()``.
        """
        return coming("Restraints: how each end is held about each axis, braces, cables and "
                      "twist restraints, each change dated, with a side view of the buckled "
                      "shape. Coming soon: today they are listed on the Check tab.",
                      "restraints-coming")
