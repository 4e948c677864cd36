"""Speed and memory of the plate's field solve (coldplate.plate.field), and the choice of its linear solver
(coldplate.plate.fieldsolver).

Run:  python benchmarks/field.py [--repeat 5] [--examples-only | --coupling-only] [--ilu] [--against-lu]

Cases: the review's channel case (tests/test_field.py: 20 copper channels 1 × 3 mm, 300 W over the whole face),
the example channel plate (examples/reagent-block-channels.toml's plate and channels without plenums, 85 W on
its 40 × 40 mm footprint, and a constant representative h: the timing does not depend on h), the same plate
with 8 sources, and the three-source example (examples/three-sources-channels.toml through the design path,
its flow split and local coefficients, as the check solves it).  For each: cells, unknowns, the linear solver
the default picks and its Krylov iterations, the default solve's median time (with its coarser grid for the
uncertainty, and one grid alone), the peak resident memory of a fresh process doing that one default solve,
and the linear solvers side by side on the default grid's system: SuperLU (factorise, back-substitute every
source), AMG-preconditioned GMRES (setup, the loads alone, the loads and every source as the field solves them)
and, with ``--ilu`` (slow), ILU-preconditioned GMRES at the loads.  Last, the coupling matrix's price (the
issue's bar, under twice one solve for 8 sources): the default field solve with the coupling against the same
solve at the loads alone (``solve_field(..., coupling=False)``), interleaved, for the 8-source case and the
three-source example.  Times are medians of wall time: on this shared 2-core machine they move with the
other core's load, so compare figures of one run (CPU time is no steadier a clock here: the LU's back-substitution
of several columns goes through OpenBLAS, whose threads spin on the busy core and count as CPU time several times
over).  Not a test: nothing here fails on time.
"""
from __future__ import annotations

import argparse
import resource
import statistics
import subprocess
import sys
import time
from pathlib import Path


ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

import numpy as np  # noqa: E402

from coldplate.plate import field as F  # noqa: E402
from benchmarks.module_solve import _median  # noqa: E402  (the benchmarks' shared median timer)
from coldplate.plate import fieldsolver as S  # noqa: E402
from coldplate.plate.fieldgrid import GridRules, build_grid  # noqa: E402

THREE_SOURCES = ROOT / "examples" / "three-sources-channels.toml"


def _high_water_mb():
    """This process's peak resident memory [MB]: VmHWM of /proc/self/status, which starts afresh at exec (the
    resource module's ru_maxrss carries the parent's peak over a fork), else ru_maxrss."""
    try:
        for line in Path("/proc/self/status").read_text().splitlines():
            if line.startswith("VmHWM:"):
                return float(line.split()[1]) / 1024.0
    except OSError:
        pass
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


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


def design_inputs(path=THREE_SOURCES):
    """The field inputs of a design file as the check builds them (coldplate.plate.fieldcheck), at the check's
    flow and load."""
    from coldplate.check import solve
    from coldplate.design.reader import load_design
    from coldplate.plate import fieldcheck as FC
    from coldplate.plate.solve import operating_point

    d = load_design(path)
    here = solve(d, model="network")
    op = operating_point(d, here.V_dot, here.load)
    flows = op.result_fields()["channel_flows"] if op.split is not None else None
    cooling, _, _ = FC.COOLINGS[d.passage.kind](d, op, flows)
    plate = F.FieldPlate(d.plate.length, d.plate.width, d.plate.base, d.plate.conductivity)
    return plate, list(FC.field_sources(d, here.load)), cooling


CASES = {
    "review": ("review channel case (20 copper channels, 300 W over the face)", review_inputs),
    "example": ("example channel plate (12 aluminium channels, 85 W footprint)", example_inputs),
    "example8": ("example channel plate, 8 sources", lambda: example_inputs(8)),
    "three": ("three-source example (examples/three-sources-channels.toml, the check's solve)", design_inputs),
}


def system_of(plate, sources, cooling, level=F.DEFAULT_LEVEL):
    channels, span, lanes = None, None, ()
    if isinstance(cooling, F.ChannelCooling):
        channels, span = (cooling.count, cooling.width, cooling.depth, cooling.lid), cooling.span
    elif isinstance(cooling, F.LaneCooling):
        lanes = cooling.lanes
    grid = build_grid(plate.length, plate.width, plate.base,
                      [(s.at[0], s.at[1], s.size[0], s.size[1]) for s in sources], channels, GridRules(), level,
                      channel_span=span, lanes=lanes)
    system = F._assemble(grid, plate.conductivity, cooling)
    B, _ = F._source_columns(grid, system, sources)
    return system.matrix, B


def peak_rss(case):
    """Peak resident memory [MB] of a fresh process that builds ``case`` and runs one default solve, and of the
    same process before the solve (its imports and inputs)."""
    out = subprocess.run([sys.executable, __file__, "--rss-of", case], capture_output=True, text=True, check=True)
    before, after = map(float, out.stdout.split())
    return before, after


