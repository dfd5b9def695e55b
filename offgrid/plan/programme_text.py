"""Views of a programme plan: an 80-column summary, a Markdown report, a row CSV."""

from __future__ import annotations

import csv
import io

from offgrid.plan.programme import ProgrammePlan
from offgrid.plan.text import (
    _money,
    _qty,
    _wrap,
    array_text,
    battery_text,
    controller_text,
    inverter_text,
)
from offgrid.plan.tiers import MTF_EDITION, TIER_NAMES

SCOPE_TEXT = {
    "programme": "one set of kits for the whole programme",
    "village": "each village its own kits",
    "zone": "one set of kits per zone",
}


def _kit_cell(counts: dict[str, int], names: list[str]) -> str:
    return " ".join(f"{counts.get(n, 0)}" for n in names)


def summary_text(plan: ProgrammePlan) -> str:
    out: list[str] = []
    title = f"Programme plan: {plan.name}"
    out += [title, "=" * min(len(title), 80)]
    if plan.demo:
        out += _wrap("Invented demonstration data: villages, sites and households are made up.", "")
    out.append(
        f"{len(plan.villages)} village(s), {plan.rows_read} survey row(s), "
        f"{plan.systems} systems, {plan.distinct_designs} distinct designs"
    )
    out.append(f"Kits: {SCOPE_TEXT[plan.kit_scope]}")
    out += [
        "",
        "Standard kits (each serves its most demanding household, in whichever village)",
        f"  {'kit':<10} {'systems':>7}  {'array':<11} {'battery':<22} "
        f"{'controller':<12} {'inverter':>8}",
    ]
    for k in plan.kits:
        p = k.parts
        out.append(
            f"  {k.name[:10]:<10} {k.systems:>7}  {array_text(p)[:11]:<11} "
            f"{battery_text(p)[:22]:<22} {controller_text(p)[:12]:<12} "
            f"{inverter_text(p):>8}"
        )
    names = [k.name for k in plan.kits]
    out += ["", "Villages"]
    if len(names) <= 6 and all(len(n) <= 5 for n in names):
        head = " ".join(f"{n[:5]:>5}" for n in names)
        out.append(f"  {'id':<8} {'systems':>7} {head} {'own':>4} {'cost':>10}")
        for v in plan.villages:
            cells = " ".join(f"{v.kit_counts.get(n, 0):>5}" for n in names)
            cost = _money(v.totals.total_cost if v.totals else None)
            out.append(f"  {v.id[:8]:<8} {v.systems:>7} {cells} {v.own_systems:>4} {cost:>10}")
    else:
        out.append(f"  {'id':<8} {'systems':>7} {'kits used':<40} {'own':>4} {'cost':>10}")
        for v in plan.villages:
            used = ", ".join(f"{n} {c}" for n, c in sorted(v.kit_counts.items()))
            cost = _money(v.totals.total_cost if v.totals else None)
            out.append(
                f"  {v.id[:8]:<8} {v.systems:>7} {used[:40]:<40} {v.own_systems:>4} {cost:>10}"
            )
    for v in plan.villages:
        if v.own_rows:
            shown = ", ".join(v.own_rows[:6]) + (
                f" and {len(v.own_rows) - 6} more" if len(v.own_rows) > 6 else ""
            )
            out += _wrap(f"{v.id}: own design for {shown}", "  ")
    out += ["", f"Procurement totals ({plan.currency or 'not priced'})"]
    if plan.totals is not None:
        for line in plan.totals.lines:
            out.append(f"  {line.label[:44]:<44} {_qty(line):>12} {_money(line.cost):>14}")
        out.append(f"  {'Total':<44} {'':>12} {_money(plan.totals.total_cost):>14}")
    tiers = ", ".join(f"{t} {plan.tier_counts[t]}" for t in TIER_NAMES if plan.tier_counts[t])
    out += ["", *_wrap(f"Access tiers ({MTF_EDITION}, thresholds from memory): {tiers}", "")]
    if plan.left_out:
        out += ["", f"Left out ({len(plan.left_out)}): the rest is planned"]
        for p in plan.left_out[:30]:
            out += _wrap(str(p), "  ")
        if len(plan.left_out) > 30:
            out.append(f"  ... and {len(plan.left_out) - 30} more (see --json)")
    unmet = [(v.id, r) for v in plan.villages for r in v.unmet]
    if unmet:
        out += ["", f"Cannot be met ({len(unmet)})"]
        for vid, (rid, msg) in unmet[:20]:
            out += _wrap(f"{vid}/{rid}: {msg}", "  ")
    if plan.notices:
        out += ["", "Notices"] + [x for n in plan.notices for x in _wrap(n, "  ")]
    out += ["", "Safety (one of each kind; the figures are one design's, see --report)"]
    out += [x for c in distinct_cautions(plan.cautions) for x in _wrap(c, "  - ")]
    return "\n".join(out)


