"""Programme planning: many villages, each designed on its own site and climate, one set of
standard kits across them all.

A programme CSV (format in ``docs/programme-format.md``) lists villages with their
coordinates, climate and survey (a community CSV of their own, or the rows of one
combined survey with a ``village`` column).  Each village is planned as a community
(:mod:`offgrid.plan.rows`: a design per distinct row, on the village's site and climate,
at the village's one tilt); the kits are then chosen exactly over every village at once
(:func:`offgrid.plan.kits.standardise`), so a kit serves the most demanding household
it is given, in whichever village and climate that household is.  Totals are summed
village by village (what each truck carries), and the programme's total is their sum
plus the kit types.

Bad input never stops the programme: a village without coordinates or climate, a
climate that fails its checks, two villages with one id, a survey row naming an unknown
village are each reported with file, line and fix; the rest is planned.
"""

from __future__ import annotations

import copy
import csv
import gc
import math
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

import numpy as np

from offgrid.climate.files import ClimateFileError, load_climate, monthly_climate_problems
from offgrid.design.cautions import DEFERS_TO_CODE
from offgrid.design.site_step import CLIMATE_DISTANCE_WARN_DEG
from offgrid.memo import design_memo
from offgrid.paths import load_profiles_dir
from offgrid.plan import survey as sv
from offgrid.plan.community import kit_options
from offgrid.plan.kits import Candidate, PlanError, Standardisation, standardise
from offgrid.plan.prices import PriceList, PriceListError, load_prices, price_list_data
from offgrid.plan.rows import (
    DEFAULT_ENERGY_STEP_PCT,
    PARALLEL_MIN_DESIGNS,
    DesignTable,
    PlanInputs,
    RowDesign,
    RowFailure,
    RowRejected,
    _build_and_design,
    _find,
    _pool_context,
    communities_dir,
    community_demand,
    compact,
    default_jobs,
    distinct_rows,
    keep_memo,
    prepare,
    sent_compact,
    set_community_tilt,
)
from offgrid.plan.survey import Survey, SurveyError, SurveyProblem, SurveyRow
from offgrid.plan.tiers import MTF_EDITION, TIER_NAMES, mtf2015_tier
from offgrid.plan.totals import PartLine, Totals, procurement_totals
from offgrid.project.model import MonthlyClimate

VILLAGE_COLUMNS = (
    "id",
    "name",
    "latitude_deg",
    "longitude_deg",
    "elevation_m",
    "climate",
    "survey",
    "zone",
)
ALIASES = {
    "latitude": "latitude_deg",
    "longitude": "longitude_deg",
    "elevation": "elevation_m",
    "lat": "latitude_deg",
    "lon": "longitude_deg",
}
SETTING_KEYS = ("programme", "demo", "project", "prices", "survey")
KIT_SCOPES = ("programme", "village", "zone")


def village_climate(ref: str, base_dir: Path | None) -> MonthlyClimate:
    """The climate a village names: a bundled climate or a climate file (relative to the
    programme's folder).  The one place a programme resolves climates; raises
    :class:`ClimateFileError` with the fix."""
    return load_climate(ref, base_dir)


@dataclass(frozen=True)
class ProgrammeProblem:
    """One problem, with the file and 1-based line it is on (0: the whole file)."""

    file: str
    line: int
    village: str
    field: str
    message: str

    def __str__(self) -> str:
        where = f"{self.file}, line {self.line}" if self.line else self.file
        who = f" (village {self.village})" if self.village else ""
        return f"{where}{who}, {self.field}: {self.message}"


class ProgrammeError(ValueError):
    """The programme cannot be planned at all (no villages, unreadable file, bad header)."""

    def __init__(self, problems: list[ProgrammeProblem]) -> None:
        self.problems = problems
        text = "\n".join(f"  {p}" for p in problems)
        super().__init__(f"cannot plan the programme ({len(problems)} problem(s))\n{text}")


@dataclass(frozen=True)
class Village:
    line: int
    id: str
    name: str
    latitude_deg: float
    longitude_deg: float
    elevation_m: float | None
    climate: str
    survey: str | None  # a community CSV of its own; None: rows of the combined survey
    zone: str = ""


@dataclass
class Programme:
    source: str
    base_dir: Path | None
    name: str = "Programme"
    demo: bool = False
    project: str | None = None
    prices: str | None = None
    survey: str | None = None  # the combined survey
    villages: list[Village] = field(default_factory=list)
    problems: list[ProgrammeProblem] = field(default_factory=list)
    setting_lines: dict[str, int] = field(default_factory=dict)


# --------------------------------------------------------------------- reading


def _number(raw: str) -> float | None:
    try:
        v = float(raw.replace(",", "."))
    except ValueError:
        return None
    return v if math.isfinite(v) else None


