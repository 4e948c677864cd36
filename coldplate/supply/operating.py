"""The operating point: the flow the supply drives through the circuit and the plate.

Three drives (``[supply] drive``): ``flow`` (given; the circuit says what supply pressure it needs),
``pressure`` (a static gauge pressure at the supply; the flow is where the circuit's need equals it) and
``pump`` (a table of flow and head; the flow is where the fitted pump curve meets the system curve).  The
plate's pressure drop and outlet temperature at every trial flow come only from the check's own chain
(:func:`coldplate.plate.solve.operating_point`, the first step of ``solve_plate``); the lines from
:mod:`hydraulics.circuit`.  Roots are bracketed and found with Brent's method (scipy.optimize.brentq), so the
answer is solved, not scanned.
"""
from __future__ import annotations

import math

import numpy as np

from hydraulics.circuit import (G, Fitting, Fluid, K_fitting, Line, Valve, dp_line, required_pressure, static_head,
                                surge_Joukowsky, walk)
from hydraulics.ducts import RE_LAMINAR_END, RE_TURBULENT_START
from hydraulics.pump import PumpError, PumpTable, intersect, pump_curve

from coldplate.plate import materials
from coldplate.design.errors import DesignError
from coldplate.plate.result import MethodUse
from coldplate.plate.solve import operating_point, plate_at
from coldplate.supply.result import CircuitResult, PumpCurve, SystemCurve

#: Largest flow searched [m^3/s] (the design reader's own limit for a given flow).
FLOW_MAX = 0.01
#: First trial flow when the design gives none [m^3/s] (1 L/min).
FLOW_START = 1.0 / 6e4
#: Points of the system curve (zero to twice the operating flow: the operating flow is the middle one) and of the
#: fitted pump curve beside it.
CURVE_POINTS = 11
PUMP_POINTS = 13


class PlateAt:
    """The plate at trial flows, remembered, with the coolant on each side of the plate: the coolant side alone
    (:func:`~coldplate.plate.solve.operating_point`: outlet, mass flow, pressure drop) where that is all a caller
    needs (the circuit's need at a trial flow, the system curve), the whole solve
    (:func:`~coldplate.plate.solve.plate_at` on that point: the face) where the face is asked for.  Both are the
    check's own chain: :func:`~coldplate.plate.solve.solve_plate` is these two steps."""

    def __init__(self, design, load: float | None = None):
        self.design, self.load, self._points, self._plates = design, load, {}, {}
        self._Q = design.heat.load if load is None else float(load)
        d = design
        pr = d.coolant.props(d.inlet_temperature, d.supply.line_pressure)
        self.upstream = Fluid(pr.rho, pr.mu)
        self.rho_in = pr.rho

    def point(self, V_dot: float):
        """The plate's OperatingPoint at V_dot, or None when the plate cannot run there (too little flow).

        A channel plate's flow split starts from the split solved at the nearest flow so far (one to three Newton
        steps fewer): the trial flows of one check come in the same order every time, so its answers do too."""
        key = float(V_dot)
        if key not in self._points:
            solved = [(abs(q - key), q) for q, p in self._points.items() if p is not None and p.split is not None]
            start = self._points[min(solved)[1]].split if solved else None
            try:
                self._points[key] = operating_point(self.design, key, self._Q, start)
            except DesignError:  # the outlet would boil (or leave the property data): the plate cannot run here
                self._points[key] = None
        return self._points[key]

    def __call__(self, V_dot: float):
        """The plate's Result at V_dot (solve_plate's), or None when the plate cannot run there."""
        key = float(V_dot)
        if key not in self._plates:
            p = self.point(key)
            self._plates[key] = None if p is None else plate_at(self.design, p)
        return self._plates[key]

    def downstream(self, r) -> Fluid:
        pr = self.design.coolant.props(r.T_out, self.design.supply.line_pressure)
        return Fluid(pr.rho, pr.mu)

    def need(self, V_dot: float) -> float:
        """Gauge pressure the supply must hold to pass V_dot [Pa]; below the plate's least flow, the static part."""
        circuit = self.design.circuit
        r = self.point(V_dot) if V_dot > 0 else None
        if r is None:
            return static_head(circuit, self.upstream, self.upstream)
        return required_pressure(circuit, r.m_dot, self.upstream, self.downstream(r), r.dp)


