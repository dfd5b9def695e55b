"""The worst-month sizing pipeline: ``design(project) -> SystemDesign``.

Pure: no UI, no files written.  Every figure is recorded with its reason.

Chain, in order (each step its own function below):

1. climate and monthly plane-of-array insolation (Liu-Jordan / Klein, :mod:`offgrid.climate.sky`);
2. loads at the battery by month (:mod:`offgrid.design.loads`);
3. design month = largest ratio of daily demand to plane-of-array insolation;
4. array power = design-month demand / (peak sun hours x temperature x soiling x mismatch x
   wiring x controller x battery round trip), each derate shown on its own;
5. system voltage, modules in series x parallel;
6. battery bank for the days of autonomy at the maximum depth of discharge, corrected for
   temperature, ageing and discharge efficiency;
7. charge-controller current with the code's continuous factors, next standard rating;
8. inverter continuous and surge rating.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np

from offgrid.climate import sky
from offgrid.climate.files import ClimateFileError, load_climate
from offgrid.climate.model import MonthlyClimate
from offgrid.design.battery import CHEMISTRIES, capacity_temperature_factor, units_in_series
from offgrid.design.cautions import DEFERS_TO_CODE  # noqa: F401  (re-exported)
from offgrid.design.loads import analyse_loads
from offgrid.design.pv import cell_temperature_ross
from offgrid.design.result import (
    ArrayResult,
    BatteryResult,
    ControllerResult,
    DesignError,
    InverterResult,
    LoadResult,
    Notice,
    ReasonBook,
    SiteResult,
    SystemDesign,
    fmt,
)
from offgrid.project.model import Project

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
#: Common charge-controller current ratings, A (common practice, no source).
CONTROLLER_RATINGS_A = (10, 15, 20, 30, 40, 50, 60, 80, 100)
#: Common inverter continuous ratings, W (common practice, no source).
INVERTER_RATINGS_W = (
    150,
    300,
    500,
    800,
    1000,
    1500,
    2000,
    3000,
    4000,
    5000,
    6000,
    8000,
    10000,
    12000,
    15000,
)
#: Surge an inverter carries for a few seconds, as a multiple of its continuous rating.
INVERTER_SURGE_MULTIPLE = 2.0
#: Auto system-voltage rule: the lowest of 12/24/48 V that keeps the larger of array and
#: inverter power at or below this current (common practice, no source).
AUTO_VOLTAGE_MAX_CURRENT_A = 100.0
NEC_CONTINUOUS = 1.25  # NEC 690.8(A)(1) and 690.8(B)(1), NFPA 70-2023
#: More charge controllers than this on one battery bus is refused (common practice, no
#: source: a system that large wants a higher voltage or splitting).
MAX_CONTROLLERS = 20
#: The chosen controller's harvest may fall this far below the demand before modules are
#: added (the derate chain and the I-V curves are both estimates; common practice, no source).
HARVEST_SHORTFALL_TOLERANCE_PCT = 0.5
LOW_SUN_KWH_M2_DAY = 1.5  # below it the monthly transposition is unreliable (test_climate_poa)


def resolve_climate(project: Project, base: Path | None = None) -> MonthlyClimate:
    """The project's climate table, inline or from a climate file."""
    if project.climate.inline is not None:
        return project.climate.inline
    if project.climate.ref:
        try:
            return load_climate(project.climate.ref, base)
        except ClimateFileError as exc:
            raise DesignError("climate-missing", str(exc), "climate.ref") from exc
    raise DesignError(
        "climate-missing",
        "the project has no climate: pick a bundled climate or type twelve monthly values",
        "climate",
    )


def next_rating(value: float, ratings: tuple[float, ...]) -> float | None:
    for r in ratings:
        if r >= value - 1e-9:
            return r
    return None


def _tuple(a) -> tuple[float, ...]:
    return tuple(float(x) for x in np.asarray(a, dtype=float))


def _check_climate(c: MonthlyClimate) -> None:
    """DesignError naming the field when the climate table is incomplete or implausible."""
    from offgrid.climate.files import monthly_climate_problems

    for key in ("insolation_kwh_m2_day", "temp_mean_c"):
        values = getattr(c, key)
        if values is None or len(values) != 12:
            raise DesignError(
                "climate-months",
                f"climate.{key}: needs 12 monthly values, has "
                f"{0 if values is None else len(values)}",
                f"climate.{key}",
            )
    problems = monthly_climate_problems(c)
    if problems:
        path, message = problems[0]
        raise DesignError("climate-months", f"{path}: {message}", path)


def site_albedo(project: Project, climate: MonthlyClimate):
    """Ground reflectance in force: the site's wins, else the climate file's, else None (0.2).

    One value or twelve (January first), as given.
    """
    site = project.site
    return site.albedo if site.albedo is not None else getattr(climate, "albedo", None)


