"""Conductor tables, voltage drop and ampacity, against the published tables."""

from __future__ import annotations

import math

import pytest

from offgrid.design import wiring as wr
from offgrid.design.result import DesignError

FT_PER_M = 1 / 0.3048


def size(name: str) -> wr.ConductorSize:
    for s in wr.AWG_SIZES + wr.MM2_SIZES:
        if s.name == name:
            return s
    raise KeyError(name)


# NFPA 70 (NEC) 2020/2023 Chapter 9 Table 8, ohm per 1000 ft at 75 C, stranded uncoated
# (REFERENCES.md, V x2).
TABLE8 = {
    "14 AWG": (3.14, None),
    "12 AWG": (1.98, 3.25),
    "10 AWG": (1.24, 2.04),
    "8 AWG": (0.778, 1.28),
    "6 AWG": (0.491, 0.808),
    "4 AWG": (0.308, 0.508),
    "3 AWG": (0.245, 0.403),
    "2 AWG": (0.194, 0.319),
    "1 AWG": (0.154, 0.253),
    "1/0 AWG": (0.122, 0.201),
    "2/0 AWG": (0.0967, 0.159),
    "3/0 AWG": (0.0766, 0.126),
    "4/0 AWG": (0.0608, 0.100),
    "250 kcmil": (0.0515, 0.0847),
}


@pytest.mark.parametrize("name", TABLE8)
def test_nec_table8_resistance_at_75c(name):
    cu, al = TABLE8[name]
    r = wr.resistance_ohm_per_km(size(name), "copper", 75.0)
    assert r / 1000 / FT_PER_M * 1000 == pytest.approx(cu, rel=1e-9)  # back to ohm/kft
    if al is not None:
        r = wr.resistance_ohm_per_km(size(name), "aluminium", 75.0)
        assert r * 0.3048 == pytest.approx(al, rel=1e-9)


# IEC 60228:2004 maximum DC resistance at 20 C, ohm/km: class 5 plain copper and class 2
# aluminium (REFERENCES.md, V x2).
IEC60228 = {
    1.5: (13.3, None),
    2.5: (7.98, None),
    4: (4.95, None),
    6: (3.30, None),
    10: (1.91, 3.08),
    16: (1.21, 1.91),
    25: (0.780, 1.20),
    35: (0.554, 0.868),
    50: (0.386, 0.641),
    70: (0.272, 0.443),
    95: (0.206, 0.320),
    120: (0.161, 0.253),
}


@pytest.mark.parametrize("mm2", IEC60228)
def test_iec60228_resistance_at_20c(mm2):
    cu, al = IEC60228[mm2]
    s = size(f"{mm2:g} mm2")
    assert wr.resistance_ohm_per_km(s, "copper", 20.0) == pytest.approx(cu, rel=1e-9)
    if al is not None:
        assert wr.resistance_ohm_per_km(s, "aluminium", 20.0) == pytest.approx(al, rel=1e-9)


def test_astm_b258_awg_diameters():
    # ASTM B258: d = 0.127 mm x 92^((36 - n)/39) (REFERENCES.md, C): 14 AWG 1.628 mm,
    # 10 AWG 2.588 mm, 4/0 (n = -3) 11.684 mm.
    assert wr.awg_diameter_mm(14) == pytest.approx(1.628, abs=5e-4)
    assert wr.awg_diameter_mm(10) == pytest.approx(2.588, abs=5e-4)
    assert wr.awg_diameter_mm(-3) == pytest.approx(11.684, abs=5e-4)
    # The same sizes' circular-mil areas in NEC Chapter 9 Table 8 (from memory): 4110, 10380,
    # 211600 cmil; 1 cmil = pi/4 x (0.0254 mm)^2.
    cmil = math.pi / 4 * 0.0254**2
    assert wr.awg_area_mm2(14) / cmil == pytest.approx(4110, rel=2e-3)
    assert wr.awg_area_mm2(10) / cmil == pytest.approx(10380, rel=2e-3)
    assert wr.awg_area_mm2(-3) / cmil == pytest.approx(211600, rel=2e-3)


