"""Running a search: every combination of the ``[search]`` axes, in chunks, limits checked, Pareto set kept.

The candidates are the outer product geometry × base × flow.  Geometries (channel count × width × depth, or
tube bore × passes) that cannot be built at all (no wall left between channels; passes wider than the
plate; a return bend tighter than the tube) are dropped before the search and counted.  Chunks of
geometries are evaluated with :class:`~coldplate.sizing.evaluate.Evaluator`; after each chunk the limits are
checked, counts are kept of which limit each candidate fails (so an empty result can say which limit
binds), and the non-dominated set of (thermal resistance, pressure drop, flow) is updated.  A
KeyboardInterrupt between chunks stops the search and keeps what was found.
"""
from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np

from hydraulics.validity import at_least, at_most

from coldplate.design.reader import Design
from coldplate.sizing.evaluate import Evaluation, Evaluator
from coldplate.sizing.headers import Evaluators, variants, with_header
from coldplate.sizing.pareto import pareto_mask
from coldplate.sizing.search import SearchSpec

#: Candidates per chunk (about): big enough for numpy, small enough for the cache and a lively progress bar.
CHUNK = 1 << 17


@dataclass(frozen=True)
class Candidate:
    """One evaluated candidate (SI, kelvin)."""

    values: tuple[tuple[str, float], ...]  #: the free variables, in the [search] order
    R_th: float
    dp: float
    flow: float
    T_face: float
    T_out: float
    velocity: float
    Re: float

    def value(self, name: str) -> float:
        return dict(self.values)[name]


@dataclass(frozen=True)
class LimitCount:
    """How one limit shaped the search."""

    name: str  #: the [search] (or implied) limit's name, e.g. "face_limit", "boiling"
    limit: float | None  #: its value (SI), None for "boiling"
    failed: int  #: candidates that fail it
    only: int  #: candidates that fail it and nothing else (relaxing it alone would admit them)
    nearest: float | None  #: among those, the value closest to the limit (SI)


@dataclass(frozen=True)
class SearchOutcome:
    spec: SearchSpec
    candidates: int  #: every combination of the axes that can be built
    unbuildable: int  #: combinations dropped before the search (do not fit the plate)
    evaluated: int
    feasible: int
    pareto: tuple[Candidate, ...]  #: the non-dominated feasible candidates, by ascending flow
    best: Candidate | None  #: least flow, then lowest R_th, then lowest dp (None when nothing is feasible)
    limits: tuple[LimitCount, ...]
    interrupted: bool
    seconds: float


class _Geometries:
    """The buildable geometries of the search as aligned 1-D arrays."""

    def __init__(self, spec: SearchSpec, design: Design):
        ax = spec.axes
        plate = design.plate
        if spec.kind == "channels":
            n, w, d = (a.ravel() for a in np.meshgrid(ax["count"], ax["width"], ax["depth"], indexing="ij"))
            wall = (plate.width - n * w) / (n + 1)
            ok = wall > 0
            self.names = ("count", "width", "depth")
            self.cols = (n[ok], w[ok], d[ok])
            self.wall, self.height = wall[ok], d[ok]  # height: what stands on the base (stock thickness)
        else:
            di, p = (a.ravel() for a in np.meshgrid(ax["inner_diameter"], ax["passes"], indexing="ij"))
            tw = 0.5 * (design.passage.outer_diameter - design.passage.inner_diameter)
            do, rb = di + 2 * tw, design.passage.bend_radius or 0.0  # None: one pass, not searched
            ok = ((p - 1) * 2 * rb + do <= plate.width) & ((p == 1) | (2 * rb >= do))
            self.names = ("inner_diameter", "passes")
            self.cols = (di[ok], p[ok])
            self.wall, self.height = None, 0.5 * do[ok]  # the half-round groove holds half the tube
        self.size = int(ok.sum())
        self.dropped = int(ok.size - self.size)


def run_search(spec: SearchSpec, design: Design, evaluator: Evaluator | Evaluators | None = None, progress=None,
               chunk: int | None = None) -> SearchOutcome:
    """Evaluate every candidate of ``spec`` and keep the feasible Pareto set.

    ``progress(done, total)`` is called after each chunk.  Ctrl-C (KeyboardInterrupt) between or within a
    chunk stops the search; the outcome then holds what the finished chunks found (``interrupted`` True).
    Where ``[search]`` lists header variables (plenum depth, port positions: :mod:`coldplate.sizing.headers`),
    each variant is searched with its own evaluator (``evaluator`` may be an :class:`Evaluators` that holds
    them) and the fronts are merged into one.
    """
    t0 = time.perf_counter()
    evs = evaluator if isinstance(evaluator, Evaluators) else Evaluators(design, evaluator)
    todo = variants(spec)
    if todo == [{}]:
        return _run_one(spec, design, evs.for_values({}), progress, chunk, {}, t0)
    per = _Geometries(spec, design).size * spec.axes["base"].size * spec.axes["flow"].size
    outcomes = []
    for i, v in enumerate(todo):
        step = None if progress is None else (lambda done, total, i=i: progress(i * per + done, len(todo) * per))
        outcomes.append(_run_one(spec, with_header(design, v), evs.for_values(v), step, chunk, v, t0))
        if outcomes[-1].interrupted:
            break
    return _merged(spec, outcomes, len(todo) * per, t0)


