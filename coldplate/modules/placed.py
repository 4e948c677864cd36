"""Thermoelectric modules placed one by one on the plate, each with its own hot face from the field.

With ``[module] size`` and ``positions`` each module is a field source (``coldplate.plate.sources.place_modules``).
Every module pumps an equal share ``q = Q_c / N`` of the cold load at its own current ``I_i``, so its hot-side
heat is linear in its own hot face (thermoelectric.hot_side_heat_line):

    Q_h,i = c0(I_i) + c1(I_i) T_h,i

The field is linear in the loads at fixed properties (superposition): its faces at loads ``Q`` are
``F(Q) = F(Q_k) + C (Q - Q_k)`` near a solved ``Q_k``, ``C`` the coupling matrix.  At fixed currents:

    (I - C diag(c1)) T_h = F(Q_k) - C Q_k + C c0

The wiring sets the currents.  In series (one string) every module carries the design's current per module.
Parallel strings (``[module] wiring = "parallel"``, or ``"series-parallel"`` with ``strings``; string ``s`` holds
the modules ``s n + 1 .. (s + 1) n`` in the order of ``positions``, ``n = N / strings``) share one voltage ``U``,
and the array is driven at the current the design asks, ``I_arr = I strings`` (the lumped array's
``array_current``), so a hotter module, whose Seebeck voltage ``S (T_h - T_c)`` is higher, takes a different
current:

    sum over string s of V_i(I_s, T_h,i) = U,      sum over s of I_s = I_arr,      V_i = S (T_h,i - T_c,i) + I_s R

solved with the hot faces above by Newton on ``(T_h, I_s, U)`` (analytic Jacobian, from the equal currents;
:func:`operate`).  A fresh field solve at the new loads then corrects ``F`` (each source's hottest face, which
``C``'s mean faces only approximate, and the properties at the new heat) until every module's hot face agrees with
its field within :data:`~coldplate.modules.solve.FIELD_TOLERANCE_K`.  No steady state at fixed currents: the
spectral radius of ``C diag(c1)`` at least one (each kelvin of the faces brings back a kelvin or more); each
module's own share is its row sum.  Parallel strings only damp a difference between modules (the hotter takes
less current), so the radius at the solved currents is the test.

A target cold face (``[module] cold_face_temperature``) is met by the warmest module (every module at or below
it): on each linear field the current per module whose warmest cold face is the target is bisected below the
current where that cold face is coldest (found on the sweep's currents, refined by golden section), the field
solved afresh at its loads, and so on until the faces agree; no current reaching the target (or the target
warmer than with no current) is a :class:`DesignError` naming the key.  Root and coldest current cost no field
solve: the linear field is exact at fixed properties but for the hottest face's shift against the mean, which the
fresh solves correct.

The start is the lumped array first solved on the field (:func:`coldplate.modules.solve.solve_with_module_field`,
the modules' heat shared equally), whose field solve at equal shares (at its current, or at its own current for
the target) is also the first step here.

The placed modules' own current sweep (:func:`_sweep`: the warmest cold face, the hottest hot face, the array's
power, COP and heat into the plate at the lumped sweep's currents), their coldest and best-COP currents come from
the solved field without another field solve, on :meth:`Linear.secant`: through the solved faces and through the
inlet water at no load (each row of the coupling scaled so, the hottest face's rise per watt for the mean
face's).  Far from the solved loads this is what superposition at fixed properties gives when the loads change
together: against full placed solves at half and one and a half times the example's current it is within 0.01 K
(the tangent ``F + C (Q - Q_k)`` missed by 0.3 to 0.4 K there, its mean faces rising slower than the hottest
ones); the rest is the coolant's properties and coefficients at the other heat.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from coldplate.design.errors import DesignError, SolveError
from coldplate.modules import model as te
from coldplate.modules.result import ModuleSweep, PlacedModule
from coldplate.modules.solve import (ASSUMPTIONS, FIELD_TOLERANCE_K, MAX_FIELD_SOLVES, SWEEP_POINTS, TargetTooWarm,
                                     _bisect, _golden_min, solve_with_module_field)
from coldplate.plate.result import MethodUse

#: Newton steps of the strings' currents and voltage (parallel wiring) before a SolveError; three settle it on
#: the example's modules in parallel (quadratic convergence from the equal currents).
NEWTON_STEPS = 40
#: Newton's last step, scaled (1 K, the mean string current, 1 V), below which it has converged [-].
NEWTON_TOLERANCE = 1e-11
#: The target cold face's current per module is bisected to this width [A] on each linear field (the cold face
#: moves a few kelvin per ampere: about 1e-8 K).
TARGET_TOLERANCE_A = 1e-9

PLACED_ASSUMPTIONS = (
    "placed thermoelectric modules: each module a source of its own footprint where [module] positions puts "
    "it, its hot face the field's hottest face under it, pumping an equal share of the cold load, each cold face "
    "following from its own hot face and current; in series every module carries the design's current per "
    "module; parallel strings (filled in the order of [module] positions) share one voltage and the array's "
    "current (the design's current per module times the strings), so a hotter module, its Seebeck voltage "
    "higher, takes a different current",
    "placed modules: the current sweep (the warmest cold face, the hottest hot face, the array's power and COP) "
    "and the coldest and best-COP currents are the placed modules' own, from the field's coupling matrix about "
    "the solved field (superposition at its coolant properties and coefficients, no further field solve), at "
    "the lumped array's currents and ending where its sweep ends; the headline figures are the worst module's "
    "(hottest hot face, warmest cold face), the dew margin the coldest cold face's",
)


@dataclass(frozen=True)
class Linear:
    """The field about one solve: each source's hottest face ``F`` [K] at loads ``Q`` [W], the coupling ``C``
    [K/W]; the faces at other loads ``Q'`` are ``F + C (Q' - Q)`` (superposition at fixed properties)."""

    F: np.ndarray
    C: np.ndarray
    Q: np.ndarray

    @classmethod
    def of(cls, result) -> "Linear":
        return cls(np.array([s.face_max for s in result.sources], float), np.array(result.coupling, float),
                   np.array([s.load for s in result.sources], float))

    def secant(self, T_in: float) -> "Linear":
        """The field through its solved faces and through the inlet water at no load: ``F = T_in + diag(r) C Q``,
        each row of the coupling scaled by ``r_i = (F_i - T_in) / (C Q)_i`` (the hottest face's rise per watt
        over the mean face's, as the lumped array's calibration scales the network), for loads far from ``Q``:
        the plate with no heat is at the inlet water exactly, and loads that change together move each hottest
        face by its own rise rather than its mean face's."""
        mean = self.C @ self.Q
        ok = mean > 0
        r = np.where(ok, (self.F - T_in) / np.where(ok, mean, 1.0), 1.0)
        return Linear(self.F, self.C * r[:, None], self.Q)


