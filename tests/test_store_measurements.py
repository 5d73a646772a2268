"""Measurement history: every reading kept as typed, corrections add, the latest reading wins.

Unit factors checked here are the exact NIST SP 811 ones (1 in = 25.4 mm, 1 ft = 0.3048 m,
1 lbf = 4.4482216152605 N).
"""

from __future__ import annotations

from pathlib import Path

import pytest

from fieldcol.errors import InputError
from fieldcol.store import Store


@pytest.fixture
def setup(tmp_path: Path):
    with Store(tmp_path / "m.db") as s:
        site = s.add_site("Ropeworks", code="aisc360-22", unit_system="us")
        col = s.add_column(site.id, {"tag": "D/2", "section": {
            "shape": "i", "d": "14 in", "bf": "14.5 in", "tf": "0.71 in", "tw": "0.44 in",
            "r": "0.6 in"}, "length": "30 ft"})
        yield s, site, col


def test_reading_kept_as_typed_with_canonical_value(setup):
    s, _, col = setup
    m = s.add_measurement(col.id, "section.tf", "0.62 in", gauge="ultrasonic", taken_by="A. Li",
                          taken_at="2026-03-04T10:00:00+00:00")
    assert m.text == "0.62 in" and m.unit == "mm"
    assert m.value == pytest.approx(0.62 * 25.4)  # NIST SP 811: 1 in = 25.4 mm exactly
    assert m.taken_at == "2026-03-04T10:00:00.000000Z"
    f = s.add_measurement(col.id, "demand.axial", "100 kip", kind="force")
    assert f.value == pytest.approx(100_000 * 4.4482216152605) and f.unit == "N"  # NIST SP 811
    assert s.current_record(col.id)["section"]["tf"] == "0.62 in"
    assert s.get_column(col.id).record["section"]["tf"] == "0.71 in"  # the stored record stays


def test_latest_wins_and_corrections_add(setup):
    s, site, col = setup
    a = s.add_measurement(col.id, "length", "29'-10\"", taken_at="2026-03-04T10:00:00Z")
    b = s.add_measurement(col.id, "length", "29 ft 9 in", taken_at="2026-05-01T09:00:00Z")
    assert s.current_record(col.id)["length"] == "29 ft 9 in"
    assert s.list_columns(site.id)[0].length == "29 ft 9 in"
    # a correction of the OLD reading keeps its time: it must not beat the later reading
    fix_a = s.correct_measurement(a.id, "29'-11\"", note="misread tape")
    assert fix_a.corrects == a.id and fix_a.taken_at == a.taken_at
    assert s.current_record(col.id)["length"] == "29 ft 9 in"
    fix_b = s.correct_measurement(b.id, "29 ft 8 in")
    assert s.current_record(col.id)["length"] == "29 ft 8 in"
    history = s.measurements(col.id, "length")
    assert [m.text for m in history] == ["29'-10\"", "29'-11\"", "29 ft 9 in", "29 ft 8 in"]
    assert s.get_column(col.id).record["length"] == "30 ft"
    s.delete("measurements", fix_b.id)  # withdrawing the correction brings b back
    assert s.current_record(col.id)["length"] == "29 ft 9 in"
    assert set(s.current_measurements(col.id)) == {"length"}


def test_bare_number_is_canonical_and_overlay_paths(setup):
    s, _, col = setup
    s.add_measurement(col.id, "condition.bow", "12")  # bare number: mm
    s.add_measurement(col.id, "section.loss.tf", "0.05 in")
    rec = s.current_record(col.id)
    assert rec["condition"]["bow"] == "12 mm"
    assert rec["section"]["loss"]["tf"] == "0.05 in"
    other = s.add_column(s.get_column(col.id).site_id, {"tag": "E/1", "section": "W8X31"})
    s.add_measurement(other.id, "section.tf", "0.43 in")
    assert s.current_record(other.id)["section"] == "W8X31"  # a catalogue name is not split


def test_bad_readings_name_their_field_and_change_nothing(setup):
    s, site, col = setup
    for args, kw, field in [
        (("length", "12 fr"), {}, "length"),
        (("length", ""), {}, "length"),
        (("length", "30 ft"), {"kind": "speed"}, "kind"),
        (("tag", "3"), {}, "quantity"),
        (("section..tf", "3 mm"), {}, "quantity"),
        (("length", "30 ft"), {"taken_at": "2026-03-04T10:00:00"}, "taken_at"),
        (("demand.axial", "30 ft"), {"kind": "force"}, "demand.axial"),
    ]:
        with pytest.raises(InputError) as e:
            s.add_measurement(col.id, *args, **kw)
        assert e.value.field == field, (args, kw)
    assert s.measurements(col.id) == []
    m = s.add_measurement(col.id, "length", "30 ft")
    with pytest.raises(InputError) as e:
        s.add_measurement(col.id, "section.tf", "1 in", corrects=m.id)
    assert e.value.field == "corrects"
    other_site = s.add_site("Elsewhere", code="en1993-1-1", unit_system="si")
    far = s.add_visit(other_site.id, "2026-01-02")
    with pytest.raises(InputError) as e:
        s.add_measurement(col.id, "length", "30 ft", visit_id=far.id)
    assert e.value.field == "visit"
    assert len(s.measurements(col.id)) == 1


def test_measured_dimensions_do_not_overrule_a_catalogue_name(tmp_path):
    # a section named from the catalogue takes its nominal dimensions (AISC Shapes Database);
    # the readings that identified it stay in the history; a section kept as measured reads them
    from fieldcol.store import open_store

    with open_store(tmp_path / "o.db") as store:
        site = store.add_site("Depot", code="aisc360-22", unit_system="us")
        col = store.add_column(site.id, {"tag": "A", "section": {"name": "W14X90"}})
        store.add_measurement(col.id, "section.d", "14.1 in", gauge="caliper")
        store.add_measurement(col.id, "section.loss.flange", "0.6 in")
        assert store.current_record(col.id)["section"] == {"name": "W14X90",
                                                           "loss": {"flange": "0.6 in"}}
        store.update_column(col.id, record={"tag": "A", "section": {"shape": "i", "d": "14 in"}})
        assert store.current_record(col.id)["section"]["d"] == "14.1 in"
        m = store.measurements(col.id)[0]
        assert store.get_measurement(m.id).text == "14.1 in"
