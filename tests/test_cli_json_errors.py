"""With --json, a refusal is a JSON object on stdout too (issue 11, output contract).

{"error": {"code", "message", "field", "exit_code"}}: exit 3 when the design cannot be met,
exit 2 for bad input; the message still goes to stderr for people. The first check runs
the program (subprocess), the others ``main`` in this process (tests/cli_support.py).
"""

from __future__ import annotations

import json

import pytest

from offgrid.project.store import save_project
from tests.cli_support import run_cli
from tests.conftest import hand_project
from tests.test_cli import cli, offgrid


def _error(proc, exit_code: int) -> dict:
    assert proc.returncode == exit_code, proc.stderr
    assert "offgrid: " in proc.stderr  # the message for people stays on stderr
    data = json.loads(proc.stdout)
    err = data["error"]
    assert set(err) == {"code", "message", "field", "exit_code"}
    assert err["exit_code"] == exit_code and err["message"]
    return err


def test_size_json_infeasible_design_exits_3_with_json(tmp_path):
    p = hand_project()
    p.battery.nominal_voltage_v = 10.0  # no whole number of 10 V units makes 24 V
    path = tmp_path / "p.toml"
    save_project(p, path)
    err = _error(offgrid("size", str(path), "--json", check=False), 3)
    assert err["field"] and err["field"].startswith("battery")
    assert "cannot make" in err["message"]


def test_size_json_bad_override_exits_2_with_the_field():
    err = _error(cli("size", "--demo", "--max-dod", "1.7", "--json", check=False), 2)
    assert err["field"] == "choices.max_dod" and err["code"] == "bad-input"


def test_size_json_bad_project_file_names_the_field(tmp_path):
    path = tmp_path / "bad.toml"
    path.write_text("format = 'offgrid-project'\nschema = 1\n[site]\nlatitude_deg = 123\n")
    err = _error(cli("size", str(path), "--json", check=False), 2)
    assert err["field"] == "site.latitude_deg"


def test_size_json_bad_option_value_is_json_too():
    err = _error(cli("size", "--demo", "--autonomy-days", "lots", "--json", check=False), 2)
    assert err["field"] == "--autonomy-days"


def test_without_json_stdout_stays_empty():
    proc = cli("size", "--demo", "--max-dod", "1.7", check=False)
    assert proc.returncode == 2 and proc.stdout == ""


@pytest.mark.parametrize(
    "args",
    [("simulate", "--demo", "--years", "x", "--json"), ("variants", "nowhere.toml", "--json")],
)
def test_other_json_subcommands_share_it(args):
    _error(cli(*args, check=False), 2)


def test_a_json_run_leaves_the_next_run_in_this_process_plain():
    """main() called twice in one process (the CLI tests, a script): --json errors belong
    to the run that asked for them."""
    first = run_cli("size", "--demo", "--max-dod", "1.7", "--json")
    assert first.returncode == 2 and json.loads(first.stdout)["error"]["field"]
    then = run_cli("size", "--demo", "--max-dod", "1.7")
    assert then.returncode == 2 and then.stdout == ""
    assert "choices.max_dod" in then.stderr
