"""Steps 1-3: the sun on the array plane, the site's temperatures and the design month.

Monthly plane-of-array insolation: Liu & Jordan (1962) isotropic sky with Klein (1977) Rb,
Erbs et al. (1982) diffuse fraction (:mod:`offgrid.climate.poa`); the tilt searched for the
worst month of supply against demand when the site sets none.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.climate import sky
from offgrid.climate.model import MonthlyClimate
from offgrid.design.months import MONTHS, as_tuple
from offgrid.design.result import DesignError, Notice, Reason, ReasonBook, SiteResult, fmt
from offgrid.project.model import Site

#: A climate whose own coordinates lie more than this far (latitude or longitude) from the
#: site may belong to another place (common practice, no source).
CLIMATE_DISTANCE_WARN_DEG = 2.0
LOW_SUN_KWH_M2_DAY = 1.5  # below it the monthly transposition is unreliable (test_climate_poa)


@dataclass(frozen=True)
class SunStep:
    tilt_deg: float
    azimuth_deg: float
    sun: dict  # month arrays: poa, kt, diffuse_fraction, rb, horizon_factor
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


@dataclass(frozen=True)
class SiteStep:
    site: SiteResult  # design_month: the first estimate, demand / sun alone
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


@dataclass(frozen=True)
class DesignMonthStep:
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


def position_notices(site: Site, climate: MonthlyClimate) -> tuple[Notice, ...]:
    """Warnings for a site position never set (latitude and longitude both exactly 0, a
    point in the sea) and for a climate whose own coordinates lie more than
    :data:`CLIMATE_DISTANCE_WARN_DEG` from the site's: the sun on the tilted array is
    worked out at the site's latitude, so either gives a wrong array without a sign."""
    lat, lon = site.latitude_deg, site.longitude_deg
    c_lat, c_lon = climate.latitude_deg, climate.longitude_deg
    at = f" (the climate is for {c_lat:g}, {c_lon or 0.0:g})" if c_lat is not None else ""
    if lat == 0.0 and lon == 0.0:
        return (
            Notice(
                "site-position-unset",
                "The site's latitude and longitude are both 0, a point in the sea: set the "
                f"site's position{at} in the Place section (or [site] in the file); the sun "
                "on the tilted array is worked out at the site's latitude",
                "warning",
                "site.latitude_deg",
            ),
        )
    if c_lat is None or (
        abs(c_lat - lat) <= CLIMATE_DISTANCE_WARN_DEG
        and (c_lon is None or abs(c_lon - lon) <= CLIMATE_DISTANCE_WARN_DEG)
    ):
        return ()
    return (
        Notice(
            "climate-elsewhere",
            f"The climate is for {c_lat:g}, {c_lon or 0.0:g}, more than "
            f"{CLIMATE_DISTANCE_WARN_DEG:g} deg from the site ({lat:g}, {lon:g}): check it "
            "is the right climate or the site's position (the sun on the tilted array is "
            "worked out at the site's latitude)",
            "warning",
            "site.latitude_deg",
        ),
    )


def site_albedo(site: Site, climate: MonthlyClimate):
    """Ground reflectance in force: the site's wins, else the climate file's, else None (0.2).

    One value or twelve (January first), as given.
    """
    return site.albedo if site.albedo is not None else getattr(climate, "albedo", None)


