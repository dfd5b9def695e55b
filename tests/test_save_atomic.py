"""Saving under faults: kills during a save, file modes, symlinks, stray temp files,
two writers of one project, and outputs that would overwrite a project.

The kill test is the fault the issue measured (a rename-aside backup left no project in
11 of 60 kills); the required property is the usual one of an atomic replace (POSIX
rename(2): "a link named new shall remain visible ... and shall refer either to the file
referred to by new or old"), common practice, no source beyond that.
"""

from __future__ import annotations

import os
import random
import signal
import stat
import subprocess
import sys
import time

import pytest

from offgrid.project.atomic import atomic_write_text
from offgrid.project.model import Load
from offgrid.project.store import dumps_project, load_project, save_project
from tests.conftest import hand_project

KILLS = 60


def _two_versions():
    """Two valid project texts of some size, so a write takes a while to finish."""
    a = hand_project()
    a.loads = [
        Load(name=f"Lamp {i}", quantity=1, power_w=5.0 + i, hours_per_day=4.0, ac_dc="dc")
        for i in range(300)
    ]
    a.info.name = "Version A"
    b = hand_project()
    b.loads = [
        Load(name=f"Fan {i}", quantity=2, power_w=20.0 + i, hours_per_day=6.0, ac_dc="ac")
        for i in range(300)
    ]
    b.info.name = "Version B"
    return dumps_project(a), dumps_project(b)


def test_a_kill_at_any_moment_leaves_the_project_whole(tmp_path):
    """A child process saves A, B, A, B ... and is killed with SIGKILL at random moments."""
    text_a, text_b = _two_versions()
    path = tmp_path / "p.toml"
    atomic_write_text(path, text_a)
    rng = random.Random(12)
    kills_mid_loop = 0
    for _ in range(KILLS):
        pid = os.fork()
        if pid == 0:  # the child: save forever, never return into pytest
            try:
                texts = (text_a, text_b)
                i = 0
                while True:
                    atomic_write_text(path, texts[i % 2])
                    i += 1
            finally:
                os._exit(0)
        time.sleep(rng.uniform(0.0, 0.012))
        os.kill(pid, signal.SIGKILL)
        _, status = os.waitpid(pid, 0)
        kills_mid_loop += os.WIFSIGNALED(status)
        assert path.is_file(), f"no project file after a kill: {sorted(os.listdir(tmp_path))}"
        assert path.read_text(encoding="utf-8") in (text_a, text_b)  # whole, old or new
        bak = tmp_path / "p.toml.bak"
        if bak.exists():
            assert bak.read_text(encoding="utf-8") in (text_a, text_b)
    assert kills_mid_loop == KILLS
    # the next save removes what the killed children left behind
    atomic_write_text(path, text_b)
    assert sorted(os.listdir(tmp_path)) == ["p.toml", "p.toml.bak"]
    assert path.read_text(encoding="utf-8") == text_b
    # both versions are loadable projects, so "old or new, whole" means "loads"
    assert load_project(path).info.name == "Version B"
    assert load_project(tmp_path / "p.toml.bak").info.name in ("Version A", "Version B")


def test_the_backup_is_made_without_removing_the_project(tmp_path, monkeypatch):
    """At the moment the new text is renamed into place the project is still there."""
    path = tmp_path / "p.toml"
    save_project(hand_project(), path)
    seen = []
    real_replace = os.replace

    def watch(src, dst):
        seen.append((os.path.basename(dst), path.is_file()))
        return real_replace(src, dst)

    monkeypatch.setattr(os, "replace", watch)
    p = hand_project()
    p.info.name = "Second"
    save_project(p, path)
    assert seen and all(present for _name, present in seen), seen


def test_save_keeps_the_permission_bits(tmp_path):
    path = tmp_path / "p.toml"
    save_project(hand_project(), path)
    os.chmod(path, 0o664)
    save_project(hand_project(), path)
    assert stat.S_IMODE(os.stat(path).st_mode) == 0o664
    os.chmod(path, 0o640)
    save_project(hand_project(), path)
    assert stat.S_IMODE(os.stat(path).st_mode) == 0o640


def test_a_new_file_gets_the_usual_mode(tmp_path):
    mask = os.umask(0o022)
    try:
        save_project(hand_project(), tmp_path / "new.toml")
    finally:
        os.umask(mask)
    assert stat.S_IMODE(os.stat(tmp_path / "new.toml").st_mode) == 0o644


def test_a_symlinked_project_keeps_its_link_and_the_target_is_updated(tmp_path):
    real_dir = tmp_path / "real"
    real_dir.mkdir()
    target = real_dir / "p.toml"
    save_project(hand_project(), target)
    link = tmp_path / "link.toml"
    link.symlink_to(target)
    first = target.read_text()
    p = hand_project()
    p.info.name = "Through the link"
    save_project(p, link)
    assert link.is_symlink() and os.readlink(link) == str(target)
    assert load_project(target).info.name == "Through the link"
    # the backup sits beside the target (documented rule), a plain file, not a link
    bak = real_dir / "p.toml.bak"
    assert bak.is_file() and not bak.is_symlink() and bak.read_text() == first
    assert not (tmp_path / "link.toml.bak").exists()


