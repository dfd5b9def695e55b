"""Section 1, Place: the project, the site and its climate (pick one or type twelve months)."""

from __future__ import annotations

import dataclasses
import re
from pathlib import Path

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.widgets import DataTable, Static

from offgrid.project.model import ALL_MONTHS, ClimateChoice, MonthlyClimate, Project
from offgrid.tui.fields import PROJECT_FIELDS, Field, parse_number
from offgrid.tui.keys import focus_now
from offgrid.tui.screens.dialogs import ChoiceDialog, PathDialog
from offgrid.tui.sections.base import Figure, Section
from offgrid.tui.session import PLACEHOLDERS, EditRejected, Session, get_path
from offgrid.tui.text import printable
from offgrid.tui.widgets.editbar import EditBar
from offgrid.tui.widgets.fieldtable import FieldTable
from offgrid.tui.widgets.monthchart import MONTHS
from offgrid.tui.widgets.steady import SteadyTable

CLIMATE_FIELDS: tuple[Field | str, ...] = (
    "Climate",
    Field("climate"),
    Field("climate.record_low_c"),
)
ROWS = (
    ("insolation_kwh_m2_day", "Sun kWh/m2/d", "mean daily sun on the horizontal, kWh/m2/day"),
    ("temp_mean_c", "Mean temp C", "monthly mean air temperature, C"),
    ("temp_max_c", "Max temp C", "mean daily maximum, C (optional: '-' clears the row)"),
    ("temp_min_c", "Min temp C", "mean daily minimum, C (optional: '-' clears the row)"),
)
ARRAY_ROW = ("poa", "On array", "sun on the tilted array, computed")
WEATHER_SUFFIXES = (".toml", ".epw", ".csv", ".tm2", ".tmy2")


def climate_name(project: Project) -> str:
    c = project.climate
    if c.inline is not None:
        demo = " (demonstration data)" if c.inline.demo else ""
        return "own twelve months" + demo
    if c.ref:
        return c.ref
    return "none yet: press c to choose"


#: Width of a picker line (the wide dialog is 78 columns, less border, padding and scrollbar).
PICKER_WIDTH = 70


def climate_picker_entries(latitude_deg: float, longitude_deg: float):
    """The climates to offer (bundled and the user's) and how they are sorted.

    Nearest first from the site; a site still at 0, 0 (not set yet) sorts them by display
    name instead. Returns ``(entries, "distance" | "name")``.
    """
    from offgrid.climate.files import climate_library

    if latitude_deg == 0 and longitude_deg == 0:
        return sorted(climate_library(), key=lambda e: (e.title.lower(), e.name)), "name"
    return climate_library(near=(latitude_deg, longitude_deg)), "distance"


def _distance_text(km: float | None) -> str:
    if km is None:
        return "no coordinates"
    return f"{km:.1f} km" if km < 10 else f"{km:,.0f} km"


def climate_option_label(entry) -> Text:
    """Two lines: the display name with distance and origin; the source, dimmed."""
    title = printable(entry.title)
    if entry.demo and "demo" not in title.lower():
        title += " (demonstration data)"
    right = f"{_distance_text(entry.distance_km) if entry.distance_km is not None else ''}"
    right = f"{right} \u00b7 {entry.origin}" if right else entry.origin
    room = PICKER_WIDTH - len(right) - 2
    if len(title) > room:
        title = title[: room - 1] + "\u2026"
    source = printable(entry.source or "source not given").replace("\n", " ")
    if len(source) > PICKER_WIDTH - 2:
        source = source[: PICKER_WIDTH - 3] + "\u2026"
    return Text.assemble(
        (title, "bold"),
        " " * (PICKER_WIDTH - len(title) - len(right)),
        (right, "italic" if entry.origin == "yours" else ""),
        "\n",
        ("  " + source, "dim"),
    )


def checked_climate(climate: MonthlyClimate) -> None:
    """Raise ValueError (with the field) if the climate could not be saved and read back."""
    from offgrid.climate.files import climate_from_dict, climate_to_dict

    climate_from_dict(climate_to_dict(climate), where="climate")


