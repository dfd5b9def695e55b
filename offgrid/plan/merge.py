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


#: Plan schemas read: 1 (counts and totals only) and 2 (with the distinct designs).
SCHEMAS = (1, 2)
#: The note of a merge of plans without their designs (schema 1).
NOT_CHOSEN_AGAIN = (
    "the kits were not chosen again (a plan file without its distinct designs, schema 1, "
    "written by an older offgrid: plan the parts again to merge with kits chosen across "
    "them)"
)


def _check_doc(name: str, doc: Any) -> None:
    if not isinstance(doc, dict) or doc.get("format") != FORMAT:
        raise MergeError(
            f"{name}: not a programme plan (format '{FORMAT}'): write it with "
            "offgrid plan PROGRAMME.csv --json"
        )
    if doc.get("schema") not in SCHEMAS:
        raise MergeError(
            f"{name}: plan schema {doc.get('schema')!r}; this offgrid reads "
            f"{' and '.join(map(str, SCHEMAS))}"
        )


def has_designs(doc: dict) -> bool:
    """A plan that carries its distinct designs (schema 2): its kits can be chosen again."""
    return doc.get("schema") == 2 and isinstance(doc.get("design_table"), dict)


def _claim(where: dict[str, str], village_id: str, name: str) -> None:
    """Note that plan ``name`` holds ``village_id``; refuse a village in two plans."""
    if village_id in where:
        raise MergeError(
            f"village '{village_id}' is in both {where[village_id]} and {name}: a "
            "programme splits by village, each village planned on one machine only; "
            "plan it in one part and leave it out of the other"
        )
    where[village_id] = name


def merge_plans(
    plans: list[tuple[str, dict]], kits: int | None = None, kit_type_cost: float | None = None
) -> dict:
    """Merge programme plans ``(file name, plan JSON)`` into one plan JSON.

    When every plan carries its distinct designs (schema 2) the kits are chosen again
    across all the villages, as the whole programme planned at once would choose them
    (``kits``/``kit_type_cost`` replace the parts' own settings); otherwise the villages
    are unioned and counts and totals summed (see the module docstring).

    Raises :class:`MergeError` for a village in two files, differing kit scopes,
    currencies, planning options or price lists, or (without designs) a kit of one name
    with different parts in two files.
    """
    if len(plans) < 2:
        raise MergeError("--merge: name two or more programme plan JSON files")
    for name, doc in plans:
        _check_doc(name, doc)
    if all(has_designs(doc) for _, doc in plans):
        return _merge_choosing(plans, kits, kit_type_cost)
    if kits is not None or kit_type_cost is not None:
        old = ", ".join(n for n, doc in plans if not has_designs(doc))
        raise MergeError(
            f"--merge: {old} carries no distinct designs (plan schema 1, an older offgrid), "
            "so the kits cannot be chosen again: plan those parts again with this offgrid, "
            "or merge without --kits and --kit-cost"
        )
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
            _claim(where, v["id"], name)
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
        f"unioned, counts and totals summed; {NOT_CHOSEN_AGAIN} and no zone "
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


