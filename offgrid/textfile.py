"""Reading the user's text files with messages a person can act on.

Project files, load lists and climate files all go through :func:`read_text`, so a missing
file, a folder given for a file, a file without read permission, a binary or non-UTF-8
file or one far too large for its kind gets one clear sentence instead of a traceback.
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

#: Larger than any project, load list or climate file offgrid writes (a climate with its
#: 365-day series is ~50 kB): refuse rather than read a wrong file into memory.
MAX_TEXT_BYTES = 20_000_000


def _kind(mode: int) -> str:
    if stat.S_ISFIFO(mode):
        return "a named pipe (FIFO)"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a plain file"


class TextFileError(ValueError):
    """A text file cannot be read; the message says why and what to do (the path is not in it)."""


def open_regular(path: str | os.PathLike, max_bytes: int | None = None):
    """Open a regular file for reading in binary, for a streaming reader.

    A folder, FIFO, device or socket is refused with :class:`TextFileError` (never
    opened in a way that blocks); so is a file over ``max_bytes`` when given.
    """
    p = Path(path)
    info = p.stat()  # follows links; never blocks, even on a FIFO
    if stat.S_ISDIR(info.st_mode):
        raise TextFileError("is a folder, not a file: give the path of the file itself")
    if not stat.S_ISREG(info.st_mode):
        raise TextFileError(
            f"is not a regular file (it is {_kind(info.st_mode)}): give "
            "the path of a saved text file"
        )
    if max_bytes is not None and info.st_size > max_bytes:
        raise TextFileError(
            f"is {info.st_size / 1e6:.0f} MB, far larger than this kind of "
            "file: check that it is the right file"
        )
    # O_NONBLOCK: if the path was swapped for a FIFO since stat, open does not wait
    fd = os.open(p, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    fh = os.fdopen(fd, "rb")
    if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):
        fh.close()
        raise TextFileError("is not a regular file: give the path of a saved text file")
    return fh


def read_text(path: str | os.PathLike, max_bytes: int = MAX_TEXT_BYTES) -> str:
    """The file's text, decoded as UTF-8 (a leading byte-order mark is kept).

    Only regular files are read (a FIFO or a device such as ``/dev/zero`` would block or
    never end), and never more than ``max_bytes``.  Raises :class:`TextFileError` with
    the reason and the fix.
    """
    p = Path(path)
    try:
        with open_regular(p, max_bytes) as fh:
            data = fh.read(max_bytes + 1)
        if len(data) > max_bytes:
            raise TextFileError(
                f"is larger than {max_bytes / 1e6:.0f} MB, far larger than this "
                "kind of file: check that it is the right file"
            )
    except FileNotFoundError:
        raise TextFileError("does not exist: check the folder and the file name") from None
    except PermissionError:
        raise TextFileError(
            "cannot be read: permission denied; check the file's permissions "
            "or copy it somewhere you can read"
        ) from None
    except OSError as exc:
        raise TextFileError(f"cannot be read: {exc.strerror or exc}") from None
    if data[:2] in (b"\xff\xfe", b"\xfe\xff"):
        raise TextFileError(
            "is UTF-16 text (a spreadsheet's 'Unicode text'): save it with "
            "UTF-8 encoding (in a spreadsheet: 'CSV UTF-8'; in an editor: "
            "encoding UTF-8)"
        )
    if b"\x00" in data[:4096]:
        raise TextFileError("is a binary file, not text: give the text file (TOML or CSV)")
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data.count(b"\n", 0, exc.start) + 1
        raise TextFileError(
            f"is not UTF-8 text (byte 0x{data[exc.start]:02x} on line {line}): save it with "
            "UTF-8 encoding (in a spreadsheet: 'CSV UTF-8'; in an editor: encoding UTF-8)"
        ) from None
