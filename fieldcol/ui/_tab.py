"""What every tab of the column screen shares (see ``fieldcol.ui.app.TABS``).

A tab is a class in its own module ``fieldcol/ui/tab_<name>.py``::

    class Tab:
        name: str; label: str; icon: ft.IconData
        def __init__(self, app: "FieldApp") -> None
        async def load(self) -> None           # fetch view-models with
                                               # asyncio.to_thread(fn, app.store, app.detail.id);
                                               # called when the tab opens and after any saved
                                               # change while it is open; or, instead:
        def fetch(self, store, column_id) -> T # (worker thread) read; the app may read it with
        def took(self, data: T) -> None        # the column in one trip; took keeps it
        def controls(self) -> list[ft.Control] # the body: synchronous, no I/O
        first: int | None                      # controls drawn in the first update on
                                               # opening (what a phone shows at once)
        def shown(self) -> None                # chosen (again) and drawn: e.g. focus an entry

A tab is made when its column is opened and kept while that column is shown (what is typed
stays across a resize); ``self.redraw()`` draws the tab again after a local change (a form
opened, a choice tapped). Saves go through ``await self.app.saver.save(...)``.
"""

from __future__ import annotations

import asyncio
from typing import TYPE_CHECKING, Any

import flet as ft

if TYPE_CHECKING:
    from fieldcol.store import Store
    from fieldcol.ui.app import FieldApp


class Tab:
    """The base of the column screen's tabs: holds the app; loads nothing; shows nothing.

    Args:
        app: the ``FieldApp``.

    Example: ``class SectionTab(Tab): name, label = "section", "Section"``.
    """
    name = ""
    label = ""
    icon: ft.IconData = ft.Icons.CIRCLE_OUTLINED
    #: how many of ``controls()`` are drawn in the column screen's first update (the rest
    #: follows at once in a second); None: all at once
    first: int | None = None

    def __init__(self, app: "FieldApp") -> None:
        self.app = app

    async def load(self) -> None:
        """Fetch what the tab shows (in a worker thread): ``fetch`` there, then ``took``.

        Example: ``await tab.load()``.
        """
        d = self.app.detail
        if d is not None and type(self).fetch is not Tab.fetch:
            self.took(await asyncio.to_thread(self.fetch, self.app.store, d.id))

    def fetch(self, store: "Store", column_id: str) -> Any:
        """(worker thread) What the tab shows, read from the store; a tab that has it lets the
        app read it in the same trip to the worker as the column itself (quicker to open).

        Example: ``tab.took(tab.fetch(store, cid))``.
        """
        return None

    def took(self, data: Any) -> None:
        """Keep what ``fetch`` read (on the UI loop).

        Example: ``tab.took(tab.fetch(store, cid))``.
        """

    def controls(self) -> list[ft.Control]:
        """The tab's body (no I/O).

        Example: ``tab.controls()``.
        """
        return []

    def shown(self) -> None:
        """Called when the tab is chosen (again), after it is drawn: e.g. an entry takes the
        keyboard; nothing by default.

        Example: ``tab.shown()``.
        """

    def redraw(self) -> None:
        """Draw the column screen again when this tab is the one shown.

        Example: ``self.redraw()`` after a form is opened.
        """
        if self.app.tab == self.name:
            self.app.redraw()


def coming(what: str, identifier: str) -> list[ft.Control]:
    """The body of a tab whose work is still to come: says what it will hold.

    Args:
        what: the sentence.
        identifier: a Semantics identifier for tests.

    Returns:
        One card.

    Example: ``coming("Restraints: ends, braces and cables per axis.", "restraints-coming")``.
    """
    from fieldcol.ui import views as v

    return [ft.Semantics(identifier=identifier, content=v._card(
        [v.text_line(what, color=v.MUTED)]))]
