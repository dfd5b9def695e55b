"""A climate file is read and parsed once while it is unchanged on disk (issue 19, edit speed).

The text UI designs the project again after every edit; each design read and parsed the
project's climate file again. ``load_climate`` keeps what it read by the file's resolved
path, inode, modification time, change time and size, and hands out a copy (a
``MonthlyClimate`` is mutable). Common practice, no source: a read cache must give
what reading afresh gives, and see a file changed on disk.
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest

from offgrid import textfile
from offgrid.climate import files
from offgrid.climate.files import clear_climate_cache, dumps_climate, load_climate
from offgrid.climate.model import MonthlyClimate
from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project

# An invented site's twelve months (for this test only, no source).
SUN = [5.1, 5.6, 6.0, 6.2, 6.1, 5.7, 5.2, 5.0, 5.3, 5.5, 5.2, 4.9]
TEMP = [24.0, 25.5, 27.0, 28.0, 27.5, 26.0, 25.0, 24.5, 25.0, 25.5, 25.0, 24.0]


@pytest.fixture
def reads(monkeypatch) -> list[Path]:
    """Every text file the climate reader reads, counted."""
    clear_climate_cache()
    seen: list[Path] = []
    original = textfile.read_text

    def counting(path, *args, **kwargs):
        seen.append(Path(path).resolve())
        return original(path, *args, **kwargs)

    monkeypatch.setattr(textfile, "read_text", counting)
    yield seen
    clear_climate_cache()


def write_climate(path: Path, sun: list[float], mtime_ns: int | None = None) -> None:
    climate = MonthlyClimate(
        insolation_kwh_m2_day=sun, temp_mean_c=TEMP, source="invented for a test", demo=True
    )
    path.write_text(dumps_climate(climate, name="invented test site"), encoding="utf-8")
    if mtime_ns is not None:
        os.utime(path, ns=(mtime_ns, mtime_ns))


def test_two_designs_of_one_project_read_its_climate_once(reads):
    project = load_project(demo_project_path())
    assert project.climate.ref, "the demo names a climate file"
    base = demo_project_path().parent
    climate_file = files.resolve_climate(project.climate.ref, base).resolve()
    first = design(project, base)
    second = design(project, base)
    assert reads.count(climate_file) == 1, reads
    assert first.to_dict() == second.to_dict()


def test_a_file_changed_on_disk_is_read_again(tmp_path, reads):
    path = tmp_path / "site.toml"
    write_climate(path, SUN, mtime_ns=1_700_000_000_000_000_000)
    assert load_climate(path).insolation_kwh_m2_day == SUN
    assert load_climate(path).insolation_kwh_m2_day == SUN
    assert len(reads) == 1
    changed = [x + 0.1 for x in SUN]  # same size on disk: only the time tells
    write_climate(path, [round(x, 1) for x in changed], mtime_ns=1_700_000_001_000_000_000)
    assert load_climate(path).insolation_kwh_m2_day == [round(x, 1) for x in changed]
    assert len(reads) == 2


def test_a_changed_copy_does_not_change_the_next_read(tmp_path, reads):
    path = tmp_path / "site.toml"
    write_climate(path, SUN, mtime_ns=1_700_000_000_000_000_000)
    mine = load_climate(path)
    mine.insolation_kwh_m2_day[0] = 0.0
    mine.temp_mean_c.append(99.0)
    mine.source = "changed"
    again = load_climate(path)
    assert again.insolation_kwh_m2_day == SUN and again.temp_mean_c == TEMP
    assert again.source == "invented for a test"
    assert again is not mine and len(reads) == 1


def test_a_file_written_just_now_is_read_every_time(tmp_path, reads):
    """Two writes within one tick of the file system's clock can leave the same times."""
    path = tmp_path / "site.toml"
    write_climate(path, SUN)
    load_climate(path)
    write_climate(path, [round(x + 0.1, 1) for x in SUN])  # same size, maybe the same time
    assert load_climate(path).insolation_kwh_m2_day == [round(x + 0.1, 1) for x in SUN]
    assert len(reads) == 2


def test_a_file_that_cannot_be_read_is_not_kept(tmp_path, reads):
    path = tmp_path / "site.toml"
    path.write_text("not = [valid", encoding="utf-8")
    for _ in range(2):
        with pytest.raises(files.ClimateFileError):
            load_climate(path)
    assert len(reads) == 2  # each attempt reads the file: the fix is seen at once
    write_climate(path, SUN)
    assert load_climate(path).insolation_kwh_m2_day == SUN
