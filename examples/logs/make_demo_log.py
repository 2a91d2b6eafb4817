"""Write the demo cryostat's invented helium log, examples/logs/demo-magnet-bath-helium.csv.

INVENTED DATA for the invented Harwick Low Temperature Facility: the log is made here from
the project's own model of the demo plan (examples/demo-magnet-bath.toml), not measured.
The truth it carries:

- the helium bath's volume, refill level and the supply's transfer loss are read from the
  plan; the static boil-off is the plan's evaluation,
  ``cryoplan.evaluate(plan).to_dict()["summary"]["static_boiloff_L_per_day"]["helium"]``;
- the level meter's sensor is 50 cm long and spans the bath, so the bath holds
  volume / 50 cm litres per centimetre (2.0 L/cm for the 100 L bath);
- readings every 10 minutes for 60 days from 2027-01-11 00:00 UTC; the reading noise is
  normal with a standard deviation of 0.3 % of the sensor's length; the meter's zero
  drifts linearly by +0.2 % over the 60 days;
- a fill starts when the level falls to the refill level plus 0 to 4 L, lasts 40 minutes
  (four readings on the way up) and tops the bath up to 95 L; each fill's transfer loss is
  the plan's figure plus a normal spread of 0.03; the litres delivered (the supply
  dewar's scale, to 0.1 L) are written on the row where the fill ends;
- a cold plate temperature of 4.2 K with 2 mK noise;
- faults put in on purpose: a disconnected meter reading exactly 0 % for three readings,
  one row written twice (a duplicate time), and one unparseable level cell ("ERR").

Run from the repository: ``python examples/logs/make_demo_log.py`` (a fixed random state: the same
file every time). It prints the truth and what cryoplan's fit recovers from the file.
"""

from __future__ import annotations

import sys
from datetime import datetime, timedelta
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]
sys.path.insert(0, str(ROOT))

import cryoplan  # noqa: E402

PLAN = ROOT / "examples" / "demo-magnet-bath.toml"
OUT = HERE / "demo-magnet-bath-helium.csv"
RANDOM_STATE = 20270111
SENSOR_CM = 50.0
NOISE_PERCENT = 0.3
DRIFT_PERCENT = 0.2
LOSS_SPREAD = 0.03
STEP_S = 600.0
DAYS = 60
FILL_READINGS = 4
TOP_L = 95.0


