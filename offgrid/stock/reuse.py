"""The design of one combination of parts from steps shared across combinations.

:func:`offgrid.design.sizing.design` run on every module x battery x controller x inverter
repeats most of its work: the loads, the sun on the plane and the first design month are
the same for every part but the inverter's efficiency and idle draw; the array step does
not read the battery's capacity; the bank step reads neither the module nor the
controller.  :class:`StepReuse` runs the same steps, in the same order, as ``design()``,
each through a store keyed by the quantities that step reads, so each is computed once
per distinct input and a step's :class:`~offgrid.design.result.DesignError` is kept and
raised again for every combination that reaches it (the same code and message, in the
same order as ``design()``: a combination is rejected by its first failing step).

Keys, by what each step reads (``design()`` in :mod:`offgrid.design.sizing`):

- loads, sun on the plane, site record: the inverter's efficiency and idle draw (the
  inverter *group*); the rest of the project is the search's;
- module fit: the module;
- array step (string window, layout, controllers): module, controller, the battery's
  round-trip efficiency, chemistry and unit voltage, the group, and the least module
  count the harvest check asks for;
- bank step: battery unit, group, system and absorption voltage;
- inverter step: group, design month, system voltage;
- electrical steps before protection (fit, noon curve, string window and layout, cable
  runs, harvest comparison): the array step's key (its site, loads, inverter and array
  follow from it, the battery only through the efficiency and the two voltages in it);
- protection schedule: run until it passes once for that key.  The battery enters a
  refusal there only through the bank's strings in parallel n (the battery string fuse
  at the terminals' current / n, refused above the largest fuse rating; the unit's
  short-circuit value is the project's), and the battery disconnect then carries the
  whole current with a breaker, whose ratings are among the fuse ratings: a schedule that
  passed for one n passes for every n (n = 1: no string fuse), one refused is run again
  for the next bank.

The design month's confirmation, the cautions and the charge-rate step never refuse and
change no figure the search reads, so they are not run.  Only the figures the search
reads are returned (:class:`PartsDesign`); ``tests/test_stock_reuse.py`` holds the search
with this reuse to the search by ``design()`` on a catalogue of varied and rejected parts.
"""

from __future__ import annotations

import math
from collections import defaultdict
from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from offgrid.design import wiring as wr
from offgrid.design.array_step import size_array
from offgrid.design.battery_step import size_battery
from offgrid.design.charging import pwm_operating_voltage
from offgrid.design.electrical import (
    harvest_check,
    lay_out_strings,
    plan_runs,
    protection_schedule,
    string_limits,
    wire_ambient_c,
)
from offgrid.design.electrical.cable_runs import CableStep
from offgrid.design.electrical.operating_point import module_fit_step, noon_operating_point
from offgrid.design.inverter_step import size_inverter
from offgrid.design.loads import analyse_loads
from offgrid.design.pv import fit_module
from offgrid.design.result import (
    ArrayResult,
    BatteryResult,
    ControllerResult,
    DesignError,
    InverterResult,
    LoadResult,
)
from offgrid.design.site_step import site_record, sun_on_plane
from offgrid.design.sizing import (
    HARVEST_SHORTFALL_TOLERANCE_PCT,
    _check_climate,
    _check_loads,
    resolve_climate,
)
from offgrid.project.model import Project


@dataclass(frozen=True)
class PartsDesign:
    """The figures of a design the parts search reads (check, bill of materials, cost)."""

    loads: LoadResult
    array: ArrayResult
    battery: BatteryResult
    controller: ControllerResult
    inverter: InverterResult


def _cached(store: dict, key: Any, fn: Callable[[], Any]) -> Any:
    """``fn()`` once per key; a DesignError is kept and raised again for the same key."""
    try:
        value, error = store[key]
    except KeyError:
        try:
            value, error = fn(), None
        except DesignError as exc:
            value, error = None, exc
        store[key] = (value, error)
    if error is not None:
        raise error.with_traceback(None)
    return value


