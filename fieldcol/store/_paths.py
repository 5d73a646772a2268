"""Where the store lives on this device.

The database must never sit inside the app's own folder: a mobile app update replaces that
folder wholesale, and the engineer's records with it.
"""

from __future__ import annotations

import os
from pathlib import Path

from fieldcol.errors import InputError

DB_NAME = "fieldcol.db"


def data_dir(env: dict[str, str] | None = None) -> Path:
    """The per-user data folder for fieldcol on this platform.

    Args:
        env: environment to read (defaults to ``os.environ``).

    Returns:
        ``$FLET_APP_STORAGE_DATA`` when set (the folder Flet gives a packaged mobile app),
        else ``$XDG_DATA_HOME/fieldcol``, else ``~/.local/share/fieldcol``
        (``%APPDATA%/fieldcol`` on Windows, ``~/Library/Application Support/fieldcol`` on macOS).

    Example:
        >>> data_dir({"XDG_DATA_HOME": "/data"}).as_posix()
        '/data/fieldcol'
    """
    env = dict(os.environ) if env is None else env
    if env.get("FLET_APP_STORAGE_DATA"):
        return Path(env["FLET_APP_STORAGE_DATA"])
    if env.get("XDG_DATA_HOME"):
        return Path(env["XDG_DATA_HOME"]) / "fieldcol"
    if os.name == "nt" and env.get("APPDATA"):
        return Path(env["APPDATA"]) / "fieldcol"
    home = Path(env.get("HOME") or Path.home())
    if os.uname().sysname == "Darwin":  # pragma: no cover - not our CI platform
        return home / "Library" / "Application Support" / "fieldcol"
    return home / ".local" / "share" / "fieldcol"


def resolve_db_path(db: str | os.PathLike[str] | None = None,
                    env: dict[str, str] | None = None) -> Path:
    """The database file to use: ``db`` if given, else ``$FIELDCOL_DB``, else the data folder.

    Args:
        db: an explicit path (the CLI's ``--db``); empty text is refused.
        env: environment to read (defaults to ``os.environ``).

    Returns:
        An absolute path to the SQLite file (which may not exist yet).

    Example:
        >>> resolve_db_path(None, {"FIELDCOL_DB": "/tmp/site.db"}).as_posix()
        '/tmp/site.db'
    """
    env = dict(os.environ) if env is None else env
    if db is not None:
        text = os.fspath(db)
        if not text.strip():
            raise InputError("db", text, "the database path is empty", "give a file path")
        return Path(text).expanduser().absolute()
    if env.get("FIELDCOL_DB"):
        return Path(env["FIELDCOL_DB"]).expanduser().absolute()
    return (data_dir(env) / DB_NAME).absolute()


def photos_dir(db_path: Path) -> Path:
    """The photo folder that belongs to a database: beside it, named after it.

    Example:
        >>> photos_dir(Path("/d/fieldcol.db")).as_posix()
        '/d/fieldcol-photos'
    """
    return db_path.with_name(db_path.stem + "-photos")
