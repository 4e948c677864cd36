"""Speed and memory of the plate's field solve (coldplate.plate.field), and the choice of its linear solver.

Run:  python benchmarks/field.py [--repeat 5]

Cases: the review's channel case (tests/test_field.py: 20 copper channels 1 × 3 mm, 300 W over the whole face)
and the example channel plate (examples/reagent-block-channels.toml's plate and channels without plenums,
85 W on its 40 × 40 mm footprint, and a constant representative h: the timing does not depend on h).
For each: cells, unknowns, the default solve's median time (with its coarser grid for the uncertainty, and
without), the direct LU against ILU-preconditioned GMRES on the same system (factorisation, back-substitution,
Krylov iterations), and the coupling matrix of 8 sources against one right-hand side on the same system,
as ratios.  Peak memory: the process's peak resident set (resource) and numpy's peak (tracemalloc; SuperLU's
own allocations are not traced there).  Not a test: nothing here fails on time.
"""
from __future__ import annotations

import argparse
import resource
import sys
import time
import tracemalloc
from pathlib import Path


ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from benchmarks.module_solve import _median  # noqa: E402  (the benchmarks' shared median timer)
from coldplate.plate import field as F  # noqa: E402
from coldplate.plate.fieldgrid import GridRules, build_grid  # noqa: E402


def review_inputs():
    from tests.test_field import review_inputs as inputs  # the test's case, with its local entry coefficient

    return inputs()


