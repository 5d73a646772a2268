"""Field bundles from the sync screen's view-model (``fieldcol.ui.bundles``): a phone's changes
and photos saved as one file and opened on another store, opened twice for nothing, and a
damaged or foreign file refused whole with every table as it was.

Real SQLite stores in a temporary folder; the browser walk is in tests/test_ui_sync.py.
"""

from __future__ import annotations

import io
import zipfile
from pathlib import Path

import pytest
from PIL import Image

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.ui.bundles import made_words, make_bundle, open_bundle, opened_words

from test_hostile_store import dump


def _jpeg() -> bytes:
    buf = io.BytesIO()
    Image.new("RGB", (64, 48), (150, 80, 40)).save(buf, "JPEG")
    return buf.getvalue()


@pytest.fixture
def phone(tmp_path: Path):
    with Store(tmp_path / "phone.db") as s:
        site = s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        col = s.add_column(site.id, {"tag": "C4", "section": "W10X49", "length": "14 ft"})
        f = s.add_finding(site.id, "Flange pitting at the base", column_id=col.id,
                          category="corrosion", severity="medium")
        s.add_photo(_jpeg(), original_name="IMG_0101.jpg", finding_id=f.id)
        yield s


def test_a_saved_bundle_carries_the_changes_and_the_photo_to_another_store(phone, tmp_path):
    made = make_bundle(phone)
    assert made.name.startswith("fieldcol-") and made.name.endswith(".zip")
    assert made.info.photos == 1 and made.info.ops == phone.sync_summary()["ops"]
    assert made_words(made).startswith(f"Bundle {made.name}: {made.info.ops} changes, 1 photo.")
    with Store(tmp_path / "office.db") as office:
        info = open_bundle(office, made.name, made.data)
        assert info.new == info.ops == made.info.ops and info.photos == 1
        assert opened_words(info) == (f"Opened {made.name}: {info.ops} new changes of "
                                      f"{info.ops}, 1 photo.")
        site = office.list_sites()[0]
        assert office.find_column(site.id, "C4") is not None
        (finding,) = office.list_findings(site.id)
        (photo,) = office.photos_of(finding_id=finding.id)
        assert photo.original_name == "IMG_0101.jpg"
        assert office.photo_path(photo).read_bytes() == _jpeg()
        again = open_bundle(office, made.name, made.data)  # the same file opened twice
        assert again.new == 0 and "nothing new" in opened_words(again)


@pytest.mark.parametrize("damage, said", [
    (lambda d: d[:len(d) // 2], "cannot read it as a zip file"),
    (lambda d: b"", "the file is empty"),
    (lambda d: _rezip(d, "manifest.json", b'{"format": "somebody-else"}'),
     "manifest: format_version is missing"),
    (lambda d: _rezip(d, "ops.jsonl", b'{"op_id": "x"}\n'), "ops.jsonl is damaged"),
])
def test_a_damaged_bundle_is_refused_whole_naming_the_file(phone, tmp_path, damage, said):
    made = make_bundle(phone)
    with Store(tmp_path / "office.db") as office:
        office.add_site("Heron Quay Cold Store", code="en1993-1-1", unit_system="si")
    before = dump(tmp_path / "office.db")
    with Store(tmp_path / "office.db") as office:
        with pytest.raises(InputError) as e:
            open_bundle(office, "from-phone.zip", damage(made.data))
    assert e.value.field.startswith("bundle") and said in str(e.value)
    if e.value.field == "bundle":
        assert e.value.text == "from-phone.zip"  # the file as picked, not a temporary copy
    assert dump(tmp_path / "office.db") == before


def _rezip(data: bytes, name: str, new: bytes) -> bytes:
    """The bundle with one member's bytes replaced (its hash in the manifest left as it was)."""
    src = zipfile.ZipFile(io.BytesIO(data))
    out = io.BytesIO()
    with zipfile.ZipFile(out, "w") as z:
        for item in src.infolist():
            z.writestr(item.filename, new if item.filename == name else src.read(item))
    return out.getvalue()
