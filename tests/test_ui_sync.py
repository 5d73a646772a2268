"""The sync screen in a real browser: a device with a conflict syncs with a real hub on loopback.

The screen is served on its own (``fieldcol.ui.sync_view.serve``) in a subprocess; Debian
chromium driven by Playwright, every request leaving the machine refused. Screenshot
``sync.png`` at phone width under ``$FIELDCOL_SHOTS``.
"""

from __future__ import annotations

import os
import socket
import subprocess
import sys
import time
from pathlib import Path

from fieldcol.store import Store
from fieldcol.sync._loopback import RunningHub, free_port
from fieldcol.sync.client import sync_with_hub

from fieldcol.sync._hubstore import HubStore
from fieldcol.sync.client import SyncReport

from test_sync_oplog import send
from _browser import PHONE, SHOTS, _open, _poll, _sel, _wait, browser  # noqa: F401



def test_sync_screen_syncs_and_shows_conflicts(tmp_path: Path, browser):
    hub = RunningHub(tmp_path / "hub")
    db = tmp_path / "device.db"
    with Store(db) as a, Store(tmp_path / "other.db") as b:
        site = a.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        col = a.add_column(site.id, {"tag": "C4", "section": "W10X49", "length": "14 ft"})
        send(a, b)
        a.update_column(col.id, location="by the press")
        b.update_column(col.id, location="by the dock")
        sync_with_hub(b, hub.url, hub.token("office-tablet"))
        token = hub.token("site-phone")
        a.set_setting("hub_url", hub.url)
        a.set_setting("hub_token", token)
    port = free_port()
    env = {**os.environ, "FLET_FORCE_WEB_SERVER": "true"}
    proc = subprocess.Popen([sys.executable, "-c", "import sys; from fieldcol.ui.sync_view import "
                             "serve; serve(sys.argv[1], int(sys.argv[2]))", str(db), str(port)],
                            env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    try:
        deadline = time.monotonic() + 60
        while True:
            try:
                socket.create_connection(("127.0.0.1", port), timeout=0.5).close()
                break
            except OSError:
                assert proc.poll() is None and time.monotonic() < deadline
                time.sleep(0.1)
        page = _open(browser, f"http://127.0.0.1:{port}", PHONE)
        _wait(page, "sync-now").click()
        _poll(lambda: page.locator(_sel("sync-status")).first.inner_text(),
              lambda t: "finished" in t, "sync status", timeout=60)
        _wait(page, "conflict-0")
        SHOTS.mkdir(parents=True, exist_ok=True)
        time.sleep(1)
        page.screenshot(path=str(SHOTS / "sync.png"))
        html = page.content()
        assert "by the press" in html and "by the dock" in html  # both values in view
        # named by its tag and site, not by its id; what moved said once, in words
        assert "column C4 (Kestrel Lane Print Works): location" in html
        assert "1 conflict to review" in html and "(1):" not in html
        _wait(page, "conflict-0-other").click()
        _poll(lambda: page.locator(_sel("sync-status")).first.inner_text(),
              lambda t: "Saved your choice" in t, "choice saved")
        assert page.refused == [] or all("rive" in u for u in page.refused)
    finally:
        proc.terminate()
        proc.wait(10)
        hub.stop()
    with Store(db) as a:
        assert a.conflicts() == []
        assert a.get_column(col.id).location in ("by the press", "by the dock")


def _listening(proc: subprocess.Popen, port: int, log: Path) -> None:
    deadline = time.monotonic() + 60
    while True:
        assert proc.poll() is None, log.read_text()
        try:
            socket.create_connection(("127.0.0.1", port), timeout=0.5).close()
            return
        except OSError:
            assert time.monotonic() < deadline, log.read_text()
            time.sleep(0.1)


def test_the_office_view_shows_every_site_from_every_device(tmp_path: Path, browser):
    """`fieldcol hub serve --office-port`: two devices sync to the hub over HTTP; the app in a
    browser over the hub's records shows both devices' sites; /sync is one tap away and offers
    the bundles and conflicts, not a hub to sync with."""
    data = tmp_path / "hub"
    hub = HubStore(data)
    tokens = [hub.add_device("site-phone"), hub.add_device("site-tablet")]
    hub.close()
    port, office = free_port(), free_port()
    log = tmp_path / "hub.log"
    env = {**os.environ, "FLET_FORCE_WEB_SERVER": "true"}
    with open(log, "w") as out:
        proc = subprocess.Popen([sys.executable, "-m", "fieldcol", "hub", "serve", "--data",
                                 str(data), "--port", str(port), "--office-port", str(office)],
                                stdout=out, stderr=subprocess.STDOUT, env=env)
    try:
        _listening(proc, port, log)
        names = ["Kestrel Lane Print Works", "Heron Quay Cold Store"]
        for i, (name, token) in enumerate(zip(names, tokens)):
            with Store(tmp_path / f"dev{i}.db") as s:
                site = s.add_site(name, code="aisc360-22", unit_system="us")
                s.add_column(site.id, {"tag": f"D{i}", "section": "W10X49", "length": "14 ft"})
                report = sync_with_hub(s, f"http://127.0.0.1:{port}", token)
                assert isinstance(report, SyncReport) and report.sent == 2
        _listening(proc, office, log)
        assert f"http://127.0.0.1:{office}" in log.read_text()
        page = _open(browser, f"http://127.0.0.1:{office}", PHONE)
        for name in names:
            _poll(lambda: page.content(), lambda html, n=name: n in html, f"site {name}")
        _wait(page, "open-sync").click()
        # the hub has no hub to reach: its screen keeps the conflicts and the bundles
        assert "office hub" in _wait(page, "office-note").inner_text()
        _wait(page, "bundle-open")
        assert page.locator(_sel("sync-now")).count() == 0
        assert page.locator(_sel("field-hub-url")).count() == 0
        assert all("rive" in u for u in page.refused)  # the one font loader it tries
    finally:
        proc.terminate()
        proc.wait(10)


def test_sync_never_imports_the_app():
    """The hub takes the office view as a callable: nothing under fieldcol/sync imports ui."""
    import ast

    root = Path(__file__).resolve().parents[1] / "fieldcol" / "sync"
    for f in root.glob("*.py"):
        for node in ast.walk(ast.parse(f.read_text())):
            names = [a.name for a in node.names] if isinstance(node, ast.Import) else \
                [node.module or ""] if isinstance(node, ast.ImportFrom) else []
            assert not any(n.startswith(("fieldcol.ui", "flet")) for n in names), f


def test_sync_lines_say_what_the_device_holds(tmp_path: Path):
    # the conflicts are counted on their cards, not again in the summary
    from fieldcol.ui.sync_view import sync_lines

    with Store(tmp_path / "a.db") as a:
        site = a.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        a.add_column(site.id, {"tag": "C4", "section": "W10X49", "length": "14 ft"})
        lines = sync_lines(a)
    assert lines[0].startswith("changes kept here: 2 (2 made on this device)")
    assert lines[1] == "changes waiting for their column or site to arrive: 0"
    assert not any("conflict" in t for t in lines)


def _serve_screen(db: Path, tmp_path: Path) -> tuple[subprocess.Popen, int]:
    port = free_port()
    log = tmp_path / "screen.log"
    env = {**os.environ, "FLET_FORCE_WEB_SERVER": "true"}
    with open(log, "w") as out:
        proc = subprocess.Popen([sys.executable, "-c", "import sys; from fieldcol.ui.sync_view "
                                 "import serve; serve(sys.argv[1], int(sys.argv[2]))", str(db),
                                 str(port)], env=env, stdout=out, stderr=subprocess.STDOUT)
    _listening(proc, port, log)
    return proc, port


def test_a_bundle_is_saved_and_another_opened_from_the_sync_screen(tmp_path: Path, browser):
    """No network at all: the phone saves its changes as a bundle (a download here), and opens a
    bundle made on the office tablet; a damaged file is refused, naming it, nothing changed."""
    from fieldcol.sync._bundle import export_bundle, import_bundle

    db = tmp_path / "phone.db"
    with Store(db) as a:
        site = a.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        a.add_column(site.id, {"tag": "C4", "section": "W10X49", "length": "14 ft"})
    with Store(tmp_path / "tablet.db") as t:
        other = t.add_site("Heron Quay Cold Store", code="en1993-1-1", unit_system="si")
        t.add_column(other.id, {"tag": "K2", "section": "HEB 200", "length": "4.2 m"})
        export_bundle(t, tmp_path / "from-tablet.zip")
    bad = tmp_path / "damaged.zip"
    bad.write_bytes((tmp_path / "from-tablet.zip").read_bytes()[:300])  # cut short in transit
    proc, port = _serve_screen(db, tmp_path)
    try:
        page = _open(browser, f"http://127.0.0.1:{port}", PHONE)
        with page.expect_download(timeout=60_000) as got:
            _wait(page, "bundle-save").click()
        saved = tmp_path / got.value.suggested_filename
        got.value.save_as(saved)
        assert saved.name.startswith("fieldcol-") and saved.suffix == ".zip"
        _poll(lambda: page.locator(_sel("bundle-status")).first.inner_text(),
              lambda t: "2 changes" in t, "bundle saved")
        with Store(tmp_path / "office.db") as office:  # the saved file is a whole bundle
            assert import_bundle(office, saved).new == 2
            assert office.find_column(office.list_sites()[0].id, "C4") is not None
        for path, said in ((bad, "Not opened: damaged.zip"),
                           (tmp_path / "from-tablet.zip", "2 new changes of 2")):
            with page.expect_file_chooser(timeout=60_000) as chooser:
                _wait(page, "bundle-open").click()
            chooser.value.set_files(str(path))
            _poll(lambda: page.locator(_sel("bundle-status")).first.inner_text(),
                  lambda t, s=said: s in t, f"bundle {path.name}", timeout=60)
            if path == bad:
                with Store(db) as a:  # refused whole: the phone's store as it was
                    assert [s.name for s in a.list_sites()] == ["Kestrel Lane Print Works"]
                assert "Nothing was changed" in page.content()
        SHOTS.mkdir(parents=True, exist_ok=True)
        time.sleep(1)
        page.screenshot(path=str(SHOTS / "bundle.png"))
        assert page.refused == [] or all("rive" in u for u in page.refused)
    finally:
        proc.terminate()
        proc.wait(10)
    with Store(db) as a:
        assert sorted(s.name for s in a.list_sites()) == ["Heron Quay Cold Store",
                                                          "Kestrel Lane Print Works"]


def test_a_new_phones_first_sync_brings_the_offices_records(tmp_path: Path, browser):
    # the engineer types the hub's address and the token the office gave, and taps Sync: the
    # hub's records come whole (its first sync), with the photo they name
    from test_sync_hub import _jpeg

    from _browser import _type_into

    hub = RunningHub(tmp_path / "hub")
    with Store(tmp_path / "office-tablet.db") as t:
        site = t.add_site("Kestrel Lane Print Works", code="aisc360-22", unit_system="us")
        col = t.add_column(site.id, {"tag": "C4", "section": "W10X49", "length": "14 ft"})
        t.add_photo(_jpeg((90, 90, 40)), column_id=col.id)
        sync_with_hub(t, hub.url, hub.token("office-tablet"))
    token = hub.token("new-phone")
    db = tmp_path / "phone.db"
    Store(db).close()
    proc, port = _serve_screen(db, tmp_path)
    try:
        page = _open(browser, f"http://127.0.0.1:{port}", PHONE)
        _type_into(page, "field-hub-url", hub.url, enter=False)
        _type_into(page, "field-hub-token", token, enter=False)
        _wait(page, "sync-now").click()
        _poll(lambda: page.locator(_sel("sync-status")).first.inner_text(),
              lambda t: "finished" in t, "sync status", timeout=60)
        html = page.content()
        assert "received 4 changes and 1 photo" in html, html[-2000:]
        assert "first sync: the hub's records came whole, in one file" in html
        SHOTS.mkdir(parents=True, exist_ok=True)
        page.screenshot(path=str(SHOTS / "first-sync.png"))
    finally:
        proc.terminate()
        proc.wait(10)
        hub.stop()
    with Store(db) as phone:
        (got,) = phone.list_sites()
        assert [c.tag for c in phone.list_columns(got.id)] == ["C4"]
