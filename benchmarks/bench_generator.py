"""Benchmark: the generator hybrid of the invented lodge (issue 16).

Targets: a 30-year hourly hybrid simulation of one design < 0.5 s; a 20-point trade-off
of sun, battery and fuel < 10 s.  Run: python benchmarks/bench_generator.py
"""

from __future__ import annotations

import time


def best(f, n: int = 3) -> float:
    """Least CPU time of ``n`` runs [s] (CPU, not wall-clock: the machine is shared)."""
    times = []
    for _ in range(n):
        t = time.process_time()
        f()
        times.append(time.process_time() - t)
    return min(times)


def main() -> None:
    from offgrid.design.sizing import design
    from offgrid.economics.hybrid_mix import mix_tradeoff
    from offgrid.generator.hybrid import generator_setup, hybrid_balance, hybrid_run
    from offgrid.generator.study import hybrid_demo_path
    from offgrid.project.store import load_project
    from offgrid.simulate.adapter import inputs_from_design
    from offgrid.simulate.balance import build_steps
    from offgrid.simulate.weather import synthetic_daily_insolation

    p = load_project(hybrid_demo_path())
    d = design(p)
    s = generator_setup(p, d)
    inp = inputs_from_design(p, d)
    w = synthetic_daily_insolation(inp.insolation_kwh_m2_day, inp.latitude_deg, 30, seed=1)
    steps = build_steps(inp, w, "hourly")
    aw, cap = inp.array_w * 0.6, inp.capacity_wh * 0.5
    t_bal = best(lambda: hybrid_balance(inp, steps, s.inputs, aw, cap))
    t_rec = best(lambda: hybrid_run(inp, w, s.inputs, aw, cap, steps=steps, solar_only=False))
    t_all = best(lambda: hybrid_run(inp, w, s.inputs, aw, cap, steps=steps))
    print(
        f"CPU time, 30 years hourly, one design: balance {t_bal:.3f} s; with battery wear "
        f"(rainflow) {t_rec:.3f} s; plus the solar-only comparison {t_all:.3f} s"
    )
    prices = {"array_per_w": 0.4, "battery_per_kwh": 300.0}
    t_mix = best(lambda: mix_tradeoff(p, d, inp, w, s, prices, steps=steps), 1)
    print(f"CPU time, 20-point trade-off over 30 years: {t_mix:.2f} s")


if __name__ == "__main__":
    main()
