"""The lines around a cold plate: hose runs, fittings, valves, a backflow device, lifts and the outlet.

A :class:`Circuit` is the list of parts in flow order with one :class:`PlateSlot` where the plate sits.  This
module computes each part's pressure loss at a mass flow, and the pressure left after every part, given the
plate's own pressure drop from elsewhere (the plate is not modelled here).  SI throughout; pressures are gauge.

Methods:

* straight runs: Darcy-Weisbach, dp = f (L/D) rho V^2 / 2, with :func:`hydraulics.friction.darcy_friction`
  (apparent laminar friction in developing flow, Gnielinski's transition blend, Colebrook for rough walls);
* fittings: loss coefficients K from individual ``fluids.fittings`` functions, listed in :data:`FITTINGS`
  with their source, dp = K rho V^2 / 2 on the line velocity;
* control valves by their flow coefficient (IEC 60534-1 definition): dp = (rho/1000) (Q/Kv)^2 * 1e5 with
  Q in m^3/h and dp in Pa; Cv = 1.156 Kv (US gallons per minute at 1 psi);
* a backflow device by its loss at a rated flow: dp = dp_open + (dp_rated - dp_open) (Q/Q_rated)^2 while
  water flows (the spring-loaded checks hold ``dp_open`` even at small flow);
* a lift: rho g dz; the outlet: a back pressure (zero for a free discharge) plus the exit loss (K = 1).

Every loss takes floats or numpy arrays of rows (the flows, the fluids' values and the plate's drop per row:
the uncertainty band's supply rows); a float in gives a float out.

Velocity-head changes between lines of different size are not tracked separately: the pressures reported
are static gauge pressures with the kinetic energy counted as lost only at the outlet (cautious for the flow).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

import numpy as np
from fluids.fittings import (
    K_ball_valve_Crane,
    K_branch_diverging_Crane,
    K_gate_valve_Crane,
    K_globe_valve_Crane,
    K_swing_check_valve_Crane,
    bend_rounded_Crane,
    contraction_sharp,
    diffuser_sharp,
    exit_normal,
    ft_Crane,
)

from hydraulics.friction import darcy_friction
from hydraulics.validity import Bound, Validity, with_validity

G = 9.80665  #: standard gravity [m/s^2]
#: Cv in US gallons per minute at 1 psi per Kv in m^3/h at 1 bar (IEC 60534-1; Cv = 1.156 Kv).
CV_PER_KV = 1.156

_CRANE = "Crane Co., Flow of Fluids Through Valves, Fittings and Pipe, Technical Paper 410 (2009)"
_CRANE_A29 = f"{_CRANE}, p. A-29 K = n fT with fT from fluids.fittings.ft_Crane; from memory"
_RENNELS = "Rennels & Hudson, Pipe Flow (Wiley 2012), as implemented in fluids.fittings"


# ---------------------------------------------------------------- fitting table

@dataclass(frozen=True)
class Term:
    """One call to a fluids function: K = multiplier * function(**arguments(D, D_other)).

    ``basis`` says which diameter's velocity K refers to: "line" (the part's diameter) or "other" (the
    bore of a barb, the far side of a contraction); K is converted to the line velocity.
    """

    function: Callable
    arguments: Callable[[float, float | None], dict]
    multiplier: float = 1.0
    basis: str = "line"


@dataclass(frozen=True)
class FittingKind:
    terms: tuple[Term, ...]
    needs_other: bool  #: needs a second diameter (``bore``)
    source: str


#: Our fitting names -> the fluids.fittings functions and arguments that give K.  tests/test_circuit.py
#: checks that every name calls the function named here.
FITTINGS: dict[str, FittingKind] = {
    "elbow-90": FittingKind((Term(ft_Crane, lambda D, o: {"D": D}, 30.0),), False,
                            f"standard 90° elbow, K = 30 fT: {_CRANE_A29}"),
    "elbow-45": FittingKind((Term(ft_Crane, lambda D, o: {"D": D}, 16.0),), False,
                            f"standard 45° elbow, K = 16 fT: {_CRANE_A29}"),
    "tee-run": FittingKind((Term(ft_Crane, lambda D, o: {"D": D}, 20.0),), False,
                           f"standard tee, flow through the run, K = 20 fT: {_CRANE_A29}"),
    "tee-branch": FittingKind((Term(K_branch_diverging_Crane,
                                    lambda D, o: {"D_run": D, "D_branch": D, "Q_run": 1.0, "Q_branch": 1.0}),),
                              False, f"tee, all flow turned into the branch: {_CRANE} (2009 branch formula)"),
    "bend-90": FittingKind((Term(bend_rounded_Crane, lambda D, o: {"Di": D, "angle": 90.0,
                                                                    "bend_diameters": 1.5}),), False,
                           f"smooth 90° bend of a hose or tube, radius 1.5 D: {_CRANE}"),
    "ball-valve": FittingKind((Term(K_ball_valve_Crane, lambda D, o: {"D1": D, "D2": D, "angle": 0.0}),), False,
                              f"full-bore ball valve, open: {_CRANE}"),
    "gate-valve": FittingKind((Term(K_gate_valve_Crane, lambda D, o: {"D1": D, "D2": D, "angle": 0.0}),), False,
                              f"gate valve, open: {_CRANE}"),
    "globe-valve": FittingKind((Term(K_globe_valve_Crane, lambda D, o: {"D1": D, "D2": D}),), False,
                               f"globe valve, open: {_CRANE}"),
    "check-valve": FittingKind((Term(K_swing_check_valve_Crane, lambda D, o: {"D": D, "angled": False}),), False,
                               f"swing check valve: {_CRANE}"),
    "contraction": FittingKind((Term(contraction_sharp, lambda D, o: {"Di1": D, "Di2": o}, basis="other"),), True,
                               f"sharp-edged contraction into the smaller ``bore``: {_RENNELS}"),
    "expansion": FittingKind((Term(diffuser_sharp, lambda D, o: {"Di1": D, "Di2": o}),), True,
                             f"sudden expansion into the larger ``bore``: {_RENNELS}"),
    "hose-barb": FittingKind((Term(contraction_sharp, lambda D, o: {"Di1": D, "Di2": o}, basis="other"),
                              Term(diffuser_sharp, lambda D, o: {"Di1": o, "Di2": D}, basis="other")), True,
                             f"hose barb: sharp contraction into the barb's ``bore`` and sudden expansion out: {_RENNELS}"),
}

FITTING_K = Validity(
    method="fitting K (Crane, Rennels)",
    reference=f"{_CRANE}; {_RENNELS}; K for turbulent flow",
    bounds=(Bound("Re", 4000.0, math.inf, "turbulent; in slower flow the fitting losses rise (Hooper 1981); "
                                          "common practice"),),
)


@with_validity(FITTING_K)
def K_fitting(name: str, D: float, other: float | None = None) -> float:
    """Loss coefficient K [-] of fitting ``name`` on the velocity in a line of inner diameter D [m].

    K = sum of multiplier * fluids_function(...) over the entry's terms, each converted from the velocity of
    its basis diameter to the line's: K_line = K_other * (D / D_other)^4.  ``other`` [m] is the bore of a
    barb, contraction or expansion.  Unknown names raise KeyError listing the known ones.
    """
    if name not in FITTINGS:
        raise KeyError(f"unknown fitting {name!r}; known: {', '.join(FITTINGS)}")
    kind = FITTINGS[name]
    if kind.needs_other and (other is None or other <= 0):
        raise ValueError(f"fitting {name!r} needs its bore")
    total = 0.0
    for t in kind.terms:
        K = t.multiplier * float(t.function(**t.arguments(D, other)))
        total += K * (D / other) ** 4 if t.basis == "other" else K
    return total


# ---------------------------------------------------------------- parts

@dataclass(frozen=True)
class Line:
    """A hose or tube run."""

    name: str
    diameter: float  #: inner [m]
    length: float  #: [m]
    roughness: float  #: absolute [m]


@dataclass(frozen=True)
class Fitting:
    name: str
    fitting: str  #: key of :data:`FITTINGS`
    diameter: float  #: line inner diameter [m]
    count: int = 1
    bore: float | None = None  #: barb bore or the other diameter of a contraction/expansion [m]


@dataclass(frozen=True)
class Valve:
    """A flow-control or solenoid valve given by its Kv [m^3/h at 1 bar]."""

    name: str
    Kv: float
    solenoid: bool = False  #: closes fast (water hammer)
    diameter: float | None = None  #: its line diameter [m], for the surge velocity


@dataclass(frozen=True)
class Backflow:
    """A backflow preventer by its loss: dp_open once it opens, dp_rated at the rated flow."""

    name: str
    device: str
    dp_rated: float  #: [Pa] at flow_rated
    flow_rated: float  #: [m^3/s]
    dp_open: float = 0.0  #: [Pa] held by its checks at any flow


@dataclass(frozen=True)
class Rise:
    """A change of height along the flow (negative: downhill) [m]."""

    name: str
    height: float


@dataclass(frozen=True)
class PlateSlot:
    name: str = "plate"


Part = Line | Fitting | Valve | Backflow | Rise | PlateSlot


@dataclass(frozen=True)
class Circuit:
    parts: tuple[Part, ...]
    back_pressure: float = 0.0  #: gauge at the outlet [Pa]; 0 = free discharge
    outlet_diameter: float | None = None  #: [m]
    air_gap: float | None = None  #: outlet above the drain's flood rim [m], when given

    @property
    def plate_index(self) -> int:
        return next(i for i, p in enumerate(self.parts) if isinstance(p, PlateSlot))

    def can_hold_pressure(self, after: int = -1) -> bool:
        """Whether anything after part ``after`` can hold the line under pressure: a shut-off or control
        valve, a check valve, or a back pressure at the outlet (what rules out an atmospheric vacuum breaker)."""
        closing = ("ball-valve", "gate-valve", "globe-valve", "check-valve")
        rest = self.parts[after + 1:]
        return self.back_pressure > 0 or any(
            isinstance(p, Valve) or (isinstance(p, Fitting) and p.fitting in closing) for p in rest)

    def outlet_side_held(self) -> bool:
        """:meth:`can_hold_pressure` after the first backflow device, or after the supply when none is listed."""
        first = next((i for i, p in enumerate(self.parts) if isinstance(p, Backflow)), -1)
        return self.can_hold_pressure(first)

    def heights(self) -> tuple[float, ...]:
        """Height of the water after each part, relative to the supply point [m]."""
        z, out = 0.0, []
        for p in self.parts:
            if isinstance(p, Rise):
                z += p.height
            out.append(z)
        return tuple(out)


#: Pressure-wave speed used for the surge of a fast-closing valve [m/s]: about that of water in a rigid metal
#: tube (1200-1450 m/s); a hose is far softer and surges less, so this is the cautious value (common practice).
WAVE_SPEED = 1400.0


def surge_Joukowsky(rho: float, V: float, a: float = WAVE_SPEED) -> float:
    """Pressure rise when a valve stops a flow of velocity V [m/s] instantly [Pa]: dp = rho a V.

    Joukowsky (1898); valid for closure faster than the wave's round trip 2 L / a.
    """
    return rho * a * V


def Kv_from_Cv(Cv: float) -> float:
    """Kv [m^3/h at 1 bar] from Cv [US gal/min at 1 psi]: Kv = Cv / 1.156 (IEC 60534-1)."""
    return Cv / CV_PER_KV


def dp_valve_Kv(V_dot: float, Kv: float, rho: float) -> float:
    """Pressure loss of a valve [Pa]: dp = (rho/1000) (Q/Kv)^2 * 1e5, Q = 3600 V_dot [m^3/h] (IEC 60534-1)."""
    return rho / 1000.0 * (3600.0 * V_dot / Kv) ** 2 * 1e5


def _number(x):
    """A float for a scalar, else the array (the circuit's functions take floats or arrays of flows)."""
    return float(x) if np.ndim(x) == 0 else np.asarray(x, dtype=float)


def dp_backflow(V_dot: float, part: Backflow) -> float:
    """Loss of a backflow device [Pa] at V_dot [m^3/s]; 0 at no flow (floats or arrays)."""
    V = np.asarray(V_dot, dtype=float)
    return _number(np.where(V > 0, part.dp_open + (part.dp_rated - part.dp_open) * (V / part.flow_rated) ** 2, 0.0))


def dp_line(V_dot: float, part: Line, rho: float, mu: float):
    """Darcy-Weisbach loss of a straight run [Pa] and the friction result (its methods for range checks), and
    the Reynolds number; floats or arrays (the uncertainty band's rows)."""
    A = math.pi * part.diameter**2 / 4
    V = V_dot / A
    Re = np.maximum(rho * V * part.diameter / mu, 1e-6)
    fr = darcy_friction(Re, part.length, part.diameter, 1.0, "circle", part.roughness / part.diameter)
    return _number(np.asarray(fr.f) * part.length / part.diameter * 0.5 * rho * V**2), fr, _number(Re)


# ---------------------------------------------------------------- the walk along the circuit

@dataclass(frozen=True)
class Fluid:
    """What the lines need of the coolant on one side of the plate."""

    rho: float  #: [kg/m^3]
    mu: float  #: [Pa s]


@dataclass(frozen=True)
class PartLoss:
    name: str
    dp: float  #: pressure lost across the part [Pa] (for a lift: rho g dz)
    Re: float | None  #: in the part's line, where it has one
    methods: tuple  #: Validity records used


def part_loss(part: Part, m_dot: float, fluid: Fluid, dp_plate: float) -> PartLoss:
    """The pressure lost across one part at mass flow m_dot [kg/s] (floats, or arrays of rows with the fluid's
    and the plate's values per row)."""
    V_dot = m_dot / fluid.rho
    if isinstance(part, PlateSlot):
        return PartLoss(part.name, dp_plate, None, ())
    if isinstance(part, Line):
        dp, fr, Re = dp_line(V_dot, part, fluid.rho, fluid.mu)
        return PartLoss(part.name, dp, Re, fr.methods)
    if isinstance(part, Fitting):
        V = V_dot / (math.pi * part.diameter**2 / 4)
        Re = fluid.rho * V * part.diameter / fluid.mu
        K = K_fitting(part.fitting, part.diameter, part.bore)
        return PartLoss(part.name, part.count * K * 0.5 * fluid.rho * V**2, Re, (K_fitting.validity,))
    if isinstance(part, Valve):
        return PartLoss(part.name, dp_valve_Kv(V_dot, part.Kv, fluid.rho), None, ())
    if isinstance(part, Backflow):
        return PartLoss(part.name, dp_backflow(V_dot, part), None, ())
    if isinstance(part, Rise):
        return PartLoss(part.name, fluid.rho * G * part.height, None, ())
    raise TypeError(f"not a circuit part: {part!r}")


def exit_loss(circuit: Circuit, m_dot: float, fluid: Fluid) -> float:
    """Kinetic energy lost at the outlet [Pa]: K = 1 (``fluids.fittings.exit_normal``) on the outlet velocity."""
    D = circuit.outlet_diameter
    if D is None:
        return 0.0
    V = m_dot / fluid.rho / (math.pi * D**2 / 4)
    return float(exit_normal()) * 0.5 * fluid.rho * V**2


def walk(circuit: Circuit, m_dot: float, upstream: Fluid, downstream: Fluid, dp_plate: float,
         p_start: float) -> tuple[tuple[PartLoss, ...], tuple[float, ...], float]:
    """Losses of every part and the gauge pressure after each, from ``p_start`` at the supply [Pa].

    Parts before the plate see the ``upstream`` fluid, parts after it the ``downstream`` (warmer) fluid at the
    same mass flow.  Returns (losses, pressures after each part, pressure left at the outlet after the exit
    loss); the outlet must hold ``circuit.back_pressure`` when the flow is the operating flow.
    """
    k = circuit.plate_index
    losses, pressures, p = [], [], p_start
    for i, part in enumerate(circuit.parts):
        loss = part_loss(part, m_dot, upstream if i <= k else downstream, dp_plate)
        p -= loss.dp
        losses.append(loss)
        pressures.append(p)
    return tuple(losses), tuple(pressures), p - exit_loss(circuit, m_dot, downstream)


def required_pressure(circuit: Circuit, m_dot: float, upstream: Fluid, downstream: Fluid,
                      dp_plate: float) -> float:
    """Gauge pressure the supply must hold for mass flow m_dot [Pa]: every loss, the lifts, the back pressure."""
    _, _, p_end = walk(circuit, m_dot, upstream, downstream, dp_plate, 0.0)
    return circuit.back_pressure - p_end


def static_head(circuit: Circuit, upstream: Fluid, downstream: Fluid) -> float:
    """Pressure the supply must exceed before any water flows [Pa]: back pressure, lifts and check openings."""
    k = circuit.plate_index
    total = circuit.back_pressure
    for i, part in enumerate(circuit.parts):
        rho = (upstream if i <= k else downstream).rho
        if isinstance(part, Rise):
            total += rho * G * part.height
        elif isinstance(part, Backflow):
            total += part.dp_open
    return total
