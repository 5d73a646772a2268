"""The office hub's HTTP interface (FastAPI): push, pull, photos, all behind device tokens.

Every route needs ``Authorization: Bearer <token>``; a missing, wrong or revoked token gets
401 and nothing else. Bodies are capped (``MAX_JSON_BYTES``, ``MAX_CHUNK_BYTES``); the only
value from a request that names a file is a content hash, checked as 64 hex digits.

Routes (JSON unless said)::

    GET  /v1/hello?device=ID            hub id, schema, newest sequence, ops held from ID, clock
    POST /v1/push   {device, schema, ops}        -> {acked, new, seqs: [first, last], max_seq}
    GET  /v1/pull?after=N&limit=M[&device=ID&skip=A-B,C-D]
                                                 -> {ops: [[seq, op], ...], max_seq, limit}
    GET  /v1/snapshot (a SQLite file)   the hub's records for a device's first sync; 404
                                        from a hub that keeps no records
    GET  /v1/photos/{sha}/status                 -> {have, received}
    PUT  /v1/photos/{sha}?offset=K&total=T (raw bytes)  -> {have, received}
    GET  /v1/photos/{sha}?offset=K (raw bytes)

Errors: ``{"field", "reason", "hint"}`` with 400 (bad JSON), 401, 409 (clock, offset), 413
(too large), 422 (a bad value), 426 (the device must update), 503 with ``Retry-After`` (the
hub's database cannot be reached just now: the device waits and tries again).

Storage is behind ``HubBackend`` (``_hubapi``): SQLite in ``--data`` (one process), or
PostgreSQL with ``--database`` (any number of processes behind a load balancer).
"""

from __future__ import annotations

import json
import os
import threading
from typing import Any, Callable, Iterator

from fastapi import FastAPI, Request
from fastapi.responses import JSONResponse, Response, StreamingResponse
from starlette.concurrency import run_in_threadpool

from fieldcol.errors import InputError
from fieldcol.store._gcpause import gc_paused
from fieldcol.store._oplog import MAX_SKIP_SPANS, ops_from_json, wall_ms
from fieldcol.sync._hubapi import SHA, HubBackend, HubUnavailable, open_hub

MAX_JSON_BYTES = 16 << 20
MAX_CHUNK_BYTES = 4 << 20
MAX_PULL = 5000
RETRY_AFTER_S = 2


def _unavailable(e: HubUnavailable) -> Response:
    return JSONResponse({"field": "database", "reason": str(e),
                         "hint": "the device tries again shortly"}, status_code=503,
                        headers={"Retry-After": str(RETRY_AFTER_S)})


class _Refused(Exception):
    def __init__(self, status: int, field: str, reason: str, hint: str | None = None):
        self.status, self.body = status, {"field": field, "reason": reason, "hint": hint}


async def _body(request: Request, cap: int) -> bytes:
    """The request body, refused as soon as it passes ``cap`` (declared or streamed)."""
    declared = request.headers.get("content-length")
    if declared is not None and (not declared.isdigit() or int(declared) > cap):
        raise _Refused(413, "body", f"larger than {cap} bytes")
    out = bytearray()
    async for chunk in request.stream():
        out += chunk
        if len(out) > cap:
            raise _Refused(413, "body", f"larger than {cap} bytes")
    return bytes(out)


def _json(raw: bytes) -> Any:
    try:
        return json.loads(raw)
    except (ValueError, UnicodeDecodeError) as e:
        raise _Refused(400, "body", f"not valid JSON ({e})") from None


def _int(value: str | None, field: str, default: int | None = None) -> int:
    if value is None and default is not None:
        return default
    if value is None or not value.isdigit() or len(value) > 18:
        raise _Refused(422, field, "expected a whole number")
    return int(value)