@dataclass(frozen=True)
class Operation:
    """The placed modules at one array current on a :class:`Linear` field (one entry per module, SI)."""

    T_h: np.ndarray  #: hot faces [K]
    T_c: np.ndarray  #: cold faces [K]
    Q_h: np.ndarray  #: heat into the plate [W]
    I: np.ndarray  #: each module's current [A] (its string's)
    V: np.ndarray  #: each module's voltage [V]
    c1: np.ndarray  #: dQ_h/dT_h of each module at its current [W/K]
    U: float  #: the strings' common voltage (the array's) [V]


def string_of(count: int, strings: int) -> np.ndarray:
    """Each module's string (0, 1, ...): ``count // strings`` modules a string, in the order of the positions."""
    return np.arange(count) // (count // strings)


def _module(m, q: float, I, T_h):
    """One module's faces and heat at currents ``I`` and hot faces ``T_h`` with their partial derivatives:
    ``(T_c, Q_h, V, dQ_h/dI, dQ_h/dT_h, dV/dI, dV/dT_h)`` (the standard model, Ioffe 1957)."""
    S, R, K = m.S, m.R, m.K
    d = S * I + K
    T_c = te.cold_face_temperature(S, R, K, I, q, T_h)
    Q_h = te.hot_side_heat(S, R, K, I, T_c, T_h)
    V = te.module_voltage(S, R, I, T_c, T_h)
    dTc_dI, dTc_dTh = (I * R - S * T_c) / d, K / d
    return (T_c, Q_h, V, S * T_h + I * R + K * dTc_dI, S * I - K + K * dTc_dTh, R - S * dTc_dI,
            S * (1.0 - dTc_dTh))


