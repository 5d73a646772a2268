"""View-models of photos: thumbnails with their markup, the upright photo to show large, and
the store calls behind taking, attaching and marking up a photo (no Flet).

Every function takes an open ``Store`` and touches SQLite or the photo files: the app calls them
through ``asyncio.to_thread`` (or ``app.saver.save``).

Public API::

    thumbs(store, photos) -> list[PhotoThumb]
    photos_of(store, *, finding_id=None, column_id=None, restraint_change_id=None)
    photo_view(store, photo_id) -> PhotoView
    add_photo(store, data, name, *, finding_id=None, column_id=None,
              restraint_change_id=None) -> str
    photo_finding(store, column_id, data, name, *, text=None) -> PhotoFinding
    undo_photo_finding(store, made) -> None
    detach_link(store, link_id) -> None
    set_markup(store, photo_id, shapes) -> list[dict]
    markup_words(shapes) -> str
"""

from __future__ import annotations

import io
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from fieldcol.errors import InputError

if TYPE_CHECKING:
    from fieldcol.store import Photo, Store

VIEW_PX = 1600          # the long side of the photo sent to the screen: sharp on a tablet
QUICK_TEXT = "Defect in the photo (words to add)"
QUICK_CATEGORY = "photo"
QUICK_SEVERITY = "info"  # nothing is judged for the engineer: the card shows it, one tap changes it


@dataclass(frozen=True)
class PhotoThumb:
    """One photo as a thumbnail: its JPEG bytes, when it was taken (EXIF), size and markup."""
    id: str
    thumb: bytes
    taken: str
    caption: str
    size: str
    name: str
    markup: list[dict[str, Any]] = field(default_factory=list)
    aspect: float = 1.0   # width / height of the upright photo

    @property
    def label(self) -> str:
        """What a screen reader says, e.g. ``"photo IMG_1.jpg, taken ..., 2 marks"``."""
        marks = f", {markup_words(self.markup)}" if self.markup else ""
        return f"photo {self.name}, {self.taken}{marks}"


@dataclass(frozen=True)
class PhotoView:
    """The upright photo to show large (a JPEG at most ``VIEW_PX`` on its long side)."""
    id: str
    data: bytes
    width: int
    height: int
    name: str
    taken: str
    size: str
    markup: list[dict[str, Any]]


@dataclass(frozen=True)
class PhotoFinding:
    """What one "photo of a defect" made: the photo, the new finding and its link."""
    photo_id: str
    finding_id: str
    link_id: str


def exif_time(stamp: str | None) -> str:
    """The EXIF time as the camera recorded it, to the minute, with its offset when the photo
    gives one (an offset of zero as ``UTC``, as every other time the app and the report
    write); the one writer of a photo's time (the photo views and the report's captions).

    Example:
        >>> exif_time("2026-02-10T10:15:00+01:00"), exif_time("2026-02-10T10:15:00+00:00")
        ('taken 2026-02-10 10:15 +01:00', 'taken 2026-02-10 10:15 UTC')
        >>> exif_time("2026-02-10T10:15:00"), exif_time(None)
        ('taken 2026-02-10 10:15 (camera clock)', 'no time in the photo')
    """
    if not stamp:
        return "no time in the photo"
    text = stamp.replace("T", " ")[:16]
    offset = stamp[19:]
    return f"taken {text}" + (" UTC" if offset in ("Z", "+00:00") else f" {offset}" if offset
                              else " (camera clock)")


def markup_words(shapes: list[dict[str, Any]] | None) -> str:
    """The markup in words, for a screen reader and a caption.

    Example:
        >>> markup_words([{"kind": "arrow"}, {"kind": "label", "text": "crack"}])
        '1 arrow, label "crack"'
    """
    if not shapes:
        return "no markup"
    arrows = sum(s.get("kind") == "arrow" for s in shapes)
    circles = sum(s.get("kind") == "circle" for s in shapes)
    parts = [f"{arrows} arrow{'s' if arrows > 1 else ''}"] if arrows else []
    parts += [f"{circles} circle{'s' if circles > 1 else ''}"] if circles else []
    parts += [f'label "{s.get("text", "")}"' for s in shapes if s.get("kind") == "label"]
    return ", ".join(parts)


def thumbs(store: "Store", photos: list["Photo"]) -> list[PhotoThumb]:
    """Thumbnails (upright, 320 px) of stored photos, with their markup.

    Args:
        store: an open store.
        photos: ``Photo`` rows.

    Returns:
        One ``PhotoThumb`` each; a file missing on this device gives empty ``thumb`` bytes.

    Example: ``thumbs(store, store.photos_of(finding_id=f.id))[0].taken``.
    """
    out = []
    for p in photos:
        try:
            data = store.photo_path(p, thumbnail=True).read_bytes()
            aspect = _aspect(data)
        except OSError:
            data, aspect = b"", 1.0  # the row still says what the photo was
        out.append(PhotoThumb(id=p.id, thumb=data, taken=exif_time(p.exif_taken_at),
                              caption=p.original_name or "", size=f"{p.width} x {p.height} px",
                              name=p.original_name or p.sha256[:12], markup=p.markup or [],
                              aspect=aspect))
    return out