def read_programme(text: str, source: str = "programme", base_dir: Path | None = None) -> Programme:
    """Parse programme CSV text; bad village rows are recorded and left out."""
    prog = Programme(source=source, base_dir=base_dir)
    fatal: list[ProgrammeProblem] = []

    def bad(line: int, vid: str, fld: str, message: str, into=None) -> None:
        (prog.problems if into is None else into).append(
            ProgrammeProblem(source, line, vid, fld, message)
        )

    reader = csv.reader(text.lstrip("\ufeff").splitlines(), skipinitialspace=True)
    header: list[str] | None = None
    seen: dict[str, int] = {}
    for line, cells in enumerate(reader, start=1):
        if not cells or all(not c.strip() for c in cells) or cells[0].strip().startswith("#"):
            continue
        if header is None:
            key = cells[0].strip().lower()
            if key == "id":
                header = [ALIASES.get(c.strip().lower(), c.strip().lower()) for c in cells]
                for h in header:
                    if h not in VILLAGE_COLUMNS:
                        bad(
                            line,
                            "",
                            h or "header",
                            f"unknown column; the columns are {', '.join(VILLAGE_COLUMNS)}",
                            fatal,
                        )
                for need in ("id", "latitude_deg", "longitude_deg", "climate"):
                    if need not in header:
                        bad(line, "", need, "required column is missing", fatal)
                continue
            value = cells[1].strip() if len(cells) > 1 else ""
            if key not in SETTING_KEYS:
                bad(
                    line,
                    "",
                    key,
                    f"unknown setting; settings rows are "
                    f"{', '.join(SETTING_KEYS)} (or the header row, first cell 'id')",
                    fatal,
                )
            elif not value:
                bad(line, "", key, "the setting has no value", fatal)
            elif key in prog.setting_lines:
                bad(
                    line,
                    "",
                    key,
                    f"set twice (also on line {prog.setting_lines[key]}); keep one",
                    fatal,
                )
            else:
                prog.setting_lines[key] = line
                if key == "programme":
                    prog.name = value
                elif key == "demo":
                    prog.demo = value.lower() in ("yes", "y", "true", "1")
                else:
                    setattr(prog, key, value)
            continue
        if fatal:
            break
        values = {h: (cells[i].strip() if i < len(cells) else "") for i, h in enumerate(header)}
        vid = values.get("id", "")
        n_before = len(prog.problems)
        if not vid:
            bad(line, "", "id", "is blank; give every village a unique id (e.g. V01)")
        elif vid in seen:
            bad(
                line,
                vid,
                "id",
                f"duplicate village id '{vid}': line {seen[vid]} already "
                "uses it (that village is planned); give this village its own id",
            )
        coords = {}
        for key, lo, hi in (
            ("latitude_deg", -90.0, 90.0),
            ("longitude_deg", -180.0, 180.0),
            ("elevation_m", -450.0, 9000.0),
        ):
            raw = values.get(key, "")
            if not raw:
                if key != "elevation_m":
                    bad(
                        line,
                        vid,
                        key,
                        "is blank: give the village's coordinates in decimal "
                        "degrees (north and east positive)",
                    )
                continue
            v = _number(raw)
            if v is None or not lo <= v <= hi:
                bad(line, vid, key, f"'{raw}' must be a number from {lo:g} to {hi:g}")
            else:
                coords[key] = v
        if not values.get("climate"):
            bad(
                line,
                vid,
                "climate",
                "is blank: name a bundled climate, the user's own "
                "climate or a climate file (offgrid climate list shows them)",
            )
        survey_ref = values.get("survey") or None
        if survey_ref is None and not prog.survey and len(prog.problems) == n_before:
            bad(
                line,
                vid,
                "survey",
                "is blank and the programme has no combined survey: "
                "name the village's survey CSV, or add a settings row 'survey,FILE.csv' "
                "with a village column",
            )
        if len(prog.problems) > n_before:
            if vid and vid not in seen:
                seen[vid] = line
            continue
        seen[vid] = line
        prog.villages.append(
            Village(
                line,
                vid,
                values.get("name") or vid,
                coords["latitude_deg"],
                coords["longitude_deg"],
                coords.get("elevation_m"),
                values["climate"],
                survey_ref,
                values.get("zone", ""),
            )
        )
    if header is None:
        bad(
            0,
            "",
            "header",
            "no header row found: the first cell of the header row must be "
            "'id' (after any settings rows)",
            fatal,
        )
    if fatal:
        raise ProgrammeError(fatal)
    if not prog.villages and not prog.problems:
        raise ProgrammeError(
            [
                ProgrammeProblem(
                    source,
                    0,
                    "",
                    "villages",
                    "the programme lists no villages: add one row per village",
                )
            ]
        )
    return prog


def load_programme(path: str | Path) -> Programme:
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except OSError as exc:
        raise ProgrammeError(
            [ProgrammeProblem(str(p), 0, "", "file", f"cannot read {p}: {exc.strerror}")]
        ) from exc
    except UnicodeDecodeError as exc:
        raise ProgrammeError(
            [
                ProgrammeProblem(
                    str(p), 0, "", "file", "not UTF-8 text: save the spreadsheet as CSV UTF-8"
                )
            ]
        ) from exc
    return read_programme(text, source=str(p), base_dir=p.parent)


def is_programme_file(path: str | Path) -> bool:
    """True when the CSV's first settings row is ``programme`` or its header has a
    latitude column (a community survey has neither)."""
    from offgrid.textfile import TextFileError, open_regular

    try:  # a regular file only (a FIFO or /dev/zero would never end), its head only
        with open_regular(path) as raw_fh:
            head = raw_fh.read(_HEAD_BYTES).decode("utf-8-sig", errors="replace")
            for raw in head.splitlines():
                cells = [c.strip().lower() for c in raw.split(",")]
                if not cells[0] or cells[0].startswith("#"):
                    continue
                if cells[0] == "programme":
                    return True
                if cells[0] == "id":
                    return any(ALIASES.get(c, c) == "latitude_deg" for c in cells)
    except (OSError, TextFileError):
        return False
    return False


#: How much of a CSV's start :func:`is_programme_file` looks at for its settings and header.
_HEAD_BYTES = 65_536


