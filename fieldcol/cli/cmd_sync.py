"""``fieldcol sync``: send this store's changes and photos to the office hub and fetch others'."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``sync`` command to the CLI parser.

    Usage: ``fieldcol sync --db site.db --hub http://127.0.0.1:8765 --token TOKEN``.
    """
    p = sub.add_parser("sync", help="sync this store with the office hub")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--hub", help="the hub's address (default: the one kept on this device)")
    p.add_argument("--token", help="this device's token (default: the one kept on this device)")
    p.add_argument("--remember", action="store_true",
                   help="keep --hub and --token on this device for the next sync")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Sync; prints what moved and any conflicts; exit 2 on a bad token, hub or clock.

    Example:
        >>> from fieldcol.cli import main
        >>> main(["sync", "--db", "site.db", "--hub", "http://127.0.0.1:9", "--token", "x"])
        2
    """
    from fieldcol.errors import InputError
    from fieldcol.store import open_store
    from fieldcol.sync.client import sync_with_hub

    with open_store(args.db, create=False) as store:
        url = args.hub or store.setting("hub_url")
        token = args.token or store.setting("hub_token")
        if not url:
            raise InputError("hub", "", "no hub address", "give --hub http://HOST:PORT")
        if not token:
            raise InputError("token", "", "no token", "give --token (fieldcol hub add-device)")
        report = sync_with_hub(store, url, token)
        if args.remember:
            store.set_setting("hub_url", url)
            store.set_setting("hub_token", token)
    for line in report.lines():
        print(line)
    return 0
