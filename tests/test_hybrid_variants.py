"""Variants "solar only" beside "hybrid" (issue 16): the generator switched off and on,
the hybrid column's figures are the hybrid study's own (run here, not typed in)."""

from __future__ import annotations

import copy

import pytest

from offgrid.economics.hybrid_mix import _solar_costs
from offgrid.economics.variants import apply_variant, compare_variants
from offgrid.generator.study import generator_study, hybrid_demo_path
from offgrid.project.model import Variant
from offgrid.project.store import load_project

YEARS = 5  # shorter than the CLI's 20 years: the same study, fewer weather years


def _study(project, base):
    return generator_study(project, base, years=YEARS)


@pytest.fixture(scope="module")
def lodge():
    p = load_project(hybrid_demo_path())
    p.economics.battery_life_years = 12.0  # one life for every column (see the LCC check)
    p.variants = [Variant("Solar only", {"generator": False}, "no generator")]
    base = hybrid_demo_path().parent
    cmp = compare_variants(p, base, with_generator=True, study=_study)
    return p, base, cmp


@pytest.fixture(scope="module")
def lodge_study(lodge):
    """The lodge's study, run on its own (not the comparison's)."""
    p, base, _ = lodge
    return generator_study(p, base, years=YEARS)


def test_switch_off_and_on():
    p = load_project(hybrid_demo_path())
    assert apply_variant(p, Variant("off", {"generator": "off"})).generator is None
    on = apply_variant(p, Variant("on", {"generator": True}))
    assert on.generator == p.generator and on.generator is not p.generator
    assert p.generator is not None  # the project itself unchanged
    solo = copy.deepcopy(p)
    solo.generator = None
    with pytest.raises(
        ValueError, match=r"variant 'on': generator: the project has no \[generator\]"
    ):
        apply_variant(solo, Variant("on", {"generator": "on"}))
    with pytest.raises(ValueError, match="must be true or false"):
        apply_variant(p, Variant("bad", {"generator": "maybe"}))


def test_hybrid_column_is_the_study(lodge, lodge_study):
    _, _, cmp = lodge
    st = lodge_study  # the study, run on its own
    hyb, solo = cmp.columns
    assert hyb.hybrid is not None and solo.hybrid is None and solo.project.generator is None

    def vals(label):
        row = cmp.row(label)
        assert row is not None and row.group == "hybrid", label
        return row.values

    assert st.mix is not None and st.chosen.startswith("the cheapest")
    assert list(vals("Mix: array")) == [
        pytest.approx(st.mix.cheapest.array_w),
        solo.design.array.power_w,
    ]
    assert list(vals("Mix: battery, nominal")) == [
        pytest.approx(st.mix.cheapest.battery_kwh),
        solo.design.battery.nominal_kwh,
    ]
    assert vals("Generator fuel")[0] == pytest.approx(st.run.fuel_l_per_year)
    assert vals("Generator fuel")[1] == 0
    assert vals("Generator run hours")[0] == pytest.approx(st.run.run_hours_per_year)
    assert list(vals("Mix: solar fraction")) == [pytest.approx(100 * st.run.solar_fraction), 100.0]
    assert vals("Mix: lifecycle cost")[0] == pytest.approx(st.mix.cheapest.lcc)
    # the cheapest hybrid burns some fuel and takes part of the energy from the sun
    assert st.run.fuel_l_per_year > 0 and 0 < st.run.solar_fraction < 1
    assert cmp.row("generator").texts == ("on", "off")
    assert solo.overrides == (("generator", "off"),)


def test_solar_column_costed_as_the_studys_solar_only_point(lodge, lodge_study):
    """Both columns count the same parts: the solar-only column's "Mix: lifecycle cost" is
    the trade-off's solar-only point (same array, battery and life, no generator)."""
    p, _, cmp = lodge
    st = lodge_study
    solo = cmp.columns[1]
    assert st.mix.solar_only.array_w == pytest.approx(solo.design.array.power_w)
    assert cmp.row("Mix: lifecycle cost").values[1] == pytest.approx(st.mix.solar_only.lcc)
    # and that point is worked from the prices: array W x EUR/W + kWh x EUR/kWh ...
    prices = st.mix.prices
    _, lcc = _solar_costs(
        p, solo.design.array.power_w, solo.design.battery.nominal_kwh, 12.0, prices
    )
    assert lcc == pytest.approx(st.mix.solar_only.lcc)
    assert prices["array_per_w"] == pytest.approx(120.0 / 300.0)  # the lodge's module price
    assert prices["battery_per_kwh"] == pytest.approx(1500.0 / (51.2 * 100 / 1000))


def test_without_with_generator_no_study_runs():
    p = load_project(hybrid_demo_path())
    p.variants = [Variant("Solar only", {"generator": False})]

    def boom(*a):
        raise AssertionError("the study must not run")

    cmp = compare_variants(p, hybrid_demo_path().parent, study=boom)
    assert all(r.group != "hybrid" for r in cmp.rows)


def test_cli_variants_shows_both(capsys, tmp_path, monkeypatch):
    """The CLI's comparison prints the hybrid rows, the fuel row the study's own figure.
    Its study runs over YEARS instead of the CLI's 20 (1.2 s of CPU instead of 5.8; the
    study's figures against the columns are checked above)."""
    import offgrid.generator.study as study_mod
    from offgrid.cli import main

    real, studies = study_mod.generator_study, []

    def short(project, base=None, **kwargs):
        studies.append(real(project, base, **{"years": YEARS, **kwargs}))
        return studies[-1]

    monkeypatch.setattr(study_mod, "generator_study", short)
    src = hybrid_demo_path().read_text(encoding="utf-8")
    src += '\n[[variants]]\nname = "Solar only"\n\n[variants.overrides]\ngenerator = false\n'
    (tmp_path / "lodge.toml").write_text(src, encoding="utf-8")
    assert main(["variants", str(tmp_path / "lodge.toml")]) == 0
    out = capsys.readouterr().out
    assert "Generator fuel (L/yr)" in out and "Mix: lifecycle cost (EUR)" in out
    assert len(studies) == 1  # the base column's study; the solar-only column has none
    fuel = next(line for line in out.splitlines() if line.startswith("Generator fuel"))
    assert fuel.split()[-3:] == [f"{studies[0].run.fuel_l_per_year:,.0f}", "0", "*"]


def test_simulated_report_reuses_its_study_for_the_base_column():
    from offgrid.design.sizing import design
    from offgrid.report.build import build_report

    p = load_project(hybrid_demo_path())
    p.variants = [Variant("Solar only", {"generator": False})]
    base = hybrid_demo_path().parent
    st = generator_study(p, base, years=YEARS)
    rep = build_report(p, design(p, base), base=base, with_charts=False, generator=st)
    sec = rep.section("variants")
    assert sec is not None
    table = sec.blocks[0]
    rows = {r[0].text: r for r in table.rows}
    fuel = rows["Generator fuel (L/yr)"]
    assert fuel[1].value == pytest.approx(st.run.fuel_l_per_year)  # the report's own study
    assert fuel[2].value == 0