def test_stray_temp_files_of_that_project_are_removed_on_the_next_save(tmp_path):
    from offgrid.project.atomic import stray_temp_files

    path = tmp_path / "p.toml"
    save_project(hand_project(), path)
    dead = subprocess.run(
        [sys.executable, "-c", "import os; print(os.getpid())"],
        capture_output=True,
        text=True,
        check=True,
    ).stdout.strip()
    ours = tmp_path / f".p.toml.{dead}.0123456789ab.offgrid-tmp"
    ours_bak = tmp_path / f".p.toml.{dead}.0123456789ab.bak.offgrid-tmp"
    live = tmp_path / f".p.toml.{os.getppid()}.0123456789ab.offgrid-tmp"  # still running
    other = tmp_path / f".q.toml.{dead}.0123456789ab.offgrid-tmp"  # another project's
    foreign = tmp_path / ".p.toml.notes.tmp"  # not our pattern
    for f in (ours, ours_bak, live, other, foreign):
        f.write_text("half a file")
    legacy = tmp_path / ".p.toml.ab12cd_3.tmp"  # an earlier version's name, an old file
    legacy.write_text("x")
    os.utime(legacy, (time.time() - 3600, time.time() - 3600))
    assert sorted(stray_temp_files(path)) == sorted([ours, ours_bak, legacy])
    save_project(hand_project(), path)
    left = sorted(os.listdir(tmp_path))
    assert left == sorted(["p.toml", "p.toml.bak", live.name, other.name, foreign.name])


def test_a_change_on_disk_since_reading_is_refused(tmp_path):
    from offgrid.project.atomic import ChangedOnDisk, fingerprint

    path = tmp_path / "p.toml"
    save_project(hand_project(), path)
    seen = fingerprint(path)
    theirs = hand_project()
    theirs.info.name = "Theirs"
    save_project(theirs, path)  # another window saves meanwhile
    mine = hand_project()
    mine.info.name = "Mine"
    with pytest.raises(ChangedOnDisk, match="changed by another program"):
        save_project(mine, path, expect=seen)
    assert load_project(path).info.name == "Theirs"
    # touched but the same bytes: not a change
    now = fingerprint(path)
    os.utime(path, (time.time() + 5, time.time() + 5))
    save_project(mine, path, expect=now)
    assert load_project(path).info.name == "Mine"


# ----------------------------------------------------------------------------- the CLI


def _run(capsys, *argv) -> tuple[int, str]:
    from offgrid.cli import main

    try:
        code = main(list(argv))
    except SystemExit as exc:
        code = exc.code
    return code, capsys.readouterr().err


@pytest.fixture
def project_file(tmp_path):
    import shutil

    from offgrid.paths import demo_project_path

    path = tmp_path / "clinic.toml"
    shutil.copy(demo_project_path(), path)
    return path


@pytest.mark.parametrize(
    "argv",
    [
        ("report", "{p}", "-o", "{p}", "--force"),
        ("report", "{p}", "-o", "{p}", "--format", "txt", "--force"),
        ("report", "{p}", "--bom", "{p}", "--force"),
        ("bom", "{p}", "-o", "{p}", "--force"),
        ("prices", "{p}", "--template", "-o", "{p}", "--force"),
        ("report", "{p}", "-o", "{link}", "--force"),  # the project under another name
        ("report", "--demo", "-o", "{other}", "--force"),  # some other project
        ("bom", "{p}", "-o", "{bak}", "--force"),  # a project's backup is a project too
    ],
)
def test_no_output_is_written_over_a_project_even_with_force(capsys, project_file, tmp_path, argv):
    link = tmp_path / "same.toml"
    link.symlink_to(project_file)
    other = tmp_path / "other.toml"
    save_project(hand_project(), other)
    save_project(hand_project(), other)  # makes other.toml.bak
    names = {"p": project_file, "link": link, "other": other, "bak": tmp_path / "other.toml.bak"}
    before = {f: f.read_bytes() for f in names.values()}
    code, err = _run(capsys, *(a.format(**names) for a in argv))
    assert code == 2, err
    assert "no output is ever written over a project, even when forced" in err
    assert {f: f.read_bytes() for f in names.values()} == before


def test_outputs_still_replace_ordinary_files_with_force(capsys, project_file, tmp_path):
    out = tmp_path / "old-report.txt"
    out.write_text("an earlier report\n")
    code, err = _run(capsys, "bom", str(project_file), "-o", str(out), "--force")
    assert code == 0, err
    assert out.read_text().startswith("part") or "," in out.read_text()


