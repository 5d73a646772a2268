"""The demo report read as a reviewing engineer reads it, for what such a reader flags: a
reading cut from its unit at a line's end, a calculation step that reads as a wrong equation,
a finding taken for part of the check, a photo's time written another way than the rest.

Outside references: pypdf (a general-purpose PDF library from PyPI) reads the pages back, line
by line as a reader sees them; AISC 360-22 Symbols for E = 29,000 ksi and G = 11,200 ksi.
"""

from __future__ import annotations

import re

import pypdf
import pytest

from fieldcol.report._column_sheet import FINDINGS_NOTE, _with_formula


def _flat(text: str) -> str:
    return re.sub(r"\s+", " ", text).strip()


@pytest.fixture(scope="module")
def report(demo_report_pdf):
    """The demo site's report: each page's lines as pypdf reads them."""
    return [p.extract_text().split("\n") for p in pypdf.PdfReader(demo_report_pdf).pages]


#: a line that ends on a bare number, and one that starts with a fraction or a unit
ENDS_ON_NUMBER = re.compile(r"(?:^|\s)[(\['\"]?\d[\d.,]*$")
STARTS_WITH_UNIT = re.compile(r"^(?:\d+/\d+|in|mm|ft|kips?|ksi|MPa|kN)\b")


def test_a_number_is_never_cut_from_its_fraction_or_unit(report):
    """"1 1/8 in" cut after the 1 reads as a bow of 1 in and another of 1/8 in; "300" at the
    end of a line and "mm" at the start of the next is a number without its unit."""
    cut = [(page, a[-30:], b[:20]) for page, lines in enumerate(report, start=1)
           for a, b in zip(lines, lines[1:])
           if ENDS_ON_NUMBER.search(a.rstrip()) and STARTS_WITH_UNIT.match(b.lstrip())]
    assert not cut, cut
    # the demo's bow finding does wrap in the findings register: its reading stays whole
    text = " ".join(" ".join(lines) for lines in report)
    assert "1 1/8 in over 16 ft" in _flat(text)


def test_the_wrapping_keeps_a_reading_whole_at_any_width():
    from fieldcol import CAUTION
    from fieldcol.report._layout import ReportPDF

    pdf = ReportPDF(paper="A4", site_name="Yard", report_date="2026-04-01", caution=CAUTION)
    pdf.set_font("DejaVu", "", 9)
    text = "Column visibly bowed about the weak axis: 1 1/8 in over 16 ft, stiffness 48.15 kip/in"
    for width in range(20, 120, 3):
        lines = pdf.wrap(text, width)
        assert " ".join(lines) == text
        for a, b in zip(lines, lines[1:]):
            assert not (ENDS_ON_NUMBER.search(a) and STARTS_WITH_UNIT.match(b)), (width, lines)


@pytest.mark.parametrize("what, formula, clause, shown", [
    # the source alone, once: not "(record) [record]"
    ("required axial strength (given)", "record", "record", "required axial strength (given)"),
    ("effective length factor", "table", "AISC 360-22 Commentary Table C-A-7.1",
     "effective length factor (table)"),
    # a statement with its own symbol: not "elastic modulus = E = 29,000 ksi"
    ("elastic modulus", "E = 29,000 ksi, G = 11,200 ksi as AISC 360-22 states them", "x",
     "elastic modulus: E = 29,000 ksi, G = 11,200 ksi as AISC 360-22 states them"),
    # a list of values: not "divides the utilization = minimum 0.75"
    ("knowledge factor", "minimum 0.75, usual 1.0, comprehensive 1.0, or as given", "x",
     "knowledge factor: minimum 0.75, usual 1.0, comprehensive 1.0, or as given"),
    # a sentence with brackets in it is no equation either
    ("hollow section", "curve a (hot-finished) or c (cold-formed) under EN; AISC E3 makes no "
     "difference", "x", "hollow section: curve a (hot-finished) or c (cold-formed) under EN; "
     "AISC E3 makes no difference"),
    # what a brace needs by its formula, then what was recorded (not "not recorded = ...")
    ("stiffness the brace needs; given: not recorded", "(1/phi) 8 Pr / Lbr", "App. 6.2",
     "stiffness the brace needs = (1/phi) 8 Pr / Lbr; given: not recorded"),
    # an equation keeps its equals sign
    ("slenderness, weak axis", "Lc,weak / r", "AISC 360-22 E3", "slenderness, weak axis = "
     "Lc,weak / r"),
])
def test_a_trace_step_reads_as_words_or_as_an_equation(what, formula, clause, shown):
    assert _with_formula(what, formula, clause) == shown


def test_the_trace_in_the_report_reads_as_words_where_it_is_words(report):
    text = _flat(" ".join(" ".join(lines) for lines in report))
    assert "(record) [record]" not in text
    assert "modulus = E =" not in text and "elastic modulus: E = 29,000 ksi" in text
    assert "utilization = minimum" not in text
    assert "not recorded = " not in text and "given: 0.6 kip/in = " not in text


def test_an_open_finding_says_the_check_has_not_weighed_it(report):
    """G/1-G: a forklift dent noted (open) on a pipe column whose record holds no loss: the
    sheet says the check above does not include it; a column with no findings says nothing."""
    pages = [_flat(" ".join(lines)) for lines in report]
    text = " ".join(pages)
    g1 = text[text.index("Column G/1-G 0.669"):]
    g1 = g1[:g1.index("Calculation trace")]
    assert "Forklift dent" in g1 and _flat(FINDINGS_NOTE) in g1
    a1 = text[text.index("Column A/1-G 0.369"):text.index("Column A/2-G 0.")]
    assert _flat(FINDINGS_NOTE) not in a1


def test_photo_captions_write_time_and_markup_as_the_app_does(report):
    """The demo photo of G/1-G's dent carries EXIF 2026-03-03 14:20:00 at offset +00:00 and a
    markup of an arrow, a circle and a label: the caption says so in the words of the app's
    photo view and the time as every other time in the report (to the minute, UTC)."""
    from fieldcol.ui.photos import exif_time, markup_words

    text = _flat(" ".join(" ".join(lines) for lines in report[-1:]))
    assert "taken 2026-03-03 14:20 UTC" in text
    assert exif_time("2026-03-03T14:20:00+00:00") == "taken 2026-03-03 14:20 UTC"
    words = markup_words([{"kind": "arrow"}, {"kind": "circle"},
                          {"kind": "label", "text": "dent, wall flattened"}])
    assert f"marked: {words}" in text
    assert "+00:00" not in text


def test_the_cover_names_the_code_once(report):
    cover = _flat(" ".join(report[0]))
    assert "Design code ANSI/AISC 360-22 (Specification for Structural Steel Buildings)" in cover
    assert "AISC 360-22 (ANSI/AISC 360-22)" not in cover


def test_a_bow_that_governs_names_its_interaction_equation(report):
    # B/2-G: the bow is checked by AISC 360-22 H1.1 (H1-1a / H1-1b), as its trace says
    text = _flat(" ".join(" ".join(lines) for lines in report))
    assert "Utilization 0.920 OK: interaction ratio (H1-1)" in text
