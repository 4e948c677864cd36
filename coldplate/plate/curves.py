"""The plate as a lumped part: thermal resistance and pressure drop against flow, and fitted flow curves.

Every point comes from :func:`coldplate.solve.solve_plate` at the design's load, so the curves run through
the same chain as the design check.  A flow small enough to make the coolant boil (or leave its property
data) raises :class:`DesignError` in the solve, and a solve that does not settle raises :class:`SolveError`;
such points are skipped and listed, with the reason, in ``FlowCurve.skipped``.

Fitted flow curves: two short formulas that a system model or a spreadsheet can evaluate at any flow inside
the fitted range instead of running the solve.  Both are fitted by least squares on relative errors (each point
weighs the same whatever its size):

* pressure drop  dp = a·V + b·V²   [Pa], V in [m^3/s]: the laminar (friction) and inertial (entry, exit,
  bends, turbulent friction) parts of a duct's loss; a and b are kept non-negative;
* thermal resistance  R = R0 + c·V^(−n)   [K/W]: R0 is the part no flow can remove, computed, not fitted
  (:func:`flow_independent_resistance`: the interface, the base, the back side's conduction and the spreading
  with the wetted walls at an unlimited heat transfer coefficient); c·V^(−n) is the convection and
  coolant-rise part (c >= 0, n between 0 and 1.5).  A free three-constant fit can put R0 below that part
  (even at 0) and move it with the flow range; holding R0 at it keeps the formula from promising, outside the
  fitted range, a resistance lower than the plate allows, and R0 the same whatever range is fitted.

The largest relative error of each fit over the fitted points is reported beside it.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from coldplate.design.errors import DesignError, SolveError

#: Default span of a flow curve around the design flow (factors), and its number of points.
DEFAULT_SPAN = (0.25, 4.0)
DEFAULT_POINTS = 25
#: Each fitted curve has two free constants; with fewer than four points its error says nothing.
MIN_POINTS = 4
N_BOUNDS = (0.0, 1.5)
#: A wetted-wall heat transfer coefficient standing for an unlimited flow [W/(m^2 K)].  Finite, so the
#: resistance it leaves is a hair above the true limit (about 1e-12 K/W here): the cautious side.
H_UNLIMITED = 1.0e12


@dataclass(frozen=True)
class FlowCurve:
    """Thermal resistance and pressure drop of the plate against flow, at the design's load (SI)."""

    V_dot: tuple[float, ...]  #: [m^3/s]
    R_th: tuple[float, ...]  #: (hottest mounting face - inlet) / load [K/W]
    dp: tuple[float, ...]  #: plate pressure drop [Pa]
    T_face: tuple[float, ...]  #: hottest mounting face [K]
    T_out: tuple[float, ...]  #: outlet water [K]
    water_m3_per_year: tuple[float, ...]  #: once-through use at the design's hours (0 when the water returns)
    load: float  #: [W]
    design_V_dot: float  #: the design point [m^3/s]
    design_R_th: float  #: [K/W]
    design_dp: float  #: [Pa]
    skipped: tuple[tuple[float, str], ...]  #: flows left out [m^3/s] and why
    R_flow_independent: float  #: the part of R_th no flow removes (:func:`flow_independent_resistance`) [K/W]


@dataclass(frozen=True)
class FittedCurves:
    """The fitted flow curves dp = a·V + b·V² and R = R0 + c·V^(−n) (SI: V in m^3/s, dp in Pa, R in K/W)."""

    a: float  #: [Pa s/m^3]
    b: float  #: [Pa s^2/m^6]
    R0: float  #: the flow-independent part, not fitted [K/W]
    c: float  #: [K/W (m^3/s)^n]
    n: float  #: [-]
    dp_max_error: float  #: largest relative error of the dp fit over the fitted points [-]
    R_max_error: float  #: largest relative error of the R fit [-]
    V_min: float  #: fitted range [m^3/s]
    V_max: float

    def dp(self, V):
        V = np.asarray(V, dtype=float)
        return self.a * V + self.b * V**2

    def R_th(self, V):
        V = np.asarray(V, dtype=float)
        return self.R0 + self.c * V ** (-self.n)


