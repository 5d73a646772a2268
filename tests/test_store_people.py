"""Who records (m004_people): the person stamped on every new row, the device's settings, the
open visit, site basis fields; a store from before m004 keeps its rows and gains the columns."""

from __future__ import annotations

from pathlib import Path

import pytest

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.store._schema import DATA_TABLES


def test_every_data_table_has_created_by_and_new_rows_carry_the_person(tmp_path: Path):
    with Store(tmp_path / "s.db") as s:
        for t in DATA_TABLES:
            cols = {r[1] for r in s.db.conn.execute(f"PRAGMA table_info({t})")}
            assert "created_by" in cols, t
        before = s.add_site("Before anyone", code="aisc360-22", unit_system="us")
        assert before.created_by is None
        s.set_who("R. Amadi", "RA", "site tablet 2")
        site = s.add_site("Kiln Shed", code="en1993-1-1", unit_system="si")
        col = s.add_column(site.id, {"tag": "K1"})
        m = s.add_measurement(col.id, "length", "3.8 m")
        assert (site.created_by, col.created_by, m.created_by) == ("R. Amadi",) * 3
    with Store(tmp_path / "s.db") as s:  # kept across opening again
        assert s.who().name == "R. Amadi" and s.person == "R. Amadi"


@pytest.mark.parametrize("name, initials, device, field", [
    ("", "RA", "tablet", "name"), ("R. Amadi", "", "tablet", "initials"),
    ("R. Amadi", "R4", "tablet", "initials"), ("R. Amadi", "RA", " ", "device")])
def test_who_refused_names_the_field(tmp_path: Path, name, initials, device, field):
    with Store(tmp_path / "s.db") as s:
        with pytest.raises(InputError) as e:
            s.set_who(name, initials, device)
        assert e.value.field == field and s.who() is None


def test_theme_setting_and_visit(tmp_path: Path):
    with Store(tmp_path / "s.db") as s:
        assert s.setting("theme") == "light"
        with pytest.raises(InputError):
            s.set_setting("theme", "purple")
        s.set_setting("theme", "dark")
        site = s.add_site("Kiln Shed", code="aisc360-22", unit_system="us")
        col = s.add_column(site.id, {"tag": "K1"})
        visit = s.start_visit(site.id, "2026-12-03", people="R. Amadi, J. Park",
                              weather="dry, 4 C", access="north door, key at gate")
        assert s.open_visit().id == visit.id and visit.access == "north door, key at gate"
        m = s.add_measurement(col.id, "length", "12 ft", visit_id=visit.id)
        assert m.visit_id == visit.id
        s.end_visit()
        assert s.open_visit() is None
        assert s.list_visits(site.id)[0].ended_at is not None
    with Store(tmp_path / "s.db") as s:
        assert s.setting("theme") == "dark"


def test_store_from_before_m004_gains_the_columns_keeps_rows(tmp_path: Path):
    db = tmp_path / "old.db"
    with Store(db, _stop_before="m004_people") as old:
        site = old.add_site("Old Mill", code="aisc360-22", unit_system="us")
        old.add_column(site.id, {"tag": "M1"})
    with Store(db) as s:
        assert s.get_site(site.id).created_by is None
        assert s.get_site(site.id).basis is None
        assert [r.tag for r in s.list_columns(site.id)] == ["M1"]


def test_what_is_recorded_during_a_visit_belongs_to_it(tmp_path):
    """A finding, a restraint change, a photo link and a reading made while a visit is open on
    the device carry its id; on another site, or once it ended, they do not."""
    import io

    from PIL import Image

    with Store(tmp_path / "v.db") as s:
        site = s.add_site("Quarry Sheds", code="aisc360-22", unit_system="us")
        other = s.add_site("Mill Annexe", code="aisc360-22", unit_system="us")
        col = s.add_column(site.id, {"tag": "Q/1", "section": "W10X49", "length": "14 ft"})
        far = s.add_column(other.id, {"tag": "M/1", "section": "W10X49", "length": "14 ft"})
        visit = s.start_visit(site.id, "2026-12-04", people="R. Amadi, T. Osei",
                              weather="wet, 6 C", access="north door only")
        f = s.add_finding(site.id, "Pitting at the base", category="corrosion",
                          severity="medium", column_id=col.id)
        rc = s.add_restraint_change(col.id, "2026-12-04", "brace_added", "strut at 7 ft",
                                    axis="weak")
        buf = io.BytesIO()
        Image.new("RGB", (20, 20), (200, 10, 10)).save(buf, "JPEG")
        s.add_photo(buf.getvalue(), finding_id=f.id)
        m = s.add_measurement(col.id, "length", "13 ft 11 in")
        elsewhere = s.add_restraint_change(far.id, "2026-12-04", "brace_added", "rod", axis="weak")
        got = {t: s.db.conn.execute(f"SELECT visit_id FROM {t} WHERE id = ?", [i]).fetchone()[0]
               for t, i in (("findings", f.id), ("restraint_changes", rc.id),
                            ("measurements", m.id))}
        assert got == {"findings": visit.id, "restraint_changes": visit.id,
                       "measurements": visit.id}
        (link,) = s.db.conn.execute("SELECT visit_id FROM photo_links WHERE finding_id = ?",
                                    [f.id]).fetchall()
        assert link[0] == visit.id
        assert s.db.conn.execute("SELECT visit_id FROM restraint_changes WHERE id = ?",
                                 [elsewhere.id]).fetchone()[0] is None
        s.end_visit()
        later = s.add_finding(site.id, "Loose bolt", category="connection", severity="low")
        assert s.db.conn.execute("SELECT visit_id FROM findings WHERE id = ?",
                                 [later.id]).fetchone()[0] is None
