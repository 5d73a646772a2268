"""The Condition tab of the column screen (its content is still to come: a placeholder).

API: ``ConditionTab(app)`` with ``name = "condition"``; see ``fieldcol.ui._tab``.
"""

from __future__ import annotations

import flet as ft

from fieldcol.ui._tab import Tab, coming


class ConditionTab(Tab):
    """Readings: thickness by gauge, bow, out of plumb (placeholder until it lands).

    Example: ``ConditionTab(app).controls()``.
    """
    name, label, icon = "condition", "Condition", ft.Icons.STRAIGHTEN

    def controls(self) -> list[ft.Control]:
        """The placeholder card.

        Example: ``ConditionTab(app).controls()``.
        """
        return coming("Condition: thickness by gauge, bow with the axis it bends about, out of "
                      "plumb; every reading kept as taken, a correction adds a reading. Coming "
                      "soon: the readings so far are on the History tab.", "condition-coming")
