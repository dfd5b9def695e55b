"""Views of a community plan: an 80-column text summary, a Markdown report and a row CSV."""

from __future__ import annotations

import csv
import io
import textwrap

from offgrid.plan.community import CommunityPlan, RowResult
from offgrid.plan.kits import KitParts, parts_of
from offgrid.plan.tiers import MTF_EDITION, TIER_NAMES
from offgrid.safetext import csv_row, markdown_text, visible

WIDTH = 80
#: The text summary lists every row up to this many; beyond, only the exceptions.
ROWS_SHOWN = 40


def _money(value: float | None) -> str:
    return "-" if value is None else f"{value:,.0f}"


def _unit_price(value: float | None) -> str:
    if value is None:
        return "-"
    return f"{value:,.2f}" if value < 10 else f"{value:,.0f}"


def _qty(line) -> str:
    return f"{line.quantity:.0f} m" if line.unit == "m" else f"{line.quantity:.0f}"


def _pct(value: float | None) -> str:
    return "-" if value is None else f"{value:+.0f}%"


def array_text(p: KitParts) -> str:
    return f"{p.module_count} x {p.module_pmax_w:g} W"


def battery_text(p: KitParts) -> str:
    return f"{p.unit_count} x {p.battery_unit_v:g} V {p.battery_unit_ah:g} Ah"


def controller_text(p: KitParts) -> str:
    n = f"{p.controller_count} x " if p.controller_count > 1 else ""
    return f"{n}{p.controller_type.upper()} {p.controller_current_a:g} A"


def inverter_text(p: KitParts) -> str:
    return f"{p.inverter_w:g} W" if p.inverter_w > 0 else "-"


def _curve_value(plan: CommunityPlan, value: float) -> str:
    if plan.standard is not None and plan.standard.objective == "oversize":
        systems = max(1, sum(k.systems for k in plan.standard.kits))
        return f"{100.0 * value / systems:.0f}"
    return _money(value)


def _wrap(text: str, lead: str = "  ") -> list[str]:
    return textwrap.wrap(text, WIDTH, initial_indent=lead, subsequent_indent=" " * len(lead))


def _kit_mode(plan: CommunityPlan) -> str:
    s = plan.standard
    assert s is not None
    target = "least total cost" if s.objective == "cost" else "least oversize"
    parts = []
    if s.k_limit is not None:
        parts.append(f"at most {s.k_limit}")
    if s.kit_type_cost > 0:
        parts.append(f"{s.kit_type_cost:,.0f} {plan.currency} per kit type")
    return ", ".join([*parts, target])


def _row_line(r: RowResult) -> str:
    tier = "-" if r.tier_served is None else str(r.tier_served)
    where = r.kit or ("own" if r.status == "own system" else r.status)
    return (
        f"  {r.id[:12]:<12} {r.kind[:9]:<9} {r.count:>5}  {tier:>4}  {where[:13]:<13} "
        f"{_pct(r.oversize_array_pct):>7} {_pct(r.oversize_battery_pct):>8}"
    )


