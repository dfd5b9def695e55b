"""The keys, read from the bindings: one list for the help screen and the command palette.

Each row is one action of a ``BINDINGS`` list (the app's, a screen's, a section's or a
table's inside it), with every key bound to it and the binding's description, so the
key shown in the help, the palette and the footer is the key that works. A few help
rows describe keys of Textual's own widgets (arrows, typing); they are marked
``where=None`` and are not palette commands.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from dataclasses import dataclass
from typing import TYPE_CHECKING, NamedTuple

from textual.app import App, SystemCommand
from textual.binding import Binding

if TYPE_CHECKING:
    from textual.screen import Screen

#: Actions not offered in the palette: the palette itself.
NOT_IN_PALETTE = {"command_palette"}


@dataclass(frozen=True)
class KeyRow:
    """One action and its keys as the user reads them (``"x, delete"``)."""

    keys: str
    description: str
    action: str
    tooltip: str = ""
    where: str | None = None  # "app", "screen", a section id, or None (help only)
    owner: type | None = None  # the class whose BINDINGS hold it


class KeyGroup(NamedTuple):
    title: str
    rows: list[KeyRow]


def own_bindings(cls: type) -> list[Binding]:
    """The bindings a class declares itself (not those it inherits)."""
    return [b for b in cls.__dict__.get("BINDINGS", ()) if isinstance(b, Binding)]


def key_text(app: App, key: str) -> str:
    """``"x,delete"`` as the footer shows it: ``"x, delete"``."""
    return ", ".join(app.get_key_display(Binding(k.strip(), "")) for k in key.split(","))


def key_rows(
    app: App, bindings: Iterable[Binding], where: str | None = None, owner: type | None = None
) -> list[KeyRow]:
    """One row per action that has a description; the keys of all its bindings together."""
    order: list[str] = []
    keys: dict[str, list[str]] = {}
    first: dict[str, Binding] = {}
    for b in bindings:
        if not b.description:
            continue
        if b.action not in first:
            order.append(b.action)
            first[b.action] = b
            keys[b.action] = []
        for k in b.key.split(","):
            if k.strip() not in keys[b.action]:
                keys[b.action].append(k.strip())
    return [
        KeyRow(
            key_text(app, ",".join(keys[a])),
            first[a].description,
            a,
            first[a].tooltip,
            where,
            owner,
        )
        for a in order
    ]


def section_groups(app: App) -> list[KeyGroup]:
    """The keys of each section and of the tables in it (``Section.KEY_WIDGETS``)."""
    from offgrid.tui.screens.work import section_class
    from offgrid.tui.widgets.bars import SECTIONS

    groups = []
    for n, (sid, title, _what) in enumerate(SECTIONS, start=1):
        cls = section_class(sid)
        rows = key_rows(app, own_bindings(cls), sid, cls)
        tail: list[KeyGroup] = []
        for widget in cls.KEY_WIDGETS:
            more = key_rows(app, own_bindings(widget), sid, widget)
            part = getattr(widget, "KEY_GROUP", "")
            if part:
                tail.append(KeyGroup(f"{n} {title}, {part}", more))
            else:
                rows = rows + more
        groups.append(KeyGroup(f"{n} {title}", rows))
        groups.extend(tail)
    return groups


def help_only(*rows: tuple[str, str]) -> list[KeyRow]:
    return [KeyRow(keys, what, "") for keys, what in rows]


def key_groups(app: App, screen: Screen | None) -> list[KeyGroup]:
    """Every key: the app's, then the work screen's and each section's (on the work
    screen), or the start or plan screen's, then the dialogs'."""
    from offgrid.tui.screens.dialogs import Dialog
    from offgrid.tui.screens.start import StartScreen
    from offgrid.tui.screens.work import WorkScreen
    from offgrid.tui.widgets.editbar import EditBar
    from offgrid.tui.widgets.fieldtable import FieldTable

    groups = [KeyGroup("Everywhere", key_rows(app, own_bindings(type(app)), "app", type(app)))]
    work_rows = key_rows(app, own_bindings(WorkScreen), "screen", WorkScreen)
    going = [r for r in work_rows if r.action.startswith(("go(", "next_section("))]
    groups[0].rows.extend(r for r in work_rows if r not in going)
    groups.append(
        KeyGroup(
            "Moving around",
            going
            + help_only(
                ("up, down, left, right", "Move the cursor"),
                ("pageup, pagedown", "Move a page"),
                ("tab, shift+tab", "Next / previous table"),
            ),
        )
    )
    groups.append(
        KeyGroup(
            "Editing a value",
            key_rows(app, own_bindings(FieldTable))
            + key_rows(app, own_bindings(EditBar))
            + help_only(
                ("any key", "Typing replaces the old value (it opens selected)"),
                ("left, right, home, end", "Keep the old value to change part of it"),
            ),
        )
    )
    groups.extend(section_groups(app))
    start_where = "screen" if isinstance(screen, StartScreen) else None
    groups.append(
        KeyGroup("Start screen", key_rows(app, own_bindings(StartScreen), start_where, StartScreen))
    )
    try:
        from offgrid.tui.screens.plan import PlanScreen
    except ImportError:
        pass
    else:
        plan_where = "screen" if isinstance(screen, PlanScreen) else None
        groups.append(
            KeyGroup(
                "Community plan (P)",
                key_rows(app, own_bindings(PlanScreen), plan_where, PlanScreen),
            )
        )
    groups.append(KeyGroup("Dialogs", key_rows(app, own_bindings(Dialog))))
    from offgrid.tui.screens.forms import FormDialog, GeneratorForm, WaterForm

    for title, form in (("Water supply form", WaterForm), ("Generator form", GeneratorForm)):
        rows = key_rows(app, own_bindings(form) + own_bindings(FormDialog))
        groups.append(KeyGroup(title, rows))
    if not isinstance(screen, WorkScreen):  # the section keys work on the work screen only
        groups = [
            KeyGroup(g.title, [r if r.where in ("app", "screen") else _help(r) for r in g.rows])
            for g in groups
        ]
    return groups


def _help(row: KeyRow) -> KeyRow:
    return KeyRow(row.keys, row.description, row.action, row.tooltip)


def palette_help(row: KeyRow) -> str:
    """What the palette shows under a command's title: its key, then what it does."""
    return f"key {row.keys}" + (f" \u00b7 {row.tooltip}" if row.tooltip else "")


def palette_title(group: KeyGroup, row: KeyRow) -> str:
    if row.where in ("app", "screen"):
        return row.description
    return f"{row.description} ({group.title})"


def binding_commands(app: App, screen: Screen) -> Iterator[SystemCommand]:
    """A palette command for every key row that works on ``screen``."""
    for group in key_groups(app, screen):
        for row in group.rows:
            if row.where is None or row.action in NOT_IN_PALETTE:
                continue
            yield SystemCommand(
                palette_title(group, row), palette_help(row), _runner(app, screen, row)
            )


def _runner(app: App, screen: Screen, row: KeyRow) -> Callable[[], None]:
    """Run the row's action where its binding lives (going to its section first)."""

    def run() -> None:
        if row.where == "app":
            app.call_next(app.run_action, row.action)
            return
        if row.where == "screen":
            app.call_next(screen.run_action, row.action)
            return
        from offgrid.tui.screens.work import WorkScreen

        if not isinstance(screen, WorkScreen) or row.owner is None or row.where is None:
            return
        screen.action_goto(row.where)
        section = screen.current
        owner = row.owner
        target = section if isinstance(section, owner) else section.query(owner).first()
        app.call_next(target.run_action, row.action)

    return run
