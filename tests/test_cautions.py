"""Safety cautions fire from the design's own figures."""

from __future__ import annotations

from dataclasses import replace

import pytest

from offgrid.design import cautions as cau


def inputs(**kw) -> cau.CautionInputs:
    base = dict(
        max_dc_voltage_v=90.0,
        system_voltage_v=48.0,
        chemistry="gel",
        cells_in_series=24,
        bank_capacity_ah=800.0,
        max_dod=0.5,
        battery_min_temp_c=15.0,
        bank_fault_current_a=9600.0,
        fault_current_estimated=True,
        ambient_for_wires_c=25.0,
        array_run_m=8.0,
        strings=2,
    )
    base.update(kw)
    return cau.CautionInputs(**base)


def codes(c: cau.CautionInputs) -> list[str]:
    return [x.code for x in cau.design_cautions(c)]


def test_ventilation_iec_62485_2_worked_by_hand():
    # IEC 62485-2:2010 eq. 1 (from memory): Q = 0.05 x n x Igas x Crt x 1e-3 m3/h.
    # Valve-regulated, boost charging, Igas = 8 mA/Ah: 24 cells, 800 Ah ->
    # 0.05 x 24 x 8 x 800 / 1000 = 7.68 m3/h; opening A = 28 x Q = 215.04 cm2.
    q = cau.ventilation_airflow_m3_h("gel", 24, 800.0)
    assert q == pytest.approx(7.68)
    assert cau.ventilation_opening_cm2(q) == pytest.approx(215.04)
    # Vented (flooded), Igas = 20 mA/Ah: 12 cells, 200 Ah -> 0.05 x 12 x 20 x 200e-3 = 2.4.
    assert cau.ventilation_airflow_m3_h("flooded", 12, 200.0) == pytest.approx(2.4)
    text = next(c.text for c in cau.design_cautions(inputs()) if c.code == "lead-acid-ventilation")
    assert "7.68 m3/h" in text and "215 cm2" in text


def test_electrolyte_freezing_tm_5_1185():
    # US Army TM 5-1185 Tables II and III (REFERENCES.md, V): full charge SG 1.280 freezes at
    # -68 C; 75 % SG 1.250 at -52 C; 50 % SG 1.220, between 1.200 (-27) and 1.250 (-52):
    # -27 - 25 x 0.4 = -37 C (linear, worked by hand); flat SG 1.130: -7 - 8 x 0.6 = -11.8 C.
    assert cau.electrolyte_freezing_c(1.0) == pytest.approx(-68.0)
    assert cau.electrolyte_freezing_c(0.75) == pytest.approx(-52.0)
    assert cau.electrolyte_freezing_c(0.5) == pytest.approx(-37.0)
    assert cau.electrolyte_freezing_c(0.0) == pytest.approx(-11.8)


def test_dc_above_extra_low_voltage():
    # IEC 61140: ripple-free DC extra-low voltage ends at 120 V.
    assert "dc-above-elv" not in codes(inputs(max_dc_voltage_v=119.0))
    assert "dc-above-elv" in codes(inputs(max_dc_voltage_v=126.2))


def test_lithium_cold_charging_and_lead_acid_freezing_fire_only_when_cold():
    warm, cold = inputs(battery_min_temp_c=12.0), inputs(battery_min_temp_c=-8.0)
    assert "electrolyte-freezing" not in codes(warm)
    assert "electrolyte-freezing" in codes(cold)
    lfp = dict(chemistry="lifepo4", cells_in_series=16)
    assert "lfp-cold-charge" not in codes(replace(warm, **lfp))
    assert "lfp-cold-charge" in codes(replace(cold, **lfp))
    assert "lead-acid-ventilation" not in codes(replace(warm, **lfp))
    assert "electrolyte-freezing" not in codes(replace(cold, **lfp))


def test_conductor_temperature_and_surge_follow_the_design():
    assert "conductor-temperature" not in codes(inputs(ambient_for_wires_c=25.0))
    assert "conductor-temperature" in codes(inputs(ambient_for_wires_c=38.0))
    short = next(
        c.text for c in cau.design_cautions(inputs(array_run_m=8.0)) if c.code == "surge-protection"
    )
    long = next(
        c.text
        for c in cau.design_cautions(inputs(array_run_m=40.0))
        if c.code == "surge-protection"
    )
    assert "both ends" not in short and "both ends" in long


def test_every_design_carries_the_standing_cautions_and_defers_to_code_last():
    out = cau.design_cautions(inputs())
    have = [c.code for c in out]
    for code in (
        "battery-short-circuit",
        "pv-live-in-daylight",
        "grounding",
        "surge-protection",
        "dc-breakers",
    ):
        assert code in have
    assert out[-1].code == "defers-to-code"
    assert "local electrical codes and licensed practice" in out[-1].text
    assert "9.6 kA" in next(c.text for c in out if c.code == "battery-short-circuit")
    assert all(c.source for c in out[:-1])  # every caution but the last names its source
    assert "polarised" in next(c.text for c in out if c.code == "dc-breakers")
    assert "IEC TS 62257-5" in next(c.source for c in out if c.code == "surge-protection")


def test_every_output_states_the_deference_to_code_once(capsys):
    # one statement, owned by offgrid.design.cautions, in the design, the plan and the report
    # (the commands run in this process: what they print is the output; tests/test_cli*.py
    # and test_report_cli.py run the program itself)
    from offgrid.cli import main

    for args in (["size", "--demo"], ["plan", "--demo"], ["report", "--demo", "--format", "txt"]):
        assert main(args) == 0, args
        out = capsys.readouterr().out
        assert " ".join(out.split()).count("defers to local electrical codes") == 1, args
