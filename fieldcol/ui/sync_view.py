"""The sync screen: hub address and token (kept on this device only), a sync button with
progress, what went and came, the conflicts to review, and field bundles (save this device's
changes as one file, open one made elsewhere) for when there is no network.

``SyncScreen(page, store)`` builds its controls and runs the sync in a worker thread;
``sync_lines(store)`` and ``conflict_cards(store)`` are the plain view-models (tested without
Flet). ``serve(db, port)`` shows the screen on its own (the app links it at ``/sync``).
"""

from __future__ import annotations

import asyncio
import json
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import flet as ft

from fieldcol.errors import InputError

if TYPE_CHECKING:
    from fieldcol.store import Store

from fieldcol.ui import palette as pal
from fieldcol.ui import views as v

TAP = 48
INK, MUTED, BG = v.INK, v.MUTED, v.BG  # theme roles: the palette gives light and dark colours
_KIND_WORDS = {"value": "edited on two devices at once",
               "delete": "deleted on one device while edited on another",
               "duplicate": "the same name used twice"}


@dataclass(frozen=True)
class ConflictCard:
    """One conflict in plain words: what, where, the value shown and the other one."""
    id: str
    title: str
    why: str
    shown: str
    other: str


def _plain(value: Any) -> str:
    if value is None:
        return "(empty)"
    if isinstance(value, str) and value[:1] in "{[":
        try:
            obj = json.loads(value)
            if isinstance(obj, dict):
                return ", ".join(f"{k} {v}" for k, v in list(obj.items())[:6])
        except ValueError:
            pass
    text = str(value)
    return text if len(text) <= 120 else text[:117] + "..."


def conflict_cards(store: "Store") -> list[ConflictCard]:
    """The open conflicts, as cards for the screen.

    Example:
        >>> conflict_cards(store)
        []
    """
    out = []
    for c in store.conflicts():
        field = "deleted" if c.field == "deleted_at" else c.field.replace("_", " ")
        shown, other = _plain(c.kept), _plain(c.value)
        if c.kind == "delete":
            shown, other = "kept (edited elsewhere)", "deleted"
        out.append(ConflictCard(c.id, f"{store.row_label(c.tbl, c.row_id)}: {field}",
                                _KIND_WORDS.get(c.kind, c.kind), shown, other))
    return out


def sync_lines(store: "Store") -> list[str]:
    """What this device holds for sync, in plain lines.

    Example:
        >>> sync_lines(store)[0].startswith("changes kept here:")
        True
    """
    s = store.sync_summary()
    return [f"changes kept here: {s['ops']} ({s['ops_here']} made on this device)",
            f"changes waiting for their column or site to arrive: {s['waiting']}"]


