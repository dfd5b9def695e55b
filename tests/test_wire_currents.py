"""Each wire states the current of each check (issue 11, output contract).

``current_a``: maximum continuous current, for ampacity and protection (NEC 690.8(A)(1) for
PV circuits); ``drop_current_a``: the operating current the voltage drop is computed with.
A practitioner recomputing the drop from the shown current must get the shown drop.
"""

from __future__ import annotations

import pytest

from offgrid.design.sizing import design
from offgrid.report.summary import summary_text
from tests.conftest import hand_project


def test_array_run_currents_and_drop_worked_by_hand():
    # Hand project (tests/conftest.py): MPPT, 2 strings x 2 modules of Isc 9.75 A, Imp 9.23 A,
    # Vmp 32.5 V; array run 15 m, copper mm2 sizes, conductor at 75 C.
    # Max current, NEC 690.8(A)(1): 1.25 x 2 x 9.75 = 24.375 A (ampacity, fuse).
    # Operating current: 2 x Imp = 18.46 A at 2 x 32.5 = 65 V (the drop).
    # Size 16 mm2: IEC 60228 class 5 plain copper 1.21 ohm/km at 20 C (team REFERENCES.md),
    # at 75 C x (1 + 0.00393 x 55) = 1.47154 ohm/km.
    # Drop 2 x 15 m x 18.46 A x 1.47154 ohm/km / 1000 = 0.81495 V = 1.2538 % of 65 V
    # (with the 24.375 A maximum current it would read 1.655 %: the old mismatch).
    data = design(hand_project()).to_dict()
    w = next(x for x in data["wires"] if x["key"] == "array")
    assert w["current_a"] == pytest.approx(24.375)
    assert w["drop_current_a"] == pytest.approx(18.46)
    assert w["voltage_v"] == pytest.approx(65.0)
    assert w["size"] == "16 mm2"
    assert w["resistance_ohm_km"] == pytest.approx(1.47154, abs=1e-5)
    assert w["drop_pct"] == pytest.approx(1.2538, abs=1e-4)


def test_every_wire_drop_recomputes_from_its_shown_current():
    # Vd% = 100 x 2 x L x I_drop x R / 1000 / V (two-wire DC drop, common practice)
    data = design(hand_project()).to_dict()
    for w in data["wires"]:
        drop = 100 * 2 * w["length_m"] * w["drop_current_a"] * w["resistance_ohm_km"] / 1000
        assert drop / w["voltage_v"] == pytest.approx(w["drop_pct"], rel=1e-5), w["key"]
        assert w["current_a"] >= w["drop_current_a"] - 1e-9


def test_reasons_name_each_current():
    d = design(hand_project())
    assert "operating" in d.why("wires.array.drop_current_a").formula
    assert "maximum" in d.why("wires.array.current_a").formula
    assert dict(d.why("wires.array.drop_pct").inputs)["drop_current"] == "18.5 A"


def test_summary_cable_table_shows_both_currents():
    p = hand_project()
    text = summary_text(p, design(p))
    head = next(ln for ln in text.splitlines() if ln.strip().startswith("run"))
    assert "max A" in head and "drop A" in head
    row = next(ln for ln in text.splitlines() if ln.strip().startswith("array to controller"))
    assert "24.4" in row and "18.5" in row and "1.25" in row
    assert max(len(ln) for ln in text.splitlines()) <= 80