class ClimateTable(SteadyTable):
    """Twelve months of the climate; a cell edits one month, or type twelve values at once."""

    BINDINGS = [Binding("enter", "select_cursor", "Edit month", id="climate.edit")]

    DEFAULT_CSS = """
    ClimateTable { height: 7; }
    """

    def __init__(self, **kwargs) -> None:
        super().__init__(cursor_type="cell", cell_padding=0, zebra_stripes=False, **kwargs)

    def fill(
        self,
        climate: MonthlyClimate | None,
        poa,
        design_month: int | None,
        untyped: dict[str, tuple[int, ...]] | None = None,
    ) -> None:
        """``untyped``: months of a row still holding placeholders, shown as ``?``."""
        untyped = untyped or {}
        keep = self.cursor_coordinate
        self.clear(columns=True)
        self.add_column(Text("Month"), width=13, key="label")
        for i, m in enumerate(MONTHS, start=1):
            arrow = "<" if getattr(self.app, "plain", False) else "\u25c2"
            mark = m + (arrow if design_month == i else " ")
            style = "bold reverse" if design_month == i else "bold"
            self.add_column(Text(mark.rjust(5), style=style), width=5, key=m)
        rows = [*ROWS, ARRAY_ROW]
        for key, label, _hint in rows:
            values = poa if key == "poa" else getattr(climate, key) if climate is not None else None
            cells = [Text(label, style="dim" if key == "poa" else "")]
            for i in range(12):
                if values is None or len(values) != 12:
                    cells.append(Text("-".rjust(5), style="dim"))
                elif i + 1 in untyped.get(key, ()):
                    cells.append(Text("?".rjust(5), style="bold"))  # not typed yet
                else:
                    digits = 2 if key in ("insolation_kwh_m2_day", "poa") else 1
                    cells.append(
                        Text(
                            f"{values[i]:.{digits}f}".rjust(5), style="dim" if key == "poa" else ""
                        )
                    )
            self.add_row(*cells, key=key)
        if keep.row < self.row_count:
            self.move_cursor(row=keep.row, column=max(1, keep.column), animate=False)
        else:
            self.move_cursor(row=0, column=1, animate=False)


