"""A small TOML writer for our documents: short arrays on one line, tables in order.

Handles what project and climate files hold: text, whole and decimal numbers, true/false,
arrays of those (nested too), tables and arrays of tables.  Text is written as a basic
string with every control character escaped, so names with markup-like text or terminal
escape sequences are saved unchanged and read back exactly (TOML 1.0, sec. "String").
"""

from __future__ import annotations

import math
import re
from typing import Any

_BARE = re.compile(r"^[A-Za-z0-9_-]+$")
_ESC = {'"': '\\"', "\\": "\\\\", "\b": "\\b", "\t": "\\t", "\n": "\\n", "\f": "\\f", "\r": "\\r"}
_LINE = 96  # arrays longer than this are broken one item per line


def _key(k: str) -> str:
    return k if _BARE.match(k) else _string(k)


def _string(s: str) -> str:
    out = []
    for ch in s:
        if ch in _ESC:
            out.append(_ESC[ch])
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04X}")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def _value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if not math.isfinite(v):
            raise ValueError("a value is not a finite number and cannot be saved")
        return repr(v)
    if isinstance(v, str):
        return _string(v)
    if isinstance(v, list | tuple):
        items = [_value(x) for x in v]
        one = "[" + ", ".join(items) + "]"
        if len(one) <= _LINE:
            return one
        return "[\n" + "".join(f"    {x},\n" for x in items) + "]"
    raise TypeError(f"cannot write {type(v).__name__} to TOML")


def _is_table(v: Any) -> bool:
    return isinstance(v, dict)


def _is_table_array(v: Any) -> bool:
    return isinstance(v, list) and bool(v) and all(isinstance(x, dict) for x in v)


def dumps(doc: dict[str, Any]) -> str:
    """TOML text of ``doc``; plain keys first, then tables, then arrays of tables."""
    lines: list[str] = []
    _emit(doc, [], lines)
    return "\n".join(lines).lstrip("\n") + "\n"


def _emit(table: dict[str, Any], path: list[str], lines: list[str]) -> None:
    plain = [(k, v) for k, v in table.items() if not _is_table(v) and not _is_table_array(v)]
    tables = [(k, v) for k, v in table.items() if _is_table(v)]
    arrays = [(k, v) for k, v in table.items() if _is_table_array(v)]
    for k, v in plain:
        lines.append(f"{_key(k)} = {_value(v)}")
    for k, v in tables:
        sub = [*path, _key(k)]
        lines.append("")
        lines.append(f"[{'.'.join(sub)}]")
        _emit(v, sub, lines)
    for k, items in arrays:
        sub = [*path, _key(k)]
        for item in items:
            lines.append("")
            lines.append(f"[[{'.'.join(sub)}]]")
            _emit(item, sub, lines)
