"""Refinement after the grid: scipy.optimize from the best few grid points, inside the bounds and the limits.

The recommendation is the feasible candidate that uses the least water (least flow; at equal flow the lowest
thermal resistance).  A grid can only offer its own steps, so from the few best grid points (least flow,
distinct whole-number choices) SLSQP minimises the flow (or, when the flow is fixed, the resistance) over the continuous variables the search varies — channel width and depth or the tube bore, the
base thickness and the flow — with every limit as an inequality constraint, within the search's ranges.
Whole-number variables (channel count, passes) stay at the grid point's value.  The optimum is then rounded
to what a workshop and a flow meter can set (0.01 mm, 0.01 L/min: sizes to the nearest, flow upwards) and
checked again; a refined point is kept only if it still meets every limit and needs less flow than the
grid's best.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from hydraulics.validity import slack

from coldplate.sizing.evaluate import Evaluator
from coldplate.sizing.headers import Evaluators
from coldplate.sizing.run import Candidate, SearchOutcome, candidate_from

#: Rounding after refinement: lengths to 0.01 mm, flow up to the next 0.01 L/min.
LENGTH_STEP = 1e-5
FLOW_STEP = 0.01 / 6e4
#: How many grid points to start from.
STARTS = 3
CONTINUOUS = {"channels": ("width", "depth", "base", "flow"), "tube": ("inner_diameter", "base", "flow")}


@dataclass(frozen=True)
class Refinement:
    start: Candidate  #: the grid point the best refinement started from
    result: Candidate | None  #: the refined, rounded, re-checked candidate (None when none was better)
    varied: tuple[str, ...]  #: the variables refined
    starts: int  #: how many grid points were tried


def refine(outcome: SearchOutcome, evaluator: Evaluator, starts: int = STARTS) -> Refinement | None:
    """Polish the grid's best; None when the search found nothing feasible or varies no continuous variable."""
    if outcome.best is None:
        return None
    spec = outcome.spec
    varied = tuple(v for v in CONTINUOUS[spec.kind] if spec.axes[v].size > 1)
    if not varied:
        return None
    seeds, seen = [], set()
    for c in outcome.pareto:  # ascending flow
        key = tuple((k, v) for k, v in c.values if k not in varied)
        if key not in seen:
            seen.add(key)
            seeds.append(c)
        if len(seeds) == starts:
            break
    best, start = None, outcome.best
    for seed in seeds:
        got = _refine_one(seed, varied, outcome, evaluator)
        if got is not None and _better(got, outcome.best) and (best is None or _better(got, best)):
            best, start = got, seed
    return Refinement(start=start, result=best, varied=varied, starts=len(seeds))


def _better(a: Candidate, b: Candidate) -> bool:
    """The recommendation's order: less flow; at the same flow, lower thermal resistance (beyond round-off)."""
    if a.flow < b.flow * (1 - 1e-6):
        return True
    return a.flow <= b.flow * (1 + 1e-9) and a.R_th < b.R_th * (1 - 1e-6)


def _evaluate(evaluator, kind, values: dict):
    """One candidate through the evaluator.  SLSQP's trial steps may leave the plate (a wall of negative
    width): numpy's warnings there would be stray lines on stderr, and the non-finite numbers they flag are
    already read as unmet limits by :func:`margins`."""
    if isinstance(evaluator, Evaluators):  # header variants: the evaluator of the candidate's own headers
        evaluator = evaluator.for_values(values)
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        if kind == "channels":
            return evaluator.channels([values["count"]], [values["width"]], [values["depth"]], [values["base"]],
                                      [values["flow"]])
        return evaluator.tubes([values["inner_diameter"]], [values["passes"]], [values["base"]], [values["flow"]])


def _most(value, limit, scale):
    """A "value <= limit" margin under the one comparison rule (the grid's: hydraulics.validity), scaled."""
    return (limit + slack(limit) - value) / scale


def _least(value, limit, scale):
    """A "value >= limit" margin under the one comparison rule, scaled."""
    return (value - limit + slack(limit)) / scale


