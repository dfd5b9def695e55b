"""Project files: TOML in, TOML out, never losing what the user saved.

* :func:`load_project` parses, converts and validates, and raises
  :class:`ProjectFileError` listing every problem with its dotted path, the
  line where it stands and a hint.  A file that failed to load is never written.
* :func:`save_project` writes atomically and keeps the previous version as
  ``NAME.toml.bak`` (:mod:`offgrid.project.atomic`: the file exists whole at every
  moment; a symlink is kept and its target written; the mode is kept; a file changed
  by someone else since it was read is not overwritten).
* Tables this version does not know are kept in ``Project.extra`` and written
  back unchanged.
* Older schemas are migrated on reading (:func:`_migrate_schema_1`) and saved in
  the current one; what the migration could not carry over is told in ``notes``.
"""

from __future__ import annotations

import dataclasses
import functools
import os
import re
import tomllib
import types
import typing
from pathlib import Path
from typing import Any, Literal, get_args, get_origin, get_type_hints

from offgrid.climate.files import ClimateFileError, climate_from_dict, climate_to_dict
from offgrid.numbers import is_finite_number
from offgrid.project.atomic import Fingerprint, write_atomic
from offgrid.project.loads_csv import MAX_LOADS, format_months, parse_months
from offgrid.project.model import (
    FORMAT_NAME,
    SCHEMA_VERSION,
    ClimateChoice,
    Load,
    Project,
)
from offgrid.project.validate import Problem, validate_project


class ProjectFileError(ValueError):
    """The project file cannot be used; ``problems`` lists each with path, line and hint."""

    def __init__(self, source: str, problems: list[Problem]) -> None:
        self.source = source
        self.problems = problems
        lines = "\n".join(f"  {p}" for p in problems)
        super().__init__(f"{source}: cannot load ({len(problems)} problem(s))\n{lines}")


# ----------------------------------------------------------------------------- writing

#: Written for an optional field left empty whose default is a value (e.g. a Voc coefficient
#: not on the datasheet), so that saving and loading keeps it empty.
NONE_WORD = "none"


def _plain(obj: Any) -> Any:
    if dataclasses.is_dataclass(obj):
        out = {}
        for f in dataclasses.fields(obj):
            value = getattr(obj, f.name)
            if value is None:
                if f.default is not None and f.default is not dataclasses.MISSING:
                    out[f.name] = NONE_WORD  # None where the default is a value: say so
                continue  # TOML has no null: a missing key means "automatic"
            if (
                isinstance(value, list)
                and not value
                and f.default_factory is not dataclasses.MISSING
            ):
                continue  # an empty list is the default: leave it out
            out[f.name] = _plain(value)
        return out
    if isinstance(obj, list | tuple):
        return [_plain(v) for v in obj]
    if isinstance(obj, dict):
        return {k: _plain(v) for k, v in obj.items()}
    return obj


def project_to_dict(project: Project) -> dict[str, Any]:
    """The document body, in the order it is saved."""
    body: dict[str, Any] = {"format": FORMAT_NAME, "schema": SCHEMA_VERSION}
    body["info"] = _plain(project.info)
    body["site"] = _plain(project.site)
    if project.climate.inline is not None:
        inline = climate_to_dict(project.climate.inline)
        inline.pop("format")
        inline.pop("schema")
        body["climate"] = inline
    else:
        body["climate"] = {"ref": project.climate.ref or ""}
    for name in ("module", "battery", "controller", "inverter", "choices"):
        body[name] = _plain(getattr(project, name))
    for f in dataclasses.fields(project):
        if f.name in body or f.name in ("loads", "extra"):
            continue
        value = getattr(project, f.name)
        if f.name == "water" and not value:
            continue  # no [[water]] tables: the file stays as before
        if value is not None:
            body[f.name] = _plain(value)
    loads = []
    for ld in project.loads:
        d = _plain(ld)
        d["months"] = format_months(ld.months)
        loads.append(d)
    body["loads"] = loads
    for key, value in project.extra.items():
        body.setdefault(key, value)
    return body


def dumps_project(project: Project) -> str:
    from offgrid.project.toml_out import dumps

    head = "# offgrid project file: edit with `offgrid`, or by hand with care.\n"
    return head + dumps(project_to_dict(project))


