"""Photos: one file per content hash, a thumbnail, and the time and place EXIF records.

The JPEGs are drawn here with Pillow and given EXIF tags (EXIF 2.3 tag numbers: 0x9003
DateTimeOriginal, 0x9011 OffsetTimeOriginal, GPS IFD 0x8825).
"""

from __future__ import annotations

import hashlib
import io
from pathlib import Path

import pytest
from PIL import Image

from fieldcol.errors import InputError
from fieldcol.store import Store


def jpeg(colour=(200, 80, 40), size=(640, 480), when="2026:03:04 10:32:05", gps=True) -> bytes:
    img = Image.new("RGB", size, colour)
    exif = Image.Exif()
    exif.get_ifd(0x8769)[0x9003] = when
    exif.get_ifd(0x8769)[0x9011] = "+01:00"
    if gps:
        g = exif.get_ifd(0x8825)
        g[1], g[2] = "N", (51.0, 30.0, 36.0)
        g[3], g[4] = "W", (0.0, 7.0, 12.0)
    buf = io.BytesIO()
    img.save(buf, "JPEG", exif=exif)
    return buf.getvalue()


@pytest.fixture
def setup(tmp_path: Path):
    with Store(tmp_path / "p.db") as s:
        site = s.add_site("Tannery Row", code="en1993-1-1", unit_system="si")
        col = s.add_column(site.id, {"tag": "1/A"})
        f = s.add_finding(site.id, "Web buckled near base", category="damage", severity="high",
                          column_id=col.id)
        yield s, site, col, f


def test_stored_once_with_thumbnail_and_exif(setup, tmp_path: Path):
    s, _, col, f = setup
    data = jpeg()
    src = tmp_path / "IMG_0042.jpg"
    src.write_bytes(data)
    p = s.add_photo(src, finding_id=f.id, caption="from the north")
    assert p.sha256 == hashlib.sha256(data).hexdigest()
    assert (p.format, p.width, p.height, p.bytes) == ("JPEG", 640, 480, len(data))
    assert p.original_name == "IMG_0042.jpg"
    assert p.exif_taken_at == "2026-03-04T10:32:05+01:00"
    assert p.latitude == pytest.approx(51.51) and p.longitude == pytest.approx(-0.12)
    assert s.photo_path(p).read_bytes() == data
    with Image.open(s.photo_path(p, thumbnail=True)) as t:
        assert max(t.size) == 320 and t.format == "JPEG"
    again = s.add_photo(data, column_id=col.id)  # same bytes: same photo, a second link
    assert again.id == p.id
    assert s.db.conn.execute("SELECT count(*) FROM photos").fetchone()[0] == 1
    files = [x for x in s.photos_dir.rglob("*") if x.is_file()]
    assert len(files) == 2  # the original and its thumbnail, once
    assert [x.id for x in s.photos_of(finding_id=f.id)] == [p.id]
    assert [x.id for x in s.photos_of(column_id=col.id)] == [p.id]
    s.add_photo(data, finding_id=f.id)  # attaching twice is one link
    assert s.db.conn.execute("SELECT count(*) FROM photo_links").fetchone()[0] == 2


def test_photo_without_exif_and_png(setup):
    s, _, col, _ = setup
    buf = io.BytesIO()
    Image.new("RGB", (50, 40), (0, 0, 255)).save(buf, "PNG")
    p = s.add_photo(buf.getvalue(), column_id=col.id)
    assert (p.format, p.exif_taken_at, p.latitude) == ("PNG", None, None)
    assert p.path.endswith(".png")


def test_restraint_change_photo_and_bad_input(setup, tmp_path: Path):
    s, _, col, f = setup
    rc = s.add_restraint_change(col.id, "2021-09-09", "cable_found", "steel cable to roof truss")
    s.add_photo(jpeg((1, 2, 3)), restraint_change_id=rc.id)
    assert len(s.photos_of(restraint_change_id=rc.id)) == 1
    with pytest.raises(InputError) as e:
        s.add_photo(b"GIF89a not really")
    assert e.value.field == "photo"
    with pytest.raises(InputError) as e:
        s.add_photo(tmp_path / "missing.jpg")
    assert e.value.field == "photo"
    p = s.add_photo(jpeg((9, 9, 9)))
    with pytest.raises(InputError) as e:
        s.attach_photo(p.id, finding_id=f.id, column_id=col.id)
    assert e.value.field == "attach_to"
    with pytest.raises(InputError) as e:
        s.attach_photo(p.id, finding_id="no-such-finding")
    assert e.value.field == "finding_id"
    s.delete("photos", p.id)
    assert s.add_photo(jpeg((9, 9, 9))).deleted_at is None  # taken again: brought back