def test_price_import_refuses_when_the_project_changed_meanwhile(
    capsys, project_file, tmp_path, monkeypatch
):
    """Another window saves the project while the CLI reads the price list."""
    import offgrid.economics.prices as prices

    sheet = tmp_path / "quote.csv"
    sheet.write_text("part,unit_price\nmodule,99\n", encoding="utf-8")
    theirs = load_project(project_file)
    theirs.info.name = "Their edit"
    real_read = prices.read_price_csv

    def read_while_they_save(*args, **kwargs):
        save_project(theirs, project_file)
        return real_read(*args, **kwargs)

    monkeypatch.setattr(prices, "read_price_csv", read_while_they_save)
    code, err = _run(capsys, "prices", str(project_file), "--import", str(sheet))
    assert code == 2
    assert "was changed by another program" in err and "nothing was written" in err
    assert load_project(project_file).info.name == "Their edit"


def test_price_import_through_a_symlink_keeps_the_link(capsys, project_file, tmp_path):
    link = tmp_path / "link.toml"
    link.symlink_to(project_file)
    sheet = tmp_path / "quote.csv"
    sheet.write_text("part,unit_price\nmodule,99\n", encoding="utf-8")
    code, err = _run(capsys, "prices", str(link), "--import", str(sheet))
    assert code == 0, err
    assert link.is_symlink()
    assert any(p.unit_price == 99 for p in load_project(project_file).prices)
    assert f"kept as {project_file}.bak" in err
    assert (tmp_path / "clinic.toml.bak").is_file()


def test_export_functions_refuse_the_project_being_read(project_file, tmp_path):
    from offgrid.report.export import ExportError, export_bom, export_report

    project = load_project(project_file)
    before = project_file.read_bytes()
    with pytest.raises(ExportError, match="the project being read"):
        export_report(project, project_file, tmp_path, force=True, reading=project_file)
    with pytest.raises(ExportError, match="an offgrid project file"):
        export_bom(project, project_file, tmp_path, force=True)
    assert project_file.read_bytes() == before


def test_without_hard_links_the_backup_is_a_copy(tmp_path, monkeypatch):
    """Some file systems (FAT, some network shares) refuse link(2): copy, never move."""
    import errno

    path = tmp_path / "p.toml"
    save_project(hand_project(), path)
    first = path.read_text()

    def no_links(*_args, **_kwargs):
        raise OSError(errno.EPERM, "Operation not permitted")

    monkeypatch.setattr(os, "link", no_links)
    p = hand_project()
    p.info.name = "Second"
    save_project(p, path)
    assert (tmp_path / "p.toml.bak").read_text() == first
    assert load_project(path).info.name == "Second"
    assert sorted(os.listdir(tmp_path)) == ["p.toml", "p.toml.bak"]


@pytest.mark.skipif(os.geteuid() != 0, reason="only root can give a file to another owner")
def test_save_keeps_the_owner_where_allowed(tmp_path):
    path = tmp_path / "p.toml"
    save_project(hand_project(), path)
    os.chown(path, 12345, 23456)
    save_project(hand_project(), path)
    st = os.stat(path)
    assert (st.st_uid, st.st_gid) == (12345, 23456)


def test_a_pipe_or_a_folder_is_never_written_as_a_project(tmp_path):
    fifo = tmp_path / "p.toml"
    os.mkfifo(fifo)
    with pytest.raises(OSError, match="not a regular file"):
        save_project(hand_project(), fifo)
    assert stat.S_ISFIFO(os.stat(fifo).st_mode)
    folder = tmp_path / "d.toml"
    folder.mkdir()
    with pytest.raises(IsADirectoryError):
        save_project(hand_project(), folder)
    assert sorted(os.listdir(tmp_path)) == ["d.toml", "p.toml"]


def test_the_text_ui_session_follows_the_same_symlink_rule(tmp_path):
    from offgrid.tui.session import Session

    target = tmp_path / "real.toml"
    save_project(hand_project(), target)
    link = tmp_path / "link.toml"
    link.symlink_to(target)
    s = Session.open(link)
    s.project.info.name = "From the UI"
    s.save()
    assert link.is_symlink() and load_project(target).info.name == "From the UI"
    assert (tmp_path / "real.toml.bak").is_file() and not (tmp_path / "link.toml.bak").exists()


def test_climate_import_and_plan_report_refuse_a_project_as_output(capsys, project_file):
    from tests.climate_support import TMY3_GREENSBORO, pvlib_data

    before = project_file.read_bytes()
    code, err = _run(
        capsys,
        "climate",
        "import",
        str(pvlib_data() / TMY3_GREENSBORO),
        "--out",
        str(project_file),
        "--force",
    )
    assert code == 2 and "no output is ever written over a project" in err
    disguised = project_file.with_suffix(".md")  # a project under a report's name
    disguised.write_bytes(before)
    code, err = _run(capsys, "plan", "--demo", "--report", str(disguised))
    assert code == 2 and "no output is ever written over a project" in err
    assert project_file.read_bytes() == before and disguised.read_bytes() == before
