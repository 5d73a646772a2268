"""The Section tab's built-up card: the arrangement, its ties, the dimensions to measure, a
sketch of the parts drawn from what is typed, the properties, and Save.

Identifiers: ``built-card``, ``built-<arrangement>``, ``built-tie-<tie>``, ``built-toes-<out|in>``,
``built-connection-<kind>``, ``built-<key>`` (an entry: ``built-channel``,
``built-battens.spacing``; riveted or bolted, the optional ``built-battens.fasteners.count``,
``built-battens.fasteners.diameter`` (or ``lacing.``), ``built-holes.diameter``,
``built-holes.per_flange``), ``built-sketch`` (the parts with the lacing or battens on the open
faces), ``built-elevation`` (a side view of one face with the lacing or battens; shown when the
chords stand apart), ``built-preview``, ``save-built``.
"""

from __future__ import annotations

import asyncio
from typing import TYPE_CHECKING, Any, Callable

import flet as ft
import flet.canvas as cv

from fieldcol.ui import _entry_controls as ec
from fieldcol.ui import builtup_model as bm
from fieldcol.ui import readings as r
from fieldcol.ui import views as v
from fieldcol.ui.views import MUTED, TONES, text_line

if TYPE_CHECKING:
    from fieldcol.ui import section as sx
    from fieldcol.ui.tab_section import SectionTab

_STEEL = v.ACCENT            # theme roles (fieldcol.ui.palette): light and dark
_FILL = v.CHOSEN_BG
_SKETCH = 220.0


def sketch(polygons: list[list[tuple[float, float]]], size: float = _SKETCH) -> cv.Canvas:
    """The parts as filled outlines in a ``size`` square (polygons in a unit box, y down).

    Example: ``sketch([[(0, 0), (1, 0), (1, 1)]])``.
    """
    pad = 10.0
    scale = size - 2 * pad
    shapes: list[cv.Shape] = []
    for poly in polygons:
        if len(poly) < 3:
            continue
        els = [cv.Path.MoveTo(pad + poly[0][0] * scale, pad + poly[0][1] * scale)]
        els += [cv.Path.LineTo(pad + x * scale, pad + y * scale) for x, y in poly[1:]]
        els.append(cv.Path.Close())
        shapes.append(cv.Path(els, ft.Paint(color=_FILL, style=ft.PaintingStyle.FILL)))
        shapes.append(cv.Path(els, ft.Paint(color=_STEEL, stroke_width=1.5,
                                            style=ft.PaintingStyle.STROKE)))
    return cv.Canvas(shapes, width=size, height=size)


def _outline(poly: list[tuple[float, float]], pad: float, scale: float, paint: ft.Paint,
             close: bool = True) -> cv.Path:
    els = [cv.Path.MoveTo(pad + poly[0][0] * scale, pad + poly[0][1] * scale)]
    els += [cv.Path.LineTo(pad + x * scale, pad + y * scale) for x, y in poly[1:]]
    if close:
        els.append(cv.Path.Close())
    return cv.Path(els, paint)


def tie_sketch(polygons: list[list[tuple[float, float]]], ties: list[list[tuple[float, float]]],
               size: float = _SKETCH) -> cv.Canvas:
    """The parts (filled) with the lacing or battens on the open faces (outlined only).

    Example: ``tie_sketch([[(0, 0), (1, 0), (1, 1)]], [[(0, 0), (1, 0), (1, .02), (0, .02)]])``.
    """
    canvas = sketch(polygons, size)
    pad, scale = 10.0, size - 20.0
    canvas.shapes += [_outline(t, pad, scale, ft.Paint(color=_STEEL, stroke_width=1.0,
                                                       style=ft.PaintingStyle.STROKE))
                      for t in ties if len(t) >= 3]
    return canvas


def elevation(lines: list[list[tuple[float, float]]], size: float = _SKETCH) -> cv.Canvas:
    """A side view of one open face: the chords (thick) and the lacing or battens (thin).

    Example: ``elevation([[(0.2, 0), (0.2, 1)], [(0.8, 0), (0.8, 1)], [(0.2, 0), (0.8, 0.5)]])``.
    """
    pad, wide = 10.0, size * 0.45           # beside the section on a phone, not below it
    shapes: list[cv.Shape] = []
    for i, line in enumerate(lines):
        width = 4.0 if i < 2 else 1.5          # the first two lines are the chords
        pts = [(x * (wide - 2 * pad) / (size - 2 * pad), y) for x, y in line]
        shapes.append(_outline(pts, pad, size - 2 * pad,
                               ft.Paint(color=_STEEL, stroke_width=width,
                                        style=ft.PaintingStyle.STROKE), close=False))
    return cv.Canvas(shapes, width=wide, height=size)


