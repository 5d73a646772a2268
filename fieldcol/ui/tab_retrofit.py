"""The Retrofit tab of a column: build an option, compare it side by side with the column as it
stands, keep it (as its definition: it follows later changes to the column), and sweep a
proposed brace up the column on a chart.

Identifiers: ``caution``, ``option-kind-<kind>``, ``part-kind-<kind>``, ``option-<field>``,
``option-axis-<a>``, ``option-end-<e>``, ``option-to-<t>``, ``option-twist``, ``option-add-part``,
``option-part-<i>``, ``option-no-plates``, ``option-compare``, ``option-keep``, ``retrofit-compare``,
``retrofit-note``, ``sweep-axis-<a>``, ``sweep-run``, ``sweep-chart``, ``retrofit-<i>``,
``retrofit-<i>-line``, ``retrofit-<i>-drop``.
"""

from __future__ import annotations

import asyncio
import copy
import json
import weakref
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.ui import views as v
import flet.canvas as cv

from fieldcol.errors import InputError
from fieldcol.ui._tab import Tab
from fieldcol.ui import retrofits as rm
from fieldcol.ui.findings import plain
from fieldcol.ui.tab_findings import choice_row
from fieldcol.ui.views import INK, LINE, MUTED, TAP, TONES, _card, caution_box, status_chip, \
    text_line

if TYPE_CHECKING:
    from fieldcol.ui.app import FieldApp

Handler = Callable[..., Any]
SINGLE = [k for k in rm.KIND_WORDS if k != "combined"]
_STATE: "weakref.WeakKeyDictionary[Any, dict[str, dict]]" = weakref.WeakKeyDictionary()
CHART_INK, CHART_GRID, CHART_EDGE, CHART_BG = v.ACCENT, v.GRID, v.INK, v.CARD


#: what a form starts with: plates are welded unless picked otherwise, and the choice shows it
#: (it showed none chosen while meaning welded)
_START: dict[str, dict[str, str]] = {"plates": {"connection": "welded"}}


def _starting(kind: str, governs: str) -> dict[str, str]:
    """What a form of ``kind`` starts with: ``_START``, and its axis on ``governs`` (the axis
    that governs the column's result; see ``retrofits.governing_axis``)."""
    typed = dict(_START.get(kind, {}))
    if governs and any(name == "axis" for name, _label, _hint in rm.FORM_FIELDS[kind]):
        typed["axis"] = governs
    return typed


def _fresh() -> dict[str, Any]:
    return {"kind": "brace", "part": "brace",
            "typed": {k: dict(_START.get(k, {})) for k in SINGLE}, "parts": [],
            "errors": {}, "compared": None, "sweep": None, "sweep_axis": "", "busy": ""}