def test_temperature_correction_agrees_with_iec_resistivity():
    # NEC Table 8 10 AWG copper 1.24 ohm/kft at 75 C corrected to 20 C with a = 0.00323:
    # 1.24 x (1 - 0.00323 x 55) = 1.0197 ohm/kft = 3.3455 ohm/km (worked by hand).
    r20 = wr.resistance_ohm_per_km(size("10 AWG"), "copper", 20.0)
    assert r20 == pytest.approx(1.24 * (1 - 0.00323 * 55) * FT_PER_M, rel=1e-9)
    # Cross-check: IEC 60028 annealed copper 0.017241 ohm mm2/m over the ASTM B258 area
    # 5.261 mm2 gives 3.277 ohm/km for solid wire; stranding adds about 2 % (common
    # practice, no source), so the two tables agree within 3 %.
    solid = 0.017241 / wr.awg_area_mm2(10) * 1000
    assert solid == pytest.approx(3.277, abs=2e-3)
    assert r20 / solid == pytest.approx(1.02, abs=0.01)
    # IEC side: a20 = 0.00393; 4 mm2 class 5 at 75 C = 4.95 x (1 + 0.00393 x 55) = 6.0199.
    assert wr.resistance_ohm_per_km(size("4 mm2"), "copper", 75.0) == pytest.approx(
        6.0199, abs=1e-4
    )


def test_voltage_drop_worked_by_hand():
    # 10 AWG copper at 75 C (Table 8: 1.24 ohm/kft = 4.0682 ohm/km), 20 m one way, 15 A:
    # Vd = 2 x 20 m x 15 A x 4.0682 ohm/km / 1000 = 2.4409 V; on 24 V that is 10.17 %.
    r = wr.resistance_ohm_per_km(size("10 AWG"), "copper", 75.0)
    assert r == pytest.approx(4.0682, abs=1e-4)
    vd = wr.voltage_drop_v(15.0, 20.0, r)
    assert vd == pytest.approx(2.4409, abs=1e-4)
    assert 100 * vd / 24 == pytest.approx(10.17, abs=0.01)


# NEC 2023 Table 310.15(B)(1)(1), 30 C base (REFERENCES.md, V): warm end of each range ->
# (75 C, 90 C) factors.
NEC_AMBIENT = {
    10: (1.20, 1.15),
    15: (1.15, 1.12),
    20: (1.11, 1.08),
    25: (1.05, 1.04),
    30: (1.00, 1.00),
    35: (0.94, 0.96),
    40: (0.88, 0.91),
    45: (0.82, 0.87),
    50: (0.75, 0.82),
    55: (0.67, 0.76),
    60: (0.58, 0.71),
    65: (0.47, 0.65),
    70: (0.33, 0.58),
}


@pytest.mark.parametrize("ambient", NEC_AMBIENT)
def test_nec_ambient_correction_table_and_its_equation(ambient):
    f75, f90 = NEC_AMBIENT[ambient]
    assert wr.nec_ambient_factor(ambient, 75) == f75
    assert wr.nec_ambient_factor(ambient, 90) == f90
    # NEC 310.15(B) allows the equation sqrt((Tc - Ta)/(Tc - 30)); it gives the table at
    # the warm end of each range, to the table's two decimals.
    assert wr.ambient_factor_formula(ambient, 75) == pytest.approx(f75, abs=0.006)
    assert wr.ambient_factor_formula(ambient, 90) == pytest.approx(f90, abs=0.006)


def test_ambient_between_rows_takes_the_warmer_row():
    # 35.5 C lies between the 31-35 and 36-40 rows: the 36-40 row (0.91 for 90 C) is safe.
    assert wr.nec_ambient_factor(35.5, 90) == 0.91
    assert wr.nec_ambient_factor(76, 75) is None  # past the last row of the 75 C column


def test_ampacity_nec_310_16_with_correction_and_terminal_limit():
    # NEC Table 310.16 (V x2): 10 AWG Cu 35 A at 75 C, 40 A at 90 C.  At 40 C ambient, 90 C
    # insulation: 40 x 0.91 = 36.4 A, but 75 C terminals (110.14(C)) cap it at 35 A.
    assert wr.ampacity_a(size("10 AWG"), "copper", 40.0, 90) == pytest.approx(35.0)
    # At 50 C: 40 x 0.82 = 32.8 A.
    assert wr.ampacity_a(size("10 AWG"), "copper", 50.0, 90) == pytest.approx(32.8)
    # Aluminium 4/0 at 30 C, 90 C insulation: 205 A, capped at the 75 C column 180 A.
    assert wr.ampacity_a(size("4/0 AWG"), "aluminium", 30.0, 90) == pytest.approx(180.0)
    # 14 AWG is not listed in aluminium.
    assert wr.ampacity_a(size("14 AWG"), "aluminium", 30.0, 90) is None


def test_ampacity_iec_with_b52_14_factor():
    # IEC 60364-5-52 B.52.5 (from memory): 6 mm2 Cu XLPE, method C, 2 loaded: 58 A; at 40 C
    # the B.52.14 XLPE factor is 0.91 (the same equation): 58 x 0.91 = 52.78 A.
    assert wr.ampacity_a(size("6 mm2"), "copper", 40.0, 90) == pytest.approx(52.78)


