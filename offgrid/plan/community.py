"""The community plan: survey -> a design per row -> standard kits -> totals and tiers.

:func:`plan_community` is the one entry point used by the command line, the text UI
and the report.  It never stops at a bad row: rows that cannot be read are listed in
``CommunityPlan.bad_rows`` with their CSV line, rows the engine cannot design are
kept with status ``cannot be met`` and the engine's message.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass, field, fields, is_dataclass
from pathlib import Path
from typing import Any

import numpy as np

from offgrid.design.cautions import DEFERS_TO_CODE
from offgrid.design.result import Notice, Reason, ReasonBook, fmt
from offgrid.paths import load_profiles_dir
from offgrid.plan.kits import Candidate, PlanError, Standardisation, standardise
from offgrid.plan.prices import PriceList, PriceListError, from_part_prices, load_prices
from offgrid.plan.rows import (
    DEFAULT_ENERGY_STEP_PCT,
    DesignedRows,
    PlanInputs,
    RowDesign,
    RowFailure,
    _find,
    default_jobs,
    design_rows,
    prepare,
)
from offgrid.plan.survey import Survey, SurveyError, SurveyProblem, load_survey
from offgrid.plan.tiers import MTF_EDITION, TIER_NAMES, mtf2015_tier, tier_reason
from offgrid.plan.totals import Totals, procurement_totals

#: Number of kit types when neither --kits nor a kit-type price is given.
DEFAULT_KITS = 3
#: Trade-off curve shown to the planner: best objective for 1..CURVE_KITS kit types.
CURVE_KITS = 8

Status = str  # "kit", "own system", "cannot be met", "not planned"


@dataclass(frozen=True)
class RowResult:
    line: int
    id: str
    name: str
    kind: str
    count: int
    demand_source: str
    status: Status
    kit: str | None
    reason: str
    design: RowDesign | None
    failure: RowFailure | None
    tier: int | None  # the row's own design
    tier_served: int | None  # with the kit (or own system) it gets
    oversize_array_pct: float | None
    oversize_battery_pct: float | None
    unit_cost: float | None


@dataclass(frozen=True)
class CommunityPlan:
    name: str
    demo: bool
    source: str
    climate: str
    rows: tuple[RowResult, ...]
    bad_rows: tuple[SurveyProblem, ...]
    standard: Standardisation | None
    totals: Totals | None
    prices_source: str
    currency: str
    tier_counts: dict[str, int]  # tier name -> systems
    notices: tuple[Notice, ...]
    cautions: tuple[str, ...]
    reasons: dict[str, Reason] = field(default_factory=dict)
    rows_read: int = 0
    distinct_designs: int = 0
    tilt_deg: float | None = None  # the community's one tilt (None: rows searched their own)
    energy_step_pct: float = 0.0
    stepped_rows: int = 0  # rows given by energy and peak power, designed at the grid step

    @property
    def unmet(self) -> tuple[RowResult, ...]:
        return tuple(r for r in self.rows if r.status == "cannot be met")

    @property
    def systems(self) -> int:
        return sum(r.count for r in self.rows if r.status in ("kit", "own system"))

    def to_dict(self) -> dict[str, Any]:
        """JSON-ready dictionary (see docs/community-format.md, "JSON output").

        Distinct designs are listed once under ``designs``; each row names its
        ``design_id`` (rows of one design share it), so the size grows with the rows'
        own fields only.  Cautions are listed once for the plan.
        """
        ids: dict[int, int] = {}
        designs: list[dict[str, Any]] = []
        families: dict[tuple, int] = {}
        rows = []
        for r in self.rows:
            d = r.design
            did = None
            if d is not None:
                did = ids.get(id(d))
                if did is None:
                    did = ids[id(d)] = len(designs)
                    item = _plain(d)
                    item.pop("cautions", None)
                    item["family"] = families.setdefault(d.family, len(families))
                    designs.append({"design_id": did, **item})
            row = {name: _plain(getattr(r, name)) for name in _ROW_FIELDS}
            row["design_id"] = did
            rows.append(row)
        out = {
            "format": "offgrid-community-plan",
            "schema": 2,
            "name": self.name,
            "demo": self.demo,
            "source": self.source,
            "climate": self.climate,
            "tilt_deg": self.tilt_deg,
            "rows_read": self.rows_read,
            "energy_step_pct": self.energy_step_pct,
            "stepped_rows": self.stepped_rows,
            "distinct_designs": self.distinct_designs,
            "systems": self.systems,
            "currency": self.currency,
            "prices": self.prices_source,
            "bad_rows": [asdict(p) for p in self.bad_rows],
            "rows": rows,
            "designs": designs,
            "families": [_plain(f) for f in families],
            "standardisation": _plain(self.standard) if self.standard else None,
            "totals": _plain(self.totals) if self.totals else None,
            "tiers": {"edition": MTF_EDITION, "systems": dict(self.tier_counts)},
            "notices": [asdict(n) for n in self.notices],
            "cautions": list(self.cautions),
            "reasons": {k: r.as_dict() for k, r in sorted(self.reasons.items())},
        }
        return out


_ROW_FIELDS = tuple(f.name for f in fields(RowResult) if f.name != "design")


_N_FIELDS: dict[type, int] = {}


def _plain(value: Any) -> Any:
    """Plain JSON values: dataclasses by their fields, tuples as lists, finite floats."""
    if isinstance(value, float):
        if not math.isfinite(value):
            raise ValueError("a plan figure is not finite")
        return round(value, 6)
    if isinstance(value, str | int | bool) or value is None:
        return value
    if isinstance(value, dict):
        return {str(k): _plain(v) for k, v in value.items()}
    if is_dataclass(value) and not isinstance(value, type):
        d = getattr(value, "__dict__", None)  # field order (set by __init__), fast
        n = _N_FIELDS.get(type(value))
        if n is None:
            n = _N_FIELDS[type(value)] = len(fields(value))
        if d is not None and len(d) == n:
            return {k: _plain(v) for k, v in d.items()}
        return {f.name: _plain(getattr(value, f.name)) for f in fields(value)}
    if isinstance(value, list | tuple):
        return [_plain(v) for v in value]
    if isinstance(value, np.generic):
        return _plain(value.item())
    return value


def kit_options(
    objective: str | None, kits: int | None, kit_type_cost: float | None, prices
) -> tuple[str, int | None, float | None]:
    """The objective, the number of kits and the kit type's cost as the kits are chosen:
    cost with a price list, else oversize; the price list's kit type cost unless one is
    given; ``DEFAULT_KITS`` kits when neither a number nor a cost is given."""
    objective = objective or ("cost" if prices is not None else "oversize")
    if (
        kit_type_cost is None
        and objective == "cost"
        and prices is not None
        and prices.has("kit_type")
    ):
        kit_type_cost = prices.optional("kit_type")
    if kits is None and kit_type_cost is None:
        kits = DEFAULT_KITS
    return objective, kits, kit_type_cost


def resolve_prices(
    survey: Survey, prices: PriceList | str | None, inputs: PlanInputs | None = None
) -> PriceList | None:
    """The price list given, or the one the survey names, or the shared project's own
    ``[[prices]]``; None when there is none."""
    if isinstance(prices, PriceList):
        return prices
    ref = prices or survey.prices
    currency = inputs.base.economics.currency if inputs is not None else "USD"
    if not ref:
        if inputs is not None and inputs.base.prices:
            return from_part_prices(
                inputs.base.prices, currency, f"the shared project's prices ({survey.project})"
            )
        return None
    path = _find(ref, survey.base_dir, load_profiles_dir(), ".csv")
    if path is None:
        raise PlanError(f"price list '{ref}' not found next to the survey or in load_profiles/")
    try:
        return load_prices(path, currency)
    except PriceListError as exc:
        raise PlanError(str(exc)) from exc


def plan_community(
    survey: Survey,
    *,
    kits: int | None = None,
    kit_type_cost: float | None = None,
    prices: PriceList | str | None = None,
    objective: str | None = None,
    climate: str | None = None,
    jobs: int | None = None,
    k_max: int = 12,
    curve_to: int = CURVE_KITS,
    energy_step_pct: float = DEFAULT_ENERGY_STEP_PCT,
) -> CommunityPlan:
    """Plan a whole survey.

    Parameters
    ----------
    survey : Survey
        As read by :func:`offgrid.plan.survey.load_survey`.
    kits : int, optional
        At most this many standard kit types (default: up to ``k_max`` when kit types have
        a cost, else ``DEFAULT_KITS``).
    kit_type_cost : float, optional
        Cost of each kit type; the number of kit types is chosen to minimise the total.
        Default: the price list's ``kit_type`` price, if it has one.
    prices : PriceList or path, optional
        Default: the survey's ``prices`` setting.  Without prices the objective is oversize.
    objective : {"cost", "oversize"}, optional
        Default: cost with a price list, oversize without.
    climate : str, optional
        Overrides the survey's climate setting.
    jobs : int, optional
        Worker processes for designing many distinct rows (default: the CPUs available).
    energy_step_pct : float
        Rows given by daily energy and peak power are designed at the next step of a
        geometric grid of this ratio (rounding up); 0 designs every figure as given.

    Raises
    ------
    SurveyError
        The shared settings cannot be used.
    PlanError
        The standardisation cannot be done as asked.
    """
    inputs = prepare(survey, climate=climate, energy_step_pct=energy_step_pct)
    price_list = resolve_prices(survey, prices, inputs)
    objective, kits, kit_type_cost = kit_options(objective, kits, kit_type_cost, price_list)
    designed = design_rows(inputs, jobs=default_jobs() if jobs is None else jobs)
    return assemble(inputs, designed, price_list, objective, kits, kit_type_cost, k_max, curve_to)


def assemble(
    inputs: PlanInputs,
    designed: DesignedRows,
    prices: PriceList | None,
    objective: str,
    kits: int | None,
    kit_type_cost: float | None,
    k_max: int,
    curve_to: int,
) -> CommunityPlan:
    """Standardise and total already designed rows (split out so views can re-run it)."""
    survey = inputs.survey
    book = ReasonBook()
    cands: list[Candidate] = []
    for i, (row, d) in enumerate(zip(designed.rows, designed.designs, strict=True)):
        if isinstance(d, RowDesign) and row.count > 0:
            cands.append(Candidate(i, d, row.count, row.kit))
    standard = None
    totals = None
    if cands:
        standard = standardise(
            cands,
            k=kits,
            kit_type_cost=kit_type_cost,
            prices=prices,
            objective=objective,
            k_max=k_max,
            curve_to=curve_to,
        )
        labels = {i: r.id for i, r in enumerate(designed.rows)}
        totals = procurement_totals(standard, cands, prices, labels)
    by_index = {a.index: a for a in standard.assignments} if standard else {}
    kit_parts = {k.name: k.parts for k in standard.kits} if standard else {}
    own_tiers, served_tiers = _tiers(designed, by_index, kit_parts)
    results: list[RowResult] = []
    tier_counts = {name: 0 for name in TIER_NAMES}
    warn_rows: dict[str, list[str]] = {}
    cautions: list[str] = []
    for i, (row, d) in enumerate(zip(designed.rows, designed.designs, strict=True)):
        if isinstance(d, RowFailure):
            results.append(
                RowResult(
                    row.line,
                    row.id,
                    row.name,
                    row.kind,
                    row.count,
                    row.demand_source,
                    "cannot be met",
                    None,
                    f"[{d.code}] {d.message}",
                    None,
                    d,
                    None,
                    None,
                    None,
                    None,
                    None,
                )
            )
            continue
        own_tier = int(own_tiers[i])
        a = by_index.get(i)
        if a is None or row.count == 0:
            results.append(
                RowResult(
                    row.line,
                    row.id,
                    row.name,
                    row.kind,
                    row.count,
                    row.demand_source,
                    "not planned",
                    None,
                    "count 0: designed but not planned",
                    d,
                    None,
                    own_tier,
                    None,
                    None,
                    None,
                    None,
                )
            )
            continue
        served = int(served_tiers[i])
        tier_counts[TIER_NAMES[served]] += row.count
        for code in d.warnings:
            warn_rows.setdefault(code, []).append(row.id)
        for text in d.cautions:
            if text not in cautions:
                cautions.append(text)
        results.append(
            RowResult(
                row.line,
                row.id,
                row.name,
                row.kind,
                row.count,
                row.demand_source,
                "kit" if a.kit else "own system",
                a.kit,
                a.reason,
                d,
                None,
                own_tier,
                served,
                a.oversize_array_pct,
                a.oversize_battery_pct,
                a.unit_cost,
            )
        )
    notices: list[Notice] = []
    unmet = [r for r in results if r.status == "cannot be met"]
    if unmet:
        notices.append(
            Notice(
                "rows-cannot-be-met",
                f"{len(unmet)} row(s) cannot be met by a "
                f"stand-alone PV design: {_ids(r.id for r in unmet)}; see each "
                "row's reason.",
                "error",
                "plan.rows",
            )
        )
    bad = list(designed.problems)
    bad_all = sorted([*survey.problems, *bad], key=lambda p: (p.line, p.field))
    if bad_all:
        lines = sorted({p.line for p in bad_all})
        notices.append(
            Notice(
                "bad-rows",
                f"{len(lines)} survey row(s) could not be read and are "
                f"left out (lines {_ids(map(str, lines))}); the rest is planned.",
                "warning",
                "plan.bad_rows",
            )
        )
    for code, ids in sorted(warn_rows.items()):
        notices.append(
            Notice(
                f"row-{code}",
                f"engine warning '{code}' in {len(ids)} row(s): "
                f"{_ids(ids)}; open a row as a project to see it.",
                "info",
                None,
            )
        )
    if DEFERS_TO_CODE not in cautions:
        cautions.append(DEFERS_TO_CODE)
    _reasons(book, standard, prices, objective)
    stepped = sum(1 for r in designed.rows if r.daily_energy_wh is not None)
    if stepped and inputs.energy_step_pct > 0:
        book.add(
            "plan.energy_step",
            "rows given by daily energy and peak power are designed "
            "at the next point of the grid (1 + step)^n above each figure, so near-equal "
            "surveys share one design; never below the surveyed figure",
            "common practice, no source (survey figures are estimates)",
            step=fmt(inputs.energy_step_pct, "%"),
            rows=str(stepped),
        )
    tilt = inputs.base.site.tilt_deg
    if inputs.tilt_searched and tilt is not None:
        book.add(
            "plan.tilt",
            "standard kits share one mounting: the engine's tilt search run "
            "once for the survey's total appliance demand by month (rows x counts); rows "
            "that set site.tilt_deg keep theirs",
            "offgrid.design.sizing.site_geometry",
            tilt=fmt(tilt, "deg"),
        )
    elif tilt is not None:
        book.add(
            "plan.tilt",
            "set in the survey or its shared project",
            "survey settings",
            tilt=fmt(tilt, "deg"),
        )
    return CommunityPlan(
        name=survey.name,
        demo=survey.demo,
        source=survey.source,
        climate=inputs.climate_ref,
        rows=tuple(results),
        bad_rows=tuple(bad_all),
        standard=standard,
        totals=totals,
        prices_source=prices.source if prices else "",
        currency=prices.currency if prices else "",
        tier_counts=tier_counts,
        notices=tuple(notices),
        cautions=tuple(cautions),
        reasons=book.freeze(),
        rows_read=survey.rows_read,
        distinct_designs=designed.distinct,
        tilt_deg=tilt,
        energy_step_pct=inputs.energy_step_pct,
        stepped_rows=stepped,
    )


def _tiers(
    designed: DesignedRows, by_index: dict, kit_parts: dict
) -> tuple[np.ndarray, np.ndarray]:
    """Access tier of each row's own design and of the system it is served by."""
    n = len(designed.rows)
    cap = np.zeros((2, n))
    energy = np.zeros((2, n))
    for i, d in enumerate(designed.designs):
        if not isinstance(d, RowDesign):
            continue
        cap[:, i] = d.peak_capacity_w
        energy[:, i] = d.appliance_energy_wh
        a = by_index.get(i)
        parts = kit_parts.get(a.kit) if a is not None and a.kit else None
        if parts is not None:
            scale = min(parts.array_power_w / d.required_power_w, parts.nominal_wh / d.required_wh)
            own_scale = min(d.array_power_w / d.required_power_w, d.nominal_wh / d.required_wh)
            energy[1, i] = d.appliance_energy_wh * max(1.0, scale / own_scale)
            cap[1, i] = parts.inverter_w + (d.peak_capacity_w - d.inverter_w)
    tiers = mtf2015_tier(cap, energy)
    return tiers[0], tiers[1]


