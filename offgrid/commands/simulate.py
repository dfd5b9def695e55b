"""``offgrid simulate``: reliability of the worst-month design over synthetic weather."""

from __future__ import annotations

import argparse

from offgrid.commands.common import (
    add_project_argument,
    design_failed,
    fail,
    json_text,
    with_example,
)
from offgrid.numbers import finite_float


def register(sub) -> None:
    p = sub.add_parser(
        "simulate",
        help="simulate years of weather: LOLP, battery life, array/battery trade-off",
        description="Size the project for its worst month, then run its energy balance over "
        "synthetic daily weather (Aguiar et al. 1988 Markov matrices) and print "
        "the loss-of-load probability, battery wear and the array/battery curve "
        "for target LOLPs.",
    )
    add_project_argument(p)
    p.add_argument("--years", default="30", metavar="N", help="synthetic years (default 30)")
    p.add_argument(
        "--seed",
        default="1",
        metavar="S",
        help="seed of the weather generator, a whole number (default 1)",
    )
    p.add_argument(
        "--hourly",
        action="store_true",
        help="hourly balance for the design (slower); the sweep stays daily",
    )
    p.add_argument(
        "--target",
        action="append",
        metavar="LOLP",
        help="target LOLP as a fraction (repeatable; default 0.01 and 0.001)",
    )
    p.add_argument(
        "--array-price",
        type=finite_float,
        metavar="PER_W",
        help="array price per W, for the cheapest point",
    )
    p.add_argument(
        "--battery-price",
        type=finite_float,
        metavar="PER_KWH",
        help="battery price per kWh, for the cheapest point",
    )
    p.add_argument(
        "--sweep",
        default="30",
        metavar="N",
        help="sweep N array sizes x N battery sizes (default 30)",
    )
    p.add_argument("--no-sweep", action="store_true", help="skip the trade-off sweep")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    from offgrid.commands.size import add_quick_arguments

    add_quick_arguments(p)
    with_example(
        p,
        "offgrid simulate --demo --years 10 --array-price 0.6 --battery-price 180",
        "ten synthetic weather years of the demonstration project: LOLP, battery "
        "wear, and the cheapest array/battery pair at 0.6 per W and 180 per kWh.",
    )
    p.set_defaults(func=run)


def _int(text: str, name: str) -> int:
    try:
        return int(text)
    except ValueError:
        fail(f"--{name}: {text!r} is not a whole number")
    raise AssertionError  # unreachable


def run(args: argparse.Namespace) -> int:
    from offgrid.design.result import DesignError
    from offgrid.simulate.run import prices_from_args, simulate_project, summary_text
    from offgrid.simulate.tradeoff import DEFAULT_TARGETS
    from offgrid.simulate.weather import check_seed, check_years

    try:
        years = check_years(args.years)
        seed = check_seed(args.seed)
        prices = prices_from_args(args.array_price, args.battery_price)
    except ValueError as exc:
        fail(str(exc))
    sweep = _int(args.sweep, "sweep")
    targets = tuple(args.target) if args.target else DEFAULT_TARGETS
    from offgrid.commands.size import project_from_args

    project, base = project_from_args(args)
    try:
        rep = simulate_project(
            project,
            base,
            years=years,
            seed=seed,
            mode="hourly" if args.hourly else "daily",
            targets=targets,
            prices=prices,
            sweep_size=sweep,
            with_tradeoff=not args.no_sweep,
        )
    except DesignError as exc:
        design_failed(exc)
    except ValueError as exc:
        fail(str(exc))
    if args.json:
        print(json_text(rep.to_dict()))
    else:
        print(summary_text(rep))
        if project.generator is not None:  # issue 16
            print("\nThis project has a generator: offgrid generator simulates it beside the sun.")
    return 0
