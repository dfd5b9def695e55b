"""Design every survey row with the single-project engine (:func:`offgrid.design.sizing.design`).

Each row becomes an ordinary :class:`~offgrid.project.model.Project`: the shared
site and climate, the shared (or the row's own) parts and design choices, and the
row's loads.  Rows with identical inputs share one design (a survey of 10,000
households usually has a few dozen distinct ones), and when many distinct rows
remain they are designed in worker processes.  Only a compact record of each design
is kept (:class:`RowDesign`); :func:`row_project` rebuilds the full project of any row
for the single-project views.
"""

from __future__ import annotations

import copy
import dataclasses
import gc
import math
import multiprocessing
import os
import threading
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, replace
from pathlib import Path

import numpy as np

from offgrid.climate.files import ClimateFileError, load_climate
from offgrid.design.result import DesignError, SystemDesign, plain_reasons
from offgrid.memo import design_memo
from offgrid.paths import load_profiles_dir
from offgrid.plan.survey import PART_SECTIONS, Survey, SurveyError, SurveyProblem, SurveyRow
from offgrid.project.loads_csv import LoadListError, load_loads_csv
from offgrid.project.model import ClimateChoice, Load, MonthlyClimate, Project, ProjectInfo
from offgrid.project.store import ProjectFileError, load_project
from offgrid.project.validate import validate_project

#: Below this many distinct designs, worker processes cost more than they save (measured:
#: start-up about 0.1 s per worker with fork; one design with its electrical part 15-25 ms).
PARALLEL_MIN_DESIGNS = 40
SURVEYED_LOAD_NAME = "surveyed demand"
#: Surveyed daily energy and peak power are designed at the next step of a geometric grid
#: of this ratio (percent), always rounding up: near-equal surveys share one design.
DEFAULT_ENERGY_STEP_PCT = 1.0


def step_up(value: float, step_pct: float) -> float:
    """``value`` raised to the next point of the grid (1 + step/100)^n; unchanged for 0.

    Never lower than ``value`` (a design for the stepped figure meets the surveyed one).
    """
    if step_pct <= 0 or value <= 0:
        return value
    ratio = math.log1p(step_pct / 100.0)
    n = math.ceil(math.log(value) / ratio - 1e-9)
    out = math.exp(n * ratio)
    return out if out >= value else value


@dataclass(frozen=True)
class Cable:
    """One cable run of a design: metres of two-conductor cable of one size."""

    key: str  # the run's key in the electrical design (string, array, charge, ...)
    run: str
    material: str
    size: str
    area_mm2: float
    metres: float  # 2 conductors x one-way length x runs
    house: bool  # a DC load circuit of this row (not part of a kit)


@dataclass(frozen=True)
class Protection:
    """Overcurrent devices or disconnects at one location of a design."""

    location: str
    kind: str  # "fuse", "fuse or breaker", "disconnect"
    rating_a: float | None
    count: int
    house: bool


@dataclass(frozen=True)
class RowDesign:
    """The figures of one design that planning needs (units in the names)."""

    family: tuple  # rows sharing a kit must agree on these (see :func:`family_key`)
    family_label: str
    system_voltage_v: int
    controller_type: str
    module_name: str
    module_pmax_w: float
    modules_series: int
    modules_parallel: int  # strings
    module_count: int
    array_power_w: float
    required_power_w: float
    battery_name: str
    battery_chemistry: str
    battery_unit_v: float
    battery_unit_ah: float
    units_series: int
    units_parallel: int
    unit_count: int
    required_wh: float  # battery energy needed at the system voltage
    nominal_wh: float
    controller_current_a: float
    controller_count: int
    inverter_w: float  # 0: no inverter
    inverter_surge_w: float
    design_energy_wh: float  # daily energy at the battery in the design month
    appliance_energy_wh: float  # daily appliance energy, design month, growth included
    peak_capacity_w: float  # inverter continuous + connected DC power (for access tiers)
    design_month: int
    warnings: tuple[str, ...]
    cautions: tuple[str, ...] = ()
    # electrical design (empty when the engine gives none): system circuits and the row's
    # own DC load circuits ("house" wiring)
    cables: tuple[Cable, ...] = ()
    devices: tuple[Protection, ...] = ()

    @property
    def string_wh(self) -> float:
        """Nominal energy of one battery string [Wh]."""
        return self.units_series * self.battery_unit_v * self.battery_unit_ah