def read_combined_survey(
    path: Path, villages: dict[str, Village], left_out: set[str] | frozenset = frozenset()
) -> tuple[dict[str, Survey], list[ProgrammeProblem]]:
    """Stream a combined survey (a community CSV with a ``village`` column) into one
    :class:`Survey` per village, sharing the file's settings.  Rows naming no or an unknown
    village are reported with their line and left out."""
    src = str(path)
    problems: list[ProgrammeProblem] = []
    shell = Survey(source=src, base_dir=path.parent)
    settings: list[tuple[str, Any]] = []
    fatal: list[SurveyProblem] = []
    out: dict[str, Survey] = {}
    seen_ids: dict[str, dict[str, int]] = {}
    header: list[str] | None = None
    vcol = -1
    unknown: dict[str, list[int]] = {}
    import io

    from offgrid.textfile import TextFileError, open_regular

    try:  # streamed: a regular file only, never a FIFO or a device
        fh = io.TextIOWrapper(open_regular(path), encoding="utf-8-sig", newline="")
    except TextFileError as exc:
        return {}, [ProgrammeProblem(src, 0, "", "survey", f"{path} {exc}")]
    except OSError as exc:
        return {}, [ProgrammeProblem(src, 0, "", "survey", f"cannot read {path}: {exc.strerror}")]
    with fh:
        reader = csv.reader(fh, skipinitialspace=True)
        last = 0
        for cells in reader:
            line, last = last + 1, reader.line_num
            if not cells or all(not c.strip() for c in cells) or cells[0].strip().startswith("#"):
                continue
            if header is None:
                if cells[0].strip().lower() == "id":
                    full = [c.strip().lower() for c in cells]
                    if "village" not in full:
                        problems.append(
                            ProgrammeProblem(
                                src,
                                line,
                                "",
                                "village",
                                "the "
                                "combined survey needs a 'village' column naming each "
                                "row's village id",
                            )
                        )
                        return {}, problems
                    vcol = full.index("village")
                    header = full[:vcol] + full[vcol + 1 :]
                    fatal.extend(sv._check_header(header, line))
                    if fatal:
                        break
                    continue
                sv._read_setting(cells, line, shell, settings, fatal)
                continue
            vid = cells[vcol].strip() if vcol < len(cells) else ""
            rest = cells[:vcol] + cells[vcol + 1 :]
            if vid not in villages:
                unknown.setdefault(vid, []).append(line)
                continue
            s = out.get(vid)
            if s is None:
                s = out[vid] = Survey(source=src, base_dir=path.parent)
                seen_ids[vid] = {}
            s.rows_read += 1
            plist: list[SurveyProblem] = []
            row = sv._read_row(header, rest, line, plist, seen_ids[vid])
            s.problems.extend(plist)
            if row is not None:
                s.rows.append(row)
    for p in fatal:
        problems.append(ProgrammeProblem(src, p.line, "", p.field, p.message))
    if fatal:
        return {}, problems
    if header is None:
        problems.append(
            ProgrammeProblem(
                src,
                0,
                "",
                "header",
                "no header row found: the first cell of the header row must be 'id'",
            )
        )
    for vid, lines in unknown.items():
        shown = ", ".join(map(str, lines[:8])) + (
            f" and {len(lines) - 8} more" if len(lines) > 8 else ""
        )
        if vid in left_out:
            problems.append(
                ProgrammeProblem(
                    src,
                    lines[0],
                    vid,
                    "village",
                    f"{len(lines)} "
                    f"row(s) of village '{vid}' are left out with "
                    "their village: correct the village's line in "
                    "the programme",
                )
            )
            continue
        what = (
            f"names village '{vid}', which the programme does not list"
            if vid
            else "has a blank village"
        )
        problems.append(
            ProgrammeProblem(
                src,
                lines[0],
                vid,
                "village",
                f"{len(lines)} row(s) "
                f"(lines {shown}) {what}: add the village to the "
                f"programme or correct the id (known: "
                f"{', '.join(list(villages)[:12])})",
            )
        )
    for s in out.values():
        s.name, s.demo, s.climate, s.project, s.prices = (
            shell.name,
            shell.demo,
            shell.climate,
            shell.project,
            shell.prices,
        )
        s.settings = tuple(settings)
        s.setting_lines = dict(shell.setting_lines)
    return out, problems


# --------------------------------------------------------------------- results


@dataclass(frozen=True)
class VillageResult:
    id: str
    name: str
    line: int
    latitude_deg: float
    longitude_deg: float
    elevation_m: float
    climate: str
    zone: str
    tilt_deg: float | None
    rows_read: int
    distinct_designs: int
    systems: int  # households and facilities served (kits + own systems)
    kit_counts: dict[str, int]
    own_systems: int
    own_rows: tuple[str, ...]  # ids of rows given a design of their own
    unmet: tuple[tuple[str, str], ...]  # (row id, engine message)
    left_out: tuple[ProgrammeProblem, ...]  # survey rows that could not be read
    modules: int
    battery_units: int
    array_kw: float
    battery_kwh: float
    totals: Totals | None
    tier_counts: dict[str, int]
    rows: tuple[tuple[str, int, int, str, str], ...]  # (id, line, count, status, kit or "")
    notices: tuple[str, ...] = ()


