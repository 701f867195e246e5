"""Reading the files a user names: regular files only, never more than a limit.

A path may name a device (``/dev/zero``), a FIFO or a loop of symbolic links:
reading one of those whole could hang the tool or exhaust its memory. Every file
calcreport reads on a user's behalf (input, curve files, traces) comes through
:func:`read_bounded`, which looks before it reads and reads at most one byte past
the limit.
"""

from __future__ import annotations

import errno
import os
import stat
from pathlib import Path

from calcreport.errors import FileReadError

__all__ = ["read_bounded"]


def read_bounded(path: str | Path, limit: int) -> bytes:
    """The bytes of the regular file at ``path``, at most ``limit`` of them.

    Raises :class:`~calcreport.errors.FileReadError` whose reason is a sentence
    (without the path): missing, a folder, not a regular file, a loop of links,
    larger than the limit, or unreadable.
    """
    name = str(path)
    try:
        info = os.stat(path)
    except FileNotFoundError:
        raise FileReadError(name, "the file does not exist.") from None
    except OSError as exc:
        if exc.errno == errno.ELOOP:
            raise FileReadError(name, "its symbolic links form a loop.") from None
        raise FileReadError(name, f"the file cannot be read ({_why(exc)}).") from None
    if stat.S_ISDIR(info.st_mode):
        raise FileReadError(name, "it is a folder, not a file.")
    if not stat.S_ISREG(info.st_mode):
        raise FileReadError(name, "it is not a regular file (a device, a pipe or a socket).")
    if info.st_size > limit:
        raise FileReadError(name, f"the file has {info.st_size:,} bytes; at most {limit:,}.")
    try:
        with open(path, "rb") as handle:
            data = handle.read(limit + 1)
    except OSError as exc:
        raise FileReadError(name, f"the file cannot be read ({_why(exc)}).") from None
    if len(data) > limit:  # it grew while being read
        raise FileReadError(name, f"the file has more than {limit:,} bytes.")
    return data


def _why(exc: OSError) -> str:
    return (exc.strerror or type(exc).__name__).lower()