def _hot_faces(m, q: float, lin: Linear, I: np.ndarray) -> np.ndarray:
    """The hot faces at fixed module currents ``I`` on the linear field: (I - C diag(c1)) T_h = F - C Q + C c0."""
    c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q)
    A = np.eye(len(I)) - lin.C * c1[None, :]
    return np.linalg.solve(A, lin.F - lin.C @ lin.Q + lin.C @ c0)


def operate(m, q: float, lin: Linear, string: np.ndarray, I_array: float, start: Operation | None = None):
    """The placed modules on the linear field ``lin`` at the array current ``I_array`` [A] (an
    :class:`Operation`): one string, every module at ``I_array``; parallel strings by Newton on the hot faces,
    the strings' currents and their common voltage from ``start``'s currents (else equal ones).  Raises
    :class:`SolveError` when Newton does not settle."""
    N, n_str = len(string), int(string[-1]) + 1
    if n_str == 1:
        I = np.full(N, float(I_array))
        T_h = _hot_faces(m, q, lin, I)
        T_c, Q_h, V = _module(m, q, I, T_h)[:3]
        return Operation(T_h, T_c, Q_h, I, V, te.hot_side_heat_line(m.S, m.R, m.K, I, q)[1], float(V.sum()))
    M = np.zeros((N, n_str))
    M[np.arange(N), string] = 1.0
    first = np.searchsorted(string, np.arange(n_str))  # each string's first module
    J = np.full(n_str, I_array / n_str)
    if start is not None and len(start.I) == N:  # the last currents, shifted to the new array current
        J = start.I[first] + (I_array - start.I[first].sum()) / n_str
    T_h = _hot_faces(m, q, lin, J[string])
    U = float((M.T @ _module(m, q, J[string], T_h)[2]).mean())
    scale = np.concatenate([np.ones(N), np.full(n_str, max(abs(I_array) / n_str, 1e-3)), [1.0]])
    weight = np.concatenate([np.ones(N + n_str), [1.0 / scale[N]]])  # residuals in K, V and A

    def residual(T_h, J, U):
        T_c, Q_h, V, *_ = _module(m, q, J[string], T_h)
        return np.concatenate([T_h - lin.F - lin.C @ (Q_h - lin.Q), M.T @ V - U, [J.sum() - I_array]])

    r, converged = residual(T_h, J, U), False
    for _ in range(NEWTON_STEPS):
        _, _, _, dQ_dI, dQ_dT, dV_dI, dV_dT = _module(m, q, J[string], T_h)
        jac = np.zeros((N + n_str + 1, N + n_str + 1))
        jac[:N, :N] = np.eye(N) - lin.C * dQ_dT[None, :]
        jac[:N, N:-1] = -(lin.C * dQ_dI[None, :]) @ M
        jac[N:-1, :N] = M.T * dV_dT[None, :]
        jac[N:-1, N:-1] = np.diag(M.T @ dV_dI)
        jac[N:-1, -1] = -1.0
        jac[-1, N:-1] = 1.0
        try:
            step = np.linalg.solve(jac, -r)
        except np.linalg.LinAlgError:
            break
        norm, t, accepted = float(np.linalg.norm(r * weight)), 1.0, False
        while t > 1e-6 and not accepted:  # backtracking: S I + K above zero, the residual not growing
            T_new, J_new, U_new = T_h + t * step[:N], J + t * step[N:-1], U + t * step[-1]
            if np.all(m.S * J_new + m.K > 0):
                r_new = residual(T_new, J_new, U_new)
                accepted = bool(np.all(np.isfinite(r_new)) and np.linalg.norm(r_new * weight) <= max(norm, 1e-12))
            if not accepted:
                t *= 0.5
        if not accepted:
            break
        T_h, J, U, r = T_new, J_new, U_new, r_new
        if float(np.max(np.abs(t * step) / scale)) <= NEWTON_TOLERANCE:
            converged = True
            break
    if not converged:
        raise SolveError(f"the placed modules' parallel strings did not settle at {I_array:.3g} A into the array "
                         f"(no currents sharing one voltage found in {NEWTON_STEPS} Newton steps); the network "
                         "model (--model network) solves the modules as one array")
    I = J[string]
    T_h = _hot_faces(m, q, lin, I)  # the faces exactly at the final currents
    T_c, Q_h, V = _module(m, q, I, T_h)[:3]
    return Operation(T_h, T_c, Q_h, I, V, te.hot_side_heat_line(m.S, m.R, m.K, I, q)[1], U)