def summary_text(plan: CommunityPlan, show_rows: bool | None = None) -> str:
    """The plan in 80 columns; every row is listed when ``show_rows`` (default: if few)."""
    out: list[str] = []
    title = plan.name + ("  (demonstration data)" if plan.demo else "")
    out += [title, "=" * min(WIDTH, len(title))]
    out.append(f"Survey   {plan.source}")
    tilt = f", one tilt {plan.tilt_deg:.0f} deg for every kit" if plan.tilt_deg is not None else ""
    out.append(f"Climate  {plan.climate or '-'}{tilt}")
    if plan.prices_source:
        out.append(f"Prices   {plan.prices_source} ({plan.currency})")
    planned = sum(1 for r in plan.rows if r.status in ("kit", "own system"))
    out += _wrap(
        f"{plan.rows_read} read, {planned} planned ({plan.systems} systems), "
        f"{len({p.line for p in plan.bad_rows})} left out, {len(plan.unmet)} cannot be "
        f"met; {plan.distinct_designs} distinct designs",
        "Rows     ",
    )
    if plan.stepped_rows and plan.energy_step_pct > 0:
        out += _wrap(
            f"{plan.stepped_rows} row(s) given by energy and peak power are designed "
            f"at the next {plan.energy_step_pct:g} % step up (--energy-step 0: as "
            "given)",
            "         ",
        )
    s = plan.standard
    if s is not None:
        out.append("")
        out.append(f"Standard kits: {len(s.kits)} type(s), {_kit_mode(plan)}")
        out.append(
            f"  {'kit':<4} {'array':<12} {'battery':<18} {'controller':<13} "
            f"{'inverter':>8} {'systems':>7} {'each':>8}"
        )
        families = []
        for k in s.kits:
            p = k.parts
            out.append(
                f"  {k.name:<4} {array_text(p):<12} {battery_text(p)[:18]:<18} "
                f"{controller_text(p)[:13]:<13} {inverter_text(p):>8} {k.systems:>7} "
                f"{_money(k.unit_cost):>8}"
            )
            if p.family_label not in families:
                families.append(p.family_label)
        for fam in families:
            names = ", ".join(k.name for k in s.kits if k.parts.family_label == fam)
            word = "kits" if "," in names else "kit"
            out += _wrap(f"{word} {names}: {fam}", "  ")
        if len(s.curve) > 1:
            chosen = len(s.kits)
            cells = [
                f"{k}{'*' if k == chosen else ''}: {_curve_value(plan, v)}" for k, v in s.curve
            ]
            what = (
                f"total cost ({plan.currency}"
                if s.objective == "cost"
                else "mean oversize per system (%"
            )
            out.append(f"  Kit types against the {what}; * chosen):")
            out += _wrap("  ".join(cells), "    ")
        own = [r for r in plan.rows if r.status == "own system"]
        if own:
            out.append("")
            out.append("Own systems (better served by a system of its own)")
            out.append(
                f"  {'id':<12} {'kind':<9} {'count':>5} {'array':<12} {'battery':<18} "
                f"{'inverter':>8} {'each':>8}"
            )
            for r in own:
                assert r.design is not None
                p = parts_of(r.design)
                out.append(
                    f"  {r.id[:12]:<12} {r.kind[:9]:<9} {r.count:>5} {array_text(p):<12} "
                    f"{battery_text(p)[:18]:<18} {inverter_text(p):>8} "
                    f"{_money(r.unit_cost):>8}"
                )
            reasons = sorted({r.reason for r in own})
            for text in reasons:
                ids = ", ".join(r.id for r in own if r.reason == text)
                out += _wrap(f"{ids}: {text}", "  ")
    rows = [r for r in plan.rows if r.status in ("kit", "own system")]
    show = show_rows if show_rows is not None else len(rows) <= ROWS_SHOWN
    if rows:
        out.append("")
        if show:
            out.append("Rows (tier as served; oversize of array and battery over the row's need)")
        else:
            big = sorted(rows, key=lambda r: -(r.oversize_battery_pct or 0))[:10]
            out.append(f"Most oversized rows ({len(rows)} planned; --rows lists all)")
            rows = big
        out.append(
            f"  {'id':<12} {'kind':<9} {'count':>5}  {'tier':>4}  {'kit':<13} "
            f"{'array':>7} {'battery':>8}"
        )
        out += [_row_line(r) for r in rows]
    out.append("")
    out += _wrap(f"Access tiers, systems as served ({MTF_EDITION}; thresholds from memory)", "")
    out.append("  " + "  ".join(f"{name}: {plan.tier_counts.get(name, 0)}" for name in TIER_NAMES))
    t = plan.totals
    if t is not None:
        out.append("")
        out.append(f"Procurement totals ({t.systems} systems)")
        cur = f" {t.currency}" if t.currency else ""
        out.append(f"  {'qty':>7}  {'part':<39} {'unit' + cur:>12} {'cost' + cur:>14}")
        for line in t.lines:
            out.append(
                f"  {_qty(line):>7}  {line.label[:39]:<39} "
                f"{_unit_price(line.unit_price):>12} {_money(line.cost):>14}"
            )
        if t.total_cost is not None:
            demo = "  (demonstration prices)" if plan.demo else ""
            out.append(f"  Capital cost: {t.total_cost:,.0f} {t.currency}{demo}")
        if t.unpriced:
            out += _wrap(f"Not priced (no price-list row): {', '.join(t.unpriced)}.", "  ")
        out += _wrap(
            "Kits are compared on modules, batteries, controllers, inverters and the "
            "per-system price; cables and protection are added here from each "
            "design's electrical result.",
            "  ",
        )
    if plan.unmet:
        out.append("")
        out.append(f"Cannot be met ({len(plan.unmet)} row(s))")
        for r in plan.unmet:
            out += _wrap(f"line {r.line} (id {r.id}): {r.reason}", "  - ")
    if plan.bad_rows:
        out.append("")
        out.append(f"Left out: rows that could not be read ({len(plan.bad_rows)} problem(s))")
        for p in plan.bad_rows:
            out += _wrap(str(p), "  - ")
    if plan.notices:
        out.append("")
        out.append("Notices")
        for n in plan.notices:
            out += _wrap(f"[{n.code}] {n.message}", "  - ")
    out.append("")
    out.append("Safety cautions")
    for text in plan.cautions:
        out += _wrap(text, "  ! ")
    return "\n".join(line[:WIDTH] for line in out)


