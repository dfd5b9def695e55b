"""Planning shares the demand-dependent steps that read a row's energy, not its peak.

A village's distinct rows repeat each surveyed daily energy with several peak powers.
Inside ``with design_memo():`` the sun, site record, design-month and battery steps of
:func:`offgrid.design.sizing.design` are memoised, keyed by every argument they take: a
row whose energy was seen before reuses them.  The check here is the engine itself: every
design made the planning way (memo on, plain reasons, many rows in a row) must equal the
same project designed alone by ``design()`` with no memo and full reasons, figure by
figure (``SystemDesign.to_dict()`` whole, reasons and warnings included) and as planning's
compact record (``summarise``).  Exact equality, no tolerance.

The projects are invented: the invented demo home parts (LiFePO4, PWM) and variants with
an MPPT controller and a valve-regulated or flooded lead-acid bank, on every bundled
invented demo climate, with random invented demands.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

import offgrid.design.sizing as sizing
from offgrid.climate.files import load_climate
from offgrid.design.result import DesignError, plain_reasons
from offgrid.memo import design_memo, memo_active
from offgrid.paths import climates_dir
from offgrid.plan.rows import communities_dir, summarise
from offgrid.project.model import ClimateChoice, Load, Project
from offgrid.project.store import load_project

DEMO_CLIMATES = sorted(p.stem for p in climates_dir().glob("*-demo.toml"))
BATTERIES = {
    "lifepo4": {},  # the parts file's own 12.8 V LiFePO4 block
    "agm": {"chemistry": "agm", "nominal_voltage_v": 12.0, "capacity_ah": 100.0},
    "flooded": {"chemistry": "flooded", "nominal_voltage_v": 2.0, "capacity_ah": 200.0},
}


def _parts() -> Project:
    return load_project(communities_dir() / "kisanga-ridge-home-parts.toml")


def _village(climate: str, controller: str, battery: str) -> Project:
    """A village's shared base: the parts, the climate inline, the site from the climate
    and one tilt (planning designs a village at one tilt)."""
    p = _parts()
    c = load_climate(climate)
    p.climate = ClimateChoice(inline=c)
    p.site.latitude_deg = c.latitude_deg
    p.site.longitude_deg = c.longitude_deg or 0.0
    p.site.elevation_m = c.elevation_m or 0.0
    p.site.tilt_deg = float(min(60.0, abs(c.latitude_deg) + 10.0))
    p.controller = replace(p.controller, type=controller)
    if controller == "mppt":
        p.controller = replace(p.controller, max_pv_voltage_v=150.0)
    p.battery = replace(p.battery, **BATTERIES[battery])
    return p


def _rows(base: Project, n: int, seed: int) -> list[Project]:
    """``n`` invented surveyed rows: each energy comes with several peaks (as a survey's
    distinct rows do), AC and DC."""
    rng = np.random.default_rng(seed)
    out = []
    energies = rng.integers(4, 160, max(1, n // 3)) * 10.0
    for i in range(n):
        energy = float(energies[i % len(energies)])
        peak = float(max(10.0, round(energy / rng.uniform(2.5, 9.0) / 5.0) * 5.0))
        p = Project(info=replace(base.info), site=base.site, climate=base.climate)
        for name in ("module", "battery", "controller", "inverter", "wiring", "choices"):
            setattr(p, name, getattr(base, name))
        p.choices = replace(base.choices, coincidence_factor=1.0)
        p.loads = [
            Load(
                name="surveyed demand",
                quantity=1,
                power_w=peak,
                hours_per_day=min(24.0, energy / peak),
                ac_dc="ac" if i % 4 == 0 else "dc",
                surge_w=3.0 * peak if i % 8 == 0 else 0.0,
            )
        ]
        out.append(p)
    return out


def _alone(p: Project):
    """The engine on its own: no memo, full reasons."""
    assert not memo_active()
    try:
        d = sizing.design(p)
    except DesignError as exc:
        return ("refused", exc.code, str(exc))
    return d.to_dict(), summarise(p, d)


def _planned(projects: list[Project]):
    """The planning way: one memo for the whole village, plain reasons."""
    out = []
    with design_memo(), plain_reasons():
        for p in projects:
            try:
                d = sizing.design(p)
            except DesignError as exc:
                out.append(("refused", exc.code, str(exc)))
                continue
            out.append((d.to_dict(), summarise(p, d)))
    return out


@pytest.mark.parametrize("battery", sorted(BATTERIES))
@pytest.mark.parametrize("controller", ["pwm", "mppt"])
@pytest.mark.parametrize("climate", DEMO_CLIMATES)
def test_planned_designs_equal_the_engine_alone(climate, controller, battery):
    base = _village(climate, controller, battery)
    rows = _rows(base, 15, seed=len(climate) * 7 + len(controller) + len(battery))
    planned = _planned(rows)
    alone = [_alone(p) for p in rows]
    designed = [a for a in alone if a[0] != "refused"]
    assert len(designed) >= len(rows) // 2  # the check covers real designs
    for i, (got, want) in enumerate(zip(planned, alone, strict=True)):
        assert got == want, f"row {i} of {climate} {controller} {battery}"


def test_rows_of_one_energy_share_the_battery_and_site_steps(monkeypatch):
    calls = {"battery": 0, "site": 0}
    size_battery, site_record = sizing.size_battery, sizing.site_record

    def counted_battery(*args, **kwargs):
        calls["battery"] += 1
        return size_battery(*args, **kwargs)

    def counted_site(*args, **kwargs):
        calls["site"] += 1
        return site_record(*args, **kwargs)

    monkeypatch.setattr(sizing, "size_battery", counted_battery)
    monkeypatch.setattr(sizing, "site_record", counted_site)
    base = _village("kisanga-ridge-demo", "pwm", "lifepo4")
    rows = []
    for peak in (20.0, 35.0, 50.0, 80.0):  # one daily energy, four peaks: four distinct rows
        p = _rows(base, 1, seed=1)[0]
        p.loads = [replace(p.loads[0], power_w=peak, hours_per_day=400.0 / peak, ac_dc="dc")]
        rows.append(p)
    planned = _planned(rows)
    assert len({d[1].peak_capacity_w for d in planned}) == 4  # four different designs
    assert calls == {"battery": 1, "site": 1}
    calls.update(battery=0, site=0)
    assert [_alone(p) for p in rows] == planned  # alone: each row runs every step
    assert calls == {"battery": 4, "site": 4}


def test_a_memoised_step_follows_the_reason_kind():
    """Full reasons after plain ones inside one memo (the text UI keeps its memo open):
    the reasons are the full records, not the plain tuples first computed."""
    from offgrid.design.result import PlainReason, Reason

    p = _rows(_village("dalli-wells-demo", "mppt", "agm"), 1, seed=3)[0]
    with design_memo():
        with plain_reasons():
            quick = sizing.design(p)
        full = sizing.design(p)
    assert all(isinstance(r, PlainReason) for r in quick.reasons.values())
    assert all(isinstance(r, Reason) for r in full.reasons.values())
    assert full.to_dict() == _alone(p)[0]
