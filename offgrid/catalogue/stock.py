"""The inputs of the parts stock (``[stock]``, kept verbatim in ``Project.extra``).

:func:`offgrid.stock.project_parts.stock_problems` checks the table against these rows
and :func:`offgrid.stock.money.project_rates` each exchange rate against
``stock.rates`` (above 0, at most its ``high``).  The ``stock.<part>`` tables are the
whole catalogue rows that ``offgrid parts best --take`` writes.
"""

from __future__ import annotations

from offgrid.catalogue.entries import InputEntry as In

STOCK_INPUTS: tuple[In, ...] = (
    In("stock.mounting", "Module mounting", kind="choice",
       hint="where the modules are mounted: ground frame or roof rails (sets the mounting "
       "line of the bill of materials)",
       values=("ground", "roof")),
    In("stock.cable_allowance_pct", "Cable allowance", "%", 0.0, 100.0,
       "cable bought over the measured runs for offcuts and terminations (common practice, "
       "no source)"),
    In("stock.rates", "Exchange rates", "project currency per unit", 0.0, 1e7,
       "one unit of a price list's currency in the project's currency (EUR = 1.08); wins "
       "over the catalogue's rates.csv", "table"),
    In("stock.module", "Catalogue module", kind="table",
       hint="the whole catalogue row of the module taken (name, datasheet, price, currency, "
       "supplier); written by `offgrid parts best --take`"),
    In("stock.battery", "Catalogue battery unit", kind="table",
       hint="the whole catalogue row of the battery unit taken"),
    In("stock.controller", "Catalogue controller", kind="table",
       hint="the whole catalogue row of the charge controller taken (with its battery "
       "voltages)"),
    In("stock.inverter", "Catalogue inverter", kind="table",
       hint="the whole catalogue row of the inverter taken (continuous, surge, DC voltage, "
       "charger current)"),
)  # fmt: skip
