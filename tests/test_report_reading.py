"""The site report read as the checking engineer reads it, page by page: every page says whose it
is, no word or symbol is cut inside a cell, what governs is marked in the table of modes, the
record reads in words.

Outside references: pypdf (a general-purpose PDF library from PyPI) reads the file back as any
reader would; EN 1993-1-1 (2005) 6.3.1.2 and 6.3.1.3 for the symbols of flexural buckling
(L_cr, λ-bar, χ, N_b,Rd) and AISC 360-22 E3 for theirs (Lc, Lc/r, Fcr, Pn, φPn).
"""

from __future__ import annotations

import csv
import re
from pathlib import Path

import pypdf
import pytest

from fieldcol.assess import assess
from fieldcol.report import site_report
from fieldcol.store import Store

PARTS = ("Contents", "Column register", "Findings register", "Photographs")
#: a part's own heading, told from the same words in a sentence by what follows it
PART_HEAD = re.compile(r"(Column register) Tag |(Findings register) (?:Ref |No findings)"
                       r"|(Photographs) P1 ")
SHEET = re.compile(r"Column (\S+) +(?:\d\.\d{3} (?:OK|OVER)|not checked|not covered|no demand)"
                   r" Level ")


def _flat(text: str) -> str:
    # pypdf breaks wrapped lines where the PDF does; compare with whitespace collapsed
    return re.sub(r"\s+", " ", text).strip()


def _pages(path: Path) -> list[str]:
    return [_flat(p.extract_text()) for p in pypdf.PdfReader(path).pages]


@pytest.fixture(scope="module")
def demo(demo_report_pdf):
    """The demo site's report, pages as text."""
    return _pages(demo_report_pdf)


def _checked(store: Store, site, rec: dict) -> None:
    col = store.add_column(site.id, rec)
    r = store.current_record(col.id)
    store.save_check(col.id, assess(r).to_dict(), record=r)


PINNED = {"bottom": "pinned", "top": "pinned"}


@pytest.fixture(scope="module")
def mixed(mixed_files):
    return mixed_files[0]


@pytest.fixture(scope="module")
def mixed_files(tmp_path_factory):
    """An EN 1993-1-1 site (SI) with a rolled column, a laced and a battened pair of channels
    (one under a moment), and a column with a loss band with open holes under end moments;
    its report's pages as text and the rows of the CSV register beside it."""
    root = tmp_path_factory.mktemp("mixed")
    base = {"material": "S355", "length": "4.5 m", "code": "en1993-1-1",
            "restraints": {"strong": PINNED, "weak": PINNED}}
    with Store(root / "en.db") as store:
        site = store.add_site("Harbour Shed 3", code="en1993-1-1", unit_system="si")
        _checked(store, site, {"tag": "K1", "section": "HE 300 B", **base,
                               "demand": {"axial": "1500 kN"}})
        _checked(store, site, {"tag": "K4", "section": {"built": {
            "arrangement": "channels", "channel": "UPN 200", "gap": "150 mm", "toes": "out",
            "lacing": {"kind": "single", "width": "40 mm", "thickness": "8 mm",
                       "pitch": "400 mm", "fasteners": {"count": 1, "diameter": "16 mm"}},
            "connection": "riveted"}}, **base, "demand": {"axial": "900 kN"}})
        _checked(store, site, {"tag": "K5", "section": {"built": {
            "arrangement": "channels", "channel": "UPN 200", "gap": "150 mm", "toes": "out",
            "battens": {"spacing": "600 mm", "depth": "150 mm", "thickness": "10 mm"},
            "connection": "welded"}}, **base, "length": "6 m",
            "demand": {"axial": "900 kN", "moments": {"strong": "30 kN*m"}}})
        _checked(store, site, {"tag": "K6", "section": {"name": "HE 200 A", "loss": {
            "uniform": "1 mm", "from": "0 mm", "to": "300 mm",
            "holes": {"flange": "20 mm", "web": "30 mm"}}}, **base,
            "demand": {"axial": "600 kN", "end_moments": {"strong": {
                "top": "40 kN*m", "bottom": "10 kN*m", "curvature": "single"}}}})
        out = site_report(store, site.id, root / "en.pdf", report_date="2026-04-01")
    rows = list(csv.reader(out.with_suffix(".csv").read_text(encoding="utf-8-sig")
                           .splitlines()))
    return _pages(out), rows


def _body(page: str) -> str:
    """A page's text after its header (site name, report date)."""
    return page.split(" report date ", 1)[1].split(" ", 1)[1]


