"""Benchmark: the dashboard's first screen and its redraw after an edit.

Run with ``python benchmarks/bench_tui.py``. Prints, measured in this one run:

* the time from starting a fresh interpreter to the dashboard's first screen, in a
  headless ``App.run_test()`` on the demo plan (and to the first figures on it), best of
  three, against a bare ``python -c "import CoolProp.CoolProp"`` (best of three) and their
  ratio; the goal is a first screen within 1.5 s once the fluid cache exists;
* the time from an accepted edit (a mass typed into the edit field and entered) to the
  redraw of the figures it changed, on the largest example, over a series of edits, against
  a plain ``sum(range(10**6))`` and their ratio; the goals are under 50 ms and a ratio under 4.

The fluid cache is warmed first, as the goal assumes.
"""

from __future__ import annotations

import asyncio
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

REPO = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(REPO))

WARM = "import cryoplan.data.fluids as f; f.warm_cache()"

#: A fresh interpreter that opens the dashboard headless and reports the time of its first
#: screen and of its first figures (seconds since the parent started it, on stdout).
FIRST_SCREEN = r"""
import asyncio, sys, time
from cryoplan.cli import build_parser       # what `cryoplan` pays before the dashboard
build_parser()
from cryoplan.plan import demo_plan_path
from cryoplan.tui.app import CryoplanApp

async def main():
    app = CryoplanApp(demo_plan_path(), bundled=True)
    async with app.run_test(size=(80, 24)) as pilot:
        while app.figures_time is None:
            await pilot.pause(0.01)
        print("first", app.first_screen_time, flush=True)
        print("figures", app.figures_time, flush=True)

asyncio.run(main())
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


def first_screen(runs: int = 3) -> tuple[float, float]:
    """(to first screen, to first figures) [s], best of ``runs`` fresh interpreters."""
    firsts, figures = [], []
    for _ in range(runs):
        start = time.time()
        out = subprocess.run(
            [sys.executable, "-c", FIRST_SCREEN],
            env=_env(),
            check=True,
            capture_output=True,
            text=True,
        ).stdout
        marks = dict(line.split() for line in out.splitlines() if line.strip())
        firsts.append(float(marks["first"]) - start)
        figures.append(float(marks["figures"]) - start)
    return min(firsts), min(figures)


def largest_example() -> str:
    from cryoplan.plan import examples_dir

    files = [
        os.path.join(examples_dir(), f) for f in os.listdir(examples_dir()) if f.endswith(".toml")
    ]
    return max(files, key=os.path.getsize)


async def edit_to_redraw(path: str, edits: int = 20) -> list[float]:
    """Seconds from entering a new mass to the redraw of its figures, per edit."""
    import shutil
    import tempfile

    from cryoplan.tui.app import CryoplanApp
    from cryoplan.tui.widgets import ColdMassTable

    folder = tempfile.mkdtemp(prefix="cryoplan-bench-")
    copy = os.path.join(folder, os.path.basename(path))
    shutil.copy(path, copy)
    app = CryoplanApp(copy)
    times = []
    async with app.run_test(size=(80, 24)) as pilot:
        while app.data is None:
            await pilot.pause(0.01)
        table = app.query_one(ColdMassTable)
        stages = app.document.stages()
        stage = next(s for s in stages if any(p.how == "mass" for p in s.parts))
        part = next(p for p in stage.parts if p.how == "mass")
        row = table.get_row_index(f"p{stage.index}.{part.index}")
        for n in range(edits):
            table.move_cursor(row=row, column=table.get_column_index("mass"), animate=False)
            table.focus()
            await pilot.press("enter")
            await pilot.pause()
            app.query_one("#edit-input").value = f"{10 + n % 7} kg"
            app.last_edit_seconds = None
            app.edit_redrawn.clear()
            await pilot.press("enter")
            await asyncio.wait_for(app.edit_redrawn.wait(), 30)
            times.append(app.last_edit_seconds)
            await pilot.pause(0.02)
    shutil.rmtree(folder, ignore_errors=True)
    return times


def plain_sum() -> float:
    """A plain ``sum(range(10**6))`` [s], best of five."""
    best = float("inf")
    for _ in range(5):
        start = time.perf_counter()
        sum(range(10**6))
        best = min(best, time.perf_counter() - start)
    return best


def main() -> None:
    subprocess.run([sys.executable, "-c", WARM], env=_env(), check=True)
    coolprop = best_of("import CoolProp.CoolProp")
    first, figures = first_screen()
    path = largest_example()
    times = asyncio.run(edit_to_redraw(path))
    reference = plain_sum()
    median = statistics.median(times)
    print(f"bare 'import CoolProp.CoolProp':                 {coolprop * 1000:8.1f} ms")
    print(
        f"dashboard, command start to first screen:        {first * 1000:8.1f} ms"
        f"   (goal: 1500 ms)"
    )
    print(f"dashboard, command start to first figures:       {figures * 1000:8.1f} ms")
    print(f"ratio first screen / import CoolProp:            {first / coolprop:8.2f}")
    print(f"largest example: {os.path.basename(path)}, {len(times)} edits of a mass")
    print(
        f"edit to redraw, median:                          {median * 1000:8.1f} ms   (goal: 50 ms)"
    )
    print(f"edit to redraw, slowest:                         {max(times) * 1000:8.1f} ms")
    print(f"plain sum(range(10**6)):                         {reference * 1000:8.1f} ms")
    print(
        f"ratio edit-to-redraw (median) / sum(range(1e6)): {median / reference:8.2f}"
        f"   (goal: under 4)"
    )


if __name__ == "__main__":
    main()
