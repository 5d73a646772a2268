"""Ids of new rows and operations: UUID version 7 text that sorts by the time it was made.

Layout: RFC 9562 section 5.7 (48-bit milliseconds, version 7, variant 10); read back with
Python's own ``uuid`` module, which parses the version and variant fields independently.
"""

from __future__ import annotations

import time
import uuid

from fieldcol.store._ids import new_id, new_ids


def _check(text: str) -> uuid.UUID:
    u = uuid.UUID(text)
    assert str(u) == text  # canonical lower-case 8-4-4-4-12 text
    assert u.version == 7 and u.variant == uuid.RFC_4122
    return u


def test_ids_made_together_are_uuid7_in_order_and_unique():
    before = new_id()
    many = new_ids(10_000)  # more than one millisecond's 4,096 counters
    after = new_id()
    assert len(set(many)) == 10_000
    assert [before, *many, after] == sorted([before, *many, after])
    for text in (many[0], many[4095], many[4096], many[-1]):
        _check(text)
    # the first 48 bits are Unix milliseconds (RFC 9562 5.7): near now
    ms = _check(many[0]).int >> 80
    assert abs(ms - time.time_ns() // 1_000_000) < 60_000
    assert new_ids(0) == []


def test_ids_one_by_one_and_together_interleave_in_order():
    got = [new_id(), *new_ids(3), new_id(), *new_ids(1)]
    assert got == sorted(got) and len(set(got)) == len(got)
