"""Photo files: stored once under their content hash, with a thumbnail and what EXIF says.

Files are written before the row that names them (temp file, fsync, rename), so a crash can
leave an unreferenced file but never a row pointing at a missing or half-written photo.
"""

from __future__ import annotations

import hashlib
import io
import os
from dataclasses import dataclass
from pathlib import Path

from fieldcol.errors import InputError

FORMATS = {"JPEG": "jpg", "PNG": "png", "WEBP": "webp"}
THUMB_PX = 320
MAX_BYTES = 64 * 1024 * 1024

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

    Args:
        photos_dir: the store's photo folder.
        data: the image file's bytes (JPEG, PNG or WebP).

    Returns:
        A ``PhotoFile`` with paths relative to ``photos_dir``.

    Example:
        >>> ingest(Path("photos"), b"not an image")
        Traceback (most recent call last):
        fieldcol.errors.InputError: photo: cannot use '12 bytes': not an image Pillow can read ...
    """
    from PIL import Image, ImageOps

    sha = hashlib.sha256(data).hexdigest()
    try:
        img = Image.open(io.BytesIO(data))
        img.load()
    except (OSError, SyntaxError, ValueError, Image.DecompressionBombError) as e:
        raise InputError(field, f"{len(data)} bytes", f"not an image Pillow can read ({e})",
                         "JPEG, PNG or WebP") from None
    if img.format not in FORMATS:
        raise InputError(field, str(img.format), "this image format is not kept",
                         "JPEG, PNG or WebP")
    taken_at, lat, lon = _exif(img)
    rel = f"{sha[:2]}/{sha}.{FORMATS[img.format]}"
    thumb_rel = f"thumbs/{sha[:2]}/{sha}.jpg"
    if not (photos_dir / rel).is_file() or file_sha256(photos_dir / rel) != sha:
        write_atomic(photos_dir / rel, data)
    if not (photos_dir / thumb_rel).is_file():
        thumb = ImageOps.exif_transpose(img)
        thumb.thumbnail((THUMB_PX, THUMB_PX))
        buf = io.BytesIO()
        thumb.convert("RGB").save(buf, "JPEG", quality=80)
        write_atomic(photos_dir / thumb_rel, buf.getvalue())
    return PhotoFile(sha, rel, thumb_rel, img.format, img.width, img.height, len(data),
                     taken_at, lat, lon)


def _exif(img: "object") -> tuple[str | None, float | None, float | None]:
    """(time taken as recorded, latitude, longitude) from EXIF, each None when absent."""
    try:
        exif = img.getexif()  # type: ignore[attr-defined]
    except Exception:  # a broken EXIF block must not lose the photo
        return None, None, None
    sub = exif.get_ifd(_EXIF_IFD)
    raw = sub.get(_DATETIME_ORIGINAL) or exif.get(_DATETIME)
    taken = None
    if isinstance(raw, str) and len(raw) >= 19 and raw[4] == ":" and raw[7] == ":":
        # EXIF keeps the camera's local clock; the offset tag, when present, places it
        taken = raw[:10].replace(":", "-") + "T" + raw[11:19]
        offset = sub.get(_OFFSET_ORIGINAL)
        if isinstance(offset, str) and len(offset) == 6:
            taken += offset
    gps = exif.get_ifd(_GPS_IFD)
    lat = _degrees(gps.get(2), gps.get(1), "S")
    lon = _degrees(gps.get(4), gps.get(3), "W")
    return taken, lat, lon


def _degrees(dms: object, ref: object, negative: str) -> float | None:
    try:
        d, m, s = (float(x) for x in dms)  # type: ignore[union-attr]
    except (TypeError, ValueError, ZeroDivisionError):
        return None
    value = d + m / 60 + s / 3600
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