def sweep_chart(s: rm.Sweep, width: float, height: float = 280) -> ft.Control:
    """Design strength (across) against the height of the proposed brace (up, like the column).

    The column as it stands is the dashed upright line; the demand, when there is one and it
    falls on the chart, the solid one; the best height is ringed and labelled. The strength axis
    starts near the smallest value (its ticks say where).

    Args:
        s: a ``Sweep``.
        width, height: the chart's size, px.

    Returns:
        A canvas (identifier ``sweep-chart`` with the summary as its label).

    Example: ``sweep_chart(rm.brace_sweep(store, cid, "weak"), 340)``.
    """
    left, right, top, bottom = 52.0, 12.0, 12.0, 40.0
    pw, ph = width - left - right, height - top - bottom
    values = [p.strength for p in s.points if p.strength is not None] + [s.before]
    if s.demand:
        values.append(s.demand)
    # the axis starts near the smallest value: the differences between heights are the point
    top_v = max(values) if values else 1.0
    lo, hi = min(values) * 0.9 if values else 0.0, top_v * 1.04
    if hi - lo < top_v * 0.1:
        lo = max(0.0, hi - top_v * 0.1)

    def xy(strength: float, at: float) -> tuple[float, float]:
        return (left + pw * (strength - lo) / (hi - lo), top + ph * (1 - at / s.length))

    small = ft.TextStyle(size=13, color=INK)
    grid = ft.Paint(color=CHART_GRID, stroke_width=1)
    shapes: list[cv.Shape] = [
        cv.Rect(left, top, pw, ph, paint=ft.Paint(color=CHART_EDGE, stroke_width=1.2,
                                                   style=ft.PaintingStyle.STROKE))]
    for i in range(0, 4):  # strength ticks
        v = lo + (hi - lo) * i / 4
        x = left + pw * i / 4
        shapes += [cv.Line(x, top, x, top + ph, paint=grid),
                   cv.Text(x, top + ph + 4, f"{v / s.factor:.0f}", style=small,
                           alignment=ft.Alignment.TOP_CENTER)]
    for frac in (0.25, 0.5, 0.75, 1.0):  # height ticks
        y = top + ph * (1 - frac)
        shapes += [cv.Line(left, y, left + pw, y, paint=grid),
                   cv.Text(left - 4, y, f"{s.length * frac / s.length_factor:.3g}",
                           style=small, alignment=ft.Alignment.CENTER_RIGHT)]
    shapes += [cv.Text(left + pw / 2, height - 16, f"design strength, {s.unit}",
                       style=small, alignment=ft.Alignment.TOP_CENTER),
               cv.Text(4, top - 2, s.length_unit, style=small)]
    bx, _ = xy(s.before, 0)
    shapes.append(cv.Path([cv.Path.MoveTo(bx, top), cv.Path.LineTo(bx, top + ph)],
                          paint=ft.Paint(color=MUTED, stroke_width=2,
                                         style=ft.PaintingStyle.STROKE,
                                         stroke_dash_pattern=[6, 4])))
    # a line's words go on the side with room, so they stay inside the chart
    shapes.append(cv.Text(bx - 3 if bx > left + pw / 2 else bx + 3, top + 2, "as it stands",
                          style=small, alignment=ft.Alignment.TOP_RIGHT
                          if bx > left + pw / 2 else ft.Alignment.TOP_LEFT))
    if s.demand and lo <= s.demand <= hi:
        dx, _ = xy(s.demand, 0)
        shapes += [cv.Line(dx, top, dx, top + ph, paint=ft.Paint(color=TONES["over"][0],
                                                                 stroke_width=2)),
                   cv.Text(dx - 3 if dx > left + pw / 2 else dx + 3, top + ph - 4, "demand",
                           style=small, alignment=ft.Alignment.BOTTOM_RIGHT
                           if dx > left + pw / 2 else ft.Alignment.BOTTOM_LEFT)]
    pts = [xy(p.strength, p.at) for p in s.points if p.strength is not None]
    if pts:
        path = [cv.Path.MoveTo(*pts[0])] + [cv.Path.LineTo(*p) for p in pts[1:]]
        shapes.append(cv.Path(path, paint=ft.Paint(color=CHART_INK, stroke_width=3,
                                                   style=ft.PaintingStyle.STROKE)))
        shapes += [cv.Circle(x, y, 4, paint=ft.Paint(color=CHART_INK)) for x, y in pts]
    if s.best is not None and s.best.strength is not None:
        x, y = xy(s.best.strength, s.best.at)
        shapes += [cv.Circle(x, y, 9, paint=ft.Paint(color=CHART_EDGE, stroke_width=2.5,
                                                     style=ft.PaintingStyle.STROKE)),
                   cv.Text(x - 10, y - 12, f"best {s.best.text}", style=ft.TextStyle(
                       size=14, color=INK, weight=ft.FontWeight.BOLD, bgcolor=CHART_BG),
                       alignment=ft.Alignment.BOTTOM_RIGHT)]
    return ft.Semantics(identifier="sweep-chart", label=s.words, content=cv.Canvas(
        shapes, width=width, height=height))