def _rss_of(case):
    inputs = CASES[case][1]()
    import scipy.sparse.linalg  # noqa: F401  (loaded before the "before" figure, as by the solve)
    import pyamg  # noqa: F401

    before = _high_water_mb()
    F.solve_field(*inputs)
    print(before, _high_water_mb())


def solvers(M, B, loads, repeat, ilu):
    """The linear solvers on one system: wall seconds and sizes.  "1" is one right-hand side (the field at the
    loads alone); "N" the field at the loads and every source's own (the coupling), as the field solves them:
    the LU back-substitutes every source, the AMG solves every source to COUPLING_RTOL and the loads to
    AMG_RTOL (fieldsolver.solve_loads, here without the level below's starting fields)."""
    from scipy.sparse import csc_matrix, csr_matrix
    from scipy.sparse.linalg import splu
    from pyamg import ruge_stuben_solver

    C = csc_matrix(M)
    b = B @ loads
    opts = dict(permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=S.DIAG_PIVOT, options=dict(SymmetricMode=True))
    out = dict(fact=_median(lambda: splu(C, **opts), repeat))
    lu = splu(C, **opts)
    out["fill"] = lu.L.nnz + lu.U.nnz
    out["back1"] = _median(lambda: lu.solve(b), repeat)
    out["backN"] = _median(lambda: lu.solve(B), repeat)
    del lu
    A = csr_matrix(M)
    out["setup"] = _median(lambda: ruge_stuben_solver(A, **S.AMG_OPTIONS), repeat)
    ml = ruge_stuben_solver(A, **S.AMG_OPTIONS)
    out["complexity"] = ml.operator_complexity()
    cycle = S._v_cycle(ml)
    out["amg1"] = _median(lambda: S._gmres(A, b.copy(), cycle), repeat)
    out["amg1_its"] = S._gmres(A, b.copy(), cycle)[1]
    out["amgN"] = _median(lambda: S.amg_loads(M, B, loads), repeat) - out["setup"]  # amg_loads sets up its own
    out["amg_its"] = S.amg_loads(M, B, loads)[2]
    out["amgN_tight"] = _median(lambda: [S._gmres(A, B[:, m].copy(), cycle) for m in range(B.shape[1])], repeat)
    if ilu:
        t = time.perf_counter()
        _, it1 = S.ilu_gmres(M, b[:, None])
        out["ilu1"], out["ilu_its"] = time.perf_counter() - t, it1
    return out


def coupling_price(plate, sources, cooling, repeat):
    """The issue's bar: the default field solve with the coupling matrix against the same solve at the loads
    alone (``coupling=False``: one right-hand side on each level), medians of interleaved runs (a drifting
    machine moves both alike).  Returns (with, without, iterations with, iterations without)."""
    times = {True: [], False: []}
    its = {}
    for _ in range(repeat):
        for flag in (True, False):
            t = time.perf_counter()
            r = F.solve_field(plate, sources, cooling, coupling=flag)
            times[flag].append(time.perf_counter() - t)
            its[flag] = r.iterations
    return statistics.median(times[True]), statistics.median(times[False]), its[True], its[False]


def report(case, repeat, ilu):
    name, make = CASES[case]
    plate, sources, cooling = make()
    r = F.solve_field(plate, sources, cooling)
    t_default = _median(lambda: F.solve_field(plate, sources, cooling), repeat)
    t_single = _median(lambda: F.solve_field(plate, sources, cooling, uncertainty=False), repeat)
    rss_before, rss_after = peak_rss(case)
    M, B = system_of(plate, sources, cooling)
    loads = np.array([src.load for src in sources], float)
    s = solvers(M, B, loads, repeat, ilu)
    n = B.shape[1]
    print(f"\n{name}")
    print(f"  cells {r.cells}, unknowns {r.unknowns}, sources {n}; default solver {r.method}"
          f" ({r.iterations} Krylov iterations on the default grid)")
    print(f"  default solve (two grids, with uncertainty) {t_default * 1e3:7.1f} ms; one grid {t_single * 1e3:7.1f} ms;"
          f" peak RSS of a fresh process {rss_after:.0f} MB ({rss_before:.0f} MB before the solve)")
    print(f"  R = {r.thermal_resistance:.5f} K/W, grid uncertainty {r.grid_uncertainty:.4f} K"
          f" ({r.grid_uncertainty / (r.hottest - r.reference) * 100:.2f} % of the rise)")
    print(f"  LU : factorise {s['fact'] * 1e3:7.1f} ms, back-substitute the loads {s['back1'] * 1e3:6.1f} ms, every"
          f" source {s['backN'] * 1e3:6.1f} ms; fill {s['fill']} ({s['fill'] / M.nnz:.1f} x the matrix,"
          f" about {s['fill'] * 12 / 2**20:.0f} MB)")
    print(f"  AMG: setup {s['setup'] * 1e3:7.1f} ms (operator complexity {s['complexity']:.2f}), GMRES at the loads"
          f" {s['amg1'] * 1e3:6.1f} ms ({s['amg1_its']} iterations); the loads and every source"
          f" {s['amgN'] * 1e3:6.1f} ms ({s['amg_its']} iterations; every source to AMG_RTOL would take"
          f" {s['amgN_tight'] * 1e3:6.1f} ms)")
    lu_all, amg_all = s["fact"] + s["backN"], s["setup"] + s["amgN"]
    print(f"  every source: LU {lu_all * 1e3:7.1f} ms, AMG {amg_all * 1e3:7.1f} ms; AMG / LU = {amg_all / lu_all:.2f}")
    if ilu:
        print(f"  GMRES+ILU, the loads: {s['ilu1'] * 1e3:7.1f} ms ({s['ilu_its']} iterations);"
              f" / LU with one back-substitution = {s['ilu1'] / (s['fact'] + s['back1']):.2f}")
    return s


