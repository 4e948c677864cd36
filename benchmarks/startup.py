"""Cold-start time of the whole `coldplate check` command, with its parts as ratios.

Run:  python benchmarks/startup.py [--repeat 7] [--against DIR]

``--against DIR`` times the same `coldplate check` from another checkout (an earlier revision, made with
``git worktree add DIR REV``) in the same run, so a change's effect on start-up is a ratio of two figures
measured side by side.

Each measurement starts a new Python process, as a user does.  The figures are
reported as the median wall time and as ratios to a bare `python -c pass`, so the
numbers compare across machines.  Not a test: nothing here fails on time.
"""
from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "reagent-block-channels.toml"

CASES = {
    "python -c pass": [sys.executable, "-c", "pass"],
    "import numpy": [sys.executable, "-c", "import numpy"],
    "import pint + registry": [sys.executable, "-c", "import coldplate.design.units"],
    "import CoolProp": [sys.executable, "-c", "import CoolProp.CoolProp"],
    "import fluids.fittings": [sys.executable, "-c", "import fluids.fittings"],
    "numpy + pint + CoolProp": [sys.executable, "-c", "import numpy, pint, CoolProp.CoolProp"],
    "coldplate check (text)": [sys.executable, "-m", "coldplate.cli", "check", str(EXAMPLE)],
    "coldplate check (json)": [sys.executable, "-m", "coldplate.cli", "check", str(EXAMPLE), "--format", "json"],
}


def timed(cmd, cwd=ROOT) -> float:
    env = dict(os.environ, PYTHONPATH=str(cwd))
    t0 = time.perf_counter()
    subprocess.run(cmd, cwd=cwd, env=env, check=True, stdout=subprocess.DEVNULL)
    return time.perf_counter() - t0


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=7)
    ap.add_argument("--against", type=Path, help="another checkout whose `coldplate check` is timed beside this one")
    args = ap.parse_args()
    cases = {name: (cmd, ROOT) for name, cmd in CASES.items()}
    if args.against:
        cases["check, other checkout"] = ([sys.executable, "-m", "coldplate.cli", "check", str(EXAMPLE)],
                                          args.against.resolve())
    for cmd, cwd in cases.values():  # warm the file cache and pint's definition cache once
        timed(cmd, cwd)
    # Interleaved rounds, so a slow spell of a shared machine falls on every case alike.
    runs = {name: [] for name in cases}
    for _ in range(args.repeat):
        for name, (cmd, cwd) in cases.items():
            runs[name].append(timed(cmd, cwd))
    medians = {name: statistics.median(times) for name, times in runs.items()}
    base = medians["python -c pass"]
    print(f"{'case':<26} {'median s':>9} {'x bare python':>14}")
    for name, t in medians.items():
        print(f"{name:<26} {t:9.3f} {t / base:14.1f}")
    libs = medians["import pint + registry"] + medians["import CoolProp"] - medians["import numpy"] - base
    check = medians["coldplate check (text)"]
    print(f"\nthird-party imports (numpy, pint + registry, CoolProp) ≈ {libs:.3f} s = "
          f"{libs / check:.0%} of the whole command")
    print(f"coldplate check / (python -c 'import numpy, pint, CoolProp.CoolProp') = "
          f"{check / medians['numpy + pint + CoolProp']:.2f}")
    if args.against:
        other = medians["check, other checkout"]
        print(f"coldplate check here / in {args.against} = {check / other:.3f} "
              f"(other: {other / medians['numpy + pint + CoolProp']:.2f} x the imports)")
    _in_process()


def _in_process() -> None:
    """Import once, then time the solve alone: the first call and the median of repeated calls."""
    code = (
        "import time, statistics\n"
        "from coldplate.check import check_file\n"
        f"p = {str(EXAMPLE)!r}\n"
        "t = time.perf_counter(); check_file(p); first = time.perf_counter() - t\n"
        "runs = []\n"
        "for _ in range(20):\n"
        "    t = time.perf_counter(); check_file(p); runs.append(time.perf_counter() - t)\n"
        "print(f'{first:.4f} {statistics.median(runs):.4f}')\n"
    )
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, check=True, capture_output=True, text=True)
    first, again = map(float, out.stdout.split())
    print(f"solve in process: first call {first * 1e3:.1f} ms, repeated {again * 1e3:.1f} ms "
          f"(property cache warm)")


if __name__ == "__main__":
    main()