@dataclass(frozen=True)
class ProgrammePlan:
    name: str
    demo: bool
    source: str
    kit_scope: str
    villages: tuple[VillageResult, ...]
    left_out: tuple[ProgrammeProblem, ...]  # villages and rows left out, with the reason
    standards: tuple[tuple[str, Standardisation], ...]  # (scope name, kits chosen there)
    totals: Totals | None
    currency: str
    prices_source: str
    tier_counts: dict[str, int]
    cautions: tuple[str, ...]
    notices: tuple[str, ...]
    rows_read: int
    distinct_designs: int
    #: the kits' inputs: one per (village, distinct design, kit flag), counts summed
    candidates: tuple[Candidate, ...] = ()
    candidate_village: tuple[str, ...] = ()
    #: what a merge needs to choose the kits again (see offgrid.plan.merge)
    options: dict[str, Any] = field(default_factory=dict)
    price_list: PriceList | None = None
    candidate_labels: tuple[str, ...] = ()

    @property
    def systems(self) -> int:
        return sum(v.systems for v in self.villages)

    @property
    def kits(self):
        return tuple(k for _, s in self.standards for k in s.kits)

    @property
    def kit_counts(self) -> dict[str, int]:
        out: dict[str, int] = {}
        for v in self.villages:
            for k, n in v.kit_counts.items():
                out[k] = out.get(k, 0) + n
        return out

    def to_dict(self) -> dict[str, Any]:
        from offgrid.plan.community import _plain

        designs = DesignTable()
        per_village: dict[str, list] = {}
        for c, vid, label in zip(
            self.candidates, self.candidate_village, self.candidate_labels, strict=True
        ):
            per_village.setdefault(vid, []).append([designs.add(c.design), c.count, c.kit, label])
        return {
            "format": "offgrid-programme-plan",
            "schema": PLAN_SCHEMA,
            "name": self.name,
            "demo": self.demo,
            "source": self.source,
            "kit_scope": self.kit_scope,
            "rows_read": self.rows_read,
            "distinct_designs": self.distinct_designs,
            "systems": self.systems,
            "currency": self.currency,
            "prices": self.prices_source,
            "kits": [
                {
                    "scope": scope,
                    "name": k.name,
                    "systems": k.systems,
                    "unit_cost": _plain(k.unit_cost),
                    "parts": _plain(k.parts),
                }
                for scope, s in self.standards
                for k in s.kits
            ],
            "kit_counts": self.kit_counts,
            "villages": [
                {
                    key: _plain(getattr(v, key))
                    for key in (
                        "id",
                        "name",
                        "line",
                        "latitude_deg",
                        "longitude_deg",
                        "elevation_m",
                        "climate",
                        "zone",
                        "tilt_deg",
                        "rows_read",
                        "distinct_designs",
                        "systems",
                        "kit_counts",
                        "own_systems",
                        "own_rows",
                        "unmet",
                        "modules",
                        "battery_units",
                        "array_kw",
                        "battery_kwh",
                        "tier_counts",
                        "notices",
                    )
                }
                | {
                    "left_out": [str(p) for p in v.left_out],
                    "total_cost": _plain(v.totals.total_cost) if v.totals else None,
                    # [design, systems, kit flag, first row]: what the kits were chosen from
                    "candidates": per_village.get(v.id, []),
                }
                for v in self.villages
            ],
            "left_out": [_plain(p) for p in self.left_out],
            "totals": _plain(self.totals) if self.totals else None,
            "tiers": {"edition": MTF_EDITION, "systems": dict(self.tier_counts)},
            "notices": list(self.notices),
            "cautions": list(self.cautions),
            "planning": dict(self.options),
            "price_list": price_list_data(self.price_list),
            "design_table": designs.data(),
        }


#: 2: the distinct designs (``designs``, each village's ``candidates``), the planning
#: options and the price list, so that a merge of plans chooses the kits again.
PLAN_SCHEMA = 2


# --------------------------------------------------------------------- planning


@dataclass
class _VillageWork:
    village: Village
    inputs: PlanInputs
    unique: list[SurveyRow]
    index_of: list[int]
    results: list = field(default_factory=list)
    #: the village's monthly demand its tilt is searched for (None: no search to run)
    demand: np.ndarray | None = None


_PROGRAMME_INPUTS: list[PlanInputs] = []
_PROGRAMME_DEMAND: list[np.ndarray | None] = []


def _programme_batch(
    batch: list[tuple[int, int, SurveyRow]],
) -> tuple[dict[int, float], list[tuple[int, int, Any]]]:
    """Design a batch in a worker; a village's tilt is searched here the first time this
    worker meets the village (the same search on the same demand as in the main process,
    so the same tilt), and returned with the designs."""
    tilts: dict[int, float] = {}
    out = []
    with design_memo():
        for v, i, row in batch:
            inputs = _PROGRAMME_INPUTS[v]
            demand = _PROGRAMME_DEMAND[v]
            if demand is not None and not inputs.tilt_searched:
                tilts[v] = set_community_tilt(inputs, demand)
            out.append((v, i, sent_compact(_build_and_design(inputs, row))))
    return tilts, out


def _light(inputs: PlanInputs) -> PlanInputs:
    """What a forked worker needs of a village: its base and the references already read
    (shared by the villages of one survey folder), not its survey's rows."""
    light = copy.copy(inputs.survey)
    light.rows, light.problems = [], []
    return replace(inputs, survey=light)