@pytest.mark.parametrize("which", ["demo", "mixed", "big"])
def test_every_page_says_whose_it_is(which, request):
    """A page a column's sheet (or a register) runs onto opens with the column's tag (or the
    register's name): a trace, a warning or a table carried over is never left unnamed."""
    pages = request.getfixturevalue(which)
    tag = part = None
    for i, page in enumerate(pages[1:], start=2):
        if "Contents Column register" in page or "Contents, continued" in page:
            continue  # drawn last, after its footer: its text comes out in another order
        body = _body(page)
        head = SHEET.match(body)
        if head or any(body.startswith(p) for p in PARTS):
            pass
        elif tag is not None and part is None:
            assert (body.startswith(f"Column {tag}, continued")
                    or body.startswith(f"Calculation trace of column {tag}, continued")), \
                (i, body[:80])
        else:
            assert part is not None and body.startswith(f"{part}, continued"), (i, body[:80])
        # what the next page continues: the last part or sheet begun on this one
        starts = [(m.start(), None, m.group(1)) for m in SHEET.finditer(body)]
        starts += [(m.start(), next(g for g in m.groups() if g), None)
                   for m in PART_HEAD.finditer(body)]
        if starts:
            _, part, tag = max(starts)


@pytest.mark.parametrize("symbol", ["slender,flange", "slender,web", "Pn,yield"])
def test_trace_symbols_are_never_cut_inside_a_word_aisc(demo, symbol):
    # AISC 360-22 Table B4.1a's flange and web limits, E3's yield strength, as the trace names them
    text = " ".join(demo)
    assert f" {symbol} " in text


@pytest.mark.parametrize("symbol", ["class,flange", "class,web", "λ-bar_z ≤ 0.2", "N_Ed / N_b,Rd"])
def test_trace_symbols_are_never_cut_inside_a_word_en(mixed, symbol):
    # EN 1993-1-1 Table 5.2 (classes) and 6.3.1.2 (4) (buckling ignored below λ-bar 0.2)
    text = " ".join(mixed)
    assert f" {symbol} " in text


def test_the_governing_mode_in_the_trace_is_in_words(demo, mixed):
    text = " ".join(demo + mixed)
    assert "governing mode (argmin): flexural buckling, weak axis" in text
    # the engine's key of a mode is not a word a reader uses (nor cut as "flexural-wea k")
    assert not re.search(r" mode (?:flexural-|beam-|section-|tie-|torsional gov|yield gov)", text)


def _sheet(pages: list[str], tag: str) -> str:
    """A column's sheet: from its heading to the next sheet's heading (or the end)."""
    text = " ".join(pages)
    start = next(m.start() for m in SHEET.finditer(text) if m.group(1) == tag)
    nxt = SHEET.search(text, start + 1)
    return text[start:nxt.start() if nxt else len(text)]


@pytest.mark.parametrize("tag, governs", [
    ("K1", "flexural buckling, weak axis (governs)"),
    ("K5", "axial force with bending (beam-column interaction), 6.62 (governs)"),
    ("K6", "the section where steel was lost (loss band), 6.2.1 (7) (band) (governs)")])
def test_the_table_of_modes_says_which_governs(mixed, tag, governs):
    """Moments or a loss band that govern stand in the table of modes beside the axial modes,
    with their design strength; the one that governs says so in words (bold alone is lost on a
    grey photocopy). EN 1993-1-1 6.3.3 (6.62) and 6.2.1 (7) are the equations named."""
    sheet = _sheet(mixed, tag)
    table = sheet[sheet.index("Every mode"):sheet.index("Calculation trace")]
    assert table.count("(governs)") == 1, table
    assert governs in table
    # the row's design strength is the one printed as the column's design strength
    design = re.search(r"Design strength (\S+ kN)", sheet).group(1)
    row = table[table.index(governs) + len(governs):]
    if tag == "K1":  # length, slenderness, stress, nominal, then the design strength
        assert re.match(r" 4500 mm [\d.]+ [\d.]+ MPa \d+ kN " + re.escape(design), row), row
    else:
        assert row.startswith(" - - - - " + design), row


def test_the_table_of_modes_names_the_codes_symbols(demo, mixed):
    # AISC 360-22 E3: Lc, Lc/r, Fcr, Pn and φPn (LRFD); EN 1993-1-1 6.3.1: L_cr, λ-bar, χ, N_b,Rd
    us = _sheet(demo, "C/3-G")
    assert ("Mode Eff. length Lc Slenderness Lc/r Crit. stress Fcr Nominal Pn Design φPn"
            in us), us[:1500]
    en = _sheet(mixed, "K1")
    assert ("Mode Eff. length L_cr Slenderness λ-bar Crit. stress χ f_y Nominal χ A f_y "
            "Design N_b,Rd" in en), en[:1500]


def test_a_design_strength_below_the_axial_one_says_why(mixed):
    # with the moments the capacity is the largest axial force the interaction allows (every
    # moment in proportion): the axial strength alone is printed beside it
    k5 = _sheet(mixed, "K5")
    got = re.search(r"Design strength (\S+) kN with the moments \(axial force alone (\S+) kN, "
                    r"nominal (\S+) kN\)", k5)
    assert got, k5[:1200]
    assert float(got.group(1)) < float(got.group(2))
    k6 = _sheet(mixed, "K6")
    assert re.search(r"Design strength \S+ kN at the loss band \(axial force alone \S+ kN", k6)