def site_geometry(
    project: Project,
    climate: MonthlyClimate,
    book: ReasonBook,
    demand_wh_day=None,
    notices: list[Notice] | None = None,
):
    """Tilt, azimuth and monthly plane-of-array insolation.

    With no tilt set, the tilt is searched to serve the worst month of supply
    against ``demand_wh_day`` best (:func:`offgrid.climate.tilt.best_tilt`).
    A horizon profile on the site removes beam while the sun is behind it.
    """
    from offgrid.climate.poa import poa_monthly
    from offgrid.climate.tilt import (
        TILT_FORMULA,
        TILT_SOURCE,
        best_tilt,
        describe_tilt,
        tilt_reason_inputs,
    )

    site = project.site
    lat = site.latitude_deg
    albedo = site_albedo(project, climate)
    azimuth = site.azimuth_deg if site.azimuth_deg is not None else sky.equator_facing_azimuth(lat)
    book.add(
        "site.azimuth_deg",
        "equator-facing unless set (clockwise from north)",
        "common practice, no source",
        azimuth=fmt(azimuth, "deg"),
    )
    horizon = list(site.horizon_deg or [])
    tilt = site.tilt_deg
    if tilt is None:
        choice = best_tilt(
            climate.insolation_kwh_m2_day,
            lat,
            azimuth,
            demand_wh_day,
            albedo,
            project.choices.min_tilt_deg,
            horizon=horizon,
            longitude_deg=site.longitude_deg,
            elevation_m=site.elevation_m,
        )
        tilt = choice.tilt_deg
        book.add("site.tilt_deg", TILT_FORMULA, TILT_SOURCE, **tilt_reason_inputs(choice))
        if notices is not None:
            notices.append(Notice("tilt-searched", describe_tilt(choice), "info", "site.tilt_deg"))
    else:
        book.add("site.tilt_deg", "set by the user", "project file", tilt=fmt(tilt, "deg"))
    res = poa_monthly(
        climate.insolation_kwh_m2_day,
        lat,
        tilt,
        azimuth,
        albedo,
        horizon=horizon,
        longitude_deg=site.longitude_deg,
        elevation_m=site.elevation_m,
    )
    inputs = {
        "tilt": fmt(tilt, "deg"),
        "azimuth": fmt(azimuth, "deg"),
        "albedo": (
            fmt(float(res.albedo[0]))
            if np.all(res.albedo == res.albedo[0])
            else sky.describe_albedo(albedo)
        ),
        "latitude": fmt(lat, "deg"),
    }
    formula = (
        "H (1 - Hd/H) Rb + Hd (1 + cos tilt)/2 + H albedo (1 - cos tilt)/2 on Klein's "
        "mean day of each month; Hd/H from the Erbs monthly correlation"
    )
    source = (
        "Liu & Jordan (1962) isotropic sky with Klein (1977) Rb; Erbs, Klein & Duffie "
        "(1982); Duffie & Beckman 4th ed. sec. 2.19"
    )
    if res.capped is not None and res.capped.any():
        from offgrid.climate.checks import MONTHS

        held = [m for m in range(12) if res.capped[m]]
        formula += "; held at the clearest-sky insolation on the plane in " + ", ".join(
            MONTHS[m] for m in held
        )
        source += (
            "; ceiling: Ineichen & Perez (2002) clear sky at the Linke turbidity of "
            "Ineichen (2008) with no aerosol and 0.2 cm water vapour"
        )
        if notices is not None:
            notices.append(
                Notice(
                    "poa-capped",
                    "In "
                    + ", ".join(
                        f"{MONTHS[m]} ({res.uncapped_kwh_m2_day[m]:.2f} -> "
                        f"{res.poa_kwh_m2_day[m]:.2f} kWh/m2/day)"
                        for m in held
                    )
                    + " the monthly transposition gave more sun on the array than cloudless days "
                    "in the clearest plausible air could bring to it (the noon sun is low over the "
                    "horizon); the array-plane value is held at that ceiling. Treat these months "
                    "as uncertain and confirm them with measured or hourly data.",
                    "warning",
                    "site.poa_kwh_m2_day",
                )
            )
    if horizon:
        lost = float((res.beam_lost_kwh_m2_day * sky.DAYS_IN_MONTH).sum())
        total = float(((res.poa_kwh_m2_day + res.beam_lost_kwh_m2_day) * sky.DAYS_IN_MONTH).sum())
        formula += (
            "; beam term x the share of the plane's beam with the sun above the horizon profile"
        )
        source += "; sun positions: Reda & Andreas (2004) SPA through pvlib"
        inputs["horizon"] = ", ".join(f"{a:g}:{e:g}" for a, e in horizon)
        inputs["horizon loss"] = fmt(100.0 * lost / total if total > 0 else 0.0, "% a year")
        from offgrid.climate.horizon import sky_share_blocked

        hidden = sky_share_blocked(horizon)
        if hidden > 0.10 and notices is not None:
            notices.append(
                Notice(
                    "horizon-diffuse",
                    f"The horizon profile hides about {hidden:.0%} of the sky's "
                    "diffuse light (on a level surface); only the sun's direct beam is removed "
                    "behind it, so the array-plane insolation reads high by up to about that share "
                    "of its diffuse part. Allow a margin for a deep valley or tall obstructions.",
                    "warning",
                    "site.poa_kwh_m2_day",
                )
            )
    book.add("site.poa_kwh_m2_day", formula, source, **inputs)
    return (
        float(tilt),
        float(azimuth),
        {
            "poa": res.poa_kwh_m2_day,
            "kt": res.kt,
            "diffuse_fraction": res.diffuse_fraction,
            "rb": res.rb,
            "horizon_factor": res.horizon_factor,
        },
    )


def energy_weighted_irradiance(poa_kwh_m2_day, daylight_h):
    """Energy-weighted mean irradiance [W/m2] of a half-sine day: pi^2 H / (8 N).

    For G(t) = Gpk sin(pi t/N), H = 2 Gpk N/pi and the energy-weighted mean
    integral(G^2)/integral(G) = pi Gpk/4 (common practice derivation, no source).
    """
    n = np.clip(np.asarray(daylight_h, dtype=float), 1.0, 24.0)
    return np.pi**2 * np.asarray(poa_kwh_m2_day, dtype=float) * 1000.0 / (8.0 * n)


