"""The field app: routes, screens and handlers over one open store.

Routes: ``/`` (sites), ``/sites/<id>`` (a site's columns), ``/columns/<id>`` (one column).
From ``WIDE`` px up, a site's columns stay beside the column shown (two panes).
Every store and engine call runs in ``asyncio.to_thread``: the UI loop never waits on SQLite
or on a check. Entries are saved one at a time (a lock), each as its own transaction.
"""

from __future__ import annotations

import asyncio
import os
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.errors import InputError
from fieldcol.ui import model as m
from fieldcol.ui import views as v

if TYPE_CHECKING:
    from fieldcol.store import Store

BG = "#F4F6F8"


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
        self.columns: m.ColumnPage | None = None
        self.detail: m.ColumnDetail | None = None
        self.fields: dict[str, ft.TextField] = {}
        self.failed: dict[str, str] = {}
        self.check_area = ft.Column(spacing=12)
        self.record_area = ft.Column(spacing=12)
        self.note = ft.Text("", size=15, color=v.INK)
        self.list_pane = ft.Container(width=400)
        self.recheck_button: ft.Control | None = None

    async def start(self) -> None:
        """Set up the page and show the route it opened on.

        Example: ``await app.start()``.
        """
        p = self.page
        p.title = "fieldcol"
        p.theme_mode = ft.ThemeMode.LIGHT
        p.theme = ft.Theme(color_scheme_seed="#1C4E9C")
        p.bgcolor = BG
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
            self._render("/", "fieldcol", [v.text_line(str(e), color=v.TONES["over"][0]),
                                          ft.Button("Back to sites", on_click=self._go("/"),
                                                    height=v.TAP)], None)

    def _render(self, route: str, title: str, body: list[ft.Control] | ft.Control,
                back: str | None, *, scroll: bool = True) -> None:
        leading = None
        if back is not None:
            leading = ft.Semantics(identifier="back", content=ft.IconButton(
                ft.Icons.ARROW_BACK, on_click=self._go(back), tooltip="Back",
                icon_color=ft.Colors.WHITE, icon_size=28))
        bar = ft.AppBar(leading=leading, title=ft.Text(title, size=20, color=ft.Colors.WHITE,
                                                       weight=ft.FontWeight.BOLD),
                        bgcolor="#1C4E9C", automatically_imply_leading=False)
        if isinstance(body, list):
            body = ft.ListView(body, spacing=12, padding=12, expand=True) if scroll \
                else ft.Column(body, expand=True)
        self.page.views.clear()
        self.page.views.append(ft.View(route=route, appbar=bar, controls=[body], padding=0,
                                       bgcolor=BG))
        self.page.update()

    # -- screens ------------------------------------------------------------------------
    async def _show_sites(self) -> None:
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

    async def _show_column(self, column_id: str) -> None:
        same = self.detail is not None and self.detail.id == column_id
        # the same column drawn again (a resize): what is typed but not saved stays
        typed = {n: (tf.value, tf.error) for n, tf in self.fields.items()} if same else {}
        failed = self.failed if same else {}
        self.detail = await asyncio.to_thread(m.column_detail, self.store, column_id)
        d = self.detail
        note = self.note.value if same else ""
        pane = self._column_pane(d)
        self.note.value = note
        self.failed = failed
        for n, (value, error) in typed.items():
            if n in self.fields:
                self.fields[n].value, self.fields[n].error = value, error
        if not self.wide:
            self._render(f"/columns/{column_id}", f"Column {d.tag}", pane,
                         f"/sites/{d.site_id}")
            return
        await self._load_columns(d.site_id)
        self._render(f"/columns/{column_id}", f"{d.site_name} · {d.tag}",
                     self._two_panes(self._list(selected=d.id), pane), f"/sites/{d.site_id}")

    def _column_pane(self, d: m.ColumnDetail) -> ft.Control:
        self.fields = {}
        entries: list[ft.Control] = []
        for f in d.fields:
            tf = v.edit_field(f, self._save_field)
            self.fields[f.name] = tf
            entries.append(ft.Semantics(identifier=f"field-{f.name}", content=tf))
        self.recheck_button = ft.Semantics(identifier="check-again", content=ft.FilledButton(
            "Check again", icon=ft.Icons.REFRESH, on_click=self._recheck, height=v.TAP))
        self.note.value = ""
        edit = v._card([v.text_line("Typed values are saved as you go (Enter or leave the field) "
                                "and the column is checked again.", size=14, color=v.MUTED),
                        *entries, self.recheck_button,
                        ft.Semantics(identifier="save-note", live_region=True,
                                     content=self.note)],
                       title="Edit")
        self._fill(d)
        return ft.ListView([ft.Semantics(identifier="column-tag", header=True,
                                         content=v.text_line(d.tag, size=24, bold=True)),
                            self.check_area, v.caution_box(), edit, self.record_area],
                           spacing=12, padding=12, expand=True)

    def _fill(self, d: m.ColumnDetail) -> None:
        body = v.check_body(d)
        # the summary sits above the caution and the edit area; the rest below them
        self.check_area.controls = body[:1]
        self.record_area.controls = body[1:] + v.record_body(d)

    # -- handlers -----------------------------------------------------------------------
    async def _refresh_list(self) -> None:
        """Reload the list beside the column (tablet) so it shows the new check."""
        d = self.detail
        if not self.wide or self.columns is None or d is None:
            return
        limit = min(1000, max(m.PAGE, len(self.columns.rows)))
        self.columns = await asyncio.to_thread(m.column_page, self.store, d.site_id, limit=limit)
        self.list_pane.content = self._list(selected=d.id)

    async def _save_field(self, e: Any) -> None:
        tf: ft.TextField = e.control
        name, text = tf.data, (tf.value or "")
        d = self.detail
        if d is None:
            return
        async with self.lock:
            d = self.detail
            saved = next(f.value for f in d.fields if f.name == name)
            if text.strip() == saved.strip():
                if tf.error is not None:  # typed back to the saved value: nothing to report
                    tf.error = None
                    self.failed.pop(name, None)
                    self.page.update()
                return
            if self.failed.get(name) == text:
                return  # the same refused entry (Enter then blur): the error is already shown
            res = await asyncio.to_thread(m.apply_edit, self.store, d.id, name, text)
            label = m.EDIT_FIELDS[name][0]
            if not res.saved:
                self.failed[name] = text
                tf.value = text  # the typed text stays for correction
                tf.error = res.error
                self.note.value = f"{label} not saved: {res.error}"
            else:
                self.failed.pop(name, None)
                tf.error = None
                self.detail = res.detail
                assert res.detail is not None and res.detail.check is not None
                self._fill(res.detail)
                self.note.value = (f"Saved {label.lower()} {text}; checked again: "
                                   f"{res.detail.check.status.label}")
                await self._refresh_list()
            self.page.update()

    async def _recheck(self, _e: Any = None) -> None:
        d = self.detail
        if d is None:
            return
        async with self.lock:
            self.note.value = "Checking..."
            self.page.update()
            try:
                self.detail = await asyncio.to_thread(m.recheck, self.store, d.id)
            except InputError as e:
                self.note.value = f"Not checked: {e}"
            else:
                self._fill(self.detail)
                assert self.detail.check is not None
                self.note.value = f"Checked again: {self.detail.check.status.label}"
                await self._refresh_list()
            self.page.update()


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


def run(store: "Store", *, host: str = "127.0.0.1", port: int = 8550) -> None:
    """Serve the app to browsers (web mode, no CDN: it works with no network) until stopped.

    Args:
        store: an open ``Store``.
        host, port: where to listen.

    Example: ``run(open_store("site.db"), port=8550)``.
    """
    # serve only: never try to open a browser on the machine running the server
    os.environ["FLET_FORCE_WEB_SERVER"] = "true"
    ft.run(make_main(store), view=ft.AppView.WEB_BROWSER, host=host, port=port, no_cdn=True)