def test_a_built_up_section_reads_in_the_words_of_the_trade(mixed):
    k4 = _sheet(mixed, "K4")
    assert ("Section built-up: two UPN 200 channels, toes out, 150 mm clear between them; "
            "single lacing of 40 mm x 8 mm bars at 400 mm pitch, 1 rivet of 16 mm at each end; "
            "riveted Material" in k4), k4[:600]
    k5 = _sheet(mixed, "K5")
    assert "battens 150 mm deep x 10 mm at 600 mm centres; welded" in k5
    for key in ("arrangement", "kind single", "count 1"):
        assert key not in k4 + k5, key  # the record's keys are not words a reader uses


def test_a_loss_band_says_where_it_is_and_its_holes_apart_from_the_thickness(mixed):
    k6 = _sheet(mixed, "K6")
    assert ("HE 200 A; section loss 1 mm per exposed face, from 0 mm to 300 mm above the base; "
            "open holes at one height in that band, width lost: each flange 20 mm, web 30 mm"
            in k6), k6[:600]
    assert "remaining thickness measured: from" not in k6


@pytest.mark.parametrize("which, tag, heading", [
    ("mixed", "K6", "the section where steel was lost (loss band)"),
    ("demo", "B/2-G", "measured bow (beam-column)")])
def test_the_governing_mode_says_its_heading_once(which, tag, heading, request):
    """The Governing mode row is the mode's words then why it governs: the reason goes on from
    the heading instead of starting with the heading's own words again."""
    sheet = _sheet(request.getfixturevalue(which), tag)
    row = re.search(r"Governing mode (.*?) (?:Measured bow|Note|Every mode) ", sheet)
    assert row and row.group(1).startswith(heading + ": "), sheet[:1500]
    reason = row.group(1)[len(heading) + 2:]
    assert not reason.startswith(("the section where", "the measured bow")), reason
    assert row.group(1).count("where steel was lost") <= 1
    assert row.group(1).count("measured bow") <= 1
    if tag == "K6":  # the band's place, from the record (0 mm to 300 mm above the base)
        assert reason.startswith("from the bottom to 300 mm above it, "), reason


def test_small_words_read_as_a_person_writes_them(demo, mixed):
    text = " ".join(demo)
    a1 = _sheet(demo, "A/1-G")
    assert "Strong axis bottom pinned; top pinned; no braces recorded" in a1
    assert "Weak axis bottom pinned; top pinned; no braces recorded" in a1
    assert "braces none recorded" not in text
    # a finding's category of the trade stays whole in its cell (was "housekeepi ng")
    assert re.search(r"F9 info closed whole site housekeeping Debris", text)
    # each demo photo names who took it (the person who noted the finding or the restraint)
    assert re.search(r"P1\b.{0,200}?, by (R\. Amadi|T\. Nguyen)", text), text[-2000:]
    assert "photographer not recorded" not in text and "by: not recorded" not in text
    # a sentence run on after a colon goes on in lower case
    assert "Governing mode flexural buckling, weak axis: its buckling length 16'-0\"" in a1
    # EN 1993-1-1 has no LRFD/ASD basis: the partial factor gamma_M1 (6.1 (1)) stands there
    k1 = _sheet(mixed, "K1")
    assert re.search(r"Code EN 1993-1-1:2005\+A1:2014, γ_M1 = 1, K basis recommended", k1), \
        k1[:900]
    assert ", EN, K basis" not in " ".join(mixed)


def test_a_batten_moment_is_in_the_sites_units(mixed):
    # EN 1993-1-1 6.4.3.1 (2), Fig. 6.11: the moment in a batten, V_Ed a / (2 n), in kN*m on an
    # SI site like every other moment (was "2.688e+06 N mm")
    k5 = _sheet(mixed, "K5")
    assert re.search(r"M_b,Ed,y [\d.]+ kN\*m moment in one batten", k5), k5
    assert "e+" not in " ".join(mixed)


def test_an_interaction_utilization_is_not_named_as_an_axial_ratio(mixed):
    # EN 1993-1-1 6.3.1.1 (6.46): N_Ed / N_b,Rd is the axial ratio alone; the ratio of the
    # interaction (6.62) or of the loss band's section is another number, named U here
    k6 = _sheet(mixed, "K6")
    assert re.search(r"N_Ed / N_b,Rd 0\.7\d+ utilization, axial", k6), k6[-1500:]
    assert re.search(r"U 0\.9\d+ utilization with bending", k6)
    assert re.search(r"U 1\.09\d utilization in the loss band", k6)
    assert not re.search(r"N_Ed / N_b,Rd [\d.]+ utilization (?:with|in)", k6)


