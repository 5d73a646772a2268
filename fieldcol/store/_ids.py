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