def compact(design, pool: dict):
    """The same record with its tuples (cables, devices, warnings, cautions) shared with
    equal ones already seen in ``pool``: thousands of designs repeat them, and a large
    programme keeps every distinct design in memory."""
    if not isinstance(design, RowDesign):
        return design
    parts = {}
    for name in ("cables", "devices", "warnings", "cautions", "family"):
        value = getattr(design, name)
        parts[name] = pool.setdefault(value, value)
    return replace(design, **parts)


#: The fields of a design that many designs repeat (text and tuples), kept once each in
#: a design table.
_SHARED_FIELDS = tuple(
    f.name for f in dataclasses.fields(RowDesign) if f.type.startswith(("str", "tuple"))
)


class DesignTable:
    """Designs as plain JSON data, compact: each design one list of its fields in the
    order of ``fields``, the repeated tuples (cables, devices, warnings, cautions, family)
    once each in ``shared`` and named by their index.  Every number as it is (never
    rounded: a merge of plans chooses kits again from these and must get what the whole
    programme got).  Read back by :func:`designs_from_data`."""

    fields = tuple(f.name for f in dataclasses.fields(RowDesign))

    def __init__(self) -> None:
        self.rows: list[list] = []
        self._index: dict[RowDesign, int] = {}
        self._shared: dict[str, tuple[list, dict]] = {k: ([], {}) for k in _SHARED_FIELDS}

    def add(self, d: RowDesign) -> int:
        """The index of ``d`` in the table (equal records are kept once)."""
        i = self._index.get(d)
        if i is not None:
            return i
        row = []
        for name in self.fields:
            value = getattr(d, name)
            if name in self._shared:
                values, index = self._shared[name]
                j = index.get(value)
                if j is None:
                    j = index[value] = len(values)
                    values.append(_plain_tuple(name, value))
                value = j
            row.append(value)
        self._index[d] = len(self.rows)
        self.rows.append(row)
        return self._index[d]

    def data(self) -> dict:
        return {
            "fields": list(self.fields),
            "shared": {k: v for k, (v, _) in self._shared.items()},
            "rows": self.rows,
        }


def _plain_tuple(name: str, value: tuple | str) -> list | str:
    if name in ("cables", "devices"):
        return [list(dataclasses.astuple(x)) for x in value]
    return value if isinstance(value, str) else list(value)


def designs_from_data(data: dict) -> list[RowDesign]:
    """The designs of a :class:`DesignTable`'s data (JSON keeps ints and floats apart, so
    each record equals the one written, field for field); raises KeyError, IndexError,
    TypeError or ValueError when the data is malformed."""
    fields = list(data["fields"])
    if fields != list(DesignTable.fields):
        raise ValueError(f"the designs' fields differ from this offgrid's: {fields}")
    shared = {}
    for name in _SHARED_FIELDS:
        if name == "cables":
            shared[name] = [tuple(Cable(*c) for c in v) for v in data["shared"][name]]
        elif name == "devices":
            shared[name] = [tuple(Protection(*c) for c in v) for v in data["shared"][name]]
        else:
            shared[name] = [tuple(v) if isinstance(v, list) else v for v in data["shared"][name]]
    out = []
    for row in data["rows"]:
        values = dict(zip(fields, row, strict=True))
        for name in _SHARED_FIELDS:
            values[name] = shared[name][values[name]]
        out.append(RowDesign(**values))
    return out


@dataclass(frozen=True)
class RowFailure:
    code: str
    message: str


def family_key(project: Project, d: SystemDesign) -> tuple[tuple, str]:
    """Rows may share a kit only with the same system voltage, controller type, module,
    battery unit and string layout: their DC appliances run at that voltage and a kit is
    one bill of parts."""
    key = (
        d.battery.system_voltage_v,
        project.controller.type,
        repr(project.module),
        repr(project.battery),
        d.array.modules_series,
        d.battery.units_series,
    )
    label = (
        f"{d.battery.system_voltage_v} V {project.controller.type.upper()}, "
        f"{project.module.name}, {project.battery.name}"
    )
    return key, label


