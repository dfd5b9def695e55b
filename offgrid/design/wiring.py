"""DC conductor sizing: resistance, voltage drop and ampacity from published tables.

Two families of sizes, chosen by the user's setting:

* ``awg``: AWG and kcmil.  DC resistance of uncoated stranded conductors at
  75 C from NFPA 70 (NEC) Chapter 9 Table 8 (2020/2023, as transcribed);
  allowable ampacity from NEC Table 310.16 (30 C ambient, not more than three
  current-carrying conductors) with the ambient correction of Table
  310.15(B)(1)(1) (NEC 2023) and the 75 C terminal limit of 110.14(C).
* ``mm2``: IEC 60228 maximum DC resistance at 20 C (class 5 flexible plain
  copper, as PV and battery cables use; class 2 aluminium); current-carrying
  capacity from IEC 60364-5-52 Table B.52.4 (PVC, 70 C) and B.52.5 (XLPE, 90 C),
  reference method C, two loaded conductors (from memory, see the tables),
  with the ambient correction of Table B.52.14 computed from its formula.

Resistance is corrected to the conductor temperature with
R2 = R1 [1 + a (T2 - T1)].  Two-wire DC voltage drop is Vd = 2 L I R with the
one-way length L (common practice).
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass

from offgrid.catalogue.inputs import RUN_LENGTH_M
from offgrid.design.result import DesignError
from offgrid.memo import memoised

FT_PER_KM = 1000.0 / 0.3048
KCMIL_MM2 = 0.506707479  # 1 kcmil = 1000 circular mils = 0.5067 mm2
RUN_MIN_M, RUN_MAX_M = RUN_LENGTH_M  # the catalogue's one range of run lengths

# Temperature coefficients of resistance, per C.
ALPHA_75 = {"copper": 0.00323, "aluminium": 0.00330}  # at 75 C: 1/(234.5+75), 1/(228.1+75)
ALPHA_20 = {"copper": 0.00393, "aluminium": 0.00403}  # at 20 C: IEC 60028, IEC 60287-1-1


@dataclass(frozen=True)
class ConductorSize:
    """One listed conductor size with its tabulated values (None: not listed)."""

    name: str  # as the trade writes it: "10 AWG", "2/0 AWG", "250 kcmil", "16 mm2"
    system: str  # "awg" or "mm2"
    area_mm2: float
    r_copper_ohm_km: float | None  # at the table's reference temperature
    r_aluminium_ohm_km: float | None
    ampacity_copper: dict[int, float]  # insulation rating C -> A at 30 C ambient
    ampacity_aluminium: dict[int, float]


def awg_diameter_mm(gauge: int) -> float:
    """Diameter of a solid round wire of AWG ``gauge`` [mm], ASTM B258.

    d = 0.127 mm x 92^((36 - n)/39); n = 0 for 1/0, -1 for 2/0, -2 for 3/0, -3 for 4/0.
    """
    return 0.127 * 92.0 ** ((36 - gauge) / 39.0)


def awg_area_mm2(gauge: int) -> float:
    """Cross-section of AWG ``gauge`` [mm2] from the ASTM B258 diameter."""
    return math.pi / 4.0 * awg_diameter_mm(gauge) ** 2


def _awg_label(gauge: int) -> str:
    return f"{gauge} AWG" if gauge > 0 else f"{1 - gauge}/0 AWG"


# NEC Chapter 9 Table 8, ohm/1000 ft at 75 C, stranded uncoated copper / aluminium.
# 14 AWG to 250 kcmil as transcribed in REFERENCES.md (V x2); 300-500 kcmil from memory.
# NEC Table 310.16 ampacity at 30 C, A: Cu 60/75/90, Al 60/75/90.  Cu and Al 75/90 to 4/0 as
# transcribed (V x2); the 60 C aluminium column and 250-500 kcmil from memory.
_AWG_ROWS = (
    # gauge or kcmil, R Cu, R Al, Cu60, Cu75, Cu90, Al60, Al75, Al90
    (14, 3.14, None, 15, 20, 25, None, None, None),
    (12, 1.98, 3.25, 20, 25, 30, 15, 20, 25),
    (10, 1.24, 2.04, 30, 35, 40, 25, 30, 35),
    (8, 0.778, 1.28, 40, 50, 55, 35, 40, 45),
    (6, 0.491, 0.808, 55, 65, 75, 40, 50, 55),
    (4, 0.308, 0.508, 70, 85, 95, 55, 65, 75),
    (3, 0.245, 0.403, 85, 100, 115, 65, 75, 85),
    (2, 0.194, 0.319, 95, 115, 130, 75, 90, 100),
    (1, 0.154, 0.253, 110, 130, 145, 85, 100, 115),
    (0, 0.122, 0.201, 125, 150, 170, 100, 120, 135),
    (-1, 0.0967, 0.159, 145, 175, 195, 115, 135, 150),
    (-2, 0.0766, 0.126, 165, 200, 225, 130, 155, 175),
    (-3, 0.0608, 0.100, 195, 230, 260, 150, 180, 205),
    ("250", 0.0515, 0.0847, 215, 255, 290, 170, 205, 230),
    ("300", 0.0429, 0.0707, 240, 285, 320, 190, 230, 260),
    ("350", 0.0367, 0.0605, 260, 310, 350, 210, 250, 280),
    ("400", 0.0321, 0.0529, 280, 335, 380, 225, 270, 305),
    ("500", 0.0258, 0.0424, 320, 380, 430, 260, 310, 350),
)

# IEC 60228 maximum DC resistance at 20 C, ohm/km: class 5 plain copper, class 2 aluminium.
# 1.5-120 mm2 as transcribed in REFERENCES.md (V x2); 150-300 mm2 from memory.
# IEC 60364-5-52 current-carrying capacity, method C, two loaded conductors, 30 C air, A:
# Table B.52.4 (PVC 70 C) and B.52.5 (XLPE 90 C), copper and aluminium: all from memory.
_MM2_ROWS = (
    # mm2, R Cu class 5, R Al class 2, Cu70, Cu90, Al70, Al90
    (1.5, 13.3, None, 19.5, 24, None, None),
    (2.5, 7.98, None, 27, 33, None, None),
    (4, 4.95, None, 36, 45, None, None),
    (6, 3.30, None, 46, 58, None, None),
    (10, 1.91, 3.08, 63, 80, 49, 62),
    (16, 1.21, 1.91, 85, 107, 66, 84),
    (25, 0.780, 1.20, 112, 138, 83, 101),
    (35, 0.554, 0.868, 138, 171, 103, 126),
    (50, 0.386, 0.641, 168, 209, 125, 154),
    (70, 0.272, 0.443, 213, 269, 160, 198),
    (95, 0.206, 0.320, 258, 328, 195, 241),
    (120, 0.161, 0.253, 299, 382, 226, 280),
    (150, 0.129, 0.206, 344, 441, 261, 324),
    (185, 0.106, 0.164, 392, 506, 298, 371),
    (240, 0.0801, 0.125, 461, 599, 352, 439),
    (300, 0.0641, 0.100, 530, 693, 406, 508),
)


def _build_awg() -> tuple[ConductorSize, ...]:
    out = []
    for g, rcu, ral, c60, c75, c90, a60, a75, a90 in _AWG_ROWS:
        if isinstance(g, str):
            name, area = f"{g} kcmil", int(g) * KCMIL_MM2
        else:
            name, area = _awg_label(g), awg_area_mm2(g)
        al = {} if a75 is None else {60: a60, 75: a75, 90: a90}
        out.append(
            ConductorSize(
                name,
                "awg",
                area,
                rcu * FT_PER_KM / 1000.0,
                None if ral is None else ral * FT_PER_KM / 1000.0,
                {60: c60, 75: c75, 90: c90},
                al,
            )
        )
    return tuple(out)


def _build_mm2() -> tuple[ConductorSize, ...]:
    out = []
    for mm2, rcu, ral, c70, c90, a70, a90 in _MM2_ROWS:
        al = {} if a70 is None else {70: a70, 90: a90}
        out.append(
            ConductorSize(f"{mm2:g} mm2", "mm2", float(mm2), rcu, ral, {70: c70, 90: c90}, al)
        )
    return tuple(out)


AWG_SIZES = _build_awg()
MM2_SIZES = _build_mm2()

# NEC 2023 Table 310.15(B)(1)(1): ambient correction, 30 C base; rows by the warm end of each
# ambient range (<=10, 11-15, ...).  75 and 90 C columns as transcribed (V); 60 C from memory.
_NEC_AMBIENT_ROWS = (
    (10, 1.29, 1.20, 1.15),
    (15, 1.22, 1.15, 1.12),
    (20, 1.15, 1.11, 1.08),
    (25, 1.08, 1.05, 1.04),
    (30, 1.00, 1.00, 1.00),
    (35, 0.91, 0.94, 0.96),
    (40, 0.82, 0.88, 0.91),
    (45, 0.71, 0.82, 0.87),
    (50, 0.58, 0.75, 0.82),
    (55, 0.41, 0.67, 0.76),
    (60, None, 0.58, 0.71),
    (65, None, 0.47, 0.65),
    (70, None, 0.33, 0.58),
    (75, None, None, 0.50),
    (80, None, None, 0.41),
)
# NEC 240.4(D): largest overcurrent device on small conductors, A (Cu 12 and 10 AWG as
# transcribed, V; Cu 14 AWG and the aluminium rows from memory).
SMALL_CONDUCTOR_MAX_A = {
    ("copper", "14 AWG"): 15,
    ("copper", "12 AWG"): 20,
    ("copper", "10 AWG"): 30,
    ("aluminium", "12 AWG"): 15,
    ("aluminium", "10 AWG"): 25,
}


def _by_size_name(func):
    """Memoise a pure function of (size, other hashable arguments), keyed by the size's
    system and name (the tables are constants; sizes hold dicts, so are not hashable)."""
    cache: dict = {}

    @functools.wraps(func)
    def wrapper(size: ConductorSize, *args):
        key = (size.system, size.name, *args)
        try:
            return cache[key]
        except KeyError:
            out = cache[key] = func(size, *args)
            return out
        except TypeError:  # an unhashable argument: compute
            return func(size, *args)

    return wrapper


def sizes_for(units: str) -> tuple[ConductorSize, ...]:
    if units == "awg":
        return AWG_SIZES
    if units == "mm2":
        return MM2_SIZES
    raise DesignError(
        "wire-units", f"Wire units must be 'awg' or 'mm2' (got {units!r}).", field="wiring.units"
    )


def _check_material(material: str) -> None:
    if material not in ALPHA_75:
        raise DesignError(
            "wire-material",
            f"Conductor material must be 'copper' or 'aluminium' (got {material!r}).",
            field="wiring.material",
        )


@_by_size_name
def resistance_ohm_per_km(size: ConductorSize, material: str, conductor_temp_c: float) -> float:
    """DC resistance of one conductor at ``conductor_temp_c`` [ohm/km].

    AWG: NEC Chapter 9 Table 8 at 75 C, R = R75 [1 + a75 (T - 75)].  mm2: IEC
    60228 at 20 C, R = R20 [1 + a20 (T - 20)].
    """
    _check_material(material)
    r = size.r_copper_ohm_km if material == "copper" else size.r_aluminium_ohm_km
    if r is None:
        raise DesignError(
            "wire-not-listed", f"{size.name} is not listed in {material}.", field="wiring.material"
        )
    if size.system == "awg":
        return r * (1.0 + ALPHA_75[material] * (conductor_temp_c - 75.0))
    return r * (1.0 + ALPHA_20[material] * (conductor_temp_c - 20.0))


def voltage_drop_v(current_a, one_way_length_m, resistance_ohm_km):
    """Two-wire DC voltage drop Vd = 2 L I R [V] (common practice)."""
    return 2.0 * one_way_length_m * current_a * resistance_ohm_km / 1000.0


def nec_ambient_factor(ambient_c: float, insulation_c: int) -> float | None:
    """NEC 2023 Table 310.15(B)(1)(1) factor; None above the insulation's last row."""
    col = {60: 1, 75: 2, 90: 3}.get(insulation_c)
    if col is None:
        raise DesignError(
            "wire-insulation",
            f"Insulation rating must be 60, 75 or 90 C for NEC sizes (got {insulation_c}).",
            field="wiring.insulation_temp_c",
        )
    for row in _NEC_AMBIENT_ROWS:
        if ambient_c <= row[0]:
            return row[col]
    return None