def _merge_choosing(
    plans: list[tuple[str, dict]], kits: int | None, kit_type_cost: float | None
) -> dict:
    """The merge of plans that carry their designs: the villages in the programme's order
    (their line), the kits chosen again over every village's candidates by the
    programme's own code (:func:`offgrid.plan.programme.choose_kits`,
    :func:`~offgrid.plan.programme.village_figures`), the totals summed again."""
    from offgrid.design.cautions import DEFERS_TO_CODE
    from offgrid.plan.community import _plain, kit_options
    from offgrid.plan.kits import Candidate
    from offgrid.plan.prices import price_list_from_data
    from offgrid.plan.programme import (
        MTF_EDITION,
        PLAN_SCHEMA,
        TIER_NAMES,
        _sum_totals,
        choose_kits,
        village_figures,
    )
    from offgrid.plan.rows import DesignTable, designs_from_data

    def same(doc: dict, key: str):
        value = doc.get(key)
        if key == "price_list" and isinstance(value, dict):  # the same prices, read from
            value = {k: v for k, v in value.items() if k != "source"}  # any folder
        return value

    first_name, first = plans[0]
    for name, doc in plans[1:]:
        for key in ("kit_scope", "currency", "planning", "price_list"):
            if same(doc, key) != same(first, key):
                what = key.replace("_", " ")
                raise MergeError(
                    f"the {what} differs between {first_name} and {name}: plan every part "
                    f"with the same {what} (the kits are chosen again across the parts)"
                )
    options = dict(first["planning"])
    prices = price_list_from_data(first["price_list"])
    if kits is not None or kit_type_cost is not None:
        _, options["kits"], options["kit_type_cost"] = kit_options(
            options["objective"], kits, kit_type_cost, prices
        )
    where: dict[str, str] = {}
    entries = []  # (line, part order, village JSON, the part's designs)
    for pi, (name, doc) in enumerate(plans):
        try:
            designs = designs_from_data(doc["design_table"])
        except (KeyError, IndexError, TypeError, ValueError) as exc:
            raise MergeError(
                f"{name}: its designs cannot be read ({exc}); write it again with "
                "offgrid plan PROGRAMME.csv --json"
            ) from exc
        for v in doc["villages"]:
            _claim(where, v["id"], name)
            entries.append((v["line"], pi, v, designs))
    entries.sort(key=lambda e: (e[0], e[1]))
    cands: list = []
    labels: list[str] = []
    mine: list[list[int]] = []
    scope_of: list[str] = []
    zone_of: list[str] = []
    scope = first["kit_scope"]
    for _, _, v, designs in entries:
        here = []
        for di, count, kit, label in v["candidates"]:
            ci = len(cands)
            cands.append(Candidate(ci, designs[di], count, kit))
            labels.append(label)
            zone = v["zone"]
            scope_of.append(
                {"programme": "programme", "village": v["id"], "zone": zone or "(no zone)"}[scope]
            )
            zone_of.append(zone)
            here.append(ci)
        mine.append(here)
    objective = options["objective"]
    standards, assign, kit_parts, zone_note = choose_kits(
        cands,
        scope_of,
        zone_of,
        scope,
        options["kits"],
        options["kit_type_cost"],
        prices,
        objective,
        options["k_max"],
    )
    cautions: list[str] = []
    villages = []
    totals = []
    table = DesignTable()
    prog_tiers = {t: 0 for t in TIER_NAMES}
    for (_, _, v, _), here in zip(entries, mine, strict=True):
        fig = village_figures(here, cands, assign, kit_parts, standards, prices, labels, cautions)
        totals.append(fig.totals)
        for t, n in fig.tiers.items():
            prog_tiers[t] += n
        own_first = [labels[ci].split("/", 1)[-1] for ci in fig.own_candidates]
        villages.append(
            dict(v)
            | {
                "systems": sum(fig.kit_counts.values()) + fig.own,
                "kit_counts": _plain(fig.kit_counts),
                "own_systems": fig.own,
                "own_rows": own_first,
                "modules": fig.modules,
                "battery_units": fig.battery_units,
                "array_kw": _plain(fig.array_w / 1000.0),
                "battery_kwh": _plain(fig.battery_wh / 1000.0),
                "tier_counts": _plain(fig.tiers),
                "total_cost": _plain(fig.totals.total_cost) if fig.totals else None,
                "candidates": [
                    [table.add(cands[ci].design), cands[ci].count, cands[ci].kit, labels[ci]]
                    for ci in here
                ],
            }
        )
    if DEFERS_TO_CODE not in cautions:
        cautions.append(DEFERS_TO_CODE)
    kit_type = standards[0][1].kit_type_cost if standards else 0.0
    total = _sum_totals(totals, sum(len(st.kits) for _, st in standards), kit_type, prices)
    kit_counts: dict[str, int] = {}
    for v in villages:
        for k, n in v["kit_counts"].items():
            kit_counts[k] = kit_counts.get(k, 0) + n
    notices: list[str] = []
    for _, doc in plans:
        for text in doc["notices"]:
            if not text.startswith((_ZONE_NOTE, "Merged from ")) and text not in notices:
                notices.append(text)
    if zone_note:
        notices.append(zone_note)
    notices.append(
        f"Merged from {len(plans)} plans ({', '.join(n for n, _ in plans)}): the kits were "
        "chosen again across all their villages from each village's distinct designs; "
        "own_rows lists the first row of each own-system design."
    )
    return {
        "format": FORMAT,
        "schema": PLAN_SCHEMA,
        "name": first["name"],
        "demo": any(doc["demo"] for _, doc in plans),
        "source": first["source"],
        "merged_from": [n for n, _ in plans],
        "kit_scope": scope,
        "rows_read": sum(doc["rows_read"] for _, doc in plans),
        "distinct_designs": sum(doc["distinct_designs"] for _, doc in plans),
        "systems": sum(v["systems"] for v in villages),
        "currency": first["currency"],
        "prices": first["prices"],
        "kits": [
            {
                "scope": name,
                "name": k.name,
                "systems": k.systems,
                "unit_cost": _plain(k.unit_cost),
                "parts": _plain(k.parts),
            }
            for name, st in standards
            for k in st.kits
        ],
        "kit_counts": kit_counts,
        "villages": villages,
        "left_out": [p for _, doc in plans for p in doc["left_out"]],
        "totals": _plain(total) if total else None,
        "tiers": {"edition": MTF_EDITION, "systems": dict(prog_tiers)},
        "notices": notices,
        "cautions": cautions,
        "planning": options,
        "price_list": first["price_list"],
        "design_table": table.data(),
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