def with_loads(design, loads):
    """The design with each source's load set (the field then places exactly these watts)."""
    sources = tuple(replace(s, load=float(q)) for s, q in zip(design.sources, loads))
    return replace(design, sources=sources, heat=replace(design.heat, load=float(sum(loads))))


def _runaway(names, c1, C: np.ndarray, I: float) -> None:
    """Refuse a coupling with no steady state at fixed currents, naming the module that contributes most.

    ``c1`` is dQ_h/dT_h of every module (one number) or of each; the test is the spectral radius of
    ``C diag(c1)``, each module's share the row sum (its face's rise per kelvin of all hot faces)."""
    G = np.asarray(C, float) * np.broadcast_to(np.asarray(c1, float), (len(C),))[None, :]
    rho = float(max(abs(np.linalg.eigvals(G))))
    if rho >= 1.0:
        rows = G.sum(axis=1)
        k = int(np.argmax(rows))
        raise SolveError(f"at {I:.3g} A per module the hot sides have no steady state (the field's coupling "
                         f"times dQ_h/dT_h has a spectral radius of {rho:.2f}, at least 1); {names[k]} is the "
                         f"worst (its face rises {rows[k]:.2f} K per kelvin of all hot faces): lower the current, "
                         "spread the modules or improve the plate")


def _on_field(design, field, lin: Linear, op: Operation | None, solve_at, gaps: list):
    """Correct the linear field by fresh field solves: ``solve_at(lin, start)`` gives the modules' Operation on
    ``lin``; the field at its loads gives the next ``lin``, until every hot face agrees with its field within
    FIELD_TOLERANCE_K.  Returns ``(field result, its Linear, the Operation, field solves)``."""
    solves = 0
    while True:
        op = solve_at(lin, op)
        fr = field(with_loads(design, op.Q_h), load=float(op.Q_h.sum()))
        solves += 1
        lin = Linear.of(fr)
        gap = float(np.max(np.abs(lin.F - op.T_h)))
        gaps.append(gap)
        if gap <= FIELD_TOLERANCE_K:
            return fr, lin, op, solves
        if solves >= MAX_FIELD_SOLVES:
            raise SolveError(f"the placed modules and the field did not agree in {MAX_FIELD_SOLVES} field solves "
                             f"(largest hot-face gap: {', '.join(f'{g:.3g} K' for g in gaps)}); the network model "
                             "(--model network) solves the modules as one array")


def _methods(base, m, currents: np.ndarray) -> tuple:
    """The lumped solve's module methods, the standard model's range taken at the largest module current."""
    out = []
    for u in base.methods:
        if u.role != "thermoelectric module":
            continue
        if u.method == te.cold_side_heat.validity.method:
            v = te.cold_side_heat.validity
            values = {"I/I_max": float(np.max(np.abs(currents))) / m.max_current}
            u = MethodUse(role=u.role, method=v.method, reference=v.reference, validity=v.describe(),
                          values=tuple(values.items()), outside=v.violations(**values))
        out.append(u)
    return tuple(out)


