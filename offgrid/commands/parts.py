"""``offgrid parts``: the parts catalogue of stock, the cheapest combination, the full kit.

``list`` and ``show`` read the catalogue (the user's, ``user_data_dir()/parts``, else the
bundled demonstration catalogue of invented parts; ``--catalogue DIR`` for another
folder); ``template KIND`` writes a kind's header; ``import CSV --kind KIND`` adds a
file's good rows to the user's catalogue; ``best PROJECT`` tries every combination and
ranks them (``--take N -o FILE`` saves the project with combination N in it); ``bom
PROJECT`` writes the complete bill of materials.  Format: docs/parts-format.md.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.commands.common import (
    STDIO,
    add_project_argument,
    fail,
    open_project,
    reading_path,
    with_example,
)


def _catalogue_arg(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "--catalogue",
        metavar="DIR",
        help="read the catalogue from DIR (default: your catalogue in the offgrid data "
        "folder, else the bundled demonstration catalogue of invented parts)",
    )


def register(sub) -> None:
    from offgrid.stock.catalogue import KIND_NAMES

    p = sub.add_parser(
        "parts",
        help="the parts catalogue of stock, the cheapest combination, the complete kit",
        description="Keep the modules, battery units, controllers, inverters, cables and "
        "protective devices you stock in CSV files (one per kind), let offgrid choose the "
        "cheapest combination that meets a project's design, and write the complete bill "
        "of materials. Format: docs/parts-format.md.",
    )
    with_example(
        p,
        "offgrid parts best --demo",
        "tries every combination of the catalogue's modules, battery units, controllers "
        "and inverters on the demonstration project and ranks those that meet the design "
        "by capital and lifecycle cost.",
    )
    ps = p.add_subparsers(dest="parts_command", metavar="ACTION")
    ps.required = True

    q = ps.add_parser("list", help="list the catalogue's parts and any bad rows")
    _catalogue_arg(q)
    q.add_argument("--kind", choices=KIND_NAMES, help="only this kind")
    with_example(q, "offgrid parts list --kind modules", "lists the catalogue's modules.")
    q.set_defaults(func=run_list)

    q = ps.add_parser("show", help="every datasheet field of a part")
    q.add_argument("name", metavar="NAME", help="the part's name, as listed")
    _catalogue_arg(q)
    with_example(
        q,
        "offgrid parts show 'Invented MPPT 150 V 60 A (demo)'",
        "prints every field of that controller of the demonstration catalogue.",
    )
    q.set_defaults(func=run_show)

    q = ps.add_parser("template", help="write a kind's CSV header to fill in")
    q.add_argument("kind", choices=KIND_NAMES, metavar="KIND", help=", ".join(KIND_NAMES))
    with_example(
        q,
        "offgrid parts template modules",
        "prints the columns of the modules' file (redirect it to modules.csv); fill in one "
        "module a row, then `offgrid parts import modules.csv`.",
    )
    q.set_defaults(func=run_template)

    q = ps.add_parser("import", help="add a CSV's parts to your catalogue")
    q.add_argument("csv", metavar="CSV", help="a CSV file of one kind")
    q.add_argument("--kind", choices=KIND_NAMES, help="its kind (default: from the file name)")
    with_example(
        q,
        "offgrid parts import my-modules.csv --kind modules",
        "checks every row of my-modules.csv and adds the good ones to your catalogue's "
        "modules.csv (rows with problems are listed with their line and skipped; a name "
        "already in the catalogue is refused).",
    )
    q.set_defaults(func=run_import)

    q = ps.add_parser("best", help="the cheapest combinations that meet the design")
    add_project_argument(q)
    _catalogue_arg(q)
    q.add_argument("--top", type=int, default=5, metavar="N", help="show the best N (5)")
    q.add_argument("--json", action="store_true", help="print the search as JSON")
    q.add_argument(
        "--jobs",
        type=int,
        metavar="N",
        help="worker processes (default 1: the shared steps make one process the fastest)",
    )
    q.add_argument(
        "--take",
        type=int,
        metavar="N",
        help="save the project with combination N (by capital) in it; needs -o FILE",
    )
    q.add_argument("-o", "--output", metavar="FILE", help="with --take: the project to write")
    q.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    with_example(
        q,
        "offgrid parts best site.toml --take 1 -o site-kit.toml",
        "ranks every buildable combination of the catalogue for site.toml and saves "
        "site-kit.toml with the cheapest one's datasheets, records and prices in it.",
    )
    q.set_defaults(func=run_best)

    q = ps.add_parser("bom", help="the complete bill of materials as CSV")
    add_project_argument(q)
    q.add_argument(
        "--catalogue",
        metavar="DIR",
        help="also price cables and protective devices the project's price list leaves "
        "open from the catalogue in DIR",
    )
    q.add_argument("-o", "--output", metavar="FILE", help="write to FILE (default: stdout)")
    q.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    with_example(
        q,
        "offgrid parts bom --demo -o kit.csv",
        "writes everything the crew packs for the demonstration project (main parts, "
        "protection, mounting, connectors, surge protection, earthing, interconnects, "
        "lugs, labels, cable with its allowance), each line saying why, priced where the "
        "project has prices; the unpriced lines are counted on stderr.",
    )
    q.set_defaults(func=run_bom)


def _catalogue(args):
    from offgrid.stock.catalogue import default_catalogue_dir, load_catalogue

    if args.catalogue:
        folder, demo = Path(args.catalogue), False
        if not folder.is_dir():
            fail(f"--catalogue {args.catalogue}: is not a folder; give the catalogue's folder")
    else:
        folder, demo = default_catalogue_dir()
    cat = load_catalogue(folder)
    if demo:
        print(
            "offgrid: note: your catalogue is empty; using the bundled demonstration "
            "catalogue (invented parts and prices)",
            file=sys.stderr,
        )
    for problem in cat.problems:
        print(f"offgrid: {problem}", file=sys.stderr)
    return cat


def _check_stock(project) -> None:
    """The project's ``[stock]`` table checked; a problem fails with its key and the fix."""
    from offgrid.stock.project_parts import stock_problems

    problems = stock_problems(project)
    if problems:
        fail("; ".join(problems), field=problems[0].split(":", 1)[0])


