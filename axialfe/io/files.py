"""Output files: checked before anything is written, then written atomically.

Every file the tool writes (``--output``, ``--plot``, a report, a starter model)
goes through this module:

- :func:`check_output` refuses, before any work is done, an output path that
  resolves to an input file (a model must never be replaced by its results),
  one that is a folder, or one whose folder does not exist;
- :func:`write_text` and :func:`atomic_path` write to a temporary file in the
  target's own folder and rename it into place, so a failing write leaves the
  folder as it was: the old file intact, no partial file beside it.
"""

from __future__ import annotations

import contextlib
import os
import tempfile
from pathlib import Path

from ..errors import ModelError

__all__ = ["check_output", "write_text", "write_bytes", "atomic_path"]


def _same(a: Path, b: Path) -> bool:
    try:
        if a.exists() and b.exists():
            return os.path.samefile(a, b)
    except OSError:
        pass
    return a.resolve() == b.resolve()


def check_output(path, inputs=(), option: str = "--output", others=()) -> Path:
    """Check that ``path`` can be written without harm; return it as a Path.

    Parameters
    ----------
    path : str or Path
        The output file.
    inputs : iterable of path
        The files the command reads; none of them may be the output.
    option : str
        The option that named the path, for the message.
    others : iterable of (option, path)
        Other outputs of the same command; two outputs may not share a file.

    Raises
    ------
    ModelError
        When the path is an input, a folder, or in a folder that does not exist.
    """
    path = Path(path)
    for source in inputs:
        if source is not None and _same(path, Path(source)):
            raise ModelError(f"{option}: '{path}' is an input file of this command; it would "
                             "be overwritten: choose another output path")
    for other_option, other in others:
        if other is not None and _same(path, Path(other)):
            raise ModelError(f"{option}: '{path}' is also given to {other_option}; give each "
                             "output its own file")
    if path.is_dir():
        raise ModelError(f"{option}: '{path}' is a folder; give a file name")
    parent = path.parent if str(path.parent) else Path(".")
    if not parent.is_dir():
        raise ModelError(f"{option}: the folder '{parent}' does not exist")
    return path


@contextlib.contextmanager
def atomic_path(path):
    """Yield a temporary path beside ``path``; rename it onto ``path`` if the block succeeds.

    On any exception the temporary file is removed and ``path`` is left as it was.
    """
    path = Path(path)
    parent = path.parent if str(path.parent) else Path(".")
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=parent)
    except OSError as exc:
        raise ModelError(f"cannot write the file: {exc.strerror or exc}", file=str(path)) from exc
    os.close(fd)
    try:
        yield Path(tmp)
        mask = os.umask(0)
        os.umask(mask)
        os.chmod(tmp, 0o666 & ~mask)
        os.replace(tmp, path)
    except OSError as exc:
        _remove(tmp)
        raise ModelError(f"cannot write the file: {exc.strerror or exc}", file=str(path)) from exc
    except BaseException:
        _remove(tmp)
        raise


def _remove(tmp):
    with contextlib.suppress(OSError):
        os.unlink(tmp)


def write_bytes(path, data: bytes) -> Path:
    """Write ``data`` to ``path`` atomically (see :func:`atomic_path`)."""
    with atomic_path(path) as tmp:
        with open(tmp, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
    return Path(path)


def write_text(path, text: str) -> Path:
    """Write ``text`` to ``path`` as UTF-8, atomically (see :func:`atomic_path`)."""
    return write_bytes(path, text.encode("utf-8"))
