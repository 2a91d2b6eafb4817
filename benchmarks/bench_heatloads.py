"""Benchmark: the heat-load core with library materials and cached fluid properties.

Prints, measured in this one run (best of several calls each):
  - a plain Python ``sum(range(10**6))``, the reference;
  - one call of each load function with real data (library copper and 304 stainless,
    helium from the fluid layer), and its ratio to the reference;
  - the vapour-cooled lead solve with the properties tabulated once (as shipped) against
    the same solve calling the material and fluid objects at every integrator step, and
    the ratio (the tabulation is there to keep a report well under a second).
"""

from __future__ import annotations

import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.dirname(HERE))
sys.path.insert(0, HERE)

from _timing import best  # noqa: E402


def main() -> None:
    from cryoplan.data.fluids import cryogen
    from cryoplan.data.materials import material
    from cryoplan.physics import heatloads as hl
    from cryoplan.physics.heatloads import vapor as hl_vapor

    copper, steel, he = material("copper"), material("stainless-304"), cryogen("helium")
    k_cu = copper.conductivity
    Tb, latent, dh = he.boiling_point, he.latent_heat, he.vapor_enthalpy
    dh(100.0), k_cu(100.0), steel.conductivity_integral(4.2, 77.0)  # warm the tables

    reference = best(lambda: sum(range(10**6)), 5)
    print(f"reference sum(range(10**6)):              {reference * 1e3:8.2f} ms")

    _, shape = hl.vapor_cooled_lead_optimum(500.0, Tb, 300.0, latent, dh, k_cu)
    cases = {
        "gray_body_exchange": lambda: hl.gray_body_exchange(0.6, 4.2, 77.0, 0.05, 0.05, 1.0),
        "mli_load": lambda: hl.mli_load(0.6, 77.0, 300.0, 30),
        "conduction_load (304)": lambda: hl.conduction_load(
            steel.conductivity_integral, 4.2, 77.0, 20e-6, 0.25, 3
        ),
        "segmented_conduction (304)": lambda: hl.segmented_conduction(
            steel.conductivity_integral, [300.0, 77.0, 4.2], [0.2, 0.25], 20e-6, 3
        ),
        "free_molecular_conduction": lambda: hl.free_molecular_conduction(
            0.6, 4.2, 77.0, 1e-4, "helium", gap=0.01
        ),
        "conduction_cooled_lead_load (Cu)": lambda: hl.conduction_cooled_lead_load(
            500.0, 0.4, 1e-4, k_cu, 4.2, 300.0
        ),
        "vapor_cooled_neck_load (304, He)": lambda: hl.vapor_cooled_neck_load(
            steel.conductivity, 2e-4, 0.4, Tb, 300.0, latent, dh
        ),
        "vapor_cooled_lead_optimum (Cu, He)": lambda: hl.vapor_cooled_lead_optimum(
            500.0, Tb, 300.0, latent, dh, k_cu
        ),
        "vapor_cooled_lead_load (Cu, He)": lambda: hl.vapor_cooled_lead_load(
            500.0, 0.8 * shape * 1e-4, 1e-4, k_cu, Tb, 300.0, latent, dh
        ),
    }
    for name, fn in cases.items():
        t = best(fn, 3 if "vapor_cooled_lead" in name else 20)
        print(f"{name:40s} {t * 1e3:8.2f} ms   ratio to reference {t / reference:8.2f}")

    def solve():
        return hl.vapor_cooled_lead_load(
            500.0, 0.8 * shape * 1e-4, 1e-4, k_cu, Tb, 300.0, latent, dh
        )

    tabulated = best(solve, 3)
    shipped = hl_vapor._FastScalar

    class Direct:  # the objects themselves at every call
        def __init__(self, f, T_lo, T_hi, n=0):
            self.f = f

        def __call__(self, T):
            return float(self.f(T))

    hl_vapor._FastScalar = Direct
    try:
        q_direct = solve()
        direct = best(solve, 2)
    finally:
        hl_vapor._FastScalar = shipped
    q_tab = solve()
    print(
        f"vapour-cooled lead, tabulated {tabulated * 1e3:.1f} ms, direct {direct * 1e3:.1f} ms: "
        f"ratio direct/tabulated {direct / tabulated:.1f}; "
        f"results differ by {abs(q_tab / q_direct - 1):.1e} (relative)"
    )


if __name__ == "__main__":
    main()
