"""Programme plans made apart (split by village, one part per machine) merged into one.

A programme plan's JSON (``offgrid plan PROGRAMME.csv --json``, format
``offgrid-programme-plan``) carries each village's kit counts, systems, parts and tiers
and the programme's kits and procurement lines; it does not carry the per-row demands
(the distinct designs) the kit search works on, so a merge cannot choose kits again.
It unions the villages and sums counts and totals, which is exact when no kit is shared
between the parts or every part chose the same kits: kits per village
(``--kit-scope village``), kits per zone with each zone on one machine, or the same kits
on every part.  Anything else is refused with the fix (plan the whole programme on one
machine).
"""

from __future__ import annotations

from typing import Any

FORMAT = "offgrid-programme-plan"
#: The category of the programme's kit type set-up line (see programme._sum_totals).
KIT_TYPES = "Kit types"
_ZONE_NOTE = "Kits restricted to the "


class MergeError(ValueError):
    """The plans cannot be merged; the message names the files and the fix."""


def _check_doc(name: str, doc: Any) -> None:
    if not isinstance(doc, dict) or doc.get("format") != FORMAT:
        raise MergeError(
            f"{name}: not a programme plan (format '{FORMAT}'): write it with "
            "offgrid plan PROGRAMME.csv --json"
        )
    if doc.get("schema") != 1:
        raise MergeError(f"{name}: plan schema {doc.get('schema')!r}; this offgrid reads 1")


def merge_plans(plans: list[tuple[str, dict]]) -> dict:
    """Merge programme plans ``(file name, plan JSON)`` into one plan JSON.

    Raises :class:`MergeError` for a village in two files, differing kit scopes or
    currencies, or a kit of one name with different parts in two files.
    """
    if len(plans) < 2:
        raise MergeError("--merge: name two or more programme plan JSON files")
    for name, doc in plans:
        _check_doc(name, doc)
    first_name, first = plans[0]
    for name, doc in plans[1:]:
        for key in ("kit_scope", "currency"):
            if doc.get(key) != first.get(key):
                raise MergeError(
                    f"{key} is '{first.get(key)}' in {first_name} but '{doc.get(key)}' in "
                    f"{name}: plan every part with the same {key.replace('_', '-')}"
                )
    where: dict[str, str] = {}
    villages: list[dict] = []
    for name, doc in plans:
        for v in doc["villages"]:
            if v["id"] in where:
                raise MergeError(
                    f"village '{v['id']}' is in both {where[v['id']]} and {name}: a "
                    "programme splits by village, each village planned on one machine only; "
                    "plan it in one part and leave it out of the other"
                )
            where[v["id"]] = name
            villages.append(v)
    kits: dict[tuple[str, str], dict] = {}
    kit_file: dict[tuple[str, str], str] = {}
    for name, doc in plans:
        for k in doc["kits"]:
            key = (k["scope"], k["name"])
            if key not in kits:
                kits[key] = dict(k)
                kit_file[key] = name
                continue
            if k["parts"] != kits[key]["parts"] or k["unit_cost"] != kits[key]["unit_cost"]:
                raise MergeError(
                    f"kit '{k['name']}' ({k['scope']}) differs between {kit_file[key]} and "
                    f"{name}: the plan JSON holds each village's counts and totals but not "
                    "the per-row demands the kit search needs, so the kits cannot be chosen "
                    "again here.  Plan the whole programme on one machine, or plan the parts "
                    "with --kit-scope village (or zone, each zone on one machine) so no kit "
                    "is shared between parts"
                )
            kits[key]["systems"] += k["systems"]
    kit_counts: dict[str, int] = {}
    for v in villages:
        for k, n in v["kit_counts"].items():
            kit_counts[k] = kit_counts.get(k, 0) + n
    tiers: dict[str, int] = {}
    for _, doc in plans:
        for t, n in doc["tiers"]["systems"].items():
            tiers[t] = tiers.get(t, 0) + n
    notices: list[str] = []
    cautions: list[str] = []
    for _, doc in plans:
        for text in doc["notices"]:
            if not text.startswith(_ZONE_NOTE) and text not in notices:
                notices.append(text)
        for text in doc["cautions"]:
            if text not in cautions:
                cautions.append(text)
    notices.append(
        f"Merged from {len(plans)} plans ({', '.join(n for n, _ in plans)}): villages "
        "unioned, counts and totals summed; the kits were not chosen again and no zone "
        "comparison was made across the parts."
    )
    return {
        "format": FORMAT,
        "schema": 1,
        "name": first["name"],
        "demo": any(doc["demo"] for _, doc in plans),
        "source": first["source"],
        "merged_from": [n for n, _ in plans],
        "kit_scope": first["kit_scope"],
        "rows_read": sum(doc["rows_read"] for _, doc in plans),
        "distinct_designs": sum(doc["distinct_designs"] for _, doc in plans),
        "systems": sum(doc["systems"] for _, doc in plans),
        "currency": first["currency"],
        "prices": first["prices"],
        "kits": list(kits.values()),
        "kit_counts": kit_counts,
        "villages": villages,
        "left_out": [p for _, doc in plans for p in doc["left_out"]],
        "totals": _merge_totals([doc["totals"] for _, doc in plans], len(kits)),
        "tiers": {"edition": first["tiers"]["edition"], "systems": tiers},
        "notices": notices,
        "cautions": cautions,
    }


