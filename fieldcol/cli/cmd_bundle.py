"""``fieldcol bundle export|import``: records and photos between stores as one file, no network."""

from __future__ import annotations

import argparse


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``bundle`` command to the CLI parser.

    Usage: ``fieldcol bundle export --db site.db out.zip``, ``fieldcol bundle import --db
    other.db out.zip`` (or ``--data HUBDIR [--database URL]`` for the office hub).
    """
    p = sub.add_parser("bundle", help="carry changes and photos between stores in one file")
    verbs = p.add_subparsers(dest="verb", metavar="VERB", required=True)
    e = verbs.add_parser("export", help="write this store's changes and photos to a zip")
    e.add_argument("out", metavar="OUT.zip")
    e.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    e.add_argument("--since", help="only changes made at or after this date or time (UTC)")
    e.set_defaults(func=run)
    i = verbs.add_parser("import", help="merge a bundle's changes and photos into a store")
    i.add_argument("src", metavar="IN.zip")
    where = i.add_mutually_exclusive_group()
    where.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    where.add_argument("--data", help="the office hub's folder (merge into the hub's store)")
    i.add_argument("--database", metavar="URL",
                   help="with --data: the hub's PostgreSQL database (as on fieldcol hub serve)")
    i.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Export or import a bundle; returns the exit status (2 for a refused bundle).

    Example:
        >>> from fieldcol.cli import main
        >>> main(["bundle", "export", "b.zip", "--db", "site.db"])  # doctest: +ELLIPSIS
        b.zip: ... operations (0 new here), ... photos
        ...
        0
    """
    from fieldcol.store import open_store
    from fieldcol.sync import export_bundle, import_bundle

    if args.verb == "export":
        with open_store(args.db, create=False) as store:
            info = export_bundle(store, args.out, since=args.since)
    elif getattr(args, "database", None):
        from fieldcol.errors import InputError
        from fieldcol.sync._hubimport import import_bundle_to_hub

        if not args.data:
            raise InputError("data", "", "--database needs the hub's folder too (its photos)",
                             "add --data HUBDIR")
        info = import_bundle_to_hub(args.data, args.database, args.src)
    elif getattr(args, "data", None):
        from fieldcol.sync._hubstore import HubStore
        hub = HubStore(args.data)
        try:
            info = import_bundle(hub.store, args.src)
        finally:
            hub.close()
    else:
        with open_store(args.db, create=True) as store:
            info = import_bundle(store, args.src)
    for line in info.lines():
        print(line)
    return 0