def _design_all(work: list[_VillageWork], jobs: int) -> None:
    """Design every village's distinct rows, in one pool of worker processes for all."""
    tasks = [(v, i, row) for v, w in enumerate(work) for i, row in enumerate(w.unique)]
    for w in work:
        w.results = [None] * len(w.unique)
    context = _pool_context() if jobs > 1 and len(tasks) >= PARALLEL_MIN_DESIGNS else None
    seen: dict = {}
    if context is None:
        for w in work:
            if w.demand is not None:
                set_community_tilt(w.inputs, w.demand)
        with design_memo():
            for v, i, row in tasks:
                work[v].results[i] = compact(_build_and_design(work[v].inputs, row), seen)
        return
    global _PROGRAMME_INPUTS, _PROGRAMME_DEMAND
    _PROGRAMME_INPUTS = [_light(w.inputs) for w in work]  # inherited by the forked workers
    _PROGRAMME_DEMAND = [w.demand for w in work]
    # a village whose rows all go to the main process's results still needs its tilt
    for w in work:
        if w.demand is not None and not w.unique:
            set_community_tilt(w.inputs, w.demand)
    # keep each batch on one village so a worker's memo serves it
    size = max(50, min(400, len(tasks) // (jobs * 4) or 1))
    batches = [tasks[i : i + size] for i in range(0, len(tasks), size)]
    gc.freeze()  # forked workers then leave the parent's objects unshared-but-untouched
    try:
        with ProcessPoolExecutor(
            max_workers=jobs, mp_context=context, initializer=keep_memo
        ) as pool:
            for tilts, result in pool.map(_programme_batch, batches):
                for v, tilt in tilts.items():
                    work[v].inputs.base.site.tilt_deg = tilt
                    work[v].inputs.tilt_searched = True
                for v, i, r in result:
                    work[v].results[i] = compact(r, seen)
    finally:
        _PROGRAMME_INPUTS, _PROGRAMME_DEMAND = [], []
        gc.unfreeze()


def _resolve_prices(prog: Programme, prices, first: PlanInputs | None) -> PriceList | None:
    if isinstance(prices, PriceList):
        return prices
    ref = prices or prog.prices or (first.survey.prices if first is not None else None)
    if not ref:
        return None
    folder = load_profiles_dir()
    path = _find(ref, prog.base_dir, folder, ".csv")
    if path is None and first is not None:
        path = _find(ref, first.base_dir, folder, ".csv")
    if path is None:
        raise PlanError(f"price list '{ref}' not found next to the programme or in load_profiles/")
    currency = first.base.economics.currency if first is not None else "USD"
    try:
        return load_prices(path, currency)
    except PriceListError as exc:
        raise PlanError(str(exc)) from exc


def _village_surveys(prog: Programme, left: list[ProgrammeProblem]) -> list[tuple[Village, Survey]]:
    combined: dict[str, Survey] = {}
    needs_combined = [v for v in prog.villages if v.survey is None]
    if needs_combined:
        path = (
            _find(prog.survey or "", prog.base_dir, communities_dir(), ".csv")
            if prog.survey
            else None
        )
        if path is None:
            left.append(
                ProgrammeProblem(
                    prog.source,
                    prog.setting_lines.get("survey", 0),
                    "",
                    "survey",
                    f"combined survey '{prog.survey}' not found next to the programme",
                )
            )
        else:
            listed = {p.village for p in prog.problems if p.village}
            combined, problems = read_combined_survey(
                path, {v.id: v for v in needs_combined}, listed
            )
            left.extend(problems)
    out = []
    for v in prog.villages:
        if v.survey is None:
            s = combined.get(v.id)
            if s is None:
                if prog.survey:
                    left.append(
                        ProgrammeProblem(
                            prog.source,
                            v.line,
                            v.id,
                            "survey",
                            "no row of the combined survey names this "
                            "village: add its rows (village column) or "
                            "name its own survey file",
                        )
                    )
                continue
            out.append((v, s))
            continue
        path = _find(v.survey, prog.base_dir, communities_dir(), ".csv")
        if path is None:
            left.append(
                ProgrammeProblem(
                    prog.source,
                    v.line,
                    v.id,
                    "survey",
                    f"survey file '{v.survey}' not found next to the programme: check the name",
                )
            )
            continue
        try:
            out.append((v, sv.load_survey(path)))
        except SurveyError as exc:
            for p in exc.problems:
                left.append(ProgrammeProblem(str(path), p.line, v.id, p.field, p.message))
    return out


def _prepare_village(
    prog: Programme,
    v: Village,
    s: Survey,
    energy_step_pct: float,
    left: list[ProgrammeProblem],
    loaded: dict | None = None,
) -> PlanInputs | None:
    try:
        climate = village_climate(v.climate, prog.base_dir)
    except ClimateFileError as exc:
        left.append(ProgrammeProblem(prog.source, v.line, v.id, "climate", str(exc)))
        return None
    bad = monthly_climate_problems(climate)
    if bad:
        path, message = bad[0]
        left.append(
            ProgrammeProblem(
                prog.source,
                v.line,
                v.id,
                "climate",
                f"'{v.climate}' fails its checks: {path}: {message}; "
                "correct the climate file or name another climate",
            )
        )
        return None
    site = {
        "site.latitude_deg": v.latitude_deg,
        "site.longitude_deg": v.longitude_deg,
        "site.elevation_m": (
            v.elevation_m if v.elevation_m is not None else climate.elevation_m or 0.0
        ),
    }
    s = copy.copy(s)
    s.settings = tuple((k, val) for k, val in s.settings if k not in site) + tuple(site.items())
    s.name = v.name
    s.demo = s.demo or prog.demo
    if prog.project and not s.project:
        s.project = prog.project
    try:
        inputs = prepare(
            s,
            climate=v.climate,
            energy_step_pct=energy_step_pct,
            climate_table=climate,
            loaded=loaded,
        )
    except SurveyError as exc:
        for p in exc.problems:
            left.append(ProgrammeProblem(s.source, p.line, v.id, p.field, p.message))
        return None
    return inputs


def plan_programme(
    prog: Programme,
    *,
    kits: int | None = None,
    kit_type_cost: float | None = None,
    prices: PriceList | str | None = None,
    objective: str | None = None,
    jobs: int | None = None,
    k_max: int = 12,
    kit_scope: str = "programme",
    energy_step_pct: float = DEFAULT_ENERGY_STEP_PCT,
) -> ProgrammePlan:
    """Plan every village and choose the kits.

    ``kit_scope``: ``programme`` (one set of kits for all villages), ``village`` (each
    village its own kits, as if planned alone) or ``zone`` (one set per value of the
    programme's ``zone`` column).  Other options as
    :func:`offgrid.plan.community.plan_community`.
    """
    if kit_scope not in KIT_SCOPES:
        raise PlanError(f"kit scope '{kit_scope}' must be one of {', '.join(KIT_SCOPES)}")
    left: list[ProgrammeProblem] = list(prog.problems)
    work: list[_VillageWork] = []
    notices: list[str] = []
    loaded: dict = {}  # parts projects read once per programme
    refs: dict = {}  # per survey folder: the load lists and row projects read once
    for v, s in _village_surveys(prog, left):
        inputs = _prepare_village(prog, v, s, energy_step_pct, left, loaded)
        if inputs is not None:
            lists, projects = refs.setdefault(inputs.base_dir, ({}, {}))
            inputs = replace(inputs, load_lists=lists, projects=projects)
        if inputs is None:
            continue
        c = inputs.base.climate.inline
        if (
            c is not None
            and c.latitude_deg is not None
            and (
                abs(c.latitude_deg - v.latitude_deg) > CLIMATE_DISTANCE_WARN_DEG
                or abs((c.longitude_deg or 0.0) - v.longitude_deg) > CLIMATE_DISTANCE_WARN_DEG
            )
        ):
            notices.append(
                f"village {v.id}: its climate '{v.climate}' is for {c.latitude_deg:g}"
                f", {c.longitude_deg or 0:g}, more than "
                f"{CLIMATE_DISTANCE_WARN_DEG:g} deg from the village; check it is "
                "the right climate"
            )
        for p in inputs.survey.problems:
            left.append(ProgrammeProblem(inputs.survey.source, p.line, v.id, p.field, p.message))
        unique, index_of = distinct_rows(inputs)
        # the tilt search itself runs with the designs (in the workers when they start)
        work.append(_VillageWork(v, inputs, unique, index_of, demand=community_demand(inputs)))
    if not work:
        raise ProgrammeError(
            left or [ProgrammeProblem(prog.source, 0, "", "villages", "no village can be planned")]
        )
    _design_all(work, default_jobs() if jobs is None else jobs)

    price_list = _resolve_prices(prog, prices, work[0].inputs)
    objective, kits, kit_type_cost = kit_options(objective, kits, kit_type_cost, price_list)

    # one candidate per (village, distinct design, kit choice): counts summed
    cands: list[Candidate] = []
    cand_village: list[int] = []
    cand_label: list[str] = []
    row_cand: list[list[int]] = []  # per village, per row: candidate index or -1
    key_of: dict[tuple, int] = {}
    for vi, w in enumerate(work):
        per_row = []
        for row, ui in zip(w.inputs.survey.rows, w.index_of, strict=True):
            r = w.results[ui]
            if not isinstance(r, RowDesign) or row.count <= 0:
                per_row.append(-1)
                continue
            key = (vi, id(r), row.kit)
            ci = key_of.get(key)
            if ci is None:
                ci = key_of[key] = len(cands)
                cands.append(Candidate(ci, r, row.count, row.kit))
                cand_village.append(vi)
                cand_label.append(f"{w.village.id}/{row.id}")
            else:
                c = cands[ci]
                cands[ci] = replace(c, count=c.count + row.count)
            per_row.append(ci)
        row_cand.append(per_row)

    zone_of = [work[vi].village.zone for vi in cand_village]
    scope_of = [
        {"programme": "programme", "village": work[vi].village.id, "zone": z or "(no zone)"}[
            kit_scope
        ]
        for vi, z in zip(cand_village, zone_of, strict=True)
    ]
    standards, assign, kit_parts, zone_note = choose_kits(
        cands, scope_of, zone_of, kit_scope, kits, kit_type_cost, price_list, objective, k_max
    )
    if zone_note:
        notices.append(zone_note)

    villages: list[VillageResult] = []
    prog_tiers = {t: 0 for t in TIER_NAMES}
    cautions: list[str] = []
    for vi, w in enumerate(work):
        villages.append(
            _village_result(
                w,
                row_cand[vi],
                cands,
                assign,
                kit_parts,
                standards,
                price_list,
                left,
                cautions,
                cand_label,
            )
        )
        for t, n in villages[-1].tier_counts.items():
            prog_tiers[t] += n
    if DEFERS_TO_CODE not in cautions:
        cautions.append(DEFERS_TO_CODE)
    kit_type = standards[0][1].kit_type_cost if standards else 0.0
    totals = _sum_totals(
        [v.totals for v in villages], sum(len(s.kits) for _, s in standards), kit_type, price_list
    )
    rows_read = sum(w.inputs.survey.rows_read for w in work)
    distinct = sum(v.distinct_designs for v in villages)
    return ProgrammePlan(
        prog.name,
        prog.demo,
        prog.source,
        kit_scope,
        tuple(villages),
        tuple(left),
        tuple(standards),
        totals,
        price_list.currency if price_list else "",
        price_list.source if price_list else "",
        prog_tiers,
        tuple(cautions),
        tuple(notices),
        rows_read,
        distinct,
        tuple(cands),
        tuple(work[vi].village.id for vi in cand_village),
        {"kits": kits, "kit_type_cost": kit_type_cost, "objective": objective, "k_max": k_max},
        price_list,
        tuple(cand_label),
    )


def choose_kits(
    cands: list[Candidate],
    scope_of: list[str],
    zone_of: list[str],
    kit_scope: str,
    kits: int | None,
    kit_type_cost: float | None,
    price_list: PriceList | None,
    objective: str,
    k_max: int,
) -> tuple[list[tuple[str, Standardisation]], dict[int, Any], dict[str, Any], str]:
    """The kits of each scope over the candidates (one per village, distinct design and kit
    flag; ``scope_of``/``zone_of``: each candidate's scope and its village's zone): the
    standardisations, each candidate's assignment by index, each kit's parts, and the
    zone comparison's note ("" when none is made).  A programme plan and a merge of plans
    (offgrid.plan.merge) both choose through here."""
    scopes: dict[str, list[int]] = {}
    for ci, name in enumerate(scope_of):
        scopes.setdefault(name, []).append(ci)
    standards: list[tuple[str, Standardisation]] = []
    assign: dict[int, Any] = {}
    kit_parts: dict[str, Any] = {}
    for name, members in scopes.items():
        sub = [cands[ci] for ci in members]
        st = standardise(
            sub,
            k=kits,
            kit_type_cost=kit_type_cost,
            prices=price_list,
            objective=objective,
            k_max=k_max,
        )
        if kit_scope != "programme":
            prefix = f"{name}-"
            st = replace(
                st,
                kits=tuple(replace(k, name=prefix + k.name) for k in st.kits),
                assignments=tuple(
                    replace(a, kit=prefix + a.kit if a.kit else None) for a in st.assignments
                ),
            )
        standards.append((name, st))
        for a in st.assignments:
            assign[a.index] = a
        for k in st.kits:
            kit_parts[k.name] = k.parts
    zones = set(zone_of)
    note = ""
    if kit_scope != "zone" and len(zones) > 1 and "" not in zones and objective == "cost":
        note = _zone_comparison(
            cands, zone_of, standards, kits, kit_type_cost, price_list, k_max, kit_scope
        )
    return standards, assign, kit_parts, note


def _zone_comparison(
    cands, zone_of, standards, kits, kit_type_cost, prices, k_max, kit_scope
) -> str:
    """Say whether kits restricted to climate zones would cost less than the scope used."""
    by_zone: dict[str, list[Candidate]] = {}
    for c, zone in zip(cands, zone_of, strict=True):
        by_zone.setdefault(zone, []).append(c)
    zoned = sum(
        standardise(
            sub, k=kits, kit_type_cost=kit_type_cost, prices=prices, objective="cost", k_max=k_max
        ).objective_value
        for sub in by_zone.values()
    )
    used = sum(st.objective_value for _, st in standards)
    if zoned < used - 1e-6:
        verdict = f"cheaper by {used - zoned:,.0f}: plan with --kit-scope zone to use them"
    else:
        verdict = f"not cheaper ({zoned - used:,.0f} more): the {kit_scope} kits are kept"
    return (
        f"Kits restricted to the {len(by_zone)} climate zones ({', '.join(sorted(by_zone))})"
        f" would cost {zoned:,.0f} against {used:,.0f} for the {kit_scope} kits "
        f"(parts and kit types): {verdict}."
    )


@dataclass(frozen=True)
class VillageFigures:
    """A village's kit counts, own systems, parts, tiers and totals, from its candidates."""

    kit_counts: dict[str, int]
    own: int
    own_candidates: tuple[int, ...]
    modules: int
    battery_units: int
    array_w: float
    battery_wh: float
    tiers: dict[str, int]
    totals: Totals | None


def village_figures(
    mine: list[int],
    cands: list[Candidate],
    assign: dict,
    kit_parts: dict,
    standards,
    prices,
    labels,
    cautions: list[str],
) -> VillageFigures:
    """The figures of one village whose candidates are ``mine`` (indices into ``cands``, in
    the order the village's rows first name them); each candidate's cautions are added to
    ``cautions`` in that order.  Sums run over the candidates (count x figure), so a merge
    of plans, which holds candidates and not rows, gives the same numbers."""
    kit_counts: dict[str, int] = {}
    own_c: list[int] = []
    own = mods = units = 0
    array_w = batt_wh = 0.0
    cap, energy, weights = [], [], []
    for ci in mine:
        c = cands[ci]
        r, n = c.design, c.count
        a = assign[ci]
        for text in r.cautions:
            if text not in cautions:
                cautions.append(text)
        if a.kit:
            kit_counts[a.kit] = kit_counts.get(a.kit, 0) + n
            parts = kit_parts[a.kit]
            mods += n * parts.modules_series * parts.strings
            units += n * parts.units_series * parts.units_parallel
            array_w += n * parts.modules_series * parts.strings * parts.module_pmax_w
            batt_wh += n * (
                parts.units_series
                * parts.units_parallel
                * parts.battery_unit_v
                * parts.battery_unit_ah
            )
            scale = min(parts.array_power_w / r.required_power_w, parts.nominal_wh / r.required_wh)
            own_scale = min(r.array_power_w / r.required_power_w, r.nominal_wh / r.required_wh)
            energy.append(r.appliance_energy_wh * max(1.0, scale / own_scale))
            cap.append(parts.inverter_w + (r.peak_capacity_w - r.inverter_w))
        else:
            own += n
            own_c.append(ci)
            mods += n * r.module_count
            units += n * r.unit_count
            array_w += n * r.array_power_w
            batt_wh += n * r.nominal_wh
            energy.append(r.appliance_energy_wh)
            cap.append(r.peak_capacity_w)
        weights.append(n)
    tiers = {t: 0 for t in TIER_NAMES}
    if weights:
        tier_idx = mtf2015_tier(np.asarray(cap), np.asarray(energy))
        for t, n in zip(np.atleast_1d(tier_idx), weights, strict=True):
            tiers[TIER_NAMES[int(t)]] += n
    totals = None
    if mine:
        order = sorted(mine)
        sub_c = [cands[ci] for ci in order]
        kits_here = []
        for _, st in standards:
            for k in st.kits:
                n = kit_counts.get(k.name, 0)
                if n:
                    kits_here.append(replace(k, systems=n))
        view = replace(
            standards[0][1],
            kits=tuple(kits_here),
            assignments=tuple(assign[ci] for ci in order),
            kit_type_cost=0.0,
        )
        totals = procurement_totals(view, sub_c, prices, {i: labels[i] for i in mine})
    return VillageFigures(
        kit_counts, own, tuple(own_c), mods, units, array_w, batt_wh, tiers, totals
    )


def _village_result(
    w: _VillageWork,
    per_row: list[int],
    cands: list[Candidate],
    assign: dict,
    kit_parts: dict,
    standards,
    prices,
    left,
    cautions,
    labels,
) -> VillageResult:
    v = w.village
    rows_out = []
    own_rows: list[str] = []
    unmet: list[tuple[str, str]] = []
    mine: list[int] = []
    seen: set[int] = set()
    for row, ui, ci in zip(w.inputs.survey.rows, w.index_of, per_row, strict=True):
        r = w.results[ui]
        if isinstance(r, RowRejected):
            left.append(
                ProgrammeProblem(w.inputs.survey.source, row.line, v.id, r.field, r.message)
            )
            continue
        if isinstance(r, RowFailure):
            unmet.append((row.id, f"[{r.code}] {r.message}"))
            rows_out.append((row.id, row.line, row.count, "cannot be met", ""))
            continue
        if ci < 0:
            rows_out.append((row.id, row.line, row.count, "not planned", ""))
            continue
        if ci not in seen:
            seen.add(ci)
            mine.append(ci)
        a = assign[ci]
        if a.kit:
            rows_out.append((row.id, row.line, row.count, "kit", a.kit))
        else:
            own_rows.append(row.id)
            rows_out.append((row.id, row.line, row.count, "own system", ""))
    fig = village_figures(mine, cands, assign, kit_parts, standards, prices, labels, cautions)
    kit_counts, own, tiers, totals = fig.kit_counts, fig.own, fig.tiers, fig.totals
    mods, units, array_w, batt_wh = fig.modules, fig.battery_units, fig.array_w, fig.battery_wh
    designs = {
        id(w.results[i]) for i in range(len(w.unique)) if not isinstance(w.results[i], RowRejected)
    }
    return VillageResult(
        v.id,
        v.name,
        v.line,
        v.latitude_deg,
        v.longitude_deg,
        float(w.inputs.base.site.elevation_m),
        w.inputs.climate_ref,
        v.zone,
        w.inputs.base.site.tilt_deg,
        w.inputs.survey.rows_read,
        len(designs),
        sum(kit_counts.values()) + own,
        kit_counts,
        own,
        tuple(own_rows),
        tuple(unmet),
        tuple(p for p in left if p.village == v.id),
        mods,
        units,
        array_w / 1000.0,
        batt_wh / 1000.0,
        totals,
        tiers,
        tuple(rows_out),
    )


def _sum_totals(
    parts: list[Totals | None], n_kits: int, kit_type_cost: float, prices: PriceList | None
) -> Totals | None:
    """The programme's totals: the villages' lines summed, plus the kit types once."""
    got = [t for t in parts if t is not None]
    if not got:
        return None
    qty: dict[tuple[str, str], list] = {}
    for t in got:
        for ln in t.lines:
            key = (ln.category, ln.description)
            if key not in qty:
                qty[key] = [ln, 0.0, 0.0 if ln.cost is not None else None]
            item = qty[key]
            item[1] += ln.quantity
            if item[2] is not None and ln.cost is not None:
                item[2] += ln.cost
            else:
                item[2] = None
    lines = [
        PartLine(ln.category, ln.description, ln.label, q, ln.unit, ln.unit_price, c)
        for ln, q, c in qty.values()
    ]
    if n_kits and kit_type_cost > 0:
        lines.append(
            PartLine(
                "Kit types",
                "setting up one standard kit type (tender, stock, training)",
                "Kit type set-up",
                float(n_kits),
                "each",
                kit_type_cost,
                kit_type_cost * n_kits,
            )
        )
    total = None
    if prices is not None:
        total = float(sum(ln.cost for ln in lines if ln.cost is not None))
    unpriced = tuple(ln.label for ln in lines if prices is not None and ln.cost is None)
    return Totals(
        tuple(lines),
        (),
        total,
        prices.currency if prices else "",
        sum(t.systems for t in got),
        unpriced,
    )


def plan_programme_file(path: str | Path, **options) -> ProgrammePlan:
    return plan_programme(load_programme(path), **options)


def demo_programme_path() -> Path:
    """The bundled invented programme (three invented villages on different sites)."""
    return communities_dir() / "demo-programme.csv"


__all__ = [
    "ProgrammeError",
    "ProgrammePlan",
    "ProgrammeProblem",
    "VillageResult",
    "demo_programme_path",
    "is_programme_file",
    "load_programme",
    "plan_programme",
    "plan_programme_file",
    "read_programme",
    "village_climate",
]
