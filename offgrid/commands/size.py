"""``offgrid size``: the worst-month design of a project, as a summary or JSON."""

from __future__ import annotations

import argparse
from pathlib import Path

from offgrid.commands.common import (
    STDIO,
    add_project_argument,
    design_failed,
    fail,
    first_field,
    json_text,
    open_project,
    read_stdin,
    with_example,
)
from offgrid.numbers import finite_float


def register(sub) -> None:
    p = sub.add_parser(
        "size",
        help="size a project for its worst month and print the design",
        description="Size a project (or a quick design from a load list and a "
        "climate) and print the design.",
    )
    add_project_argument(p)
    p.add_argument("--json", action="store_true", help="print the design as JSON")
    add_quick_arguments(p)
    with_example(
        p,
        "offgrid size --loads household-kit --climate kisanga-ridge-demo --autonomy-days 3",
        "sizes the bundled household load list on the invented "
        "Kisanga Ridge climate with three days of autonomy (--demo sizes the whole "
        "demonstration project; --json prints the design as JSON).",
    )
    p.set_defaults(func=run)


def add_quick_arguments(p: argparse.ArgumentParser) -> None:
    """--loads and --climate (a quick design without a project file) and the overrides."""
    quick = p.add_argument_group("quick design without a project file")
    quick.add_argument(
        "--loads",
        metavar="LOADS.csv",
        help="load list CSV, or a load list's name (see `offgrid loads list`); "
        "- reads it from the standard input",
    )
    quick.add_argument(
        "--climate",
        metavar="CLIMATE",
        help="climate name or climate file (see `offgrid climate list`)",
    )
    quick.add_argument("--autonomy-days", type=finite_float, metavar="N")
    quick.add_argument(
        "--max-dod", type=finite_float, metavar="F", help="maximum depth of discharge 0-1"
    )
    quick.add_argument("--controller", choices=("pwm", "mppt"))


def project_from_args(args: argparse.Namespace):
    """(project, base folder) from PROJECT, --demo or --loads with --climate, overrides applied."""
    if args.loads or args.climate:
        if args.project or args.demo:
            fail("give a PROJECT (or --demo), or --loads with --climate, not both")
        project, base = quick_project(args), None
    else:
        project, base = open_project(args)
    apply_overrides(project, args)
    return project, base


def quick_project(args: argparse.Namespace):
    """A project built from --loads and --climate with default parts."""
    from offgrid.climate.files import ClimateFileError, load_climate
    from offgrid.project.model import ClimateChoice, Project, ProjectInfo, Site

    if not (args.loads and args.climate):
        fail(
            "a quick design needs both --loads LOADS.csv and --climate CLIMATE",
            field="--climate" if args.loads else "--loads",
        )
    loads = read_load_list(args.loads)
    try:
        climate = load_climate(args.climate)
    except ClimateFileError as exc:
        fail(str(exc), field="--climate")
    if climate.latitude_deg is None:
        fail(
            f"climate '{args.climate}' has no latitude_deg: add it to the climate file",
            field="latitude_deg",
        )
    site = Site(
        name=args.climate,
        latitude_deg=climate.latitude_deg,
        longitude_deg=climate.longitude_deg or 0.0,
        elevation_m=climate.elevation_m or 0.0,
    )
    return Project(
        info=ProjectInfo(name=f"Quick design: {args.loads}"),
        site=site,
        climate=ClimateChoice(ref=args.climate),
        loads=loads,
    )


def read_load_list(ref: str):
    """The loads of ``--loads``: ``-`` (standard input), a CSV file, or a load list's name."""
    from offgrid.paths import load_list_library, resolve_load_list
    from offgrid.project.loads_csv import LoadListError, load_loads_csv, read_loads_csv

    try:
        if ref == STDIO:
            return read_loads_csv(read_stdin("--loads"), source="standard input")
        path = resolve_load_list(ref)
        if path is None and not Path(ref).suffix and "/" not in ref:
            names = (
                ", ".join(
                    n if o == "bundled" else f"{n} (yours)" for n, _p, o in load_list_library()
                )
                or "none"
            )
            fail(
                f"--loads {ref}: no such file or load list name; give a CSV file or one of "
                f"{names} (see `offgrid loads list`)",
                field="--loads",
            )
        return load_loads_csv(path or ref)
    except LoadListError as exc:
        fail(str(exc), field=first_field(exc))
    raise AssertionError  # unreachable


def apply_overrides(project, args: argparse.Namespace) -> None:
    from offgrid.project.validate import validate_project

    if args.autonomy_days is not None:
        project.choices.autonomy_days = args.autonomy_days
    if args.max_dod is not None:
        project.choices.max_dod = args.max_dod
    if args.controller:
        project.controller.type = args.controller
    problems = validate_project(project)
    if problems:
        fail("; ".join(str(p) for p in problems), field=problems[0].path)


def run(args: argparse.Namespace) -> int:
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design

    project, base = project_from_args(args)
    try:
        result = design(project, base)
    except DesignError as exc:
        if exc.code == "no-loads" and project.water:
            return _water_only(args, project, base, exc)
        design_failed(exc)
    water = _water_parts(project, base)  # [[water]] supplies: (JSON sections, text lines)
    if args.json:
        out = result.to_dict()
        if project.generator is not None:  # issue 16: the generator beside the design
            from offgrid.generator.study import size_section

            out["generator"] = size_section(project, result, base)
        if water is not None:
            out["water"] = water[0]
        print(json_text(out))
    else:
        from offgrid.report.summary import summary_text

        print(summary_text(project, result))
        if project.generator is not None:  # issue 16
            from offgrid.generator.study import size_lines

            print("\n".join(size_lines(project, result, base)))
        if water is not None:
            print("\n".join(water[1]))
    return 0


def _water_only(args: argparse.Namespace, project, base, exc) -> int:
    """A project that only pumps water (no loads): its supplies, and why there is no
    battery system, instead of a refusal."""
    water = _water_parts(project, base)
    assert water is not None
    why = (
        "no battery system designed (the load list is empty); each water supply below "
        "runs from its own array. Add appliances to size a battery system too"
    )
    if args.json:
        print(json_text({"power": None, "power_note": why, "water": water[0]}))
    else:
        print(f"{project.info.name or 'Project'}: {why}")
        print("\n".join(water[1]))
    return 0


def _water_parts(project, base):
    """The water supplies' JSON sections and text lines (offgrid.water), None without."""
    if not project.water:
        return None
    from offgrid.design.result import DesignError
    from offgrid.water.design import water_design
    from offgrid.water.text import water_lines, water_section

    sections, lines = [], [""]
    for i, supply in enumerate(project.water):
        try:
            w = water_design(project, i, base)
        except DesignError as exc:
            design_failed(exc)
            raise
        sections.append(water_section(w, supply))
        lines.extend(water_lines(w, supply))
    return sections, lines
