"""``offgrid plan``: design a whole community survey, choose standard kits, total the parts."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.commands.common import STDIO, fail, json_text, read_stdin, with_example
from offgrid.numbers import finite_float


def register(sub) -> None:
    p = sub.add_parser(
        "plan",
        help="plan a community survey: a design per row, standard kits, totals",
        description="Design every household and facility of a community survey (CSV), choose "
        "a few standard kits at the least cost (or oversize), and total the parts "
        "for procurement. Columns: docs/community-format.md.",
    )
    p.add_argument(
        "survey",
        nargs="?",
        metavar="COMMUNITY.csv",
        help="community survey CSV, or a programme CSV of villages "
        "(docs/programme-format.md); - reads a survey from the standard "
        "input (names in it are then looked up from the current folder)",
    )
    p.add_argument(
        "--demo",
        action="store_true",
        help="plan the bundled demonstration community (invented village)",
    )
    p.add_argument(
        "--demo-programme",
        action="store_true",
        help="plan the bundled demonstration programme (three invented villages)",
    )
    p.add_argument(
        "--kit-scope",
        choices=("programme", "village", "zone"),
        default="programme",
        help="a programme's kits: one set for all villages "
        "(default), each village its own, or one set per zone column value",
    )
    how = p.add_mutually_exclusive_group()
    how.add_argument("--kits", type=int, metavar="K", help="use at most K standard kit types")
    how.add_argument(
        "--kit-cost",
        type=finite_float,
        metavar="C",
        help="cost of each extra kit type; the number of kit types is chosen "
        "(default: the price list's kit_type price, else --kits 3)",
    )
    p.add_argument(
        "--max-kits",
        type=int,
        default=12,
        metavar="N",
        help="most kit types tried with --kit-cost (default 12)",
    )
    p.add_argument(
        "--objective",
        choices=("cost", "oversize"),
        help="what the kits minimise (default: cost with a price list, else oversize)",
    )
    p.add_argument(
        "--prices", metavar="PRICES.csv", help="price list (default: the survey's 'prices' setting)"
    )
    p.add_argument(
        "--climate",
        metavar="CLIMATE",
        help="climate name or file, overriding the survey's 'climate' setting",
    )
    p.add_argument(
        "--jobs",
        type=int,
        metavar="N",
        help="worker processes for many distinct rows (default: the CPUs available)",
    )
    p.add_argument(
        "--energy-step",
        type=finite_float,
        default=None,
        metavar="PCT",
        help="design surveyed energy and peak power at the next PCT %% step up, "
        "so near-equal rows share a design (default 1; 0: as given)",
    )
    p.add_argument(
        "--merge",
        nargs="+",
        metavar="PLAN.json",
        help="merge programme plans made apart (split by village, each written with "
        "--json) into one: the kits chosen again across all the villages from their "
        "distinct designs (--kits, --kit-cost change the parts' settings); plan files of "
        "an older offgrid: villages unioned, counts and totals summed",
    )
    p.add_argument("--rows", action="store_true", help="list every row in the summary")
    p.add_argument("--json", action="store_true", help="print the plan as JSON")
    p.add_argument(
        "--report",
        metavar="FILE",
        help="also write the plan: .md (report), .csv (one line per row) or .json",
    )
    with_example(
        p,
        "offgrid plan --demo --kits 3 --report plan.md",
        "plans the invented Kisanga Ridge village with three standard kits and "
        "writes the plan as Markdown to plan.md.",
    )
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    from offgrid.plan.community import demo_survey_path, plan_file
    from offgrid.plan.kits import PlanError
    from offgrid.plan.survey import SurveyError

    if args.merge:
        return run_merge(args)
    if sum(map(bool, (args.demo, args.demo_programme, args.survey))) > 1:
        fail("give one of COMMUNITY.csv, PROGRAMME.csv, --demo or --demo-programme")
    if args.demo_programme:
        from offgrid.plan.programme import demo_programme_path

        return run_programme(args, demo_programme_path())
    path = demo_survey_path() if args.demo else args.survey
    if path and not args.demo:
        from offgrid.plan.programme import is_programme_file

        if is_programme_file(path):
            return run_programme(args, path)
    if not path:
        fail("name a community survey CSV, or use --demo for the bundled demonstration community")
    report = _check_common(args)
    if path == STDIO:
        from offgrid.plan.community import plan_community
        from offgrid.plan.survey import read_survey

        text = read_stdin("COMMUNITY.csv")

        def plan_file(_path, **options):  # the same options, the survey from the pipe
            return plan_community(
                read_survey(text, source="standard input", base_dir=Path.cwd()), **options
            )

    try:
        plan = plan_file(path, climate=args.climate, **_plan_options(args))
    except (SurveyError, PlanError) as exc:
        fail(str(exc))
    if report is not None:
        write_report(plan, report)
    if args.json:
        print(dump_json(plan.to_dict()))
    else:
        from offgrid.plan.text import summary_text

        print(summary_text(plan, show_rows=True if args.rows else None))
        if report is not None:
            print(f"\nWritten: {report}")
    if plan.bad_rows or plan.unmet:
        print(
            f"offgrid: {len({p.line for p in plan.bad_rows})} row(s) left out, "
            f"{len(plan.unmet)} cannot be met: see the lists above",
            file=sys.stderr,
        )
        return 1
    return 0


def _plan_options(args) -> dict:
    """The planning options a community and a programme share, from the command line."""
    step = {} if args.energy_step is None else {"energy_step_pct": args.energy_step}
    return dict(
        kits=args.kits,
        kit_type_cost=args.kit_cost,
        prices=args.prices,
        objective=args.objective,
        jobs=args.jobs,
        k_max=args.max_kits,
        **step,
    )


def _check_common(args) -> Path | None:
    if args.kits is not None and args.kits < 1:
        fail(f"--kits {args.kits}: give 1 or more kit types")
    if args.jobs is not None and args.jobs < 1:
        fail("--jobs must be 1 or more")
    if args.max_kits < 1:
        fail("--max-kits must be 1 or more")
    report = Path(args.report) if args.report else None
    if report is not None and report.suffix.lower() not in (".md", ".csv", ".json"):
        fail(f"--report {report}: the file name must end in .md, .csv or .json")
    if report is not None:  # before any work: never over a project, even when forced
        from offgrid.report.export import overwrite_refusal

        refusal = overwrite_refusal(report)
        if refusal:
            fail(f"--report {refusal}")
    return report


def run_programme(args: argparse.Namespace, path) -> int:
    """Plan a programme of villages (``offgrid plan PROGRAMME.csv``)."""
    from offgrid.plan.kits import PlanError
    from offgrid.plan.programme import ProgrammeError, plan_programme_file
    from offgrid.plan.programme_text import markdown_report, rows_csv, summary_text

    report = _check_common(args)
    if args.climate:
        fail("--climate: a programme names each village's climate in its climate column")
    try:
        plan = plan_programme_file(path, kit_scope=args.kit_scope, **_plan_options(args))
    except (ProgrammeError, PlanError) as exc:
        fail(str(exc))
    if report is not None:
        write_report(plan, report, markdown_report, rows_csv)
    if args.json:
        print(dump_json(plan.to_dict()))
    else:
        print(summary_text(plan))
        if report is not None:
            print(f"\nWritten: {report}")
    unmet = sum(len(v.unmet) for v in plan.villages)
    if plan.left_out or unmet:
        print(
            f"offgrid: {len(plan.left_out)} problem(s) left out, {unmet} row(s) cannot be "
            "met: see the lists above",
            file=sys.stderr,
        )
        return 1
    return 0


def run_merge(args: argparse.Namespace) -> int:
    """Merge programme plans made apart (``offgrid plan --merge A.json B.json ...``)."""
    import json

    from offgrid.plan.merge import MergeError, merge_plans, merged_markdown
    from offgrid.project.atomic import atomic_write_text
    from offgrid.report.export import overwrite_refusal

    if args.survey or args.demo or args.demo_programme:
        fail("--merge takes plan JSON files only: give no survey or programme beside it")
    if args.kits is not None and args.kits < 1:
        fail(f"--kits {args.kits}: give 1 or more kit types")
    report = Path(args.report) if args.report else None
    if report is not None and report.suffix.lower() not in (".md", ".json"):
        fail(f"--report {report}: a merged plan is written as .md or .json")
    plans = []
    for name in args.merge:
        try:
            plans.append((name, json.loads(Path(name).read_text(encoding="utf-8"))))
        except OSError as exc:
            fail(f"--merge {name}: cannot read it: {exc.strerror}")
        except (UnicodeDecodeError, ValueError):
            fail(
                f"--merge {name}: not JSON; write each part with offgrid plan PROGRAMME.csv --json"
            )
    try:
        doc = merge_plans(plans, kits=args.kits, kit_type_cost=args.kit_cost)
    except MergeError as exc:
        fail(str(exc))
    if report is not None:
        refusal = overwrite_refusal(report)
        if refusal:
            fail(f"--report {refusal}")
        text = merged_markdown(doc) if report.suffix.lower() == ".md" else dump_json(doc) + "\n"
        try:
            atomic_write_text(report, text, backup=True)
        except OSError as exc:
            fail(f"cannot write {report}: {exc.strerror}")
    if args.json or report is None:
        print(dump_json(doc) if args.json else merged_markdown(doc))
    else:
        print(
            f"Merged {len(plans)} plans: {len(doc['villages'])} villages, {doc['systems']} "
            f"systems\nWritten: {report}"
        )
    return 1 if doc["left_out"] else 0


def write_report(plan, path: Path, markdown_report=None, rows_csv=None) -> None:
    """Write ``--report`` as Markdown, row CSV or JSON by its suffix (a community plan's
    views unless a programme's are given); never over a project file."""
    from offgrid.project.atomic import atomic_write_text

    if markdown_report is None or rows_csv is None:
        from offgrid.plan.text import markdown_report, rows_csv
    suffix = path.suffix.lower()
    if suffix == ".md":
        text = markdown_report(plan)
    elif suffix == ".csv":
        text = rows_csv(plan)
    else:
        text = dump_json(plan.to_dict()) + "\n"
    from offgrid.report.export import overwrite_refusal

    refusal = overwrite_refusal(path)
    if refusal:
        fail(f"--report {refusal}")
    try:
        atomic_write_text(path, text, backup=True)
    except OSError as exc:
        fail(f"cannot write {path}: {exc.strerror}")


#: Above this many rows the JSON is written compact (one line): the indented form is
#: encoded by Python's pure-Python encoder, about ten times slower than the C one.
JSON_INDENT_MAX_ROWS = 2000


def dump_json(data: dict) -> str:
    """The plan as JSON text: indented for a readable plan, compact for a large one."""
    table = data.get("design_table")  # a programme plan's distinct designs
    big = (
        max(len(data.get("rows") or ()), len(table["rows"]) if isinstance(table, dict) else 0)
        > JSON_INDENT_MAX_ROWS
    )
    return json_text(data, indent=None if big else 2, separators=(",", ":") if big else None)