def distinct_cautions(cautions) -> list[str]:
    """One caution of each kind (the text before its first colon), in order."""
    seen: set[str] = set()
    out = []
    for c in cautions:
        kind = c.split(":")[0].split(" about ")[0][:48]
        if kind not in seen:
            seen.add(kind)
            out.append(c)
    return out


def markdown_report(plan: ProgrammePlan) -> str:
    cur = plan.currency
    out = [f"# Programme plan: {plan.name}", ""]
    if plan.demo:
        out += ["*Invented demonstration data: villages, sites and households are made up.*", ""]
    out += [
        f"{len(plan.villages)} villages, {plan.rows_read} survey rows, {plan.systems} "
        f"systems, {plan.distinct_designs} distinct designs. Kits: "
        f"{SCOPE_TEXT[plan.kit_scope]}.",
        "",
        "## Standard kits",
        "",
        "| kit | systems | array | battery | controller | inverter | unit cost |",
        "|---|---:|---|---|---|---:|---:|",
    ]
    for k in plan.kits:
        p = k.parts
        out.append(
            f"| {k.name} | {k.systems} | {array_text(p)} | {battery_text(p)} | "
            f"{controller_text(p)} | {inverter_text(p)} | {_money(k.unit_cost)} |"
        )
    names = [k.name for k in plan.kits]
    out += [
        "",
        "## Villages",
        "",
        "| village | name | lat, lon | climate | tilt | systems | "
        + " | ".join(f"kit {n}" for n in names)
        + " | own | modules | batteries | array kW | battery kWh | cost |",
        "|---|---|---|---|---:|---:|" + "---:|" * len(names) + "---:|---:|---:|---:|---:|---:|",
    ]
    for v in plan.villages:
        tilt = "-" if v.tilt_deg is None else f"{v.tilt_deg:.0f}"
        cost = _money(v.totals.total_cost if v.totals else None)
        out.append(
            f"| {v.id} | {v.name} | {v.latitude_deg:g}, {v.longitude_deg:g} | "
            f"{v.climate} | {tilt} | {v.systems} | "
            + " | ".join(str(v.kit_counts.get(n, 0)) for n in names)
            + f" | {v.own_systems} | {v.modules} | {v.battery_units} | "
            f"{v.array_kw:.1f} | {v.battery_kwh:.1f} | {cost} |"
        )
    out += [
        "",
        "## Programme summary",
        "",
        f"* systems: {plan.systems} ("
        + ", ".join(f"kit {n}: {c}" for n, c in sorted(plan.kit_counts.items()))
        + f"; own designs: {sum(v.own_systems for v in plan.villages)})",
        f"* modules: {sum(v.modules for v in plan.villages)}, battery units: "
        f"{sum(v.battery_units for v in plan.villages)}",
        f"* capital cost: {_money(plan.totals.total_cost if plan.totals else None)} {cur}",
        "* access tiers ("
        + MTF_EDITION
        + ", thresholds from memory): "
        + ", ".join(f"{t} {plan.tier_counts[t]}" for t in TIER_NAMES),
        "",
    ]
    own = [(v.id, r) for v in plan.villages for r in v.own_rows]
    if own:
        out += ["## Households and facilities needing their own design", ""]
        out += [f"* {vid}: {rid}" for vid, rid in own] + [""]
    if plan.totals is not None:
        out += [
            "## Procurement totals",
            "",
            f"| part | quantity | unit price | cost ({cur}) |",
            "|---|---:|---:|---:|",
        ]
        for line in plan.totals.lines:
            price = "-" if line.unit_price is None else f"{line.unit_price:,.2f}"
            out.append(f"| {line.label} | {_qty(line)} | {price} | {_money(line.cost)} |")
        out += [f"| **Total** | | | {_money(plan.totals.total_cost)} |", ""]
    if plan.left_out:
        out += ["## Left out", "", "The rest of the programme is planned.", ""]
        out += [f"* {p}" for p in plan.left_out] + [""]
    if plan.notices:
        out += ["## Notices", ""] + [f"* {n}" for n in plan.notices] + [""]
    out += ["## Safety", ""] + [f"* {c}" for c in plan.cautions] + [""]
    return "\n".join(out)


