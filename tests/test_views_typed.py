"""Every view renders from typed records: no figure is a placeholder, a renamed field raises.

Structural checks of this code base (no published source applies).  The views read the
design's records by their declared fields, with no ``getattr(..., default)``: a figure
that went missing would show a blank, a '-', ``None`` or ``nan``; a renamed field would
have shown a default (0, blank) and now raises AttributeError instead.
"""

from __future__ import annotations

import dataclasses
import re

import pytest

from offgrid.design.sizing import design
from offgrid.economics.bom import bill_of_materials
from offgrid.economics.costs import lifecycle_cost
from offgrid.paths import demo_project_path
from offgrid.project.model import Load
from offgrid.project.store import load_project
from offgrid.report import render
from offgrid.report.build import build_report
from offgrid.report.document import Figures, Table
from offgrid.report.summary import summary_text
from offgrid.simulate.life import BatteryWear
from offgrid.simulate.reliability import Reliability
from offgrid.tui.screens.curves import array_curves
from offgrid.tui.sections.sizes import figure_rows
from offgrid.tui.sections.wires import basic_rows, runs_of
from tests.conftest import hand_project

PLACEHOLDER = re.compile(r"^(|-|None|nan|inf|-inf)$", re.IGNORECASE)
MISSING_WORD = re.compile(r"\b(None|nan)\b")


def _cases():
    demo_path = demo_project_path()
    variant = hand_project()  # PWM controller, flooded lead-acid, DC loads only: no inverter
    variant.controller.type = "pwm"
    variant.battery.chemistry = "flooded"
    variant.loads = [Load("DC lights", 4, 10.0, 5.0, "dc"), Load("DC fridge", 1, 60.0, 10.0, "dc")]
    return {"demo": (load_project(demo_path), demo_path.parent), "pwm-flooded-dc": (variant, None)}


CASES = _cases()


def _views(project, base, d) -> dict[str, str]:
    """Every text a view makes of the design (the report in all three formats)."""
    report = build_report(project, d, base=base, with_charts=False, with_variants=False)
    bom = bill_of_materials(project, d)
    cost = lifecycle_cost(project, d, bom)
    rows = [r for r in figure_rows(d) if not isinstance(r, str)]
    return {
        "summary": summary_text(project, d),
        "report-txt": render(report, "txt"),
        "report-md": render(report, "md"),
        "bom": "\n".join(f"{ln.description} {ln.quantity:g} {ln.follows}" for ln in bom),
        "cost": " ".join(f"{ln.key} {ln.quantity:g}" for ln in cost.lines),
        "sizes": "\n".join(f"{label}: {value}" for label, value, _path in rows),
        "wires": "\n".join(f"{label}: {value}" for label, value, _path in basic_rows(d)),
        "curves": "\n".join(c.title for c in array_curves(project, d)),
    }


@pytest.mark.parametrize("name", list(CASES))
def test_no_view_shows_a_missing_value(name):
    project, base = CASES[name]
    d = design(project, base)
    if name != "demo":
        assert d.controller.type == "pwm" and not d.inverter.needed
        assert d.battery.chemistry == "flooded"
    for view, text in _views(project, base, d).items():
        assert text.strip(), view
        assert not MISSING_WORD.search(text), (view, MISSING_WORD.search(text))
    # every figure cell of the report (a cell naming a design figure) shows a value
    report = build_report(project, d, base=base, with_charts=False, with_variants=False)
    checked = 0
    for section in report.sections:
        for block in section.blocks:
            cells = []
            if isinstance(block, Table):
                cells = [c for row in block.rows for c in row]
            elif isinstance(block, Figures):
                cells = [item.cell for item in block.items]
            for cell in cells:
                if cell.path:
                    assert not PLACEHOLDER.match(cell.text.strip()), (section.key, cell)
                    checked += 1
    assert checked > 50
    # the text UI's figure rows and cable table show a value in every cell
    for label, value, _path in [r for r in figure_rows(d) if not isinstance(r, str)]:
        assert not PLACEHOLDER.match(value.strip()), (label, value)
    runs = runs_of(d)
    assert runs and all(w.length_path for w in runs)
    assert len(array_curves(project, d)) == 3


