"""Drawings of the Restraints and Check tabs on a Flet canvas: the side view of one axis and
the column curve chart. Plain shapes from the view-models; no I/O."""

from __future__ import annotations

import flet as ft

from fieldcol.ui import views as v
import flet.canvas as cv

from fieldcol.ui.check_model import Chart
from fieldcol.ui.restraints_model import AxisSketch

INK = v.INK
MUTED = v.MUTED
STEEL = v.ACCENT
SHAPE = v.TONES["over"][0]      # the buckled shape: a dashed red-brown line, told apart by its dash too
OFF = v.CAUTION_EDGE        # a brace that does not count: hollow and dashed


def _paint(color: str, width: float = 2.0, *, fill: bool = False,
           dash: list[float] | None = None) -> ft.Paint:
    return ft.Paint(color=color, stroke_width=width,
                    style=ft.PaintingStyle.FILL if fill else ft.PaintingStyle.STROKE,
                    stroke_dash_pattern=dash)


def _text(x: float, y: float, value: str, size: int = 16, color: str = INK,
          bold: bool = False, align: ft.Alignment = ft.Alignment.TOP_LEFT) -> cv.Text:
    return cv.Text(x, y, value, style=ft.TextStyle(size=size, color=color,
                                                   weight=ft.FontWeight.BOLD if bold else None),
                   alignment=align)


def _support(kind: str, x: float, y: float, top: bool) -> list[cv.Shape]:
    """The symbol of an end: fixed (hatched block), pinned (triangle), guided (a sleeve that
    slides), spring (a zig-zag), free (nothing held: an open circle)."""
    s = -1 if top else 1
    out: list[cv.Shape] = []
    if kind == "fixed":
        out.append(cv.Line(x - 22, y, x + 22, y, _paint(INK, 4)))
        for i in range(5):
            out.append(cv.Line(x - 20 + 10 * i, y, x - 28 + 10 * i, y + 10 * s, _paint(INK, 1.5)))
    elif kind == "pinned":
        out.append(cv.Path([cv.Path.MoveTo(x, y), cv.Path.LineTo(x - 12, y + 18 * s),
                            cv.Path.LineTo(x + 12, y + 18 * s), cv.Path.Close()], _paint(INK, 2)))
        out.append(cv.Line(x - 18, y + 18 * s, x + 18, y + 18 * s, _paint(INK, 2)))
    elif kind == "guided":
        out.append(cv.Line(x - 22, y, x + 22, y, _paint(INK, 4)))
        out.append(cv.Circle(x - 12, y + 7 * s, 5, _paint(INK, 2)))
        out.append(cv.Circle(x + 12, y + 7 * s, 5, _paint(INK, 2)))
        out.append(cv.Line(x - 22, y + 14 * s, x + 22, y + 14 * s, _paint(INK, 2)))
    elif kind == "spring":
        pts = [cv.Path.MoveTo(x, y)]
        for i in range(1, 7):
            pts.append(cv.Path.LineTo(x + (8 if i % 2 else -8), y + 3 * i * s))
        pts.append(cv.Path.LineTo(x, y + 21 * s))
        out.append(cv.Path(pts, _paint(INK, 2)))
        out.append(cv.Line(x - 18, y + 21 * s, x + 18, y + 21 * s, _paint(INK, 3)))
    else:  # free
        out.append(cv.Circle(x, y, 6, _paint(INK, 2)))
    return out


