"""The sizing pipeline's use of the climate work: tilt search, horizon, low-sun notice."""

from __future__ import annotations

import numpy as np
import pytest

from offgrid.climate.files import load_climate
from offgrid.climate.tilt import best_tilt
from offgrid.design.sizing import design
from offgrid.project.model import ClimateChoice, Load, Project, ProjectInfo, Site
from offgrid.project.store import ProjectFileError, dumps_project, loads_project


def _project(climate_name: str, **site) -> Project:
    """An invented small household (demonstration data, tests only)."""
    c = load_climate(climate_name)
    return Project(
        info=ProjectInfo(name="Test household", demo=True),
        site=Site(
            name=climate_name,
            latitude_deg=c.latitude_deg,
            longitude_deg=c.longitude_deg,
            elevation_m=c.elevation_m,
            **site,
        ),
        climate=ClimateChoice(ref=climate_name),
        loads=[
            Load("LED lights", 4, 6.0, 5.0, "dc"),
            Load("Radio", 1, 15.0, 4.0, "dc"),
            Load("Fridge", 1, 60.0, 12.0, "ac"),
        ],
    )


def test_tilt_left_automatic_is_searched_for_the_worst_month():
    p = _project("greensboro-nc-tmy3")
    d = design(p)
    c = load_climate("greensboro-nc-tmy3")
    expected = best_tilt(
        c.insolation_kwh_m2_day,
        c.latitude_deg,
        180.0,
        d.loads.daily_energy_wh,
        p.site.albedo,
        p.choices.min_tilt_deg,
    )
    assert d.site.tilt_deg == expected.tilt_deg
    assert d.site.tilt_deg > abs(c.latitude_deg)  # winter-limited: steeper than latitude
    reason = d.why("site.tilt_deg")
    assert "searched" in reason.formula and "Klein" in reason.source
    assert any(n.code == "tilt-searched" for n in d.warnings)


def test_set_tilt_is_kept():
    d = design(_project("greensboro-nc-tmy3", tilt_deg=25.0))
    assert d.site.tilt_deg == 25.0
    assert d.why("site.tilt_deg").formula == "set by the user"


def test_southern_site_faces_north():
    d = design(_project("tarn-station-demo"))
    assert d.site.azimuth_deg == 0.0 and d.site.tilt_deg >= 10.0
    assert d.site.design_month in (5, 6, 7)


def test_horizon_lowers_the_plane_insolation_and_is_explained():
    ridge = [(120.0, 0.0), (130.0, 25.0), (230.0, 25.0), (240.0, 0.0)]
    open_ = design(_project("greensboro-nc-tmy3", tilt_deg=40.0))
    shaded = design(_project("greensboro-nc-tmy3", tilt_deg=40.0, horizon_deg=ridge))
    assert np.all(
        np.asarray(shaded.site.poa_kwh_m2_day) <= np.asarray(open_.site.poa_kwh_m2_day) + 1e-12
    )
    assert shaded.site.poa_kwh_m2_day[11] < 0.8 * open_.site.poa_kwh_m2_day[11]
    assert shaded.array.power_w >= open_.array.power_w
    reason = dict(shaded.why("site.poa_kwh_m2_day").inputs)
    assert "horizon" in reason and "horizon loss" in reason


def test_low_sun_design_month_is_flagged():
    # Myrvik (invented, 63.4 N): December's 0.07 kWh/m2/day is the design month; the monthly
    # transposition is unreliable there (tests/test_climate_poa.py measured 20-50 % high).
    p = _project("myrvik-cabin-demo", tilt_deg=70.0)
    p.loads = [Load("LED lights", 2, 5.0, 3.0, "dc")]
    d = design(p)
    assert d.site.design_month in (11, 12, 1)
    assert any(n.code == "low-sun-month" for n in d.warnings)


