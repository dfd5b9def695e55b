"""What the crew must also carry: the accessories of a complete bill of materials.

The main parts, the protection schedule and the cable are in
:func:`offgrid.economics.bom.bill_of_materials`; this module adds, with quantities from
the design, each line naming the design figure (``figure``: a reason key of the
design) or the caution (``figure = "caution:<code>"``) that asks for it:

* a mounting set per module (``[stock] mounting``: ground or roof);
* PV connector pairs, two per string, and a combiner where strings are paralleled;
* DC surge protective devices where the surge caution calls for them: one at each
  controller's PV input, a second at the array end when the array cable is longer than
  10 m (the caution's own threshold).  No caution of the design calls for an AC surge
  protective device, so none is listed;
* the earthing conductor along the cable runs and one earth electrode (the grounding
  caution);
* battery interconnects and lugs rated for the battery disconnect's current (the largest
  current through the terminals);
* a holder for each fuse of the protection schedule;
* a DC distribution board with a way per DC load circuit;
* a warning label for each caution that asks for a marking.

(The cable runs with the stated allowance come from the main list's own
:func:`offgrid.economics.bom._cable_lines`, given the allowance.)

Counts that are the trade's habit, not a design figure (connectors per string, lugs per
conductor end, labels, allowance) say ``common practice, no source``.  Earthing
conductor size follows the local code (NEC 250.122, IEC 60364-5-54): the line says to
confirm it.
"""

from __future__ import annotations

import math

from offgrid.design.result import SystemDesign
from offgrid.economics.bom import CONDUCTORS_PER_RUN, BomLine, devices_of, wires_of
from offgrid.project.model import Project

COMMON = "common practice, no source"
#: The surge caution asks for protection at both ends of an array cable longer than this.
SURGE_BOTH_ENDS_M = 10.0
#: Labels each caution asks for: caution code -> (where, how many per system).
LABELS: dict[str, tuple[str, int]] = {
    "dc-above-elv": ("'DC voltage above extra-low voltage' at the battery and controller", 2),
    "pv-live-in-daylight": ("'PV array live in daylight' at the PV disconnect and combiner", 2),
    "battery-short-circuit": ("'Battery: high short-circuit current' at the battery", 1),
    "lead-acid-ventilation": ("'Battery room: no flames, ventilate, hydrogen' at the door", 1),
    "lfp-cold-charge": ("'Do not charge below 0 C' at the battery", 1),
}


def caution_codes(design: SystemDesign) -> set[str]:
    return {c.code for c in design.electrical.cautions} if design.electrical else set()


def _battery_terminal_current_a(design: SystemDesign) -> tuple[float, str]:
    """The largest current through the battery terminals and the figure it is."""
    for d in devices_of(design):
        if d.kind == "disconnect" and d.rating_a:
            return float(d.rating_a), "protection.devices.rating_a"
    charge = [w for w in wires_of(design) if w.key in ("charge", "inverter")]
    if charge:
        w = max(charge, key=lambda w: w.current_a)
        return float(w.current_a), f"wires.{w.key}.current_a"
    return design.battery.peak_charge_current_a, "battery.peak_charge_current_a"


