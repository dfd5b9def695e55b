"""The cheapest combination of catalogue parts that meets the design.

Every module x battery unit x charge controller x inverter of a catalogue is tried on a
copy of the project with those parts in it (:func:`with_parts`), designed by the engine
(:func:`offgrid.design.sizing.design`: the string window against the controller's PV
voltage, the controller's current and count, the bank's units in series and parallel),
then checked for what the design does not choose itself: the controller works at the
system voltage and the inverter's DC voltage is the system voltage (both checked before
designing; a project whose system voltage is "auto" is tried at 12, 24 and 48 V, each
fixed in turn), and the inverter's continuous and
surge ratings cover the design's required figures (``inverter.required_continuous_w``,
``inverter.required_surge_w``).

An inverter enters the design only through its efficiency and idle draw, so inverters
with the same two values share one design (the result is the same as designing each
combination, which ``tests/test_stock_choose.py`` checks against a brute-force search).

The steps of the design are shared across the combinations (:mod:`offgrid.stock.reuse`):
the loads, the sun and the site once per inverter group, the array step per module x
controller x what it reads of the battery, the bank step per battery unit, the electrical
steps per array step; a step that refuses is not run again for the combinations that
reach it with the same inputs (``tests/test_stock_reuse.py`` holds it to the search by
``sizing.design``, ``reuse=False``).

Combinations are ranked by capital (the main parts at catalogue prices in the project's
currency, plus the installation share) and by lifecycle cost
(:func:`offgrid.economics.costs.lifecycle_cost`).  A combination with a part that has no
price, or a price in a currency without an exchange rate, is not ranked: it is listed
as unpriced with what is missing (never counted as free).
"""

from __future__ import annotations

import copy
import itertools
from collections import Counter
from dataclasses import dataclass, field, replace
from pathlib import Path

from offgrid.design.result import DesignError
from offgrid.economics.bom import BomLine
from offgrid.project.model import PriceItem, Project
from offgrid.stock.catalogue import (
    SYSTEM_VOLTAGES_V,
    Catalogue,
    StockPart,
    battery_spec,
    controller_spec,
    module_spec,
)
from offgrid.stock.money import Rates, convert, project_rates

MAIN_KINDS = ("modules", "batteries", "controllers", "inverters")


@dataclass(frozen=True)
class Combination:
    module: StockPart
    battery: StockPart
    controller: StockPart
    inverter: StockPart | None  # None: the design has no AC loads
    system_voltage_v: int
    module_count: int
    battery_units: int
    controller_count: int
    array_power_w: float
    bank_kwh: float
    capital: float | None  # project currency, installation share included
    lcc: float | None
    missing: tuple[str, ...] = ()  # parts without a usable price, and why

    def names(self) -> tuple[str, ...]:
        inv = self.inverter.name if self.inverter else "(no inverter)"
        return (self.module.name, self.battery.name, self.controller.name, inv)


@dataclass(frozen=True)
class Rejection:
    names: tuple[str, str, str, str]
    code: str
    message: str


@dataclass(frozen=True)
class SearchResult:
    currency: str
    tried: int
    designs_run: int
    by_capital: tuple[Combination, ...]
    by_lcc: tuple[Combination, ...]
    unpriced: tuple[Combination, ...]
    rejected: tuple[Rejection, ...]
    notes: tuple[str, ...] = ()
    reasons: dict[str, int] = field(default_factory=dict)  # code -> combinations rejected

    @property
    def best(self) -> Combination | None:
        return self.by_capital[0] if self.by_capital else None


def needs_inverter(project: Project) -> bool:
    """True when any load is AC with power (the engine's ``inverter.needed``)."""
    return any(ld.ac_dc == "ac" and ld.quantity * ld.power_w > 0 for ld in project.loads)


def with_parts(
    project: Project,
    module: StockPart,
    battery: StockPart,
    controller: StockPart,
    inverter: StockPart | None,
) -> Project:
    """A copy of the project with the catalogue parts' datasheets in its part tables.

    A shallow copy (the engine only reads a project): the four part tables are new,
    everything else is shared with ``project``, so a caller that changes another table
    of the copy replaces it first."""
    p = copy.copy(project)
    p.module = module_spec(module)
    p.battery = battery_spec(battery)
    p.controller = controller_spec(controller)
    if inverter is not None:
        p.inverter = replace(
            p.inverter,
            efficiency=float(inverter.spec["efficiency"]),
            self_consumption_w=float(inverter.spec["self_consumption_w"]),
        )
    return p


