"""The README names the lead-acid low-charge-rate note once, with the code's value (issue 11)."""

from __future__ import annotations

import re
from pathlib import Path

from offgrid.design.battery import MIN_LEAD_ACID_CHARGE_C_RATE

README = Path(__file__).resolve().parents[1] / "README.md"


def test_low_charge_rate_note_is_one_value_matching_the_code():
    text = README.read_text(encoding="utf-8")
    # every sentence about the lead-acid low-rate note
    found = re.finditer(r"[^.|]*note below C/\d+[^.|]*", text)
    notes = [" ".join(m.group(0).split()) for m in found]
    assert len(notes) == 1, notes
    value = int(re.search(r"C/(\d+)", notes[0]).group(1))
    assert value == round(1 / MIN_LEAD_ACID_CHARGE_C_RATE)  # C/50 in offgrid.design.battery
    assert "common practice, no source" in notes[0]
    assert "C/20" not in " ".join(notes)
