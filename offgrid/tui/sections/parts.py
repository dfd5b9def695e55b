"""Section 3, Parts: design choices, the module, battery unit, controller and inverter."""

from __future__ import annotations

import dataclasses

from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import DataTable

from offgrid.tui.fields import MODULE_FIELDS, PARTS_FIELDS, Field
from offgrid.tui.keys import focus_now
from offgrid.tui.screens.dialogs import ChoiceDialog
from offgrid.tui.screens.sheet import SheetDialog
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import EditRejected, Session, get_path, set_path
from offgrid.tui.widgets.editbar import EditBar
from offgrid.tui.widgets.fieldtable import FieldTable

#: The first word of a field's path -> the catalogue kind the picker lists for it.
CATALOGUE_KIND = {
    "module": "modules",
    "battery": "batteries",
    "controller": "controllers",
    "inverter": "inverters",
}


class PartsSection(Section):
    section_id = "parts"
    BINDINGS = [
        Binding("c", "from_catalogue", "From catalogue", show=False, id="parts.catalogue"),
        Binding("b", "cheapest", "Cheapest parts", show=False, id="parts.cheapest"),
    ]
    help_text = (
        "The parts the system is built from and the design choices. Enter edits the "
        "field under the cursor; the module's datasheet is edited as a whole, because "
        "its values must agree with each other."
    )

    def compose(self) -> ComposeResult:
        yield FieldTable(PARTS_FIELDS, id="parts-fields")
        yield EditBar(id="parts-edit")

    @property
    def fields(self) -> FieldTable:
        return self.query_one(FieldTable)

    @property
    def editor(self) -> EditBar:
        return self.query_one(EditBar)

    def first_focus(self):
        return self.fields

    def show(self, session: Session) -> None:
        self.fields.fill(session.project, session.design, {})

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        event.stop()
        field = self.fields.current_field()
        if field is None:
            return
        if field.group_form == "module":
            self._edit_module(field)
        elif field.base_kind == "choice":
            self._choose(field)
        else:
            self._edit(field)

    def _edit(self, field: Field) -> None:
        self.edit_field(field, self.editor, self.fields)

    def _choose(self, field: Field) -> None:
        current = get_path(self.session.project, field.path)

        def chosen(value) -> None:
            if value is None or value == current:
                return
            try:
                self.session.set_value(field.path, value)
            except EditRejected as exc:
                self.app.notify(self.problems_text(exc), severity="error", markup=False)
                return
            self.edited(f"{field.label}: {field.show(value)}")

        self.app.push_screen(
            ChoiceDialog(field.label, list(field.choices), current, note=field.help()), chosen
        )

    def _edit_module(self, field: Field) -> None:
        project = self.session.project

        def apply(values: dict[str, object]) -> dict[str, str]:
            """Set all datasheet values at once; return problems by path (empty: accepted)."""

            def put(p) -> None:
                for path, value in values.items():
                    set_path(p, path, value)

            try:
                self.session.change(put)
            except EditRejected as exc:
                return {p.path: p.message for p in exc.problems}
            self.edited("Module datasheet set")
            return {}

        self.app.push_screen(
            SheetDialog(
                "Module datasheet (values at STC)", MODULE_FIELDS, project, apply, focus=field.path
            )
        )

    def action_from_catalogue(self) -> None:
        """Pick the part under the cursor (module, battery, controller, inverter) from the
        parts catalogue; the project keeps its whole row and price (undo takes it back)."""
        from offgrid.economics.costs import money
        from offgrid.stock.catalogue import default_catalogue_dir, load_catalogue
        from offgrid.stock.choose import price_in, rate_sets_for
        from offgrid.stock.project_parts import put_part

        field = self.fields.current_field()
        kind = CATALOGUE_KIND.get(field.path.split(".")[0]) if field else None
        if kind is None:
            self.app.notify(
                "Put the cursor on a module, battery, controller or inverter field first.",
                markup=False,
            )
            return
        folder, demo = default_catalogue_dir()
        cat = load_catalogue(folder)
        parts = cat.of(kind)
        if cat.problems:
            self.app.notify(
                f"{len(cat.problems)} catalogue row(s) skipped; `offgrid parts list` "
                "shows them with their lines.",
                severity="warning",
                markup=False,
            )
        if not parts:
            self.app.notify(f"The catalogue has no {kind}.", markup=False)
            return
        project = self.session.project
        rates, _ = rate_sets_for(project, cat)
        cur = project.economics.currency
        options = []
        for part in parts:
            value, _why = price_in(part, cur, *rates)
            price = money(value, cur) if value is not None else "no price"
            options.append((part.name, f"{part.name}  ({price})"))

        def chosen(name) -> None:
            part = cat.find(kind, name) if name is not None else None
            if part is None:
                return
            said: list[str] = []
            try:
                self.session.change(lambda p: said.append(put_part(p, part, rates)))
            except EditRejected as exc:
                self.app.notify(self.problems_text(exc), severity="error", markup=False)
                return
            self.edited(f"{part.name} from the catalogue")
            if said and said[0]:
                self.app.notify(said[0], severity="warning", markup=False)

        note = "Invented demonstration catalogue" if demo else f"Catalogue: {folder}"
        self.app.push_screen(ChoiceDialog(f"Catalogue {kind}", options, note=note), chosen)

    def action_cheapest(self) -> None:
        """Try every combination of the catalogue's parts (off the UI thread) and offer the
        cheapest few by capital; Enter takes one into the project."""
        import copy

        self.app.notify("Trying the catalogue's combinations...", timeout=3, markup=False)
        self._search(copy.deepcopy(self.session.project), self.session.base_dir)

    @work(thread=True, exclusive=True, group="parts-search")
    def _search(self, project, base) -> None:
        from offgrid.design.result import DesignError
        from offgrid.stock.catalogue import default_catalogue_dir, load_catalogue
        from offgrid.stock.choose import search

        try:
            cat = load_catalogue(default_catalogue_dir()[0])
            result = search(project, cat, base)
        except DesignError as exc:
            self.app.call_from_thread(
                self.app.notify, f"Cannot try combinations: {exc}", severity="error", markup=False
            )
            return
        self.app.call_from_thread(self._found, project, cat, result)

    def _found(self, project, cat, result) -> None:
        from offgrid.economics.costs import money
        from offgrid.stock.choose import rate_sets_for
        from offgrid.stock.project_parts import put_part

        n_ok = len(result.by_capital) + len(result.unpriced)
        reasons = ", ".join(
            f"{n} {code}" for code, n in sorted(result.reasons.items(), key=lambda kv: -kv[1])[:3]
        )
        note = (
            f"{result.tried} tried, {n_ok} meet the design, {result.tried - n_ok} rejected"
            + (f" ({reasons})" if reasons else "")
            + ". Capital / lifecycle cost of the main parts."
        )
        if not result.by_capital:
            self.app.notify("No priced combination meets the design. " + note, markup=False)
            return
        cur = result.currency
        options = []
        for i, x in enumerate(result.by_capital[:5]):
            inv = x.inverter.name if x.inverter else "no inverter"
            label = (
                f"{money(x.capital, cur)} / {money(x.lcc, cur)}, {x.system_voltage_v} V: "
                f"{x.module_count} x "
                f"{x.module.name}, {x.battery_units} x {x.battery.name}, "
                f"{x.controller_count} x {x.controller.name}, {inv}"
            )
            options.append((i, label))
        rates, _ = rate_sets_for(project, cat)

        def chosen(index) -> None:
            if index is None:
                return
            x = result.by_capital[index]
            parts = [p for p in (x.module, x.battery, x.controller, x.inverter) if p]

            def put(p) -> None:
                p.choices = dataclasses.replace(p.choices, system_voltage=x.system_voltage_v)
                for part in parts:
                    put_part(p, part, rates)

            try:
                self.session.change(put)
            except EditRejected as exc:
                self.app.notify(self.problems_text(exc), severity="error", markup=False)
                return
            self.edited(f"Catalogue combination {index + 1} taken")

        self.app.push_screen(ChoiceDialog("Cheapest combinations", options, note=note), chosen)

    def figure(self) -> Figure | None:
        field = self.fields.current_field()
        if field is None:
            return None
        d = self.session.design
        value = field.show(get_path(self.session.project, field.path), d)
        extra = "" if field.reason else "A value you typed or chose; the engine uses it as given."
        return Figure(field.label, value, field.reason, extra=extra)

    def reveal(self, path: str) -> bool:
        if self.fields.select_path(path):
            focus_now(self.fields)
            return True
        return False
