"""The device's side of sync with the office hub: push, photos, pull.

Order of a sync: say hello (schema, clocks, what the hub holds from us), upload the photos the
outgoing operations name, push the operations in batches (the push cursor moves only after the
hub's acknowledgement), download the photos incoming operations name, then apply each pulled
batch together with the pull cursor in one transaction. Any step may be cut; the next sync
repeats it harmlessly (operations are taken by id, photos by content hash).
"""

from __future__ import annotations

import functools
import hashlib
import json
import ssl
import tempfile
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Callable

import httpx

from fieldcol.errors import InputError
from fieldcol.store import Store
from fieldcol.store._gcpause import gc_paused
from fieldcol.store._migrations import MIGRATION_NAMES
from fieldcol.store._oplog import (FUTURE_TOLERANCE_MS, MAX_SKIP_SPANS, Conflict, Op,
                                   ops_from_json, wall_ms)
from fieldcol.store._snapshot import apply_snapshot, snapshot_photos
from fieldcol.sync._photofiles import have_photo, needed_photos, photo_file, take_photo

PUSH_BATCH = 5000
PULL_BATCH = 5000
#: the hub takes 4 MiB a request: most photos go whole in one
CHUNK = 4 << 20
TIMEOUT_S = 30.0
#: waits before each new try when the hub answers 503 (its database is out of reach for a
#: moment: a restart, a fail-over); about half a minute in all, then the sync stops
RETRY_503_S = (0.5, 1.0, 2.0, 4.0, 8.0, 8.0, 8.0)


@dataclass
class SyncReport:
    """What one sync moved: operations and photos sent and received, conflicts, warnings."""
    sent: int = 0
    received: int = 0
    photos_sent: int = 0
    photos_received: int = 0
    conflicts: list[Conflict] = field(default_factory=list)
    warnings: list[str] = field(default_factory=list)
    #: each conflict's row as the engineer knows it (``Store.row_label``), by conflict id
    labels: dict[str, str] = field(default_factory=dict)
    #: this store's first sync took the hub's records whole (``store/_snapshot``)
    whole: bool = False

    def lines(self, *, details: bool = True) -> list[str]:
        """Plain lines for the command line and the sync screen; ``details=False`` leaves out
        one line per conflict (the screen shows each on a card).

        Example:
            >>> SyncReport(sent=3, photos_sent=1).lines()[0]
            'sent 3 changes and 1 photo; received 0 changes and 0 photos'
        """
        out = [f"sent {_n(self.sent, 'change')} and {_n(self.photos_sent, 'photo')}; received "
               f"{_n(self.received, 'change')} and {_n(self.photos_received, 'photo')}"]
        if self.whole:
            out.append("first sync: the hub's records came whole, in one file")
        out += self.warnings
        if self.conflicts and not details:
            out.append(f"{_n(len(self.conflicts), 'conflict')} to review")
        elif self.conflicts:
            out.append(f"conflicts to review ({len(self.conflicts)}):")
            out += [f"  {self.labels.get(c.id) or f'{c.tbl} {c.row_id[:8]}'}, {c.field}: shows "
                    f"{c.kept!r}, other {c.value!r} ({c.kind})" for c in self.conflicts]
        return out


def _n(count: int, word: str) -> str:
    return f"{count} {word}" if count == 1 else f"{count} {word}s"


@functools.lru_cache(maxsize=1)
def _tls_context() -> ssl.SSLContext:
    """The certificate check for an https hub, made once a process (reading the authorities'
    certificates took longer than a small sync's requests)."""
    return httpx.create_ssl_context()


