"""Markdown rendering of the report (pipe tables; charts as text in code blocks)."""

from __future__ import annotations

from offgrid.report.document import Bullets, Chart, Figures, Paragraph, Report, Table
from offgrid.safetext import markdown_text as _esc


def _table(t: Table) -> list[str]:
    head = "| " + " | ".join(_esc(c) or " " for c in t.columns) + " |"
    rule = (
        "|"
        + "|".join("---:" if t.alignment(i) == "r" else ":---" for i in range(len(t.columns)))
        + "|"
    )
    rows = []
    for row in t.rows:
        cells = []
        for c in row:
            text = _esc(c.text)
            cells.append(f"**{text}**" if c.mark else text)
        rows.append("| " + " | ".join(cells) + " |")
    out = [head, rule, *rows]
    if t.caption:
        out += ["", f"_{_esc(t.caption)}_"]
    return out


def _figures(f: Figures) -> list[str]:
    out = []
    if f.title:
        out += [f"### {_esc(f.title)}", ""]
    for item in f.items:
        lines = [f"- **{_esc(item.label)}: {_esc(item.cell.text)}**"]
        if item.formula:
            lines.append(f"  = {_esc(item.formula)}")
        if item.inputs and item.listed:
            lines.append("  Inputs:")
            lines += [f"  {_esc(k)}: {_esc(v)}" for k, v in item.inputs]
        elif item.inputs:
            lines.append(
                "  Inputs: "
                + "; ".join(f"{_esc(k.replace('_', ' '))} {_esc(v)}" for k, v in item.inputs)
            )
        if item.source:
            lines.append(f"  Source: {_esc(item.source)}")
        # a backslash at the end of a line is a hard line break (CommonMark 6.7)
        out += [line + "\\" for line in lines[:-1]] + lines[-1:]
    return out


def render_markdown(report: Report) -> str:
    out = [f"# {_esc(report.title)}", "", f"_{_esc(report.subtitle)}_", ""]
    if report.demo:
        out += ["**Demonstration data (invented scenario).**", ""]
    for k, v in report.meta:
        out.append(f"- {_esc(k)}: {_esc(v)}")
    out += ["", "## Contents", ""]
    out += [f"{n}. {_esc(s.title)}" for n, s in enumerate(report.sections, start=1)]
    for n, sec in enumerate(report.sections, start=1):
        out += ["", f"## {n}. {_esc(sec.title)}"]
        for block in sec.blocks:
            out.append("")
            if isinstance(block, Paragraph):
                out.append(_esc(block.text))
            elif isinstance(block, Bullets):
                lead = {"plain": "- ", "caution": "- **Caution:** ", "warning": "- **Warning:** "}[
                    block.kind
                ]
                out += [lead + _esc(item) for item in block.items]
            elif isinstance(block, Table):
                out += _table(block)
            elif isinstance(block, Figures):
                out += _figures(block)
            elif isinstance(block, Chart):
                out += [f"**{_esc(block.title)}**", "", "```text", *block.text, "```"]
                if block.caption:
                    out += ["", f"_{_esc(block.caption)}_"]
    out.append("")
    return "\n".join(out)
