"""Flet controls for photos: thumbnails and a large view with the markup drawn over them, zoom,
and the markup editor (tap a tool, tap or drag on the photo).

The markup is drawn on an ``ft.canvas.Canvas`` stacked over an image of exactly the same size,
so the shapes (fractions of the upright photo) land where they were put at any size.
Identifiers: ``photo-<prefix>-<i>``, ``photo-large``, ``photo-zoom-in``, ``photo-zoom-out``,
``photo-markup``, ``markup-<tool>``, ``markup-surface``, ``markup-label-text``,
``markup-undo``, ``markup-clear``, ``markup-save``, ``markup-cancel``, ``photo-close``.
"""

from __future__ import annotations

import math
from typing import Any, Awaitable, Callable

import flet as ft
import flet.canvas as cv

from fieldcol.store._markup import EDGE_HEX, INK_HEX, MAX_LABEL, arrow_head
from fieldcol.ui import photos as pm
from fieldcol.ui.views import INK, LINE, MUTED, TAP, text_line

Handler = Callable[..., Any]
THUMB = 112   # px, the long side of a thumbnail


def fit(aspect: float, box_w: float, box_h: float) -> tuple[float, float]:
    """The largest width x height of a picture of ``aspect`` (w / h) inside a box.

    Example:
        >>> fit(2.0, 300, 300)
        (300.0, 150.0)
    """
    aspect = aspect if aspect > 0 and math.isfinite(aspect) else 1.0
    w = float(box_w)
    h = w / aspect
    if h > box_h:
        h = float(box_h)
        w = h * aspect
    return round(w, 1), round(h, 1)


def shapes_on(markup: list[dict[str, Any]], w: float, h: float,
              *, scale: float = 1.0) -> list[cv.Shape]:
    """Canvas shapes for ``markup`` over a picture drawn ``w x h`` px.

    Each line is drawn dark and wide, then bright and thin over it, so it reads on any photo.

    Example: ``cv.Canvas(shapes_on(p.markup, 340, 255))``.
    """
    side = min(w, h)
    out: list[cv.Shape] = []
    for colour, width in ((EDGE_HEX, 6.0 * scale), (INK_HEX, 3.0 * scale)):
        stroke = ft.Paint(color=colour, stroke_width=width, style=ft.PaintingStyle.STROKE,
                          stroke_cap=ft.StrokeCap.ROUND)
        fill = ft.Paint(color=colour, style=ft.PaintingStyle.FILL)
        for s in markup:
            if s["kind"] == "arrow":
                x0, y0 = s["from"][0] * w, s["from"][1] * h
                x1, y1 = s["to"][0] * w, s["to"][1] * h
                a, b = arrow_head((x0, y0), (x1, y1), (16 + width) * scale)
                out.append(cv.Line(x0, y0, x1, y1, paint=stroke))
                out.append(cv.Path([cv.Path.MoveTo(x1, y1), cv.Path.LineTo(*a),
                                    cv.Path.LineTo(*b), cv.Path.Close()], paint=fill))
            elif s["kind"] == "circle":
                out.append(cv.Circle(s["at"][0] * w, s["at"][1] * h, s["r"] * side,
                                     paint=stroke))
    for s in markup:
        if s["kind"] == "label":
            out.append(cv.Text(
                min(s["at"][0] * w, max(0.0, w - 8 * len(s["text"]) * scale)), s["at"][1] * h,
                s["text"], style=ft.TextStyle(size=max(11.0, 16 * scale), color=INK_HEX,
                                              bgcolor=EDGE_HEX, weight=ft.FontWeight.BOLD)))
    return out


def marked(src: bytes, w: float, h: float, markup: list[dict[str, Any]], *,
           scale: float = 1.0, radius: float = 0) -> ft.Control:
    """A picture with its markup over it, both exactly ``w x h`` px.

    Example: ``marked(view.data, 340, 255, view.markup)``.
    """
    image = ft.Image(src=src, width=w, height=h, fit=ft.BoxFit.FILL, border_radius=radius,
                     gapless_playback=True)
    if not markup:
        return ft.Container(image, width=w, height=h)
    return ft.Stack([image, cv.Canvas(shapes_on(markup, w, h, scale=scale), width=w,
                                      height=h)], width=w, height=h)


