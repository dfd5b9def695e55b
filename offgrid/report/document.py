"""The report as plain data, rendered alike to text, Markdown and HTML.

:func:`offgrid.report.build.build_report` fills a :class:`Report` from a project
and its design; each renderer (:mod:`.text`, :mod:`.markdown`, :mod:`.html`)
only lays it out.  Numbers are formatted once, here, so every format shows the
same figure.  A :class:`Cell` keeps the number it shows (``value``) and, for a
design figure, its dotted path (``path``) in the design's JSON.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from typing import Literal

from offgrid.safetext import printable


def _visible_text(obj: object, names: tuple[str, ...]) -> None:
    """Make the text fields ``names`` of a frozen record one-line and free of control
    characters (:func:`offgrid.safetext.printable`): every renderer gets safe text."""
    for f in fields(obj):  # type: ignore[arg-type]
        if f.name not in names:
            continue
        value = getattr(obj, f.name)
        if isinstance(value, str):
            new: object = printable(value)
        elif isinstance(value, tuple):
            new = tuple(
                printable(v)
                if isinstance(v, str)
                else tuple(printable(x) for x in v)
                if isinstance(v, tuple)
                else v
                for v in value
            )
        else:
            continue
        object.__setattr__(obj, f.name, new)


Align = Literal["l", "r"]


@dataclass(frozen=True)
class Cell:
    text: str
    value: float | None = None  # the number shown, unrounded
    path: str | None = None  # dotted path of a design figure (``array.power_w``)
    mark: bool = False  # differs from the first column (variants)

    def __post_init__(self) -> None:
        _visible_text(self, ("text",))


@dataclass(frozen=True)
class Table:
    key: str
    columns: tuple[str, ...]
    rows: tuple[tuple[Cell, ...], ...]
    align: tuple[Align, ...] = ()
    caption: str = ""
    #: text format: columns (by index) that may wrap when the table is wider than the page
    wrap: tuple[int, ...] = ()

    def __post_init__(self) -> None:
        _visible_text(self, ("columns", "caption"))

    def alignment(self, i: int) -> Align:
        return self.align[i] if i < len(self.align) else "l"


@dataclass(frozen=True)
class Paragraph:
    text: str

    def __post_init__(self) -> None:
        _visible_text(self, ("text",))


@dataclass(frozen=True)
class Bullets:
    items: tuple[str, ...]
    kind: Literal["plain", "caution", "warning"] = "plain"

    def __post_init__(self) -> None:
        _visible_text(self, ("items",))


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

    def __post_init__(self) -> None:
        _visible_text(self, ("label", "formula", "inputs", "source"))


@dataclass(frozen=True)
class Figures:
    items: tuple[FigureItem, ...]
    title: str = ""

    def __post_init__(self) -> None:
        _visible_text(self, ("title",))


@dataclass(frozen=True)
class Chart:
    key: str
    title: str
    svg: str  # inline SVG (no XML prolog, no external reference); "" when charts are off
    text: tuple[str, ...] = ()  # the same information in at most 80 columns of text
    caption: str = ""

    def __post_init__(self) -> None:
        _visible_text(self, ("title", "text", "caption"))


Block = Table | Paragraph | Bullets | Figures | Chart


@dataclass(frozen=True)
class Section:
    key: str
    title: str
    blocks: tuple[Block, ...]

    def __post_init__(self) -> None:
        _visible_text(self, ("title",))


@dataclass(frozen=True)
class Report:
    title: str
    subtitle: str
    sections: tuple[Section, ...]
    demo: bool = False
    meta: tuple[tuple[str, str], ...] = field(default=())

    def __post_init__(self) -> None:
        _visible_text(self, ("title", "subtitle", "meta"))

    def section(self, key: str) -> Section | None:
        for s in self.sections:
            if s.key == key:
                return s
        return None
