"""A site's column list on screen: pages read by (tag, id) as the list grows, a tag search,
level and status filters, and the place it was scrolled to kept while a column is open.

Public API::

    lst = ColumnList(app)             # one per FieldApp, as ``app.list``
    await lst.load(site_id, fresh=False)   # the first page, or the rows shown so far again
    lst.control(selected=None, tools=None) -> ft.Control   # the list (one ListView per site)
    await lst.restore()               # back to where it was scrolled (after the screen is drawn)

Identifiers: ``column-search``, ``filter-status-<all|over|ok|not-checked>``,
``filter-level-<all|name>``, ``columns-shown``, ``more-columns``, ``column-<tag>``.
The ListView is kept per site and only its rows change, so the search entry keeps the
keyboard while the rows follow what is typed.
"""

from __future__ import annotations

import asyncio
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.ui import model as m
from fieldcol.ui import views as v

if TYPE_CHECKING:
    from fieldcol.ui.app import FieldApp

_SEARCH_PAUSE = 0.25  # s after the last key before the list follows (not on every key)


class ColumnList:
    """The column list of the site shown (see the module's docstring).

    Args:
        app: the ``FieldApp``.

    Example: ``await app.list.load(site_id); body = app.list.control()``.
    """

    def __init__(self, app: "FieldApp") -> None:
        self.app = app
        self.page: m.ColumnPage | None = None
        self.at = 0.0                      # px scrolled, kept while a column is open
        self.selected: str | None = None
        self.tools: ft.Control | None = None
        self.view = ft.ListView(spacing=8, expand=True, padding=12, scroll_interval=150,
                                on_scroll=self._scrolled)
        self.search = ft.TextField(
            label="Find a column by tag", prefix_icon=ft.Icons.SEARCH, text_size=18,
            on_change=self._typed, on_submit=self._typed, dense=False,
            label_style=ft.TextStyle(size=16))
        self._typing = 0
        self.stale = False
        # rows drawn before, by column id: a row whose line is unchanged is the same control,
        # so redrawing the list (a tablet's column tap, a save) sends only what changed
        self._rows: dict[str, tuple[m.ColumnLine, ft.Control]] = {}
        self._caution = v.caution_box()

    # -- data ----------------------------------------------------------------------------
    async def load(self, site_id: str, *, fresh: bool = False) -> m.ColumnPage:
        """The site's list: the first page for a new site; with ``fresh``, the rows shown so
        far read again (checks may have changed) with the same filters.

        Example: ``await app.list.load(site_id, fresh=True)``.
        """
        store = self.app.store
        if self.page is None or self.page.site.id != site_id:
            self.page = await asyncio.to_thread(m.column_page, store, site_id)
            self.at = 0.0
            self.search.value = ""
            self._rows = {}
            self.view = ft.ListView(spacing=8, expand=True, padding=12, scroll_interval=150,
                                    on_scroll=self._scrolled)
        elif fresh or self.stale:
            self.page = await asyncio.to_thread(m.same_page_again, store, self.page)
        self.stale = False
        return self.page

    def forget(self) -> None:
        """Read the rows again next time (a column added, copied or deleted).

        Example: ``app.list.forget()``.
        """
        self.stale = True

    async def _filtered(self, **change: Any) -> None:
        cur = self.page
        if cur is None:
            return
        want = {"search": cur.search, "level": cur.level, "status": cur.status, **change}
        self.page = await asyncio.to_thread(
            lambda: m.column_page(self.app.store, cur.site.id, **want))
        self.at = 0.0
        self._fill()
        self.app.page.update()

    async def _more(self, _e: Any = None) -> None:
        if self.page is None:
            return
        self.page = await asyncio.to_thread(m.next_page, self.app.store, self.page)
        self._fill()
        self.app.page.update()

    # -- events --------------------------------------------------------------------------
    def _scrolled(self, e: ft.OnScrollEvent) -> None:
        # only remembered: redrawing the page on every scroll event would cost a diff each
        ft.context.disable_auto_update()
        self.at = max(0.0, float(e.pixels or 0.0))

    async def _typed(self, e: Any) -> None:
        self._typing += 1
        mine = self._typing
        await asyncio.sleep(_SEARCH_PAUSE)
        if mine != self._typing:  # another key came: that one searches
            ft.context.disable_auto_update()
            return
        text = (self.search.value or "").strip()
        if self.page is not None and text != (self.page.search or ""):
            await self._filtered(search=text or None)

    def _choose(self, **change: Any) -> Callable[..., Any]:
        async def pick(_e: Any = None) -> None:
            await self._filtered(**change)
        return pick

    # -- controls ------------------------------------------------------------------------
    async def restore(self) -> None:
        """Scroll back to where the list was (after the screen holding it is drawn).

        Example: ``await app.list.restore()``.
        """
        if self.at <= 0:
            return
        try:
            await asyncio.wait_for(self.view.scroll_to(offset=self.at), 3)
        except Exception:  # noqa: BLE001 (not on screen any more: nothing to restore)
            pass

    def control(self, selected: str | None = None,
                tools: ft.Control | None = None) -> ft.Control:
        """The list: heading, tools, search and filters, the rows, "Show more".

        Args:
            selected: the id drawn highlighted (the column beside the list on a tablet).
            tools: buttons under the heading (add a column, edit the site).

        Returns:
            The ListView (the same one for the site, its rows filled anew).

        Example: ``app.list.control(selected=d.id, tools=row)``.
        """
        self.selected, self.tools = selected, tools
        self._fill()
        return self.view

    def _chips(self) -> list[ft.Control]:
        p = self.page
        assert p is not None
        status = [("all", "All", None)] + [(k, w, k) for k, w in m.STATUS_FILTERS.items()]
        rows = [[v.choice_chip(f"filter-status-{key}", word, p.status == value,
                               self._choose(status=value)) for key, word, value in status]]
        if len(p.levels) > 1 or p.level is not None:
            levels = [("all", "All levels", None)] + [(lv, lv, lv) for lv in p.levels]
            rows.append([v.choice_chip(f"filter-level-{key}", word, p.level == value,
                                       self._choose(level=value))
                         for key, word, value in levels])
        # the chips wrap onto a second line rather than slide sideways: on a phone a chip
        # half off the edge ("Not checked") reads as cut, and nothing chosen is out of sight
        return [ft.Row(r, spacing=8, run_spacing=8, wrap=True) for r in rows]

    def _fill(self) -> None:
        p = self.page
        if p is None:
            return
        c = p.site
        open_column = self.app.open_column
        if p.filtered:
            shown = f"{len(p.rows)}{'+' if p.has_more else ''} of {c.columns} columns match"
        else:
            shown = f"{len(p.rows)} of {c.columns} columns shown" if p.has_more \
                else f"{c.columns} columns"
        picked = ", ".join(x for x in (
            m.STATUS_FILTERS.get(p.status or "", ""), p.level or "",
            f"tag has '{p.search}'" if p.search else "") if x)
        head: list[ft.Control] = [
            ft.Semantics(identifier="columns-shown", content=v.text_line(
                f"{shown} · {c.over} over capacity" + (f" · {picked}" if picked else ""),
                color=v.MUTED)),
            *([self.tools] if self.tools is not None else []),
            ft.Semantics(identifier="column-search", content=self.search),
            *self._chips(), self._caution]
        rows = [self._row(r, open_column) for r in p.rows]
        if not rows:
            rows = [v.text_line("No column matches. Clear the search or pick All.",
                                color=v.MUTED)]
        tail: list[ft.Control] = []
        if p.has_more:
            tail.append(ft.Semantics(identifier="more-columns", content=ft.OutlinedButton(
                "Show more columns", icon=ft.Icons.EXPAND_MORE, on_click=self._more,
                height=v.TAP)))
        self.view.controls = head + rows + tail

    def _row(self, line: m.ColumnLine, open_column: Callable[[str], Any]) -> ft.Control:
        kept = self._rows.get(line.id)
        if kept is not None and kept[0] == line:
            row = kept[1]
            v.mark_selected(row, line.id == self.selected)
            return row
        row = v.column_row(line, open_column(line.id), selected=line.id == self.selected)
        self._rows[line.id] = (line, row)
        return row
