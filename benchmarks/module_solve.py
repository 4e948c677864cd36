"""Cost of the thermoelectric stage: the coupled solve with its current sweep, as a ratio to one plate solve.

Run:  python benchmarks/module_solve.py [--repeat 7]

Both are timed in one process, one after the other, and reported as the median wall time and as the
ratio (module solve / one solve_plate) with the number of plate solves the module solve made, so the
figures compare across machines.  Not a test: nothing here fails on time.
"""
from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from coldplate.design.reader import load_design  # noqa: E402
from coldplate.check import solve  # noqa: E402
from coldplate.plate.solve import solve_plate

EXAMPLE = ROOT / "examples" / "sample-stage-thermoelectric.toml"


def _median(fn, repeat):
    times = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=7)
    args = ap.parse_args()
    design = load_design(EXAMPLE)
    result = solve(design)  # warm caches
    plate = _median(lambda: solve_plate(design, load=result.module.Q_hot), args.repeat)
    module = _median(lambda: solve(design), args.repeat)
    print(f"one plate solve        {plate * 1e3:8.1f} ms")
    print(f"solve with modules     {module * 1e3:8.1f} ms   ratio {module / plate:6.1f}")
    print(f"operating point plate solves: {result.module.iterations}; sweep points: {len(result.module.sweep.current)}")


if __name__ == "__main__":
    main()
