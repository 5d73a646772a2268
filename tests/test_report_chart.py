"""The column curve on a column's sheet read back from the PDF as geometry: no word of the chart
(a point's label, a curve's name) overlaps another word, a line drawn on the page (a curve, an
axis, another label's leader) or a point's mark.

Outside references: pypdf (a general-purpose PDF library from PyPI) reads the page's text runs
and its path operators (ISO 32000-1 8.5.2: ``m``, ``l``, ``c``, ``re``; 9.4.2: ``Td``); the
width of each word comes from the bundled DejaVu Sans files' own advance widths (read by
fpdf2, which parses the TrueType tables), its height from the font's ascent and descent
(``chartlabels.text_box``). 1 pt = 25.4 / 72 mm.
"""

from __future__ import annotations

import re

import pypdf
import pytest
from fpdf import FPDF
from hypothesis import given, settings
from hypothesis import strategies as st
from pypdf.generic import ContentStream

from fieldcol.assess import assess
from fieldcol.report import site_report
from fieldcol.chartlabels import (boxes_meet, place, segment_meets_box, segments_cross,
                                     text_box)
from fieldcol.report._layout import ASSETS, FONT
from fieldcol.store import Store
from fieldcol.ui.check_model import check_summary

MM = 25.4 / 72  # mm per pt
PINNED = {"bottom": "pinned", "top": "pinned"}

#: columns whose points crowd each other, the curve or the axis title: three points close
#: together on a falling curve (a historic A7 W10), a square tube (strong and weak at the same
#: slenderness; its torsional point, reported for a closed section by the AISC 360-22 E4 user
#: note, at the top left by the axis title, where its label was once written over the
#: title), a stub (every point on the plateau), a very slender column (a point past Lc/r
#: 200), a round pipe; under EN 1993-1-1 a rolled I with two curves (b and c) close together,
#: a stub there, and a hollow section (one curve)
US = [("A2", "W10X49", "A7", "16 ft", "230 kip"),
      ("E1", "HSS6X6X3/8", "A500 Gr B", "12 ft", "150 kip"),
      ("S1", "W14X90", "A992", "2 ft", "300 kip"),
      ("L1", "W8X31", "A992", "38 ft", "20 kip"),
      ("P1", "Pipe6STD", "A53 Gr B", "12 ft", "80 kip")]
EN = [("K1", "HE 300 B", "4.5 m", "1500 kN"),
      ("K2", "HE 300 B", "1 m", "1500 kN"),
      ("K3", "HE 200 A", "7 m", "300 kN"),
      ("K4", {"shape": "rect", "d": "150 mm", "b": "150 mm", "t": "8 mm", "finish": "hot-finished"},
       "5 m", "500 kN")]


def _checked(store: Store, site, rec: dict) -> dict:
    col = store.add_column(site.id, rec)
    r = store.current_record(col.id)
    result = assess(r).to_dict()
    store.save_check(col.id, result, record=r)
    return result


@pytest.fixture(scope="module")
def reports(tmp_path_factory):
    """Both sites' reports: (pdf path, {tag: the check's result}, unit system) each."""
    root = tmp_path_factory.mktemp("chart")
    out = []
    with Store(root / "c.db") as store:
        us = store.add_site("Chart Yard", code="aisc360-22", unit_system="us")
        results = {tag: _checked(store, us, {
            "tag": tag, "section": sec, "material": mat, "length": length,
            "restraints": {"strong": PINNED, "weak": PINNED}, "demand": {"axial": load}})
            for tag, sec, mat, length, load in US}
        out.append((site_report(store, us.id, root / "us.pdf", report_date="2026-04-01"),
                    results, "us"))
        en = store.add_site("Chart Quay", code="en1993-1-1", unit_system="si")
        results = {tag: _checked(store, en, {
            "tag": tag, "section": sec, "material": "S355", "length": length,
            "code": "en1993-1-1", "restraints": {"strong": PINNED, "weak": PINNED},
            "demand": {"axial": load}}) for tag, sec, length, load in EN}
        out.append((site_report(store, en.id, root / "en.pdf", report_date="2026-04-01"),
                    results, "si"))
    return out


