"""The protection schedule: string fuses, disconnects, the battery fuse and the bank's fault
current every battery-side device must interrupt (NEC 690.9, 706.15, 706.31, 240.6(A))."""

from __future__ import annotations

from dataclasses import dataclass

from offgrid.design import protection as prot
from offgrid.design import wiring as wr
from offgrid.design.electrical.cable_runs import NEC, CableStep
from offgrid.design.electrical.records import ProtectionResult, StringDesign
from offgrid.design.result import (
    BatteryResult,
    InverterResult,
    Reason,
    ReasonBook,
    fmt,
    reason_kind,
)
from offgrid.memo import memoised
from offgrid.project.model import Load


@dataclass(frozen=True)
class ProtectionStep:
    protection: ProtectionResult
    reasons: dict[str, Reason]


def _device_kind(rating: float | None, kind: str) -> str:
    return "fuse" if rating in prot.FUSE_ONLY_RATINGS_A else kind


def load_circuit_devices(
    wires: tuple[wr.WireChoice, ...], loads: list[Load], vsys: float, bank_v: float
) -> list[prot.Device]:
    """One fuse or breaker per DC load circuit, at the DC distribution board (a motor's
    starting current noted)."""
    devices: list[prot.Device] = []
    for w in wires:
        if w.key.startswith("load"):
            load = loads[int(w.key[4:]) - 1]
            note = ""
            if load.surge_w > load.power_w > 0:
                note = (
                    f"starts at about {load.quantity * load.surge_w / vsys:.0f} A: a "
                    "time-delay fuse or a breaker with a motor-start curve"
                )
            devices.append(
                prot.Device(
                    f"{w.run} circuit, at the DC distribution board",
                    _device_kind(w.fuse_a, "fuse or breaker"),
                    w.fuse_a,
                    bank_v,
                    1,
                    note=note,
                    source=f"{NEC} 240.4, 240.6(A)",
                )
            )
    return devices


def protection_schedule(
    cables: CableStep,
    strings: StringDesign,
    battery: BatteryResult,
    inverter: InverterResult,
    loads: list[Load],
    *,
    unit_capacity_ah: float,
    battery_short_circuit_a: float | None,
    isc_a: float,
    controllers: int,
    vsys: float,
    v_abs: float,
) -> ProtectionStep:
    """Every protective device with its rating, voltage and interrupting rating."""
    rb = ReasonBook()
    wires, inv, isc = cables.wires, inverter, isc_a
    layout = strings.layout
    n_c = layout.strings_per_controller
    plan = cables.plan
    fuses_needed, string_fuse = plan.fuses_needed, plan.string_fuse_a
    array_fuse, charge_fuse = plan.array_fuse_a, plan.charge_fuse_a
    battery_fuse, i_charge_max = plan.battery_fuse_a, plan.charge_max_current_a
    # Protection.
    bat = battery
    unit_sc, estimated = prot.unit_short_circuit_a(
        bat.chemistry, unit_capacity_ah, battery_short_circuit_a
    )
    fault = prot.bank_fault_current_a(unit_sc, int(bat.units_parallel))
    bank_v = v_abs * 1.1
    devices: list[prot.Device] = []
    if fuses_needed:
        devices.append(
            prot.Device(
                "each PV string, in the combiner (both poles if ungrounded)",
                "fuse",
                string_fuse,
                strings.string_voc_cold_v,
                layout.parallel,
                note="gPV fuses, IEC 60269-6",
                source=f"{NEC} 690.9(A),(B)",
            )
        )
    devices.append(
        prot.Device(
            "PV disconnect and breaker at each controller's input",
            "fuse or breaker",
            array_fuse,
            strings.string_voc_cold_v,
            controllers,
            source=f"{NEC} 690.9(B), 690.13, 690.15",
        )
    )
    devices.append(
        prot.Device(
            "each controller's battery output, at the battery end",
            "fuse or breaker",
            charge_fuse,
            bank_v,
            controllers,
            interrupt_rating_a=fault,
            source=f"{NEC} 240.21, 690.9",
        )
    )
    if battery_fuse is not None:
        devices.append(
            prot.Device(
                "battery fuse at the battery terminal, inverter circuit",
                "fuse",
                battery_fuse,
                bank_v,
                1,
                interrupt_rating_a=fault,
                source=f"{NEC} 706.31, 240.6(A)",
            )
        )
    n_bat = int(bat.units_parallel)
    bat_string_fuse = None
    # the largest current through the battery terminals: all discharge circuits, or all charge
    total = (1.25 * float(inv.dc_input_current_a) if inv.needed else 0.0) + sum(
        1.25 * w.current_a for w in wires if w.key.startswith("load")
    )
    total = max(total, 1.25 * i_charge_max * controllers)
    if n_bat >= 2:
        bat_string_fuse = prot.standard_rating_a(
            total / n_bat, what="battery string fuse", field="battery.capacity_ah"
        )
        devices.append(
            prot.Device(
                "each parallel battery string, at its positive terminal",
                "fuse",
                bat_string_fuse,
                bank_v,
                n_bat,
                interrupt_rating_a=fault,
                note="a fault in one string is fed by all the others",
                source="common practice, no source",
            )
        )
    disconnect_a = prot.standard_rating_a(
        total, fuse=False, what="battery disconnect", field="loads"
    )
    devices.append(
        prot.Device(
            "battery disconnect, readily accessible, at the battery",
            "disconnect",
            disconnect_a,
            bank_v,
            1,
            note="rated for the largest current through the terminals",
            source=f"{NEC} 706.15",
        )
    )
    devices.extend(load_circuit_devices(wires, loads, vsys, bank_v))
    protection = ProtectionResult(
        tuple(devices),
        fuses_needed,
        string_fuse,
        battery_fuse,
        unit_sc,
        estimated,
        fault,
        n_bat if n_bat >= 2 else 0,
        bat_string_fuse,
    )

    rb.extend(
        _protection_reasons(
            ProtectionFigures(
                estimated=estimated,
                unit_sc=unit_sc,
                n_bat=n_bat,
                battery_fuse=battery_fuse,
                inv=inv,
                fault=fault,
                unit_capacity_ah=unit_capacity_ah,
                bat_string_fuse=bat_string_fuse,
                string_fuse=string_fuse,
                isc=isc,
                bank_v=bank_v,
                strings=strings,
                n_c=n_c,
            )
        )
    )
    return ProtectionStep(protection, rb.freeze())


