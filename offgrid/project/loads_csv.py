"""Load lists as CSV: import with line-numbered messages, and export.

Columns (header required, order free): ``name, quantity, power_w, hours_per_day,
ac_dc, duty_cycle, surge_w, months, critical``; optional ``time_of_day``
(any, day, morning, evening, night) and ``run_m`` (one-way length of a DC load's cable
run in metres; empty: the project's default run).  ``months`` is ``1-12``, ``5,6,7`` or
``11-2`` (wrapping); ``critical`` is yes/no.  Numbers are read by
:func:`offgrid.numbers.read_number`; a name that a spreadsheet would take for a formula
is written with a leading apostrophe (:func:`offgrid.safetext.csv_cell`) and read back
without it.  At most :data:`MAX_LOADS` loads are read.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass
from pathlib import Path

from offgrid.catalogue import input_entry
from offgrid.numbers import NumberError, is_finite_number, read_number
from offgrid.project.model import ALL_MONTHS, Load
from offgrid.safetext import csv_cell, csv_uncell

COLUMNS = (
    "name",
    "quantity",
    "power_w",
    "hours_per_day",
    "ac_dc",
    "duty_cycle",
    "surge_w",
    "months",
    "critical",
)
OPTIONAL_COLUMNS = ("time_of_day", "run_m")
TIMES_OF_DAY = input_entry("loads[].time_of_day").values
#: The longest load list read (a clinic or a school has tens of loads; a whole village is
#: planned as a community survey, not as one load list).
MAX_LOADS = 5000
_YES = {"yes", "y", "true", "1"}
_NO = {"no", "n", "false", "0", ""}


@dataclass(frozen=True)
class LoadProblem:
    line: int  # 1-based line in the CSV file (header is line 1)
    field: str
    message: str

    def __str__(self) -> str:
        if not self.line:  # the whole file
            return f"{self.field}: {self.message}"
        return f"line {self.line}, {self.field}: {self.message}"


class LoadListError(ValueError):
    def __init__(self, problems: list[LoadProblem], source: str = "load list") -> None:
        self.problems = problems
        text = "\n".join(f"  {p}" for p in problems)
        super().__init__(f"{source}: {len(problems)} problem(s)\n{text}")


def parse_months(text: str) -> tuple[int, ...]:
    """``'1-12'``, ``'5,6,7'``, ``'11-2'`` (wraps over the new year) or ``'all'`` to months."""
    text = str(text).strip().lower()
    if text in ("", "all", "1-12"):
        return ALL_MONTHS
    months: set[int] = set()
    for part in text.replace(";", ",").replace(" ", ",").split(","):
        if not part:
            continue
        if "-" in part:
            a, b = part.split("-", 1)
            lo, hi = _month(a), _month(b)
            seq = range(lo, hi + 1) if lo <= hi else [*range(lo, 13), *range(1, hi + 1)]
            months.update(seq)
        else:
            months.add(_month(part))
    return tuple(sorted(months))


def _month(text: str) -> int:
    try:
        m = int(text)
    except ValueError:
        raise ValueError(
            f"'{text}' is not a month number; use 1-12, e.g. '1-12' or '5,6,7'"
        ) from None
    if not 1 <= m <= 12:
        raise ValueError(f"month {m} is outside 1-12")
    return m


def format_months(months: tuple[int, ...]) -> str:
    """Compact text for a month set: ``(1..12) -> '1-12'``, ``(5, 6, 7) -> '5-7'``."""
    ms = sorted(set(months))
    if not ms:
        return ""
    runs: list[list[int]] = [[ms[0], ms[0]]]
    for m in ms[1:]:
        if m == runs[-1][1] + 1:
            runs[-1][1] = m
        else:
            runs.append([m, m])
    return ",".join(f"{a}-{b}" if b > a else str(a) for a, b in runs)


def _range(path: str) -> tuple[float, float]:
    """(low, high) of a load's input, from the catalogue."""
    entry = input_entry(path)
    assert entry.low is not None and entry.high is not None, path
    return entry.low, entry.high


