"""The [generator] table of a project: load, save, refusals naming the field (issue 16)."""

from __future__ import annotations

import dataclasses

import pytest

from offgrid.catalogue import inputs_under
from offgrid.generator.fields import quiet_mask
from offgrid.paths import demo_project_path
from offgrid.project.model import GeneratorSpec
from offgrid.project.store import ProjectFileError, dumps_project, loads_project

GEN = """
[generator]
name = "Invented 6 kW diesel set"
rated_kw = 6.0
fuel_l_h = [0.9, 1.3, 1.75, 2.2]
start_soc = 0.5
stop_soc = 0.9
quiet_from_h = 22
quiet_to_h = 6
"""


def _text(extra: str = GEN) -> str:
    return demo_project_path().read_text(encoding="utf-8") + extra


def test_round_trip():
    p = loads_project(_text())
    assert p.generator is not None and p.generator.rated_kw == 6.0
    assert p.generator.fuel_load_pct == [25.0, 50.0, 75.0, 100.0]
    again = loads_project(dumps_project(p))
    assert again.generator == p.generator


def test_no_generator_table_means_solar_only():
    p = loads_project(_text(""))
    assert p.generator is None
    assert "[generator]" not in dumps_project(p)


@pytest.mark.parametrize(
    ("change", "field", "words"),
    [
        (("1.75, 2.2]", "1.2, 2.2]"), "generator.fuel_l_h", "rise with load"),
        (("start_soc = 0.5", "start_soc = 0.95"), "generator.start_soc", "swap"),
        (
            ("rated_kw = 6.0", "rated_kw = 6.0\nmin_load_fraction = 1.3"),
            "generator.min_load_fraction",
            "0-1",
        ),
        (("quiet_to_h = 6\n", ""), "generator.quiet_to_h", "both"),
        (
            ("rated_kw = 6.0", 'rated_kw = 6.0\ndispatch = "whenever"'),
            "generator.dispatch",
            "cycle_charging",
        ),
    ],
)
def test_bad_generator_input_refused(change, field, words):
    with pytest.raises(ProjectFileError) as err:
        loads_project(_text(GEN.replace(*change)))
    text = str(err.value)
    assert field in text and words in text


def test_field_metadata_matches_the_model():
    # the catalogue's generator rows declare every input of the [generator] table, none twice
    names = {f.name for f in dataclasses.fields(GeneratorSpec)}
    rows = inputs_under("generator.")
    paths = [e.path.removeprefix("generator.") for e in rows]
    assert sorted(paths) == sorted(names)
    for e in rows:
        assert len(e.label) <= 22 and e.hint, e.path
        if e.low is not None:
            assert e.low < e.high, e.path


def test_quiet_mask_wraps_midnight():
    m = quiet_mask(22, 6)
    assert [h for h in range(24) if m[h]] == [0, 1, 2, 3, 4, 5, 22, 23]
    assert sum(quiet_mask(None, None)) == 0
    assert [h for h in range(24) if quiet_mask(12, 14)[h]] == [12, 13]
