"""The finned air sink as a model: straight plate fins on a base, evaluated for whole arrays of candidates.

Geometry: ``N`` fins of thickness ``t`` and height ``H`` standing on a base of thickness ``b`` that covers the
envelope's ``L`` (along the air) by ``W`` (across the fins); the ``N - 1`` gaps ``s = (W - N t)/(N - 1)``
carry the air.  Every function takes numpy arrays (one entry per candidate) and returns arrays; the one-sink
solve in :mod:`coldplate.air.stage` calls the same functions with one-entry arrays.

Forced air (fan or approach velocity) is ducted: all of it goes between the fins (a shroud over the tips, no
bypass), each gap a rectangular duct s x H heated on the two fins and the base ("3L"), the tips against the
shroud (adiabatic tip).  The fins are smeared into a coefficient on the base's fin side,
h_eff = h (eta 2 N H L + (N - 1) s L) / (L W), and the base spreads the footprint's heat to it by the
Muzychka, Culham & Yovanovich series.  The air warms along the sink; the face is taken above the air's outlet
temperature, T_face = T_out + P (R_centroid(h_eff) + R_interface): against the exact isothermal-base answer
(effectiveness 1 - exp(-NTU)) this never gives a cooler face, since 1/(1 - e^-NTU) <= 1 + 1/NTU.

Natural convection: fins vertical, the air rising along ``L`` through the gaps; Bar-Cohen & Rohsenow's Nu on
the base-to-ambient difference (so the air's rise is inside it), tips open (corrected fin length), the
coefficient found with the base temperature by bisection (Ra depends on it).
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np
from CoolProp.CoolProp import PropsSI

from coldplate.air import correlations as corr
from coldplate.plate.conduction import fin_efficiency_straight, fin_m, spreading_MCY
from coldplate.plate.convection import nusselt
from hydraulics.friction import DuctFriction, darcy_friction
from hydraulics.losses import K_sudden_contraction, K_sudden_expansion

#: Density of the sink materials [kg/m^3] for the sink's mass (ASM Handbook Vol. 2, 1990, and Incropera et al.
#: 6th ed. Table A.1; from memory).  A material without an entry is refused by the stage.
DENSITY = {"aluminium-6061": 2700.0, "aluminium-6063": 2690.0, "aluminium-1100": 2710.0, "copper": 8930.0,
           "brass": 8500.0}
#: Heated walls of a fin gap: the two fins (long sides) and the base (one short side); the shroud is adiabatic.
HEATED = "3L"


@dataclass(frozen=True)
class AirProps:
    """Dry air at one temperature and pressure (CoolProp's pseudo-pure "Air", Lemmon et al. 2000)."""

    T: float  #: [K]
    p: float  #: [Pa]
    rho: float  #: [kg/m^3]
    mu: float  #: [Pa s]
    k: float  #: [W/(m K)]
    cp: float  #: [J/(kg K)]

    @property
    def Pr(self) -> float:
        return self.mu * self.cp / self.k

    @property
    def nu(self) -> float:
        return self.mu / self.rho

    @property
    def alpha(self) -> float:
        return self.k / (self.rho * self.cp)


def air_props(T: float, p: float) -> AirProps:
    """Dry-air properties from CoolProp at T [K], p [Pa]."""
    get = lambda key: float(PropsSI(key, "T", T, "P", p, "Air"))  # noqa: E731
    return AirProps(T, p, get("D"), get("V"), get("L"), get("C"))


@lru_cache(maxsize=16)
def air_props_table(T_low: float, p: float, span: float = 1200.0, step: float = 2.0):
    """Dry-air properties as a function of arrays of temperature: CoolProp at nodes ``step`` K apart from
    ``T_low`` over ``span`` K, interpolated linearly (for the search's many candidates; the chosen sink is
    solved with CoolProp directly).  Returns ``props_at(T) -> AirProps`` of arrays.  Kept per room and pressure
    (its 2,400 CoolProp calls are most of an air check; a live re-check asks again)."""
    T = np.arange(T_low, T_low + span + step, step)
    cols = {key: np.array([PropsSI(key, "T", float(x), "P", p, "Air") for x in T]) for key in ("D", "V", "L", "C")}
    for a in (T, *cols.values()):
        a.flags.writeable = False

    def props_at(Tq):
        Tq = np.clip(np.asarray(Tq, dtype=float), T[0], T[-1])
        return AirProps(Tq, p, *(np.interp(Tq, T, cols[k]) for k in ("D", "V", "L", "C")))

    return props_at


@dataclass
class Candidates:
    """Fin arrays of equal length: count ``N``, thickness ``t`` [m], height ``H`` [m]."""

    N: np.ndarray
    t: np.ndarray
    H: np.ndarray

    def gap(self, W: float) -> np.ndarray:
        return (W - self.N * self.t) / (self.N - 1)


def channel(c: Candidates, W: float):
    """Per candidate: gap s, flow area of the gaps, hydraulic diameter and aspect ratio (short/long)."""
    s = c.gap(W)
    area = (c.N - 1) * s * c.H
    D_h = 2.0 * s * c.H / (s + c.H)
    alpha = np.minimum(s, c.H) / np.maximum(s, c.H)
    return s, area, D_h, alpha


def pressure_drop(c: Candidates, Q, air, pr: AirProps):
    """Pressure drop [Pa] of the air ``Q`` [m^3/s] through each candidate's gaps: sharp entry, apparent
    friction over the length, sharp exit, on the gap velocity (frontal area W x H before and after).
    Returns (dp, velocity, Re, friction result, K_entry, K_exit)."""
    s, area, D_h, alpha = channel(c, air.width)
    V = np.maximum(np.asarray(Q, dtype=float), 1e-12) / area  # a fan table starting at no flow: dp -> 0 there
    Re = pr.rho * V * D_h / pr.mu
    fr = darcy_friction(Re, air.length, D_h, alpha, "rectangle")
    front = air.width * c.H
    Kc = K_sudden_contraction(front, area)
    Ke = K_sudden_expansion(area, front)
    dp = (Kc + Ke + fr.f * air.length / D_h) * 0.5 * pr.rho * V**2
    return dp, V, Re, fr, Kc, Ke


def pressure_drop_many(c: Candidates, air, pr: AirProps):
    """``dp(Q)`` [Pa] of every candidate at its air flow Q [m^3/s] (an array like the candidates'):
    :func:`pressure_drop`'s value with the geometry held (the friction through
    :class:`hydraulics.friction.DuctFriction` over the candidates), for the fans' operating points of the search."""
    s, area, D_h, alpha = channel(c, air.width)
    front = air.width * c.H
    K = K_sudden_contraction(front, area) + K_sudden_expansion(area, front)
    friction = DuctFriction(air.length, D_h, alpha, "rectangle")

    def dp(Q):
        V = np.maximum(np.asarray(Q, dtype=float), 1e-12) / area
        return (K + friction(pr.rho * V * D_h / pr.mu) * air.length / D_h) * 0.5 * pr.rho * V**2

    return dp


def pressure_drop_of_one(c: Candidates, air, pr: AirProps):
    """``dp(Q)`` [Pa] of one sink (one-entry candidate arrays) at an air flow Q [m^3/s], a float:
    :func:`pressure_drop_many` for that sink, for the fan's operating point."""
    many = pressure_drop_many(c, air, pr)
    return lambda Q: float(many(np.full(1, float(Q)))[0])


def forced_conductance(c: Candidates, Q, air, pr: AirProps):
    """Fin-side conductance hA [W/K] of each candidate at air flow Q [m^3/s], with h, Nu, eta and Bi.
    Returns (hA, h, Nu, eta, Bi, convection result)."""
    s, area, D_h, alpha = channel(c, air.width)
    V = np.asarray(Q, dtype=float) / area
    Re = pr.rho * V * D_h / pr.mu
    cv = nusselt(Re, pr.Pr, air.length, D_h, alpha, heated=HEATED)
    h = cv.Nu * pr.k / D_h
    eta = fin_efficiency_straight(fin_m(h, air.conductivity, c.t), c.H)  # tip against the shroud
    hA = h * (eta * 2.0 * c.N * c.H * air.length + (c.N - 1) * s * air.length)
    return hA, h, cv.Nu, eta, h * 0.5 * c.t / air.conductivity, cv


def natural_conductance(c: Candidates, P: float, air, props_at, iterations: int = 50):
    """Fin-side conductance hA [W/K] by natural convection at heat P [W], with the base's rise over the
    ambient air [K], h, Nu, eta, Bi and El.  The rise dT solves dT = P / hA(dT) (bisection on every candidate at
    once: hA grows with dT, so the difference is monotone); properties at the film temperature."""
    s = c.gap(air.width)
    T0 = air.temperature
    lo, hi = np.full(c.N.shape, 1e-3), np.full(c.N.shape, 1000.0)

    def at(dT):
        pr = props_at(T0 + 0.5 * dT)
        El = corr.G0 * (1.0 / pr.T) * dT * s**4 / (pr.nu * pr.alpha * air.length)
        Nu = corr.Nu_vertical_channel_Bar_Cohen_Rohsenow(El)
        h = Nu * pr.k / s
        eta = corr.fin_efficiency_corrected_tip(fin_m(h, air.conductivity, c.t), c.H, c.t)
        hA = h * (eta * 2.0 * c.N * (c.H + 0.5 * c.t) * air.length + (c.N - 1) * s * air.length)
        return hA, h, Nu, eta, h * 0.5 * c.t / air.conductivity, El

    for _ in range(iterations):
        mid = np.sqrt(lo * hi)
        hA = at(mid)[0]
        big = mid * hA > P  # this rise sheds more than P: the answer is lower
        hi = np.where(big, mid, hi)
        lo = np.where(big, lo, mid)
    dT = np.sqrt(lo * hi)
    return (*at(dT), dT)


def mass(c: Candidates, air, density: float):
    """Sink mass [kg]: fins and base."""
    return density * air.length * (c.N * c.t * c.H + air.width * air.base)


class SpreadingTable:
    """The base's spreading rise at the source centre per watt, R_centroid - R_1D, against h_eff [W/(m^2 K)],
    from the exact series at nodes (16 a decade) and interpolated in log h; the one-dimensional part
    R_1D = (b/k + 1/h_eff)/(L W) is added exactly.  For the search; the chosen sink gets the exact series."""

    def __init__(self, air, fp_l: float, fp_w: float):
        self.air, self.fp = air, (fp_l, fp_w)
        self.h = np.logspace(-1.0, 5.0, 97)
        self.spread = np.array([self._exact(h) - self._one_d(h) for h in self.h])

    def _one_d(self, h):
        a = self.air
        return (a.base / a.conductivity + 1.0 / h) / (a.length * a.width)

    def _exact(self, h):
        a = self.air
        return spreading_MCY(a.length, a.width, self.fp[0], self.fp[1], a.base, a.conductivity, h).R_centroid

    def R_centroid(self, h_eff):
        h_eff = np.asarray(h_eff, dtype=float)
        return np.interp(np.log(h_eff), np.log(self.h), self.spread) + self._one_d(h_eff)


@lru_cache(maxsize=32)
def spreading_table(air, fp_l: float, fp_w: float) -> SpreadingTable:
    """The :class:`SpreadingTable` of one sink base and footprint, kept (its 97 exact series depend on the design
    alone, and a live re-check or a module solve asks for the same table again)."""
    table = SpreadingTable(air, fp_l, fp_w)
    table.h.flags.writeable = table.spread.flags.writeable = False
    return table


def exact_centroid(air, fp_l: float, fp_w: float, h_eff: float):
    """The spreading series at one sink (the chosen one): the Spreading record."""
    return spreading_MCY(air.length, air.width, fp_l, fp_w, air.base, air.conductivity, float(h_eff))


def air_rise(P, m_dot, cp):
    """The air's rise through the sink [K]: the energy balance P = m_dot cp (T_out - T_in)."""
    return np.asarray(P, dtype=float) / (np.asarray(m_dot, dtype=float) * cp)


def frontal_flow(air, H, velocity: float):
    """Air through the fins at an approach velocity [m^3/s]: the velocity over the fins' frontal area W x H
    (ducted, no bypass)."""
    return velocity * air.width * np.asarray(H, dtype=float)