class _Array:
    """The placed modules of a design on a linear field: each operation at a current per module, the worst
    module's cold face, its coldest current (all without a field solve)."""

    def __init__(self, design):
        m = self.m = design.module
        self.q = m.cold_load / m.count
        self.string = string_of(m.count, m.strings)
        self.names = [s.name for s in design.sources]

    def at(self, lin: Linear, I: float, start: Operation | None = None) -> Operation:
        """The modules at the design's current ``I`` per module (the array at ``I`` times the strings); a
        runaway (at the equal currents, and at the solved ones) or unsettled strings raise SolveError."""
        m = self.m
        c1 = start.c1 if start is not None else te.hot_side_heat_line(m.S, m.R, m.K, I, self.q)[1]
        _runaway(self.names, c1, lin.C, I)
        op = operate(m, self.q, lin, self.string, I * m.strings, start)
        _runaway(self.names, op.c1, lin.C, I)
        return op

    def warmest(self, lin: Linear, I: float) -> float:
        """The warmest module's cold face at ``I`` per module [K]; infinity with no steady state."""
        try:
            return float(self.at(lin, I).T_c.max())
        except SolveError:
            return math.inf

    def coldest(self, lin: Linear, currents=None) -> tuple[float, float]:
        """``(current per module, warmest cold face)`` where the warmest cold face is coldest among ``currents``
        (default the sweep's, 0 to I_max), refined by golden section between the least one's neighbours."""
        if currents is None:
            currents = np.linspace(0.0, self.m.max_current, SWEEP_POINTS)
        values = [self.warmest(lin, float(I)) for I in currents]
        k = int(np.argmin(values))
        I_c, T_c = _golden_min(lambda I: self.warmest(lin, I), float(currents[max(k - 1, 0)]),
                               float(currents[min(k + 1, len(currents) - 1)]))
        return (I_c, T_c) if T_c <= values[k] else (float(currents[k]), values[k])


def _sweep(arr: _Array, lin: Linear, lumped: ModuleSweep) -> ModuleSweep:
    """The placed modules' own sweep on the linear field about the solved one, at the lumped sweep's currents:
    the warmest cold face, the hottest hot face, the array's power, COP and heat into the plate.  It stops where
    the lumped sweep stops (boiling water, which the linear field does not see, or its runaway) or earlier where
    the coupling has no steady state."""
    m, rows, stopped = arr.m, [], lumped.stopped
    for I in lumped.current:
        try:
            op = arr.at(lin, float(I))
        except SolveError:
            stopped = (f"no steady state above {rows[-1][0]:.3g} A per module: the placed modules' hot sides run "
                       "away" if rows else "no steady state")
            break
        power = float((op.V * op.I).sum())
        rows.append((float(I), float(op.T_c.max()), float(op.T_h.max()),
                     float(te.coefficient_of_performance(m.cold_load, power)), power, float(op.Q_h.sum())))
    cols = list(zip(*rows)) if rows else [()] * 6
    return ModuleSweep(current=tuple(cols[0]), T_cold=tuple(cols[1]), T_hot=tuple(cols[2]), cop=tuple(cols[3]),
                       power=tuple(cols[4]), Q_hot=tuple(cols[5]), stopped=stopped)


def _c(T: float) -> str:
    return f"{T - 273.15:.2f} degC"


def _target(arr: _Array, target: float, state: dict):
    """``solve_at`` for a target cold face: on each linear field the current whose warmest module's cold face is
    the target (bisection below the coldest current), or the coldest current when none reaches it (noted in
    ``state``, refused once the field agrees); ``state["I"]`` the current per module."""
    field = "[module] cold_face_temperature"

    def solve_at(lin, start):
        T_zero = arr.warmest(lin, 0.0)
        if T_zero < target:
            raise DesignError(field, f"{_c(target)} is warmer than the warmest placed module's cold face with no "
                                     f"current ({_c(T_zero)}): the modules would have to heat; lower the target")
        I_c, T_min = arr.coldest(lin)
        state.pop("unreachable", None)
        if T_min > target:
            state["unreachable"] = (I_c, T_min)
            I = I_c
        else:
            I = _bisect(lambda I: arr.warmest(lin, I) - target, 0.0, I_c, tol=TARGET_TOLERANCE_A)
        state["I"] = I
        return arr.at(lin, I)

    return solve_at


