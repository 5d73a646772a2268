"""The Restraints tab: a live side view of both axes, the braces (add at mid-height in two
taps, change, remove), how each end is held, and the twist restraint points.

API: ``RestraintsTab(app)`` with ``name = "restraints"``; see ``fieldcol.ui._tab``. Every save
goes through ``app.saver`` with Undo, and writes a dated restraint change (who: ``app.person``)
into the column's history in the same transaction. The sketch follows the brace being typed.
"""

from __future__ import annotations

import asyncio
from typing import Any, Callable

import flet as ft

from fieldcol.errors import InputError
from fieldcol.ui import _entry_controls as ec
from fieldcol.ui import restraints_model as rm
from fieldcol.ui import views as v
from fieldcol.ui._drawing import axis_canvas
from fieldcol.ui._tab import Tab

_FORM_LABELS = {"at": ("Height above the bottom", "e.g. 12 ft, 12'-6\" or 3.8 m"),
                "stiffness": ("Stiffness (blank: taken as rigid)", "e.g. 20 kip/in or 3.5 kN/mm"),
                "strength": ("Strength (blank: taken as enough)", "e.g. 5 kip or 22 kN"),
                "area": ("Cable or rod area", "e.g. 0.6 in^2 or 380 mm^2"),
                "length": ("Cable or rod length", "e.g. 18 ft or 5.5 m"),
                "angle": ("Cable or rod angle",
                          "to the way the column moves, e.g. 40 deg (0 = in line)"),
                "added": ("Added (date or note)", "e.g. 2026-12-03 or 2019 retrofit"),
                "seen_by": ("Seen by", "who saw it"),
                "note": ("Note", "e.g. angle to the north wall")}


def _checked(label: str) -> Callable[[rm.Saved], str]:
    """The save bar's words after a restraint change: the change and the new check (a brace
    or an end changes the result, and the engineer is looking at the sketch, not the number)."""
    return lambda saved: ec.checked_words(label, saved.status)


