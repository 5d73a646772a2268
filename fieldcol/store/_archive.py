"""Reading zip files we did not make ourselves, safely: backups now, field bundles too.

A zip from elsewhere may be damaged or hostile: member names that climb out of the target
(``photos/../../x``), a small member that inflates to gigabytes, a manifest that is not the
shape we wrote, text that is not UTF-8, bytes flipped in transit. Every such fault refuses the
whole archive with one ``InputError`` naming the archive's field, before anything is written
where the caller keeps its data.

The layout every archive shares: a ``manifest.json`` (a UTF-8 JSON object) whose ``files`` key
maps each other member's name to its SHA-256, and which carries a format name and an integer
format version. Nothing outside ``files`` is read.

API (three steps; each raises ``InputError(field, ...)`` and leaves the disk as it was)::

    shape = ManifestShape("fieldcol-backup", newest=1,
                          required={"schema_version": int, "counts": dict},
                          optional={"missing_photos": list})
    arc = open_archive("site.zip", shape, field="backup")  # manifest + names + sizes checked
    with staged(arc, beside=target_folder) as folder:     # every member streamed, hash checked
        ...check the extracted files (e.g. SQLite integrity_check), then move them into place
        (os.replace: ``folder`` lies beside the target, on the same file system)
    # the staging folder and whatever was not moved out of it are removed here

- ``open_archive`` reads the central directory and the manifest only: the manifest's shape
  (an object, known keys only, each of its type, versions as integers and never booleans, the
  format name, a version not newer than ``newest``), every member name (relative, no ``..``,
  no ``.``, no backslash, no drive, no control characters, resolved under a folder), the member
  set equal to ``files``, no duplicates, no links, no encryption, only stored or deflated
  members, and every member's declared size against ``Limits`` (per member, in total, the
  free disk space, and the ratio of inflated to compressed size) before a byte is inflated.
- ``staged`` streams each member in chunks into a fresh folder beside the target, stops a
  member at its declared size, and compares its SHA-256 with the manifest.
- ``member_path(root, name, field)`` resolves a name under ``root`` or refuses it; use it for
  any path read from inside an archive (e.g. a database row naming a file).
"""

from __future__ import annotations

import hashlib
import json
import os
import re
import shutil
import stat
import tempfile
import unicodedata
import zipfile
import zlib
from contextlib import contextmanager
from dataclasses import dataclass, field as dc_field
from pathlib import Path
from typing import Any, Iterator, Mapping

from fieldcol.errors import InputError

MANIFEST = "manifest.json"
STAGING_PREFIX = ".fieldcol-staging-"
_SHA256 = re.compile(r"[0-9a-f]{64}")
_CHUNK = 1 << 20


@dataclass(frozen=True)
class Limits:
    """How much an archive may hold; anything beyond is refused before it is read.

    ``max_ratio`` applies to members larger than ``ratio_floor`` once inflated (tiny members
    compress absurdly well and are harmless). Photos barely compress and a SQLite file holds
    mostly text, so a real member of ours stays far below 100:1 (common practice: a ratio
    limit of about 100 is the usual guard against zip bombs).
    """
    max_members: int = 100_000
    max_member_bytes: int = 4 << 30
    max_total_bytes: int = 16 << 30
    max_ratio: float = 100.0
    ratio_floor: int = 1 << 20
    max_manifest_bytes: int = 8 << 20


LIMITS = Limits()


@dataclass(frozen=True)
class ManifestShape:
    """What a manifest must look like, besides ``format``, ``format_version`` and ``files``.

    Args:
        format: the exact ``format`` text (e.g. ``"fieldcol-backup"``).
        newest: the highest ``format_version`` this code understands.
        required / optional: other keys and their JSON types (``int`` never accepts a boolean;
            ``float`` accepts integers too). Unknown keys are refused.
        what: the archive's kind in words, for errors (``"fieldcol backup"``).

    Example:
        >>> ManifestShape("fieldcol-backup", 1, required={"schema_version": int}).newest
        1
    """
    format: str
    newest: int
    required: Mapping[str, type] = dc_field(default_factory=dict)
    optional: Mapping[str, type] = dc_field(default_factory=dict)
    what: str = "fieldcol archive"


