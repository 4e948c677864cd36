"""Thermoelectric modules and the plate solved as one system: operating point, current sweep, turning point.

The plate side comes only from :func:`coldplate.plate.solve.solve_plate` at the modules' real hot-side heat;
the hot face is the plate's hottest mounting face (the design's interface lies between the module's hot
face and the plate).  With the cold-side load ``Q_c`` and the current fixed, the hot-side heat of one
module is linear in its hot-face temperature, ``Q_h = c0 + c1 T_h`` (thermoelectric.hot_side_heat_line),
so with the plate's resistance ``R(Q) = (T_face - T_in) / Q`` the coupled hot face is

    T_h = (T_in + N R c0) / (1 - N R c1)

and ``N R c1 >= 1`` means no steady state (the hot side runs away).  ``R`` barely depends on the load,
so the operating point is a bracketed iteration on ``T_h``: each step takes the plate's ``R`` at the last
load, proposes ``T_h`` from the line above, keeps it only inside the bracket (else bisects), and stops
when the plate's hottest face equals the proposed hot face within 1e-6 K.

The sweep from zero to I_max uses the plate's ``R`` interpolated (piecewise linear in the load) between
full plate solves at the loads the sweep reaches; tests check it against the full coupled solve.
"""
from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from coldplate.modules import model as te
from coldplate.design.errors import DesignError, SolveError
from coldplate.plate.result import MethodUse
from coldplate.modules.result import ModuleResult, ModuleSweep

SWEEP_POINTS = 31  #: currents from 0 to I_max in the sweep
TOLERANCE_K = 1e-6  #: hot-face agreement of the coupled operating point [K]
MAX_ITERATIONS = 40
_GOLDEN = (math.sqrt(5.0) - 1.0) / 2.0


ASSUMPTIONS = (
    "thermoelectric modules: the standard model with constant S, R and K (from the datasheet maxima at their "
    "rated hot-side temperature, Luo 2008, when given so); Thomson heat, contact resistances inside the module "
    "and heat leaking around the modules are left out",
    "the modules' hot faces sit on the plate's heated footprint and take its hottest mounting-face temperature; "
    "all modules run at the same faces and current",
)

#: The network cannot resolve where each placed module sits (coldplate.modules.placed solves them on the field).
PLACED_ON_NETWORK = ("placed modules on the resistance network: solved as one lumped array, the heat shared "
                     "equally, at the network's cautious hottest face of the several sources (their positions "
                     "are not resolved one by one; --model field gives each module its own hot face)")


class TargetTooWarm(SolveError):
    """A target cold face warmer than the cold face with no current (the modules would have to heat)."""

    def __init__(self, message: str, T_zero: float):
        super().__init__(message)
        self.T_zero = T_zero  #: the cold face with no current [K]


class _Runaway(Exception):
    def __init__(self, slope: float):
        super().__init__(slope)
        self.slope = slope


def _c(T: float) -> str:
    return f"{T - 273.15:.2f} degC"


def faces_at_resistance(m, I: float, q: float, T_in: float, R_plate: float, count: int):
    """Hot face, cold face, heat into the plate and runaway slope for a plate of fixed resistance.

    ``q`` is the cold-side load of one module [W]; ``R_plate`` the plate's resistance, hottest mounting
    face to inlet water [K/W].  Raises ``_Runaway`` when ``count R_plate c1 >= 1``.
    """
    c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q)
    slope = count * R_plate * c1
    if slope >= 1.0:
        raise _Runaway(slope)
    T_h = (T_in + count * R_plate * c0) / (1.0 - slope)
    T_c = te.cold_face_temperature(m.S, m.R, m.K, I, q, T_h)
    return T_h, T_c, count * (c0 + c1 * T_h), slope


