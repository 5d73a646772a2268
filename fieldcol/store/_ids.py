"""Ids of new rows and operations: UUIDs whose text sorts by the time they were made.

Why: every id is a key of several B-trees (the row's table, its operation, its winners, its
version). Random ids (version 4) land all over those trees, so a large batch (a schedule of
100,000 columns) touches a page per id and soon outgrows SQLite's page cache; ids that sort by
time go in at the right-hand end, a page at a time. The layout is UUID version 7 (RFC 9562):
48 bits of milliseconds, the version, a 12-bit counter that keeps ids of one millisecond in
order within this process, the variant and 62 random bits (unique across devices).
"""

from __future__ import annotations

import os
import random
import threading
import time

_lock = threading.Lock()
_last = [0, 0]  # the millisecond and the counter of the id made last in this process
# random bits from a generator seeded by the system's (a system call per id cost more than
# the rest of making it); seeded again in a forked child, which would repeat its parent's
_bits = random.Random(os.urandom(32)).getrandbits


def _reseed() -> None:
    global _bits
    _bits = random.Random(os.urandom(32)).getrandbits


if hasattr(os, "register_at_fork"):
    os.register_at_fork(after_in_child=_reseed)


def new_id() -> str:
    """A new UUID (version 7) as text; each one made here sorts after the one before.

    Example:
        >>> a, b = new_id(), new_id()
        >>> a < b, len(a), a[14]
        (True, 36, '7')
    """
    ms = time.time_ns() // 1_000_000
    with _lock:
        if ms <= _last[0]:  # the same millisecond (or the clock went back): count on
            ms, seq = _last[0], _last[1] + 1
            if seq > 0xFFF:
                ms, seq = ms + 1, 0
        else:
            seq = 0
        _last[0], _last[1] = ms, seq
    n = (ms & 0xFFFF_FFFF_FFFF) << 80 | 0x7 << 76 | seq << 64 | 0b10 << 62 | _bits(62)
    h = f"{n:032x}"
    return f"{h[:8]}-{h[8:12]}-{h[12:16]}-{h[16:20]}-{h[20:]}"


def new_ids(n: int) -> list[str]:
    """``n`` new ids at once, in order, as ``new_id`` makes them one by one.

    Why: a schedule's 100,000 columns need 200,000 ids (the rows and their operations); made
    together the time and counter are taken once and each id costs a format and no lock.

    Example:
        >>> a = new_ids(3)
        >>> a == sorted(a), len(set(a)), new_id() > a[-1]
        (True, 3, True)
    """
    if n <= 0:
        return []
    ms = time.time_ns() // 1_000_000
    with _lock:
        if ms <= _last[0]:
            ms, seq = _last[0], _last[1] + 1
        else:
            seq = 0
        last = seq + n - 1  # counters past 0xFFF run on into the next milliseconds
        _last[0], _last[1] = ms + (last >> 12), last & 0xFFF
    bits, out, head, prefix = _bits, [], -1, ""
    for s in range(seq, seq + n):
        m = ms + (s >> 12)
        if m != head:
            head = m
            t = f"{m & 0xFFFF_FFFF_FFFF:012x}"
            prefix = f"{t[:8]}-{t[8:]}-7"
        r = f"{0x8000_0000_0000_0000 | bits(62):016x}"
        out.append(f"{prefix}{s & 0xFFF:03x}-{r[:4]}-{r[4:]}")
    return out