@pytest.mark.parametrize("which", ["demo", "mixed"])
def test_a_sheets_record_check_and_modes_stay_on_its_first_page(which, request):
    """The record, the latest check and the whole table of modes stand on the page of the
    sheet's heading, beside its pictures: a table of modes cut in two, its last rows on the
    next page, read badly."""
    pages = request.getfixturevalue(which)
    for i, page in enumerate(pages):
        heads = list(SHEET.finditer(page))
        for k, m in enumerate(heads):
            end = heads[k + 1].start() if k + 1 < len(heads) else len(page)
            sheet = page[m.start():end]
            if "not checked" in sheet[:40]:
                continue
            # the table's last axial row (yield) is on the page of the heading
            assert "yielding (squash load)" in sheet, (i + 1, m.group(1))


def test_the_csv_register_says_what_the_pdfs_register_says(mixed_files):
    """Row for row, the spreadsheet beside the report holds the cells the PDF's register
    prints; a level or grid not recorded is "-" in both (a lone hyphen is no formula: it
    needs no guard, and an apostrophe before it showed in the spreadsheet)."""
    pages, rows = mixed_files
    text = " ".join(pages)
    register = text[text.index("Column register Tag"):]
    register = register[:register.index("Findings register")]
    assert rows[0] == ["Tag", "Level", "Grid", "Section", "Governing mode", "Utilization",
                       "Status", "Checked"]
    assert len(rows) == 1 + 4 + 1
    for row in rows[1:-1]:
        assert row[1:3] == ["-", "-"], row
        assert " ".join(row) in register, row


@pytest.fixture(scope="module")
def big(tmp_path_factory):
    """A site of 170 columns not yet checked: more column sheets than the first contents page
    holds (three across), a register over several pages; its report's pages as text."""
    root = tmp_path_factory.mktemp("big")
    with Store(root / "big.db") as store:
        site = store.add_site("Long Quay Sheds", code="aisc360-22", unit_system="us")
        for i in range(170):
            store.add_column(site.id, {"tag": f"Q{i:03d}", "section": "W10X49",
                                       "material": "A992", "length": "12 ft"})
        out = site_report(store, site.id, root / "big.pdf", report_date="2026-04-01")
    return _pages(out)


def test_a_second_contents_page_says_what_it_is_and_its_pages_are_right(big):
    pages = big
    assert "Contents" in pages[1] and "Contents, continued Q" in pages[2], pages[2][:300]
    listed = re.findall(r"(Q\d{3}) (\d+)", pages[1] + " " + pages[2])
    assert len(listed) == 170
    for tag, page in listed:
        assert re.search(rf"Column {tag} +not checked", pages[int(page) - 1]), (tag, page)


def test_a_radius_of_gyration_in_the_trace_gives_back_its_slenderness(demo):
    """C/1-G is a welded I measured on site: d 16 in, bf 12 in, tf 3/4 in, tw 1/2 in. By hand
    (rectangles, common practice): A = 2 x 12 x 0.75 + 14.5 x 0.5 = 25.25 in2,
    Iy = 2 x 0.75 x 12^3 / 12 + 14.5 x 0.5^3 / 12 = 216.15 in4, ry = sqrt(Iy / A) = 2.926 in;
    Lc / ry = 216 / 2.926 = 73.8 (AISC 360-22 E3). To the nearest 1/16 in (2 15/16") the
    radius gave 73.5 back, not the 73.83 printed beside it."""
    c1 = _sheet(demo, "C/1-G")
    ry = float(re.search(r" ry ([\d.]+) in radius of gyration", c1).group(1))
    assert ry == pytest.approx((216.15 / 25.25) ** 0.5, abs=0.0006)
    slenderness = float(re.search(r" Lc/r,y ([\d.]+) slenderness", c1).group(1))
    assert 18 * 12 / ry == pytest.approx(slenderness, rel=2e-4)


@pytest.mark.parametrize("which", ["mixed", "big"])
def test_the_caution_and_page_x_of_y_on_every_page(which, request):
    pages = request.getfixturevalue(which)
    for i, t in enumerate(pages, start=1):
        assert "an aid to, not a substitute for, the judgement of a licensed engineer; " \
               "local codes govern" in t, i
        assert f"page {i} of {len(pages)}" in t, i


