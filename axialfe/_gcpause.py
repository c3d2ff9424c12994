"""A pause of Python's cyclic garbage collector while building many small objects.

Reading or assembling a model with hundreds of thousands of segments allocates
millions of tuples and floats that never form cycles; the collector would scan
all live objects again and again and dominate the run time.
"""

from __future__ import annotations

import contextlib
import gc

__all__ = ["gc_paused"]


@contextlib.contextmanager
def gc_paused():
    """Disable cyclic garbage collection inside the block (restored on exit)."""
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()
