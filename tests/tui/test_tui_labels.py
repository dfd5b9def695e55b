"""Every field label fits the field tables' label column whole at 80x24 (issue 19: never cut)."""

from __future__ import annotations

import importlib
import pkgutil

import offgrid.tui.fields as fields_module
import offgrid.tui.sections as sections
from offgrid.tui.fields import Field

LABEL_ROOM = 22  # the label column is 24 wide, less the 2-space indent of a field row


def _fields():
    modules = [fields_module] + [
        importlib.import_module(f"offgrid.tui.sections.{m.name}")
        for m in pkgutil.iter_modules(sections.__path__)
    ]
    for mod in modules:
        for value in vars(mod).values():
            if isinstance(value, tuple):
                yield from (f for f in value if isinstance(f, Field))


def test_every_field_label_fits_its_column():
    found = list(_fields())
    assert len(found) > 50  # the tables were found
    too_long = sorted({f.label for f in found if len(f.label) > LABEL_ROOM})
    assert not too_long, too_long
