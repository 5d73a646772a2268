"""The files fieldcol ships with: the section and material tables (``data``) and the report
fonts (``assets``).

They live at the top of the repository. A wheel carries them inside the package
(``fieldcol/_data``, ``fieldcol/_assets``: ``setup.py`` copies them there when it builds), so
an installed fieldcol finds them through ``importlib.resources``; a source checkout (the
editable install, a device build) reads the repository's own folders.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from importlib.resources.abc import Traversable

FOLDERS = ("data", "assets")


def shipped(folder: str) -> Traversable:
    """One of the folders fieldcol ships with.

    Args:
        folder: ``"data"`` or ``"assets"``.

    Returns:
        The folder (a ``Traversable``: open its files with ``.open()`` / ``.read_bytes()``).

    Example:
        >>> (shipped("data") / "materials.csv").is_file()
        True
    """
    if folder not in FOLDERS:
        raise ValueError(f"fieldcol ships no folder {folder!r} (only {', '.join(FOLDERS)})")
    here = Path(__file__).resolve().parent
    # a folder on disk first: importlib.resources (with tempfile and random) costs ~25 ms of
    # every command's start, and is needed only for a package imported from a zip
    for path in (here / f"_{folder}", here.parent / folder):
        if path.is_dir():
            return path
    from importlib.resources import files

    return files("fieldcol") / f"_{folder}"
