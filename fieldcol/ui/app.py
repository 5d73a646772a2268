"""The field app: routes, screens and the column screen's tabs over one open store.

Routes: ``/`` (sites), ``/sites/<id>`` (a site's columns), ``/columns/<id>`` (one column).
From ``WIDE`` px up, a site's columns stay beside the column shown (two panes).

The column screen is a row of tabs (``TABS``, in order; identifiers ``tab-<name>``; the row
scrolls sideways on a phone) over the shown tab's body. Each tab is a class in its own module
``fieldcol/ui/tab_<name>.py`` (the contract is in ``fieldcol/ui/_tab.py``)::

    class Tab:
        name: str; label: str
        def __init__(self, app: FieldApp) -> None
        async def load(self) -> None          # asyncio.to_thread(fn, app.store, app.detail.id)
        def controls(self) -> list[ft.Control]

What a tab may use of the app::

    app.store        the open Store (call it only through asyncio.to_thread or app.saver)
    app.detail       the shown column's model.ColumnDetail (None on the list screens)
    app.saver        fieldcol.ui.saving.Saver: await app.saver.save(label, do, undo, field)
    await app.changed()   reload the column (detail, status, its line in the list) after a
                          saved change, and reload + redraw the open tab
    app.redraw()     draw the column screen again (no I/O)
    app.person       the engineer's name (None until set), app.visit_id (the open visit or None)
    app.open_photo(p)     a click handler that shows a PhotoThumb large
    app.lock         held while a change is written (saver takes it)

Every store and engine call runs in ``asyncio.to_thread``: the UI loop never waits on SQLite
or on a check.
"""

from __future__ import annotations

import asyncio
import os
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.errors import InputError
from fieldcol.ui import model as m
from fieldcol.ui import notes as n
from fieldcol.ui import notes_views as nv
from fieldcol.ui import views as v
from fieldcol.ui._tab import Tab
from fieldcol.ui.saving import Saver
from fieldcol.ui.tab_check import CheckTab
from fieldcol.ui.tab_condition import ConditionTab
from fieldcol.ui.tab_findings import FindingsTab
from fieldcol.ui.tab_history import HistoryTab
from fieldcol.ui.tab_restraints import RestraintsTab
from fieldcol.ui.tab_retrofit import RetrofitTab
from fieldcol.ui.tab_section import SectionTab

if TYPE_CHECKING:
    from fieldcol.store import Store

#: the column screen's tabs, in the order shown
TABS: list[type[Tab]] = [CheckTab, SectionTab, RestraintsTab, ConditionTab, FindingsTab,
                         RetrofitTab, HistoryTab]


