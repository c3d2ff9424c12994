"""Guards around a command's numerics: floating-point trouble is an error, never a warning.

Inside :func:`numerics_guarded`, numpy raises on overflow, division by zero and
invalid operations instead of warning and carrying on with inf or NaN, and
Python's own arithmetic errors are caught as well.  Values within the model's
physical ranges can still make the arithmetic fail (a segment of 1e-300 m, a
misfit of 1e300 mm); the command then prints one located ``error:`` line and
exits 2, and nothing else reaches stderr.
"""

from __future__ import annotations

import contextlib
import warnings

import numpy as np

from ..errors import SolveError

__all__ = ["numerics_guarded"]

_ARITHMETIC = (FloatingPointError, ZeroDivisionError, OverflowError, RuntimeWarning)


@contextlib.contextmanager
def numerics_guarded(source=None):
    """Run a block with floating-point trouble raised as one :class:`SolveError`.

    Parameters
    ----------
    source : path, optional
        The input file, named in the message.
    """
    try:
        with np.errstate(over="raise", divide="raise", invalid="raise", under="ignore"), warnings.catch_warnings():
            warnings.simplefilter("error", RuntimeWarning)
            yield
    except _ARITHMETIC as exc:
        what = str(exc).strip() or type(exc).__name__
        raise SolveError(f"the arithmetic failed ({what}): some value is so large or so small "
                         "that the numbers overflow; check the sizes of the inputs",
                         file=None if source is None else str(source)) from None
    except RecursionError:
        raise SolveError("the input is nested too deeply to be read",
                         file=None if source is None else str(source)) from None


@contextlib.contextmanager
def time_limit(seconds: float, message: str, source=None):
    """Stop a block that runs longer than ``seconds`` with one :class:`SolveError`.

    For work whose time cannot be bounded in advance (simplifying a closed form):
    the tool refuses rather than computes for many minutes.  Works in the main
    thread of a POSIX process; elsewhere the block runs unbounded.
    """
    import signal
    import threading

    if not hasattr(signal, "setitimer") or threading.current_thread() is not threading.main_thread():
        yield
        return

    class _Late(BaseException):
        pass

    def ring(signum, frame):
        raise _Late

    old = signal.signal(signal.SIGALRM, ring)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    except _Late:
        raise SolveError(message, file=None if source is None else str(source)) from None
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, old)
