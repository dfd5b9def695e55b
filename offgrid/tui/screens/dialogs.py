"""Small modal dialogs: confirm, message, pick one, type a path."""

from __future__ import annotations

import os
from pathlib import Path
from typing import Any

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.suggester import Suggester
from textual.widgets import Button, Input, OptionList, Static
from textual.widgets._input import Selection
from textual.widgets.option_list import Option

from offgrid.tui.text import literal


class Dialog(ModalScreen):
    """Common frame: a bordered box in the middle, Esc closes."""

    BINDINGS = [Binding("escape", "close", "Close", id="dialog.close")]

    def action_close(self) -> None:
        self.dismiss(None)


class ConfirmDialog(Dialog):
    """A question with a few answers, each on a key; returns the chosen answer's id."""

    def __init__(
        self, title: str, message: str, answers: list[tuple[str, str, str]], wide: bool = False
    ) -> None:
        """``answers`` are (key, label, result); Esc returns None. ``wide``: 78 columns."""
        super().__init__()
        self.wide = wide
        self.title_text = title
        self.message = message
        self.answers = answers

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide" if self.wide else "dialog"):
            yield Static(Text(self.title_text, style="bold"), classes="dialog-title")
            yield Static(literal(self.message), classes="dialog-body")
            with Horizontal(classes="dialog-buttons"):
                for key, label, result in self.answers:
                    yield Button(Text(f"{key} {label}"), id=f"answer-{result}", compact=True)
            yield Static(Text("Esc: back without changing anything", style="dim"))

    def on_mount(self) -> None:
        self.query(Button).first().focus()

    def on_key(self, event) -> None:
        for key, _label, result in self.answers:
            if event.character and event.character.lower() == key.lower():
                event.stop()
                self.dismiss(result)
                return

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        self.dismiss((event.button.id or "").removeprefix("answer-"))


class MessageDialog(Dialog):
    """A title and text to read (scrolls); Enter or Esc closes."""

    BINDINGS = [Binding("enter", "close", "Close", id="dialog.ok")]

    def __init__(self, title: str, body: str | Text) -> None:
        super().__init__()
        self.title_text = title
        self.body = body

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide"):
            yield Static(Text(self.title_text, style="bold"), classes="dialog-title")
            with VerticalScroll(classes="dialog-scroll"):
                body = self.body if isinstance(self.body, Text) else literal(self.body, lines=True)
                yield Static(body)
            yield Static(Text("Enter or Esc: close", style="dim"))

    def on_mount(self) -> None:
        self.query_one(VerticalScroll).focus()


class ChoiceDialog(Dialog):
    """Pick one of a list; returns the value of the chosen option, None on Esc."""

    def __init__(
        self, title: str, options: list[tuple[Any, str | Text]], current: Any = None, note: str = ""
    ) -> None:
        super().__init__()
        self.title_text = title
        self.options = options
        self.current = current
        self.note = note

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide"):
            yield Static(Text(self.title_text, style="bold"), classes="dialog-title")
            items = []
            for i, (_value, label) in enumerate(self.options):
                prompt = label if isinstance(label, Text) else literal(label)
                items.append(Option(prompt, id=f"o{i}"))
            yield OptionList(*items, id="choices")
            hint = "\u2191\u2193 move \u00b7 Enter choose \u00b7 Esc back"
            if self.note:
                hint = f"{self.note}\n{hint}"
            yield Static(Text(hint, style="dim"))

    def on_mount(self) -> None:
        ol = self.query_one(OptionList)
        ol.focus()
        for i, (value, _label) in enumerate(self.options):
            if value == self.current:
                ol.highlighted = i
                break
        else:
            ol.highlighted = 0 if self.options else None

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        index = int((event.option.id or "o0")[1:])
        self.dismiss(self.options[index][0])


class PathSuggester(Suggester):
    """Completes file and folder names as you type, like a shell."""

    def __init__(self, suffixes: tuple[str, ...]) -> None:
        super().__init__(use_cache=False, case_sensitive=True)
        self.suffixes = suffixes

    async def get_suggestion(self, value: str) -> str | None:
        matches = matching_paths(value, self.suffixes)
        return matches[0] if matches else None


def matching_paths(value: str, suffixes: tuple[str, ...], limit: int = 50) -> list[str]:
    """Files with one of ``suffixes`` (and folders) that start with what was typed."""
    typed = os.path.expanduser(value) if value else ""
    folder, stem = os.path.split(typed)
    base = Path(folder) if folder else Path(".")
    try:
        entries = sorted(base.iterdir(), key=lambda p: (not p.is_dir(), p.name.lower()))
    except OSError:
        return []
    out = []
    for p in entries:
        if not p.name.startswith(stem) or (p.name.startswith(".") and not stem.startswith(".")):
            continue
        if p.is_dir() or p.suffix.lower() in suffixes:
            shown = os.path.join(folder, p.name) if folder else p.name
            if value.startswith("~"):
                shown = "~" + shown[len(os.path.expanduser("~")) :]
            out.append(shown + ("/" if p.is_dir() else ""))
        if len(out) >= limit:
            break
    return out


class PathDialog(Dialog):
    """Type a file path (Right arrow accepts the completion); returns the Path or None."""

    def __init__(
        self,
        title: str,
        value: str = "",
        suffixes: tuple[str, ...] = (".toml",),
        must_exist: bool = True,
        note: str = "",
        verb: str | None = None,
    ) -> None:
        super().__init__()
        self.verb = verb or ("opens" if must_exist else "saves")
        self.title_text = title
        self.value = value
        self.suffixes = suffixes
        self.must_exist = must_exist
        self.note = note

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide"):
            yield Static(Text(self.title_text, style="bold"), classes="dialog-title")
            if self.note:
                yield Static(literal(self.note), classes="dialog-body")
            yield Input(
                self.value,
                id="path",
                suggester=PathSuggester(self.suffixes),
                placeholder="path/to/file" + self.suffixes[0],
            )
            yield Static(id="path-problem", classes="bad")
            yield Static(id="path-list", classes="path-list")
            yield Static(
                Text(
                    f"In {Path.cwd()}\nRight arrow completes \u00b7 Enter "
                    f"{self.verb} \u00b7 Esc back",
                    style="dim",
                )
            )

    def on_mount(self) -> None:
        box = self.query_one(Input)
        box.focus()
        box.cursor_position = len(box.value)
        name_at = box.value.rfind("/") + 1
        if name_at < len(box.value):  # a suggested name: selected, so typing replaces it
            box.selection = Selection(name_at, len(box.value))  # (its folder stays)
        self._list(box.value)

    def _list(self, value: str) -> None:
        matches = matching_paths(value, self.suffixes, limit=7)
        text = Text("\n".join(matches) if matches else "(no matching files here)", style="dim")
        self.query_one("#path-list", Static).update(text)

    def on_input_changed(self, event: Input.Changed) -> None:
        self._list(event.value)
        self.query_one("#path-problem", Static).update("")

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        raw = event.value.strip()
        problem = self.query_one("#path-problem", Static)
        if not raw:
            problem.update(Text("\u2717 type a file name", style="bold"))
            return
        path = Path(raw).expanduser()
        if path.is_dir():
            problem.update(Text("\u2717 that is a folder: add a file name", style="bold"))
            return
        if self.must_exist and not path.is_file():
            problem.update(literal(f"\u2717 no such file: {raw}", style="bold"))
            return
        self.dismiss(path)