def examples_table(repeat, against_lu=False):
    """Every example through the design path (coldplate.plate.fieldcheck): cells, the solver and its iterations,
    the default solve's median time (two grids, with the uncertainty) and one grid's, the network's time, and the
    field against the network (R_th, hottest face); with ``against_lu`` also the largest difference of any
    source's hottest and mean face from the same solve on SuperLU's LU."""
    from coldplate.check import solve
    from coldplate.design.reader import load_design
    from coldplate.plate.fieldcheck import solve_plate_field
    from coldplate.plate.solve import solve_plate

    print("\nexamples through the design path (plate alone at the check's flow and load; wall seconds)")
    print(f"  {'example':34s} {'cells':>7s} {'solver':>6s} {'its':>4s} {'default s':>9s} {'1 grid s':>8s}"
          f" {'network s':>9s} {'R field':>8s} {'R netw.':>8s} {'diff %':>7s} {'U K':>6s}"
          + (f" {'vs LU K':>8s}" if against_lu else ""))
    for path in sorted((ROOT / "examples").glob("*.toml")):
        d = load_design(path)
        here = solve(d, model="network")  # the check's flow and load (a circuit's flow, the modules' heat)
        flow, load = here.V_dot, here.load
        r = solve_plate_field(d, flow, load)
        n = solve_plate(d, flow, load)
        t_def = _median(lambda: solve_plate_field(d, flow, load), repeat)
        t_one = _median(lambda: solve_plate_field(d, flow, load, uncertainty=False), repeat)
        t_net = _median(lambda: solve_plate(d, flow, load), repeat)
        extra = ""
        if against_lu:
            direct_up_to, S.DIRECT_UP_TO = S.DIRECT_UP_TO, 10**9
            try:
                lu = solve_plate_field(d, flow, load)
            finally:
                S.DIRECT_UP_TO = direct_up_to
            diff = max(max(abs(a.face_max - b.face_max), abs(a.face_mean - b.face_mean))
                       for a, b in zip(r.field.sources, lu.field.sources))
            extra = f" {diff:8.1e}"
        print(f"  {path.stem:34s} {r.field.cells:7d} {r.field.method:>6s} {r.field.iterations:4d} {t_def:9.2f}"
              f" {t_one:8.2f} {t_net:9.3f} {r.R_th:8.4f} {n.R_th:8.4f} {(r.R_th / n.R_th - 1) * 100:+7.1f}"
              f" {r.grid_uncertainty:6.3f}" + extra)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--examples-only", action="store_true", help="only the examples through the design path")
    ap.add_argument("--ilu", action="store_true", help="also ILU-preconditioned GMRES (slow: tens of seconds)")
    ap.add_argument("--against-lu", action="store_true",
                    help="the examples' source faces against the same solves on the LU (the largest difference)")
    ap.add_argument("--coupling-only", action="store_true",
                    help="only the coupling's price (with against without, interleaved) and peak memory")
    ap.add_argument("--rss-of", choices=sorted(CASES), help=argparse.SUPPRESS)
    args = ap.parse_args()
    if args.rss_of:
        _rss_of(args.rss_of)
        return
    if args.coupling_only:
        coupling_table(args.repeat)
        return
    examples_table(args.repeat, args.against_lu)
    if args.examples_only:
        return
    for case in ("review", "example", "three"):
        report(case, args.repeat, args.ilu)
    s = report("example8", args.repeat, args.ilu)
    print(f"  every source / the loads alone, linear solver only: LU"
          f" {(s['fact'] + s['backN']) / (s['fact'] + s['back1']):.2f},"
          f" AMG {(s['setup'] + s['amgN']) / (s['setup'] + s['amg1']):.2f}")
    coupling_table(args.repeat)


def coupling_table(repeat):
    for case in ("example8", "three"):
        plate, sources, cooling = CASES[case][1]()
        w, wo, its_w, its_wo = coupling_price(plate, sources, cooling, max(repeat, 7))
        r = F.solve_field(plate, sources, cooling)
        print(f"  {case}: {r.cells} cells, {r.unknowns} unknowns, {len(sources)} sources; the default solve with the"
              f" coupling {w:.3f} s ({its_w} iterations on the default grid), without {wo:.3f} s ({its_wo}):"
              f" ratio {w / wo:.2f} (the bar: under 2 for 8 sources); peak RSS of a fresh process"
              f" {peak_rss(case)[1]:.0f} MB")


if __name__ == "__main__":
    main()
