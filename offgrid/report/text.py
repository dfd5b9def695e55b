"""Plain-text rendering of the report: 80 columns, nothing but ASCII layout."""

from __future__ import annotations

import textwrap

from offgrid.report.document import (
    Bullets,
    Chart,
    Figures,
    Paragraph,
    Report,
    Table,
)

WIDTH = 80
GAP = 2  # spaces between table columns


def _wrap(text: str, width: int = WIDTH, lead: str = "", rest: str | None = None) -> list[str]:
    rest = lead if rest is None else rest
    return textwrap.wrap(
        text, width, initial_indent=lead, subsequent_indent=rest, break_on_hyphens=False
    ) or [lead.rstrip()]


def _widths(table: Table, cols: list[int]) -> list[int]:
    out = []
    for c in cols:
        w = len(table.columns[c])
        for row in table.rows:
            w = max(w, len(row[c].text))
        out.append(w)
    return out


def _render_rows(table: Table, cols: list[int], widths: list[int]) -> list[str]:
    def line(cells: list[str]) -> str:
        parts = []
        for k, (c, text) in enumerate(zip(cols, cells, strict=True)):
            w = widths[k]
            parts.append(text.rjust(w) if table.alignment(c) == "r" else text.ljust(w))
        return (" " * GAP).join(parts).rstrip()

    out = [line([table.columns[c] for c in cols]), (" " * GAP).join("-" * w for w in widths)]
    for row in table.rows:
        wrapped = []
        for k, c in enumerate(cols):
            text = row[c].text
            if len(text) > widths[k]:
                wrapped.append(textwrap.wrap(text, widths[k], break_on_hyphens=False) or [""])
            else:
                wrapped.append([text])
        for n in range(max(len(w) for w in wrapped)):
            out.append(line([w[n] if n < len(w) else "" for w in wrapped]))
    return out


def _column_groups(table: Table, widths: list[int], width: int):
    """Split the columns after the first into the fewest even groups that fit the page.

    Each group repeats the first column, which wraps (down to 12 characters) if needed.
    """
    rest = list(range(1, len(widths)))
    for n in range(2, len(rest) + 1):
        size = -(-len(rest) // n)
        groups = [rest[k : k + size] for k in range(0, len(rest), size)]
        need = max(sum(widths[c] for c in g) + GAP * len(g) for g in groups)
        first = min(widths[0], width - need)
        if first >= min(12, widths[0]):
            return [([0, *g], [first] + [widths[c] for c in g]) for g in groups]
    return [([0, c], [min(widths[0], 12), min(widths[c], width - 12 - GAP)]) for c in rest]


def render_table(table: Table, width: int = WIDTH) -> list[str]:
    """A table in at most ``width`` columns: wrap the wrappable columns, else split the columns."""
    cols = list(range(len(table.columns)))
    widths = _widths(table, cols)
    total = sum(widths) + GAP * (len(cols) - 1)
    if total > width and table.wrap:
        excess = total - width
        for c in sorted(table.wrap, key=lambda c: -widths[c]):
            spare = widths[c] - max(12, len(table.columns[c]))
            cut = min(spare, excess)
            if cut > 0:
                widths[c] -= cut
                excess -= cut
        total = sum(widths) + GAP * (len(cols) - 1)
    lines: list[str] = []
    if total <= width:
        lines = _render_rows(table, cols, widths)
    else:
        for group, gw in _column_groups(table, widths, width):
            if lines:
                lines.append("")
            lines += _render_rows(table, group, gw)
    if table.caption:
        lines += _wrap(table.caption)
    return lines


def _figure_lines(fig: Figures) -> list[str]:
    lines: list[str] = []
    if fig.title:
        lines += [fig.title, "~" * len(fig.title)]
    for item in fig.items:
        value = item.cell.text
        head = f"{item.label} "
        room = WIDTH - len(value) - 1
        if len(head) > room:
            lines += _wrap(item.label)
            lines.append(f"{'':.<{WIDTH - len(value) - 1}} {value}")
        else:
            lines.append(f"{head:.<{room}} {value}")
        if item.formula:
            lines += _wrap(f"= {item.formula}", lead="    ", rest="      ")
        if item.inputs and item.listed:
            lines.append("    inputs:")
            for k, v in item.inputs:
                lines += _wrap(f"{k}: {v}", lead="      ", rest="        ")
        elif item.inputs:
            lines += _wrap(
                "inputs: " + "; ".join(f"{k.replace('_', ' ')} {v}" for k, v in item.inputs),
                lead="    ",
                rest="      ",
            )
        if item.source:
            lines += _wrap(f"source: {item.source}", lead="    ", rest="      ")
    return lines


def render_text(report: Report) -> str:
    """The report as text, every line at most 80 characters."""
    out: list[str] = []
    title = report.title.upper()
    out += _wrap(title)
    out.append("=" * min(WIDTH, len(title)))
    if report.subtitle:
        out += _wrap(report.subtitle)
    if report.demo:
        out.append("DEMONSTRATION DATA (invented scenario)")
    for k, v in report.meta:
        out += _wrap(f"{k}: {v}")
    for n, sec in enumerate(report.sections, start=1):
        heading = f"{n}. {sec.title}"
        out += ["", "", heading, "-" * len(heading)]
        for block in sec.blocks:
            out.append("")
            if isinstance(block, Paragraph):
                out += _wrap(block.text)
            elif isinstance(block, Bullets):
                lead = {"plain": "  - ", "caution": "  ! ", "warning": "  * "}[block.kind]
                for item in block.items:
                    out += _wrap(item, lead=lead, rest=" " * len(lead))
            elif isinstance(block, Table):
                out += render_table(block)
            elif isinstance(block, Figures):
                out += _figure_lines(block)
            elif isinstance(block, Chart):
                out += _wrap(block.title)
                for line in block.text:
                    out += [line] if len(line) <= WIDTH else _wrap(line, rest="    ")
                if block.caption:
                    out += _wrap(block.caption)
    out.append("")
    text = "\n".join(line.rstrip() for line in out)
    return text
