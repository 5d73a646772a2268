"""Field bundles from the sync screen: this device's changes and photos saved as one file, and a
file made on another device opened here, for when there is no network at all.

The same bundle as ``fieldcol bundle export`` / ``import`` (``fieldcol.sync._bundle``): a bundle
is checked whole before anything is written, and opening one twice changes nothing.

Public API::

    make_bundle(store) -> Made          # the file's name, bytes and what it holds
    open_bundle(store, name, data) -> BundleInfo
    made_words(made) -> str; opened_words(info) -> str
"""

from __future__ import annotations

import tempfile
from dataclasses import dataclass
from datetime import datetime, timezone
from pathlib import Path
from typing import TYPE_CHECKING

from fieldcol.errors import InputError
from fieldcol.sync._bundle import BundleInfo, export_bundle, import_bundle

if TYPE_CHECKING:
    from fieldcol.store import Store


@dataclass(frozen=True)
class Made:
    """A bundle made for saving: the file name offered, its bytes, what it holds."""
    name: str
    data: bytes
    info: BundleInfo


def _count(n: int, one: str, many: str) -> str:
    return f"{n:,} {one if n == 1 else many}"


def bundle_name(device_id: str, when: datetime) -> str:
    """The file name a new bundle is offered under: the device and the time it was made (UTC),
    so bundles from several devices sort and never clash.

    Example:
        >>> bundle_name("3f2a9c1e-0000", datetime(2026, 12, 5, 9, 30, tzinfo=timezone.utc))
        'fieldcol-3f2a9c-2026-12-05-0930.zip'
    """
    return f"fieldcol-{device_id.replace('-', '')[:6]}-{when:%Y-%m-%d-%H%M}.zip"


def make_bundle(store: "Store") -> Made:
    """Every change kept on this device (its own and those it received) and their photos, as a
    bundle's bytes (a whole bundle each time: the receiving store skips what it has).

    Args:
        store: the open store.

    Returns:
        A ``Made``.

    Example:
        >>> make_bundle(store).name.endswith(".zip")
        True
    """
    name = bundle_name(store.device_id, datetime.now(timezone.utc))
    with tempfile.TemporaryDirectory(prefix="fieldcol-bundle-") as tmp:
        info = export_bundle(store, Path(tmp) / name)
        return Made(name, info.path.read_bytes(), info)


def open_bundle(store: "Store", name: str, data: bytes) -> BundleInfo:
    """Check a bundle's bytes whole, then keep its photos and merge its changes.

    Args:
        store: the open store.
        name: the file's name as picked (said in errors and results).
        data: its bytes.

    Returns:
        The ``BundleInfo`` (``new``: changes this device did not have). Raises ``InputError``
        on field ``bundle`` naming the file when it is refused; nothing is written then.

    Example:
        >>> m = make_bundle(store)
        >>> open_bundle(store, m.name, m.data).new  # its own bundle: nothing new
        0
    """
    if not data:
        raise InputError("bundle", name, "the file is empty", "pick the bundle's .zip file")
    with tempfile.TemporaryDirectory(prefix="fieldcol-bundle-") as tmp:
        path = Path(tmp) / "picked.zip"
        path.write_bytes(data)
        try:
            info = import_bundle(store, path)
        except InputError as e:
            # the checks speak of the temporary copy: name the file the engineer picked
            value = name if e.field == "bundle" else e.value
            raise InputError(e.field, value, e.reason, e.hint) from None
    return BundleInfo(Path(name), info.device_id, info.ops, info.new, info.photos, info.first,
                      info.last, info.pending)


def made_words(made: Made) -> str:
    """What a saved bundle holds, in a line.

    Example:
        >>> made_words(Made("b.zip", b"", BundleInfo(Path("b.zip"), "d", 3, 0, 1, None, None)))
        'Bundle b.zip: 3 changes, 1 photo. Open it on the office computer or another device.'
    """
    i = made.info
    return (f"Bundle {made.name}: {_count(i.ops, 'change', 'changes')}, "
            f"{_count(i.photos, 'photo', 'photos')}. Open it on the office computer or another "
            "device.")


def opened_words(info: BundleInfo) -> str:
    """What an opened bundle brought, in a line.

    Example:
        >>> opened_words(BundleInfo(Path("b.zip"), "d", 3, 2, 1, None, None))
        'Opened b.zip: 2 new changes of 3, 1 photo.'
        >>> opened_words(BundleInfo(Path("b.zip"), "d", 3, 0, 0, None, None))
        'Opened b.zip: nothing new (all 3 changes were here already).'
    """
    if info.new == 0 and info.ops:
        return f"Opened {info.path.name}: nothing new (all {_count(info.ops, 'change', 'changes')} " \
               "were here already)."
    words = f"Opened {info.path.name}: {info.new:,} new {'change' if info.new == 1 else 'changes'}" \
            f" of {info.ops:,}, {_count(info.photos, 'photo', 'photos')}."
    if info.pending:
        words += f" {_count(info.pending, 'change waits', 'changes wait')} for its column or " \
                 "site to arrive."
    return words
