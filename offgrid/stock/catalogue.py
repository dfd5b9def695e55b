"""The parts catalogue of stock: one CSV file per kind, a spreadsheet can edit them.

A catalogue is a folder holding any of ``modules.csv``, ``batteries.csv``,
``controllers.csv``, ``inverters.csv``, ``cables.csv``, ``devices.csv`` (and
``rates.csv``, the exchange rates: :mod:`offgrid.stock.money`).  The user's catalogue
is ``user_data_dir()/parts`` (beside the user's climates); a demonstration catalogue of
invented generic parts is bundled (``offgrid/data/parts``).  The columns of each kind
are the fields of the project's part tables (:mod:`offgrid.project.model`), checked
against the same ranges as the project (:func:`offgrid.project.validate.ranged_inputs`), plus
``price``, ``currency`` and ``supplier``.  The format is in docs/parts-format.md.

A row with a missing or impossible value is reported with its file and line, the
column and the fix, and skipped; a name used twice in one kind is refused (the
second row skipped).  Reading never raises for a bad row.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass, fields
from pathlib import Path
from typing import Any

from offgrid.economics.prices import read_price_table
from offgrid.numbers import MAX_PRICE, PRICE_RANGE, NumberError, read_number
from offgrid.project.model import BatterySpec, ControllerSpec, ModuleSpec
from offgrid.project.validate import ranged_inputs
from offgrid.safetext import csv_cell, csv_uncell, printable

PARTS_FOLDER = "parts"
RANGE_OF = {path: (lo, hi, hint) for path, lo, hi, hint in ranged_inputs()}
#: The battery voltages a system may have (offgrid.design.sizing chooses among them).
SYSTEM_VOLTAGES_V = (12, 24, 48)


@dataclass(frozen=True)
class Column:
    """One column of a kind's CSV: ``kind`` is 'text', 'number', 'int', 'choice',
    'voltages' (a list such as ``12 24 48``) or 'yes/no'."""

    name: str
    kind: str = "number"
    required: bool = True
    hint: str = ""
    low: float | None = None
    high: float | None = None
    choices: tuple[str, ...] = ()


def _ranged(table: str, name: str, kind: str = "number", required: bool = True) -> Column:
    lo, hi, hint = RANGE_OF[f"{table}.{name}"]
    return Column(name, kind, required, hint, lo, hi)


COMMON = (
    Column("price", "number", False, f"unit price in the row's currency; {PRICE_RANGE}"),
    Column("currency", "text", False, "ISO 4217 code of the price (USD, EUR, KES ...)"),
    Column("supplier", "text", False, "where the part comes from (free text)"),
    Column("demo", "yes/no", False, "yes marks an invented demonstration part"),
)


def _module_columns() -> tuple[Column, ...]:
    out = [Column("name", "text", True, "the part's name, unique among the modules")]
    for f in fields(ModuleSpec):
        if f.name == "name":
            continue
        kind = "int" if f.name == "cells_in_series" else "number"
        out.append(_ranged("module", f.name, kind, f.name != "beta_voc_pct_per_c"))
    return tuple(out)


def _battery_columns() -> tuple[Column, ...]:
    out = [
        Column("name", "text", True, "the part's name, unique among the battery units"),
        Column(
            "chemistry",
            "choice",
            True,
            "flooded, agm, gel or lifepo4",
            choices=("flooded", "agm", "gel", "lifepo4"),
        ),
    ]
    for f in fields(BatterySpec):
        if f.name not in ("name", "chemistry"):
            out.append(_ranged("battery", f.name))
    return tuple(out)


KINDS: dict[str, tuple[Column, ...]] = {
    "modules": _module_columns(),
    "batteries": _battery_columns(),
    "controllers": (
        Column("name", "text", True, "the part's name, unique among the controllers"),
        Column("type", "choice", True, "mppt or pwm", choices=("mppt", "pwm")),
        _ranged("controller", "max_pv_voltage_v"),
        _ranged("controller", "efficiency"),
        _ranged("controller", "max_current_a"),
        Column(
            "battery_voltages_v",
            "voltages",
            True,
            "the battery voltages it works at, separated by spaces (12 24 48)",
        ),
    ),
    "inverters": (
        Column("name", "text", True, "the part's name, unique among the inverters"),
        Column("continuous_w", "number", True, "continuous AC output, W", 50, 100000),
        Column("surge_w", "number", True, "surge output for a few seconds, W", 50, 300000),
        Column(
            "dc_voltage_v",
            "choice",
            True,
            "nominal DC input voltage, 12, 24 or 48",
            choices=("12", "24", "48"),
        ),
        _ranged("inverter", "efficiency"),
        _ranged("inverter", "self_consumption_w"),
        Column(
            "charger_a",
            "number",
            False,
            "battery charger current of an inverter-charger, A; blank: no charger",
            1,
            1000,
        ),
    ),
    "cables": (
        Column("name", "text", True, "the part's name, unique among the cables"),
        Column("material", "choice", True, "copper or aluminium", choices=("copper", "aluminium")),
        Column("size", "text", True, "size as the wiring schedule writes it (6 mm2, 10 AWG)"),
    ),
    "devices": (
        Column("name", "text", True, "the part's name, unique among the devices"),
        Column(
            "kind",
            "choice",
            True,
            "fuse, breaker, disconnect or surge protector",
            choices=("fuse", "breaker", "disconnect", "surge protector"),
        ),
        Column("rating_a", "number", False, "current rating, A", 0.1, 10000),
        Column("voltage_v", "number", True, "DC voltage rating, V", 1, 1500),
    ),
}
KIND_NAMES = tuple(KINDS)
#: What one row's price buys.
PRICE_UNIT = {"cables": "per metre"}
#: The singular of each kind, as a bill-of-materials key word.
SINGULAR = {
    "modules": "module",
    "batteries": "battery",
    "controllers": "controller",
    "inverters": "inverter",
    "cables": "cable",
    "devices": "device",
}


def columns_of(kind: str) -> tuple[Column, ...]:
    return (*KINDS[kind], *COMMON)


@dataclass(frozen=True)
class StockPart:
    """One catalogue row: its datasheet values (``spec``), price and where it was read."""

    kind: str
    name: str
    spec: dict[str, Any]
    price: float | None
    currency: str
    supplier: str
    demo: bool
    source: str  # file the row was read from
    line: int

    def record(self) -> dict[str, Any]:
        """The full row as plain data (what a project keeps of a part it uses)."""
        out: dict[str, Any] = {"name": self.name}
        out |= {k: v for k, v in self.spec.items() if v is not None}
        if self.price is not None:
            out["price"] = self.price
        if self.currency:
            out["currency"] = self.currency
        if self.supplier:
            out["supplier"] = self.supplier
        if self.demo:
            out["demo"] = True
        return out


@dataclass(frozen=True)
class CatalogueProblem:
    source: str
    line: int | None
    column: str | None
    message: str

    def __str__(self) -> str:
        where = printable(self.source)
        if self.line is not None:
            where += f": line {self.line}"
        if self.column:
            where += f", {self.column}"
        return f"{where}: {self.message}"


@dataclass(frozen=True)
class Catalogue:
    folder: str
    parts: dict[str, tuple[StockPart, ...]]
    problems: tuple[CatalogueProblem, ...]
    #: (from, to) -> rate: 1 ``from`` buys ``rate`` of ``to`` (rates.csv)
    rates: dict[tuple[str, str], float]

    def of(self, kind: str) -> tuple[StockPart, ...]:
        return self.parts.get(kind, ())

    def find(self, kind: str, name: str) -> StockPart | None:
        return next((p for p in self.of(kind) if p.name == name), None)

    def count(self) -> int:
        return sum(len(v) for v in self.parts.values())


def _cell_value(col: Column, raw: str) -> tuple[Any, str | None]:
    """(value, problem) of one cell; value None for a blank optional cell."""
    if not raw:
        return None, ("is empty: " + col.hint) if col.required else None
    if col.kind == "text":
        return csv_uncell(raw), None
    if col.kind == "yes/no":
        low = raw.lower()
        if low in ("yes", "true", "1", "y"):
            return True, None
        if low in ("no", "false", "0", "n"):
            return False, None
        return None, f"'{printable(raw)}' is not yes or no"
    if col.kind == "choice":
        low = raw.lower()
        if low not in col.choices:
            return None, f"'{printable(raw)}' is not one of: {', '.join(col.choices)}"
        return low, None
    if col.kind == "voltages":
        out = []
        for word in raw.replace(";", " ").replace(",", " ").split():
            try:
                v = read_number(word)
            except NumberError as exc:
                return None, f"'{printable(word)}' {exc}; {col.hint}"
            if v not in SYSTEM_VOLTAGES_V:
                return None, f"{v:g} V is not a system voltage (12, 24 or 48); {col.hint}"
            out.append(int(v))
        return tuple(sorted(set(out))), None
    try:
        v = read_number(raw)
    except NumberError as exc:
        return None, f"'{printable(raw)}' {exc}; {col.hint}"
    if col.kind == "int":
        if v != int(v):
            return None, f"{v:g} is not a whole number; {col.hint}"
        v = int(v)
    if col.name == "price":
        if not 0 < v <= MAX_PRICE:
            return None, f"{v:g}: {PRICE_RANGE}; leave it blank if the price is not known"
        return float(v), None
    if (col.low is not None and v < col.low) or (col.high is not None and v > col.high):
        return None, f"{v:g} is out of range {col.low:g} to {col.high:g}: {col.hint}"
    return v, None


def _row_problems(kind: str, spec: dict[str, Any]) -> list[tuple[str, str]]:
    """Consistency of a row's values, (column, message)."""
    out = []
    if kind == "modules":
        if spec["vmp_v"] >= spec["voc_v"]:
            out.append(("vmp_v", "Vmp must be below Voc: check the datasheet's STC table"))
        if spec["imp_a"] >= spec["isc_a"]:
            out.append(("imp_a", "Imp must be below Isc: check the datasheet's STC table"))
        if spec["pmax_w"] > spec["voc_v"] * spec["isc_a"]:
            out.append(("pmax_w", "Pmax is above Voc x Isc: check the datasheet"))
    if kind == "inverters" and spec["surge_w"] < spec["continuous_w"]:
        out.append(("surge_w", "the surge rating cannot be below the continuous rating"))
    return out


