"""Fixtures for the text-UI tests."""

from __future__ import annotations

from pathlib import Path

import pytest
import pytest_asyncio


@pytest.fixture(autouse=True)
def state(tmp_path, monkeypatch) -> Path:
    """Recent files and recovery files go to a folder of the test's own."""
    folder = tmp_path / "state"
    monkeypatch.setenv("OFFGRID_STATE_DIR", str(folder))
    monkeypatch.chdir(tmp_path)
    return folder


# ---------------------------------------------------------------- one app per module
# Starting the app costs about a second of CPU per test (imports are warm, but the
# first design and eight sections are built anew). Tests that only need "the demo
# project on the work screen" share one running app per module: ``demo_pilot`` hands
# it over reset (dialogs closed, editors shut, workers stopped, a fresh demo session,
# section Place). A module that uses it runs on one event loop:
# ``pytestmark = pytest.mark.asyncio(loop_scope="module")``.


@pytest_asyncio.fixture(scope="module", loop_scope="module")
async def shared_pilot(tmp_path_factory):
    """One demo app, running for the whole module."""
    from tui_helpers import SIZE, demo_app

    app = demo_app(tmp_path_factory.mktemp("shared-state"))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause()
        await app.work._all_mounted.wait()
        yield pilot


@pytest_asyncio.fixture(loop_scope="module")
async def demo_pilot(shared_pilot):
    """The module's app, reset to the demo project as a new app would show it."""
    from tui_helpers import reset_demo

    await reset_demo(shared_pilot)
    return shared_pilot