def rows_csv(plan: ProgrammePlan) -> str:
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["village", "id", "line", "count", "status", "kit"])
    for v in plan.villages:
        for rid, line, count, status, kit in v.rows:
            w.writerow([v.id, rid, line, count, status, kit])
    return buf.getvalue()


def kit_table(plan: ProgrammePlan):
    """(headers, rows) of the programme's kits, as plain strings (the text UI)."""
    head = (
        "kit",
        "array",
        "battery",
        "controller",
        "inverter",
        "systems",
        f"each {plan.currency}".strip(),
    )
    rows = [
        (
            k.name,
            array_text(k.parts),
            battery_text(k.parts),
            controller_text(k.parts),
            inverter_text(k.parts),
            str(k.systems),
            _money(k.unit_cost),
        )
        for k in plan.kits
    ]
    return head, rows


def village_table(plan: ProgrammePlan):
    """(headers, rows) of the villages: systems, each kit's count, own systems, cost."""
    names = [k.name for k in plan.kits]
    head = (
        "village",
        "climate",
        "systems",
        "kits",
        "own",
        "left out",
        f"cost {plan.currency}".strip(),
    )
    rows = []
    for v in plan.villages:
        kits = " ".join(f"{n}:{v.kit_counts[n]}" for n in names if v.kit_counts.get(n))
        rows.append(
            (
                v.id,
                v.climate,
                str(v.systems),
                kits,
                str(v.own_systems),
                str(len(v.left_out)),
                _money(v.totals.total_cost if v.totals else None),
            )
        )
    return head, rows


def totals_table(plan: ProgrammePlan):
    cur = plan.currency
    head = ("qty", "part", f"cost {cur}".strip())
    rows = [
        (_qty(line), line.label, _money(line.cost))
        for line in (plan.totals.lines if plan.totals else ())
    ]
    return head, rows


def notes_text(plan: ProgrammePlan) -> str:
    lines = [f"Kits: {SCOPE_TEXT[plan.kit_scope]}.", ""]
    own = [f"{v.id}/{r}" for v in plan.villages for r in v.own_rows]
    if own:
        lines += ["Own design: " + ", ".join(own), ""]
    unmet = [f"  {v.id}/{rid}: {msg}" for v in plan.villages for rid, msg in v.unmet]
    if unmet:
        lines += ["Cannot be met:", *unmet, ""]
    if plan.left_out:
        lines += ["Left out (the rest is planned):", *(f"  {p}" for p in plan.left_out), ""]
    if plan.notices:
        lines += ["Notices:", *(f"  {n}" for n in plan.notices), ""]
    lines.append("Safety cautions:")
    lines += [f"  ! {c}" for c in distinct_cautions(plan.cautions)]
    return "\n".join(lines)
