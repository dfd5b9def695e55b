"""Section 3, Parts: design choices, the module, battery unit, controller and inverter."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.widgets import DataTable

from offgrid.tui.fields import MODULE_FIELDS, PARTS_FIELDS, Field
from offgrid.tui.keys import focus_now
from offgrid.tui.screens.dialogs import ChoiceDialog
from offgrid.tui.screens.sheet import SheetDialog
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import EditRejected, Session, get_path, set_path
from offgrid.tui.widgets.editbar import EditBar
from offgrid.tui.widgets.fieldtable import FieldTable


class PartsSection(Section):
    section_id = "parts"
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
