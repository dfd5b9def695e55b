"""The array's charging quantities, one model each: the PWM operating voltage and the peak
charge current (issue 14, item 5).

Every user calls these functions: the derate chain's operating-point factor, its
"pwm-voltage-waste" notice and its reason (:mod:`offgrid.design.array_step`), the battery
step's peak charge current (:func:`offgrid.design.battery_step.charge_rate`), the cable
runs' PV and charge currents (:func:`offgrid.design.electrical.cable_runs.plan_runs`), the
I-V harvest comparison (:mod:`offgrid.design.electrical.harvest_compare`, through the run
plan) and the parts search (:mod:`offgrid.stock.reuse`).  Below all of them: it imports
only :mod:`offgrid.design.battery` and :mod:`offgrid.design.pv`.
"""

from __future__ import annotations

from dataclasses import dataclass

from offgrid.design.battery import CHEMISTRIES, absorption_voltage_v, cells_in_series
from offgrid.design.pv import DiodeParams, module_current

#: A full battery at rest sits about 5 % above its nominal voltage (2.1 V a lead-acid cell,
#: about 3.36 V a lithium iron phosphate cell); common practice, no source.
FULL_REST_PER_NOMINAL = 1.05

#: What :func:`pwm_operating_voltage` computes, for the reasons that quote it: the battery
#: side and the array side.
PWM_BATTERY_SIDE_FORMULA = (
    "the mean of full rest (1.05 x the bank's nominal voltage: cells x the chemistry's "
    "nominal cell voltage) and the absorption voltage (cells x the chemistry's absorption "
    "voltage per cell)"
)
PWM_ARRAY_SIDE_FORMULA = (
    "the battery side x (2 - wiring derate): the wiring derate's loss as the array wiring drop"
)
PWM_VOLTAGE_SOURCE = "common practice, no source"
#: What :func:`peak_charge_current` computes, for the reasons that quote it.
PEAK_CHARGE_FORMULA = (
    "MPPT: STC power x controller efficiency / bank voltage (the bank's own nominal "
    "voltage, units in series x unit voltage); PWM: strings x the I-V model's module "
    "current at the PWM operating voltage / modules in series, at STC; at most the "
    "controllers' ratings together"
)
PEAK_CHARGE_SOURCE = "common practice, no source; module current: De Soto (2006) single-diode model"


@dataclass(frozen=True)
class PwmVoltage:
    """The voltages of a PWM-controlled array [V] (:func:`pwm_operating_voltage`)."""

    full_rest_v: float  # the bank at rest, full
    absorption_v: float  # the bank at the end of bulk charge
    battery_v: float  # the battery-side charging voltage: mean of the two
    wiring_drop_v: float  # the array wiring drop, from the wiring derate
    array_v: float  # what the array is pulled down to: battery side + wiring drop


def pwm_operating_voltage(
    chemistry: str, system_voltage_v: float, wiring_derate: float
) -> PwmVoltage:
    """The voltage a PWM controller pulls the array down to, battery side and array side.

    A PWM controller switches the array straight onto the battery, so the array works at
    the battery's voltage while it charges plus the wiring drop.  The battery's voltage is
    taken as the mean of full rest, 1.05 x the bank's nominal voltage
    (:data:`FULL_REST_PER_NOMINAL`), and the absorption voltage, both per cell of the
    chemistry (lead-acid 2.0 and 2.35-2.45 V, lithium iron phosphate 3.2 and 3.55 V) x the
    cells in series (:func:`offgrid.design.battery.cells_in_series`).  The array wiring drop
    is the wiring derate's loss, (1 - wiring derate) x that voltage.  Common practice, no
    source; the absorption voltages per cell are the presets' (check the battery's manual).
    """
    chem = CHEMISTRIES[chemistry]
    cells = cells_in_series(chemistry, system_voltage_v)
    full_rest = FULL_REST_PER_NOMINAL * chem.cell_voltage_v * cells
    absorption = absorption_voltage_v(chemistry, system_voltage_v)
    battery = 0.5 * (full_rest + absorption)
    drop = (1.0 - float(wiring_derate)) * battery
    return PwmVoltage(full_rest, absorption, battery, drop, battery + drop)


def pwm_module_current_a(params: DiodeParams, array_v: float, series: int) -> float:
    """One module's current [A] at STC (1000 W/m2, 25 C cell) when its string of ``series``
    modules is held at ``array_v``: the single-diode model of :mod:`offgrid.design.pv`
    (De Soto 2006), the one I-V model of the design."""
    return float(module_current(params, float(array_v) / int(series), 1000.0, 25.0))


@dataclass(frozen=True)
class PeakCharge:
    """The array's charge current at full sun (:func:`peak_charge_current`)."""

    current_a: float  # at most the controllers' ratings
    array_current_a: float  # what the array gives before the ratings
    voltage_v: float  # MPPT: the bank voltage divided by; PWM: the array's operating voltage
    string_current_a: float  # PWM: one string's I-V current at STC; MPPT: 0


def peak_charge_current(
    ctype: str,
    *,
    series: int,
    strings: int,
    module_pmax_w: float,
    controller_efficiency: float,
    bank_voltage_v: float,
    system_voltage_v: float,
    rating_a: float,
    params: DiodeParams,
    pwm_array_v: float,
) -> PeakCharge:
    """The array's current into the battery at full sun (STC) [A], at most ``rating_a``.

    MPPT: STC power (series x strings x module Pmax) x controller efficiency / the bank's
    own nominal voltage (``bank_voltage_v``, e.g. 51.2 V for a 16-cell LiFePO4 bank; the
    system voltage when it is 0).  PWM: strings x the module current at ``pwm_array_v`` /
    series at STC (:func:`pwm_module_current_a`).  ``strings`` and ``rating_a``: the whole
    array and all controllers together (the battery step), or one controller's share and
    its rating (the charge run).  Common practice, no source.
    """
    if ctype == "mppt":
        v = float(bank_voltage_v) or float(system_voltage_v)
        i_string = 0.0
        i_array = series * strings * float(module_pmax_w) * float(controller_efficiency) / v
    else:
        v = float(pwm_array_v)
        i_string = pwm_module_current_a(params, v, series)
        i_array = strings * i_string
    return PeakCharge(min(i_array, float(rating_a)), i_array, v, i_string)