def summarise(project: Project, d: SystemDesign) -> RowDesign:
    key, label = family_key(project, d)
    lr = d.loads
    dm = d.site.design_month - 1
    growth = 1.0 + lr.growth_pct / 100.0
    appliance = (lr.ac_energy_wh[dm] + lr.dc_energy_wh[dm]) * growth
    inv_w = d.inverter.continuous_w if d.inverter.needed else 0.0
    return RowDesign(
        family=key,
        family_label=label,
        system_voltage_v=d.battery.system_voltage_v,
        controller_type=d.controller.type,
        module_name=project.module.name,
        module_pmax_w=d.array.module_power_w,
        modules_series=d.array.modules_series,
        modules_parallel=d.array.modules_parallel,
        module_count=d.array.module_count,
        array_power_w=d.array.power_w,
        required_power_w=d.array.required_power_w,
        battery_name=project.battery.name,
        battery_chemistry=project.battery.chemistry,
        battery_unit_v=project.battery.nominal_voltage_v,
        battery_unit_ah=project.battery.capacity_ah,
        units_series=d.battery.units_series,
        units_parallel=d.battery.units_parallel,
        unit_count=d.battery.unit_count,
        required_wh=d.battery.required_ah * d.battery.system_voltage_v,
        nominal_wh=d.battery.nominal_kwh * 1000.0,
        controller_current_a=d.controller.current_a,
        controller_count=d.controller.count,
        inverter_w=inv_w,
        inverter_surge_w=d.inverter.surge_w if d.inverter.needed else 0.0,
        design_energy_wh=lr.design_daily_energy_wh,
        appliance_energy_wh=float(appliance),
        peak_capacity_w=float(inv_w + lr.connected_dc_w),
        design_month=d.site.design_month,
        warnings=tuple(n.code for n in d.warnings),
        cautions=d.cautions,
        cables=_cables(d),
        devices=_devices(d),
    )


def _cables(d: SystemDesign) -> tuple[Cable, ...]:
    er = getattr(d, "electrical", None)
    if er is None:
        return ()
    return tuple(
        Cable(
            w.key,
            w.run,
            w.material,
            w.size,
            float(w.area_mm2),
            2.0 * float(w.length_m) * int(w.count),
            w.key.startswith("load"),
        )
        for w in er.wires
    )


def _devices(d: SystemDesign) -> tuple[Protection, ...]:
    er = getattr(d, "electrical", None)
    if er is None:
        return ()
    return tuple(
        Protection(
            v.location,
            v.kind,
            None if v.rating_a is None else float(v.rating_a),
            int(v.count),
            v.location.startswith("DC load"),
        )
        for v in er.protection.devices
    )


# --------------------------------------------------------------------- the shared base


@dataclass
class PlanInputs:
    """Everything resolved once per survey: the shared base project and reference caches."""

    survey: Survey
    base: Project
    base_dir: Path | None
    climate_ref: str
    load_lists: dict[str, list[Load] | str]  # ref -> loads, or the error text
    projects: dict[str, Project | str]
    tilt_searched: bool = False  # True once community_tilt has set the shared tilt
    energy_step_pct: float = DEFAULT_ENERGY_STEP_PCT

    def design_key(self, row: SurveyRow) -> tuple:
        """Rows with equal keys get one design (energy rows compared at their grid step)."""
        if row.daily_energy_wh is None or row.peak_power_w is None:
            return row.key()
        e, p = self.stepped(row)
        return (None, row.project, e, p, row.ac_dc, row.surge_w, row.overrides)

    def stepped(self, row: SurveyRow) -> tuple[float, float]:
        assert row.daily_energy_wh is not None and row.peak_power_w is not None
        e = step_up(row.daily_energy_wh, self.energy_step_pct)
        p = step_up(row.peak_power_w, self.energy_step_pct)
        return min(e, 24.0 * p), p


def communities_dir() -> Path:
    """Bundled community surveys, their parts projects and price lists."""
    return load_profiles_dir() / "communities"


def _find(ref: str, base_dir: Path | None, folder: Path, suffix: str) -> Path | None:
    """A referenced file: next to the survey, then in ``folder``, then in the bundled
    communities folder."""
    candidates = []
    p = Path(ref).expanduser()
    names = [p] if p.suffix else [p, p.with_name(p.name + suffix)]
    for q in names:
        if q.is_absolute():
            candidates.append(q)
        else:
            if base_dir is not None:
                candidates.append(base_dir / q)
            candidates.append(folder / q)
            candidates.append(communities_dir() / q)
    for c in candidates:
        if c.is_file():
            return c
    return None