def price_in(part: StockPart, currency: str, *rates: Rates) -> tuple[float | None, str]:
    """The part's price in ``currency`` and, when there is none, why."""
    if part.price is None:
        return None, f"{part.name}: no price in the catalogue"
    value = convert(part.price, part.currency, currency, *rates)
    if value is None:
        return None, (
            f"{part.name}: priced in {part.currency}, no exchange rate to {currency} "
            "(add it to the catalogue's rates.csv or the project's [stock.rates])"
        )
    return value, ""


def check_parts(design, controller: StockPart, inverter: StockPart | None) -> tuple[str, str]:
    """What the engine does not check itself; ('', '') when the parts fit, else (code, why)."""
    v = design.battery.system_voltage_v
    volts = controller.spec["battery_voltages_v"]
    if v not in volts:
        return "controller-battery-voltage", (
            f"{controller.name} works at {' '.join(map(str, volts))} V, the system is {v} V"
        )
    inv = design.inverter
    if inverter is None or not inv.needed:
        return "", ""
    s = inverter.spec
    if s["dc_voltage_v"] != v:
        return "inverter-dc-voltage", (
            f"{inverter.name} takes {s['dc_voltage_v']} V DC, the system is {v} V"
        )
    if s["continuous_w"] + 1e-9 < inv.required_continuous_w:
        return "inverter-continuous", (
            f"{inverter.name} gives {s['continuous_w']:g} W continuous, the design needs "
            f"{inv.required_continuous_w:.0f} W (1.25 x the AC power on at once)"
        )
    if s["surge_w"] + 1e-9 < inv.required_surge_w:
        return "inverter-surge", (
            f"{inverter.name} gives {s['surge_w']:g} W surge, the design needs "
            f"{inv.required_surge_w:.0f} W to start the largest appliance"
        )
    return "", ""


def replace_choices(project: Project, system_voltage_v: int) -> Project:
    """A shallow copy of the project at a fixed system voltage."""
    p = copy.copy(project)
    p.choices = replace(project.choices, system_voltage=int(system_voltage_v))
    return p


def fixed_voltage_check(
    system_v: int, controller: StockPart, inverter: StockPart | None
) -> tuple[str, str]:
    """With a fixed system voltage, the voltage checks of :func:`check_parts` need no
    design: they come first (so a part that cannot work at that voltage costs no design)."""
    volts = controller.spec["battery_voltages_v"]
    if system_v not in volts:
        return "controller-battery-voltage", (
            f"{controller.name} works at {' '.join(map(str, volts))} V, the system is {system_v} V"
        )
    if inverter is not None and inverter.spec["dc_voltage_v"] != system_v:
        return "inverter-dc-voltage", (
            f"{inverter.name} takes {inverter.spec['dc_voltage_v']} V DC, the system is "
            f"{system_v} V"
        )
    return "", ""


def main_lines(design, combo_parts: tuple) -> list[BomLine]:
    """The four main parts as bill-of-materials lines keyed by the catalogue names."""
    module, battery, controller, inverter = combo_parts
    a, b, c = design.array, design.battery, design.controller
    lines = [
        BomLine(f"module:{module.name}", module.name, float(a.module_count), "each", "", ""),
        BomLine(f"battery:{battery.name}", battery.name, float(b.unit_count), "each", "", ""),
        BomLine(f"controller:{controller.name}", controller.name, float(c.count), "each", "", ""),
    ]
    if inverter is not None and design.inverter.needed:
        lines.append(BomLine(f"inverter:{inverter.name}", inverter.name, 1.0, "each", "", ""))
    return lines


def cost_of(
    project: Project, design, combo_parts: tuple, rate_sets: tuple, factors: dict | None = None
) -> tuple:
    """(capital, lifecycle cost, missing) of the main parts in the project's currency.

    :func:`offgrid.economics.costs.lifecycle_cost` is linear in the lines' totals and,
    without a simulation, depends on the parts only through each line's kind (its service
    life; the battery's from its chemistry): ``factors`` caches, per (kind, chemistry),
    the capital and lifecycle cost of a line of total 1, so each combination costs a sum
    (``tests/test_stock_choose.py`` checks it against the direct call)."""
    from offgrid.economics.costs import lifecycle_cost

    currency = project.economics.currency
    lines = main_lines(design, combo_parts)
    prices, missing = [], []
    for ln, part in zip(lines, combo_parts, strict=False):
        value, why = price_in(part, currency, *rate_sets)
        if value is None:
            missing.append(why)
        else:
            prices.append(PriceItem(ln.key, value))
    if missing:
        return None, None, tuple(missing)
    if factors is None:
        priced = copy.copy(project)
        priced.prices = prices
        lc = lifecycle_cost(priced, design, tuple(lines))
        return lc.capital, lc.lcc, ()
    capital = lcc = 0.0
    for ln, price in zip(lines, prices, strict=True):
        key = (ln.kind, project.battery.chemistry)
        if key not in factors:
            one = copy.copy(project)
            one.prices = [PriceItem(ln.key, 1.0)]
            unit = BomLine(ln.key, ln.description, 1.0, ln.unit, "", "")
            lc = lifecycle_cost(one, design, (unit,))
            factors[key] = (lc.capital, lc.lcc)
        f_cap, f_lcc = factors[key]
        total = price.unit_price * ln.quantity
        capital += total * f_cap
        lcc += total * f_lcc
    return capital, lcc, ()