def save_project(
    project: Project,
    path: str | os.PathLike,
    *,
    expect: Fingerprint | Literal[False] | None = False,
) -> Fingerprint:
    """Write atomically with a backup (see :mod:`offgrid.project.atomic`).

    ``expect``: the file's :class:`Fingerprint` when it was read (None: there was no
    file); if the file on disk differs, :class:`offgrid.project.atomic.ChangedOnDisk` is
    raised and nothing is written. ``False`` (the default) writes without that check.
    Returns the new fingerprint, to pass as ``expect`` to the next save.
    """
    return write_atomic(
        path, dumps_project(project), expect=expect or None, check_expect=expect is not False
    )


# ----------------------------------------------------------------------------- reading


def _locate_lines(text: str) -> dict[str, int]:
    """Map dotted paths (``site.latitude_deg``, ``loads[2].power_w``) to 1-based line numbers."""
    where: dict[str, int] = {}
    table = ""
    counts: dict[str, int] = {}
    header = re.compile(r"^\s*(\[\[?)\s*([A-Za-z0-9_.\-]+)\s*\]\]?")
    keyline = re.compile(r"^\s*([A-Za-z0-9_\-]+)\s*=")
    for n, line in enumerate(text.splitlines(), start=1):
        m = header.match(line)
        if m:
            name = m.group(2)
            if m.group(1) == "[[":
                counts[name] = counts.get(name, 0) + 1
                table = f"{name}[{counts[name]}]"
            else:
                table = name
            where.setdefault(table, n)
            continue
        k = keyline.match(line)
        if k:
            path = f"{table}.{k.group(1)}" if table else k.group(1)
            where.setdefault(path, n)
    return where


class _Reader:
    def __init__(self) -> None:
        self.problems: list[Problem] = []

    def bad(self, path: str, message: str) -> None:
        self.problems.append(Problem(path, message))

    def convert(self, tp: Any, value: Any, path: str) -> Any:
        origin = get_origin(tp)
        args = get_args(tp)
        if origin in (typing.Union, types.UnionType):
            if (value is None or value == NONE_WORD) and type(None) in args:
                return None
            options = [a for a in args if a is not type(None)]
            literal_opts = [a for a in options if get_origin(a) is Literal]
            for lit in literal_opts:
                if value in get_args(lit):
                    return value
            others = [a for a in options if get_origin(a) is not Literal]
            if len(others) == 2 and {get_origin(a) for a in others} == {list, None}:
                # one number or a list of them (site.albedo): pick by the value's shape
                listed = next(a for a in others if get_origin(a) is list)
                single = next(a for a in others if get_origin(a) is None)
                return self.convert(listed if isinstance(value, list) else single, value, path)
            if len(others) == 1:
                return self.convert(others[0], value, path)
            allowed = [v for lit in literal_opts for v in get_args(lit)]
            self.bad(path, f"'{value}' is not allowed; use one of {allowed} or a number")
            return None
        if origin is Literal:
            if value not in args:
                self.bad(path, f"'{value}' must be one of: {', '.join(map(str, args))}")
            return value
        if tp is bool:
            if not isinstance(value, bool):
                self.bad(path, f"'{_short(value)}' must be true or false")
            return bool(value)
        if tp is float:
            if isinstance(value, bool) or not isinstance(value, int | float):
                self.bad(path, f"'{_short(value)}' is not a number")
                return 0.0
            if not is_finite_number(value):
                self.bad(path, f"'{_short(value)}' is not a finite number; {_hint(path)}")
                return 0.0
            return float(value)
        if tp is int:
            if (
                isinstance(value, bool)
                or not isinstance(value, int | float)
                or (isinstance(value, float) and not value.is_integer())
            ):
                self.bad(path, f"'{_short(value)}' must be a whole number")
                return 0
            if abs(value) > 10**15:
                self.bad(path, f"'{_short(value)}' is far too large; {_hint(path)}")
                return 0
            return int(value)
        if tp is str:
            if not isinstance(value, str):
                self.bad(path, f"'{_short(value)}' must be text in quotes")
                return str(value)
            return value
        if origin is list:
            if not isinstance(value, list):
                self.bad(path, "must be a list")
                return []
            return [self.convert(args[0], v, f"{path}[{i + 1}]") for i, v in enumerate(value)]
        if origin is tuple:
            if path.endswith(".months"):
                if not (
                    isinstance(value, str)
                    or (
                        isinstance(value, list)
                        and all(isinstance(v, int) and not isinstance(v, bool) for v in value)
                    )
                ):
                    self.bad(
                        path,
                        f"'{_short(value)}' is not a set of months: write it in "
                        'quotes, e.g. months = "1-12" or months = "5,6,7"',
                    )
                    return ()
                try:
                    return parse_months(
                        value if isinstance(value, str) else ",".join(str(v) for v in value)
                    )
                except ValueError as exc:
                    self.bad(path, str(exc))
                    return ()
            if not isinstance(value, list | tuple):
                self.bad(path, "must be a list")
                return ()
            return tuple(self.convert(args[0], v, f"{path}[{i + 1}]") for i, v in enumerate(value))
        if origin is dict or tp is dict:
            return dict(value) if isinstance(value, dict) else {}
        if dataclasses.is_dataclass(tp):
            return self.build(tp, value, path)
        return value

    def build(self, cls: Any, data: Any, path: str) -> Any:
        if not isinstance(data, dict):
            self.bad(path, "must be a table")
            return cls() if _all_defaults(cls) else None
        hints = type_hints(cls)
        kwargs = {}
        known = {f.name for f in dataclasses.fields(cls)}
        for key in data:
            if key not in known:
                self.bad(
                    f"{path}.{key}", f"unknown field; known fields are {', '.join(sorted(known))}"
                )
        for f in dataclasses.fields(cls):
            if f.name in data:
                kwargs[f.name] = self.convert(hints[f.name], data[f.name], f"{path}.{f.name}")
            elif f.default is dataclasses.MISSING and f.default_factory is dataclasses.MISSING:
                self.bad(f"{path}.{f.name}", "required field is missing")
                kwargs[f.name] = self.convert(hints[f.name], _zero(hints[f.name]), path)
        return cls(**kwargs)


