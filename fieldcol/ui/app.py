"""The field app: routes, screens and the column screen's tabs over one open store.

Routes: ``/`` (sites; at first start it asks who is using the device), ``/settings`` (who,
theme), ``/sync`` (the office hub: address, token, sync, conflicts, field bundles),
``/sites/<id>/report`` (the site's PDF report and CSV register, handed out),
``/columns/<id>/report`` (one column's calculation sheet, the same way), ``/sites/new``,
``/sites/<id>`` (a site's columns), ``/sites/<id>/edit``, ``/sites/<id>/new-column``,
``/sites/<id>/visit`` (start a visit), ``/columns/<id>`` (one column: Delete in its top bar,
"Next like this" (duplicate) at the foot of the screen, in thumb reach and far from Delete).
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
import datetime
import os
import sqlite3
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.errors import InputError, StoreBusyError
from fieldcol.ui import forms as fm
from fieldcol.ui import model as m
from fieldcol.ui import sites as st
from fieldcol.ui import notes as n
from fieldcol.ui import notes_views as nv
from fieldcol.ui import palette
from fieldcol.ui import views as v
from fieldcol.ui._tab import Tab
from fieldcol.ui.column_list import ColumnList
from fieldcol.ui.saving import Saver, failure_words
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


class ColumnGone(InputError):
    """The column of an address is not on this device any more (deleted here, with its site,
    or by a sync) or never was (an old or mistyped address); ``tag`` its tag if known."""

    def __init__(self, column_id: str, tag: str | None) -> None:
        super().__init__("column", column_id, "this column was deleted" if tag else
                         "no column with this id on this device", None)
        self.tag = tag


class FieldApp:
    """One browser tab (or device window) of the app: its page, the shared store, its state.

    Args:
        page: the Flet page of this session.
        store: an open ``Store`` (shared by sessions; it serialises its own calls).
        office: True when the store is the office hub's (the office view): the sync screen
            then has no hub to reach, only bundles and conflicts.

    Example: ``await FieldApp(page, store).start()`` inside ``main(page)``.
    """

    def __init__(self, page: ft.Page, store: "Store", *, office: bool = False) -> None:
        self.page = page
        self.store = store
        self.office = office
        self.lock = asyncio.Lock()
        self.wide = False
        self.person: str | None = None
        self.visit_id: str | None = None
        self.visit: Any = None  # the visit open on this device (any site), or None
        self.list = ColumnList(self)
        self.detail: m.ColumnDetail | None = None
        self.counts: dict[str, int] = {}
        self.tab = "check"
        self.tabs: dict[str, Tab] = {}
        self.tab_error: list[ft.Control] | None = None  # the shown tab could not be read
        self._drawn: str | None = None  # a route drawn before the browser reports it
        self._address: str | None = None  # the view's route while drawn under another
        self.screen = "/"  # the route of the screen drawn last (the save bar's messages follow it)
        self.draws = 0  # screens and tabs drawn (sent) so far: the saver sees if one was
        self.pane = ft.ListView(spacing=12, padding=12, expand=True)
        self.list_pane = ft.Container(width=400)
        self._right = ft.Container(expand=True)  # the pane beside the list (tablet)
        self._title = ft.Text("fieldcol")
        # the tablet's column screen on show, as (view, site id): another column of the same
        # site changes it in place (see ``_beside_list``)
        self._frame: tuple[ft.View, str] | None = None
        self.saver = Saver(self)
        self.theme = "light"
        self.forms: dict[str, dict[str, ft.TextField]] = {}  # per route: what is typed stays
        self.choices: dict[str, dict[str, str]] = {}        # per route: choices made

    async def start(self) -> None:
        """Set up the page and show the route it opened on.

        Example: ``await app.start()``.
        """
        p = self.page
        p.title = "fieldcol"
        who, self.theme = await asyncio.to_thread(
            lambda: (self.store.who(), self.store.setting("theme")))
        self.person = who.name if who else None
        palette.apply(p, self.theme)
        p.bgcolor = v.BG
        p.padding = 0
        p.on_route_change = self._on_route
        p.on_resize = self._on_resize
        self.wide = (p.width or 0) >= v.WIDE
        await self.show(p.route or "/")

    # -- navigation ---------------------------------------------------------------------
    async def _on_route(self, e: ft.RouteChangeEvent) -> None:
        drawn, self._drawn = self._drawn, None
        if e.route == drawn:  # already on screen (open_column drew it before the address)
            return
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
            if parts == ["settings"]:
                await self._show_settings()
            elif parts == ["sync"]:
                await self._show_sync()
            elif parts == ["sites", "new"]:
                await self._show_site_form(None)
            elif len(parts) == 3 and parts[0] == "sites" and parts[2] == "edit":
                await self._show_site_form(parts[1])
            elif len(parts) == 3 and parts[0] == "sites" and parts[2] == "new-column":
                await self._show_column_form(parts[1])
            elif len(parts) == 3 and parts[0] == "sites" and parts[2] == "visit":
                await self._show_visit_form(parts[1])
            elif len(parts) == 3 and parts[0] == "sites" and parts[2] == "report":
                await self._show_report(parts[1])
            elif len(parts) == 2 and parts[0] == "sites":
                await self._show_site(parts[1])
            elif len(parts) == 2 and parts[0] == "columns":
                await self._show_column(parts[1])
            elif len(parts) == 3 and parts[0] == "columns" and parts[2] == "report":
                await self._show_report(None, parts[1])
            else:
                await self._show_sites()
        except (sqlite3.Error, OSError, StoreBusyError) as e:
            # the store could not be read (busy, locked, a disk fault): never a blank screen
            self._failed(route, e)
        except ColumnGone as e:  # a reload or Back at a column since deleted, an old address
            await self._column_gone(e)
        except InputError as e:  # e.g. an id that no longer exists: say so, keep the app usable
            self.detail = None
            self._render("/", "fieldcol", [v.text_line(str(e), color=v.TONES["over"][0]),
                                          ft.Button("Back to sites", on_click=self._go("/"),
                                                    height=v.TAP)], None)

    async def _column_gone(self, e: ColumnGone) -> None:
        """The sites, with why in the bar, for the address of a column that is gone."""
        self.detail = None
        words = (f"Column {e.tag} was deleted: the sites are shown." if e.tag else
                 "No column at that address on this device: the sites are shown.")
        if self.draws:  # within a session (Back, Forward): the address moves and is drawn
            self.saver.say(words, kind="info", draw=False)
            self.saver.follow("/")
            await self.page.push_route("/")
            return
        # the session's first screen (a reload at the address): drawn under the address the
        # browser holds, which stays. A screen of another route, or a new address pushed
        # while the session starts, left the web client blank (seen in headless chromium,
        # no error on either side); a site's own screen as the first one is blank as well
        # (also on a plain reload at /sites/<id>), so the sites, not the column's site
        self._address = self.page.route or "/"
        try:
            await self.show("/")
        finally:
            self._address = None
        self.saver.say(words, kind="info")

    def _failed(self, route: str, e: BaseException) -> None:
        """A screen that could not be loaded: what happened in plain words, and Try again."""
        self.detail = None

        async def again(_e: Any = None) -> None:
            await self.show(route)
        self._render(route, "fieldcol", [v._card([
            ft.Row([ft.Icon(ft.Icons.ERROR_OUTLINE, color=v.TONES["over"][0], size=28),
                    ft.Container(v.text_line("This screen could not be loaded.", size=18,
                                             bold=True), expand=True)]),
            ft.Semantics(identifier="load-error", content=v.text_line(failure_words(e))),
            v.text_line("Nothing was lost: what was saved stays saved.", color=v.MUTED),
            ft.Row([ft.Semantics(identifier="try-again", content=ft.FilledButton(
                        "Try again", icon=ft.Icons.REFRESH, on_click=again, height=v.TAP)),
                    ft.Semantics(identifier="to-sites", content=ft.OutlinedButton(
                        "Sites", icon=ft.Icons.HOME, on_click=self._go("/"), height=v.TAP))],
                   wrap=True, spacing=8)])], None)

    def _render(self, route: str, title: str, body: list[ft.Control] | ft.Control,
                back: str | None, *, scroll: bool = True, title_id: str | None = None,
                actions: list[ft.Control] | None = None,
                foot: ft.Control | None = None) -> None:
        leading = None
        if back is not None:
            leading = ft.Semantics(identifier="back", content=ft.IconButton(
                ft.Icons.ARROW_BACK, on_click=self._go(back), tooltip="Back",
                icon_color=v.ON_ACCENT, icon_size=28))
        self._frame = None  # a new screen: nothing of the last one to change in place
        self.screen = route
        self.saver.moved(route)  # a message of another screen closes with this update
        # a long name (a site's, beside Report and Edit at 390 px) wraps onto a second line
        # rather than losing its end: two lines of 20 px fit the 56 px bar; beyond that it
        # ends in "..." and the tooltip (a long press) and screen readers have it whole
        self._title = ft.Text(title, size=20, color=v.ON_ACCENT, weight=ft.FontWeight.BOLD,
                              max_lines=2, overflow=ft.TextOverflow.ELLIPSIS, tooltip=title)
        head: ft.Control = self._title
        if title_id is not None:
            head = ft.Semantics(identifier=title_id, header=True, content=head)
        bar = ft.AppBar(leading=leading, title=head, actions=actions or [],
                        bgcolor=v.ACCENT, automatically_imply_leading=False)
        if isinstance(body, list):
            body = ft.ListView(body, spacing=12, padding=12, expand=True) if scroll \
                else ft.Column(body, expand=True)
        # the save bar sits under every screen: in thumb reach, never scrolled away; a
        # screen's ``foot`` (its quick action) just above it, as near the thumb
        screen = ft.Column([ft.Container(body, expand=True),
                            *([foot] if foot is not None else []), self.saver.bar],
                           spacing=0, expand=True)
        self.page.views.clear()
        self.page.views.append(ft.View(route=self._address or route, appbar=bar,
                                       controls=[screen], padding=0, bgcolor=v.BG))
        self.page.update()
        self.draws += 1

    # -- screens ------------------------------------------------------------------------
    def _action(self, icon: ft.IconData, tip: str, identifier: str,
                on_click: Callable[..., Any]) -> ft.Control:
        return ft.Semantics(identifier=identifier, button=True, label=tip, content=ft.IconButton(
            icon, on_click=on_click, tooltip=tip, icon_color=v.ON_ACCENT, icon_size=28))

    async def _show_sites(self) -> None:
        self.detail = None
        cards = await asyncio.to_thread(m.site_cards, self.store)
        body = v.sites_body(cards, lambda sid: self._go(f"/sites/{sid}"))
        top: list[ft.Control] = []
        if self.person is None:  # first start: ask who is here before anything is recorded
            top = [v.text_line("Before you record: who is using this device?", size=18,
                               bold=True),
                   *fm.who_form(self.forms.setdefault("/who", {}), None, self._save_who)]
        new = ft.Semantics(identifier="new-site", content=ft.FilledButton(
            "New site", icon=ft.Icons.ADD, on_click=self._go("/sites/new"), height=v.TAP))
        self._render("/", "fieldcol · Sites", top + [new] + body, None,
                     actions=[self._action(ft.Icons.SYNC, "Sync with the office", "open-sync",
                                           self._go("/sync")),
                              self._action(ft.Icons.SETTINGS, "Settings", "settings",
                                           self._go("/settings"))])

    async def _show_sync(self) -> None:
        from fieldcol.ui.sync_view import SyncScreen

        self.detail = None
        screen = SyncScreen(self.page, self.store, office=self.office)
        self._render("/sync", "Bundles and conflicts" if self.office else "Sync with the office",
                     screen.controls(), "/")
        await screen.refresh()

    async def _save_who(self, _e: Any = None) -> None:
        route = "/who" if self.person is None and (self.page.route or "/") == "/" else "/settings"
        f = self.forms.get(route, {})
        do, undo = st.who_change(*(f[k].value or "" for k in ("name", "initials", "device")))
        who = await self.saver.save("who is recording", do, undo, f,
                                    done=lambda p: f"Saved: {p.name} ({p.initials}) on "
                                                   f"{p.device}")
        if who is not None:
            self.person = who.name
            self.forms.pop("/who", None)
            await self.show(self.page.route or "/")

    async def _show_settings(self) -> None:
        self.detail = None
        who = await asyncio.to_thread(self.store.who)
        fields = self.forms.setdefault("/settings", {})

        def choose(theme: str) -> Callable[..., Any]:
            async def pick(_e: Any = None) -> None:
                old = self.theme
                done = await self.saver.save(
                    f"theme {theme}", lambda s: s.set_setting("theme", theme),
                    lambda s: s.set_setting("theme", old))
                if done is not None:
                    self.theme = theme
                    self.page.theme_mode = ft.ThemeMode.DARK if theme == "dark" \
                        else ft.ThemeMode.LIGHT
                    await self.show("/settings")
            return pick
        self._render("/settings", "Settings",
                     fm.who_form(fields, who, self._save_who, self.theme, choose), "/")

    async def _show_site_form(self, site_id: str | None) -> None:
        self.detail = None
        route = "/sites/new" if site_id is None else f"/sites/{site_id}/edit"
        if route not in self.choices:
            self.choices[route] = await asyncio.to_thread(st.site_values, self.store, site_id)
        values = self.choices[route]
        fields = self.forms.setdefault(route, {})

        def choose(key: str, value: str) -> Callable[..., Any]:
            async def pick(_e: Any = None) -> None:
                values[key] = value
                await self.show(route)
            return pick

        async def save(_e: Any = None) -> None:
            typed = {**values, **{k: tf.value or "" for k, tf in fields.items()}}
            do, undo = st.site_change(site_id, typed)
            name = typed.get("name", "").strip()
            sid = await self.saver.save(f"site {name}".strip(), do, undo, fields)
            if sid is not None:
                self.forms.pop(route, None)
                self.choices.pop(route, None)
                self.saver.follow(f"/sites/{sid}")
                await self.page.push_route(f"/sites/{sid}")
        back = "/" if site_id is None else f"/sites/{site_id}"
        self._render(route, "New site" if site_id is None else "Edit site",
                     fm.site_form(fields, values, choose, save, site_id is None), back)

    async def _show_column_form(self, site_id: str) -> None:
        self.detail = None
        route = f"/sites/{site_id}/new-column"
        fields = self.forms.setdefault(route, {})
        tag = ""
        if not fields:
            def propose(store: "Store") -> str:
                rows = store.page_columns(site_id, limit=1000)
                return st.next_tag(store, site_id, rows[-1].tag) if rows else "C1"
            tag = await asyncio.to_thread(propose, self.store)

        async def save(_e: Any = None) -> None:
            typed = {k: tf.value or "" for k, tf in fields.items()}
            do, undo = st.add_column_change(site_id, typed)
            cid = await self.saver.save(f"column {typed.get('tag', '').strip()}".strip(), do,
                                        undo, fields)
            if cid is not None:
                self.forms.pop(route, None)
                self.list.forget()
                self.saver.follow(f"/columns/{cid}")
                await self.page.push_route(f"/columns/{cid}")
        self._render(route, "New column", fm.column_form(fields, tag, save), f"/sites/{site_id}")

    def open_column(self, column_id: str) -> Callable[..., Any]:
        """The click handler that opens a column (its route).

        Example: ``ft.Container(on_click=app.open_column(cid))``.
        """
        route = f"/columns/{column_id}"

        async def go(_e: Any = None) -> None:
            # drawn at once, then the address follows: waiting for the browser to hand the
            # route back first costs a round trip on every tap on a row
            self._drawn = route
            await self.show(route)
            await self.page.push_route(route)
        return go

    async def _load_visit(self, site_id: str) -> None:
        self.visit = await asyncio.to_thread(self.store.open_visit)
        self.visit_id = self.visit.id if self.visit is not None and \
            self.visit.site_id == site_id else None

    def _visit_tool(self, site_id: str) -> ft.Control:
        vis = self.visit
        if vis is not None and vis.site_id == site_id:
            said = f"Visit under way: {vis.date}" + "".join(
                f" · {x}" for x in (vis.who, vis.weather, vis.access) if x)
            return ft.Semantics(identifier="visit-now", content=ft.Row([
                ft.Icon(ft.Icons.EVENT_AVAILABLE, color=v.INK, size=24),
                ft.Container(v.text_line(said), expand=True),
                ft.Semantics(identifier="end-visit", content=ft.OutlinedButton(
                    "End visit", icon=ft.Icons.STOP, on_click=self._end_visit,
                    height=v.TAP))], wrap=True, spacing=8))
        return ft.Semantics(identifier="new-visit", content=ft.OutlinedButton(
            "Start a visit", icon=ft.Icons.EVENT, on_click=self._go(f"/sites/{site_id}/visit"),
            height=v.TAP))

    async def _end_visit(self, _e: Any = None) -> None:
        vis = self.visit
        if vis is None:
            return
        do, undo = st.end_visit_change(vis.id)
        await self.saver.save(f"end of the visit of {vis.date}", do, undo,
                              done=f"Visit of {vis.date} ended")

    async def _show_visit_form(self, site_id: str) -> None:
        self.detail = None
        route = f"/sites/{site_id}/visit"
        fields = self.forms.setdefault(route, {})
        async def save(_e: Any = None) -> None:
            typed = {k: tf.value or "" for k, tf in fields.items()}
            do, undo = st.visit_change(site_id, typed)
            vis = await self.saver.save(f"visit of {typed.get('date', '').strip()}", do, undo,
                                        fields, done=lambda x: f"Visit of {x.date} started: "
                                        "what is recorded now belongs to it")
            if vis is not None:
                self.forms.pop(route, None)
                self.saver.follow(f"/sites/{site_id}")
                await self.page.push_route(f"/sites/{site_id}")
        self._render(route, "New visit",
                     fm.visit_form(fields, datetime.date.today().isoformat(), self.person, save),
                     f"/sites/{site_id}")

    def _list(self, site_id: str, selected: str | None = None) -> ft.Control:
        new = ft.Semantics(identifier="new-column", content=ft.FilledButton(
            "Add column", icon=ft.Icons.ADD, on_click=self._go(f"/sites/{site_id}/new-column"),
            height=v.TAP))
        visit = self._visit_tool(site_id)
        tools = ft.Row([new, visit], wrap=True, spacing=8, run_spacing=8) \
            if self.visit is None or self.visit.site_id != site_id \
            else ft.Column([visit, new], spacing=8)
        return self.list.control(selected, tools)

    async def _show_report(self, site_id: str | None, column_id: str | None = None) -> None:
        """The report of a site, or (``column_id``) one column's calculation sheet."""
        from fieldcol.ui.report_view import ReportScreen

        self.detail = None
        col = None
        if column_id is not None:
            col = await asyncio.to_thread(self.store.get_column, column_id)
            site_id = col.site_id
        assert site_id is not None
        card = await asyncio.to_thread(m.site_card, self.store, site_id)
        screen = ReportScreen(self.page, self.store, site_id, col.tag if col else None)
        if col is None:
            self._render(f"/sites/{site_id}/report", f"Report: {card.name}",
                         screen.controls(card.summary), f"/sites/{site_id}")
        else:
            self._render(f"/columns/{column_id}/report", f"Sheet: {col.tag}",
                         screen.controls(card.summary), f"/columns/{column_id}")

    async def _show_site(self, site_id: str) -> None:
        self.detail = None
        # the rows shown before read again (checks may be new), then back where they were
        page = await self.list.load(site_id, fresh=True)
        await self._load_visit(site_id)
        title = page.site.name
        actions = [self._action(ft.Icons.PICTURE_AS_PDF, "Site report", "site-report",
                                self._go(f"/sites/{site_id}/report")),
                   self._action(ft.Icons.EDIT, "Edit site", "edit-site",
                                self._go(f"/sites/{site_id}/edit"))]
        if not self.wide:
            self._render(f"/sites/{site_id}", title, self._list(site_id), "/", actions=actions,
                         title_id="site-title")
        else:
            hint = ft.Container(v.text_line("Pick a column to see its check.", color=v.MUTED),
                                padding=24)
            self._render(f"/sites/{site_id}", title,
                         self._two_panes(self._list(site_id), hint), "/", actions=actions,
                         title_id="site-title")
        await self.list.restore()

    def _two_panes(self, left: ft.Control, right: ft.Control) -> ft.Control:
        self.list_pane.content = left
        self._right = ft.Container(right, expand=True)
        return ft.Row([self.list_pane, ft.VerticalDivider(width=1, color=v.LINE),
                       self._right], expand=True, spacing=0,
                      vertical_alignment=ft.CrossAxisAlignment.STRETCH)

    def _beside_list(self, route: str, title: str, site_id: str, right: ft.Control) -> bool:
        """On a tablet showing a column of ``site_id`` beside its list: show another column
        in its place (the route, the title, the right pane) and keep the rest of the screen.
        Only what changed travels (the list's rows are kept controls, two change their
        highlight): a new screen re-sent the whole list on every tap. False when the screen
        is not that one (then the caller draws it whole)."""
        f = self._frame
        if f is None or f[1] != site_id or not self.page.views or self.page.views[-1] is not f[0]:
            return False
        f[0].route = route
        self.screen = route
        self.saver.moved(route)  # another column: the last one's Undo goes
        self._title.value = self._title.tooltip = title
        self._right.content = right
        self.page.update()
        self.draws += 1
        return True

    def _load_column(self, column_id: str) -> tuple[m.ColumnDetail, dict[str, int]]:
        """(worker thread) The column screen and the numbers beside its tabs; ``ColumnGone``
        for a column deleted (its tombstone stays in the file and would read as a column:
        a reload or Back after Delete showed it, open to edits) or unknown."""
        try:
            col = self.store.get_column(column_id)
        except InputError:
            raise ColumnGone(column_id, None) from None
        site = self.store.get_site(col.site_id)
        if col.deleted_at is not None or site.deleted_at is not None:
            raise ColumnGone(column_id, col.tag)
        d = m.column_detail(self.store, column_id)
        opened = len(self.store.list_findings(d.site_id, status="open", column_id=column_id))
        return d, {"findings": opened, "retrofit": len(self.store.retrofits(column_id))}

    def _load_column_and_visit(self, column_id: str, tab: Tab | None = None
                               ) -> tuple[m.ColumnDetail, dict[str, int], Any, Any]:
        """(worker thread) The column, the numbers beside its tabs, the open visit and what
        ``tab`` shows (its ``fetch``): one trip to the worker for the whole screen."""
        d, counts = self._load_column(column_id)
        return d, counts, self.store.open_visit(), \
            None if tab is None else tab.fetch(self.store, column_id)

    async def _show_column(self, column_id: str) -> None:
        same = self.detail is not None and self.detail.id == column_id and bool(self.tabs)
        first: Tab | None = None
        if not same:  # a new column: fresh tabs (a resize keeps them, and what is typed)
            tabs = {cls.name: cls(self) for cls in TABS}
            first = tabs["check"] if type(tabs["check"]).fetch is not Tab.fetch else None
        try:
            self.detail, self.counts, self.visit, data = await asyncio.to_thread(
                self._load_column_and_visit, column_id, first)
        except (sqlite3.Error, OSError, StoreBusyError):
            if first is None:
                raise
            # the tab's part could not be read: the column alone, the tab says why below
            self.detail, self.counts, self.visit, data = await asyncio.to_thread(
                self._load_column_and_visit, column_id)
            first = None
        self.visit_id = self.visit.id if self.visit is not None and \
            self.visit.site_id == self.detail.site_id else None
        if not same:
            self.tabs, self.tab = tabs, "check"
            # the shown tab is read before the screen is drawn: one update carries the whole
            # screen (drawing it empty first, then again filled, sent every control twice)
            if first is not None:
                first.took(data)
                self.tab_error = None
            else:
                await self._load_tab(draw=False)
        d = self.detail
        self.pane = ft.ListView(spacing=12, padding=12, expand=True)
        shown = self._pane_controls()
        # the top of the tab (the result, the caution) goes first, the rest in a second update:
        # what a phone shows at once is on screen while the part below is still on its way
        n = self.tabs[self.tab].first
        k = len(shown) if n is None else 1 + max(1, n)
        rest = shown[k:] if self.tab_error is None else []
        self.pane.controls = shown[:len(shown) - len(rest)]
        # Delete alone at the top (a reach away: a mis-tap there costs an Undo); the next
        # column like this one, the most repeated step of a survey, at the thumb
        actions = [self._action(ft.Icons.DELETE_OUTLINE, "Delete this column (Undo follows)",
                                "delete-column", self._delete)]
        foot = v.column_foot(self._duplicate)
        if not self.wide:
            self._render(f"/columns/{column_id}", f"Column {d.tag}", self.pane,
                         f"/sites/{d.site_id}", title_id="column-tag", actions=actions,
                         foot=foot)
        else:
            await self.list.load(d.site_id)
            route, title = f"/columns/{column_id}", f"{d.site_name} · {d.tag}"
            left = self._list(d.site_id, selected=d.id)
            if not self._beside_list(route, title, d.site_id, self.pane):
                self._render(route, title, self._two_panes(left, self.pane),
                             f"/sites/{d.site_id}", title_id="column-tag", actions=actions,
                             foot=foot)
                self._frame = (self.page.views[-1], d.site_id)
                await self.list.restore()  # the list beside stays where it was scrolled
        if rest:
            drawn = self.pane.controls
            # a moment for the device to draw the top before the rest arrives: sent at once,
            # the second update was taken in before the first frame and held it back
            # (measured: the result on screen ~100 ms sooner in headless chromium)
            await asyncio.sleep(0.08)
            if self.pane.controls is drawn and self.detail is d:  # nothing redrawn meanwhile
                drawn.extend(rest)
                self.page.update()

    async def _duplicate(self, _e: Any = None) -> None:
        d = self.detail
        if d is None:
            return
        do, undo = st.duplicate_change(d.id)
        cid = await self.saver.save(f"copy of {d.tag}", do, undo,
                                    done=lambda c: f"Added the next column like {d.tag} "
                                                   "(section, length, restraints, material; "
                                                   "no demand or readings)")
        if cid is not None:
            self.list.forget()
            self.saver.follow(f"/columns/{cid}")  # Undo takes the copy away again
            await self.page.push_route(f"/columns/{cid}")

    async def _delete(self, _e: Any = None) -> None:
        d = self.detail
        if d is None:
            return
        do, undo = st.delete_change(d.id)
        self.detail = None  # the screen goes with the column
        sid = await self.saver.save(f"deletion of column {d.tag}", do, undo,
                                    done=f"Deleted column {d.tag}")
        if sid is None:
            self.detail = d
            return
        self.list.forget()
        self.saver.follow(f"/sites/{sid}")  # Undo brings the column back into this list
        await self.page.push_route(f"/sites/{sid}")

    # -- the column screen's tabs ---------------------------------------------------------
    def _pane_controls(self) -> list[ft.Control]:
        tabs = [(t.name, t.label, t.icon) for t in self.tabs.values()]
        row = v.tab_row(tabs, self.tab, self.counts, self._choose_tab, wrap=self.wide)
        row.key = "tab-row"  # drawn again, it is compared with the last: only changes are sent
        body = self.tab_error if self.tab_error is not None else self.tabs[self.tab].controls()
        return [row, *body]

    def redraw(self) -> None:
        """Draw the column screen (tab row and the shown tab) again; no I/O.

        Example: ``app.redraw()`` after a tab changed what it shows.
        """
        if self.detail is None or not self.tabs:
            return
        self.pane.controls = self._pane_controls()
        self.page.update()
        self.draws += 1

    async def _load_tab(self, *, draw: bool = True) -> None:
        """Read the shown tab's view-models; then draw it (unless ``draw`` is False: the
        caller draws the whole screen). A tab that cannot be read shows why, with Try again."""
        d, name = self.detail, self.tab
        if d is None:
            return
        try:
            await self.tabs[name].load()
            self.tab_error = None
        except (sqlite3.Error, OSError, StoreBusyError) as e:
            async def again(_e: Any = None) -> None:
                await self._load_tab()
            self.tab_error = [v._card([
                ft.Semantics(identifier="load-error", content=v.text_line(
                    f"This tab could not be loaded. {failure_words(e)}")),
                ft.Semantics(identifier="try-again", content=ft.FilledButton(
                    "Try again", icon=ft.Icons.REFRESH, on_click=again, height=v.TAP))])]
        if draw and (self.detail is d or (self.detail is not None and self.detail.id == d.id)):
            if self.tab == name:
                self.redraw()

    def _choose_tab(self, name: str) -> Callable[..., Any]:
        async def choose(_e: Any = None) -> None:
            ft.context.disable_auto_update()  # redraw and _load_tab send their own updates
            self.tab = name
            self.tab_error = None
            self.redraw()
            await self._load_tab()
            if self.tab == name:
                self.tabs[name].shown()  # e.g. the Condition tab's entry takes the keyboard
        return choose

    async def changed(self) -> None:
        """Reload after a saved change: the column (detail, status, counts, its line in the
        list beside it) and the open tab; on a list screen, that screen.

        Example: ``await app.changed()`` (``app.saver.save`` calls it after each save).
        """
        d = self.detail
        if d is None:
            route = self.page.route or "/"
            if not route.startswith("/columns/"):  # a column going away moves on by itself
                await self.show(route)
            return
        tab = self.tabs.get(self.tab)
        # the column and the open tab's view in one trip to the worker (when the tab can)
        both = tab if tab is not None and type(tab).fetch is not Tab.fetch else None
        try:
            try:
                self.detail, self.counts, self.visit, data = await asyncio.to_thread(
                    self._load_column_and_visit, d.id, both)
            except (sqlite3.Error, OSError, StoreBusyError):
                if both is None:
                    raise
                self.detail, self.counts = await asyncio.to_thread(self._load_column, d.id)
                both = None  # the tab reads again below and says why if it cannot
        except InputError:  # the column itself went (deleted): back to its site
            self.detail = None
            self.saver.follow(f"/sites/{d.site_id}")  # e.g. "Undone: copy of ..." goes along
            await self.page.push_route(f"/sites/{d.site_id}")
            return
        self.visit_id = self.visit.id if self.visit is not None and \
            self.visit.site_id == self.detail.site_id else None
        await self._refresh_list()
        if both is not None and self.tab == both.name and self.tabs.get(self.tab) is both:
            both.took(data)
            self.tab_error = None
            self.redraw()
        else:
            await self._load_tab()

    async def _refresh_list(self) -> None:
        """Read the list beside the column again (tablet) so it shows the new check."""
        d = self.detail
        if not self.wide or self.list.page is None or d is None:
            return
        await self.list.load(d.site_id, fresh=True)
        self.list.control(d.id, self.list.tools)

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