def _merged(spec: SearchSpec, outcomes, total: int, t0: float) -> SearchOutcome:
    """One outcome from the header variants' outcomes: counts added, one front over all of them."""
    every = [c for o in outcomes for c in o.pareto]
    keep = pareto_mask(np.array([[c.R_th, c.dp, c.flow] for c in every]).reshape(-1, 3)) if every else []
    pareto = tuple(sorted((c for c, k in zip(every, keep) if k), key=lambda c: (c.flow, c.R_th, c.dp)))
    senses = {name: sense for name, _, sense in _limit_list(spec.limits)}
    limits = []
    for parts in zip(*(o.limits for o in outcomes)):
        near = [p.nearest for p in parts if p.nearest is not None]
        pick = min if senses[parts[0].name] == "max" else max
        limits.append(LimitCount(parts[0].name, parts[0].limit, sum(p.failed for p in parts),
                                 sum(p.only for p in parts), pick(near) if near else None))
    return SearchOutcome(spec=spec, candidates=total, unbuildable=sum(o.unbuildable for o in outcomes),
                         evaluated=sum(o.evaluated for o in outcomes), feasible=sum(o.feasible for o in outcomes),
                         pareto=pareto, best=pareto[0] if pareto else None, limits=tuple(limits),
                         interrupted=any(o.interrupted for o in outcomes), seconds=time.perf_counter() - t0)


