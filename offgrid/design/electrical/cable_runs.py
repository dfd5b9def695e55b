"""Cable runs: each circuit's currents, its fuse and the conductor sized for it.

Maximum current for ampacity and protection (NEC 690.8(A)(1) on the PV side), operating
current for the voltage drop; conductors from :mod:`offgrid.design.wiring`.
"""

from __future__ import annotations

from dataclasses import dataclass

from offgrid.design import protection as prot
from offgrid.design import strings as st
from offgrid.design import wiring as wr
from offgrid.design.charging import PwmVoltage, peak_charge_current
from offgrid.design.inverter_step import inverter_dc_current_a
from offgrid.design.pv import DiodeParams
from offgrid.design.result import InverterResult, Notice, Reason, ReasonBook, fmt, reason_kind
from offgrid.memo import memoised
from offgrid.project.model import DesignChoices, Load, ModuleSpec, WiringChoices

NEC = "NFPA 70 (NEC) 2023"
#: What each kind of run's maximum current is, for its reason.
WIRE_CURRENT_RULE = {
    "string": "1.25 x Isc of one string",
    "array": "1.25 x Isc x strings per controller",
    "charge": "the controller's rated output current (or its operating current if larger)",
    "inverter": "inverter continuous rating / (efficiency x low-voltage cut-off)",
    "load": "quantity x power / system voltage",
}
#: What each kind of run's operating (voltage-drop) current is, for its reason.
WIRE_DROP_CURRENT_RULE = {
    "string": "Imp of one string (MPPT) or the module current at the PWM operating voltage "
    "(PWM), at STC",
    "array": "strings per controller x the string's operating current",
    "charge": "the peak charge current of one controller's strings, at most its rating "
    "(MPPT: STC power x efficiency / bank voltage; PWM: strings x the module current at "
    "the PWM operating voltage, at STC)",
    "inverter": "the same as its maximum current (the inverter at its continuous rating at "
    "the low-voltage cut-off)",
    "load": "the same as its maximum current (quantity x power / system voltage)",
}
LARGE_CONDUCTOR_MM2 = 50.0  # ~1/0 AWG: above this on 12/24 V, suggest a higher voltage


@dataclass(frozen=True)
class RunPlan:
    runs: tuple[wr.RunSpec, ...]
    fuses_needed: bool  # string fuses
    string_fuse_a: float | None
    array_fuse_a: float
    charge_fuse_a: float
    battery_fuse_a: float | None  # the inverter circuit's, None without an inverter
    charge_max_current_a: float  # each controller's battery output, for its fuse
    pwm_voltage: PwmVoltage  # what a PWM array works against (battery and array side)


@dataclass(frozen=True)
class CableStep:
    wires: tuple[wr.WireChoice, ...]
    plan: RunPlan
    ambient_c: float
    reasons: dict[str, Reason]
    notices: tuple[Notice, ...]


def wire_ambient_c(wiring: WiringChoices, temp_day_c) -> float:
    """Ambient temperature for ampacity: the user's, else the hottest month's daytime mean."""
    if wiring.ambient_temp_c is not None:
        return float(wiring.ambient_temp_c)
    return float(max(temp_day_c))


def dc_load_runs(
    loads: list[Load], vsys: float, wiring: WiringChoices, drop_limit_pct: float
) -> list[wr.RunSpec]:
    """One run per DC load with power: quantity x power / system voltage, its own length
    (``loads[N].run_m``) or the default (``wiring.dc_load_run_m``), fuse >= 1.25 x current."""
    runs: list[wr.RunSpec] = []
    for n_load, load in enumerate(loads, start=1):
        if load.ac_dc != "dc" or not load.quantity * load.power_w > 0:
            continue
        i_load = load.quantity * load.power_w / vsys
        own = f"loads[{n_load}].run_m"
        length = wiring.dc_load_run_m if load.run_m is None else load.run_m
        field = "wiring.dc_load_run_m" if load.run_m is None else own
        runs.append(
            wr.RunSpec(
                f"load{n_load}",
                f"DC load '{load.name}'",
                i_load,
                i_load,
                vsys,
                length,
                drop_limit_pct,
                prot.standard_rating_a(
                    1.25 * i_load,
                    what=f"DC load '{load.name}' circuit",
                    field=f"loads[{n_load}].power_w",
                ),
                1,
                field,
                own,
            )
        )
    return runs


