"""The column screen's Condition tab: thickness by gauge, bow about an axis, out-of-plumb.

Built for one thumb: the tab opens on a bow entry with the keyboard up, the axis already set to
the one the column records (else the weak axis) and one tap to change; Enter or "Save reading"
keeps it. Each reading is kept as taken; "Correct" adds a reading pointing at the old one.
Below the form, the bow the column curves already allow for (L/1000 usual, L/1500
conservative; identifiers ``bow-allowance-1000``, ``bow-allowance-1500``), saved on the tap.
Every save goes through ``app.saver`` (undo, "not saved" with retry, typed text kept).
"""

from __future__ import annotations

import asyncio
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.ui import _entry_controls as ec
from fieldcol.ui import band_model as bm
from fieldcol.ui import readings as r
from fieldcol.ui._tab import Tab
from fieldcol.ui.views import MUTED, text_line

if TYPE_CHECKING:
    from fieldcol.ui.app import FieldApp

_KINDS = [("bow", "Bow"), ("plumb", "Plumb"), ("thickness", "Thickness")]


class ConditionTab(Tab):
    """The Condition tab (identifier ``tab-condition``).

    Example: ``ConditionTab(app)``; the app calls ``await tab.load()`` then ``tab.controls()``.
    """

    name, label, icon = "condition", "Condition", ft.Icons.STRAIGHTEN

    def __init__(self, app: "FieldApp") -> None:
        super().__init__(app)
        self.view: r.ConditionView | None = None
        self.kind = "bow"
        self.axis: str | None = None      # None: the column's own axis (view.bow_axis)
        self.element: str | None = None
        self.value = ""                   # what is typed, kept across redraws
        self.gauges: dict[str, str] = {}  # a gauge typed here wins over the column's last
        self.note = ""
        self.correcting: str | None = None
        self.fix = {"value": "", "note": ""}
        self.body = ft.Column(spacing=12)
        self.field: ft.TextField | None = None
        self._field_key: tuple[Any, ...] | None = None
        self.fix_field: ft.TextField | None = None
        # the new-reading card and every entry in it are made once and only changed after:
        # an entry moved into a card made anew is a new box on the device, which drops its
        # focus and any letter typed that the server has not yet heard of
        self.form = ec.card([], "New reading", identifier="reading-form")
        self._form_col: ft.Column = self.form.content.content
        self._form_head = list(self._form_col.controls)
        self._value_box: ft.Semantics | None = None
        self.gauge_field = ec.unit_entry("Gauge", "", None, on_change=self._typed_gauge)
        self.note_field = ec.unit_entry("Note (optional)", "", None, on_change=self._typed_note)
        self._gauge_box = ft.Semantics(identifier="reading-gauge", content=self.gauge_field)
        self._note_box = ft.Semantics(identifier="reading-note", content=self.note_field)
        self._save_button = ec.big_button("Save reading", ft.Icons.SAVE, self._save,
                                          "save-reading")
        self._focus_task: asyncio.Task | None = None
        self._typed_elsewhere = False  # the gauge or note typed since the focus was asked
        self.allowance = "L/1000"          # as recorded (the engine's default when not)

    async def load(self) -> None:
        """Fetch the column's readings (worker thread) and redraw.

        Example: ``await tab.load()``.
        """
        d = self.app.detail
        if d is None:
            return
        view, band = await asyncio.to_thread(
            lambda s: (r.condition_view(s, d.id), bm.band_view(s, d.id)), self.app.store)
        self.view = view
        self.allowance = band.allowance
        if self.element not in [k for k, _ in view.elements]:
            self.element = view.elements[0][0]
        if self.correcting and self.correcting not in [x.id for x in view.readings]:
            self.correcting = None
        self._draw()

    def controls(self) -> list[ft.Control]:
        """The tab's body (synchronous, no I/O).

        Example: ``page.add(*tab.controls())``.
        """
        if self.view is None:
            return [text_line("Loading the readings...", color=MUTED)]
        self._draw()
        return [ec.status_line(self.app.detail), self.body]

    # -- drawing ------------------------------------------------------------------------
    def _draw(self) -> None:
        v = self.view
        assert v is not None
        # room at the end: the last card can scroll clear of the save bar
        self.body.controls = [self._entry(v), self._allowance(), *self._readings(v),
                              ft.Container(height=96)]

    def _allowance(self) -> ft.Control:
        now = self.allowance
        return ec.card([
            text_line("Bow the column curves already allow for:", size=16, color=MUTED),
            ec.choice_row([(k.split("/")[1], w) for k, (w, _) in bm.ALLOWANCE_WORDS.items()],
                          now.split("/")[1], self._pick_allowance, "bow-allowance",
                          said="bow allowance"),
            text_line(bm.ALLOWANCE_WORDS[now][1][:1].upper() + bm.ALLOWANCE_WORDS[now][1][1:]
                      + ".", size=16)], "Bow allowance", identifier="bow-allowance-card")

    def _pick_allowance(self, n: str) -> Callable[..., Any]:
        async def pick(_e: Any = None) -> None:
            d, choice = self.app.detail, f"L/{n}"
            if d is None or choice == self.allowance:
                return
            done: list[r.Change] = []

            def do(store: Any) -> r.Change:
                ch = bm.set_bow_allowance(store, d.id, choice)
                done.append(ch)
                return ch

            def undo(store: Any) -> None:
                if done:
                    r.undo_change(store, done[-1])

            await self.app.saver.save(f"bow allowance {choice}", do, undo=undo,
                                      done=ec.saved_words)
        return pick

    def _entry(self, v: r.ConditionView) -> ft.Control:
        unit = v.unit
        bare = "bare numbers in inches" if unit == "in" else "bare numbers in mm"
        kind = self.kind
        label = {"bow": "Bow at its worst", "plumb": "Out of plumb over the height",
                 "thickness": "Thickness"}[kind]
        hint = bare
        if kind == "bow" and v.bow_limit:
            hint = f"new-column tolerance L/1000 = {v.bow_limit} over {v.length}; {bare}"
        if kind == "plumb" and v.plumb_limit:
            hint = f"erection tolerance H/500 = {v.plumb_limit} over {v.length}; {bare}"
        if kind == "thickness":
            label = dict(v.elements)[self.element or v.elements[0][0]].split(":")[0] + \
                (" thickness remaining" if self.element != "uniform" else " loss per face")
        # the keyboard comes up on the value: the tab opens ready to type a bow. The entry is
        # one control while the kind stays: a new one at each redraw (the load's, a save's)
        # would drop letters typed before the server heard of them
        key = (kind, self.element, unit)
        if self.field is None or self._field_key != key:
            self.field = ec.unit_entry(label, self.value, unit, hint=hint,
                                       on_change=self._typed, on_submit=self._save,
                                       autofocus=self.correcting is None)
            self._field_key = key
            self._value_box = ft.Semantics(identifier="reading-value", content=self.field)
            if self.correcting is None:
                self._focus_soon(self.field)
        else:
            self.field.label, self.field.helper = label, hint or None
            if (self.field.value or "") != self.value:
                self.field.value = self.value  # e.g. emptied after a save
        parts: list[ft.Control] = [
            ec.choice_row(_KINDS, kind, self._pick_kind, "reading-kind", said="reading:")]
        if kind == "thickness":
            parts.append(ec.choice_row(v.elements, self.element or "", self._pick_element,
                                       "element", said="measured:"))
        parts.append(self._value_box)
        if kind == "bow":
            axis = self.axis or v.bow_axis
            parts.append(ec.choice_row([(a, w) for a, (w, _) in r.AXIS_CHOICES.items()], axis,
                                       self._pick_axis, "bow-axis", said="bends about the"))
            parts.append(text_line(r.AXIS_CHOICES[axis][1], size=16, color=MUTED))
        gauge = self.gauges.get(kind, v.gauges.get(kind, ""))
        for tf, text in ((self.gauge_field, gauge), (self.note_field, self.note)):
            if (tf.value or "") != text:
                tf.value = text
        parts += [self._gauge_box, self._note_box, self._save_button]
        self._form_col.controls = [*self._form_head, *parts]
        return self.form

    def shown(self) -> None:
        """The tab was chosen (again): the bow entry takes the keyboard (a tap on the tab
        takes it away from an entry already there).

        Example: ``tab.shown()``.
        """
        if self.field is not None and self.correcting is None:
            self._focus_soon(self.field)

    def _focus_soon(self, field: ft.TextField) -> None:
        """Give ``field`` the keyboard once it is on the screen (autofocus alone loses it when
        the tap that opened the tab takes the focus back); asked twice, the second time for a
        device slow to draw, unless something else was typed meanwhile."""
        self._typed_elsewhere = False

        async def focus() -> None:
            for wait in (0.15, 0.5):
                await asyncio.sleep(wait)  # drawn first: the update leaves before this call
                if field is not self.field or self.app.tab != self.name \
                        or self._typed_elsewhere:
                    return  # another entry, another tab, or the gauge or note being typed
                try:
                    await asyncio.wait_for(field.focus(), 2)
                except Exception:  # not on the device yet (or gone): the next try, if any
                    continue
        try:
            loop = asyncio.get_running_loop()
        except RuntimeError:
            return
        if self._focus_task is not None and not self._focus_task.done():
            self._focus_task.cancel()
        self._focus_task = loop.create_task(focus())

    def _readings(self, v: r.ConditionView) -> list[ft.Control]:
        out: list[ft.Control] = [text_line("Readings that count now", size=19, bold=True)]
        if not v.readings:
            out.append(text_line("No thickness, bow or plumb reading yet.", color=MUTED))
        for i, x in enumerate(v.readings):
            lines: list[ft.Control] = [
                text_line(f"{x.name}: {x.value}", size=19, bold=True),
                text_line(", ".join(p for p in (x.gauge, x.who, x.when) if p), size=16,
                          color=MUTED)]
            if x.typed != x.value:
                lines.append(text_line(f"typed {x.typed}", size=16, color=MUTED))
            for extra in (x.corrects, x.note):
                if extra:
                    lines.append(text_line(extra, size=16, color=MUTED))
            if self.correcting == x.id:
                lines.append(self._fix_form(i, x))
            else:
                lines.append(ec.small_button("Correct", ft.Icons.EDIT, self._open_fix(x.id), f"correct-{i}",
                                             f"correct the {x.name.lower()} reading {x.value}"))
            out.append(ec.card(lines, identifier=f"condition-reading-{i}"))
        return out

    def _fix_form(self, i: int, x: r.ReadingItem) -> ft.Control:
        assert self.view is not None
        self.fix_field = ec.unit_entry(f"Right value for {x.name.lower()}", self.fix["value"],
                                       self.view.unit, on_change=self._typed_fix("value"),
                                       on_submit=self._save_fix(x), autofocus=True)
        why = ec.unit_entry("Why (e.g. misread the gauge)", self.fix["note"], None,
                            on_change=self._typed_fix("note"))
        return ft.Column([
            text_line("The reading stays in the history, marked corrected.", size=16,
                      color=MUTED),
            ft.Semantics(identifier=f"correct-value-{i}", content=self.fix_field),
            ft.Semantics(identifier=f"correct-note-{i}", content=why),
            ft.Row([ec.big_button("Save correction", ft.Icons.SAVE, self._save_fix(x),
                                  f"save-correction-{i}"),
                    ec.small_button("Cancel", ft.Icons.CLOSE, self._open_fix(None),
                                    f"cancel-correction-{i}")], wrap=True, spacing=8)],
            spacing=10)

    # -- handlers -----------------------------------------------------------------------
    def _typed(self, e: Any) -> None:
        self.value = e.control.value or ""
        if e.control.error:  # being corrected: the message goes
            e.control.error = None
            e.control.update()

    def _typed_gauge(self, e: Any) -> None:
        self.gauges[self.kind] = e.control.value or ""
        self._typed_elsewhere = True

    def _typed_note(self, e: Any) -> None:
        self.note = e.control.value or ""
        self._typed_elsewhere = True

    def _typed_fix(self, key: str) -> Callable[[Any], None]:
        def keep(e: Any) -> None:
            self.fix[key] = e.control.value or ""
            if key == "value" and e.control.error:
                e.control.error = None
                e.control.update()
        return keep

    def _pick_kind(self, kind: str) -> Callable[..., None]:
        def pick(_e: Any = None) -> None:
            self.kind = kind
            self.redraw()
        return pick

    def _pick_axis(self, axis: str) -> Callable[..., None]:
        def pick(_e: Any = None) -> None:
            self.axis = axis
            self.redraw()
        return pick

    def _pick_element(self, element: str) -> Callable[..., None]:
        def pick(_e: Any = None) -> None:
            self.element = element
            self.redraw()
        return pick

    def _open_fix(self, reading_id: str | None) -> Callable[..., None]:
        def show(_e: Any = None) -> None:
            if reading_id != self.correcting:
                self.fix = {"value": "", "note": ""}
            self.correcting = reading_id
            self.redraw()
        return show

    async def _save(self, _e: Any = None) -> None:
        v, d = self.view, self.app.detail
        if v is None or d is None or self.field is None:
            return
        kind, text, note = self.kind, self.value, self.note
        axis = self.axis or v.bow_axis
        element = self.element
        gauge = self.gauges.get(kind, v.gauges.get(kind, ""))
        person, visit = self.app.person, self.app.visit_id
        done: list[r.Change] = []

        def do(store: Any) -> r.Change:
            ch = r.add_reading(store, d.id, kind, text, element=element, axis=axis,
                               gauge=gauge, note=note, person=person, visit_id=visit)
            done.append(ch)
            if self.value == text:  # kept in the store now: the entry starts empty again
                self.value, self.note = "", ""
            return ch

        def undo(store: Any) -> None:
            if done:
                r.undo_change(store, done[-1])

        what = {"bow": "bow", "plumb": "out of plumb", "thickness": "thickness"}[kind]
        await self.app.saver.save(f"{what} {text.strip()}", do, undo=undo,
                                        field=self.field, done=ec.saved_words)

    def _save_fix(self, x: r.ReadingItem) -> Callable[..., Any]:
        async def save(_e: Any = None) -> None:
            text, note = self.fix["value"], self.fix["note"]
            person = self.app.person
            done: list[r.Change] = []

            def do(store: Any) -> r.Change:
                ch = r.correct_reading(store, x.id, text, note=note, person=person)
                done.append(ch)
                self.correcting, self.fix = None, {"value": "", "note": ""}
                return ch

            def undo(store: Any) -> None:
                if done:
                    r.undo_change(store, done[-1])

            await self.app.saver.save(f"correction of {x.name.lower()} to {text.strip()}",
                                      do, undo=undo, field=self.fix_field, done=ec.saved_words)
        return save