def _ids(ids, limit: int = 8) -> str:
    items = list(ids)
    text = ", ".join(items[:limit])
    return text + (f" and {len(items) - limit} more" if len(items) > limit else "")


def _reasons(
    book: ReasonBook, standard: Standardisation | None, prices: PriceList | None, objective: str
) -> None:
    book.add(
        "plan.rows",
        "each row designed as its own project with the single-system engine "
        "(worst-month sizing); identical rows designed once",
        "offgrid.design.sizing.design",
    )
    if standard is not None:
        target = (
            "parts cost of every system + cost per kit type x kit types"
            if objective == "cost"
            else "sum over systems of the mean relative oversize of array power and battery energy"
        )
        book.add(
            "plan.kits",
            f"minimise {target}; {standard.method}",
            "optimal one-dimensional grouping by dynamic programming (Bellman 1961)",
            objective=objective,
            kit_types=str(len(standard.kits)),
            families=str(standard.families),
            limit=str(standard.k_limit) if standard.k_limit is not None else "by cost",
            kit_type_cost=fmt(standard.kit_type_cost),
        )
        book.add(
            "plan.oversize",
            "kit array power / row's required array power - 1, and kit "
            "nominal battery energy / row's required battery energy - 1",
            "common practice",
        )
    formula, source = tier_reason()
    book.add("plan.tiers", formula, source)
    book.add(
        "plan.tiers.served",
        "as the row's tier, with the kit's inverter rating and the "
        "daily energy scaled by the kit's smallest ratio of array and battery to the row's "
        "needs",
        f"{MTF_EDITION} (thresholds from memory); scaling common practice",
    )
    if prices is not None:
        book.add(
            "plan.totals.cost",
            "sum over part lines of quantity x unit price; "
            "capacity-priced parts: capacity x price per W, kWh or A",
            prices.source,
            currency=prices.currency,
        )


def plan_file(path: str | Path, **options) -> CommunityPlan:
    """Read and plan a community CSV file (options as :func:`plan_community`)."""
    return plan_community(load_survey(path), **options)


def demo_survey_path() -> Path:
    """The bundled demonstration community (invented village of Kisanga Ridge)."""
    return load_profiles_dir() / "communities" / "kisanga-ridge-community.csv"


__all__ = [
    "CommunityPlan",
    "PlanError",
    "RowResult",
    "SurveyError",
    "demo_survey_path",
    "plan_community",
    "plan_file",
]