@dataclass(frozen=True)
class ProtectionFigures:
    """The figures of the protection schedule that its reasons quote."""

    estimated: bool
    unit_sc: float
    n_bat: int
    battery_fuse: float | None
    inv: InverterResult
    fault: float
    unit_capacity_ah: float
    bat_string_fuse: float | None
    string_fuse: float | None
    isc: float
    bank_v: float
    strings: StringDesign
    n_c: int


def _protection_reasons(k: ProtectionFigures) -> dict[str, Reason]:
    """Reasons of the fault current, the battery and string fuses and the device ratings
    (memoised while planning on the figures they quote and the reason record in force)."""
    return _quoted_reasons(k, reason_kind())


@memoised  # planning: a village's designs share a few banks, inverters and strings
def _quoted_reasons(k: ProtectionFigures, kind: type) -> dict[str, Reason]:
    """:func:`_protection_reasons` (``kind``: part of the memo's key only)."""
    estimated = k.estimated
    unit_sc = k.unit_sc
    n_bat = k.n_bat
    battery_fuse = k.battery_fuse
    inv = k.inv
    fault = k.fault
    unit_capacity_ah = k.unit_capacity_ah
    bat_string_fuse = k.bat_string_fuse
    string_fuse = k.string_fuse
    isc = k.isc
    bank_v = k.bank_v
    strings = k.strings
    n_c = k.n_c
    rb = ReasonBook()
    rb.add(
        "protection.bank_fault_current_a",
        "sum over parallel strings of one unit's short-circuit current",
        "datasheet" if not estimated else "estimate per Ah of capacity, from memory, no source",
        unit=fmt(unit_sc, "A"),
        strings=str(n_bat),
    )
    if battery_fuse is not None:
        rb.add(
            "protection.battery_fuse_a",
            "smallest standard rating >= 1.25 x inverter DC "
            "current; its DC interrupting rating must exceed the bank fault current",
            f"{NEC} 240.6(A), 706.31",
            inverter_current=fmt(float(inv.dc_input_current_a), "A"),
            fault=fmt(fault, "A"),
        )
    rb.add(
        "protection.unit_short_circuit_a",
        "one battery unit's prospective short-circuit "
        "current: the datasheet value, or an estimate per Ah of capacity",
        "datasheet"
        if not estimated
        else "estimate per Ah of capacity, from memory, no source: take it from the datasheet",
        capacity=fmt(unit_capacity_ah, "Ah"),
    )
    rb.add(
        "protection.battery_string_fuses",
        "one fuse per parallel battery string from two "
        "strings up (a fault in one string is fed by all the others)",
        "common practice, no source",
        strings=str(n_bat),
    )
    if bat_string_fuse is not None:
        rb.add(
            "protection.battery_string_fuse_a",
            "smallest standard rating >= (1.25 x the "
            "largest current the bank delivers or takes) / parallel strings",
            f"{NEC} 240.6(A); sharing common practice, no source",
            strings=str(n_bat),
        )
    if string_fuse is not None:
        rb.add(
            "protection.string_fuse_a",
            "smallest standard rating >= 1.56 x Isc, not above the module's maximum series fuse",
            f"{NEC} 690.9(B), 240.6(A)",
            isc=fmt(isc, "A"),
        )
    for key, formula in (
        ("rating_a", "each device's rating as its cable's fuse (the source beside each)"),
        (
            "voltage_v",
            "minimum DC voltage rating: the string cold Voc on the PV side, 1.1 x "
            "the absorption voltage on the battery side",
        ),
        ("count", "one device per string, per controller or per battery string as listed"),
        (
            "interrupt_rating_a",
            "minimum DC interrupting rating: the bank's prospective fault current",
        ),
    ):
        rb.add(
            f"protection.devices.{key}",
            formula,
            f"{NEC} 240.6(A), 690.9, 706.15",
            bank_voltage=fmt(bank_v, "V"),
            string_voc_cold=fmt(strings.string_voc_cold_v, "V"),
            fault=fmt(fault, "A"),
        )
    rb.add(
        "protection.string_fuses",
        "string fuses from three strings in parallel per "
        "controller (or when the back-feed exceeds the module's series fuse rating)",
        f"{NEC} 690.9(A); IEC 62548:2016 7.3.3",
        strings_per_controller=str(n_c),
    )
    return rb.freeze()