@dataclass
class Archive:
    """An archive whose manifest, names and declared sizes passed ``open_archive``."""
    path: Path
    field: str
    manifest: dict[str, Any]
    members: dict[str, zipfile.ZipInfo]

    @property
    def files(self) -> dict[str, str]:
        """Member name -> SHA-256, as the manifest lists them."""
        return self.manifest["files"]

    def refuse(self, reason: str, hint: str | None = None) -> InputError:
        """The error to raise for this archive (field and file named).

        Example: ``raise arc.refuse("its database is damaged")``.
        """
        return InputError(self.field, str(self.path), reason, hint)


def open_archive(src: str | os.PathLike[str], shape: ManifestShape, *, field: str = "archive",
                 limits: Limits = LIMITS, space_for: Path | None = None) -> Archive:
    """Open a zip and check its manifest, member names and declared sizes (nothing inflated
    except the manifest).

    Args:
        src: the zip file.
        shape: what the manifest must hold.
        field: the field errors name (``"backup"``, ``"bundle"``).
        limits: size limits.
        space_for: a folder whose file system must have room for every member (optional).

    Returns:
        An ``Archive``.

    Example:
        >>> open_archive("not-there.zip", ManifestShape("x", 1), field="bundle")
        Traceback (most recent call last):
        fieldcol.errors.InputError: bundle: cannot use 'not-there.zip': no such file
    """
    path = Path(src)
    if not path.is_file():
        raise InputError(field, str(src), "no such file", None)
    try:
        with zipfile.ZipFile(path) as z:
            infos = z.infolist()
            names = [i.filename for i in infos]
            if len(names) > limits.max_members + 1:
                raise InputError(field, str(src), f"more than {limits.max_members} files", None)
            if len(set(names)) != len(names):
                raise InputError(field, str(src), "a file name appears twice in it", None)
            if MANIFEST not in names:
                raise InputError(field, str(src), f"no manifest: not a {shape.what}", None)
            minfo = z.getinfo(MANIFEST)
            _check_info(minfo, limits, field, str(src))
            if minfo.file_size > limits.max_manifest_bytes:
                raise InputError(field, str(src), "its manifest is too large", None)
            raw = _read_capped(z, minfo, limits.max_manifest_bytes, field, str(src))
    except InputError:
        raise
    except (zipfile.BadZipFile, zlib.error, OSError, EOFError, ValueError,
            NotImplementedError, RuntimeError) as e:
        raise InputError(field, str(src), f"cannot read it as a zip file ({e})", None) from None
    manifest = parse_manifest(raw, shape, field, str(src))
    members = {i.filename: i for i in infos if i.filename != MANIFEST}
    listed = manifest["files"]
    if set(members) != set(listed):
        extra = sorted(set(members) - set(listed))[:3]
        missing = sorted(set(listed) - set(members))[:3]
        raise InputError(field, str(src), f"its files do not match its manifest (extra {extra}, "
                         f"missing {missing})", None)
    total = 0
    for name, info in members.items():
        check_name(name, field, str(src))
        _check_info(info, limits, field, str(src))
        total += info.file_size
    if total > limits.max_total_bytes:
        raise InputError(field, str(src), f"it would unpack to {total:,} bytes, more than the "
                         f"{limits.max_total_bytes:,} allowed", None)
    if space_for is not None:
        probe = space_for
        while not probe.exists() and probe != probe.parent:
            probe = probe.parent
        free = shutil.disk_usage(probe).free
        if total > free:
            raise InputError(field, str(src), f"it needs {total:,} bytes and the disk has "
                             f"{free:,} free", "free some space")
    return Archive(path, field, manifest, members)


