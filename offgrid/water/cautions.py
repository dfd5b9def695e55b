"""Safety and water-quality cautions of a pumping design (common practice, no source; the
design defers to local electrical and water codes and licensed practice)."""

from __future__ import annotations

DEFER = (
    "This pumping design defers to the local electrical code, the water authority's rules "
    "for boreholes and drinking water, and licensed practice; confirm each item with them."
)


def water_cautions(
    supply, drop_cable_current_a: float, array_voc_cold_v: float, cable: str = ""
) -> tuple[str, ...]:
    """The cautions that apply to one water supply."""
    out = [
        "Dry-run protection: fit a low-water probe (or the controller's dry-run sensing) "
        "above the pump intake; a pump that runs dry overheats and wears out in minutes, "
        "and a helical rotor is destroyed quickly.",
        "Tank full: a float switch (or a pressure switch) at the tank stops the pump; run "
        "its signal cable separately from the power cable.",
        "Well-head sanitation: seal the borehole head against surface water and animals, "
        "keep a clear, fenced, drained apron around it, and fit a non-return (backflow) "
        "valve on the riser; disinfect the borehole and the tank before first use and test "
        "the water before people drink it.",
        "Lightning: the long drop cable down the borehole and the array are exposed; bond "
        "the array frame, the well casing (if metal) and the controller to one earth, and "
        "fit surge protection on the array input and on the pump cable.",
        f"Drop cable ({supply.drop_cable_m:g} m): size it for the pump's full current "
        f"(about {drop_cable_current_a:.1f} A here; at least {cable} for the array's DC "
        "voltage; an AC pump's cable follows its inverter's output) with a voltage drop "
        "the motor allows, "
        "in a cable made for submersion in drinking water, joined with a proper "
        "water-tight splice kit.",
        f"DC arcs: the array reaches about {array_voc_cold_v:.0f} V open circuit on a cold "
        "morning; fit a DC disconnect rated for it and never open a DC circuit under load "
        "by pulling a connector.",
        "Tank: an overflow pipe to a soak-away or a drain, a screened vent, a lockable lid, "
        "and a scour outlet for cleaning; children must not be able to climb in.",
    ]
    if supply.pump.kind == "helical_rotor":
        out.append(
            "Positive-displacement pump: never close a valve on its delivery while it runs: "
            "the pressure rises until something breaks; fit a pressure relief or a "
            "pressure switch."
        )
    out.append(DEFER)
    return tuple(out)