def _known(folder: Path, suffix: str) -> str:
    names = sorted(p.stem for p in folder.glob(f"*{suffix}")) if folder.is_dir() else []
    return ", ".join(names) or "none"


def set_path(project: Project, path: str, value) -> None:
    """Set ``section.field`` (e.g. ``choices.derates.soiling``) on a project."""
    *parts, name = path.split(".")
    obj = project
    for part in parts:
        obj = getattr(obj, part)
    setattr(obj, name, value)


def prepare(
    survey: Survey,
    climate: str | None = None,
    project: str | None = None,
    energy_step_pct: float = DEFAULT_ENERGY_STEP_PCT,
    climate_table: MonthlyClimate | None = None,
    loaded: dict[Path, Project | ProjectFileError] | None = None,
) -> PlanInputs:
    """Resolve the shared climate, site and base project; raise SurveyError if unusable.

    ``climate_table``: a climate already read (a programme's village), used as it is.
    ``loaded``: parts projects already read (path -> project or its error), shared by a
    programme's villages so each file is read once; each survey gets its own copy.
    """
    fatal: list[SurveyProblem] = []
    lines = survey.setting_lines
    base_dir = survey.base_dir
    base = Project()
    project_ref = project or survey.project
    if project_ref:
        path = _find(project_ref, base_dir, load_profiles_dir(), ".toml")
        if path is None:
            fatal.append(
                SurveyProblem(
                    lines.get("project", 0),
                    "",
                    "project",
                    f"project file '{project_ref}' not found next to the "
                    "survey or in load_profiles/",
                )
            )
        else:
            got = _load_base(path, loaded)
            if isinstance(got, ProjectFileError):
                fatal.append(SurveyProblem(lines.get("project", 0), "", "project", str(got)))
            else:
                base = got
    base.loads = []
    base.info = ProjectInfo(name=survey.name, demo=survey.demo)
    climate_ref = climate or survey.climate or base.climate.ref
    if climate_table is not None:
        base.climate = ClimateChoice(inline=climate_table)
        climate_ref = climate or climate_table.source or "village climate"
    elif not climate_ref and base.climate.inline is None:
        fatal.append(
            SurveyProblem(
                0,
                "",
                "climate",
                "no climate: add a settings row "
                "'climate,NAME' (a bundled climate or a file) or give "
                "--climate",
            )
        )
    elif climate_ref:
        try:
            base.climate = ClimateChoice(inline=load_climate(climate_ref, base_dir))
        except ClimateFileError as exc:
            fatal.append(SurveyProblem(lines.get("climate", 0), "", "climate", str(exc)))
    set_here = {k for k, _ in survey.settings}
    for key, value in survey.settings:
        set_path(base, key, value)
    # The shared site is where the climate is, unless settings rows say otherwise.
    c = base.climate.inline
    if "site.latitude_deg" not in set_here:
        if c is None or c.latitude_deg is None:
            fatal.append(
                SurveyProblem(
                    0,
                    "",
                    "site.latitude_deg",
                    "the climate has no latitude: add a settings row 'site.latitude_deg,VALUE'",
                )
            )
        else:
            base.site.latitude_deg = c.latitude_deg
            if "site.longitude_deg" not in set_here:
                base.site.longitude_deg = c.longitude_deg or 0.0
            if "site.elevation_m" not in set_here:
                base.site.elevation_m = c.elevation_m or 0.0
    if not base.site.name:
        base.site.name = survey.name
    if c is not None and c.to_type_text():  # placeholders, not data: no row is designed
        fatal.append(
            SurveyProblem(
                lines.get("project", 0),
                "",
                "climate.months_to_type",
                f"the project's own climate has months still to type: {c.to_type_text()}; "
                "type them (Place section, or the file's [climate.monthly] table, then "
                "remove them from [climate.months_to_type]) or give a climate row",
            )
        )
    if not fatal:
        for p in validate_project(base):
            fatal.append(SurveyProblem(lines.get(p.path, 0), "", p.path, p.message))
    if fatal:
        raise SurveyError(fatal, survey.source)
    if not 0.0 <= energy_step_pct <= 10.0:
        raise SurveyError(
            [
                SurveyProblem(
                    0,
                    "",
                    "energy step",
                    f"{energy_step_pct:g} % must be 0 (design every figure as given) to 10 %",
                )
            ],
            survey.source,
        )
    return PlanInputs(
        survey, base, base_dir, climate_ref or "", {}, {}, energy_step_pct=energy_step_pct
    )


