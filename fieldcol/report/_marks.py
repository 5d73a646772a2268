"""Markup (arrows, circles, labels) drawn over a photo on a report page, as vector lines.

The shapes are fractions of the upright photo (``fieldcol.store._markup``): scaled to the box the
photo was placed in, they land where they were drawn in the app.
"""

from __future__ import annotations

from typing import Any, Sequence

from fpdf import FPDF

from fieldcol.store._markup import EDGE_RGB, INK_RGB, arrow_head


def draw_markup(pdf: FPDF, shapes: Sequence[dict[str, Any]], x: float, y: float, w: float,
                h: float, font: str) -> None:
    """Draw ``shapes`` over the photo placed at ``x, y`` with size ``w x h`` (mm).

    Each line is drawn twice, dark and wide then bright and thin, so it reads on light and dark
    parts of a photo alike.

    Args:
        pdf: the document (the photo already drawn).
        shapes: checked markup shapes.
        x, y, w, h: the photo's box on the page, mm.
        font: the font family for labels.

    Example: ``draw_markup(pdf, photo.markup, 20, 40, 40, 30, "DejaVu")``.
    """
    side = min(w, h)
    scale = max(0.35, side / 60)  # line widths grow a little with the photo

    def at(p: Sequence[float]) -> tuple[float, float]:
        return x + p[0] * w, y + p[1] * h

    for colour, width in ((EDGE_RGB, 1.1 * scale), (INK_RGB, 0.55 * scale)):
        pdf.set_draw_color(*colour)
        pdf.set_fill_color(*colour)
        pdf.set_line_width(width)
        for s in shapes:
            if s["kind"] == "arrow":
                (x0, y0), (x1, y1) = at(s["from"]), at(s["to"])
                pdf.line(x0, y0, x1, y1)
                a, b = arrow_head((x0, y0), (x1, y1), 2.6 * scale)
                pdf.polygon([(x1, y1), a, b], style="DF")
            elif s["kind"] == "circle":
                cx, cy = at(s["at"])
                r = s["r"] * side
                pdf.ellipse(cx - r, cy - r, 2 * r, 2 * r, style="D")
    size = max(5.0, 7.5 * scale)
    pdf.set_font(font, "B", size)
    for s in shapes:
        if s["kind"] != "label":
            continue
        lx, ly = at(s["at"])
        tw = pdf.get_string_width(s["text"]) + 1.6
        th = size * 0.45
        lx = min(max(lx, x), x + w - tw) if tw < w else x  # a label stays on its photo
        ly = min(max(ly, y), y + h - th)
        pdf.set_fill_color(*EDGE_RGB)
        pdf.set_text_color(*INK_RGB)
        pdf.set_xy(lx, ly)
        pdf.cell(tw, th, s["text"], fill=True, align="C")
    pdf.set_text_color(20, 20, 20)
    pdf.set_draw_color(0, 0, 0)
    pdf.set_line_width(0.2)


__all__ = ["draw_markup"]