def rate_sets_for(project: Project, catalogue: Catalogue) -> tuple[tuple[Rates, ...], list[str]]:
    stock = project.extra.get("stock")
    table = stock.get("rates", {}) if isinstance(stock, dict) else {}
    own, problems = project_rates(
        table if isinstance(table, dict) else {}, project.economics.currency
    )
    return (own, catalogue.rates), problems


def _pool_context():
    """fork when it is safe (no other thread runs: the text UI searches in a worker
    thread), else None: then the search runs in this process."""
    import multiprocessing
    import threading

    if "fork" in multiprocessing.get_all_start_methods() and threading.active_count() == 1:
        return multiprocessing.get_context("fork")
    return None


_WORKER_REUSE: dict[str, object] = {}  # in a worker process: the search's token -> StepReuse


def _chunk_in_worker(chunk: tuple):
    from offgrid.memo import design_memo
    from offgrid.stock.reuse import StepReuse

    *args, token = chunk
    reuse = None
    if token:
        if token not in _WORKER_REUSE:
            _WORKER_REUSE.clear()  # one search's steps at a time
            _WORKER_REUSE[token] = StepReuse()
        reuse = _WORKER_REUSE[token]
    with design_memo():
        return _search_chunk(*args, reuse=reuse)


def _group_key(inverter: StockPart | None, system_voltage_v: int) -> tuple:
    """What the loads read of the inverter (efficiency, idle draw), and the system voltage."""
    if inverter is None:
        return ("project inverter", system_voltage_v)
    s = inverter.spec
    return (float(s["efficiency"]), float(s["self_consumption_w"]), system_voltage_v)


def _search_chunk(
    project, v, m, bats, ctrls, groups, base, rate_sets, keep: int = 2000, reuse=None
):
    """One module at one system voltage against every battery, controller and inverter:
    (feasible, rejections, reasons, tried, designs run).

    ``reuse``: a :class:`~offgrid.stock.reuse.StepReuse` shared by the search's chunks
    (the same figures and refusals as ``sizing.design``, each step once per distinct
    input), or None: every combination designed by ``sizing.design``."""
    from offgrid.design.sizing import design

    feasible: list[Combination] = []
    rejected: list[Rejection] = []
    reasons: Counter[str] = Counter()
    tried = runs = 0
    factors: dict = {}  # (kind, chemistry) -> capital and lifecycle cost of a total of 1
    cost_projects: dict[str, Project] = {}
    bat_keys = {
        b.name: (b.spec["efficiency"], b.spec["chemistry"], b.spec["nominal_voltage_v"])
        for b in bats
    }

    def reject(names: tuple, code: str, why: str) -> None:
        reasons[code] += 1
        if len(rejected) < keep:
            rejected.append(Rejection(names, code, why))

    for b, c in itertools.product(bats, ctrls):
        for group in groups:
            members = []
            for inv in group:
                names = (m.name, b.name, c.name, inv.name if inv else "")
                code, why = fixed_voltage_check(v, c, inv)
                if code:
                    tried += 1
                    reject(names, code, why)
                else:
                    members.append(inv)
            if not members:
                continue
            runs += 1
            try:
                if reuse is None:
                    trial = with_parts(project, m, b, c, members[0])
                    d = design(trial, base)
                else:
                    # the costs read of the project only its economics and the battery's
                    # chemistry: one copy per battery unit serves them
                    if b.name not in cost_projects:
                        cost_projects[b.name] = with_parts(project, m, b, c, members[0])
                    trial = cost_projects[b.name]
                    d = reuse.design(
                        lambda b=b, c=c, i=members[0]: with_parts(project, m, b, c, i),
                        (m.name, b.name, c.name),
                        _group_key(members[0], v),
                        bat_keys[b.name],
                    )
                error = None
            except DesignError as exc:
                error = exc
            for inv in members:
                tried += 1
                names = (m.name, b.name, c.name, inv.name if inv else "")
                code, why = (error.code, str(error)) if error else check_parts(d, c, inv)
                if code:
                    reject(names, code, why)
                    continue
                capital, lcc, missing = cost_of(trial, d, (m, b, c, inv), rate_sets, factors)
                feasible.append(
                    Combination(
                        m,
                        b,
                        c,
                        inv,
                        d.battery.system_voltage_v,
                        d.array.module_count,
                        d.battery.unit_count,
                        d.controller.count,
                        d.array.power_w,
                        d.battery.nominal_kwh,
                        capital,
                        lcc,
                        missing,
                    )
                )
    return feasible, rejected, dict(reasons), tried, runs