def create_app(hub: HubBackend) -> FastAPI:
    """The hub's web application over ``hub`` (serve it with uvicorn).

    Example:
        >>> create_app(open_hub("hubdata")).title
        'fieldcol hub'
    """
    app = FastAPI(title="fieldcol hub", docs_url=None, redoc_url=None, openapi_url=None)

    @app.middleware("http")
    async def guard(request: Request, call_next: Any) -> Response:
        auth = request.headers.get("authorization", "")
        token = auth[7:] if auth.lower().startswith("bearer ") else None
        try:  # (exception handlers do not see errors raised in a middleware)
            device = await run_in_threadpool(hub.device_for_token, token)
        except HubUnavailable as e:
            return _unavailable(e)
        if device is None:
            return JSONResponse({"field": "token", "reason": "missing, wrong or revoked token",
                                 "hint": None}, status_code=401)
        request.state.device = device
        return await call_next(request)

    @app.exception_handler(_Refused)
    async def refused(request: Request, e: _Refused) -> Response:
        return JSONResponse(e.body, status_code=e.status)

    @app.exception_handler(HubUnavailable)
    async def unavailable(request: Request, e: HubUnavailable) -> Response:
        return _unavailable(e)

    @app.exception_handler(InputError)
    async def bad_input(request: Request, e: InputError) -> Response:
        status = 409 if e.field in ("clock", "offset") else 422
        return JSONResponse({"field": e.field, "reason": e.reason, "hint": e.hint},
                            status_code=status)

    @app.get("/v1/hello")
    def hello(request: Request, device: str = "") -> dict[str, Any]:
        hub.touch(request.state.device.name, device or None)
        return {"hub_id": hub.hub_id, "schema": hub.schema, "max_seq": hub.max_seq(),
                "have_from_you": hub.count_from(device) if device else 0, "now_ms": wall_ms()}

    @app.post("/v1/push")
    async def push(request: Request) -> dict[str, Any]:
        raw = await _body(request, MAX_JSON_BYTES)
        with gc_paused():
            body = _json(raw)
            if not isinstance(body, dict) or not isinstance(body.get("ops"), list):
                raise _Refused(422, "ops", "expected {device, schema, ops: [...]}")
            _check_schema(hub, body.get("schema"))
            ops = ops_from_json(body["ops"], "ops")
        result = await run_in_threadpool(hub.push, ops)
        await run_in_threadpool(hub.touch, request.state.device.name, body.get("device")
                                if isinstance(body.get("device"), str) else None)
        return {"acked": len(ops), "new": result.new,
                "seqs": list(result.seqs) if result.seqs else None,
                "max_seq": await run_in_threadpool(hub.max_seq)}

    @app.get("/v1/pull")
    def pull(after: str = "0", limit: str = "1000", device: str = "",
             skip: str = "") -> Response:
        n = min(_int(limit, "limit"), MAX_PULL)
        spans = _spans(skip)
        # each operation's JSON text comes written by the database
        rows = hub.pull_json(_int(after, "after"), n, (device, spans) if device and spans else None)
        body = ",".join([f"[{int(seq)},{text}]" for seq, text in rows])
        # "limit": the page size used; a shorter page holds everything there was
        return Response(f'{{"ops":[{body}],"max_seq":{int(hub.max_seq())},"limit":{n}}}'.encode(),
                        media_type="application/json")

    @app.get("/v1/snapshot")
    def snapshot() -> Response:
        path = hub.snapshot()
        if path is None:
            return JSONResponse({"field": "snapshot", "reason": "this hub keeps no merged "
                                 "records", "hint": "pull the operations"}, status_code=404)
        fh = open(path, "rb")
        # gone from the folder at once, read through the open file: a download cut short or
        # a hub stopped half way leaves nothing behind
        path.unlink()
        size = os.fstat(fh.fileno()).st_size
        return StreamingResponse(_pieces(fh), media_type="application/vnd.sqlite3",
                                 headers={"Content-Length": str(size)})

    @app.get("/v1/photos/{sha}/status")
    def photo_status(sha: str) -> dict[str, Any]:
        _sha(sha)
        have, got = hub.photo_status(sha)
        return {"have": have, "received": got}

    @app.put("/v1/photos/{sha}")
    async def photo_put(sha: str, request: Request) -> dict[str, Any]:
        _sha(sha)
        offset = _int(request.query_params.get("offset"), "offset")
        total = _int(request.query_params.get("total"), "total")
        data = await _body(request, MAX_CHUNK_BYTES)
        have, got = await run_in_threadpool(hub.photo_append, sha, offset, total, data)
        return {"have": have, "received": got}

    @app.get("/v1/photos/{sha}")
    def photo_get(sha: str, offset: str = "0") -> Response:
        _sha(sha)
        data = hub.photo_read(sha, _int(offset, "offset"), MAX_CHUNK_BYTES)
        if data is None:
            return JSONResponse({"field": "sha256", "reason": "the hub does not hold this photo",
                                 "hint": None}, status_code=404)
        return Response(data, media_type="application/octet-stream")

    return app


