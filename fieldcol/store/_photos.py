"""Photo files: stored once under their content hash, with a thumbnail and what EXIF says.

Files are written before the row that names them (temp file, fsync, rename), so a crash can
leave an unreferenced file but never a row pointing at a missing or half-written photo.
"""

from __future__ import annotations

import hashlib
import io
import math
import os
import re
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from fieldcol.errors import InputError

if TYPE_CHECKING:
    from PIL import Image

FORMATS = {"JPEG": "jpg", "PNG": "png", "WEBP": "webp"}
THUMB_PX = 320
MAX_BYTES = 64 * 1024 * 1024
#: decompression-bomb guards, checked on the header before any pixel is decoded: a phone
#: camera's largest pictures stay under 120 million pixels (from memory: 108 MP sensors), and
#: a real photo decodes to well under 1000 times its file size (a flat, all-one-colour PNG
#: comes nearest); the ratio applies above 32 MB decoded
MAX_PIXELS = 120_000_000
MAX_RATIO = 1000
RATIO_FLOOR = 32 * 1024 * 1024

_EXIF_IFD, _GPS_IFD = 0x8769, 0x8825
_DATETIME_ORIGINAL, _OFFSET_ORIGINAL, _DATETIME = 0x9003, 0x9011, 0x0132


@dataclass
class PhotoFile:
    """What ingesting one image produced: its hash, where it lies, and its metadata."""
    sha256: str
    path: str
    thumb_path: str
    format: str
    width: int
    height: int
    bytes: int
    exif_taken_at: str | None
    latitude: float | None
    longitude: float | None


def read_bytes(source: bytes | str | os.PathLike[str], field: str = "photo") -> tuple[bytes, str | None]:
    """The image bytes and original file name from a path or from bytes already in hand.

    Example:
        >>> read_bytes(b"abc")
        (b'abc', None)
    """
    if isinstance(source, (bytes, bytearray)):
        data, name = bytes(source), None
    else:
        p = Path(source)
        if not p.is_file():
            raise InputError(field, str(p), "no such file", None)
        if p.stat().st_size > MAX_BYTES:
            raise InputError(field, str(p), "the file is larger than 64 MB", None)
        data, name = p.read_bytes(), p.name
    if not data:
        raise InputError(field, name or "", "the file is empty", None)
    if len(data) > MAX_BYTES:
        raise InputError(field, name or "", "the file is larger than 64 MB", None)
    return data, name


def ingest(photos_dir: Path, data: bytes, field: str = "photo") -> PhotoFile:
    """Check ``data`` is an image, store it and its thumbnail under its hash (once).

    Everything that can refuse the image (not an image, too many pixels for its file size,
    a thumbnail that cannot be made) happens before any file is written, so a refusal never
    leaves a file behind. A broken EXIF block loses only the EXIF (time, place, orientation);
    EXIF values out of range (month 13, latitude 999) are dropped. A phone's multi-picture JPEG
    (MPO) is kept as its first picture.

    Args:
        photos_dir: the store's photo folder.
        data: the image file's bytes (JPEG, PNG, WebP, or a multi-picture JPEG).

    Returns:
        A ``PhotoFile`` with paths relative to ``photos_dir``.

    Example:
        >>> ingest(Path("photos"), b"not an image")
        Traceback (most recent call last):
        fieldcol.errors.InputError: photo: cannot use '12 bytes': not an image Pillow can read ...
    """
    img, size = _open(data, field)
    if img.format == "MPO":
        data = _first_picture(data, img, field)
        img, size = _open(data, field)
    if img.format not in FORMATS:
        raise InputError(field, str(img.format), "this image format is not kept",
                         "JPEG, PNG or WebP")
    taken_at, lat, lon = _exif(img)
    thumb = _thumbnail(img, field)
    sha = hashlib.sha256(data).hexdigest()
    rel = f"{sha[:2]}/{sha}.{FORMATS[img.format]}"
    thumb_rel = f"thumbs/{sha[:2]}/{sha}.jpg"
    if not (photos_dir / rel).is_file() or file_sha256(photos_dir / rel) != sha:
        write_atomic(photos_dir / rel, data)
    if not (photos_dir / thumb_rel).is_file():
        write_atomic(photos_dir / thumb_rel, thumb)
    return PhotoFile(sha, rel, thumb_rel, img.format, size[0], size[1], len(data),
                     taken_at, lat, lon)