class _Hub:
    """Thin HTTP calls; every failure becomes an InputError naming what to fix."""

    def __init__(self, url: str, token: str, transport: httpx.BaseTransport | None = None):
        if not url.startswith(("http://", "https://")):
            raise InputError("hub", url, "not a hub address", "e.g. https://hub.example or "
                             "http://127.0.0.1:8765")
        if not token:
            raise InputError("token", "", "no token given", "ask for one: fieldcol hub add-device")
        self.url = url.rstrip("/")
        self.http = httpx.Client(base_url=self.url, timeout=TIMEOUT_S, transport=transport,
                                 verify=_tls_context(),
                                 headers={"Authorization": f"Bearer {token}"})

    def close(self) -> None:
        self.http.close()

    def call(self, method: str, path: str, *, absent_ok: bool = False,
             **kw: Any) -> httpx.Response:
        """One request; ``absent_ok``: a 404 is returned, not raised."""
        import time

        for wait in (*RETRY_503_S, None):
            try:
                r = self.http.request(method, path, **kw)
            except httpx.HTTPError as e:
                raise InputError("hub", self.url, f"cannot reach the hub ({type(e).__name__}: "
                                 f"{e})", "check the address and the network, then sync "
                                 "again") from None
            if r.status_code != 503 or wait is None:
                break
            time.sleep(wait)  # every request is safe to repeat (ops by id, photos by offset)
        if r.status_code == 404 and absent_ok:
            return r
        self._check(r, path)
        return r

    def save(self, path: str, dest: Path,
             progress: Callable[[int, int], None] | None = None) -> bool:
        """Stream the answer to GET ``path`` into the new file ``dest``; False when the hub
        answers 404 (it has no such thing to give). ``progress``: called with (bytes so far,
        bytes in all) as they arrive."""
        try:
            with self.http.stream("GET", path) as r:
                if r.status_code == 404:
                    return False
                if r.status_code != 200:
                    r.read()
                    self._check(r, path)
                total = int(r.headers.get("content-length") or 0)
                with open(dest, "xb") as fh:
                    for chunk in r.iter_bytes():
                        fh.write(chunk)
                        if progress:
                            progress(fh.tell(), total)
        except httpx.HTTPError as e:
            raise InputError("hub", self.url, f"cannot reach the hub ({type(e).__name__}: "
                             f"{e})", "check the address and the network, then sync "
                             "again") from None
        return True

    def _check(self, r: httpx.Response, path: str) -> None:
        """Raise the ``InputError`` an answer of 400 or more means."""
        if r.status_code == 503:
            raise InputError("hub", self.url, "the hub cannot reach its database just now",
                             "sync again in a few minutes; what was sent stays sent")
        if r.status_code == 401:
            raise InputError("token", "****", "the hub refused this token (wrong or revoked)",
                             "ask the office for a new one: fieldcol hub add-device")
        if r.status_code >= 400:
            try:
                body = r.json()
                f, reason, hint = body.get("field", "hub"), body.get("reason", ""), body.get("hint")
            except ValueError:
                f, reason, hint = "hub", r.text[:200], None
            if f == "clock":
                raise InputError("clock", "this device", f"the hub refused changes: {reason}",
                                 "check the clock on this device; the changes stay here and go "
                                 "at the next sync")
            raise InputError(str(f), path, f"the hub said {r.status_code}: {reason}", hint)


def sync_with_hub(store: Store, url: str, token: str, *,
                  progress: Callable[[str, int, int], None] | None = None,
                  transport: httpx.BaseTransport | None = None,
                  take_whole: bool = True) -> SyncReport:
    """Sync this store with the hub at ``url``.

    Args:
        store: this device's store.
        url: the hub's address.
        token: this device's token.
        progress: called with (step, done, total) as the sync goes: ``send`` and ``receive``
            count operations, ``records`` the bytes of a first sync's download.
        transport: an httpx transport (tests cut connections with one).
        take_whole: an empty store takes the hub's records whole when the hub keeps them
            (``store/_snapshot``); False: operation by operation, as every later sync.

    Returns:
        A ``SyncReport``. Raises ``InputError`` (field ``token``, ``hub``, ``clock`` or
        ``schema``) when it cannot finish; what was done before stays done.

    Example: ``sync_with_hub(store, "http://127.0.0.1:8765", token).lines()``.
    """
    say = progress or (lambda step, done, total: None)
    report = SyncReport()
    hub = _Hub(url, token, transport)
    try:
        hello = hub.call("GET", "/v1/hello", params={"device": store.device_id}).json()
        hub_id = str(hello["hub_id"])
        push_c, pull_c = f"push:{hub_id}", f"pull:{hub_id}"
        missing = [s for s in hello["schema"] if s not in MIGRATION_NAMES]
        if missing:
            raise InputError("schema", "this device", "this device's fieldcol is older than the "
                             "hub's", "update fieldcol on this device, then sync")
        skew = wall_ms() - int(hello["now_ms"])
        if skew > FUTURE_TOLERANCE_MS:
            report.warnings.append(f"this device's clock is {skew // 60000} minutes ahead of the "
                                   "hub's: check the clock")
        elif skew < -24 * 3600 * 1000:
            report.warnings.append(f"this device's clock is {-skew // 86_400_000} days behind "
                                   "the hub's: check the clock (changes made offline may lose "
                                   "to others)")
        # a hub restored from an older copy has lost what we sent: send it all again
        if int(hello["max_seq"]) < store.cursor(pull_c) or \
                int(hello["have_from_you"]) < _own_ops_upto(store, store.cursor(push_c)):
            store.set_cursor(push_c, 0)
            store.set_cursor(pull_c, 0)
            store.forget_own_spans(hub_id)
            report.warnings.append("the hub holds less than it acknowledged (restored from a "
                                   "backup?): everything was sent again")
        _push(store, hub, hub_id, push_c, report, say)
        if take_whole:
            _first_pull(store, hub, hub_id, pull_c, report, say)
        _pull(store, hub, hub_id, pull_c, report, say)
        report.conflicts = store.conflicts()
        report.labels = {c.id: store.row_label(c.tbl, c.row_id) for c in report.conflicts}
    finally:
        hub.close()
    return report


