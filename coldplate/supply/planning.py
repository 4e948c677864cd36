"""Planning once-through water: the least flow that keeps the limits, water and money per year, and the
break-even against a recirculating chiller.

The least flow is solved, not scanned: the excess over the limits,
``m(Q) = max(T_face(Q) - face_limit, T_out(Q) - discharge_limit)``, falls with flow, and its root is bracketed
(doubling or halving from the operating flow) and found with Brent's method (scipy.optimize.brentq).  Every
temperature comes from :func:`coldplate.solve.solve_plate` at the trial flow.  Flows where the plate cannot
run (the coolant would boil) count as above the limits.
"""
from __future__ import annotations

import math

import numpy as np

from coldplate.supply.operating import FLOW_MAX, PlateAt
from coldplate.supply.result import Breakeven, PlanningResult, UseCurve

#: Points of the water-use curve spaced evenly in log flow; the operating flow and the least flow join them.
USE_POINTS = 9
#: Relative tolerance of the least flow.
RTOL = 1e-6


def wants_planning(design) -> bool:
    """Planning runs for once-through supplies that give a planning key or a circuit."""
    s = design.supply
    return s.once_through and (design.circuit is not None or s.face_limit is not None or s.tariff is not None)


def face_limit(design) -> tuple[float | None, str]:
    """The mounting-face limit planning keeps [K] and where it comes from: the supply's ``face_limit``, else
    the modules' hot-side limit (their hot faces sit on the mounting face), else none ("none": then the least
    flow keeps only the drain limit, and no flow is advised from it)."""
    if design.supply.face_limit is not None:
        return design.supply.face_limit, "face_limit"
    if design.module is not None:
        return design.module.hot_side_limit, "module hot-side limit"
    return None, "none"


def _excess(r, s, limit: float | None) -> float:
    """How far the plate at one flow is above its limits [K] (positive: a limit is broken)."""
    if r is None:
        return math.inf
    e = r.T_out - s.discharge_limit
    if limit is not None:
        e = max(e, r.T_face_max - limit)
    return e


def least_flow(plate: PlateAt, start: float) -> float:
    """The least flow [m^3/s] meeting the limits, or math.inf when none up to FLOW_MAX does.

    From a start above the limits: doubling to a bracket.  From one that meets them: half of it, then steps
    toward the root along the secant of the excess against 1/flow (the coolant's rise is linear in 1/flow),
    each aimed a little short so it overshoots into the excess, between a sixteenth and four fifths of the last
    flow that met the limits (halving where the secant says nothing); the root then by Brent's method."""
    s = plate.design.supply
    limit = face_limit(plate.design)[0]
    m = lambda q: _excess(plate(q), s, limit)  # noqa: E731
    q = start
    if m(q) > 0:
        while m(q) > 0:
            lo, q = q, 2.0 * q
            if q > FLOW_MAX:
                return math.inf if m(FLOW_MAX) > 0 else _root(m, lo, FLOW_MAX)
        return _root(m, 0.5 * q, q)
    previous, hi, q = start, start, 0.5 * start
    while m(q) <= 0:
        previous, hi = hi, q
        q = _secant_step(previous, m(previous), hi, m(hi))
    return _root(m, q, hi)


#: How far short of the secant's root the next trial aims (in flow), and the bounds of a step (shares of the last
#: flow that met the limits).
AIM_SHORT, STEP_MIN, STEP_MAX = 0.9, 1.0 / 16.0, 0.8


def _secant_step(q0: float, m0: float, q1: float, m1: float) -> float:
    """The next trial flow below ``q1`` [m^3/s] from two flows that meet the limits (excess m <= 0, rising as the
    flow falls): the secant's root in 1/flow, aimed :data:`AIM_SHORT` short, bounded; half of ``q1`` where the
    secant does not fall toward a root."""
    x0, x1 = 1.0 / q0, 1.0 / q1
    if m1 > m0 and x1 > x0:
        x = x1 - m1 * (x1 - x0) / (m1 - m0)
        return min(max(AIM_SHORT / x, STEP_MIN * q1), STEP_MAX * q1)
    return 0.5 * q1