def run_list(args: argparse.Namespace) -> int:
    from offgrid.safetext import printable
    from offgrid.stock.catalogue import KIND_NAMES, PRICE_UNIT

    cat = _catalogue(args)
    kinds = [args.kind] if args.kind else list(KIND_NAMES)
    print(f"Catalogue: {printable(cat.folder)}")
    for kind in kinds:
        parts = cat.of(kind)
        print(f"\n{kind} ({len(parts)})")
        for part in parts:
            price = (
                f"{part.price:g} {part.currency}"
                + (f" {PRICE_UNIT[kind]}" if kind in PRICE_UNIT else "")
                if part.price is not None
                else "no price"
            )
            flag = "  [invented]" if part.demo else ""
            print(f"  {printable(part.name)}: {price}{flag}")
    return 0


def run_show(args: argparse.Namespace) -> int:
    from offgrid.safetext import printable
    from offgrid.stock.catalogue import KIND_NAMES

    cat = _catalogue(args)
    found = [p for k in KIND_NAMES for p in cat.of(k) if p.name == args.name]
    if not found:
        fail(
            f"no part named '{printable(args.name)}' in {printable(cat.folder)}: "
            "`offgrid parts list` shows the names"
        )
    for part in found:
        print(f"{printable(part.name)} ({part.kind}, {printable(part.source)} line {part.line})")
        for key, value in part.record().items():
            if key == "name":
                continue
            shown = " ".join(map(str, value)) if isinstance(value, tuple) else value
            print(f"  {key}: {printable(str(shown))}")
        if part.demo:
            print("  (invented demonstration part)")
    return 0


def run_template(args: argparse.Namespace) -> int:
    from offgrid.stock.catalogue import template_csv

    sys.stdout.write(template_csv(args.kind))
    return 0