def axis_canvas(a: AxisSketch, width: float = 166, height: float = 300) -> cv.Canvas:
    """The side view of one axis: the column, its ends, its braces (filled: counted; hollow and
    dashed: left out) and its first buckled shape (dashed), the axis that governs boxed.

    Args:
        a: an ``AxisSketch``.
        width, height: the drawing size, px.

    Returns:
        A ``Canvas``.

    Example: ``axis_canvas(sketch(record, "us").axes[1])``.
    """
    top, bottom = 92.0 if a.governs else 70.0, height - 40.0
    x0 = width / 2
    amp = width * 0.28

    def y(zf: float) -> float:
        return bottom - zf * (bottom - top)

    shapes: list[cv.Shape] = []
    if a.governs:
        shapes.append(cv.Rect(2, 2, width - 4, height - 4, border_radius=8,
                              paint=_paint(SHAPE, 3)))
    title = ("Strong axis" if a.axis == "strong" else "Weak axis")
    # every word 16 px (read on a phone at arm's length); "GOVERNS" on a line of its own
    shapes.append(_text(x0, 6, title, 16, INK, True, ft.Alignment.TOP_CENTER))
    line = 26.0
    if a.governs:
        shapes.append(_text(x0, line, "GOVERNS", 16, SHAPE, True, ft.Alignment.TOP_CENTER))
        line += 20
    shapes.append(_text(x0, line, f"Lc {a.Lc_text}", 16, SHAPE if a.governs else MUTED,
                        a.governs, ft.Alignment.TOP_CENTER))
    shapes.append(cv.Line(x0, y(0), x0, y(1), _paint(STEEL, 5)))
    if a.shape:
        path = [cv.Path.MoveTo(x0 + amp * a.shape[0][1], y(a.shape[0][0]))]
        path += [cv.Path.LineTo(x0 + amp * w, y(z)) for z, w in a.shape[1:]]
        shapes.append(cv.Path(path, _paint(SHAPE, 3, dash=[8, 5])))
    shapes += _support(a.bottom, x0, y(0), top=False)
    shapes += _support(a.top, x0, y(1), top=True)
    for zf, kind, counted in a.braces:
        yy = y(zf)
        if counted:
            shapes.append(cv.Line(x0, yy, 8, yy, _paint(INK, 3)))
            shapes.append(cv.Circle(x0, yy, 6, _paint(INK, fill=True)))
        else:
            shapes.append(cv.Line(x0, yy, 8, yy, _paint(OFF, 2, dash=[4, 4])))
            shapes.append(cv.Circle(x0, yy, 6, _paint(OFF, 2)))
        if kind in ("cable", "rod"):
            shapes.append(cv.Line(x0, yy, 10, max(top, yy - 40), _paint(INK if counted else OFF, 1.5)))
        shapes.append(_text(4, yy + 4, kind, 16, INK if counted else OFF))
        if not counted:  # said beside the column, where the brace line leaves room
            shapes.append(_text(x0 + 8, yy + 4, "left out", 16, OFF))
    shapes.append(_text(x0, height - 20, a.note, 16, MUTED, False, ft.Alignment.TOP_CENTER))
    return cv.Canvas(shapes=shapes, width=width, height=height)


def curve_canvas(chart: Chart, width: float = 340, height: float = 240) -> cv.Canvas:
    """The column curve(s) of the code with this column's points (the governing one filled and
    labelled), axes labelled with the code's symbols and units.

    Args:
        chart: a ``Chart``.
        width, height: the drawing size, px.

    Returns:
        A ``Canvas``.

    Example: ``curve_canvas(latest_summary(store, cid).chart)``.
    """
    left, right, top, bottom = 48.0, width - 10.0, 30.0, height - 44.0

    def px(x: float) -> float:
        return left + (right - left) * min(max(x / chart.x_max, 0.0), 1.0)

    def py(s: float) -> float:
        return bottom - (bottom - top) * min(max(s / chart.stress_max, 0.0), 1.0)

    shapes: list[cv.Shape] = [cv.Line(left, bottom, right, bottom, _paint(INK, 1.5)),
                              cv.Line(left, top, left, bottom, _paint(INK, 1.5))]
    for xv in _ticks(chart.x_max):
        shapes.append(cv.Line(px(xv), bottom, px(xv), bottom + 5, _paint(INK, 1)))
        shapes.append(_text(px(xv), bottom + 6, f"{xv:g}", 16, MUTED, False,
                            ft.Alignment.TOP_CENTER))
    for sv in _ticks(chart.stress_max):
        shapes.append(cv.Line(left - 5, py(sv), left, py(sv), _paint(INK, 1)))
        shapes.append(cv.Line(left, py(sv), right, py(sv), _paint(v.GRID, 1)))
        shapes.append(_text(left - 7, py(sv) - 10, f"{sv:g}", 16, MUTED, False,
                            ft.Alignment.TOP_RIGHT))
    shapes.append(_text(right, bottom + 24, chart.x_name, 16, INK, True, ft.Alignment.TOP_RIGHT))
    shapes.append(_text(4, 4, f"{chart.stress_name} ({chart.stress_unit})", 16, INK, True))
    dashes = [None, [6, 4], [2, 3]]
    drawn: list[tuple[float, float, float, float]] = [(left, bottom, right, bottom),
                                                      (left, top, left, bottom)]
    written = [(4.0, 4.0, 4.0 + text_width(f"{chart.stress_name} ({chart.stress_unit})", 16),
                4.0 + LINE * 16)]
    for i, (label, pts) in enumerate(chart.curves):
        xy = _thinned([(px(x), py(s)) for x, s in pts])
        path = [cv.Path.MoveTo(*xy[0])] + [cv.Path.LineTo(x, y) for x, y in xy[1:]]
        shapes.append(cv.Path(path, _paint(STEEL, 2.5, dash=dashes[i % 3])))
        drawn += [(*a, *b) for a, b in zip(xy, xy[1:])]
        # named in the top right corner, which a falling curve leaves empty
        shapes.append(_text(right - 4, top + 4 + 20 * i, label, 16, STEEL,
                            align=ft.Alignment.TOP_RIGHT))
        written.append((right - 4 - text_width(label, 16), top + 4 + 20 * i, right - 4,
                        top + 4 + 20 * i + LINE * 16))
    marks = []
    for p in chart.points:
        x, yv = px(p.x), py(p.stress)
        if p.governs:
            shapes.append(cv.Circle(x, yv, 7, _paint(SHAPE, fill=True)))
        else:  # named in the key under the chart: labels of close points would overlap
            shapes.append(cv.Circle(x, yv, 6, _paint(INK, 2)))
            marks.append((x - 7, yv - 7, x + 7, yv + 7))   # the ring's stroke reaches 7 px
    for p in chart.points:
        if p.governs:
            shapes += _governs_label(f"{p.label}: governs", (px(p.x), py(p.stress)),
                                     (left + 2, 0, right, bottom - 2), drawn,
                                     written + marks)
    return cv.Canvas(shapes=shapes, width=width, height=height)