class PlaceSection(Section):
    section_id = "place"
    KEY_WIDGETS = (ClimateTable,)
    help_text = (
        "Project and site details, and the climate: pick a bundled one, a file, or "
        "type the twelve monthly values in the table."
    )

    BINDINGS = [
        Binding(
            "c", "choose_climate", "Climate", id="place.climate", tooltip="Pick the site's climate"
        ),
        Binding(
            "m",
            "own_months",
            "Months",
            id="place.months",
            tooltip="Use your own monthly climate values",
        ),
        Binding("k", "check_climate", "Check", id="place.check"),
        Binding(
            "z",
            "horizon",
            "Horizon",
            id="place.horizon",
            tooltip="Type the hills and trees around the site",
        ),
    ]

    def compose(self) -> ComposeResult:
        yield FieldTable(PROJECT_FIELDS + CLIMATE_FIELDS, id="place-fields")
        yield Static(id="climate-title", classes="table-title")
        yield ClimateTable(id="climate-table")
        yield EditBar(id="place-edit")

    @property
    def fields(self) -> FieldTable:
        return self.query_one(FieldTable)

    @property
    def months(self) -> ClimateTable:
        return self.query_one(ClimateTable)

    @property
    def editor(self) -> EditBar:
        return self.query_one(EditBar)

    def first_focus(self):
        return self.fields

    # ------------------------------------------------------------------ drawing
    def show(self, session: Session) -> None:
        project, design = session.project, session.design
        special = {"climate": climate_name(project)}
        inline = project.climate.inline
        if inline is None:
            special["climate.record_low_c"] = (
                "from the climate file" if project.climate.ref else "-"
            )
        else:
            low = inline.record_low_c
            special["climate.record_low_c"] = (
                f"{low:g} C" if low is not None else "estimated from minima"
            )
        self.fields.fill(project, design, {}, special)
        climate = self._climate(session)
        poa = design.site.poa_kwh_m2_day if design else None
        dm = design.site.design_month if design else None
        untyped = session.months_to_type()
        self.months.fill(climate, poa, dm, untyped)
        if untyped:
            title = "Monthly climate (your own values; ? = not typed yet: Enter types a month)"
        elif inline is not None:
            title = "Monthly climate (your own values: Enter edits a month)"
        elif project.climate.ref:
            title = (
                f"Climate '{printable(project.climate.ref)}' \u00b7 Enter on a month "
                "edits your own copy"
            )
        else:
            title = "Monthly climate: none yet (press c to pick one, or m to type your own)"
        self.query_one("#climate-title", Static).update(Text(title, style="bold"))

    def _climate(self, session: Session) -> MonthlyClimate | None:
        c = session.project.climate
        if c.inline is not None:
            return c.inline
        if c.ref:
            try:
                from offgrid.design.sizing import resolve_climate

                return resolve_climate(session.project, session.base_dir)
            except ValueError:
                return None
        return None

    # ------------------------------------------------------------------ fields
    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        if event.data_table is not self.fields:
            return
        event.stop()
        field = self.fields.current_field()
        if field is None:
            return
        if field.kind == "climate":
            self.action_choose_climate()
            return
        if field.path == "climate.record_low_c":
            self._edit_record_low(field)
            return
        self.edit_field(field, self.editor, self.fields)

    def _edit_record_low(self, field: Field) -> None:
        project = self.session.project
        current = project.climate.inline.record_low_c if project.climate.inline else None
        text = "auto" if current is None else f"{current:g}"

        def apply(typed: str) -> str | None:
            try:
                value = field.parse(typed)

                def put(p: Project) -> None:
                    self._make_own(p)
                    p.climate.inline.record_low_c = value
                    checked_climate(p.climate.inline)

                self.session.change(put, focus="climate")
            except EditRejected as exc:
                return self.problems_text(exc)
            except ValueError as exc:
                return str(exc)
            self.edited("record low set")
            return None

        self.editor.start(
            field.label,
            text,
            apply,
            field.help() + "; setting it makes your own copy of the climate",
            back=self.fields,
        )

    # ------------------------------------------------------------------ months
    def on_data_table_cell_selected(self, event: DataTable.CellSelected) -> None:
        if event.data_table is not self.months:
            return
        event.stop()
        row, col = event.coordinate.row, event.coordinate.column
        if row >= len(ROWS):
            self.app.notify("This row is computed from the climate and the tilt.", timeout=3)
            return
        key, label, hint = ROWS[row]
        month = max(1, col)
        climate = self._climate(self.session)
        values = getattr(climate, key) if climate is not None else None
        fresh = climate is None or month in self.session.months_to_type().get(key, ())
        start = f"{values[month - 1]:g}" if values and not fresh else ""

        def apply(typed: str) -> str | None:
            try:
                self.session.change(
                    lambda p: self._put_months(p, key, month, typed), focus="climate"
                )
            except EditRejected as exc:
                return self.problems_text(exc)
            self.edited(f"{MONTHS[month - 1]} {label.lower()} set")
            return None

        what = f"{label} for {MONTHS[month - 1]} (or twelve values separated by spaces)"
        self.editor.start(what, start, apply, hint, back=self.months)

    def _make_own(self, p: Project) -> None:
        """Turn a referenced climate into the project's own copy (same values)."""
        if p.climate.inline is not None:
            return
        base = None
        if p.climate.ref:
            from offgrid.design.sizing import resolve_climate

            base = resolve_climate(p, self.session.base_dir)
        if base is None:  # placeholders, every month marked as still to type
            base = MonthlyClimate(
                insolation_kwh_m2_day=[PLACEHOLDERS["insolation_kwh_m2_day"]] * 12,
                temp_mean_c=[PLACEHOLDERS["temp_mean_c"]] * 12,
                source="typed by the user",
                months_to_type={key: ALL_MONTHS for key in PLACEHOLDERS},
            )
            own = base
        else:
            own = dataclasses.replace(
                base, source=f"own copy of {p.climate.ref}: {base.source}".strip()
            )
        p.climate = ClimateChoice(inline=own)

    def _put_months(self, p: Project, key: str, month: int, typed: str) -> None:
        self._make_own(p)
        climate = p.climate.inline
        assert climate is not None
        unit = "" if key.startswith("insolation") else "C"
        parts = [x.rstrip(",") for x in re.split(r"[\s;]+", typed.strip()) if x]
        if len(parts) == 1 and parts[0].count(",") >= 11:
            parts = [x for x in parts[0].split(",") if x]
        optional = key in ("temp_max_c", "temp_min_c")
        if typed.strip() in ("-", "") and optional:
            setattr(climate, key, None)
        elif len(parts) == 12:
            setattr(climate, key, [parse_number(s, unit) for s in parts])
            self._typed(climate, key, ALL_MONTHS)
        elif len(parts) == 1:
            values = getattr(climate, key)
            if values is None:
                raise ValueError(
                    "this row is empty: type all twelve values, January first, separated by spaces"
                )
            values = list(values)
            values[month - 1] = parse_number(parts[0], unit)
            setattr(climate, key, values)
            self._typed(climate, key, (month,))
        else:
            raise ValueError(f"type one value, or all twelve (you typed {len(parts)})")
        checked_climate(climate)

    @staticmethod
    def _typed(climate: MonthlyClimate, key: str, months: tuple[int, ...]) -> None:
        """Months of row ``key`` typed (whatever the value, even a placeholder's): no longer
        to type.  Part of the edit, so undo and redo bring the marks back with the values."""
        if key not in climate.months_to_type:
            return
        left = tuple(m for m in climate.months_to_type[key] if m not in months)
        marks = {k: m for k, m in climate.months_to_type.items() if k != key}
        climate.months_to_type = {**marks, key: left} if left else marks

    # ------------------------------------------------------------------ climate choice
    def action_choose_climate(self) -> None:
        site = self.session.project.site
        entries, sorted_by = climate_picker_entries(site.latitude_deg, site.longitude_deg)
        options: list[tuple[object, str | Text]] = []
        for e in entries:
            if e.error:
                options.append(
                    (
                        ("bad", e.name),
                        Text(f"{printable(e.title)}: cannot be read ({printable(e.error)})"),
                    )
                )
            else:
                options.append((("ref", e.name), climate_option_label(e)))
        options.append(
            (("own", ""), "Type twelve monthly values (starts from the current climate)")
        )
        options.append(
            (
                ("file", ""),
                "Import a weather file: EPW, TMY3, TMY2, monthly CSV, or "
                "an offgrid climate (.toml)...",
            )
        )
        current = self.session.project.climate
        now = ("ref", current.ref) if current.ref else ("own", "") if current.inline else None
        note = (
            "nearest first from the site"
            if sorted_by == "distance"
            else "by name (set the site's latitude and longitude for nearest first)"
        )
        note += " \u00b7 yours: from `offgrid climate import`"
        self.app.push_screen(
            ChoiceDialog("Climate for this site", options, now, note=note), self._climate_chosen
        )

    def _climate_chosen(self, choice) -> None:
        if not choice:
            return
        kind, name = choice
        if kind == "bad":
            self.app.notify("That climate file cannot be read.", severity="error")
        elif kind == "ref":
            self._use_ref(name)
        elif kind == "own":
            self.action_own_months()
        elif kind == "file":
            self.app.push_screen(
                PathDialog(
                    "Climate or weather file",
                    suffixes=WEATHER_SUFFIXES,
                    verb="reads it",
                    note="An offgrid climate (.toml) is used as it is; an hourly weather year "
                    "(EPW, TMY3, TMY2) or a monthly CSV is reduced to twelve months and "
                    "checked.",
                ),
                self._file_chosen,
            )

    def _file_chosen(self, path: Path | None) -> None:
        if path is None:
            return
        from offgrid.tui.screens.dialogs import MessageDialog

        path = path.resolve()
        if path.suffix.lower() == ".toml":
            from offgrid.climate.files import load_climate

            try:
                load_climate(path)
            except ValueError as exc:
                self.app.push_screen(MessageDialog("That climate file cannot be used", str(exc)))
                return
            self._use_ref(str(path))
            return
        self.app.notify(f"Importing {printable(path.name)}...", timeout=3, markup=False)
        self._import(path)

    @work(thread=True, exclusive=True, group="climate-import")
    def _import(self, path: Path) -> None:
        """Read and reduce a weather file (pvlib readers: slow to load, so off the UI thread)."""
        try:
            from offgrid.climate.importers import import_weather_file

            result = import_weather_file(path)
        except (ValueError, OSError, ImportError) as exc:
            self.app.call_from_thread(self._import_failed, path, str(exc))
            return
        self.app.call_from_thread(self._imported, path, result)

    def _import_failed(self, path: Path, message: str) -> None:
        from offgrid.tui.screens.dialogs import MessageDialog

        self.app.push_screen(
            MessageDialog(
                f"{printable(path.name)} was not imported",
                message + "\n\nThe project was not changed.",
            )
        )

    def _imported(self, path: Path, result) -> None:
        from offgrid.tui.screens.dialogs import MessageDialog

        climate = result.climate

        def put(p: Project) -> None:
            p.climate = ClimateChoice(inline=climate)
            if (
                p.site.latitude_deg == 0
                and p.site.longitude_deg == 0
                and climate.latitude_deg is not None
            ):
                p.site.latitude_deg = climate.latitude_deg
                p.site.longitude_deg = climate.longitude_deg or 0.0
                p.site.elevation_m = climate.elevation_m or p.site.elevation_m
            checked_climate(p.climate.inline)

        try:
            self.session.change(put, focus="climate")
        except EditRejected as exc:
            self._import_failed(path, self.problems_text(exc))
            return
        self.edited(f"Climate imported from {printable(path.name)}")
        lines = [
            f"Twelve monthly values from {path.name} ({result.kind}) are now this "
            "project's own climate.",
            f"Source: {climate.source}",
        ]
        lines += [f"Note: {n}" for n in result.notes]
        lines += [f"{f.severity.upper()}: {f.message}" for f in result.findings]
        self.app.push_screen(MessageDialog("Climate imported", "\n".join(lines)))

    # ------------------------------------------------------------------ checks
    def action_check_climate(self) -> None:
        climate = self._climate(self.session)
        if climate is None:
            self.app.notify("No climate to check yet: press c to choose one.", timeout=3)
            return
        self.app.notify("Checking the climate against the sun's geometry...", timeout=2)
        site = self.session.project.site
        self._check(climate, site.latitude_deg, site.longitude_deg, site.elevation_m)

    @work(thread=True, exclusive=True, group="climate-check")
    def _check(self, climate, lat: float, lon: float, elev: float) -> None:
        try:
            from offgrid.climate.checks import check_climate

            findings = check_climate(climate, lat, lon, elev)
        except (ValueError, ImportError) as exc:
            self.app.call_from_thread(self._import_failed, Path("climate"), str(exc))
            return
        self.app.call_from_thread(self._checked, findings)

    def _checked(self, findings) -> None:
        from offgrid.tui.screens.dialogs import ChoiceDialog, MessageDialog

        if not findings:
            self.app.push_screen(
                MessageDialog(
                    "Climate check",
                    "No problems found: the sun "
                    "values fit the site's clear-sky limits and the "
                    "temperatures agree with each other.",
                )
            )
            return
        options: list[tuple[object, str]] = []
        for f in findings:
            month = f" ({MONTHS[f.month - 1]})" if f.month else ""
            options.append((None, f"{f.severity.upper()}{month}: {f.message}"))
            for i, fix in enumerate(f.fixes):
                options.append(((f, i), f"   fix: {fix.label}"))

        def chosen(value) -> None:
            if not value:
                return
            finding, i = value
            from offgrid.climate.checks import apply_fix

            def put(p: Project) -> None:
                self._make_own(p)
                p.climate = ClimateChoice(inline=apply_fix(p.climate.inline, finding, i))
                checked_climate(p.climate.inline)

            try:
                self.session.change(put, focus="climate")
            except EditRejected as exc:
                self.app.notify(self.problems_text(exc), severity="error", markup=False)
                return
            self.edited(f"Climate fixed: {finding.fixes[i].label}", tell=True)

        self.app.push_screen(
            ChoiceDialog(
                "Climate check: what was found (Enter on a fix applies it to your own copy)",
                options,
                note="u undoes a fix",
            ),
            chosen,
        )

    def _use_ref(self, ref: str) -> None:
        from offgrid.climate.files import load_climate

        moved = []

        def put(p: Project) -> None:
            p.climate = ClimateChoice(ref=ref)
            c = load_climate(ref, self.session.base_dir)
            if p.site.latitude_deg == 0 and p.site.longitude_deg == 0 and c.latitude_deg:
                p.site.latitude_deg = c.latitude_deg
                p.site.longitude_deg = c.longitude_deg or 0.0
                p.site.elevation_m = c.elevation_m or p.site.elevation_m
                moved.append("latitude and longitude taken from the climate")

        try:
            self.session.change(put, focus="climate")
        except EditRejected as exc:
            self.app.notify(self.problems_text(exc), severity="error", markup=False)
            return
        note = f"Climate: {printable(ref)}" + (f"; {moved[0]}" if moved else "")
        self.edited(note, tell=True)

    def action_horizon(self) -> None:
        """Type the horizon profile (site.horizon_deg) as azimuth:elevation pairs."""
        from offgrid.climate.horizon import parse_horizon

        now = self.session.project.site.horizon_deg
        text = ", ".join(f"{az:g}:{el:g}" for az, el in now)

        def apply(typed: str) -> str | None:
            try:
                points = parse_horizon(typed)
                self.session.set_value("site.horizon_deg", points)
            except EditRejected as exc:
                return self.problems_text(exc)
            except ValueError as exc:
                return str(exc)
            self.edited()
            if points:
                az, el = max(points, key=lambda p: p[1])
                said = f"Horizon: {len(points)} point(s), highest {el:g} deg at azimuth {az:g} deg."
            else:
                said = "Horizon: open (no obstructions)."
            self.app.notify(said, timeout=4)
            return None

        self.editor.start(
            "Horizon profile: azimuth:elevation pairs, degrees",
            text,
            apply,
            "e.g. 90:10, 180:4, 270:12 (azimuth clockwise from north, elevation "
            "of the obstruction top); empty = open horizon",
            back=self.fields,
        )

    def action_own_months(self) -> None:
        if self.session.project.climate.inline is not None:
            self.app.notify("These twelve months are your own already: Enter edits one.")
            focus_now(self.months)
            return
        try:
            self.session.change(self._make_own, focus="climate")
        except EditRejected as exc:
            self.app.notify(self.problems_text(exc), severity="error", markup=False)
            return
        if self.session.months_to_type():  # started from placeholders, not a copy
            note = "Your own twelve months: type the sun and mean temperature (? = not typed)"
        else:
            note = "Now your own copy of the twelve months: edit them in the table"
        self.edited(note, tell=True)
        focus_now(self.months)

    # ------------------------------------------------------------------ why
    def figure(self) -> Figure | None:
        d = self.session.design
        if self.months.has_focus:
            row, col = self.months.cursor_coordinate
            month = max(1, col)
            key, label, _hint = ([*ROWS, ARRAY_ROW])[row]
            value = "-"
            if key == "poa" and d is not None:
                value = f"{d.site.poa_kwh_m2_day[month - 1]:.2f} kWh/m2/day"
                return Figure(f"{MONTHS[month - 1]} sun on the array", value, "site.poa_kwh_m2_day")
            climate = self._climate(self.session)
            # dynamic: a MonthlyClimate field named in ROWS ("poa", the array row, is not one)
            values = getattr(climate, key) if climate and key != "poa" else None
            if values:
                value = f"{values[month - 1]:g}"
            if month in self.session.months_to_type().get(key, ()):
                value = "not typed yet"
            src = climate.source if climate else ""
            return Figure(
                f"{MONTHS[month - 1]} {label}",
                value,
                "site.design_month" if d and d.site.design_month == month else None,
                extra=f"Climate data, typed or read from the climate file. Source: "
                f"{src or 'not given'}",
            )
        field = self.fields.current_field()
        if field is None:
            return None
        try:  # a project path (a string) through a part that may be unset
            typed = get_path(self.session.project, field.path)
        except (AttributeError, IndexError):
            value = climate_name(self.session.project)
        else:
            value = field.show(typed, d)
        extra = "" if field.reason else "A value you typed; the engine uses it as given."
        return Figure(field.label, value, field.reason, extra=extra)

    def reveal(self, path: str) -> bool:
        if self.fields.select_path(path):
            focus_now(self.fields)
            return True
        if path.startswith("climate"):
            self.fields.select_path("climate")
            focus_now(self.fields)
            return True
        if self.fields.select_path(path):
            focus_now(self.fields)
            return True
        return False