def make(path: Path = OUT) -> dict:
    """Write the log; return the truth it was made from."""
    plan = cryoplan.load_plan(str(PLAN))
    summary = cryoplan.evaluate(plan).to_dict()["summary"]
    bath = next(b for b in plan.baths if b.cryogen == "helium")
    volume_l, refill_l = bath.volume * 1e3, bath.refill_at * 1e3
    loss = plan.supplies["helium"].transfer_loss
    boiloff_l_per_day = summary["static_boiloff_L_per_day"]["helium"]
    l_per_cm = volume_l / SENSOR_CM
    rate = boiloff_l_per_day / 86400.0  # L/s
    rng = np.random.default_rng(RANDOM_STATE)

    n = int(DAYS * 86400 / STEP_S)
    level = np.empty(n)
    fills: dict[int, float] = {}
    v, i = TOP_L, 0
    trigger = refill_l + rng.uniform(0.0, 4.0)
    while i < n:
        if v <= trigger and i + FILL_READINGS < n:
            this_loss = loss + rng.normal(0.0, LOSS_SPREAD)
            duration = FILL_READINGS * STEP_S
            delivered = round((TOP_L - v + rate * duration) / (1.0 - this_loss), 1)
            gain = delivered * (1.0 - this_loss) - rate * duration
            for k in range(1, FILL_READINGS + 1):
                level[i] = v + gain * k / FILL_READINGS
                i += 1
            v = level[i - 1]
            fills[i - 1] = delivered
            trigger = refill_l + rng.uniform(0.0, 4.0)
            continue
        level[i] = v
        v -= rate * STEP_S
        i += 1
    percent = level / l_per_cm / SENSOR_CM * 100.0
    percent += rng.normal(0.0, NOISE_PERCENT, n) + DRIFT_PERCENT * np.arange(n) / n
    temperature = 4.2 + rng.normal(0.0, 0.002, n)
    start = datetime(2027, 1, 11)
    times = [(start + timedelta(seconds=STEP_S * k)).strftime("%Y-%m-%dT%H:%MZ") for k in range(n)]
    cells = [f"{p:.2f}" for p in percent]
    bad_run = int(23 * 86400 / STEP_S)
    for k in range(bad_run, bad_run + 3):
        cells[k] = "0.00"  # the meter unplugged
    cells[int(47 * 86400 / STEP_S) + 5] = "ERR"
    duplicate = int(35 * 86400 / STEP_S) + 7

    header = [
        "# INVENTED DATA: a demo log of the invented Harwick Low Temperature Facility, bay 3,",
        "# made by examples/logs/make_demo_log.py from cryoplan's model of",
        "# examples/demo-magnet-bath.toml; not a measurement.",
        f"# helium level: % of a {SENSOR_CM:g} cm sensor spanning the bath, "
        f"{l_per_cm:.2f} L/cm; noise sd {NOISE_PERCENT} %, drift +{DRIFT_PERCENT} % in "
        f"{DAYS} days",
        f"# truth: static boil-off {boiloff_l_per_day:.4f} L/day, transfer loss {loss:g} "
        f"(+- {LOSS_SPREAD} between fills); faults put in: 3 readings of 0 % "
        "(meter unplugged), a duplicate row, an unparseable cell",
        "time,helium level [%],cold plate temperature [K],helium fill [L]",
    ]
    rows = []
    for k in range(n):
        fill = f"{fills[k]:.1f}" if k in fills else ""
        rows.append(f"{times[k]},{cells[k]},{temperature[k]:.3f},{fill}")
        if k == duplicate:
            rows.append(rows[-1])
    path.write_text("\n".join(header + rows) + "\n")
    return {
        "boiloff_L_per_day": boiloff_l_per_day,
        "transfer_loss": loss,
        "litres_per_cm": l_per_cm,
        "fills": len(fills),
    }


def check(path: Path, truth: dict) -> None:
    """Read the log back with cryoplan and print what the fit recovers."""
    from cryoplan.physics import logfit
    from cryoplan.plan.log_reader import read_log

    mapping = {"helium level [%]": {"sensor_length": f"{SENSOR_CM:g} cm",
                                    "litres_per_cm": truth["litres_per_cm"]}}  # fmt: skip
    log = read_log(path, mapping)
    lvl = log.series["helium level [%]"]
    t, v = log.time[lvl.valid], lvl.volume[lvl.valid]
    fit = logfit.fit_boiloff(t, v)
    fill = log.series["helium fill [L]"]
    pairs = logfit.pair_deliveries(log.time[fill.valid], fill.volume[fill.valid], fit.fills)
    ok = [(i, d) for i, d in pairs if np.isfinite(fit.rises[i])]
    durations = [fit.fills[i].time_after - fit.fills[i].time_before for i, _ in ok]
    losses = logfit.fill_transfer_losses(
        [d for _, d in ok], fit.rises[[i for i, _ in ok]], durations, fit.rate, fit.rate_sigma
    )
    print(f"wrote {path.relative_to(ROOT)} ({path.stat().st_size / 1024:.0f} kB)")
    print(f"problems: {log.describe_problems()}")
    print(
        f"boil-off: truth {truth['boiloff_L_per_day']:.3f} L/day, fitted "
        f"{fit.boiloff_per_day * 1e3:.3f} +- {fit.rate_sigma * 86400e3:.3f} L/day "
        f"({len(fit.intervals)} intervals, {len(fit.fills)} fills)"
    )
    print(
        f"transfer loss: truth {truth['transfer_loss']:g}, fitted {losses.mean:.3f} "
        f"(sd {losses.sd:.3f} over {losses.n} fills)"
    )


if __name__ == "__main__":
    check(OUT, make(OUT))
