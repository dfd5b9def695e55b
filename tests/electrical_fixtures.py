"""A worst-month core built by hand, so that the electrical tests do not depend on sizing.

Invented demonstration data: a small clinic in our own village "Kasamba" at 12 S.
"""

from __future__ import annotations

import numpy as np

from offgrid.climate import sky
from offgrid.project.model import Load, Project, ProjectInfo, Site
from offgrid.result import (
    ArrayResult,
    BatteryResult,
    ControllerResult,
    InverterResult,
    LoadResult,
    SiteResult,
    SystemDesign,
)

HORIZONTAL = (5.6, 5.7, 5.5, 5.3, 5.0, 4.7, 4.9, 5.5, 6.2, 6.5, 6.0, 5.6)
TEMP_DAY = (25.0, 25.0, 25.0, 24.0, 22.0, 20.0, 20.0, 22.0, 26.0, 28.0, 27.0, 25.0)


def demo_project(**controller) -> Project:
    p = Project(info=ProjectInfo(name="Kasamba clinic (demonstration data)", demo=True),
                site=Site(name="Kasamba (demonstration)", latitude_deg=-12.0,
                          longitude_deg=28.0, elevation_m=1200.0))
    p.loads = [Load("vaccine fridge", 1, 60.0, 10.0, "dc", critical=True),
               Load("lights", 8, 9.0, 5.0, "dc"),
               Load("laptop", 1, 65.0, 4.0, "ac")]
    for k, v in controller.items():
        setattr(p.controller, k, v)
    return p


def demo_core(project: Project, *, series=2, parallel=2, system_v=24, record_low_c=2.0,
              chemistry="agm", battery_parallel=1, inverter=True, controller_a=30.0,
              controllers=1, absorption_v=None, demand_wh=1400.0) -> SystemDesign:
    lat = project.site.latitude_deg
    tilt = abs(lat) + 5
    az = sky.equator_facing_azimuth(lat)
    poa = sky.poa_monthly_liu_jordan(HORIZONTAL, lat, tilt, az)["poa"]
    design_month = int(np.argmin(poa)) + 1
    n = series * parallel
    loads = LoadResult((demand_wh,) * 12, (260.0,) * 12, (1000.0,) * 12, (30.0,) * 12, 15.0,
                       (600.0,) * 12, demand_wh, demand_wh, 10.0, 0.7, 65.0, 132.0, 45.5, 92.4,
                       0.0, "", ((600.0,) * 12, (360.0,) * 12, (260.0,) * 12))
    site = SiteResult(design_month, tilt, az, lat, HORIZONTAL, tuple(poa.tolist()),
                      tuple((demand_wh / poa).tolist()), TEMP_DAY, TEMP_DAY, record_low_c,
                      "demonstration")
    pw = project.module.pmax_w
    array = ArrayResult(n * pw, n * pw * 0.9, pw, series, parallel, n,
                        {"soiling": 0.95, "mismatch": 0.98, "wiring": 0.97}, 0.9,
                        tuple(t + 25 for t in TEMP_DAY), (demand_wh * 1.2,) * 12,
                        project.module.voc_v * 1.07, project.module.vmp_v * 0.9,
                        series * project.module.voc_v * 1.07, series * project.module.vmp_v * 0.9)
    vabs = absorption_v or {"lifepo4": 14.2, "flooded": 14.8}.get(chemistry, 14.4) * system_v / 12
    bs = int(system_v // 12)
    battery = BatteryResult(chemistry, system_v, 200.0 * battery_parallel, 190.0, 4.8, 2.4, 0.5,
                            3.0, bs, battery_parallel, bs * battery_parallel, 1.0, 0.8, 0.92,
                            vabs)
    ctrl = ControllerResult(project.controller.type, controller_a * 0.9, controller_a,
                            controllers, project.controller.max_pv_voltage_v,
                            project.controller.efficiency)
    inv = InverterResult(inverter, 65.0, 300.0, 0.0, 600.0, 0.9, 15.0,
                         300.0 / (0.9 * system_v) if inverter else 0.0)
    return SystemDesign(loads, site, array, battery, ctrl, inv, (), ())
