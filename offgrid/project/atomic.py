"""Writing a file so that a kill, crash or power cut at any moment leaves it whole.

:func:`write_atomic` (and :func:`atomic_write_text`) is what every file offgrid
writes goes through (projects, climates, reports, load lists, state). Its steps:

1. A symlink is followed: the link is kept and the file it points to is written
   (the temporary file and the backup go beside that file, in its folder).
2. Stray temporary files of the same file left by an interrupted save are removed
   (only ours, recognised by :data:`TEMP_RE`, and only when the process that made
   them has ended).
3. The new text goes to a hidden temporary file in the same folder, with the old
   file's permission bits (and owner and group where allowed), then flush + fsync.
4. The backup ``NAME.bak`` is made *without removing the file*: a hard link to it,
   or a copy where the file system has no hard links, put in place by a rename.
5. One rename puts the temporary file over the file, then the folder is fsynced.

The file therefore exists at every moment, as the old version or the new one whole.
With ``expect`` (a :class:`Fingerprint` taken when the file was read), the write is
refused with :class:`ChangedOnDisk` if somebody else changed the file since.
"""

from __future__ import annotations

import contextlib
import errno
import hashlib
import os
import re
import secrets
import shutil
import stat
import time
from dataclasses import dataclass
from pathlib import Path

#: Our temporary files: ``.NAME.PID.RANDOM.offgrid-tmp`` (the new text, or a backup
#: about to be renamed into place).
TEMP_SUFFIX = ".offgrid-tmp"
TEMP_RE = re.compile(
    r"^\.(?P<name>.+)\.(?P<pid>\d+)\.[0-9a-f]{12}(?:\.bak)?" + re.escape(TEMP_SUFFIX) + "$"
)
#: Temporary files of earlier offgrid versions (``tempfile.mkstemp`` names); removed once
#: older than :data:`LEGACY_AGE_S`, since they carry no process number.
LEGACY_RE = re.compile(r"^\.(?P<name>.+)\.[a-z0-9_]{8}\.tmp$")
LEGACY_AGE_S = 600.0


@dataclass(frozen=True)
class Fingerprint:
    """What a file was when read or written: modification time [ns], size [bytes], SHA-256."""

    mtime_ns: int
    size: int
    sha256: str


class ChangedOnDisk(OSError):
    """The file was changed by someone else since it was read; nothing was written."""

    def __init__(self, path: Path, now: Fingerprint | None) -> None:
        self.path = path
        self.now = now
        what = "was removed" if now is None else "was changed by another program or window"
        super().__init__(errno.EEXIST, f"{path} {what} since it was opened or last saved")


def fingerprint(path: str | os.PathLike) -> Fingerprint | None:
    """The file's fingerprint now, or None if there is no regular file there."""
    try:
        with open(path, "rb") as fh:
            st = os.fstat(fh.fileno())
            if not stat.S_ISREG(st.st_mode):
                return None
            digest = hashlib.sha256()
            for block in iter(lambda: fh.read(1 << 20), b""):
                digest.update(block)
    except OSError:
        return None
    return Fingerprint(st.st_mtime_ns, st.st_size, digest.hexdigest())


def same_content(a: Fingerprint | None, b: Fingerprint | None) -> bool:
    """True when both fingerprints describe the same bytes (time alone does not count)."""
    if a is None or b is None:
        return a is b
    return a.size == b.size and a.sha256 == b.sha256


def real_target(path: str | os.PathLike) -> Path:
    """The file a write to ``path`` updates: a symlink's target (the link itself is kept)."""
    p = Path(path)
    return Path(os.path.realpath(p)) if p.is_symlink() else p


def _alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except OSError:
        return True  # exists, not ours
    with contextlib.suppress(OSError, IndexError):  # a zombie answers kill(0) too
        state = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0]
        return state not in ("Z", "X")
    return True


def stray_temp_files(path: str | os.PathLike) -> list[Path]:
    """Our temporary files of ``path`` left by interrupted saves (their process has ended)."""
    target = real_target(path)
    folder = target.parent
    found = []
    now = time.time()
    try:
        entries = list(os.scandir(folder))
    except OSError:
        return []
    for entry in entries:
        m = TEMP_RE.match(entry.name)
        legacy = None if m else LEGACY_RE.match(entry.name)
        hit = m or legacy
        if hit is None or hit.group("name") != target.name:
            continue
        try:
            st = entry.stat(follow_symlinks=False)
        except OSError:
            continue
        if not stat.S_ISREG(st.st_mode):
            continue  # never a link, a folder or a device, whatever its name
        if m and _alive(int(m.group("pid"))):
            continue  # another window may be saving this very moment
        if legacy and now - st.st_mtime < LEGACY_AGE_S:
            continue
        found.append(Path(entry.path))
    return found