def sun_on_plane(
    site: Site, min_tilt_deg: float, climate: MonthlyClimate, demand_wh_day=None
) -> SunStep:
    """Step 1: tilt, azimuth and monthly plane-of-array insolation.

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

    book = ReasonBook()
    notices: list[Notice] = []
    lat = site.latitude_deg
    albedo = site_albedo(site, climate)
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
            min_tilt_deg,
            horizon=horizon,
            longitude_deg=site.longitude_deg,
            elevation_m=site.elevation_m,
        )
        tilt = choice.tilt_deg
        book.add("site.tilt_deg", TILT_FORMULA, TILT_SOURCE, **tilt_reason_inputs(choice))
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
        more_formula, more_source, held = _ceiling_terms(res)
        formula, source = formula + more_formula, source + more_source
        notices.extend(held)
    if horizon:
        more_formula, more_source, more_inputs, hidden = _horizon_terms(res, horizon)
        formula, source = formula + more_formula, source + more_source
        inputs.update(more_inputs)
        notices.extend(hidden)
    book.add("site.poa_kwh_m2_day", formula, source, **inputs)
    return SunStep(
        float(tilt),
        float(azimuth),
        {
            "poa": res.poa_kwh_m2_day,
            "kt": res.kt,
            "diffuse_fraction": res.diffuse_fraction,
            "rb": res.rb,
            "horizon_factor": res.horizon_factor,
        },
        book.freeze(),
        tuple(notices),
    )


def _ceiling_terms(res) -> tuple[str, str, list[Notice]]:
    """Formula and source words, and the warning, for months held at the clear-sky ceiling."""
    from offgrid.climate.checks import MONTHS

    held = [m for m in range(12) if res.capped[m]]
    formula = "; held at the clearest-sky insolation on the plane in " + ", ".join(
        MONTHS[m] for m in held
    )
    source = (
        "; ceiling: Ineichen & Perez (2002) clear sky at the Linke turbidity of "
        "Ineichen (2008) with no aerosol and 0.2 cm water vapour"
    )
    notices = [
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
    ]
    return formula, source, notices


def _horizon_terms(res, horizon) -> tuple[str, str, dict[str, str], list[Notice]]:
    """Formula and source words, inputs and the warning of a horizon profile."""
    lost = float((res.beam_lost_kwh_m2_day * sky.DAYS_IN_MONTH).sum())
    total = float(((res.poa_kwh_m2_day + res.beam_lost_kwh_m2_day) * sky.DAYS_IN_MONTH).sum())
    formula = "; beam term x the share of the plane's beam with the sun above the horizon profile"
    source = "; sun positions: Reda & Andreas (2004) SPA through pvlib"
    inputs = {}
    inputs["horizon"] = ", ".join(f"{a:g}:{e:g}" for a, e in horizon)
    inputs["horizon loss"] = fmt(100.0 * lost / total if total > 0 else 0.0, "% a year")
    from offgrid.climate.horizon import sky_share_blocked

    hidden = sky_share_blocked(horizon)
    notices: list[Notice] = []
    if hidden > 0.10:
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
    return formula, source, inputs, notices


def site_record(site: Site, climate: MonthlyClimate, sun: SunStep, demand_wh_day) -> SiteStep:
    """Step 3 (first estimate) and the temperatures: the site's record of the design.

    The first design month is the largest demand / plane-of-array insolation; the array
    step replaces it by the least-covered month after each month's derates.  Raises
    DesignError when a month with loads has no usable sun.
    """
    book = ReasonBook()
    notices: list[Notice] = []
    demand = np.asarray(demand_wh_day)
    poa = np.asarray(sun.sun["poa"])
    horiz = np.asarray(climate.insolation_kwh_m2_day, dtype=float)
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
    dm = int(np.argmax(ratio))
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
    result = SiteResult(
        design_month=dm + 1,
        tilt_deg=sun.tilt_deg,
        azimuth_deg=sun.azimuth_deg,
        latitude_deg=site.latitude_deg,
        horizontal_kwh_m2_day=as_tuple(horiz),
        poa_kwh_m2_day=as_tuple(poa),
        demand_to_sun=as_tuple(ratio),
        temp_mean_c=as_tuple(t_mean),
        temp_day_c=as_tuple(t_day),
        record_low_c=t_low,
        climate_source=climate.source,
        albedo=as_tuple(sky.monthly_albedo(site_albedo(site, climate))),
    )
    book.add(
        "site.record_low_c", "lowest temperature used for the cold open-circuit voltage", low_src
    )
    book.given("site.latitude_deg", "site.latitude_deg", fmt(site.latitude_deg, "deg"))
    src = climate.source or "the climate"
    which = (
        "the site's own value"
        if site.albedo is not None
        else "the climate file's value"
        if getattr(climate, "albedo", None) is not None
        else "the usual 0.2 for ground without snow"
    )
    book.add(
        "site.albedo",
        "ground reflectance of each month: " + which,
        "common practice, no source" if which.startswith("the usual") else "project file",
        albedo=sky.describe_albedo(site_albedo(site, climate)),
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
    return SiteStep(result, book.freeze(), tuple(notices))


def confirm_design_month(
    site: SiteResult, supply_wh_day, demand_wh_day, dm: int
) -> DesignMonthStep:
    """The reasons of the design month the array step chose, and the low-sun warning."""
    book = ReasonBook()
    notices: list[Notice] = []
    demand = np.asarray(demand_wh_day)
    horiz = np.asarray(site.horizontal_kwh_m2_day)
    with np.errstate(over="ignore"):
        cover = np.divide(
            np.asarray(supply_wh_day), demand, out=np.full(12, np.inf), where=demand > 0
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
    if horiz[dm] < LOW_SUN_KWH_M2_DAY and site.tilt_deg > 15.0:
        notices.append(
            Notice(
                "low-sun-month",
                f"In {MONTHS[dm]}, the design month, the horizontal insolation is "
                f"only {horiz[dm]:.2f} kWh/m2/day: in such dark months the monthly transposition "
                "to "
                f"a {site.tilt_deg:.0f} deg plane can read 20-50 % high (against an hourly sky "
                "model on typical-year weather at 55-65 N). Allow a margin of modules, or check "
                "the month with an hourly model of the site's weather.",
                "warning",
                "site.poa_kwh_m2_day",
            ),
        )
    book.add(
        "loads.design_daily_energy_wh",
        "daily energy at the battery in the design month",
        "worst-month method",
        month=MONTHS[dm],
    )
    return DesignMonthStep(book.freeze(), tuple(notices))


def _next_least(cover: np.ndarray, dm: int) -> str:
    """The month next least covered after the design month, for the design month's reason."""
    rest = np.where(np.arange(12) == dm, np.inf, cover)
    j = int(np.argmin(rest))
    return "-" if not np.isfinite(rest[j]) else f"{MONTHS[j]} {rest[j]:.3f}"