class StepReuse:
    """The steps of ``design()`` shared across the combinations of one search.

    Every project given to :meth:`design` must be the search's project with only the
    four part tables replaced (:func:`offgrid.stock.choose.with_parts`) and its system
    voltage fixed (:func:`offgrid.stock.choose.replace_choices`): the keys name the parts
    and the system voltage, nothing else of the project."""

    def __init__(self) -> None:
        self._chains: dict = {}  # array key -> (arr, site, loads, inverter step) or refusal
        self._banks: dict = {}  # (battery, group, volts) -> bank step or refusal
        self._ends: dict = {}  # (array key, strings of the bank) -> last array step or refusal
        self.stores: defaultdict[str, dict] = defaultdict(dict)  # the other steps, by name
        self._protected: set = set()  # electrical keys whose protection schedule passed

    def design(
        self,
        make: Callable[[], Project],
        names: tuple[str, str, str],
        group: tuple,
        bat_key: tuple,
    ) -> PartsDesign:
        """The figures ``sizing.design(make())`` gives, or its DesignError.

        ``make``: the combination's project, built only when a step is first met;
        ``names``: its (module, battery, controller) catalogue names; ``group``: its
        inverter's (efficiency, idle draw) and system voltage; ``bat_key``: its battery's
        (round-trip efficiency, chemistry, unit voltage), what the array step reads."""
        made: list[Project] = []

        def p() -> Project:
            if not made:
                made.append(make())
            return made[0]

        m_name, b_name, c_name = names
        arr_key = (m_name, c_name, bat_key, group)
        arr, site2, lr, inv = _cached(self._chains, arr_key, lambda: self._chain(p(), arr_key))
        bat = _cached(
            self._banks,
            (b_name, group, arr.system_voltage_v, arr.absorption_voltage_v),
            lambda: _figures_only(_bank(p(), lr, arr, site2)),
        )
        last = _cached(
            self._ends,
            (arr_key, int(bat.battery.units_parallel)),
            lambda: self._rounds(p, arr_key, arr, site2, lr, bat, inv),
        )
        return PartsDesign(lr, last.array, bat.battery, last.controller, inv.inverter)

    def _chain(self, p: Project, arr_key: tuple):
        """Loads, sun, site, module fit, the first array step, the design month and the
        inverter step: ``design()``'s steps that read no battery capacity."""

        m_name, _c, _b, group = arr_key
        lr0, demand, site, t_low = _cached(self.stores["site"], group, lambda: _site(p))
        params = _cached(self.stores["fit"], m_name, lambda: fit_module(p.module))
        arr = self._array(lambda: p, arr_key, site, lr0, t_low, params, 0)
        dm = arr.design_month
        site2, lr = _month(site, lr0, demand, arr, dm)
        inv = _cached(
            self.stores["inverter"],
            (group, dm, arr.system_voltage_v),
            lambda: size_inverter(p.inverter, lr, arr.system_voltage_v),
        )
        return arr, site2, lr, inv

    def _array(
        self, proj: Callable[[], Project], arr_key, site, lr0, t_low, params, min_modules: int
    ):

        return _cached(
            self.stores["array"],
            (*arr_key, min_modules),
            lambda: _figures_only(
                size_array(
                    proj().module,
                    proj().controller,
                    proj().battery,
                    proj().choices,
                    site,
                    lr0,
                    t_low,
                    params,
                    min_modules=min_modules,
                )
            ),
        )

    def _rounds(self, proj: Callable[[], Project], arr_key, arr, site2, lr, bat, inv):
        """``design()``'s electrical rounds: modules added until the I-V harvest through
        the controller covers the demand; the last array step.  ``proj``: the combination's
        project, built only if a step of the rounds is first met here."""

        m_name, _c, _b, group = arr_key
        lr0, _demand, _site, t_low = _cached(self.stores["site"], group, lambda: _site(proj()))
        params = _cached(self.stores["fit"], m_name, lambda: fit_module_of(proj()))

        def electrical(array_step, min_modules: int) -> float:
            key = (*arr_key, min_modules)
            front = _cached(
                self.stores["front"],
                key,
                lambda: _front(
                    proj(),
                    site2,
                    lr,
                    array_step,
                    bat.battery,
                    inv.inverter,
                    params,
                    self,
                    (m_name, arr_key[1], group, int(site2.design_month)),
                ),
            )
            if key not in self._protected:
                _protection(proj(), front, bat.battery, inv.inverter)
                self._protected.add(key)
            return front[2]

        short = electrical(arr, 0)
        for _ in range(4):  # as sizing.design: add modules until the harvest covers
            if short <= HARVEST_SHORTFALL_TOLERANCE_PCT:
                break
            n = arr.array.module_count
            need = max(n + 1, math.ceil(n / (1.0 - short / 100.0) - 1e-9))
            # the later rounds see the design month's site, as in sizing.design
            arr = self._array(proj, arr_key, site2, lr0, t_low, params, need)
            short = electrical(arr, need)
        return arr


def _figures_only(step):
    """A step's record without its reasons and notices (the search reads neither; kept
    for thousands of steps they would hold most of the search's memory)."""
    return replace(step, reasons={}, notices=())


def fit_module_of(p: Project):
    return fit_module(p.module)


def _bank(p: Project, lr, arr, site2):

    return size_battery(
        p.battery,
        p.choices,
        lr.daily_energy_wh,
        arr.system_voltage_v,
        arr.absorption_voltage_v,
        np.asarray(site2.temp_mean_c),
        p.site.battery_temp_c,
        p.site.battery_warm_temp_c,
    )