class PlateLine:
    """The plate's resistance against its load, from full plate solves, interpolated piecewise linearly."""

    def __init__(self, design, plate_solver):
        self.design, self.solver = design, plate_solver
        self.Q: list[float] = []
        self.R: list[float] = []
        self.limit = math.inf  #: smallest load found to boil the water [W]
        self.solves = 0

    def add(self, Q: float, R: float) -> None:
        i = int(np.searchsorted(self.Q, Q))
        self.Q.insert(i, Q)
        self.R.insert(i, R)

    def solve(self, Q: float):
        """The full plate solve at load ``Q``, recorded as a node; None when the water would boil."""
        if Q >= self.limit:
            return None
        self.solves += 1
        try:
            pr = self.solver(self.design, load=Q)
        except DesignError as exc:
            if exc.field != "[coolant] flow":
                raise
            self.limit = Q
            return None
        self.add(Q, pr.R_th)
        return pr

    def resistance(self, Q: float) -> float:
        return float(np.interp(Q, self.Q, self.R))

    def covers(self, Q: float, rel: float = 0.05) -> bool:
        return any(abs(Q - x) <= rel * max(abs(x), 1e-9) for x in self.Q)


def faces_on_line(m, I, q, T_in, count, line: PlateLine):
    """As :func:`faces_at_resistance` with the plate's resistance taken from ``line`` at the load reached."""
    if I == 0 and q == 0:
        return T_in, T_in, 0.0, 0.0
    R = line.resistance(line.Q[0])
    for _ in range(MAX_ITERATIONS):
        T_h, T_c, Q, slope = faces_at_resistance(m, I, q, T_in, R, count)
        R_new = line.resistance(Q)
        if abs(R_new - R) * Q < 1e-9:
            break
        R = R_new
    return T_h, T_c, Q, slope


def couple(design, I: float, plate_solver):
    """The coupled operating point at current ``I`` per module, with full plate solves.

    Returns ``(T_hot, T_cold, Q_hot, plate_result, plate_solves, slope)``.  Raises :class:`SolveError`
    with the reason when there is no steady state or the water would boil.
    """
    m = design.module
    N, q, T_in = m.count, m.cold_load / m.count, design.inlet_temperature
    c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q)
    T_boil = design.coolant.boiling_point(design.supply.line_pressure)
    lo, hi = T_in, math.inf
    T_h = T_in
    pr = None
    for it in range(1, MAX_ITERATIONS + 1):
        Q = N * (c0 + c1 * T_h)
        try:
            pr = plate_solver(design, load=Q)
        except DesignError as exc:
            if exc.field != "[coolant] flow":
                raise
            if T_h < T_boil:
                raise SolveError(f"at {I:.3g} A per module the modules put {Q:.4g} W or more into the plate and the "
                                 "water would boil: lower the current or the load, or raise the flow") from None
            hi = T_h
            T_h = 0.5 * (lo + hi)
            continue
        g = pr.T_face_max - T_h
        if abs(g) < TOLERANCE_K and it > 1:
            return T_h, te.cold_face_temperature(m.S, m.R, m.K, I, q, T_h), Q, pr, it, N * pr.R_th * c1
        if g > 0:
            lo = max(lo, T_h)
        else:
            hi = min(hi, T_h)
        slope = N * pr.R_th * c1
        if slope >= 1.0:
            raise SolveError(_runaway_message(I, N, c1, pr.R_th, slope))
        proposal = (T_in + N * pr.R_th * c0) / (1.0 - slope)
        T_h = proposal if lo <= proposal <= hi else 0.5 * (lo + hi)
    raise SolveError(f"the module and plate did not settle at {I:.3g} A in {MAX_ITERATIONS} plate solves "
                     f"(hot face between {_c(lo)} and {_c(hi)})")


def _runaway_message(I, N, c1, R, slope):
    return (f"at {I:.3g} A per module the hot side has no steady state: each kelvin the hot face rises makes the "
            f"{N} module(s) put {N * c1:.3g} W more into a plate of {R:.3g} K/W (product {slope:.2f}, at least 1), "
            "so the hot side runs away; lower the current or improve the plate (more flow, a better plate or "
            "interface)")