@functools.cache
def type_hints(cls: type) -> dict[str, Any]:
    """The field types of dataclass ``cls`` (``get_type_hints``, evaluated once per class:
    annotations do not change while the program runs). Read it, never change it."""
    return get_type_hints(cls)


def _short(value: Any) -> str:
    """A value quoted in a message: at most 40 characters."""
    if isinstance(value, int) and not isinstance(value, bool) and abs(value) > 10**40:
        return f"a number of {len(hex(value)) * 1.2:.0f}-odd digits"
    text = repr(value) if isinstance(value, list | dict) else str(value)
    return text if len(text) <= 40 else text[:37] + "..."


def _hint(path: str) -> str:
    """What to type at ``path``: its hint in the catalogue, or a general hint."""
    from offgrid.catalogue import find_input

    entry = find_input(path)
    return entry.hint if entry is not None and entry.hint else "type a number such as 0 or 1.5"


def _depth(data: Any, limit: int) -> int:
    """How deep tables and lists nest in ``data`` (iterative; stops past ``limit``)."""
    deepest = 0
    stack = [(data, 0)]
    while stack:
        obj, level = stack.pop()
        deepest = max(deepest, level)
        if deepest > limit:
            return deepest
        if isinstance(obj, dict):
            stack.extend((v, level + 1) for v in obj.values())
        elif isinstance(obj, list):
            stack.extend((v, level + 1) for v in obj)
    return deepest


#: Largest project file read: 5,000 loads with an inline climate and its daily series take
#: about 1.2 MB; a larger TOML file would take seconds to parse for nothing.
MAX_PROJECT_BYTES = 2_000_000

#: Deepest nesting of tables and lists read from a project file (offgrid writes at most
#: four levels; kept unknown tables may add a few).
MAX_DEPTH = 32


def _zero(tp: Any) -> Any:
    return {float: 0.0, int: 0, str: "", bool: False}.get(tp, [])


def _all_defaults(cls: Any) -> bool:
    return all(
        f.default is not dataclasses.MISSING or f.default_factory is not dataclasses.MISSING
        for f in dataclasses.fields(cls)
    )


