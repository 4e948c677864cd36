"""Frozen results of the supply side: the operating point in its circuit, and water planning (SI, kelvin).

Fields are part of the interface the reports read (see README "[circuit]" and DEVELOPERS.md).
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class SystemCurve:
    """Pressure the supply must hold against flow: the whole circuit including the plate, and the plate alone.

    ``dp_circuit`` counts every loss, the lifts, the check valves' opening losses and the outlet's back
    pressure (a pump's system curve); ``dp_plate`` is the plate's own drop.  Flows where the plate cannot
    run (the coolant would boil) are left out.
    """

    V_dot: tuple[float, ...]  #: [m^3/s]
    dp_circuit: tuple[float, ...]  #: [Pa]
    dp_plate: tuple[float, ...]  #: [Pa]


@dataclass(frozen=True)
class PumpCurve:
    V_dot: tuple[float, ...]  #: [m^3/s]
    dp: tuple[float, ...]  #: the pump's pressure rise [Pa] (fitted curve sampled over its table)


@dataclass(frozen=True)
class CircuitResult:
    drive: str  #: "flow", "pressure" or "pump"
    V_dot: float  #: operating flow [m^3/s]
    supply_pressure: float | None  #: gauge pressure at the supply used [Pa]: static, or suction + pump rise
    plate_inlet_pressure: float  #: gauge [Pa] while flowing
    points: tuple[tuple[str, float], ...]  #: ("supply", p0), (part, gauge pressure after it)..., ("outlet", p)
    curve: SystemCurve
    pump: PumpCurve | None
    needed_pressure: float  #: what the circuit needs at the supply for V_dot [Pa] (gauge)
    plate_outlet_pressure: float  #: gauge [Pa] while flowing
    heights: tuple[tuple[str, float], ...]  #: (part, height after it above the supply point [m])
    surges: tuple[tuple[str, float], ...]  #: (fast-closing valve, Joukowsky pressure rise [Pa])
    m_dot: float  #: [kg/s]
    plate_rating: float  #: the plate's stated or usual pressure rating, gauge [Pa]


@dataclass(frozen=True)
class UseCurve:
    """Once-through water use against the hottest mounting-face temperature, over a range of flows."""

    V_dot: tuple[float, ...]  #: [m^3/s]
    T_face: tuple[float, ...]  #: [K]
    T_out: tuple[float, ...]  #: discharge [K]
    m3_per_year: tuple[float, ...]


@dataclass(frozen=True)
class Breakeven:
    """Once-through water against a recirculating chiller's electricity, per year, in the user's currency."""

    chiller_power: float  #: [W] electrical
    electricity_cost_per_year: float  #: chiller running the same hours
    water_cost_per_year: float  #: once-through at the operating flow
    breakeven_flow: float  #: flow whose water bill equals the chiller's electricity [m^3/s]
    breakeven_tariff: float  #: water price per m^3 at which the operating flow costs the same
    saving_per_year: float  #: water cost - electricity cost (positive: the chiller saves money)
    payback_years: float | None  #: chiller price / saving, when the price is given and the saving positive


@dataclass(frozen=True)
class PlanningResult:
    V_dot_min: float  #: least flow meeting the limits [m^3/s]; math.inf when no flow meets them
    binding: str  #: "mounting face", "discharge" or "unreachable"
    face_limit: float | None  #: [K]
    discharge_limit: float  #: [K]
    T_face_at_min: float | None  #: [K] at V_dot_min (None when unreachable)
    T_out_at_min: float | None  #: [K]
    water_L_per_day: float  #: at the operating flow
    water_m3_per_year: float
    water_m3_per_year_min: float | None  #: at V_dot_min
    cost_per_year: float | None  #: at the operating flow, in `currency`
    cost_per_year_min: float | None
    currency: str | None
    waste_ratio: float | None  #: operating flow / least flow
    use_curve: UseCurve
    breakeven: Breakeven | None
    #: where ``face_limit`` comes from: "face_limit" ([supply]), "module hot-side limit", or "none" (no
    #: mounting-face limit: the least flow keeps the drain limit only, and no flow is advised from it)
    face_limit_from: str = "face_limit"
