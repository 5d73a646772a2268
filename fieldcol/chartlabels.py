"""Where the words of a chart go: each label beside its point, clear of the curves, the axes,
the other points, the other labels and the axis title; further off with a leader line where the
room beside it is taken; and, where no place in the chart is free, a numbered key under it.

Plain geometry in millimetres (y downwards, as fpdf2 and a Flet canvas place things), so the
same rule can be checked without drawing anything (``tests/test_report_chart.py``). Both faces
use it: the report's column curve in the page's mm and pt, the app's (``ui._drawing``) in its
logical pixels taken as 1 px = 25.4 / 96 mm = 0.75 pt, so the rings, the gap and the grid keep
the same size to the eye on paper and on screen. It imports nothing of either face.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Iterable, Iterator, Sequence

#: x0, y0, x1, y1 with x0 <= x1 and y0 <= y1 (mm)
Box = tuple[float, float, float, float]
#: x0, y0, x1, y1: a straight piece of a line drawn on the chart (mm)
Segment = tuple[float, float, float, float]

#: how far from its point a label is tried, beyond the point's own mark (mm): the first rings
#: sit beside the point; from ``LEADER_FROM`` on a thin line joins label and point
RINGS = (0.4, 1.0, 1.8, 2.8, 4.0, 5.5, 7.5, 10.0, 13.0, 17.0, 22.0, 28.0, 36.0)
LEADER_FROM = 1.9
#: the longest leader that may cross a line drawn, where no other place is free (mm)
CROSS_UP_TO = 5.5
#: the gap kept round every label (mm): touching words read as one
PAD = 0.3
#: directions tried at each distance, in this order (degrees, 0 = right, 90 = up the page):
#: up and to the right first, where a falling column curve leaves the chart empty
ANGLES = (30, 0, 60, 90, 330, 120, 150, 300, 180, 270, 210, 240, 15, 45, 75, 105, 345, 315)


@dataclass(frozen=True)
class Placed:
    """One label as placed: where its text starts (``x``, ``baseline``), the box its letters
    fill, and the leader line from its point to the box (None beside the point)."""
    x: float
    baseline: float
    box: Box
    leader: Segment | None


def text_box(x: float, baseline: float, width: float, size_pt: float) -> Box:
    """The box a line of text fills, from its ascenders to its descenders.

    DejaVu Sans reaches 0.76 em above the baseline (capitals, ascenders, brackets) and 0.24 em
    below it (the font's own metrics, rounded up); 1 pt = 25.4 / 72 mm.

    Example:
        >>> [round(v, 3) for v in text_box(10, 20, 12, 7.2)]
        [10, 18.07, 22, 20.61]
    """
    em = size_pt * 25.4 / 72
    return (x, baseline - 0.76 * em, x + width, baseline + 0.24 * em)


def boxes_meet(a: Box, b: Box, pad: float = 0.0) -> bool:
    """True when two boxes, each grown by ``pad``, overlap (touching edges do not count).

    Example:
        >>> boxes_meet((0, 0, 1, 1), (1, 0, 2, 1)), boxes_meet((0, 0, 1, 1), (0.5, 0.5, 2, 2))
        (False, True)
    """
    return (a[0] - pad < b[2] and b[0] - pad < a[2]
            and a[1] - pad < b[3] and b[1] - pad < a[3])


def segment_meets_box(s: Segment, b: Box, pad: float = 0.0) -> bool:
    """True when a straight segment passes through the inside of a box grown by ``pad``
    (Liang-Barsky clipping; a segment that only touches an edge does not count).

    Example:
        >>> segment_meets_box((0, 0, 10, 10), (4, 4, 6, 6)), segment_meets_box(
        ...     (0, 0, 10, 0), (4, 1, 6, 2))
        (True, False)
    """
    x0, y0, x1, y1 = b[0] - pad, b[1] - pad, b[2] + pad, b[3] + pad
    ax, ay, bx, by = s
    dx, dy = bx - ax, by - ay
    t0, t1 = 0.0, 1.0
    for p, q in ((-dx, ax - x0), (dx, x1 - ax), (-dy, ay - y0), (dy, y1 - ay)):
        if p == 0:
            if q <= 0:
                return False
            continue
        r = q / p
        if p < 0:
            t0 = max(t0, r)
        else:
            t1 = min(t1, r)
        if t0 >= t1:
            return False
    return True


def segments_cross(a: Segment, b: Segment) -> bool:
    """True when two segments cross at a point inside both (sharing an end does not count).

    Example:
        >>> segments_cross((0, 0, 2, 2), (0, 2, 2, 0)), segments_cross((0, 0, 1, 1), (1, 1, 2, 0))
        (True, False)
    """
    def side(px: float, py: float, qx: float, qy: float, rx: float, ry: float) -> float:
        return (qx - px) * (ry - py) - (qy - py) * (rx - px)

    d1 = side(b[0], b[1], b[2], b[3], a[0], a[1])
    d2 = side(b[0], b[1], b[2], b[3], a[2], a[3])
    d3 = side(a[0], a[1], a[2], a[3], b[0], b[1])
    d4 = side(a[0], a[1], a[2], a[3], b[2], b[3])
    return d1 * d2 < 0 and d3 * d4 < 0


def segments_touch(a: Segment, b: Segment) -> bool:
    """True when two segments have any point in common (an end on the other, or passing
    through its corner, counts).

    Example:
        >>> segments_touch((0, 0, 2, 0), (1, 0, 1, 5)), segments_touch((0, 0, 1, 0), (2, 0, 3, 1))
        (True, False)
    """
    def side(px: float, py: float, qx: float, qy: float, rx: float, ry: float) -> float:
        return (qx - px) * (ry - py) - (qy - py) * (rx - px)

    def within(p: float, q: float, r: float) -> bool:
        return min(p, q) - 1e-9 <= r <= max(p, q) + 1e-9

    d1 = side(b[0], b[1], b[2], b[3], a[0], a[1])
    d2 = side(b[0], b[1], b[2], b[3], a[2], a[3])
    d3 = side(a[0], a[1], a[2], a[3], b[0], b[1])
    d4 = side(a[0], a[1], a[2], a[3], b[2], b[3])
    if d1 * d2 < 0 and d3 * d4 < 0:
        return True
    for d, (px, py), (qx, qy), (rx, ry) in (
            (d1, b[:2], b[2:], a[:2]), (d2, b[:2], b[2:], a[2:]),
            (d3, a[:2], a[2:], b[:2]), (d4, a[:2], a[2:], b[2:])):
        if abs(d) < 1e-12 and within(px, qx, rx) and within(py, qy, ry):
            return True
    return False


def _leader(ax: float, ay: float, mark: float, box: Box) -> Segment:
    """From the edge of the point's mark to the nearest point of the label's box."""
    nx, ny = min(max(ax, box[0]), box[2]), min(max(ay, box[1]), box[3])
    d = math.hypot(nx - ax, ny - ay) or 1.0
    return (ax + (nx - ax) * mark / d, ay + (ny - ay) * mark / d, nx, ny)


def place(anchors: Sequence[tuple[float, float]], sizes: Sequence[tuple[float, float]],
          size_pt: float, *, area: Box, lines: Sequence[Segment], keep_out: Sequence[Box],
          radii: Sequence[float], toward: Sequence[Sequence[int] | None] | None = None,
          lead: Sequence[bool] | None = None) -> list[Placed | None]:
    """Labels placed in turn, each as near its point as the room allows.

    A place is taken when the label's box lies inside ``area`` and, grown by ``PAD``, meets no
    line drawn (``lines``: curves, axes), no box to keep clear (``keep_out``: the axis title),
    no point's mark, no label placed before it nor its leader; a leader line meets no other
    label or mark and crosses no other leader nor any line drawn. Beside the point first,
    then at growing distances (``RINGS``) in the directions of ``ANGLES``, then anywhere in
    the area, nearest first; only where none of those is free may a short leader (up to
    ``CROSS_UP_TO``) cross a line. Where that leaves a label out, every label is placed again
    on a leader, and that placing is kept if it leaves fewer out.

    Args:
        anchors: each label's point (mm).
        sizes: each label's box, ``(width, height)`` (mm; ``text_box`` gives it).
        size_pt: the labels' font size (pt), to put the baseline within the box.
        area: where labels may go (the plot inside its axes).
        lines: the segments drawn on the chart.
        keep_out: boxes already written (the axis title).
        radii: per label, the radius of its point's mark (mm; a group of points close
            together: the circle round them all); 0 for a label on a line (a curve's name).
        toward: per label, the directions to try first (degrees, as ``ANGLES``; None: those).
        lead: per label, True where it always takes a leader line (a curve's name: the line
            touches the curve it names, so two curves close together are never confused).

    Returns:
        One ``Placed`` per label, in the order given; None where no place is free (the caller
        keys that label by number under the chart).

    Example:
        >>> p = place([(20, 20)], [(10, 2)], 5.4, area=(0, 0, 60, 40), lines=[], keep_out=[],
        ...           radii=[0.9])
        >>> p[0].leader is None and p[0].box[0] > 20
        True
    """
    got = _place(anchors, sizes, size_pt, area, lines, keep_out, radii, toward, lead)
    if None in got:
        # words set close round their points can close a later point in: every label on a
        # leader instead, kept if it places more of them
        again = _place(anchors, sizes, size_pt, area, lines, keep_out, radii, toward,
                       [True] * len(anchors))
        if again.count(None) < got.count(None):
            return again
    return got


def _place(anchors: Sequence[tuple[float, float]], sizes: Sequence[tuple[float, float]],
           size_pt: float, area: Box, lines: Sequence[Segment], keep_out: Sequence[Box],
           radii: Sequence[float], toward: Sequence[Sequence[int] | None] | None,
           lead: Sequence[bool] | None) -> list[Placed | None]:
    em = size_pt * 25.4 / 72
    marks = [(ax - r, ay - r, ax + r, ay + r) for (ax, ay), r in zip(anchors, radii)]
    taken: list[Box] = list(keep_out)
    leaders: list[Segment] = []
    out: list[Placed | None] = []
    for i, ((ax, ay), (w, h)) in enumerate(zip(anchors, sizes)):
        # marks over this one (points at almost the same place) stand aside for its leader,
        # which starts inside them; its words still keep clear of them
        others = [m for j, m in enumerate(marks) if j != i and radii[j]]
        apart = [m for m in others if not boxes_meet(m, marks[i])]
        first = tuple((toward or [None] * len(anchors))[i] or ())
        angles = first + tuple(a for a in ANGLES if a not in first)
        rings = RINGS if not (lead and lead[i]) else tuple(r for r in RINGS if r >= LEADER_FROM)
        short = tuple(r for r in rings if r <= CROSS_UP_TO)
        got = None
        # each made only as far as it is asked for: most labels sit beside their point, and
        # the grid's thousands of places are seldom needed
        for boxes, strict in ((_ring_boxes(ax, ay, w, h, radii[i], angles, rings), True),
                              (_grid_boxes(ax, ay, w, h, area), True),
                              (_ring_boxes(ax, ay, w, h, radii[i], angles, short), False)):
            got = _first_free(ax, ay, em, boxes, area, lines, taken, leaders, others, apart,
                              radii[i], strict)
            if got is not None:
                break
        out.append(got)
        if got is not None:
            taken.append(got.box)
            if got.leader is not None:
                leaders.append(got.leader)
    return out


def _ring_boxes(ax: float, ay: float, w: float, h: float, mark: float,
                angles: Sequence[int], rings: Sequence[float]) -> Iterator[tuple[Box, float]]:
    """Boxes round a point: at each distance beyond its mark, one per direction, the box's
    nearest corner (or the middle of its nearest side) there: to the right a label starts
    there, to the left it ends there. Each with that distance."""
    for ring in rings:
        for deg in angles:
            c, s = math.cos(math.radians(deg)), -math.sin(math.radians(deg))
            ox, oy = ax + c * (mark + ring), ay + s * (mark + ring)
            x0 = ox if c > 0.38 else ox - w if c < -0.38 else ox - w / 2
            y0 = oy if s > 0.38 else oy - h if s < -0.38 else oy - h / 2
            yield (x0, y0, x0 + w, y0 + h), ring


def _grid_boxes(ax: float, ay: float, w: float, h: float,
                area: Box) -> Iterator[tuple[Box, float]]:
    """Every place in the area on a grid of 1 mm across and 0.5 mm down, nearest the point
    first (where the rings found nothing free: a crowded chart)."""
    out = []
    nx, ny = int((area[2] - area[0] - w) / 1.0), int((area[3] - area[1] - h) / 0.5)
    for i in range(max(nx, -1) + 1):
        for j in range(max(ny, -1) + 1):
            x0, y0 = area[0] + i * 1.0, area[1] + j * 0.5
            box = (x0, y0, x0 + w, y0 + h)
            nx_, ny_ = min(max(ax, box[0]), box[2]), min(max(ay, box[1]), box[3])
            out.append((box, max(LEADER_FROM, math.hypot(nx_ - ax, ny_ - ay))))
    out.sort(key=lambda b: b[1])
    yield from out


def _crosses_a_line(lead: Segment, lines: Sequence[Segment]) -> bool:
    """True when a leader meets a line drawn anywhere past its first 0.1 mm (it may start on
    the line it names; passing through a corner of a curve counts as crossing it)."""
    x0, y0, x1, y1 = lead
    n = math.hypot(x1 - x0, y1 - y0) or 1.0
    t = min(0.1 / n, 0.5)
    short = (x0 + (x1 - x0) * t, y0 + (y1 - y0) * t, x1, y1)
    return any(segments_touch(short, seg) for seg in lines)


def _first_free(ax: float, ay: float, em: float, boxes: Iterable[tuple[Box, float]],
                area: Box, lines: Sequence[Segment], taken: Sequence[Box],
                leaders: Sequence[Segment], marks: Sequence[Box], apart: Sequence[Box],
                mark: float, strict: bool) -> Placed | None:
    """The first box of ``boxes`` that is free (see ``place``), with its leader if any."""
    for box, ring in boxes:
        if box[0] < area[0] or box[1] < area[1] or box[2] > area[2] or box[3] > area[3]:
            continue
        if any(boxes_meet(box, t, PAD) for t in taken) or \
                any(boxes_meet(box, m, PAD) for m in marks) or \
                boxes_meet(box, (ax - mark, ay - mark, ax + mark, ay + mark), PAD) or \
                any(segment_meets_box(seg, box, PAD) for seg in lines
                    # (a segment wholly beside the box cannot meet it: skipped cheaply)
                    if min(seg[0], seg[2]) < box[2] + PAD and max(seg[0], seg[2]) > box[0] - PAD
                    and min(seg[1], seg[3]) < box[3] + PAD
                    and max(seg[1], seg[3]) > box[1] - PAD) or \
                any(segment_meets_box(seg, box, PAD) for seg in leaders):
            continue
        lead = _leader(ax, ay, mark, box) if ring >= LEADER_FROM else None
        if lead is not None and (
                any(segment_meets_box(lead, t) for t in taken)
                or any(segment_meets_box(lead, m) for m in apart)
                or any(segments_cross(lead, seg) for seg in leaders)
                or (strict and _crosses_a_line(lead, lines))):
            continue
        return Placed(box[0], box[3] - 0.24 * em, box, lead)
    return None


__all__ = ["Box", "Placed", "Segment", "boxes_meet", "place", "segment_meets_box",
           "segments_cross", "segments_touch", "text_box"]