def _migrate_schema_1(
    data: dict[str, Any], notes: list[str], moved: dict[str, str] | None = None
) -> dict[str, Any]:
    """Schema 1 -> 2: each ``[wiring.dc_load_runs_m]`` entry (load name = length) moves onto
    every load of that name as ``run_m``; an entry naming no load is told in ``notes`` and
    dropped. ``data`` is not changed; the migrated copy is returned. ``moved`` receives
    ``loads[N].run_m`` -> the schema-1 entry it came from (for messages)."""
    from offgrid.safetext import printable

    wiring = data.get("wiring")
    if not isinstance(wiring, dict) or "dc_load_runs_m" not in wiring:
        return data
    data = dict(data)
    wiring = dict(wiring)
    runs = wiring.pop("dc_load_runs_m")
    data["wiring"] = wiring
    if not isinstance(runs, dict):
        notes.append(
            "wiring.dc_load_runs_m was not a table of load name = length; it is "
            "dropped when the project is saved (schema 2 keeps each load's length "
            "on the load, as run_m)"
        )
        return data
    loads = data.get("loads")
    loads = (
        [dict(ld) if isinstance(ld, dict) else ld for ld in loads]
        if isinstance(loads, list)
        else []
    )
    if loads:
        data["loads"] = loads
    moved = {} if moved is None else moved
    names = 0
    for name, length in runs.items():
        owners = [
            i
            for i, ld in enumerate(loads)
            if isinstance(ld, dict) and ld.get("name") == name and "run_m" not in ld
        ]
        if not owners and not any(isinstance(ld, dict) and ld.get("name") == name for ld in loads):
            notes.append(
                f"wiring.dc_load_runs_m: '{printable(str(name))}' = "
                f"{_short(length)} m names no load in this project; that length is "
                "dropped when the project is saved (set it on the load as run_m)"
            )
            continue
        for i in owners:
            loads[i]["run_m"] = length
            moved[f"loads[{i + 1}].run_m"] = f"wiring.dc_load_runs_m.'{printable(str(name))}'"
        names += 1
    if names:
        notes.append(
            f"schema 1 file: the cable run lengths of {names} load name(s) now stand "
            "on the loads (run_m); saving writes schema 2"
        )
    return data


def project_from_dict(
    data: dict[str, Any], source: str = "project", notes: list[str] | None = None
) -> tuple[Project, list[Problem]]:
    """Convert a parsed document to a Project; returns it with the list of problems.

    A file of an older schema is migrated; what that could not carry over is appended to
    ``notes`` (each a sentence naming the field).
    """
    notes = [] if notes is None else notes
    reader = _Reader()
    fmt = data.get("format")
    if fmt != FORMAT_NAME:
        what = (
            "the file has no format line" if fmt is None else f"'{fmt}' is not an offgrid project"
        )
        reader.bad(
            "format", f'{what}: an offgrid project starts with the line format = "{FORMAT_NAME}"'
        )
        return Project(), reader.problems
    schema = data.get("schema")
    if not isinstance(schema, int) or isinstance(schema, bool) or schema < 1:
        reader.bad(
            "schema", f"'{schema}' must be a whole number (this offgrid writes {SCHEMA_VERSION})"
        )
        return Project(), reader.problems
    if schema > SCHEMA_VERSION:
        reader.bad(
            "schema",
            f"the file is schema {schema}, newer than this offgrid reads "
            f"({SCHEMA_VERSION}); open it with a newer offgrid. The file was "
            "not changed",
        )
        return Project(), reader.problems
    moved: dict[str, str] = {}
    if schema == 1:
        data = _migrate_schema_1(data, notes, moved)
    elif isinstance(data.get("wiring"), dict) and "dc_load_runs_m" in data["wiring"]:
        reader.bad(
            "wiring.dc_load_runs_m",
            f"schema {schema} keeps each DC load's cable length "
            "on the load: write run_m = LENGTH in its [[loads]] table instead",
        )
        return Project(), reader.problems
    hints = type_hints(Project)
    kwargs: dict[str, Any] = {}
    extra: dict[str, Any] = {}
    for key, value in data.items():
        if key in ("format", "schema"):
            continue
        if key == "climate":
            kwargs["climate"] = _read_climate(value, reader)
        elif key == "loads":
            if not isinstance(value, list):
                reader.bad("loads", "must be a list of [[loads]] tables")
                continue
            if len(value) > MAX_LOADS:
                reader.bad(
                    "loads",
                    f"{len(value):,} loads: more than {MAX_LOADS:,} loads in one "
                    "project; a project is one system, plan a community with "
                    "`offgrid plan`",
                )
                continue
            kwargs["loads"] = [
                reader.build(Load, v, f"loads[{i + 1}]") for i, v in enumerate(value)
            ]
        elif key in hints and key != "extra":
            kwargs[key] = reader.convert(hints[key], value, key)
        else:
            extra[key] = value
    project = Project(**kwargs, extra=extra)
    if not reader.problems:
        reader.problems.extend(validate_project(project))
    problems = [
        Problem(p.path, f"{p.message} (moved from {moved[p.path]} of the schema-1 file)", p.line)
        if p.path in moved
        else p
        for p in reader.problems
    ]
    return project, problems