def test_a_us_sites_trace_speaks_inches_and_ksi(tmp_path: Path):
    """The engine writes the parts of a built-up section and its fasteners in mm and MPa; a US
    site's report reads them in inches and ksi, as they were measured (a 3/8 in plate is
    9.525 mm, a 5/8 in rivet 15.875 mm: exact, 1 in = 25.4 mm; 414 MPa = 60 ksi, NIST SP 811)."""
    with Store(tmp_path / "u.db") as store:
        site = store.add_site("Ferry Road Bakery", code="aisc360-22", unit_system="us")
        _checked(store, site, {"tag": "L3", "section": {"built": {
            "arrangement": "channels", "channel": "C12X20.7", "gap": "6 in", "toes": "out",
            "battens": {"spacing": "24 in", "depth": "8 in", "thickness": "3/8 in",
                        "fasteners": {"count": 2, "diameter": "5/8 in"}},
            "connection": "riveted"}}, "material": "A7", "length": "20 ft",
            "demand": {"axial": "150 kip"}})
        _checked(store, site, {"tag": "L4", "section": {"built": {
            "arrangement": "angles-web", "angle": "L4X4X1/2",
            "web": {"depth": "14 in", "thickness": "3/8 in"},
            "flange_plates": {"width": "10 in", "thickness": "1/2 in"},
            "connection": "riveted"}}, "material": "A7", "length": "18 ft",
            "demand": {"axial": "300 kip"}})
        out = site_report(store, site.id, tmp_path / "u.pdf", report_date="2026-04-01")
    text = " ".join(_pages(out))
    assert "riveted to a web plate 14 x 3/8 in, flange plates 10 x 1/2 in" in text
    assert "toes out, 6 in apart" in text
    assert "2 rivets of 5/8 in" in text
    assert not re.search(r"\d MPa", text), re.search(r".{60}\d MPa.{20}", text)
    assert not re.search(r"\d(?: x \d+(?:\.\d+)?)? mm (?:apart|packings|\[|,)", text)


def test_a_utilization_set_by_an_interaction_says_so(mixed):
    """Under moments the utilization is the ratio of the interaction equation (EN 1993-1-1
    6.3.3 (6.62) here), not the demand over the design strength: 900 kN over the printed
    design strength is another number, so the sheet says which it is."""
    k5 = _sheet(mixed, "K5")
    got = re.search(r"Utilization (\d\.\d{3}) OK: interaction ratio \(6\.62\)", k5)
    assert got, k5[:1500]
    design = float(re.search(r"Design strength (\d+) kN", k5).group(1))
    assert abs(900 / design - float(got.group(1))) > 0.002  # truly another number
    assert "it is the interaction ratio of the code's equation" in mixed[0]
    k1 = _sheet(mixed, "K1")
    assert re.search(r"Utilization \d\.\d{3} OK Governing mode", k1)


def test_the_register_names_a_built_up_section_in_words(mixed_files):
    pages, rows = mixed_files
    sections = {r[0]: r[3] for r in rows[1:-1]}
    assert sections["K4"] == "2 UPN 200 channels, laced"
    assert sections["K5"] == "2 UPN 200 channels, battened"
    assert sections["K1"] == "HE 300 B" and sections["K6"] == "HE 200 A with loss"


def test_an_unchecked_column_names_its_code_and_a_finding_its_place_on_the_sheet(tmp_path):
    with Store(tmp_path / "o.db") as store:
        site = store.add_site("Old Mill Annex", code="aisc360-22", unit_system="us")
        store.add_column(site.id, {"tag": "N2", "section": "W8X31", "material": "A36",
                                   "length": "10 ft"})
        col = store.add_column(site.id, {"tag": "N3", "section": "W12X65", "material": "A36",
                                         "length": "14 ft"})
        store.add_finding(site.id, "Web buckled locally near the splice", category="damage",
                          severity="urgent", column_id=col.id, face="north", height="6 ft")
        out = site_report(store, site.id, tmp_path / "o.pdf", report_date="2026-04-01")
    pages = _pages(out)
    n2 = _sheet(pages, "N2")
    assert "Code ANSI/AISC 360-22 (Specification for Structural Steel Buildings)" in n2 \
        and "aisc360-22" not in n2
    n3 = _sheet(pages, "N3")
    # the sheet says where on the column, as the register does
    assert "Web buckled locally near the splice (north face, 6'-0\" up, urgent, open)" in n3


def test_the_heading_of_a_columns_findings_stays_with_its_first_finding(tmp_path: Path):
    """Wherever a sheet leaves off, "Findings on this column" is never the last thing on a
    page: a long first finding (a surveyor's full note) goes over with it."""
    from fieldcol import CAUTION
    from fieldcol.report._layout import ReportPDF
    from fieldcol.report._column_sheet import _column_findings

    rows = [("F1", "Flange pitting over the lower third, deepest near the base plate; " * 12
             + "(high, open)"), ("F2", "Paint failing (low, open)")]
    for k in range(20):
        pdf = ReportPDF(paper="Letter", site_name="Yard", report_date="2026-04-01",
                        caution=CAUTION)
        pdf.add_page()
        # the last 40 mm of the page, 2 mm at a time
        pdf.set_y(pdf.page_break_trigger - 40 + k * 2)
        _column_findings(pdf, rows)
        out = tmp_path / f"f{k}.pdf"
        pdf.output(str(out))
        pages = _pages(out)
        at = next(t for t in pages if "Findings on this column" in t)
        assert "Findings on this column F1 Flange pitting" in at, (k, at[-200:])


