"""The real program in a real terminal: tmux on a private socket, keys in, screen out.

Skipped where tmux is not installed.  Each test starts ``python -m offgrid`` in an
80x24 tmux window, sends keys with ``send-keys`` and polls ``capture-pane`` until
the expected text appears.  Killing the tmux server hangs up the terminal, which
is what a dropped SSH connection does to the program.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import time
import uuid
from pathlib import Path

import pytest

from offgrid.paths import demo_project_path
from offgrid.project.store import load_project

ROOT = Path(__file__).resolve().parents[2]
TMUX = shutil.which("tmux")
pytestmark = pytest.mark.skipif(TMUX is None, reason="tmux is not installed")


class Terminal:
    def __init__(self, name: str, state: Path, cwd: Path) -> None:
        # a fresh socket per terminal: a server killed by the previous test may still be
        # exiting on a reused name, and a new session would attach to it and die with it
        self.socket = f"offgrid-test-{os.getpid()}-{name}-{uuid.uuid4().hex[:8]}"
        self.state = state
        self.cwd = cwd

    def tmux(self, *args: str, check: bool = True) -> str:
        proc = subprocess.run(
            [TMUX, "-L", self.socket, "-f", "/dev/null", *args],
            capture_output=True,
            text=True,
            timeout=20,
        )
        if check and proc.returncode != 0:
            raise AssertionError(f"tmux {' '.join(args)}: {proc.stderr}")
        return proc.stdout

    def start(
        self,
        *argv: str,
        term: str = "xterm-256color",
        no_color: bool = False,
        notice_s: float | None = None,
    ) -> None:
        env = {
            "TERM": term,
            "OFFGRID_STATE_DIR": str(self.state),
            "PYTHONPATH": str(ROOT),
            "TEXTUAL_ANIMATIONS": "none",
            "ESCDELAY": "25",
            "HOME": os.environ.get("HOME", "/tmp"),
            "PATH": os.environ.get("PATH", ""),
        }
        if no_color:
            env["NO_COLOR"] = "1"
        if notice_s is not None:  # every notice lasts this long (offgrid.tui.app.notice_seconds)
            env["OFFGRID_NOTICE_SECONDS"] = str(notice_s)
        assign = " ".join(f"{k}='{v}'" for k, v in env.items())
        args = " ".join(f"'{a}'" for a in argv)
        command = f"cd '{self.cwd}' && exec env -i {assign} '{sys.executable}' -m offgrid {args}"
        self.tmux("new-session", "-d", "-x", "80", "-y", "24", "-s", "t", command)

    def keys(self, *keys: str) -> None:
        for k in keys:
            self.tmux("send-keys", "-t", "t", k)
            # a key sent right after Escape would arrive as Alt+key
            time.sleep(0.5 if k == "Escape" else 0.15)

    def type(self, text: str) -> None:
        self.tmux("send-keys", "-t", "t", "-l", text)
        time.sleep(0.15)

    def screen(self) -> str:
        return self.tmux("capture-pane", "-t", "t", "-p", check=False)

    def wait_for(self, *texts: str, timeout: float = 15.0, every_s: float = 0.1) -> str:
        end = time.monotonic() + timeout
        shown = ""
        while time.monotonic() < end:
            shown = self.screen()
            if all(t in shown for t in texts):
                return shown
            time.sleep(every_s)
        raise AssertionError(f"never saw {texts!r} on screen:\n{shown}")

    def wait_for_gone(self, text: str, timeout: float = 15.0) -> None:
        end = time.monotonic() + timeout
        while text in self.screen():
            if time.monotonic() > end:
                raise AssertionError(f"{text!r} still on screen after {timeout} s")
            time.sleep(0.05)

    def colours(self) -> str:
        """The screen with its colours and attributes (escape sequences)."""
        return self.tmux("capture-pane", "-t", "t", "-p", "-e")

    def settled(self, *, absent: tuple[str, ...] = (), quiet_s: float = 0.3) -> str:
        """The screen with colours once it has not changed for ``quiet_s`` and shows none of
        ``absent`` (work in progress); fails after 15 s."""
        end = time.monotonic() + 15.0
        shown, since = self.colours(), time.monotonic()
        while time.monotonic() < end:
            time.sleep(0.05)
            now = self.colours()
            if now != shown:
                shown, since = now, time.monotonic()
                continue
            busy = any(t in self.screen() for t in absent)
            if time.monotonic() - since >= quiet_s and not busy:
                return shown
        raise AssertionError(f"the screen never settled:\n{self.screen()}")

    def hang_up(self) -> None:
        self.tmux("kill-server", check=False)

    def alive(self) -> bool:
        return (
            subprocess.run(
                [TMUX, "-L", self.socket, "has-session", "-t", "t"], capture_output=True
            ).returncode
            == 0
        )


@pytest.fixture
def terminal(tmp_path, request):
    made: list[Terminal] = []

    def make(name: str = "a") -> Terminal:
        t = Terminal(f"{request.node.name[:20]}-{name}", tmp_path / "state", tmp_path)
        made.append(t)
        return t

    yield make
    for t in made:
        t.hang_up()


def running(pid: int) -> bool:
    """Whether process ``pid`` is alive (an exited process not yet reaped is not)."""
    try:
        stat = Path(f"/proc/{pid}/stat").read_text()
    except OSError:
        return False
    return stat.rsplit(")", 1)[1].split()[0] != "Z"


def project_copy(tmp_path: Path) -> Path:
    target = tmp_path / "clinic.toml"
    target.write_text(demo_project_path().read_text())
    return target


@pytest.mark.parametrize(
    "term,no_color",
    [("xterm-256color", False), ("vt100", False), ("xterm-256color", True)],
    ids=["256-colours", "16-colours", "no-colour"],
)
def test_edit_save_and_quit_in_a_real_terminal(terminal, tmp_path, term, no_color):
    target = project_copy(tmp_path)
    t = terminal()
    t.start(str(target), term=term, no_color=no_color)
    plain = term == "vt100" or no_color  # ASCII only: a serial console, a screen reader
    t.wait_for(
        "[1 Place]" if plain else "\u25b81 Place\u25c2",
        "Array 1,800 W",
        "Battery 38.4 kWh 800 Ah 48 V",
    )
    if plain:
        shown = t.screen()
        t.wait_for("Nov<")  # the design month's mark in the months table
        shown = t.screen()
        assert not any(ch in shown for ch in "\u2502\u25b8\u25c2\u2192"), shown
    # the key line shows each key whole: the one that would be cut at 80 columns is hidden
    import re
    import time

    def keys_part() -> tuple[str, str]:
        footer = t.screen().rstrip("\n").splitlines()[-1]
        return re.split(r"[\u258f|]\s*\^p", footer)[0].rstrip(), footer

    end = time.monotonic() + 5  # the key line is laid out once the screen has its size
    while not (shown := keys_part())[0].endswith("w Why?") and time.monotonic() < end:
        time.sleep(0.05)
    assert shown[0].endswith("w Why?"), shown[1]
    t.keys("3")
    t.wait_for("Days of autonomy")
    t.keys("Down", "Enter")
    t.wait_for("Enter applies, Esc cancels")
    t.keys("BSpace")
    t.type("5")
    t.keys("Enter")
    screen = t.wait_for("\u25cf unsaved", "5 days")
    assert "Battery 38.4 kWh" not in screen  # the headline followed the edit
    t.keys("s")
    t.wait_for("Saved")
    t.keys("q")
    end = time.monotonic() + 10
    while t.alive() and "offgrid" in t.screen() and time.monotonic() < end:
        time.sleep(0.1)
    assert load_project(target).choices.autonomy_days == 5.0


def test_hang_up_then_recover_what_was_on_screen(terminal, tmp_path):
    target = project_copy(tmp_path)
    t = terminal("first")
    t.start(str(target))
    t.wait_for("Array 1,800 W")
    t.keys("2")
    t.wait_for("Vaccine refrig")
    t.keys("Enter")
    t.wait_for("Enter applies")
    t.keys("C-u")
    t.type("Cold box [blue] 7")
    t.keys("Enter")
    t.wait_for("Cold box [blue] 7", "\u25cf unsaved")
    pid = int(t.tmux("list-panes", "-t", "t", "-F", "#{pane_pid}").split()[0])
    t.hang_up()  # the terminal goes away, as when an SSH connection drops
    end = time.monotonic() + 10
    while not list((tmp_path / "state").glob("recovery-*.json")) and time.monotonic() < end:
        time.sleep(0.1)
    assert list((tmp_path / "state").glob("recovery-*.json")), "no recovery file written"
    assert load_project(target).loads[0].name != "Cold box [blue] 7"  # the file is untouched
    while running(pid) and time.monotonic() < end:
        time.sleep(0.05)  # the old process is gone
    t2 = terminal("second")
    t2.start()
    t2.wait_for("Unsaved work was found", "clinic.toml")
    t2.keys("r")
    t2.wait_for("\u25cf unsaved")
    t2.keys("2")
    t2.wait_for("Cold box [blue] 7")
    t2.keys("s")
    t2.wait_for("Saved")
    assert load_project(target).loads[0].name == "Cold box [blue] 7"


def test_start_screen_and_help_in_a_real_terminal(terminal, tmp_path):
    t = terminal()
    t.start(term="vt100")
    t.wait_for("New project", "Blank project")
    t.keys("d")
    t.wait_for("Array 1,800 W")
    t.keys("?")
    t.wait_for("Keys and help", "You are in 1 Place")
    t.keys("Escape")
    t.keys("4")
    t.wait_for("\u25c0 design", "Supply to battery")


def test_open_and_type_at_human_speed_then_kill_9(terminal, tmp_path):
    """a, then the name one key at a time 0.15 s apart: every name exactly as typed.

    Then kill -9 right after the last edit: the recovery copy already has it.
    """
    import json
    import signal

    target = project_copy(tmp_path)
    t = terminal()
    t.start(str(target))
    t.wait_for("Array 1,800 W")
    t.keys("2")
    t.wait_for("Vaccine refrig")
    names = ["Welder", "Drill", "Grain mill", "Kx01", "Fridge", "Lamp"]
    for name in names:
        t.keys("a")
        for ch in name:
            t.type(ch)
        t.keys("Enter")
    t.keys("Right", "Right", "Right", "Enter")  # hours per day of the last one, replaced
    t.type("4")
    t.type("5")
    t.keys("BSpace")
    t.keys("Enter")
    t.wait_for("Lamp", "\u25cf unsaved")
    pid = int(t.tmux("list-panes", "-t", "t", "-F", "#{pane_pid}").split()[0])
    time.sleep(0.3)
    os.kill(pid, signal.SIGKILL)
    files = list((tmp_path / "state").glob("recovery-*.json"))
    assert files, "no recovery file"
    from offgrid.project.store import loads_project

    kept = loads_project(json.loads(files[0].read_text())["text"])
    typed = [ld.name for ld in kept.loads if ld.name in names]
    assert typed == names  # each added after the one before, in order
    assert kept.loads[[ld.name for ld in kept.loads].index("Lamp")].hours_per_day == 4.0


def test_nothing_left_on_screen_after_notifications(terminal, tmp_path):
    """A notification in every section comes and goes; the screen is then the same cell
    for cell (colours included) as before it: nothing is left at the bottom-right.

    Every notice lasts 0.8 s here (``OFFGRID_NOTICE_SECONDS``) instead of its own 2 s: the
    test waits for the screen, not for a clock."""
    t = terminal()
    t.start(str(project_copy(tmp_path)), term="tmux-256color", notice_s=0.8)
    t.wait_for("Array 1,800 W")
    busy = ("keep working", "Working out the design")  # work in progress, not settled yet
    shown = {  # a line of each section's own content, drawn after the section bar moves
        "1": "Project name",
        "2": "Appliance",
        "3": "Design choices",
        "4": "Array power installed",
        "5": "cable runs",
        "6": "Enter: go to",
        "7": "Press g to test",
        "8": "Base and 2 option(s)",
    }
    for section, text in shown.items():
        t.keys(section)
        t.wait_for(f"\u25b8{section} ", text)
        before = t.settled(absent=busy)
        t.keys("u", "u")  # "Nothing to undo", twice: two toasts stacked
        t.wait_for("Nothing to undo", every_s=0.02)
        t.wait_for_gone("Nothing to undo")
        end = time.monotonic() + 3
        while (after := t.colours()) != before and time.monotonic() < end:
            time.sleep(0.05)
        assert after == before, f"section {section}: the screen changed after the toasts"


@pytest.mark.skipif(
    not os.environ.get("OFFGRID_WHOLE_JOB"),
    reason="about 90 s at 0.15 s a key: OFFGRID_WHOLE_JOB=1 runs it",
)
def test_whole_job_at_human_speed_keeps_every_typed_value(tmp_path):
    """benchmarks/tmux_whole_job.py once: every value typed comes out exactly as typed."""
    import importlib.util

    spec = importlib.util.spec_from_file_location(
        "tmux_whole_job", ROOT / "benchmarks" / "tmux_whole_job.py"
    )
    job = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(job)
    assert job.one_run(tmp_path, 0.15) == []