def plan_runs(
    module: ModuleSpec,
    params: DiodeParams,
    ctype: str,
    controller_efficiency: float,
    controller_current_a: float,
    controllers: int,
    vsys: float,
    pwm: PwmVoltage,
    bank_voltage_v: float,
    layout: st.Layout,
    inverter: InverterResult,
    loads: list[Load],
    wiring: WiringChoices,
    choices: DesignChoices,
) -> RunPlan:
    """Every run of the system (strings, array, charge, inverter, DC loads) with its maximum
    and operating currents, circuit voltage, length, drop limit and fuse.

    ``pwm``: the PWM operating voltage (:func:`offgrid.design.charging.pwm_operating_voltage`);
    the charge run's operating current is one controller's peak charge current
    (:func:`offgrid.design.charging.peak_charge_current`, MPPT at ``bank_voltage_v``)."""
    # Runs and their currents.
    isc, imp = module.isc_a, module.imp_a
    n_c = layout.strings_per_controller
    peak = peak_charge_current(
        ctype,
        series=layout.series,
        strings=n_c,
        module_pmax_w=module.pmax_w,
        controller_efficiency=controller_efficiency,
        bank_voltage_v=bank_voltage_v,
        system_voltage_v=vsys,
        rating_a=controller_current_a,
        params=params,
        pwm_array_v=pwm.array_v,
    )
    if ctype == "pwm":
        v_array, i_op_str = pwm.array_v, peak.string_current_a
    else:
        v_array, i_op_str = layout.series * module.vmp_v, imp
    fuses_needed = prot.string_fuses_needed(n_c, isc, wiring.module_max_fuse_a)
    string_fuse = (
        prot.string_fuse_rating_a(isc, wiring.module_max_fuse_a) if (fuses_needed) else None
    )
    i_charge_op = peak.current_a
    i_charge_max = max(float(controller_current_a), i_charge_op)
    limits = choices
    runs: list[wr.RunSpec] = []
    if n_c >= 2:
        runs.append(
            wr.RunSpec(
                "string",
                "modules to combiner",
                prot.pv_max_current_a(isc, 1),
                i_op_str,
                v_array,
                wiring.string_run_m,
                limits.drop_limit_array_pct,
                string_fuse,
                layout.parallel,
                "wiring.string_run_m",
            )
        )
    array_fuse = prot.standard_rating_a(
        prot.pv_fuse_min_a(isc, n_c),
        fuse=False,
        what="PV circuit of each controller",
        field="controller.max_current_a",
    )
    runs.append(
        wr.RunSpec(
            "array",
            "array to controller",
            prot.pv_max_current_a(isc, n_c),
            n_c * i_op_str,
            v_array,
            wiring.array_run_m,
            limits.drop_limit_array_pct,
            array_fuse,
            controllers,
            "wiring.array_run_m",
        )
    )
    charge_fuse = prot.standard_rating_a(
        1.25 * i_charge_max,
        fuse=False,
        what="controller-to-battery circuit",
        field="controller.max_current_a",
    )
    runs.append(
        wr.RunSpec(
            "charge",
            "controller to battery",
            i_charge_max,
            i_charge_op,
            vsys,
            wiring.controller_battery_m,
            limits.drop_limit_battery_pct,
            charge_fuse,
            controllers,
            "wiring.controller_battery_m",
        )
    )
    inv = inverter
    battery_fuse = None
    if inv.needed:
        i_inv = float(inv.dc_input_current_a)
        if not i_inv > 0:  # a core built by hand: the inverter step's one formula
            i_inv = inverter_dc_current_a(float(inv.continuous_w), float(inv.efficiency), vsys)
        battery_fuse = prot.standard_rating_a(1.25 * i_inv, what="inverter circuit", field="loads")
        runs.append(
            wr.RunSpec(
                "inverter",
                "battery to inverter",
                i_inv,
                i_inv,
                vsys,
                wiring.battery_inverter_m,
                limits.drop_limit_battery_pct,
                battery_fuse,
                1,
                "wiring.battery_inverter_m",
            )
        )
    runs.extend(dc_load_runs(loads, vsys, wiring, limits.drop_limit_load_pct))
    return RunPlan(
        tuple(runs),
        fuses_needed,
        string_fuse,
        array_fuse,
        charge_fuse,
        battery_fuse,
        i_charge_max,
        pwm,
    )