class BuiltCard:
    """State and controls of the built-up card inside a ``SectionTab``.

    Example: ``BuiltCard(tab).card(view)`` gives the card.
    """

    def __init__(self, tab: "SectionTab") -> None:
        self.tab = tab
        self.loaded_for: str | None = None
        self.arrangement, self.tie = "channels", "battens"
        self.toes, self.connection = "out", "riveted"
        self.typed: dict[str, str] = {}
        self.preview: bm.BuiltPreview | None = None
        self.fields: dict[str, ft.TextField] = {}
        self.area = ft.Column(spacing=8)

    def _fill_from_record(self, v: "sx.SectionView") -> None:
        if self.loaded_for == v.column_id:
            return
        self.loaded_for = v.column_id
        app = self.tab.app
        rec = app.detail.record if app.detail is not None else {}
        section = rec.get("section") if isinstance(rec, dict) else None
        self.arrangement, self.tie, self.typed, self.toes, self.connection = \
            bm.built_typed(section)

    def card(self, v: "sx.SectionView") -> ft.Control:
        """The card (synchronous, no I/O)."""
        self._fill_from_record(v)
        system = "us" if v.unit == "in" else "si"
        self.fields = {}
        rows: list[ft.Control] = []
        said_optional = False
        for e in bm.entries(self.arrangement, self.tie, self.connection, self.toes):
            tf = ec.unit_entry(e.label, self.typed.get(e.key, ""),
                               v.unit if e.kind == "length" else None, hint=e.hint,
                               on_change=self._typed(e.key),
                               keyboard=ft.KeyboardType.NUMBER if e.kind == "count"
                               else ft.KeyboardType.TEXT)
            self.fields[e.key] = tf
            if e.optional and not said_optional:
                said_optional = True
                rows.append(ft.Container(text_line(bm.OPTIONAL_WORDS, size=16, color=MUTED),
                                         col={"xs": 12}))
            rows.append(ft.Container(ft.Semantics(identifier=f"built-{e.key}", content=tf),
                                     col={"xs": 12 if e.kind == "part" else 6}))
        controls: list[ft.Control] = [
            text_line("Riveted, bolted or welded from channels, angles and plates.", size=16,
                      color=MUTED),
            ec.choice_row(bm.ARRANGEMENTS, self.arrangement, self._pick("arrangement"), "built",
                          said="arrangement:"),
            ec.choice_row(bm.TIES[self.arrangement], self.tie, self._pick("tie"), "built-tie",
                          said="joined by:")]
        if self.arrangement == "channels":
            controls.append(ec.choice_row([("out", "Toes out"), ("in", "Toes in")], self.toes,
                                          self._pick("toes"), "built-toes"))
        controls += [
            ec.choice_row(bm.CONNECTIONS, self.connection, self._pick("connection"),
                          "built-connection"),
            ft.ResponsiveRow(rows, spacing=8, run_spacing=8),
            ft.Row([ec.big_button("Show it", ft.Icons.VISIBILITY, self._show, "built-show",
                                  filled=False),
                    ec.big_button("Save built-up section", ft.Icons.SAVE, self._save,
                                  "save-built")], wrap=True, spacing=8, run_spacing=8),
            self.area]
        self._fill_area(system)
        return ec.card(controls, "Built up from parts", identifier="built-card")

    def _fill_area(self, system: str) -> None:
        p = self.preview
        if p is None:
            self.area.controls = [text_line(bm.MEASURE[self.arrangement], size=16, color=MUTED)]
            return
        if p.error:
            self.area.controls = [text_line(p.error, size=16, color=TONES["over"][0])]
            return
        views: list[ft.Control] = [
            ft.Semantics(identifier="built-sketch", label="sketch of the built-up section",
                         content=tie_sketch(p.polygons, p.ties))]
        if p.elevation:
            views.append(ft.Semantics(identifier="built-elevation",
                                      label=f"side view of one face: {p.elevation_label}",
                                      content=elevation(p.elevation)))
        self.area.controls = [
            ft.Row(views, spacing=8, vertical_alignment=ft.CrossAxisAlignment.START),
            ft.Semantics(identifier="built-preview", content=ft.Column(
                [ec.value_line(x.label, x.value) for x in p.lines], spacing=4)),
            text_line(p.measure, size=16, color=MUTED)]

    # -- handlers ---------------------------------------------------------------------------
    def _typed(self, key: str) -> Callable[[Any], None]:
        def keep(e: Any) -> None:
            self.typed[key] = e.control.value or ""
            if e.control.error:
                e.control.error = None
                self.tab._update(e.control)
        return keep

    def _pick(self, what: str) -> Callable[[str], Callable[..., None]]:
        def choose(value: str) -> Callable[..., None]:
            def pick(_e: Any = None) -> None:
                setattr(self, what, value)
                if what == "arrangement":
                    self.tie = bm.TIES[value][0][0]
                self.preview = None
                self.tab.redraw()
            return pick
        return choose

    def _system(self) -> str:
        v = self.tab.view
        return "us" if v is not None and v.unit == "in" else "si"

    async def _show(self, _e: Any = None) -> None:
        self.preview = await asyncio.to_thread(
            bm.built_preview, self.arrangement, self.tie, dict(self.typed), self._system(),
            self.toes, self.connection)
        tf = self.fields.get(self.preview.error_key or "")
        if tf is not None:
            tf.error = self.preview.error
            self.tab._update(tf)
        self._fill_area(self._system())
        self.tab._update(self.area)

    async def _save(self, _e: Any = None) -> None:
        d = self.tab.app.detail
        if d is None:
            return
        done: list[r.Change] = []
        arr, tie, typed = self.arrangement, self.tie, dict(self.typed)
        toes, conn = self.toes, self.connection

        def do(store: Any) -> r.Change:
            ch = bm.save_built(store, d.id, arr, tie, typed, toes, conn)
            done.append(ch)
            return ch

        def undo(store: Any) -> None:
            if done:
                r.undo_change(store, done[-1])

        await self._show()
        field = self.fields.get(self.preview.error_key or "") if self.preview else None
        await self.tab.app.saver.save("built-up section", do, undo=undo, field=field,
                                      done=ec.saved_words)
