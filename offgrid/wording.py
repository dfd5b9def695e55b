"""Client-facing words for values that are not checked against their published source.

In code and tests a recalled value says ``from memory`` (the stronger marking, for
us). A report, a printed caution or a screen a client or inspector reads says what
to do about it instead: "confirm against the current edition of IEC 62485-2", or,
when no standard is named, against the maker's datasheet.
"""

from __future__ import annotations

import dataclasses
import re
from typing import Any

MARK = "from memory"
STANDARD = re.compile(
    r"\b(IEC \d{4,5}(?:-\d+)*|IEEE Std \d+|NFPA 70|NEC|ASTM [A-Z]\d+|ESMAP MTF|"
    r"Duffie (?:&|and) Beckman|TM 5-1185)"
)
_WITH_NOTE = re.compile(r"\bfrom memory \(([^)]*)\)")
_MARKED = re.compile(r"(?:,\s*|;\s*|\s+)?\(?\bfrom memory\b\)?(?:,\s*no source)?")


def confirm_words(text: str) -> str:
    """``text`` with each 'from memory' turned into what to confirm and where."""
    if MARK not in text:
        return text
    found = STANDARD.search(text)
    if found:
        std = found.group(1)
        std = "NFPA 70 (NEC)" if std == "NEC" else std
        where = f"confirm against the current edition of {std}"
    else:
        where = "confirm against the maker's datasheet"

    def put(m: re.Match) -> str:
        lead = m.group(0)
        if lead.lstrip().startswith("("):
            return f" ({where})"
        return f"; {where}" if lead[:1] in ",;" else f" ({where})"

    out = _WITH_NOTE.sub(lambda m: f"({m.group(1)}; {where})", text)
    return _MARKED.sub(put, out).replace("  ", " ")


def for_client(obj: Any) -> Any:
    """A copy of a frozen report model (dataclasses, tuples, strings) in client words."""
    if isinstance(obj, str):
        return confirm_words(obj)
    if isinstance(obj, tuple):
        return tuple(for_client(x) for x in obj)
    if isinstance(obj, list):
        return [for_client(x) for x in obj]
    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        changes = {
            f.name: for_client(getattr(obj, f.name)) for f in dataclasses.fields(obj) if f.init
        }
        return dataclasses.replace(obj, **changes)
    return obj
