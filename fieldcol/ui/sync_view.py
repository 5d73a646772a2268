"""The sync screen: hub address and token (kept on this device only), a sync button with
progress, what went and came, and the conflicts to review.

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

    def __init__(self, page: ft.Page, store: "Store") -> None:
        self.page, self.store = page, store
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

    def controls(self) -> list[ft.Control]:
        """The screen's body."""
        head = ft.Text("Office hub", size=18, weight=ft.FontWeight.BOLD, color=INK)
        return [head,
                ft.Semantics(identifier="field-hub-url", content=self.url),
                ft.Semantics(identifier="field-hub-token", content=self.token),
                ft.Semantics(identifier="sync-now", content=self.button),
                self.progress,
                ft.Semantics(identifier="sync-status", content=self.status),
                self.moved, self.summary,
                ft.Text("Conflicts to review", size=18, weight=ft.FontWeight.BOLD, color=INK),
                self.conflicts]


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

    ft.run(main, view=ft.AppView.WEB_BROWSER, host="127.0.0.1", port=port, no_cdn=True)