def test_the_elastic_reference_tables_speak_as_its_trace(tmp_path: Path):
    # the elastic reference check writes Fcr and Pn in its trace (Euler's load over the area,
    # capped at Fy: common practice); its table of modes uses the same symbols
    with Store(tmp_path / "e.db") as store:
        site = store.add_site("Reference Yard", code="aisc360-22", unit_system="us")
        _checked(store, site, {"tag": "R1", "section": "W10X49", "material": "A992",
                               "length": "14 ft", "code": "elastic",
                               "demand": {"axial": "100 kip"}})
        out = site_report(store, site.id, tmp_path / "e.pdf", report_date="2026-04-01")
    r1 = _sheet(_pages(out), "R1")
    assert ("Eff. length Lc Slenderness Lc/r Crit. stress Fcr Nominal Pn Design Pn" in r1), \
        r1[:1500]
    assert " Fcr,y " in r1 and " Pn,y " in r1


def test_a_text_written_again_reads_back_the_same(tmp_path: Path):
    """The fonts keep each text's encoding into their subset (the report writes the same words
    thousands of times); new characters met between two writings of a text must not change
    what the first text reads as (pypdf reads each glyph back through the font's own map)."""
    from fieldcol import CAUTION
    from fieldcol.report._layout import ReportPDF

    pdf = ReportPDF(paper="A4", site_name="Yard", report_date="2026-04-01", caution=CAUTION)
    assert {type(f).__name__ for f in pdf.fonts.values()} == {"_KeptEncoding"}
    pdf.add_page()
    lines = ["Flange 0.48 in", "Ржавчина у основания", "Flange 0.48 in", "λ-bar_z ≤ 0.2 χ",
             "Flange 0.48 in Ж"]
    for i, line in enumerate(lines):
        pdf.set_font("DejaVu", "B" if i % 2 else "", 9)
        pdf.text(20, 30 + 8 * i, line)
    pdf.output(str(tmp_path / "t.pdf"))
    text = _flat(pypdf.PdfReader(tmp_path / "t.pdf").pages[0].extract_text())
    assert " ".join(lines) in text, text


def test_a_check_saved_with_the_old_batten_moment_unit_still_reads_in_site_units():
    # checks saved before the batten moment's unit was N*mm carry "N mm": shown in kN*m
    from fieldcol.ui.check_model import check_summary

    summ = check_summary({"code": "en1993-1-1", "steps": [
        {"symbol": "M_b,Ed,y", "what": "moment in one batten at the chord, y axis",
         "formula": "V_Ed a / (2 n)", "value": 2.688e6, "unit": "N mm", "clause": ""}]}, "si")
    assert summ.trace[0].value == "2.688 kN*m"


def _unrounded(text: str) -> list[str]:
    """Whole numbers of six digits or more with more than four significant figures."""
    return [n for n in re.findall(r"(?<![\d.,-])\d{6,}(?![\d-])", text)
            if len(n.rstrip("0")) > 4]


#: (code, record) pairs whose traces hold every kind of value: section properties to mm^6,
#: forces, stresses, moments, stiffnesses, short and long lengths, pure numbers
TRACE_RECORDS = [
    ("aisc", {"tag": "T1", "section": "W14X90", "material": "A992", "length": "24 ft",
              "restraints": {"strong": PINNED, "weak": {**PINNED, "braces": [
                  {"at": "12 ft", "stiffness": "20 kip/in"}]}},
              "demand": {"axial": "500 kip", "moments": {"strong": "80 kip*ft"}}}),
    ("en", {"tag": "T2", "section": "HE 300 B", "material": "S355", "length": "4.5 m",
            "code": "en1993-1-1", "restraints": {"strong": PINNED, "weak": PINNED},
            "demand": {"axial": "1500 kN", "moments": {"strong": "60 kN*m"}}}),
    ("en built-up", {"tag": "T3", "section": {"built": {
        "arrangement": "channels", "channel": "UPN 200", "gap": "150 mm", "toes": "out",
        "battens": {"spacing": "600 mm", "depth": "150 mm", "thickness": "10 mm"},
        "connection": "welded"}}, "material": "S355", "length": "6 m", "code": "en1993-1-1",
        "restraints": {"strong": PINNED, "weak": PINNED}, "demand": {"axial": "900 kN"}}),
]


