"""Files into and out of the app: photos and field bundles through the platform picker (which
offers the camera on a phone build) or, in a browser, a file upload to the server; a bundle out
through the platform's save dialog (a download in a browser).

In web mode the Python side runs on the server and the picker gives no path and no bytes: each
picked file is uploaded (HTTP PUT to a signed URL) into ``UPLOAD_DIR``, read once, then removed.
``run`` in ``fieldcol.ui.app`` sets ``UPLOAD_DIR`` and the signing key (``FLET_SECRET_KEY``).
On a device build the picker hands back the bytes (or a path) directly.

Public API::

    Picked(name, data)
    intake_for(page) -> Intake          # one per session, kept referenced (a Flet service)
    await intake.pick(many=True, what="photo") -> list[Picked]     # or what="bundle"
    await intake.save(name, data)       # a file out: the save dialog, or a download
    configure_uploads() -> str          # the upload folder, made and remembered
"""

from __future__ import annotations

import asyncio
import os
import re
import secrets
import tempfile
import uuid
import weakref
from dataclasses import dataclass
from pathlib import Path

import flet as ft

from fieldcol.errors import InputError

UPLOAD_DIR: str | None = None
MAX_BYTES = 64 * 1024 * 1024   # the store refuses larger photos too
#: a bundle carries a site's photos: 512 MB is several hundred phone photos, and what a phone
#: can hold in memory to hand over
BUNDLE_BYTES = 512 * 1024 * 1024
# what -> (picker file type, extensions, largest file, what to do about a larger one)
_KINDS = {"photo": (ft.FilePickerFileType.IMAGE, None, MAX_BYTES,
                    "the file is larger than 64 MB", "take the photo at a lower resolution"),
          "bundle": (ft.FilePickerFileType.CUSTOM, ["zip"], BUNDLE_BYTES,
                     "the file is larger than 512 MB",
                     "make the bundle on the other device with fewer photos (since a date)")}
_INTAKES: "weakref.WeakKeyDictionary[ft.Page, Intake]" = weakref.WeakKeyDictionary()
_UNSAFE = re.compile(r"[^A-Za-z0-9._-]+")


@dataclass(frozen=True)
class Picked:
    """One picked photo: the name it came with and its bytes."""
    name: str
    data: bytes


def configure_uploads(folder: str | None = None) -> str:
    """Make the folder browser uploads land in, and the key that signs their URLs.

    Args:
        folder: where uploads go; a new private temporary folder when None.

    Returns:
        The folder (give it to ``ft.run(upload_dir=...)``).

    Example: ``ft.run(main, upload_dir=configure_uploads())``.
    """
    global UPLOAD_DIR
    UPLOAD_DIR = folder or tempfile.mkdtemp(prefix="fieldcol-uploads-")
    os.makedirs(UPLOAD_DIR, mode=0o700, exist_ok=True)
    # a per-run key: upload URLs are signed and die with the server
    os.environ.setdefault("FLET_SECRET_KEY", secrets.token_urlsafe(32))
    os.environ.setdefault("FLET_MAX_UPLOAD_SIZE", str(BUNDLE_BYTES))  # photos: MAX_BYTES, below
    return UPLOAD_DIR


class Intake:
    """The session's file picker and the uploads in flight."""

    def __init__(self, page: ft.Page) -> None:
        self.page = page
        self.picker = ft.FilePicker(on_upload=self._on_upload)
        self._waiting: dict[str, asyncio.Future[str | None]] = {}

    async def pick(self, *, many: bool = True, what: str = "photo") -> list[Picked]:
        """Ask for photos or a bundle; gives them read (an empty list when the engineer cancels).

        Args:
            many: allow several at once.
            what: ``"photo"`` (images) or ``"bundle"`` (a field bundle, ``.zip``).

        Returns:
            The picked files. Raises ``InputError`` on field ``photo`` (or ``bundle``) when one
            cannot be received (too large, upload refused), naming the file.

        Example: ``photos = await intake_for(page).pick()``.
        """
        kind, extensions, limit, too_big, hint = _KINDS[what]
        web = bool(getattr(self.page, "web", False))
        files = await self.picker.pick_files(
            file_type=kind, allowed_extensions=extensions, allow_multiple=many,
            with_data=not web)
        out = []
        for f in files or []:
            if f.size and f.size > limit:
                raise InputError(what, f.name, too_big, hint)
            if f.bytes:
                out.append(Picked(f.name, f.bytes))
            elif f.path:
                out.append(Picked(f.name, await asyncio.to_thread(Path(f.path).read_bytes)))
            else:
                out.append(Picked(f.name, await self._upload(f, what)))
        return out

    async def save(self, name: str, data: bytes) -> str | None:
        """Hand a file out: the platform's save dialog, or a download in a browser.

        Args:
            name: the file name offered.
            data: its bytes.

        Returns:
            The path chosen on a desktop; None in a browser or on a phone (the platform keeps
            the file) or when the engineer cancels.

        Example: ``await intake_for(page).save("site.zip", data)``.
        """
        return await self.picker.save_file(file_name=name, src_bytes=data)

    async def _upload(self, f: ft.FilePickerFile, what: str) -> bytes:
        if UPLOAD_DIR is None:
            raise InputError(what, f.name, "this server takes no uploads",
                             "start the app with `fieldcol app`")
        rel = f"{uuid.uuid4().hex}/{_UNSAFE.sub('_', f.name)[-80:] or what}"
        done: asyncio.Future[str | None] = asyncio.get_running_loop().create_future()
        self._waiting[f.name] = done
        try:
            await self.picker.upload([ft.FilePickerUploadFile(
                upload_url=self.page.get_upload_url(rel, 600), id=f.id, name=f.name)])
            error = await asyncio.wait_for(done, timeout=600)
        except asyncio.TimeoutError:
            error = "the upload took longer than 10 minutes"
        finally:
            self._waiting.pop(f.name, None)
        path = Path(UPLOAD_DIR) / rel
        try:
            if error:
                raise InputError(what, f.name, f"the upload failed ({error})", "try again")
            return await asyncio.to_thread(path.read_bytes)
        except OSError as e:
            raise InputError(what, f.name, f"the upload did not arrive ({e})",
                             "try again") from None
        finally:
            path.unlink(missing_ok=True)  # the store keeps its own copy
            try:
                path.parent.rmdir()
            except OSError:
                pass

    def _on_upload(self, e: ft.FilePickerUploadEvent) -> None:
        done = self._waiting.get(e.file_name)
        if done is None or done.done():
            return
        if e.error:
            done.set_result(e.error)
        elif e.progress is not None and e.progress >= 1.0:
            done.set_result(None)


def intake_for(page: ft.Page) -> Intake:
    """The session's ``Intake`` (made on first use and kept for the page's life).

    Example: ``await intake_for(page).pick()``.
    """
    got = _INTAKES.get(page)
    if got is None:
        got = _INTAKES[page] = Intake(page)
    return got


__all__ = ["Picked", "Intake", "intake_for", "configure_uploads", "UPLOAD_DIR", "MAX_BYTES"]