def _golden_min(f, a: float, b: float, tol: float = 1e-5):
    """Minimum of a unimodal ``f`` on [a, b] by golden-section search; returns ``(x, f(x))``."""
    c, d = b - _GOLDEN * (b - a), a + _GOLDEN * (b - a)
    fc, fd = f(c), f(d)
    while b - a > tol:
        if fc <= fd:
            b, d, fd = d, c, fc
            c = b - _GOLDEN * (b - a)
            fc = f(c)
        else:
            a, c, fc = c, d, fd
            d = a + _GOLDEN * (b - a)
            fd = f(d)
    x = 0.5 * (a + b)
    return x, f(x)


def _bisect(f, a: float, b: float, tol: float = 1e-7) -> float:
    """Root of ``f`` on [a, b] where f(a) and f(b) differ in sign."""
    fa = f(a)
    for _ in range(200):
        mid = 0.5 * (a + b)
        fm = f(mid)
        if (fm > 0) == (fa > 0):
            a, fa = mid, fm
        else:
            b = mid
        if b - a < tol:
            break
    return 0.5 * (a + b)


def _sweep(design, line: PlateLine):
    """Sweep the current from 0 to I_max on the plate line, adding plate solves until the loads are covered."""
    m = design.module
    N, q, T_in = m.count, m.cold_load / m.count, design.inlet_temperature
    currents = np.linspace(0.0, m.max_current, SWEEP_POINTS)
    for _ in range(6):
        rows, stopped = [], ""
        for I in currents:
            try:
                rows.append((float(I),) + faces_on_line(m, float(I), q, T_in, N, line))
            except _Runaway:
                stopped = f"no steady state above {rows[-1][0]:.3g} A per module: the hot side runs away"
                break
            if rows[-1][3] >= line.limit:
                rows.pop()
                stopped = f"the water would boil above {rows[-1][0]:.3g} A per module" if rows else "water boils"
                break
        loads = [r[3] for r in rows if r[3] > 0]
        if not loads:
            return rows, stopped
        wanted = [Q for Q in (min(loads), max(loads), 0.5 * (min(loads) + max(loads))) if not line.covers(Q)]
        if not wanted:
            return rows, stopped
        for Q in wanted:
            if line.solve(Q) is None:  # boils: find the largest load that does not, by bisection
                good = max(x for x in line.Q if x < line.limit)
                for _ in range(8):
                    mid = 0.5 * (good + line.limit)
                    if line.solve(mid) is not None:
                        good = mid
    raise SolveError("the current sweep's plate loads did not settle")


def solve_with_module(design, plate_solver):
    """The design with its ``[module]`` table: the plate result at the modules' heat, with ``.module`` set."""
    pr, mr, methods = module_operating_point(design, plate_solver)
    placed = (PLACED_ON_NETWORK,) if design.module.placed else ()
    return replace(pr, module=mr, assumptions=pr.assumptions + ASSUMPTIONS + placed, methods=pr.methods + methods)


def first_load(design) -> float:
    """The load of the module solve's first plate solve [W]: half the modules' hot-side heat at I_max with both
    faces at the inlet water (a guess inside the sweep's range of loads)."""
    m = design.module
    return m.count * (m.cold_load / m.count + 0.5 * m.max_current**2 * m.R
                      + m.S * m.max_current * design.inlet_temperature) * 0.5