def design(project: Project, base: Path | None = None) -> SystemDesign:
    """Size the system for the worst month.  Raises :class:`DesignError` if it cannot be met."""
    book = ReasonBook()
    notices: list[Notice] = []
    climate = resolve_climate(project, base)
    _check_climate(climate)
    choices = project.choices
    if not project.loads or all(
        ld.quantity * ld.power_w * ld.hours_per_day * ld.duty_cycle == 0 for ld in project.loads
    ):
        raise DesignError(
            "no-loads",
            "the load list is empty (or every load uses 0 Wh): add the "
            "appliances with their power and hours per day",
            "loads",
        )

    # 2. loads (first: the tilt search weighs the months by their demand)
    lr = analyse_loads(
        project.loads, project.inverter, choices.load_growth_pct, choices.coincidence_factor, book
    )
    demand = np.asarray(lr.daily_energy_wh)

    # 1. sun
    tilt, azimuth, sun = site_geometry(project, climate, book, demand, notices)
    poa = np.asarray(sun["poa"])
    horiz = np.asarray(climate.insolation_kwh_m2_day, dtype=float)

    # 3. design month
    dark = (poa < 0.05) & (demand > 0)
    if dark.any():
        names = ", ".join(MONTHS[i] for i in np.flatnonzero(dark))
        raise DesignError(
            "no-sun",
            f"no usable sun in {names} (polar night or zero insolation) "
            "while loads run: a PV-only system cannot carry them; remove those "
            "months from the loads or add another source",
            "climate",
        )
    ratio = np.divide(demand, poa, out=np.zeros_like(demand), where=poa > 0)
    # A first design month from demand / sun alone; the array sizing below replaces it by the
    # month whose derated supply covers its demand least (cell temperature, PWM operating
    # point), and sizes the array on that month.
    dm = int(np.argmax(ratio))
    lr = _with_design_energy(lr, float(demand[dm]))

    # temperatures
    t_mean = np.asarray(climate.temp_mean_c, dtype=float)
    t_max = np.asarray(climate.temp_max_c, dtype=float) if climate.temp_max_c else t_mean + 5.0
    t_day = (t_mean + t_max) / 2.0
    if climate.record_low_c is not None:
        t_low = float(climate.record_low_c)
        low_src = "record low of the climate file"
    else:
        if climate.temp_min_c:
            t_low = float(min(climate.temp_min_c)) - 5.0
            low_src = "coldest monthly mean minimum - 5 C (no record low given; common practice)"
            basis = "the coldest monthly mean minimum - 5 C"
        else:
            t_low = float(t_mean.min()) - 10.0
            low_src = "coldest monthly mean - 10 C (no minima given; common practice)"
            basis = "the coldest monthly mean - 10 C"
        notices.append(
            Notice(
                "record-low-estimated",
                f"The climate has no record low temperature; {t_low:.0f} C "
                f"({basis}) is assumed for the cold open-circuit voltage, and real record lows are "
                "often 10-20 C colder. Enter the site's record low (the NEC 690.7(A) informational "
                "note points to the ASHRAE extreme annual mean minimum design temperature, from "
                "memory) so the strings stay within the controller's voltage.",
                "warning",
                "site.record_low_c",
            )
        )

    site = SiteResult(
        design_month=dm + 1,
        tilt_deg=tilt,
        azimuth_deg=azimuth,
        latitude_deg=project.site.latitude_deg,
        horizontal_kwh_m2_day=_tuple(horiz),
        poa_kwh_m2_day=_tuple(poa),
        demand_to_sun=_tuple(ratio),
        temp_mean_c=_tuple(t_mean),
        temp_day_c=_tuple(t_day),
        record_low_c=t_low,
        climate_source=climate.source,
        albedo=_tuple(sky.monthly_albedo(site_albedo(project, climate))),
    )
    book.add(
        "site.record_low_c", "lowest temperature used for the cold open-circuit voltage", low_src
    )
    book.given("site.latitude_deg", "site.latitude_deg", fmt(project.site.latitude_deg, "deg"))
    src = climate.source or "the climate"
    which = (
        "the site's own value"
        if project.site.albedo is not None
        else "the climate file's value"
        if getattr(climate, "albedo", None) is not None
        else "the usual 0.2 for ground without snow"
    )
    book.add(
        "site.albedo",
        "ground reflectance of each month: " + which,
        "common practice, no source" if which.startswith("the usual") else "project file",
        albedo=sky.describe_albedo(site_albedo(project, climate)),
    )
    book.add(
        "site.horizontal_kwh_m2_day",
        "mean daily global horizontal insolation of each month, from the climate",
        src,
    )
    book.add("site.temp_mean_c", "mean air temperature of each month, from the climate", src)
    book.add(
        "site.temp_day_c",
        "daytime air temperature: (monthly mean + mean daily maximum)"
        " / 2" + ("" if climate.temp_max_c else "; no maxima given, maximum taken as mean + 5 C"),
        "common practice, no source",
    )
    book.add(
        "site.demand_to_sun",
        "daily demand at the battery / plane-of-array insolation, "
        "each month (Wh per kWh/m2); before the month's derates (the design month is the "
        "least-covered month after them, see site.design_month)",
        "worst-month method, common practice",
    )

    # 4-5. array
    k_array = len(notices)
    arr_notices: list[Notice] = []
    from offgrid.design.pv import fit_module

    params = fit_module(project.module)  # once per design: the window and the curves share it
    array, ctrl, system_v, batt_abs_v, dm = _size_array(
        project, site, lr, sun, book, arr_notices, t_low, params=params
    )
    site = replace(site, design_month=dm + 1)
    lr = _with_design_energy(lr, float(demand[dm]))
    with np.errstate(over="ignore"):
        cover = np.divide(
            np.asarray(array.supply_wh_day), demand, out=np.full(12, np.inf), where=demand > 0
        )
    book.add(
        "site.design_month",
        "the month whose supply, with every derate of that month "
        "(cell temperature, PWM operating point, soiling ...), covers its demand least: "
        "the largest demand / (plane-of-array insolation x the month's derate chain); the "
        "array is sized on it, so every other month is covered too",
        "worst-month method, common practice",
        month=MONTHS[dm],
        supply_over_demand=fmt(float(cover[dm])),
        next_least=_next_least(cover, dm),
    )
    if horiz[dm] < LOW_SUN_KWH_M2_DAY and tilt > 15.0:
        notices.insert(
            k_array,
            Notice(
                "low-sun-month",
                f"In {MONTHS[dm]}, the design month, the horizontal insolation is "
                f"only {horiz[dm]:.2f} kWh/m2/day: in such dark months the monthly transposition "
                "to "
                f"a {tilt:.0f} deg plane can read 20-50 % high (against an hourly sky model on "
                "typical-year weather at 55-65 N). Allow a margin of modules, or check the month "
                "with an hourly model of the site's weather.",
                "warning",
                "site.poa_kwh_m2_day",
            ),
        )
        k_array += 1
    book.add(
        "loads.design_daily_energy_wh",
        "daily energy at the battery in the design month",
        "worst-month method",
        month=MONTHS[dm],
    )
    # 6. battery
    battery = _size_battery(project, lr, system_v, batt_abs_v, t_mean, book, notices)
    # 8. inverter
    inverter = _size_inverter(project, lr, system_v, book, notices)

    if lr.inverter_idle_wh > 0.2 * max(lr.daily_energy_wh):
        notices.append(
            Notice(
                "inverter-idle-large",
                f"The inverter's idle draw "
                f"({lr.inverter_idle_wh:.0f} Wh/day) is over 20 % of the daily "
                "demand: a smaller inverter, a search (sleep) mode or DC "
                "appliances would shrink the system.",
                "info",
                "loads.inverter_idle_wh",
            )
        )

    def assemble(array, ctrl, arr_notices) -> SystemDesign:
        return SystemDesign(
            loads=lr,
            site=site,
            array=array,
            battery=battery,
            controller=ctrl,
            inverter=inverter,
            warnings=tuple(notices[:k_array] + arr_notices + notices[k_array:]),
            cautions=(),
            reasons=book.freeze(),
        )

    # 9. electrical design: strings, harvest both ways from the I-V curves, cables,
    # protection, cautions.  If the chosen controller's harvest falls short of the demand
    # in any month, add modules and size again (at most a few rounds).
    from offgrid.design.electrical import electrical_design, with_electrical

    core = assemble(array, ctrl, arr_notices)
    er = electrical_design(project, core, params)
    first = array.module_count
    for _ in range(4):
        short = er.harvest.shortfall_pct
        if short <= HARVEST_SHORTFALL_TOLERANCE_PCT:
            break
        need = max(
            core.array.module_count + 1,
            math.ceil(core.array.module_count / (1.0 - short / 100.0) - 1e-9),
        )
        arr_notices = []
        array, ctrl, _, _, _ = _size_array(
            project, site, lr, sun, book, arr_notices, t_low, min_modules=need, params=params
        )
        core = assemble(array, ctrl, arr_notices)
        er = electrical_design(project, core, params)
    if core.array.module_count != first:
        arr_notices.append(
            Notice(
                "array-raised-for-harvest",
                f"The array was raised from {first} to "
                f"{core.array.module_count} modules: through the {ctrl.type.upper()} controller "
                "the I-V curves deliver less than the derate chain assumed in at least one month.",
                "info",
                "array.power_w",
            )
        )
        book.add(
            "array.modules_parallel",
            "raised until the daily harvest through the chosen "
            "controller, after the battery round trip, covers every month's demand",
            "De Soto (2006) I-V curves over the month's mean day (offgrid.design.harvest)",
            first=str(first),
            now=str(core.array.module_count),
        )
    rate_notices, i_peak = _charge_rate_notices(project, array, ctrl, battery, book)
    battery = replace(
        battery,
        peak_charge_current_a=float(i_peak),
        charge_c_rate=float(i_peak / battery.capacity_ah),
    )
    arr_notices.extend(rate_notices)
    core = assemble(array, ctrl, arr_notices)
    return with_electrical(core, er)


