"""What every tab of the column screen shares (see ``fieldcol.ui.app.TABS``).

A tab is a class in its own module ``fieldcol/ui/tab_<name>.py``::

    class Tab:
        name: str; label: str; icon: ft.IconData
        def __init__(self, app: "FieldApp") -> None
        async def load(self) -> None           # fetch view-models with
                                               # asyncio.to_thread(fn, app.store, app.detail.id);
                                               # called when the tab opens and after any saved
                                               # change while it is open
        def controls(self) -> list[ft.Control] # the body: synchronous, no I/O
        first: int | None                      # controls drawn in the first update on
                                               # opening (what a phone shows at once)

A tab is made when its column is opened and kept while that column is shown (what is typed
stays across a resize); ``self.redraw()`` draws the tab again after a local change (a form
opened, a choice tapped). Saves go through ``await self.app.saver.save(...)``.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import flet as ft

if TYPE_CHECKING:
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
        """Fetch what the tab shows (in a worker thread); nothing by default.

        Example: ``await tab.load()``.
        """

    def controls(self) -> list[ft.Control]:
        """The tab's body (no I/O).

        Example: ``tab.controls()``.
        """
        return []

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
