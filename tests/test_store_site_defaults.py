"""A column record that leaves out its code (or a demand its basis) is checked to its site's
code and basis, on every path that checks it: the store's current record, an edit on the column
screen, a reading, a brace.

References (by hand from the published text):
- EN 1993-1-1 6.3.1.2 with Table 6.2: HE 300 B (EN 10365: A = 14,910 mm^2, i_z = 75.8 mm,
  h/b = 1.0, t_f = 19 mm) in S355 (f_y = 355 MPa for t <= 40 mm, EN 10025-2), pinned, 4 m:
  curve c about z, lambda_1 = 93.9 sqrt(235/355) = 76.40, lambda-bar = 4000 / 75.8 / 76.40 =
  0.6907, Phi = 0.8588, chi = 0.7304, N_b,Rd = chi A f_y / 1.0 = 3,866 kN.
- AISC 360-22 E1: the ASD allowable strength is Pn / 1.67 (Omega_c).
"""

from __future__ import annotations

import pytest

from fieldcol.store import open_store, site_defaults
from fieldcol.ui import model as m
from fieldcol.ui import readings as rd
from fieldcol.ui import restraints_model as rm

EN_COLUMN = {"tag": "Q1", "section": "HE 300 B", "material": "S355", "length": "4 m"}


@pytest.fixture
def store(tmp_path):
    s = open_store(tmp_path / "sites.db")
    yield s
    s.close()


def _kN(q: dict) -> float:
    assert q["unit"] == "N"
    return q["value"] / 1000


def test_record_without_code_takes_the_en_sites_code(store):
    site = store.add_site("Quay Shed", code="en1993-1-1", unit_system="si")
    col = store.add_column(site.id, dict(EN_COLUMN))
    assert "code" not in store.get_column(col.id).record  # the record itself is left alone
    assert store.current_record(col.id)["code"] == "en1993-1-1"

    # an edit on the column screen: checked to EN 1993-1-1, not to AISC
    do, _undo = m.edit_change(col.id, "demand", "3000 kN")
    detail = do(store)
    chk = store.latest_check(col.id)
    assert chk.result["code"] == "en1993-1-1" and detail.check.code.startswith("EN 1993-1-1")
    assert _kN(chk.result["design_strength"]) == pytest.approx(3866, rel=0.003)  # by hand, above
    assert chk.result["governing_mode"] == "flexural-weak"

    # a reading and a brace: the same code
    rd.add_reading(store, col.id, "bow", "5 mm", axis="weak")
    assert store.latest_check(col.id).result["code"] == "en1993-1-1"
    rm.save_brace(store, col.id, {"at": "2 m", "axis": "weak"})
    assert store.latest_check(col.id).result["code"] == "en1993-1-1"


@pytest.mark.parametrize("demand", [{"axial": "200 kip"}, None],
                         ids=["demand-without-basis", "no-demand"])
def test_a_column_on_an_asd_site_is_checked_on_asd(store, demand):
    # AISC 360-22 E1: Pn / Omega_c, Omega_c = 1.67: a demand that leaves its basis out, and a
    # column with no demand at all (the allowable strength shown), both take the site's ASD
    site = store.add_site("Yard Store", code="aisc360-22", unit_system="us")
    store.update_site(site.id, basis="asd")
    rec = {"tag": "Y1", "section": "W10X49", "material": "A992", "length": "16 ft"}
    col = store.add_column(site.id, rec if demand is None else {**rec, "demand": demand})
    do, _undo = m.edit_change(col.id, "length", "15 ft")
    do(store)
    res = store.latest_check(col.id).result
    assert res["basis"] == "asd"
    gov = res["modes"][res["governing_mode"]]
    assert _kN(res["design_strength"]) == pytest.approx(_kN(gov["nominal_strength"]) / 1.67,
                                                        rel=1e-6)


def test_record_basis_without_demand_and_its_agreement_with_the_demand():
    from fieldcol.assess import assess
    from fieldcol.errors import InputError
    rec = {"tag": "B", "section": "W10X49", "material": "A992", "length": "16 ft"}
    lrfd, asd = assess(rec), assess({**rec, "basis": "asd"})
    # AISC 360-22 E1: phi_c = 0.90 (LRFD), Omega_c = 1.67 (ASD)
    assert float(asd.design_strength) == pytest.approx(
        float(lrfd.design_strength) / 0.90 / 1.67, rel=1e-6)
    both = assess({**rec, "basis": "asd", "demand": {"axial": "100 kip"}})
    assert both.to_dict()["basis"] == "asd"
    with pytest.raises(InputError) as e:
        assess({**rec, "basis": "asd", "demand": {"axial": "100 kip", "basis": "lrfd"}})
    assert e.value.field == "basis"
    with pytest.raises(InputError) as e:
        assess({**rec, "basis": "allowable"})
    assert e.value.field == "basis"


def test_what_the_record_says_stands():
    class Site:
        code, basis, gamma_m1 = "en1993-1-1", None, 1.1
    rec = {"tag": "A", "code": "aisc360-22", "demand": {"axial": "1 kip", "basis": "lrfd"}}
    assert site_defaults(rec, Site()) == rec
    assert site_defaults({"tag": "A", "gamma_M1": 1.0}, Site())["gamma_M1"] == 1.0
    assert site_defaults({"tag": "A"}, Site()) == {"tag": "A", "code": "en1993-1-1",
                                                  "gamma_M1": 1.1}