def _run_one(spec: SearchSpec, design: Design, ev: Evaluator, progress, chunk, fixed: dict,
             t0: float) -> SearchOutcome:
    """The search of one header variant (``fixed``: its header values, put into every candidate's values)."""
    geo = _Geometries(spec, design)
    base, flow = spec.axes["base"], spec.axes["flow"]
    per_geometry = base.size * flow.size
    total = geo.size * per_geometry
    chunk = chunk or CHUNK
    step = max(1, chunk // per_geometry)
    q_step = flow.size if per_geometry <= chunk else max(1, chunk // base.size)  # long flow lists: split them too
    lim = spec.limits
    hours = design.supply.hours_per_day
    checks = _limit_list(lim)
    failed = {name: 0 for name, *_ in checks}
    only = dict(failed)
    nearest: dict[str, float | None] = {name: None for name, *_ in checks}
    front_F = np.empty((0, 3))
    front_idx = np.empty((0, 3), dtype=np.int64)
    front_x = np.empty((0, 4))
    done = feasible_count = 0
    interrupted = False
    try:
        for g0, q0 in ((g, q) for g in range(0, geo.size, step) for q in range(0, flow.size, q_step)):
            sl = slice(g0, min(g0 + step, geo.size))
            cols = [c[sl] for c in geo.cols]
            fl = flow[q0:q0 + q_step]
            e = ev.channels(*cols, base, fl) if spec.kind == "channels" else ev.tubes(*cols, base, fl)
            stats, F, idx, extra = _chunk(e, _quantities(e, geo, sl, base, fl, hours), checks, g0, q0)
            feasible_here = stats.pop("feasible")
            if F.size:
                F = np.concatenate([front_F, F])
                idx = np.concatenate([front_idx, idx])
                extra = np.concatenate([front_x, extra])
                keep = pareto_mask(F)
                F, idx, extra = F[keep], idx[keep], extra[keep]
            else:
                F, idx, extra = front_F, front_idx, front_x
            # the chunk is done: count it (nothing above changed the running totals, so Ctrl-C leaves them whole)
            front_F, front_idx, front_x = F, idx, extra
            feasible_count += feasible_here
            for name, (n_bad, n_only, near, sense) in stats.items():
                failed[name] += n_bad
                only[name] += n_only
                if near is not None:
                    old = nearest[name]
                    nearest[name] = near if old is None else (min(old, near) if sense == "max" else max(old, near))
            done += e.R_th.size
            if progress is not None:
                progress(done, total)
    except KeyboardInterrupt:
        interrupted = True
    pareto = _materialise(front_F, front_idx, front_x, spec, geo, base, flow, fixed)
    pareto = tuple(sorted(pareto, key=lambda c: (c.flow, c.R_th, c.dp)))
    limits = tuple(LimitCount(name, limit, failed[name], only[name], nearest[name]) for name, limit, _ in checks)
    return SearchOutcome(spec=spec, candidates=total, unbuildable=geo.dropped * per_geometry, evaluated=done,
                         feasible=feasible_count, pareto=pareto, best=pareto[0] if pareto else None,
                         limits=limits, interrupted=interrupted, seconds=time.perf_counter() - t0)


def _chunk(e: Evaluation, quantities, checks, g0, q0):
    """One chunk's limit counts and its feasible points: ({limit: (failed, failed only it, nearest, sense)} with
    "feasible" → count, then the points as in :func:`_reduced_points`)."""
    passes = {name: _passes(quantities[name], limit, sense) for name, limit, sense in checks}
    for name, _, sense in checks:  # where the coolant boils the rest is unknown: count it as boiling only
        if sense != "flag":
            passes[name] = passes[name] | ~e.solvable
    shape = e.R_th.shape
    n_fail = np.broadcast_to(sum((~p).astype(np.int8) for p in passes.values()), shape)
    stats = {}
    for name, _, sense in checks:
        bad = np.broadcast_to(~passes[name], shape)
        alone = bad & (n_fail == 1)
        k = int(alone.sum())
        near = None
        if k:
            v = np.broadcast_to(quantities[name], shape)[alone]
            near = float(v.min() if sense == "max" else v.max())
        stats[name] = (int(bad.sum()), k, near, sense)
    feasible = n_fail == 0
    stats["feasible"] = int(feasible.sum())
    return (stats, *_reduced_points(e, feasible, g0, q0))


def _limit_list(lim):
    """(name, limit, sense) for every limit in force: "max" means value <= limit, "min" value >= limit."""
    out = [("boiling", None, "flag"), ("face_limit", lim.face, "max")]
    for name, value, sense in (("pressure_drop_limit", lim.pressure_drop, "max"),
                               ("discharge_limit", lim.discharge, "max"),
                               ("max_water", lim.max_water, "max"),
                               ("min_width", lim.min_width, "min"),
                               ("min_wall", lim.min_wall, "min"),
                               ("max_thickness", lim.max_thickness, "max")):
        if value is not None:
            out.append((name, value, sense))
    return out


def _quantities(e: Evaluation, geo: _Geometries, sl, base, flow, hours):
    """The quantity each limit reads, as arrays that broadcast to (G, Nt, Nq)."""
    cols = dict(zip(geo.names, (c[sl] for c in geo.cols)))
    q = {"boiling": e.solvable, "face_limit": e.T_face, "pressure_drop_limit": e.dp, "discharge_limit": e.T_out,
         "max_water": (flow * hours * 3600.0 / 86400.0).reshape(1, 1, -1),
         "max_thickness": geo.height[sl].reshape(-1, 1, 1) + base.reshape(1, -1, 1)}
    if "width" in cols:
        q["min_width"] = cols["width"].reshape(-1, 1, 1)
        q["min_wall"] = geo.wall[sl].reshape(-1, 1, 1)
    return q


def _passes(value, limit, sense):
    if sense == "flag":
        return np.asarray(value, dtype=bool)
    # the one comparison rule: a range's arithmetic must not miss a limit it lands on (0.8 mm vs 0.7999...)
    with np.errstate(invalid="ignore"):
        return at_most(value, limit) if sense == "max" else at_least(value, limit)


def _reduced_points(e: Evaluation, feasible, g0, q0):
    """Feasible points as objectives (R_th, dp, flow), indices (g, b, q) and (T_face, T_out, velocity, Re),
    keeping for each (g, q) only the base with the lowest R_th: pressure drop and flow do not depend on the
    base, so the others are dominated."""
    R = np.where(feasible, e.R_th, np.inf)
    b = np.argmin(R, axis=1)  # (G, Nq)
    G, _, Nq = R.shape
    gi, qi = np.meshgrid(np.arange(G), np.arange(Nq), indexing="ij")
    R_best = R[gi, b, qi]
    ok = np.isfinite(R_best)
    gi, qi, b = gi[ok], qi[ok], b[ok]
    F = np.column_stack([R_best[ok], e.dp[gi, b, qi], e.flow[gi, b, qi]])
    extra = np.column_stack([a[gi, b, qi] for a in (e.T_face, e.T_out, e.velocity, e.Re)])
    return F, np.column_stack([gi + g0, b, qi + q0]).astype(np.int64), extra


def _materialise(F, idx, extra, spec, geo, base, flow, fixed) -> list[Candidate]:
    out = []
    for (R, dp, fl), (g, b, q), (T_face, T_out, V, Re) in zip(F, idx, extra):
        values = {name: float(c[g]) for name, c in zip(geo.names, geo.cols)}
        values.update(base=float(base[b]), flow=float(flow[q]), **fixed)
        out.append(Candidate(tuple((k, values[k]) for k in spec.axes), float(R), float(dp), float(fl),
                             float(T_face), float(T_out), float(V), float(Re)))
    return out


def candidate_from(e: Evaluation, values) -> Candidate:
    """A Candidate from a one-element evaluation."""
    return Candidate(values=values, R_th=float(e.R_th.item()), dp=float(e.dp.item()), flow=float(e.flow.item()),
                     T_face=float(e.T_face.item()), T_out=float(e.T_out.item()),
                     velocity=float(e.velocity.item()), Re=float(e.Re.item()))
