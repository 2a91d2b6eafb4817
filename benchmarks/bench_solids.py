"""Benchmark: vectorised enthalpy against scipy.integrate.quad, point by point.

Issue 2's bar: per point, ``Material.enthalpy`` on 10^5 temperatures is at least 100x
faster than ``scipy.integrate.quad`` of the same c(T) point by point, and agrees with it
to a relative 1e-6. Both figures and the ratio are measured in this one run.

Run: /tmp/venv/bin/python benchmarks/bench_solids.py [material ...]
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from scipy import integrate  # noqa: E402

from cryoplan.data import materials as library  # noqa: E402

N_VECTOR = 100_000
N_QUAD = 300  # quad is slow: time a sample of points and take the time per point


def bench(mid: str, rng: np.random.Generator) -> tuple[float, float, float]:
    m = library.material(mid)
    temps = rng.uniform(0.5, m.t_max, N_VECTOR)

    start = time.perf_counter()
    m.enthalpy(1.0)  # the first call builds the table: timed separately
    build = time.perf_counter() - start

    start = time.perf_counter()
    h = m.enthalpy(temps)
    vector_per_point = (time.perf_counter() - start) / N_VECTOR

    points = sorted(b for b in m._breakpoints if 0 < b < m.t_max)
    sample = temps[:N_QUAD]
    start = time.perf_counter()
    ref = np.array(
        [
            integrate.quad(
                m.specific_heat,
                0.0,
                t,
                points=[p for p in points if p < t] or None,
                limit=200,
                epsabs=0.0,
                epsrel=1e-10,
            )[0]
            for t in sample
        ]
    )
    quad_per_point = (time.perf_counter() - start) / N_QUAD
    worst = float(np.max(np.abs(h[:N_QUAD] / ref - 1.0)))
    print(
        f"{mid:<18} table build {build * 1e3:6.1f} ms | vectorised {vector_per_point * 1e9:7.1f} "
        f"ns/point | quad {quad_per_point * 1e6:8.1f} us/point | ratio "
        f"{quad_per_point / vector_per_point:9.0f}x | worst rel. diff {worst:.1e}"
    )
    return vector_per_point, quad_per_point, worst


def main(argv: list[str]) -> int:
    mids = argv or ["copper", "stainless-304", "niobium", "g10-cr"]
    rng = np.random.default_rng(2)
    print(
        f"enthalpy of {N_VECTOR} temperatures (vectorised) vs scipy.integrate.quad "
        f"({N_QUAD} of them, point by point)"
    )
    ok = True
    for mid in mids:
        vector, quad, worst = bench(mid, rng)
        ok &= quad / vector >= 100 and worst <= 1e-6
    print("bar (>= 100x faster, agreement 1e-6):", "met" if ok else "NOT met")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