def example_inputs(n_sources=1):
    plate = F.FieldPlate(0.080, 0.060, 0.003, 167.0)  # aluminium 6061, the project's table value
    cooling = F.ChannelCooling(count=12, width=0.002, depth=0.006, mass_flow=1.5e-3 / 60 * 999.1, cp=4188.0,
                               inlet=288.15, h=3000.0)
    if n_sources == 1:
        return plate, [F.FieldSource("footprint", 85.0, (0.040, 0.040), (0.040, 0.0))], cooling
    # eight 8 × 8 mm devices in two rows of four (a demo layout of our own)
    srcs = [F.FieldSource(f"d{i}", 10.0, (0.008, 0.008), (0.012 + 0.018 * (i % 4), -0.013 + 0.026 * (i // 4)))
            for i in range(n_sources)]
    return plate, srcs, cooling


def system_of(plate, sources, cooling, level=F.DEFAULT_LEVEL):
    channels = (cooling.count, cooling.width, cooling.depth, cooling.lid) if isinstance(cooling, F.ChannelCooling) \
        else None
    grid = build_grid(plate.length, plate.width, plate.base,
                      [(s.at[0], s.at[1], s.size[0], s.size[1]) for s in sources], channels, GridRules(), level)
    system = F._assemble(grid, plate.conductivity, cooling)
    B, _ = F._source_columns(grid, system, sources)
    return system.matrix, B


def solvers(M, B, repeat):
    from scipy.sparse.linalg import splu

    opts = dict(permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=F.DIAG_PIVOT, options=dict(SymmetricMode=True))
    t_fact = _median(lambda: splu(M, **opts), repeat)
    lu = splu(M, **opts)
    t_back1 = _median(lambda: lu.solve(B[:, :1]), repeat)
    t_backN = _median(lambda: lu.solve(B), repeat)
    # GMRES is timed once per case (it is slow here, see the module docstring); one right-hand side only
    t = time.perf_counter()
    _, it1 = F._linear_solve(M, B[:, :1], "gmres")
    t_gm1 = time.perf_counter() - t
    return dict(fact=t_fact, back1=t_back1, backN=t_backN, gm1=t_gm1, it1=it1,
                fill=lu.L.nnz + lu.U.nnz)


def report(name, plate, sources, cooling, repeat):
    r = F.solve_field(plate, sources, cooling)
    t_default = _median(lambda: F.solve_field(plate, sources, cooling), repeat)
    t_single = _median(lambda: F.solve_field(plate, sources, cooling, uncertainty=False), repeat)
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0  # before the solver comparison's ILU
    M, B = system_of(plate, sources, cooling)
    s = solvers(M, B, repeat)
    print(f"\n{name}")
    print(f"  process peak RSS after the default solves {rss:.0f} MB (cumulative over the cases so far)")
    print(f"  cells {r.cells}, unknowns {r.unknowns}, LU fill {s['fill']} ({s['fill'] / M.nnz:.1f} x the matrix)")
    print(f"  default solve (two grids, with uncertainty) {t_default * 1e3:7.1f} ms;"
          f" one grid {t_single * 1e3:7.1f} ms")
    print(f"  R = {r.thermal_resistance:.5f} K/W, grid uncertainty {r.grid_uncertainty:.4f} K"
          f" ({r.grid_uncertainty / (r.hottest - r.reference) * 100:.2f} % of the rise)")
    print(f"  LU: factorise {s['fact'] * 1e3:7.1f} ms, back-substitute {s['back1'] * 1e3:6.1f} ms;"
          f"  GMRES+ILU: {s['gm1'] * 1e3:7.1f} ms ({s['it1']} iterations);"
          f"  GMRES / LU = {s['gm1'] / (s['fact'] + s['back1']):.2f}")
    return s


def examples_table(repeat):
    """Every example through the design path (coldplate.plate.fieldcheck): cells, unknowns, the default solve's
    median time (two grids, with the uncertainty) and one grid's, the network's time, and the field against the
    network (R_th, hottest face)."""
    from coldplate.design.reader import load_design
    from coldplate.check import solve
    from coldplate.plate.fieldcheck import solve_plate_field
    from coldplate.plate.solve import solve_plate

    print("\nexamples through the design path (plate alone at the check's flow and load)")
    print(f"  {'example':34s} {'cells':>7s} {'default s':>9s} {'1 grid s':>8s} {'network s':>9s}"
          f" {'R field':>8s} {'R netw.':>8s} {'diff %':>7s} {'U K':>6s}")
    for path in sorted((ROOT / "examples").glob("*.toml")):
        d = load_design(path)
        here = solve(d, model="network")  # the check's flow and load (a circuit's flow, the modules' heat)
        flow, load = here.V_dot, here.load
        r = solve_plate_field(d, flow, load)
        n = solve_plate(d, flow, load)
        t_def = _median(lambda: solve_plate_field(d, flow, load), repeat)
        t_one = _median(lambda: solve_plate_field(d, flow, load, uncertainty=False), repeat)
        t_net = _median(lambda: solve_plate(d, flow, load), repeat)
        print(f"  {path.stem:34s} {r.field.cells:7d} {t_def:9.2f} {t_one:8.2f} {t_net:9.3f}"
              f" {r.R_th:8.4f} {n.R_th:8.4f} {(r.R_th / n.R_th - 1) * 100:+7.1f} {r.grid_uncertainty:6.3f}")


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--examples-only", action="store_true", help="only the examples through the design path")
    args = ap.parse_args()
    tracemalloc.start()
    examples_table(args.repeat)
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    print(f"  process peak RSS after the examples {rss:.0f} MB")
    if args.examples_only:
        return
    report("review channel case (20 copper channels, 300 W over the face)", *review_inputs(), args.repeat)
    report("example channel plate (12 aluminium channels, 85 W footprint)", *example_inputs(), args.repeat)
    plate, srcs, cooling = example_inputs(8)
    s = report("example channel plate, 8 sources", plate, srcs, cooling, args.repeat)
    one = s["fact"] + s["back1"]
    print(f"  coupling of 8 sources / one right-hand side, LU: {(s['fact'] + s['backN']) / one:.2f}"
          " (GMRES starts again for each right-hand side)")
    t8 = _median(lambda: F.solve_field(plate, srcs, cooling, uncertainty=False), args.repeat)
    print(f"  whole solve_field, 8 sources: {t8 * 1e3:.1f} ms")
    _, peak = tracemalloc.get_traced_memory()
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    print(f"\npeak memory: numpy/Python (tracemalloc) {peak / 2**20:.1f} MB; process peak RSS {rss:.1f} MB")


if __name__ == "__main__":
    main()