def _read_climate(value: Any, reader: _Reader) -> ClimateChoice:
    if not isinstance(value, dict):
        reader.bad("climate", "must be a table with `ref` or a [climate.monthly] table")
        return ClimateChoice()
    if "monthly" in value:
        try:
            return ClimateChoice(inline=climate_from_dict(value, where="climate"))
        except ClimateFileError as exc:
            msg = str(exc)
            path, _, rest = msg.partition(": ")
            reader.bad(path, rest or msg)
            return ClimateChoice()
    ref = value.get("ref")
    if not isinstance(ref, str) or not ref.strip():
        reader.bad(
            "climate.ref",
            "give a bundled climate name (see `offgrid climate list`) or a "
            "file path, or an inline [climate.monthly] table",
        )
        return ClimateChoice()
    return ClimateChoice(ref=ref)


def loads_project(text: str, source: str = "project", *, notes: list[str] | None = None) -> Project:
    """Parse project text; raise :class:`ProjectFileError` with every problem.

    ``notes``: a list that receives what migrating an older schema could not carry over.
    """
    too_deep = Problem(
        "file",
        f"tables or lists nested more than {MAX_DEPTH} levels deep: "
        "this is not an offgrid project; check that it is the right "
        "file",
    )
    tables = len(re.findall(r"(?m)^\s*\[\[\s*loads\s*\]\]", text))
    if tables > MAX_LOADS:  # refused before parsing: a huge file is not parsed for nothing
        raise ProjectFileError(
            source,
            [
                Problem(
                    "loads",
                    f"{tables:,} loads: more than "
                    f"{MAX_LOADS:,} loads in one project; a project "
                    "is one system, plan a community with "
                    "`offgrid plan`",
                )
            ],
        )
    try:
        data = tomllib.loads(text)
    except RecursionError:
        raise ProjectFileError(source, [too_deep]) from None
    except tomllib.TOMLDecodeError as exc:
        m = re.search(r"line (\d+)", str(exc))
        line = int(m.group(1)) if m else None
        raise ProjectFileError(
            source, [Problem("file", f"not valid TOML: {exc}; fix the syntax at that line", line)]
        ) from exc
    if _depth(data, MAX_DEPTH) > MAX_DEPTH:
        raise ProjectFileError(source, [too_deep])
    project, problems = project_from_dict(data, source, notes)
    if problems:
        lines = _locate_lines(text)
        located = []
        for p in problems:
            line = lines.get(p.path)
            if line is None:  # fall back to the enclosing table
                parent = p.path.rsplit(".", 1)[0]
                line = lines.get(parent)
            located.append(Problem(p.path, p.message, line))
        raise ProjectFileError(source, located)
    return project


def load_project(path: str | os.PathLike, *, notes: list[str] | None = None) -> Project:
    """Read a project file (see :func:`loads_project`)."""
    from offgrid.textfile import TextFileError, read_text

    p = Path(path)
    try:
        text = read_text(p, max_bytes=MAX_PROJECT_BYTES)
    except TextFileError as exc:
        raise ProjectFileError(str(p), [Problem("file", str(exc))]) from None
    return loads_project(text.removeprefix("\ufeff"), source=str(p), notes=notes)


def copy_project(project: Project) -> Project:
    """A deep, independent copy (through the saved form, so it is exactly what would be saved)."""
    import copy

    return copy.deepcopy(project)