def flow_independent_resistance(design) -> float:
    """The part of the plate's resistance that no flow removes [K/W]: the limit of R_th as the flow grows.

    R_int + θ_centre(h_eff,∞), with θ_centre the Muzychka-Culham-Yovanovich spreading series'
    rise at the source centre (:func:`coldplate.plate.conduction.spreading_MCY`, which includes the
    one-dimensional base t/(k A)) and h_eff,∞ = 1 / (A_plate R_back,∞), R_back,∞ the passage's back side
    (its own ``back_side``) with the wetted walls at :data:`H_UNLIMITED`: the conduction parts (tube wall,
    bond, plate between passes) stay and convection vanishes.  The coolant's temperature rise vanishes too.
    At every finite flow h_eff is lower and the coolant rises, so every solved R_th lies above this value.
    """
    from coldplate.plate import conduction
    from coldplate.plate.passages import PASSAGES

    d = design
    module = PASSAGES[d.passage.kind]
    geom = module.geometry(d.passage, d.plate)
    R_back = module.back_side(d.passage, d.plate, geom, H_UNLIMITED).total
    h_eff = 1.0 / (d.plate.length * d.plate.width * R_back)
    spread = conduction.spreading_MCY(d.plate.length, d.plate.width, d.heat.footprint_length,
                                      d.heat.footprint_width, d.plate.base, d.plate.conductivity, h_eff)
    R_int = conduction.R_interface(d.interface.resistance_area, d.heat.footprint_length * d.heat.footprint_width)
    return float(R_int + spread.R_centroid)


def default_flows(flow: float, span=DEFAULT_SPAN, points: int = DEFAULT_POINTS) -> tuple[float, ...]:
    """Log-spaced flows from span[0] to span[1] times ``flow`` [m^3/s] (the operating flow), with it included."""
    lo, hi = span
    flows = [v for v in np.geomspace(flow * lo, flow * hi, points).tolist()
             if abs(v / flow - 1.0) > 1e-9]  # the operating flow itself goes in exactly once
    flows.append(float(flow))
    return tuple(sorted(flows))


def flow_curve(design, flows=None, load: float | None = None, flow: float | None = None) -> FlowCurve:
    """Solve the plate at each flow [m^3/s] (the default span around the design point when None) at one load [W].

    ``load`` defaults to the design's and ``flow`` (the design point) to the design's flow.  Where the solve
    sets them (thermoelectric modules give the plate's load; a supply circuit gives the flow), pass the solved
    result's ``load`` and ``V_dot``: the curve then holds the plate at the operating point's heat.
    """
    from coldplate.plate.solve import solve_plate

    flow = design.flow if flow is None else float(flow)
    if flow is None:
        raise DesignError("[coolant] flow", "no flow given: the curves need the operating flow of the solved design")
    if flows is None:
        flows = default_flows(flow)
    flows = sorted(float(v) for v in flows)
    if not flows or any(not math.isfinite(v) or v <= 0 for v in flows):
        raise DesignError("flows", "must be positive, finite volumetric flows")
    rows, skipped = [], []
    for V in flows:
        try:
            r = solve_plate(design, flow=V, load=load)
        except DesignError as exc:  # boiling or out of the property data at this flow
            skipped.append((V, exc.problem))
            continue
        except SolveError as exc:  # the solve did not settle at this flow
            skipped.append((V, str(exc)))
            continue
        rows.append((V, r.R_th, r.dp, r.T_face_max, r.T_out, r.water_use_m3_per_year))
    if not rows:
        raise DesignError("flows", "no flow in the range gives a liquid coolant: " + skipped[0][1])
    here = solve_plate(design, flow=flow, load=load)
    cols = list(zip(*rows))
    return FlowCurve(V_dot=tuple(cols[0]), R_th=tuple(cols[1]), dp=tuple(cols[2]), T_face=tuple(cols[3]),
                     T_out=tuple(cols[4]), water_m3_per_year=tuple(cols[5]), load=here.load,
                     design_V_dot=here.V_dot, design_R_th=here.R_th, design_dp=here.dp, skipped=tuple(skipped),
                     R_flow_independent=flow_independent_resistance(design))