def ambient_factor_formula(ambient_c: float, conductor_rating_c: float) -> float | None:
    """sqrt((Tc - Ta) / (Tc - 30)): the equation of NEC 310.15(B) and IEC 60364-5-52 B.52.14."""
    if ambient_c >= conductor_rating_c:
        return None
    return math.sqrt((conductor_rating_c - ambient_c) / (conductor_rating_c - 30.0))


@_by_size_name
def ampacity_a(
    size: ConductorSize, material: str, ambient_c: float, insulation_c: int
) -> float | None:
    """Usable ampacity [A] at the ambient temperature; None when the size cannot be used.

    NEC: Table 310.16 at the insulation rating times the ambient factor, not more
    than the 75 C column (110.14(C), terminals rated 75 C).  IEC: B.52.4 (PVC,
    for insulation up to 75 C) or B.52.5 (XLPE, 90 C) times the B.52.14 factor.
    """
    _check_material(material)
    table = size.ampacity_copper if material == "copper" else size.ampacity_aluminium
    if not table:
        return None
    if size.system == "awg":
        factor = nec_ambient_factor(ambient_c, insulation_c)
        if factor is None:
            return None
        terminal = table[min(75, insulation_c)]
        return min(table[insulation_c] * factor, terminal)
    rating = 90 if insulation_c >= 90 else 70
    factor = ambient_factor_formula(ambient_c, rating)
    if factor is None:
        return None
    return table[rating] * round(factor, 2)