def module_operating_point(design, plate_solver):
    """The modules and the plate solved together with ``plate_solver``: ``(plate result at the modules' heat,
    ModuleResult, the modules' MethodUse records)``; :func:`solve_with_module` joins them into one Result."""
    m = design.module
    N, q, T_in = m.count, m.cold_load / m.count, design.inlet_temperature
    line = PlateLine(design, plate_solver)
    seed = first_load(design)
    for load in (seed, 0.1 * seed, max(N * q, 1e-3)):  # a first plate solve; a smaller load if the water boils
        if line.solve(max(load, 1e-3)) is not None:
            break
    else:
        raise SolveError(f"the water would boil with {max(N * q, 1e-3):.4g} W from the modules: raise the flow")
    rows, stopped = _sweep(design, line)
    if not rows:  # even with no current the modules' passive heat would boil the water
        raise DesignError("[coolant] flow", "is too small for the modules: the water would boil even with no "
                                            "current through them; raise the flow")
    I_s = [r[0] for r in rows]
    T_c_s = [r[2] for r in rows]

    def cold(I):
        try:
            return faces_on_line(m, I, q, T_in, N, line)[1]
        except _Runaway:
            return math.inf

    k = int(np.argmin(T_c_s))
    I_coldest, T_coldest = _golden_min(cold, I_s[max(k - 1, 0)], I_s[min(k + 1, len(I_s) - 1)])
    if T_c_s[k] < T_coldest:
        I_coldest, T_coldest = I_s[k], T_c_s[k]

    shortfall = ""
    if m.current is not None:
        mode, I_op = "current", m.current
        if stopped and I_op > I_s[-1]:
            raise SolveError(f"at {I_op:g} A per module: {stopped}")
    else:
        mode, target = "target", m.cold_face_target
        if target < T_coldest - 1e-6:  # out of reach: run at the coldest current and say what would reach it
            shortfall = _unreachable(design, target, I_coldest, T_coldest, line)
            I_op = I_coldest
        elif target > T_c_s[0]:
            raise TargetTooWarm(f"the target cold face {_c(target)} is warmer than the cold face with no current "
                                f"({_c(T_c_s[0])}): the modules would have to heat; lower the target", T_c_s[0])
        else:
            I_op = _bisect(lambda I: cold(I) - target, 0.0, I_coldest)

    T_h, T_c, Q_h, pr, solves, slope = couple(design, I_op, plate_solver)
    if mode == "target" and not shortfall:  # secant on the full coupled solve, from the plate line's current
        I_prev, f_prev = I_op, T_c - target
        step = 1e-3 * m.max_current
        for _ in range(8):
            if abs(f_prev) < 1e-5:
                break
            I_new = min(max(I_prev + step, 0.0), I_coldest)
            T_h, T_c, Q_h, pr, n, slope = couple(design, I_new, plate_solver)
            solves += n
            f_new = T_c - target
            if f_new == f_prev:
                break
            step = -f_new * (I_new - I_prev) / (f_new - f_prev)
            I_prev, f_prev = I_new, f_new
        I_op = I_prev

    V = te.module_voltage(m.S, m.R, I_op, T_c, T_h)
    P = N * V * I_op
    I_arr, V_arr = te.array_supply(I_op, V, N, m.strings)
    if I_op <= I_coldest or mode == "target":
        best = I_op
    else:
        best = _bisect(lambda I: cold(I) - T_c, 0.0, I_coldest) if cold(0.0) > T_c else 0.0
    T_rated = m.rated_hot_side if m.rated_hot_side is not None else T_h
    sweep = ModuleSweep(
        current=tuple(I_s), T_cold=tuple(T_c_s), T_hot=tuple(r[1] for r in rows),
        cop=tuple(float(te.coefficient_of_performance(q * N, N * te.electrical_power(m.S, m.R, r[0], r[2], r[1])))
                  for r in rows),
        power=tuple(N * te.electrical_power(m.S, m.R, r[0], r[2], r[1]) for r in rows),
        Q_hot=tuple(r[3] for r in rows), stopped=stopped)
    mr = ModuleResult(
        count=N, wiring=m.wiring, current=I_op, voltage=V, array_current=I_arr, array_voltage=V_arr,
        T_cold=T_c, T_hot=T_h, Q_cold=m.cold_load, Q_hot=Q_h, power=P,
        cop=float(te.coefficient_of_performance(m.cold_load, P)), coldest_current=I_coldest,
        best_cop_current=best, sweep=sweep, T_dew=pr.T_dew, dew_margin=T_c - pr.T_dew, strings=m.strings,
        mode=mode, T_load=T_c + m.cold_load * m.cold_side_resistance, T_cold_coldest=T_coldest,
        max_current=m.max_current, hot_side_limit=m.hot_side_limit, R_plate=pr.R_th, runaway_slope=slope,
        max_heat_model=te.datasheet_max_heat(m.S, m.R, m.max_current, T_rated),
        parameters=(m.S, m.R, m.K), iterations=solves, shortfall=shortfall)
    uses = [(te.cold_side_heat.validity, {"I/I_max": I_op / m.max_current})]
    if m.rated_hot_side is not None:
        uses.append((te.luo_parameters.validity, {"dT_max/T_h": m.max_temperature_difference / m.rated_hot_side}))
    methods = tuple(MethodUse(role="thermoelectric module", method=v.method, reference=v.reference,
                              validity=v.describe(), values=tuple(values.items()), outside=v.violations(**values))
                    for v, values in uses)
    return pr, mr, methods


