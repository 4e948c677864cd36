"""Speed of the sizing search, measured in one run against the one-design path.

Run:  python benchmarks/sizing.py [--candidates 1000000] [--repeat 3]

Reports, for a channel plate (the bundled reagent-block example's plate):

* the one-design path: solve_plate per design (median over a few designs);
* the vectorised evaluator on a structured grid (geometry x base x flow), cold (property and spreading tables
  built in the timed call) and warm, in candidates per second and as a ratio to solve_plate;
* the evaluator with every candidate a different geometry (one base, one flow: the least structure);
* a whole search of about 1e6 candidates including the limit counts and the Pareto filter (run_search);
* the flow split alone (Evaluator.splits) on the laser-mount sizing example's flow axis (59 flows) for
  ``--split-geometries`` of its geometries: solved at the nodes (the search's way) against at every flow, as a
  ratio, and the largest share taken below the exact one and drop above it.

Not a test: nothing here fails on time.  Figures are medians of --repeat runs in one process.
"""
from __future__ import annotations

import argparse
import dataclasses
import statistics
import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from coldplate.design.reader import load_data, design_from_dict  # noqa: E402
from coldplate.sizing.evaluate import Evaluator  # noqa: E402
from coldplate.sizing.run import run_search  # noqa: E402
from coldplate.sizing.search import read_search  # noqa: E402
from coldplate.plate.solve import solve_plate  # noqa: E402

EXAMPLE = ROOT / "examples" / "reagent-block-channels.toml"
SPLIT_EXAMPLE = ROOT / "examples" / "laser-mount-sizing.toml"


def _grid(n_target: int):
    """count x width x depth geometries that fit, 5 bases, enough flows for about n_target candidates."""
    counts = np.arange(4, 41)
    widths = np.linspace(0.6e-3, 3e-3, 13)
    depths = np.linspace(2e-3, 8e-3, 13)
    n, w, d = (a.ravel() for a in np.meshgrid(counts, widths, depths, indexing="ij"))
    ok = (0.06 - n * w) / (n + 1) > 0
    n, w, d = n[ok], w[ok], d[ok]
    base = np.linspace(2e-3, 6e-3, 5)
    nq = max(1, round(n_target / (n.size * base.size)))
    flow = np.linspace(0.1, 4.0, nq) / 6e4
    return n, w, d, base, flow


