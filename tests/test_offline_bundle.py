"""scripts/make_offline_bundle.py: the pip commands it runs (a real run needs the network and
~40 s; it was run by hand: 31 wheels, 118 MB, installed with --no-index, demo sized)."""

from __future__ import annotations

import importlib.util
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
SCRIPT = ROOT / "scripts" / "make_offline_bundle.py"


def _script():
    spec = importlib.util.spec_from_file_location("make_offline_bundle", SCRIPT)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_bundle_for_this_machine_is_one_pip_wheel_of_the_checkout(tmp_path, capsys):
    assert _script().main([str(tmp_path / "out"), "--dry-run"]) == 0
    lines = [ln for ln in capsys.readouterr().out.splitlines() if ln.startswith("+ ")]
    assert len(lines) == 1
    assert lines[0].endswith(f"-m pip wheel --wheel-dir {tmp_path / 'out'} {ROOT}")


def test_bundle_for_another_platform_fetches_binary_wheels_only(tmp_path, capsys):
    out = tmp_path / "win"
    assert (
        _script().main(
            [str(out), "--dry-run", "--platform", "win_amd64", "--python-version", "3.12"]
        )
        == 0
    )
    lines = [ln for ln in capsys.readouterr().out.splitlines() if ln.startswith("+ ")]
    assert lines[0].endswith(f"-m pip wheel --no-deps --wheel-dir {out} {ROOT}")
    assert (
        "-m pip download --only-binary=:all: --platform win_amd64 --python-version 3.12 "
        f"--dest {out} -r " in lines[1]
    )


def test_install_notes_say_how_to_install_offline():
    text = _script().INSTALL
    assert "--no-index --find-links THIS_FOLDER offgrid" in text
    assert "local electrical codes" in text
    deps = _script().dependencies(ROOT)
    assert any(d.startswith("pvlib") for d in deps) and any(d.startswith("textual") for d in deps)
