"""The cycle collector held off while a sync decodes or merges a batch.

Why: a batch of 5,000 operations makes hundreds of thousands of small dicts and tuples, none of
them in a reference cycle. Each few hundred of them started a collection, and every so often one
that walked every object the process held; that was a fifth of a sync's processor time. Reference
counting still frees everything as usual; only the search for cycles waits until the batch ends.
"""

from __future__ import annotations

import gc
import threading
from contextlib import contextmanager
from typing import Iterator

_lock = threading.Lock()
_depth = 0  # batches under way in any thread: the collector is process-wide


@contextmanager
def gc_paused() -> Iterator[None]:
    """Hold off the cycle collector for the ``with`` block (nested or from several threads at
    once: it runs again when the last block ends, and only if it was running before).

    Example:
        >>> with gc_paused():
        ...     gc.isenabled()
        False
    """
    global _depth, _was_on
    with _lock:
        if _depth == 0:
            _was_on = gc.isenabled()
            gc.disable()
        _depth += 1
    try:
        yield
    finally:
        with _lock:
            _depth -= 1
            if _depth == 0 and _was_on:
                gc.enable()


_was_on = True