def _pump_table(design, rho: float) -> PumpTable:
    s = design.supply
    rise = tuple(h * rho * G for h in s.pump_rise) if s.pump_rise_is_head else s.pump_rise
    return PumpTable(s.pump_flow, rise)


def _solve_pressure(plate: PlateAt, p_supply: float) -> float:
    """The flow at which the circuit needs exactly p_supply (bracket by doubling/halving, then Brent)."""
    from scipy.optimize import brentq

    held = plate.need(0.0)
    if p_supply <= held:
        raise DesignError("[supply] static_pressure", f"{p_supply / 1e3:.4g} kPa does not overcome the circuit's "
                                                      f"lifts, back pressure and check valves ({held / 1e3:.4g} kPa): "
                                                      "no water flows")
    q = plate.design.flow or FLOW_START
    if plate.need(q) < p_supply:  # the supply drives more: double up to a bracket
        while plate.need(q) < p_supply:
            lo = q
            if q >= FLOW_MAX:
                raise DesignError("[supply] static_pressure", f"drives more than {FLOW_MAX * 6e4:.0f} L/min "
                                                              "through this circuit; check the circuit's parts")
            q = min(2.0 * q, FLOW_MAX)
        hi = q
    else:  # it drives less: halve down to a bracket (zero flow always needs less than the supply holds)
        lo, hi = 0.0, q
        while q > 1e-9:
            q *= 0.5
            if plate.need(q) < p_supply:
                lo = q
                break
            hi = q
    return float(brentq(lambda v: p_supply - plate.need(v), lo, hi, xtol=1e-12, rtol=1e-9))


def operate(design, load: float | None = None, plate: PlateAt | None = None, curve: bool = True) -> CircuitResult:
    """The operating point of ``design`` in its circuit, with pressures along it and the system curve.

    ``load`` is the heat into the plate [W] when it is not the design's own (thermoelectric modules); ``plate``
    the plate's solves so far at that load (the supply stage shares one with planning), else a new one.
    ``curve`` False leaves the system curve out (None): the supply stage draws it through planning's flows.
    """
    d, c = design, design.circuit
    plate = PlateAt(d, load) if plate is None else plate
    pump, table = None, None
    if d.supply.drive == "flow":
        V = d.flow
    elif d.supply.drive == "pressure":
        V = _solve_pressure(plate, d.supply.static_pressure)
    else:
        table = _pump_table(d, plate.rho_in)
        try:
            V = intersect(table, plate.need, suction=d.supply.static_pressure or 0.0)
        except PumpError as exc:
            raise DesignError("[supply] pump_head", str(exc)) from None
        fit = pump_curve(table)
        qs = np.linspace(table.V_dot[0], table.V_dot[-1], PUMP_POINTS)
        pump = PumpCurve(tuple(map(float, qs)), tuple(fit(q) for q in qs))
    r = plate.point(V)
    if r is None:
        field = "[coolant] flow" if d.supply.drive == "flow" else ("[supply] static_pressure" if d.supply.drive ==
                                                                    "pressure" else "[supply] pump_head")
        raise DesignError(field, f"the circuit passes {V * 6e4:.3g} L/min, too little for the load: the coolant "
                                 "would boil or leave its property range in the plate")
    down = plate.downstream(r)
    need = plate.need(V)
    if d.supply.drive == "pressure":
        p0 = d.supply.static_pressure
    elif d.supply.drive == "pump":
        p0 = (d.supply.static_pressure or 0.0) + pump_curve(table)(V)
    else:
        p0 = need
    if abs(p0 - need) > max(1.0, 1e-6 * p0):  # the root sits where the plate stops running: it would boil
        field = "[supply] static_pressure" if d.supply.drive == "pressure" else "[supply] pump_head"
        raise DesignError(field, f"drives only about {V * 6e4:.3g} L/min through the circuit, too little for the "
                                 "load: the coolant would boil in the plate")
    losses, pressures, p_end = walk(c, r.m_dot, plate.upstream, down, r.dp, p0)
    k = c.plate_index
    names = [part.name for part in c.parts]
    points = (("supply", p0),) + tuple(zip(names, pressures)) + (("outlet", p_end),)
    inlet = pressures[k - 1] if k > 0 else p0
    return CircuitResult(
        drive=d.supply.drive, V_dot=V, supply_pressure=p0 if d.supply.drive != "flow" else None,
        plate_inlet_pressure=inlet, points=points,
        curve=system_curve(plate, max(2 * V, pump.V_dot[-1] if pump else 0)) if curve else None,
        pump=pump, needed_pressure=need, plate_outlet_pressure=pressures[k], heights=tuple(zip(names, c.heights())),
        surges=_surges(c, r.m_dot, plate.upstream, down), m_dot=r.m_dot,
        plate_rating=materials.plate_rating(d.plate.pressure_rating, d.passage.kind)[0])


