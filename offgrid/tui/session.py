"""One open project in the text UI: the document, its file, its design, undo.

No Textual here, so the whole editing model is testable without a terminal.
Every change goes through :meth:`Session.change`, which validates the project
after the change and rolls it back (last valid value kept) if the change
introduced a problem.  The design is recomputed by :meth:`Session.recompute`.
"""

from __future__ import annotations

import copy
import pickle
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from offgrid.climate.model import ROWS_TO_TYPE, to_type_text
from offgrid.design.result import DesignError, SystemDesign
from offgrid.project.atomic import (
    Fingerprint,
    clean_stray_temp_files,
    fingerprint,
)
from offgrid.project.model import ClimateChoice, Load, Project, ProjectInfo, Site
from offgrid.project.store import dumps_project, load_project, save_project
from offgrid.project.validate import Problem, validate_project

UNDO_DEPTH = 200

#: The placeholder each month of a climate row a design needs (the keys of
#: ``ROWS_TO_TYPE``) holds until it is typed (the saved climate needs twelve numbers).
#: The months still to type are the climate's own (``MonthlyClimate.months_to_type``),
#: so saving, reopening, recovery and undo keep them with the values.
PLACEHOLDERS = {"insolation_kwh_m2_day": 0.0, "temp_mean_c": 20.0}
assert PLACEHOLDERS.keys() == ROWS_TO_TYPE.keys()


class EditRejected(ValueError):
    """An edit that would make the project invalid; ``problems`` say why."""

    def __init__(self, problems: list[Problem]) -> None:
        self.problems = problems
        super().__init__("; ".join(p.message for p in problems))


@dataclass
class Outcome:
    """What the last recompute gave: a design, or the reason there is none."""

    design: SystemDesign | None = None
    error: str | None = None
    error_field: str | None = None
    error_code: str | None = None
    seconds: float = 0.0


_memo_held: list = []  # the engine memo's open block while a text UI runs


def compute_outcome(project: Project, base_dir: Path) -> Outcome:
    """The design of ``project`` or the reason there is none; never raises.

    Pure (reads only ``project`` and the climate files): safe on a worker thread when
    ``project`` is a copy nobody else changes. The engine's memo of the steps that do
    not depend on the demand (offgrid.memo: transposition, module fit, I-V harvest,
    keyed by their exact inputs) is held open for the life of the process, so an edit
    of the loads or the battery does not redo the site's sky and the module's curves
    (the demo: about 22 ms to 4 ms a design). It is held open from the first design
    until :func:`release_engine_memo` (the app calls it when it ends).
    """
    from offgrid.design.sizing import design  # the engine; imported here to keep start-up light
    from offgrid.memo import design_memo

    if not _memo_held:  # kept referenced (a dropped generator would end the block);
        block = design_memo()  # entries are bounded by memo.MAX_ENTRIES
        block.__enter__()
        _memo_held.append(block)
    t0 = time.perf_counter()
    out = Outcome()
    try:
        out.design = design(project, base_dir)
    except DesignError as exc:
        out.error, out.error_field, out.error_code = str(exc), exc.field, exc.code
    except Exception as exc:  # an engine fault must not take the editor down
        out.error = f"the design engine failed: {type(exc).__name__}: {exc}"
        out.error_code = "engine-fault"
    out.seconds = time.perf_counter() - t0
    return out


def release_engine_memo() -> None:
    """End the engine memo held by :func:`compute_outcome` (its entries are dropped)."""
    while _memo_held:
        _memo_held.pop().__exit__(None, None, None)


def snapshot(project: Project) -> Project:
    """A copy of ``project`` for the undo stack: through pickle (the project is plain data),
    a third of ``copy.deepcopy``'s time (0.2 against 0.7 ms for the demo), every edit."""
    try:
        return pickle.loads(pickle.dumps(project, pickle.HIGHEST_PROTOCOL))
    except (pickle.PicklingError, TypeError, AttributeError):
        return copy.deepcopy(project)


def get_path(obj: Any, path: str) -> Any:
    """Value at a dotted path such as ``site.latitude_deg`` or ``loads[2].power_w``."""
    for part in path.split("."):
        name, _, index = part.partition("[")
        obj = getattr(obj, name) if name else obj
        if index:
            obj = obj[int(index.rstrip("]")) - 1]
    return obj


def set_path(obj: Any, path: str, value: Any) -> None:
    head, _, last = path.rpartition(".")
    target = get_path(obj, head) if head else obj
    setattr(target, last, value)