def _renamed(record, old: str, new: str):
    """A copy of a frozen record whose class has field ``old`` renamed to ``new``."""
    cls = type(record)
    spec = [(new if f.name == old else f.name, f.type) for f in dataclasses.fields(cls)]
    renamed = dataclasses.make_dataclass(f"Renamed{cls.__name__}", spec, frozen=True)
    return renamed(
        **{
            (new if f.name == old else f.name): getattr(record, f.name)
            for f in dataclasses.fields(cls)
        }
    )


def _with_wires(d, old, new):
    er = d.electrical
    wires = tuple(_renamed(w, old, new) for w in er.wires)
    return dataclasses.replace(d, electrical=dataclasses.replace(er, wires=wires))


def _with_mpp(d, old, new):
    er = d.electrical
    return dataclasses.replace(
        d, electrical=dataclasses.replace(er, mpp=_renamed(er.mpp, old, new))
    )


def _with_devices(d, old, new):
    er = d.electrical
    devices = tuple(_renamed(x, old, new) for x in er.protection.devices)
    return dataclasses.replace(
        d,
        electrical=dataclasses.replace(
            er, protection=dataclasses.replace(er.protection, devices=devices)
        ),
    )


@pytest.mark.parametrize(
    ("view", "change", "old"),
    [
        ("report", _with_wires, "drop_pct"),  # the report's own table read it with a default 0
        ("bom", _with_wires, "length_m"),  # the cable line was dropped
        ("bom", _with_devices, "count"),  # was counted as 1
        ("sizes", _with_mpp, "pmp_w"),  # the rows were cut short
    ],
)
def test_a_renamed_field_fails_instead_of_showing_a_default(view, change, old):
    project, base = CASES["demo"]
    d = change(design(project, base), old, old + "_renamed")
    with pytest.raises(AttributeError, match=old):
        if view == "report":
            build_report(project, d, base=base, with_charts=False, with_variants=False)
        elif view == "bom":
            bill_of_materials(project, d)
        else:
            figure_rows(d)


def test_a_renamed_simulation_field_fails_instead_of_the_preset_battery_life():
    """The simulated battery life was read with a default: renamed, the preset was used."""

    def zeros(cls, **given):
        values = {f.name: 0 for f in dataclasses.fields(cls) if f.name != "reasons"}
        return cls(**{**values, **given})

    wear = zeros(BatteryWear, cycle_hist=(), expected_life_years=6.3)
    rel = zeros(Reliability, months=(), worst_year_soc_min=(), notes=(), wear=wear)
    project, base = CASES["demo"]
    d = design(project, base)
    bom = bill_of_materials(project, d)
    assert lifecycle_cost(project, d, bom, rel).battery_life_years == 6.3
    renamed = dataclasses.replace(
        rel, wear=_renamed(wear, "expected_life_years", "expected_life_years_renamed")
    )
    with pytest.raises(AttributeError, match="expected_life_years"):
        lifecycle_cost(project, d, bom, renamed)


def _auto_fields():
    from offgrid.tui.fields import PARTS_FIELDS, PROJECT_FIELDS

    return [
        f for f in (*PROJECT_FIELDS, *PARTS_FIELDS) if not isinstance(f, str) and f.auto is not None
    ]


def test_an_automatic_field_shows_the_design_value_and_a_renamed_one_raises():
    """A field left to 'auto' shows what the design chose; that figure was read under a
    blanket suppress, so a renamed one showed the bare 'auto' text."""
    project, base = CASES["demo"]
    d = design(project, base)
    fields = _auto_fields()
    assert {f.path for f in fields} >= {"site.tilt_deg", "controller.max_current_a"}
    for f in fields:
        assert "\u2192" in f.show(None, d), f.path
    tilt = next(f for f in fields if f.path == "site.tilt_deg")
    renamed = dataclasses.replace(d, site=_renamed(d.site, "tilt_deg", "tilt_deg_renamed"))
    with pytest.raises(AttributeError, match="tilt_deg"):
        tilt.show(None, renamed)
