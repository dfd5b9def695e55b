"""The community survey CSV: shared settings, then one row per household or facility.

Layout (documented for users in ``docs/community-format.md``)::

    # comment lines start with '#'
    community,Kisanga Ridge            <- settings: key,value rows before the header
    climate,kisanga-ridge-demo
    choices.autonomy_days,3            <- any project field as section.field
    id,name,kind,count,load_list,daily_energy_wh,peak_power_w,...   <- header: first cell "id"
    H-001,Basic home,household,40,household-basic,,,
    H-101,Surveyed home,household,1,,180,45

Reading never stops at a bad row: each problem is recorded with its CSV line and
the row is left out; :class:`SurveyError` is raised only when the settings or the
header make the whole file unusable.
"""

from __future__ import annotations

import csv
import dataclasses
import io
import sys
import types
import typing
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Literal, get_args, get_origin, get_type_hints

from offgrid.numbers import NumberError, read_number
from offgrid.project.model import Project

#: Row columns with a fixed meaning; any other column must be a project field path.
ROW_COLUMNS = (
    "id",
    "name",
    "kind",
    "count",
    "load_list",
    "project",
    "daily_energy_wh",
    "peak_power_w",
    "ac_dc",
    "surge_w",
    "kit",
)
REQUIRED_COLUMNS = ("id", "count")
#: Settings keys with a fixed meaning; others must be project field paths.
SETTING_KEYS = ("community", "demo", "climate", "project", "prices")
KIT_CHOICES = ("auto", "yes", "no")


def _sections() -> dict[str, type]:
    """Every table of a project a setting or a row column may set, as ``section.field``:
    the dataclass fields of :class:`Project` (and their nested tables), except the
    document's own info, climate and loads."""
    out: dict[str, type] = {}

    def walk(prefix: str, cls: type) -> None:
        out[prefix] = cls
        for name, tp in get_type_hints(cls).items():
            if dataclasses.is_dataclass(tp):
                walk(f"{prefix}.{name}", tp)

    for name, tp in get_type_hints(Project).items():
        if dataclasses.is_dataclass(tp) and name not in ("info", "climate"):
            walk(name, tp)
    return out


#: Sections of a project a setting or a row column may set, as ``section.field``.
SECTIONS: dict[str, type] = _sections()
#: Sections taken whole from a row's own project file (everything but where and what).
PART_SECTIONS: tuple[str, ...] = tuple(k for k in SECTIONS if "." not in k and k != "site")
#: Fields a survey may not set per row (they belong to the shared site).
SHARED_ONLY = ("site.latitude_deg", "site.longitude_deg", "site.elevation_m")
_YES = {"yes", "y", "true", "1"}
_NO = {"no", "n", "false", "0"}


@dataclass(frozen=True)
class SurveyProblem:
    """One problem with the survey; ``line`` is the 1-based CSV line (0: the whole file)."""

    line: int
    row_id: str
    field: str
    message: str

    def __str__(self) -> str:
        where = f"line {self.line}" if self.line else "survey"
        who = f" (id {self.row_id})" if self.row_id else ""
        return f"{where}{who}, {self.field}: {self.message}"


class SurveyError(ValueError):
    """The survey cannot be planned at all (bad settings or header)."""

    def __init__(self, problems: list[SurveyProblem], source: str = "survey") -> None:
        self.problems = problems
        text = "\n".join(f"  {p}" for p in problems)
        super().__init__(f"{source}: cannot plan ({len(problems)} problem(s))\n{text}")


@dataclass(frozen=True, slots=True)  # a million rows: no per-row __dict__
class SurveyRow:
    """One household or facility as typed (values checked, references not yet resolved)."""

    line: int
    id: str
    name: str
    kind: str
    count: int
    load_list: str | None = None
    project: str | None = None
    daily_energy_wh: float | None = None
    peak_power_w: float | None = None
    ac_dc: str = "dc"
    surge_w: float = 0.0
    kit: str = "auto"  # auto: the standardisation decides; yes: must get a kit; no: own system
    overrides: tuple[tuple[str, Any], ...] = ()  # (section.field, converted value)

    @property
    def demand_source(self) -> str:
        if self.daily_energy_wh is not None:
            return "energy"
        if self.load_list is not None:
            return "load list"
        return "project"

    def key(self) -> tuple:
        """Identical keys give identical designs (within one survey)."""
        return (
            self.load_list,
            self.project,
            self.daily_energy_wh,
            self.peak_power_w,
            self.ac_dc,
            self.surge_w,
            self.overrides,
        )


