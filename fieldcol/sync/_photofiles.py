"""Photo files travelling by content hash: which ones a batch needs, and taking one in."""

from __future__ import annotations

import hashlib
import json
from pathlib import Path
from typing import Iterable

from fieldcol.errors import InputError
from fieldcol.store import Store, _photos
from fieldcol.store._oplog import Op


def needed_photos(ops: Iterable[Op]) -> dict[str, str]:
    """Content hash -> file name (relative to the photo folder) of every photo the ops name.

    Example:
        >>> needed_photos([])
        {}
    """
    out: dict[str, str] = {}
    for o in ops:
        if o.tbl == "photos":
            value = o.fields().get("path")
            if value:
                name = json.loads(value)
                out[Path(name).stem] = name
    return out


def have_photo(store: Store, sha: str, name: str | None = None) -> bool:
    """True when this store holds the photo with this hash (checked against its content).

    Example:
        >>> have_photo(store, "0" * 64)
        False
    """
    folder = store.photos_dir / sha[:2]
    files = [folder / Path(name).name] if name else list(folder.glob(f"{sha}.*")) \
        if folder.is_dir() else []
    return any(f.is_file() and _photos.file_sha256(f) == sha for f in files)


def photo_file(store: Store, sha: str) -> Path | None:
    """The file of the photo with this hash in this store, or None.

    Example:
        >>> photo_file(store, "0" * 64) is None
        True
    """
    folder = store.photos_dir / sha[:2]
    if not folder.is_dir():
        return None
    for f in sorted(folder.glob(f"{sha}.*")):
        if f.is_file():
            return f
    return None


def take_photo(store: Store, sha: str, data: bytes, field: str = "photo") -> None:
    """Keep photo bytes that arrived from elsewhere, after checking them against their hash.

    Example:
        >>> take_photo(store, "0" * 64, b"abc")
        Traceback (most recent call last):
        fieldcol.errors.InputError: photo: cannot use '000000000000': the bytes do not match their hash (send the photo again)
    """
    if hashlib.sha256(data).hexdigest() != sha:
        raise InputError(field, sha[:12], "the bytes do not match their hash",
                         "send the photo again")
    _photos.ingest(store.photos_dir, data, field)