def parse_manifest(raw: bytes, shape: ManifestShape, field: str, src: str) -> dict[str, Any]:
    """Decode and check a manifest's bytes against ``shape``.

    Args:
        raw: the manifest file's bytes (UTF-8 JSON).
        shape: what it must hold. field / src: named in errors.

    Returns:
        The manifest as a dict.

    Example:
        >>> parse_manifest(b'[]', ManifestShape("x", 1), "bundle", "b.zip")
        Traceback (most recent call last):
        fieldcol.errors.InputError: bundle: cannot use 'b.zip': manifest: expected a JSON object, found a list
    """
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as e:
        raise InputError(field, src, f"manifest: not UTF-8 text (byte {e.start})", None) from None
    try:
        obj = json.loads(text, object_pairs_hook=_no_duplicates,
                         parse_constant=_no_constant)
    except ValueError as e:  # JSONDecodeError, a duplicate key, NaN / Infinity
        raise InputError(field, src, f"manifest: not valid JSON ({e})", None) from None
    except RecursionError:
        raise InputError(field, src, "manifest: nested too deeply", None) from None
    if not isinstance(obj, dict):
        raise InputError(field, src, f"manifest: expected a JSON object, found "
                         f"{_json_type(obj)}", None)
    types: dict[str, type] = {"format": str, "format_version": int, "files": dict,
                              **shape.required, **shape.optional}
    unknown = sorted(set(obj) - set(types))
    if unknown:
        raise InputError(field, src, f"manifest: unknown key {unknown[0]!r}", None)
    for key in ("format", "format_version", "files", *shape.required):
        if key not in obj:
            raise InputError(field, src, f"manifest: {key} is missing", None)
    for key, value in obj.items():
        want = types[key]
        if not _is(value, want):
            raise InputError(field, src, f"manifest: {key} must be "
                             f"{_json_type(want())}, found {_json_type(value)}", None)
    if obj["format"] != shape.format:
        raise InputError(field, src, f"not a {shape.what} (format {obj['format']!r})", None)
    if obj["format_version"] < 1:
        raise InputError(field, src, "manifest: format_version must be 1 or more", None)
    if obj["format_version"] > shape.newest:
        raise InputError(field, src, "made by a newer fieldcol", "update fieldcol to open it")
    for name, digest in obj["files"].items():
        if not isinstance(digest, str) or not _SHA256.fullmatch(digest):
            raise InputError(field, src, f"manifest: files[{name!r}] must be a SHA-256 in "
                             "lower-case hex", None)
    return obj


def check_name(name: str, field: str, src: str) -> None:
    """Refuse a member name that is not a plain relative path of ours.

    Example:
        >>> check_name("photos/ab/x.jpg", "backup", "b.zip")
        >>> check_name("photos/../../x", "backup", "b.zip")
        Traceback (most recent call last):
        fieldcol.errors.InputError: backup: cannot use 'b.zip': the file name 'photos/../../x' leaves its folder
    """
    bad = (not name or len(name) > 1024 or name.startswith("/") or "\\" in name
           or ":" in name or any(unicodedata.category(c)[0] == "C" for c in name)
           or name.endswith("/"))
    parts = name.split("/")
    if bad or any(p in ("", ".", "..") for p in parts):
        raise InputError(field, src, f"the file name {name!r} leaves its folder", None)


def member_path(root: Path, name: str, field: str, src: str = "") -> Path:
    """``root / name``, refused unless it resolves inside ``root``.

    Args:
        root: the folder. name: a relative name read from an archive or a row.

    Returns:
        The path under ``root``.

    Example:
        >>> member_path(Path("/data/photos"), "ab/c.jpg", "backup").as_posix()
        '/data/photos/ab/c.jpg'
    """
    check_name(name, field, src or name)
    base = Path(os.path.abspath(root))
    target = Path(os.path.abspath(base / name))
    real_base = base.resolve()
    if not target.resolve().is_relative_to(real_base) or not target.is_relative_to(base):
        raise InputError(field, src or name, f"the file name {name!r} leaves its folder", None)
    return target


