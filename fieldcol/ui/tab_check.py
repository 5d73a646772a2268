"""The Check tab of the column screen: right under the status, the capacity about each axis and
in torsion, what governs and why, the utilization and the warnings; then the column-curve chart,
the caution, the full trace one tap away, the edit card (length, section, material, axial
demand, and LRFD or ASD for an AISC column), the loads card (beam reactions, end moments,
the story: ``_loads_card.py``) and the record in words.

API: ``CheckTab(app)`` with ``name = "check"``; see ``fieldcol.ui._tab``. Its entries save
through ``app.saver`` (Enter or leaving the entry) with Undo; a refused entry keeps its text
with the error under it in plain words. Entries typed but not saved survive a redraw (another
save, a resize): the ``TextField`` objects live as long as the tab.
"""

from __future__ import annotations

import asyncio
from typing import Any

import flet as ft

from fieldcol.ui import _check_views as cv
from fieldcol.ui import _entry_controls as ec
from fieldcol.ui import check_model as cm
from fieldcol.ui import loads_model as lm
from fieldcol.ui import model as m
from fieldcol.ui import views as v
from fieldcol.ui._loads_card import LoadsCard
from fieldcol.ui._tab import Tab


class CheckTab(Tab):
    """The check, the caution and the edits of the column shown.

    Example: ``CheckTab(app).controls()``.
    """
    name, label, icon = "check", "Check", ft.Icons.FACT_CHECK_OUTLINED

    def __init__(self, app) -> None:  # noqa: ANN001 (FieldApp, see _tab)
        super().__init__(app)
        self.fields: dict[str, ft.TextField] = {}
        self.saved: dict[str, str] = {}   # the value each entry showed as saved
        self.failed: dict[str, str] = {}  # the text last refused per entry
        self.summary: cm.CheckSummary | None = None
        self.edit: ft.Control | None = None  # the edit card, made once (it holds the entries)
        self.trace: tuple[cm.CheckSummary, ft.Control] | None = None  # the trace of a summary
        self.basis_box = ft.Container()  # LRFD / ASD (an AISC column), in the edit card
        self._basis_shown: str | None = None
        self.loads = LoadsCard(self)  # made once: it holds entries

    def fetch(self, store: Any, column_id: str) -> tuple[cm.CheckSummary | None, lm.LoadsView]:
        """(worker thread) The latest check as the tab shows it, and the loads recorded.

        Example: ``tab.took(tab.fetch(store, cid))``.
        """
        return cm.latest_summary(store, column_id), lm.loads_view(store, column_id)

    def took(self, data: tuple[cm.CheckSummary | None, lm.LoadsView | None]) -> None:
        """Keep the summary and the loads read by ``fetch``.

        Example: ``tab.took((summary, loads))``.
        """
        self.summary, loads = data
        self.loads.took(loads)

    def controls(self) -> list[ft.Control]:
        """Summary, caution, edit card, then modes, warnings, trace and the record.

        Example: ``tab.controls()``.
        """
        d = self.app.detail
        assert d is not None
        for f in d.fields:
            tf = self.fields.get(f.name)
            if tf is None:
                tf = self.fields[f.name] = v.edit_field(f, self._save)
            elif (tf.value or "") == self.saved.get(f.name, "") and not tf.error:
                tf.value = f.value  # untouched: show the value as saved now
            if tf.helper != f.hint:  # e.g. the demand's, once the basis is ASD
                tf.helper = f.hint
            self.saved[f.name] = f.value
        if self.edit is None:
            # made once per column: the entries inside it are kept objects, and a kept card
            # is compared field by field (a card made anew, matched by its key, would not
            # look inside the kept entries it holds)
            entries = [ft.Semantics(identifier=f"field-{f.name}", content=self.fields[f.name])
                       for f in d.fields]
            recheck = ft.Semantics(identifier="check-again", content=ft.FilledButton(
                "Check again", icon=ft.Icons.REFRESH, on_click=self._recheck, height=v.TAP))
            sheet = ft.Semantics(identifier="column-sheet", button=True, content=ft.OutlinedButton(
                "Calculation sheet (PDF)", icon=ft.Icons.PICTURE_AS_PDF, height=v.TAP,
                on_click=self._sheet))
            self.edit = v._card([v.text_line("Saved when you press Enter or leave the entry, "
                                             "then checked again; Undo in the bar below.",
                                             color=v.MUTED), *entries, self.basis_box,
                                 ft.Row([recheck, sheet], wrap=True, spacing=8, run_spacing=8)],
                                title="Edit")
        if d.basis != self._basis_shown:  # drawn again only when it changed
            self._basis_shown = d.basis
            self.basis_box.content = None if d.basis is None else ft.Column([
                v.text_line("Basis (AISC 360-22)", size=16, color=v.MUTED),
                ec.choice_row(list(m.BASES.items()), d.basis, self._pick_basis, "basis",
                              said="basis:")], spacing=4)
        s = self.summary
        if s is None or d.check is None:
            body = v.check_body(d)
            self.first = 2
            return _keyed([*body, v.caution_box()], "result", "caution") + \
                [self.edit, self.loads.draw(), *_keyed(v.record_body(d), "column", "record")]
        chart = cv.chart_card(s, width=330)   # fits the phone and the tablet's right pane
        result = cv.result_cards(s)
        self.first = len(result) + 1  # the result and the caution are drawn first on opening
        if self.trace is None or self.trace[0] is not s:  # a new check: the trace folded
            self.trace = (s, cv.trace_tile(s))
        # keyed: a card drawn again after a save is compared with the one before it, so only
        # what changed goes to the client (the screen is not sent whole again)
        return [*_keyed(result, "result", "warnings"), *_keyed([v.caution_box()], "caution"),
                self.edit, self.loads.draw(), *_keyed([chart] if chart else [], "chart"),
                self.trace[1],
                *_keyed(v.record_body(d), "column", "record")]

    async def _sheet(self, _e: Any = None) -> None:
        if self.app.detail is not None:
            await self.app.page.push_route(f"/columns/{self.app.detail.id}/report")

    async def _save(self, e: Any) -> None:
        # every path below sends its own update (the saver draws the re-checked tab): the one
        # Flet adds after a handler would compare the whole screen again for nothing
        ft.context.disable_auto_update()
        tf: ft.TextField = e.control
        name, text = tf.data, (tf.value or "")
        app, d = self.app, self.app.detail
        if d is None:
            return
        saved = next(f.value for f in d.fields if f.name == name)
        if text.strip() == saved.strip():
            if tf.error is not None:  # typed back to the saved value: nothing to report
                tf.error = None
                self.failed.pop(name, None)
                app.page.update()
            return
        if self.failed.get(name) == text:
            return  # the same refused entry (Enter then blur): the error is already shown
        label = m.EDIT_FIELDS[name][0].lower()
        do, undo = m.edit_change(d.id, name, text, person=app.person, visit_id=app.visit_id)
        res = await app.saver.save(
            f"{label} {text.strip()}", do, undo, tf,
            done=lambda r: f"Saved {label} {text.strip()}; {m.check_words(r)}")
        if res is None and tf.error:
            self.failed[name] = text
        else:
            self.failed.pop(name, None)

    def _pick_basis(self, basis: str) -> Any:
        async def pick(_e: Any = None) -> None:
            ft.context.disable_auto_update()  # the saver draws the re-checked tab
            d = self.app.detail
            if d is None or d.basis == basis:
                return
            do, undo = m.edit_change(d.id, "basis", basis, person=self.app.person,
                                     visit_id=self.app.visit_id)
            await self.app.saver.save(
                f"basis {basis.upper()}", do, undo,
                done=lambda r: f"Saved basis {basis.upper()}; {m.check_words(r)}")
        return pick

    async def _recheck(self, _e: Any = None) -> None:
        app, d = self.app, self.app.detail
        if d is None:
            return
        app.saver.say("Checking...", kind="info")
        cid = d.id
        await app.saver.save("check", lambda s: m.recheck(s, cid),
                             done=lambda r: "Checked again: " + (
                                 r.check.status.label if r.check else "not checked"))


def _keyed(controls: list[ft.Control], *keys: str) -> list[ft.Control]:
    """Give each control its key (a name that stays from one drawing to the next)."""
    for c, k in zip(controls, keys):
        c.key = f"check-{k}"
    return controls