def _timed(fn, repeat):
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--candidates", type=int, default=1_000_000)
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--split-geometries", type=int, default=200)
    ap.add_argument("--split-only", action="store_true", help="only the flow split's measurement")
    args = ap.parse_args()
    _split_benchmark(args.split_geometries)
    if args.split_only:
        return
    data = load_data(EXAMPLE)
    design = design_from_dict(data)

    # one-design path
    rng = np.random.default_rng(1)
    singles = []
    for _ in range(12):
        p = dataclasses.replace(design.passage, count=int(rng.integers(6, 20)), width=float(rng.uniform(1e-3, 2e-3)))
        singles.append(dataclasses.replace(design, passage=p))
    flows = rng.uniform(0.5, 3.0, len(singles)) / 6e4
    solve_plate(design)  # warm imports and caches
    per_design = statistics.median(_timed(lambda d=d, q=q: solve_plate(d, flow=q), 3) for d, q in zip(singles, flows))
    rate_one = 1.0 / per_design

    n, w, d, base, flow = _grid(args.candidates)
    size = n.size * base.size * flow.size
    cold = _timed(lambda: Evaluator(design).channels(n, w, d, base, flow), args.repeat)
    ev = Evaluator(design)
    ev.channels(n, w, d, base, flow)
    warm = _timed(lambda: ev.channels(n, w, d, base, flow), args.repeat)
    flat_n = 200_000
    fi = rng.integers(0, n.size, flat_n)
    fw = w[fi] * rng.uniform(0.9, 1.0, flat_n)  # every candidate its own geometry
    flat = _timed(lambda: ev.channels(n[fi], fw, d[fi], base[:1], flow[len(flow) // 2:len(flow) // 2 + 1]),
                  args.repeat)

    data = dict(data)
    data["search"] = {"count": {"from": 4, "to": 40}, "width": {"from": "0.6 mm", "to": "3 mm", "steps": 13},
                      "depth": {"from": "2 mm", "to": "8 mm", "steps": 13},
                      "base": {"from": "2 mm", "to": "6 mm", "steps": 5},
                      "flow": {"from": "0.1 L/min", "to": "4 L/min", "steps": int(flow.size)},
                      "face_limit": "30 degC", "pressure_drop_limit": "30 kPa", "min_width": "0.8 mm",
                      "min_wall": "0.6 mm"}
    spec = read_search(data, design)
    outcomes = []

    def search():
        outcomes.append(run_search(spec, design))  # a fresh Evaluator: tables built inside, as in `coldplate size`

    whole = _timed(search, args.repeat)
    o = outcomes[-1]

    print(f"channel plate: {EXAMPLE.name}; numpy {np.__version__}; python {sys.version.split()[0]}")
    print(f"{'path':<52} {'seconds':>9} {'candidates/s':>14} {'x one-design':>13}")
    print(f"{'solve_plate, one design (median)':<52} {per_design:9.4f} {rate_one:14,.0f} {1:13.0f}")
    for label, t, k in ((f"evaluator, grid of {size:,}, cold (tables built)", cold, size),
                        (f"evaluator, grid of {size:,}, warm", warm, size),
                        (f"evaluator, {flat_n:,} different geometries", flat, flat_n)):
        print(f"{label:<52} {t:9.3f} {k / t:14,.0f} {k / t / rate_one:13,.0f}")
    label = f"search of {o.candidates:,} incl. limits and Pareto"
    print(f"{label:<52} {whole:9.3f} {o.candidates / whole:14,.0f} {o.candidates / whole / rate_one:13,.0f}")
    print(f"\nsearch: {o.feasible:,} feasible, {len(o.pareto)} on the front; "
          f"spreading series evaluated {ev.plate.series_evaluations} times for the warm evaluator's tables")


def _split_benchmark(n_geometries: int) -> None:
    from coldplate.sizing import evaluate
    data = load_data(SPLIT_EXAMPLE)
    design = design_from_dict(data)
    spec = read_search(data, design)
    ev = Evaluator(design)
    flow = spec.axes["flow"]
    rng = np.random.default_rng(2)
    n_all, w_all, d_all = (np.ravel(a) for a in np.meshgrid(spec.axes["count"], spec.axes["width"],
                                                            spec.axes["depth"], indexing="ij"))
    fits = (design.plate.width - n_all * w_all) / (n_all + 1) > 0.6e-3
    pick = rng.choice(np.flatnonzero(fits), min(n_geometries, int(fits.sum())), replace=False)
    n, w, d = n_all[pick], w_all[pick], d_all[pick]
    st = ev.coolant(flow.reshape(1, 1, -1))
    t0 = time.perf_counter()
    share, drop = ev.splits(n, w, d, st)
    t_nodes = time.perf_counter() - t0
    exact_flows, evaluate.SPLIT_EXACT_FLOWS = evaluate.SPLIT_EXACT_FLOWS, 10**9
    try:
        t0 = time.perf_counter()
        share_x, drop_x = ev.splits(n, w, d, st)
        t_exact = time.perf_counter() - t0
    finally:
        evaluate.SPLIT_EXACT_FLOWS = exact_flows
    nodes = evaluate.split_nodes(flow, np.asarray(st.ok).ravel())
    print(f"flow split, {n.size} geometries of {SPLIT_EXAMPLE.name} x {flow.size} flows "
          f"({nodes.size} nodes): every flow {t_exact:.2f} s, nodes {t_nodes:.2f} s, ratio {t_exact / t_nodes:.1f}")
    print(f"  share below exact: max {np.nanmax(share_x - share):.4f}, never above: "
          f"{np.nanmax(share - share_x):.2e}; drop above exact: max {np.nanmax(drop / drop_x) - 1:.1%}, "
          f"least {np.nanmin(drop / drop_x) - 1:.2e}")


if __name__ == "__main__":
    main()