@dataclass(frozen=True)
class RunSpec:
    """One DC run to size."""

    key: str  # "string", "array", "charge", "inverter", "loadN" (N: line of the load list)
    name: str  # for people: "modules to combiner"
    max_current_a: float  # the circuit's maximum current (NEC 690.8(A) or the load)
    operating_current_a: float  # current for the voltage drop
    voltage_v: float  # circuit voltage the drop is a percentage of
    length_m: float  # one way
    drop_limit_pct: float
    fuse_a: float | None  # overcurrent device rating on this run, None: none
    count: int = 1  # identical runs (one per string or per controller)
    length_field: str = ""  # project field the length was read from, for messages
    # Project field that sets this run's length (a DC load's own ``loads[N].run_m``, even
    # while it is absent and the default applies); empty: ``length_field``.
    length_path: str = ""


@dataclass(frozen=True)
class WireChoice:
    key: str
    run: str
    count: int
    current_a: float  # maximum circuit current
    operating_current_a: float
    length_m: float
    material: str
    size: str
    area_mm2: float
    resistance_ohm_km: float
    drop_v: float
    drop_pct: float
    drop_limit_pct: float
    ampacity_a: float
    required_ampacity_a: float
    fuse_a: float | None
    voltage_v: float = 0.0  # circuit voltage the drop is a percentage of
    # Dotted project path that sets this run's length (``wiring.array_run_m``,
    # ``loads[3].run_m``): what a view edits to change it.
    length_path: str = ""


