"""The ``fieldcol`` command line.

Each command lives in its own module ``fieldcol/cli/cmd_<name>.py`` that defines
``register(subparsers)``; the parser it adds sets ``func=run`` where ``run(args) -> int``.
Command modules import heavy libraries inside ``run`` so that start-up stays fast.
"""

from __future__ import annotations

import argparse
import importlib
import os
import sys
from typing import Any, Sequence

# Before numpy is first imported: its BLAS starts a thread per core as it loads, which costs a
# command such as ``check`` more than its whole calculation (arrays of one column, no matrix
# work); a count the user set stays as set.
os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

from fieldcol import CAUTION, __version__
from fieldcol.errors import InputError



def build_parser(only: str | None = None) -> argparse.ArgumentParser:
    """The command line's parser: every command, or only the command ``only``.

    Building all seventeen commands' parsers costs about a tenth of a second; a run that names
    its command builds just that one (``main`` does), so ``fieldcol check`` starts quickly.

    Example: ``build_parser("check").parse_args(["check", "c.json"]).file`` gives ``'c.json'``.
    """
    parser = argparse.ArgumentParser(
        prog="fieldcol",
        description="Assess existing steel columns on site. " + CAUTION,
    )
    parser.add_argument("--version", action="version", version=f"fieldcol {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for mod in [f"cmd_{only.replace('-', '_')}"] if only else _command_modules():
        importlib.import_module(f"{__name__}.{mod}").register(sub)
    return parser


def _command_modules() -> list[str]:
    import pkgutil

    pkg_path = __path__  # type: ignore[name-defined]
    return sorted(m.name for m in pkgutil.iter_modules(pkg_path) if m.name.startswith("cmd_"))


def _named_command(argv: Sequence[str]) -> str | None:
    """The command a command line names first, when a module of ours holds it (else None:
    the full parser then says what is wrong, or prints the help)."""
    first = next((a for a in argv if not a.startswith("-")), None)
    if first is None or argv[0] != first:  # options before the command: leave it to argparse
        return None
    from pathlib import Path

    if not (first.replace("-", "").isalpha() and first.islower()):
        return None  # not a command name (a path, a typo with other signs): the full parser
    mod = Path(__file__).with_name(f"cmd_{first.replace('-', '_')}.py")
    return first if mod.is_file() else None


def read_json(path: str, field: str = "file") -> Any:
    """The JSON in a file (``-`` reads standard input), read strictly by ``fieldcol.jsontext``:
    UTF-8 with or without a byte-order mark, UTF-16 and UTF-32 are read; duplicate keys, NaN,
    Infinity, lone surrogates and deep nesting raise InputError naming the file.

    Example: ``record = read_json("column.json")``.
    """
    from pathlib import Path

    from fieldcol import jsontext

    try:
        data = sys.stdin.buffer.read() if path == "-" else Path(path).read_bytes()
    except OSError as e:
        raise InputError(field, path, e.strerror or "cannot read the file") from None
    return jsontext.loads(data, field, "standard input" if path == "-" else path)


def print_json(obj: Any) -> None:
    """Print ``obj`` as indented JSON on stdout: numpy values become numbers, and a number that
    is not finite becomes ``null`` (never NaN or Infinity, which are not JSON)."""
    from fieldcol import jsontext

    print(jsontext.dumps(obj))


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit status (0 ok, 2 bad input, 1 other failure)."""
    if argv is None:
        argv = sys.argv[1:]
    parser = build_parser(_named_command(argv))
    args = parser.parse_args(argv)
    if not getattr(args, "func", None):
        parser.print_help()
        return 0
    try:
        return int(args.func(args) or 0)
    except InputError as e:
        # an entry may hold text the terminal cannot show: escape it rather than crash
        msg = str(e).encode("utf-8", "backslashreplace").decode("utf-8")
        print(f"error: {msg}", file=sys.stderr)
        return 2
    except BrokenPipeError:
        # the reader (e.g. `head`) closed the pipe: not an error of ours
        import os

        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return 0
    except Exception as e:
        # no store was opened unless sqlite3 was imported: it need not be imported to start
        sqlite3 = sys.modules.get("sqlite3")
        if sqlite3 is None or not isinstance(e, sqlite3.OperationalError):
            raise
        from fieldcol.store._base import is_busy

        if not is_busy(e):
            raise
        # a lock met outside the store's own retries (StoreBusyError is an InputError,
        # handled above): still the same plain message
        from fieldcol.errors import StoreBusyError

        print(f"error: {StoreBusyError(getattr(args, 'db', None) or 'the store')}",
              file=sys.stderr)
        return 2