def _charge_rate_notices(
    project: Project,
    array: ArrayResult,
    ctrl: ControllerResult,
    battery: BatteryResult,
    book: ReasonBook,
) -> tuple[list[Notice], float]:
    """The array's peak charge current against what the bank takes (and, for lead-acid, needs).

    Peak current: MPPT, array STC power x controller efficiency / system voltage; PWM,
    strings x Imp; at most the controllers' ratings together.
    """
    from offgrid.design.battery import MAX_CHARGE_C_RATE, MIN_LEAD_ACID_CHARGE_C_RATE

    v = battery.bank_voltage_v or battery.system_voltage_v
    if ctrl.type == "mppt":
        i_array = array.power_w * ctrl.efficiency / v
    else:
        i_array = array.modules_parallel * project.module.imp_a
    i_peak = min(i_array, ctrl.current_a * ctrl.count)
    rate = i_peak / battery.capacity_ah
    top = MAX_CHARGE_C_RATE.get(battery.chemistry)
    book.add(
        "battery.peak_charge_current_a",
        "MPPT: array STC power x controller efficiency / "
        "system voltage; PWM: strings x Imp; at most the controllers' ratings together",
        "common practice, no source",
        array=fmt(array.power_w, "W"),
        controllers=f"{ctrl.count} x {ctrl.current_a:g} A",
    )
    book.add(
        "battery.charge_c_rate",
        "peak charge current / installed capacity (per hour)",
        "common practice, no source; limits from memory (typical makers' figures)",
        peak_current=fmt(i_peak, "A"),
        capacity=fmt(battery.capacity_ah, "Ah"),
        limit=f"C/{1 / top:.0f}" if top else "-",
        low_limit=(
            f"C/{1 / MIN_LEAD_ACID_CHARGE_C_RATE:.0f} (lead-acid; common practice, no source)"
            if CHEMISTRIES[battery.chemistry].lead_acid
            else "-"
        ),
    )
    out = []
    if top and rate > top:
        out.append(
            Notice(
                "charge-rate-high",
                f"At full sun the array can push about {i_peak:.0f} A into the "
                f"{battery.capacity_ah:.0f} Ah bank, C/{1 / rate:.1f}, more than the "
                f"C/{1 / top:.0f} "
                f"a {battery.chemistry} battery usually accepts: set the controller's "
                "charge-current "
                "limit to at most "
                f"{top * battery.capacity_ah:.0f} A, or choose a larger bank (check the battery's "
                "datasheet).",
                "warning",
                "battery.charge_c_rate",
            )
        )
    if CHEMISTRIES[battery.chemistry].lead_acid and rate < MIN_LEAD_ACID_CHARGE_C_RATE:
        out.append(
            Notice(
                "charge-rate-low",
                f"At full sun the array charges the {battery.capacity_ah:.0f} Ah "
                f"bank at only about {i_peak:.0f} A (C/{1 / rate:.0f}): lead-acid charged this "
                "gently "
                "seldom reaches full charge and sulphates. A larger array, fewer days of autonomy "
                "or "
                "a periodic full charge from another source helps.",
                "info",
                "battery.charge_c_rate",
            )
        )
    return out, i_peak


def _next_least(cover: np.ndarray, dm: int) -> str:
    """The month next least covered after the design month, for the design month's reason."""
    rest = np.where(np.arange(12) == dm, np.inf, cover)
    j = int(np.argmin(rest))
    return "-" if not np.isfinite(rest[j]) else f"{MONTHS[j]} {rest[j]:.3f}"


def _with_design_energy(lr: LoadResult, value: float) -> LoadResult:
    return replace(lr, design_daily_energy_wh=value)


def choose_system_voltage(project: Project, power_w: float, book: ReasonBook) -> int:
    """The user's system voltage, or the auto rule (lowest that keeps DC current <= 100 A)."""
    chosen = project.choices.system_voltage
    unit_v = project.battery.nominal_voltage_v
    if chosen != "auto":
        book.add(
            "battery.system_voltage_v",
            "set by the user",
            "project file",
            system_voltage=fmt(int(chosen), "V"),
        )
        return int(chosen)
    for v in (12, 24, 48):
        if power_w / v <= AUTO_VOLTAGE_MAX_CURRENT_A and units_in_series(v, unit_v):
            break
    else:
        v = 48
    book.add(
        "battery.system_voltage_v",
        "lowest of 12, 24, 48 V at which the larger of array and inverter power draws at most "
        f"{AUTO_VOLTAGE_MAX_CURRENT_A:.0f} A and the battery units make the voltage",
        "common practice, no source",
        power=fmt(power_w, "W"),
        unit_voltage=fmt(unit_v, "V"),
    )
    return v


def _soiling_factor(project: Project) -> tuple[float, str]:
    d = project.choices.derates
    if d.soiling_rate_pct_per_day is not None:
        mean_loss = d.soiling_rate_pct_per_day / 100.0 * d.cleaning_interval_days / 2.0
        return max(0.5, 1.0 - mean_loss), (
            f"1 - daily rate {d.soiling_rate_pct_per_day:g} %/day x cleaning interval "
            f"{d.cleaning_interval_days:g} d / 2 (mean of a linear build-up)"
        )
    return d.soiling, "fixed soiling factor"