def read_kind_csv(kind: str, text: str, source: str) -> tuple[list[StockPart], list]:
    """The parts of one kind's CSV text and the problems (rows with a problem skipped)."""
    cols = columns_of(kind)
    table = read_price_table(text)
    have = {n.strip().lower() for n in table.names}
    problems: list[CatalogueProblem] = []
    missing = [c.name for c in cols if c.required and c.name not in have]
    if missing:
        return [], [
            CatalogueProblem(
                source,
                1,
                None,
                f"the header lacks the column(s) {', '.join(missing)}: start from "
                f"`offgrid parts template {kind}`",
            )
        ]
    unknown = sorted(have - {c.name for c in cols} - {""})
    if unknown:
        problems.append(
            CatalogueProblem(
                source,
                1,
                None,
                f"column(s) {', '.join(map(printable, unknown))} are not read (see "
                "docs/parts-format.md)",
            )
        )
    parts: list[StockPart] = []
    seen: dict[str, int] = {}
    for line, cells in table.records:
        if not any(cells.values()):
            continue
        values: dict[str, Any] = {}
        bad = False
        for col in cols:
            value, problem = _cell_value(col, cells.get(col.name, ""))
            if problem:
                problems.append(CatalogueProblem(source, line, col.name, problem + "; row skipped"))
                bad = True
            values[col.name] = value
        if bad:
            continue
        name = values.pop("name")
        price, currency = values.pop("price"), (values.pop("currency") or "").upper()
        supplier, demo = values.pop("supplier") or "", bool(values.pop("demo"))
        if currency and not (len(currency) == 3 and currency.isascii() and currency.isalpha()):
            problems.append(
                CatalogueProblem(
                    source,
                    line,
                    "currency",
                    f"'{printable(currency)}' is not a three-letter currency code (ISO 4217: "
                    "USD, EUR, KES ...); row skipped",
                )
            )
            continue
        if price is not None and not currency:
            problems.append(
                CatalogueProblem(
                    source, line, "currency", "a price needs its currency (USD, EUR ...)"
                )
            )
            continue
        if kind == "inverters":
            values["dc_voltage_v"] = int(values["dc_voltage_v"])
        consistency = _row_problems(kind, values)
        for column, message in consistency:
            problems.append(CatalogueProblem(source, line, column, message + "; row skipped"))
        if consistency:
            continue
        if name in seen:
            problems.append(
                CatalogueProblem(
                    source,
                    line,
                    "name",
                    f"'{printable(name)}' is already on line {seen[name]}: each part "
                    "needs its own name; row skipped",
                )
            )
            continue
        seen[name] = line
        parts.append(StockPart(kind, name, values, price, currency, supplier, demo, source, line))
    return parts, problems


