"""The field app: routes, screens and handlers over one open store.

Routes: ``/`` (sites), ``/sites/<id>`` (a site's columns), ``/columns/<id>`` (one column).
From ``WIDE`` px up, a site's columns stay beside the column shown (two panes). The column
screen has four tabs: its check (and edits), findings (with photos and the add form), history
(restraint changes, readings) and retrofit options (checked when the tab opens).
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
from fieldcol.ui import notes as n
from fieldcol.ui import notes_views as nv
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
        self.edit_card: ft.Control = ft.Container()
        # the column screen's tabs and what they show
        self.tab = "check"
        self.pane = ft.ListView(spacing=12, padding=12, expand=True)
        self.findings: list[n.FindingLine] = []
        self.history: n.History | None = None
        self.retrofits: list[n.RetrofitLine] | None = None
        self.n_retrofits = 0
        self.retrofit_error: str | None = None
        self.draft = {"text": "", "category": "", "severity": ""}  # the finding being typed
        self.draft_errors: dict[str, str | None] = {}
        self.form_open = False
        self.finding_note = ft.Text("", size=15, color=v.INK)

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
        typed = {k: (tf.value, tf.error) for k, tf in self.fields.items()} if same else {}
        failed = self.failed if same else {}
        self.detail, notes = await asyncio.to_thread(self._load_column, column_id)
        self.findings, self.history, self.n_retrofits = notes
        if not same:
            self.tab, self.retrofits = "check", None
            self.draft = {"text": "", "category": "", "severity": ""}
            self.draft_errors = {}
            self.form_open = False
            self.finding_note.value = ""
        d = self.detail
        note = self.note.value if same else ""
        pane = self._column_pane(d)
        self.note.value = note
        self.failed = failed
        for name, (value, error) in typed.items():
            if name in self.fields:
                self.fields[name].value, self.fields[name].error = value, error
        if not self.wide:
            self._render(f"/columns/{column_id}", f"Column {d.tag}", pane,
                         f"/sites/{d.site_id}", title_id="column-tag")
            return
        await self._load_columns(d.site_id)
        self._render(f"/columns/{column_id}", f"{d.site_name} · {d.tag}",
                     self._two_panes(self._list(selected=d.id), pane), f"/sites/{d.site_id}",
                     title_id="column-tag")

    def _load_column(self, column_id: str) -> tuple[m.ColumnDetail, tuple]:
        """(worker thread) The column screen and its findings, history and option count."""
        d = m.column_detail(self.store, column_id)
        return d, (n.column_findings(self.store, column_id),
                   n.column_history(self.store, column_id),
                   len(self.store.retrofits(column_id)))

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
        edit = v._card([v.text_line("Saved as you go (Enter or leave the field), then checked "
                                    "again.", size=14, color=v.MUTED),
                        *entries, self.recheck_button,
                        ft.Semantics(identifier="save-note", live_region=True,
                                     content=self.note)],
                       title="Edit")
        self._fill(d)
        self.edit_card = edit
        self.pane = ft.ListView(spacing=12, padding=12, expand=True)
        self._show_tab()
        return self.pane

    # -- tabs -------------------------------------------------------------------------------
    def _show_tab(self) -> None:
        """Fill the column pane with the tag, the tab row and the chosen tab's controls."""
        d = self.detail
        assert d is not None
        counts = {"findings": sum(f.status == "open" for f in self.findings),
                  "retrofit": self.n_retrofits}
        # the tag is in the title bar: the tabs take the place of a second heading
        head: list[ft.Control] = [nv.section_tabs(self.tab, counts, self._choose_tab)]
        if self.tab == "findings":
            body = nv.findings_body(self.findings, self._finding_form(), self._open_photo,
                                    self._toggle_finding)
        elif self.tab == "history":
            assert self.history is not None
            body = nv.history_body(self.history, self._open_photo)
        elif self.tab == "retrofit":
            body = nv.retrofit_body(self.retrofits, self.retrofit_error)
        else:
            body = [self.check_area, v.caution_box(), self.edit_card, self.record_area]
        self.pane.controls = head + body

    def _choose_tab(self, name: str) -> Callable[..., Any]:
        async def choose(_e: Any = None) -> None:
            self.tab = name
            self._show_tab()
            self.page.update()
            if name == "retrofit" and self.retrofits is None and self.detail is not None:
                cid = self.detail.id
                error = None
                try:
                    options = await asyncio.to_thread(n.retrofit_options, self.store, cid)
                except InputError as e:  # the column as it stands cannot be checked
                    options, error = [], f"Retrofit options not checked: {e}"
                if self.detail is None or self.detail.id != cid:
                    return  # another column was opened meanwhile
                self.retrofits, self.retrofit_error = options, error
                if self.tab == "retrofit":
                    self._show_tab()
                    self.page.update()
        return choose

    # -- findings ---------------------------------------------------------------------------
    def _finding_form(self) -> ft.Control:
        note = ft.Semantics(identifier="finding-note", live_region=True,
                            content=self.finding_note)
        self.finding_note.visible = bool(self.finding_note.value)  # no gap when silent
        if not self.form_open:
            return ft.Column([ft.Semantics(identifier="new-finding", content=ft.FilledButton(
                "New finding", icon=ft.Icons.ADD, on_click=self._show_form(True),
                height=v.TAP)), note], spacing=8)

        def keep(key: str) -> Callable[..., Any]:
            def on_change(e: Any) -> None:
                self.draft[key] = e.control.value or ""
                if self.draft_errors.pop(key, None) is not None:  # being corrected
                    e.control.error = None
                    e.control.update()
            return on_change

        text = ft.TextField(label="What was found (required)", value=self.draft["text"],
                            on_change=keep("text"), multiline=True, min_lines=2, max_lines=5,
                            text_size=17, color=v.INK, border_color=v.LINE,
                            error=self.draft_errors.get("text"), error_max_lines=4,
                            error_style=ft.TextStyle(size=14, color=v.TONES["over"][0]))
        category = ft.TextField(label="Category", value=self.draft["category"],
                                on_change=keep("category"), on_submit=self._add_finding,
                                helper="e.g. corrosion, bow, bracing, damage",
                                text_size=17, color=v.INK, border_color=v.LINE,
                                error=self.draft_errors.get("category"), error_max_lines=4,
                                error_style=ft.TextStyle(size=14, color=v.TONES["over"][0]),
                                helper_style=ft.TextStyle(size=13, color=v.MUTED))
        sev_error = self.draft_errors.get("severity")
        controls: list[ft.Control] = [
            ft.Semantics(identifier="finding-text", content=text),
            ft.Semantics(identifier="finding-category", content=category),
            v.text_line("Severity", size=14, color=v.MUTED),
            nv.severity_choice(self.draft["severity"], self._choose_severity)]
        if sev_error:
            controls.append(ft.Semantics(identifier="severity-error", content=v.text_line(
                sev_error, size=14, color=v.TONES["over"][0])))
        controls.append(ft.Row([
            ft.Semantics(identifier="add-finding", content=ft.FilledButton(
                "Add finding", icon=ft.Icons.SAVE, on_click=self._add_finding, height=v.TAP)),
            # hiding the form keeps what is typed: it comes back when the form is opened
            ft.Semantics(identifier="hide-finding-form", content=ft.TextButton(
                "Hide form", on_click=self._show_form(False), height=v.TAP))],
            wrap=True, spacing=8))
        return ft.Column([v._card(controls, title="New finding"), note], spacing=8)

    def _show_form(self, shown: bool) -> Callable[..., Any]:
        def show(_e: Any = None) -> None:
            self.form_open = shown
            self._show_tab()
            self.page.update()
        return show

    def _choose_severity(self, s: str) -> Callable[..., Any]:
        def choose(_e: Any = None) -> None:
            self.draft["severity"] = s
            self.draft_errors.pop("severity", None)
            self._show_tab()
            self.page.update()
        return choose

    async def _add_finding(self, _e: Any = None) -> None:
        d = self.detail
        if d is None:
            return
        async with self.lock:
            draft = dict(self.draft)
            res = await asyncio.to_thread(n.add_finding, self.store, d.id, draft["text"],
                                          draft["category"], draft["severity"])
            if self.detail is None or self.detail.id != d.id:
                return
            self.findings = res.findings
            if res.saved:
                self.draft = {"text": "", "category": "", "severity": ""}
                self.draft_errors = {}
                self.form_open = False  # the new finding shows first in the list below
                self.finding_note.value = f"Saved finding: {draft['text'].strip()}"
            else:
                self.draft_errors = dict(res.errors) or {res.error_field or "text": res.error}
                self.finding_note.value = "Finding not saved: " + "; ".join(
                    self.draft_errors.values())
            self._show_tab()
            self.page.update()

    def _toggle_finding(self, f: n.FindingLine) -> Callable[..., Any]:
        async def toggle(_e: Any = None) -> None:
            d = self.detail
            if d is None:
                return
            new = "open" if f.status == "closed" else "closed"
            async with self.lock:
                res = await asyncio.to_thread(n.set_finding_status, self.store, d.id, f.id, new)
                if self.detail is None or self.detail.id != d.id:
                    return
                self.findings = res.findings
                self.finding_note.value = (f"Finding {'reopened' if new == 'open' else 'closed'}: "
                                           f"{f.text}") if res.saved else \
                    f"Not changed: {res.error}"
                self._show_tab()
                self.page.update()
        return toggle

    def _open_photo(self, p: n.PhotoThumb) -> Callable[..., Any]:
        async def show(_e: Any = None) -> None:
            try:
                data = await asyncio.to_thread(n.photo_bytes, self.store, p.id)
            except InputError as e:  # said in the dialog: the tab shown may have no note line
                self.page.show_dialog(ft.AlertDialog(
                    title=v.text_line("Photo not shown", size=16, bold=True),
                    content=v.text_line(str(e)), actions=[ft.FilledButton(
                        "Close", on_click=self._close_dialog, height=v.TAP)]))
                return
            self.page.show_dialog(nv.photo_dialog(p, data, self._close_dialog))
        return show

    def _close_dialog(self, _e: Any = None) -> None:
        self.page.pop_dialog()

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
                self.retrofits = None  # checked against the old record: check them again
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
                self.retrofits = None
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