@pytest.fixture(scope="module")
def braced(tmp_path_factory):
    """Columns whose braces the side view labels: a strap too soft to count at mid-height, a
    single cable (tension only: not counted), a strut that counts at a third of the height
    (two half-waves, the shape swinging both ways past it); the report's path and tags."""
    root = tmp_path_factory.mktemp("braced")
    with Store(root / "b.db") as store:
        site = store.add_site("Brace Yard", code="aisc360-22", unit_system="us")
        base = {"section": "W14X90", "material": "A992", "length": "24 ft",
                "demand": {"axial": "500 kip"}}
        weak = {"S1": [{"at": "12 ft", "stiffness": "0.6 kip/in"}],
                "S2": [{"at": "12 ft", "cable": {"area": "0.6 in^2", "length": "18 ft",
                                                 "angle": "40 deg"}}],
                "S3": [{"at": "8 ft"}]}
        for tag, braces in weak.items():
            _checked(store, site, {"tag": tag, **base, "restraints": {
                "strong": PINNED, "weak": {**PINNED, "braces": braces}}})
        out = site_report(store, site.id, root / "b.pdf", report_date="2026-04-01")
    return out, list(weak)


def test_a_braces_words_never_cross_the_column_or_its_buckled_shape(braced):
    """The side view names each brace beside its line ("strap", "cable, not counted"): the
    words keep off the column's own line and the first buckled shape drawn over it."""
    path, tags = braced
    reader = pypdf.PdfReader(path)
    texts = [re.sub(r"\s+", " ", p.extract_text()) for p in reader.pages]
    for tag in tags:
        index = next(i for i, t in enumerate(texts) if re.search(rf"Column {tag} ", t)
                     and "Side view" in t)
        runs, segments, _ = _page_geometry(reader, index)
        words = [r for r in runs if r[3] == pytest.approx(5.2)
                 and re.fullmatch(r"(strut|cable|strap|rod)(, not)?|counted|not counted", r[0])]
        assert words, (tag, [r[0] for r in runs if r[3] < 6])
        for text, box, _, _ in words:
            inner = (box[0] + 0.05, box[1] + 0.05, box[2] - 0.05, box[3] - 0.05)
            for seg in segments:
                # the brace's own line runs along the top of its words: horizontal lines
                # aside, nothing drawn (the column, its shape) passes through them
                if abs(seg[1] - seg[3]) > 0.05:
                    assert not segment_meets_box(seg, inner), (tag, text, seg)


def _widths():
    pdf = FPDF(unit="mm")
    pdf.add_font(FONT, "", str(ASSETS / "fonts" / "DejaVuSans.ttf"))
    pdf.add_font(FONT, "B", str(ASSETS / "fonts" / "DejaVuSans-Bold.ttf"))

    def width(text: str, bold: bool, size: float) -> float:
        pdf.set_font(FONT, "B" if bold else "", size)
        return pdf.get_string_width(text)
    return width


def _page_geometry(reader: pypdf.PdfReader, index: int):
    """A page's text runs ``(text, box, bold, size)`` and its drawn pieces: straight segments
    and the boxes of curved paths (the points' marks), in mm with y down the page."""
    page = reader.pages[index]
    height = float(page.mediabox.height)
    width = _widths()
    runs = []

    def visit(text, cm, tm, font, size):
        if text.strip() and font is not None:
            bold = "Bold" in str(font.get("/BaseFont", ""))
            x, base = tm[4] * MM, (height - tm[5]) * MM
            runs.append((text, text_box(x, base, width(text, bold, size), size), bold, size))

    page.extract_text(visitor_text=visit)
    segments, marks = [], []
    here = start = None
    curve: list[tuple[float, float]] = []
    for operands, op in ContentStream(page.get_contents(), reader).operations:
        pts = [(float(operands[i]) * MM, (height - float(operands[i + 1])) * MM)
               for i in range(0, len(operands) - 1, 2)] if op in (b"m", b"l", b"c") else []
        if op == b"m":
            here = start = pts[0]
            curve = [pts[0]]
        elif op == b"l":
            segments.append((*here, *pts[0]))
            here = pts[0]
            curve.append(pts[0])
        elif op == b"c":
            curve += pts
            here = pts[-1]
            marks.append(curve)
        elif op == b"re":
            x, y, w, h = (float(v) * MM for v in operands)
            y = height * MM - y
            for a, b in (((x, y), (x + w, y)), ((x + w, y), (x + w, y - h)),
                         ((x + w, y - h), (x, y - h)), ((x, y - h), (x, y))):
                segments.append((*a, *b))
        elif op == b"h" and here is not None and start is not None:
            segments.append((*here, *start))
    mark_boxes = [(min(p[0] for p in c), min(p[1] for p in c), max(p[0] for p in c),
                   max(p[1] for p in c)) for c in marks if len(c) > 4]
    return runs, segments, mark_boxes