#: the app's logical pixel in the placer's millimetres and points (CSS: 96 px to the inch)
_MM, _PT = 25.4 / 96, 0.75
#: a line of text's height per px of font size (Flutter's line box for its sans fonts is
#: ~1.17 em; rounded up) and a bold letter's width per px (the widest of our labels in DejaVu
#: Sans Bold, a wide face, runs 0.59 em a letter; rounded up, since the client picks the font)
LINE, BOLD_LETTER = 1.25, 0.65


def text_width(text: str, size: float) -> float:
    """A conservative width of one line of text on the canvas, px: the client measures text,
    the server cannot, so labels are kept clear by this estimate.

    Example:
        >>> text_width("weak (y): governs", 16)
        176.8
    """
    return round(len(text) * BOLD_LETTER * size, 1)


def _governs_label(text: str, at: tuple[float, float], area: tuple[float, float, float, float],
                   lines: list[tuple[float, float, float, float]],
                   keep_out: list[tuple[float, float, float, float]]) -> list[cv.Shape]:
    """The governing point's words, placed by ``chartlabels.place`` (the report's rule) clear
    of the curves, the axes, the other points and the words already written; on a leader line
    where the room beside the point is taken. Nothing where no place is free: the key under
    the chart names the governing point in bold all the same."""
    from fieldcol import chartlabels

    def mm(b: tuple[float, ...]) -> tuple[float, ...]:
        return tuple(v * _MM for v in b)

    got = chartlabels.place([mm(at)], [mm((text_width(text, 16), LINE * 16))], 16 * _PT,
                            area=mm(area), lines=[mm(s) for s in lines],
                            keep_out=[mm(b) for b in keep_out], radii=[7 * _MM])[0]
    if got is None:
        return []
    out: list[cv.Shape] = [_text(got.box[0] / _MM, got.box[1] / _MM, text, 16, SHAPE, True)]
    if got.leader is not None:
        out.insert(0, cv.Line(*(v / _MM for v in got.leader), _paint(SHAPE, 1.5)))
    return out


def _thinned(xy: list[tuple[float, float]], *, tol: float = 0.5) -> list[tuple[float, float]]:
    """A polyline with the points dropped that lie within ``tol`` px of the straight segment
    drawn instead of them (a column curve of 61 points draws the same with ~15: every point is
    a control sent to the client).

    Example:
        >>> _thinned([(0, 0), (1, 1), (2, 2), (3, 0)])
        [(0, 0), (2, 2), (3, 0)]
    """
    if len(xy) < 3:
        return list(xy)

    def off(a: tuple[float, float], c: tuple[float, float], b: tuple[float, float]) -> float:
        dx, dy = c[0] - a[0], c[1] - a[1]
        norm = (dx * dx + dy * dy) ** 0.5 or 1.0
        return abs(dy * (b[0] - a[0]) - dx * (b[1] - a[1])) / norm

    out, start = [xy[0]], 0
    for i in range(2, len(xy)):
        # can the segment from the last kept point reach point i and pass every point between?
        if any(off(xy[start], xy[i], xy[j]) > tol for j in range(start + 1, i)):
            start = i - 1
            out.append(xy[start])
    out.append(xy[-1])
    return out


def _ticks(top: float) -> list[float]:
    """Round tick values from 0 to ``top``: steps of 1, 2 or 5 times a power of ten."""
    import math

    raw = top / 4
    p = 10 ** math.floor(math.log10(raw)) if raw > 0 else 1
    step = next(m * p for m in (1, 2, 2.5, 5, 10) if m * p >= raw)
    return [i * step for i in range(int(top // step) + 1)]
