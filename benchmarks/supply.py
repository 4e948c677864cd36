"""Cost of the supply stage, as ratios to one plate solve, measured in one run.

Run:  python benchmarks/supply.py [--repeat 3]

Counts the plate solves each stage makes (operating point, least flow, curves) and times the whole
``solve`` of the tap-to-drain example against a single ``solve_plate`` at the same flow, in one process.
Not a test: nothing here fails on time.
"""
from __future__ import annotations

import argparse
import importlib
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from coldplate.design.reader import load_design  # noqa: E402
from coldplate.check import solve  # noqa: E402
from coldplate.plate.solve import solve_plate  # noqa: E402

#: The modules that call solve_plate during a check (each holds its own reference to it).
CALLERS = [importlib.import_module(m) for m in ("coldplate.check", "coldplate.supply.operating")]

EXAMPLE = ROOT / "examples" / "tap-to-drain-circuit.toml"


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=3)
    n = ap.parse_args().repeat
    design = load_design(EXAMPLE)
    result = solve(design)  # warm the property cache and the imports
    calls = {"n": 0}
    original = solve_plate

    def counted(*args, **kwargs):
        calls["n"] += 1
        return original(*args, **kwargs)

    for module in CALLERS:
        module.solve_plate = counted
    try:
        solve(design)
    finally:
        for module in CALLERS:
            module.solve_plate = original
    whole = statistics.median(_time(lambda: solve(design)) for _ in range(n))
    one = statistics.median(_time(lambda: solve_plate(design, result.V_dot)) for _ in range(5 * n))
    print(f"plate solves per supply-stage solve: {calls['n']}")
    print(f"one solve_plate: {one * 1e3:.1f} ms; whole solve with circuit and planning: {whole * 1e3:.0f} ms "
          f"= {whole / one:.0f} plate solves")


def _time(fn) -> float:
    t0 = time.perf_counter()
    fn()
    return time.perf_counter() - t0


if __name__ == "__main__":
    main()
