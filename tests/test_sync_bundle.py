"""Field bundles: changes and photos between stores by file; hostile bundles refused whole.

The refusals follow the usual rules for reading archives from elsewhere (common practice):
no member name leaving the target, sizes as declared, hashes as listed, no zip bombs.
"""

from __future__ import annotations

import hashlib
import json
import zipfile
from pathlib import Path

import pytest

from fieldcol.cli import main
from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.sync import export_bundle, import_bundle

from test_sync_hub import _jpeg
from test_sync_oplog import dump


def _filled(path: Path) -> Store:
    s = Store(path)
    site = s.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
    col = s.add_column(site.id, {"tag": "C1", "section": "W10X49", "length": "14 ft"})
    f = s.add_finding(site.id, "Web crack at splice", category="crack", severity="high",
                      column_id=col.id)
    s.add_photo(_jpeg((90, 90, 200)), finding_id=f.id)
    return s


def test_export_import_twice_and_by_command(tmp_path: Path, capsys):
    with _filled(tmp_path / "a.db") as a, Store(tmp_path / "b.db") as b:
        info = export_bundle(a, tmp_path / "a.zip")
        assert info.ops > 0 and info.photos == 1
        got = import_bundle(b, tmp_path / "a.zip")
        assert got.new == info.ops
        before = dump(b)
        assert import_bundle(b, tmp_path / "a.zip").new == 0
        assert dump(b) == before == dump(a)
        p = b.photos_of(finding_id=b.list_findings(b.list_sites()[0].id)[0].id)[0]
        assert b.photo_path(p).is_file() and b.photo_path(p, thumbnail=True).is_file()
    assert main(["bundle", "export", str(tmp_path / "c.zip"), "--db", str(tmp_path / "a.db"),
                 "--since", "2999-01-01"]) == 0
    assert "0 operations" in capsys.readouterr().out
    assert main(["bundle", "import", str(tmp_path / "a.zip"), "--data", str(tmp_path / "hub")]) == 0
    assert "(0 new here)" not in capsys.readouterr().out
    assert main(["bundle", "export", "x.zip", "--db", str(tmp_path / "a.db"),
                 "--since", "last week"]) == 2


def _rewrite(src: Path, dst: Path, change) -> None:
    """Copy a bundle, letting ``change(members)`` alter the member dict first."""
    with zipfile.ZipFile(src) as z:
        members = {n: z.read(n) for n in z.namelist()}
    change(members)
    with zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as z:
        for n, data in members.items():
            z.writestr(n, data)


def _manifest(members: dict, **changes) -> None:
    m = json.loads(members["manifest.json"])
    m.update(changes)
    members["manifest.json"] = json.dumps(m).encode()


def _relist(members: dict) -> None:
    m = json.loads(members["manifest.json"])
    m["files"] = {n: hashlib.sha256(d).hexdigest() for n, d in members.items()
                  if n != "manifest.json"}
    members["manifest.json"] = json.dumps(m).encode()


def _bad_op(members: dict) -> None:
    lines = members["ops.jsonl"].decode().splitlines()
    op = json.loads(lines[0])
    op["tbl"] = "meta"
    lines[0] = json.dumps(op)
    members["ops.jsonl"] = ("\n".join(lines) + "\n").encode()
    _relist(members)


def _climb(members: dict) -> None:
    members["photos/../../escape.jpg"] = b"x"
    _relist(members)


def _bomb(members: dict) -> None:
    members["photos/" + "0" * 64 + ".jpg"] = b"\0" * (300 << 20)
    _relist(members)


def _future(members: dict) -> None:
    lines = [json.loads(x) for x in members["ops.jsonl"].decode().splitlines()]
    for op in lines:
        op["hlc"] += (365 * 24 * 3600 * 1000) << 16
    members["ops.jsonl"] = "".join(json.dumps(o) + "\n" for o in lines).encode()
    _manifest(members, hlc_first=min(o["hlc"] for o in lines), hlc_last=max(o["hlc"] for o in lines))
    _relist(members)


HOSTILE = {
    "unknown version": lambda m: _manifest(m, format_version=99),
    "wrong hash": lambda m: m.__setitem__("ops.jsonl", m["ops.jsonl"] + b"\n"),
    "fewer operations than declared": lambda m: _manifest(m, ops=10**6),
    "a table it may not write": _bad_op,
    "a path climbing out": _climb,
    "a zip bomb": _bomb,
    "clocks a year ahead": _future,
    "not a bundle": lambda m: _manifest(m, format="something-else"),
}


@pytest.mark.parametrize("what", sorted(HOSTILE))
def test_hostile_bundles_are_refused_whole(tmp_path: Path, what: str):
    with _filled(tmp_path / "a.db") as a:
        export_bundle(a, tmp_path / "a.zip")
    _rewrite(tmp_path / "a.zip", tmp_path / "bad.zip", HOSTILE[what])
    with Store(tmp_path / "b.db") as b:
        before = dump(b)
        with pytest.raises(InputError) as e:
            import_bundle(b, tmp_path / "bad.zip")
        assert e.value.field.startswith("bundle")
        assert dump(b) == before and b.count_ops() == 0
        assert not b.photos_dir.exists() or not any(b.photos_dir.rglob("*.jpg"))
    assert not (tmp_path / "escape.jpg").exists()
    assert main(["bundle", "import", str(tmp_path / "bad.zip"), "--db", str(tmp_path / "b.db")]) == 2


def test_truncated_and_corrupt_files_are_refused(tmp_path: Path):
    with _filled(tmp_path / "a.db") as a:
        export_bundle(a, tmp_path / "a.zip")
    raw = (tmp_path / "a.zip").read_bytes()
    (tmp_path / "cut.zip").write_bytes(raw[: len(raw) // 2])
    (tmp_path / "junk.zip").write_bytes(b"PK\x03\x04" + b"\xff" * 200)
    with Store(tmp_path / "b.db") as b:
        for name in ("cut.zip", "junk.zip", "missing.zip"):
            with pytest.raises(InputError) as e:
                import_bundle(b, tmp_path / name)
            assert e.value.field == "bundle"
        assert b.count_ops() == 0