def thumbnails(photos: list[pm.PhotoThumb], open_photo: Callable[[pm.PhotoThumb], Handler],
               prefix: str) -> ft.Control:
    """Tappable thumbnails with their markup and the time the camera recorded.

    Args:
        photos: ``PhotoThumb`` view-models.
        open_photo: gives the click handler that shows a photo large.
        prefix: identifier prefix (``photo-<prefix>-<i>``).

    Returns:
        A wrapping row.

    Example: ``thumbnails(line.photos, lambda p: handler, "f0")``.
    """
    items: list[ft.Control] = []
    for i, p in enumerate(photos):
        w, h = fit(p.aspect, THUMB, THUMB)
        pic: ft.Control = marked(p.thumb, w, h, p.markup, scale=0.5, radius=4) if p.thumb \
            else ft.Container(text_line("photo file missing", size=16, color=MUTED),
                              width=THUMB, height=THUMB, alignment=ft.Alignment.CENTER)
        box = ft.Container(
            content=ft.Column([ft.Container(pic, width=THUMB, height=THUMB,
                                            alignment=ft.Alignment.CENTER),
                               ft.Row([ft.Icon(ft.Icons.DRAW, size=16, color=INK),
                                       text_line("marked", size=16)], spacing=2, tight=True)
                               if p.markup else text_line("tap to see", size=16, color=MUTED)],
                              spacing=2, tight=True, width=THUMB,
                              horizontal_alignment=ft.CrossAxisAlignment.CENTER),
            on_click=open_photo(p), ink=True, padding=4, border=ft.Border.all(1, LINE),
            border_radius=8)
        items.append(ft.Semantics(identifier=f"photo-{prefix}-{i}", button=True,
                                  label=f"{p.label}: tap to see it larger", content=box))
    return ft.Row(items, wrap=True, spacing=8, run_spacing=8)


def _button(ident: str, text: str, icon: Any, on_click: Handler, *, filled: bool = False,
            selected: bool | None = None) -> ft.Control:
    kind = ft.FilledButton if filled else ft.OutlinedButton
    btn = kind(text, icon=icon, on_click=on_click, height=TAP)
    if selected:
        btn = ft.FilledButton(text, icon=ft.Icons.CHECK, on_click=on_click, height=TAP)
    sem = ft.Semantics(identifier=ident, content=btn, button=True)
    if selected is not None:
        sem.selected = selected
        sem.label = f"{text}{' (chosen)' if selected else ''}"
    return sem