def _nonnegative_pair(columns, y):
    """Least squares on relative residuals for y = p·col0 + q·col1 with p, q >= 0: (p, q) and the sum of squares.

    With two unknowns the constrained optimum is the free one when it is feasible, else the better of the two
    one-term fits.
    """
    A = np.column_stack(columns) / y[:, None]
    ones = np.ones_like(y)
    best = None
    for cols in ((0, 1), (0,), (1,)):
        coef, *_ = np.linalg.lstsq(A[:, cols], ones, rcond=None)
        if np.any(coef < 0):
            continue
        full = np.zeros(2)
        full[list(cols)] = coef
        res = A @ full - 1.0
        ss = float(res @ res)
        if best is None or ss < best[1]:
            best = (full, ss)
    return best


def _fit_R_given_n(V, R, R0, n):
    """R = R0 + c V^-n at fixed R0 and n, c >= 0, least squares on relative residuals: (c, sum of squares)."""
    x = V ** (-n) / R
    rhs = 1.0 - R0 / R
    c = max(float(x @ rhs) / float(x @ x), 0.0)
    res = c * x - rhs
    return c, float(res @ res)


def _best_n(V, R, R0):
    """n in N_BOUNDS minimising the R fit's squares: a scan of 31 values, then golden sections in the best
    scan interval (so a second local minimum elsewhere cannot trap the search)."""
    grid = np.linspace(*N_BOUNDS, 31)
    ss = [_fit_R_given_n(V, R, R0, n)[1] for n in grid]
    i = int(np.argmin(ss))
    lo, hi = grid[max(i - 1, 0)], grid[min(i + 1, len(grid) - 1)]
    g = (math.sqrt(5.0) - 1.0) / 2.0
    x1, x2 = hi - g * (hi - lo), lo + g * (hi - lo)
    f1, f2 = _fit_R_given_n(V, R, R0, x1)[1], _fit_R_given_n(V, R, R0, x2)[1]
    for _ in range(50):
        if f1 < f2:
            hi, x2, f2 = x2, x1, f1
            x1 = hi - g * (hi - lo)
            f1 = _fit_R_given_n(V, R, R0, x1)[1]
        else:
            lo, x1, f1 = x1, x2, f2
            x2 = lo + g * (hi - lo)
            f2 = _fit_R_given_n(V, R, R0, x2)[1]
    return 0.5 * (lo + hi)


def fit_flow_curves(curve: FlowCurve) -> FittedCurves:
    """Fit the flow curves' two formulas; raises DesignError with fewer than MIN_POINTS points.

    R0 is the curve's ``R_flow_independent`` (computed, see the module's note); a, b, c and n are fitted.
    """
    V = np.asarray(curve.V_dot, dtype=float)
    if len(V) < MIN_POINTS:
        raise DesignError("flows", f"at least {MIN_POINTS} solvable flows are needed for the fit, got {len(V)}")
    dp = np.asarray(curve.dp, dtype=float)
    R = np.asarray(curve.R_th, dtype=float)
    (a, b), _ = _nonnegative_pair([V, V**2], dp)
    dp_err = float(np.max(np.abs((a * V + b * V**2) / dp - 1.0)))
    R0 = float(curve.R_flow_independent)
    n = _best_n(V, R, R0)
    c, _ = _fit_R_given_n(V, R, R0, n)
    R_err = float(np.max(np.abs((R0 + c * V ** (-n)) / R - 1.0)))
    return FittedCurves(a=float(a), b=float(b), R0=R0, c=float(c), n=float(n), dp_max_error=dp_err,
                        R_max_error=R_err, V_min=float(V.min()), V_max=float(V.max()))


def mounting_face_profile(result) -> tuple[tuple[float, ...], tuple[float, ...]]:
    """The mounting face on the centre line within the footprint: (x [m], T [K]).

    The plate's top face from the solve's profile plus the interface's rise (load × interface resistance,
    uniform flux over the footprint); the hottest point of the march is included so the peak is exact.
    """
    d = result.design
    x0 = 0.5 * (d.plate.length - d.heat.footprint_length)
    x1 = x0 + d.heat.footprint_length
    rise = result.load * dict(result.resistances)["interface"]
    x = np.asarray(result.profile.x)
    inside = (x >= x0) & (x <= x1)
    xs = np.concatenate([[x0], x[inside], [result.x_hot], [x1]])
    Ts = np.interp(xs, x, np.asarray(result.profile.T_top)) + rise
    order = np.argsort(xs, kind="stable")
    xs, Ts = xs[order], Ts[order]
    Ts[np.searchsorted(xs, result.x_hot)] = result.T_face_max
    return tuple(map(float, xs)), tuple(map(float, Ts))
