"""The app's column curve (``ui._drawing.curve_canvas``) read back as geometry: the governing
point's words keep off the curves, the axes, the points' marks and the words already written,
for a very slender, a middling and a stocky column under AISC 360-22 and EN 1993-1-1.

Outside references: each column's slenderness from its section's radius of gyration in the
published tables (AISC Shapes Database v15.0: W8X31 ry 2.02 in, W10X49 ry 2.54 in, W14X90
ry 3.70 in; EN 10365: HE 200 A iz 49.8 mm, HE 300 B iz 75.8 mm; from memory, and checked
below against the check's own Lc/r so a wrong recollection fails here, not silently); the
width of the words from the bundled DejaVu Sans Bold's own advance widths (read by Pillow,
which parses the TrueType tables): a wide face, so the client's own font is no wider.
"""

from __future__ import annotations

import flet.canvas as cv
import pytest
from PIL import ImageFont

from fieldcol.assess import assess
from fieldcol.chartlabels import boxes_meet, segment_meets_box, segments_touch
from fieldcol.report._layout import ASSETS
from fieldcol.ui._drawing import LINE, SHAPE, curve_canvas, text_width
from fieldcol.ui.views import GRID
from fieldcol.ui.check_model import check_summary

PINNED = {"bottom": "pinned", "top": "pinned"}
BOLD = ImageFont.truetype(str(ASSETS / "DejaVuSans-Bold.ttf"), 16)

#: (code, section, material, length, load, the governing slenderness expected, within 3 %):
#: Lc/r = L / ry for AISC, lambda-bar = L / iz / (93.9 eps) with eps = sqrt(235 / 355) for
#: S355 (EN 1993-1-1 6.3.1.3)
CASES = [
    ("aisc360-22", "W8X31", "A992", "32 ft", "10 kip", 384 / 2.02),
    ("aisc360-22", "W10X49", "A992", "16 ft", "150 kip", 192 / 2.54),
    ("aisc360-22", "W14X90", "A992", "6 ft 2 in", "300 kip", 74 / 3.70),
    ("en1993-1-1", "HE 200 A", "S355", "9.46 m", "50 kN", 9460 / 49.8 / (93.9 * 0.8136)),
    ("en1993-1-1", "HE 300 B", "S355", "4.5 m", "1500 kN", 4500 / 75.8 / (93.9 * 0.8136)),
    ("en1993-1-1", "HE 300 B", "S355", "1.5 m", "1500 kN", 1500 / 75.8 / (93.9 * 0.8136)),
]


def _chart(code: str, section: str, material: str, length: str, load: str):
    rec = {"tag": "T1", "section": section, "material": material, "length": length,
           "code": code, "restraints": {"strong": PINNED, "weak": PINNED},
           "demand": {"axial": load}}
    return check_summary(assess(rec).to_dict(), "us" if code == "aisc360-22" else "si").chart


def _geometry(canvas: cv.Canvas):
    """The canvas's curves, axes and ticks as segments (the grid left out), the governing label's leader (a line
    in the governing colour), its marks as boxes, its words with their width from the font's
    advance widths."""
    segments, leader, marks, words = [], [], [], []
    for s in canvas.shapes:
        if isinstance(s, cv.Path):
            pts = [(e.x, e.y) for e in s.elements]
            segments += [(*a, *b) for a, b in zip(pts, pts[1:])]
        elif isinstance(s, cv.Line):
            if s.paint.color != GRID:   # the faint grid may run under words and leaders
                (leader if s.paint.color == SHAPE else segments).append(
                    (s.x1, s.y1, s.x2, s.y2))
        elif isinstance(s, cv.Circle):
            r = s.radius + 1  # half the ring's stroke
            marks.append((s.x - r, s.y - r, s.x + r, s.y + r))
        elif isinstance(s, cv.Text):
            words.append((s, BOLD.getlength(s.value)))
    return segments, leader, marks, words


@pytest.mark.parametrize("case", CASES, ids=lambda c: f"{c[0]}-{c[1]}-{c[3]}")
def test_the_governing_words_keep_off_every_curve_point_and_word(case):
    code, section, material, length, load, slender = case
    chart = _chart(code, section, material, length, load)
    weak = next(p for p in chart.points if p.label.startswith("weak"))
    assert weak.x == pytest.approx(slender, rel=0.03)   # (a stocky I may govern in twist)
    canvas = curve_canvas(chart, width=340, height=250)
    segments, leader, marks, words = _geometry(canvas)
    label = [(t, w) for t, w in words if t.value.endswith(": governs")]
    assert len(label) == 1, [t.value for t, _ in words]
    (t, w), = label
    # the estimate the placer was given holds the words as the font draws them
    assert w <= text_width(t.value, 16)
    box = (t.x, t.y, t.x + w, t.y + LINE * 16)
    assert 0 <= box[0] and box[2] <= 340 and 0 <= box[1] and box[3] <= 250
    for s in segments:
        assert not segment_meets_box(s, box), (t.value, box, s)
    for m in marks:
        assert not boxes_meet(box, m), (t.value, box, m)
    for other, ow in words:
        if other is t:
            continue
        # an aligned word's box from its anchor: the tick numbers and curve names are set
        # right or centred on their point
        ax = {"TOP_RIGHT": other.x - ow, "TOP_CENTER": other.x - ow / 2}.get(
            _align(other), other.x)
        assert not boxes_meet(box, (ax, other.y, ax + ow, other.y + LINE * 16)), \
            (t.value, other.value)
    for s in leader:   # a leader crosses no line drawn
        assert not any(segments_touch(_from_mark(s), c) for c in segments), s


def _align(t: cv.Text) -> str:
    a = t.alignment
    for name in ("TOP_RIGHT", "TOP_CENTER"):
        if a == getattr(__import__("flet").Alignment, name):
            return name
    return "TOP_LEFT"


def _from_mark(s):
    """A leader less its first px, which starts at the point's own mark (on the curve)."""
    import math
    n = math.hypot(s[2] - s[0], s[3] - s[1]) or 1.0
    k = min(1.0 / n, 0.5)
    return (s[0] + (s[2] - s[0]) * k, s[1] + (s[3] - s[1]) * k, s[2], s[3])
