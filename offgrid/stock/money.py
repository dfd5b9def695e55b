"""Money between currencies: exchange rates of a catalogue and of a project.

A catalogue's ``rates.csv`` has the columns ``from, to, rate``: one unit of ``from``
buys ``rate`` units of ``to`` (``EUR, USD, 1.08``).  A project may hold its own rates
(``[stock.rates]``, ``EUR = 1.08``: one EUR in the project's currency), which win over
the catalogue's.  A rate is used directly or inverted; rates are not chained, so a price
without a rate to the project's currency stays unpriced (counted and listed, never
taken as zero).
"""

from __future__ import annotations

from pathlib import Path

from offgrid.catalogue import input_entry
from offgrid.numbers import NumberError, read_number
from offgrid.safetext import printable

Rates = dict[tuple[str, str], float]


def rate_problem(value: float) -> str | None:
    """Why ``value`` is not an exchange rate, or None: above the catalogue's ``stock.rates``
    low (0) and at most its high, the largest rate accepted either way (a rate of rates.csv
    is held to the same)."""
    spec = input_entry("stock.rates")
    if not spec.low < value <= spec.high:
        most = f"{spec.high:.0e}".replace("e+0", "e")
        return (
            f"{value:g} is not a rate: one unit of 'from' in 'to', above {spec.low:g} and at "
            f"most {most}"
        )
    return None


def read_rates_csv(text: str, source: str) -> tuple[Rates, list]:
    """Rates of a ``from, to, rate`` CSV, and the problems of its rows (each skipped)."""
    from offgrid.economics.prices import read_price_table
    from offgrid.stock.catalogue import CatalogueProblem

    table = read_price_table(text)
    have = {n.strip().lower() for n in table.names}
    if not {"from", "to", "rate"} <= have:
        return {}, [
            CatalogueProblem(source, 1, None, "needs the columns from, to, rate (EUR, USD, 1.08)")
        ]
    rates: Rates = {}
    problems = []
    for line, cells in table.records:
        src, dst = cells.get("from", "").upper(), cells.get("to", "").upper()
        if not all(len(x) == 3 and x.isascii() and x.isalpha() for x in (src, dst)):
            problems.append(
                CatalogueProblem(
                    source,
                    line,
                    "from",
                    "both currencies are needed as three-letter codes (EUR, USD); row skipped",
                )
            )
            continue
        try:
            rate = read_number(cells.get("rate", ""))
        except NumberError as exc:
            problems.append(CatalogueProblem(source, line, "rate", f"{exc}; row skipped"))
            continue
        why = rate_problem(rate)
        if why:
            problems.append(CatalogueProblem(source, line, "rate", why + "; row skipped"))
            continue
        if (src, dst) in rates:
            problems.append(
                CatalogueProblem(
                    source,
                    line,
                    "from",
                    f"{printable(src)} to {printable(dst)} is given twice; row skipped",
                )
            )
            continue
        rates[(src, dst)] = rate
    return rates, problems


def load_rates(path: Path) -> tuple[Rates, list]:
    from offgrid.stock.catalogue import CatalogueProblem
    from offgrid.textfile import TextFileError, read_text

    if not path.exists():
        return {}, []
    try:
        text = read_text(path)
    except TextFileError as exc:
        return {}, [CatalogueProblem(str(path), None, None, str(exc))]
    return read_rates_csv(text, str(path))


def project_rates(table: dict, currency: str) -> tuple[Rates, list[str]]:
    """A project's ``[stock.rates]`` (currency -> its value in the project's currency)."""
    rates: Rates = {}
    problems = []
    for code, value in table.items():
        if isinstance(value, bool) or not isinstance(value, int | float):
            problems.append(f"stock.rates.{code}: give a number (one {code} in {currency})")
            continue
        why = rate_problem(float(value))
        if why:
            problems.append(f"stock.rates.{code}: {why}")
            continue
        rates[(str(code).upper(), currency.upper())] = float(value)
    return rates, problems


def convert(amount: float, src: str, dst: str, *rate_sets: Rates) -> float | None:
    """``amount`` of ``src`` in ``dst``; None when no rate set has the pair (either way).

    The first rate set that has the pair wins (a project's own before the catalogue's).
    """
    src, dst = src.upper(), dst.upper()
    if src == dst:
        return amount
    for rates in rate_sets:
        if (src, dst) in rates:
            return amount * rates[(src, dst)]
        if (dst, src) in rates:
            return amount / rates[(dst, src)]
    return None
