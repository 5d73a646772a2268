"""Who may use the app over a network: an access key beyond loopback, same-origin WebSockets.

``Guard`` wraps the whole web app (an ASGI middleware). It depends on the address the app
listens on, never on the address a request comes from (a reverse proxy on the same machine
would make every request look local):

* listening on loopback with no key: only loopback host names are answered (a page on another
  site that rebinds its name to 127.0.0.1 gets nothing);
* listening anywhere else (or given a key): every HTTP request and every WebSocket must carry the
  key, in the address (``?key=...``) or in the cookie the first good request sets (HttpOnly,
  SameSite=Strict, so the web client's later requests carry it and other sites' pages cannot);
  none gives 401, a wrong one 403;
* always: a WebSocket must come from a page of this same host and port (its ``Origin``), and no
  response allows every origin (``Access-Control-Allow-Origin: *`` is taken out).
"""

from __future__ import annotations

import hmac
import ipaddress
import re
import secrets
import socket
from dataclasses import dataclass
from typing import Any, Awaitable, Callable
from urllib.parse import parse_qs, quote, urlsplit

from fieldcol.errors import InputError

Scope = dict[str, Any]
Receive = Callable[[], Awaitable[dict[str, Any]]]
Send = Callable[[dict[str, Any]], Awaitable[None]]
App = Callable[[Scope, Receive, Send], Awaitable[None]]

_KEY_CHARS = re.compile(r"[A-Za-z0-9_\-.~]{16,128}")
_LOOPBACK_NAMES = {"localhost", "localhost.localdomain", "ip6-localhost"}
_WILDCARDS = {"0.0.0.0", "::", ""}


def is_loopback(host: str) -> bool:
    """Whether an address to listen on (or a host name asked for) stays on this machine.

    Args:
        host: an IP address or host name, IPv6 with or without brackets.

    Returns:
        True for ``localhost``, 127.0.0.0/8 and ``::1``.

    Example:
        >>> is_loopback("127.0.0.1"), is_loopback("[::1]"), is_loopback("0.0.0.0")
        (True, True, False)
    """
    name = host.strip("[]").lower()
    if name in _LOOPBACK_NAMES:
        return True
    try:
        return ipaddress.ip_address(name).is_loopback
    except ValueError:
        return False


def new_key() -> str:
    """A fresh access key (32 random bytes as hex).

    Example:
        >>> len(new_key()) >= 43
        True
    """
    return secrets.token_hex(32)  # hex: never starts with "-", which argparse reads as an option


def check_key(text: str) -> str:
    """An access key given on the command line, refused when it is too short to guess-proof.

    Args:
        text: the key as typed.

    Returns:
        The key.

    Raises:
        InputError: on field ``key`` when it is not 16 to 128 letters, digits or ``_-.~``.

    Example:
        >>> check_key("correct-horse-battery")
        'correct-horse-battery'
    """
    if not _KEY_CHARS.fullmatch(text):
        raise InputError("key", text, "an access key is 16 to 128 letters, digits or _ - . ~",
                         "leave --key out and the app makes one")
    return text


def cookie_name(port: int) -> str:
    """The cookie that keeps the key; one per port, as browsers share cookies across ports.

    Example:
        >>> cookie_name(8550)
        'fieldcol_key_8550'
    """
    return f"fieldcol_key_{port}"


def open_addresses(host: str, port: int, key: str | None) -> list[str]:
    """The addresses to open the app at, with the key in them.

    Args:
        host: the address listened on; ``0.0.0.0`` / ``::`` give this machine's own addresses.
        port: the port listened on.
        key: the access key, or None.

    Returns:
        ``http://HOST:PORT/?key=...`` for each address (the listen address when none is found).

    Example:
        >>> open_addresses("192.0.2.7", 8550, "k" * 20)
        ['http://192.0.2.7:8550/?key=kkkkkkkkkkkkkkkkkkkk']
    """
    hosts = [host]
    if host in _WILDCARDS:
        hosts = _own_addresses(ipv6=host == "::") or ["127.0.0.1"]
    tail = f"/?key={quote(key)}" if key else "/"
    return [f"http://{_bracket(h)}:{port}{tail}" for h in hosts]


def _bracket(host: str) -> str:
    return f"[{host}]" if ":" in host and not host.startswith("[") else host


def _own_addresses(ipv6: bool) -> list[str]:
    """This machine's addresses other than loopback (IPv4 first); site Wi-Fi often has no
    route out, so the interfaces are asked directly where the platform allows it."""
    found: list[str] = []
    for a in _interface_ipv4() + _resolved(ipv6):
        if not is_loopback(a) and a not in found and not a.lower().startswith("fe80"):
            found.append(a)
    return sorted(found, key=lambda a: ":" in a)


def _interface_ipv4() -> list[str]:
    """IPv4 address of each network interface (Linux and the BSDs; empty elsewhere)."""
    try:
        import fcntl
        import struct
    except ImportError:
        return []
    out = []
    with socket.socket(socket.AF_INET, socket.SOCK_DGRAM) as s:
        for _index, name in getattr(socket, "if_nameindex", list)():
            try:
                req = struct.pack("256s", name.encode()[:15])
                out.append(socket.inet_ntoa(fcntl.ioctl(s.fileno(), 0x8915, req)[20:24]))
            except OSError:  # an interface with no IPv4 address
                continue
    return out


