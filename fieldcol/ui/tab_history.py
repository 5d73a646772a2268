"""The History tab of the column screen: restraint changes and every reading, as kept.

API: ``HistoryTab(app)`` with ``name = "history"``; ``load()`` reads
``notes.column_history(store, column_id)``; see ``fieldcol.ui._tab``.
"""

from __future__ import annotations

import asyncio

import flet as ft

from fieldcol.ui import notes as n
from fieldcol.ui import notes_views as nv
from fieldcol.ui._tab import Tab
from fieldcol.ui import views as v


class HistoryTab(Tab):
    """Restraint changes, then each reading (corrections marked).

    Example: ``await tab.load(); tab.controls()``.
    """
    name, label, icon = "history", "History", ft.Icons.HISTORY

    def __init__(self, app) -> None:  # noqa: ANN001 (FieldApp, see _tab)
        super().__init__(app)
        self.history: n.History | None = None

    async def load(self) -> None:
        """Read the column's history (worker thread).

        Example: ``await tab.load()``.
        """
        d = self.app.detail
        if d is not None:
            self.history = await asyncio.to_thread(n.column_history, self.app.store, d.id)

    def controls(self) -> list[ft.Control]:
        """The two history cards (a wait line until loaded).

        Example: ``tab.controls()``.
        """
        if self.history is None:
            return [v.text_line("Reading the history...", color=v.MUTED)]
        return nv.history_body(self.history, self.app.open_photo)
