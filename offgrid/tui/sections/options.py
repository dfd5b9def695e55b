"""Section 8, Options: the project's variants beside the base design, and its price list.

The comparison (:func:`offgrid.economics.variants.compare_variants`) designs the base
and every variant: measured on the demo (benchmarks/bench_options.py) 0.04 s per
column once warm, 0.4 s for the first call (imports), 0.9 s for three columns with
the 30-year risk check (``g``).  So it runs in a worker thread on a copy of the
project and the table is marked out of date until it is back.  ``p`` switches to
the price list, which is edited in place; every edit goes through the Session
(validation, undo).
"""

from __future__ import annotations

import copy
import time
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.message import Message
from textual.widgets import DataTable, Static

from offgrid.catalogue import ROW_GROUPS, figure_entry, fill, find_input
from offgrid.catalogue.outcomes import outcome_key, outcome_value
from offgrid.design.result import Reason
from offgrid.project.model import PriceItem, Project, Variant
from offgrid.tui.fields import (
    CHEMISTRY_CHOICES,
    CONTROLLER_TYPES,
    PARTS_FIELDS,
    VOLTAGE_CHOICES,
    Field,
    parse_number,
)
from offgrid.tui.keys import focus_now
from offgrid.tui.messages import RevealAsked, WhyAsked, send
from offgrid.tui.screens.dialogs import ChoiceDialog, MessageDialog, PathDialog
from offgrid.tui.screens.why import find_reason
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import EditRejected, Session
from offgrid.tui.text import printable
from offgrid.tui.widgets.editbar import EditBar
from offgrid.tui.widgets.steady import SteadyTable

DIFF_MARK = "* "  # before the value, so a narrow column never crops it
LABEL_WIDTH = 28  # two spaces and the compared figures' labels (26 at most), or an input's (22)
RISK_YEARS = 30  # synthetic weather years per column, as in section 7 Risk
KNOWN_FIELDS = {f.path: f for f in PARTS_FIELDS if isinstance(f, Field)}

#: Round-trip efficiency set with a chemistry preset: typical values, from memory.
PRESET_EFFICIENCY = {"flooded": 0.80, "agm": 0.85, "gel": 0.85, "lifepo4": 0.95}


@dataclass(frozen=True)
class Choice:
    """A common override offered when a variant is added."""

    key: str
    label: str
    path: str | None  # None: a preset that sets several paths (battery chemistry)
    choices: tuple[tuple[Any, str], ...] = ()


COMMON: tuple[Choice, ...] = (
    Choice("controller", "Controller type (MPPT or PWM)", "controller.type", CONTROLLER_TYPES),
    Choice(
        "chemistry", "Battery chemistry preset (type, depth, efficiency)", None, CHEMISTRY_CHOICES
    ),
    Choice("voltage", "System voltage", "choices.system_voltage", VOLTAGE_CHOICES),
    Choice("autonomy", "Days of autonomy", "choices.autonomy_days"),
    Choice("dod", "Max depth of discharge", "choices.max_dod"),
    Choice("growth", "Load growth margin", "choices.load_growth_pct"),
    Choice("ageing", "End-of-life capacity", "choices.ageing_factor"),
    Choice("soiling", "Soiling loss (fraction kept)", "choices.derates.soiling"),
)


def chemistry_preset(project: Project, chemistry: str) -> dict[str, Any]:
    """Overrides for a battery of ``chemistry``: its depth of discharge and efficiency.

    The unit voltage is rounded to whole cells of that chemistry (a 2 V lead-acid cell
    becomes one 3.2 V lithium iron phosphate cell), so the bank can still be laid out.
    """
    from offgrid.design.battery import CHEMISTRIES

    chem = CHEMISTRIES[chemistry]
    out: dict[str, Any] = {
        "battery.chemistry": chemistry,
        "battery.max_dod": chem.default_max_dod,
        "battery.efficiency": PRESET_EFFICIENCY[chemistry],
    }
    unit_v = project.battery.nominal_voltage_v
    cell_v = chem.cell_voltage_v
    cells = max(1, round(unit_v / cell_v))
    if abs(cells * cell_v - unit_v) > 1e-6:
        out["battery.nominal_voltage_v"] = round(cells * cell_v, 2)
    return out


