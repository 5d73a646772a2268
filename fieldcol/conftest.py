"""A real store for the docstring examples of the store, CLI, bench and demo modules."""

from __future__ import annotations

import copy
import io
from typing import Iterator

import pytest

# doctests of these modules run in a fresh temp folder holding a small real store
_STORE_MODULES = ("fieldcol.store", "fieldcol.cli", "fieldcol.bench", "fieldcol.demo",
                  "fieldcol.sync", "fieldcol.ui.sync_view", "fieldcol.ui.bundles",
                  "fieldcol.ui.report_view")

# an invented column: W14X90, 30 ft, pinned both ways, 500 kip factored load
REC = {"tag": "B/4-L1", "section": "W14X90", "material": "A992", "length": "30 ft",
       "restraints": {"strong": {"bottom": "pinned", "top": "pinned"},
                      "weak": {"bottom": "pinned", "top": "pinned"}},
       "code": "aisc360-22", "demand": {"axial": "500 kip", "basis": "lrfd"}}

# a schedule that adds A/1-L1 and changes the length of B/4-L1
COLS_CSV = ("tag,level,grid,section,length (ft)\n"
            "A/1-L1,L1,A/1,W10X49,16\n"
            "B/4-L1,L1,B/4,W14X90,29.5\n")


def _jpeg() -> bytes:
    from PIL import Image

    buf = io.BytesIO()
    Image.new("RGB", (64, 48), (150, 72, 30)).save(buf, "JPEG")
    return buf.getvalue()


@pytest.fixture(autouse=True)
def store_examples(request: pytest.FixtureRequest, doctest_namespace: dict) -> Iterator[None]:
    """Fill the doctest namespace: ``store`` (``site.db`` in the working folder), ``site``
    (Depot), ``col`` (B/4-L1 on level L1, grid B/4, record ``rec``), ``chk`` (its check),
    ``finding`` (on the column), ``photo`` (of the finding, from the bytes ``jpeg``); the
    folder also holds ``cols.csv`` (``COLS_CSV``). Other tests get nothing."""
    if not request.node.name.startswith(_STORE_MODULES):
        yield
        return
    from fieldcol.assess import assess
    from fieldcol.store import open_store

    tmp = request.getfixturevalue("tmp_path")
    request.getfixturevalue("monkeypatch").chdir(tmp)
    (tmp / "cols.csv").write_text(COLS_CSV)
    store = open_store(tmp / "site.db")
    site = store.add_site("Depot", code="aisc360-22", unit_system="us")
    col = store.add_column(site.id, REC, level="L1", grid="B/4")
    finding = store.add_finding(site.id, "Base plate corroded", category="corrosion",
                                severity="high", column_id=col.id)
    jpeg = _jpeg()
    names = dict(
        store=store, site=site, col=col, rec=copy.deepcopy(REC), finding=finding, jpeg=jpeg,
        photo=store.add_photo(jpeg, original_name="IMG_0042.jpg", finding_id=finding.id),
        chk=store.save_check(col.id, assess(REC).to_dict()))
    doctest_namespace.update(names)
    yield
    store.close()
    for name in names:  # the namespace lives for the session: leave no closed store in it
        del doctest_namespace[name]
