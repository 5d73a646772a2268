"""The README documents every command, and states the caution."""

import argparse
import re
from pathlib import Path

from fieldcol import CAUTION
from fieldcol.cli import build_parser

README = (Path(__file__).resolve().parents[1] / "README.md").read_text()


def test_every_command_is_in_the_readme():
    parser = build_parser()
    sub = next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))
    missing = [name for name in sub.choices
               if not re.search(rf"`fieldcol {re.escape(name)}\b|`{re.escape(name)}`", README)]
    assert not missing, f"commands not documented in README.md: {missing}"


def test_readme_states_the_caution_and_two_setup_commands():
    assert "aid to, not a substitute for, the judgement of a licensed engineer" in README
    assert "local codes" in README and "govern" in README
    blocks = README.split("```sh")[1:3]
    assert len(blocks) == 2 and all(b.strip().startswith("python3") or "chromium" in b for b in blocks)
    assert CAUTION.startswith("fieldcol is an aid to")
