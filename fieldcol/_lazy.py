"""Names of a package imported from its modules when first asked for (PEP 562)."""

from __future__ import annotations

import importlib
import sys
from typing import Any, Callable


def lazy_names(package: str, where: dict[str, str]) -> tuple[Callable[[str], Any],
                                                                 Callable[[], list[str]]]:
    """A package's ``__getattr__`` and ``__dir__`` for names kept in its modules.

    Each name is imported from its module (``where``: name -> module, relative to the package
    or absolute) the first time it is asked for, then kept on the package: a command that
    checks one column does not pay for the modules it never runs (the command line starts
    faster).

    Args:
        package: the package's ``__name__``.
        where: name -> the module that defines it.

    Returns:
        (``__getattr__``, ``__dir__``) to set on the package.

    Example:
        >>> get, names = lazy_names("fieldcol.stability", {"end": "._ends"})
        >>> get("end").__name__, "end" in names()
        ('end', True)
    """
    def __getattr__(name: str) -> Any:
        module = where.get(name)
        if module is None:
            raise AttributeError(f"module {package!r} has no attribute {name!r}")
        value = getattr(importlib.import_module(module, package), name)
        vars(sys.modules[package])[name] = value
        return value

    def __dir__() -> list[str]:
        return sorted(set(vars(sys.modules[package])) | set(where))

    return __getattr__, __dir__
