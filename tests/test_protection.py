"""Overcurrent protection, NEC 690.7 cold voltage and the string window."""

from __future__ import annotations

import pytest

from offgrid.design import protection as prot
from offgrid.design import strings as st
from offgrid.design.result import DesignError

# NEC 2023 Table 240.6(A) (REFERENCES.md, V).
NEC_240_6 = (
    10,
    15,
    20,
    25,
    30,
    35,
    40,
    45,
    50,
    60,
    70,
    80,
    90,
    100,
    110,
    125,
    150,
    175,
    200,
    225,
    250,
    300,
    350,
    400,
    450,
    500,
    600,
    700,
    800,
    1000,
)


def test_standard_ratings_are_nec_240_6a_2023():
    assert prot.STANDARD_RATINGS_A[: len(NEC_240_6)] == NEC_240_6
    assert prot.FUSE_ONLY_RATINGS_A == (1, 3, 6, 601)


@pytest.mark.parametrize(
    "current, fuse, want",
    [
        (31.0, True, 35),
        (100.1, True, 110),
        (1.2, True, 3),
        (1.2, False, 10),
        (5.0, True, 6),
        (600.5, True, 601),
        (600.5, False, 700),
        (15.0, True, 15),
    ],
)
def test_next_standard_rating(current, fuse, want):
    assert prot.standard_rating_a(current, fuse=fuse) == want


def test_pv_circuit_current_and_fuse_690_8_690_9():
    # NEC 690.8(A)(1): 1.25 x Isc; 690.9(B): 1.25 x that.  Isc 9.75 A: 12.19 A and
    # 15.23 A -> standard 20 A (worked by hand).  Two strings: 24.38 A, 30.47 A -> 35 A.
    assert prot.pv_max_current_a(9.75, 1) == pytest.approx(12.1875)
    assert prot.pv_fuse_min_a(9.75, 1) == pytest.approx(15.234375)
    assert prot.string_fuse_rating_a(9.75, None) == 20
    assert prot.standard_rating_a(prot.pv_fuse_min_a(9.75, 2)) == 35


def test_string_fuses_from_three_strings():
    # NEC 690.9(A): one or two strings cannot back-feed more than one string's current.
    assert not prot.string_fuses_needed(1, 9.75, None)
    assert not prot.string_fuses_needed(2, 9.75, None)
    assert prot.string_fuses_needed(3, 9.75, None)
    # With the module's series fuse rating (IEC 62548 7.3.3 criterion, from memory):
    # 3 strings back-feed 2 x 1.25 x 9.75 = 24.4 A <= 30 A: none; 4 strings 36.6 A: fuses.
    assert not prot.string_fuses_needed(3, 9.75, 30.0)
    assert prot.string_fuses_needed(4, 9.75, 30.0)


def test_string_fuse_above_module_rating_is_refused():
    with pytest.raises(DesignError, match="maximum series fuse") as err:
        prot.string_fuse_rating_a(9.75, 15.0)  # needs 20 A
    assert err.value.field == "wiring.module_max_fuse_a"


def test_bank_fault_current_sums_parallel_strings():
    unit, est = prot.unit_short_circuit_a("agm", 200.0, 4200.0)
    assert (unit, est) == (4200.0, False)
    assert prot.bank_fault_current_a(unit, 3) == pytest.approx(12600.0)
    unit, est = prot.unit_short_circuit_a("agm", 200.0, None)
    assert est and unit > 0
    with pytest.raises(DesignError):
        prot.unit_short_circuit_a("agm", 200.0, -5.0)


# NEC Table 690.7(A) (REFERENCES.md, V): lowest expected ambient -> factor.
NEC_690_7 = {
    24: 1.02,
    20: 1.02,
    19: 1.04,
    15: 1.04,
    14: 1.06,
    10: 1.06,
    9: 1.08,
    5: 1.08,
    4: 1.10,
    0: 1.10,
    -1: 1.12,
    -5: 1.12,
    -6: 1.14,
    -10: 1.14,
    -11: 1.16,
    -15: 1.16,
    -16: 1.18,
    -20: 1.18,
    -21: 1.20,
    -25: 1.20,
    -26: 1.21,
    -30: 1.21,
    -31: 1.23,
    -35: 1.23,
    -36: 1.25,
    -40: 1.25,
}


