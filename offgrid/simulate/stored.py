"""A risk study kept as plain JSON: every field of the report, read back to the same records.

The text UI keeps the last study of a project with the project text it was run on
(:mod:`offgrid.tui.sections.risk`). JSON, not pickle: reading it runs no code, so a
planted or damaged file can only be refused. The form follows the records' declared
fields (dataclass type hints): records become objects, tuples lists, numpy arrays
``{"array": [...], "dtype": "..."}``; reading checks each value against its declared
type and refuses the whole file with :class:`StoredStudyError` on any mismatch.
"""

from __future__ import annotations

import dataclasses
import json
import math
import types
import typing
from typing import Any

import numpy as np

from offgrid.simulate.run import SimulationReport

FORMAT = "offgrid-risk-study"
VERSION = 1


class StoredStudyError(ValueError):
    """A kept study that cannot be read back (damaged, another format or version)."""


def _encode(value: Any) -> Any:
    if dataclasses.is_dataclass(value) and not isinstance(value, type):
        return {f.name: _encode(getattr(value, f.name)) for f in dataclasses.fields(value)}
    if isinstance(value, np.ndarray):
        return {"array": value.tolist(), "dtype": value.dtype.str}
    if isinstance(value, np.generic):
        return value.item()
    if isinstance(value, dict):
        return {str(k): _encode(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_encode(v) for v in value]
    if isinstance(value, float) and not math.isfinite(value):
        return {"float": repr(value)}  # inf / nan kept exactly (JSON has no such numbers)
    return value


def _fail(where: str, why: str) -> StoredStudyError:
    return StoredStudyError(f"{where}: {why}")


def _decode(value: Any, kind: Any, where: str) -> Any:
    if kind is Any:
        return value
    origin = typing.get_origin(kind)
    args = typing.get_args(kind)
    if origin in (typing.Union, types.UnionType):
        if value is None and type(None) in args:
            return None
        errors = []
        for arm in (a for a in args if a is not type(None)):
            try:
                return _decode(value, arm, where)
            except StoredStudyError as exc:
                errors.append(str(exc))
        raise _fail(where, "; ".join(errors) or "no form fits")
    if dataclasses.is_dataclass(kind):
        if not isinstance(value, dict):
            raise _fail(where, f"expected a {kind.__name__} record")
        hints = typing.get_type_hints(kind)
        names = {f.name for f in dataclasses.fields(kind)}
        if set(value) != names:
            raise _fail(where, f"fields {sorted(set(value) ^ names)} do not match")
        return kind(**{n: _decode(value[n], hints[n], f"{where}.{n}") for n in value})
    if kind is np.ndarray:
        if not isinstance(value, dict) or set(value) != {"array", "dtype"}:
            raise _fail(where, "expected an array")
        try:
            return np.array(value["array"], dtype=np.dtype(value["dtype"]))
        except (TypeError, ValueError) as exc:
            raise _fail(where, f"not an array: {exc}") from exc
    if origin is tuple:
        if not isinstance(value, list):
            raise _fail(where, "expected a list")
        if len(args) == 2 and args[1] is Ellipsis:
            return tuple(_decode(v, args[0], f"{where}[{i}]") for i, v in enumerate(value))
        if len(args) != len(value):
            raise _fail(where, f"expected {len(args)} items")
        pairs = enumerate(zip(value, args, strict=True))
        return tuple(_decode(v, a, f"{where}[{i}]") for i, (v, a) in pairs)
    if origin is dict:
        if not isinstance(value, dict):
            raise _fail(where, "expected a mapping")
        return {k: _decode(v, args[1], f"{where}.{k}") for k, v in value.items()}
    if kind is float:
        if isinstance(value, dict) and set(value) == {"float"}:
            if value["float"] not in ("inf", "-inf", "nan"):
                raise _fail(where, "not a number")
            return float(value["float"])
        if isinstance(value, bool) or not isinstance(value, int | float):
            raise _fail(where, "expected a number")
        return float(value)
    if kind in (int, str, bool):
        if type(value) is not kind:
            raise _fail(where, f"expected {kind.__name__}")
        return value
    raise _fail(where, f"cannot read a {kind!r}")


@dataclasses.dataclass(frozen=True)
class StoredStudy:
    """A kept study: the report, the project text it was run on (TOML: every input),
    the run time [s] and the project file it belongs to (None: not given)."""

    report: SimulationReport
    project_text: str
    seconds: float
    project_path: str | None = None


def study_to_json(study: StoredStudy) -> str:
    body = {
        "format": FORMAT,
        "version": VERSION,
        "project_path": study.project_path,
        "project_text": study.project_text,
        "seconds": float(study.seconds),
        "report": _encode(study.report),
    }
    return json.dumps(body, ensure_ascii=False, separators=(",", ":"), allow_nan=False)


def study_from_json(text: str) -> StoredStudy:
    """The study written by :func:`study_to_json`.

    Raises :class:`StoredStudyError` naming the first field that does not fit."""
    try:
        body = json.loads(text)
    except json.JSONDecodeError as exc:
        raise StoredStudyError(f"not JSON: {exc}") from exc
    if not isinstance(body, dict) or body.get("format") != FORMAT:
        raise StoredStudyError("not a kept risk study")
    if body.get("version") != VERSION:
        raise StoredStudyError(f"version {body.get('version')!r}; this offgrid reads {VERSION}")
    path, project_text, seconds = (body.get(k) for k in ("project_path", "project_text", "seconds"))
    if not isinstance(project_text, str) or isinstance(seconds, bool):
        raise StoredStudyError("the project text is missing")
    if not isinstance(seconds, int | float) or not (path is None or isinstance(path, str)):
        raise StoredStudyError("the run time or the project path is not readable")
    report = _decode(body.get("report"), SimulationReport, "report")
    return StoredStudy(report, project_text, float(seconds), path)
