"""The parts catalogue of stock: reading, bad rows, money, the project's own copy.

All parts here are invented for the tests (the bundled catalogue is marked invented).
"""

from __future__ import annotations

import csv
import io
import math
from dataclasses import fields

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from offgrid.project.model import BatterySpec, ModuleSpec
from offgrid.stock.catalogue import (
    KIND_NAMES,
    bundled_catalogue_dir,
    columns_of,
    default_catalogue_dir,
    kind_csv,
    load_catalogue,
    read_kind_csv,
    template_csv,
    user_catalogue_dir,
)
from offgrid.stock.money import convert, project_rates, read_rates_csv

MOD_HEAD = template_csv("modules").strip()
GOOD_MOD = "Test module A,300,32.5,9.23,39.8,9.75,0.05,-0.30,-0.40,60,1.63,45,100,USD,shop,yes"


def test_bundled_catalogue_reads_whole_and_is_marked_invented():
    cat = load_catalogue(bundled_catalogue_dir())
    assert cat.problems == ()
    assert set(cat.parts) == set(KIND_NAMES)
    for kind in KIND_NAMES:
        assert cat.of(kind), kind
        for part in cat.of(kind):
            assert part.demo and "Invented" in part.name and "(demo)" in part.name
            assert "invented" in part.supplier
    assert "INVENTED" in (bundled_catalogue_dir() / "README.txt").read_text()


def test_columns_are_the_project_part_tables_fields():
    mod = [c.name for c in columns_of("modules")]
    assert mod[: len(fields(ModuleSpec))] == [f.name for f in fields(ModuleSpec)]
    bat = [c.name for c in columns_of("batteries")]
    assert bat[: len(fields(BatterySpec))] == [f.name for f in fields(BatterySpec)]
    for kind in KIND_NAMES:
        assert [c.name for c in columns_of(kind)][-4:] == ["price", "currency", "supplier", "demo"]


def test_bad_rows_are_reported_with_file_line_column_and_skipped():
    text = "\n".join(
        [
            MOD_HEAD,
            GOOD_MOD,
            "",  # a blank line still counts (line 3)
            GOOD_MOD.replace("Test module A", "Bad number").replace(",32.5,", ",abc,"),
            GOOD_MOD.replace("Test module A", "Vmp above Voc").replace(",32.5,", ",41,"),
            GOOD_MOD.replace("Test module A", "Out of range").replace(",300,", ",5000,"),
            GOOD_MOD,  # the same name again
            GOOD_MOD.replace("Test module A", "No currency").replace(",USD,", ",,"),
            GOOD_MOD.replace("Test module A", "Blank Voc").replace(",39.8,", ",,"),
            GOOD_MOD.replace("Test module A", "Odd currency").replace(",USD,", ",dollars,"),
        ]
    )
    parts, problems = read_kind_csv("modules", text, "mods.csv")
    assert [p.name for p in parts] == ["Test module A"]
    assert parts[0].line == 2
    said = [str(p) for p in problems]
    assert said[0].startswith("mods.csv: line 4, vmp_v: 'abc'")
    assert said[1].startswith("mods.csv: line 5, vmp_v: Vmp must be below Voc")
    assert said[2].startswith("mods.csv: line 6, pmax_w: 5000 is out of range 1 to 1000")
    assert "line 7, name: 'Test module A' is already on line 2" in said[3]
    assert "line 8, currency: a price needs its currency" in said[4]
    assert "line 9, voc_v: is empty" in said[5]
    assert "line 10, currency: 'DOLLARS' is not a three-letter currency code" in said[6]
    assert all("row skipped" in s for s in said[:4])


def test_missing_header_column_names_the_template():
    parts, problems = read_kind_csv("batteries", "name,chemistry\nx,agm\n", "b.csv")
    assert parts == []
    assert "lacks the column(s) nominal_voltage_v" in str(problems[0])
    assert "offgrid parts template batteries" in str(problems[0])


def test_written_catalogue_reads_back_the_same():
    cat = load_catalogue(bundled_catalogue_dir())
    for kind in KIND_NAMES:
        again, problems = read_kind_csv(kind, kind_csv(kind, list(cat.of(kind))), "x")
        assert problems == []
        assert [(p.name, p.spec, p.price, p.currency) for p in again] == [
            (p.name, p.spec, p.price, p.currency) for p in cat.of(kind)
        ]