class SyncScreen:
    """The sync screen's controls and handlers over one store."""

    def __init__(self, page: ft.Page, store: "Store", *, office: bool = False) -> None:
        self.page, self.store, self.office = page, store, office
        self.url = ft.TextField(label="Hub address", value=store.setting("hub_url") or "",
                                hint_text="https://hub.example.org", text_size=16,
                                keyboard_type=ft.KeyboardType.URL, on_change=self._typed,
                                error_max_lines=3)
        self.token = ft.TextField(label="Device token", value=store.setting("hub_token") or "",
                                  password=True, can_reveal_password=True, text_size=16,
                                  on_change=self._typed, error_max_lines=3)
        self.progress = ft.ProgressBar(value=0, visible=False)
        self.status = ft.Text("", size=16, color=INK)
        self.moved = ft.Column([], spacing=4)
        self.conflicts = ft.Column([], spacing=12)
        self.summary = ft.Column([], spacing=2)
        self.button = ft.Button("Sync now", icon=ft.Icons.SYNC, height=TAP,
                                on_click=self.sync)
        self.bundle_status = ft.Text("", size=16, color=INK)
        self.bundle_buttons = [
            ft.Semantics(identifier="bundle-save", button=True, content=ft.OutlinedButton(
                "Save a bundle", icon=ft.Icons.ARCHIVE_OUTLINED, height=TAP,
                on_click=self.save_bundle)),
            ft.Semantics(identifier="bundle-open", button=True, content=ft.OutlinedButton(
                "Open a bundle", icon=ft.Icons.UNARCHIVE_OUTLINED, height=TAP,
                on_click=self.open_bundle))]
        from fieldcol.ui.intake import intake_for
        intake_for(page)  # the picker is a service: in the page before its first use

    def _typed(self, e: Any = None) -> None:
        self.status.value = ""
        if e is not None and getattr(e.control, "error", None):
            e.control.error = None   # being corrected: its message goes

    async def refresh(self) -> None:
        """Reload the counts and the conflicts from the store."""
        lines, cards = await asyncio.to_thread(lambda: (sync_lines(self.store),
                                                        conflict_cards(self.store)))
        self.summary.controls = [ft.Text(t, size=16, color=MUTED) for t in lines]
        self.conflicts.controls = [self._card(i, c) for i, c in enumerate(cards)] or [
            ft.Row([ft.Icon(ft.Icons.CHECK_CIRCLE_OUTLINE, color=MUTED),
                    ft.Text("No conflicts to review", size=16, color=MUTED)])]
        self.page.update()

    def _card(self, i: int, c: ConflictCard) -> ft.Control:
        return ft.Semantics(identifier=f"conflict-{i}", content=ft.Container(
            bgcolor=v.CARD, padding=12, border_radius=8,
            border=ft.Border.all(1, v.LINE),
            content=ft.Column([
                ft.Row([ft.Icon(ft.Icons.CALL_SPLIT, color=v.CAUTION_EDGE),
                        ft.Text(f"Conflict {i + 1}: {c.title}", size=16, weight=ft.FontWeight.BOLD,
                                color=INK, expand=True)]),
                ft.Text(c.why, size=16, color=MUTED),
                ft.Text(f"Shown now: {c.shown}", size=16, color=INK),
                ft.Text(f"Other value: {c.other}", size=16, color=INK),
                ft.Row([ft.Semantics(identifier=f"conflict-{i}-shown", content=ft.OutlinedButton(
                            "Keep shown", height=TAP, on_click=self._resolve(c.id, "shown"))),
                        ft.Semantics(identifier=f"conflict-{i}-other", content=ft.OutlinedButton(
                            "Use other", height=TAP, on_click=self._resolve(c.id, "other")))],
                       wrap=True),
                ft.Text("Both values stay in the history.", size=16, color=MUTED),
            ], spacing=6)))

    def _resolve(self, conflict_id: str, keep: str) -> Any:
        async def resolve(_e: Any = None) -> None:
            try:
                await asyncio.to_thread(self.store.resolve_conflict, conflict_id, keep)
                self.status.value = "Saved your choice; it goes to the hub at the next sync."
            except InputError as e:
                self.status.value = f"Not saved: {e.reason}"
            await self.refresh()
        return resolve

    async def sync(self, _e: Any = None) -> None:
        """Keep the address and token on this device, then sync in a worker thread."""
        from fieldcol.sync.client import sync_with_hub

        url, token = (self.url.value or "").strip(), (self.token.value or "").strip()
        loop = asyncio.get_running_loop()

        def progress(step: str, done: int, total: int) -> None:
            def show() -> None:
                self.progress.value = min(1.0, done / total) if total else None
                if step == "records":  # a first sync: the hub's records whole, in bytes
                    self.status.value = f"Receiving the office's records: " \
                                        f"{done / 1e6:.1f} of {total / 1e6:.1f} MB"
                else:
                    self.status.value = f"{'Sending' if step == 'send' else 'Receiving'}: " \
                                        f"{done} of {total}"
                self.page.update()
            loop.call_soon_threadsafe(show)

        def work() -> Any:
            self.store.set_setting("hub_url", url or None)
            self.store.set_setting("hub_token", token or None)
            if not url or not token:
                raise InputError("hub" if not url else "token", "", "give the hub address and "
                                 "this device's token", "ask the office for them")
            return sync_with_hub(self.store, url, token, progress=progress)

        self.button.disabled, self.progress.visible, self.progress.value = True, True, None
        self.status.value = "Syncing..."
        self.page.update()
        try:
            report = await asyncio.to_thread(work)
            self.status.value = "Sync finished"
            self.moved.controls = [ft.Text(t, size=16, color=INK)
                                   for t in report.lines(details=False)]
        except InputError as e:
            self.status.value = f"Not synced: {e.reason}" + (f" ({e.hint})" if e.hint else "")
            # the words also go under each entry that is missing: the status line alone
            # named no entry, and it sits below them both
            for entry, what in ((self.url, "The hub address"), (self.token, "The device token")):
                if not (entry.value or "").strip():
                    entry.error = f"{what} is needed: ask the office for it"
        finally:
            self.button.disabled, self.progress.visible = False, False
        await self.refresh()

    def _bundle_busy(self, words: str | None) -> None:
        for b in self.bundle_buttons:
            b.content.disabled = words is not None
        if words is not None:
            self.bundle_status.value = words
        self.page.update()

    async def save_bundle(self, _e: Any = None) -> None:
        """Make a bundle of every change kept here and hand it out (a download in a browser)."""
        from fieldcol.ui.bundles import made_words, make_bundle
        from fieldcol.ui.intake import intake_for

        self._bundle_busy("Making the bundle...")
        try:
            made = await asyncio.to_thread(make_bundle, self.store)
            await intake_for(self.page).save(made.name, made.data)
            self.bundle_status.value = made_words(made)
        except InputError as e:
            self.bundle_status.value = f"Not saved: {e.reason}" + (f" ({e.hint})" if e.hint else "")
        finally:
            self._bundle_busy(None)

    async def open_bundle(self, _e: Any = None) -> None:
        """Pick a bundle, check it whole and merge it; say what came and show any conflicts."""
        from fieldcol.ui.bundles import open_bundle, opened_words
        from fieldcol.ui.intake import intake_for

        name = "the bundle"
        try:
            picked = await intake_for(self.page).pick(many=False, what="bundle")
            if not picked:
                return
            name = picked[0].name
            self._bundle_busy(f"Checking {name}...")
            info = await asyncio.to_thread(open_bundle, self.store, name, picked[0].data)
            self.bundle_status.value = opened_words(info)
        except InputError as e:
            # an operation inside it names its own field; the file is named either way
            where = "" if e.field == "bundle" else f"{e.field}: "
            self.bundle_status.value = (f"Not opened: {name}: {where}{e.reason}"
                                        + (f" ({e.hint})" if e.hint else "")
                                        + ". Nothing was changed.")
        finally:
            self._bundle_busy(None)
        await self.refresh()

    def controls(self) -> list[ft.Control]:
        """The screen's body."""
        head = ft.Text("Office hub", size=18, weight=ft.FontWeight.BOLD, color=INK)
        if self.office:  # the hub itself: there is no hub to reach from here
            hub: list[ft.Control] = [head, ft.Semantics(identifier="office-note", content=ft.Text(
                "This is the office hub: the devices sync to it. What is changed or opened "
                "here reaches each device at its next sync.", size=16, color=MUTED))]
        else:
            hub = [head,
                   ft.Semantics(identifier="field-hub-url", content=self.url),
                   ft.Semantics(identifier="field-hub-token", content=self.token),
                   ft.Semantics(identifier="sync-now", content=self.button),
                   self.progress,
                   ft.Semantics(identifier="sync-status", content=self.status),
                   self.moved]
        whose = "the hub's records" if self.office else "this device's changes"
        return [*hub, self.summary,
                ft.Text("Conflicts to review", size=18, weight=ft.FontWeight.BOLD, color=INK),
                self.conflicts,
                ft.Text("Field bundle (no network)", size=18, weight=ft.FontWeight.BOLD,
                        color=INK),
                ft.Text(f"Carry {whose} and photos as one file, or open a file made on "
                        "another device. Opening one twice changes nothing.", size=16,
                        color=MUTED),
                ft.Row(self.bundle_buttons, wrap=True, spacing=8),
                ft.Semantics(identifier="bundle-status", live_region=True,
                             content=self.bundle_status)]


def serve(db: str, port: int) -> None:
    """Serve the sync screen alone on 127.0.0.1 (web), over the store ``db``.

    Example: ``serve("site.db", 8551)`` (blocks).
    """
    from fieldcol.store import Store

    store = Store(db)

    async def main(page: ft.Page) -> None:
        page.title = "fieldcol · Sync"
        pal.apply(page, store.setting("theme") or "light")
        page.bgcolor = BG
        screen = SyncScreen(page, store)
        page.appbar = ft.AppBar(title=ft.Text("fieldcol · Sync", size=20, color=v.ON_ACCENT),
                                bgcolor=v.ACCENT)
        page.add(ft.ListView(screen.controls(), spacing=12, padding=12, expand=True))
        await screen.refresh()

    from fieldcol.ui.intake import configure_uploads

    ft.run(main, view=ft.AppView.WEB_BROWSER, host="127.0.0.1", port=port, no_cdn=True,
           upload_dir=configure_uploads())  # a bundle picked in a browser arrives as an upload
