"""Benchmark: a two-stage cooldown over three weeks of simulated time, against a plain loop.

Issue 5 asks that a two-stage cooldown over three weeks of simulated time finishes in under
10 times a plain Python ``sum(range(10**6))`` on the same machine. This script measures both
in one run and prints the times and their ratio.

The demo (the Harwick Low-Temperature Facility's test cryostat, invented round numbers):

- cold plate (4 K stage): 40 kg copper and 20 kg stainless steel 304, target 4.2 K;
- radiation shield (50 K stage): 30 kg aluminium, target 50 K;
- a two-stage cooler of the 1.5 W at 4.2 K pulse-tube class, 40 W near 45 K on the first
  stage, given as a capacity map on a temperature grid (invented round numbers);
- loads: radiation onto the shield from 293 K, a fixed wiring load on the cold plate, and
  the supports between shield and cold plate as a 4 mW/K link;
- 7 kW of compressor power; run for 21 days whatever happens (no early stop).

Heat capacities come from the material library where it is available; otherwise from a
Debye lattice plus electronic term with textbook constants (Kittel, *Introduction to Solid
State Physics*, 8th ed., 2005, tables of theta_D and gamma; from memory).

Run: ``/tmp/venv/bin/python benchmarks/bench_refrigeration.py``
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # run from a source checkout

from cryoplan.physics.refrigeration import (
    SECONDS_PER_DAY,
    CapacityMap,
    CooldownStage,
    Link,
    simulate_cooldown,
)

SIGMA = 5.670374419e-8  # Stefan-Boltzmann constant, W/(m^2 K^4) (CODATA 2018)


def _heat_capacities():
    """Total heat capacity functions of the two stages, and where they came from."""
    try:
        from cryoplan.data.materials import material, material_ids

        ids = set(material_ids())

        def pick(*names):
            for name in names:
                if name in ids:
                    return material(name)
            raise LookupError(names)

        cu = pick("copper")
        ss = pick("stainless-304")
        al = pick("aluminium", "aluminium-6061")
        cold = lambda T: 40.0 * cu.specific_heat(T) + 20.0 * ss.specific_heat(T)  # noqa: E731
        shield = lambda T: 30.0 * al.specific_heat(T)  # noqa: E731
        return cold, shield, f"material library ({cu.name}, {ss.name}, {al.name})"
    except Exception:
        from cryoplan.physics.solids import debye_specific_heat

        # theta_D [K], molar mass [kg/mol], gamma [J/(mol K^2)]; Kittel 2005 (from memory)
        def cu(T):
            return debye_specific_heat(T, 343.0, 0.063546, gamma=0.695e-3)

        def ss(T):  # iron-like lattice with a larger electronic term (from memory)
            return debye_specific_heat(T, 470.0, 0.05585, gamma=4.6e-3)

        def al(T):
            return debye_specific_heat(T, 428.0, 0.026982, gamma=1.35e-3)

        cold = lambda T: 40.0 * cu(T) + 20.0 * ss(T)  # noqa: E731
        shield = lambda T: 30.0 * al(T)  # noqa: E731
        return cold, shield, "synthetic Debye + electronic heat capacities (library not found)"


def demo_map() -> CapacityMap:
    """A two-stage map of the 1.5 W at 4.2 K class (invented round numbers)."""
    t1 = np.array([20.0, 30.0, 40.0, 50.0, 60.0, 80.0, 120.0, 200.0, 300.0])
    q1_base = np.array([0.0, 15.0, 33.0, 48.0, 60.0, 80.0, 110.0, 150.0, 180.0])
    t2 = np.array([2.6, 3.0, 4.2, 6.0, 10.0, 20.0, 40.0, 80.0, 150.0, 300.0])
    q2_base = np.array([0.0, 0.4, 1.5, 3.0, 5.5, 9.0, 14.0, 20.0, 25.0, 30.0])
    q1 = q1_base[:, None] * (1.0 - 0.1 * t2[None, :] / 300.0)
    f = np.clip(1.0 - 0.5 * (t1 - 45.0) / 255.0, 0.5, 1.0)
    q2 = f[:, None] * q2_base[None, :]
    return CapacityMap(t1, t2, q1, q2, base_temperatures=(15.0, 2.4))


def loads(T):
    """Static loads [W] on (shield, cold plate) from the stage-temperature vector [K]."""
    shield = SIGMA * 0.03 * 1.5 * (293.0**4 - T[0] ** 4) + 2.0 * (293.0 - T[0]) / 250.0
    cold = SIGMA * 0.05 * 1.0 * (T[0] ** 4 - T[1] ** 4) + 0.05
    return np.stack([shield, cold])


def run():
    cold_c, shield_c, origin = _heat_capacities()
    stages = [
        CooldownStage("radiation shield", shield_c, 293.0, 50.0),
        CooldownStage("cold plate", cold_c, 293.0, 4.2),
    ]
    return (
        simulate_cooldown(
            stages,
            demo_map(),
            loads,
            [Link(0, 1, conductance=0.004)],
            input_power=7000.0,
            ambient=293.0,
            t_max=21 * SECONDS_PER_DAY,
            stop_when_cold=False,
        ),
        origin,
    )


def main() -> None:
    loop_times, cool_times = [], []
    for _ in range(5):
        t0 = time.perf_counter()
        sum(range(10**6))
        loop_times.append(time.perf_counter() - t0)
        t0 = time.perf_counter()
        result, origin = run()
        cool_times.append(time.perf_counter() - t0)
    loop = statistics.median(loop_times)
    cool = statistics.median(cool_times)
    print("two-stage cooldown, 21 days simulated")
    print(f"  heat capacities: {origin}")
    for name, tt, Tend in zip(
        result.names, result.time_to_target, result.temperatures[:, -1], strict=True
    ):
        when = f"{tt / 3600.0:.1f} h" if tt is not None else "not reached"
        print(f"  {name}: target reached after {when}; {Tend:.3f} K at the end")
    print(f"  electrical energy: {result.electrical_energy / 3.6e6:.0f} kWh")
    print(f"  energy closure: {result.closure_error:.2e}")
    print(f"  solver evaluations: {result.evaluations}; points: {result.t.size}")
    print(f"sum(range(10**6)):        {loop * 1e3:8.2f} ms (median of 5)")
    print(f"two-stage cooldown:       {cool * 1e3:8.2f} ms (median of 5)")
    print(f"ratio cooldown / loop:    {cool / loop:8.2f}   (asked: under 10)")


if __name__ == "__main__":
    main()