def _unreachable(design, target, I_c, T_min, line: PlateLine) -> str:
    """Why a target cold face cannot be reached, and what would reach it (plate line at the coldest point)."""
    m = design.module
    N, T_in = m.count, design.inlet_temperature
    R = line.resistance(faces_on_line(m, I_c, m.cold_load / N, T_in, N, line)[2])

    def coldest(count=N, T_water=T_in, R_plate=R):
        def f(I):
            try:
                return faces_at_resistance(m, I, m.cold_load / count, T_water, R_plate, count)[1]
            except _Runaway:
                return math.inf
        return _golden_min(f, 0.0, m.max_current)[1]

    ways = []
    if coldest(R_plate=0.0) <= target:
        s = _bisect(lambda s: coldest(R_plate=s * R) - target, 0.0, 1.0)
        ways.append(f"a plate resistance below {s * R:.3g} K/W (now {R:.3g} K/W: more flow, a better plate "
                    "or interface)")
    dT = 150.0
    if coldest(T_water=T_in - dT) <= target:
        d = _bisect(lambda d: coldest(T_water=T_in - d) - target, 0.0, dT)
        T_need = T_in - d
        if T_need > design.coolant.freezing_point():
            ways.append(f"inlet water at or below {_c(T_need)} (now {_c(T_in)})")
    for n in range(N + 1, 4 * N + 5):
        if coldest(count=n) <= target:
            ways.append(f"{n} modules of this kind sharing the load")
            break
    ways.append("a module with a larger dT_max or I_max")
    return (f"The target cold face {_c(target)} is not reachable at any current up to I_max "
            f"({m.max_current:g} A): the coldest is {_c(T_min)} at {I_c:.3g} A per module, where the results "
            f"are given. It would be reached with {'; or '.join(ways)}.")


# --- the modules on the field model, in a few field solves ------------------------------------------------------
#
# The field (coldplate.plate.fieldcheck.solve_plate_field) costs about a second a solve; the module solve above
# calls its plate function seven times or more (the first node, the sweep's nodes, every step of ``couple``).
# So the module solve runs on the network (coldplate.plate.solve.solve_plate, milliseconds) scaled by the field:
# at fixed coolant properties and coefficients the field is linear in the load, so its resistance over the
# network's at one load, ``k = R_field(Q) / R_network(Q)``, carries the network to the field's answer near that
# load.  The scale changes with the load only through the properties and the coefficients (the outlet's
# temperature), so one update from the field at the modules' heat normally settles it: two field solves from a
# start without a scale, one when a scale from a nearby solve (the supply's first pass) is handed in.

#: Agreement of the modules' hot face with the field's hottest face at the modules' heat [K].  The module
#: solve's own tolerance (TOLERANCE_K, 1e-6 K) holds between the modules and the scaled network; against the
#: field 1e-3 K is enough: it is about a twentieth of the field's own grid uncertainty on the examples
#: (0.01-0.03 K) and far below the design margins the findings test.
FIELD_TOLERANCE_K = 1e-3
#: Field solves before the calibration gives up with a SolveError (two or three settle it on the examples).
MAX_FIELD_SOLVES = 6

FIELD_ASSUMPTION = (
    "thermoelectric modules on the field model: the operating point and the current sweep are solved on the "
    "resistance network with its face rise scaled by the field's resistance over the network's at the modules' "
    "heat; the plate's figures are the field at that heat, its hottest face the modules' hot face within "
    f"{FIELD_TOLERANCE_K:g} K")


