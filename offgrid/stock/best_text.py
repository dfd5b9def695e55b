"""The cheapest-combination search as text and as JSON (views of
:class:`offgrid.stock.choose.SearchResult`)."""

from __future__ import annotations

from offgrid.stock.choose import Combination, SearchResult


def search_text(result: SearchResult, top: int = 5) -> str:
    """The search as plain text: counts, the best few both ways, why the others fail."""
    from offgrid.catalogue import composite, figure_entry
    from offgrid.safetext import printable

    cur = result.currency
    n_ok = len(result.by_capital) + len(result.unpriced)
    out = [
        f"Combinations tried: {result.tried} ({result.designs_run} designs run); "
        f"{n_ok} meet the design, {len(result.by_capital)} of them priced; "
        f"{result.tried - n_ok} rejected.",
        "Capital: the main parts (modules, battery units, controllers, inverter) at "
        "catalogue prices in the project's currency, plus the installation share; cable, "
        "protection and accessories are in the bill of materials.",
    ]
    out += [f"note: {printable(n)}" for n in result.notes]

    def block(title: str, items: tuple[Combination, ...]) -> None:
        out.append("")
        out.append(title)
        for i, x in enumerate(items[:top], 1):
            inv = printable(x.inverter.name) if x.inverter else "no inverter (DC only)"
            parts = (
                f"{x.module_count} x {printable(x.module.name)}, {x.battery_units} x "
                f"{printable(x.battery.name)}, {x.controller_count} x "
                f"{printable(x.controller.name)}, {inv}"
            )
            values = {  # the combination's figures by their catalogue paths
                "costs.capital": x.capital,
                "costs.lcc": x.lcc,
                "battery.system_voltage_v": x.system_voltage_v,
                "array.power_w": x.array_power_w,
                "battery.nominal_kwh": x.bank_kwh,
            }
            line = composite("parts.combination").fill(values.get, figure_entry, cur, parts=parts)
            out.append(f"{i:>2}. {line}")

    if result.by_capital:
        block("Cheapest by capital:", result.by_capital)
        block("Cheapest by lifecycle cost:", result.by_lcc)
    else:
        out += ["", "No priced combination meets the design."]
    if result.unpriced:
        out += ["", f"Meet the design but cannot be priced ({len(result.unpriced)}):"]
        for x in result.unpriced[:top]:
            out.append("  " + "; ".join(printable(s) for s in x.missing))
    if result.reasons:
        out += ["", "Rejected, by reason:"]
        for code, n in sorted(result.reasons.items(), key=lambda kv: (-kv[1], kv[0])):
            example = next((r for r in result.rejected if r.code == code), None)
            out.append(
                f"  {n:>5} {code}" + (f": e.g. {printable(example.message)}" if example else "")
            )
    return "\n".join(out) + "\n"


def search_json(result: SearchResult, top: int = 5) -> dict:
    """The search as plain data (counts, the best few both ways, rejections by reason)."""

    def one(x: Combination) -> dict:
        return {
            "module": x.module.name,
            "battery": x.battery.name,
            "controller": x.controller.name,
            "inverter": x.inverter.name if x.inverter else None,
            "system_voltage_v": x.system_voltage_v,
            "module_count": x.module_count,
            "battery_units": x.battery_units,
            "controller_count": x.controller_count,
            "array_power_w": x.array_power_w,
            "bank_kwh": x.bank_kwh,
            "capital": x.capital,
            "lcc": x.lcc,
            "missing": list(x.missing),
        }

    examples = {}
    for r in result.rejected:
        examples.setdefault(r.code, r.message)
    return {
        "currency": result.currency,
        "tried": result.tried,
        "designs_run": result.designs_run,
        "meet_design": len(result.by_capital) + len(result.unpriced),
        "priced": len(result.by_capital),
        "by_capital": [one(x) for x in result.by_capital[:top]],
        "by_lcc": [one(x) for x in result.by_lcc[:top]],
        "unpriced": [one(x) for x in result.unpriced[:top]],
        "rejected": {
            code: {"count": n, "example": examples.get(code, "")}
            for code, n in sorted(result.reasons.items())
        },
        "notes": list(result.notes),
    }
