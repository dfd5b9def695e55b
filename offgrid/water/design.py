"""Size one water supply: head, the pump on the array through each month's mean day, the
array layout inside the pump's voltage window, the borehole's yield as a hard limit, the tank.

``water_design(project, index)`` returns a :class:`WaterDesign` whose figures each carry a
:class:`~offgrid.design.result.Reason` in ``reasons``; a design that cannot be met raises
:class:`~offgrid.design.result.DesignError` naming the field.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from pathlib import Path
from typing import Any

import numpy as np

from offgrid.design.harvest import daily_poa_profile
from offgrid.design.pv import DiodeParams, cell_temperature_ross, fit_module, module_mpp
from offgrid.design.result import DesignError, Notice, Reason, ReasonBook, fmt
from offgrid.design.strings import voc_cold_v
from offgrid.water import hydraulics as hy
from offgrid.water.cautions import water_cautions
from offgrid.water.coupling import (
    ArrayLayout,
    controller_input_power_w,
    direct_operating_point,
)
from offgrid.water.pump import PumpAtHead, flow_at_power_m3_h, motor_line, pump_at_head

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
#: Standard tank sizes [m3] (common practice, no source: ranges of common plastic and
#: sectional steel tanks).
TANK_SIZES_M3 = (1.0, 2.0, 3.0, 5.0, 10.0, 15.0, 20.0, 25.0, 30.0, 40.0, 50.0, 75.0, 100.0)
#: Standard pipe bores [mm] (common practice, no source: nominal sizes of PE/PVC pipe; the
#: inner bore depends on the pressure class: confirm it on the pipe's table).
PIPE_BORES_MM = (20.0, 25.0, 32.0, 40.0, 50.0, 63.0, 75.0, 90.0, 110.0, 125.0, 160.0, 200.0)
FRICTION_SHARE_LIMIT = 0.10  # friction at most 10 % of the static lift (common practice)
DROP_CABLE_LIMIT_PCT = 3.0  # drop-cable voltage drop limit (common practice, no source)
MAX_PARALLEL = 40
HEAD_ITERATIONS = 8


@dataclass(frozen=True)
class DayConditions:
    """Each month's mean day on the array: irradiance and cell temperature (12 x steps)."""

    irradiance_w_m2: np.ndarray
    step_h: np.ndarray  # (12,)
    temp_day_c: np.ndarray  # (12,) daytime air temperature
    noct_c: float
    mismatch: float

    def cell_temp_c(self, g) -> np.ndarray:
        """Ross cell temperature at irradiance ``g`` (months first) [C]."""
        g = np.asarray(g, dtype=float)
        t = self.temp_day_c.reshape((12,) + (1,) * (g.ndim - 1))
        return cell_temperature_ross(t, g, self.noct_c)


@dataclass(frozen=True)
class DailyFlows:
    head_m: float  # duty head (at the day's peak flow)
    head_flow_m3_h: float  # the flow the duty head was taken at (the last peak flow)
    flow_m3_h: np.ndarray  # (..., steps)
    power_w: np.ndarray  # input power to the pump set (..., steps)
    volume_m3_day: np.ndarray  # (...)
    pump: PumpAtHead


