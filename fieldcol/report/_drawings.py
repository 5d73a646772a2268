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
            # left of the column's line, under the brace (over it where the buckled shape
            # swings left there): never written over the column or its shape
            x0, x1 = bx + 1.0, cx - 0.8
            lines = pdf.wrap(label, x1 - x0)
            tall = 2.0 * len(lines)
            spans = [(by + 0.2, by + 0.2 + tall), (by - 0.4 - tall, by - 0.4)]
            shape = [(cx + wv * amp, bot_y - zf * (bot_y - top_y)) for zf, wv in ax.shape]
            top = next((a for a, b in spans if all(px_ > x1 + 0.3 for px_, py_ in shape
                                                   if a - 0.5 <= py_ <= b + 0.5)), spans[0][0])
            pdf.lines_at(x0, top, lines, 2.0)
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
    drawn: list[tuple[float, float, float, float]] = [
        (px, py, px, py + ph), (px, py + ph, px + pw, py + ph)]
    shown = []
    for k, (label, pts) in enumerate(ch.curves):
        pdf.set_draw_color(*(SHAPE if k == 0 else GREY))
        pdf.set_line_width(0.4)
        line = [(sx(a), sy(b)) for a, b in pts if a <= ch.x_max]
        pdf.polyline(line)
        drawn += [(*a, *b) for a, b in zip(line, line[1:])]
        shown.append(line)
    pdf.set_line_width(0.2)
    used = _point_labels(pdf, ch, shown, drawn, (sx, sy), (px, py, pw, ph), title)
    return h + used


#: the size of the words on the column curve (pt); a point's mark (radius, mm); points nearer
#: than ``TOGETHER`` (mm, centre to centre) share one label: their marks touch
LABEL_PT, MARK, TOGETHER = 5.4, 0.9, 2.8


def _groups(pts: list, at: list[tuple[float, float]]) -> list[list[int]]:
    """The points as labelled: the governing one alone (its words in bold), the others in
    groups of points whose marks touch (a square tube's two axes at one place: one label)."""
    groups: list[list[int]] = []
    for i, p in enumerate(pts):
        if p.governs:
            groups.insert(0, [i])
            continue
        near = [g for g in groups if not pts[g[0]].governs and any(
            (at[i][0] - at[j][0]) ** 2 + (at[i][1] - at[j][1]) ** 2 < TOGETHER ** 2 for j in g)]
        merged = [i] + [j for g in near for j in g]
        groups = [g for g in groups if g not in near] + [sorted(merged)]
    return groups