def _merge_totals(parts: list[dict | None], n_kits: int) -> dict | None:
    """The parts' procurement lines summed by (category, description); the kit type
    set-up counted once per kit type of the merged plan."""
    got = [t for t in parts if t]
    if not got:
        return None
    lines: dict[tuple[str, str], dict] = {}
    kit_price = None
    for t in got:
        for ln in t["lines"]:
            if ln["category"] == KIT_TYPES:
                kit_price = kit_price or dict(ln)
                continue
            key = (ln["category"], ln["description"])
            if key not in lines:
                lines[key] = dict(ln)
                continue
            item = lines[key]
            item["quantity"] = round(item["quantity"] + ln["quantity"], 6)
            if item["cost"] is None or ln["cost"] is None:
                item["cost"] = None
            else:
                item["cost"] = round(item["cost"] + ln["cost"], 6)
    out = list(lines.values())
    if kit_price is not None and n_kits:
        price = kit_price["unit_price"]
        out.append(
            kit_price
            | {"quantity": float(n_kits), "cost": None if price is None else price * n_kits}
        )
    priced = any(t["total_cost"] is not None for t in got)
    total = round(sum(ln["cost"] for ln in out if ln["cost"] is not None), 6) if priced else None
    unpriced: list[str] = []
    for t in got:
        unpriced += [u for u in t["unpriced"] if u not in unpriced]
    return {
        "lines": out,
        "sources": [],
        "total_cost": total,
        "currency": got[0]["currency"],
        "systems": sum(t["systems"] for t in got),
        "unpriced": unpriced,
    }


def merged_markdown(doc: dict) -> str:
    """A short Markdown view of a merged plan: kits, villages, totals, notes, cautions."""
    cur = doc["currency"]
    out = [f"# {doc['name']}: merged programme plan", ""]
    if doc["demo"]:
        out += ["*Demonstration data: invented villages and households.*", ""]
    out += ["## Kits", "", "| kit | systems | unit cost |", "|---|---:|---:|"]
    for k in doc["kits"]:
        cost = "" if k["unit_cost"] is None else f"{k['unit_cost']:,.0f} {cur}"
        out.append(f"| {k['name']} | {k['systems']} | {cost} |")
    out += ["", "## Villages", "", "| village | systems | kits | own systems | cost |"]
    out.append("|---|---:|---|---:|---:|")
    for v in doc["villages"]:
        kits = ", ".join(f"{k} x{n}" for k, n in v["kit_counts"].items())
        cost = "" if v["total_cost"] is None else f"{v['total_cost']:,.0f} {cur}"
        out.append(
            f"| {v['id']} {v['name']} | {v['systems']} | {kits} | {v['own_systems']} | {cost} |"
        )
    t = doc["totals"]
    if t:
        out += ["", "## Procurement", "", "| item | quantity | cost |", "|---|---:|---:|"]
        for ln in t["lines"]:
            cost = "" if ln["cost"] is None else f"{ln['cost']:,.0f}"
            out.append(f"| {ln['label']} | {ln['quantity']:g} {ln['unit']} | {cost} |")
        if t["total_cost"] is not None:
            out.append(f"| **Total** | | **{t['total_cost']:,.0f} {cur}** |")
    out += ["", "## Notes", ""] + [f"- {n}" for n in doc["notices"]]
    out += ["", "## Cautions", ""] + [f"- {c}" for c in doc["cautions"]]
    return "\n".join(out) + "\n"


__all__ = ["MergeError", "merge_plans", "merged_markdown"]