class PhotoDialog:
    """The large view of one photo: zoom, and the markup editor behind "Mark up".

    ``save_markup(photo_id, shapes)`` is awaited to keep the markup (through the app's saver);
    it returns True when saved.
    """

    TOOLS = (("arrow", "Arrow", ft.Icons.NORTH_EAST), ("circle", "Circle",
                                                         ft.Icons.CIRCLE_OUTLINED),
             ("label", "Label", ft.Icons.TEXT_FIELDS))

    def __init__(self, page: ft.Page, view: pm.PhotoView,
                 save_markup: Callable[[str, list[dict]], Awaitable[bool]]) -> None:
        self.page, self.view, self.save_markup = page, view, save_markup
        box_w = max(240.0, min(float(page.width or 390) - 48, 760.0))
        box_h = max(240.0, min(float(page.height or 844) * 0.55, 760.0))
        self.w, self.h = fit(view.width / view.height, box_w, box_h)
        self.editing = False
        self.tool = "arrow"
        self.shapes: list[dict[str, Any]] = [dict(s) for s in view.markup]
        self.note = ft.Text("", size=16, color=INK)
        self.label_text = ft.TextField(label=f"Label words (up to {MAX_LABEL} characters)",
                                       max_length=MAX_LABEL, text_size=17, dense=True)
        self._drag: tuple[float, float] | None = None
        self._last: tuple[float, float] | None = None
        self.viewer = ft.InteractiveViewer(content=self._picture(), min_scale=1, max_scale=6,
                                           boundary_margin=ft.Margin.all(0))
        # out of the semantics tree: a tap through it would arrive at the centre, not where
        # the finger was (markup is placed by eye; the shapes are then said in words)
        self.surface = ft.GestureDetector(
            exclude_from_semantics=True, on_tap_down=self._tap, on_pan_start=self._pan_start, on_pan_update=self._pan_update,
            on_pan_end=self._pan_end, drag_interval=30)
        self.body = ft.Column(tight=True, spacing=8, scroll=ft.ScrollMode.AUTO)
        # modal: a tap beside the dialog must not throw away marks not yet saved
        self.dialog = ft.AlertDialog(
            modal=True, title=text_line(view.name, size=17, bold=True), content=self.body,
            inset_padding=ft.Padding.all(8), content_padding=ft.Padding.all(10))
        self._fill()

    # -- drawing ----------------------------------------------------------------------------
    def _picture(self) -> ft.Control:
        return marked(self.view.data, self.w, self.h, self.shapes)

    def _fill(self) -> None:
        v = self.view
        said = pm.markup_words(self.shapes)
        if not self.editing:
            self.viewer.content = self._picture()
            self.body.controls = [
                ft.Semantics(identifier="photo-large", label=f"photo {v.name}, {said}",
                             content=ft.Container(self.viewer, width=self.w, height=self.h)),
                text_line(f"{v.taken} · {v.size}" + (f" · {said}" if self.shapes else ""),
                          size=16, color=MUTED),
                ft.Row([_button("photo-zoom-in", "Zoom in", ft.Icons.ZOOM_IN, self._zoom(1.6)),
                        _button("photo-zoom-out", "Fit", ft.Icons.ZOOM_OUT_MAP, self._reset)],
                       wrap=True, spacing=8),
                ft.Row([_button("photo-markup", "Mark up", ft.Icons.DRAW, self._edit(True),
                                filled=True),
                        _button("photo-close", "Close", ft.Icons.CLOSE, self.close)],
                       wrap=True, spacing=8)]
            return
        # one surface for the dialog's life: rebuilt, it would drop a tap landing meanwhile
        surface = self.surface
        surface.content = self._picture()
        hint = {"arrow": "Tap the defect: an arrow points at it. Or drag from where the arrow "
                         "starts to the defect.",
                "circle": "Tap the defect to ring it. Or drag from its centre outwards.",
                "label": "Type the words, then tap where they go."}[self.tool]
        tools = [_button(f"markup-{k}", word, icon, self._choose(k), selected=self.tool == k)
                 for k, word, icon in self.TOOLS]
        controls: list[ft.Control] = [
            ft.Row(tools, wrap=True, spacing=6),
            text_line(hint, size=16, color=MUTED)]
        if self.tool == "label":
            controls.append(ft.Semantics(identifier="markup-label-text",
                                         content=self.label_text))
        controls += [
            ft.Semantics(identifier="markup-surface", label=f"photo to mark up, {said}",
                         content=ft.Container(surface, width=self.w, height=self.h)),
            ft.Semantics(identifier="markup-note", live_region=True, content=self.note),
            ft.Row([_button("markup-undo", "Undo mark", ft.Icons.UNDO, self._undo_shape),
                    _button("markup-clear", "Clear all", ft.Icons.DELETE_SWEEP, self._clear)],
                   wrap=True, spacing=6),
            ft.Row([_button("markup-save", "Save markup", ft.Icons.SAVE, self._save,
                            filled=True),
                    _button("markup-cancel", "Cancel", ft.Icons.CLOSE, self._edit(False))],
                   wrap=True, spacing=6)]
        self.body.controls = controls

    def _refresh(self) -> None:
        self._fill()
        self.dialog.update()

    # -- handlers -----------------------------------------------------------------------
    def _zoom(self, factor: float) -> Handler:
        async def zoom(_e: Any = None) -> None:
            await self.viewer.zoom(factor)
        return zoom

    async def _reset(self, _e: Any = None) -> None:
        await self.viewer.reset()

    def _edit(self, on: bool) -> Handler:
        def edit(_e: Any = None) -> None:
            self.editing = on
            if not on:  # cancel: back to what is kept
                self.shapes = [dict(s) for s in self.view.markup]
            self.note.value = ""
            self._refresh()
        return edit

    def _choose(self, tool: str) -> Handler:
        def choose(_e: Any = None) -> None:
            self.tool = tool
            self._refresh()
        return choose

    def _norm(self, x: float, y: float) -> tuple[float, float]:
        return (min(1.0, max(0.0, x / self.w)), min(1.0, max(0.0, y / self.h)))

    def add_at(self, x: float, y: float) -> None:
        """Add the chosen tool's shape for a tap at ``x, y`` px on the photo (tests call it
        with the numbers a tap gives)."""
        nx, ny = self._norm(x, y)
        if self.tool == "arrow":
            # the tail sits up and away from the nearer sides, so the arrow crosses open photo
            dx = -0.22 if nx > 0.5 else 0.22
            dy = -0.18 if ny > 0.5 else 0.18
            self._add({"kind": "arrow", "from": [min(1, max(0, nx + dx)),
                                                 min(1, max(0, ny + dy))], "to": [nx, ny]})
        elif self.tool == "circle":
            self._add({"kind": "circle", "at": [nx, ny], "r": 0.08})
        else:
            words = (self.label_text.value or "").strip()
            if not words:
                self.note.value = "Type the label's words first, then tap where they go."
                return
            self._add({"kind": "label", "at": [nx, ny], "text": words})

    def _add(self, shape: dict[str, Any]) -> None:
        from fieldcol.store._markup import check_markup

        try:
            check_markup(self.shapes + [shape])
        except Exception as e:  # an InputError: said in the note, nothing drawn
            self.note.value = f"Not drawn: {getattr(e, 'reason', e)}"
            return
        self.shapes.append(shape)
        self.note.value = f"{pm.markup_words(self.shapes)} (not saved yet)"

    def _tap(self, e: ft.TapEvent) -> None:
        pos = e.local_position
        if pos is None:
            return
        self.add_at(pos.x, pos.y)
        self._refresh()

    def _pan_start(self, e: ft.DragStartEvent) -> None:
        self._drag = (e.local_position.x, e.local_position.y)
        self._last = self._drag

    def _pan_update(self, e: ft.DragUpdateEvent) -> None:
        self._last = (e.local_position.x, e.local_position.y)

    def _pan_end(self, _e: Any) -> None:
        if self._drag is None or self._last is None:
            return
        (x0, y0), (x1, y1) = self._drag, self._last
        self._drag = None
        if math.dist((x0, y0), (x1, y1)) < 12:  # a short drag is a tap
            self.add_at(x1, y1)
        elif self.tool == "arrow":
            self._add({"kind": "arrow", "from": list(self._norm(x0, y0)),
                       "to": list(self._norm(x1, y1))})
        elif self.tool == "circle":
            r = math.dist((x0, y0), (x1, y1)) / min(self.w, self.h)
            self._add({"kind": "circle", "at": list(self._norm(x0, y0)),
                       "r": round(min(1.0, max(0.01, r)), 4)})
        else:
            self.add_at(x1, y1)
        self._refresh()

    def _undo_shape(self, _e: Any = None) -> None:
        if self.shapes:
            self.shapes.pop()
        self.note.value = pm.markup_words(self.shapes) + " (not saved yet)"
        self._refresh()

    def _clear(self, _e: Any = None) -> None:
        self.shapes = []
        self.note.value = "All marks taken off (not saved yet)"
        self._refresh()

    async def _save(self, _e: Any = None) -> None:
        shapes = [dict(s) for s in self.shapes]
        if await self.save_markup(self.view.id, shapes):
            self.view = pm.PhotoView(**{**self.view.__dict__, "markup": shapes})
            self.editing = False
            self.note.value = ""
            self._refresh()
        else:
            self.note.value = "Markup not saved: see the message below; your marks are kept here."
            self._refresh()

    def close(self, _e: Any = None) -> None:
        """Close the dialog (unsaved marks are dropped only here, on purpose)."""
        self.page.pop_dialog()


