"""The module's fit and its operating point at solar noon of the design month."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.design.harvest import daily_poa_profile
from offgrid.design.pv import (
    DiodeParams,
    IVCurve,
    OperatingPoint,
    cell_temperature_ross,
    iv_curve,
    validate_module,
)
from offgrid.design.result import (
    DesignError,
    Notice,
    Reason,
    ReasonBook,
    SiteResult,
    fmt,
    reason_kind,
)
from offgrid.memo import memoised
from offgrid.project.model import ModuleSpec


@dataclass(frozen=True)
class FitStep:
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


@dataclass(frozen=True)
class NoonStep:
    profile: np.ndarray  # plane-of-array irradiance [W/m2], months x steps of the mean day
    step_h: float
    temp_day_c: np.ndarray  # 12 months
    curve: IVCurve
    mpp: OperatingPoint
    reasons: dict[str, Reason]


def _fit_error(error_pct: float) -> str:
    """A fit error to 0.001 % (the fit's tolerance is 0.5 %): float noise of ~1e-14 %
    reads 0, the same on every processor."""
    return fmt(round(float(error_pct), 3) + 0.0, "%")


def module_fit_step(module: ModuleSpec, params: DiodeParams) -> FitStep:
    """The fit's reason (its STC errors) and the datasheet's consistency warnings."""
    rb = ReasonBook()
    notices = [
        Notice("module-cells", text, "warning", "module.cells_in_series")
        for text in validate_module(module)
    ]
    rb.add(
        "module.fit",
        "single-diode model fitted to the datasheet; reproduces Vmp, Imp, Voc, "
        "Isc at STC within 0.5 %",
        params.method,
        vmp_error=_fit_error(params.stc_error_pct[0]),
        imp_error=_fit_error(params.stc_error_pct[1]),
        voc_error=_fit_error(params.stc_error_pct[2]),
        isc_error=_fit_error(params.stc_error_pct[3]),
    )
    return FitStep(rb.freeze(), tuple(notices))


def noon_operating_point(
    module: ModuleSpec, params: DiodeParams, site: SiteResult, albedo
) -> NoonStep:
    """The design month's mean-day irradiance profile and one module's I-V curve at its noon.

    ``albedo``: the ground reflectance in force (the site result's, else the project's).
    What it reads of the module and the site is passed on to :func:`_noon_point`, which
    planning memoises on exactly those figures (a village's designs share a few design
    months, not their demands).
    """
    return _noon_point(
        module.noct_c,
        module.area_m2,
        params,
        int(site.design_month),
        site.horizontal_kwh_m2_day,
        site.poa_kwh_m2_day,
        site.latitude_deg,
        site.tilt_deg,
        site.azimuth_deg,
        site.temp_day_c,
        albedo,
        reason_kind(),
    )


@memoised
def _noon_point(
    noct_c: float,
    area_m2: float,
    params: DiodeParams,
    design_month: int,
    horizontal_kwh_m2_day,
    poa_kwh_m2_day,
    latitude_deg: float,
    tilt_deg: float,
    azimuth_deg: float,
    temp_day_c,
    albedo,
    kind: type,
) -> NoonStep:
    """:func:`noon_operating_point` on the figures it reads (``kind``: the reason record in
    force, part of the memo's key only)."""
    rb = ReasonBook()
    m = design_month - 1
    profile, step_h = daily_poa_profile(
        horizontal_kwh_m2_day, poa_kwh_m2_day, latitude_deg, tilt_deg, azimuth_deg, albedo
    )
    temp_day = np.asarray(temp_day_c, dtype=float)

    # Design-month operating point at solar noon (the middle of the profile).
    g_noon = float(profile[m].max())
    if not g_noon > 0:
        raise DesignError(
            "no-sun",
            "The design month has no sunshine on the array: check the "
            "climate data and the array tilt.",
            field="climate",
        )
    tc_noon = float(cell_temperature_ross(temp_day[m], g_noon, noct_c))
    curve = iv_curve(params, g_noon, tc_noon, area_m2)
    mpp = curve.point
    src_noon = (
        "De Soto (2006) model at the design month's solar-noon irradiance "
        "(Collares-Pereira & Rabl profile of the monthly insolation) and NOCT cell "
        "temperature"
    )
    rb.add("mpp.month", "the design month", "worst-month method", month=str(m + 1))
    rb.add(
        "mpp.irradiance_w_m2",
        "plane-of-array irradiance at solar noon of the design month's mean day",
        src_noon,
        insolation=fmt(float(poa_kwh_m2_day[m]), "kWh/m2/day"),
    )
    rb.add(
        "mpp.cell_temp_c",
        "daytime air temperature + (NOCT - 20 C) x irradiance / 800 W/m2",
        "Duffie & Beckman 4th ed. eq. 23.3.3 (NOCT method)",
        ambient=fmt(temp_day[m], "C"),
        irradiance=fmt(g_noon, "W/m2"),
        noct=fmt(noct_c, "C"),
    )
    for key in ("voltage_v", "current_a", "power_w", "irradiance_w_m2", "cell_temp_c"):
        rb.add(
            f"iv_curve.{key}",
            "one module's I-V and P-V curve: current and power at evenly "
            "spaced voltages from 0 V to Voc, at the design month's solar-noon irradiance "
            "and cell temperature",
            src_noon,
            irradiance=fmt(g_noon, "W/m2"),
            cell_temp=fmt(tc_noon, "C"),
        )
    for key, val, unit in (
        ("vmp_v", mpp.vmp_v, "V"),
        ("imp_a", mpp.imp_a, "A"),
        ("pmp_w", mpp.pmp_w, "W"),
        ("fill_factor", mpp.fill_factor, ""),
        ("efficiency", mpp.efficiency, ""),
        ("voc_v", mpp.voc_v, "V"),
        ("isc_a", mpp.isc_a, "A"),
    ):
        rb.add(
            f"mpp.{key}",
            "maximum power point, open-circuit voltage and short-circuit "
            "current of one module on its I-V curve; fill factor = Pmp / (Voc Isc); "
            "efficiency = Pmp / (G x area)",
            src_noon,
            irradiance=fmt(g_noon, "W/m2"),
            cell_temp=fmt(tc_noon, "C"),
            value=fmt(val, unit),
            area=fmt(area_m2, "m2"),
        )
    return NoonStep(profile, step_h, temp_day, curve, mpp, rb.freeze())