def _md_row(cells) -> str:
    return "| " + " | ".join(markdown_text(str(c)) for c in cells) + " |"


def markdown_report(plan: CommunityPlan) -> str:
    """The plan as a Markdown document (kits, own systems, every row, totals, tiers)."""
    md: list[str] = [f"# {markdown_text(plan.name)}", ""]
    if plan.demo:
        md += ["*Demonstration data: the community, the people and the prices are invented.*", ""]
    md += [f"- Survey: {markdown_text(plan.source)}", f"- Climate: {markdown_text(plan.climate)}"]
    if plan.tilt_deg is not None:
        md.append(f"- Tilt: {plan.tilt_deg:.0f} deg for every system (one mounting for the kits)")
    if plan.prices_source:
        md.append(f"- Prices: {markdown_text(plan.prices_source)} ({markdown_text(plan.currency)})")
    md.append(
        f"- Rows: {plan.rows_read} read, {plan.systems} systems planned, "
        f"{len({p.line for p in plan.bad_rows})} left out, {len(plan.unmet)} cannot be met"
    )
    s = plan.standard
    if s is not None:
        md += [
            "",
            "## Standard kits",
            "",
            f"{len(s.kits)} kit type(s), {_kit_mode(plan)}.",
            "",
            f"Method: {s.method}.",
            "",
        ]
        md.append(
            _md_row(
                [
                    "kit",
                    "family",
                    "array",
                    "battery",
                    "controller",
                    "inverter",
                    "systems",
                    f"each ({plan.currency or '-'})",
                ]
            )
        )
        md.append(_md_row(["---"] * 8))
        for k in s.kits:
            p = k.parts
            md.append(
                _md_row(
                    [
                        k.name,
                        p.family_label,
                        f"{array_text(p)} ({p.array_power_w:g} W)",
                        f"{battery_text(p)} ({p.nominal_wh / 1000:.2f} kWh)",
                        controller_text(p),
                        inverter_text(p),
                        k.systems,
                        _money(k.unit_cost),
                    ]
                )
            )
        if len(s.curve) > 1:
            md += [
                "",
                "Best objective against the number of kit types:",
                "",
                _md_row(["kit types", *[k for k, _ in s.curve]]),
                _md_row(["---"] * (len(s.curve) + 1)),
                _md_row(
                    [
                        "cost" if s.objective == "cost" else "mean oversize %",
                        *[_curve_value(plan, v) for _, v in s.curve],
                    ]
                ),
            ]
    own = [r for r in plan.rows if r.status == "own system"]
    if own:
        md += [
            "",
            "## Own systems",
            "",
            _md_row(["id", "name", "count", "array", "battery", "inverter", "reason"]),
            _md_row(["---"] * 7),
        ]
        for r in own:
            assert r.design is not None
            p = parts_of(r.design)
            md.append(
                _md_row(
                    [
                        r.id,
                        r.name,
                        r.count,
                        array_text(p),
                        battery_text(p),
                        inverter_text(p),
                        r.reason,
                    ]
                )
            )
    md += [
        "",
        "## Rows",
        "",
        _md_row(
            [
                "line",
                "id",
                "name",
                "kind",
                "count",
                "needs W / Wh",
                "tier own",
                "tier served",
                "kit",
                "array over",
                "battery over",
            ]
        ),
        _md_row(["---"] * 11),
    ]
    for r in plan.rows:
        need = f"{r.design.required_power_w:.0f} / {r.design.required_wh:.0f}" if r.design else "-"
        md.append(
            _md_row(
                [
                    r.line,
                    r.id,
                    r.name,
                    r.kind,
                    r.count,
                    need,
                    "-" if r.tier is None else r.tier,
                    "-" if r.tier_served is None else r.tier_served,
                    r.kit or r.status,
                    _pct(r.oversize_array_pct),
                    _pct(r.oversize_battery_pct),
                ]
            )
        )
    md += [
        "",
        f"## Access tiers ({MTF_EDITION}, thresholds from memory)",
        "",
        _md_row(TIER_NAMES),
        _md_row(["---"] * len(TIER_NAMES)),
        _md_row([plan.tier_counts.get(n, 0) for n in TIER_NAMES]),
    ]
    t = plan.totals
    if t is not None:
        md += [
            "",
            "## Procurement totals",
            "",
            _md_row(
                [
                    "part",
                    "description",
                    "quantity",
                    f"unit ({t.currency or '-'})",
                    f"cost ({t.currency or '-'})",
                ]
            ),
            _md_row(["---"] * 5),
        ]
        for line in t.lines:
            md.append(
                _md_row(
                    [
                        line.category,
                        line.description,
                        _qty(line),
                        _unit_price(line.unit_price),
                        _money(line.cost),
                    ]
                )
            )
        if t.total_cost is not None:
            md += ["", f"**Capital cost: {t.total_cost:,.0f} {t.currency}**"]
        if t.unpriced:
            md += [
                "",
                "Not priced (no price-list row): " + markdown_text(", ".join(t.unpriced)) + ".",
            ]
        md += [
            "",
            "Kits are compared on modules, batteries, controllers, inverters and the "
            "per-system price; cables and protection are added here from each design's "
            "electrical result. Cable is metres of two-conductor cable (2 x one-way length "
            "x runs).",
        ]
    if plan.unmet:
        md += ["", "## Cannot be met", ""]
        md += [
            f"- line {r.line} (id {markdown_text(r.id)}): {markdown_text(r.reason)}"
            for r in plan.unmet
        ]
    if plan.bad_rows:
        md += ["", "## Rows left out", ""]
        md += [f"- {markdown_text(str(p))}" for p in plan.bad_rows]
    if plan.notices:
        md += ["", "## Notices", ""]
        md += [f"- \\[{n.code}\\] {markdown_text(n.message)}" for n in plan.notices]
    md += ["", "## Safety cautions", ""]
    md += [f"- {markdown_text(c)}" for c in plan.cautions]
    return visible("\n".join(md)) + "\n"


