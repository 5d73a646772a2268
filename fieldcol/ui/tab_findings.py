"""The Findings tab of the column screen: the findings with their photos and the add form.

API: ``FindingsTab(app)`` with ``name = "findings"``; ``load()`` reads
``notes.column_findings(store, column_id)``; see ``fieldcol.ui._tab``. What is typed in the
add form stays while the column is shown (hiding the form keeps it too).
"""

from __future__ import annotations

import asyncio
from typing import Any, Callable

import flet as ft

from fieldcol.ui import notes as n
from fieldcol.ui import notes_views as nv
from fieldcol.ui import views as v
from fieldcol.ui._tab import Tab

_EMPTY = {"text": "", "category": "", "severity": ""}


class FindingsTab(Tab):
    """The findings (open first), their photos, close / reopen, and the new-finding form.

    Example: ``await tab.load(); tab.controls()``.
    """
    name, label, icon = "findings", "Findings", ft.Icons.ASSIGNMENT_LATE_OUTLINED

    def __init__(self, app) -> None:  # noqa: ANN001 (FieldApp, see _tab)
        super().__init__(app)
        self.findings: list[n.FindingLine] | None = None
        self.draft = dict(_EMPTY)  # the finding being typed
        self.draft_errors: dict[str, str | None] = {}
        self.form_open = False
        self.note = ft.Text("", size=16, color=v.INK)

    async def load(self) -> None:
        """Read the column's findings (worker thread).

        Example: ``await tab.load()``.
        """
        d = self.app.detail
        if d is not None:
            self.findings = await asyncio.to_thread(n.column_findings, self.app.store, d.id)

    def controls(self) -> list[ft.Control]:
        """The form, then the findings.

        Example: ``tab.controls()``.
        """
        if self.findings is None:
            return [v.text_line("Reading the findings...", color=v.MUTED)]
        return nv.findings_body(self.findings, self._form(), self.app.open_photo, self._toggle)

    # -- the add form ---------------------------------------------------------------------
    def _form(self) -> ft.Control:
        note = ft.Semantics(identifier="finding-note", live_region=True, content=self.note)
        self.note.visible = bool(self.note.value)  # no gap when silent
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

        err = ft.TextStyle(size=16, color=v.TONES["over"][0])
        text = ft.TextField(label="What was found (required)", value=self.draft["text"],
                            on_change=keep("text"), multiline=True, min_lines=2, max_lines=5,
                            text_size=17, color=v.INK, border_color=v.LINE,
                            error=self.draft_errors.get("text"), error_max_lines=4,
                            error_style=err)
        category = ft.TextField(label="Category", value=self.draft["category"],
                                on_change=keep("category"), on_submit=self._add,
                                helper="e.g. corrosion, bow, bracing, damage",
                                text_size=17, color=v.INK, border_color=v.LINE,
                                error=self.draft_errors.get("category"), error_max_lines=4,
                                error_style=err,
                                helper_style=ft.TextStyle(size=16, color=v.MUTED))
        sev_error = self.draft_errors.get("severity")
        controls: list[ft.Control] = [
            ft.Semantics(identifier="finding-text", content=text),
            ft.Semantics(identifier="finding-category", content=category),
            v.text_line("Severity", size=16, color=v.MUTED),
            nv.severity_choice(self.draft["severity"], self._choose_severity)]
        if sev_error:
            controls.append(ft.Semantics(identifier="severity-error", content=v.text_line(
                sev_error, size=16, color=v.TONES["over"][0])))
        controls.append(ft.Row([
            ft.Semantics(identifier="add-finding", content=ft.FilledButton(
                "Add finding", icon=ft.Icons.SAVE, on_click=self._add, height=v.TAP)),
            # hiding the form keeps what is typed: it comes back when the form is opened
            ft.Semantics(identifier="hide-finding-form", content=ft.TextButton(
                "Hide form", on_click=self._show_form(False), height=v.TAP))],
            wrap=True, spacing=8))
        return ft.Column([v._card(controls, title="New finding"), note], spacing=8)

    def _show_form(self, shown: bool) -> Callable[..., Any]:
        def show(_e: Any = None) -> None:
            self.form_open = shown
            self.redraw()
        return show

    def _choose_severity(self, s: str) -> Callable[..., Any]:
        def choose(_e: Any = None) -> None:
            self.draft["severity"] = s
            self.draft_errors.pop("severity", None)
            self.redraw()
        return choose

    async def _add(self, _e: Any = None) -> None:
        app, d = self.app, self.app.detail
        if d is None:
            return
        async with app.lock:
            draft = dict(self.draft)
            res = await asyncio.to_thread(n.add_finding, app.store, d.id, draft["text"],
                                          draft["category"], draft["severity"])
        if app.detail is None or app.detail.id != d.id:
            return
        self.findings = res.findings
        if res.saved:
            self.draft, self.draft_errors = dict(_EMPTY), {}
            self.form_open = False  # the new finding shows first in the list below
            self.note.value = f"Saved finding: {draft['text'].strip()}"
            await app.changed()
        else:
            self.draft_errors = dict(res.errors) or {res.error_field or "text": res.error}
            self.note.value = "Finding not saved: " + "; ".join(
                str(x) for x in self.draft_errors.values())
            self.redraw()

    def _toggle(self, f: n.FindingLine) -> Callable[..., Any]:
        async def toggle(_e: Any = None) -> None:
            app, d = self.app, self.app.detail
            if d is None:
                return
            new = "open" if f.status == "closed" else "closed"
            async with app.lock:
                res = await asyncio.to_thread(n.set_finding_status, app.store, d.id, f.id, new)
            if app.detail is None or app.detail.id != d.id:
                return
            self.findings = res.findings
            self.note.value = (f"Finding {'reopened' if new == 'open' else 'closed'}: "
                               f"{f.text}") if res.saved else f"Not changed: {res.error}"
            await app.changed()
        return toggle
