"""``fieldcol app``: serve the field app to a browser (web mode, works with no network)."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``app`` command to the CLI parser."""
    p = sub.add_parser("app", help="serve the field app in a browser",
                       description="Serve the field app (sites, columns, checks, edits) on this "
                       "machine for a browser; everything it needs is served locally.")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--host", default="127.0.0.1",
                   help="address to listen on (default 127.0.0.1, this machine only); any other "
                   "address (0.0.0.0 for every network) needs the access key on every request")
    p.add_argument("--key", help="the access key (16 to 128 letters, digits or _-.~); made up "
                   "afresh when listening beyond this machine and none is given; given with a "
                   "loopback host, it is required there too")
    p.add_argument("--port", type=int, default=8550, help="port to listen on (default 8550)")
    p.add_argument("--demo", action="store_true",
                   help="build the demo site into the store first if it is not there")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Serve the app until interrupted; returns the exit status.

    Beyond loopback (``--host 0.0.0.0``) every request needs the access key: the one given
    with ``--key`` or one made up now; the addresses printed carry it.

    Example: ``fieldcol app --db /tmp/demo.db --demo --port 8550``.
    """
    from fieldcol.cli import CAUTION
    from fieldcol.errors import InputError
    from fieldcol.store import open_store
    from fieldcol.ui._access import check_key, is_loopback, new_key, open_addresses

    if not 1 <= args.port <= 65535:
        raise InputError("port", str(args.port), "a port is a whole number from 1 to 65535",
                         "e.g. 8550")
    key = check_key(args.key) if args.key is not None else None
    if key is None and not is_loopback(args.host):
        key = new_key()
    store = open_store(args.db)
    try:
        if args.demo:
            from fieldcol.demo import SITE_NAME, build_demo

            if store.find_site(SITE_NAME) is None:
                build_demo(store)
        from fieldcol.ui.app import run as serve

        print(f"fieldcol app for {store.path}")
        for url in open_addresses(args.host, args.port, key):
            print(f"open {url} in a browser (Ctrl+C stops)", flush=True)
        if key is not None:
            print("anyone with this address and key can read and change every record; the "
                  "traffic is not encrypted (see the README: put it behind TLS)", flush=True)
        print(CAUTION, flush=True)
        serve(store, host=args.host, port=args.port, key=key)
    finally:
        store.close()
    return 0