def _chart_words(result: dict, system: str) -> set[str]:
    ch = check_summary(result, system).chart
    words = {p.label + (" governs" if p.governs else "") for p in ch.points}
    if len(ch.curves) > 1:
        words |= {label for label, _ in ch.curves}
    return words


@pytest.mark.parametrize("which", [0, 1])
def test_no_word_of_a_column_curve_overlaps_another_word_a_line_or_a_point(reports, which):
    path, results, system = reports[which]
    reader = pypdf.PdfReader(path)
    texts = [re.sub(r"\s+", " ", p.extract_text()) for p in reader.pages]
    seen = 0
    for tag, result in results.items():
        words = _chart_words(result, system)
        index = next(i for i, t in enumerate(texts) if re.search(rf"Column {re.escape(tag)} ", t)
                     and "Column curve and this column" in t)
        runs, segments, marks = _page_geometry(reader, index)
        # points whose marks touch share a label: "strong (x), weak (y)"
        labels = [r for r in runs if r[3] == pytest.approx(5.4)
                  and set(r[0].split(", ")) <= words]
        # every word of the chart is written inside it (none sent to a numbered key)
        assert {w for r in labels for w in r[0].split(", ")} == words, (tag, words, labels)
        assert "numbered above" not in texts[index]
        for text, box, _, _ in labels:
            # a hair inside the box: a leader line ends on its own label's edge
            inner = (box[0] + 0.05, box[1] + 0.05, box[2] - 0.05, box[3] - 0.05)
            for other in runs:
                if other[0] != text:
                    assert not boxes_meet(inner, other[1]), (tag, text, other[0])
            for seg in segments:
                assert not segment_meets_box(seg, inner), (tag, text, seg)
            for m in marks:
                assert not boxes_meet(inner, m), (tag, text, m)
            seen += 1
    assert seen >= len(results)


def test_a_code_with_two_curves_names_each_on_the_chart(reports):
    """EN 1993-1-1 Table 6.2: a rolled I with h/b <= 1.2 and tf <= 100 mm buckles on curve b
    about y-y and curve c about z-z; both curves are drawn, so each is named beside it (a
    grey line and a blue one told apart by colour alone would not do)."""
    path, results, system = reports[1]
    ch = check_summary(results["K1"], system).chart
    assert [label for label, _ in ch.curves] == ["curve b (y-y)", "curve c (z-z)"]
    reader = pypdf.PdfReader(path)
    index = next(i for i, p in enumerate(reader.pages) if "Column K1 " in p.extract_text())
    runs, segments, _ = _page_geometry(reader, index)
    for name in ("curve b (y-y)", "curve c (z-z)"):
        box = next(r[1] for r in runs if r[0] == name)
        # its leader line touches the label: a segment with an end on the box's edge
        assert any(min(abs(s[2] - box[0]), abs(s[2] - box[2])) < 0.02 or
                   min(abs(s[3] - box[1]), abs(s[3] - box[3])) < 0.02
                   for s in segments if box[0] - 0.02 <= s[2] <= box[2] + 0.02
                   and box[1] - 0.02 <= s[3] <= box[3] + 0.02), name


def _never_meet(got, area, marks, lines):
    placed = [p for p in got if p is not None]
    for i, p in enumerate(placed):
        assert area[0] <= p.box[0] and p.box[2] <= area[2]
        assert area[1] <= p.box[1] and p.box[3] <= area[3]
        assert not any(boxes_meet(p.box, m) for m in marks)
        assert not any(segment_meets_box(s, p.box) for s in lines)
        for q in placed[i + 1:]:
            assert not boxes_meet(p.box, q.box)
            if q.leader is not None:
                assert not segment_meets_box(q.leader, p.box)
            if p.leader is not None:
                assert not segment_meets_box(p.leader, q.box)
            if p.leader and q.leader:
                assert not segments_cross(p.leader, q.leader)
    return placed