class FieldApp:
    """One browser tab (or device window) of the app: its page, the shared store, its state.

    Args:
        page: the Flet page of this session.
        store: an open ``Store`` (shared by sessions; it serialises its own calls).

    Example: ``await FieldApp(page, store).start()`` inside ``main(page)``.
    """

    def __init__(self, page: ft.Page, store: "Store") -> None:
        self.page = page
        self.store = store
        self.lock = asyncio.Lock()
        self.wide = False
        self.person: str | None = None
        self.visit_id: str | None = None
        self.columns: m.ColumnPage | None = None
        self.detail: m.ColumnDetail | None = None
        self.counts: dict[str, int] = {}
        self.tab = "check"
        self.tabs: dict[str, Tab] = {}
        self.pane = ft.ListView(spacing=12, padding=12, expand=True)
        self.list_pane = ft.Container(width=400)
        self.saver = Saver(self)

    async def start(self) -> None:
        """Set up the page and show the route it opened on.

        Example: ``await app.start()``.
        """
        p = self.page
        p.title = "fieldcol"
        p.theme_mode = ft.ThemeMode.LIGHT
        p.theme = ft.Theme(color_scheme_seed=v.ACCENT)
        p.bgcolor = v.BG
        p.padding = 0
        p.on_route_change = self._on_route
        p.on_resize = self._on_resize
        self.wide = (p.width or 0) >= v.WIDE
        await self.show(p.route or "/")

    # -- navigation ---------------------------------------------------------------------
    async def _on_route(self, e: ft.RouteChangeEvent) -> None:
        await self.show(e.route)

    async def _on_resize(self, e: Any) -> None:
        wide = (e.width or 0) >= v.WIDE
        if wide != self.wide:
            self.wide = wide
            await self.show(self.page.route or "/")

    def _go(self, route: str) -> Callable[..., Any]:
        async def go(_e: Any = None) -> None:
            await self.page.push_route(route)
        return go

    async def show(self, route: str) -> None:
        """Render the screen of ``route`` (unknown routes show the sites).

        Args:
            route: ``/``, ``/sites/<id>`` or ``/columns/<id>``.

        Example: ``await app.show("/sites/" + site_id)``.
        """
        parts = [x for x in route.split("?")[0].split("/") if x]
        try:
            if len(parts) == 2 and parts[0] == "sites":
                await self._show_site(parts[1])
            elif len(parts) == 2 and parts[0] == "columns":
                await self._show_column(parts[1])
            else:
                await self._show_sites()
        except InputError as e:  # e.g. an id that no longer exists: say so, keep the app usable
            self.detail = None
            self._render("/", "fieldcol", [v.text_line(str(e), color=v.TONES["over"][0]),
                                          ft.Button("Back to sites", on_click=self._go("/"),
                                                    height=v.TAP)], None)

    def _render(self, route: str, title: str, body: list[ft.Control] | ft.Control,
                back: str | None, *, scroll: bool = True, title_id: str | None = None) -> None:
        leading = None
        if back is not None:
            leading = ft.Semantics(identifier="back", content=ft.IconButton(
                ft.Icons.ARROW_BACK, on_click=self._go(back), tooltip="Back",
                icon_color=ft.Colors.WHITE, icon_size=28))
        head: ft.Control = ft.Text(title, size=20, color=ft.Colors.WHITE,
                                   weight=ft.FontWeight.BOLD)
        if title_id is not None:
            head = ft.Semantics(identifier=title_id, header=True, content=head)
        bar = ft.AppBar(leading=leading, title=head,
                        bgcolor=v.ACCENT, automatically_imply_leading=False)
        if isinstance(body, list):
            body = ft.ListView(body, spacing=12, padding=12, expand=True) if scroll \
                else ft.Column(body, expand=True)
        # the save bar sits under every screen: in thumb reach, never scrolled away
        screen = ft.Column([ft.Container(body, expand=True), self.saver.bar], spacing=0,
                           expand=True)
        self.page.views.clear()
        self.page.views.append(ft.View(route=route, appbar=bar, controls=[screen], padding=0,
                                       bgcolor=v.BG))
        self.page.update()

    # -- screens ------------------------------------------------------------------------
    async def _show_sites(self) -> None:
        self.detail = None
        cards = await asyncio.to_thread(m.site_cards, self.store)
        self._render("/", "fieldcol · Sites",
                     v.sites_body(cards, lambda sid: self._go(f"/sites/{sid}")), None)

    async def _load_columns(self, site_id: str) -> m.ColumnPage:
        if self.columns is None or self.columns.site.id != site_id:
            self.columns = await asyncio.to_thread(m.column_page, self.store, site_id)
        return self.columns

    async def _more(self, _e: Any = None) -> None:
        cur = self.columns
        if cur is None:
            return
        nxt = await asyncio.to_thread(m.column_page, self.store, cur.site.id,
                                      offset=cur.offset + len(cur.rows), limit=cur.limit)
        self.columns = m.ColumnPage(site=cur.site, rows=cur.rows + nxt.rows, offset=cur.offset,
                                    limit=cur.limit, has_more=nxt.has_more)
        await self.show(self.page.route or "/")

    def _list(self, selected: str | None = None) -> ft.Control:
        assert self.columns is not None
        return v.columns_list(self.columns, lambda cid: self._go(f"/columns/{cid}"),
                              self._more if self.columns.has_more else None, selected)

    async def _show_site(self, site_id: str) -> None:
        self.detail = None
        self.columns = None  # a fresh list each time the site is opened: checks may be new
        page = await self._load_columns(site_id)
        title = page.site.name
        if not self.wide:
            self._render(f"/sites/{site_id}", title, self._list(), "/")
            return
        hint = ft.Container(v.text_line("Pick a column to see its check.", color=v.MUTED),
                            padding=24)
        self._render(f"/sites/{site_id}", title, self._two_panes(self._list(), hint), "/")

    def _two_panes(self, left: ft.Control, right: ft.Control) -> ft.Control:
        self.list_pane.content = left
        return ft.Row([self.list_pane, ft.VerticalDivider(width=1, color=v.LINE),
                       ft.Container(right, expand=True)], expand=True, spacing=0,
                      vertical_alignment=ft.CrossAxisAlignment.STRETCH)

    def _load_column(self, column_id: str) -> tuple[m.ColumnDetail, dict[str, int]]:
        """(worker thread) The column screen and the numbers beside its tabs."""
        d = m.column_detail(self.store, column_id)
        opened = len(self.store.list_findings(d.site_id, status="open", column_id=column_id))
        return d, {"findings": opened, "retrofit": len(self.store.retrofits(column_id))}

    async def _show_column(self, column_id: str) -> None:
        same = self.detail is not None and self.detail.id == column_id and bool(self.tabs)
        self.detail, self.counts = await asyncio.to_thread(self._load_column, column_id)
        if not same:  # a new column: fresh tabs (a resize keeps them, and what is typed)
            self.tabs = {cls.name: cls(self) for cls in TABS}
            self.tab = "check"
        d = self.detail
        self.pane = ft.ListView(spacing=12, padding=12, expand=True)
        self.pane.controls = self._pane_controls()
        if not self.wide:
            self._render(f"/columns/{column_id}", f"Column {d.tag}", self.pane,
                         f"/sites/{d.site_id}", title_id="column-tag")
        else:
            await self._load_columns(d.site_id)
            self._render(f"/columns/{column_id}", f"{d.site_name} · {d.tag}",
                         self._two_panes(self._list(selected=d.id), self.pane),
                         f"/sites/{d.site_id}", title_id="column-tag")
        if not same:
            await self._load_tab()

    # -- the column screen's tabs ---------------------------------------------------------
    def _pane_controls(self) -> list[ft.Control]:
        tabs = [(t.name, t.label, t.icon) for t in self.tabs.values()]
        row = v.tab_row(tabs, self.tab, self.counts, self._choose_tab, wrap=self.wide)
        return [row, *self.tabs[self.tab].controls()]

    def redraw(self) -> None:
        """Draw the column screen (tab row and the shown tab) again; no I/O.

        Example: ``app.redraw()`` after a tab changed what it shows.
        """
        if self.detail is None or not self.tabs:
            return
        self.pane.controls = self._pane_controls()
        self.page.update()

    async def _load_tab(self) -> None:
        d, name = self.detail, self.tab
        if d is None:
            return
        await self.tabs[name].load()
        if self.detail is d or (self.detail is not None and self.detail.id == d.id):
            if self.tab == name:
                self.redraw()

    def _choose_tab(self, name: str) -> Callable[..., Any]:
        async def choose(_e: Any = None) -> None:
            self.tab = name
            self.redraw()
            await self._load_tab()
        return choose

    async def changed(self) -> None:
        """Reload after a saved change: the column (detail, status, counts, its line in the
        list beside it) and the open tab; on a list screen, that screen.

        Example: ``await app.changed()`` (``app.saver.save`` calls it after each save).
        """
        d = self.detail
        if d is None:
            await self.show(self.page.route or "/")
            return
        try:
            self.detail, self.counts = await asyncio.to_thread(self._load_column, d.id)
        except InputError:  # the column itself went (deleted): back to its site
            self.detail = None
            await self.page.push_route(f"/sites/{d.site_id}")
            return
        await self._refresh_list()
        await self._load_tab()

    async def _refresh_list(self) -> None:
        """Reload the list beside the column (tablet) so it shows the new check."""
        d = self.detail
        if not self.wide or self.columns is None or d is None:
            return
        limit = min(1000, max(m.PAGE, len(self.columns.rows)))
        self.columns = await asyncio.to_thread(m.column_page, self.store, d.site_id, limit=limit)
        self.list_pane.content = self._list(selected=d.id)

    # -- shared by tabs ---------------------------------------------------------------------
    def open_photo(self, p: n.PhotoThumb) -> Callable[..., Any]:
        """A click handler that shows a photo large: zoom, and its markup to draw or change.

        Args:
            p: the photo's ``PhotoThumb``.

        Returns:
            An async handler.

        Example: ``thumbnails(photos, app.open_photo, "r0")``.
        """
        from fieldcol.ui.photo_views import photo_opener

        return photo_opener(self)(p)


