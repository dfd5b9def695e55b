"""Shared fixtures: small projects built in code (invented data, for tests only)."""

from __future__ import annotations

import os
import sys

import pytest

from offgrid.project.model import (
    BatterySpec,
    ClimateChoice,
    ControllerSpec,
    DesignChoices,
    InverterSpec,
    Load,
    ModuleSpec,
    MonthlyClimate,
    Project,
    ProjectInfo,
    Site,
)


def pytest_xdist_auto_num_workers(config) -> int:
    """Workers for ``-n auto``: two more than the processors (at least 4). Many UI tests
    wait on a terminal or a worker thread, so extra workers on two cores overlap those
    waits with other tests: on the quiet 2-core machine (2 Dec 2026) the whole suite took
    211 s with 2 workers, 169 s with 3 (1,361 tests), and with 1,448 tests 183 s with 3
    against 169 s with 4 (CPU 312 and 306 s: the fourth fills the waits)."""
    return max(4, (os.cpu_count() or 1) + 2)


def pytest_configure(config) -> None:
    """Bytecode caches are written even under ``PYTHONDONTWRITEBYTECODE``: the suite starts
    about a hundred interpreters on offgrid's modules (CLI subprocesses, the tmux tests'
    apps) and every xdist worker rewrites the asserts of every test module; without the
    caches each one compiles them all again (the CLI and report test files: 33 s of CPU
    without offgrid's caches, 25 s with them; collecting the suite: 8.9 s of CPU per worker
    without the test modules' caches, 3.4 s with them; 2 Dec 2026). The caches go in the
    ``__pycache__`` folders, which git ignores. The run without workers (or xdist's
    controller) compiles the package once before the workers start."""
    sys.dont_write_bytecode = False
    _fewer_collector_passes()
    if not hasattr(config, "workerinput"):
        import compileall

        import offgrid

        compileall.compile_dir(os.path.dirname(offgrid.__file__), quiet=2)
        if _xdist_workers(config):
            _rewrite_test_modules_once(config)


#: The youngest generation's threshold of the garbage collector in the test processes
#: (Python's default is 700; the older generations keep theirs, 10 and 10).
COLLECTOR_GEN0_THRESHOLD = 10_000


def _fewer_collector_passes() -> None:
    """A test process lives through hundreds of tests: apps, designs and imports pile up
    and the collector's passes over them (each full pass 0.2-0.25 s) took a quarter of
    the CPU: tests/tui/test_tui_files.py with test_tui_options.py spent 9.7-10.9 s of
    ~45 s in the collector, test_tui_sections.py 9.7 of 44.5 s, the plan, climate and
    simulate test files 5.2 of 58.7 s (-n0, Python's default thresholds 700, 10, 10).
    With 10,000 for the youngest generation: 3.3, 3.7 and 0.6 s, and the runs 13.5, 9.4
    and 8.6 s of CPU shorter (25,000 was no better: 4.1 s; the peak memory of the
    sections file 229 -> 257 MB; 3 Dec 2026, load 2-5). Nothing a test checks depends on
    when cycles are collected; ``gc.collect()`` and the text UI's own switching of the
    collector (tests/tui/test_tui_startup.py) work as before."""
    import gc

    _gen0, gen1, gen2 = gc.get_threshold()
    gc.set_threshold(COLLECTOR_GEN0_THRESHOLD, gen1, gen2)


def _xdist_workers(config) -> int:
    """How many xdist workers this run starts (0 without xdist or with ``-n0``)."""
    if not config.pluginmanager.hasplugin("xdist"):
        return 0
    try:
        n = config.getoption("numprocesses")
    except ValueError:
        return 0
    return n if isinstance(n, int) else 0


