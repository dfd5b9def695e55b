"""The report says why the smallest-margin month is not the design month when they differ.

Worked example by hand (worst-month method, common practice, no source): supply and
demand in Wh/day, month A supply 1,050 for demand 1,000 (share +5 %, 50 Wh/day to
spare), month B supply 2,080 for 2,000 (+4 %, 80 Wh/day): B is the design month (the
smaller share), A has the smaller margin (50 < 80 Wh/day), and A has less demand.
"""

from __future__ import annotations

import copy

from offgrid.design.sizing import design
from offgrid.project.model import Load
from offgrid.report import make_report
from offgrid.report.margins import margin_sentences, smallest_margin_month
from tests.report_helpers import demo

SUPPLY = [3000.0] * 12
DEMAND = [1000.0] * 12
SUPPLY[0], DEMAND[0] = 1050.0, 1000.0  # Jan: A
SUPPLY[6], DEMAND[6] = 2080.0, 2000.0  # Jul: B


def test_hand_worked_months():
    assert smallest_margin_month(SUPPLY, DEMAND) == 0
    text = margin_sentences(6, SUPPLY, DEMAND)
    assert text.startswith("Smallest margin: Jan: supply 1,050 Wh/day for 1,000 Wh/day")
    assert "(+5%, +50 Wh/day)" in text
    assert "It is not the design month (Jul: supply 2,080 Wh/day for 2,000" in text
    assert "(+4%, +80 Wh/day)" in text
    assert "Jan has less demand than Jul" in text


def test_same_month_says_so():
    text = margin_sentences(0, SUPPLY, DEMAND)
    assert "It is the design month" in text and "not the design month" not in text


def mill_in_january():
    """The demo clinic with a grain mill (invented, for demonstration) run in January."""
    project, base = demo()
    project = copy.deepcopy(project)
    project.loads.append(
        Load(name="Grain mill (demo)", quantity=1, power_w=400.0, hours_per_day=2.0, months=(1,))
    )
    return project, base


def test_report_explains_two_different_months():
    project, base = mill_in_january()
    d = design(project, base)
    supply, demand = d.array.supply_wh_day, d.loads.daily_energy_wh
    dm = d.site.design_month - 1
    low = smallest_margin_month(supply, demand)
    assert dm == 0 and low != dm  # the case the wording is for
    # the sentence's claim: the design month has the smallest share of all months
    shares = [s / q for s, q in zip(supply, demand, strict=True)]
    assert shares.index(min(shares)) == dm
    text = " ".join(make_report(project, base, "txt").split())
    assert "It is not the design month (Jan" in text
    assert "covers its demand by the smallest share" in text