def _size_array(
    project: Project,
    site: SiteResult,
    lr: LoadResult,
    sun: dict,
    book: ReasonBook,
    notices: list[Notice],
    t_low: float,
    min_modules: int = 0,
    params=None,
):
    m = project.module
    ctrl_spec = project.controller
    poa = np.asarray(site.poa_kwh_m2_day)
    demand = np.asarray(lr.daily_energy_wh)
    daylight = sky.daylight_hours(site.latitude_deg)
    g_w = energy_weighted_irradiance(poa, daylight)
    t_cell = cell_temperature_ross(site.temp_day_c, g_w, m.noct_c)
    gamma = m.gamma_pmax_pct_per_c / 100.0
    alpha = m.alpha_isc_pct_per_c / 100.0
    soiling, soil_text = _soiling_factor(project)
    d = project.choices.derates
    batt_rt = project.battery.efficiency
    chem = CHEMISTRIES[project.battery.chemistry]

    # A first estimate of power (MPPT chain) fixes the system voltage.
    f_temp_mppt = 1.0 + gamma * (t_cell - 25.0)
    chain = soiling * d.mismatch * d.wiring * ctrl_spec.efficiency * batt_rt
    rough = float(
        np.max(np.divide(demand, poa * f_temp_mppt * chain, out=np.zeros(12), where=poa > 0))
    )
    system_v = choose_system_voltage(project, max(rough, lr.peak_ac_w * NEC_CONTINUOUS), book)
    n_cells_sys = system_v / 2.0 if chem.lead_acid else system_v / 3.0
    batt_abs_v = chem.absorption_v_per_cell * n_cells_sys
    # String window (offgrid.design.electrical): cold Voc at the record low, hot Vmp from the fitted
    # single-diode model; DesignError when no series count fits the controller.
    from offgrid.design.electrical import string_limits

    lim = string_limits(project, site.temp_day_c, t_low, batt_abs_v, params)
    window, vmp_hot, voc_cold = lim.window, lim.vmp_hot_v, lim.voc_cold_v
    book.add(
        "array.modules_series",
        "MPPT: of the series counts in the string window, the layout with the fewest "
        "modules, then the fewest strings, then the higher voltage; PWM: the smallest "
        "count whose hot Vmp exceeds absorption + wiring drop",
        "NEC 690.7(A) for the cold Voc limit; the rest common practice, no source",
        absorption=fmt(batt_abs_v, "V"),
        vmp_hot=fmt(vmp_hot, "V"),
        voc_cold=fmt(voc_cold, "V"),
        controller_max=fmt(ctrl_spec.max_pv_voltage_v, "V"),
        window=f"{window.min_series}-{window.max_series}",
    )
    ns = window.min_series
    if ctrl_spec.type == "mppt":
        f_temp = f_temp_mppt
        temp_text = "1 + gamma_Pmax x (cell temperature - 25 C)"
        f_op = np.ones(12)
    else:
        # PWM: the array works at battery voltage, its current ~ Imp (1 + alpha dT).
        f_temp = 1.0 + alpha * (t_cell - 25.0)
        temp_text = "1 + alpha_Isc x (cell temperature - 25 C) (PWM: current-limited)"
        v_op_module = (system_v * 1.1 * (2.0 - d.wiring)) / ns
        f_op_scalar = min(1.0, v_op_module * m.imp_a / m.pmax_w)
        f_op = np.full(12, f_op_scalar)
        if ns * m.vmp_v > 1.6 * system_v:
            notices.append(
                Notice(
                    "pwm-voltage-waste",
                    f"With PWM the {ns}-module string (Vmp {ns * m.vmp_v:.0f} V)"
                    f" is pulled down to about {system_v * 1.1:.0f} V, so only {f_op_scalar:.0%} "
                    "of "
                    "its power is used: choose an MPPT controller or modules made for a "
                    f"{system_v} V battery.",
                    "warning",
                    "array.power_w",
                )
            )

    # The design month: the month whose derated supply covers its demand least.
    monthly_total = f_temp * f_op * chain
    need_w = np.divide(
        demand, poa * monthly_total, out=np.zeros(12), where=(poa * monthly_total) > 0
    )
    dm = int(np.argmax(need_w))
    derates = {
        "temperature": float(f_temp[dm]),
        "operating point": float(f_op[dm]),
        "soiling": soiling,
        "mismatch": d.mismatch,
        "wiring": d.wiring,
        "controller": ctrl_spec.efficiency,
        "battery round trip": batt_rt,
    }
    total = float(np.prod(list(derates.values())))
    required = float(demand[dm] / (poa[dm] * total))
    # Lay out the modules and count the controllers together: each controller takes an equal
    # share of whole strings, and its share may not ask more than its rating.
    n_need = max(1, math.ceil(required / m.pmax_w - 1e-9), min_modules)
    layout = _layout_with_controllers(project, window, n_need, system_v)
    ns, n_par = layout.series, layout.parallel
    string_w = ns * m.pmax_w
    power = n_par * string_w
    ctrl = _size_controller(project, n_par, power, system_v, book, layout.controllers)
    supply = power * poa * monthly_total
    book.add(
        "array.required_power_w",
        "design-month demand / (peak sun hours x product of derates), the largest of "
        "the twelve months",
        "worst-month method; derate chain common practice",
        demand=fmt(float(demand[dm]), "Wh/day"),
        peak_sun_hours=fmt(float(poa[dm]), "h"),
        derates=fmt(total),
    )
    book.add(
        "array.derates.temperature",
        temp_text,
        "cell temperature: Ross (1976) NOCT model, Duffie & Beckman eq. 23.3.3",
        cell_temperature=fmt(float(t_cell[dm]), "C"),
        irradiance=fmt(float(g_w[dm]), "W/m2"),
        ambient_day=fmt(site.temp_day_c[dm], "C"),
        noct=fmt(m.noct_c, "C"),
    )
    book.add("array.derates.soiling", soil_text, "common practice, no source")
    book.add(
        "array.power_w",
        "modules in series x strings in parallel x module Pmax, strings "
        "rounded up to meet the required power",
        "common practice, no source",
        required=fmt(required, "W"),
        series=str(ns),
        parallel=str(n_par),
        module=fmt(m.pmax_w, "W"),
    )
    book.add(
        "array.modules_parallel",
        "ceil(required power / (series x module Pmax))",
        "common practice, no source",
        required=fmt(required, "W"),
        string_power=fmt(string_w, "W"),
    )
    book.add(
        "array.supply_wh_day",
        "array power x plane-of-array insolation x the month's derates",
        "worst-month method",
    )
    book.given("array.module_power_w", "module.pmax_w", fmt(m.pmax_w, "W"))
    book.add(
        "array.module_count",
        "modules in series x strings in parallel",
        "common practice, no source",
        series=str(ns),
        parallel=str(n_par),
    )
    book.add(
        "array.derates.operating point",
        "MPPT: 1; PWM: string voltage held at the "
        "battery's charging voltage (1.1 x system voltage, plus the wiring drop) x Imp / "
        "Pmax, at most 1",
        "common practice, no source",
        battery=fmt(system_v, "V"),
        series=str(ns),
        module_imp=fmt(m.imp_a, "A"),
    )
    book.given("array.derates.mismatch", "choices.derates.mismatch", fmt(d.mismatch))
    book.given("array.derates.wiring", "choices.derates.wiring", fmt(d.wiring))
    book.given("array.derates.controller", "controller.efficiency", fmt(ctrl_spec.efficiency))
    book.given("array.derates.battery round trip", "battery.efficiency", fmt(batt_rt))
    book.add(
        "array.derate_total",
        "product of the design month's derates",
        "common practice, no source",
        derates=" x ".join(fmt(v) for v in derates.values()),
    )
    book.add(
        "array.cell_temp_c",
        "daytime air temperature + (NOCT - 20 C) / 800 W/m2 x the "
        "month's energy-weighted irradiance (pi^2 H / (8 daylight hours))",
        "Ross (1976) NOCT model, Duffie & Beckman eq. 23.3.3; half-sine day, common practice",
        noct=fmt(m.noct_c, "C"),
    )
    book.add(
        "array.string_voc_cold_v",
        "modules in series x module Voc at the record low",
        "NFPA 70 (NEC) 2023 690.7(A)",
        series=str(ns),
        voc_cold=fmt(voc_cold, "V"),
    )
    book.add(
        "array.string_vmp_hot_v",
        "modules in series x module Vmp in the hottest month",
        "common practice, no source",
        series=str(ns),
        vmp_hot=fmt(vmp_hot, "V"),
    )
    array = ArrayResult(
        power_w=float(power),
        required_power_w=required,
        module_power_w=m.pmax_w,
        modules_series=ns,
        modules_parallel=n_par,
        module_count=ns * n_par,
        derates=derates,
        derate_total=total,
        cell_temp_c=_tuple(t_cell),
        supply_wh_day=_tuple(supply),
        voc_cold_v=float(voc_cold),
        vmp_hot_v=float(vmp_hot),
        string_voc_cold_v=float(ns * voc_cold),
        string_vmp_hot_v=float(ns * vmp_hot),
    )

    if ctrl.count > 1:
        notices.append(
            Notice(
                "several-controllers",
                f"{ctrl.count} charge controllers of "
                f"{ctrl.current_a:g} A are needed; give each its own group of "
                f"{n_par // ctrl.count} strings.",
                "info",
                "controller.current_a",
            )
        )
    return array, ctrl, system_v, batt_abs_v, dm