@pytest.mark.parametrize("system", ["us", "si"])
@pytest.mark.parametrize("name, record", TRACE_RECORDS, ids=[n for n, _ in TRACE_RECORDS])
def test_trace_values_read_to_four_figures_as_an_engineer_writes_them(name, record, system):
    """Every value of a trace (the Check tab's, the report's) to four significant figures, a
    whole number of six digits or more in engineering notation (common practice: "1.892e6
    mm^4", E = "210e3 MPa"), and each reads back through the entry parser to the engine's
    own number within that rounding (a US length of a foot or more in feet-inches to the
    nearest 1/16 in, common practice for a tape)."""
    from fieldcol.ui.check_model import check_summary
    from fieldcol.units import STEP_KINDS, parse_length, parse_quantity

    result = assess(record).to_dict()
    summ = check_summary(result, system)
    checked = 0
    from fieldcol.trace import display_symbol

    steps = {(display_symbol(st["symbol"], result["code"]), st["what"]): st
             for st in result["steps"]}
    for line in summ.trace:
        step = steps.get((line.symbol, line.what))
        if step is None:  # (its words in inches on a US site)
            continue
        kind = STEP_KINDS.get(step["unit"])
        if not isinstance(step["value"], float) or kind is None or kind == "angle" \
                or line.value in ("yes", "no"):
            continue
        text = line.value
        assert not _unrounded(text), (line.symbol, text)
        if "'" in text or '"' in text:
            assert parse_length(text, "x") == pytest.approx(step["value"], abs=25.4 / 32)
        else:
            number = text.split(" ")[0].lstrip("-")
            mantissa = number.split("e")[0].replace(".", "").lstrip("0")
            whole = "e" not in number and "." not in number
            assert (len(mantissa) <= 4 or (whole and len(mantissa) <= 5)
                    or (whole and len(mantissa.rstrip("0")) <= 4)), (line.symbol, text)
            back = (parse_length(text, "x", allow_zero=True) if kind == "length"
                    else parse_quantity(text, kind, "x", allow_zero=True, allow_negative=True))
            assert back == pytest.approx(step["value"], rel=5.1e-4, abs=1e-9), \
                (line.symbol, text, step["value"])
        checked += 1
    assert checked > 25


def test_a_large_section_property_in_the_report_is_in_engineering_notation(mixed):
    """HE 300 B: It = 185 cm^4 in the EN 10365 tables (from memory; the trace's own value
    from its plates and root fillets is near it): written 1.892e6 mm^4, never a run of
    seven digits; no value of the report's traces is a whole number of six digits or more."""
    k1 = _sheet(mixed, "K1")
    it = re.search(r"I_t (\d\.\d{1,3})e6 mm\^4 torsion constant", k1)
    assert it and 1.80 <= float(it.group(1)) <= 1.95, k1[:200]
    assert "E 210000 MPa" in k1  # a round value stays as EN 1993-1-1 3.2.6 states it
    for page in mixed:
        assert not _unrounded(page), _unrounded(page)


def test_a_us_sites_formulas_speak_inches_too(tmp_path: Path):
    """The engine writes the hole allowance of AISC 360-22 B4.3b and the section check in a
    loss band in its own millimetres (dh + 2 mm, Lc = 1 mm); a US site's trace reads them in
    inches (2 mm = 0.0787 in, 1 mm = 0.0394 in: 1 in = 25.4 mm exactly, NIST SP 811), in the
    report, the Check tab and ``fieldcol check``'s sheet alike."""
    from fieldcol.cli.cmd_check import sheet
    from fieldcol.ui.check_model import check_summary

    holes = {"tag": "L4", "section": {"built": {
        "arrangement": "angles-web", "angle": "L4X4X1/2",
        "web": {"depth": "14 in", "thickness": "3/8 in"},
        "flange_plates": {"width": "10 in", "thickness": "1/2 in"},
        "connection": "riveted", "holes": {"diameter": "15/16 in", "per_flange": 2}}},
        "material": {"Fy": "33 ksi", "Fu": "60 ksi", "E": "29000 ksi", "G": "11200 ksi"},
        "length": "18 ft", "demand": {"axial": "300 kip", "moments": {"strong": "30 kip*ft"}}}
    band = {"tag": "L5", "section": {"name": "W10X49", "loss": {
        "uniform": "1/16 in", "from": "0 in", "to": "12 in"}}, "material": "A36",
        "length": "14 ft", "demand": {"axial": "200 kip", "end_moments": {"strong": {
            "top": "30 kip*ft", "bottom": "10 kip*ft", "curvature": "single"}}}}
    with Store(tmp_path / "f.db") as store:
        site = store.add_site("Tannery Row", code="aisc360-22", unit_system="us")
        _checked(store, site, holes)
        _checked(store, site, band)
        out = site_report(store, site.id, tmp_path / "f.pdf", report_date="2026-04-01")
    text = " ".join(_pages(out))
    assert "(dh + 0.0787 in)" in text and "Lc = 0.0394 in" in text
    metric = re.compile(r"\d ?(?:mm|MPa|kN)\b")
    assert not metric.search(text), metric.search(text)
    for rec in (holes, band):
        result = assess(rec).to_dict()
        lines = check_summary(result, "us").trace
        assert not any(metric.search(f"{t.value} {t.what} {t.formula}") for t in lines)
        assert not metric.search(sheet(result, "us")), metric.search(sheet(result, "us"))