def _pieces(fh: Any) -> Iterator[bytes]:
    """A file's bytes in pieces of 1 MiB, the file closed at the end (or when the client
    goes)."""
    try:
        while piece := fh.read(1 << 20):
            yield piece
    finally:
        fh.close()


def _spans(text: str) -> list[tuple[int, int]]:
    """``"5-9,20-31"`` as [(5, 9), (20, 31)]: spans of sequence numbers a pull leaves out."""
    if not text:
        return []
    parts = text.split(",")
    if len(parts) > MAX_SKIP_SPANS:
        raise _Refused(422, "skip", f"at most {MAX_SKIP_SPANS} spans")
    out = []
    for part in parts:
        first, _, last = part.partition("-")
        a, b = _int(first, "skip"), _int(last, "skip")
        if a > b:
            raise _Refused(422, "skip", "a span runs from its first number to its last")
        out.append((a, b))
    return out


def _sha(sha: str) -> None:
    if not SHA.fullmatch(sha):
        raise _Refused(422, "sha256", "not a content hash (64 hex digits)")


def _check_schema(hub: HubBackend, theirs: Any) -> None:
    if not isinstance(theirs, list) or not all(isinstance(s, str) for s in theirs):
        raise _Refused(422, "schema", "expected the list of schema steps")
    missing = [s for s in hub.schema if s not in theirs]
    if missing:
        raise _Refused(426, "schema", "this device's fieldcol is older than the hub's",
                       "update fieldcol on this device, then sync")
    newer = [s for s in theirs if s not in hub.schema]
    if newer:
        raise _Refused(409, "schema", "the hub's fieldcol is older than this device's",
                       "update fieldcol on the hub, then sync")


def serve(data_dir: str, host: str, port: int, *, insecure_ok: bool = False,
          certfile: str | None = None, keyfile: str | None = None,
          database: str | None = None,
          office: Callable[[Any], None] | None = None) -> None:
    """Run the hub until stopped (Ctrl-C). Listening beyond loopback needs TLS or ``insecure_ok``.
    With ``database`` (``postgresql://...``) the records live there and photos in ``data_dir``;
    a database that cannot be reached raises ``InputError`` before anything listens.

    ``office``: a callable serving the office view over the hub's records (given the hub's
    ``Store``; it blocks), run in a thread beside the hub; the caller supplies it, so sync never
    imports the app.

    Example: ``serve("hubdata", "127.0.0.1", 8765)`` (blocks).
    """
    import uvicorn

    if not _loopback(host) and not (certfile and keyfile) and not insecure_ok:
        raise InputError("host", host, "the hub listens beyond this computer only with TLS",
                         "keep 127.0.0.1 behind a TLS reverse proxy, give --tls-cert and "
                         "--tls-key, or pass --insecure-ok on a network you trust")
    hub = open_hub(data_dir, database)
    try:
        if office is not None:
            start_office(hub, office)
        uvicorn.run(create_app(hub), host=host, port=port, log_level="warning",
                    ssl_certfile=certfile, ssl_keyfile=keyfile)
    finally:
        hub.close()


def start_office(hub: Any, office: Callable[[Any], None]) -> threading.Thread:
    """Start ``office(store)`` over the hub's records in a daemon thread (it ends with the hub).

    Example: ``start_office(HubStore("hubdata"), office_runner("127.0.0.1", 8766))``.
    """
    store = getattr(hub, "store", None)
    if store is None:
        raise InputError("office-port", "", "this hub keeps no records the office view can "
                         "read", "serve the office view from a hub with its own store")
    thread = threading.Thread(target=office, args=(store,), name="fieldcol-office", daemon=True)
    thread.start()
    return thread


def _loopback(host: str) -> bool:
    """True for addresses that only this computer can reach.

    Example:
        >>> _loopback("127.0.0.1"), _loopback("0.0.0.0"), _loopback("localhost")
        (True, False, True)
    """
    import ipaddress
    if host == "localhost":
        return True
    try:
        return ipaddress.ip_address(host).is_loopback
    except ValueError:
        return False