def _controller_ratings(project: Project) -> tuple[float, ...]:
    if project.controller.max_current_a:
        return (float(project.controller.max_current_a),)
    return CONTROLLER_RATINGS_A


def _string_current_a(project: Project, series: int, system_v: int) -> float:
    """Current one string asks of its controller [A] (the terms of :func:`_size_controller`)."""
    m = project.module
    if project.controller.type == "pwm":
        return NEC_CONTINUOUS * NEC_CONTINUOUS * m.isc_a
    return NEC_CONTINUOUS * series * m.pmax_w / system_v


def _layout_with_controllers(project: Project, window, n_need: int, system_v: int):
    """Series x parallel layout and the number of controllers sharing it equally.

    The controller count rises until each controller's share of whole strings is within
    the largest rating; DesignError when one string alone is too much for a controller or
    when more than MAX_CONTROLLERS would be needed.
    """
    from dataclasses import replace

    from offgrid.design.strings import choose_layout

    m = project.module
    top = max(_controller_ratings(project))
    fix = (
        "raise the system voltage, set a larger controller rating in "
        "controller.max_current_a, or split the loads into several systems"
    )
    if project.controller.type == "mppt":
        s_fit = math.floor(top * system_v / (NEC_CONTINUOUS * m.pmax_w) + 1e-9)
        if s_fit < window.min_series:
            s = window.min_series
            raise DesignError(
                "controller-current",
                f"One string of {s} module{'s' if s > 1 else ''} "
                f"({s * m.pmax_w:.0f} W, the "
                f"fewest in series the battery voltage allows) needs "
                f"{_string_current_a(project, s, system_v):.0f} A from its MPPT controller "
                f"(1.25 x power / {system_v} V), more than the {top:.4g} A rating: {fix}.",
                "controller.max_current_a",
            )
        window = replace(window, max_series=min(window.max_series, s_fit))
    elif _string_current_a(project, 1, system_v) > top + 1e-9:
        raise DesignError(
            "controller-current",
            f"One string (Isc {m.isc_a:g} A) needs "
            f"{_string_current_a(project, 1, system_v):.1f} A from its PWM controller (1.25 x "
            f"1.25 x Isc, NEC 690.8), more than the {top:.4g} A rating: set a larger controller "
            "rating in controller.max_current_a, or choose an MPPT controller.",
            "controller.max_current_a",
        )
    n_ctrl = 1
    while True:
        layout = choose_layout(window, n_need, n_ctrl)
        i_str = _string_current_a(project, layout.series, system_v)
        if layout.strings_per_controller * i_str <= top + 1e-9:
            return layout
        n_ctrl = max(n_ctrl + 1, math.ceil(layout.parallel * i_str / top - 1e-9))
        if n_ctrl > MAX_CONTROLLERS:
            raise DesignError(
                "controller-count",
                f"The array of about {n_need} modules of {m.pmax_w:.0f} W "
                f"needs more than {MAX_CONTROLLERS} charge controllers of {top:.4g} A at "
                f"{system_v} V, more than one battery bus should carry: {fix}.",
                "controller.max_current_a",
            )


def _size_controller(
    project: Project, n_par: int, power: float, system_v: int, book: ReasonBook, count: int = 1
) -> ControllerResult:
    """7. Charge controller: current with the code's factors, standard rating, ``count`` of them.

    The strings share out equally between the ``count`` controllers, so each carries
    ``required / count``.
    """
    m = project.module
    ctrl_spec = project.controller
    if ctrl_spec.type == "pwm":
        req = NEC_CONTINUOUS * NEC_CONTINUOUS * m.isc_a * n_par
        book.add(
            "controller.required_current_a",
            "1.25 x 1.25 x Isc x strings in parallel",
            "NEC 690.8(A)(1) maximum circuit current and 690.8(B)(1) continuous factor, "
            "NFPA 70-2023",
            isc=fmt(m.isc_a, "A"),
            parallel=str(n_par),
        )
    else:
        req = NEC_CONTINUOUS * power / system_v
        book.add(
            "controller.required_current_a",
            "1.25 x array power / battery voltage",
            "output current of an MPPT converter; 1.25 continuous factor as NEC 690.8(B)(1)",
            array=fmt(power, "W"),
            battery=fmt(system_v, "V"),
        )
    ratings = _controller_ratings(project)
    count = max(1, int(count))
    per = req / count
    rating = next_rating(per, ratings) or max(ratings)
    book.add(
        "controller.current_a",
        "next standard rating at or above the required current "
        "per controller (the strings share out equally between the controllers)",
        "common practice, no source",
        required=fmt(req, "A"),
        controllers=str(count),
        per_controller=fmt(per, "A"),
    )
    book.add(
        "controller.count",
        "fewest controllers whose equal share of whole strings each "
        "stays within the largest rating",
        "common practice, no source",
        strings=str(n_par),
        largest_rating=fmt(max(ratings), "A"),
    )
    book.given("controller.efficiency", "controller.efficiency", fmt(ctrl_spec.efficiency))
    return ControllerResult(
        type=ctrl_spec.type,
        required_current_a=float(req),
        current_a=float(rating),
        count=count,
        max_pv_voltage_v=ctrl_spec.max_pv_voltage_v,
        efficiency=ctrl_spec.efficiency,
    )