def test_labels_of_points_close_together_never_overlap():
    """Three points 2 mm apart on a falling line and two more names: each has a place and none
    meets another, a mark, the line or another's leader; six labels on one point in a chart
    too small for them: those left out are said (None: the sheet keys them by number) and the
    rest still never meet."""
    size = 5.4
    sizes = [(w, text_box(0, 0, w, size)[3] - text_box(0, 0, w, size)[1])
             for w in (9.0, 14.0, 7.5, 12.0, 10.0, 8.0)]
    line = [(2.0 * i, 5.0 + i * 0.5, 2.0 * (i + 1), 5.0 + (i + 1) * 0.5) for i in range(30)]
    points = [(20.0, 10.0), (22.0, 10.5), (24.0, 11.0), (30.0, 12.5), (40.0, 15.0)]
    radii = [0.9, 0.9, 0.9, 0.0, 0.0]
    got = place(points, sizes[:5], size, area=(0, 0, 60, 40), lines=line, keep_out=[],
                radii=radii, lead=[False, False, False, True, True])
    marks = [(x - 0.9, y - 0.9, x + 0.9, y + 0.9) for x, y in points[:3]]
    assert len(_never_meet(got, (0, 0, 60, 40), marks, line)) == 5
    assert got[3].leader is not None and got[4].leader is not None  # names touch their line
    got = place([(22.0, 20.0)] * 6, sizes, size, area=(15, 15, 30, 25), lines=line,
                keep_out=[], radii=[0.9] * 6)
    assert 0 < len(_never_meet(got, (15, 15, 30, 25), [(21.1, 19.1, 22.9, 20.9)], line)) < 6


def test_the_geometry_helpers_agree_with_hand_cases():
    # by hand: a diagonal through a square's middle meets it; a line beside it does not
    assert segment_meets_box((0, 0, 10, 10), (4, 4, 6, 6))
    assert not segment_meets_box((0, 0, 10, 0), (4, 1, 6, 2))
    assert not segment_meets_box((4, 4, 4, 8), (4, 4, 6, 6))  # along an edge only
    assert segments_cross((0, 0, 2, 2), (0, 2, 2, 0))
    assert not segments_cross((0, 0, 1, 1), (1, 1, 2, 0))
    assert not boxes_meet((0, 0, 1, 1), (1, 0, 2, 1))
    assert boxes_meet((0, 0, 1, 1), (1, 0, 2, 1), 0.1)
    # 7.2 pt is 2.54 mm (1 pt = 1/72 in): 0.76 of it above the baseline, 0.24 below
    assert text_box(10, 20, 12, 7.2) == pytest.approx((10, 20 - 0.76 * 2.54, 22, 20 + 0.24 * 2.54))



@settings(max_examples=60, deadline=None, derandomize=True)
@given(points=st.lists(st.tuples(st.floats(2, 58), st.floats(2, 38)), min_size=1, max_size=6),
       heights=st.lists(st.floats(0, 40), min_size=2, max_size=12),
       widths=st.lists(st.floats(3, 20), min_size=6, max_size=6))
def test_placed_labels_never_meet_whatever_the_chart(points, heights, widths):
    """Any points, any line across the chart: whatever is placed meets nothing (another
    label, a leader, a mark, the line) and lies inside the chart; a label left out is None."""
    size, area = 5.4, (0.0, 0.0, 60.0, 40.0)
    step = 60.0 / (len(heights) - 1)
    line = [(i * step, a, (i + 1) * step, b) for i, (a, b) in enumerate(zip(heights,
                                                                             heights[1:]))]
    sizes = [(w, text_box(0, 0, w, size)[3] - text_box(0, 0, w, size)[1])
             for w in widths[:len(points)]]
    got = place(points, sizes, size, area=area, lines=line, keep_out=[(0, 0, 8, 2)],
                radii=[0.9] * len(points))
    assert len(got) == len(points)
    marks = [(x - 0.9, y - 0.9, x + 0.9, y + 0.9) for x, y in points]
    for i, p in enumerate(got):
        if p is None:
            continue
        assert not boxes_meet(p.box, (0, 0, 8, 2))
        # its own mark too: a label never covers a point, its own or another's
        _never_meet([p], area, marks, line)
        for q in got[i + 1:]:
            if q is not None:
                _never_meet([p, q], area, [], [])