def _load_base(
    path: Path, loaded: dict[Path, Project | ProjectFileError] | None
) -> Project | ProjectFileError:
    """The parts project at ``path``: read once into ``loaded``, a fresh copy each call."""
    if loaded is None:
        try:
            return load_project(path)
        except ProjectFileError as exc:
            return exc
    if path not in loaded:
        try:
            loaded[path] = load_project(path)
        except ProjectFileError as exc:
            loaded[path] = exc
    got = loaded[path]
    return got if isinstance(got, ProjectFileError) else copy.deepcopy(got)


def _load_list(inputs: PlanInputs, ref: str) -> list[Load] | str:
    if ref not in inputs.load_lists:
        folder = load_profiles_dir()
        path = _find(ref, inputs.base_dir, folder, ".csv")
        if path is None:
            inputs.load_lists[ref] = (
                f"load list '{ref}' not found next to the survey or in "
                f"load_profiles/ (bundled: {_known(folder, '.csv')})"
            )
        else:
            try:
                inputs.load_lists[ref] = load_loads_csv(path)
            except LoadListError as exc:
                first = "; ".join(str(p) for p in exc.problems[:3])
                inputs.load_lists[ref] = f"load list '{ref}' has problems: {first}"
    return inputs.load_lists[ref]


def _row_base(inputs: PlanInputs, ref: str) -> Project | str:
    if ref not in inputs.projects:
        path = _find(ref, inputs.base_dir, load_profiles_dir(), ".toml")
        if path is None:
            inputs.projects[ref] = (
                f"project file '{ref}' not found next to the survey or in load_profiles/"
            )
        else:
            try:
                inputs.projects[ref] = load_project(path)
            except ProjectFileError as exc:
                inputs.projects[ref] = str(exc).replace("\n", " ")
    return inputs.projects[ref]


def row_project(inputs: PlanInputs, row: SurveyRow, shared: bool = False) -> Project:
    """The full single-system project of one row; raises ValueError naming the problem.

    ``shared``: for designing only (the engine never changes its project), a row without
    overrides shares the base's part tables instead of copying them; only ``choices``
    is copied (an energy row sets its coincidence factor).
    """
    base = inputs.base
    share = shared and not row.overrides
    copy_ = (lambda obj: obj) if share else _copy
    p = Project(
        info=ProjectInfo(name=f"{inputs.survey.name}: {row.name}", demo=inputs.survey.demo),
        site=copy_(base.site),
        climate=base.climate,
    )
    for name in PART_SECTIONS:
        setattr(p, name, copy_(getattr(base, name)))
    own_loads: list[Load] = []
    if row.project:
        rp = _row_base(inputs, row.project)
        if isinstance(rp, str):
            raise ValueError(f"project: {rp}")
        for name in PART_SECTIONS:
            setattr(p, name, copy_(getattr(rp, name)))
        own_loads = rp.loads
    if share:
        p.choices = replace(p.choices)
    if row.load_list:
        loads = _load_list(inputs, row.load_list)
        if isinstance(loads, str):
            raise ValueError(f"load_list: {loads}")
        p.loads = [replace(ld) for ld in loads]
    elif row.daily_energy_wh is not None and row.peak_power_w is not None:
        energy, peak = inputs.stepped(row)
        p.loads = [
            Load(
                name=SURVEYED_LOAD_NAME,
                quantity=1,
                power_w=peak,
                hours_per_day=energy / peak,
                ac_dc=row.ac_dc,  # type: ignore[arg-type]
                surge_w=row.surge_w,
            )
        ]
        # The surveyed peak is already the power on at once: no coincidence factor.
        p.choices.coincidence_factor = 1.0
    else:
        if not own_loads:
            raise ValueError(
                f"project: '{row.project}' has no loads; add a load_list or "
                "daily_energy_wh with peak_power_w"
            )
        p.loads = [replace(ld) for ld in own_loads]
    for path, value in row.overrides:
        set_path(p, path, value)
    # The shared base, project files, load lists and surveyed figures were checked when
    # read; only a row's own override values can still be out of range.
    if row.overrides:
        problems = validate_project(p)
        if problems:
            raise ValueError("; ".join(str(q) for q in problems[:3]))
    return p


