"""The array tilt found by search: best for the worst month, and best for the year.

A stand-alone system is sized by its worst month, the month with the least
plane-of-array insolation for its demand.  The tilt that serves that month
best maximises

    min over months with demand of  POA_m(tilt) / demand_m

which is the same as needing the smallest array.  The tilt with the largest
annual insolation is found beside it, and the difference reported.  Both are
searched on a 1-degree grid of candidate tilts, vectorised, then refined to
0.1 degree around the best, never below the self-cleaning minimum tilt
(default 10 degrees: common practice, no source).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.climate import sky
from offgrid.climate.model import MONTH_NAMES
from offgrid.climate.poa import poa_monthly


@dataclass(frozen=True)
class TiltChoice:
    """Result of :func:`best_tilt`.  Insolation in kWh/m2/day, annual in kWh/m2/year."""

    tilt_deg: float  # best for the worst month (the one to use)
    annual_tilt_deg: float  # best for the annual total
    difference_deg: float  # tilt_deg - annual_tilt_deg
    azimuth_deg: float
    min_tilt_deg: float
    at_minimum: bool  # the worst-month optimum was held at the self-cleaning minimum
    design_month: int  # 1-12: the worst month at tilt_deg
    poa_kwh_m2_day: tuple[float, ...]  # at tilt_deg
    poa_annual_tilt_kwh_m2_day: tuple[float, ...]  # at annual_tilt_deg
    worst_month_poa_kwh_m2_day: float  # at tilt_deg, in the design month
    worst_month_gain_pct: float  # worst-month supply/demand vs the annual tilt, percent more
    annual_kwh_m2: float  # at tilt_deg
    annual_best_kwh_m2: float  # at annual_tilt_deg
    annual_loss_pct: float  # annual insolation given up for the worst month, percent
    demand_weighted: bool  # False: no demand given, every month weighs the same


def _annual(poa) -> np.ndarray:
    return (np.asarray(poa) * sky.DAYS_IN_MONTH).sum(axis=-1)


def _worst_ratio(poa, demand) -> np.ndarray:
    used = demand > 0
    ratio = np.where(used, np.asarray(poa) / np.where(used, demand, 1.0), np.inf)
    return ratio.min(axis=-1)


def _argmax_low(scores: np.ndarray, tilts: np.ndarray) -> float:
    """Tilt of the best score; ties go to the lower tilt."""
    return float(tilts[int(np.argmax(scores))])


def _fine_grid(best: float, lo: float, hi: float) -> np.ndarray:
    return np.round(np.arange(max(lo, best - 1.0), min(hi, best + 1.0) + 1e-9, 0.1), 6)


def best_tilt(
    insolation_kwh_m2_day,
    latitude_deg: float,
    azimuth_deg: float | None = None,
    demand_wh_day=None,
    albedo: float = 0.2,
    min_tilt_deg: float = 10.0,
    horizon=None,
    longitude_deg: float = 0.0,
    elevation_m: float = 0.0,
) -> TiltChoice:
    """Search the tilt that maximises the worst month's supply against demand.

    Parameters
    ----------
    insolation_kwh_m2_day : array of 12
        Monthly mean daily horizontal insolation [kWh/m2/day].
    latitude_deg : float
        Site latitude [deg].
    azimuth_deg : float, optional
        Plane azimuth [deg, clockwise from north]; default equator-facing.
    demand_wh_day : array of 12, optional
        Daily demand of each month [Wh/day]; months with zero demand are ignored.
        Default: the same in every month.
    albedo : float
        Ground reflectance [-].
    min_tilt_deg : float
        Self-cleaning minimum [deg]; no tilt below it is proposed.
    horizon : list of (azimuth_deg, elevation_deg), optional
        Horizon profile (needs ``longitude_deg`` and ``elevation_m``).
    """
    if not 0.0 <= min_tilt_deg <= 90.0:
        raise ValueError(f"choices.min_tilt_deg: {min_tilt_deg} is outside 0-90 degrees")
    az = sky.equator_facing_azimuth(latitude_deg) if azimuth_deg is None else float(azimuth_deg)
    if demand_wh_day is None:
        demand = np.ones(12)
        weighted = False
    else:
        demand = np.asarray(demand_wh_day, dtype=float)
        if demand.shape != (12,) or not np.all(np.isfinite(demand)) or np.any(demand < 0):
            raise ValueError("monthly demand: needs 12 finite values of at least 0 Wh/day")
        if not np.any(demand > 0):
            demand = np.ones(12)
        weighted = True
    h = np.asarray(insolation_kwh_m2_day, dtype=float)
    sun = None
    if horizon:
        from offgrid.climate.sunpos import mean_day_sun_paths

        sun = mean_day_sun_paths(latitude_deg, longitude_deg, elevation_m)

    def poa(tilts):
        return poa_monthly(
            h,
            latitude_deg,
            tilts,
            az,
            albedo,
            horizon=horizon,
            longitude_deg=longitude_deg,
            elevation_m=elevation_m,
            sun=sun,
        ).poa_kwh_m2_day

    lo, hi = float(min_tilt_deg), 90.0
    # one evaluation of the 1-degree grid serves both criteria, then one of both fine grids
    coarse = np.unique(np.concatenate([np.arange(lo, hi, 1.0), [hi]]))
    p_coarse = poa(coarse)
    fine_w = _fine_grid(_argmax_low(_worst_ratio(p_coarse, demand), coarse), lo, hi)
    fine_a = _fine_grid(_argmax_low(_annual(p_coarse), coarse), lo, hi)
    p_fine = poa(np.concatenate([fine_w, fine_a]))
    worst_tilt = _argmax_low(_worst_ratio(p_fine[: fine_w.size], demand), fine_w)
    annual_tilt = _argmax_low(_annual(p_fine[fine_w.size :]), fine_a)
    both = poa(np.array([worst_tilt, annual_tilt]))
    p_w, p_a = both[0], both[1]
    r_w, r_a = _worst_ratio(both, demand)
    used = demand > 0
    ratio_w = np.where(used, p_w / np.where(used, demand, 1.0), np.inf)
    design_month = int(np.argmin(ratio_w)) + 1
    ann_w, ann_a = _annual(both)
    gain = (r_w / r_a - 1.0) * 100.0 if r_a > 0 else 0.0
    loss = (1.0 - ann_w / ann_a) * 100.0 if ann_a > 0 else 0.0
    return TiltChoice(
        tilt_deg=worst_tilt,
        annual_tilt_deg=annual_tilt,
        difference_deg=round(worst_tilt - annual_tilt, 6),
        azimuth_deg=az,
        min_tilt_deg=lo,
        at_minimum=worst_tilt <= lo + 1e-9,
        design_month=design_month,
        poa_kwh_m2_day=tuple(float(x) for x in p_w),
        poa_annual_tilt_kwh_m2_day=tuple(float(x) for x in p_a),
        worst_month_poa_kwh_m2_day=float(p_w[design_month - 1]),
        worst_month_gain_pct=float(gain),
        annual_kwh_m2=float(ann_w),
        annual_best_kwh_m2=float(ann_a),
        annual_loss_pct=float(max(loss, 0.0)),
        demand_weighted=weighted,
    )


def describe_tilt(choice: TiltChoice) -> str:
    """One line for people: the chosen tilt, the annual optimum and the difference."""
    month = MONTH_NAMES[choice.design_month - 1]
    held = " (held at the self-cleaning minimum)" if choice.at_minimum else ""
    return (
        f"tilt {choice.tilt_deg:.1f} deg{held} serves best the month with the least sun "
        f"on the array for its demand ({month}); the best annual tilt is "
        f"{choice.annual_tilt_deg:.1f} deg ({choice.difference_deg:+.1f} deg): "
        f"{choice.worst_month_gain_pct:.1f} % more in that month for "
        f"{choice.annual_loss_pct:.1f} % less over the year (the design month, with each "
        "month's own derates, can differ)"
    )


def tilt_reason_inputs(choice: TiltChoice) -> dict[str, str]:
    """Inputs for a :class:`offgrid.design.result.Reason` describing the search."""
    from offgrid.design.result import fmt

    return {
        "azimuth": fmt(choice.azimuth_deg, "deg"),
        "self-cleaning minimum": fmt(choice.min_tilt_deg, "deg"),
        "least sun for the demand": MONTH_NAMES[choice.design_month - 1],
        "best annual tilt": fmt(choice.annual_tilt_deg, "deg"),
        "difference": fmt(choice.difference_deg, "deg"),
        "worst-month gain": fmt(choice.worst_month_gain_pct, "%"),
        "annual loss": fmt(choice.annual_loss_pct, "%"),
        "demand weighting": "monthly demand" if choice.demand_weighted else "equal months",
    }


TILT_FORMULA = (
    "tilt searched on a 1-degree grid refined to 0.1 degree, from the self-cleaning minimum "
    "to 90 degrees, maximising the lowest ratio of monthly plane-of-array insolation to "
    "monthly demand (Liu-Jordan isotropic sky with Klein's Rb)"
)
TILT_SOURCE = (
    "Duffie & Beckman 4th ed. sec. 2.19; Klein (1977) Solar Energy 19; search criterion and "
    "10-degree minimum: common practice, no source"
)