def test_formula_cells_are_neutralised_and_read_back():
    row = GOOD_MOD.replace("Test module A", "=1+1")
    parts, _ = read_kind_csv("modules", MOD_HEAD + "\n" + row, "x")
    written = kind_csv("modules", parts)
    assert written.splitlines()[1].startswith("'=1+1,")  # a spreadsheet shows it as text
    again, _ = read_kind_csv("modules", written, "x")
    assert again[0].name == "=1+1"


def test_user_catalogue_wins_over_the_bundled_one():
    folder, demo = default_catalogue_dir()
    assert demo and folder == bundled_catalogue_dir()
    user_catalogue_dir().mkdir(parents=True)
    (user_catalogue_dir() / "modules.csv").write_text(MOD_HEAD + "\n" + GOOD_MOD + "\n")
    folder, demo = default_catalogue_dir()
    assert not demo and load_catalogue(folder).of("modules")[0].name == "Test module A"


# ----------------------------------------------------------------------------- money


def test_convert_direct_inverse_and_missing():
    rates = {("EUR", "USD"): 1.08}
    assert convert(100.0, "EUR", "USD", rates) == pytest.approx(108.0)  # 100 x 1.08
    assert convert(108.0, "usd", "eur", rates) == pytest.approx(100.0)  # 108 / 1.08
    assert convert(5.0, "KES", "USD", rates) is None  # no rate: unpriced, never zero
    own = {("EUR", "USD"): 1.10}
    assert convert(100.0, "EUR", "USD", own, rates) == pytest.approx(110.0)  # project first


def test_rate_rows_with_problems():
    rates, problems = read_rates_csv("from,to,rate\nEUR,USD,1.08\nKES,USD,0\nGBP,,1.2\n", "r")
    assert rates == {("EUR", "USD"): 1.08}
    assert "line 3, rate" in str(problems[0]) and "line 4, from" in str(problems[1])
    rates, problems = project_rates({"EUR": 1.1, "XYZ": "a lot"}, "USD")
    assert rates == {("EUR", "USD"): 1.1} and "stock.rates.XYZ" in problems[0]


def test_the_format_document_lists_every_column():
    from offgrid.paths import CHECKOUT_ROOT

    doc = (CHECKOUT_ROOT / "docs" / "parts-format.md").read_text()
    for kind in KIND_NAMES:
        section = doc.split(f"### `{kind}.csv`")[1].split("###")[0]
        for col in columns_of(kind):
            assert f"| `{col.name}` |" in section, (kind, col.name)


# ----------------------------------------------------------------------------- fuzz

NASTY = st.one_of(
    st.sampled_from(["", "nan", "inf", "-1e400", "1,500", "=cmd|' /C calc'!A0", "\x1b[31m"]),
    st.text(max_size=12),
    st.floats(allow_nan=True, allow_infinity=True).map(str),
)


@settings(derandomize=True, max_examples=150, deadline=None, database=None)
@given(kind=st.sampled_from(KIND_NAMES), column=st.integers(0, 20), cell=NASTY)
def test_one_bad_cell_never_crashes_nor_lets_a_non_finite_number_in(kind, column, cell):
    """One cell of the first row replaced: the other rows are all kept; the first is kept
    with finite values or reported on its line; nothing raises."""
    cat = load_catalogue(bundled_catalogue_dir())
    head, first, *rest = kind_csv(kind, list(cat.of(kind))).splitlines()
    cells = next(csv.reader([first]))
    cells[column % len(cells)] = cell
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerow(cells)
    text = "\n".join([head, buf.getvalue().rstrip("\n"), *rest]) + "\n"
    parts, problems = read_kind_csv(kind, text, "f")
    kept_first = any(p.line == 2 for p in parts)
    said_first = any(p.line is not None and p.line >= 2 for p in problems)
    assert kept_first or said_first
    for part in parts:
        for value in part.spec.values():
            if isinstance(value, float):
                assert math.isfinite(value)
        assert part.price is None or (math.isfinite(part.price) and part.price > 0)