def unique_name(names: list[str], wanted: str) -> str:
    name, n = wanted, 2
    while name in names:
        name, n = f"{wanted} ({n})", n + 1
    return name


def override_label(path: str) -> str:
    """The catalogue's label of the input at ``path``, else the path itself."""
    entry = find_input(path)
    return entry.label if entry else path


def parse_override(path: str, text: str) -> Any:
    """The value typed for an override: through the field's own reader when it is known."""
    f = KNOWN_FIELDS.get(path)
    if f is not None:
        value = f.parse(text)
        if value is None:
            raise ValueError(f"{f.label}: a variant needs a value here, not 'auto'")
        return value
    raw = text.strip()
    if not raw:
        raise ValueError(f"{path}: type a value")
    try:
        number = parse_number(raw)
    except ValueError:
        return raw
    return int(number) if number == int(number) and "." not in raw else number


@dataclass
class OptionsRun:
    comparison: Any  # VariantComparison
    project_text: str
    seconds: float
    with_risk: bool = False


class VariantTable(SteadyTable):
    """Base and variants side by side; one column each."""

    BINDINGS = [
        Binding("enter", "select_cursor", "Edit", id="options.edit"),
        Binding(
            "a",
            "add_variant",
            "Add",
            id="options.add",
            tooltip="A variant of the design with one change",
        ),
        Binding(
            "x",
            "delete_variant",
            "Delete",
            id="options.delete",
            tooltip="Remove the option under the cursor",
        ),
        Binding(
            "c",
            "add_change",
            "Add change",
            id="options.change",
            tooltip="One more change in the option under the cursor",
        ),
    ]

    class Command(Message):
        """A key of the table, for the Options section: add, change or delete."""

        def __init__(self, what: str) -> None:
            super().__init__()
            self.what = what

    def action_add_variant(self) -> None:
        send(self, self.Command("add_variant"))

    def action_add_change(self) -> None:
        send(self, self.Command("add_change"))

    def action_delete_variant(self) -> None:
        send(self, self.Command("delete_variant"))


class PriceTable(SteadyTable):
    """The price list: part, unit price, currency, note; then the parts still unpriced."""

    KEY_GROUP = "prices (p)"

    BINDINGS = [
        Binding("enter", "select_cursor", "Edit", id="prices.edit"),
        Binding("a", "add_price", "Add", id="prices.add", tooltip="A new line in the price list"),
        Binding(
            "x",
            "delete_price",
            "Delete",
            id="prices.delete",
            tooltip="Remove the price under the cursor",
        ),
        Binding(
            "i", "import_prices", "Import", id="prices.import", tooltip="Read a price list CSV file"
        ),
    ]

    class Command(Message):
        """A key of the table, for the Options section: add, delete or import prices."""

        def __init__(self, what: str) -> None:
            super().__init__()
            self.what = what

    def action_add_price(self) -> None:
        send(self, self.Command("add_price"))

    def action_delete_price(self) -> None:
        send(self, self.Command("delete_price"))

    def action_import_prices(self) -> None:
        send(self, self.Command("import_prices"))


#: The base design's cost rows under the price list, by catalogue path (label, unit,
#: digits there; each is also the key of its reason in ``LifecycleCost.reasons``).
BASE_COST_ROWS = ("costs.capital", "costs.lcc", "costs.cost_per_kwh")