def _own_ops_upto(store: Store, seq: int) -> int:
    with store._lock:
        return store.db.conn.execute("SELECT count(*) FROM sync_ops WHERE device_id = ? AND "
                                     "seq <= ?", [store.device_id, seq]).fetchone()[0]


def _push(store: Store, hub: _Hub, hub_id: str, cursor: str, report: SyncReport,
          say: Callable[[str, int, int], None]) -> None:
    total = max(0, store.last_op_seq() - store.cursor(cursor))
    done = 0
    while True:
        # each operation as the JSON text that goes, written by SQLite
        batch = store.ops_json_with_seq(store.cursor(cursor), PUSH_BATCH, exclude_source="hub")
        if not batch:
            break
        photo_ops = [Op.from_json(json.loads(text)) for _, tbl, text in batch if tbl == "photos"]
        for sha, name in needed_photos(photo_ops).items():  # photos before the rows naming them
            if _upload(store, hub, sha):
                report.photos_sent += 1
        head = json.dumps({"device": store.device_id, "schema": list(MIGRATION_NAMES)})
        body = f'{head[:-1]},"ops":[{",".join([text for _, _, text in batch])}]}}'
        ack = hub.call("POST", "/v1/push", content=body.encode(),
                       headers={"Content-Type": "application/json"}).json()
        with store._tx():  # only after the acknowledgement
            store.set_cursor(cursor, batch[-1][0])
            span = ack.get("seqs") if isinstance(ack, dict) else None
            if isinstance(span, list) and len(span) == 2 and all(
                    type(n) is int for n in span) and 0 < span[0] <= span[1]:
                # what this push added to the hub: no need to pull it back
                store.note_own_span(hub_id, span[0], span[1])
        report.sent += len(batch)
        done += len(batch)
        say("send", done, total)


def _upload(store: Store, hub: _Hub, sha: str) -> bool:
    """Send one photo, continuing an unfinished upload; False when the hub had it."""
    f = photo_file(store, sha)
    if f is None:
        return False  # not on this device either: the row goes, the photo cannot
    status = hub.call("GET", f"/v1/photos/{sha}/status").json()
    if status["have"]:
        return False
    size = f.stat().st_size
    offset = int(status["received"])
    with open(f, "rb") as fh:
        while offset < size:
            fh.seek(offset)
            chunk = fh.read(CHUNK)
            r = hub.call("PUT", f"/v1/photos/{sha}", params={"offset": offset, "total": size},
                         content=chunk).json()
            offset = int(r["received"])
            if r["have"]:
                break
    return True


def _first_pull(store: Store, hub: _Hub, hub_id: str, cursor: str, report: SyncReport,
                say: Callable[[str, int, int], None]) -> None:
    """An empty store takes the hub's merged records whole (``store/_snapshot``): SQLite
    copies them, where pulling them would merge every operation in Python. A hub that keeps
    no records answers 404 and the pull goes operation by operation."""
    if store.cursor(cursor) or not store.holds_nothing():
        return
    with tempfile.TemporaryDirectory(prefix=".fieldcol-snapshot-",
                                     dir=store.path.parent) as tmp:
        dest = Path(tmp) / "snapshot.db"
        if not hub.save("/v1/snapshot", dest, lambda done, total: say("records", done, total)):
            return
        _fetch_photos(store, hub, snapshot_photos(dest), report)
        got = apply_snapshot(store, dest, hub_id=hub_id, cursor=cursor)
    report.received += got.ops
    report.whole = True
    say("receive", got.seq, got.seq)


