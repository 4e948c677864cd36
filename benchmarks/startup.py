"""Cold-start time of the whole `coldplate check` command, with its parts as ratios.

Run:  python benchmarks/startup.py [--repeat 7]

Each measurement starts a new Python process, as a user does.  The figures are
reported as the median wall time and as ratios to a bare `python -c pass`, so the
numbers compare across machines.  Not a test: nothing here fails on time.
"""
from __future__ import annotations

import argparse
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
    "import pint + registry": [sys.executable, "-c", "import coldplate.units"],
    "import CoolProp": [sys.executable, "-c", "import CoolProp.CoolProp"],
    "import fluids.fittings": [sys.executable, "-c", "import fluids.fittings"],
    "coldplate check (text)": [sys.executable, "-m", "coldplate.cli", "check", str(EXAMPLE)],
    "coldplate check (json)": [sys.executable, "-m", "coldplate.cli", "check", str(EXAMPLE), "--format", "json"],
}


def timed(cmd) -> float:
    t0 = time.perf_counter()
    subprocess.run(cmd, cwd=ROOT, check=True, stdout=subprocess.DEVNULL)
    return time.perf_counter() - t0


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=7)
    args = ap.parse_args()
    for cmd in CASES.values():  # warm the file cache and pint's definition cache once
        timed(cmd)
    medians = {name: statistics.median(timed(cmd) for _ in range(args.repeat)) for name, cmd in CASES.items()}
    base = medians["python -c pass"]
    print(f"{'case':<26} {'median s':>9} {'x bare python':>14}")
    for name, t in medians.items():
        print(f"{name:<26} {t:9.3f} {t / base:14.1f}")


if __name__ == "__main__":
    main()
