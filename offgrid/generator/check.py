"""The generator check: what it must carry at once, against its derated output.

While it runs, the generator carries the AC loads on at once (the design's AC peak:
connected AC power x coincidence factor, at least the largest appliance) and the battery
charger at full rate (its input = DC output / efficiency); when a motor starts, the
design's surge need (one AC start plus what runs beside it) takes the place of the AC
peak.  Both must lie within the derated output: a generator cannot lend from a surge
margin that its datasheet does not state (common practice, no source).

Minimum loading: a diesel run long below about 30 % of its rating wet-stacks (unburnt
fuel and soot in the exhaust; common practice, no source).  The rule applied here and in
the dispatch: the generator is never loaded below ``min_load_fraction`` x derated
output; what the loads and the charger cannot take is burnt in a dump load, and those
hours are counted.
"""

from __future__ import annotations

from dataclasses import dataclass

from offgrid.design.result import Notice, Reason, fmt

SOURCE = "common practice, no source"


@dataclass(frozen=True)
class GeneratorCheck:
    derated_w: float
    ac_peak_w: float
    surge_need_w: float
    surge_load: str
    charger_input_w: float
    running_need_w: float
    starting_need_w: float
    min_load_w: float
    ok: bool
    notices: tuple[Notice, ...]
    reason: Reason


def generator_check(
    derated_w: float,
    ac_peak_w: float,
    surge_need_w: float,
    charger_output_w: float,
    charger_efficiency: float,
    min_load_fraction: float,
    surge_load: str = "",
) -> GeneratorCheck:
    """Running and starting need against the derated output [W]; notices say what to change."""
    charger_in = charger_output_w / charger_efficiency if charger_efficiency > 0 else 0.0
    running = ac_peak_w + charger_in
    starting = max(surge_need_w, ac_peak_w) + charger_in
    min_w = min_load_fraction * derated_w
    notices: list[Notice] = []
    if starting > derated_w:
        who = f" ({surge_load} starting)" if surge_load and surge_need_w > ac_peak_w else ""
        notices.append(
            Notice(
                "generator-too-small",
                f"the generator's derated output {derated_w / 1000:.2f} kW is below what it "
                f"must carry at once{who}: {starting / 1000:.2f} kW (AC loads "
                f"{max(surge_need_w, ac_peak_w) / 1000:.2f} kW + charger input "
                f"{charger_in / 1000:.2f} kW). Choose a larger generator (generator.rated_kw) "
                "or a smaller charger (generator.charger_kw)",
                "error",
                "generator.check.starting_need_w",
            )
        )
    if charger_in < min_w:
        notices.append(
            Notice(
                "generator-light-charging",
                f"the charger alone draws {charger_in / 1000:.2f} kW, below the minimum "
                f"loading {min_w / 1000:.2f} kW: charging runs will burn the rest in a dump "
                "load or wet-stack the engine; a larger charger or a smaller generator fits "
                "better",
                "warning",
                "generator.check.min_load_w",
            )
        )
    reason = Reason(
        "running: AC peak + charger output / charger efficiency; starting: max(surge need, "
        "AC peak) + charger input; both <= derated output",
        (
            ("derated output", fmt(derated_w, "W")),
            ("AC peak", fmt(ac_peak_w, "W")),
            ("surge need", fmt(surge_need_w, "W")),
            ("charger input", fmt(charger_in, "W")),
            ("minimum loading", fmt(min_load_fraction)),
        ),
        SOURCE,
    )
    return GeneratorCheck(
        derated_w,
        ac_peak_w,
        surge_need_w,
        surge_load,
        charger_in,
        running,
        starting,
        min_w,
        starting <= derated_w,
        tuple(notices),
        reason,
    )