def rows_csv(plan: CommunityPlan) -> str:
    """One line per row: what it needs, what it gets, and why (for a spreadsheet)."""
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    w.writerow(
        [
            "line",
            "id",
            "name",
            "kind",
            "count",
            "status",
            "kit",
            "required_array_w",
            "required_battery_wh",
            "array_w",
            "battery_wh",
            "inverter_w",
            "tier_own",
            "tier_served",
            "oversize_array_pct",
            "oversize_battery_pct",
            "unit_cost",
            "reason",
        ]
    )
    kits = {k.name: k.parts for k in plan.standard.kits} if plan.standard else {}
    for r in plan.rows:
        d = r.design
        parts = kits.get(r.kit) if r.kit else (parts_of(d) if d else None)
        w.writerow(
            csv_row(
                [
                    r.line,
                    r.id,
                    r.name,
                    r.kind,
                    r.count,
                    r.status,
                    r.kit or "",
                    f"{d.required_power_w:.1f}" if d else "",
                    f"{d.required_wh:.0f}" if d else "",
                    f"{parts.array_power_w:g}" if parts else "",
                    f"{parts.nominal_wh:.0f}" if parts else "",
                    f"{parts.inverter_w:g}" if parts else "",
                    "" if r.tier is None else r.tier,
                    "" if r.tier_served is None else r.tier_served,
                    "" if r.oversize_array_pct is None else f"{r.oversize_array_pct:.1f}",
                    "" if r.oversize_battery_pct is None else f"{r.oversize_battery_pct:.1f}",
                    "" if r.unit_cost is None else f"{r.unit_cost:.2f}",
                    r.reason,
                ]
            )
        )
    for p in plan.bad_rows:
        w.writerow(
            csv_row(
                [
                    p.line,
                    p.row_id,
                    "",
                    "",
                    "",
                    "left out",
                    "",
                    "",
                    "",
                    "",
                    "",
                    "",
                    "",
                    "",
                    "",
                    "",
                    "",
                    f"{p.field}: {p.message}",
                ]
            )
        )
    return out.getvalue()


