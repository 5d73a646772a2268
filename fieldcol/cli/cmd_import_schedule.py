"""``fieldcol import-schedule``: preview, then apply, a CSV column schedule for a site."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path


def register(sub: argparse._SubParsersAction) -> None:
    """Add the ``import-schedule`` command to the CLI parser.

    Usage: ``fieldcol import-schedule cols.csv --db site.db --site Depot --apply``.
    """
    p = sub.add_parser(
        "import-schedule", help="import a CSV column schedule (preview unless --apply)",
        description="Read a CSV schedule (tag, level, grid, section, length, material, demand; "
        "units in the header like 'length (ft)' or in each cell like '30 ft'). Prints what "
        "would change and every row error, and writes nothing unless --apply; --apply writes "
        "all rows in one transaction and refuses the file if any row has an error. A new site "
        "needs --create-site with --code (and --units, else us for aisc360-22, si for "
        "en1993-1-1).")
    p.add_argument("file", metavar="FILE.csv")
    p.add_argument("--db", help="the store file (default: $FIELDCOL_DB or the app-data folder)")
    p.add_argument("--site", required=True, help="the site's name")
    p.add_argument("--apply", action="store_true", help="write the changes")
    p.add_argument("--create-site", action="store_true", help="create the site if it is new")
    p.add_argument("--code", choices=("aisc360-22", "en1993-1-1"), help="code for a new site")
    p.add_argument("--units", choices=("us", "si"), help="unit system for a new site")
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    """Preview or apply the import; exit status 0 when clean, 2 when rows have errors.

    Example:
        >>> from fieldcol.cli import main
        >>> main(["import-schedule", "cols.csv", "--db", "site.db", "--site", "Depot"])
        site Depot
          row    2  add       A/1-L1
          row    3  update    B/4-L1 (length)
        1 to add, 1 to update, 0 unchanged, 0 row errors
        nothing written (preview); add --apply to write
        0
    """
    import tempfile

    from fieldcol.errors import InputError
    from fieldcol.store import apply_schedule, open_store, preview_schedule, resolve_db_path

    path = resolve_db_path(args.db)
    code = args.code
    with tempfile.TemporaryDirectory(prefix="fieldcol-preview-") as tmp:
        # a preview, or an import refused, must not create the store file: read against an
        # empty one first, and create the real one only to write a clean import
        exists = path.exists()
        with open_store(path if exists else f"{tmp}/empty.db") as store:
            preview = preview_schedule(store, args.site, args.file, code=code)
            for line in preview.each_line():
                print(line)
            if preview.errors:
                if args.apply:
                    raise preview.refusal()
                print("nothing written: fix the rows above", file=sys.stderr)
                return 2
            if not args.apply:
                print("nothing written (preview); add --apply to write")
                return 0
            create = None
            if not preview.site_exists:
                if not args.create_site:
                    raise InputError("site", args.site, "no site with this name",
                                     "add --create-site --code aisc360-22|en1993-1-1")
                if code is None:
                    raise InputError("code", "", "a new site needs its design code",
                                     "--code aisc360-22 or --code en1993-1-1")
                units = args.units or {"aisc360-22": "us", "en1993-1-1": "si"}[code]
                create = {"code": code, "unit_system": units}
            if exists:  # written as previewed, unless another program wrote meanwhile
                done = apply_schedule(store, args.site, args.file, create_site=create,
                                      preview=preview)
        if not exists:
            try:
                with open_store(path) as store:
                    done = apply_schedule(store, args.site, args.file, create_site=create)
            except BaseException:
                _remove_new_store(path)
                raise
    c = done.counts()
    print(f"written: {c['add']} added, {c['update']} updated, {c['unchanged']} unchanged")
    return 0


def _remove_new_store(path: "Path") -> None:
    """Take away a store file this command created for an import that then failed."""
    for p in (path, path.with_name(path.name + "-wal"), path.with_name(path.name + "-shm"),
              path.with_name(path.name + "-journal")):
        p.unlink(missing_ok=True)