def _open(data: bytes, field: str) -> "tuple[Image.Image, tuple[int, int]]":
    """Open and decode an image, refusing a decompression bomb before it is decoded; returns
    the image and its size in pixels. A JPEG is decoded at the scale its thumbnail needs (the
    decoder still reads every block, so a damaged file is still refused): a photo arriving from
    another device costs little more than its bytes on disk."""
    import warnings

    from PIL import Image

    what = f"{len(data)} bytes"
    with warnings.catch_warnings():
        # our MAX_PIXELS below is the limit; Pillow's hard error (twice its warning) stays
        warnings.simplefilter("ignore", Image.DecompressionBombWarning)
        warnings.simplefilter("ignore", UserWarning)  # Pillow's notes on corrupt EXIF
        try:
            img = Image.open(io.BytesIO(data))  # reads the header only
        except Image.DecompressionBombError:
            raise InputError(field, what, "the image has more pixels than fieldcol opens",
                             f"at most {MAX_PIXELS // 1_000_000} million pixels") from None
        except Exception as e:  # anything a hostile file provokes in a decoder: refuse it
            raise InputError(field, what, f"not an image Pillow can read ({e})",
                             "JPEG, PNG or WebP") from None
        w, h = img.size
        decoded = w * h * max(len(img.getbands()), 1)
        if w * h > MAX_PIXELS:
            raise InputError(field, what, f"the image has {w} x {h} pixels, more than "
                             "fieldcol opens", f"at most {MAX_PIXELS // 1_000_000} million "
                             "pixels; take it at a lower resolution")
        if decoded > RATIO_FLOOR and decoded > MAX_RATIO * len(data):
            raise InputError(field, what, f"the image would decode to {decoded:,} bytes from a "
                             f"file of {len(data):,}: refused as a decompression bomb", None)
        try:
            if img.format == "JPEG":
                img.draft("RGB", (THUMB_PX, THUMB_PX))
            img.load()
        except Exception as e:
            raise InputError(field, what, f"not an image Pillow can read ({e})",
                             "JPEG, PNG or WebP") from None
    return img, (w, h)


def _first_picture(data: bytes, img: "Image.Image", field: str) -> bytes:
    """The bytes of a multi-picture JPEG's first picture (itself a complete JPEG)."""
    try:
        size = int(img.mpinfo[0xB002][0]["Size"])  # type: ignore[attr-defined]
    except Exception:
        size = 0
    first = data[:size] if 0 < size <= len(data) else b""
    if first[:2] != b"\xff\xd8" or first[-2:] != b"\xff\xd9":
        raise InputError(field, f"{len(data)} bytes", "a multi-picture JPEG whose first "
                         "picture cannot be found", "save it as a plain JPEG")
    return _without_mpf(first)


def _without_mpf(jpeg: bytes) -> bytes:
    """The JPEG without its multi-picture index (an APP2 segment starting ``MPF``), which
    would point at pictures no longer there. Segments are walked up to the image data."""
    out, i = [jpeg[:2]], 2
    while i + 4 <= len(jpeg) and jpeg[i] == 0xFF and jpeg[i + 1] not in (0xDA, 0xD9):
        n = int.from_bytes(jpeg[i + 2:i + 4], "big")
        seg = jpeg[i:i + 2 + n]
        if not (jpeg[i + 1] == 0xE2 and seg[4:8] == b"MPF\x00"):
            out.append(seg)
        i += 2 + n
    out.append(jpeg[i:])
    return b"".join(out)


def _thumbnail(img: "Image.Image", field: str) -> bytes:
    from PIL import ImageOps

    try:
        oriented = ImageOps.exif_transpose(img)
    except Exception:  # a broken EXIF block: take the picture as the camera stored it
        oriented = img.copy()
    try:
        oriented.thumbnail((THUMB_PX, THUMB_PX))
        buf = io.BytesIO()
        oriented.convert("RGB").save(buf, "JPEG", quality=80)
    except Exception as e:
        raise InputError(field, f"{img.width} x {img.height}", f"cannot make its thumbnail "
                         f"({e})", "JPEG, PNG or WebP") from None
    return buf.getvalue()


