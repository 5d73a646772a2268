"""The hub's photos: a content-addressed folder that any number of hub processes share.

A photo lies at ``<folder>/<sha[:2]>/<sha>.<ext>`` with its thumbnail, each written to a
temporary file and renamed into place, so a reader never meets half a file and two processes
receiving the same photo leave one. An unfinished upload grows in ``<partial>/<sha>.part``;
appends to it are serialised across processes by an advisory file lock (``flock``) on
``<sha>.lock``, so two hub processes never interleave pieces of one upload.
"""

from __future__ import annotations

import fcntl
import hashlib
import os
from contextlib import contextmanager
from pathlib import Path
from typing import Iterator

from fieldcol.errors import InputError
from fieldcol.store import _photos
from fieldcol.store._photos import MAX_BYTES
from fieldcol.sync._hubapi import SHA


class HubPhotos:
    """Photos by content hash in ``folder``; unfinished uploads in ``partial``.

    Example:
        >>> p = HubPhotos(Path("hub-photos"), Path("partial")); p.status("0" * 64)
        (False, 0)
    """

    def __init__(self, folder: Path, partial: Path):
        self.folder, self.partial = Path(folder), Path(partial)

    def _part(self, sha: str) -> Path:
        if not SHA.fullmatch(sha):
            raise InputError("sha256", sha[:80], "not a content hash", "64 hex digits")
        return self.partial / f"{sha}.part"

    def file(self, sha: str) -> Path | None:
        """The held photo's file, or None."""
        self._part(sha)
        sub = self.folder / sha[:2]
        if not sub.is_dir():
            return None
        for f in sorted(sub.glob(f"{sha}.*")):
            if f.is_file() and not f.name.endswith(".tmp"):
                return f
        return None

    def status(self, sha: str) -> tuple[bool, int]:
        """(held whole, bytes of an unfinished upload)."""
        part = self._part(sha)
        if self.file(sha) is not None:
            return True, 0
        return False, part.stat().st_size if part.is_file() else 0

    @contextmanager
    def _locked(self, sha: str) -> Iterator[None]:
        self.partial.mkdir(parents=True, exist_ok=True)
        fd = os.open(self.partial / f"{sha}.lock", os.O_RDWR | os.O_CREAT, 0o600)
        try:
            fcntl.flock(fd, fcntl.LOCK_EX)  # other processes and other threads wait here
            yield
        finally:
            os.close(fd)

    def append(self, sha: str, offset: int, total: int, data: bytes) -> tuple[bool, int]:
        """Add a piece of an upload at ``offset``; when ``total`` bytes are in, check the hash
        and keep the photo. Returns (held whole, bytes received)."""
        part = self._part(sha)
        if not 0 < total <= MAX_BYTES:
            raise InputError("total", str(total), "a photo is 1 byte to 64 MB", None)
        if self.file(sha) is not None:  # held already: no lock needed, none left behind
            return True, total
        with self._locked(sha):
            have, got = self.status(sha)
            if have:  # finished by another process while this one waited
                (self.partial / f"{sha}.lock").unlink(missing_ok=True)
                return True, total
            if offset != got:
                raise InputError("offset", str(offset), f"the upload stands at {got} bytes",
                                 f"continue from {got}")
            if got + len(data) > total:
                raise InputError("total", str(total), "more bytes than the photo has", None)
            if got == 0 and len(data) == total:
                blob = data  # whole in one piece: nothing to resume, so no partial file
            else:
                with open(part, "ab") as fh:
                    fh.write(data)
                    fh.flush()
                    os.fsync(fh.fileno())
                got += len(data)
                if got < total:
                    return False, got
                blob = part.read_bytes()
                part.unlink()
            if hashlib.sha256(blob).hexdigest() != sha:  # a mismatch drops the upload
                raise InputError("photo", sha[:12], "the bytes do not match their hash",
                                 "send the photo again")
            _photos.ingest(self.folder, blob, "photo")  # temp file and rename, photo and thumb
            # the lock file goes only now: whoever waits on it, or makes a new one, finds the
            # photo held and touches nothing (after a failure it stays, so appends stay serial)
            (self.partial / f"{sha}.lock").unlink(missing_ok=True)
            return True, total

    def read(self, sha: str, offset: int, size: int) -> bytes | None:
        """Bytes of a held photo from ``offset`` (None when not held)."""
        f = self.file(sha)
        if f is None:
            return None
        with open(f, "rb") as fh:
            fh.seek(max(0, offset))
            return fh.read(size)
