"""User text made safe for each output: terminals, reports and CSV files.

Names typed by people (appliances, projects, sites, files) are saved unchanged; every
output shows them through one of these helpers (no UI imports here, so the command
line, the reports and the text UI share them):

* :func:`printable`: every control or direction-override character made visible
  (ESC -> U+241B, a newline -> U+240A), for one-line names.
* :func:`visible`: the same but keeping newlines and tabs, for a whole output
  (a summary, a report, an error message) before it reaches a terminal or a file.
* :func:`markdown_text`: a name inside Markdown, with links, images, HTML and table
  pipes escaped.
* :func:`csv_cell` / :func:`csv_uncell`: CSV formula injection neutralised (OWASP,
  "CSV Injection": a cell that begins with ``=``, ``+``, ``-``, ``@``, tab or carriage
  return gets a leading apostrophe) and taken off again when offgrid reads its own file.
"""

from __future__ import annotations

import re

# C0 controls, DEL, C1 controls, and the invisible bidirectional overrides that
# can make text appear in a different order than it is stored.
_HIDDEN = re.compile("[\x00-\x1f\x7f-\x9f\u200e\u200f\u202a-\u202e\u2066-\u2069]")
_HIDDEN_BUT_LINES = re.compile(
    "[\x00-\x08\x0b-\x1f\x7f-\x9f\u200e\u200f\u202a-\u202e\u2066-\u2069]"
)


def _picture(match: re.Match[str]) -> str:
    code = ord(match.group(0))
    if code < 0x20:
        return chr(0x2400 + code)  # Unicode control pictures: ESC -> U+241B
    if code == 0x7F:
        return "\u2421"
    return f"<U+{code:04X}>"


def printable(text: str) -> str:
    """``text`` with every control or direction-override character made visible."""
    return _HIDDEN.sub(_picture, str(text))


def visible(text: str) -> str:
    """Like :func:`printable` but newlines and tabs are kept: for a whole output."""
    return _HIDDEN_BUT_LINES.sub(_picture, str(text))


_MD_SPECIAL = re.compile(r"([\\`*_\[\]|~])")


def markdown_text(text: str) -> str:
    """Text as literal Markdown: one line (controls and newlines made visible), no link or
    image (``[`` and ``]`` escaped, CommonMark 2.4), no HTML (``<`` as ``&lt;``), no
    emphasis, code span or table-cell break."""
    return _MD_SPECIAL.sub(r"\\\1", printable(text)).replace("<", "&lt;")


#: First characters that make a spreadsheet read a cell as a formula (OWASP CSV Injection).
FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
_QUOTED_FORMULA = re.compile(r"^'+[=+\-@\t\r]")
_PLAIN_NUMBER = re.compile(r"[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?")


def csv_cell(value: object) -> object:
    """A CSV cell a spreadsheet shows as text: ``=1+1`` is written ``'=1+1``.

    Numbers, and text that is only a number, are written as they are (``-5`` is no
    formula); text that
    already begins with apostrophes before a formula character gets one more, so
    :func:`csv_uncell` gives back exactly the original.
    """
    if not isinstance(value, str) or not value or _PLAIN_NUMBER.fullmatch(value):
        return value
    if value.startswith(FORMULA_STARTS) or _QUOTED_FORMULA.match(value):
        return "'" + value
    return value


def csv_row(cells: list[object]) -> list[object]:
    """A row for a CSV that people read: text cells :func:`printable` and :func:`csv_cell`."""
    return [csv_cell(printable(c)) if isinstance(c, str) else c for c in cells]


def csv_uncell(text: str) -> str:
    """The text :func:`csv_cell` was given (an apostrophe before a formula character dropped)."""
    return text[1:] if _QUOTED_FORMULA.match(text) else text
