"""The engineering core is a library on its own: it never imports store, cli, ui or Flet."""

import ast
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1] / "fieldcol"
CORE = ["errors.py", "units.py", "materials.py", "trace.py", "record.py", "recordkeys.py", "assess.py",
        "demand.py", "sections", "stability", "codes", "retrofit", "retrofit.py",
        "bending.py", "band.py", "uncertainty.py", "_lazy.py", "chartlabels.py"]
FORBIDDEN = ("fieldcol.store", "fieldcol.cli", "fieldcol.ui", "fieldcol.sync", "fieldcol.report",
             "flet", "sqlite_utils", "sqlite3")


def _imports(path: Path) -> set[str]:
    tree = ast.parse(path.read_text())
    names = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names.update(a.name for a in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module:
            names.add(node.module)
    return names


def test_core_imports_nothing_from_outer_layers():
    files = []
    for name in CORE:
        p = ROOT / name
        files += sorted(p.rglob("*.py")) if p.is_dir() else ([p] if p.exists() else [])
    assert files, "the engineering core is missing"
    for f in files:
        bad = [m for m in _imports(f) if m.startswith(FORBIDDEN)]
        assert not bad, f"{f.relative_to(ROOT)} imports {bad}"


def test_store_and_sync_import_no_face():
    """The store and sync sit under every face (command line, app, report): they import none
    of them, not even for a constant (the caution lives in ``fieldcol/__init__.py``)."""
    faces = ("fieldcol.cli", "fieldcol.ui", "fieldcol.report", "flet")
    for layer in ("store", "sync"):
        for f in sorted((ROOT / layer).rglob("*.py")):
            bad = [m for m in _imports(f) if m.startswith(faces)]
            assert not bad, f"{f.relative_to(ROOT)} imports {bad}"


def test_report_and_check_text_run_without_flet():
    """The report draws the app's side view and column curve from its plain view-models
    (``ui.restraints_model``, ``ui.check_model``): they, and so the report, never load Flet."""
    import subprocess
    import sys

    code = ("import sys; import fieldcol.report._pages, fieldcol.report._column_sheet, "
            "fieldcol.report._drawings, fieldcol.report._plain, fieldcol.ui.check_model, "
            "fieldcol.ui.restraints_model; "
            "bad = [m for m in sys.modules if m == 'flet' or m.startswith('flet.')]; "
            "assert not bad, bad")
    subprocess.run([sys.executable, "-c", code], check=True, cwd=ROOT.parent)