def _exif(img: "object") -> tuple[str | None, float | None, float | None]:
    """(time taken as recorded, latitude, longitude) from EXIF, each None when absent,
    unreadable or out of range (a broken EXIF block must not lose the photo)."""
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", UserWarning)
        try:
            exif = img.getexif()  # type: ignore[attr-defined]
            sub = exif.get_ifd(_EXIF_IFD)
            raw = sub.get(_DATETIME_ORIGINAL) or exif.get(_DATETIME)
            offset = sub.get(_OFFSET_ORIGINAL)
            gps = dict(exif.get_ifd(_GPS_IFD))
        except Exception:
            return None, None, None
    taken = exif_time(raw, offset)
    lat = _degrees(gps.get(2), gps.get(1), "N", "S", 90.0)
    lon = _degrees(gps.get(4), gps.get(3), "E", "W", 180.0)
    if lat is None or lon is None:  # half a position is no position
        return taken, None, None
    return taken, lat, lon


def exif_time(raw: object, offset: object = None) -> str | None:
    """An EXIF date-time (``2026:03:04 10:15:00``) as ISO text, or None if it is not a real time.

    The camera's local clock is kept as recorded; the offset tag, when present and valid,
    places it.

    Example:
        >>> exif_time("2026:03:04 10:15:00", "+01:00"), exif_time("2026:13:40 10:00:00")
        ('2026-03-04T10:15:00+01:00', None)
    """
    from datetime import datetime

    if not isinstance(raw, str):
        return None
    try:
        when = datetime.strptime(raw.strip("\x00 ")[:19], "%Y:%m:%d %H:%M:%S")
    except ValueError:
        return None
    if not 1900 <= when.year <= 2200:
        return None
    taken = when.strftime("%Y-%m-%dT%H:%M:%S")
    if isinstance(offset, str) and re.fullmatch(r"[+-](0\d|1[0-4]):[0-5]\d", offset):
        taken += offset
    return taken


def _degrees(dms: object, ref: object, positive: str, negative: str,
             limit: float) -> float | None:
    try:
        d, m, s = (float(x) for x in dms)  # type: ignore[union-attr]
    except (TypeError, ValueError, ZeroDivisionError):
        return None
    if ref not in (positive, negative) or not all(map(math.isfinite, (d, m, s))):
        return None
    if not (0 <= d <= limit and 0 <= m < 60 and 0 <= s < 60):
        return None
    value = d + m / 60 + s / 3600
    if value > limit:
        return None
    return -value if ref == negative else value


def file_sha256(path: Path) -> str:
    """SHA-256 of a file, read in chunks.

    Example:
        >>> len(file_sha256(Path(__file__)))
        64
    """
    h = hashlib.sha256()
    with open(path, "rb") as f:
        for chunk in iter(lambda: f.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def write_atomic(path: Path, data: bytes) -> None:
    """Write ``data`` to ``path`` so that a crash leaves the old file or the new, never half.

    Example:
        >>> write_atomic(Path("/tmp/fieldcol-doc.txt"), b"x")
    """
    path.parent.mkdir(parents=True, exist_ok=True)
    tmp = path.with_name(f".{path.name}.{os.getpid()}.tmp")
    with open(tmp, "wb") as f:
        f.write(data)
        f.flush()
        os.fsync(f.fileno())
    os.replace(tmp, path)
    _fsync_dir(path.parent)


def clean_temporary(photos_dir: Path, max_age_s: float = 86400.0) -> int:
    """Remove temporary files left by an intake that was interrupted (a killed process).

    A file is left alone while the process that writes it still runs (and younger than
    ``max_age_s``), so another program adding a photo at the same moment is not disturbed.

    Returns:
        How many files were removed.

    Example:
        >>> clean_temporary(Path("/no/such/folder"))
        0
    """
    import time

    if not photos_dir.is_dir():
        return 0
    removed = 0
    for tmp in photos_dir.glob("**/.*.tmp"):
        try:
            pid = int(tmp.name.rsplit(".", 2)[-2])
        except (ValueError, IndexError):
            pid = 0
        try:
            young = time.time() - tmp.stat().st_mtime < max_age_s
            if young and pid > 0 and _alive(pid):
                continue
            tmp.unlink()
            removed += 1
        except OSError:  # gone already, or not ours to remove
            continue
    return removed


def _alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except OSError:  # exists, owned by someone else
        return True
    return True


def _fsync_dir(folder: Path) -> None:
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:  # pragma: no cover - platforms without directory handles
        return
    try:
        os.fsync(fd)
    except OSError:  # pragma: no cover
        pass
    finally:
        os.close(fd)
