"""``offgrid loads``: the load lists known by name (bundled and your own), and adding yours."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.commands.common import STDIO, fail, read_stdin, with_example


def register(sub) -> None:
    p = sub.add_parser(
        "loads",
        help="list the load lists by name; add your own",
        description="Load lists (CSV, columns in the README) known by name: the "
        "bundled ones and your own, kept in your offgrid folder. A "
        "name works wherever a load list is asked for, e.g. "
        "`offgrid size --loads NAME`.",
    )
    lsub = p.add_subparsers(dest="loads_command", metavar="ACTION")

    q = lsub.add_parser(
        "list",
        help="list the bundled load lists and yours",
        description="Every load list known by name, with its appliance count "
        "and daily energy; yours are marked.",
    )
    with_example(
        q,
        "offgrid loads list",
        "lists the bundled load lists and your own, with where yours are kept.",
    )
    q.set_defaults(func=run_list)

    q = lsub.add_parser(
        "add",
        help="check a load list and keep it in your library",
        description="Check a load-list CSV (every problem with its line) and "
        "keep a copy in your offgrid folder under NAME, so that "
        "any project or command can name it.",
    )
    q.add_argument(
        "file",
        metavar="FILE",
        help="load-list CSV; - reads the standard input (then --name is needed)",
    )
    q.add_argument("--name", help="name to keep it under (default: the file name)")
    q.add_argument("--force", action="store_true", help="replace your list of that name")
    with_example(
        q,
        "offgrid loads add survey-shop.csv --name corner-shop",
        "checks survey-shop.csv and keeps it as corner-shop; then "
        "`offgrid size --loads corner-shop --climate kisanga-ridge-demo` sizes it.",
    )
    q.set_defaults(func=run_add)

    q = lsub.add_parser(
        "show",
        help="print a load list by name (CSV)",
        description="Print a load list known by name, as CSV: a start for your own.",
    )
    q.add_argument("name", metavar="NAME")
    q.add_argument(
        "-o",
        "--output",
        metavar="FILE",
        help="write the CSV to FILE (default, or -: the standard output)",
    )
    q.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    with_example(
        q,
        "offgrid loads show household-kit -o my-home.csv",
        "copies the bundled household kit into my-home.csv, to edit as your own.",
    )
    q.set_defaults(func=run_show)
    with_example(p, "offgrid loads list", "lists the load lists known by name.")
    p.set_defaults(func=lambda args: (p.print_help(), 2)[1])


def _daily_wh(loads) -> float:
    return sum(ld.quantity * ld.power_w * ld.hours_per_day * ld.duty_cycle for ld in loads)


def run_list(args: argparse.Namespace) -> int:
    from offgrid.paths import load_list_library, user_load_profiles_dir
    from offgrid.project.loads_csv import LoadListError, load_loads_csv

    items = load_list_library()
    print(f"{'NAME':<30} {'LOADS':>5} {'WH/DAY':>8}  FROM")
    for name, path, origin in items:
        try:
            loads = load_loads_csv(path)
            print(f"{name:<30} {len(loads):>5} {_daily_wh(loads):>8.0f}  {origin}")
        except LoadListError as exc:
            print(f"{name:<30} {'':>5} {'':>8}  {origin}: cannot be read ({exc.problems[0]})")
    print("\nWH/DAY: the appliances' daily energy before losses, all months in use.")
    print(f"Your own lists (FROM yours) are kept in {user_load_profiles_dir()}")
    print("add one with `offgrid loads add FILE`.")
    return 0


def valid_library_name(name: str, what: str = "--name") -> str:
    """A file-system-safe library name, or a clear failure."""
    import re

    stem = re.sub(r"[^A-Za-z0-9._-]+", "-", name.strip()).strip("-.").lower()
    if not stem:
        fail(f"{what} '{name}': give a name of letters, digits and dashes")
    return stem


def run_add(args: argparse.Namespace) -> int:
    from offgrid.paths import load_profiles_dir, user_load_profiles_dir
    from offgrid.project.atomic import atomic_write_text
    from offgrid.project.loads_csv import LoadListError, read_loads_csv
    from offgrid.textfile import TextFileError, read_text

    if args.file == STDIO:
        if not args.name:
            fail("a load list from the standard input needs --name NAME")
        text, source = read_stdin("FILE"), "standard input"
    else:
        src = Path(args.file)
        try:
            text, source = read_text(src).removeprefix("\ufeff"), str(src)
        except TextFileError as exc:
            fail(str(exc))
    name = valid_library_name(args.name or Path(args.file).stem)
    try:
        loads = read_loads_csv(text, source=source)
    except LoadListError as exc:
        fail(f"not added: {exc}")
    if (load_profiles_dir() / f"{name}.csv").exists():
        fail(f"'{name}' is a bundled load list: choose another name with --name")
    out = user_load_profiles_dir() / f"{name}.csv"
    if out.exists() and not args.force:
        fail(
            f"you already have a load list '{name}' ({out}): add --force to replace it, or "
            "choose another --name"
        )
    try:
        out.parent.mkdir(parents=True, exist_ok=True)
        atomic_write_text(out, text if text.endswith("\n") else text + "\n", backup=True)
    except OSError as exc:
        fail(f"{out}: cannot write: {exc.strerror or exc}")
    print(f"offgrid: kept {len(loads)} appliance line(s) as '{name}' in {out}", file=sys.stderr)
    print(f"offgrid: use it with --loads {name}", file=sys.stderr)
    return 0


def run_show(args: argparse.Namespace) -> int:
    from offgrid.commands.output import check_writable, write_output
    from offgrid.paths import find_load_list
    from offgrid.textfile import TextFileError, read_text

    path = find_load_list(args.name)
    if path is None:
        fail(f"no load list named '{args.name}': see `offgrid loads list`")
    try:
        text = read_text(path)
    except TextFileError as exc:
        fail(str(exc))
    if args.output and args.output != STDIO:
        out = Path(args.output)
        check_writable(out, args.force)
        write_output(out, text)
        print(f"offgrid: wrote {out}", file=sys.stderr)
    else:
        sys.stdout.write(text)
    return 0