def _point_labels(pdf: ReportPDF, ch: "Chart", shown: list, drawn: list, scale: tuple,
                  plot: tuple[float, float, float, float], title: str) -> float:
    """The column's points with their words and, where a code has more than one curve, each
    curve's name, placed by ``chartlabels.place`` so no word overlaps another, a curve or a point;
    then the caption. Returns the height a numbered key under the chart took (0 without)."""
    from fieldcol import chartlabels as _labels

    sx, sy = scale
    px, py, pw, ph = plot
    pts = sorted(ch.points, key=lambda q: q.x)
    at = [(sx(p.x), sy(p.stress)) for p in pts]
    for p, (ax, ay) in zip(pts, at):
        pdf.set_draw_color(*(ACCENT if p.governs else INK))
        pdf.set_fill_color(*(ACCENT if p.governs else (255, 255, 255)))
        pdf.ellipse(ax - MARK, ay - MARK, 2 * MARK, 2 * MARK, style="DF")
    texts, anchors, radii, toward = [], [], [], []
    for g in _groups(pts, at):
        cx, cy = sum(at[i][0] for i in g) / len(g), sum(at[i][1] for i in g) / len(g)
        gov = pts[g[0]].governs
        texts.append((", ".join(pts[i].label for i in g) + (" governs" if gov else ""), gov,
                      ACCENT if gov else INK))
        anchors.append((cx, cy))
        radii.append(MARK + max(((at[i][0] - cx) ** 2 + (at[i][1] - cy) ** 2) ** 0.5 for i in g))
        toward.append(None)
    named = len(texts)
    if len(shown) > 1:  # the curves' names, each where it stands apart from the others
        for (label, _), line in zip(ch.curves, shown):
            others = [o for o in shown if o is not line]
            spot = _apart(line, others, at)
            anchors.append(spot)
            radii.append(0.0)
            texts.append((label, False, SHAPE if line is shown[0] else GREY))
            # the upper curve named above it, a lower one below it (y grows down the page)
            below = any(q[1] < spot[1] for o in others for q in o if abs(q[0] - spot[0]) < 1.0)
            toward.append((240, 210, 270, 300, 180) if below else (60, 30, 90, 120, 0))
    sizes = []
    for text, bold, _ in texts:
        _small(pdf, LABEL_PT, bold)
        b = _labels.text_box(0, 0, pdf.width_of(text), LABEL_PT)
        sizes.append((b[2] - b[0], b[3] - b[1]))
    _small(pdf, 5.4)
    area = (px + 0.5, py - 4.0, px + pw, py + ph - 0.4)
    keep = [_labels.text_box(px - 1.0, py - 1.4, pdf.width_of(title), 5.4)]
    placed = _labels.place(anchors, sizes, LABEL_PT, area=area, lines=drawn, keep_out=keep,
                           radii=radii, toward=toward, lead=[i >= named for i in range(len(texts))])
    # no room in the chart: a number beside the point (placed by the same rule), the words in
    # a key under the chart
    left = [i for i, got in enumerate(placed) if got is None]
    _small(pdf, LABEL_PT, True)
    numbers = _labels.place(
        [anchors[i] for i in left],
        [(pdf.width_of(str(n + 1)), sizes[i][1]) for n, i in enumerate(left)], LABEL_PT,
        area=area, lines=drawn + [g.leader for g in placed if g and g.leader],
        keep_out=keep + [g.box for g in placed if g], radii=[radii[i] for i in left],
        lead=[i >= named for i in left])
    for i, got in enumerate(placed):
        if got is None:
            n = left.index(i)
            got = numbers[n]
            if got is None:
                continue
            got = _labels.Placed(got.x, got.baseline, got.box, got.leader)
            text = str(n + 1)
        else:
            text = texts[i][0]
        _, bold, colour = texts[i]
        _small(pdf, LABEL_PT, bold or text.isdigit())
        pdf.set_text_color(*colour)
        if got.leader is not None:
            pdf.set_draw_color(*colour)
            pdf.set_line_width(0.15)
            pdf.line(*got.leader)
            pdf.set_line_width(0.2)
        pdf.text(got.x, got.baseline, text)
    pdf.set_text_color(*GREY)
    _small(pdf, 5.2)
    lines = pdf.wrap(ch.caption, pw + 11.0)[:2]
    if left:
        lines += pdf.wrap("numbered above: " + "; ".join(
            f"{n + 1} {texts[i][0]}" + ("" if numbers[n] else " (no room to number it)")
            for n, i in enumerate(left)), pw + 11.0)
    pdf.lines_at(px - 9.0, py + ph + 6.2, lines, 2.1)
    pdf.set_text_color(*INK)
    pdf.set_draw_color(*RULE)
    pdf.set_fill_color(255, 255, 255)
    return max(0, len(lines) - 2) * 2.1


def _apart(line: list[tuple[float, float]], others: list,
           points: list[tuple[float, float]]) -> tuple[float, float]:
    """The point of a drawn curve, in the middle half of its run, furthest from the other
    curves and at least 6 mm from the column's points (its name goes there)."""
    def gap(p: tuple[float, float]) -> float:
        near = min((abs(p[1] - q[1]) for o in others for q in o if abs(q[0] - p[0]) < 1.0),
                   default=0.0)
        crowded = any((p[0] - a) ** 2 + (p[1] - b) ** 2 < 36.0 for a, b in points)
        return near - (100.0 if crowded else 0.0)

    inner = line[len(line) // 4: -(len(line) // 4) or None] or line
    return max(inner, key=gap)