@dataclass(frozen=True)
class WaterDesign:
    name: str
    static_level_m: float
    drawdown_m: float
    tank_height_m: float
    friction_m: float
    minor_loss_m: float
    total_dynamic_head_m: float
    peak_flow_m3_h: float
    velocity_m_s: float
    hydraulic_energy_kwh_day: float  # design month
    pump_set_efficiency: float  # hydraulic power / input power at the duty point
    start_power_w: float
    start_irradiance_w_m2: float
    series: int
    parallel: int
    module_count: int
    array_power_w: float
    string_voc_cold_v: float
    need_m3_day: tuple[float, ...]
    water_m3_day: tuple[float, ...]
    limiting_month: int  # 1-12
    pipe_suggested_mm: float  # smallest standard bore in the velocity and friction limits
    drop_cable_current_a: float
    drop_cable_size: str
    drop_cable_drop_pct: float
    tank_required_m3: float
    tank_size_m3: float
    tank_count: int
    day_irradiance_w_m2: tuple[float, ...]  # limiting month's mean day
    day_flow_m3_h: tuple[float, ...]
    day_step_h: float
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]
    cautions: tuple[str, ...]

    def to_dict(self) -> dict[str, Any]:
        d = asdict(self)
        d["reasons"] = {k: r.as_dict() for k, r in self.reasons.items()}
        d["notices"] = [asdict(n) for n in self.notices]
        d["cautions"] = list(self.cautions)
        for k, v in d.items():
            if isinstance(v, float) and not math.isfinite(v):
                raise ValueError(f"water.{k} is not finite")
        return d


def day_conditions(project, climate, supply, book: ReasonBook) -> DayConditions:
    """The array plane's mean-day irradiance and cell temperature of each month."""
    from offgrid.design.array_step import soiling_factor
    from offgrid.design.site_step import site_albedo
    from offgrid.design.sizing import site_geometry

    need = np.asarray(supply.need_m3_day, dtype=float)
    # the tilt search (when no tilt is set) weighs the months by the water need
    tilt, azimuth, sun = site_geometry(project, climate, book, need * 1000.0, [])
    g, step_h = daily_poa_profile(
        tuple(climate.insolation_kwh_m2_day),
        tuple(float(x) for x in sun["poa"]),
        project.site.latitude_deg,
        tilt,
        azimuth,
        site_albedo(project.site, climate),
    )
    d = project.choices.derates
    soiling, _how = soiling_factor(project.choices.derates)  # the same soiling as the power design
    g = np.asarray(g) * soiling
    t_mean = np.asarray(climate.temp_mean_c, dtype=float)
    t_max = np.asarray(climate.temp_max_c, dtype=float) if climate.temp_max_c else t_mean + 5.0
    t_day = (t_mean + t_max) / 2.0
    return DayConditions(
        g, np.asarray(step_h, dtype=float), t_day, float(project.module.noct_c), d.mismatch
    )


def input_power_w(params, supply, cond_g, cond_tc, layout: ArrayLayout, pump: PumpAtHead, mism):
    """Power into the pump set at every step [W] for a layout, at the pump's head."""
    sp = supply.pump
    if sp.drive == "direct":
        line_v, line_i = motor_line(pump)
        v, i = direct_operating_point(params, cond_g, cond_tc, layout, line_v, line_i / mism)
        return v * i * mism
    p = controller_input_power_w(params, cond_g, cond_tc, layout, sp.min_input_v) * mism
    return np.minimum(p * sp.controller_efficiency, pump.max_power_w)


def daily_flows(
    params, supply, cond: DayConditions, layout: ArrayLayout, g=None, field: str = "water[1].pump"
) -> DailyFlows:
    """Flow through each month's mean day at the duty head, iterated with the peak flow.

    ``g`` (months first, steps last) replaces the mean days' irradiance; ``field`` is the
    pump's project path, named when the pump cannot lift the head."""
    g = cond.irradiance_w_m2 if g is None else g
    tc = cond.cell_temp_c(g)
    q_peak = 0.0
    p_fixed = None
    if supply.pump.drive == "controller":  # the array's MPP does not depend on the head
        pump = pump_at_head(supply.pump, float(hy.total_dynamic_head_m(supply, 0.0)), field)
        p_fixed = input_power_w(params, supply, g, tc, layout, pump, cond.mismatch)
    for _ in range(HEAD_ITERATIONS):
        q_head = q_peak
        head = float(hy.total_dynamic_head_m(supply, q_head))
        pump = pump_at_head(supply.pump, head, field)
        if p_fixed is None:
            p = input_power_w(params, supply, g, tc, layout, pump, cond.mismatch)
        else:
            p = p_fixed
        q = flow_at_power_m3_h(pump, p)
        new_peak = float(q.max()) if q.size else 0.0
        if abs(new_peak - q_peak) < 1e-3:
            q_peak = new_peak
            break
        q_peak = new_peak
    step = cond.step_h.reshape((12,) + (1,) * (q.ndim - 1))
    vol = (q * step).sum(axis=-1)
    return DailyFlows(head, q_head, q, p, vol, pump)


