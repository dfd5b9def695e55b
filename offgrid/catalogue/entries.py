"""The kinds of catalogue entry (plain data): a project input, a design figure, a row
whose label carries figures (:class:`CompositeEntry`) and a table of figures
(:class:`TableEntry`)."""

from __future__ import annotations

import string
from collections.abc import Callable
from dataclasses import dataclass

#: Longest input label: the text UI's field tables give the label 22 characters.
INPUT_LABEL_ROOM = 22
#: Longest figure label: the Sizes section's figure column gives it 29 characters.
FIGURE_LABEL_ROOM = 29


@dataclass(frozen=True)
class InputEntry:
    """One value the user types or chooses, at a dotted path of the ``Project``.

    ``low``/``high`` bound a number (inclusive; None: no range check); ``hint`` says what
    to type and is the tail of every message about the field; ``kind`` is text, float,
    int, choice, months, climate, floats (a list of numbers, each in the range) or table
    (a table or a list of lists with rules of its own), ``auto_`` in front when it may be
    left out (the engine then picks); ``reason`` is the design figure (reason key) that explains the
    automatic value or what the input drives; ``values`` are the values a choice allows
    (how the UI names them is the UI's).
    """

    path: str
    label: str
    unit: str = ""
    low: float | None = None
    high: float | None = None
    hint: str = ""
    kind: str = "float"
    reason: str | None = None
    values: tuple = ()

    @property
    def is_fraction(self) -> bool:
        """A number 0-1 (a typed "60" or "60 %" means 0.6)."""
        return self.high == 1 and self.low is not None and self.low >= 0


@dataclass(frozen=True)
class FigureEntry:
    """One design figure, at a dotted path of ``SystemDesign.to_dict()``.

    ``digits``: decimals shown (None: by the value's size); ``reason``: the reason key
    that explains it when that is not its own (a composite row); ``key``: one of the
    report's key figures.  ``scale``: the stored value times this is the shown one (a
    fraction shown in %: 100; W shown in kW: 1e-3), in ``unit``; a ``{currency}`` in the
    unit is the project's currency, filled in at display (:meth:`unit_in`).  ``short``:
    the word a narrow table's column heading uses instead of the label (``Max`` of
    ``Maximum continuous current``; :meth:`column`).
    """

    path: str
    label: str
    unit: str = ""
    digits: int | None = None
    reason: str | None = None
    key: bool = False
    scale: float = 1.0
    short: str = ""

    @property
    def reason_key(self) -> str:
        """This figure's own key in ``SystemDesign.reasons`` (``strings.max_series``)."""
        from offgrid.design.result import reason_key

        return reason_key(self.path)

    @property
    def explained_by(self) -> str:
        """The key in ``SystemDesign.reasons`` whose reason explains this figure."""
        return self.reason or self.reason_key

    def unit_in(self, currency: str = "") -> str:
        """The unit with the project's currency in place of ``{currency}``."""
        return self.unit.replace("{currency}", currency).strip()

    def heading(self, currency: str = "") -> str:
        """A table row's heading: the label and the unit (``Battery energy, usable (kWh)``)."""
        unit = self.unit_in(currency)
        return f"{self.label} ({unit})" if unit else self.label

    def column(self, currency: str = "", unit: bool = True) -> str:
        """A narrow table's column heading: the short word (else the label) and the unit
        (``Max A``); without the unit where the table's caption gives it."""
        word = self.short or self.label
        return f"{word} {self.unit_in(currency)}".strip() if unit else word

    def shown(self, value: float) -> float:
        """The stored value as shown: times ``scale`` (0.0123 -> 1.23 %)."""
        return value * self.scale

    def text(self, value: float, digits: int | None = None, currency: str = "") -> str:
        """The stored ``value`` scaled, with its digits, thousands separated, and its unit:
        ``1,800 W``; ``0.0123`` of a % row: ``1.230 %``."""
        d = self.digits if digits is None else digits
        number = f"{self.shown(value):,.{d if d is not None else 2}f}"
        return f"{number} {self.unit_in(currency)}".strip()


@dataclass(frozen=True)
class CompositeEntry:
    """A row whose label carries computed numbers, e.g. ``Upkeep {upkeep} x PWF {pwf}``.

    ``label`` is a template whose named placeholders are filled from ``parts``: each
    name maps to the path of a figure that is itself a catalogue entry, and is shown as
    that figure's :meth:`FigureEntry.text` (number, digits, scale and unit).  ``value``
    is the path of the figure the row shows beside its label (empty for a line of
    prose); its reason explains the row, and ``{label}`` in the template is its label.
    ``{name.label}`` is the label of the figure named ``name``, so a sentence says each
    number with the catalogue's label and unit (``{power.label} {power}``: ``Array power
    installed 1,800 W``).  ``words`` name the placeholders that are words, not figures (a
    method, a name), given by the view that fills the row.
    """

    id: str
    label: str
    parts: tuple[tuple[str, str], ...]
    value: str = ""
    words: tuple[str, ...] = ()

    @property
    def names(self) -> tuple[str, ...]:
        """The placeholder names the template uses, in order, each once (``{power.label}``
        is the name ``power``)."""
        out: list[str] = []
        for _, field, _, _ in string.Formatter().parse(self.label):
            name = (field or "").split(".")[0]
            if name and name not in out:
                out.append(name)
        return tuple(out)

    def fill(
        self,
        value_of: Callable[[str], float | None],
        figure: Callable[[str], FigureEntry],
        currency: str = "",
        **words: str,
    ) -> str:
        """The label with each placeholder replaced by its figure's text; ``value_of``
        gives a figure's stored value by path ('-' where it is None), ``figure`` the
        catalogue entry at a path (:func:`offgrid.catalogue.figure_entry`); ``words``
        the texts of the word placeholders."""
        paths = dict(self.parts)
        texts: dict[str, str] = {}
        for name in self.names:
            if name == "label" and self.value:
                texts[name] = figure(self.value).label
            elif name in self.words:
                texts[name] = words[name]
            else:
                v = value_of(paths[name])
                e = figure(paths[name])
                shown = "-" if v is None else e.text(float(v), currency=currency)
                texts[name] = _Shown(shown, e.label)
        return self.label.format_map(texts)


class _Shown(str):
    """A figure's text in a template; ``.label`` is the figure's catalogue label."""

    label: str

    def __new__(cls, text: str, label: str) -> _Shown:
        obj = super().__new__(cls, text)
        obj.label = label
        return obj


@dataclass(frozen=True)
class TableEntry:
    """A table of figures: an id, its title and its rows (or columns) as figure paths.

    ``figures`` are catalogue paths (``reliability.months[].lolp``); a row of figures
    is headed by its figure's label and unit (:meth:`FigureEntry.heading`), a column by
    its short word and unit (:meth:`FigureEntry.column`), so the table says what the
    figure rows elsewhere say.  ``title`` heads the label column (or the table);
    ``note`` is the table's caption.
    """

    id: str
    title: str
    figures: tuple[str, ...]
    note: str = ""
    #: the caption gives the units: columns are headed by their short word alone
    units_in_note: bool = False

    def columns(self, figure: Callable[[str], FigureEntry], currency: str = "") -> tuple:
        """The headings of the figure columns, in order (:meth:`FigureEntry.column`)."""
        return tuple(figure(p).column(currency, unit=not self.units_in_note) for p in self.figures)