def _copy(obj):
    """Copy of a project table: dataclasses, lists and dicts copied, values shared (much
    quicker than copy.deepcopy for thousands of rows)."""
    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        return replace(
            obj,
            **{
                f.name: _copy(getattr(obj, f.name))
                for f in dataclasses.fields(obj)
                if isinstance(getattr(obj, f.name), list | dict)
                or dataclasses.is_dataclass(getattr(obj, f.name))
            },
        )
    if isinstance(obj, list):
        return [_copy(v) for v in obj]
    if isinstance(obj, dict):
        return {k: _copy(v) for k, v in obj.items()}
    return obj


# --------------------------------------------------------------------- designing


def _design_one(project: Project, base_dir: Path | None) -> RowDesign | RowFailure:
    from offgrid.design.sizing import design

    try:
        with plain_reasons():  # a row keeps no reasons (see RowDesign)
            d = design(project, base_dir)
        return summarise(project, d)
    except DesignError as exc:
        return RowFailure(exc.code, str(exc))


@dataclass(frozen=True)
class RowRejected:
    """A row that could not become a project (bad reference or override value)."""

    field: str
    message: str


def _build_and_design(inputs: PlanInputs, row: SurveyRow) -> RowDesign | RowFailure | RowRejected:
    try:
        project = row_project(inputs, row, shared=True)
    except ValueError as exc:
        field, _, message = str(exc).partition(": ")
        return RowRejected(field, message) if message else RowRejected("row", str(exc))
    return _design_one(project, inputs.base_dir)


_WORKER_INPUTS: PlanInputs | None = None


#: A worker's results share their equal tuples (cables, devices, cautions ...) before they
#: are sent: a batch then pickles each once (measured: 400 designs 911 -> 134 kB, sent
#: 15 x quicker).  Bounded like the memo.
_SENT: dict = {}


def sent_compact(result):
    """:func:`compact` a worker's result against what it sent before."""
    if len(_SENT) > 20_000:
        _SENT.clear()
    return compact(result, _SENT)


def keep_memo() -> None:
    """Worker initializer: the design memo stays on for the worker's life, so batch after
    batch reuses what earlier batches computed (the memo bounds its own size)."""
    design_memo().__enter__()


def _init_worker(inputs: PlanInputs) -> None:
    global _WORKER_INPUTS
    _WORKER_INPUTS = inputs
    keep_memo()


def _worker_batch(
    batch: list[tuple[int, SurveyRow]],
) -> list[tuple[int, RowDesign | RowFailure | RowRejected]]:
    assert _WORKER_INPUTS is not None
    with design_memo():
        return [(i, sent_compact(_build_and_design(_WORKER_INPUTS, row))) for i, row in batch]


def _pool_context():
    """fork, when it is safe; None otherwise (then rows are designed in this process).

    fork is unsafe once threads run (the text UI plans in a worker thread), and spawn
    would re-run the program's main module in each worker.
    """
    if "fork" in multiprocessing.get_all_start_methods() and threading.active_count() == 1:
        return multiprocessing.get_context("fork")
    return None


def default_jobs() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # not on Linux
        return max(1, os.cpu_count() or 1)