def check_length(length_m: float, run_name: str, field: str) -> None:
    if not math.isfinite(length_m) or length_m < RUN_MIN_M:
        raise DesignError(
            "run-length",
            f"The {run_name} run is {length_m:g} m long: type its one-way length "
            f"in metres (at least {RUN_MIN_M:g} m).",
            field=field,
        )
    if length_m > RUN_MAX_M:
        raise DesignError(
            "run-length",
            f"The {run_name} run is {length_m:g} m long, more than "
            f"{RUN_MAX_M:g} m: check the unit is metres, or move the equipment closer; a low-"
            "voltage DC run this long is not practical.",
            field=field,
        )


@memoised  # planning: thousands of designs size the same string, array and charge runs
def _candidates(
    run: RunSpec,
    units: str,
    material: str,
    conductor_temp_c: float,
    ambient_c: float,
    insulation_c: int,
) -> tuple[WireChoice, ...]:
    """Every listed size that meets the run's ampacity and small-conductor rules, smallest first."""
    check_length(run.length_m, run.name, run.length_field)
    if not (run.max_current_a > 0 and math.isfinite(run.max_current_a)):
        raise DesignError("run-current", f"The {run.name} run has no current to size for.")
    required = max(1.25 * run.max_current_a, run.fuse_a or 0.0)
    out = []
    for size in sizes_for(units):
        amp = ampacity_a(size, material, ambient_c, insulation_c)
        if amp is None or amp < required:
            continue
        limit = SMALL_CONDUCTOR_MAX_A.get((material, size.name))
        if limit is not None and run.fuse_a is not None and run.fuse_a > limit:
            continue
        r = resistance_ohm_per_km(size, material, conductor_temp_c)
        drop = voltage_drop_v(run.operating_current_a, run.length_m, r)
        out.append(
            WireChoice(
                run.key,
                run.name,
                run.count,
                run.max_current_a,
                run.operating_current_a,
                run.length_m,
                material,
                size.name,
                size.area_mm2,
                r,
                drop,
                100.0 * drop / run.voltage_v,
                run.drop_limit_pct,
                amp,
                required,
                run.fuse_a,
                voltage_v=run.voltage_v,
                length_path=run.length_path or run.length_field,
            )
        )
    if not out:
        largest = sizes_for(units)[-1].name
        raise DesignError(
            "wire-ampacity",
            f"The {run.name} run needs {required:.0f} A of ampacity and no listed {material} "
            f"conductor up to {largest} carries it at {ambient_c:.0f} C ambient: raise the "
            "system voltage or split the circuit into parallel runs"
            + (", or use copper." if material == "aluminium" else "."),
            field=run.length_field,
        )
    return tuple(out)