def photo_opener(app: Any) -> Callable[[pm.PhotoThumb], Handler]:
    """Click handlers that show a photo large (with zoom and markup) for any screen of ``app``.

    The markup is kept through ``app.saver.save`` (Undo puts the earlier markup back).

    Args:
        app: the ``FieldApp`` (``page``, ``store``, ``saver``).

    Returns:
        A function of a ``PhotoThumb`` giving its async click handler.

    Example: ``thumbnails(photos, photo_opener(app), "r0")``.
    """
    import asyncio

    from fieldcol.errors import InputError

    async def save_markup(photo_id: str, shapes: list[dict]) -> bool:
        before: dict[str, list] = {}

        def do(store: Any) -> bool:
            before["m"] = pm.set_markup(store, photo_id, shapes)
            return True

        def undo(store: Any) -> None:
            pm.set_markup(store, photo_id, before["m"])

        return bool(await app.saver.save("photo markup", do, undo))

    def opener(p: pm.PhotoThumb) -> Handler:
        async def show(_e: Any = None) -> None:
            try:
                view = await asyncio.to_thread(pm.photo_view, app.store, p.id)
            except InputError as e:  # said in the dialog: the screen may have no note line
                app.page.show_dialog(ft.AlertDialog(
                    title=text_line("Photo not shown", size=17, bold=True),
                    content=text_line(f"{e.reason}" + (f": {e.hint}" if e.hint else "")),
                    actions=[ft.Semantics(identifier="photo-close", content=ft.FilledButton(
                        "Close", on_click=lambda _e: app.page.pop_dialog(), height=TAP))]))
                return
            app.page.show_dialog(PhotoDialog(app.page, view, save_markup).dialog)
        return show
    return opener


__all__ = ["PhotoDialog", "photo_opener", "thumbnails", "marked", "shapes_on", "fit", "THUMB"]
