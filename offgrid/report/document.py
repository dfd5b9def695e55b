"""The report as plain data, rendered alike to text, Markdown and HTML.

:func:`offgrid.report.build.build_report` fills a :class:`Report` from a project
and its design; each renderer (:mod:`.text`, :mod:`.markdown`, :mod:`.html`)
only lays it out.  Numbers are formatted once, here, so every format shows the
same figure.  A :class:`Cell` keeps the number it shows (``value``) and, for a
design figure, its dotted path (``path``) in the design's JSON.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

Align = Literal["l", "r"]


@dataclass(frozen=True)
class Cell:
    text: str
    value: float | None = None  # the number shown, unrounded
    path: str | None = None  # dotted path of a design figure (``array.power_w``)
    mark: bool = False  # differs from the first column (variants)


@dataclass(frozen=True)
class Table:
    key: str
    columns: tuple[str, ...]
    rows: tuple[tuple[Cell, ...], ...]
    align: tuple[Align, ...] = ()
    caption: str = ""
    #: text format: columns (by index) that may wrap when the table is wider than the page
    wrap: tuple[int, ...] = ()

    def alignment(self, i: int) -> Align:
        return self.align[i] if i < len(self.align) else "l"


@dataclass(frozen=True)
class Paragraph:
    text: str


@dataclass(frozen=True)
class Bullets:
    items: tuple[str, ...]
    kind: Literal["plain", "caution", "warning"] = "plain"


@dataclass(frozen=True)
class FigureItem:
    """A sized figure with its reason."""

    path: str
    label: str
    cell: Cell
    formula: str = ""
    inputs: tuple[tuple[str, str], ...] = ()
    source: str = ""
    listed: bool = False  # inputs one per line ("name: values"), e.g. one per cable run


@dataclass(frozen=True)
class Figures:
    items: tuple[FigureItem, ...]
    title: str = ""


@dataclass(frozen=True)
class Chart:
    key: str
    title: str
    svg: str  # inline SVG (no XML prolog, no external reference); "" when charts are off
    text: tuple[str, ...] = ()  # the same information in at most 80 columns of text
    caption: str = ""


Block = Table | Paragraph | Bullets | Figures | Chart


@dataclass(frozen=True)
class Section:
    key: str
    title: str
    blocks: tuple[Block, ...]


@dataclass(frozen=True)
class Report:
    title: str
    subtitle: str
    sections: tuple[Section, ...]
    demo: bool = False
    meta: tuple[tuple[str, str], ...] = field(default=())

    def section(self, key: str) -> Section | None:
        for s in self.sections:
            if s.key == key:
                return s
        return None