def check_load(load: Load) -> list[tuple[str, str]]:
    """Problems with one load as (field, message with the fix); empty when valid."""
    out: list[tuple[str, str]] = []
    if not load.name.strip():
        out.append(("name", "the name is blank; give the appliance a name"))
    for fld in ("power_w", "hours_per_day", "duty_cycle", "surge_w"):
        value = getattr(load, fld)
        if not is_finite_number(value):
            out.append((fld, f"'{value}' is not a finite number; type a number such as 0 or 1.5"))
    if load.run_m is not None and not is_finite_number(load.run_m):
        out.append(
            (
                "run_m",
                f"'{load.run_m}' is not a finite number; type the one-way cable "
                "length in metres, or leave it empty for the default run",
            )
        )
    if out:
        return out
    q, pw, hr, du, su = (
        _range(f"loads[].{k}")
        for k in ("quantity", "power_w", "hours_per_day", "duty_cycle", "surge_w")
    )
    if not isinstance(load.quantity, int) or isinstance(load.quantity, bool):
        out.append(("quantity", f"'{load.quantity}' must be a whole number {q[0]:g}-{q[1]:g}"))
    elif not q[0] <= load.quantity <= q[1]:
        out.append(
            ("quantity", f"{load.quantity} is not a count; use a whole number {q[0]:g}-{q[1]:g}")
        )
    if not pw[0] <= load.power_w <= pw[1]:
        out.append(("power_w", f"{load.power_w} W is outside {pw[0]:,.0f}-{pw[1]:,.0f} W"))
    if not hr[0] <= load.hours_per_day <= hr[1]:
        out.append(
            (
                "hours_per_day",
                f"{load.hours_per_day} h is outside {hr[0]:g}-{hr[1]:g} hours per day",
            )
        )
    if not du[0] <= load.duty_cycle <= du[1]:
        out.append(
            (
                "duty_cycle",
                f"{load.duty_cycle} must be a fraction {du[0]:g}-{du[1]:g} "
                "(0.4 = on 40 % of the time)",
            )
        )
    if not su[0] <= load.surge_w <= su[1]:
        out.append(("surge_w", f"{load.surge_w} W must be 0 (no surge) or a starting power in W"))
    elif 0 < load.surge_w < load.power_w:
        out.append(
            (
                "surge_w",
                f"{load.surge_w} W is below the running power {load.power_w} W; "
                "give the starting power of one unit, or 0 for no surge",
            )
        )
    if load.ac_dc not in ("ac", "dc"):
        out.append(("ac_dc", f"'{load.ac_dc}' must be ac or dc"))
    if not load.months or any(not 1 <= m <= 12 for m in load.months):
        out.append(("months", "give the months of use, e.g. 1-12 or 5,6,7"))
    lo, hi = _range("loads[].run_m")
    if load.run_m is not None and not lo <= load.run_m <= hi:
        out.append(
            (
                "run_m",
                f"{load.run_m:g} m is out of range; one-way length of its DC cable "
                f"run, {lo:g}-{hi:g} m, or leave it empty for the default run "
                "(wiring.dc_load_run_m)",
            )
        )
    if load.time_of_day not in TIMES_OF_DAY:
        out.append(
            ("time_of_day", f"'{load.time_of_day}' must be one of {', '.join(TIMES_OF_DAY)}")
        )
    return out


#: Required numeric cells and what to type in them.
_REQUIRED_CELLS = {
    "power_w": "the running power of one unit in W",
    "hours_per_day": "the hours of use per day, 0-24",
}


def _num(row: dict, key: str, line: int, problems: list[LoadProblem], default: float) -> float:
    raw = (row.get(key) or "").strip()
    if raw == "":
        if key in _REQUIRED_CELLS:
            problems.append(LoadProblem(line, key, f"is empty; type {_REQUIRED_CELLS[key]}"))
        return default
    try:
        return read_number(raw)
    except NumberError as exc:
        problems.append(LoadProblem(line, key, str(exc)))
        return default