@dataclass
class Session:
    """The open project and everything the UI needs to know about it."""

    project: Project
    path: Path | None = None  # None: not saved yet (new, demo or scenario)
    origin: str = "file"  # file, demo, blank, scenario, recovered
    baseline: str = ""  # saved text at the last open/save; dirty when the text differs
    disk: Fingerprint | None = None  # the file as last read or written (None: no file)
    outcome: Outcome = field(default_factory=Outcome)
    undo_stack: list[Project] = field(default_factory=list)
    redo_stack: list[Project] = field(default_factory=list)
    listeners: list[Callable[[], None]] = field(default_factory=list)
    # What opening an older file's schema could not carry over (shown once on opening).
    notes: list[str] = field(default_factory=list)

    # ------------------------------------------------------------------ creation
    @classmethod
    def open(cls, path: str | Path) -> Session:
        """Open a project file; raises ProjectFileError (nothing is opened) if it is unusable."""
        p = Path(path).expanduser().resolve()
        seen = fingerprint(p)  # before reading: a change after this counts as a change
        notes: list[str] = []
        project = load_project(p, notes=notes)
        clean_stray_temp_files(p)  # what an interrupted save of this project left
        s = cls(project=project, path=p, origin="file", disk=seen, notes=notes)
        s.baseline = s.text()
        return s

    @classmethod
    def unsaved(cls, project: Project, origin: str, baseline: str | None = None) -> Session:
        """A project not tied to a file yet: it counts as unsaved until saved."""
        s = cls(project=project, path=None, origin=origin)
        s.baseline = "" if baseline is None else baseline
        return s

    # ------------------------------------------------------------------ state
    @property
    def base_dir(self) -> Path:
        return self.path.parent if self.path else Path.cwd()

    def text(self) -> str:
        """The project as it would be saved."""
        return dumps_project(self.project)

    @property
    def dirty(self) -> bool:
        return self.text() != self.baseline

    @property
    def design(self) -> SystemDesign | None:
        return self.outcome.design

    @property
    def title(self) -> str:
        return self.project.info.name or "Untitled project"

    # ------------------------------------------------------------------ own months
    def months_to_type(self) -> dict[str, tuple[int, ...]]:
        """The own climate's months still to type, by row (empty: none)."""
        climate = self.project.climate.inline
        if climate is None:
            return {}
        return {k: m for k, m in climate.still_to_type().items() if k in ROWS_TO_TYPE}

    def untyped_outcome(self) -> Outcome | None:
        """No design while months are still to type (placeholders are not data)."""
        left = self.months_to_type()
        if not left:
            return None
        what = to_type_text(left)
        return Outcome(
            error=f"months still to type: {what}. Type them in the climate table (Place); "
            "the design waits for them.",
            error_field="climate",
            error_code="climate-months-untyped",
        )

    # ------------------------------------------------------------------ design
    def recompute(self) -> Outcome:
        """Run the engine on the current project here and now; never raises."""
        self.outcome = self.untyped_outcome() or compute_outcome(self.project, self.base_dir)
        return self.outcome

    # ------------------------------------------------------------------ editing
    def change(self, mutate: Callable[[Project], None], focus: str | None = None) -> None:
        """Apply ``mutate`` to the project; keep it only if the project stays valid.

        ``focus`` is the dotted path being edited: a problem there rejects the
        edit even if it existed before.  Raises :class:`EditRejected`.
        """
        before = snapshot(self.project)
        old = {p.path for p in validate_project(self.project)}
        try:
            mutate(self.project)
        except (ValueError, TypeError, IndexError) as exc:
            self.project = before
            raise EditRejected([Problem(focus or "value", str(exc))]) from exc
        new = [
            p
            for p in validate_project(self.project)
            if p.path not in old or (focus is not None and p.path == focus)
        ]
        if new:
            self.project = before
            raise EditRejected(new)
        self.undo_stack.append(before)
        del self.undo_stack[:-UNDO_DEPTH]
        self.redo_stack.clear()

    def set_value(self, path: str, value: Any) -> None:
        """Set one field; raises :class:`EditRejected` and keeps the old value on a problem."""
        self.change(lambda p: set_path(p, path, value), focus=path)

    def undo(self) -> bool:
        if not self.undo_stack:
            return False
        self.redo_stack.append(self.project)
        self.project = self.undo_stack.pop()
        return True

    def redo(self) -> bool:
        if not self.redo_stack:
            return False
        self.undo_stack.append(self.project)
        self.project = self.redo_stack.pop()
        return True

    # ------------------------------------------------------------------ loads
    def add_load(self, index: int | None = None, load: Load | None = None) -> int:
        """Insert a load (a plain new one by default) after ``index``; returns its position."""
        new = load or Load(name="New appliance", quantity=1, power_w=10.0, hours_per_day=1.0)
        at = len(self.project.loads) if index is None else index + 1
        self.change(lambda p: p.loads.insert(at, new))
        return at

    def duplicate_load(self, index: int) -> int:
        twin = copy.deepcopy(self.project.loads[index])
        return self.add_load(index, twin)

    def delete_load(self, index: int) -> None:
        self.change(lambda p: p.loads.pop(index))

    def move_load(self, index: int, step: int) -> int:
        to = index + step
        if not 0 <= to < len(self.project.loads):
            return index

        def swap(p: Project) -> None:
            p.loads[index], p.loads[to] = p.loads[to], p.loads[index]

        self.change(swap)
        return to

    def replace_loads(self, loads: list[Load], append: bool) -> None:
        def put(p: Project) -> None:
            p.loads = [*p.loads, *loads] if append else list(loads)

        self.change(put)

    # ------------------------------------------------------------------ files
    def problems_blocking_save(self) -> list[Problem]:
        """Problems that would make the saved file unreadable (e.g. no climate chosen)."""
        return validate_project(self.project)

    def save(self, path: str | Path | None = None, overwrite: bool = False) -> Path:
        """Save atomically (with NAME.toml.bak); the session then points at that file.

        Saving to the session's own file raises :class:`ChangedOnDisk` (nothing written)
        if another program or window changed it since it was opened or last saved,
        unless ``overwrite``; its version is then kept as the ``.bak``."""
        target = Path(path).expanduser() if path else self.path
        if target is None:
            raise ValueError("this project has no file yet: use save as")
        if target.suffix == "":
            target = target.with_suffix(".toml")
        problems = self.problems_blocking_save()
        if problems:
            raise EditRejected(problems)
        target = target.resolve()
        own = self.path is not None and target == self.path
        check = own and not overwrite and target.exists()  # a removed file: just write it
        self.disk = save_project(self.project, target, expect=self.disk if check else False)
        self.path = target
        self.origin = "file"
        self.baseline = self.text()
        return target

    def revert(self) -> None:
        """Back to the saved file (or to the starting state of an unsaved project)."""
        if self.path is not None and self.path.exists():
            seen = fingerprint(self.path)
            fresh = load_project(self.path)
            self.undo_stack.append(self.project)
            self.project = fresh
            self.disk = seen
            self.baseline = self.text()
        elif self.baseline:
            from offgrid.project.store import loads_project

            self.undo_stack.append(self.project)
            self.project = loads_project(self.baseline, "starting state")


