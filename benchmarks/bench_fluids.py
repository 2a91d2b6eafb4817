"""Benchmark: loading the six cryogens from the warm cache against importing CoolProp.

Run with ``python benchmarks/bench_fluids.py``. Prints, measured in this one run (best of
three fresh interpreters each):

* a bare ``python -c "import CoolProp.CoolProp"``;
* a process that loads all six cryogens at 1 atm from the warm cache and evaluates
  ``vapor_enthalpy`` on an array, checking that CoolProp was not imported;
* an empty ``python -c pass``, for scale;

and the ratio of the second to the first. The cache is the usual one (or
``$CRYOPLAN_CACHE_DIR``); it is warmed first.
"""

from __future__ import annotations

import os
import subprocess
import sys
import time
from pathlib import Path

REPO = Path(__file__).resolve().parents[1]

WARM = "import cryoplan.data.fluids as f; f.warm_cache()"

LOAD = """
import sys
import numpy as np
import cryoplan.data.fluids as f
T = np.linspace(100.0, 300.0, 1000)
total = sum(float(f.cryogen(n).vapor_enthalpy(T).sum()) for n in f.cryogen_names())
assert "CoolProp" not in sys.modules, "CoolProp was imported on the warm path"
"""


def _env() -> dict:
    env = dict(os.environ)
    env["PYTHONPATH"] = str(REPO) + os.pathsep + env.get("PYTHONPATH", "")
    return env


def best_of(code: str, runs: int = 3) -> float:
    """Wall time of the fastest of ``runs`` fresh interpreters running ``code`` [s]."""
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run([sys.executable, "-c", code], env=_env(), check=True)
        times.append(time.perf_counter() - start)
    return min(times)


def main() -> None:
    subprocess.run([sys.executable, "-c", WARM], env=_env(), check=True)
    coolprop = best_of("import CoolProp.CoolProp")
    cached = best_of(LOAD)
    empty = best_of("pass")
    print(f"bare 'import CoolProp.CoolProp':                   {coolprop * 1000:8.1f} ms")
    print(f"six cryogens from the warm cache + vapor_enthalpy: {cached * 1000:8.1f} ms")
    print(f"empty interpreter (python -c pass), for scale:     {empty * 1000:8.1f} ms")
    print(f"ratio cached / CoolProp import: {cached / coolprop:.3f}")


if __name__ == "__main__":
    main()
