"""The exception family: what a user did wrong, and what cannot be solved.

Every error a user can act on derives from :class:`AxialfeError`.  Errors keep
their fields and build the message in ``__str__`` so that the command line and
the tests see one sentence-case line::

    bar.toml:23: segments[2] ('sleeve'): area must be positive: got -2 mm^2

Anything else raised inside the package is a bug, and the command line reports
it as one.
"""

from __future__ import annotations

import difflib
from collections.abc import Iterable

__all__ = [
    "AxialfeError",
    "ModelError",
    "UnitError",
    "SolveError",
    "suggest",
]


def suggest(name: str, options: Iterable[str]) -> str | None:
    """Return the closest of ``options`` to ``name``, or None when none is close."""
    options = [str(o) for o in options]
    matches = difflib.get_close_matches(str(name), options, n=1, cutoff=0.6)
    if not matches:  # a difference of case only ('b' for 'B')
        folded = {o.casefold(): o for o in options}
        matches = [folded[m] for m in difflib.get_close_matches(
            str(name).casefold(), list(folded), n=1, cutoff=0.6)]
    return matches[0] if matches else None


class AxialfeError(Exception):
    """Root of every error that axialfe raises on purpose."""


# characters that would break a message's one line (TOML text may carry any of them)
_LINE_BREAKS = {ord(c): repr(c)[1:-1] for c in "\n\r\x0b\x0c\x1c\x1d\x1e\x85\u2028\u2029"}


def one_line(text: str) -> str:
    """``text`` with line breaks shown as escapes, so a message stays on one line."""
    return text.translate(_LINE_BREAKS)


class ModelError(AxialfeError, ValueError):
    """A model (file or code) that is malformed, inconsistent or out of range.

    Parameters
    ----------
    message : str
        What is wrong, sentence case, no trailing period.
    place : str, optional
        Where in the model, e.g. ``"segments[2] ('sleeve')"`` or ``"stations.left"``.
    file : str, optional
        The model file's name.
    line : int, optional
        The 1-based line of the file where the place can be found.
    hint : str, optional
        A close match for a misspelt name (shown as "did you mean ...?").
    options : iterable of str, optional
        The valid choices, shown when there is no close match.
    """

    def __init__(self, message, *, place=None, file=None, line=None, hint=None, options=None):
        super().__init__(message)
        self.message = message
        self.place = place
        self.file = file
        self.line = line
        self.hint = hint
        self.options = tuple(options) if options is not None else None

    def located(self, *, file=None, line=None, place=None):
        """Return a copy carrying a file, a line and a place where they were missing."""
        new = type(self).__new__(type(self))
        new.__dict__.update(self.__dict__)
        Exception.__init__(new, self.message)
        if new.file is None:
            new.file = file
        if new.line is None:
            new.line = line
        if new.place is None:
            new.place = place
        return new

    def __str__(self) -> str:
        head = ""
        if self.file is not None:
            head = f"{self.file}:{self.line}: " if self.line else f"{self.file}: "
        body = f"{self.place}: {self.message}" if self.place else self.message
        if self.hint is not None:
            body += f"; did you mean '{self.hint}'?"
        elif self.options:
            body += "; expected one of: " + ", ".join(f"'{o}'" for o in self.options)
        return one_line(head + body)


class UnitError(ModelError):
    """A value with a missing, unknown or wrongly dimensioned unit."""


class SolveError(AxialfeError, RuntimeError):
    """A model that has no unique equilibrium: a mechanism, a floating part, a singular system.

    Parameters
    ----------
    message : str
        What cannot be solved and why, naming stations, gaps or segments.
    file : str, optional
        The model file's name, when the model came from one.
    line : int, optional
        The line of the file where the first station or gap named can be found.
    """

    def __init__(self, message, *, file=None, line=None):
        super().__init__(message)
        self.message = message
        self.file = file
        self.line = line

    def __str__(self) -> str:
        if self.file is None:
            return one_line(self.message)
        return one_line(f"{self.file}:{self.line}: {self.message}" if self.line
                        else f"{self.file}: {self.message}")