def solve_placed_field(design, field, network, scale: float = 1.0):
    """Placed modules on the field model: the field Result at each module's own hot-side heat, ``.module`` set
    with ``placed`` (one :class:`PlacedModule` each) and the worst module's headline figures.

    ``field``, ``network`` and ``scale`` as in :func:`coldplate.modules.solve.solve_with_module_field`, which
    gives the lumped array (its operating current, or its current for a target cold face: the start here); then
    the coupled hot faces (and, with parallel strings, each string's current) by the coupling matrix
    (:func:`operate`), at the design's current or, for a target cold face, at the current whose warmest module
    meets it, corrected by fresh field solves.  Raises :class:`SolveError` on a runaway or when the field solves
    do not agree, :class:`DesignError` naming ``[module] cold_face_temperature`` when no current reaches the
    target.
    """
    m = design.module
    try:
        base = solve_with_module_field(design, field, network, scale)
    except TargetTooWarm as exc:
        raise DesignError("[module] cold_face_temperature", f"{_c(m.cold_face_target)} is warmer than the modules' "
                                                            f"cold face with no current ({_c(exc.T_zero)}): the "
                                                            "modules would have to heat; lower the target") from None
    lumped = base.module
    arr, q, state = _Array(design), m.cold_load / m.count, {}
    if m.current is not None:
        I = m.current

        def solve_at(lin, start):
            return arr.at(lin, I, start)
    else:
        solve_at = _target(arr, m.cold_face_target, state)

    fr, lin, op, solves = _on_field(design, field, Linear.of(base), None, solve_at, [])
    if "unreachable" in state:
        I_c, T_min = state["unreachable"]
        raise DesignError("[module] cold_face_temperature",
                          f"{_c(m.cold_face_target)} is out of reach of the placed modules: the warmest module's "
                          f"cold face is at its coldest {_c(T_min)}, at {I_c:.3g} A per module (I_max "
                          f"{m.max_current:g} A); raise the target, or lower the plate's resistance (more flow, a "
                          "better plate or interface), use colder water or more modules")
    I = state.get("I", m.current)
    _runaway(arr.names, op.c1, lin.C, I)
    I_arr = I * m.strings
    P = op.V * op.I
    slopes = lin.C @ op.c1
    placed = tuple(PlacedModule(n, s.at, float(th), float(tc), float(qh), q, float(v), float(p), float(k),
                                m.hot_side_limit - float(th), float(i))
                   for n, s, th, tc, qh, v, p, k, i in zip(arr.names, design.sources, op.T_h, op.T_c, op.Q_h, op.V,
                                                           P, slopes, op.I))
    worst = max(placed, key=lambda pm: pm.T_hot)
    power = float(P.sum())
    T_cold = float(op.T_c.max())
    far = lin.secant(fr.T_in)  # the sweep's field, for loads far from the operating point's
    sweep = _sweep(arr, far, lumped.sweep)
    I_coldest, T_coldest = arr.coldest(far, sweep.current) if sweep.current else (I, T_cold)
    if m.current is None or I <= I_coldest:
        best = I
    else:  # past the coldest current: the least current reaching the same warmest cold face
        best = (_bisect(lambda x: arr.warmest(far, x) - T_cold, 0.0, I_coldest)
                if arr.warmest(far, 0.0) > T_cold else 0.0)
    target = {} if m.current is not None else dict(shortfall="")
    mr = replace(lumped, current=I, voltage=worst.voltage, array_current=I_arr, array_voltage=op.U, T_cold=T_cold,
                 T_hot=worst.T_hot, Q_hot=float(op.Q_h.sum()), power=power,
                 cop=float(te.coefficient_of_performance(m.cold_load, power)), T_dew=fr.T_dew,
                 dew_margin=float(op.T_c.min()) - fr.T_dew, T_load=T_cold + m.cold_load * m.cold_side_resistance,
                 R_plate=fr.R_th, runaway_slope=float(max(abs(np.linalg.eigvals(lin.C * op.c1[None, :])))),
                 field_solves=lumped.field_solves + solves, placed=placed, sweep=sweep, coldest_current=I_coldest,
                 T_cold_coldest=T_coldest, best_cop_current=best, **target)
    how = () if m.current is not None else (
        f"placed modules at a target cold face: the current per module at which the warmest module's cold face "
        f"meets the target (every module at or below it), found on the field's coupling matrix about its last "
        f"solve and corrected by fresh field solves ({solves} after the lumped array's {lumped.field_solves})",)
    return replace(fr, design=design, module=mr,
                   assumptions=fr.assumptions + ASSUMPTIONS[:1] + PLACED_ASSUMPTIONS + how,
                   methods=fr.methods + _methods(base, m, op.I))
