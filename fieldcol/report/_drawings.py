"""The pictures on a column's sheet, as vector lines: the side view of each axis (ends, braces,
the first buckled shape, the governing axis marked) and the column curve with the column's points.

Both are drawn from the same view-models the app's Check and Restraints tabs use
(``fieldcol.ui.restraints_model.sketch``, ``fieldcol.ui.check_model.Chart``; plain data, no
Flet), so the report and the screen show the same picture. Every mark carries a word beside it:
nothing is told by shape or colour alone.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from fieldcol.report._layout import FONT, GREY, INK, RULE, ReportPDF

if TYPE_CHECKING:
    from fieldcol.ui.check_model import Chart
    from fieldcol.ui.restraints_model import Sketch

ACCENT = (176, 40, 24)      # the governing axis / point (always with the word "governs")
SHAPE = (30, 80, 150)
PALE = (200, 200, 200)


def _small(pdf: ReportPDF, size: float = 6.2, bold: bool = False) -> None:
    pdf.set_font(FONT, "B" if bold else "", size)


def _end(pdf: ReportPDF, kind: str, x: float, y: float, top: bool) -> None:
    """An end symbol at ``x, y``; ``top`` flips it. Each symbol has its word beside it."""
    s = -1 if top else 1
    pdf.set_draw_color(*INK)
    pdf.set_line_width(0.3)
    if kind == "fixed":
        pdf.set_line_width(0.7)
        pdf.line(x - 3.2, y, x + 3.2, y)
        pdf.set_line_width(0.2)
        for i in range(5):
            xi = x - 3 + i * 1.5
            pdf.line(xi, y, xi - 1.0, y + s * 1.2)
    elif kind == "pinned":
        pdf.polygon([(x, y), (x - 1.8, y + s * 2.4), (x + 1.8, y + s * 2.4)], style="D")
    elif kind == "guided":
        pdf.line(x - 2.6, y, x + 2.6, y)
        pdf.ellipse(x - 2.2, y + (0 if s > 0 else -1.2), 1.2, 1.2, style="D")
        pdf.ellipse(x + 1.0, y + (0 if s > 0 else -1.2), 1.2, 1.2, style="D")
    elif kind == "spring":
        pts = [(x, y)] + [(x + (1.2 if i % 2 else -1.2), y + s * 0.5 * (i + 1)) for i in range(4)]
        pts.append((x, y + s * 2.5))
        pdf.polyline(pts)
    pdf.set_line_width(0.2)
    _small(pdf, 5.6)
    pdf.set_text_color(*GREY)
    word = kind if kind in ("fixed", "pinned", "guided", "free", "spring") else kind
    pdf.text(x + 3.4, y + (2.4 if s > 0 else -0.8), word)
    pdf.set_text_color(*INK)


def sketch(pdf: ReportPDF, sk: "Sketch", x: float, y: float, w: float, h: float) -> float:
    """The side view of both axes in the box ``x, y, w, h`` (mm); returns the height used.

    Example: ``sketch(pdf, restraints_model.sketch(record, "us"), 130, 40, 64, 62)``.
    """
    _small(pdf, 6.6, True)
    pdf.text(x, y + 2.4, "Side view, first buckled shape")
    if sk.error or not sk.axes:
        _small(pdf)
        pdf.set_text_color(*GREY)
        pdf.lines_at(x, y + 4, pdf.wrap("not drawn: " + (sk.error or "no axes"), w), 2.6)
        pdf.set_text_color(*INK)
        return 16.0
    n = len(sk.axes)
    bw = w / n
    top_y, bot_y = y + 12.0, y + h - 8.0
    for i, ax in enumerate(sk.axes):
        bx = x + i * bw
        cx = bx + bw * 0.36
        if ax.governs:
            pdf.set_draw_color(*ACCENT)
            pdf.set_line_width(0.5)
            pdf.rect(bx + 0.5, y + 4.0, bw - 1.5, h - 4.0)
            pdf.set_line_width(0.2)
        # the column as built (grey) and its buckled shape (blue, thick)
        pdf.set_draw_color(*PALE)
        pdf.set_line_width(0.6)
        pdf.line(cx, top_y, cx, bot_y)
        amp = bw * 0.22
        if ax.shape:
            pdf.set_draw_color(*SHAPE)
            pdf.set_line_width(0.45)
            pdf.polyline([(cx + wv * amp, bot_y - zf * (bot_y - top_y)) for zf, wv in ax.shape])
        pdf.set_line_width(0.2)
        _end(pdf, ax.bottom, cx, bot_y, top=False)
        _end(pdf, ax.top, cx, top_y, top=True)
        for zf, kind, counted in ax.braces:
            by = bot_y - zf * (bot_y - top_y)
            pdf.set_draw_color(*INK)
            pdf.set_line_width(0.45 if counted else 0.25)
            if counted:
                pdf.line(cx - amp - 2, by, cx - 0.5, by)
            else:
                pdf.set_dash_pattern(dash=0.8, gap=0.6)
                pdf.line(cx - amp - 2, by, cx - 0.5, by)
                pdf.set_dash_pattern()
            pdf.set_line_width(0.2)
            _small(pdf, 5.2)
            pdf.set_text_color(*GREY)
            label = kind if counted else f"{kind}, not counted"
            pdf.lines_at(cx - amp - 2, by + 0.2, pdf.wrap(label, amp + 6), 2.0)
            pdf.set_text_color(*INK)
        _small(pdf, 6.2, True)
        pdf.set_text_color(*(ACCENT if ax.governs else INK))
        pdf.text(bx + 1.5, y + 7.4, f"{ax.axis} axis" + ("  governs" if ax.governs else ""))
        pdf.set_text_color(*INK)
        _small(pdf, 5.8)
        pdf.lines_at(bx + 1.5, bot_y + 3.0, pdf.wrap(f"K {ax.K:.2f}, Lc {ax.Lc_text}; {ax.note}",
                                                   bw - 3), 2.3)
    pdf.set_draw_color(*RULE)
    return h


def _nice(v: float) -> float:
    """A round tick step near ``v / 4``."""
    import math

    raw = v / 4 if v > 0 else 1.0
    mag = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 2.5, 5, 10):
        if raw <= m * mag:
            return m * mag
    return 10 * mag


def curve(pdf: ReportPDF, ch: "Chart | None", x: float, y: float, w: float, h: float) -> float:
    """The column curve with this column's points in the box ``x, y, w, h``; returns the height.

    Example: ``curve(pdf, check_summary(result, "us").chart, 130, 110, 64, 46)``.
    """
    _small(pdf, 6.6, True)
    pdf.text(x, y + 2.4, "Column curve and this column")
    if ch is None or not ch.curves:
        _small(pdf)
        pdf.set_text_color(*GREY)
        pdf.text(x, y + 6, "not drawn: no column curve for this check")
        pdf.set_text_color(*INK)
        return 9.0
    px, py, pw, ph = x + 9.0, y + 7.5, w - 11.0, h - 18.0
    sx = lambda v: px + pw * min(v, ch.x_max) / ch.x_max  # noqa: E731
    sy = lambda v: py + ph - ph * min(v, ch.stress_max) / ch.stress_max  # noqa: E731
    pdf.set_draw_color(*GREY)
    pdf.set_line_width(0.2)
    pdf.line(px, py, px, py + ph)
    pdf.line(px, py + ph, px + pw, py + ph)
    _small(pdf, 5.4)
    pdf.set_text_color(*GREY)
    step = _nice(ch.x_max)
    t = 0.0
    while t <= ch.x_max + 1e-9:
        pdf.line(sx(t), py + ph, sx(t), py + ph + 0.8)
        lab = f"{t:g}"
        pdf.text(sx(t) - pdf.width_of(lab) / 2, py + ph + 3.0, lab)
        t += step
    step = _nice(ch.stress_max)
    t = 0.0
    while t <= ch.stress_max + 1e-9:
        pdf.line(px - 0.8, sy(t), px, sy(t))
        lab = f"{t:g}"
        pdf.text(px - 1.2 - pdf.width_of(lab), sy(t) + 0.8, lab)
        t += step
    pdf.text(px + (pw - pdf.width_of(ch.x_name)) / 2, py + ph + 5.4, ch.x_name)
    title = f"{ch.stress_name} ({ch.stress_unit})"
    pdf.text(px - 1.0, py - 1.4, title)
    for k, (label, pts) in enumerate(ch.curves):
        pdf.set_draw_color(*(SHAPE if k == 0 else GREY))
        pdf.set_line_width(0.4)
        pdf.polyline([(sx(a), sy(b)) for a, b in pts if a <= ch.x_max])
    pdf.set_line_width(0.2)
    # the axis title is a label too: a point near the top left (a stocky column) steps clear
    placed: list[tuple[float, float, float, float]] = [
        (px - 1.0, py - 1.4 - 2.0, px - 1.0 + pdf.width_of(title), py - 1.4)]
    for p in sorted(ch.points, key=lambda q: q.x):
        cx, cy = sx(p.x), sy(p.stress)
        pdf.set_draw_color(*(ACCENT if p.governs else INK))
        pdf.set_fill_color(*(ACCENT if p.governs else (255, 255, 255)))
        pdf.ellipse(cx - 0.9, cy - 0.9, 1.8, 1.8, style="DF")
        _small(pdf, 5.4, p.governs)
        pdf.set_text_color(*(ACCENT if p.governs else INK))
        text = p.label + (" governs" if p.governs else "")
        tw = pdf.width_of(text)
        tx = cx + 1.4 if cx + 1.4 + tw < px + pw else cx - 1.4 - tw
        ty = cy - 1.0
        # points close together: step a label down until it clears the ones already placed
        for _ in range(6):
            if not any(tx < x1 and x0 < tx + tw and ty - 2.0 < y1 and y0 < ty
                       for x0, y0, x1, y1 in placed):
                break
            ty += 2.2
        placed.append((tx, ty - 2.0, tx + tw, ty))
        pdf.text(tx, ty, text)
    pdf.set_text_color(*GREY)
    _small(pdf, 5.2)
    pdf.lines_at(x, py + ph + 6.2, pdf.wrap(ch.caption, w)[:2], 2.1)
    pdf.set_text_color(*INK)
    pdf.set_draw_color(*RULE)
    pdf.set_fill_color(255, 255, 255)
    return h