def read_loads_csv(text: str, source: str = "load list") -> list[Load]:
    """Parse CSV text into loads; raises :class:`LoadListError` listing every problem."""
    problems: list[LoadProblem] = []
    reader = csv.DictReader(io.StringIO(text.lstrip("\ufeff")), skipinitialspace=True)
    header = [h.strip().lower() for h in (reader.fieldnames or [])]
    reader.fieldnames = header
    if not header:
        raise LoadListError(
            [
                LoadProblem(
                    1,
                    "header",
                    "the file is empty; the first line must name "
                    f"the columns: {', '.join(COLUMNS)}",
                )
            ],
            source,
        )
    unknown = [h for h in header if h not in COLUMNS + OPTIONAL_COLUMNS]
    missing = [c for c in ("name", "power_w", "hours_per_day") if c not in header]
    for h in unknown:
        hint = " (use watts: power_w)" if h in ("power", "watts", "power_kw", "kw") else ""
        problems.append(
            LoadProblem(
                1,
                h,
                f"unknown column{hint}; known columns are {', '.join(COLUMNS + OPTIONAL_COLUMNS)}",
            )
        )
    for c in missing:
        problems.append(LoadProblem(1, c, "required column is missing"))
    if problems:
        raise LoadListError(problems, source)
    loads: list[Load] = []
    for row in reader:
        # the row's first line: a quoted cell may run over several lines
        line = reader.line_num - sum(
            v.rstrip("\r\n").count("\n") for v in row.values() if isinstance(v, str)
        )
        if all(not (v or "").strip() for v in row.values() if isinstance(v, str)):
            continue
        if None in row:
            problems.append(LoadProblem(line, "row", "has more cells than the header has columns"))
            continue
        start = len(problems)
        name = csv_uncell((row.get("name") or "").strip())
        if any("\n" in (v or "") for v in row.values() if isinstance(v, str)):
            problems.append(
                LoadProblem(
                    line,
                    "row",
                    'a quotation mark (") opens a cell and is '
                    "never closed, so the lines after it were read into "
                    "one cell: close the quote or remove it",
                )
            )
            continue
        if len(loads) >= MAX_LOADS:
            problems.append(
                LoadProblem(
                    line,
                    "row",
                    f"more than {MAX_LOADS:,} loads: a load "
                    "list is one system's appliances; split the list, or "
                    "plan a community with `offgrid plan`",
                )
            )
            raise LoadListError(problems, source)
        qty = _num(row, "quantity", line, problems, 1)
        if qty != int(qty):
            problems.append(LoadProblem(line, "quantity", f"{qty} must be a whole number"))
        acdc = (row.get("ac_dc") or "ac").strip().lower()
        crit_raw = (row.get("critical") or "").strip().lower()
        if crit_raw not in _YES | _NO:
            problems.append(LoadProblem(line, "critical", f"'{crit_raw}' must be yes or no"))
        try:
            months = parse_months(row.get("months") or "1-12")
        except ValueError as exc:
            problems.append(LoadProblem(line, "months", str(exc)))
            months = ALL_MONTHS
        load = Load(
            name=name,
            quantity=int(qty),
            power_w=_num(row, "power_w", line, problems, 0.0),
            hours_per_day=_num(row, "hours_per_day", line, problems, 0.0),
            ac_dc=acdc,  # type: ignore[arg-type]
            duty_cycle=_num(row, "duty_cycle", line, problems, 1.0),
            surge_w=_num(row, "surge_w", line, problems, 0.0),
            months=months,
            critical=crit_raw in _YES,
            time_of_day=(row.get("time_of_day") or "any").strip().lower(),  # type: ignore[arg-type]
            run_m=(
                _num(row, "run_m", line, problems, 0.0)
                if (row.get("run_m") or "").strip()
                else None
            ),
        )
        if len(problems) == start:
            problems.extend(LoadProblem(line, f, m) for f, m in check_load(load))
        loads.append(load)
    if problems:
        raise LoadListError(problems, source)
    return loads


def load_loads_csv(path: str | Path) -> list[Load]:
    from offgrid.textfile import TextFileError, read_text

    p = Path(path)
    try:
        text = read_text(p)
    except TextFileError as exc:
        raise LoadListError([LoadProblem(0, "file", str(exc))], str(p)) from None
    return read_loads_csv(text, source=str(p))


def loads_to_csv(loads: list[Load]) -> str:
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow([*COLUMNS, *OPTIONAL_COLUMNS])
    for ld in loads:
        writer.writerow(
            [
                csv_cell(ld.name),
                ld.quantity,
                f"{ld.power_w:g}",
                f"{ld.hours_per_day:g}",
                ld.ac_dc,
                f"{ld.duty_cycle:g}",
                f"{ld.surge_w:g}",
                format_months(ld.months),
                "yes" if ld.critical else "no",
                ld.time_of_day,
                "" if ld.run_m is None else f"{ld.run_m:g}",
            ]
        )
    return out.getvalue()