def search(
    project: Project,
    catalogue: Catalogue,
    base: Path | None = None,
    keep_rejected: int = 2000,
    jobs: int = 1,
    reuse: bool = True,
) -> SearchResult:
    """Every combination of the catalogue's main parts, designed, checked and ranked.

    ``jobs`` > 1 shares the modules out between that many worker processes (fork only;
    the result is the same).  ``reuse``: the design steps shared across the combinations
    (:mod:`offgrid.stock.reuse`; False designs each by ``sizing.design``, the same
    result, about 20 times slower on a large catalogue).  Raises
    :class:`~offgrid.design.result.DesignError` when the project's climate cannot be
    read (no combination could be designed)."""
    from offgrid.design.sizing import resolve_climate
    from offgrid.memo import design_memo
    from offgrid.project.model import ClimateChoice

    rate_sets, notes = rate_sets_for(project, catalogue)
    # the climate read once (DesignError when it cannot be): every trial shares it
    project = copy.copy(project)
    project.climate = ClimateChoice(inline=resolve_climate(project, base))
    mods, bats, ctrls = (catalogue.of(k) for k in MAIN_KINDS[:3])
    invs: tuple[StockPart | None, ...] = (
        catalogue.of("inverters") if needs_inverter(project) else (None,)
    )
    if not (mods and bats and ctrls and invs):
        needed = MAIN_KINDS if invs != (None,) else MAIN_KINDS[:3]
        empty = [k for k in needed if not catalogue.of(k)]
        notes.append("the catalogue has no " + ", ".join(empty) + ": nothing to combine")
        return SearchResult(project.economics.currency, 0, 0, (), (), (), (), tuple(notes))
    groups: dict[tuple, list[StockPart | None]] = {}
    for inv in invs:
        key = None if inv is None else (inv.spec["efficiency"], inv.spec["self_consumption_w"])
        groups.setdefault(key, []).append(inv)
    fixed = project.choices.system_voltage
    # "auto": each system voltage is tried as a fixed one (the engine's own choice would
    # hide the parts that work at another voltage)
    volts = SYSTEM_VOLTAGES_V if fixed == "auto" else (int(fixed),)
    if fixed == "auto":
        notes.append(
            "system voltage 'auto': every combination tried at 12, 24 and 48 V; taking one "
            "fixes the project's system voltage at its own"
        )
    chunks = [
        (replace_choices(project, v), v, m, bats, ctrls, tuple(groups.values()), base, rate_sets)
        for v in volts
        for m in mods
    ]
    context = _pool_context() if jobs > 1 and len(chunks) > 1 else None
    if context is None:
        from offgrid.stock.reuse import StepReuse

        shared = StepReuse() if reuse else None
        with design_memo():
            done = [_search_chunk(*c, reuse=shared) for c in chunks]
    else:
        import uuid
        from concurrent.futures import ProcessPoolExecutor

        token = uuid.uuid4().hex if reuse else ""
        with ProcessPoolExecutor(max_workers=jobs, mp_context=context) as pool:
            done = list(pool.map(_chunk_in_worker, [(*c, token) for c in chunks]))
    feasible: list[Combination] = []
    rejected: list[Rejection] = []
    reasons: Counter[str] = Counter()
    tried = runs = 0
    for ok, rej, why, n_tried, n_runs in done:  # in the order of the chunks: deterministic
        feasible += ok
        rejected += rej[: max(0, keep_rejected - len(rejected))]
        reasons.update(why)
        tried += n_tried
        runs += n_runs
    priced = [x for x in feasible if x.capital is not None]
    unpriced = tuple(x for x in feasible if x.capital is None)
    by_capital = tuple(
        sorted(priced, key=lambda x: (x.capital, x.lcc, x.names(), x.system_voltage_v))
    )
    by_lcc = tuple(sorted(priced, key=lambda x: (x.lcc, x.capital, x.names(), x.system_voltage_v)))
    return SearchResult(
        project.economics.currency,
        tried,
        runs,
        by_capital,
        by_lcc,
        unpriced,
        tuple(rejected),
        tuple(notes),
        dict(reasons),
    )