def _aspect(data: bytes) -> float:
    from PIL import Image

    try:
        with Image.open(io.BytesIO(data)) as im:
            return im.width / im.height
    except (OSError, ValueError, ZeroDivisionError):
        return 1.0


def photos_of(store: "Store", **target: str) -> list[PhotoThumb]:
    """Thumbnails of the photos attached to one finding, column or restraint change.

    Args:
        store: an open store.
        target: exactly one of ``finding_id=``, ``column_id=``, ``restraint_change_id=``.

    Returns:
        ``PhotoThumb`` list, oldest attachment first.

    Example: ``photos_of(store, column_id=cid)``.
    """
    return thumbs(store, store.photos_of(**target))


def photo_view(store: "Store", photo_id: str) -> PhotoView:
    """The photo upright (EXIF orientation applied) as a JPEG for the screen, with its markup.

    The markup's coordinates are fractions of this upright picture, so an image drawn at any
    size with the shapes scaled to it lines up.

    Args:
        store: an open store.
        photo_id: the photo.

    Returns:
        A ``PhotoView``; ``InputError`` on field ``photo`` when the file is missing here.

    Example: ``photo_view(store, pid).data[:2]`` gives ``b'\\xff\\xd8'``.
    """
    from PIL import Image, ImageOps

    p = store.get_photo(photo_id)
    path = store.photo_path(p)
    try:
        with Image.open(path) as im:
            im.draft("RGB", (VIEW_PX, VIEW_PX))  # a JPEG decodes at a smaller scale: faster
            up = ImageOps.exif_transpose(im)
            up.thumbnail((VIEW_PX, VIEW_PX))
            buf = io.BytesIO()
            up.convert("RGB").save(buf, "JPEG", quality=85)
    except OSError as e:
        raise InputError("photo", p.original_name or p.id, f"the file is missing ({e})",
                         "restore the photos folder from a backup") from None
    return PhotoView(id=p.id, data=buf.getvalue(), width=up.width, height=up.height,
                     name=p.original_name or p.sha256[:12], taken=exif_time(p.exif_taken_at),
                     size=f"{p.width} x {p.height} px", markup=p.markup or [])


def add_photo(store: "Store", data: bytes, name: str | None, **target: str | None) -> str:
    """Keep a photo and attach it to one finding, column or restraint change.

    Args:
        store: an open store.
        data: the image file's bytes (JPEG, PNG or WebP).
        name: the file name it came with.
        target: one of ``finding_id=``, ``column_id=``, ``restraint_change_id=``.

    Returns:
        The id of the photo link (what undo takes back).

    Example: ``add_photo(store, jpeg, "IMG_2.jpg", column_id=cid)``.
    """
    photo = store.add_photo(data, original_name=name)
    return store.attach_photo(photo.id, **target).id


def detach_link(store: "Store", link_id: str) -> None:
    """Take back one attachment (undo of ``add_photo``); the photo file stays kept.

    Example: ``detach_link(store, link_id)``.
    """
    store.delete("photo_links", link_id)


def photo_finding(store: "Store", column_id: str, data: bytes, name: str | None, *,
                  text: str | None = None, severity: str = QUICK_SEVERITY) -> PhotoFinding:
    """The short path: a photo of a defect becomes a new open finding on the column at once.

    The words can follow later (the card shows "words to add"); nothing is lost meanwhile.

    Args:
        store: an open store.
        column_id: the column.
        data: the image bytes.
        name: the file name it came with.
        text: one line about it, if typed; a placeholder otherwise.
        severity: the severity (``info`` until the engineer says).

    Returns:
        A ``PhotoFinding`` (ids of what was made, for undo).

    Example: ``photo_finding(store, cid, jpeg, "IMG_3.jpg").finding_id``.
    """
    col = store.get_column(column_id)
    photo = store.add_photo(data, original_name=name)  # a bad file is refused before any row
    words = (text or "").strip() or QUICK_TEXT
    f = store.add_finding(col.site_id, words, category=QUICK_CATEGORY, severity=severity,
                          column_id=column_id)
    link = store.attach_photo(photo.id, finding_id=f.id)
    return PhotoFinding(photo.id, f.id, link.id)


def undo_photo_finding(store: "Store", made: PhotoFinding) -> None:
    """Take back a ``photo_finding`` (tombstones: the rows stay in the file and backups).

    Example: ``undo_photo_finding(store, made)``.
    """
    store.delete("photo_links", made.link_id)
    store.delete("findings", made.finding_id)


def set_markup(store: "Store", photo_id: str, shapes: list[dict[str, Any]]) -> list[dict]:
    """Keep the markup of a photo and give back what it was (for undo).

    Args:
        store: an open store.
        photo_id: the photo.
        shapes: the new shapes (normalised to the upright photo).

    Returns:
        The markup before this change.

    Example: ``old = set_markup(store, pid, [{"kind": "circle", "at": [.5, .5], "r": .1}])``.
    """
    before = store.get_photo(photo_id).markup or []
    store.set_markup(photo_id, shapes)
    return before


__all__ = ["PhotoThumb", "PhotoView", "PhotoFinding", "thumbs", "photos_of", "photo_view",
           "add_photo", "detach_link", "photo_finding", "undo_photo_finding", "set_markup",
           "markup_words", "exif_time", "QUICK_TEXT", "VIEW_PX"]