def _size_battery(
    project: Project,
    lr: LoadResult,
    system_v: int,
    batt_abs_v: float,
    t_mean: np.ndarray,
    book: ReasonBook,
    notices: list[Notice],
) -> BatteryResult:
    """6. Battery bank for the days of autonomy, on the worst month of demand x cold factor.

    Each month's need: demand x days / (DoD x discharge efficiency x end of life) x that
    month's capacity-temperature factor; the bank is sized on the largest (or, with
    ``choices.battery_largest_coldest``, on the largest demand x the coldest month's factor).
    Ampere-hours at the bank's own nominal voltage (units in series x unit voltage).
    """
    from offgrid.simulate.life import (
        CALENDAR_TEMPERATURE_SOURCE,
        CYCLE_LIFE_SOURCE,
        calendar_life_years,
        cycles_to_failure,
    )

    b = project.battery
    choices = project.choices
    chem = CHEMISTRIES[b.chemistry]
    dod = choices.max_dod if choices.max_dod is not None else b.max_dod
    series = units_in_series(system_v, b.nominal_voltage_v)
    if series is None:
        raise DesignError(
            "battery-voltage",
            f"{b.nominal_voltage_v:.4g} V battery units cannot "
            f"make a {system_v} V system: choose units whose voltage divides "
            f"{system_v} V, or another system voltage",
            "battery.nominal_voltage_v",
        )
    bank_v = series * b.nominal_voltage_v
    room = project.site.battery_temp_c
    t_cap = np.full(12, float(room)) if room is not None else np.asarray(t_mean, dtype=float)
    f_m = np.array([capacity_temperature_factor(b.chemistry, t) for t in t_cap])
    demand = np.asarray(lr.daily_energy_wh, dtype=float)
    eta_dis = math.sqrt(b.efficiency)
    per_wh = choices.autonomy_days / (dod * eta_dis * choices.ageing_factor)
    worst = int(np.argmax(demand * f_m))
    worst_wh = float(demand[worst] * f_m[worst]) * per_wh
    big, cold = int(np.argmax(demand)), int(np.argmax(f_m))
    conservative_wh = float(demand[big] * f_m[cold]) * per_wh
    if choices.battery_largest_coldest:
        energy, f_t, t_batt, need_wh = (
            float(demand[big]),
            float(f_m[cold]),
            float(t_cap[cold]),
            conservative_wh,
        )
        rule = (
            "largest daily demand x the coldest month's temperature factor (conservative, "
            "chosen in choices.battery_largest_coldest)"
        )
    else:
        energy, f_t, t_batt, need_wh = (
            float(demand[worst]),
            float(f_m[worst]),
            float(t_cap[worst]),
            worst_wh,
        )
        rule = "the month of the largest demand x temperature factor"
    need_ah = need_wh / bank_v
    parallel = max(1, math.ceil(need_ah / b.capacity_ah - 1e-9))
    cap_ah = parallel * b.capacity_ah
    nominal_kwh = cap_ah * bank_v / 1000.0
    usable_kwh = nominal_kwh * dod
    # Ageing: the warm months (the room's warm-season temperature, else each month's mean air
    # temperature, at least the cold-season room temperature when set).
    warm = project.site.battery_warm_temp_c
    if warm is not None:
        t_age = np.full(12, float(warm))
        age_from = "site.battery_warm_temp_c"
    else:
        t_age = np.asarray(t_mean, dtype=float)
        age_from = "each month's mean air temperature"
        if room is not None:
            t_age = np.maximum(t_age, float(room))
            age_from += f", at least the room's {room:g} C"
    cal_years = calendar_life_years(b.chemistry, t_age)
    book.add(
        "battery.required_ah",
        f"{rule}: its daily energy x days of autonomy x temperature factor / (max depth "
        "of discharge x discharge efficiency x end-of-life capacity) / bank voltage",
        "common practice (autonomy method); temperature factor: " + chem.temp_source,
        energy=fmt(energy, "Wh/day"),
        autonomy=fmt(choices.autonomy_days, "days"),
        temperature_factor=fmt(f_t),
        battery_temperature=fmt(t_batt, "C"),
        max_dod=fmt(dod),
        discharge_efficiency=fmt(eta_dis),
        ageing=fmt(choices.ageing_factor),
        bank_voltage=fmt(bank_v, "V"),
        worst_month=f"{MONTHS[worst]}: {demand[worst]:.0f} Wh/day x {f_m[worst]:.3f} -> "
        f"{worst_wh / bank_v:.0f} Ah" + ("" if choices.battery_largest_coldest else " (used)"),
        largest_x_coldest=f"{demand[big]:.0f} Wh/day ({MONTHS[big]}) x {f_m[cold]:.3f} "
        f"({MONTHS[cold]}) -> {conservative_wh / bank_v:.0f} Ah"
        + (" (used)" if choices.battery_largest_coldest else " (conservative option)"),
    )
    book.add(
        "battery.capacity_ah",
        "strings in parallel x unit capacity",
        "common practice, no source",
        parallel=str(parallel),
        unit=fmt(b.capacity_ah, "Ah"),
    )
    book.add(
        "battery.units_series",
        "system voltage / unit voltage",
        "common practice",
        system=fmt(system_v, "V"),
        unit=fmt(b.nominal_voltage_v, "V"),
    )
    book.add(
        "battery.units_parallel",
        "ceil(required Ah / unit Ah)",
        "common practice",
        required=fmt(need_ah, "Ah"),
        unit=fmt(b.capacity_ah, "Ah"),
    )
    book.add(
        "battery.usable_kwh",
        "installed Ah x bank voltage x max depth of discharge",
        "common practice",
        capacity=fmt(cap_ah, "Ah"),
        max_dod=fmt(dod),
        bank_voltage=fmt(bank_v, "V"),
    )
    if chem.lead_acid and parallel > 3:
        notices.append(
            Notice(
                "lead-acid-parallel",
                f"{parallel} parallel strings of lead-acid "
                "batteries: strings share current unevenly above three; choose "
                "larger units (or 2 V cells) to keep three or fewer.",
                "warning",
                "battery.units_parallel",
            )
        )
    if parallel == 1 and cap_ah > 2.0 * need_ah:
        notices.append(
            Notice(
                "battery-oversized",
                f"One string of these {b.capacity_ah:g} Ah "
                f"units is {cap_ah / need_ah:.1f} times the {need_ah:.0f} Ah the "
                "design needs: smaller units would cost less and charge more "
                "fully.",
                "info",
                "battery.capacity_ah",
            )
        )
    if t_cap[cold] < 5:
        where = (
            "the battery room's temperature (site.battery_temp_c)"
            if project.site.battery_temp_c is not None
            else f"the mean air temperature of {MONTHS[cold]}; set site.battery_temp_c for a room"
        )
        notices.append(
            Notice(
                "battery-cold",
                f"The battery works at about {t_cap[cold]:.0f} C "
                f"({where}): it then needs {f_m[cold]:.2f} times its rated "
                "capacity for the same energy (counted in that month's need); "
                "insulate it or move it indoors.",
                "warning",
                "battery.required_ah",
            )
        )
    book.add(
        "battery.nominal_kwh",
        "installed Ah x bank nominal voltage (units in series x unit voltage) / 1000",
        "common practice, no source",
        capacity=fmt(cap_ah, "Ah"),
        bank_voltage=fmt(bank_v, "V"),
    )
    book.add(
        "battery.bank_voltage_v",
        "units in series x the unit's own nominal voltage",
        "common practice, no source",
        series=str(series),
        unit=fmt(b.nominal_voltage_v, "V"),
    )
    book.add(
        "battery.capacity_temp_c",
        "battery temperature for capacity in the month the "
        "bank is sized on: the room's (site.battery_temp_c) or that month's mean air "
        "temperature",
        chem.temp_source,
        month=MONTHS[worst if not choices.battery_largest_coldest else cold],
    )
    book.add(
        "battery.ageing_temp_c",
        "warmest monthly battery temperature for ageing: " + age_from,
        "common practice, no source",
        months=" ".join(f"{t:.0f}" for t in t_age),
    )
    book.add(
        "battery.ageing_temps_c",
        "battery temperature for ageing, each month: " + age_from,
        "common practice, no source",
    )
    book.add(
        "battery.calendar_life_years",
        "float (calendar) life at 25 C / the day-weighted "
        "mean over the months of 2^((T - 25 C) / 10 C), T the month's battery temperature "
        "for ageing, no credit below 25 C"
        if chem.lead_acid
        else "float (calendar) life of the preset, not corrected for temperature (no source "
        "for lithium iron phosphate)",
        CALENDAR_TEMPERATURE_SOURCE + "; life at 25 C from memory",
        at_25c=fmt(calendar_life_years(b.chemistry), "yr"),
        warmest=fmt(float(t_age.max()), "C"),
    )
    if chem.lead_acid and dod > 0.8 + 1e-9:
        n_dod = float(cycles_to_failure(b.chemistry, dod))
        n_half = float(cycles_to_failure(b.chemistry, 0.5))
        notices.append(
            Notice(
                "lead-acid-deep-dod",
                f"A maximum depth of discharge of {dod:.0%} on {chem.label} "
                f"batteries: the cycle-life curve used here gives about {n_dod:.0f} cycles to end "
                f"of life at that depth against {n_half:.0f} at 50 % ({CYCLE_LIFE_SOURCE}), so "
                f"a bank run that deep on many days wears out in about {n_dod / 365:.1f} years of "
                "daily cycling. Lead-acid is usually designed for 50 % or less (common practice); "
                "check the battery's datasheet for its cycle life.",
                "warning",
                "battery.max_dod",
            )
        )
    if choices.max_dod is not None:
        book.given("battery.max_dod", "choices.max_dod", fmt(dod))
    else:
        book.given("battery.max_dod", "battery.max_dod", fmt(dod))
    book.given("battery.autonomy_days", "choices.autonomy_days", fmt(choices.autonomy_days, "days"))
    book.add(
        "battery.unit_count",
        "units in series x strings in parallel",
        "common practice, no source",
        series=str(series),
        parallel=str(parallel),
    )
    book.add(
        "battery.temp_factor",
        "capacity needed per rated capacity at the battery's "
        "temperature (1 at 25 C, more in the cold)",
        chem.temp_source,
        battery_temperature=fmt(t_batt, "C"),
        temperature_from="site.battery_temp_c"
        if project.site.battery_temp_c is not None
        else "the sizing month's mean air temperature",
    )
    book.given("battery.ageing_factor", "choices.ageing_factor", fmt(choices.ageing_factor))
    book.add(
        "battery.discharge_efficiency",
        "square root of the round-trip efficiency (the "
        "loss shared equally between charge and discharge)",
        "common practice, no source",
        round_trip=fmt(b.efficiency),
    )
    book.add(
        "battery.absorption_voltage_v",
        "absorption (charging) voltage per cell at 25 C x cells in series",
        "common practice, no source (check the battery's manual)",
        per_cell=fmt(chem.absorption_v_per_cell, "V"),
        chemistry=chem.label,
    )
    return BatteryResult(
        chemistry=b.chemistry,
        system_voltage_v=system_v,
        capacity_ah=float(cap_ah),
        required_ah=float(need_ah),
        nominal_kwh=float(nominal_kwh),
        usable_kwh=float(usable_kwh),
        max_dod=float(dod),
        autonomy_days=float(choices.autonomy_days),
        units_series=series,
        units_parallel=parallel,
        unit_count=series * parallel,
        temp_factor=float(f_t),
        ageing_factor=float(choices.ageing_factor),
        discharge_efficiency=float(eta_dis),
        absorption_voltage_v=float(batt_abs_v),
        bank_voltage_v=float(bank_v),
        capacity_temp_c=float(t_batt),
        ageing_temp_c=float(t_age.max()),
        calendar_life_years=float(cal_years),
        ageing_temps_c=_tuple(t_age),
    )


