"""A field bundle into a hub over PostgreSQL (``fieldcol bundle import --data DIR --database URL``).

The bundle is checked and merged whole into a temporary store first (every check a device makes
on a bundle), then its photos and operations go to the hub through ``HubBackend`` like a push:
photos before the operations naming them, operations by id so a second import adds nothing.
"""

from __future__ import annotations

import dataclasses
import os
import tempfile
from pathlib import Path

from fieldcol.sync._bundle import BundleInfo, import_bundle
from fieldcol.sync._hubapi import open_hub

BATCH = 5000


def import_bundle_to_hub(data_dir: str | os.PathLike[str], database: str,
                         src: str | os.PathLike[str]) -> BundleInfo:
    """Check a bundle, then store its photos and operations in the hub.

    Returns the bundle's ``BundleInfo`` with ``new`` counted at the hub.

    Example: ``import_bundle_to_hub("hubdata", "postgresql://hub@127.0.0.1/fieldcol", "b.zip")``.
    """
    from fieldcol.store import Store

    hub = open_hub(data_dir, database)
    try:
        with tempfile.TemporaryDirectory(prefix=".fieldcol-bundle-", dir=data_dir) as tmp:
            with Store(Path(tmp) / "bundle.db") as staged:
                info = import_bundle(staged, src)
                for f in sorted(staged.photos_dir.glob("[0-9a-f][0-9a-f]/*")):
                    if f.is_file() and not f.name.startswith("."):
                        data = f.read_bytes()
                        hub.photo_append(f.stem, 0, len(data), data)
                new, after = 0, 0
                while True:
                    batch = staged.ops_with_seq(after, BATCH)
                    if not batch:
                        break
                    # the bundle's operations only (never anything the staging store made)
                    new += hub.push([op for _, op in batch
                                     if op.device_id != staged.device_id]).new
                    after = batch[-1][0]
    finally:
        hub.close()
    return dataclasses.replace(info, new=new)