# ----------------------------------------------------------------- tables for the text UI

Table = tuple[tuple[str, ...], list[tuple[str, ...]]]


def kit_table(plan: CommunityPlan) -> Table:
    """(headers, rows) of the standard kits, as plain strings."""
    head = (
        "kit",
        "array",
        "battery",
        "controller",
        "inverter",
        "systems",
        f"each {plan.currency}".strip(),
    )
    rows = []
    if plan.standard is not None:
        for k in plan.standard.kits:
            p = k.parts
            rows.append(
                (
                    k.name,
                    array_text(p),
                    battery_text(p),
                    controller_text(p),
                    inverter_text(p),
                    str(k.systems),
                    _money(k.unit_cost),
                )
            )
    return head, rows


def row_table(plan: CommunityPlan) -> Table:
    """(headers, rows) of every survey row: status, kit, tier and oversize."""
    head = ("line", "id", "kind", "count", "status", "kit", "tier", "array +", "battery +")
    rows = []
    for r in plan.rows:
        rows.append(
            (
                str(r.line),
                r.id,
                r.kind,
                str(r.count),
                r.status,
                r.kit or "-",
                "-" if r.tier_served is None else str(r.tier_served),
                _pct(r.oversize_array_pct),
                _pct(r.oversize_battery_pct),
            )
        )
    for p in plan.bad_rows:
        rows.append((str(p.line), p.row_id or "-", "-", "-", "left out", "-", "-", "-", "-"))
    return head, rows


def totals_table(plan: CommunityPlan) -> Table:
    """(headers, rows) of the procurement totals."""
    cur = plan.currency
    head = ("qty", "part", f"unit {cur}".strip(), f"cost {cur}".strip())
    rows = []
    if plan.totals is not None:
        for line in plan.totals.lines:
            rows.append((_qty(line), line.label, _unit_price(line.unit_price), _money(line.cost)))
    return head, rows