@dataclass
class Survey:
    source: str
    base_dir: Path | None
    name: str = "Community"
    demo: bool = False
    climate: str | None = None
    project: str | None = None
    prices: str | None = None
    settings: tuple[tuple[str, Any], ...] = ()  # shared section.field values
    setting_lines: dict[str, int] = field(default_factory=dict)
    rows: list[SurveyRow] = field(default_factory=list)
    problems: list[SurveyProblem] = field(default_factory=list)
    rows_read: int = 0


# --------------------------------------------------------------------- field conversion


def field_type(path: str) -> Any:
    """Type hint of a ``section.field`` path, or raise ValueError naming the known fields."""
    section, _, name = path.rpartition(".")
    cls = SECTIONS.get(section)
    if cls is None:
        raise ValueError(
            f"'{path}' is not a known column: use one of {', '.join(ROW_COLUMNS)} "
            f"or a project field such as choices.autonomy_days (sections: "
            f"{', '.join(SECTIONS)})"
        )
    hints = get_type_hints(cls)
    if name not in hints or dataclasses.is_dataclass(hints[name]):
        known = ", ".join(
            f"{section}.{f.name}"
            for f in dataclasses.fields(cls)
            if not dataclasses.is_dataclass(hints[f.name])
        )
        raise ValueError(f"'{path}' is not a field of [{section}]; known: {known}")
    return hints[name]


def convert_value(tp: Any, text: str) -> Any:
    """Convert cell text to the field's type; raise ValueError with the fix."""
    origin, args = get_origin(tp), get_args(tp)
    if origin in (typing.Union, types.UnionType):
        literal_values = [v for a in args if get_origin(a) is Literal for v in get_args(a)]
        for v in literal_values:
            if text.lower() == str(v).lower():
                return v
        others = [a for a in args if a is not type(None) and get_origin(a) is not Literal]
        if type(None) in args and text.lower() in ("auto", "none"):
            return None
        if len(others) == 1:
            try:
                return convert_value(others[0], text)
            except ValueError:
                if literal_values:
                    raise ValueError(
                        f"'{text}' must be a number or one of {', '.join(map(str, literal_values))}"
                    ) from None
                raise
        raise ValueError(f"'{text}' is not allowed")
    if origin is Literal:
        for v in args:
            if text.lower() == str(v).lower():
                return v
        raise ValueError(f"'{text}' must be one of {', '.join(map(str, args))}")
    if tp is bool:
        low = text.lower()
        if low in _YES:
            return True
        if low in _NO:
            return False
        raise ValueError(f"'{text}' must be yes or no")
    if tp is float:
        return read_number(text)
    if tp is int:
        value = convert_value(float, text)
        if value != int(value):
            raise ValueError(f"'{text}' must be a whole number")
        return int(value)
    if tp is str:
        return text
    raise ValueError(f"this field cannot be set from a survey cell ('{text}')")


# --------------------------------------------------------------------- reading


def _is_blank(cells: list[str]) -> bool:
    return all(not c.strip() for c in cells)


#: The most rows read from one survey (identical households share a row with a count).
MAX_ROWS = 10_000


def read_survey(text: str, source: str = "survey", base_dir: Path | None = None) -> Survey:
    """Parse community CSV text.  Bad rows are recorded in ``Survey.problems`` and left out.

    Raises :class:`SurveyError` if the settings or the header are unusable.
    """
    survey = Survey(source=source, base_dir=base_dir)
    fatal: list[SurveyProblem] = []
    reader = csv.reader(io.StringIO(text.lstrip("\ufeff")), skipinitialspace=True)
    header: list[str] | None = None
    header_line = 0
    settings: list[tuple[str, Any]] = []
    seen_ids: dict[str, int] = {}
    last = 0
    for cells in reader:
        line, last = last + 1, reader.line_num  # a quoted cell may span lines
        if not cells or _is_blank(cells) or cells[0].strip().startswith("#"):
            continue
        if header is None:
            first = cells[0].strip().lower()
            if first == "id":
                header = [c.strip().lower() for c in cells]
                header_line = line
                fatal.extend(_check_header(header, line))
                continue
            _read_setting(cells, line, survey, settings, fatal)
            continue
        if fatal:
            break
        if survey.rows_read >= MAX_ROWS:
            raise SurveyError(
                [
                    SurveyProblem(
                        line,
                        "",
                        "rows",
                        f"more than {MAX_ROWS:,} rows: "
                        "give identical households one row with a count, "
                        "or split the survey by area",
                    )
                ],
                source,
            )
        survey.rows_read += 1
        row = _read_row(header, cells, line, survey.problems, seen_ids)
        if row is not None:
            survey.rows.append(row)
    if header is None:
        fatal.append(
            SurveyProblem(
                0,
                "",
                "header",
                "no header row found: the first cell of the "
                "header row must be 'id' (after any key,value settings rows)",
            )
        )
    survey.settings = tuple(settings)
    if fatal:
        raise SurveyError(fatal, source)
    if not survey.rows_read:
        raise SurveyError(
            [
                SurveyProblem(
                    header_line,
                    "",
                    "rows",
                    "the survey has a header but no rows: add one row per household or facility",
                )
            ],
            source,
        )
    return survey


