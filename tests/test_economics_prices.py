"""Price lists: one core CSV reader and one PriceListError behind both column layouts.

The parts' list (``part, unit_price``: the bill of materials priced part by part) and the
plan's list (``item, basis, unit_price, currency``: prices per unit of capacity) are two
column maps over :func:`offgrid.economics.prices.read_price_table`.  Expected values are the
inputs themselves (a reader must give back what was written); no published source applies.
"""

from __future__ import annotations

import importlib.util

import pytest

from offgrid.economics.prices import (
    PriceListError,
    merge_prices,
    price_for,
    price_keys,
    read_price_csv,
    read_price_table,
)
from offgrid.project.model import PriceItem


def test_price_lookup_most_specific_first():
    prices = [
        PriceItem("controller", 300.0),
        PriceItem("controller:PWM", 120.0),
        PriceItem("cable:copper 6 mm2", 4.0),
        PriceItem("cable", 2.0),
    ]
    assert price_keys("controller:MPPT 50 A") == [
        "controller:MPPT 50 A",
        "controller:MPPT 50",
        "controller:MPPT",
        "controller",
    ]
    assert price_for("controller:PWM 30 A", prices) == 120.0
    assert price_for("controller:MPPT 50 A", prices) == 300.0
    assert price_for("cable:copper 6 mm2", prices) == 4.0
    assert price_for("cable:copper 10 mm2", prices) == 2.0
    assert price_for("inverter:500 W", prices) is None


def test_price_csv_reads_and_skips_blanks():
    text = (
        "part,unit_price,unit,description,note\n"
        "module:Generic,115,each,PV module,\n"
        "battery:Generic,,each,blank: not yet priced,\n"
        "cable,1250.5,m,,bulk\n"
    )
    items = read_price_csv(text)
    assert [(p.part, p.unit_price, p.note) for p in items] == [
        ("module:Generic", 115.0, ""),
        ("cable", 1250.5, "bulk"),
    ]
    # a thousands separator is refused, as in every other reader (offgrid.numbers)
    with pytest.raises(PriceListError, match=r"row 2, unit_price: '1,250\.5'.*write 1500"):
        read_price_csv('part,unit_price\ncable,"1,250.5"\n')


@pytest.mark.parametrize(
    ("row", "fragment"),
    [
        ("module,0", "above zero"),
        ("module,-5", "above zero"),
        ("module,cheap", "not a number"),
        ("module,nan", "not a finite number"),
        (",12", "part column is empty"),
    ],
)
def test_price_csv_refuses_bad_prices(row, fragment):
    with pytest.raises(PriceListError) as exc:
        read_price_csv(f"part,unit_price\n{row}\n", "p.csv")
    assert "p.csv: row 2" in str(exc.value) and fragment in str(exc.value)


def test_price_csv_refuses_missing_columns_and_duplicates():
    with pytest.raises(PriceListError, match="needs the columns"):
        read_price_csv("item,cost\nmodule,3\n")
    with pytest.raises(PriceListError, match="priced twice"):
        read_price_csv("part,unit_price\nmodule,3\nmodule,4\n")


def test_merge_prices_replaces_same_part():
    old = [PriceItem("module", 100.0), PriceItem("cable", 2.0)]
    new = [PriceItem("module", 90.0)]
    assert [(p.part, p.unit_price) for p in merge_prices(old, new)] == [
        ("module", 90.0),
        ("cable", 2.0),
    ]


def test_one_price_list_error_for_both_layouts():
    from offgrid.plan import prices as plan_prices

    assert plan_prices.PriceListError is PriceListError
    with pytest.raises(PriceListError, match=r"row 2, unit_price"):
        plan_prices.read_prices_csv("part,unit_price\nmodule,-3\n")
    with pytest.raises(PriceListError, match=r"line 2: unknown item"):
        plan_prices.read_prices_csv("item,basis,unit_price,currency\npanel,per_w,1,USD\n")


def test_both_layouts_name_the_files_own_line_after_blank_lines_and_multiline_cells():
    # the header is line 1; a blank line and a quoted note over two lines still count
    parts = 'part,unit_price,note\n\nmodule,3,"two\nlines"\nfuse,-1,\n'
    with pytest.raises(PriceListError, match=r"row 5, unit_price: -1 for 'fuse'"):
        read_price_csv(parts)
    from offgrid.plan.prices import read_prices_csv

    plan = (
        'item,basis,unit_price,currency,note\n\nmodule,per_w,0.4,USD,"two\nlines"\n'
        "battery,per_kwh,-1,USD,\n"
    )
    with pytest.raises(PriceListError, match=r"line 5: unit_price -1 must be 0 or more"):
        read_prices_csv(plan)


def test_the_core_reader_gives_lines_and_lower_case_cells():
    table = read_price_table('\ufeffPart, Unit_Price ,Note\nmodule, 3 ,"a, b"\n\nfuse,,\n')
    assert table.names == ["Part", "Unit_Price ", "Note"]  # as written
    assert [line for line, _ in table.records] == [2, 4]
    assert table.records[0][1] == {"part": "module", "unit_price": "3", "note": "a, b"}
    assert table.records[1][1] == {"part": "fuse", "unit_price": "", "note": ""}


def test_the_report_package_only_renders():
    for name in ("bom", "costs", "variants"):
        assert importlib.util.find_spec(f"offgrid.report.{name}") is None, name
        assert importlib.util.find_spec(f"offgrid.economics.{name}") is not None, name