def _design_unique(
    inputs: PlanInputs, rows: list[SurveyRow], jobs: int
) -> list[RowDesign | RowFailure | RowRejected]:
    """Build and design each row; in ``jobs`` worker processes when there are many."""
    context = _pool_context() if jobs > 1 and len(rows) >= PARALLEL_MIN_DESIGNS else None
    if context is None:
        seen: dict = {}
        with design_memo():
            return [compact(_build_and_design(inputs, r), seen) for r in rows]
    # the workers need the shared base and references, not the whole survey
    light = copy.copy(inputs.survey)
    light.rows, light.problems = [], []
    shared = replace(inputs, survey=light, load_lists={}, projects={})
    indexed = list(enumerate(rows))
    size = max(50, len(indexed) // (jobs * 4))
    batches = [indexed[i : i + size] for i in range(0, len(indexed), size)]
    out: list = [None] * len(rows)
    # Objects made before the fork are frozen out of the garbage collector, so the
    # workers' collections do not touch (and so copy) every page they inherit.
    gc.freeze()
    seen = {}
    try:
        with ProcessPoolExecutor(
            max_workers=jobs, mp_context=context, initializer=_init_worker, initargs=(shared,)
        ) as pool:
            for result in pool.map(_worker_batch, batches):
                for i, r in result:
                    out[i] = compact(r, seen)
    finally:
        gc.unfreeze()
    return out


@dataclass(frozen=True)
class DesignedRows:
    rows: tuple[SurveyRow, ...]  # the rows that built a project (count 0 rows included)
    designs: tuple[RowDesign | RowFailure, ...]  # one per row
    problems: tuple[SurveyProblem, ...]  # rows that could not become a project
    distinct: int  # designs actually computed


def community_tilt(inputs: PlanInputs) -> float | None:
    """Search the community's one tilt and set it on the shared site.

    Standard kits share one mounting frame, so the whole community is designed at one
    tilt: the engine's own search (:func:`offgrid.design.sizing.site_geometry`) run once for the
    survey's total appliance demand by month (each row's loads x its count).  Rows that
    set ``site.tilt_deg`` keep theirs.  Returns the tilt, or None when the site already
    has one or no row can be read.
    """
    total = community_demand(inputs)
    return None if total is None else set_community_tilt(inputs, total)


def community_demand(inputs: PlanInputs) -> np.ndarray | None:
    """The survey's total appliance demand by month (Wh/day, 12 values) that
    :func:`community_tilt` searches the tilt for; None when there is no search to run
    (the site has a tilt, it was searched already, or no row can be read)."""
    from offgrid.design.loads import appliance_energy_wh

    if inputs.base.site.tilt_deg is not None or inputs.tilt_searched:
        return None
    total = np.zeros(12)
    monthly: dict[tuple, np.ndarray | None] = {}  # one load list's months, once per list
    for row in inputs.survey.rows:
        if row.count <= 0:
            continue
        if row.daily_energy_wh is not None:
            total += row.daily_energy_wh * row.count
            continue
        ref = (row.load_list, row.project)
        if ref not in monthly:
            loads = _load_list(inputs, row.load_list) if row.load_list else None
            if loads is None and row.project:
                rp = _row_base(inputs, row.project)
                loads = rp.loads if isinstance(rp, Project) else None
            ok = isinstance(loads, list) and loads
            monthly[ref] = appliance_energy_wh(loads).sum(axis=0) if ok else None
        if monthly[ref] is not None:
            total += monthly[ref] * row.count
    return total if total.any() else None


def set_community_tilt(inputs: PlanInputs, total: np.ndarray) -> float:
    """Search the tilt for the monthly demand ``total`` (:func:`community_demand`) and set
    it on the shared site; the part of :func:`community_tilt` a programme runs in its
    worker processes."""
    from offgrid.design.result import ReasonBook
    from offgrid.design.sizing import site_geometry

    base = inputs.base
    assert base.climate.inline is not None
    tilt, _, _ = site_geometry(base, base.climate.inline, ReasonBook(), demand_wh_day=total)
    base.site.tilt_deg = float(tilt)
    inputs.tilt_searched = True
    return float(tilt)


def distinct_rows(inputs: PlanInputs) -> tuple[list[SurveyRow], list[int]]:
    """The survey's rows with one design each (same :meth:`PlanInputs.design_key`), and for
    every row the index of its distinct row."""
    keyed: dict[tuple, int] = {}
    unique: list[SurveyRow] = []
    index_of: list[int] = []
    for row in inputs.survey.rows:
        k = inputs.design_key(row)
        if k not in keyed:
            keyed[k] = len(unique)
            unique.append(row)
        index_of.append(keyed[k])
    return unique, index_of


def design_rows(inputs: PlanInputs, jobs: int = 1) -> DesignedRows:
    """Build and design every row; identical rows are designed once.

    The community's tilt is searched once first (:func:`community_tilt`).
    """
    community_tilt(inputs)
    unique, index_of = distinct_rows(inputs)
    results = _design_unique(inputs, unique, jobs)
    problems: list[SurveyProblem] = []
    kept: list[SurveyRow] = []
    designs: list[RowDesign | RowFailure] = []
    for row, i in zip(inputs.survey.rows, index_of, strict=True):
        r = results[i]
        if isinstance(r, RowRejected):
            problems.append(SurveyProblem(row.line, row.id, r.field, r.message))
        else:
            kept.append(row)
            designs.append(r)
    distinct = sum(1 for r in results if not isinstance(r, RowRejected))
    return DesignedRows(tuple(kept), tuple(designs), tuple(problems), distinct)