def _site(p: Project):
    """Loads, sun on the plane and the site record: ``design()``'s first steps."""

    climate = resolve_climate(p)
    _check_climate(climate)
    _check_loads(p)
    ch = p.choices
    lr = analyse_loads(p.loads, p.inverter, ch.load_growth_pct, ch.coincidence_factor)
    demand = np.asarray(lr.daily_energy_wh)
    sun = sun_on_plane(p.site, ch.min_tilt_deg, climate, demand)
    site = site_record(p.site, climate, sun, demand).site
    return lr, demand, site, site.record_low_c


def _month(site, lr0, demand, arr, dm: int):
    """The site and loads at the array step's design month, as ``design()`` sets them
    (``confirm_design_month`` only gives that month's reasons and the low-sun warning,
    never refuses: not run)."""
    site2 = replace(site, design_month=dm + 1)
    lr = replace(lr0, design_daily_energy_wh=float(demand[dm]))
    return site2, lr


def _cables(plan, wiring, choices, ambient_c: float, store: dict):
    """:func:`offgrid.design.electrical.cable_runs.size_cables` without the wires' reasons
    and notices (the search reads neither): the same conductors and refusals, in the same
    order, each run (the PV runs in series together) sized once per search."""

    cable = (
        wiring.units,
        wiring.material,
        wiring.conductor_temp_c,
        ambient_c,
        wiring.insulation_temp_c,
    )
    pv_runs = tuple(r for r in plan.runs if r.key in ("string", "array"))
    other = [r for r in plan.runs if r.key not in ("string", "array")]
    limit = choices.drop_limit_array_pct
    wires = list(
        _cached(
            store,
            (pv_runs, limit, cable),
            lambda: tuple(wr.size_runs_in_series(list(pv_runs), limit, *cable)),
        )
    )
    for r in other:
        wires.append(_cached(store, (r, cable), lambda r=r: wr.size_conductor(r, *cable)))
    return CableStep(tuple(wires), plan, ambient_c, {}, ())


def _front(p: Project, site, lr, arr, battery, inverter, params, reuse: StepReuse, names: tuple):
    """The sub-steps of :func:`offgrid.design.electrical.electrical_design` before the
    protection schedule, called as it calls them: (strings, cables, the harvest's
    shortfall [%], controllers).

    ``names``: (module, controller, inverter group, design month), what the module fit,
    the noon curve and the string window read (the site follows from the group and the
    design month; the string window reads the battery only through ``v_abs``)."""

    module, wiring = p.module, p.wiring
    core = _Core(arr.array, arr.controller, battery, inverter, lr, site)
    m_name, c_name, group, dm = names
    _cached(reuse.stores["module fit"], m_name, lambda: module_fit_step(module, params))
    noon = _cached(
        reuse.stores["noon"],
        (m_name, group, dm),
        lambda: noon_operating_point(module, params, site, site.albedo or p.site.albedo),
    )
    ctype = p.controller.type
    vsys = float(battery.system_voltage_v)
    v_abs = float(battery.absorption_voltage_v)
    lim = _cached(
        reuse.stores["limits"],
        (m_name, c_name, group, dm, v_abs),
        lambda: string_limits(
            module,
            p.controller,
            p.choices.drop_limit_array_pct,
            noon.temp_day_c,
            float(site.record_low_c),
            v_abs,
            params,
        ),
    )
    controllers = max(1, int(arr.controller.count))
    lay = lay_out_strings(
        module, params, ctype, lim, noon.temp_day_c, v_abs, arr.array, controllers
    )
    layout = lay.strings.layout
    plan = plan_runs(
        module,
        params,
        ctype,
        float(p.controller.efficiency),
        float(arr.controller.current_a),
        controllers,
        vsys,
        pwm_operating_voltage(battery.chemistry, vsys, float(p.choices.derates.wiring)),
        float(battery.bank_voltage_v),
        layout,
        inverter,
        p.loads,
        wiring,
        p.choices,
    )
    ambient_c = wire_ambient_c(wiring, site.temp_day_c)
    cables = _cables(plan, wiring, p.choices, ambient_c, reuse.stores["wires"])
    crop = harvest_check(p, core, params, layout, cables, noon, lim)
    return lay.strings, cables, float(crop.harvest.shortfall_pct), controllers


def _protection(p: Project, front, battery, inverter) -> None:

    strings, cables, _short, controllers = front
    protection_schedule(
        cables,
        strings,
        battery,
        inverter,
        p.loads,
        unit_capacity_ah=p.battery.capacity_ah,
        battery_short_circuit_a=p.wiring.battery_short_circuit_a,
        isc_a=p.module.isc_a,
        controllers=controllers,
        vsys=float(battery.system_voltage_v),
        v_abs=float(battery.absorption_voltage_v),
    )


@dataclass(frozen=True)
class _Core:
    """What :func:`offgrid.design.electrical._derate` reads of the core design."""

    array: ArrayResult
    controller: ControllerResult
    battery: BatteryResult
    inverter: InverterResult
    loads: LoadResult
    site: Any