def size_cables(
    plan: RunPlan, wiring: WiringChoices, choices: DesignChoices, vsys: float, ambient_c: float
) -> CableStep:
    """The runs of :func:`plan_runs` with their conductors sized (PV runs in series share one
    drop limit), the reasons of every wire, and the cable warnings.  What it reads of the
    wiring and the choices is passed on to :func:`_sized_cables` (memoised while planning:
    a village's designs share a few sets of runs)."""
    return _sized_cables(
        plan,
        wiring.units,
        wiring.material,
        wiring.conductor_temp_c,
        wiring.insulation_temp_c,
        choices.drop_limit_array_pct,
        float(choices.derates.wiring),
        vsys,
        ambient_c,
        reason_kind(),
    )


@memoised
def _sized_cables(
    plan: RunPlan,
    units: str,
    material: str,
    conductor_temp_c: float,
    insulation_temp_c: float,
    drop_limit_array_pct: float,
    wiring_derate: float,
    vsys: float,
    ambient_c: float,
    kind: type,
) -> CableStep:
    """:func:`size_cables` on the figures it reads (``kind``: the reason record in force,
    part of the memo's key only)."""
    runs, ambient = plan.runs, ambient_c
    cable = (units, material, conductor_temp_c, ambient, insulation_temp_c)
    pv_runs = tuple(r for r in runs if r.key in ("string", "array"))
    other = [r for r in runs if r.key not in ("string", "array")]
    wires = _pv_wires(pv_runs, drop_limit_array_pct, *cable) + tuple(
        wr.size_conductor(r, *cable) for r in other
    )
    return CableStep(
        wires,
        plan,
        ambient,
        wire_reasons(wires, runs, units, conductor_temp_c, insulation_temp_c, ambient),
        cable_notices(wires, vsys, wiring_derate),
    )


def wire_reasons(
    wires: tuple[wr.WireChoice, ...],
    runs: tuple[wr.RunSpec, ...],
    units: str,
    conductor_temp_c: float,
    insulation_temp_c: float,
    ambient: float,
) -> dict[str, Reason]:
    """The reasons of every figure of every wire (``wires.KEY.FIGURE``); ``units``,
    ``conductor_temp_c`` and ``insulation_temp_c`` are the wiring table's."""
    rb = ReasonBook()
    kind = reason_kind()
    for w in wires:
        spec = next(r for r in runs if r.key == w.key)
        rb.extend(
            _one_wire_reasons(
                w, spec.length_field, units, conductor_temp_c, insulation_temp_c, ambient, kind
            )
        )
    return rb.freeze()


@memoised  # planning: the designs of a village repeat a few PV runs
def _pv_wires(
    pv_runs: tuple[wr.RunSpec, ...],
    limit_pct: float,
    units: str,
    material: str,
    conductor_temp_c: float,
    ambient_c: float,
    insulation_c: int,
) -> tuple[wr.WireChoice, ...]:
    """:func:`offgrid.design.wiring.size_runs_in_series` of the PV runs, as a tuple."""
    return tuple(
        wr.size_runs_in_series(
            list(pv_runs), limit_pct, units, material, conductor_temp_c, ambient_c, insulation_c
        )
    )