_STORE: "Store | None" = None  # one store per process, shared by its sessions


async def main(page: ft.Page) -> None:
    """The app on the default store (``$FIELDCOL_DB`` or the app-data folder), for a device
    build or ``flet run``; ``fieldcol app`` uses ``make_main`` with the store it opened.

    Args:
        page: the session's page.

    Example: ``ft.run(main)``.
    """
    global _STORE
    if _STORE is None:
        from fieldcol.store import open_store

        _STORE = await asyncio.to_thread(open_store)
    await FieldApp(page, _STORE).start()


def make_main(store: "Store") -> Callable[[ft.Page], Any]:
    """The Flet ``main`` for a store: each session gets its own ``FieldApp``.

    Args:
        store: an open ``Store``.

    Returns:
        An async ``main(page)``.

    Example: ``ft.run(make_main(store))``.
    """
    async def main(page: ft.Page) -> None:
        await FieldApp(page, store).start()
    return main


def run(store: "Store", *, host: str = "127.0.0.1", port: int = 8550,
        key: str | None = None) -> None:
    """Serve the app to browsers (web mode, no CDN: it works with no network) until stopped.

    The web app is Flet's own, served by uvicorn behind ``fieldcol.ui._access.Guard``: beyond
    loopback (or with a key) every request and WebSocket needs the access key.

    Args:
        store: an open ``Store``.
        host, port: where to listen.
        key: the access key; required when ``host`` is not loopback.

    Example: ``run(open_store("site.db"), port=8550)``.
    """
    import uvicorn
    import flet_web.fastapi as flet_fastapi

    from fieldcol.ui._access import Guard, is_loopback

    if key is None and not is_loopback(host):
        raise InputError("host", host, "beyond this machine the app needs an access key",
                         "pass key=new_key()")
    from fieldcol.ui.intake import configure_uploads

    # photos picked in a browser arrive as uploads (signed URLs) into a private folder
    web = flet_fastapi.app(make_main(store), no_cdn=True, upload_dir=configure_uploads())
    config = uvicorn.Config(Guard(web, key, port), host=host, port=port,
                            ws="websockets-sansio", log_level="warning",
                            access_log=False,  # an access log would record keys in addresses
                            timeout_graceful_shutdown=3)
    uvicorn.Server(config).run()
