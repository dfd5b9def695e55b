"""``offgrid climate``: list, show, check and import site climates; find the best tilt."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.commands.common import STDIO, fail, with_example
from offgrid.numbers import finite_float

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
_MARK = {"error": "!!", "warning": " !", "info": " -"}


def register(sub) -> None:
    p = sub.add_parser(
        "climate",
        help="list, show, check and import site climates",
        description="Site climates: the bundled ones, weather-file import, checks "
        "of typed monthly values, and the best array tilt.",
    )
    csub = p.add_subparsers(dest="climate_command", metavar="ACTION")

    q = csub.add_parser(
        "list",
        help="list the bundled climates and yours",
        description="Every climate a project can name: the bundled ones and "
        "those you imported (marked yours), with coordinates, kind "
        "of data and source.",
    )
    with_example(
        q,
        "offgrid climate list",
        "lists the climates by the name a project uses "
        '([climate] ref = "NAME"), yours marked as yours.',
    )
    q.set_defaults(func=run_list)

    q = csub.add_parser("show", help="show a climate's monthly table, checks and best tilt")
    q.add_argument("name", metavar="NAME", help="climate name or climate file")
    _geometry_args(q)
    q.add_argument("--no-checks", action="store_true", help="skip the plausibility checks")
    with_example(
        q,
        "offgrid climate show greensboro-nc-tmy3 --tilt 30",
        "prints the monthly table of the bundled Greensboro climate with the sun on "
        "a plane tilted 30 degrees towards the equator, and its checks.",
    )
    q.set_defaults(func=run_show)

    q = csub.add_parser(
        "import",
        help="turn a weather file into a climate file",
        description="Import an EPW, TMY3 (.csv), TMY2 (.tm2) or monthly CSV file. "
        "Hourly files are reduced to monthly means and keep their "
        "daily totals. The climate file goes into your offgrid "
        "folder, where any project can name it.",
    )
    q.add_argument(
        "file",
        metavar="FILE",
        help="the weather file; - reads the standard input (then --kind is needed)",
    )
    q.add_argument("--name", help="name of the climate (default: the station's)")
    q.add_argument(
        "--out",
        metavar="PATH",
        help="climate file to write instead (default: NAME.toml in your climates "
        "folder, see `offgrid climate list`; - writes to the standard output)",
    )
    q.add_argument(
        "--kind",
        choices=("epw", "tmy3", "tmy2", "monthly-csv"),
        help="file format, when the name does not tell",
    )
    q.add_argument(
        "--unit", metavar="UNIT", help="unit of a monthly CSV's insolation column, e.g. MJ/m2/day"
    )
    q.add_argument(
        "--fix", action="store_true", help="apply the suggested fix of a detected unit slip"
    )
    q.add_argument("--force", action="store_true", help="overwrite an existing file")
    with_example(
        q,
        'offgrid climate import upper-valley.epw --name "Upper Valley"',
        "reduces the weather year to twelve months (daily totals kept), checks it and "
        "keeps it as upper-valley in your climates; a project then names it with "
        '[climate] ref = "upper-valley".',
    )
    q.set_defaults(func=run_import)

    q = csub.add_parser(
        "check",
        help="check twelve monthly insolation values against physics",
        description="Check a climate file, or twelve typed values, for an "
        "impossible clearness index, values above the clear sky and "
        "unit slips.",
    )
    q.add_argument("name", nargs="?", metavar="NAME", help="climate name or file")
    q.add_argument(
        "--values",
        metavar="'V1 ... V12'",
        help="twelve monthly mean daily horizontal insolation values, January first",
    )
    q.add_argument(
        "--unit",
        metavar="UNIT",
        default="kWh/m2/day",
        help="unit the --values are in (default kWh/m2/day)",
    )
    q.add_argument("--lat", type=finite_float, help="latitude, degrees north")
    q.add_argument("--lon", type=finite_float, help="longitude, degrees east")
    q.add_argument("--elevation", type=finite_float, default=None, help="elevation, m")
    q.add_argument(
        "--tilt",
        type=finite_float,
        default=None,
        help="array tilt for the low-sun check, degrees (default: the latitude, at least 10)",
    )
    with_example(
        q,
        'offgrid climate check --values "5 5.5 6 6 5.5 5 5 5.5 6 6 5.5 5" --lat -3.4 --lon 36.9',
        "checks twelve typed monthly values (kWh/m2/day) "
        "against the clear sky at that latitude and longitude.",
    )
    q.set_defaults(func=run_check)

    q = csub.add_parser(
        "tilt",
        help="best tilt for the worst month and for the year",
        description="Search the tilt that serves the worst month best, beside "
        "the tilt for the best annual yield.",
    )
    q.add_argument("name", metavar="NAME", help="climate name or climate file")
    _geometry_args(q, tilt=False)
    q.add_argument(
        "--demand",
        metavar="'W1 ... W12'",
        help="daily demand of each month, Wh/day (default: the same every month)",
    )
    q.add_argument(
        "--min-tilt",
        type=finite_float,
        default=10.0,
        help="self-cleaning minimum tilt, degrees (default 10)",
    )
    with_example(
        q,
        "offgrid climate tilt kisanga-ridge-demo --min-tilt 15",
        "the tilt that serves the worst month best (at least 15 degrees) beside the "
        "best annual tilt, for the invented Kisanga Ridge climate.",
    )
    q.set_defaults(func=run_tilt)

    with_example(p, "offgrid climate list", "lists the climates a project can name.")
    p.set_defaults(func=lambda args: (p.print_help(), 2)[1])


def _geometry_args(q: argparse.ArgumentParser, tilt: bool = True) -> None:
    if tilt:
        q.add_argument(
            "--tilt",
            type=finite_float,
            help="plane tilt, degrees (default: best for the worst month)",
        )
    q.add_argument(
        "--azimuth",
        type=finite_float,
        help="direction the plane faces, degrees clockwise from north "
        "(default: towards the equator)",
    )
    q.add_argument(
        "--albedo",
        type=_albedo_arg,
        default=None,
        metavar="'R' or 'R1 ... R12'",
        help="ground reflectance, one value or twelve January first (default: the "
        "climate's own, else 0.2)",
    )
    q.add_argument(
        "--horizon", metavar="'AZ:EL ...'", help="horizon profile, e.g. '90:15 135:8 180:5 270:12'"
    )


# ----------------------------------------------------------------------------- helpers


def _albedo_arg(text: str) -> float | list[float]:
    """--albedo: one reflectance or twelve, January first."""
    from offgrid.climate.sky import albedo_problems

    parts = text.replace(",", " ").replace(";", " ").split()
    try:
        values = [float(v) for v in parts]
    except ValueError:
        raise argparse.ArgumentTypeError(f"'{text}' is not a number (or twelve)") from None
    value: float | list[float] = values[0] if len(values) == 1 else values
    problems = albedo_problems(value, "--albedo")
    if problems:
        raise argparse.ArgumentTypeError(f"{problems[0][0]}: {problems[0][1]}")
    return value


def _load(name: str):
    from offgrid.climate.files import (
        ClimateFileError,
        climate_header,
        load_climate,
        resolve_climate,
    )

    try:
        path = resolve_climate(name)
        return load_climate(name), climate_header(path)
    except ClimateFileError as exc:
        fail(str(exc))
    raise AssertionError  # unreachable


def _numbers(text: str, what: str, count: int = 12) -> list[float]:
    parts = text.replace(",", " ").replace(";", " ").split()
    from offgrid.numbers import NumberError, read_number

    try:
        values = [read_number(v) for v in parts]
    except NumberError as exc:
        fail(f"{what}: every value must be a finite number: {exc}")
    if len(values) != count:
        fail(f"{what}: give {count} values, January first (got {len(values)})")
    return values


def _row(label: str, values, fmt: str = "{:6.2f}") -> str:
    return f"{label:<7}" + "".join(fmt.format(v) for v in values)


def _header_row() -> str:
    return " " * 7 + "".join(f"{m:>6}" for m in MONTHS)


def _wrap(text: str, indent: str = "   ", width: int = 79) -> str:
    import textwrap

    return textwrap.fill(text, width=width, initial_indent=indent, subsequent_indent=indent + "  ")


def print_findings(findings, out=None) -> None:
    out = sys.stdout if out is None else out
    if not findings:
        print("Checks: nothing to report", file=out)
        return
    print(f"Checks ({len(findings)})", file=out)
    for f in findings:
        print(_wrap(f"{_MARK.get(f.severity, ' -')} [{f.code}] {f.message}", indent=""), file=out)
        for i, fix in enumerate(f.fixes):
            lead = "fix" if i == 0 else "or "
            vals = " ".join(f"{v:g}" for v in fix.values)
            print(_wrap(f"{lead}: {fix.label} -> {vals}", indent="     "), file=out)


#: Project field names in engine messages -> the option the user typed here.
_OPTION_OF_FIELD = (
    ("site.tilt_deg", "--tilt"),
    ("site.azimuth_deg", "--azimuth"),
    ("site.albedo", "--albedo"),
    ("choices.min_tilt_deg", "--min-tilt"),
    ("site.horizon_deg", "--horizon"),
)


def _option_message(exc: Exception) -> str:
    text = str(exc)
    for field, option in _OPTION_OF_FIELD:
        text = text.replace(field, option)
    return text


def _horizon(args):
    if not getattr(args, "horizon", None):
        return []
    from offgrid.climate.horizon import parse_horizon

    try:
        return parse_horizon(args.horizon)
    except ValueError as exc:
        fail(f"--horizon: {str(exc).removeprefix('site.horizon_deg ')}")
    raise AssertionError


# ----------------------------------------------------------------------------- actions


def run_list(args) -> int:
    from offgrid.climate.files import climate_library
    from offgrid.paths import user_climates_dir

    items = climate_library()
    if not items:
        print("No climates found.")
    else:
        print(f"{'NAME':<30} {'LAT':>7} {'LON':>8}  {'DATA':<11}  FROM")
    for e in items:
        if e.error:
            print(f"{e.name:<30} unreadable ({e.origin}): {e.error}")
            continue
        lat = f"{e.latitude_deg:.2f}" if e.latitude_deg is not None else "-"
        lon = f"{e.longitude_deg:.2f}" if e.longitude_deg is not None else "-"
        kind = "demo" if e.demo else ("hourly year" if e.daily else "monthly")
        print(f"{e.name:<30} {lat:>7} {lon:>8}  {kind:<11}  {e.origin}")
        about = e.source if e.title == e.name else f"{e.title}: {e.source}"
        print(_wrap(about, indent="    ", width=79))
    print("\nDemo climates are invented demonstration data.")
    print(
        _wrap(
            f"Yours are kept in {user_climates_dir()} (add one with `offgrid climate "
            'import FILE`). A project names a climate with [climate] ref = "NAME"; '
            "show one with `offgrid climate show NAME`.",
            indent="",
        )
    )
    return 0


def run_show(args) -> int:
    import numpy as np

    from offgrid.climate import sky

    climate, head = _load(args.name)
    lat = climate.latitude_deg
    print(f"{head['name']}" + ("  (demonstration data)" if climate.demo else ""))
    print("=" * min(79, len(head["name"]) + (23 if climate.demo else 0)))
    print(_wrap(f"Source: {climate.source or 'not given'}", indent=""))
    coords = []
    for label, value, unit in (
        ("lat", lat, ""),
        ("lon", climate.longitude_deg, ""),
        ("elevation", climate.elevation_m, " m"),
        ("record low", climate.record_low_c, " C"),
    ):
        if value is not None:
            coords.append(f"{label} {value:g}{unit}")
    print(", ".join(coords) or "no coordinates given")
    if climate.daily is not None:
        print("Daily series: 365 days kept (for the reliability simulation)")
    print()
    print(_header_row())
    h = np.asarray(climate.insolation_kwh_m2_day, dtype=float)
    print(_row("GHI", h))
    if lat is not None:
        print(_row("KT", sky.clearness_index(h, lat)))
    for label, key in (("T mean", "temp_mean_c"), ("T max", "temp_max_c"), ("T min", "temp_min_c")):
        values = getattr(climate, key)
        if values is not None:
            print(_row(label, values, "{:6.1f}"))
    if lat is not None:
        tilt_line = _show_plane(args, climate, h)
        print()
        print(_wrap(tilt_line, indent=""))
    if not args.no_checks and lat is not None:
        from offgrid.climate.checks import check_climate

        print()
        print_findings(
            check_climate(climate, tilt_deg=getattr(args, "tilt", None), albedo=args.albedo)
        )
    return 0


def _show_plane(args, climate, h) -> str:
    from offgrid.climate.poa import poa_monthly
    from offgrid.climate.tilt import best_tilt, describe_tilt

    lat = climate.latitude_deg
    horizon = _horizon(args)
    lon = climate.longitude_deg or 0.0
    elev = climate.elevation_m or 0.0
    try:
        albedo = args.albedo if args.albedo is not None else climate.albedo
        choice = best_tilt(
            h,
            lat,
            args.azimuth,
            None,
            albedo,
            10.0,
            horizon=horizon,
            longitude_deg=lon,
            elevation_m=elev,
        )
        tilt = choice.tilt_deg if args.tilt is None else args.tilt
        res = poa_monthly(
            h,
            lat,
            tilt,
            choice.azimuth_deg,
            albedo,
            horizon=horizon,
            longitude_deg=lon,
            elevation_m=elev,
        )
    except ValueError as exc:
        fail(_option_message(exc))
    print(_row("POA", res.poa_kwh_m2_day))
    if horizon:
        print(_row("lost", res.beam_lost_kwh_m2_day))
    print(
        _wrap(
            "GHI: horizontal, POA: in the array plane at tilt "
            f"{tilt:g} deg, azimuth {choice.azimuth_deg:g} deg, kWh/m2/day"
            + ("; lost: beam hidden by the horizon" if horizon else "")
            + "; KT: clearness index; T: C",
            indent="",
        )
    )
    return describe_tilt(choice) + " (equal demand every month)"


def run_tilt(args) -> int:
    from offgrid.climate.tilt import best_tilt, describe_tilt

    climate, head = _load(args.name)
    if climate.latitude_deg is None:
        fail(f"climate '{args.name}' has no latitude_deg")
    demand = _numbers(args.demand, "--demand") if args.demand else None
    try:
        albedo = args.albedo if args.albedo is not None else climate.albedo
        c = best_tilt(
            climate.insolation_kwh_m2_day,
            climate.latitude_deg,
            args.azimuth,
            demand,
            albedo,
            args.min_tilt,
            horizon=_horizon(args),
            longitude_deg=climate.longitude_deg or 0.0,
            elevation_m=climate.elevation_m or 0.0,
        )
    except ValueError as exc:
        fail(_option_message(exc))
    print(f"{head['name']}: lat {climate.latitude_deg:g}, azimuth {c.azimuth_deg:g}")
    print(_header_row())
    print(_row(f"{c.tilt_deg:g}", c.poa_kwh_m2_day))
    print(_row(f"{c.annual_tilt_deg:g}", c.poa_annual_tilt_kwh_m2_day))
    print(
        _wrap(
            f"kWh/m2/day in the array plane: first row at the worst-month tilt "
            f"({c.tilt_deg:g} deg), second at the best annual tilt "
            f"({c.annual_tilt_deg:g} deg)",
            indent="",
        )
    )
    print(
        f"annual kWh/m2: {c.annual_kwh_m2:.0f} at {c.tilt_deg:g} deg, "
        f"{c.annual_best_kwh_m2:.0f} at {c.annual_tilt_deg:g} deg"
    )
    print(_wrap(describe_tilt(c), indent=""))
    return 0


def run_check(args) -> int:
    from offgrid.climate.checks import (
        check_climate,
        check_insolation,
        check_transposition,
        convert_insolation,
        worst_severity,
    )

    if args.values:
        if args.name:
            fail("give a climate NAME or --values, not both")
        if args.lat is None:
            fail("--values needs --lat")
        try:
            values = convert_insolation(_numbers(args.values, "--values"), args.unit)
        except ValueError as exc:
            fail(str(exc))
        findings = check_insolation(values, args.lat, args.lon, args.elevation or 0.0)
        if worst_severity(findings) != "error":
            tilt = max(abs(args.lat), 10.0) if args.tilt is None else args.tilt
            findings += check_transposition(
                values, args.lat, tilt, None, None, args.elevation or 0.0
            )
    elif args.name:
        climate, _ = _load(args.name)
        findings = check_climate(climate, args.lat, args.lon, args.elevation, tilt_deg=args.tilt)
    else:
        fail("name a climate, or give --values with --lat")
    print_findings(findings)
    return 1 if worst_severity(findings) == "error" else 0


def run_import(args) -> int:
    from dataclasses import replace

    from offgrid.climate.checks import apply_fix, check_climate
    from offgrid.climate.files import save_climate
    from offgrid.climate.importers import WeatherFileError, import_weather_file

    try:
        if args.file == STDIO:
            result = _import_stdin(args, import_weather_file)
        else:
            result = import_weather_file(args.file, kind=args.kind, unit=args.unit)
    except WeatherFileError as exc:
        fail(str(exc))
    climate = result.climate
    # with --out -, the climate file goes to the standard output and this report to stderr
    log = sys.stderr if args.out == STDIO else sys.stdout
    findings = list(result.findings)
    fixable = [f for f in findings if f.severity == "error" and f.fixes]
    if fixable and args.fix:
        for f in fixable:
            climate = apply_fix(climate, f)
            print(f"applied: {f.fixes[0].label}", file=log)
        climate = replace(
            climate,
            source=climate.source
            + " (unit corrected on import: "
            + "; ".join(f.fixes[0].label for f in fixable)
            + ")",
        )
        findings = check_climate(climate)
    name = args.name or result.name
    to_stdout = args.out == STDIO
    if args.out:
        out = Path(args.out)
    else:
        from offgrid.climate.files import bundled_climates
        from offgrid.paths import user_climates_dir

        stem = _file_stem(name)
        if stem in bundled_climates():
            fail(
                f"'{stem}' is the name of a bundled climate: choose another --name (or write "
                "the file elsewhere with --out PATH)"
            )
        out = user_climates_dir() / f"{stem}.toml"
    print(
        f"{Path(args.file).name}: {result.kind}, lat {climate.latitude_deg}, "
        f"lon {climate.longitude_deg}, elevation {climate.elevation_m}",
        file=log,
    )
    print(_header_row(), file=log)
    print(_row("GHI", climate.insolation_kwh_m2_day), file=log)
    print(_row("T mean", climate.temp_mean_c, "{:6.1f}"), file=log)
    print("GHI: kWh/m2/day horizontal; T mean: C", file=log)
    for note in result.notes:
        print(_wrap(f"note: {note}", indent=""), file=log)
    print_findings(findings, out=log)
    errors = [f for f in findings if f.severity == "error"]
    if errors:
        hint = (
            " (run again with --fix to apply the suggested fix)"
            if any(f.fixes for f in errors)
            else ""
        )
        fail(f"not written: {len(errors)} problem(s) to resolve first{hint}", code=1)
    if to_stdout:
        from offgrid.climate.files import dumps_climate

        sys.stdout.write(dumps_climate(climate, name=name))
        return 0
    from offgrid.report.export import overwrite_refusal

    refusal = overwrite_refusal(out)
    if refusal:
        fail(f"--out {refusal}")
    if out.exists() and not args.force:
        fail(f"{out} exists: use --force to overwrite it, or --out PATH")
    try:
        if not args.out:
            out.parent.mkdir(parents=True, exist_ok=True)
        save_climate(climate, out, name=name)
    except OSError as exc:
        fail(f"{exc.filename or out}: cannot write the climate file: {exc.strerror or exc}")
    print(f"wrote {out}")
    if not args.out:
        print(f'A project names it with [climate] ref = "{out.stem}" (or --climate {out.stem}).')
    return 0


_KIND_SUFFIX = {"epw": ".epw", "tmy3": ".csv", "tmy2": ".tm2", "monthly-csv": ".csv"}


def _import_stdin(args, import_weather_file):
    """Import a weather file piped into ``offgrid climate import - --kind KIND``."""
    import tempfile

    if not args.kind:
        fail(
            "FILE '-' reads the standard input: say what it is with --kind "
            "(epw, tmy3, tmy2 or monthly-csv)"
        )
    if sys.stdin is None or sys.stdin.isatty():
        fail("FILE '-' reads the standard input: pipe or redirect the weather file into offgrid")
    buffer = getattr(sys.stdin, "buffer", None)
    data = buffer.read() if buffer is not None else sys.stdin.read().encode("utf-8")
    with tempfile.TemporaryDirectory(prefix="offgrid-import-") as folder:
        path = Path(folder) / f"standard-input{_KIND_SUFFIX[args.kind]}"
        path.write_bytes(data)
        result = import_weather_file(path, kind=args.kind, unit=args.unit)
    from dataclasses import replace

    source = result.climate.source.replace(path.name, "read from the standard input")
    return replace(result, climate=replace(result.climate, source=source))


def _file_stem(name: str) -> str:
    import re

    return re.sub(r"[^A-Za-z0-9]+", "-", name).strip("-").lower() or "climate"
