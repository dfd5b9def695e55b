"""What the text UI keeps between runs: recent projects and recovery files.

Everything lives in one folder: ``$OFFGRID_STATE_DIR``, else
``$XDG_STATE_HOME/offgrid``, else ``~/.local/state/offgrid``.

A recovery file holds the exact text of the project that was on screen, the
file it belongs to and the text that file had when it was opened (to tell
whether it changed since).  Each running UI writes its own
``recovery-PID.json`` (atomically) a few seconds after the last edit, and
removes it after a save or a deliberate quit.  A file whose process is no
longer running is offered at the next start.
"""

from __future__ import annotations

import contextlib
import json
import os
import time
from dataclasses import dataclass
from pathlib import Path

from offgrid.project.atomic import atomic_write_text

RECOVERY_FORMAT = "offgrid-recovery"
RECENT_LIMIT = 12


def state_dir() -> Path:
    env = os.environ.get("OFFGRID_STATE_DIR")
    if env:
        return Path(env).expanduser()
    xdg = os.environ.get("XDG_STATE_HOME")
    base = Path(xdg).expanduser() if xdg else Path.home() / ".local" / "state"
    return base / "offgrid"


def _ensure(folder: Path) -> Path:
    folder.mkdir(parents=True, exist_ok=True)
    return folder


# ----------------------------------------------------------------------------- recent files


def recent_projects(folder: Path | None = None) -> list[Path]:
    """Recently used project files that still exist, newest first."""
    f = (folder or state_dir()) / "recent.json"
    try:
        items = json.loads(f.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return []
    out = []
    for item in items if isinstance(items, list) else []:
        if isinstance(item, str) and Path(item).is_file():
            out.append(Path(item))
    return out


def remember_project(path: Path, folder: Path | None = None) -> None:
    folder = folder or state_dir()
    try:
        _ensure(folder)
        items = [str(p) for p in recent_projects(folder) if p != path]
        items.insert(0, str(path))
        atomic_write_text(
            folder / "recent.json",
            json.dumps(items[:RECENT_LIMIT], indent=1),
            backup=False,
            new_mode=0o600,
        )
    except OSError:
        pass  # a read-only home must not stop the work


# ----------------------------------------------------------------------------- recovery


@dataclass(frozen=True)
class Recovery:
    file: Path  # the recovery file itself
    pid: int
    saved_at: float  # seconds since the epoch
    project_path: str | None  # the project file it belongs to, None if never saved
    title: str
    text: str  # the project exactly as it was on screen
    baseline: str  # the saved text it started from

    @property
    def age_text(self) -> str:
        return time.strftime("%Y-%m-%d %H:%M", time.localtime(self.saved_at))


def _alive(pid: int) -> bool:
    if pid == os.getpid():
        return True
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    except OSError:
        return False
    # A process that has ended but not been reaped (a zombie) still answers kill(0).
    try:
        stat = Path(f"/proc/{pid}/stat").read_text()
        return stat.rsplit(")", 1)[1].split()[0] not in ("Z", "X")
    except (OSError, IndexError):
        return True


class RecoveryStore:
    """This process's recovery file, and the orphans left by earlier runs."""

    def __init__(self, folder: Path | None = None, pid: int | None = None) -> None:
        self.folder = folder or state_dir()
        self.pid = os.getpid() if pid is None else pid
        self.file = self.folder / f"recovery-{self.pid}.json"

    def write(self, text: str, project_path: Path | None, title: str, baseline: str) -> Path:
        body = {
            "format": RECOVERY_FORMAT,
            "pid": self.pid,
            "saved_at": time.time(),
            "project_path": str(project_path) if project_path else None,
            "title": title,
            "text": text,
            "baseline": baseline,
        }
        _ensure(self.folder)
        return atomic_write_text(
            self.file, json.dumps(body, ensure_ascii=False), backup=False, new_mode=0o600
        )  # the project's text: private

    def clear(self) -> None:
        with contextlib.suppress(FileNotFoundError):
            self.file.unlink()

    def orphans(self) -> list[Recovery]:
        """Recovery files whose process has ended, newest first."""
        found = []
        if not self.folder.is_dir():
            return found
        for f in self.folder.glob("recovery-*.json"):
            item = read_recovery(f)
            if item is None or item.file == self.file or _alive(item.pid):
                continue
            found.append(item)
        return sorted(found, key=lambda r: r.saved_at, reverse=True)


def read_recovery(f: Path) -> Recovery | None:
    try:
        body = json.loads(f.read_text(encoding="utf-8"))
        if body.get("format") != RECOVERY_FORMAT:
            return None
        return Recovery(
            file=f,
            pid=int(body["pid"]),
            saved_at=float(body["saved_at"]),
            project_path=body.get("project_path"),
            title=str(body.get("title", "")),
            text=str(body["text"]),
            baseline=str(body.get("baseline", "")),
        )
    except (OSError, ValueError, KeyError, TypeError):
        return None


def discard_recovery(item: Recovery) -> None:
    with contextlib.suppress(FileNotFoundError):
        item.file.unlink()