def clean_stray_temp_files(path: str | os.PathLike) -> list[Path]:
    """Remove :func:`stray_temp_files` of ``path``; returns what was removed."""
    removed = []
    for f in stray_temp_files(path):
        with contextlib.suppress(OSError):  # gone already, or not ours to remove: never fatal
            f.unlink()
            removed.append(f)
    return removed


def _temp_name(target: Path, bak: bool = False) -> Path:
    tag = f"{target.name}.{os.getpid()}.{secrets.token_hex(6)}"
    return target.with_name(f".{tag}{'.bak' if bak else ''}{TEMP_SUFFIX}")


def _fsync_folder(folder: Path) -> None:
    with contextlib.suppress(OSError):
        dfd = os.open(folder, os.O_RDONLY)
        try:
            os.fsync(dfd)
        finally:
            os.close(dfd)


def _backup(target: Path) -> None:
    """``target + '.bak'`` = the current file, made without removing ``target``."""
    bak = target.with_name(target.name + ".bak")
    with contextlib.suppress(OSError):
        if os.path.samefile(bak, target) and not os.path.islink(bak):
            return  # already a hard link to it (an earlier save was interrupted after it)
    tmp = _temp_name(target, bak=True)
    try:
        try:
            os.link(target, tmp)
        except OSError:  # no hard links here (some network and FAT file systems): copy
            shutil.copy2(target, tmp, follow_symlinks=False)
            with open(tmp, "rb") as fh:
                os.fsync(fh.fileno())
        os.replace(tmp, bak)  # replaces a stale .bak (even a symlink) in one step
        # rename(2) does nothing when both names are links to one file: tidy up then
        with contextlib.suppress(FileNotFoundError):
            os.unlink(tmp)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        raise


def write_atomic(
    path: str | os.PathLike,
    text: str,
    backup: bool = True,
    *,
    expect: Fingerprint | None = None,
    new_mode: int | None = None,
    check_expect: bool = False,
) -> Fingerprint:
    """Write ``text`` (UTF-8, ``\\n`` line ends) to ``path`` whole; see the module notes.

    ``backup``: keep the previous file as ``NAME.bak``. ``check_expect``: refuse with
    :class:`ChangedOnDisk` unless the file on disk still has ``expect``'s content (None:
    there was no file). ``new_mode``: permission bits of a new file (default 0666 less the
    umask); an existing file keeps its own. Returns the written file's fingerprint.
    """
    target = real_target(path)
    folder = target.parent if str(target.parent) else Path(".")
    if target.is_dir():
        raise IsADirectoryError(
            errno.EISDIR, "is a folder, not a file: give a file name", str(target)
        )
    if not folder.is_dir():
        raise FileNotFoundError(
            errno.ENOENT,
            "the folder does not exist: create it first or choose another",
            str(folder),
        )
    try:
        old = os.stat(target)
    except FileNotFoundError:
        old = None
    if old is not None and not stat.S_ISREG(old.st_mode):
        raise OSError(
            errno.EINVAL,
            "is not a regular file (a device or a pipe?): choose another name",
            str(target),
        )
    clean_stray_temp_files(target)
    if old is not None:
        mode = stat.S_IMODE(old.st_mode)
    elif new_mode is not None:
        mode = new_mode
    else:
        mask = os.umask(0)
        os.umask(mask)
        mode = 0o666 & ~mask
    data = text.encode("utf-8")
    tmp = _temp_name(target)
    fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600)
    try:
        with os.fdopen(fd, "wb") as fh:
            if old is not None and (old.st_uid != os.geteuid() or old.st_gid != os.getegid()):
                with contextlib.suppress(OSError):  # owner only as root; group if a member
                    os.fchown(fh.fileno(), old.st_uid, old.st_gid)
                with contextlib.suppress(OSError):
                    os.fchown(fh.fileno(), -1, old.st_gid)
            os.fchmod(fh.fileno(), mode)
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
            st = os.fstat(fh.fileno())
        if check_expect:
            now = fingerprint(target)
            if not same_content(now, expect):
                raise ChangedOnDisk(target, now)
        if backup and old is not None:
            _backup(target)
        os.replace(tmp, target)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        raise
    _fsync_folder(folder)
    return Fingerprint(st.st_mtime_ns, st.st_size, hashlib.sha256(data).hexdigest())


def atomic_write_text(
    path: str | os.PathLike, text: str, backup: bool = True, *, new_mode: int | None = None
) -> Path:
    """:func:`write_atomic` without the change check; returns ``path`` as given."""
    write_atomic(path, text, backup, new_mode=new_mode)
    return Path(path)
