"""Benchmark: the spin entropy of a demagnetization salt on a 1000 x 1000 grid.

Prints, measured in this one run:
  - a plain Python `sum(range(10**6))` (best of 5), the reference the other benchmarks use;
  - the molar entropy S(B, T) of ferric ammonium alum on a 1000 x 1000 grid of field
    (0 to 8 T) and temperature (1 mK to 4.2 K), vectorised (best of 3), and the ratio;
  - the same grid point by point for its first 1000 points, scaled to the grid, to show
    what the vectorised form saves.
"""

from __future__ import annotations

import os
import sys

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.dirname(HERE))
sys.path.insert(0, HERE)

from _timing import best  # noqa: E402


def main() -> None:
    import cryoplan

    s = cryoplan.salt("ferric-ammonium-alum")
    field = np.linspace(0.0, 8.0, 1000)[:, None]
    temperature = np.geomspace(1e-3, 4.2, 1000)[None, :]
    s.entropy(field, temperature)
    t_sum = best(lambda: sum(range(10**6)), 5)
    t_grid = best(lambda: s.entropy(field, temperature), 3)
    flat_b = np.broadcast_to(field, (1000, 1000)).ravel()[:1000]
    flat_t = np.broadcast_to(temperature, (1000, 1000)).ravel()[:1000]
    t_loop = best(lambda: [s.entropy(float(b), float(t)) for b, t in zip(flat_b, flat_t)], 1)
    grid = s.entropy(field, temperature)
    print(f"sum(range(10**6))                  : {t_sum * 1000:8.1f} ms")
    print(f"entropy, 1000 x 1000 grid           : {t_grid * 1000:8.1f} ms")
    print(f"ratio grid / sum                    : {t_grid / t_sum:8.2f}   (bar: < 20)")
    print(f"point by point, scaled to the grid  : {t_loop * 1000 * 1000:8.0f} ms")
    print(f"ratio point by point / vectorised   : {t_loop * 1000 / t_grid:8.0f}")
    print(f"finite everywhere                   : {bool(np.isfinite(grid).all())}")


if __name__ == "__main__":
    main()
