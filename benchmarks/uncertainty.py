"""Speed of the uncertainty band: every example with 4000 samples (python benchmarks/uncertainty.py).

For each example: the plain check, then the band (``[uncertainty]`` as the file gives it, else the load ±10 %,
the inlet ±3 K and the correlations' scatter), with the path it takes.  Figures are seconds of wall time on this
machine and the band's ratio to one check; the issue's target is under 1 s a band (bar 2 s) with 4000 samples.
Every example takes the vectorised evaluator (channels, tubes, cavities; several sources; modules; a supply that
sets the flow); the repeated-check path (a varied tube size) runs its default 200 samples (64 with
a circuit or modules) and would be reported, not held to that target.  The last column counts the evaluations
of all rows at once (``evaluate_*_rows`` calls: one for a plate at a given flow, a few for modules, a supply's
root or Sieder-Tate's wall iteration).
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


EVALUATIONS = [0]  #: plate evaluations of all rows in the last band


def _count_evaluations() -> None:
    """Count the rows' plate evaluations (each of all the rows it is handed: ``evaluate_*_rows``) without
    changing what they compute."""
    from coldplate.uncertainty import propagate

    def counting(fn):
        def counted(*args, **kwargs):
            EVALUATIONS[0] += 1
            return fn(*args, **kwargs)
        return counted

    for name in ("evaluate_channel_rows", "evaluate_tube_rows", "evaluate_cavity_rows"):
        setattr(propagate, name, counting(getattr(propagate, name)))


def main() -> None:
    _count_evaluations()
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
              f"{t2 - t1:6.3f} s  ({(t2 - t1) / (t1 - t0):6.2f} checks)  face p95 {face.high - 273.15:.2f} degC "
              f"± {face.high_error:.3f} K  {EVALUATIONS[0]:3d} evaluations")
        EVALUATIONS[0] = 0


if __name__ == "__main__":
    main()