def _resolved(ipv6: bool) -> list[str]:
    """The addresses this machine's own name resolves to."""
    try:
        infos = socket.getaddrinfo(socket.gethostname(), None)
    except OSError:
        return []
    return [str(addr[0]) for family, *_rest, addr in infos
            if family == socket.AF_INET or (ipv6 and family == socket.AF_INET6)]


@dataclass
class Guard:
    """ASGI middleware: the access rules above, around the whole web app.

    Args:
        app: the web app (Flet's FastAPI app).
        key: the access key; None only when listening on loopback.
        port: the port listened on (names the cookie).

    Example: ``uvicorn.Config(Guard(flet_app, key, 8550), host="0.0.0.0", port=8550)``.
    """

    app: App
    key: str | None
    port: int

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] not in ("http", "websocket"):
            await self.app(scope, receive, send)
            return
        headers = _headers(scope)
        given = _given_key(scope, headers, cookie_name(self.port))
        refusal = self._refusal(scope["type"], headers, given)
        if refusal is not None:
            await _refuse(scope, receive, send, *refusal)
            return
        set_cookie = None
        if self.key is not None and given[0] == "query":
            set_cookie = (f"{cookie_name(self.port)}={self.key}; Path=/; HttpOnly; "
                          "SameSite=Strict").encode("latin-1")

        async def guarded_send(message: dict[str, Any]) -> None:
            if message["type"] == "http.response.start":
                kept = [(k, v) for k, v in message.get("headers", [])
                        if k.lower() != b"access-control-allow-origin"]
                if self.key is not None:
                    # the key may sit in this page's address: never pass it on as a referrer
                    kept.append((b"referrer-policy", b"no-referrer"))
                if set_cookie is not None:
                    kept.append((b"set-cookie", set_cookie))
                message = {**message, "headers": kept}
            await send(message)

        await self.app(scope, receive, guarded_send)

    def _refusal(self, kind: str, headers: dict[str, str],
                 given: tuple[str, str | None]) -> tuple[int, str] | None:
        host = headers.get("host", "")
        if self.key is None and not is_loopback(_host_name(host)):
            return 403, "this app answers only on this machine (127.0.0.1)"
        if self.key is not None:
            if given[1] is None:
                return 401, ("this app needs its access key: open the address it printed "
                             "when it started (http://HOST:PORT/?key=...)")
            if not hmac.compare_digest(given[1].encode("utf-8", "replace"),
                                       self.key.encode("utf-8")):
                return 403, "wrong access key: open the address the app printed when it started"
        if kind == "websocket" and not _same_origin(headers.get("origin"), host):
            return 403, "a connection from a page of another site is refused"
        return None


def _headers(scope: Scope) -> dict[str, str]:
    """Request headers by lower-case name; repeated cookie headers joined."""
    out: dict[str, str] = {}
    for k, v in scope.get("headers", []):
        name = k.decode("latin-1").lower()
        value = v.decode("latin-1")
        out[name] = f"{out[name]}; {value}" if name == "cookie" and name in out else value
    return out


def _given_key(scope: Scope, headers: dict[str, str], cookie: str) -> tuple[str, str | None]:
    """Where the request carries a key (``query`` first, then ``cookie``) and the key."""
    query = parse_qs(scope.get("query_string", b"").decode("latin-1"))
    if query.get("key"):
        return "query", query["key"][-1]
    for part in headers.get("cookie", "").split(";"):
        name, _, value = part.strip().partition("=")
        if name == cookie:
            return "cookie", value
    return "none", None


def _host_name(host_header: str) -> str:
    """The name in a Host header, without its port (``[::1]:8550`` -> ``::1``)."""
    if host_header.startswith("["):
        return host_header[1:].split("]", 1)[0]
    return host_header.rsplit(":", 1)[0] if host_header.count(":") == 1 else host_header


def _same_origin(origin: str | None, host_header: str) -> bool:
    """Whether a WebSocket's Origin is a page of the host and port it connects to."""
    if not origin or not host_header:
        return False
    parts = urlsplit(origin)
    if parts.scheme not in ("http", "https") or not parts.hostname:
        return False
    try:
        port = parts.port or (443 if parts.scheme == "https" else 80)
    except ValueError:
        return False
    wanted = urlsplit("//" + host_header)
    try:
        # a Host header leaves out the default port of the scheme the page was loaded with
        wanted_port = wanted.port or (443 if parts.scheme == "https" else 80)
    except ValueError:
        return False
    return (parts.hostname.lower(), port) == ((wanted.hostname or "").lower(), wanted_port)


async def _refuse(scope: Scope, receive: Receive, send: Send, status: int, text: str) -> None:
    """Answer ``status`` with ``text`` (plain words) and nothing of the app."""
    body = (text + "\n").encode("utf-8")
    headers = [(b"content-type", b"text/plain; charset=utf-8"),
               (b"content-length", str(len(body)).encode()),
               (b"cache-control", b"no-store")]
    if status == 401:
        headers.append((b"www-authenticate", b'FieldcolKey realm="fieldcol"'))
    if scope["type"] == "http":
        await send({"type": "http.response.start", "status": status, "headers": headers})
        await send({"type": "http.response.body", "body": body})
        return
    await receive()  # the client's websocket.connect, answered below instead of accepted
    if "websocket.http.response" in scope.get("extensions", {}):
        await send({"type": "websocket.http.response.start", "status": status,
                    "headers": headers})
        await send({"type": "websocket.http.response.body", "body": body})
    else:
        await send({"type": "websocket.close", "code": 1008})
