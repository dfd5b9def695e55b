"""Design variants: overrides applied and checked, compared side by side with differences marked."""

from __future__ import annotations

import pytest

from offgrid.design.sizing import design
from offgrid.economics.variants import apply_variant, compare_variants, flatten_overrides
from offgrid.project.model import Variant
from offgrid.project.store import dumps_project, loads_project
from tests.conftest import hand_project
from tests.report_helpers import demo


def test_apply_variant_changes_only_a_copy():
    project = hand_project()
    v = Variant("PWM 12 V", {"controller.type": "pwm", "choices.system_voltage": 12})
    out = apply_variant(project, v)
    assert out.controller.type == "pwm" and out.choices.system_voltage == 12
    assert project.controller.type == "mppt" and project.choices.system_voltage == 24


def test_nested_tables_mean_dotted_keys():
    nested = {"battery": {"chemistry": "lifepo4", "max_dod": 0.8}, "loads[2]": {"hours_per_day": 2}}
    assert flatten_overrides(nested) == [
        ("battery.chemistry", "lifepo4"),
        ("battery.max_dod", 0.8),
        ("loads[2].hours_per_day", 2),
    ]
    out = apply_variant(hand_project(), Variant("n", nested))
    assert out.battery.chemistry == "lifepo4"
    assert out.loads[1].hours_per_day == 2.0 and isinstance(out.loads[1].hours_per_day, float)


@pytest.mark.parametrize(
    ("overrides", "fragment"),
    [
        ({"controller.kind": "pwm"}, "'kind' is not a field"),
        ({"batery.chemistry": "gel"}, "'batery' is not a field"),
        ({"controller.type": "shunt"}, "must be one of"),
        ({"battery.capacity_ah": "big"}, "not a number"),
        ({"loads[9].power_w": 5}, "loads[9] does not exist"),
        ({"battery.max_dod": 2.0}, "battery.max_dod"),
        ({"variants": []}, "cannot change"),
    ],
)
def test_bad_override_names_variant_and_path(overrides, fragment):
    with pytest.raises(ValueError) as exc:
        apply_variant(hand_project(), Variant("Bad one", overrides))
    assert "variant 'Bad one'" in str(exc.value)
    assert fragment in str(exc.value)


def test_variants_survive_save_and_load():
    project, _ = demo()
    again = loads_project(dumps_project(project))
    assert [v.name for v in again.variants] == [v.name for v in project.variants]
    assert again.variants[0].overrides == {"controller.type": "pwm"}
    assert again.prices == project.prices and again.economics == project.economics


def test_compare_demo_variants_marks_differences():
    project, base = demo()
    cmp = compare_variants(project, base)
    names = [c.name for c in cmp.columns]
    assert names == ["Base design", "PWM controller", "Lithium bank"]
    assert all(c.error is None for c in cmp.columns)
    # every column is the plain design of its variant
    for col in cmp.columns[1:]:
        v = next(v for v in project.variants if v.name == col.name)
        ref = design(apply_variant(project, v), base)
        assert col.design.array.power_w == ref.array.power_w
        assert col.design.battery.capacity_ah == ref.battery.capacity_ah
    ctype = cmp.row("controller.type")
    assert ctype.values == ("mppt", "pwm", "mppt")
    assert ctype.differs == (False, True, False)
    units = cmp.row("Battery units")
    assert units.values[0] == 24 and units.differs[2]
    lcc = cmp.row("Lifecycle cost")
    assert all(isinstance(v, float) for v in lcc.values)
    assert lcc.differs[1] == (lcc.values[1] != lcc.values[0])
    assert not any(r.differs[0] for r in cmp.rows)  # the base never differs from itself


def test_variant_that_does_not_design_keeps_its_column():
    project = hand_project()
    project.variants = [Variant("Tiny controller", {"controller.max_pv_voltage_v": 30})]
    cmp = compare_variants(project)
    col = cmp.columns[1]
    assert col.design is None and "cannot design" in col.error
    assert cmp.row("Array power installed").values[1] is None
    assert cmp.row("Array power installed").differs[1] is False


def test_counts_and_battery_life_read_as_elsewhere():
    """Warnings and notes counted apart as in the headline; battery life names its method."""
    from offgrid.economics.variants import battery_life_label

    assert battery_life_label(["chemistry preset, typical service life"]) == "Battery life, preset"
    assert (
        battery_life_label(["reliability simulation (battery wear)"]) == "Battery life, simulated"
    )
    assert (
        battery_life_label(["reliability simulation (battery wear)", "chemistry preset"])
        == "Battery life, preset or simulated"
    )
    from offgrid.economics.variants import COUNT_ROWS

    labels = [r[0] for r in COUNT_ROWS]
    assert labels == ["Warnings", "Notes"]
