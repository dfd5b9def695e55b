"""Safety cautions that follow from the design itself.

Each caution fires from figures of the design (voltages, chemistry,
temperatures, fault currents), says what to do, and names its source.  The
last caution of every design says it defers to local electrical code and
licensed practice.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.memo import memoised

#: Extra-low voltage limit for ripple-free DC [V]: IEC 61140:2016 / IEC 60449 band I.
ELV_DC_LIMIT_V = 120.0

# IEC 62485-2:2010 eq. 1: Q = v q s n Igas Crt 1e-3 [m3/h], v q s = 0.05 m3/Ah; Igas under
# boost (absorption) charging from its Table 1, mA per Ah: vented 20, valve-regulated 8 (both
# from memory).  Free opening area A = 28 Q [cm2] for inlet and outlet (eq. 3, from memory).
IEC62485_VQS_M3_PER_AH = 0.05
IEC62485_IGAS_BOOST_MA_PER_AH = {"flooded": 20.0, "agm": 8.0, "gel": 8.0}
IEC62485_AREA_CM2_PER_M3_H = 28.0

# US Army TM 5-1185 Table II (specific gravity at 80 F vs state of charge) and Table III
# (freezing point vs specific gravity), as transcribed (V).
TM5_1185_SOC = (0.0, 0.25, 0.50, 0.75, 1.0)
TM5_1185_SG_BY_SOC = (1.130, 1.190, 1.220, 1.250, 1.280)
TM5_1185_SG = (1.100, 1.150, 1.200, 1.250, 1.280)
TM5_1185_FREEZE_C = (-7.0, -15.0, -27.0, -52.0, -68.0)

DEFERS_TO_CODE = (
    "This design defers to local electrical codes and licensed practice: it is a calculation "
    "aid, to be checked, installed and inspected by a qualified electrician; the authority "
    "having jurisdiction has the last word."
)


@dataclass(frozen=True)
class Caution:
    code: str
    text: str
    source: str = "common practice, no source"

    def line(self) -> str:
        return f"{self.text} [{self.source}]" if self.source else self.text


def ventilation_airflow_m3_h(chemistry: str, cells: int, capacity_ah: float) -> float:
    """Required battery-room airflow [m3/h], IEC 62485-2 eq. 1 at boost charging.

    Q = 0.05 x n x Igas x Crt x 1e-3 with ``cells`` in series times the parallel
    capacity folded into ``capacity_ah`` (the bank's total Ah at its voltage).
    """
    igas = IEC62485_IGAS_BOOST_MA_PER_AH[chemistry]
    return IEC62485_VQS_M3_PER_AH * cells * igas * capacity_ah * 1e-3


def ventilation_opening_cm2(airflow_m3_h: float) -> float:
    """Free area of each of the inlet and the outlet [cm2], IEC 62485-2: A = 28 Q."""
    return IEC62485_AREA_CM2_PER_M3_H * airflow_m3_h


def electrolyte_freezing_c(state_of_charge: float) -> float:
    """Freezing point of lead-acid electrolyte at a state of charge [C], TM 5-1185 II and III."""
    sg = float(np.interp(state_of_charge, TM5_1185_SOC, TM5_1185_SG_BY_SOC))
    return float(np.interp(sg, TM5_1185_SG, TM5_1185_FREEZE_C))


@dataclass(frozen=True)
class CautionInputs:
    max_dc_voltage_v: float  # string Voc at the record low
    system_voltage_v: float
    chemistry: str
    cells_in_series: int  # battery cells per string
    bank_capacity_ah: float  # all parallel strings
    max_dod: float
    battery_min_temp_c: float  # coldest the battery gets
    bank_fault_current_a: float
    fault_current_estimated: bool
    ambient_for_wires_c: float
    array_run_m: float
    strings: int
    battery_min_source: str = "the site's record low"  # where battery_min_temp_c comes from


@memoised  # planning: a village's designs share a few banks and strings
def design_cautions(c: CautionInputs) -> tuple[Caution, ...]:
    out: list[Caution] = []
    if c.max_dc_voltage_v > ELV_DC_LIMIT_V:
        out.append(
            Caution(
                "dc-above-elv",
                f"The PV strings reach {c.max_dc_voltage_v:.0f} V DC at the record low, above the "
                f"{ELV_DC_LIMIT_V:.0f} V extra-low-voltage limit: a shock can kill. Only qualified "
                "people may work on them; use touch-safe connectors, enclosures and warning "
                "labels.",
                "IEC 61140:2016 (ELV limit 120 V ripple-free DC)",
            )
        )
    if c.chemistry in IEC62485_IGAS_BOOST_MA_PER_AH:
        q = ventilation_airflow_m3_h(c.chemistry, c.cells_in_series, c.bank_capacity_ah)
        a = ventilation_opening_cm2(q)
        out.append(
            Caution(
                "lead-acid-ventilation",
                "Lead-acid batteries give off hydrogen while charging: ventilate the battery "
                "space "
                f"with at least {q:.2f} m3/h ({c.cells_in_series} cells, {c.bank_capacity_ah:.0f} "
                f"Ah), i.e. a free opening of at least {a:.0f} cm2 low down for inlet and the same "
                "high up for outlet. No sparks, flames or switches above the batteries.",
                "IEC 62485-2:2010 eq. 1 (Q = 0.05 n Igas Crt 1e-3) and A = 28 Q, from memory",
            )
        )
        soc = 1.0 - c.max_dod
        freeze = electrolyte_freezing_c(soc)
        flat = electrolyte_freezing_c(0.0)
        if c.battery_min_temp_c <= 0.0:
            out.append(
                Caution(
                    "electrolyte-freezing",
                    f"The battery may reach {c.battery_min_temp_c:.0f} C ({c.battery_min_source})."
                    " At the design's deepest "
                    f"discharge ({c.max_dod:.0%}) the electrolyte freezes near {freeze:.0f} C and "
                    f"a flat battery near {flat:.0f} C; a frozen battery cracks. Keep the bank "
                    "insulated or indoors and recharge promptly in the cold.",
                    "US Army TM 5-1185 Tables II and III",
                )
            )
    if c.chemistry == "lifepo4" and c.battery_min_temp_c <= 0.0:
        out.append(
            Caution(
                "lfp-cold-charge",
                f"Lithium iron phosphate cells must not be charged below 0 C and this battery may "
                f"reach {c.battery_min_temp_c:.0f} C ({c.battery_min_source}): use a battery "
                "management system or "
                "controller that stops charging in the cold, or keep the battery warm.",
                "common practice, no source (some makers say +5 C)",
            )
        )
    est = (
        " (estimated; take the value from the battery datasheet)"
        if (c.fault_current_estimated)
        else ""
    )
    out.append(
        Caution(
            "battery-short-circuit",
            f"The battery bank can drive about {c.bank_fault_current_a / 1000:.1f} kA into a short "
            f"circuit{est}: fit the battery fuse next to the terminal, cover the terminals, use "
            "insulated tools and take off rings and watches.",
            "common practice, no source",
        )
    )
    if c.ambient_for_wires_c >= 30.0:
        out.append(
            Caution(
                "conductor-temperature",
                f"Cables were sized for {c.ambient_for_wires_c:.0f} C ambient. Cables in sun, on "
                "roofs or bundled run hotter: use sunlight-resistant 90 C PV cable, keep it shaded "
                "and separated, and re-size if the ambient is higher.",
                "NEC 2023 310.15(B), IEC 60364-5-52",
            )
        )
    out.append(
        Caution(
            "pv-live-in-daylight",
            "PV modules are live whenever light falls on them and cannot be switched off: cover "
            "them or open the PV disconnect before work, and never open a connector under load.",
            "NEC 690.13; IEC 62548:2016",
        )
    )
    out.append(
        Caution(
            "grounding",
            "Bond the module frames, mounting structure and equipment enclosures to a grounding "
            "electrode, and provide ground-fault detection for the PV array as the controller or "
            "local code requires.",
            "NEC 690.41, 690.43, 690.47; IEC 60364-7-712",
        )
    )
    long_run = (
        (
            f" The {c.array_run_m:g} m array cable makes a large induction loop: fit surge "
            "protection at both ends and run the two conductors together."
        )
        if c.array_run_m > 10
        else ""
    )
    out.append(
        Caution(
            "surge-protection",
            "Nearby lightning induces surges in the array wiring: fit a DC surge protective device "
            "rated for the string Voc at the controller input and bond it to the earthing "
            f"system.{long_run}",
            "IEC TS 62257-5 (protection against electrical hazards)",
        )
    )
    out.append(
        Caution(
            "dc-breakers",
            "Use only fuses and breakers rated for DC at the circuit's voltage. Many DC breakers "
            "are polarised: wire them the way round their marking shows. AC-rated breakers cannot "
            "break a DC arc and must not be used on DC circuits.",
            "NEC 690.9(D), 110.3(B); IEC 60947-2",
        )
    )
    out.append(Caution("defers-to-code", DEFERS_TO_CODE, ""))
    return tuple(out)
