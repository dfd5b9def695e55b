"""The one-page client summary: site, what is installed, what it serves and for how many
days without sun, the cost, the main cautions and a block for signatures.

Plain text in 78 columns (about one printed page); the long technical report stays
(:mod:`offgrid.report.build`).  The cost is the complete bill of materials priced from
the project's price list: with lines unpriced it says how many, never a partial sum as
the cost.  Recalled values are in client words (:func:`offgrid.wording.confirm_words`).
"""

from __future__ import annotations

import textwrap

from offgrid.design.result import SystemDesign
from offgrid.economics.costs import lifecycle_cost, money
from offgrid.project.model import Project
from offgrid.safetext import printable
from offgrid.wording import confirm_words

WIDTH = 78
#: The cautions a client summary shows first, in this order (the rest are in the report).
MAIN_CAUTIONS = (
    "battery-short-circuit",
    "lead-acid-ventilation",
    "lfp-cold-charge",
    "pv-live-in-daylight",
    "grounding",
    "dc-above-elv",
)
MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def _wrap(text: str, indent: str = "  ") -> list[str]:
    rest = " " * len(indent) + "  "
    return textwrap.wrap(text, WIDTH, initial_indent=indent, subsequent_indent=rest)


def _inverter_line(project: Project, design: SystemDesign) -> str:
    from offgrid.stock.project_parts import stock_inverter

    inv = design.inverter
    if not inv.needed:
        return "Inverter: none (all loads run on DC)"
    rec = stock_inverter(project)
    sized = _said("client.inverter", design)
    if rec is not None:  # the part chosen from stock, then the sizes it has to meet
        return f"Inverter: {printable(str(rec['name']))}; {sized}"
    return sized


def _said(entry_id: str, design: SystemDesign, currency: str = "", **words: str) -> str:
    """The catalogue's sentence ``entry_id`` (offgrid/catalogue/composites.py) filled
    from the design: each number with its figure's label and unit."""
    from offgrid.catalogue import composite, figure_entry

    tree = design.to_dict()

    def value_of(path: str) -> float | None:
        node = tree
        for part in path.split("."):
            node = node[part]  # a path of the design's JSON, as the catalogue names it
        return node

    return composite(entry_id).fill(value_of, figure_entry, currency, **words)


def client_summary_text(project: Project, design: SystemDesign) -> str:
    """The one-page summary as text (80-column safe)."""
    from offgrid.economics.bom import complete_bill_of_materials

    info, c = project.info, design.controller
    title = printable(info.name) + ("  (demonstration data, invented)" if info.demo else "")
    out = [title, "=" * min(WIDTH, len(title)), ""]
    if info.client:
        out.append(f"Client:    {printable(info.client)}")
    if info.designer:
        out.append(f"Designer:  {printable(info.designer)}")
    site = project.site
    out.append(
        f"Site:      {printable(site.name or '-')} (latitude {site.latitude_deg:.2f}, "
        f"longitude {site.longitude_deg:.2f})"
    )
    out += ["", "What is installed"]
    # each number with the catalogue's label and unit (offgrid/catalogue/composites.py)
    out += _wrap(_said("client.array", design, module=printable(project.module.name)))
    out += _wrap(_said("client.battery", design, battery=printable(project.battery.name)))
    out += _wrap(_said("client.controller", design, kind=c.type.upper()))
    out += _wrap(_inverter_line(project, design))
    month = MONTHS[design.site.design_month - 1]
    out += ["", "What it serves"]
    n_loads = len(project.loads)
    n_crit = sum(1 for x in project.loads if x.critical)
    lines_text = f"{n_loads} appliance line(s)" + (f", {n_crit} of them critical" if n_crit else "")
    out += _wrap(_said("client.serves", design, lines=lines_text, month=month))
    out += _wrap(_said("client.autonomy", design))
    lines = complete_bill_of_materials(project, design)
    lc = lifecycle_cost(project, design, lines)
    out += ["", "Cost"]
    if lc.capital is not None:
        from offgrid.catalogue import fill

        years = f"{project.economics.life_years} years"
        out += _wrap(fill("client.cost", lc, lc.currency, years=years))
    else:
        from offgrid.economics.generator_bom import bom_prices
        from offgrid.economics.prices import price_for

        table = bom_prices(project)  # the generator set: generator.price when not listed
        unpriced = [ln for ln in lines if price_for(ln.key, table) is None]
        so_far = sum((price_for(ln.key, table) or 0.0) * ln.quantity for ln in lines)
        n_priced = len(lines) - len(unpriced)
        out += _wrap(
            f"Not yet fully priced: {len(unpriced)} of {len(lines)} lines of the bill of "
            f"materials have no price, so no total cost is given. The {n_priced} "
            f"priced lines come to {money(so_far, lc.currency)} (parts only, INCOMPLETE). "
            "`offgrid parts bom` lists the unpriced lines; price them with `offgrid prices`."
        )
    if project.generator is not None:  # issue 16: the generator's lines are costed apart
        out += _wrap(
            "The generator and what its cautions ask for (charger, changeover, fuel store, "
            "exhaust, CO alarms) are in the bill of materials; their cost over the life, "
            "with the fuel, is the generator study's (`offgrid generator`), not part of "
            "the lifecycle cost of the solar parts."
        )
    out += ["", "Main cautions"]
    by_code = {x.code: x for x in design.electrical.cautions} if design.electrical else {}
    for code in MAIN_CAUTIONS:
        if code in by_code:
            out += _wrap(confirm_words(by_code[code].text), "- ")
    defers = by_code.get("defers-to-code")
    if defers is not None:
        out += ["", *_wrap(confirm_words(defers.text), "")]
    out += ["", "Signatures"]
    for who in ("Designer", "Installer", "Client"):
        out.append(f"  {who + ':':<11} {'_' * 30}   Date: {'_' * 12}")
    return "\n".join(out) + "\n"
