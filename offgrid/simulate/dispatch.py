"""The battery balance with a generator as a dispatchable source, hour by hour.

Steps are the hourly steps of :func:`offgrid.simulate.balance.build_steps` (24 a day,
solar time).  Each hour, at its start, the dispatch rule decides whether the generator
runs:

``cycle_charging``
    it starts when the state of charge is at or below ``start_soc``, or when the sun and
    the battery cannot cover this hour's load; it then runs, carrying the load and
    charging the battery through the charger at up to the charger's rating, until the
    state of charge reaches ``stop_soc``.
``load_following``
    it runs only in hours the sun and the battery (down to its depth-of-discharge floor)
    cannot cover, and then only for the load; the battery gets only what the minimum
    loading forces out of it.

Quiet hours: the generator does not run in them (no start; a running one stops).

When it runs, a step goes: PV serves the load first; the generator serves what is left
(the AC loads through the changeover directly, the DC loads through the charger:
``gen_wh_per_bus_wh`` generator Wh per Wh of load at the battery bus), up to its derated
output; PV surplus charges the battery first, then the generator through the charger
(cycle charging) within the charger rating, the battery's room and its charge-rate limit;
a load below the minimum loading is made up by a dump load (fuel burnt, energy wasted,
hour counted); what is still unserved comes from the battery, then is shed.  When it is
off the step is the solar-only step of :mod:`offgrid.simulate.balance`.

Fuel per running hour = a x rating + b x (output + dump) (the linear fuel curve).  The
loop runs on plain floats, one design at a time (the dispatch carries state from hour to
hour, and a few designs run faster this way than as small numpy arrays).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from offgrid.simulate.balance import SHED_TOLERANCE_WH, Steps

RULES = ("cycle_charging", "load_following")


@dataclass(frozen=True)
class GeneratorInputs:
    """Plain inputs of the generator in the balance (no dependence on the project)."""

    derated_w: float
    min_load_w: float
    no_load_l_h: float  # a x rating
    b_l_per_kwh: float
    charger_w: float  # charger DC output limit
    charger_efficiency: float
    rule: str
    start_soc: float
    stop_soc: float
    quiet: tuple[bool, ...] = (False,) * 24
    gen_wh_per_bus_wh: tuple[float, ...] = (1.0,) * 12  # per month


def check_generator_inputs(g: GeneratorInputs) -> GeneratorInputs:
    if g.rule not in RULES:
        raise ValueError(f"generator.dispatch: '{g.rule}' must be one of {', '.join(RULES)}")
    if not g.derated_w > 0:
        raise ValueError("generator.rated_kw: the derated output must be above zero")
    if not 0 <= g.min_load_w <= g.derated_w:
        raise ValueError("generator.min_load_fraction: must be 0-1")
    if not 0 < g.charger_efficiency <= 1:
        raise ValueError("generator.charger_efficiency: must be in (0, 1]")
    if g.rule == "cycle_charging" and not g.start_soc < g.stop_soc:
        raise ValueError("generator.start_soc: must be below generator.stop_soc; swap them")
    if len(g.quiet) != 24 or len(g.gen_wh_per_bus_wh) != 12:
        raise ValueError("generator: quiet hours need 24 flags and the load ratio 12 months")
    return g


@dataclass(frozen=True)
class HybridBalance:
    """Totals of one design over the series; per-hour records when asked."""

    array_w: float
    capacity_wh: float
    days: int
    demand_wh: float
    demand_critical_wh: float
    unmet_wh: float
    unmet_critical_wh: float
    shed_days: int
    pv_wh: float
    spilled_wh: float
    discharge_wh: float
    charge_wh: float
    gen_to_load_wh: float  # at the battery bus
    gen_to_battery_wh: float  # charger output into the battery terminals
    gen_output_wh: float  # at the generator terminals, dump load included
    dump_wh: float
    fuel_l: float
    run_h: int
    starts: int
    below_min_h: int
    stored_start_wh: float
    stored_end_wh: float
    stored_wh: np.ndarray | None = None  # (days x 24,) at the end of each hour
    gen_w: np.ndarray | None = None  # (days x 24,) generator output incl. dump, W

    @property
    def unmet_fraction(self) -> float:
        return self.unmet_wh / self.demand_wh if self.demand_wh > 0 else 0.0

    @property
    def solar_fraction(self) -> float:
        """PV energy used / (PV energy used + generator energy used), both at the bus."""
        pv_used = self.pv_wh - self.spilled_wh
        gen_used = self.gen_to_load_wh + self.gen_to_battery_wh
        total = pv_used + gen_used
        return pv_used / total if total > 0 else 1.0


def run_hybrid(
    steps: Steps,
    array_w: float,
    capacity_wh: float,
    gen: GeneratorInputs,
    *,
    max_dod: float,
    eta_charge: float,
    eta_discharge: float,
    initial_soc: float = 1.0,
    record: bool = False,
) -> HybridBalance:
    """Hour-by-hour balance of one design (array [W], battery [Wh]) with a generator."""
    if steps.mode != "hourly" or steps.steps_per_day != 24:
        raise ValueError("generator simulation: needs the hourly steps (mode='hourly')")
    check_generator_inputs(gen)
    aw, cap = float(array_w), float(capacity_wh)
    if aw < 0 or not cap > 0:
        raise ValueError("design: the array must be 0 W or more and the battery above 0 Wh")
    days = steps.pv_wh_per_w.shape[0]
    floor = cap * (1.0 - max_dod)
    ec, ed = float(eta_charge), float(eta_discharge)
    iec = 1.0 / ec
    e = cap * float(initial_soc)
    e_start = e
    big = float("inf")
    cc = steps.charge_cap_per_wh
    climit = big if cc is None else float(cc[0, 0]) * cap  # per hour, the same every hour
    g_w, g_min = gen.derated_w, gen.min_load_w
    chg_w, eta_chg = gen.charger_w, gen.charger_efficiency
    inv_chg = 1.0 / eta_chg
    a_l, b_l = gen.no_load_l_h, gen.b_l_per_kwh / 1000.0
    cycle = gen.rule == "cycle_charging"
    start_e, stop_e = gen.start_soc * cap, gen.stop_soc * cap
    quiet = gen.quiet
    kmon = gen.gen_wh_per_bus_wh
    tol = SHED_TOLERANCE_WH
    pv_l = steps.pv_wh_per_w.tolist()
    lc_l = steps.critical_wh.tolist()
    lo_l = steps.other_wh.tolist()
    month = steps.month.tolist()
    tot_pv = aw * float(steps.pv_wh_per_w.sum())
    tot_spill = tot_draw = tot_cin = 0.0
    g_load_t = g_batt_t = g_out_t = dump_t = fuel = 0.0
    unmet = unmet_c = 0.0
    shed_days = run_h = starts = below = 0
    on = False
    st_rec: list[float] | None = [] if record else None
    gw_rec: list[float] | None = [] if record else None
    for d in range(days):
        k = kmon[month[d]]
        pv_d, lc_d, lo_d = pv_l[d], lc_l[d], lo_l[d]
        day_shed = 0.0
        for s in range(24):
            p = aw * pv_d[s]
            lc = lc_d[s]
            load = lc + lo_d[s]
            if load <= p:
                rest = 0.0
                surplus = p - load
                short = False
                avail_b = 0.0
            else:
                rest = load - p
                surplus = 0.0
                avail_b = (e - floor) * ed
                if avail_b < 0.0:
                    avail_b = 0.0
                short = rest - avail_b > tol
            was = on
            if quiet[s]:
                on = False
            elif cycle:
                if on:
                    if e >= stop_e:
                        on = short  # reached the stop; runs on only if still short
                elif e <= start_e or short:
                    on = True
            else:
                on = short
            if on:
                run_h += 1
                if not was:
                    starts += 1
                room = (cap - e) * iec
                if room < 0.0:
                    room = 0.0
                pv_cin = surplus if surplus < room else room
                if pv_cin > climit:
                    pv_cin = climit
                g_serve = rest if rest * k <= g_w else g_w / k
                g_load = g_serve * k
                rest -= g_serve
                left_room = room - pv_cin
                left_c = climit - pv_cin
                if left_c < left_room:
                    left_room = left_c
                if cycle:
                    want = (g_w - g_load) * eta_chg
                else:  # load following: only what the minimum loading forces out
                    extra = g_min - g_load
                    want = extra * eta_chg if extra > 0.0 else 0.0
                if want > chg_w:
                    want = chg_w
                if want > left_room:
                    want = left_room
                g_cin = want if want > 0.0 else 0.0
                g_out = g_load + g_cin * inv_chg
                dump = g_min - g_out
                if dump > 1e-9:
                    below += 1
                    dump_t += dump
                    g_out = g_min
                fuel += a_l + b_l * g_out
                g_load_t += g_serve
                g_batt_t += g_cin
                g_out_t += g_out
                cin = pv_cin + g_cin
                e += cin * ec
                tot_cin += cin
                tot_spill += surplus - pv_cin
                if gw_rec is not None:
                    gw_rec.append(g_out)
            else:
                if surplus > 0.0:
                    room = (cap - e) * iec
                    if room < 0.0:
                        room = 0.0
                    pv_cin = surplus if surplus < room else room
                    if pv_cin > climit:
                        pv_cin = climit
                    e += pv_cin * ec
                    tot_cin += pv_cin
                    tot_spill += surplus - pv_cin
                if gw_rec is not None:
                    gw_rec.append(0.0)
            if rest > 0.0:
                draw = rest if rest < avail_b else avail_b
                e -= draw / ed
                tot_draw += draw
                shed = rest - draw
                if shed > 0.0:
                    served = load - shed
                    sc = lc if lc < served else served
                    unmet_c += lc - sc
                    day_shed += shed
            if st_rec is not None:
                st_rec.append(e)
        unmet += day_shed
        if day_shed > tol:
            shed_days += 1
    return HybridBalance(
        array_w=aw,
        capacity_wh=cap,
        days=days,
        demand_wh=float(steps.critical_wh.sum() + steps.other_wh.sum()),
        demand_critical_wh=float(steps.critical_wh.sum()),
        unmet_wh=unmet,
        unmet_critical_wh=unmet_c,
        shed_days=shed_days,
        pv_wh=tot_pv,
        spilled_wh=tot_spill,
        discharge_wh=tot_draw,
        charge_wh=tot_cin,
        gen_to_load_wh=g_load_t,
        gen_to_battery_wh=g_batt_t,
        gen_output_wh=g_out_t,
        dump_wh=dump_t,
        fuel_l=fuel,
        run_h=run_h,
        starts=starts,
        below_min_h=below,
        stored_start_wh=e_start,
        stored_end_wh=e,
        stored_wh=None if st_rec is None else np.asarray(st_rec),
        gen_w=None if gw_rec is None else np.asarray(gw_rec),
    )
