"""Safety cautions of a generator beside the sun (shown wherever the generator is)."""

from __future__ import annotations

from offgrid.project.model import GeneratorSpec

CAUTIONS: tuple[str, ...] = (
    "Exhaust and carbon monoxide: never run the generator indoors, in a garage, a "
    "basement, a lean-to or a battery room, nor near doors, windows or air intakes; carbon "
    "monoxide has no smell and kills. Pipe the exhaust away from the building and fit "
    "carbon monoxide alarms in the rooms beside it.",
    "Fuel storage and spill: keep fuel in approved, labelled containers or a bunded tank "
    "away from the generator, the battery room and any flame; refuel only with the engine "
    "stopped and cool; keep spill absorbent and an extinguisher for liquid fuels at hand.",
    "Changeover: connect the generator only through a changeover switch or an interlock "
    "(the inverter-charger's own transfer relay, or a break-before-make switch) so that it "
    "can never feed back into another supply or into the inverter's output.",
    "Earthing: a generator is a separately derived source: earth its frame, and bond its "
    "neutral to earth in one place only (at the generator or at the changeover, never both), "
    "as the local code requires; check the inverter-charger's own neutral switching.",
    "Noise: site the generator where its noise and exhaust do not reach sleeping rooms or "
    "neighbours; quiet hours in the project only stop the simulation's runs, not the "
    "engine's own automatic start.",
    "This design defers to local electrical codes, fuel-storage rules and licensed "
    "practice: have the generator, its changeover and its earthing installed and "
    "inspected by a qualified electrician.",
)
#: One code per entry of CAUTIONS, in its order: what a bill-of-materials line that a
#: caution asks for names (``figure = "caution:<code>"``).
CAUTION_CODES: tuple[str, ...] = (
    "generator-exhaust-co",
    "generator-fuel",
    "generator-changeover",
    "generator-earthing",
    "generator-noise",
    "generator-codes",
)
LPG = (
    "LPG is heavier than air: store cylinders outdoors, upright, away from drains, pits "
    "and cellar openings where leaking gas collects."
)
PETROL = (
    "Petrol vapour ignites easily: never refuel a hot or running engine, and store "
    "petrol away from any spark, including the battery and its charger."
)


def generator_cautions(spec: GeneratorSpec) -> tuple[str, ...]:
    """The cautions that apply to this generator."""
    extra = {"lpg": (LPG,), "petrol": (PETROL,)}.get(spec.fuel, ())
    return CAUTIONS[:2] + extra + CAUTIONS[2:]
