"""The one-page client summary (``offgrid report --format client``)."""

from __future__ import annotations

import pytest

from offgrid.catalogue import figure_entry
from offgrid.cli import main
from offgrid.design.sizing import design
from offgrid.economics.bom import complete_bill_of_materials
from offgrid.economics.costs import money
from offgrid.paths import demo_project_path
from offgrid.project.model import PriceItem
from offgrid.project.store import load_project
from offgrid.report.client import client_summary_text

KINDS = [
    "module",
    "battery",
    "controller",
    "inverter",
    "fuse",
    "fuse-or-breaker",
    "disconnect",
    "cable",
    "mounting",
    "pv-connector",
    "combiner",
    "surge-protector",
    "earthing-conductor",
    "earth-electrode",
    "battery-link",
    "lug",
    "fuse-holder",
    "dc-board",
    "label",
]


@pytest.fixture(scope="module")
def demo():
    p = load_project(demo_project_path())
    return p, design(p, demo_project_path().parent)


def test_one_page_with_what_the_client_needs(demo):
    p, d = demo
    text = client_summary_text(p, d)
    lines = text.splitlines()
    assert len(lines) <= 60 and max(map(len, lines)) <= 80  # one printed page
    assert "(demonstration data, invented)" in lines[0]
    # each number with the catalogue's label and unit (offgrid/catalogue/composites.py)
    power, days = figure_entry("array.power_w"), figure_entry("battery.autonomy_days")
    assert f"{power.label} {power.text(d.array.power_w)}: {d.array.module_count} x" in text
    assert f"{days.label} {days.text(d.battery.autonomy_days)}" in " ".join(text.split())
    assert "defers to local electrical codes" in text
    assert text.count("Date: ____") == 3
    # unpriced accessories: no total given as the cost, the partial sum marked so
    assert "Capital" not in text and "INCOMPLETE" in text


def test_fully_priced_kit_gives_capital_and_lifecycle(demo):
    p, d = demo
    import copy

    q = copy.deepcopy(p)
    q.prices = [PriceItem(k, 1.0) for k in KINDS]
    lines = complete_bill_of_materials(q, d)
    # every line at 1 USD: the parts cost is the sum of the quantities, + 15 % installation
    parts = sum(ln.quantity for ln in lines)
    text = client_summary_text(q, d)
    assert f"{figure_entry('costs.capital').label} {money(parts * 1.15, 'USD')}" in text


def test_report_command_writes_the_client_format(tmp_path, capsys):
    out = tmp_path / "client.txt"
    assert main(["report", "--demo", "--format", "client", "-o", str(out)]) == 0
    assert out.read_text().startswith("Kisanga Ridge health post")
