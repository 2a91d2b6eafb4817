"""Benchmark: reading and fitting a year of one-minute level readings (525,600 rows).

Prints, measured in this one run:
  - a bare `python -c "import CoolProp.CoolProp"` in a fresh process (best of 3), the
    reference clock of the other benchmarks;
  - reading the year's log with cryoplan.plan.log_reader.read_log (best of 3), and the
    ratio to the reference;
  - fitting the boil-off between its fills (cryoplan.physics.logfit.fit_boiloff, best of
    3), and the ratio;
  - both together, and the ratio (the bar: under 1, i.e. faster than importing CoolProp).

The log is synthetic (written to a temporary folder): a 100 L helium bath boiling 10 L/day
with 0.3 L reading noise, refilled every 7 days, ISO 8601 UTC times, a level, a temperature
and a fill column.
"""

from __future__ import annotations

import os
import sys
import tempfile

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
sys.path.insert(0, ROOT)
sys.path.insert(0, HERE)

from _timing import best, best_of_process  # noqa: E402

ROWS = 525_600


def write_year(path: str) -> None:
    rng = np.random.default_rng(0)
    minutes = np.arange(ROWS)
    stamps = (np.datetime64("2027-01-01T00:00") + minutes * np.timedelta64(1, "m")).astype(str)
    phase = minutes % (7 * 1440)
    level = 95.0 - 10.0 / 1440 * phase + rng.normal(0.0, 0.3, ROWS)
    temperature = 4.2 + rng.normal(0.0, 0.002, ROWS)
    fill = np.where(phase == 0, "75.0", "")
    with open(path, "w") as fh:
        fh.write("# synthetic benchmark log\n")
        fh.write("time,helium level [L],cold plate temperature [K],helium fill [L]\n")
        fh.write(
            "\n".join(
                f"{s}Z,{v:.2f},{t:.4f},{f}" for s, v, t, f in zip(stamps, level, temperature, fill)
            )
        )
        fh.write("\n")


def main() -> None:
    from cryoplan.physics.logfit import fit_boiloff
    from cryoplan.plan.log_reader import read_log

    with tempfile.TemporaryDirectory() as folder:
        path = os.path.join(folder, "year.csv")
        write_year(path)
        size = os.path.getsize(path) / 1024**2
        t_coolprop = best_of_process(["-c", "import CoolProp.CoolProp"], 3)
        log = read_log(path)
        t_read = best(lambda: read_log(path), 3)
    lvl = log.series["helium level [L]"]
    t, v = log.time[lvl.valid], lvl.volume[lvl.valid]
    fit = fit_boiloff(t, v)
    t_fit = best(lambda: fit_boiloff(t, v), 3)

    print(f"log: {ROWS} rows, {size:.1f} MB; {len(fit.intervals)} intervals fitted")
    print(f"bare import CoolProp.CoolProp : {t_coolprop * 1000:8.1f} ms")
    print(f"read_log (a year, 1 min)      : {t_read * 1000:8.1f} ms")
    print(f"ratio read / CoolProp import  : {t_read / t_coolprop:8.3f}")
    print(f"fit_boiloff                   : {t_fit * 1000:8.1f} ms")
    print(f"ratio fit / CoolProp import   : {t_fit / t_coolprop:8.3f}")
    both = t_read + t_fit
    print(f"ratio read+fit / CoolProp     : {both / t_coolprop:8.3f}   (bar: < 1)")


if __name__ == "__main__":
    main()
