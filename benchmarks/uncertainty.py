"""Speed of the uncertainty band: every example with 4000 samples (python benchmarks/uncertainty.py).

For each example: the plain check, then the band (``[uncertainty]`` as the file gives it, else the load ±10 %,
the inlet ±3 K and the correlations' scatter), with the path it takes.  Figures are seconds of wall time on this
machine and the band's ratio to one check; the issue's target is under 1 s a band (bar 2 s) through the
vectorised evaluator.  The repeated-check path (tubes, cavities, modules, a supply that sets the flow) runs its
default 200 samples and is reported, not held to that target.
"""
from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from coldplate.check import solve  # noqa: E402
from coldplate.design.reader import design_from_dict, load_data  # noqa: E402
from coldplate.uncertainty.propagate import propagate  # noqa: E402
from coldplate.uncertainty.reader import read_uncertainty  # noqa: E402


def main() -> None:
    for path in sorted((ROOT / "examples").glob("*.toml")):
        data = load_data(path)
        data.setdefault("uncertainty", {"heat.load": "±10 %", "coolant.inlet_temperature": "±3 K"})
        design = design_from_dict(data)
        spec = read_uncertainty(data, design)
        t0 = time.perf_counter()
        r = solve(design)
        t1 = time.perf_counter()
        band = propagate(design, r, spec, data)
        t2 = time.perf_counter()
        face = band.band("face")
        print(f"{path.stem:32s} {band.method:21s} {band.samples:5d} samples  check {t1 - t0:6.3f} s  band "
              f"{t2 - t1:6.3f} s  ({(t2 - t1) / (t1 - t0):6.1f} checks)  face p95 {face.high - 273.15:.2f} degC "
              f"± {face.high_error:.3f} K")


if __name__ == "__main__":
    main()