def margins(c: Candidate, outcome: SearchOutcome, design) -> np.ndarray:
    """Every limit as a margin that is >= 0 when met, scaled to order one.

    A limit is met under the same rule the grid uses (a value within the relative tolerance of a limit is
    on it), so a limit written in other units ("0.0315 inch" for 0.8 mm) does not reject the refinement's
    every step while the grid accepts the same point.
    """
    lim, v = outcome.spec.limits, dict(c.values)
    out = [_most(c.T_face, lim.face, 1.0)]
    if lim.pressure_drop is not None:
        out.append(_most(c.dp, lim.pressure_drop, lim.pressure_drop))
    if lim.discharge is not None:
        out.append(_most(c.T_out, lim.discharge, 1.0))
    if lim.max_water is not None:
        out.append(_most(c.flow * design.supply.hours_per_day / 24.0, lim.max_water, lim.max_water))
    if outcome.spec.kind == "channels":
        wall = (design.plate.width - v["count"] * v["width"]) / (v["count"] + 1)
        out.append(wall / 1e-4)
        if lim.min_width is not None:
            out.append(_least(v["width"], lim.min_width, lim.min_width))
        if lim.min_wall is not None:
            out.append(_least(wall, lim.min_wall, lim.min_wall))
        height = v["depth"]
    else:
        tw = 0.5 * (design.passage.outer_diameter - design.passage.inner_diameter)
        do = v["inner_diameter"] + 2 * tw
        rb = design.passage.bend_radius or 0.0  # None: one pass, not searched
        out.append((design.plate.width - (v["passes"] - 1) * 2 * rb - do) / 1e-3)
        if v["passes"] > 1:
            out.append((2 * rb - do) / 1e-3)
        height = 0.5 * do
    if lim.max_thickness is not None:
        out.append(_most(v["base"] + height, lim.max_thickness, lim.max_thickness))
    m = np.array(out, dtype=float)
    return np.where(np.isfinite(m), m, -1e3)


def _refine_one(seed: Candidate, varied, outcome: SearchOutcome, evaluator: Evaluator) -> Candidate | None:
    from scipy.optimize import minimize  # scipy only on the sizing path, never at check start-up

    spec, design = outcome.spec, evaluator.design
    fixed = dict(seed.values)
    order = tuple(spec.axes)
    scale = np.array([fixed[v] for v in varied])
    bounds = [(spec.axes[v].min() / s, spec.axes[v].max() / s) for v, s in zip(varied, scale)]
    memo: dict[bytes, Candidate] = {}

    def candidate(x) -> Candidate:
        key = np.asarray(x, dtype=float).tobytes()
        if key not in memo:
            values = dict(fixed)
            values.update({v: float(xi * s) for v, xi, s in zip(varied, x, scale)})
            e = _evaluate(evaluator, spec.kind, values)
            memo[key] = candidate_from(e, tuple((k, values[k]) for k in order))
        return memo[key]

    if "flow" in varied:  # least flow; with the flow fixed, the lowest resistance at that flow
        flow_i = varied.index("flow")
        objective = lambda x: x[flow_i]  # noqa: E731
    else:
        objective = lambda x: candidate(x).R_th / seed.R_th  # noqa: E731
    res = minimize(objective, np.ones(len(varied)), method="SLSQP", bounds=bounds,
                   constraints=[{"type": "ineq", "fun": lambda x: margins(candidate(x), outcome, design)}],
                   options={"maxiter": 60, "ftol": 1e-6})
    x = np.clip(res.x, [b[0] for b in bounds], [b[1] for b in bounds])
    values = dict(fixed)
    for v, xi, s in zip(varied, x, scale):
        values[v] = float(xi * s)
    for v in varied:  # what a workshop and a flow meter can set
        if v == "flow":
            values[v] = math.ceil(values[v] / FLOW_STEP - 1e-9) * FLOW_STEP
        else:
            values[v] = round(values[v] / LENGTH_STEP) * LENGTH_STEP
    for _ in range(20 if "flow" in varied else 1):  # rounding may cost a little margin: step the flow up
        c = candidate_from(_evaluate(evaluator, spec.kind, values), tuple((k, values[k]) for k in order))
        if np.all(margins(c, outcome, design) >= 0):
            return c
        values["flow"] += FLOW_STEP
    return None