class RestraintsTab(Tab):
    """Ends, braces, cables and twist restraints of the column shown, with its side view.

    Example: ``RestraintsTab(app).controls()``.
    """
    name, label, icon = "restraints", "Restraints", ft.Icons.ALIGN_VERTICAL_CENTER

    def __init__(self, app) -> None:  # noqa: ANN001 (FieldApp, see _tab)
        super().__init__(app)
        self.view: rm.Restraints | None = None
        self.record: dict[str, Any] | None = None
        self.system = "us"
        self.sketch: rm.Sketch | None = None
        self.draft: dict[str, Any] | None = None      # the brace form, when open
        self.refs: tuple[tuple[str, int], ...] = ()   # the brace being changed
        self.inputs: dict[str, ft.TextField] = {}
        self.twist_field = ft.TextField(label="Height of a twist restraint", text_size=18,
                                        helper="e.g. 12 ft or 3.6 m", border_color=v.LINE,
                                        error_max_lines=3, helper_max_lines=2,
                                        color=v.INK, on_submit=self._add_twist,
                                        on_change=self._clear_error)
        self.spring: dict[tuple[str, str], ft.TextField] = {}
        self._pending: asyncio.Task | None = None

    # -- loading ----------------------------------------------------------------------------
    async def load(self) -> None:
        """The record, its restraints and its sketch (worker thread).

        Example: ``await tab.load()``.
        """
        d = self.app.detail
        if d is None:
            return
        cid = d.id

        def fetch(store):  # noqa: ANN001
            rec = store.current_record(cid)
            system = store.get_site(store.get_column(cid).site_id).unit_system
            return rec, system, rm.restraints_view(rec, system), \
                rm.sketch_with(rec, self.draft, self.refs, system)

        self.record, self.system, self.view, self.sketch = await asyncio.to_thread(
            fetch, self.app.store)

    async def _resketch(self) -> None:
        """Draw the sketch again with what is typed (after a short pause in typing)."""
        await asyncio.sleep(0.25)
        if self.record is None:
            return
        rec, draft, refs, system = self.record, dict(self.draft or {}), self.refs, self.system
        self.sketch = await asyncio.to_thread(rm.sketch_with, rec, draft if self.draft else None,
                                              refs, system)
        err = self.sketch.error_field
        if self.draft is not None:
            for name, tf in self.inputs.items():
                want = self.sketch.error if err == name else None
                if tf.error != want:
                    tf.error = want
        self.redraw()

    def _follow(self) -> None:
        if self._pending is not None and not self._pending.done():
            self._pending.cancel()
        self._pending = asyncio.get_running_loop().create_task(self._resketch())

    # -- the body ---------------------------------------------------------------------------
    def controls(self) -> list[ft.Control]:
        """Sketch, braces (with the form), ends, twist points, caution.

        Example: ``tab.controls()``.
        """
        if self.view is None or self.sketch is None:
            return [v.text_line("Loading restraints...", color=v.MUTED)]
        return [self._sketch_card(), self._braces_card(), self._ends_card(), self._twist_card(),
                v.caution_box()]

    def _sketch_card(self) -> ft.Control:
        s = self.sketch
        assert s is not None
        head = "Side view" + (" (with the brace being typed, not saved yet)"
                              if self.draft is not None else "")
        body: list[ft.Control] = []
        if s.axes:
            body.append(ft.Row([axis_canvas(a) for a in s.axes], spacing=6,
                               alignment=ft.MainAxisAlignment.CENTER, wrap=True))
            body.append(ft.Semantics(identifier="restraint-governs", content=ft.Row(
                [ft.Icon(ft.Icons.SWAP_VERT, color=v.INK),
                 v.text_line(s.governing[:1].upper() + s.governing[1:], bold=True,
                             )], wrap=True)))
            body.append(v.text_line("Dashed line: the first buckled shape. Filled brace: "
                                    "counted; hollow: left out (see the Check tab).",
                                    color=v.MUTED))
        if s.error and self.draft is None:
            body.append(v.text_line(s.error, color=v.TONES["over"][0]))
        return ft.Semantics(identifier="restraint-sketch", content=v._card(body, title=head))

    # -- braces -----------------------------------------------------------------------------
    def _braces_card(self) -> ft.Control:
        assert self.view is not None
        rows: list[ft.Control] = []
        for i, b in enumerate(self.view.braces):
            words = f"{b.at_text} · {rm.AXIS_WORDS[b.axis]} · {b.summary}"
            sub = " · ".join(x for x in (f"added {b.added}" if b.added else "",
                                         f"seen by {b.seen_by}" if b.seen_by else "", b.note) if x)
            rows.append(ft.Semantics(identifier=f"brace-{i}", content=ft.Container(
                ft.Column([v.text_line(words, bold=True),
                           *([v.text_line(sub, color=v.MUTED)] if sub else []),
                           ft.Row([ft.OutlinedButton("Change", icon=ft.Icons.EDIT,
                                                     height=v.TAP, on_click=self._open(b)),
                                   ft.Semantics(identifier=f"remove-brace-{i}", button=True,
                                                content=ft.OutlinedButton(
                                                    "Remove", icon=ft.Icons.DELETE_OUTLINE,
                                                    height=v.TAP, on_click=self._remove(b)))],
                                  wrap=True)], spacing=4),
                border=ft.Border.all(1, v.LINE), border_radius=8, padding=10)))
        if not rows:
            rows.append(v.text_line("No braces recorded: each axis is held at its ends only.",
                                    color=v.MUTED))
        if self.draft is None:
            rows.append(ft.Semantics(identifier="add-brace", button=True, content=ft.FilledButton(
                "Add a brace (at mid-height)", icon=ft.Icons.ADD, height=56,
                on_click=self._open(None))))
        else:
            rows.append(self._form())
        n = len(self.view.braces)
        return v._card(rows, title=f"Braces ({n})")

    def _open(self, b: rm.BraceView | None) -> Callable[..., Any]:
        async def open_form(_e: Any = None) -> None:
            if b is None:
                self.draft = rm.empty_draft(self.record, who=self.app.person)
                self.refs = ()
            else:
                self.draft = dict(b.draft)
                self.refs = b.refs
            self.inputs = {}
            self.redraw()
            self._follow()
        return open_form

    def _remove(self, b: rm.BraceView) -> Callable[..., Any]:
        async def remove(_e: Any = None) -> None:
            cid, who, refs = self.app.detail.id, self.app.person, b.refs
            holder: dict[str, rm.Saved] = {}

            def do(store):  # noqa: ANN001
                holder["s"] = rm.remove_brace(store, cid, refs, who=who)
                return holder["s"]

            label = f"removal of the brace at {b.at_text}"
            await self.app.saver.save(label, do, lambda store: rm.restore(store, holder["s"]),
                                      done=_checked(label))
        return remove

    def _input(self, name: str) -> ft.TextField:
        tf = self.inputs.get(name)
        if tf is None:
            label, helper = _FORM_LABELS[name]
            tf = ft.TextField(label=label, helper=helper, value=str(self.draft.get(name) or ""),
                              text_size=18, color=v.INK, border_color=v.LINE, data=name,
                              on_change=self._typed, on_submit=self._save_brace,
                              error_max_lines=3, helper_max_lines=2,
                              helper_style=ft.TextStyle(size=16, color=v.MUTED),
                              error_style=ft.TextStyle(size=16, color=v.TONES["over"][0]))
            self.inputs[name] = tf
        return ft.Semantics(identifier=f"brace-{name}", content=tf)

    async def _typed(self, e: Any) -> None:
        if self.draft is None:
            return
        self.draft[e.control.data] = e.control.value or ""
        if e.control.error:
            e.control.error = None
            e.control.update()
        self._follow()

    def _choice_row(self, key: str, options: tuple[str, ...], words: dict[str, str]) -> ft.Control:
        assert self.draft is not None
        cur = self.draft.get(key)

        def pick(o: str) -> Callable[..., Any]:
            async def on(_e: Any = None) -> None:
                self.draft[key] = o
                self.redraw()
                self._follow()
            return on

        buttons = []
        for o in options:
            chosen = cur == o
            label = words.get(o, o)
            # chosen: filled and ticked (not by colour alone)
            btn = (ft.FilledButton(label, icon=ft.Icons.CHECK, height=v.TAP, on_click=pick(o))
                   if chosen else ft.OutlinedButton(label, height=v.TAP, on_click=pick(o)))
            buttons.append(ft.Semantics(identifier=f"brace-{key}-{o.replace(' ', '-')}",
                                        button=True, selected=chosen, content=btn))
        return ft.Row(buttons, wrap=True, spacing=6, run_spacing=6)

    def _form(self) -> ft.Control:
        d = self.draft
        assert d is not None
        kind = d.get("kind") or "strut"
        fields: list[ft.Control] = [
            v.text_line("Change the brace" if self.refs else "New brace", size=18, bold=True),
            self._input("at"),
            v.text_line("Holds the column about", color=v.MUTED),
            self._choice_row("axis", ("weak", "strong", "both"),
                             {"weak": "Weak axis", "strong": "Strong axis", "both": "Both"}),
            v.text_line("What it is", color=v.MUTED),
            self._choice_row("kind", rm.BRACE_KINDS, {}),
        ]
        if kind in ("cable", "rod"):
            fields += [self._input("area"), self._input("length"), self._input("angle")]
        else:
            fields.append(self._input("stiffness"))
        fields += [self._input("strength"), self._input("added"), self._input("seen_by"),
                   self._input("note"),
                   ft.Semantics(identifier="brace-twist", content=ft.Checkbox(
                       label="Also holds it against twisting",
                       value=bool(d.get("twist")), on_change=self._twist_toggled,
                       label_style=ft.TextStyle(size=16, color=v.INK))),
                   ft.Row([ft.Semantics(identifier="save-brace", button=True,
                                        content=ft.FilledButton(
                                            "Save brace", icon=ft.Icons.SAVE, height=56,
                                            on_click=self._save_brace)),
                           ft.Semantics(identifier="cancel-brace", button=True,
                                        content=ft.OutlinedButton("Cancel", height=56,
                                                                  on_click=self._cancel))],
                          wrap=True)]
        return ft.Container(ft.Column(fields, spacing=10), border=ft.Border.all(2, v.ACCENT),
                            border_radius=8, padding=10)

    async def _twist_toggled(self, e: Any) -> None:
        if self.draft is not None:
            self.draft["twist"] = bool(e.control.value)
            self._follow()

    async def _cancel(self, _e: Any = None) -> None:
        self.draft, self.refs, self.inputs = None, (), {}
        self._follow()

    async def _save_brace(self, _e: Any = None) -> None:
        if self.draft is None or self.app.detail is None:
            return
        draft, refs, cid, who = dict(self.draft), self.refs, self.app.detail.id, self.app.person
        holder: dict[str, Any] = {}

        def do(store):  # noqa: ANN001
            try:
                holder["s"] = rm.save_brace(store, cid, draft, refs=refs, who=who)
            except InputError as e:  # kept to show under the form field it names
                holder["error"] = e
                raise
            return holder["s"]

        at = str(draft.get("at") or "").strip()
        label = ("the brace at " if refs else "a brace at ") + at
        # the form's entries by name: a refusal in the bar names the entry as labelled
        res = await self.app.saver.save(label, do, lambda store: rm.restore(store, holder["s"]),
                                        dict(self.inputs), done=_checked(label))
        if res is None:
            e = holder.get("error")
            if e is not None and e.field in self.inputs:
                self.inputs[e.field].error = rm.plain(e)
                self.redraw()
            return
        self.draft, self.refs, self.inputs = None, (), {}
        await self.load()
        self.redraw()

    # -- ends -------------------------------------------------------------------------------
    def _ends_card(self) -> ft.Control:
        assert self.view is not None
        rows: list[ft.Control] = []
        for axis in rm.AXES:
            rows.append(v.text_line(("Strong axis" if axis == "strong" else "Weak axis"),
                                    bold=True))
            for end in ("top", "bottom"):
                ev = self.view.ends[(axis, end)]
                # the box shows the kind, its meaning goes below it: "pinned: held in place,
                # free to rotate" does not fit the box at 390 px and was cut off mid-word
                dd = ft.Dropdown(
                    label=f"{end.capitalize()} end", value=ev.kind, text_size=17,
                    options=[ft.DropdownOption(
                        key=k, text=k, content=v.text_line(f"{k}: {rm.END_HELP[k]}"))
                        for k in rm.END_KINDS],
                    on_select=self._end_chosen(axis, end), data=(axis, end), expand=True)
                rows.append(ft.Semantics(identifier=f"end-{axis}-{end}", content=dd))
                # a text, not the dropdown's helper: the dropdown gives a screen reader no
                # words of its own, this line does
                means = v.text_line(rm.END_HELP.get(ev.kind, ""), color=v.MUTED)
                rows.append(ft.Semantics(identifier=f"end-{axis}-{end}-means", content=ft.Container(
                    means, padding=ft.Padding.only(left=16))))
                if ev.kind == "spring" or (axis, end) in self.spring:
                    tf = self.spring.get((axis, end))
                    if tf is None:
                        tf = ft.TextField(label="Rotational stiffness", value=ev.rotation,
                                          helper="e.g. 50000 kip*in/rad or 5000 kN*m/rad",
                                          text_size=18, border_color=v.LINE, color=v.INK,
                                          error_max_lines=3, helper_max_lines=2,
                                          on_submit=self._spring_saved(axis, end),
                                          helper_style=ft.TextStyle(size=16, color=v.MUTED))
                        self.spring[(axis, end)] = tf
                    rows.append(ft.Semantics(identifier=f"spring-{axis}-{end}", content=tf))
        return v._card(rows, title="Ends")

    def _end_chosen(self, axis: str, end: str) -> Callable[..., Any]:
        async def chosen(e: Any) -> None:
            kind = e.control.value
            if kind == "spring":  # saved once its stiffness is typed
                self.spring[(axis, end)] = ft.TextField(
                    label="Rotational stiffness (then Enter)", text_size=18,
                    helper="e.g. 50000 kip*in/rad or 5000 kN*m/rad", border_color=v.LINE,
                    color=v.INK, on_submit=self._spring_saved(axis, end),
                    error_max_lines=3, helper_max_lines=2,
                    helper_style=ft.TextStyle(size=16, color=v.MUTED))
                self.redraw()
                return
            await self._set_end(axis, end, kind)
        return chosen

    def _spring_saved(self, axis: str, end: str) -> Callable[..., Any]:
        async def saved(e: Any) -> None:
            await self._set_end(axis, end, "spring", e.control.value or "", field=e.control)
        return saved

    async def _set_end(self, axis: str, end: str, kind: str, rotation: str = "",
                       field: ft.TextField | None = None) -> None:
        cid, who = self.app.detail.id, self.app.person
        holder: dict[str, rm.Saved] = {}

        def do(store):  # noqa: ANN001
            holder["s"] = rm.set_end(store, cid, axis, end, kind, rotation=rotation, who=who)
            return holder["s"]

        label = f"{end} end, {axis} axis: {kind}"
        res = await self.app.saver.save(label, do, lambda store: rm.restore(store, holder["s"]),
                                        field, done=_checked(label))
        if res is not None:
            self.spring.pop((axis, end), None)
            await self.load()
            self.redraw()

    # -- twist ------------------------------------------------------------------------------
    def _twist_card(self) -> ft.Control:
        assert self.view is not None
        rows: list[ft.Control] = []
        for i, (idx, text) in enumerate(self.view.twist):
            rows.append(ft.Row([v.text_line(f"Held against twisting at {text}"),
                                ft.Semantics(identifier=f"remove-twist-{i}", button=True,
                                             content=ft.OutlinedButton(
                                                 "Remove", height=v.TAP,
                                                 on_click=self._remove_twist(idx, text)))],
                               wrap=True))
        if not rows:
            rows.append(v.text_line("Held against twisting at the ends only.", color=v.MUTED))
        rows += [ft.Semantics(identifier="twist-at", content=self.twist_field),
                 ft.Semantics(identifier="add-twist", button=True, content=ft.OutlinedButton(
                     "Add twist restraint", icon=ft.Icons.ADD, height=v.TAP,
                     on_click=self._add_twist))]
        return v._card(rows, title="Twist restraints")

    async def _clear_error(self, e: Any) -> None:
        if e.control.error:
            e.control.error = None
            e.control.update()

    async def _add_twist(self, _e: Any = None) -> None:
        cid, who, at = self.app.detail.id, self.app.person, self.twist_field.value or ""
        holder: dict[str, rm.Saved] = {}

        def do(store):  # noqa: ANN001
            holder["s"] = rm.add_twist(store, cid, at, who=who)
            return holder["s"]

        label = f"twist restraint at {at.strip()}"
        res = await self.app.saver.save(label, do, lambda store: rm.restore(store, holder["s"]),
                                        self.twist_field, done=_checked(label))
        if res is not None:
            self.twist_field.value = ""
            await self.load()
            self.redraw()

    def _remove_twist(self, idx: int, text: str) -> Callable[..., Any]:
        async def remove(_e: Any = None) -> None:
            cid, who = self.app.detail.id, self.app.person
            holder: dict[str, rm.Saved] = {}

            def do(store):  # noqa: ANN001
                holder["s"] = rm.remove_twist(store, cid, idx, who=who)
                return holder["s"]

            label = f"removal of the twist restraint at {text}"
            if await self.app.saver.save(label, do, lambda store: rm.restore(store, holder["s"]),
                                         done=_checked(label)):
                await self.load()
                self.redraw()
        return remove