class RetrofitTab(Tab):
    """Retrofit options of the shown column (see the module docstring)."""

    name, label, icon = "retrofit", "Retrofit", ft.Icons.CONSTRUCTION

    def __init__(self, app: "FieldApp") -> None:
        super().__init__(app)
        self.options: list[rm.Compared] | None = None
        self.load_error: str | None = None
        self.no_plates: str | None = None  # why cover plates are not offered for this column
        self.root = ft.Column(spacing=12, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
        self.note = ft.Text("", size=16, color=INK)

    @property
    def cid(self) -> str:
        assert self.app.detail is not None
        return self.app.detail.id

    @property
    def st(self) -> dict[str, Any]:
        return _STATE.setdefault(self.app, {}).setdefault(self.cid, _fresh())

    # -- contract --------------------------------------------------------------------------
    async def load(self) -> None:
        """Check every kept option against the column as it stands (off the UI loop)."""
        cid = self.cid
        store = self.app.store

        def read() -> tuple[dict, str | None, str]:
            record = store.current_record(cid)
            return record, rm.plates_refused(record), rm.governing_axis(store, cid)
        record, self.no_plates, governs = await asyncio.to_thread(read)
        key = json.dumps(record, sort_keys=True)
        try:
            self.options = await asyncio.to_thread(rm.saved_options, store, cid)
            self.load_error = None
        except InputError as e:  # the column as it stands cannot be checked
            self.options, self.load_error = [], f"Options not checked: {plain(e)}"
        st = self.st
        if st.get("record") != key:
            # what was on screen was for the column as it was: it is worked out again on request
            st.update(record=key, compared=None, sweep=None)
        # every axis choice starts on the axis that governs (the sweep's too: it showed weak
        # chosen while sweeping the governing axis); one the engineer picked stays
        st["governs"] = governs
        st["sweep_axis"] = st["sweep_axis"] or governs
        for kind, typed in st["typed"].items():
            if not typed.get("axis"):
                typed.update({k: x for k, x in _starting(kind, governs).items() if k == "axis"})
        if self.no_plates:  # a choice the column cannot take is not left picked
            st["kind"] = "brace" if st["kind"] == "plates" else st["kind"]
            st["part"] = "brace" if st["part"] == "plates" else st["part"]
            st["parts"] = [p for p in st["parts"] if p.get("kind") != "plates"]

    def controls(self) -> list[ft.Control]:
        """The tab's body (synchronous)."""
        self._build()
        return [self.root]

    # -- building -------------------------------------------------------------------------
    def _redraw(self) -> None:
        self._build()
        try:
            self.root.update()  # only this tab's controls are compared again: quick
        except RuntimeError:
            pass

    def _build(self) -> None:
        st = self.st
        out: list[ft.Control] = [caution_box(), self._builder()]
        out.append(ft.Semantics(identifier="retrofit-note", live_region=True, content=self.note,
                                visible=bool(self.note.value)))
        if st["busy"]:
            out.append(ft.Row([ft.ProgressRing(width=22, height=22), text_line(st["busy"])]))
        if st["compared"] is not None:
            out.append(self._compared(st["compared"]))
        out.append(self._sweep())
        out.append(text_line("Kept options (each worked out on the column as it stands now)",
                             size=17, bold=True))
        if self.load_error:
            out.append(ft.Semantics(identifier="retrofit-error", content=text_line(
                self.load_error, color=TONES["over"][0])))
        elif not self.options:
            out.append(text_line("No options kept for this column yet.", color=MUTED))
        for i, o in enumerate(self.options or []):
            out.append(self._kept(i, o))
        self.root.controls = out

    def _fields(self, kind: str, prefix: str = "option") -> list[ft.Control]:
        st = self.st
        typed = st["typed"][kind]
        errors: dict[str, str] = st["errors"]
        out: list[ft.Control] = []
        for name, label, hint in rm.FORM_FIELDS[kind]:
            if name in rm.CHOICES:
                words = {"both": "both axes"}
                out.append(text_line(label, size=16, color=MUTED))
                out.append(choice_row(f"{prefix}-{name}",
                                      [(c, words.get(c, c)) for c in rm.CHOICES[name]],
                                      typed.get(name, ""), self._pick(kind, name), label))
                if errors.get(name):
                    out.append(text_line(errors[name], size=16, color=TONES["over"][0]))
                continue

            def on_change(e: Any, name: str = name) -> None:
                typed[name] = e.control.value or ""
                if errors.pop(name, None) is not None:
                    e.control.error = None
                    e.control.update()

            out.append(ft.Semantics(identifier=f"{prefix}-{name}", content=ft.TextField(
                label=label, helper=hint, value=typed.get(name, ""), on_change=on_change,
                text_size=17, color=INK, border_color=LINE, error=errors.get(name),
                error_max_lines=3, error_style=ft.TextStyle(size=16, color=TONES["over"][0]),
                helper_max_lines=2, helper_style=ft.TextStyle(size=16, color=MUTED))))
        if kind in ("brace", "cable"):
            def twist(e: Any) -> None:
                typed["twist"] = bool(e.control.value)
            out.append(ft.Semantics(identifier=f"{prefix}-twist", content=ft.Checkbox(
                label="Also holds it against twisting", value=bool(typed.get("twist")),
                on_change=twist, label_style=ft.TextStyle(size=16, color=INK))))
        return out

    def _builder(self) -> ft.Control:
        st = self.st
        kinds = [(k, w) for k, w in rm.KIND_WORDS.items() if k != "plates" or not self.no_plates]
        body: list[ft.Control] = [choice_row("option-kind", kinds, st["kind"], self._kind,
                                             "kind of option")]
        if self.no_plates:
            body.append(ft.Semantics(identifier="option-no-plates", content=text_line(
                f"Cover plates are not offered here: {self.no_plates}.", size=16,
                color=MUTED)))
        if st["kind"] == "combined":
            for i, part in enumerate(st["parts"]):
                body.append(ft.Semantics(identifier=f"option-part-{i}", content=ft.Row([
                    ft.Icon(ft.Icons.CHECK, size=18, color=INK),
                    ft.Text(f"{i + 1}. {rm_label(part)}", size=16, color=INK, expand=True),
                    ft.IconButton(ft.Icons.DELETE_OUTLINE, on_click=self._drop_part(i),
                                  tooltip="Take this part out", icon_size=24,
                                  width=TAP, height=TAP)])))
            if not st["parts"]:
                body.append(text_line("Add the parts one at a time; they are applied in order.",
                                      size=16, color=MUTED))
            body.append(text_line("Next part", size=16, bold=True))
            body.append(choice_row("part-kind", [(k, w) for k, w in kinds if k in SINGLE],
                                   st["part"], self._part_kind, "kind of part"))
            body += self._fields(st["part"])
            body.append(ft.Semantics(identifier="option-add-part", button=True,
                                     content=ft.OutlinedButton(
                                         "Add this part", icon=ft.Icons.PLAYLIST_ADD,
                                         on_click=self._add_part, height=TAP)))
        else:
            body += self._fields(st["kind"])
        body.append(ft.Row([
            ft.Semantics(identifier="option-compare", button=True, content=ft.FilledButton(
                "Compare", icon=ft.Icons.COMPARE_ARROWS, on_click=self._compare, height=TAP)),
            ft.Semantics(identifier="option-keep", button=True, content=ft.OutlinedButton(
                "Keep this option", icon=ft.Icons.BOOKMARK_ADD, on_click=self._keep,
                height=TAP))], wrap=True, spacing=8))
        return _card(body, title="Build an option")

    def _compared(self, c: rm.Compared) -> ft.Control:
        def cell(text: str, *, bold: bool = False) -> ft.Control:
            return ft.Container(ft.Text(text, size=16, color=INK,
                                        weight=ft.FontWeight.BOLD if bold else None),
                                expand=1, padding=ft.Padding.symmetric(vertical=4))

        def row(label: str, a: ft.Control | str, b: ft.Control | str) -> ft.Control:
            return ft.Column([text_line(label, size=16, color=MUTED), ft.Row([
                ft.Container(a, expand=1) if isinstance(a, ft.Control) else cell(a),
                ft.Container(b, expand=1) if isinstance(b, ft.Control) else cell(b, bold=True)],
                vertical_alignment=ft.CrossAxisAlignment.START)], spacing=0)

        body: list[ft.Control] = [
            text_line(c.description, bold=True),
            ft.Row([cell("As it stands", bold=True), cell("With the option", bold=True)]),
            row("Design strength", c.before_strength, f"{c.after_strength} ({c.gain})"),
            row("Utilization for demand " + c.demand, status_chip(c.before),
                status_chip(c.after)),
            row("What governs", c.governing_before, c.governing_after)]
        for w in c.warnings:
            body.append(ft.Row([ft.Icon(ft.Icons.REPORT_PROBLEM_OUTLINED, color=INK, size=20),
                                ft.Text(w, size=16, color=INK, expand=True)],
                               vertical_alignment=ft.CrossAxisAlignment.START))
        return ft.Semantics(identifier="retrofit-compare", label=c.line,
                            content=_card(body, title="Side by side"))

    def _sweep(self) -> ft.Control:
        st = self.st
        axis = st["sweep_axis"] or "weak"  # set by load(): the governing axis
        body: list[ft.Control] = [
            text_line("Where would one new rigid brace help most? The column's design strength "
                      "with the brace at heights up the column.", size=16, color=MUTED),
            choice_row("sweep-axis", [("weak", "weak axis"), ("strong", "strong axis"),
                                      ("both", "both axes")], axis, self._sweep_axis,
                       "brace axis"),
            ft.Semantics(identifier="sweep-run", button=True, content=ft.OutlinedButton(
                "Show the sweep", icon=ft.Icons.SHOW_CHART, on_click=self._run_sweep,
                height=TAP))]
        s = st["sweep"]
        if s is not None:
            width = max(280.0, min(float(self.app.page.width or 390) - 60, 640.0))
            body += [sweep_chart(s, width), text_line(s.words, size=16)]
        return _card(body, title="Brace height sweep")

    def _kept(self, i: int, o: rm.Compared) -> ft.Control:
        body: list[ft.Control] = [
            text_line(o.description, bold=True),
            text_line(f"{o.status} · kept {o.saved}", size=16, color=MUTED),
            text_line("follows the column as it stands" if o.follows else
                      "a snapshot: does not follow later changes to the column", size=16,
                      color=INK if o.follows else TONES["over"][0])]
        if o.error:
            body.append(text_line(o.line, color=TONES["over"][0]))
        else:
            body += [
                ft.Row([status_chip(o.before), ft.Icon(ft.Icons.ARROW_FORWARD, color=INK),
                        status_chip(o.after)], wrap=True, spacing=6),
                ft.Semantics(identifier=f"retrofit-{i}-line", content=ft.Column([
                    text_line(f"Design strength {o.before_strength} -> {o.after_strength} "
                              f"({o.gain})"),
                    text_line(f"Utilization {o.before.label} -> {o.after.label} for demand "
                              f"{o.demand}"),
                    text_line(f"Governs: {o.governing_before} -> {o.governing_after}",
                              size=16, color=MUTED)], spacing=2))]
            for w in o.warnings:
                body.append(ft.Row([ft.Icon(ft.Icons.REPORT_PROBLEM_OUTLINED, color=INK,
                                            size=20), ft.Text(w, size=16, color=INK,
                                                              expand=True)],
                                   vertical_alignment=ft.CrossAxisAlignment.START))
        body.append(ft.Semantics(identifier=f"retrofit-{i}-drop", button=True,
                                 content=ft.OutlinedButton("Drop this option",
                                                           icon=ft.Icons.DELETE_OUTLINE,
                                                           on_click=self._drop(o),
                                                           height=TAP)))
        return ft.Semantics(identifier=f"retrofit-{i}", content=_card(body))

    # -- handlers -------------------------------------------------------------------------
    def _kind(self, kind: str) -> Handler:
        def choose(_e: Any = None) -> None:
            self.st.update(kind=kind, errors={}, compared=None)
            self._redraw()
        return choose

    def _part_kind(self, kind: str) -> Handler:
        def choose(_e: Any = None) -> None:
            self.st.update(part=kind, errors={})
            self._redraw()
        return choose

    def _pick(self, kind: str, name: str) -> Callable[[str], Handler]:
        def pick(value: str) -> Handler:
            def choose(_e: Any = None) -> None:
                self.st["typed"][kind][name] = value
                self.st["errors"].pop(name, None)
                self._redraw()
            return choose
        return pick

    def _sweep_axis(self, axis: str) -> Handler:
        def choose(_e: Any = None) -> None:
            self.st.update(sweep_axis=axis, sweep=None)
            self._redraw()
        return choose

    def _say(self, words: str) -> None:
        self.note.value = words

    def _single(self) -> dict[str, Any] | None:
        """The option of the form, or None with the field's error shown."""
        st = self.st
        kind = st["part"] if st["kind"] == "combined" else st["kind"]
        try:
            return rm.option_of(kind, st["typed"][kind])
        except InputError as e:
            st["errors"] = {e.field: plain(e)}
            self._say(f"Not ready: {plain(e)}")
            return None

    def _option(self) -> dict[str, Any] | None:
        st = self.st
        if st["kind"] != "combined":
            return self._single()
        parts = list(st["parts"])
        if not parts:
            one = self._single()
            if one is None:
                return None
            parts = [one]
        return {"kind": "combined", "options": copy.deepcopy(parts)}

    def _add_part(self, _e: Any = None) -> None:
        st = self.st
        one = self._single()
        if one is not None:
            st["parts"].append(one)
            st["typed"][st["part"]] = _starting(st["part"], st.get("governs", ""))
            st["errors"] = {}
            self._say(f"Part {len(st['parts'])} added: {rm_label(one)}")
        self._redraw()

    def _drop_part(self, i: int) -> Handler:
        def drop(_e: Any = None) -> None:
            parts = self.st["parts"]
            if 0 <= i < len(parts):
                parts.pop(i)
            self._redraw()
        return drop

    def _engine_error(self, e: InputError) -> None:
        st = self.st
        st["errors"] = {rm.form_field(e): plain(e)}
        self._say(f"Not compared: {plain(e)}")

    async def _compare(self, _e: Any = None) -> None:
        st = self.st
        option = self._option()
        if option is None:
            self._redraw()
            return
        st["busy"] = "Working out the option..."
        self._redraw()
        try:
            st["compared"] = await asyncio.to_thread(rm.compare_option, self.app.store,
                                                     self.cid, option)
            st["errors"] = {}
            self._say("")
        except InputError as e:
            st["compared"] = None
            self._engine_error(e)
        finally:
            st["busy"] = ""
        self._redraw()

    async def _keep(self, _e: Any = None) -> None:
        st = self.st
        option = self._option()
        if option is None:
            self._redraw()
            return
        cid = self.cid
        kept: dict[str, str] = {}

        def do(store: Any) -> str:
            kept["id"] = rm.keep_option(store, cid, option)
            return kept["id"]

        def undo(store: Any) -> None:
            rm.drop_option(store, kept["id"])

        try:
            await asyncio.to_thread(rm.compare_option, self.app.store, cid, option)
        except InputError as e:  # refused before saving: the typed values stay
            self._engine_error(e)
            self._redraw()
            return
        if await self.app.saver.save(f"option: {rm_label(option)}", do, undo) is not None:
            st["parts"] = []
            self._say(f"Kept: {rm_label(option)}")
            self._redraw()

    def _drop(self, o: rm.Compared) -> Handler:
        async def drop(_e: Any = None) -> None:
            if o.id is None:
                return
            rid = o.id
            await self.app.saver.save(f"dropped option: {o.description[:40]}",
                                      lambda store: rm.drop_option(store, rid),
                                      lambda store: store.restore_retrofit(rid))
        return drop

    async def _run_sweep(self, _e: Any = None) -> None:
        st = self.st
        cid = self.cid
        axis = st["sweep_axis"] or await asyncio.to_thread(rm.governing_axis, self.app.store,
                                                           cid)
        st.update(sweep_axis=axis, busy="Working out the sweep (11 heights)...")
        self._redraw()
        try:
            st["sweep"] = await asyncio.to_thread(rm.brace_sweep, self.app.store, cid, axis)
        except InputError as e:
            self._say(f"No sweep: {plain(e)}")
        finally:
            st["busy"] = ""
        self._redraw()


def rm_label(option: dict[str, Any]) -> str:
    """The option in short words (``brace weak at 12 ft``).

    Example:
        >>> rm_label({"kind": "plates", "thickness": "3/8 in"})
        'plates 3/8 in x flange width'
    """
    from fieldcol.retrofit import label

    return label(option)


__all__ = ["RetrofitTab", "sweep_chart", "rm_label"]