def bundled_catalogue_dir() -> Path:
    """The demonstration catalogue (invented generic parts)."""
    return Path(__file__).resolve().parents[1] / "data" / PARTS_FOLDER


def user_catalogue_dir() -> Path:
    from offgrid.paths import user_data_dir

    return user_data_dir() / PARTS_FOLDER


def has_parts(folder: Path) -> bool:
    return any((folder / f"{k}.csv").is_file() for k in KIND_NAMES)


def default_catalogue_dir() -> tuple[Path, bool]:
    """The user's catalogue when it holds any parts file, else the bundled demonstration
    catalogue; (folder, is_demo)."""
    user = user_catalogue_dir()
    return (user, False) if has_parts(user) else (bundled_catalogue_dir(), True)


def load_catalogue(folder: str | Path) -> Catalogue:
    """Every kind's file of ``folder`` (a missing file is an empty kind) and the rates."""
    from offgrid.stock.money import load_rates
    from offgrid.textfile import TextFileError, read_text

    folder = Path(folder)
    parts: dict[str, tuple[StockPart, ...]] = {}
    problems: list[CatalogueProblem] = []
    if not folder.is_dir():
        problems.append(
            CatalogueProblem(
                str(folder), None, None, "is not a folder: give the catalogue's folder"
            )
        )
    for kind in KIND_NAMES:
        path = folder / f"{kind}.csv"
        if not path.exists():
            continue
        try:
            text = read_text(path)
        except TextFileError as exc:
            problems.append(CatalogueProblem(str(path), None, None, str(exc)))
            continue
        got, probs = read_kind_csv(kind, text, str(path))
        parts[kind] = tuple(got)
        problems += probs
    rates, rate_problems = load_rates(folder / "rates.csv")
    return Catalogue(str(folder), parts, tuple(problems + rate_problems), rates)