def _check_header(header: list[str], line: int) -> list[SurveyProblem]:
    problems = []
    seen: set[str] = set()
    for h in header:
        if not h:
            problems.append(
                SurveyProblem(
                    line, "", "header", "a column has no name; name it or delete the empty column"
                )
            )
            continue
        if h in seen:
            problems.append(SurveyProblem(line, "", h, "column appears twice; keep one"))
        seen.add(h)
        if h in ROW_COLUMNS:
            continue
        try:
            field_type(h)
        except ValueError as exc:
            problems.append(SurveyProblem(line, "", h, str(exc)))
        if h in SHARED_ONLY:
            problems.append(
                SurveyProblem(
                    line,
                    "",
                    h,
                    "the site is shared by the whole survey: "
                    "set it once as a settings row before the header",
                )
            )
    for c in REQUIRED_COLUMNS:
        if c not in header:
            problems.append(SurveyProblem(line, "", c, "required column is missing"))
    if not {"load_list", "project", "daily_energy_wh"} & set(header):
        problems.append(
            SurveyProblem(
                line,
                "",
                "header",
                "no demand column: add load_list, project, or daily_energy_wh with peak_power_w",
            )
        )
    if ("daily_energy_wh" in header) != ("peak_power_w" in header):
        problems.append(
            SurveyProblem(
                line,
                "",
                "header",
                "daily_energy_wh and peak_power_w go together: add the missing one",
            )
        )
    return problems


def _read_setting(
    cells: list[str],
    line: int,
    survey: Survey,
    settings: list[tuple[str, Any]],
    fatal: list[SurveyProblem],
) -> None:
    key = cells[0].strip()
    value = cells[1].strip() if len(cells) > 1 else ""
    if any(c.strip() for c in cells[2:]):
        fatal.append(
            SurveyProblem(
                line,
                "",
                key,
                "a settings row has two cells, key and value; "
                "if this is the header, its first cell must be 'id'",
            )
        )
        return
    low = key.lower()
    if value == "":
        fatal.append(SurveyProblem(line, "", key, "the setting has no value"))
        return
    if low in survey.setting_lines:
        fatal.append(
            SurveyProblem(
                line, "", key, f"set twice (also on line {survey.setting_lines[low]}); keep one"
            )
        )
        return
    survey.setting_lines[low] = line
    if low == "community":
        survey.name = value
    elif low == "demo":
        if value.lower() not in _YES | _NO:
            fatal.append(SurveyProblem(line, "", key, f"'{value}' must be yes or no"))
        survey.demo = value.lower() in _YES
    elif low in ("climate", "project", "prices"):
        setattr(survey, low, value)
    else:
        try:
            settings.append((low, convert_value(field_type(low), value)))
        except ValueError as exc:
            fatal.append(
                SurveyProblem(
                    line,
                    "",
                    key,
                    f"{exc} (settings keys: {', '.join(SETTING_KEYS)}, or section.field)",
                )
            )