@pytest.mark.parametrize("t", NEC_690_7)
def test_nec_690_7_table(t):
    assert st.nec_690_7_factor(t) == NEC_690_7[t]


def test_nec_690_7_between_rows_and_out_of_range():
    assert st.nec_690_7_factor(-5.5) == 1.14  # colder row, the larger factor
    assert st.nec_690_7_factor(30.0) == 1.0
    with pytest.raises(DesignError, match="Voc temperature coefficient"):
        st.nec_690_7_factor(-45.0)


def test_cold_voc_with_coefficient_and_with_table():
    # 690.7(A)(1) with the coefficient: 39.8 x (1 + (-0.003) x (-5 - 25)) = 43.382 V.
    v, rule = st.voc_cold_v(39.8, -0.30, -5.0)
    assert v == pytest.approx(43.382)
    assert "coefficient" in rule
    # Without one: 39.8 x 1.12 (Table 690.7(A), -1 to -5 C) = 44.576 V.
    v, rule = st.voc_cold_v(39.8, None, -5.0)
    assert v == pytest.approx(44.576)
    assert "690.7(A) factor" in rule


def test_string_window_worked_by_hand():
    # MPPT, 150 V input; cold Voc 43.38 V -> at most floor(150/43.38) = 3; 48 V lead-acid
    # absorption 57.6 V + 5 V margin = 62.6 V over hot Vmp 28.6 V -> at least 3.
    w = st.string_window("mppt", 150.0, 43.382, 28.6, 57.6)
    assert (w.min_series, w.max_series) == (3, 3)
    # 250 V controller: up to 5.
    w = st.string_window("mppt", 250.0, 43.382, 28.6, 57.6)
    assert (w.min_series, w.max_series) == (3, 5)


def test_string_window_empty_says_what_to_change():
    with pytest.raises(DesignError, match="no series count fits") as err:
        st.string_window("mppt", 100.0, 43.382, 28.6, 57.6)
    msg = str(err.value)
    assert "at least 3 modules" in msg and "at most 2" in msg
    assert "maximum PV input of at least 131 V" in msg  # ceil(3 x 43.382)
    assert err.value.field == "controller.max_pv_voltage_v"
    with pytest.raises(DesignError, match="an MPPT controller"):
        st.string_window("pwm", 40.0, 22.0, 17.5, 57.6, 1.7)  # 36-cell modules on 48 V PWM


def test_layout_choice():
    w = st.string_window("mppt", 250.0, 43.382, 28.6, 57.6)  # 3-5 in series
    # 10 modules: 5 x 2 uses exactly 10 (3 x 4 = 12, 4 x 3 = 12).
    lay = st.choose_layout(w, 10, 1)
    assert (lay.series, lay.parallel, lay.module_count) == (5, 2, 10)
    # 9 modules: 3 x 3 exactly, though it needs string fuses (fewest modules first).
    assert (st.choose_layout(w, 9, 1).series, st.choose_layout(w, 9, 1).parallel) == (3, 3)
    # Two controllers share strings equally.
    lay = st.choose_layout(w, 10, 2)
    assert lay.parallel % 2 == 0 and lay.strings_per_controller * 2 == lay.parallel
    # PWM takes the smallest series count.
    wp = st.string_window("pwm", 100.0, 22.0, 17.5, 14.4, 0.4)
    assert st.choose_layout(wp, 4, 1).series == 1


def test_battery_disconnect_is_rated_and_dc_motor_circuits_say_time_delay():
    # NEC 706.15 disconnect: rated for the largest current through the battery terminals
    # (1.25 x the circuits it carries; common practice, no source).  A DC motor draws its
    # starting current through its circuit fuse (common practice, no source).
    from offgrid.design.sizing import design
    from tests.conftest import hand_project

    p = hand_project()
    p.loads[0].surge_w = 400.0  # the 100 W DC load starts like a motor
    d = design(p)
    pr = d.electrical.protection
    disconnect = next(x for x in pr.devices if x.kind == "disconnect")
    charge = next(w for w in d.electrical.wires if w.key == "charge")
    assert disconnect.rating_a is not None
    assert disconnect.rating_a >= 1.25 * charge.current_a * d.controller.count
    dc = next(x for x in pr.devices if x.location.startswith("DC load 'DC lights'"))
    assert "time-delay" in dc.note and "17 A" in dc.note  # 400 W / 24 V
