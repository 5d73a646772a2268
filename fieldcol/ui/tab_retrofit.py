"""The Retrofit tab of the column screen: each saved option checked before and after.

API: ``RetrofitTab(app)`` with ``name = "retrofit"``; ``load()`` runs
``notes.retrofit_options(store, column_id)`` (the engine: a worker thread); see
``fieldcol.ui._tab``.
"""

from __future__ import annotations

import asyncio

import flet as ft

from fieldcol.errors import InputError
from fieldcol.ui import notes as n
from fieldcol.ui import notes_views as nv
from fieldcol.ui._tab import Tab


class RetrofitTab(Tab):
    """Saved retrofit options, before -> after, with the caution.

    Example: ``await tab.load(); tab.controls()``.
    """
    name, label, icon = "retrofit", "Retrofit", ft.Icons.CONSTRUCTION

    def __init__(self, app) -> None:  # noqa: ANN001 (FieldApp, see _tab)
        super().__init__(app)
        self.options: list[n.RetrofitLine] | None = None
        self.error: str | None = None

    async def load(self) -> None:
        """Check every saved option against the column as it stands (worker thread).

        Example: ``await tab.load()``.
        """
        d = self.app.detail
        if d is None:
            return
        self.options, self.error = None, None
        self.redraw()  # the wait line while the engine runs
        try:
            options = await asyncio.to_thread(n.retrofit_options, self.app.store, d.id)
            error = None
        except InputError as e:  # the column as it stands cannot be checked
            options, error = [], f"Retrofit options not checked: {e}"
        if self.app.detail is None or self.app.detail.id != d.id:
            return  # another column was opened meanwhile
        self.options, self.error = options, error

    def controls(self) -> list[ft.Control]:
        """The options (or the wait line while they are checked).

        Example: ``tab.controls()``.
        """
        return nv.retrofit_body(self.options, self.error)
