"""Cost of the thermoelectric stage, as ratios to one plate solve of the same model.

Run:  python benchmarks/module_solve.py [--repeat 3] [--network-repeat 7]

In one process, one after the other: one network plate solve and the module solve on the network (the check
with ``model="network"``); one field plate solve, the module solve on the field as the check runs it (the
calibration, coldplate.modules.solve.solve_with_module_field) and the module solve with every step a field solve
(``solve_with_module(design, solve_plate_field)``, the path before the calibration), both without the
findings, and the whole check on the field model.  Each is the median wall
time, shown as a ratio to the one plate solve of its model, with the field solves it made counted, so the
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

from coldplate.check import solve  # noqa: E402
from coldplate.design.reader import load_design  # noqa: E402
from coldplate.modules.solve import solve_with_module, solve_with_module_field  # noqa: E402
from coldplate.plate import fieldcheck  # noqa: E402
from coldplate.plate.solve import solve_plate  # noqa: E402

EXAMPLE = ROOT / "examples" / "sample-stage-thermoelectric.toml"


def _median(fn, repeat):
    times = []
    for _ in range(repeat):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times)


class _Count:
    def __init__(self, solve):
        self.solve, self.calls = solve, 0

    def __call__(self, *args, **kwargs):
        self.calls += 1
        return self.solve(*args, **kwargs)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=3, help="repeats of each field-model timing")
    ap.add_argument("--network-repeat", type=int, default=7, help="repeats of each network-model timing")
    args = ap.parse_args()
    design = load_design(EXAMPLE)
    result = solve(design, model="network")  # warm caches
    Q = result.module.Q_hot
    plate = _median(lambda: solve_plate(design, load=Q), args.network_repeat)
    module = _median(lambda: solve(design, model="network"), args.network_repeat)
    print("network model")
    print(f"  one plate solve                 {plate * 1e3:9.1f} ms")
    print(f"  solve with modules              {module * 1e3:9.1f} ms   ratio {module / plate:6.1f}")
    print(f"  operating point plate solves: {result.module.iterations}; sweep points: "
          f"{len(result.module.sweep.current)}")

    original = fieldcheck.solve_plate_field
    field = _median(lambda: original(design, load=Q), args.repeat)
    counter = fieldcheck.solve_plate_field = _Count(original)
    try:
        check = _median(lambda: solve(design, model="field"), args.repeat)
        per_check = counter.calls / args.repeat
        counter.calls = 0
        calibrated = _median(lambda: solve_with_module_field(design, counter, solve_plate), args.repeat)
        per_calibrated = counter.calls / args.repeat
        counter.calls = 0
        every_step = _median(lambda: solve_with_module(design, counter), args.repeat)
        per_step = counter.calls / args.repeat
    finally:
        fieldcheck.solve_plate_field = original
    print("field model")
    print(f"  one plate solve                 {field * 1e3:9.1f} ms")
    print(f"  the check with modules          {check * 1e3:9.1f} ms   ratio {check / field:6.1f}   "
          f"field solves {per_check:g}")
    print(f"  modules, calibrated             {calibrated * 1e3:9.1f} ms   ratio {calibrated / field:6.1f}   "
          f"field solves {per_calibrated:g}")
    print(f"  modules, every step a field     {every_step * 1e3:9.1f} ms   ratio {every_step / field:6.1f}   "
          f"field solves {per_step:g}")
    print(f"  calibrated / every step: {calibrated / every_step:.3f}")


if __name__ == "__main__":
    main()