def make_main(store: "Store", *, office: bool = False) -> Callable[[ft.Page], Any]:
    """The Flet ``main`` for a store: each session gets its own ``FieldApp``.

    Args:
        store: an open ``Store``.
        office: the store is the office hub's (see ``FieldApp``).

    Returns:
        An async ``main(page)``.

    Example: ``ft.run(make_main(store))``.
    """
    async def main(page: ft.Page) -> None:
        await FieldApp(page, store, office=office).start()
    return main


def run(store: "Store", *, host: str = "127.0.0.1", port: int = 8550,
        key: str | None = None, office: bool = False) -> None:
    """Serve the app to browsers (web mode, no CDN: it works with no network) until stopped.

    The web app is Flet's own, served by uvicorn behind ``fieldcol.ui._access.Guard``: beyond
    loopback (or with a key) every request and WebSocket needs the access key.

    Args:
        store: an open ``Store``.
        host, port: where to listen.
        key: the access key; required when ``host`` is not loopback.
        office: the store is the office hub's (see ``FieldApp``).

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
    web = flet_fastapi.app(make_main(store, office=office), no_cdn=True,
                           upload_dir=configure_uploads())
    config = uvicorn.Config(Guard(web, key, port), host=host, port=port,
                            ws="websockets-sansio", log_level="warning",
                            access_log=False,  # an access log would record keys in addresses
                            timeout_graceful_shutdown=3)
    uvicorn.Server(config).run()
