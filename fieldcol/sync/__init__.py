"""Getting records between devices: field bundles (files) and the office hub (HTTP).

Public API::

    export_bundle(store, out, *, since=None) -> BundleInfo
    import_bundle(store, src) -> BundleInfo
    sync_with_hub(store, url, token, *, progress=None) -> SyncReport   (fieldcol.sync.client)
    create_app(hub) / Hub(data_dir)                                       (fieldcol.sync.hub)

The merge itself lives with the store (``fieldcol.store._oplog``): every path here hands
operations to ``Store.apply_ops``, so a bundle, a push and a pull are applied the same way.
"""

from __future__ import annotations

from fieldcol.sync._bundle import BundleInfo, export_bundle, import_bundle

__all__ = ["BundleInfo", "export_bundle", "import_bundle"]