def template_csv(kind: str) -> str:
    """The header of a kind's CSV (the columns in order), to fill in."""
    buf = io.StringIO()
    csv.writer(buf, lineterminator="\n").writerow([c.name for c in columns_of(kind)])
    return buf.getvalue()


def _cell_text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "yes" if value else ""
    if isinstance(value, tuple):
        return " ".join(str(v) for v in value)
    if isinstance(value, float):
        return f"{value:g}"
    return str(value)


def kind_csv(kind: str, parts: list[StockPart]) -> str:
    """The parts of one kind as the catalogue's CSV (cells safe for a spreadsheet)."""
    cols = columns_of(kind)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow([c.name for c in cols])
    for p in parts:
        row = {**p.spec, "name": p.name, "price": p.price, "currency": p.currency}
        row |= {"supplier": p.supplier, "demo": p.demo}
        w.writerow([csv_cell(_cell_text(row.get(c.name))) for c in cols])
    return buf.getvalue()


def module_spec(part: StockPart) -> ModuleSpec:
    return ModuleSpec(name=part.name, **part.spec)


def battery_spec(part: StockPart) -> BatterySpec:
    return BatterySpec(name=part.name, **part.spec)


def controller_spec(part: StockPart) -> ControllerSpec:
    s = part.spec
    return ControllerSpec(
        type=s["type"],
        max_pv_voltage_v=float(s["max_pv_voltage_v"]),
        efficiency=float(s["efficiency"]),
        max_current_a=float(s["max_current_a"]),
    )