def _rewrite_test_modules_once(config) -> None:
    """Write pytest's assertion-rewritten caches of the test modules before the workers
    start. In a fresh tree every worker collects at once, finds no cache and rewrites all
    ~130 modules itself: collection took 29.3 s of CPU in all with 4 workers (the
    suite collected and nothing run, ``-k`` matching no test), 17.7 s with the caches
    in place; rewriting them once here costs ~3.6 s (3 Dec 2026, load 1.4-4). A
    fresh cache (the same source size and time in its header, as pytest checks) is
    left alone, so a warm tree pays only a ``stat`` per module. The helper modules the
    tests import (tui_helpers.py ...) are compiled too. A pytest whose internals moved
    skips this: the workers then write the caches as before."""
    import compileall
    import fnmatch
    import importlib.util
    import struct
    from pathlib import Path

    try:
        from _pytest.assertion import rewrite
        from _pytest.assertion.rewrite import (
            PYC_TAIL,
            _rewrite_test,
            _write_pyc,
            get_cache_dir,
        )

        state = config.stash[rewrite.assertstate_key]
    except (ImportError, AttributeError, KeyError):
        return
    if config.getoption("assertmode") != "rewrite":
        return
    patterns = [*config.getini("python_files"), "conftest.py"]
    here = Path(__file__).parent
    asked = [Path(config.invocation_params.dir, a.split("::")[0]).resolve() for a in config.args]
    for source in sorted(here.rglob("*.py")):
        wanted = source.name == "conftest.py" or any(
            source == a or a in source.parents for a in asked
        )
        if not wanted:
            continue  # a run of some files: the others' caches wait for a run that needs them
        if not any(fnmatch.fnmatch(source.name, p) for p in patterns):
            compileall.compile_file(str(source), quiet=2)
            continue
        pyc = get_cache_dir(source) / (source.name[:-3] + PYC_TAIL)
        stat = source.stat()
        header = importlib.util.MAGIC_NUMBER + b"\0\0\0\0"
        header += struct.pack("<LL", int(stat.st_mtime) & 0xFFFFFFFF, stat.st_size & 0xFFFFFFFF)
        try:
            with open(pyc, "rb") as fp:
                if fp.read(16) == header:
                    continue
        except OSError:
            pass
        try:
            source_stat, code = _rewrite_test(source, config)
        except SyntaxError:
            continue  # the worker that collects it reports the error
        pyc.parent.mkdir(exist_ok=True)
        _write_pyc(state, code, source_stat, pyc)


@pytest.fixture(autouse=True)
def _private_user_library(tmp_path_factory, monkeypatch):
    """The user's library (imported climates, own load lists) in a temporary folder: no test
    reads or writes the real ``~/.local/share/offgrid``."""
    monkeypatch.delenv("OFFGRID_HOME", raising=False)
    monkeypatch.delenv("OFFGRID_DATA", raising=False)
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path_factory.mktemp("xdg-data")))


@pytest.fixture(autouse=True)
def _recovery_writers_end(monkeypatch):
    """The text UI's recovery writers made in a test end their threads after it (each
    would idle 30 s after its last write). Planning refuses to fork while other threads
    run, so a worker that had just run a UI test planned serially: the fork paths went
    unchecked and tests/test_plan_merge.py's one-and-two-workers test failed, depending
    on which tests a worker had run before it (tests/test_recovery_writer.py)."""
    from offgrid.tui import autosave

    made = []
    real_init = autosave.RecoveryWriter.__init__

    def init(self, *args, **kwargs):
        real_init(self, *args, **kwargs)
        made.append(self)

    monkeypatch.setattr(autosave.RecoveryWriter, "__init__", init)
    yield
    for writer in made:
        thread = writer._thread
        writer.close()
        if thread is not None:
            thread.join(5.0)  # gone before the next test counts the threads


def hand_project() -> Project:
    """The project of the hand-worked sizing in tests/test_sizing.py (invented)."""
    climate = MonthlyClimate(
        insolation_kwh_m2_day=[5.0] * 11 + [4.0],
        temp_mean_c=[25.0] * 12,
        temp_max_c=[25.0] * 12,
        temp_min_c=[20.0] * 12,
        record_low_c=5.0,
        source="invented for a hand-worked test",
        demo=True,
    )
    return Project(
        info=ProjectInfo(name="Hand-worked case", demo=True),
        site=Site(
            name="Test site",
            latitude_deg=10.0,
            longitude_deg=0.0,
            tilt_deg=0.0,
            azimuth_deg=180.0,
            battery_temp_c=25.0,
        ),
        climate=ClimateChoice(inline=climate),
        loads=[
            Load("DC lights", 1, 100.0, 10.0, "dc"),
            Load("AC pump", 1, 200.0, 5.0, "ac", surge_w=600.0),
        ],
        module=ModuleSpec(),
        battery=BatterySpec(
            chemistry="agm", nominal_voltage_v=12.0, capacity_ah=200.0, max_dod=0.5, efficiency=0.85
        ),
        controller=ControllerSpec(type="mppt", max_pv_voltage_v=150.0, efficiency=0.97),
        inverter=InverterSpec(efficiency=0.9, self_consumption_w=10.0, hours_on_per_day=24.0),
        choices=DesignChoices(
            system_voltage=24,
            autonomy_days=3.0,
            load_growth_pct=10.0,
            coincidence_factor=0.7,
            ageing_factor=0.8,
        ),
    )


@pytest.fixture
def project() -> Project:
    return hand_project()