def _pull(store: Store, hub: _Hub, hub_id: str, cursor: str, report: SyncReport,
          say: Callable[[str, int, int], None]) -> None:
    # the hub leaves out what this store pushed there itself (it holds those operations; a
    # copy restored from before a push has forgotten that push's span with it). Read once:
    # spans come from pushes, all made before the pull.
    own = store.own_spans(hub_id)
    # the next page is fetched while this one is merged (the hub reads and sends it, this
    # store writes: mostly in SQLite and the network, which run beside Python)
    with ThreadPoolExecutor(max_workers=1, thread_name_prefix="fieldcol-pull") as pool:
        coming = pool.submit(_fetch_page, hub, store.device_id, store.cursor(cursor), own)
        while True:
            after, spans, body = coming.result()
            with gc_paused():
                rows = body["ops"]
                page = body.get("limit")
                # a page shorter than asked holds all there was after ``after`` but the spans
                # left out, which were committed before they were acknowledged: the cursor
                # passes them too (unless the hub's numbers went back: a restored hub, trust
                # none)
                whole = type(page) is int and len(rows) < page
                through = int(rows[-1][0]) if rows else after
                if spans and max(b for _, b in spans) > int(body["max_seq"]):
                    store.forget_own_spans(hub_id)
                    own = spans = []
                elif spans and whole:
                    through = max(through, max(b for _, b in spans))
                if not rows:
                    if through > after:
                        with store._tx():
                            store.set_cursor(cursor, through)
                            store.forget_own_spans(hub_id, through)
                    break
                objs = [o for _, o in rows]
                # other operations this store holds come back too: skip those before decoding
                # them (photo rows still go through the photo check below, as they always did)
                ids = [o.get("op_id") if isinstance(o, dict) else None for o in objs]
                held = store.held_ops(i for i in ids if isinstance(i, str))
                objs = [o for o, i in zip(objs, ids)
                        if not (isinstance(i, str) and i in held and o.get("tbl") != "photos")]
                ops = ops_from_json(objs, "pull.ops")
            _fetch_photos(store, hub, needed_photos(ops), report)
            if not whole:  # (a failed fetch is raised once this page is merged and noted)
                coming = pool.submit(_fetch_page, hub, store.device_id, through, own)
            with store._tx():
                result = store.apply_ops(ops, source="hub", max_future_ms=None)
                store.set_cursor(cursor, through)
                if spans:
                    store.forget_own_spans(hub_id, through)
            report.received += result.new
            say("receive", through, int(body["max_seq"]))
            if whole:
                break


def _fetch_photos(store: Store, hub: _Hub, names: dict[str, str], report: SyncReport) -> None:
    """The photo files (hash -> name) this store lacks, fetched before the rows naming them."""
    for sha, name in names.items():
        if not have_photo(store, sha, name):
            if _download(store, hub, sha):
                report.photos_received += 1
            else:
                report.warnings.append(f"photo {sha[:12]} is not on the hub yet (the device "
                                       "that took it has not sent it)")


def _fetch_page(hub: _Hub, device_id: str, after: int, own: list[tuple[int, int]]
                ) -> tuple[int, list[tuple[int, int]], dict[str, Any]]:
    """One page of the hub's operations after ``after``, leaving out this store's own spans:
    (after, the spans named, the decoded answer)."""
    spans = [s for s in own if s[1] > after][:MAX_SKIP_SPANS]
    params: dict[str, Any] = {"after": after, "limit": PULL_BATCH}
    if spans:
        params.update(device=device_id, skip=",".join(f"{a}-{b}" for a, b in spans))
    reply = hub.call("GET", "/v1/pull", params=params)
    with gc_paused():
        body = reply.json()
    if not isinstance(body, dict) or not isinstance(body.get("ops"), list):
        raise InputError("hub", hub.url, "the hub's answer to a pull is not a page of "
                         "operations", "check the hub address")
    return after, spans, body


def _download(store: Store, hub: _Hub, sha: str) -> bool:
    data = bytearray()
    digest = hashlib.sha256()  # hashed as it arrives: each piece once
    while True:
        # no status call first: the hub answers 404 for a photo it does not hold
        r = hub.call("GET", f"/v1/photos/{sha}", params={"offset": len(data)}, absent_ok=True)
        if r.status_code == 404:
            if data:  # gone between two pieces (it never should): take nothing
                raise InputError("photo", sha[:12], "the hub stopped serving this photo "
                                 "half way", "sync again")
            return False
        if not r.content:
            break
        data += r.content
        digest.update(r.content)
        if digest.copy().hexdigest() == sha:
            break
    take_photo(store, sha, bytes(data))
    return True