def _size_inverter(
    project: Project,
    lr: LoadResult,
    system_v: int,
    book: ReasonBook,
    notices: list[Notice] | None = None,
) -> InverterResult:
    inv = project.inverter
    needed = lr.connected_ac_w > 0
    if not needed:
        for key in (
            "continuous_w",
            "required_continuous_w",
            "surge_w",
            "required_surge_w",
            "dc_input_current_a",
            "self_consumption_w",
        ):
            book.add(f"inverter.{key}", "no AC loads: no inverter", "common practice")
        book.given("inverter.efficiency", "inverter.efficiency", fmt(inv.efficiency))
        return InverterResult(False, 0.0, 0.0, 0.0, 0.0, inv.efficiency, 0.0, 0.0)
    from offgrid.design.loads import SURGE_FORMULA

    req_cont = lr.peak_ac_w * NEC_CONTINUOUS
    req_surge = lr.surge_need_w
    cont_std = next_rating(req_cont, INVERTER_RATINGS_W)
    surge_std = next_rating(req_surge / INVERTER_SURGE_MULTIPLE, INVERTER_RATINGS_W)
    cont = max(cont_std or req_cont, surge_std or req_surge / INVERTER_SURGE_MULTIPLE)
    if (cont_std is None or surge_std is None) and notices is not None:
        top = INVERTER_RATINGS_W[-1]
        notices.append(
            Notice(
                "inverter-above-ratings",
                f"No single inverter of the common ratings (up to "
                f"{top / 1000:g} kW) gives {cont:.0f} W continuous and {req_surge:.0f} W surge: "
                "use "
                f"{math.ceil(cont / top - 1e-9)} or more inverters made to share the load in "
                "parallel, or split the AC loads; the figures shown are what they must add up to.",
                "warning",
                "inverter.continuous_w",
            )
        )
    surge = cont * INVERTER_SURGE_MULTIPLE
    low_v = system_v * 0.875  # 10.5 V per 12 V: low-voltage cut-off (common practice)
    dc_current = cont / (inv.efficiency * low_v)
    book.add(
        "inverter.required_continuous_w",
        "1.25 x the AC power on at once (peak AC "
        "power: the coincidence factor never below the largest single AC appliance)",
        "common practice, no source",
        peak=fmt(lr.peak_ac_w, "W"),
    )
    book.add(
        "inverter.continuous_w",
        "next standard rating at or above 1.25 x peak AC power, raised until its "
        f"surge ({INVERTER_SURGE_MULTIPLE:g} x continuous) covers the required surge",
        "common practice, no source",
        peak=fmt(lr.peak_ac_w, "W"),
        required=fmt(req_cont, "W"),
        required_surge=fmt(req_surge, "W"),
    )
    book.add(
        "inverter.required_surge_w",
        "surge need = " + SURGE_FORMULA,
        "common practice, no source",
        appliance=lr.surge_need_load or "none",
        coincidence_factor=fmt(lr.coincidence_factor),
        peak=fmt(lr.peak_ac_w, "W"),
        value=fmt(req_surge, "W"),
    )
    book.add(
        "inverter.surge_w",
        f"{INVERTER_SURGE_MULTIPLE:g} x the chosen continuous rating "
        "(a few seconds); it must cover the required surge, which is the " + SURGE_FORMULA,
        "common practice, no source",
        continuous=fmt(cont, "W"),
        required=fmt(req_surge, "W"),
        appliance=lr.surge_need_load or "none",
    )
    book.add(
        "inverter.dc_input_current_a",
        "continuous rating / (efficiency x low-voltage cut-off)",
        "common practice, no source",
        cutoff=fmt(low_v, "V"),
    )
    book.given("inverter.efficiency", "inverter.efficiency", fmt(inv.efficiency))
    book.given(
        "inverter.self_consumption_w",
        "inverter.self_consumption_w",
        fmt(inv.self_consumption_w, "W"),
    )
    return InverterResult(
        True,
        float(req_cont),
        float(cont),
        float(req_surge),
        float(surge),
        inv.efficiency,
        inv.self_consumption_w,
        float(dc_current),
    )