def start_irradiance_w_m2(params, supply, cond: DayConditions, layout, pump: PumpAtHead, month):
    """Lowest plane irradiance [W/m2] at which water flows, at the month's day temperature."""
    grid = np.linspace(1.0, 1200.0, 600)
    tc = cell_temperature_ross(cond.temp_day_c[month], grid, cond.noct_c)
    p = input_power_w(params, supply, grid, tc, layout, pump, cond.mismatch)
    on = p > pump.start_power_w
    return float(grid[np.argmax(on)]) if on.any() else float("inf")


def _layouts(params: DiodeParams, project, supply, cond: DayConditions, t_low: float):
    """Series counts inside the pump's voltage window, with the cold string Voc."""
    m = project.module
    sp = supply.pump
    voc_cold, rule = voc_cold_v(m.voc_v, m.beta_voc_pct_per_c, t_low)
    hot = int(np.argmax(cond.temp_day_c))
    vmp_hot, _, _ = module_mpp(
        params, 1000.0, cell_temperature_ross(cond.temp_day_c[hot], 1000.0, m.noct_c)
    )
    vmp_hot = float(vmp_hot)
    s_max = math.floor(sp.max_input_v / voc_cold)
    s_min = 1
    if sp.drive == "controller":
        s_min = max(1, math.ceil(sp.min_input_v / vmp_hot))
    if s_max < s_min:
        raise DesignError(
            "pump-window",
            f"no series count of the module fits the pump's input window "
            f"{sp.min_input_v:g}-{sp.max_input_v:g} V (module cold Voc {voc_cold:.1f} V, "
            f"hot Vmp {vmp_hot:.1f} V): choose a pump controller with a wider window or "
            "another module",
            "water.pump.max_input_v",
        )
    return list(range(s_min, s_max + 1)), voc_cold, rule, vmp_hot


def suggested_pipe_mm(supply, flow_m3_h: float) -> float:
    """Smallest standard bore keeping the velocity at most 2 m/s and the friction at most 10 %
    of the static lift at ``flow_m3_h`` (the largest listed if none does)."""
    from dataclasses import replace

    lift = supply.static_level_m + supply.tank_height_m
    for bore in PIPE_BORES_MM:
        trial = replace(supply, pipe_diameter_mm=bore)
        v = float(hy.velocity_m_s(flow_m3_h, bore / 1000.0))
        if v <= hy.VELOCITY_HIGH_M_S and float(
            hy.friction_head_m(trial, flow_m3_h)
        ) <= FRICTION_SHARE_LIMIT * max(lift, 1.0):
            return bore
    return PIPE_BORES_MM[-1]


def drop_cable(project, supply, current_a: float, voltage_v: float) -> tuple[str, float]:
    """Smallest conductor of the project's wire units keeping the two-wire drop of the drop
    cable within 3 % at ``current_a`` and ``voltage_v``: (size name, drop %)."""
    from offgrid.design.wiring import resistance_ohm_per_km, sizes_for, voltage_drop_v

    w = project.wiring
    sizes = sizes_for(w.units)
    drop = 0.0
    for size in sizes:
        try:
            r = resistance_ohm_per_km(size, w.material, w.conductor_temp_c)
        except DesignError:
            continue
        drop = 100.0 * float(voltage_drop_v(current_a, supply.drop_cable_m, r)) / voltage_v
        if drop <= DROP_CABLE_LIMIT_PCT:
            return size.name, drop
    return sizes[-1].name, drop


