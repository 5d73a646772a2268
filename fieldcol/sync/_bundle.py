"""Field bundles: a store's operations and photos in one zip, for when there is no network.

Layout (format ``fieldcol-bundle``, version 1)::

    manifest.json   format, format_version, files (name -> SHA-256), device_id, schema,
                    ops (count), hlc_first, hlc_last, made_at
    ops.jsonl       one operation per line (``fieldcol.store._oplog.Op`` as JSON)
    photos/<sha256>.<ext>   every photo the operations name that this store holds

Import checks the whole bundle (manifest, names, sizes, hashes, every operation, every photo
against its name) before anything is written, then keeps the photos and applies the operations
in one transaction. Operations are applied by id, so importing a bundle twice changes nothing.
"""

from __future__ import annotations

import json
import os
import re
import zipfile
from dataclasses import dataclass
from datetime import datetime, timezone
from pathlib import Path

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.store._archive import Limits, ManifestShape, open_archive, staged
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.store._oplog import Op, hlc_iso, hlc_ms, wall_ms, FUTURE_TOLERANCE_MS
from fieldcol.store._photos import file_sha256
from fieldcol.sync._photofiles import needed_photos, photo_file, take_photo

FORMAT = "fieldcol-bundle"
VERSION = 1
SHAPE = ManifestShape(FORMAT, VERSION, required={
    "device_id": str, "schema": list, "ops": int, "hlc_first": int, "hlc_last": int,
    "made_at": str}, what="fieldcol field bundle")
#: a bundle holds text and photos: 2 GB of either is far beyond a site's worth
LIMITS = Limits(max_member_bytes=1 << 30, max_total_bytes=2 << 30)
_PHOTO_NAME = re.compile(r"photos/([0-9a-f]{64})\.(jpg|png|webp)")


@dataclass(frozen=True)
class BundleInfo:
    """What a bundle held: operations (and how many were new here), photos, clock range."""
    path: Path
    device_id: str
    ops: int
    new: int
    photos: int
    first: str | None
    last: str | None
    pending: int = 0

    def lines(self) -> list[str]:
        """Plain lines for the command line.

        Example:
            >>> BundleInfo(Path("b.zip"), "d", 3, 1, 0, None, None).lines()[0]
            'b.zip: 3 operations (1 new here), 0 photos'
        """
        out = [f"{self.path.name}: {self.ops} operations ({self.new} new here), "
               f"{self.photos} photos"]
        if self.first:
            out.append(f"changes from {self.first} to {self.last}")
        if self.pending:
            out.append(f"{self.pending} rows wait for changes not received yet")
        return out


def parse_since(text: str | None) -> int:
    """The clock reading a ``--since`` date or time means (0 when None).

    Example:
        >>> parse_since("2026-12-01") == 1_796_083_200_000 << 16
        True
    """
    if text is None:
        return 0
    try:
        when = datetime.fromisoformat(text.replace("Z", "+00:00"))
    except ValueError:
        raise InputError("since", text, "not a date or time",
                         "e.g. 2026-12-01 or 2026-12-01T08:00Z") from None
    if when.tzinfo is None:
        when = when.replace(tzinfo=timezone.utc)
    return int(when.timestamp() * 1000) << 16