def system_curve(plate: PlateAt, V_max: float, n: int = CURVE_POINTS, flows=None) -> SystemCurve:
    """The circuit's need and the plate's drop from zero flow to V_max (``n`` even steps), or at zero and the
    given ``flows`` (flows where the plate boils left out)."""
    rows = [(0.0, plate.need(0.0), 0.0)]
    for q in (np.linspace(0.0, V_max, n)[1:] if flows is None else sorted(q for q in flows if q > 0)):
        r = plate.point(float(q))
        if r is not None:
            rows.append((float(q), plate.need(float(q)), r.dp))
    V, need, dp = zip(*rows)
    return SystemCurve(V, need, dp)


def _surges(c, m_dot, up, down):
    k, out = c.plate_index, []
    last_D = None
    for i, p in enumerate(c.parts):
        if isinstance(p, (Line, Fitting)):
            last_D = p.diameter
        if isinstance(p, Valve) and p.solenoid:
            D = p.diameter or last_D or c.outlet_diameter
            if D:
                f = up if i <= k else down
                out.append((p.name, surge_Joukowsky(f.rho, m_dot / f.rho / (math.pi * D**2 / 4))))
    return tuple(out)


def _evaluated_at(v, Re: float) -> float:
    """In the transition the laminar methods are evaluated at Re = 2300 and the turbulent ones at 1e4."""
    if RE_LAMINAR_END < Re < RE_TURBULENT_START:
        laminar = any(b.variable == "Re" and b.high <= RE_LAMINAR_END for b in v.bounds)
        return RE_LAMINAR_END if laminar else RE_TURBULENT_START
    return Re


def circuit_methods(design, cr: CircuitResult, r) -> tuple[MethodUse, ...]:
    """Range checks of the line friction and fitting methods at the operating flow, one row per method.

    ``r`` is the plate's result at the operating point.  Each method is checked at every part that uses it;
    the row shows the lowest Reynolds number among them.
    """
    c = design.circuit
    plate = PlateAt(design)
    down = plate.downstream(r)
    k = c.plate_index
    seen: dict[str, list] = {}
    for i, p in enumerate(c.parts):
        f = plate.upstream if i <= k else down
        V_dot = r.m_dot / f.rho
        if isinstance(p, Line):
            _, fr, Re = dp_line(V_dot, p, f.rho, f.mu)
            for v in fr.methods:
                Re_v = _evaluated_at(v, Re)
                seen.setdefault(v.method, [v, "circuit lines", []])[2].append(
                    (p.name, {"Re": Re_v, "L_over_D": p.length / p.diameter, "x_plus": p.length / (p.diameter * Re_v)}))
        elif isinstance(p, Fitting):
            Re = f.rho * (V_dot / (math.pi * p.diameter**2 / 4)) * p.diameter / f.mu
            v = K_fitting.validity
            seen.setdefault(v.method, [v, "circuit fittings", []])[2].append((p.name, {"Re": Re}))
    out = []
    for v, role, uses in seen.values():
        outside = tuple(f"{name}: {msg}" for name, values in uses for msg in v.violations(**values))
        worst = min(uses, key=lambda u: u[1]["Re"])[1]
        used = {key: float(x) for key, x in worst.items() if any(b.variable == key for b in v.bounds)}
        out.append(MethodUse(role=role, method=v.method, reference=v.reference, validity=v.describe(),
                             values=tuple(used.items()), outside=outside))
    return tuple(out)