@contextmanager
def staged(arc: Archive, beside: Path, *, names: list[str] | None = None) -> Iterator[Path]:
    """Extract members into a new folder beside ``beside``, each hash checked.

    Args:
        arc: from ``open_archive``.
        beside: the folder the files will be moved into (the staging folder is made in its
            parent, so ``os.replace`` from it never crosses file systems).
        names: the members to extract (default: all).

    Yields:
        The staging folder, laid out as the archive. It is removed when the block ends,
        whether or not the block moved files out of it.

    Example:
        >>> with staged(arc, store.photos_dir) as folder:  # doctest: +SKIP
        ...     (folder / "store.db").is_file()
        True
    """
    parent = Path(os.path.abspath(beside)).parent
    made = [p for p in (parent, *parent.parents) if not p.exists()]
    parent.mkdir(parents=True, exist_ok=True)
    folder = Path(tempfile.mkdtemp(prefix=f"{STAGING_PREFIX}{os.getpid()}-", dir=parent))
    try:
        try:
            with zipfile.ZipFile(arc.path) as z:
                for name in (list(arc.members) if names is None else names):
                    info = arc.members.get(name)
                    if info is None:
                        raise arc.refuse(f"{name!r} is not in it")
                    out = member_path(folder, name, arc.field, str(arc.path))
                    out.parent.mkdir(parents=True, exist_ok=True)
                    h = hashlib.sha256()
                    with z.open(info) as f, open(out, "xb") as w:
                        left = info.file_size
                        while chunk := f.read(min(_CHUNK, left + 1)):
                            left -= len(chunk)
                            if left < 0:
                                raise arc.refuse(f"{name} is larger than it says")
                            h.update(chunk)
                            w.write(chunk)
                        if left:
                            raise arc.refuse(f"{name} is shorter than it says")
                        w.flush()
                        os.fsync(w.fileno())
                    if h.hexdigest() != arc.files[name]:
                        raise arc.refuse(f"{name} is damaged (its hash differs from the "
                                         "manifest)", "use another copy")
        except InputError:
            raise
        except (zipfile.BadZipFile, zlib.error, EOFError, NotImplementedError,
                RuntimeError) as e:
            raise arc.refuse(f"a file in it is damaged ({e})", "use another copy") from None
        except OSError as e:
            raise InputError(arc.field, str(arc.path), f"cannot unpack it here ({e})",
                             "check the disk has space and may be written") from None
        yield folder
    finally:
        shutil.rmtree(folder, ignore_errors=True)
        for p in made:  # folders made only for staging go too (the caller's stay)
            try:
                p.rmdir()
            except OSError:
                break


def clean_staging(folder: Path) -> int:
    """Remove staging folders in ``folder`` left by a process that was killed mid-extraction.

    Returns:
        How many were removed.

    Example:
        >>> clean_staging(Path("/no/such/folder"))
        0
    """
    from fieldcol.store._photos import _alive

    if not folder.is_dir():
        return 0
    removed = 0
    for d in folder.glob(f"{STAGING_PREFIX}*"):
        try:
            pid = int(d.name[len(STAGING_PREFIX):].split("-", 1)[0])
        except ValueError:
            pid = 0
        if d.is_dir() and not (pid > 0 and _alive(pid)):
            shutil.rmtree(d, ignore_errors=True)
            removed += 1
    return removed


def _check_info(info: zipfile.ZipInfo, limits: Limits, field: str, src: str) -> None:
    name = info.filename
    if info.flag_bits & 0x1:
        raise InputError(field, src, f"{name} is encrypted", None)
    if info.compress_type not in (zipfile.ZIP_STORED, zipfile.ZIP_DEFLATED):
        raise InputError(field, src, f"{name} uses a compression fieldcol does not read", None)
    mode = info.external_attr >> 16
    if info.is_dir() or stat.S_IFMT(mode) not in (0, stat.S_IFREG):  # links, devices
        raise InputError(field, src, f"{name} is not a plain file", None)
    if info.file_size > limits.max_member_bytes:
        raise InputError(field, src, f"{name} would unpack to {info.file_size:,} bytes, more "
                         f"than the {limits.max_member_bytes:,} allowed", None)
    if info.file_size > limits.ratio_floor and \
            info.file_size > limits.max_ratio * max(info.compress_size, 1):
        raise InputError(field, src, f"{name} would unpack to {info.file_size:,} bytes from "
                         f"{info.compress_size:,} (more than {limits.max_ratio:g} times): "
                         "refused as a zip bomb", None)


def _read_capped(z: zipfile.ZipFile, info: zipfile.ZipInfo, cap: int, field: str,
                 src: str) -> bytes:
    with z.open(info) as f:
        data = f.read(cap + 1)
    if len(data) > cap:
        raise InputError(field, src, f"{info.filename} is too large", None)
    return data


def _no_duplicates(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for k, v in pairs:
        if k in out:
            raise ValueError(f"the key {k!r} appears twice")
        out[k] = v
    return out


def _no_constant(name: str) -> Any:
    raise ValueError(f"{name} is not a number JSON allows")


def _is(value: Any, want: type) -> bool:
    if want is int:
        return isinstance(value, int) and not isinstance(value, bool)
    if want is float:
        return isinstance(value, (int, float)) and not isinstance(value, bool)
    return isinstance(value, want)


def _json_type(value: Any) -> str:
    for t, word in ((bool, "true or false"), (int, "a whole number"), (float, "a number"),
                    (str, "text"), (list, "a list"), (dict, "a JSON object")):
        if isinstance(value, t):
            return word
    return "null" if value is None else type(value).__name__
