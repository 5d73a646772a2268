"""The app on a network: `fieldcol app --host ADDRESS` guarded by an access key.

Real servers (`fieldcol app` in a subprocess), real HTTP (httpx), a real WebSocket handshake
(websockets) and a real browser (Debian chromium driven by Playwright). The guarded server
listens on a non-loopback address of this machine when it has one; otherwise on 0.0.0.0,
reached through 127.0.0.1 (the guard follows the address listened on, never the peer's).

Outside rules checked here:
- RFC 9110 15.5.2 / 15.5.4: 401 when no credentials are given (with a WWW-Authenticate
  header), 403 when the ones given are refused.
- RFC 6455 10.2 and 4.1: a server that accepts only its own pages checks the Origin header of
  the opening handshake; a refused handshake is an HTTP answer other than 101.
- RFC 6265bis 4.1.2.7 / 5.4.7: an HttpOnly, SameSite=Strict cookie is kept from scripts and
  not sent with requests that other sites start.
- Fetch standard (CORS protocol): `Access-Control-Allow-Origin: *` would let any site read
  the responses; it must never be sent.
"""

from __future__ import annotations

import asyncio
import os
import re
import shutil
import socket
import subprocess
import sys
import time
from pathlib import Path
from urllib.parse import urlparse

import httpx
import pytest
import websockets

from fieldcol import CAUTION
from fieldcol.ui._access import _interface_ipv4, cookie_name, is_loopback

CHROMIUM = shutil.which("chromium")
if CHROMIUM is None:
    raise RuntimeError("Debian chromium is not installed: apt-get install -y chromium")
from playwright import sync_api  # noqa: E402