def blank_project() -> Project:
    """A new empty project: the user picks a climate and adds loads."""
    return Project(
        info=ProjectInfo(name="New project"), site=Site(name=""), climate=ClimateChoice()
    )


def demo_session() -> Session:
    """The bundled demonstration project, unsaved (the bundled file is never written)."""
    from offgrid.paths import demo_project_path

    project = load_project(demo_project_path())
    s = Session.unsaved(project, origin="demo")
    s.baseline = s.text()  # unchanged demo: nothing to lose yet
    return s


def scenario_session(csv_path: Path, climate_ref: str = "kisanga-ridge-demo") -> Session:
    """A new project from one of the bundled demo load lists, on a bundled climate."""
    from offgrid.climate.files import load_climate
    from offgrid.project.loads_csv import load_loads_csv

    loads = load_loads_csv(csv_path)
    climate = load_climate(climate_ref)
    title = csv_path.stem.replace("-", " ").capitalize()
    project = Project(
        info=ProjectInfo(
            name=f"{title} (demo)",
            demo=True,
            notes="Demonstration data: invented scenario, not a survey.",
        ),
        site=Site(
            name=f"{title} site (demo)",
            latitude_deg=climate.latitude_deg or 0.0,
            longitude_deg=climate.longitude_deg or 0.0,
            elevation_m=climate.elevation_m or 0.0,
        ),
        climate=ClimateChoice(ref=climate_ref),
        loads=loads,
    )
    s = Session.unsaved(project, origin="scenario")
    s.baseline = s.text()
    return s


def recovered_session(text: str, project_path: str | None, baseline: str) -> Session:
    """The project exactly as it was on screen when the earlier run ended."""
    import tomllib

    from offgrid.project.store import project_from_dict

    project, _problems = project_from_dict(tomllib.loads(text), "recovery")
    # problems can only be the ones the UI allows while editing (e.g. no climate yet)
    path = Path(project_path) if project_path else None
    s = Session(project=project, path=path, origin="recovered")
    s.baseline = baseline if path is None else ""
    if path is not None and path.is_file():
        s.disk = fingerprint(path)  # the check before saving compares with the file now
        try:
            s.baseline = dumps_project(load_project(path))
        except ValueError:
            s.baseline = ""
    return s
