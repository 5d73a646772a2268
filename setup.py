"""Build step: the wheel carries the repository's ``data/`` and ``assets/`` inside the package,
as ``fieldcol/_data`` and ``fieldcol/_assets`` (read through ``fieldcol._resources``).

Everything else about the project is in ``pyproject.toml``.
"""

import shutil
from pathlib import Path

from setuptools import setup
from setuptools.command.build_py import build_py

ROOT = Path(__file__).resolve().parent
SKIP = shutil.ignore_patterns("*.py", "*.pyc", "__pycache__")  # tools that rebuild the data


class BuildWithData(build_py):
    """``build_py`` that also copies ``data/`` and ``assets/`` into the built package."""

    def run(self) -> None:
        super().run()
        if getattr(self, "editable_mode", False):
            return  # an editable install reads the repository's folders in place
        for folder in ("data", "assets"):
            target = Path(self.build_lib) / "fieldcol" / f"_{folder}"
            shutil.rmtree(target, ignore_errors=True)
            shutil.copytree(ROOT / folder, target, ignore=SKIP)


setup(cmdclass={"build_py": BuildWithData})