ARGS = ["--no-sandbox", "--enable-unsafe-swiftshader", "--disable-gpu", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync"]
TIMEOUT = 20.0
SITE = "site-Kestrel Lane Print Works"
SHOTS = Path(os.environ.get("FIELDCOL_SHOTS", "/tmp/fieldcol-shots"))


def _network_address() -> tuple[str, str]:
    """(address to listen on, address to connect to)."""
    own = [a for a in _interface_ipv4() if not is_loopback(a)]
    return (own[0], own[0]) if own else ("0.0.0.0", "127.0.0.1")


def _free_port(host: str) -> int:
    with socket.socket() as s:
        s.bind((host, 0))
        return s.getsockname()[1]


class _App:
    """`fieldcol app` in a subprocess; its printed lines are read as it starts."""

    def __init__(self, db: Path, *args: str, connect: str) -> None:
        self.log = db.with_suffix(".log")
        self.out = open(self.log, "w")
        self.proc = subprocess.Popen([sys.executable, "-m", "fieldcol", "app", "--db", str(db),
                                      "--demo", *args], stdout=self.out,
                                     stderr=subprocess.STDOUT)
        self.connect = connect
        self.port = int(args[args.index("--port") + 1])
        deadline = time.monotonic() + 60
        while True:
            assert self.proc.poll() is None, self.log.read_text()
            try:
                socket.create_connection((connect, self.port), timeout=0.5).close()
                break
            except OSError:
                assert time.monotonic() < deadline, "the app did not start listening"
                time.sleep(0.1)
        self.base = f"http://{connect}:{self.port}"

    def printed(self) -> str:
        return self.log.read_text()

    def stop(self) -> None:
        self.proc.terminate()
        try:
            self.proc.wait(10)
        except subprocess.TimeoutExpired:
            self.proc.kill()
            self.proc.wait(10)
        self.out.close()


@pytest.fixture(scope="module")
def guarded(tmp_path_factory):
    """The app beyond loopback, with the key it made up itself."""
    listen, connect = _network_address()
    port = _free_port(connect)
    app = _App(tmp_path_factory.mktemp("net") / "net.db", "--host", listen, "--port", str(port),
               connect=connect)
    try:
        urls = re.findall(r"open (http://\S+) in a browser", app.printed())
        assert urls, app.printed()
        key = re.search(r"\?key=([A-Za-z0-9_\-]+)$", urls[0]).group(1)
        assert len(key) >= 43  # 32 random bytes
        if listen != "0.0.0.0":
            assert urls[0] == f"http://{listen}:{port}/?key={key}"
        app.key = key
        yield app
    finally:
        app.stop()


@pytest.fixture(scope="module")
def local(tmp_path_factory):
    """The app as it always was: loopback, no key."""
    port = _free_port("127.0.0.1")
    app = _App(tmp_path_factory.mktemp("loop") / "loop.db", "--port", str(port),
               connect="127.0.0.1")
    yield app
    app.stop()


def _no_acao(r: httpx.Response) -> None:
    assert "access-control-allow-origin" not in r.headers, r.headers


# --- HTTP --------------------------------------------------------------------------------------

def test_every_request_needs_the_key(guarded):
    with httpx.Client(base_url=guarded.base, timeout=10) as c:
        for path in ("/", "/main.dart.js", "/flutter_bootstrap.js", "/sites/1", "/upload"):
            r = c.get(path)
            assert r.status_code == 401, (path, r.status_code)
            assert "access key" in r.text and "www-authenticate" in r.headers
            assert "flutter" not in r.text.lower()
            _no_acao(r)
        r = c.get("/", params={"key": guarded.key[:-1] + "x"})
        assert r.status_code == 403 and "wrong access key" in r.text
        r = c.get("/main.dart.js", headers={"Cookie": f"{cookie_name(guarded.port)}=nope"})
        assert r.status_code == 403
        # a cookie for another port of the same machine does not open this one
        r = c.get("/", headers={"Cookie": f"{cookie_name(guarded.port + 1)}={guarded.key}"})
        assert r.status_code == 401


def test_the_key_in_the_address_sets_a_strict_cookie(guarded):
    with httpx.Client(base_url=guarded.base, timeout=10) as c:
        r = c.get("/", params={"key": guarded.key})
        assert r.status_code == 200 and "flutter" in r.text.lower()
        _no_acao(r)
        assert r.headers["referrer-policy"] == "no-referrer"
        cookie = r.headers["set-cookie"]
        name = cookie_name(guarded.port)
        assert cookie.startswith(f"{name}={guarded.key};")
        assert "HttpOnly" in cookie and "SameSite=Strict" in cookie and "Path=/" in cookie
        # the client keeps the cookie: the web client's later requests carry it
        r = c.get("/main.dart.js")
        assert r.status_code == 200 and len(r.content) > 10_000
        _no_acao(r)


def test_no_key_asked_on_loopback_but_only_loopback_names(local):
    with httpx.Client(base_url=local.base, timeout=10) as c:
        r = c.get("/")
        assert r.status_code == 200 and "flutter" in r.text.lower()
        _no_acao(r)
        assert "set-cookie" not in r.headers
        assert "key" not in local.printed().split("open ")[1].split(" ")[0]
        # a page of another site whose name was pointed at 127.0.0.1 gets nothing
        r = c.get("/", headers={"Host": f"attacker.example:{local.port}"})
        assert r.status_code == 403


# --- WebSocket ---------------------------------------------------------------------------------

async def _handshake(app, *, origin: str | None, cookie: str | None = None,
                     query: str = "") -> int:
    """The HTTP status of a WebSocket opening handshake to the app's /ws."""
    headers = {"Cookie": cookie} if cookie else {}
    url = f"ws://{app.connect}:{app.port}/ws{query}"
    try:
        async with websockets.connect(url, origin=origin, additional_headers=headers,
                                      open_timeout=10):
            return 101
    except websockets.InvalidStatus as e:
        return e.response.status_code


def test_websocket_needs_the_key_and_a_page_of_this_app(guarded):
    own = f"http://{guarded.connect}:{guarded.port}"
    good = f"{cookie_name(guarded.port)}={guarded.key}"

    async def go():
        return [
            await _handshake(guarded, origin=own),                               # no key
            await _handshake(guarded, origin=own, cookie=good[:-2] + "zz"),      # wrong key
            await _handshake(guarded, origin=None, cookie=good),                 # no Origin
            await _handshake(guarded, origin="http://attacker.example", cookie=good),
            await _handshake(guarded, origin=f"http://{guarded.connect}:{guarded.port + 1}",
                             cookie=good),                                       # other port
            await _handshake(guarded, origin=own, cookie=good),
            await _handshake(guarded, origin=own, query=f"?key={guarded.key}"),
        ]

    assert asyncio.run(go()) == [401, 403, 403, 403, 403, 101, 101]


def test_websocket_origin_checked_on_loopback_too(local):
    own = f"http://127.0.0.1:{local.port}"

    async def go():
        return [await _handshake(local, origin="http://attacker.example"),
                await _handshake(local, origin=None),
                await _handshake(local, origin=own),
                await _handshake(local, origin=f"http://localhost:{local.port}")]

    # the last: Host 127.0.0.1 but a page of localhost is another origin (RFC 6454 4)
    assert asyncio.run(go()) == [403, 403, 101, 403]


# --- command line ------------------------------------------------------------------------------

@pytest.mark.parametrize("key", ["short", "has space in it 123456", "é" * 20])
def test_a_bad_key_is_refused_naming_the_field(tmp_path, key):
    r = subprocess.run([sys.executable, "-m", "fieldcol", "app", "--db", str(tmp_path / "x.db"),
                        "--host", "0.0.0.0", "--port", "1", "--key", key],
                       capture_output=True, text=True, timeout=60)
    assert r.returncode == 2 and r.stderr.startswith("error: key: "), r.stderr
    assert not (tmp_path / "x.db").exists()


# --- a real browser ----------------------------------------------------------------------------

def _page(browser, app, path: str):
    ctx = browser.new_context(viewport={"width": 390, "height": 844})
    page = ctx.new_page()

    def only_this_machine(r):
        if urlparse(r.request.url).hostname in (app.connect, "127.0.0.1", "localhost"):
            r.continue_()
        else:
            r.abort()

    page.route("**/*", only_this_machine)
    return ctx, page, page.goto(app.base + path)


def test_browser_opens_the_app_with_the_key_and_nothing_without(guarded):
    with sync_api.sync_playwright() as p:
        browser = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        try:
            ctx, page, resp = _page(browser, guarded, f"/?key={guarded.key}")
            assert resp.status == 200
            page.wait_for_selector("flt-semantics-placeholder", state="attached",
                                   timeout=TIMEOUT * 1000)
            page.evaluate("document.querySelector('flt-semantics-placeholder').click()")
            site = page.locator(f'[flt-semantics-identifier="{SITE}"]').first
            site.wait_for(state="attached", timeout=TIMEOUT * 1000)
            caution = page.locator('[flt-semantics-identifier="caution"]').first
            assert CAUTION in caution.inner_text()
            # the page's scripts cannot read the key from the cookie
            assert cookie_name(guarded.port) not in page.evaluate("document.cookie")
            SHOTS.mkdir(parents=True, exist_ok=True)
            time.sleep(1)
            page.screenshot(path=str(SHOTS / "network-with-key.png"))
            ctx.close()

            for path, status in (("/", 401), ("/?key=not-the-right-key-at-all", 403)):
                ctx, page, resp = _page(browser, guarded, path)
                assert resp.status == status
                time.sleep(2)  # long enough for a web client to start, were one served
                assert page.locator("flt-semantics-placeholder, flutter-view").count() == 0
                assert SITE.split("-", 1)[1] not in page.content()
                page.screenshot(path=str(SHOTS / f"network-{status}.png"))
                ctx.close()
        finally:
            browser.close()