def test_horizon_survives_the_project_file_and_is_validated():
    p = _project("greensboro-nc-tmy3", horizon_deg=[(90.0, 12.0), (180.0, 5.0)])
    text = dumps_project(p)
    assert "horizon_deg" in text
    back = loads_project(text)
    assert [tuple(x) for x in back.site.horizon_deg] == [(90.0, 12.0), (180.0, 5.0)]
    bad = dumps_project(_project("greensboro-nc-tmy3", horizon_deg=[(90.0, 12.0), (180.0, 95.0)]))
    with pytest.raises(ProjectFileError, match=r"site\.horizon_deg: point 2: elevation 95"):
        loads_project(bad)


def test_climate_albedo_used_unless_the_site_sets_one():
    # A snow-month reflectance in the climate (Duffie & Beckman 4th ed. Example 2.19.1's
    # months) raises the array-plane insolation of those months when the site leaves its
    # albedo automatic; a value on the site wins.
    from dataclasses import replace

    from offgrid.design.sizing import design
    from offgrid.project.model import ClimateChoice
    from tests.conftest import hand_project

    snow = [0.7, 0.7, 0.4, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.4]
    p = hand_project()
    p.site.tilt_deg = 60.0
    p.site.albedo = None
    plain = design(p).site.poa_kwh_m2_day
    p.climate = ClimateChoice(inline=replace(p.climate.inline, albedo=snow))
    d = design(p)
    snowy = d.site.poa_kwh_m2_day
    assert snowy[0] > plain[0] and snowy[5] == pytest.approx(plain[5])
    assert "0.7 Jan-Feb" in dict(d.reasons["site.poa_kwh_m2_day"].inputs)["albedo"]
    p.site.albedo = 0.2
    assert design(p).site.poa_kwh_m2_day[0] == pytest.approx(plain[0])


def test_low_sun_month_capped_in_the_design_with_a_warning():
    # 64 N with 0.1 kWh/m2/day in December (invented): the array-plane value is held at the
    # clearest-sky ceiling on the plane (tests/test_sky_albedo.py) and the design says so.
    from dataclasses import replace

    from offgrid.climate.poa import clearest_sky_ceiling
    from tests.conftest import hand_project

    p = hand_project()
    p.site.latitude_deg = 64.0
    p.site.tilt_deg = 60.0
    p.climate = ClimateChoice(
        inline=replace(
            p.climate.inline,
            insolation_kwh_m2_day=[0.3, 1.0, 2.4, 4.0, 5.0, 5.5, 5.0, 3.8, 2.2, 1.0, 0.3, 0.1],
        )
    )
    d = design(p)
    ceiling = clearest_sky_ceiling(64.0, 60.0, 180.0, None, p.site.elevation_m)
    assert d.site.poa_kwh_m2_day[11] == pytest.approx(ceiling[11])
    notice = next(n for n in d.warnings if n.code == "poa-capped")
    assert "Dec" in notice.message and notice.severity == "warning"
    assert "held at the clearest-sky" in d.reasons["site.poa_kwh_m2_day"].formula


def test_climate_albedo_reaches_the_harvest_as_the_site_value_would():
    # The albedo in force (site, else climate, else 0.2) is one figure of the design that the
    # I-V harvest's mean-day profile reads too: a snow-month reflectance given in the climate
    # file gives the same harvest as the same values typed on the site.
    from dataclasses import replace

    from offgrid.design.sizing import design
    from offgrid.project.model import ClimateChoice
    from tests.conftest import hand_project

    snow = [0.7, 0.7, 0.4, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.2, 0.4]
    p = hand_project()
    p.site.tilt_deg = 60.0
    p.site.albedo = None
    p.climate = ClimateChoice(inline=replace(p.climate.inline, albedo=snow))
    from_climate = design(p)
    assert from_climate.site.albedo == pytest.approx(snow)
    assert "climate file" in from_climate.reasons["site.albedo"].formula
    p.site.albedo = snow
    from_site = design(p)
    assert from_climate.array.harvest_mppt_wh_day == pytest.approx(
        from_site.array.harvest_mppt_wh_day, rel=1e-9
    )