@pytest.mark.parametrize("code", ["aisc", "en"])
def test_an_input_a_code_check_lists_again_is_shown_once(demo, mixed, code):
    """A code check lists the material, the effective lengths and the demand it was given;
    the trace (the report's, the Check tab's) shows each once, where it was worked out, under
    one symbol (AISC 360-22 E4's torsional length written as the others are: Lc,z; EN
    1993-1-1 6.3.1.4: L_cr,T)."""
    from fieldcol.ui.check_model import check_summary

    tag, rec = {"aisc": TRACE_RECORDS[0], "en": TRACE_RECORDS[1]}[code]
    lines = check_summary(assess(rec).to_dict(), "us" if code == "aisc" else "si").trace
    pairs = [(t.symbol, t.value) for t in lines]
    symbols = ({"Fy", "E", "G", "Lc,x", "Lc,y", "Lc,z", "Pr"} if code == "aisc"
               else {"E", "G", "L_cr,y", "L_cr,z", "L_cr,T", "N_Ed"})
    for sym in symbols:
        assert sum(s == sym for s, _ in pairs) == 1, (sym, [p for p in pairs if p[0] == sym])
    assert "Lcz" not in {s for s, _ in pairs}
    sheet = _sheet(demo, "A/1-G") if code == "aisc" else _sheet(mixed, "K1")
    e = "E 29000 ksi" if code == "aisc" else "E 210000 MPa"
    assert sheet.count(e) == 1, sheet.count(e)


def test_an_en_trace_never_says_no_load_was_given_when_one_was(mixed):
    """EN 1993-1-1 6.3.1.2 (4): buckling may be ignored for λ-bar <= 0.2 or NEd/Ncr <= 0.04.
    The resistance is found without the load, so the second test is not used: said so, not
    "no load given" beside a demand of 1500 kN."""
    k1 = _sheet(mixed, "K1")
    assert "N_Ed 1500 kN" in k1 and "no load given" not in k1
    assert "the resistance does not depend on the load: NEd/Ncr <= 0.04 not used" in k1


def test_restraints_not_recorded_say_what_the_check_took(tmp_path: Path):
    """A column recorded without restraints (or with an end left out) is checked with that
    end pinned (the record's default); its sheet says so rather than "not recorded" beside a
    side view of pinned ends and K = 1 (AISC 360-22 Commentary Table C-A-7.1, pinned-pinned)."""
    with Store(tmp_path / "r.db") as store:
        site = store.add_site("Lock Keeper's Yard", code="aisc360-22", unit_system="us")
        _checked(store, site, {"tag": "N1", "section": "W8X31", "material": "A36",
                               "length": "12 ft", "demand": {"axial": "100 kip"}})
        _checked(store, site, {"tag": "N2", "section": "W8X31", "material": "A36",
                               "length": "12 ft", "restraints": {"weak": {"bottom": "fixed"}},
                               "demand": {"axial": "100 kip"}})
        out = site_report(store, site.id, tmp_path / "r.pdf", report_date="2026-04-01")
    pages = _pages(out)
    n1, n2 = _sheet(pages, "N1"), _sheet(pages, "N2")
    assert ("Strong axis not recorded: both ends taken as pinned Weak axis not recorded: both "
            "ends taken as pinned") in n1
    assert "Weak axis bottom fixed; top taken as pinned; no braces recorded" in n2
    assert "Strong axis not recorded: both ends taken as pinned" in n2
    assert "(pinned-pinned)" in n1  # the trace's K: what the words say was taken


def test_a_column_held_back_by_its_tie_joints_says_why(tmp_path: Path):
    """Two C12X20.7 channels battened with two 5/8 in rivets at each end: the rivets cannot
    carry the force of the 2 % shear of AISC 360-22 E6.2 at the member's buckling strength,
    so they govern. The sheet says that, not "see the warnings" where no warning is about
    them."""
    from fieldcol.ui.check_model import check_summary

    rec = {"tag": "L3", "section": {"built": {
        "arrangement": "channels", "channel": "C12X20.7", "gap": "6 in", "toes": "out",
        "battens": {"spacing": "24 in", "depth": "8 in", "thickness": "3/8 in",
                    "fasteners": {"count": 2, "diameter": "5/8 in"}},
        "connection": "riveted"}}, "material": "A7", "length": "20 ft",
        "demand": {"axial": "150 kip"}}
    result = assess(rec).to_dict()
    assert result["governing_mode"] == "tie-joint"
    summ = check_summary(result, "us")
    assert summ.governs == "The end rivets or bolts of the lacing or battens govern"
    assert "AISC 360-22 E6.2" in summ.why and "warnings" not in summ.why
    assert not any("rivet" in w for w in summ.warnings)
    with Store(tmp_path / "j.db") as store:
        site = store.add_site("Ferry Road Bakery", code="aisc360-22", unit_system="us")
        _checked(store, site, rec)
        out = site_report(store, site.id, tmp_path / "j.pdf", report_date="2026-04-01")
    sheet = _sheet(_pages(out), "L3")
    assert ("Governing mode the end rivets or bolts of the lacing or battens: the rivets or "
            "bolts at the ends of a lacing bar or batten cannot carry") in sheet
