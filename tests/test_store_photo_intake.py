"""Photo intake against damaged and hostile images (every image is made here, with Pillow or
byte by byte): broken EXIF, EXIF out of range, decompression bombs, multi-picture JPEGs, and
temporary files left by an interrupted intake.
"""

from __future__ import annotations

import io
import struct
import subprocess
import sys
import warnings
import zlib
from pathlib import Path

import pytest
from PIL import Image, ImageOps

from fieldcol.errors import InputError
from fieldcol.store import Store


def _files(folder: Path) -> list[str]:
    return sorted(str(p.relative_to(folder)) for p in folder.rglob("*") if p.is_file()) \
        if folder.exists() else []


def _jpeg_with_exif(**tags) -> bytes:
    im = Image.new("RGB", (32, 24), (10, 200, 30))
    ex = Image.Exif()
    gps = ex.get_ifd(0x8825)
    for k, v in tags.items():
        if k == "gps":
            gps.update(v)
        else:
            ex[int(k[1:], 16)] = v
    buf = io.BytesIO()
    im.save(buf, "JPEG", exif=ex)
    return buf.getvalue()


def _broken_orientation_jpeg() -> bytes:
    """A JPEG whose EXIF makes Pillow's orientation handling fail with ``struct.error``."""
    data = bytearray(_jpeg_with_exif(x0112=6, x0132="2026:01:02 10:00:00", x010F="Cam",
                                     gps={1: "N", 2: (51.0, 3.0, 4.0)}))
    at = data.find(b"Exif")
    data[at + 41] = 86  # the orientation entry's type and a neighbour's count, garbled
    data[at + 90] = 67
    return bytes(data)


def test_broken_exif_loses_only_the_exif(tmp_path: Path):
    bad = _broken_orientation_jpeg()
    with warnings.catch_warnings():  # the reference: Pillow itself fails on this file
        warnings.simplefilter("ignore")
        with pytest.raises(struct.error):
            ImageOps.exif_transpose(Image.open(io.BytesIO(bad)))
    with Store(tmp_path / "s.db") as s:
        p = s.add_photo(bad)
        assert p.format == "JPEG" and (p.width, p.height) == (32, 24)
        # exactly the photo and its thumbnail: no orphan, no temporary file
        assert _files(s.photos_dir) == sorted([p.path, p.thumb_path])
        assert Image.open(s.photos_dir / p.thumb_path).size == (32, 24)


def test_exif_values_out_of_range_are_dropped(tmp_path: Path):
    # EXIF 2.32: DateTime is "YYYY:MM:DD HH:MM:SS"; GPS latitude is degrees, minutes, seconds
    # with a N/S reference (common practice, the layout every camera writes)
    wild = _jpeg_with_exif(x0132="2026:13:40 10:00:00",
                           gps={1: "N", 2: (999.0, 0.0, 0.0), 3: "E", 4: (2.0, 3.0, 4.0)})
    sane = _jpeg_with_exif(x0132="2026:03:04 10:15:00",
                           gps={1: "S", 2: (33.0, 51.0, 36.0), 3: "W", 4: (70.0, 30.0, 0.0)})
    odd = _jpeg_with_exif(x0132="0000:00:00 00:00:00",
                          gps={1: "Q", 2: (10.0, 0.0, 0.0), 3: "E", 4: (200.0, 0.0, 0.0)})
    with Store(tmp_path / "s.db") as s:
        p = s.add_photo(wild)
        assert (p.exif_taken_at, p.latitude, p.longitude) == (None, None, None)
        q = s.add_photo(sane)
        assert q.exif_taken_at == "2026-03-04T10:15:00"
        assert q.latitude == pytest.approx(-(33 + 51 / 60 + 36 / 3600))  # 33.86 S
        assert q.longitude == pytest.approx(-70.5)
        r = s.add_photo(odd)
        assert (r.exif_taken_at, r.latitude, r.longitude) == (None, None, None)


def _png_header(w: int, h: int, idat: bytes) -> bytes:
    """A PNG (PNG specification, ISO/IEC 15948: signature, IHDR, IDAT, IEND) of 8-bit RGB."""
    def chunk(kind: bytes, body: bytes) -> bytes:
        return (struct.pack(">I", len(body)) + kind + body
                + struct.pack(">I", zlib.crc32(kind + body) & 0xFFFFFFFF))
    ihdr = struct.pack(">IIBBBBB", w, h, 8, 2, 0, 0, 0)
    return (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", ihdr) + chunk(b"IDAT", idat)
            + chunk(b"IEND", b""))


def test_decompression_bombs_are_refused_before_decoding(tmp_path: Path):
    huge = _png_header(100_000, 100_000, zlib.compress(b"\0" * 64))  # 10 billion pixels
    lean = _png_header(6000, 6000, zlib.compress(b"\0" * 64))  # 36 MP from 100 bytes
    assert Image.open(io.BytesIO(lean)).size == (6000, 6000)  # a header Pillow accepts
    # a complete, valid 6000 x 6000 black PNG: ~108 MB decoded from ~100 kB
    z = zlib.compressobj(9)
    row = b"\0" * (1 + 6000 * 3)
    real = _png_header(6000, 6000, b"".join(z.compress(row) for _ in range(6000)) + z.flush())
    with Store(tmp_path / "s.db") as s:
        for data, reason in ((huge, "more pixels than fieldcol opens"),
                             (lean, "decompression bomb"), (real, "decompression bomb")):
            with pytest.raises(InputError, match=reason) as e:
                s.add_photo(data)
            assert e.value.field == "photo"
        assert _files(s.photos_dir) == [] and s._rows("SELECT id FROM photos") == []


def test_multi_picture_jpeg_is_kept_as_its_first_picture(tmp_path: Path):
    first = Image.new("RGB", (48, 32), (250, 20, 20))
    second = Image.new("RGB", (48, 32), (20, 20, 250))
    buf = io.BytesIO()
    first.save(buf, "MPO", save_all=True, append_images=[second])
    mpo = buf.getvalue()
    assert Image.open(io.BytesIO(mpo)).format == "MPO"
    with Store(tmp_path / "s.db") as s:
        p = s.add_photo(mpo)
        assert p.format == "JPEG" and (p.width, p.height) == (48, 32)
        kept = Image.open(s.photos_dir / p.path)
        assert kept.format == "JPEG" and getattr(kept, "n_frames", 1) == 1
        r, g, b = kept.convert("RGB").getpixel((24, 16))
        assert r > 200 and b < 60  # the first (red) picture
        assert p.bytes < len(mpo)


def test_temporary_files_of_an_interrupted_intake_go_at_the_next_open(tmp_path: Path):
    db = tmp_path / "s.db"
    with Store(db) as s:
        photos = s.photos_dir
    gone = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"],
                          capture_output=True, text=True, check=True)
    dead = int(gone.stdout)
    (photos / "ab").mkdir(parents=True)
    left = photos / "ab" / f".{'ab' * 32}.jpg.{dead}.tmp"
    left.write_bytes(b"half a photo")
    busy = photos / "ab" / f".{'cd' * 32}.jpg.1.tmp"  # pid 1 runs: another writer, kept
    busy.write_bytes(b"being written")
    staging = tmp_path / f".fieldcol-staging-{dead}-x1"
    (staging / "photos").mkdir(parents=True)
    (staging / "store.db").write_bytes(b"partial")
    with Store(db):
        pass
    assert not left.exists() and not staging.exists()
    assert busy.exists()