def standard_tank(required_m3: float) -> tuple[float, int]:
    """The smallest standard size that holds ``required_m3``, or several of the largest."""
    for size in TANK_SIZES_M3:
        if size >= required_m3 - 1e-9:
            return size, 1
    big = TANK_SIZES_M3[-1]
    return big, math.ceil(required_m3 / big)


def water_design(project, index: int = 0, base: Path | None = None) -> WaterDesign:
    """Size ``project.water[index]``; DesignError when the water cannot be delivered."""
    from offgrid.design.sizing import check_months_typed, resolve_climate

    if not project.water:
        raise DesignError("no-water", "the project has no [[water]] supply: add one", "water")
    supply = project.water[index]
    where = f"water[{index + 1}]"
    book = ReasonBook()
    notices: list[Notice] = []
    climate = resolve_climate(project, base)
    check_months_typed(climate)  # no pump sized on placeholders
    params = fit_module(project.module)
    cond = day_conditions(project, climate, supply, book)
    t_mean = np.asarray(climate.temp_mean_c, dtype=float)
    t_low = (
        float(climate.record_low_c)
        if climate.record_low_c is not None
        else float(min(climate.temp_min_c)) - 5.0
        if climate.temp_min_c
        else float(t_mean.min()) - 10.0
    )
    need = np.asarray(supply.need_m3_day, dtype=float)
    series_options, voc_cold, voc_rule, vmp_hot = _layouts(params, project, supply, cond, t_low)

    best = None
    over_yield = None
    for s in series_options:
        for p in range(1, MAX_PARALLEL + 1):
            lay = ArrayLayout(s, p)
            if best is not None and lay.modules >= best[0].modules:
                break
            fl = daily_flows(params, supply, cond, lay, field=f"{where}.pump")
            peak = float(fl.flow_m3_h.max())
            if peak > supply.safe_yield_m3_h + 1e-9:
                over_yield = over_yield or (lay, fl)
                break
            if np.all(fl.volume_m3_day >= need - 1e-9):
                best = (lay, fl)
                break
    if best is None:
        if over_yield is not None:
            lay, fl = over_yield
            raise DesignError(
                "borehole-yield",
                f"the need cannot be pumped within the borehole's safe yield "
                f"{supply.safe_yield_m3_h:g} m3/h: an array of {lay.modules} modules already "
                f"peaks at {fl.flow_m3_h.max():.2f} m3/h and still falls short; lower the "
                "need, add a second source, or (after a new pumping test) raise the yield",
                f"{where}.safe_yield_m3_h",
            )
        raise DesignError(
            "pump-too-small",
            f"the pump cannot deliver the need in every month even at its highest datasheet "
            f"power {supply.pump.power_points_w[-1]:g} W with {MAX_PARALLEL} strings: choose "
            "a larger pump or lower the need",
            f"{where}.pump.power_points_w",
        )
    lay, fl = best
    cover = np.divide(fl.volume_m3_day, need, out=np.full(12, np.inf), where=need > 0)
    lim = int(np.argmin(cover))
    q_peak = float(fl.flow_m3_h.max())
    head = fl.head_m
    q_h = fl.head_flow_m3_h  # the head's parts at the flow it was taken at
    d = supply.pipe_diameter_mm / 1000.0
    friction = float(hy.friction_head_m(supply, q_h))
    minor = float(hy.minor_loss_head_m(q_h, d, supply.minor_loss_k))
    drawdown = float(hy.drawdown_at_m(q_h, supply.drawdown_m, supply.drawdown_test_m3_h))
    vel = float(hy.velocity_m_s(q_peak, d))
    e_hyd = float(hy.hydraulic_energy_wh(fl.volume_m3_day[lim], head)) / 1000.0
    k = int(np.argmax(fl.flow_m3_h[lim]))
    p_duty = float(fl.power_w[lim, k])
    q_duty = float(fl.flow_m3_h[lim, k])
    eff = hy.WH_PER_M3_M * q_duty * head / p_duty if p_duty > 0 else 0.0
    g_start = start_irradiance_w_m2(params, supply, cond, lay, fl.pump, lim)
    pipe_mm = suggested_pipe_mm(supply, q_peak)
    i_pump = float(np.max(fl.power_w)) / max(float(lay.series) * vmp_hot, 1.0)
    cable_size, cable_drop = drop_cable(project, supply, i_pump, lay.series * vmp_hot)
    tank_req = supply.autonomy_days * float(need.max())
    tank_size, tank_n = standard_tank(tank_req)
    array_w = lay.modules * project.module.pmax_w

    # reasons
    m = MONTHS[lim]
    book.add(
        "water.total_dynamic_head_m",
        "static level + drawdown at the peak flow + tank height + friction + fittings",
        "common practice, no source (sum of heads); drawdown linear in the rate",
        static=fmt(supply.static_level_m, "m"),
        drawdown=fmt(drawdown, "m"),
        tank=fmt(supply.tank_height_m, "m"),
        friction=fmt(friction, "m"),
        fittings=fmt(minor, "m"),
    )
    if supply.friction_method == "hazen_williams":
        fsrc = "Hazen-Williams, SI form (from memory), C by material (from memory)"
    else:
        fsrc = "Darcy-Weisbach with the Swamee & Jain (1976) friction factor, eq. 5"
    book.add(
        "water.friction_m",
        "pipe friction head at the peak flow",
        fsrc,
        flow=fmt(q_peak, "m3/h"),
        length=fmt(supply.pipe_length_m, "m"),
        diameter=fmt(supply.pipe_diameter_mm, "mm"),
        material=supply.pipe_material,
    )
    book.add(
        "water.minor_loss_m",
        "K v^2 / (2 g)",
        "common practice, no source",
        K=fmt(supply.minor_loss_k),
        velocity=fmt(vel, "m/s"),
    )
    book.add(
        "water.velocity_m_s",
        "peak flow / pipe bore area",
        "continuity; band 0.5-2 m/s common practice, no source",
        flow=fmt(q_peak, "m3/h"),
        diameter=fmt(supply.pipe_diameter_mm, "mm"),
    )
    book.add(
        "water.hydraulic_energy_kwh_day",
        "rho g V H / 3.6e6 (2.725 Wh per m3 per m)",
        "physics: potential energy of the lifted water, rho = 1000 kg/m3, g = 9.81 m/s2",
        volume=fmt(float(fl.volume_m3_day[lim]), "m3/day"),
        head=fmt(head, "m"),
        month=m,
    )
    book.add(
        "water.pump_set_efficiency",
        "hydraulic power / input power at the noon duty point",
        "physics, with the datasheet's flow at the input power",
        flow=fmt(q_duty, "m3/h"),
        head=fmt(head, "m"),
        power=fmt(p_duty, "W"),
    )
    how = (
        "array I-V curve meets the motor's current-voltage line (bisection on the diode voltage)"
        if supply.pump.drive == "direct"
        else "array maximum power inside the controller window x controller efficiency"
    )
    book.add(
        "water.water_m3_day",
        f"sum over the mean day's steps of the pump's flow at its input power; {how}",
        "De Soto et al. (2006) single-diode model; Collares-Pereira & Rabl (1979) day profile; "
        "pump datasheet points",
        layout=f"{lay.series} x {lay.parallel}",
        head=fmt(head, "m"),
    )
    book.add(
        "water.limiting_month",
        "month whose delivered water covers its need least",
        "common practice, no source",
        month=m,
        cover=fmt(float(cover[lim]) * 100.0, "%"),
    )
    book.add(
        "water.start_irradiance_w_m2",
        "lowest plane irradiance giving the pump its start-up power",
        "pump datasheet (first segment extended to zero flow)",
        start_power=fmt(fl.pump.start_power_w, "W"),
        month=m,
    )
    book.add(
        "water.module_count",
        "fewest modules (series x parallel) whose water meets the need in every month with the "
        "peak flow within the safe yield",
        "common practice, no source; series count inside the pump's window (NEC 690.7 cold Voc)",
        cold_voc=f"{voc_cold:.1f} V ({voc_rule})",
        window=f"{supply.pump.min_input_v:g}-{supply.pump.max_input_v:g} V",
        safe_yield=fmt(supply.safe_yield_m3_h, "m3/h"),
    )
    book.add(
        "water.tank_size_m3",
        "days of water x largest daily need, rounded up to a standard size",
        "common practice, no source (tank sizes)",
        days=fmt(supply.autonomy_days, "days"),
        need=fmt(float(need.max()), "m3/day"),
    )
    book.given("water.static_level_m", f"{where}.static_level_m", fmt(supply.static_level_m, "m"))
    book.given("water.tank_height_m", f"{where}.tank_height_m", fmt(supply.tank_height_m, "m"))
    book.given("water.need_m3_day", f"{where}.need_m3_day", "twelve monthly values")
    book.add(
        "water.drawdown_m",
        "drawdown at the test rate x flow / test rate",
        "common practice, no source (linear drawdown; a step test is better)",
        test_drawdown=fmt(supply.drawdown_m, "m"),
        test_rate=fmt(supply.drawdown_test_m3_h, "m3/h"),
        flow=fmt(q_h, "m3/h"),
    )
    book.add(
        "water.peak_flow_m3_h",
        "largest flow over the twelve mean days",
        "pump datasheet at the input power of each step",
        safe_yield=fmt(supply.safe_yield_m3_h, "m3/h"),
    )
    book.add(
        "water.start_power_w",
        "input power where the datasheet's flow at this head reaches zero",
        "pump datasheet (first segment extended to zero flow)",
        head=fmt(head, "m"),
    )
    for name in ("series", "parallel"):
        book.add(
            f"water.{name}",
            "the layout of the fewest modules (see water.module_count)",
            "common practice, no source",
            layout=f"{lay.series} x {lay.parallel}",
        )
    book.add(
        "water.array_power_w",
        "modules x module rated power",
        "module datasheet",
        modules=str(lay.modules),
        module=fmt(project.module.pmax_w, "W"),
    )
    book.add(
        "water.string_voc_cold_v",
        "series count x module Voc at the record low",
        f"NEC 690.7 ({voc_rule})",
        series=str(lay.series),
        voc_cold=fmt(voc_cold, "V"),
        record_low=fmt(t_low, "C"),
    )
    book.add(
        "water.tank_required_m3",
        "days of water x largest daily need",
        "common practice, no source",
        days=fmt(supply.autonomy_days, "days"),
        need=fmt(float(need.max()), "m3/day"),
    )
    book.add(
        "water.tank_count",
        "tanks of the standard size to hold the required volume",
        "common practice, no source",
        required=fmt(tank_req, "m3"),
    )
    book.add(
        "water.drop_cable_current_a",
        "largest input power / (series x module hot Vmp)",
        "common practice, no source (DC side of the pump)",
        power=fmt(float(np.max(fl.power_w)), "W"),
        voltage=fmt(lay.series * vmp_hot, "V"),
    )
    book.add(
        "water.drop_cable_drop_pct",
        "2 L I R / V x 100 for the chosen conductor",
        "two-wire DC drop (common practice)",
        size=cable_size,
        limit=fmt(DROP_CABLE_LIMIT_PCT, "%"),
    )
    if vel > hy.VELOCITY_HIGH_M_S:
        notices.append(
            Notice(
                "pipe-velocity",
                f"the pipe velocity at the peak flow is {vel:.2f} m/s, above the usual "
                f"{hy.VELOCITY_HIGH_M_S:g} m/s: use a larger pipe ({pipe_mm:g} mm)",
                "warning",
                f"{where}.pipe_diameter_mm",
            )
        )
    elif vel < hy.VELOCITY_LOW_M_S:
        notices.append(
            Notice(
                "pipe-velocity",
                f"the pipe velocity at the peak flow is {vel:.2f} m/s, below "
                f"{hy.VELOCITY_LOW_M_S:g} m/s: sediment can settle; fit a scour valve at the "
                "low points and flush the main",
                "info",
                f"{where}.pipe_diameter_mm",
            )
        )
    if friction > FRICTION_SHARE_LIMIT * head:
        notices.append(
            Notice(
                "pipe-friction",
                f"friction is {friction:.1f} m of the {head:.1f} m head: a larger pipe saves "
                "array power",
                "warning",
                f"{where}.pipe_diameter_mm",
            )
        )
    if q_peak > 0.8 * supply.safe_yield_m3_h:
        notices.append(
            Notice(
                "near-yield",
                f"the peak flow {q_peak:.2f} m3/h is above 80 % of the safe yield "
                f"{supply.safe_yield_m3_h:g} m3/h: watch the water level in the first dry season",
                "warning",
                f"{where}.safe_yield_m3_h",
            )
        )
    book.add(
        "water.pipe_suggested_mm",
        "smallest standard bore with velocity <= 2 m/s and friction <= 10 % of the static lift "
        "at the peak flow",
        "common practice, no source (limits and bores)",
        flow=fmt(q_peak, "m3/h"),
        lift=fmt(supply.static_level_m + supply.tank_height_m, "m"),
    )
    book.add(
        "water.drop_cable_size",
        "smallest conductor with 2 L I R <= 3 % of the string's hot Vmp",
        "two-wire DC drop (common practice); resistances as in offgrid.design.wiring",
        current=fmt(i_pump, "A"),
        length=fmt(supply.drop_cable_m, "m"),
        voltage=fmt(lay.series * vmp_hot, "V"),
    )
    if pipe_mm < supply.pipe_diameter_mm - 1e-9 or pipe_mm > supply.pipe_diameter_mm + 1e-9:
        notices.append(
            Notice(
                "pipe-suggested",
                f"a {pipe_mm:g} mm bore would keep velocity and friction in range at this flow "
                f"(the project has {supply.pipe_diameter_mm:g} mm)",
                "info",
                f"{where}.pipe_diameter_mm",
            )
        )
    cautions = water_cautions(
        supply, i_pump, voc_cold * lay.series, f"{cable_size} ({cable_drop:.1f} % drop)"
    )
    return WaterDesign(
        name=supply.name,
        static_level_m=supply.static_level_m,
        drawdown_m=drawdown,
        tank_height_m=supply.tank_height_m,
        friction_m=friction,
        minor_loss_m=minor,
        total_dynamic_head_m=head,
        peak_flow_m3_h=q_peak,
        velocity_m_s=vel,
        hydraulic_energy_kwh_day=e_hyd,
        pump_set_efficiency=float(eff),
        start_power_w=fl.pump.start_power_w,
        start_irradiance_w_m2=g_start,
        series=lay.series,
        parallel=lay.parallel,
        module_count=lay.modules,
        array_power_w=array_w,
        string_voc_cold_v=voc_cold * lay.series,
        need_m3_day=tuple(float(x) for x in need),
        water_m3_day=tuple(float(x) for x in fl.volume_m3_day),
        limiting_month=lim + 1,
        pipe_suggested_mm=pipe_mm,
        drop_cable_current_a=i_pump,
        drop_cable_size=cable_size,
        drop_cable_drop_pct=cable_drop,
        tank_required_m3=tank_req,
        tank_size_m3=tank_size,
        tank_count=tank_n,
        day_irradiance_w_m2=tuple(float(x) for x in cond.irradiance_w_m2[lim]),
        day_flow_m3_h=tuple(float(x) for x in fl.flow_m3_h[lim]),
        day_step_h=float(cond.step_h[lim]),
        reasons=book.freeze(),
        notices=tuple(notices),
        cautions=cautions,
    )