@memoised  # planning: a village's designs share most of their wires
def _one_wire_reasons(
    w: wr.WireChoice,
    length_field: str | None,
    units: str,
    conductor_temp_c: float,
    insulation_temp_c: float,
    ambient: float,
    record: type,
) -> dict[str, Reason]:
    """The reasons of one wire's figures (``length_field``: its run's; ``record``: the
    reason record in force, part of the memo's key only)."""
    rb = ReasonBook()
    table = "NEC Chapter 9 Table 8" if units == "awg" else "IEC 60228"
    amp_table = (
        "NEC Table 310.16 with Table 310.15(B)(1)(1), 110.14(C)"
        if units == "awg"
        else "IEC 60364-5-52 Tables B.52.4/B.52.5, B.52.14"
    )
    base = f"wires.{w.key}"
    rule = w.key if w.key in WIRE_CURRENT_RULE else "load"
    rb.add(
        f"{base}.size",
        "smallest listed size whose ampacity >= max(1.25 x max current, "
        "fuse) and whose voltage drop is within the run's limit",
        f"{NEC} 690.8(B), 215.2; {amp_table}",
        max_current=fmt(w.current_a, "A"),
        required_ampacity=fmt(w.required_ampacity_a, "A"),
        length=fmt(w.length_m, "m"),
        ambient=fmt(ambient, "C"),
        material=w.material,
    )
    rb.add(
        f"{base}.drop_pct",
        "100 x 2 x one-way length x drop current (drop_current_a, "
        "the operating current) x resistance / circuit voltage",
        f"{table}, corrected to conductor temperature",
        length=fmt(w.length_m, "m"),
        drop_current=fmt(w.operating_current_a, "A"),
        resistance=fmt(w.resistance_ohm_km, "ohm/km"),
        circuit_voltage=fmt(w.voltage_v, "V"),
        conductor_temp=fmt(conductor_temp_c, "C"),
        limit=fmt(w.drop_limit_pct, "%"),
    )
    rb.add(
        f"{base}.drop_current_a",
        "the operating current the voltage drop is computed with, by the rule of its kind of run",
        "common practice, no source",
        rule=WIRE_DROP_CURRENT_RULE[rule],
        value=fmt(w.operating_current_a, "A"),
    )
    rb.add(
        f"{base}.voltage_v",
        "circuit voltage the drop is a percentage of: the string's "
        "operating voltage on the PV side, the system voltage on the battery side",
        "common practice, no source",
        value=fmt(w.voltage_v, "V"),
    )
    rb.add(
        f"{base}.resistance_ohm_km",
        "conductor resistance at the conductor temperature",
        f"{table}, corrected to conductor temperature",
        conductor_temp=fmt(conductor_temp_c, "C"),
        size=w.size,
    )
    rb.add(
        f"{base}.ampacity_a",
        "table ampacity x ambient correction, within the terminal rating",
        amp_table,
        ambient=fmt(ambient, "C"),
        insulation=fmt(insulation_temp_c, "C"),
    )
    rb.add(
        f"{base}.current_a",
        "the circuit's maximum continuous current (for ampacity and "
        "protection), by the rule of its kind of run",
        f"{NEC} 690.8(A)(1) for PV circuits; the rest common practice, no source",
        rule=WIRE_CURRENT_RULE[rule],
        value=fmt(w.current_a, "A"),
    )
    rb.add(
        f"{base}.length_m",
        "one-way length of the run as set in the project (typed, or the default)",
        "project file",
        field=length_field or "wiring",
        value=fmt(w.length_m, "m"),
    )
    rb.add(
        f"{base}.count",
        "identical runs: one per string (string runs) or per "
        "controller (array and charge runs), else one",
        "common practice, no source",
        count=str(w.count),
    )
    if w.fuse_a is not None:
        rb.add(
            f"{base}.fuse_a",
            "smallest standard rating >= 1.25 x the circuit current, not "
            "above the conductor's ampacity",
            f"{NEC} 240.6(A), 690.9(B), 240.4",
            current=fmt(w.current_a, "A"),
            ampacity=fmt(w.ampacity_a, "A"),
        )
    return rb.freeze()


def cable_notices(
    wires: tuple[wr.WireChoice, ...], vsys: float, wiring_derate: float
) -> tuple[Notice, ...]:
    """Very large cables at 12/24 V; a wiring derate the cables as sized do not bear out."""
    notices: list[Notice] = []
    big = [w for w in wires if w.area_mm2 >= LARGE_CONDUCTOR_MM2 and vsys <= 24]
    if big:
        names = ", ".join(f"{w.run} ({w.size})" for w in big)
        notices.append(
            Notice(
                "raise-system-voltage",
                f"At {vsys:.0f} V these runs need very large cables: {names}. "
                f"A {2 * vsys:.0f} V system halves the current, and for the same voltage drop the "
                "cable needs about a quarter of the cross-section.",
                "warning",
                "battery.system_voltage_v",
            )
        )

    # The derate chain's wiring factor against the cables as sized (drop % ~ power lost %).
    cable_loss = sum(w.drop_pct for w in wires if w.key in ("string", "array", "charge")) / 100
    chain_loss = 1.0 - wiring_derate
    if abs(chain_loss - cable_loss) > 0.03:
        notices.append(
            Notice(
                "wiring-derate-vs-cables",
                f"The wiring derate ({1 - chain_loss:.2f}) allows "
                f"{chain_loss:.0%} for cable losses, but the PV and charge cables as sized lose "
                f"about {cable_loss:.1%} at full sun: set choices.derates.wiring to about "
                f"{1 - cable_loss:.2f} so the derate chain and the harvest agree"
                + (
                    " (the array is now larger than the cables need)."
                    if chain_loss > cable_loss
                    else " (the harvest from the I-V curves already counts the real loss)."
                ),
                "info",
                "array.derates.wiring",
            )
        )
    return tuple(notices)