def _read_row(
    header: list[str],
    cells: list[str],
    line: int,
    problems: list[SurveyProblem],
    seen_ids: dict[str, int],
) -> SurveyRow | None:
    if len(cells) > len(header) and any(c.strip() for c in cells[len(header) :]):
        rid = cells[0].strip() if cells else ""
        problems.append(
            SurveyProblem(
                line, rid, "row", f"has {len(cells)} cells but the header has {len(header)} columns"
            )
        )
        return None
    values = {h: (cells[i].strip() if i < len(cells) else "") for i, h in enumerate(header)}
    rid = values.get("id", "")
    start = len(problems)

    def bad(fld: str, message: str) -> None:
        problems.append(SurveyProblem(line, rid, fld, message))

    if not rid:
        bad("id", "is blank; give every row a unique id (e.g. H-001)")
    elif rid in seen_ids:
        bad(
            "id",
            f"duplicate id '{rid}': line {seen_ids[rid]} already uses it (that row is "
            "planned); give this row its own id",
        )
    else:
        seen_ids[rid] = line
    count = 0
    raw = values.get("count", "")
    if raw == "":
        bad("count", "is blank; give the number of identical households or facilities (1 or more)")
    else:
        try:
            number = read_number(raw)
        except NumberError as exc:
            number = None
            bad("count", f"{exc}; give a whole number of systems")
        if number is not None:
            if number != number or number < 0:
                bad(
                    "count", f"{raw} is negative; give the number of systems (0 leaves the row out)"
                )
            elif number != int(number):
                bad("count", f"{raw} must be a whole number of systems")
            elif number > 1_000_000:
                bad("count", f"{raw} is not a plausible count (at most 1,000,000)")
            else:
                count = int(number)
    load_list = values.get("load_list") or None
    project = values.get("project") or None
    energy_raw = values.get("daily_energy_wh", "")
    peak_raw = values.get("peak_power_w", "")
    energy = peak = None
    if energy_raw or peak_raw:
        if not energy_raw or not peak_raw:
            missing = "daily_energy_wh" if not energy_raw else "peak_power_w"
            bad(missing, "is blank; daily_energy_wh and peak_power_w go together")
        else:
            energy = _positive(energy_raw, "daily_energy_wh", "Wh/day", bad)
            peak = _positive(peak_raw, "peak_power_w", "W", bad)
            if energy is not None and peak is not None and energy > 24 * peak:
                bad(
                    "daily_energy_wh",
                    f"{energy:g} Wh/day is more than 24 h at the peak power "
                    f"{peak:g} W; check both figures",
                )
        if load_list:
            bad(
                "load_list",
                "give either a load list or daily_energy_wh with peak_power_w, not both",
            )
    elif not load_list and not project:
        bad("demand", "blank: give a load_list, a project, or daily_energy_wh with peak_power_w")
    ac_dc = (values.get("ac_dc") or "dc").lower()
    if ac_dc not in ("ac", "dc"):
        bad("ac_dc", f"'{ac_dc}' must be ac or dc")
    elif values.get("ac_dc") and energy_raw == "" and peak_raw == "":
        bad("ac_dc", "applies only to rows given by daily_energy_wh and peak_power_w")
    surge = 0.0
    if values.get("surge_w"):
        s = _positive(values["surge_w"], "surge_w", "W", bad, allow_zero=True)
        surge = s if s is not None else 0.0
        if energy_raw == "":
            bad("surge_w", "applies only to rows given by daily_energy_wh and peak_power_w")
        elif peak is not None and 0 < surge < peak:
            bad(
                "surge_w",
                f"{surge:g} W is below the peak power {peak:g} W; give the starting "
                "power, or 0 for none",
            )
    kit = (values.get("kit") or "auto").lower()
    if kit not in KIT_CHOICES:
        bad("kit", f"'{kit}' must be auto, yes (always a standard kit) or no (its own system)")
    overrides = []
    for h in header:
        if h in ROW_COLUMNS or not values.get(h):
            continue
        try:
            overrides.append((h, convert_value(field_type(h), values[h])))
        except ValueError as exc:
            bad(h, str(exc))
    if len(problems) > start:
        return None
    # The short repeated texts are interned: a programme holds a million rows.
    return SurveyRow(
        line=line,
        id=rid,
        name=values.get("name", "") or rid,
        kind=sys.intern((values.get("kind") or "household").lower()),
        count=count,
        load_list=sys.intern(load_list) if load_list else None,
        project=sys.intern(project) if project else None,
        daily_energy_wh=energy,
        peak_power_w=peak,
        ac_dc=sys.intern(ac_dc),
        surge_w=surge,
        kit=sys.intern(kit),
        overrides=tuple(sorted(overrides)) if overrides else (),
    )


def _positive(raw: str, fld: str, unit: str, bad, allow_zero: bool = False) -> float | None:
    try:
        value = read_number(raw)
    except NumberError as exc:
        bad(fld, f"{exc} ({unit})")
        return None
    if value < 0 or (value == 0 and not allow_zero):
        bad(fld, f"{raw} {unit} must be {'0 or more' if allow_zero else 'above 0'}")
        return None
    return value


def load_survey(path: str | Path) -> Survey:
    """Read a community CSV file; references inside resolve relative to its folder."""
    from offgrid.textfile import TextFileError, read_text

    p = Path(path)
    try:
        text = read_text(p)
    except TextFileError as exc:
        raise SurveyError([SurveyProblem(0, "", "file", f"{p} {exc}")], str(p)) from None
    return read_survey(text, source=str(p), base_dir=p.parent)