def _root(m, lo, hi) -> float:
    from scipy.optimize import brentq

    if not math.isfinite(m(lo)):  # narrow the side where the plate cannot run to a finite value
        for _ in range(60):
            mid = 0.5 * (lo + hi)
            if math.isfinite(m(mid)) and m(mid) > 0:
                lo = mid
                break
            if m(mid) > 0:
                lo = mid
            else:
                hi = mid
        else:  # pragma: no cover - the limits bind exactly where the plate stops running
            return hi
    return float(brentq(m, lo, hi, xtol=1e-14, rtol=RTOL))


def plan(design, V_op: float, load: float | None = None, plate: PlateAt | None = None) -> PlanningResult:
    """Planning at the operating flow V_op [m^3/s], with the plate at ``load`` [W] (the design's own if None);
    ``plate`` the plate's solves so far at that load (shared with the operating point), else a new one."""
    s = design.supply
    plate = PlateAt(design, load) if plate is None else plate
    V_min = least_flow(plate, V_op)
    per_year = s.seconds_per_year
    m3 = V_op * per_year
    limit, limit_from = face_limit(design)
    if math.isfinite(V_min):
        r = plate(V_min)
        face = None if limit is None else r.T_face_max - limit
        binding = "mounting face" if face is not None and face >= r.T_out - s.discharge_limit else "discharge"
        T_face_min, T_out_min, m3_min = r.T_face_max, r.T_out, V_min * per_year
    else:
        binding, T_face_min, T_out_min, m3_min = "unreachable", None, None, None
    cost = None if s.tariff is None else m3 * s.tariff
    cost_min = None if s.tariff is None or m3_min is None else m3_min * s.tariff
    return PlanningResult(
        V_dot_min=V_min, binding=binding, face_limit=limit, face_limit_from=limit_from,
        discharge_limit=s.discharge_limit,
        T_face_at_min=T_face_min, T_out_at_min=T_out_min, water_L_per_day=V_op * 1000.0 * s.seconds_per_day,
        water_m3_per_year=m3, water_m3_per_year_min=m3_min, cost_per_year=cost, cost_per_year_min=cost_min,
        currency=s.currency, waste_ratio=V_op / V_min if math.isfinite(V_min) else None,
        use_curve=use_curve(plate, V_op, V_min), breakeven=breakeven(s, m3))


def use_curve(plate: PlateAt, V_op: float, V_min: float, n: int = USE_POINTS) -> UseCurve:
    """Water per year against the hottest mounting face, from half the smaller to twice the larger of the two
    flows (``n`` geometric steps, and the two flows themselves, already solved; flows where the plate cannot run
    are left out)."""
    low = min(V_op, V_min) if math.isfinite(V_min) else V_op
    high = max(V_op, V_min) if math.isfinite(V_min) else V_op
    per_year = plate.design.supply.seconds_per_year
    rows = []
    flows = set(map(float, np.geomspace(0.5 * low, min(2.0 * high, FLOW_MAX), n))) | {float(V_op)}
    if math.isfinite(V_min):
        flows.add(float(V_min))
    for q in sorted(flows):
        r = plate(float(q))
        if r is not None:
            rows.append((float(q), r.T_face_max, r.T_out, float(q) * per_year))
    V, T_face, T_out, m3 = zip(*rows) if rows else ((), (), (), ())
    return UseCurve(V, T_face, T_out, m3)


def breakeven(s, m3_per_year: float) -> Breakeven | None:
    """Once-through water at the operating flow against a chiller's electricity over the same hours."""
    if s.chiller_power is None:
        return None
    per_year = s.seconds_per_year
    electricity = s.chiller_power * per_year * s.electricity_tariff
    water = m3_per_year * s.tariff
    saving = water - electricity
    payback = s.chiller_price / saving if s.chiller_price is not None and saving > 0 else None
    return Breakeven(
        chiller_power=s.chiller_power, electricity_cost_per_year=electricity, water_cost_per_year=water,
        breakeven_flow=electricity / (s.tariff * per_year) if s.tariff > 0 else math.inf,
        breakeven_tariff=electricity / m3_per_year if m3_per_year > 0 else math.inf,
        saving_per_year=saving, payback_years=payback)