def accessory_lines(
    project: Project, design: SystemDesign, mounting: str, allowance_pct: float
) -> list[BomLine]:
    """The accessories (see the module docstring), in the order of the energy path."""
    a, b, c = design.array, design.battery, design.controller
    codes = caution_codes(design)
    out = [
        BomLine(
            f"mounting:{mounting}",
            f"Module mounting set, {mounting} (rails or frame share, clamps, fixings)",
            float(a.module_count),
            "each",
            f"one per module: {a.module_count} modules; {COMMON}",
            "array.module_count",
        ),
        BomLine(
            "pv-connector:pair",
            "PV connector pair (male and female), matched to the modules' leads",
            float(2 * a.modules_parallel),
            "each",
            f"two per string (its + and - ends) x {a.modules_parallel} string(s); {COMMON}",
            "array.modules_parallel",
        ),
    ]
    if a.modules_parallel > 1:
        out.append(
            BomLine(
                f"combiner:{a.modules_parallel} strings",
                f"PV combiner box for {a.modules_parallel} strings, DC-rated, at least "
                f"{math.ceil(a.string_voc_cold_v)} V",
                1.0,
                "each",
                f"{a.modules_parallel} strings in parallel are joined before the array cable",
                "array.modules_parallel",
            )
        )
    if "surge-protection" in codes:
        run = project.wiring.array_run_m
        per = 2 if run > SURGE_BOTH_ENDS_M else 1
        where = "controller input and array end" if per == 2 else "controller input"
        out.append(
            BomLine(
                f"surge-protector:DC {math.ceil(a.string_voc_cold_v)} V",
                f"DC surge protective device for PV, rated for at least "
                f"{math.ceil(a.string_voc_cold_v)} V (the string's cold Voc)",
                float(per * c.count),
                "each",
                f"surge caution: one at each of {c.count} controller input(s)"
                + (f", one at the array end of the {run:g} m array cable" if per == 2 else "")
                + f" ({where})",
                "caution:surge-protection",
            )
        )
    if "grounding" in codes:
        w = project.wiring
        length = w.array_run_m + w.controller_battery_m + w.battery_inverter_m
        out.append(
            BomLine(
                "earthing-conductor:green-yellow",
                "Earthing (protective bonding) conductor, green-yellow; size to the local "
                "code: confirm against the current edition of NEC 250.122 or IEC 60364-5-54",
                float(math.ceil(length * (1 + allowance_pct / 100.0) - 1e-9)),
                "m",
                f"grounding caution: frames and enclosures bonded along the array, charge "
                f"and inverter runs ({length:g} m) + {allowance_pct:g} % allowance; {COMMON}",
                "caution:grounding",
            )
        )
        out.append(
            BomLine(
                "earth-electrode:rod",
                "Earth electrode (rod with its clamp)",
                1.0,
                "each",
                "grounding caution: one electrode for the system's earthing",
                "caution:grounding",
            )
        )
    amps, figure = _battery_terminal_current_a(design)
    links = b.units_parallel * (b.units_series - 1)
    leads = 2 * b.units_parallel if b.units_parallel > 1 else 0
    if links or leads:
        out.append(
            BomLine(
                f"battery-link:{math.ceil(amps)} A",
                f"Battery interconnect, rated for at least {math.ceil(amps)} A",
                float(links + leads),
                "each",
                f"{b.units_series - 1} link(s) in each of {b.units_parallel} string(s)"
                + (" + 2 string leads to the bus per string" if leads else "")
                + f"; rated for the {amps:g} A through the terminals",
                figure,
            )
        )
    battery_runs = [w for w in wires_of(design) if w.key in ("charge", "inverter")]
    lug_ends = 2 * (links + leads) + sum(2 * CONDUCTORS_PER_RUN * w.count for w in battery_runs)
    if lug_ends:
        out.append(
            BomLine(
                f"lug:{math.ceil(amps)} A",
                f"Crimp lug for the battery cables, rated for at least {math.ceil(amps)} A",
                float(lug_ends),
                "each",
                "two per interconnect, two per conductor of the charge and inverter runs; "
                + COMMON,
                figure,
            )
        )
    fuses = [d for d in devices_of(design) if d.kind == "fuse"]
    by_rating: dict[str, int] = {}
    for d in fuses:
        key = f"{d.rating_a:g} A" if d.rating_a is not None else "fuse"
        by_rating[key] = by_rating.get(key, 0) + d.count
    for rating, n in by_rating.items():
        out.append(
            BomLine(
                f"fuse-holder:{rating}",
                f"DC fuse holder for a {rating} fuse",
                float(n),
                "each",
                f"one holder per fuse of the protection schedule rated {rating}",
                "protection.devices.count",
            )
        )
    loads = [w for w in wires_of(design) if w.key.startswith("load")]
    if loads:
        out.append(
            BomLine(
                f"dc-board:{len(loads)} ways",
                f"DC distribution board, {len(loads)} fused ways, rated for the system's "
                f"{b.system_voltage_v} V DC",
                1.0,
                "each",
                f"one way per DC load circuit of the wiring schedule ({len(loads)})",
                "protection.devices.count",
            )
        )
    labels = [(code, LABELS[code]) for code in sorted(codes) if code in LABELS]
    for code, (text, n) in labels:
        out.append(
            BomLine(
                f"label:{code}",
                f"Warning label {text}",
                float(n),
                "each",
                f"the {code} caution asks the hazard to be marked; {COMMON}",
                f"caution:{code}",
            )
        )
    return out