class OptionsSection(Section):
    section_id = "options"
    KEY_WIDGETS = (VariantTable, PriceTable)
    help_text = (
        "The project's variants beside the base design, each figure that differs "
        "marked with *; and the price list that the costs use (p switches). Enter "
        "edits the value under the cursor; w explains a figure or a cost."
    )

    BINDINGS = [
        Binding(
            "p",
            "toggle_prices",
            "Prices",
            id="options.prices",
            tooltip="Show and edit the project's price list",
        ),
        Binding("g", "toggle_risk", "Risk", id="options.risk"),
    ]

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.result: OptionsRun | None = None
        self.running = False
        self.showing_prices = False
        self.with_risk = False  # also simulate every column (LOLP, unmet energy)
        self._rows: list[Any] = []  # ComparisonRow, or ("name", None)
        self._price_rows: list[tuple[str, Any]] = []  # ("price", index) / ("missing", key) ...
        self._cost: Any = None

    def compose(self) -> ComposeResult:
        yield Static(id="options-status", classes="table-title")
        yield VariantTable(id="options-table", cursor_type="cell", zebra_stripes=False)
        yield PriceTable(id="prices-table", cursor_type="cell", zebra_stripes=False)
        yield EditBar(id="options-edit")

    @property
    def table(self) -> VariantTable:
        return self.query_one(VariantTable)

    @property
    def prices(self) -> PriceTable:
        return self.query_one(PriceTable)

    @property
    def editor(self) -> EditBar:
        return self.query_one(EditBar)

    def first_focus(self):
        return self.prices if self.showing_prices else self.table

    # ------------------------------------------------------------------ drawing
    def show(self, session: Session) -> None:
        self.table.display = not self.showing_prices
        self.prices.display = self.showing_prices
        if self.showing_prices:
            self._fill_prices(session)
        else:
            fresh = (
                self.result is not None
                and self.result.project_text == session.text()
                and self.result.with_risk == self.with_risk
            )
            if not fresh and not self.running:
                self._start(session)
            self._status(session)
            self._fill()

    def _status(self, session: Session) -> None:
        status = self.query_one("#options-status", Static)
        n = len(session.project.variants)
        if self.running:
            what = f", {RISK_YEARS} weather years each" if self.with_risk else ""
            status.update(
                Text(
                    f"Designing the base and {n} option(s){what}... (you can keep working)",
                    style="bold",
                )
            )
        elif self.result is not None and self.result.project_text != session.text():
            status.update(Text("\u26a0 Out of date: the project changed.", style="bold reverse"))
        elif not n:
            status.update(
                Text(
                    "No options yet: a adds one (one change against the base). p: prices",
                    style="bold",
                )
            )
        else:
            risk = "g: risk off" if self.with_risk else "g: risk"
            status.update(
                Text(
                    f"Base and {n} option(s); * differs from the base "
                    f"({self.result.seconds:.1f} s). p: prices, {risk}"
                    if self.result
                    else "",
                    style="bold",
                )
            )

    def _start(self, session: Session) -> None:
        self.running = True
        self._compare(
            copy.deepcopy(session.project), session.base_dir, session.text(), self.with_risk
        )

    @work(thread=True, exclusive=True, group="options")
    def _compare(self, project: Project, base: Path, text: str, with_risk: bool) -> None:
        from textual.worker import get_current_worker

        worker = get_current_worker()
        t0 = time.perf_counter()
        try:
            from offgrid.economics.variants import compare_variants

            simulate = None
            if with_risk:
                from offgrid.simulate.run import simulate_project

                def simulate(proj, _design):
                    if worker.is_cancelled:
                        raise RuntimeError("stopped")
                    return simulate_project(
                        proj, base, years=RISK_YEARS, with_tradeoff=False
                    ).reliability

            comparison = compare_variants(project, base, simulate=simulate)
        except Exception as exc:  # a message for the user, not a crash
            if not worker.is_cancelled:
                self.app.call_from_thread(self._failed, str(exc))
            return
        if not worker.is_cancelled:
            run = OptionsRun(comparison, text, time.perf_counter() - t0, with_risk)
            self.app.call_from_thread(self._done, run)

    def _done(self, run: OptionsRun) -> None:
        self.running = False
        self.result = run
        if self.is_attached and self.work.session is not None and not self.showing_prices:
            self.show(self.session)

    def _failed(self, message: str) -> None:
        self.running = False
        self.app.notify(
            f"Options could not be compared: {message}", severity="error", markup=False, timeout=6
        )

    def _fill(self) -> None:
        table = self.table
        keep = table.cursor_coordinate
        table.clear(columns=True)
        self._rows = []
        if self.result is None:
            return
        cmp = self.result.comparison
        cols = cmp.columns
        room = max(10, min(26, (76 - LABEL_WIDTH) // max(1, len(cols)) - 2))
        table.add_column("", width=LABEL_WIDTH, key="label")
        for k in range(len(cols)):
            head = "Base" if k == 0 else f"Option {k}"
            table.add_column(Text(head, style="bold"), width=room, key=f"c{k}")
        table.add_row(Text("Name", style="bold"), *[Text(printable(c.name)) for c in cols])
        self._rows.append(("name", None))
        if any(c.error for c in cols):
            table.add_row(
                Text("Problem", style="bold"), *[Text(printable(c.error or "-")) for c in cols]
            )
            self._rows.append(("error", None))
        group = ""
        titles = ROW_GROUPS  # the catalogue's headings (offgrid/catalogue/composites.py)
        for row in cmp.rows:
            if row.group != group:
                group = row.group
                table.add_row(
                    Text(titles.get(group, group), style="bold underline"), *["" for _ in cols]
                )
                self._rows.append(("heading", None))
            label = override_label(row.label) if row.group == "choices" else row.label
            unit = f" {row.unit}" if row.unit else ""
            cells = []
            for text, diff, raw in zip(row.texts, row.differs, row.values, strict=True):
                numeric = isinstance(raw, int | float) and not isinstance(raw, bool)
                value = printable(text) + (unit if numeric else "")
                cells.append(
                    Text(DIFF_MARK + value, style="bold reverse") if diff else Text("  " + value)
                )
            table.add_row(Text("  " + label), *cells)
            self._rows.append(row)
        if table.row_count:
            table.move_cursor(
                row=min(keep.row, table.row_count - 1),
                column=min(max(1, keep.column), len(cols)),
                animate=False,
            )

    # ------------------------------------------------------------------ prices
    def _fill_prices(self, session: Session) -> None:
        table = self.prices
        keep = table.cursor_coordinate
        table.clear(columns=not table.columns)
        if not table.columns:
            table.add_column("Part", width=34, key="part")
            table.add_column("Unit price", width=11, key="price")
            table.add_column("Currency", width=8, key="currency")
            table.add_column("Note", key="note")
        self._price_rows = []
        project = session.project
        cur = project.economics.currency
        for i, item in enumerate(project.prices):
            table.add_row(
                Text(printable(item.part)),
                Text(f"{item.unit_price:,.2f}"),
                Text(cur),
                Text(printable(item.note)),
            )
            self._price_rows.append(("price", i))
        self._cost = self._base_cost(session)
        cost = self._cost
        status = self.query_one("#options-status", Static)
        if cost is not None and cost.missing:
            table.add_row(
                Text("No price yet (Enter gives one)", style="bold underline"), "", "", ""
            )
            self._price_rows.append(("heading", None))
            for key in cost.missing:
                table.add_row(
                    Text("  " + printable(key)), Text("missing", style="bold"), Text(cur), ""
                )
                self._price_rows.append(("missing", key))
        if cost is not None:
            table.add_row(Text("Cost of the base design", style="bold underline"), "", "", "")
            self._price_rows.append(("heading", None))
            for path in BASE_COST_ROWS:
                e = figure_entry(path)
                value = outcome_value(cost, path)
                shown = "no price" if value is None else f"{e.shown(value):,.{e.digits}f}"
                table.add_row(
                    Text("  " + e.label), Text(shown, style="bold"), Text(e.unit_in(cur)), ""
                )
                self._price_rows.append(("cost", path))
        if cost is None:
            state = ", no design yet to price (see the headline). a adds a line"
        elif cost.missing:
            state = f", {len(cost.missing)} part(s) without a price. w: formula"
        else:
            state = ", every part priced. w: formula"
        status.update(
            Text(f"Price list: {len(project.prices)} line(s){state}. p: options", style="bold")
        )
        if table.row_count:
            table.move_cursor(
                row=min(keep.row, table.row_count - 1), column=keep.column, animate=False
            )

    def _base_cost(self, session: Session):
        d = session.design
        if d is None:
            return None
        from offgrid.economics.bom import bill_of_materials
        from offgrid.economics.costs import lifecycle_cost

        try:
            return lifecycle_cost(session.project, d, bill_of_materials(session.project, d))
        except (ValueError, KeyError) as exc:
            self.app.notify(f"No cost: {exc}", severity="warning", markup=False, timeout=4)
            return None

    def on_variant_table_command(self, message: VariantTable.Command) -> None:
        message.stop()
        {
            "add_variant": self.action_add_variant,
            "add_change": self.action_add_change,
            "delete_variant": self.action_delete_variant,
        }[message.what]()

    def on_price_table_command(self, message: PriceTable.Command) -> None:
        message.stop()
        {
            "add_price": self.action_add_price,
            "delete_price": self.action_delete_price,
            "import_prices": self.action_import_prices,
        }[message.what]()

    def action_toggle_prices(self) -> None:
        self.editor.close()
        self.showing_prices = not self.showing_prices
        self.show(self.session)
        focus_now(self.first_focus())

    def action_show_prices(self) -> None:
        if not self.showing_prices:
            self.action_toggle_prices()

    def action_toggle_risk(self) -> None:
        self.with_risk = not self.with_risk
        self.app.notify(
            f"Options compared with {RISK_YEARS} synthetic weather years each "
            "(loss-of-load, unmet energy)."
            if self.with_risk
            else "Options compared without the risk check.",
            timeout=3,
        )
        if self.showing_prices:
            self.action_toggle_prices()
        else:
            self.show(self.session)

    def _price_row(self) -> tuple[str, Any]:
        if not self._price_rows:
            return ("none", None)
        return self._price_rows[min(self.prices.cursor_row, len(self._price_rows) - 1)]

    def _edit_price(self, index: int | None, column: str, part: str = "") -> None:
        project = self.session.project
        cur = project.economics.currency
        if column == "currency":
            self._edit_currency()
            return
        if index is None:  # a part of the design without a price: add its line
            self._ask_price(part, None)
            return
        item = project.prices[index]
        if column == "part":
            self._edit_text(
                f"prices[{index + 1}].part",
                "Part key",
                item.part,
                "a key from the bill of materials, e.g. controller:MPPT or cable:copper 6 mm2",
            )
        elif column == "note":
            self._edit_text(f"prices[{index + 1}].note", "Note", item.note, "any text")
        else:
            self._ask_price(item.part, index, f"{item.unit_price:g}", cur)

    def _edit_text(self, path: str, label: str, text: str, hint: str) -> None:
        def apply(typed: str) -> str | None:
            try:
                self.session.set_value(path, typed.strip() if label == "Part key" else typed)
            except EditRejected as exc:
                return self.problems_text(exc)
            self.edited(f"{label} set")
            return None

        self.editor.start(label, text, apply, hint, back=self.prices)

    def _edit_currency(self) -> None:
        def apply(typed: str) -> str | None:
            code = typed.strip().upper()
            if not code or len(code) > 5 or not code.isalpha():
                return "type a currency code of letters, e.g. USD, EUR, KES"
            self.session.set_value("economics.currency", code)
            self.edited("Currency set")
            return None

        self.editor.start(
            "Currency of every price (economics.currency)",
            self.session.project.economics.currency,
            apply,
            "one currency for the whole price list",
            back=self.prices,
        )

    def _ask_price(self, part: str, index: int | None, text: str = "", currency: str = "") -> None:
        cur = currency or self.session.project.economics.currency

        def apply(typed: str) -> str | None:
            if not typed.strip():
                return f"type the price of one unit of '{part}' in {cur}"
            try:
                price = parse_number(typed, cur)
            except ValueError as exc:
                return str(exc)

            def put(p: Project) -> None:
                if index is None:
                    p.prices.append(PriceItem(part=part, unit_price=price))
                else:
                    p.prices[index].unit_price = price

            at = len(self.session.project.prices) + 1 if index is None else index + 1
            try:
                self.session.change(put, focus=f"prices[{at}].unit_price")
            except EditRejected as exc:
                return self.problems_text(exc)
            self.edited("Price set")
            return None

        self.editor.start(
            f"Unit price of {printable(part)} ({cur})",
            text,
            apply,
            "price of one unit, above zero",
            back=self.prices,
        )

    def action_add_price(self) -> None:
        cost = self._cost
        start = cost.missing[0] if cost is not None and cost.missing else ""

        def apply(typed: str) -> str | None:
            part = typed.strip()
            if not part:
                return "type a part key, e.g. module, battery, controller:MPPT, fuse"
            if any(p.part.strip() == part for p in self.session.project.prices):
                return f"'{part}' already has a price: edit its line instead"
            self.call_after_refresh(self._ask_price, part, None)
            return None

        self.editor.start(
            "New price: part key",
            start,
            apply,
            "a bill-of-materials key; the kind alone (cable) prices every part of that kind",
            back=self.prices,
        )

    def action_delete_price(self) -> None:
        what, index = self._price_row()
        if what != "price":
            self.app.notify("Put the cursor on a line of the price list.", timeout=3)
            return
        part = self.session.project.prices[index].part
        self.session.change(lambda p: p.prices.pop(index))
        self.edited()
        self.app.notify(f"Price of {printable(part)} deleted (u undoes).", markup=False, timeout=3)

    def action_import_prices(self) -> None:
        def chosen(path: Path | None) -> None:
            if path is not None:
                self.import_prices(path)

        self.app.push_screen(
            PathDialog(
                "Import a price list (CSV: part, unit_price)", suffixes=(".csv",), verb="reads it"
            ),
            chosen,
        )

    def import_prices(self, path: Path) -> None:
        from offgrid.economics.prices import PriceListError, load_price_csv, merge_prices

        try:
            items = load_price_csv(path)
        except (OSError, PriceListError) as exc:
            self.app.push_screen(
                MessageDialog(
                    "That price list cannot be used", f"{exc}\n\nThe price list was not changed."
                )
            )
            return
        try:
            self.session.change(lambda p: setattr(p, "prices", merge_prices(p.prices, items)))
        except EditRejected as exc:
            self.app.push_screen(
                MessageDialog("That price list cannot be used", self.problems_text(exc))
            )
            return
        self.edited()
        self.app.notify(
            f"{len(items)} price(s) read from {printable(path.name)} (u undoes).",
            markup=False,
            timeout=4,
        )

    # ------------------------------------------------------------------ variants
    def _column(self) -> int:
        """Index of the compared column under the cursor (0 is the base)."""
        return max(0, self.table.cursor_column - 1)

    def _variant_index(self) -> int | None:
        k = self._column()
        return k - 1 if 1 <= k <= len(self.session.project.variants) else None

    def on_data_table_cell_selected(self, event: DataTable.CellSelected) -> None:
        event.stop()
        if event.data_table is self.prices:
            what, index = self._price_row()
            column = str(event.cell_key.column_key.value)
            if what == "price":
                self._edit_price(index, column)
            elif what == "missing":
                self._edit_price(None, "price", part=index)
            elif what == "cost":
                send(self, WhyAsked())
            return
        if not self._rows or self.result is None:
            return
        row = self._rows[min(self.table.cursor_row, len(self._rows) - 1)]
        vi = self._variant_index()
        if isinstance(row, tuple):
            if row[0] == "name" and vi is not None:
                self._rename(vi)
            elif row[0] == "name":
                self.app.notify("The base is the project itself; a adds an option.", timeout=3)
            return
        if row.group != "choices":
            self.app.notify("A computed figure: w explains it.", timeout=3)
            return
        if vi is None:
            send(self, RevealAsked(row.path))  # the base value is edited where it lives
            return
        self._edit_override(vi, row.path)

    def _rename(self, vi: int) -> None:
        v = self.session.project.variants[vi]

        def apply(typed: str) -> str | None:
            try:
                self.session.set_value(f"variants[{vi + 1}].name", typed.strip())
            except EditRejected as exc:
                return self.problems_text(exc)
            self.edited("Option renamed")
            return None

        self.editor.start(
            "Name of the option", v.name, apply, "a short name; names must differ", back=self.table
        )

    def _set_override(self, vi: int, path: str, value: Any) -> str | None:
        """Put ``path = value`` in variant ``vi``; None if accepted, else the problem."""
        from offgrid.economics.variants import apply_variant, flatten_overrides

        def put(p: Project) -> None:
            v = p.variants[vi]
            v.overrides = dict(flatten_overrides(v.overrides))
            v.overrides[path] = value
            apply_variant(p, v)  # raises ValueError naming the path when it does not fit

        try:
            self.session.change(put, focus=f"variants[{vi + 1}].overrides")
        except EditRejected as exc:
            return self.problems_text(exc)
        self.edited(f"{override_label(path)} set")
        return None

    def _edit_override(self, vi: int, path: str) -> None:
        from offgrid.economics.variants import flatten_overrides

        v = self.session.project.variants[vi]
        current = dict(flatten_overrides(v.overrides)).get(path)
        f = KNOWN_FIELDS.get(path)
        if f is not None and f.base_kind == "choice":
            options = [c for c in f.choices if c[0] != "auto" or path == "choices.system_voltage"]

            def chosen(value) -> None:
                if value is not None and value != current:
                    problem = self._set_override(vi, path, value)
                    if problem:
                        self.app.notify(problem, severity="error", markup=False, timeout=6)

            self.app.push_screen(
                ChoiceDialog(f"{printable(v.name)}: {override_label(path)}", options, current),
                chosen,
            )
            return
        text = "" if current is None else (f.edit_text(current) if f else str(current))

        def apply(typed: str) -> str | None:
            try:
                value = parse_override(path, typed)
            except ValueError as exc:
                return str(exc)
            return self._set_override(vi, path, value)

        self.editor.start(
            f"{printable(v.name)}: {override_label(path)}",
            text,
            apply,
            f.help() if f else path,
            back=self.table,
        )

    def action_add_change(self) -> None:
        """One more change in the option under the cursor."""
        vi = self._variant_index()
        if vi is None:
            self.app.notify(
                "Put the cursor on an option's column first (a adds an option).", timeout=3
            )
            return
        self.action_add_variant(into=vi)

    def action_add_variant(self, into: int | None = None) -> None:
        options = [(c.key, c.label) for c in COMMON]

        def picked(key) -> None:
            if key is None:
                return
            choice = next(c for c in COMMON if c.key == key)
            if choice.choices:
                values = [(v, lbl) for v, lbl in choice.choices]

                def valued(value) -> None:
                    if value is not None:
                        self._add(choice, value, into)

                self.app.push_screen(ChoiceDialog(choice.label, values), valued)
            else:
                self._ask_value(choice, into)

        title = (
            "New option: what does it change?"
            if into is None
            else f"{printable(self.session.project.variants[into].name)}: add a change"
        )
        self.app.push_screen(ChoiceDialog(title, options), picked)

    def _ask_value(self, choice: Choice, into: int | None = None) -> None:
        f = KNOWN_FIELDS.get(choice.path or "")
        from offgrid.tui.session import get_path

        now = get_path(self.session.project, choice.path)
        start = f.edit_text(now) if f is not None and now is not None else ""

        def apply(typed: str) -> str | None:
            try:
                value = parse_override(choice.path, typed)
            except ValueError as exc:
                return str(exc)
            return self._add(choice, value, into)

        self.editor.start(
            f"New option: {choice.label}", start, apply, f.help() if f else "", back=self.table
        )

    def _add(self, choice: Choice, value: Any, into: int | None = None) -> str | None:
        """Add a variant with the chosen override (or add it to variant ``into``).

        Returns None if accepted, else the problem.
        """
        from offgrid.economics.variants import apply_variant, flatten_overrides

        project = self.session.project
        if choice.path is None:
            overrides = chemistry_preset(project, value)
            shown = dict(CHEMISTRY_CHOICES)[value]
        else:
            overrides = {choice.path: value}
            f = KNOWN_FIELDS.get(choice.path)
            shown = f.show(value) if f is not None else str(value)
        name = unique_name(
            [v.name for v in project.variants], f"{choice.label.split(' (')[0]}: {shown}"[:40]
        )
        variant = Variant(name=name, overrides=overrides, note="added in the options section")
        at = len(project.variants) + 1 if into is None else into + 1

        def put(p: Project) -> None:
            if into is None:
                p.variants.append(variant)
                apply_variant(p, variant)
                return
            v = p.variants[into]
            v.overrides = {**dict(flatten_overrides(v.overrides)), **overrides}
            apply_variant(p, v)

        try:
            self.session.change(put, focus=f"variants[{at}].overrides")
        except EditRejected as exc:
            problem = self.problems_text(exc)
            self.app.notify(problem, severity="error", markup=False, timeout=6)
            return problem
        self.edited()
        if into is None:
            self.app.notify(
                f"Option '{printable(name)}' added; Enter on its name renames it.",
                markup=False,
                timeout=4,
            )
        else:
            self.app.notify(
                f"{choice.label.split(' (')[0]}: {shown} added to "
                f"'{printable(project.variants[into].name)}'.",
                markup=False,
                timeout=4,
            )
        return None

    def action_delete_variant(self) -> None:
        vi = self._variant_index()
        if vi is None:
            self.app.notify("Put the cursor on an option's column (the base stays).", timeout=3)
            return
        name = self.session.project.variants[vi].name
        self.session.change(lambda p: p.variants.pop(vi))
        self.edited()
        self.app.notify(f"Option '{printable(name)}' deleted (u undoes).", markup=False, timeout=3)

    # ------------------------------------------------------------------ why
    def figure(self) -> Figure | None:
        if self.showing_prices:
            what, label = self._price_row()
            cost = self._cost
            if what == "cost" and cost is not None:
                return Figure(
                    figure_entry(label).label,
                    self._cost_text(cost, label),
                    None,
                    cost.reasons.get(label),
                    extra=self._cost_extra(cost),
                )
            if what == "price":
                item = self.session.project.prices[label]
                return Figure(
                    item.part,
                    f"{item.unit_price:g} {self.session.project.economics.currency}",
                    None,
                    extra="A price you typed or imported; the costs use it as given.",
                )
            return None
        if not self._rows or self.result is None:
            return None
        row = self._rows[min(self.table.cursor_row, len(self._rows) - 1)]
        if isinstance(row, tuple):
            return None
        k = min(self._column(), len(row.texts) - 1)
        col = self.result.comparison.columns[k]
        value = row.texts[k]
        label = f"{row.label} ({col.name})"
        if row.group == "cost" and col.cost is not None:
            reason = (
                col.cost.reasons.get(row.path)
                if row.path in col.cost.reasons
                else Reason(
                    "battery service life used for replacements", (), col.cost.battery_life_source
                )
            )
            return Figure(label, value, None, reason, extra=self._cost_extra(col.cost))
        if row.group == "reliability" and col.reliability is not None:
            key = outcome_key(figure_entry(row.path).explained_by)
            reason = col.reliability.reasons.get(key)
            return Figure(
                label,
                value,
                None,
                reason,
                extra=f"{RISK_YEARS} synthetic weather "
                "years through this option's design, as in 7 Risk.",
            )
        if row.group == "choices":
            return Figure(
                label,
                value,
                None,
                extra="A value of this option (or of the base "
                "project); the engine uses it as given.",
            )
        if col.design is not None:
            path, reason = find_reason(col.design.reasons, row.path)
            extra = (
                "The number of warnings and notes of this design; 6 Cautions lists "
                "those of the base."
                if row.path == "warnings"
                else ""
            )
            return Figure(label, value, path, reason, extra=extra)
        return Figure(label, value, None, extra=col.error or "")

    @staticmethod
    def _cost_text(cost, path: str) -> str:
        value = outcome_value(cost, path)
        return "-" if value is None else figure_entry(path).text(value, currency=cost.currency)

    @staticmethod
    def _cost_extra(cost) -> str:
        if cost.missing:
            return cost.message()
        # the catalogue's sentence (offgrid/catalogue/composites.py), its figures' units
        sums = fill("costs.sums_note", cost, cost.currency)
        return f"Over {cost.economics.life_years} years: {sums} ({cost.battery_life_source})."
