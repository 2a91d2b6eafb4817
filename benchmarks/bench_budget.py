"""Benchmark: `cryoplan print` of an example and one evaluate() of the largest example.

Prints, measured in this one run:
  - a bare `python -c "import CoolProp.CoolProp"` (best of 3), the reference;
  - `cryoplan print EXAMPLE` with the fluid cache built (best of 3), and the ratio
    (the bar: under 0.3);
  - a plain Python `sum(range(10**6))` (best of 5), the second reference;
  - one `evaluate()` of the largest example, warm (best of 5), and the ratio (bar: under 4).
"""

from __future__ import annotations

import glob
import os
import subprocess
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
sys.path.insert(0, ROOT)
sys.path.insert(0, HERE)

from _timing import best  # noqa: E402


def main() -> None:
    import cryoplan
    from cryoplan.plan import examples_dir

    examples = sorted(glob.glob(os.path.join(examples_dir(), "*.toml")))
    largest = max(examples, key=os.path.getsize)
    env = dict(os.environ, PYTHONPATH=ROOT)
    # warm the cache and pint's registry cache
    subprocess.run(
        [sys.executable, "-m", "cryoplan", "print", largest],
        env=env,
        check=True,
        capture_output=True,
    )

    t_coolprop = best(
        lambda: subprocess.run([sys.executable, "-c", "import CoolProp.CoolProp"], check=True), 3
    )
    t_print = best(
        lambda: subprocess.run(
            [sys.executable, "-m", "cryoplan", "print", largest],
            env=env,
            check=True,
            capture_output=True,
        ),
        3,
    )
    t_sum = best(lambda: sum(range(10**6)), 5)
    plan = cryoplan.load_plan(largest)
    cryoplan.evaluate(plan)
    t_eval = best(lambda: cryoplan.evaluate(plan), 5)

    print(f"example: {os.path.basename(largest)}")
    print(f"bare import CoolProp.CoolProp : {t_coolprop * 1000:8.1f} ms")
    print(f"cryoplan print (cache built)  : {t_print * 1000:8.1f} ms")
    print(f"ratio print / CoolProp import : {t_print / t_coolprop:8.3f}   (bar: < 0.3)")
    print(f"sum(range(10**6))             : {t_sum * 1000:8.1f} ms")
    print(f"evaluate(largest example)     : {t_eval * 1000:8.1f} ms")
    print(f"ratio evaluate / sum          : {t_eval / t_sum:8.3f}   (bar: < 4)")


if __name__ == "__main__":
    main()
