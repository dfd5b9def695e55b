"""Helpers shared by the report tests: the demo design, the CLI JSON, number parsing."""

from __future__ import annotations

import io
import json
import re
from contextlib import redirect_stdout
from functools import lru_cache

from offgrid.cli import main
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
_NUMBER = re.compile(r"^\s*([-+]?[0-9][0-9,]*(?:\.[0-9]+)?)")


def demo():
    path = demo_project_path()
    return load_project(path), path.parent


@lru_cache(maxsize=1)
def size_json_text() -> str:
    """``offgrid size --demo --json`` as printed."""
    buf = io.StringIO()
    with redirect_stdout(buf):
        assert main(["size", "--demo", "--json"]) == 0
    return buf.getvalue()


def size_json() -> dict:
    return json.loads(size_json_text())


def at_path(tree, dotted: str):
    """Value at a dotted path; list items by index (``loads.per_load_wh.3.6``)."""
    node = tree
    for part in dotted.split("."):
        node = node[int(part)] if isinstance(node, list) else node[part]
    return node


def parse_shown(text: str) -> tuple[float, int] | None:
    """The number a cell shows and its decimals: ``'1,351 W' -> (1351.0, 0)``; months by name."""
    stripped = text.strip()
    if stripped in MONTHS:
        return float(MONTHS.index(stripped) + 1), 0
    m = _NUMBER.match(stripped)
    if not m:
        return None
    raw = m.group(1).replace(",", "")
    decimals = len(raw.split(".")[1]) if "." in raw else 0
    return float(raw), decimals


def assert_shown_equals(text: str, expected: float, where: str) -> None:
    """The shown number equals ``expected`` rounded to the decimals shown."""
    got = parse_shown(text)
    assert got is not None, f"{where}: '{text}' shows no number"
    value, decimals = got
    assert abs(value - float(expected)) <= 0.5 * 10 ** (-decimals) + 1e-9, (
        f"{where}: report shows '{text}', size --json has {expected}"
    )