def scaled_plate(result, scale: float):
    """A plate Result with its face's rise above the inlet water scaled by ``scale`` [-].

    Scaled: ``R_th`` and each of its ``resistances`` (so they still add up), ``T_face_max`` and ``T_plate_max``
    (inlet + scale · rise), the profile's top face ``T_top`` (inlet + scale · rise) and each source's
    ``face_max`` and ``face_mean`` in ``sources``.  Not scaled: the coolant (``T_out``, the profile's
    ``T_bulk``), the flow, pressure drop, coefficients and properties, which the scale does not describe.  A
    scale below one (the field cooler than the network) lowers the face, which the calibration's check at the
    field's own answer then confirms; the reported plate figures are never the scaled ones.
    """
    T_in = result.T_in

    def up(T):
        return T_in + scale * (T - T_in)

    p = result.profile
    profile = type(p)(p.x, p.T_bulk, tuple(up(T) for T in p.T_top))
    sources = tuple(replace(s, face_max=up(s.face_max), face_mean=up(s.face_mean)) for s in result.sources)
    return replace(result, R_th=scale * result.R_th,
                   resistances=tuple((name, scale * R) for name, R in result.resistances),
                   T_face_max=up(result.T_face_max), T_plate_max=up(result.T_plate_max), profile=profile,
                   sources=sources)


def scaled_solver(network, scale: float):
    """The plate function ``network(design, load=Q)`` with its face rise scaled (:func:`scaled_plate`)."""
    def plate(design, load):
        return scaled_plate(network(design, load=load), scale)
    return plate


def solve_with_module_field(design, field, network, scale: float = 1.0):
    """The modules on the field model in a few field solves: the plate Result of ``field`` at the modules' heat,
    with ``.module`` set (its ``field_solves`` and ``field_scale`` filled).

    ``field`` and ``network`` are plate functions ``(design, load=Q) -> Result`` at the same flow (the field's
    and the network's, e.g. ``partial(solve_plate_field, flow=V)``); ``scale`` is a first field-over-network
    resistance ratio (1: none known).  Steps: the module solve (:func:`module_operating_point`) on the network
    scaled by ``scale`` gives the modules' heat ``Q`` and hot face ``T_h``; the field at ``Q`` gives its hottest
    face; when that is within :data:`FIELD_TOLERANCE_K` of ``T_h`` the answer is that field result, else the
    scale becomes ``R_field(Q) / R_network(Q)`` and the module solve runs again.  Raises :class:`SolveError`
    after :data:`MAX_FIELD_SOLVES` field solves.
    """
    gaps, solves = [], 0
    while solves < MAX_FIELD_SOLVES:
        try:
            pr, mr, methods = module_operating_point(design, scaled_solver(network, scale))
        except SolveError:
            # the unscaled network (hotter than the field, as it errs) may find no steady state where the field
            # has one: take the scale at the first load the module solve tries, once, and solve again
            if solves or scale != 1.0:
                raise
            Q = first_load(design)
            try:
                solves += 1
                scale = field(design, load=Q).R_th / network(design, load=Q).R_th
            except DesignError:  # the water boils at that load: the network's reason stands
                scale = math.inf
            if scale >= 1.0:
                raise
            continue
        fr = field(design, load=mr.Q_hot)
        solves += 1
        gap = fr.T_face_max - mr.T_hot
        gaps.append(gap)
        if abs(gap) <= FIELD_TOLERANCE_K:
            mr = replace(mr, field_solves=solves, field_scale=scale)
            return replace(fr, module=mr, assumptions=fr.assumptions + ASSUMPTIONS + (FIELD_ASSUMPTION,),
                           methods=fr.methods + methods)
        scale = fr.R_th / network(design, load=mr.Q_hot).R_th
    raise SolveError(f"the modules and the field model did not agree in {MAX_FIELD_SOLVES} field solves (hot "
                     f"face against the field's hottest face: {', '.join(f'{g:+.3g} K' for g in gaps)}); "
                     "the network model (--model network) solves the modules alone")
