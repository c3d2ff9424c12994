"""Reading an input file and decoding its TOML: the one way every reader does it.

The model, fit, joint and claims readers all start the same way: read the file
as UTF-8 text within the limits of :mod:`axialfe.io.limits` (a regular file of
bounded size), then decode the TOML, bounded in nesting, with a decode error
turned into one located line.  Each reader then checks and converts the data
in its own way.
"""

from __future__ import annotations

import re
import tomllib
from pathlib import Path

from .._gcpause import gc_paused
from ..errors import ModelError
from . import limits

__all__ = ["read_text", "decode", "toml_loads", "TOMLDecodeError"]


def _parser():
    """The TOML parser: ``tomli`` 2.2's compiled build where it is installed (the parser
    the standard library's ``tomllib`` was taken from: the same TOML 1.0, the same
    messages, twice as fast on a big model file), else ``tomllib``.  A pure-Python build
    is no faster, and tomli 2.3 on reads TOML 1.1 (newlines in inline tables, ``\\e``),
    which ``tomllib`` refuses: neither is used."""
    try:
        import tomli
        import tomli._parser
    except ImportError:
        return tomllib.loads, (tomllib.TOMLDecodeError,)
    version = tuple(int(p) for p in re.findall(r"\d+", getattr(tomli, "__version__", ""))[:2])
    if tomli._parser.__file__.endswith(".py") or version != (2, 2):
        return tomllib.loads, (tomllib.TOMLDecodeError,)
    return tomli.loads, (tomli.TOMLDecodeError, tomllib.TOMLDecodeError)


toml_loads, TOMLDecodeError = _parser()

_LINE = re.compile(r"line (\d+)")


def read_text(path, what: str, *, file=None, line=None, place=None) -> str:
    """The text of the input file ``path`` (a ``what``: "model file", "fit file", ...).

    ``file``, ``line`` and ``place`` locate the errors where another file names
    this one (a claims file named by a model file); by default they are the
    file itself.

    Raises
    ------
    ModelError
        One located line for a file that does not exist, a folder, a file that
        is not a regular file or is over the size limit, or one that cannot be
        read as UTF-8.
    """
    path = Path(path)
    where = dict(file=file or str(path), line=line, place=place)
    try:
        return limits.read_input(path)
    except FileNotFoundError:
        raise ModelError(f"the {what} does not exist", **where) from None
    except IsADirectoryError:
        raise ModelError(f"this is a folder, not a {what}", **where) from None
    except (OSError, UnicodeDecodeError) as exc:
        raise ModelError(f"cannot read the {what}: {exc.__class__.__name__}: {exc}",
                         **{**where, "place": None}) from exc


def decode(text: str, source: str | None) -> dict:
    """The TOML ``text`` as data, with a decode error as one line located in ``source``.

    Deep nesting is refused before the (recursive) parser sees it.
    """
    limits.check_text(text, source)
    try:
        with gc_paused():
            return toml_loads(text)
    except TOMLDecodeError as exc:
        m = _LINE.search(str(exc))
        end = "end of document" in str(exc)  # TOML's own count: the last line
        raise ModelError(f"not valid TOML: {exc}", file=source,
                         line=int(m.group(1)) if m else (text.count("\n") + 1 if end else None)
                         ) from exc
    except RecursionError:  # a backstop: the scan above refuses deep nesting first
        raise ModelError(f"arrays and tables nest deeper than {limits.MAX_DEPTH} levels",
                         file=source) from None