def run_import(args: argparse.Namespace) -> int:
    from offgrid.project.atomic import atomic_write_text
    from offgrid.safetext import printable
    from offgrid.stock.catalogue import (
        KIND_NAMES,
        kind_csv,
        load_catalogue,
        read_kind_csv,
        user_catalogue_dir,
    )
    from offgrid.textfile import TextFileError, read_text

    src = Path(args.csv)
    kind = args.kind or (src.stem if src.stem in KIND_NAMES else None)
    if kind is None:
        fail(
            f"give --kind ({', '.join(KIND_NAMES)}): the file name does not say it", field="--kind"
        )
    try:
        text = read_text(src)
    except TextFileError as exc:
        fail(f"{printable(str(src))}: {exc}")
    new, problems = read_kind_csv(kind, text, str(src))
    for problem in problems:
        print(f"offgrid: {problem}", file=sys.stderr)
    folder = user_catalogue_dir()
    mine = load_catalogue(folder)
    target = str(folder / f"{kind}.csv")
    if any(p.source == target for p in mine.problems):
        for problem in mine.problems:
            if problem.source == target:
                print(f"offgrid: {problem}", file=sys.stderr)
        fail(
            f"your catalogue's {printable(target)} has rows with problems (above): fix them "
            "first, so that adding to it loses none of them; nothing was changed"
        )
    have = list(mine.of(kind))
    names = {p.name for p in have}
    added = []
    for part in new:
        if part.name in names:
            print(
                f"offgrid: {printable(str(src))}: line {part.line}, name: "
                f"'{printable(part.name)}' is already in your catalogue; row skipped "
                "(rename it, or edit the catalogue's file)",
                file=sys.stderr,
            )
            continue
        names.add(part.name)
        added.append(part)
    if not added:
        fail(f"no part of {printable(str(src))} was added; the catalogue is unchanged")
    folder.mkdir(parents=True, exist_ok=True)
    atomic_write_text(folder / f"{kind}.csv", kind_csv(kind, have + added))
    print(f"offgrid: {len(added)} {kind} added to {folder / (kind + '.csv')}", file=sys.stderr)
    return 0


def run_best(args: argparse.Namespace) -> int:
    from offgrid.stock.best_text import search_text
    from offgrid.stock.choose import search

    out = Path(args.output) if args.output and args.output != STDIO else None
    if args.take is not None and out is None:
        fail("--take saves a project: give -o FILE", field="--output")
    if out is not None:
        from offgrid.commands.output import check_writable

        check_writable(out, args.force, reading_path(args))
    project, base = open_project(args)
    _check_stock(project)
    cat = _catalogue(args)
    from offgrid.commands.common import design_failed
    from offgrid.design.result import DesignError

    if args.jobs is not None and args.jobs < 1:
        fail("--jobs must be 1 or more", field="--jobs")
    jobs = args.jobs or 1  # bench_parts.py: 2 workers 4.5 s wall against 3.6 s in one
    try:
        result = search(project, cat, base, jobs=jobs)
    except DesignError as exc:
        design_failed(exc, "; no combination was tried")
    if args.json:
        from offgrid.commands.common import json_text
        from offgrid.stock.best_text import search_json

        print(json_text(search_json(result, max(1, args.top))))
    else:
        sys.stdout.write(search_text(result, max(1, args.top)))
    if args.take is None:
        return 0 if result.by_capital or result.unpriced else 3
    if not 1 <= args.take <= len(result.by_capital):
        fail(f"--take {args.take}: there are {len(result.by_capital)} priced combinations")
    _take(project, base, cat, result.by_capital[args.take - 1], out)
    return 0


def _take(project, base, cat, combo, out: Path) -> None:
    from dataclasses import replace

    from offgrid.project.store import save_project
    from offgrid.stock.choose import rate_sets_for
    from offgrid.stock.project_parts import take_parts

    rates, _ = rate_sets_for(project, cat)
    taken, missing = take_parts(
        project,
        combo.module,
        combo.battery,
        combo.controller,
        combo.inverter,
        rates,
        combo.system_voltage_v,
    )
    if project.climate.ref and base is not None and not Path(project.climate.ref).is_absolute():
        ref = base / project.climate.ref
        if ref.exists() and out.resolve().parent != base.resolve():
            taken.climate = replace(taken.climate, ref=str(ref.resolve()))
    save_project(taken, out)
    for why in missing:
        print(f"offgrid: no price taken: {why}", file=sys.stderr)
    print(f"offgrid: wrote {out} with combination {', '.join(combo.names())}", file=sys.stderr)


def run_bom(args: argparse.Namespace) -> int:
    from offgrid.commands.common import design_failed
    from offgrid.commands.output import check_writable, write_output
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design
    from offgrid.stock.kit import priced_bom_csv

    out = Path(args.output) if args.output and args.output != STDIO else None
    if out is not None:
        check_writable(out, args.force, reading_path(args))
    project, base = open_project(args)
    _check_stock(project)
    try:
        result = design(project, base)
    except DesignError as exc:
        design_failed(exc, "; no bill of materials was written")
    cat = _catalogue(args) if args.catalogue else None
    text, missing = priced_bom_csv(project, result, cat)
    if out is None:
        sys.stdout.write(text)
    else:
        write_output(out, text, reading_path(args))
        print(f"offgrid: wrote {out}", file=sys.stderr)
    if missing:
        print(
            f"offgrid: {len(missing)} line(s) have no price (total left open): "
            + ", ".join(missing),
            file=sys.stderr,
        )
    return 0