def run(**kw) -> wr.RunSpec:
    base = dict(
        key="array",
        name="array to controller",
        max_current_a=12.19,
        operating_current_a=9.23,
        voltage_v=65.0,
        length_m=15.0,
        drop_limit_pct=3.0,
        fuse_a=20,
        length_field="wiring.array_run_m",
    )
    base.update(kw)
    return wr.RunSpec(**base)


def test_size_conductor_smallest_meeting_ampacity_and_drop_worked_by_hand():
    # 15 m at 9.23 A on 65 V, 3 % limit, 20 A fuse, 30 C, 90 C insulation, Cu at 75 C.
    # Ampacity needs max(1.25 x 12.19, 20) = 20 A: 14 AWG (25 A at 90 C, capped 20 A at 75 C)
    # qualifies, but 240.4(D) caps its fuse at 15 A; 12 AWG: 1.98 ohm/kft = 6.4961 ohm/km,
    # drop 2 x 15 x 9.23 x 6.4961e-3 = 1.7988 V = 2.77 % -> 12 AWG.
    w = wr.size_conductor(run(), "awg", "copper", 75.0, 30.0, 90)
    assert w.size == "12 AWG"
    assert w.drop_pct == pytest.approx(2.767, abs=0.002)
    assert w.ampacity_a == pytest.approx(25.0)
    # On 48 V the same run needs 3.75 %: 10 AWG (1.24 ohm/kft) gives 1.73 %.
    w = wr.size_conductor(run(voltage_v=48.0), "awg", "copper", 75.0, 30.0, 90)
    assert w.size == "10 AWG"


def test_size_conductor_mm2():
    # Same run in mm2: 1.5 mm2 class 5 at 75 C = 13.3 x (1 + 0.00393 x 55) = 16.175 ohm/km,
    # drop 2 x 15 x 9.23 x 16.175e-3 = 4.479 V = 6.89 %: too much; 2.5 mm2: 7.98 -> 9.705
    # ohm/km, 4.13 %; 4 mm2: 6.020 ohm/km, 2.565 % -> 4 mm2.
    w = wr.size_conductor(run(), "mm2", "copper", 75.0, 30.0, 90)
    assert w.size == "4 mm2"
    assert w.drop_pct == pytest.approx(2.565, abs=0.002)


def test_runs_in_series_share_the_limit():
    a = run(key="string", name="modules to combiner", length_m=8.0, fuse_a=None)
    b = run(operating_current_a=18.46, max_current_a=24.4, fuse_a=35, length_m=20.0)
    ws = wr.size_runs_in_series([a, b], 3.0, "mm2", "copper", 75.0, 30.0, 90)
    assert sum(w.drop_pct for w in ws) <= 3.0
    # each alone would fit a smaller size than together
    alone = [wr.size_conductor(r, "mm2", "copper", 75.0, 30.0, 90) for r in (a, b)]
    assert sum(w.area_mm2 for w in ws) > sum(w.area_mm2 for w in alone)


@pytest.mark.parametrize("length, words", [(0.0, "at least 0.1 m"), (10000.0, "more than 1000")])
def test_run_length_out_of_range(length, words):
    with pytest.raises(DesignError, match=words) as err:
        wr.size_conductor(run(length_m=length), "mm2", "copper", 75.0, 30.0, 90)
    assert err.value.field == "wiring.array_run_m"


def test_current_no_conductor_can_carry():
    with pytest.raises(DesignError, match="no listed copper conductor") as err:
        wr.size_conductor(run(max_current_a=900.0, fuse_a=None), "awg", "copper", 75.0, 30.0, 90)
    assert err.value.code == "wire-ampacity"
    assert "raise the system voltage" in str(err.value)


def test_drop_no_conductor_can_meet():
    r = run(
        voltage_v=12.0,
        operating_current_a=100.0,
        max_current_a=100.0,
        fuse_a=125,
        length_m=200.0,
        drop_limit_pct=1.0,
    )
    with pytest.raises(DesignError, match="voltage drop") as err:
        wr.size_conductor(r, "mm2", "copper", 75.0, 30.0, 90)
    assert err.value.code == "wire-drop"
    assert "shorten the run" in str(err.value)


def test_bad_units_and_material():
    with pytest.raises(DesignError) as err:
        wr.size_conductor(run(), "inch", "copper", 75.0, 30.0, 90)
    assert err.value.field == "wiring.units"
    with pytest.raises(DesignError) as err:
        wr.size_conductor(run(), "mm2", "gold", 75.0, 30.0, 90)
    assert err.value.field == "wiring.material"
