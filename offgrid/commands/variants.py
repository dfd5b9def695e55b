"""``offgrid variants``: a project's design variants side by side."""

from __future__ import annotations

import argparse

from offgrid.commands.common import (
    add_project_argument,
    fail,
    json_text,
    open_project,
    with_example,
)


def register(sub) -> None:
    p = sub.add_parser(
        "variants",
        help="compare the project's design variants side by side",
        description="Design the project and each of its [[variants]] and show "
        "their figures, costs and differences (* marks a figure "
        "that differs from the base design).",
    )
    add_project_argument(p)
    p.add_argument("--json", action="store_true", help="print the comparison as JSON")
    with_example(
        p,
        "offgrid variants --demo",
        "the demonstration project's variants beside "
        "its base design, differing figures marked with *.",
    )
    p.set_defaults(func=run)


def comparison_dict(cmp) -> dict:
    return {
        "columns": [
            {
                "name": c.name,
                "note": c.note,
                "overrides": dict(c.overrides),
                "error": c.error,
                "hybrid_error": c.hybrid_error,
            }
            for c in cmp.columns
        ],
        "rows": [
            {
                "label": r.label,
                "unit": r.unit,
                "group": r.group,
                "values": list(r.values),
                "differs": list(r.differs),
            }
            for r in cmp.rows
        ],
    }


def run(args: argparse.Namespace) -> int:
    from offgrid.economics.variants import compare_variants

    project, base = open_project(args)
    if not project.variants:
        fail(
            "the project has no variants: add [[variants]] tables with a name and "
            '[variants.overrides] (for example "controller.type" = "pwm")',
            code=1,
        )
    cmp = compare_variants(project, base, with_generator=True)
    if args.json:
        print(json_text(comparison_dict(cmp)))
        return 0
    from offgrid.design.sizing import design
    from offgrid.report.build import build_report
    from offgrid.report.document import Report
    from offgrid.report.text import render_text

    base_design = cmp.columns[0].design
    if base_design is None:
        fail(f"the base design fails: {cmp.columns[0].error}", code=3)
    full = build_report(
        project, base_design or design(project, base), base=base, comparison=cmp, with_charts=False
    )
    sec = full.section("variants")
    print(
        render_text(
            Report(
                title=f"Variants of {project.info.name}",
                subtitle="",
                sections=(sec,) if sec else (),
            )
        ),
        end="",
    )
    return 0
