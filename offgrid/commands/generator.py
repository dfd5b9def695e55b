"""``offgrid generator``: a generator beside the sun (derating, fuel, dispatch, cheapest mix)."""

from __future__ import annotations

import argparse

from offgrid.commands.common import (
    add_project_argument,
    design_failed,
    fail,
    json_text,
    open_project,
    with_example,
)
from offgrid.numbers import finite_float


def register(sub) -> None:
    p = sub.add_parser(
        "generator",
        help="a generator beside the sun: derated output, fuel, run hours, cheapest mix",
        description="Size the project for its worst month (solar only), then add its "
        "[generator]: derated output at the site, the fuel line fitted to the datasheet, "
        "the check of what it must carry, an hourly simulation over synthetic weather "
        "with the dispatch rule (run hours, starts, litres, solar fraction, battery life) "
        "and the lifecycle cost across smaller arrays and banks, cheapest point beside "
        "the solar-only design. --demo uses the bundled invented hybrid lodge.",
    )
    add_project_argument(p)
    p.add_argument("--years", default="20", metavar="N", help="synthetic years (default 20)")
    p.add_argument("--seed", default="1", metavar="S", help="weather seed (default 1)")
    p.add_argument(
        "--array-w", type=finite_float, metavar="W", help="simulate this array size instead"
    )
    p.add_argument(
        "--battery-kwh",
        type=finite_float,
        metavar="KWH",
        help="simulate this nominal battery energy instead",
    )
    p.add_argument("--array-price", type=finite_float, metavar="PER_W", help="array price per W")
    p.add_argument(
        "--battery-price", type=finite_float, metavar="PER_KWH", help="battery price per kWh"
    )
    p.add_argument(
        "--solar-share",
        type=finite_float,
        metavar="FRACTION",
        help="cheapest mix with at least this share of the energy from the sun (0-1)",
    )
    p.add_argument("--no-mix", action="store_true", help="skip the trade-off across sizes")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    with_example(
        p,
        "offgrid generator --demo --years 10",
        "ten synthetic years of the invented northern lodge with its diesel set: derating, "
        "fuel line, run hours and litres a year, and the cheapest mix of sun and fuel.",
    )
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    from offgrid.design.result import DesignError
    from offgrid.generator.study import generator_study, hybrid_demo_path, summary_text
    from offgrid.simulate.run import prices_from_args

    try:
        prices = prices_from_args(args.array_price, args.battery_price)
    except ValueError as exc:
        fail(str(exc))
    if args.demo:
        if args.project:
            fail("give either PROJECT or --demo, not both")
        args.project, args.demo = str(hybrid_demo_path()), False
    project, base = open_project(args)
    try:
        study = generator_study(
            project,
            base,
            years=args.years,  # read by check_years / check_seed, as `offgrid simulate`
            seed=args.seed,
            array_w=args.array_w,
            battery_kwh=args.battery_kwh,
            prices=prices,
            with_mix=not args.no_mix,
            min_solar_fraction=args.solar_share,
        )
    except DesignError as exc:
        design_failed(exc)
    except ValueError as exc:
        fail(str(exc))
    if args.json:
        print(json_text({"generator": study.to_dict()}))
    else:
        print(summary_text(study))
    return 0