def export_bundle(store: Store, out: str | os.PathLike[str], *, since: str | None = None) -> BundleInfo:
    """Write this store's operations (those made since ``since``) and their photos to a zip.

    Args:
        store: the open store.
        out: the bundle file to write (replaced atomically).
        since: an ISO date or time; only changes made at or after it (default: all).

    Returns:
        A ``BundleInfo``.

    Example:
        >>> export_bundle(store, "b.zip").ops > 0
        True
    """
    from_hlc = parse_since(since)
    ops = [o for o in store.ops_after(0, 10**9) if o.hlc >= from_hlc]
    text = "".join(json.dumps(o.to_json(), ensure_ascii=False) + "\n" for o in ops).encode()
    files = {"ops.jsonl": _sha(text)}
    photos: list[tuple[str, Path]] = []
    for sha, name in sorted(needed_photos(ops).items()):
        f = photo_file(store, sha)
        if f is not None and file_sha256(f) == sha:
            photos.append((f"photos/{sha}{f.suffix}", f))
            files[f"photos/{sha}{f.suffix}"] = sha
    manifest = {"format": FORMAT, "format_version": VERSION, "files": files,
                "device_id": store.device_id, "schema": list(MIGRATION_NAMES), "ops": len(ops),
                "hlc_first": min((o.hlc for o in ops), default=0),
                "hlc_last": max((o.hlc for o in ops), default=0),
                "made_at": datetime.now(timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ")}
    dest = Path(out)
    if dest.is_dir():
        raise InputError("out", str(dest), "this is a folder", "give a file name such as site.zip")
    tmp = dest.with_name(f".{dest.name}.part")
    try:
        with zipfile.ZipFile(tmp, "w", zipfile.ZIP_DEFLATED) as z:
            z.writestr("manifest.json", json.dumps(manifest, indent=1))
            z.writestr("ops.jsonl", text)
            for name, f in photos:
                z.write(f, name, compress_type=zipfile.ZIP_STORED)
        os.replace(tmp, dest)
    except OSError as e:
        tmp.unlink(missing_ok=True)
        raise InputError("out", str(dest), f"cannot write it ({e.strerror or e})", None) from None
    return BundleInfo(dest, store.device_id, len(ops), 0, len(photos),
                      hlc_iso(manifest["hlc_first"]) if ops else None,
                      hlc_iso(manifest["hlc_last"]) if ops else None)


def _sha(data: bytes) -> str:
    import hashlib
    return hashlib.sha256(data).hexdigest()


def import_bundle(store: Store, src: str | os.PathLike[str]) -> BundleInfo:
    """Check a bundle whole, then keep its photos and merge its operations.

    A bundle that is damaged, of an unknown version, larger than it says, naming paths out of
    its folder, with wrong hashes or operations this store cannot take is refused whole with an
    ``InputError`` on field ``bundle`` (or the operation's field), and nothing is written.

    Args:
        store: the open store (a device's, or the hub's).
        src: the bundle file.

    Returns:
        A ``BundleInfo`` (``new``: operations this store did not have).

    Example:
        >>> _ = export_bundle(store, "b.zip")
        >>> import_bundle(store, "b.zip").new  # its own operations: nothing new
        0
    """
    arc = open_archive(src, SHAPE, field="bundle", limits=LIMITS, space_for=store.photos_dir)
    m = arc.manifest
    ours = list(MIGRATION_NAMES)
    theirs = [s for s in m["schema"] if isinstance(s, str)]
    if len(theirs) != len(m["schema"]):
        raise arc.refuse("its schema list is not a list of names")
    newer = [s for s in theirs if s not in ours]
    if newer:
        raise arc.refuse(f"made by a newer fieldcol (schema steps {', '.join(newer)})",
                         "update fieldcol on this device first")
    if "ops.jsonl" not in arc.files:
        raise arc.refuse("it holds no operations file")
    for name in arc.files:
        if name != "ops.jsonl":
            hit = _PHOTO_NAME.fullmatch(name)
            if not hit or hit.group(1) != arc.files[name]:
                raise arc.refuse(f"{name!r} is not a photo named by its hash")
    store.photos_dir.mkdir(parents=True, exist_ok=True)
    with staged(arc, store.photos_dir) as folder:
        ops = _read_ops(arc, folder / "ops.jsonl")
        if len(ops) != m["ops"]:
            raise arc.refuse(f"it says {m['ops']} operations but holds {len(ops)}")
        if ops and (min(o.hlc for o in ops) < m["hlc_first"] or max(o.hlc for o in ops) > m["hlc_last"]):
            raise arc.refuse("its operations fall outside the clock range it declares")
        schema = store._schema()
        for i, o in enumerate(ops):
            schema.check(o, f"bundle.ops[{i}]")
        if ops and hlc_ms(max(o.hlc for o in ops)) > wall_ms() + FUTURE_TOLERANCE_MS:
            raise InputError("bundle", str(src), "its changes are stamped ahead of this clock "
                             f"(up to {hlc_iso(max(o.hlc for o in ops))})",
                             "check the clock of the device that made it, and of this one")
        photos = [n for n in arc.files if n != "ops.jsonl"]
        datas = []
        for name in photos:
            datas.append((arc.files[name], (folder / name).read_bytes()))
        for sha, data in datas:  # checked images first: a row never names a missing file
            take_photo(store, sha, data, "bundle")
        result = store.apply_ops(ops, source="bundle")
    first = min((o.hlc for o in ops), default=0)
    last = max((o.hlc for o in ops), default=0)
    return BundleInfo(Path(src), m["device_id"], len(ops), result.new, len(photos),
                      hlc_iso(first) if ops else None, hlc_iso(last) if ops else None,
                      result.pending)


def _read_ops(arc: object, path: Path) -> list[Op]:
    ops = []
    with open(path, "rb") as fh:
        for n, line in enumerate(fh, 1):
            if not line.strip():
                continue
            try:
                obj = json.loads(line)
            except (ValueError, UnicodeDecodeError):
                raise InputError("bundle", str(getattr(arc, "path", "")),
                                 f"line {n} of its operations is not JSON", None) from None
            ops.append(Op.from_json(obj, f"bundle.ops[{n - 1}]"))
    return ops


__all__ = ["BundleInfo", "export_bundle", "import_bundle", "parse_since"]