def drop_limit_field(key: str) -> str:
    """The project field holding the voltage-drop limit of a run with this key."""
    if key in ("string", "array"):
        return "choices.drop_limit_array_pct"
    if key in ("charge", "inverter"):
        return "choices.drop_limit_battery_pct"
    return "choices.drop_limit_load_pct"


def _drop_error(runs: list[RunSpec], limit_pct: float, units: str) -> DesignError:
    largest = sizes_for(units)[-1].name
    what = " and ".join(
        f"{r.name} ({r.length_m:.1f} m at {r.operating_current_a:.1f} A)" for r in runs
    )
    return DesignError(
        "wire-drop",
        f"The {what} cannot keep within {limit_pct:g} % voltage drop at "
        f"{runs[0].voltage_v:.0f} V even in {largest}: shorten the run "
        f"({runs[-1].length_field}), raise the system voltage, or relax the limit "
        f"({drop_limit_field(runs[-1].key)}).",
        field=runs[-1].length_field,
    )


def size_conductor(
    run: RunSpec,
    units: str,
    material: str,
    conductor_temp_c: float,
    ambient_c: float,
    insulation_c: int,
) -> WireChoice:
    """Smallest listed size whose ampacity and voltage drop both meet the run's needs.

    The usable ampacity must be at least 1.25 x the maximum current (NEC 690.8(B),
    215.2(A)(1): continuous current) and at least the overcurrent device's rating
    (stricter than the next-size-up allowance of 240.4(B)); on 14-10 AWG the
    device may not exceed 240.4(D).  The drop at the operating current must be
    within the run's limit.
    """
    for choice in _candidates(run, units, material, conductor_temp_c, ambient_c, insulation_c):
        if choice.drop_pct <= run.drop_limit_pct:
            return choice
    raise _drop_error([run], run.drop_limit_pct, units)


def size_runs_in_series(
    runs: list[RunSpec],
    limit_pct: float,
    units: str,
    material: str,
    conductor_temp_c: float,
    ambient_c: float,
    insulation_c: int,
) -> list[WireChoice]:
    """Size runs that one current path passes in turn so that their drops add up to the limit.

    Each run starts at its smallest size meeting ampacity; while the summed drop
    exceeds ``limit_pct`` the run with the largest drop moves up one size
    (greedy, common practice, no source).  All runs must share one circuit voltage.
    """
    cands = [
        _candidates(r, units, material, conductor_temp_c, ambient_c, insulation_c) for r in runs
    ]
    idx = [0] * len(runs)
    while sum(c[i].drop_pct for c, i in zip(cands, idx, strict=True)) > limit_pct:
        order = sorted(range(len(runs)), key=lambda k: -cands[k][idx[k]].drop_pct)
        for k in order:
            if idx[k] + 1 < len(cands[k]):
                idx[k] += 1
                break
        else:
            raise _drop_error(runs, limit_pct, units)
    return [c[i] for c, i in zip(cands, idx, strict=True)]
