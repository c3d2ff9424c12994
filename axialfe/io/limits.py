"""Limits on what the readers accept: file size, kind of file, nesting depth.

A model file is untrusted.  Before it is parsed:

- it must be a regular file (not a device such as ``/dev/zero``, a pipe or a
  socket, which could never end or block the reader), of at most
  :data:`MAX_FILE_BYTES` (64 MB);
- its arrays and inline tables may nest at most :data:`MAX_DEPTH` levels; the
  TOML parser is recursive, so deeper nesting is refused by a flat scan
  before it can overflow the stack.
"""

from __future__ import annotations

import os
import re
import stat
from pathlib import Path

from ..errors import ModelError

__all__ = ["MAX_FILE_BYTES", "MAX_DEPTH", "read_input", "check_text"]

MAX_FILE_BYTES = 64 * 1024 * 1024
MAX_DEPTH = 16


def read_input(path) -> str:
    """Read an input file as UTF-8 text (a leading byte-order mark is dropped).

    Raises
    ------
    FileNotFoundError, IsADirectoryError, OSError, UnicodeDecodeError
        As :meth:`pathlib.Path.read_text` does (the caller words them).
    ModelError
        For a file that is not a regular file or is larger than the limit.
    """
    path = Path(path)
    info = os.stat(path)
    if stat.S_ISDIR(info.st_mode):
        raise IsADirectoryError(str(path))
    if not stat.S_ISREG(info.st_mode):
        raise ModelError("not a regular file (a device, a pipe or a socket): give a model file",
                         file=str(path))
    if info.st_size > MAX_FILE_BYTES:
        raise ModelError(f"the file is larger than the limit of {MAX_FILE_BYTES // 2**20} MB",
                         file=str(path))
    with open(path, "rb") as fh:
        data = fh.read(MAX_FILE_BYTES + 1)
    if len(data) > MAX_FILE_BYTES:  # it grew while it was read
        raise ModelError(f"the file is larger than the limit of {MAX_FILE_BYTES // 2**20} MB",
                         file=str(path))
    return data.decode("utf-8-sig")


_NOT_BRACKET = re.compile(r"[^\[\]{}]+")


def _may_nest_deeply(text: str) -> bool:
    """A fast over-estimate on the brackets alone (strings and comments included)."""
    depth = most = 0
    for ch in _NOT_BRACKET.sub("", text):
        if ch in "[{":
            depth += 1
            most = max(most, depth)
        else:
            depth = max(depth - 1, 0)
    return most > MAX_DEPTH


def check_text(text: str, source: str | None = None) -> None:
    """Refuse a text that is too long or nests arrays and inline tables too deeply.

    The scan skips strings and comments; its depth is that of ``[`` and ``{``
    inside values (table headers stand at depth 0).
    """
    if len(text) > MAX_FILE_BYTES:
        raise ModelError(f"the text is longer than the limit of {MAX_FILE_BYTES // 2**20} MB",
                         file=source)
    if not _may_nest_deeply(text):
        return
    depth, line, i, n = 0, 1, 0, len(text)
    at_line_start = True
    while i < n:
        ch = text[i]
        if ch == "\n":
            line += 1
            at_line_start = True
            i += 1
            continue
        if ch == "#":
            j = text.find("\n", i)
            i = n if j < 0 else j
            continue
        if ch in "\"'":
            triple = text.startswith(ch * 3, i)
            end = ch * 3 if triple else ch
            j = i + len(end)
            while j < n:
                if ch == '"' and text[j] == "\\":
                    j += 2
                    continue
                if text.startswith(end, j):
                    break
                if not triple and text[j] == "\n":
                    break
                j += 1
            line += text.count("\n", i, j)
            i = j + len(end)
            at_line_start = False
            continue
        if ch in " \t\r":
            i += 1
            continue
        if at_line_start and depth == 0 and ch == "[":  # a table header: skip the line
            j = text.find("\n", i)
            i = n if j < 0 else j
            continue
        at_line_start = False
        if ch in "[{":
            depth += 1
            if depth > MAX_DEPTH:
                raise ModelError(f"arrays and tables nest deeper than {MAX_DEPTH} levels",
                                 file=source, line=line)
        elif ch in "]}":
            depth = max(depth - 1, 0)
        i += 1
