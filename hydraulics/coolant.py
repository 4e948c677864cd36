"""Coolant properties from CoolProp, with the liquid state checked here.

CoolProp is imported in this module only.  Water uses the IAPWS-IF97 backend
(``IF97::Water``): about twenty times faster than the default IAPWS-95 backend and
within 0.05 % of it for the liquid (IAPWS R7-97).  Glycol mixtures use CoolProp's
incompressible-liquid data (``INCOMP::MEG``/``MPG`` by mass fraction,
``INCOMP::AEG``/``APG`` by volume fraction).

CoolProp does not refuse every state a cooling circuit must not reach: at a
temperature above saturation it silently returns steam, and some backends reject
water at exactly 0.00 degC.  :meth:`Coolant.check_liquid` therefore checks the
state against the freezing and boiling points itself and raises a clear
:class:`StateError` naming the field.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import CoolProp.CoolProp as CP

#: Standard atmosphere [Pa].
P_ATM = 101325.0
#: Freezing point of water at one atmosphere [K] (ice point, IAPWS).
T_FREEZE_WATER = 273.15


class StateError(ValueError):
    """The coolant is not a single-phase liquid at the requested state.

    ``hydraulics`` never imports ``coldplate``; the design layer re-raises this as
    its own StateError with the field name.
    """


@dataclass(frozen=True)
class Props:
    """Transport and thermodynamic properties at one state (SI)."""

    T: float  #: temperature [K]
    p: float  #: absolute pressure [Pa]
    rho: float  #: density [kg/m^3]
    mu: float  #: dynamic viscosity [Pa s]
    cp: float  #: isobaric specific heat [J/(kg K)]
    k: float  #: thermal conductivity [W/(m K)]

    @property
    def Pr(self) -> float:
        """Prandtl number cp·mu/k [-]."""
        return self.cp * self.mu / self.k

    @property
    def nu(self) -> float:
        """Kinematic viscosity [m^2/s]."""
        return self.mu / self.rho


_GLYCOLS = {
    ("ethylene-glycol", "mass"): "MEG",
    ("propylene-glycol", "mass"): "MPG",
    ("ethylene-glycol", "volume"): "AEG",
    ("propylene-glycol", "volume"): "APG",
}

FLUIDS = ("water", "ethylene-glycol", "propylene-glycol")


@dataclass(frozen=True)
class Coolant:
    """A coolant: water, or a glycol-water mixture with its fraction's basis stated."""

    fluid: str = "water"
    fraction: float = 0.0  #: glycol fraction [-], 0..0.6
    basis: str = "mass"  #: "mass" or "volume"

    def __post_init__(self):
        if self.fluid not in FLUIDS:
            raise ValueError(f"unknown fluid {self.fluid!r}; known: {', '.join(FLUIDS)}")
        if self.fluid != "water":
            if self.basis not in ("mass", "volume"):
                raise ValueError(f"fraction basis must be 'mass' or 'volume', not {self.basis!r}")
            if not (0.05 <= self.fraction <= 0.6):
                raise ValueError(f"glycol fraction {self.fraction:.3g} outside 0.05..0.6 (CoolProp's data range)")

    @property
    def backend(self) -> str:
        """The CoolProp fluid string."""
        if self.fluid == "water":
            return "IF97::Water"
        return f"INCOMP::{_GLYCOLS[(self.fluid, self.basis)]}[{self.fraction:.4f}]"

    @property
    def is_water(self) -> bool:
        return self.fluid == "water"

    @property
    def has_additive(self) -> bool:
        """Glycol or another additive makes a potable cross-connection a high hazard."""
        return not self.is_water

    def label(self) -> str:
        if self.is_water:
            return "water"
        return f"{self.fluid} {self.fraction * 100:.0f} % by {self.basis} in water"

    def freezing_point(self) -> float:
        """Freezing point [K] (water: the ice point; mixtures: CoolProp's T_freeze)."""
        if self.is_water:
            return T_FREEZE_WATER
        return _freeze(self.backend)

    def boiling_point(self, p: float) -> float:
        """Saturation temperature of water at absolute pressure ``p`` [K].

        Used for mixtures too: glycol raises the boiling point, so water's value is
        the cautious limit.
        """
        return _tsat(p)

    def upper_limit(self, p: float) -> float:
        """Highest usable temperature [K]: the boiling point or the end of the property data."""
        return min(self.boiling_point(p), _tmax(self.backend))

    def check_liquid(self, T: float, p: float) -> None:
        """Raise :class:`StateError` unless the coolant is a liquid at (T, p)."""
        if not (math.isfinite(T) and math.isfinite(p)) or p <= 0:
            raise StateError(f"state T = {T} K, p = {p} Pa is not physical")
        tf = self.freezing_point()
        if T <= tf:
            raise StateError(
                f"{self.label()} freezes at {tf - 273.15:.2f} degC; {T - 273.15:.2f} degC is at or below it"
            )
        tmax = _tmax(self.backend)
        if T >= tmax:
            raise StateError(
                f"{T - 273.15:.1f} degC is beyond CoolProp's property data for {self.label()} "
                f"(up to {tmax - 273.15:.1f} degC)"
            )
        tb = self.boiling_point(p)
        if T >= tb - SATURATION_MARGIN_K:
            raise StateError(
                f"{self.label()} boils at {tb - 273.15:.1f} degC at {p / 1e3:.0f} kPa absolute; "
                f"{T - 273.15:.1f} degC would be steam, not liquid"
            )

    def props(self, T: float, p: float = P_ATM) -> Props:
        """Properties at temperature ``T`` [K] and absolute pressure ``p`` [Pa].

        The liquid state is checked first (see :meth:`check_liquid`).
        """
        self.check_liquid(T, p)
        return _props(self.backend, round(T, 6), round(p, 1))


#: A liquid this close to its boiling point [K] is treated as boiling: it boils on a heated wall anyway,
#: and CoolProp's IF97 refuses states within a few thousandths of a percent of saturation.
SATURATION_MARGIN_K = 0.1


@lru_cache(maxsize=4096)
def _props(backend: str, T: float, p: float) -> Props:
    rho, mu, cp, k = (CP.PropsSI(name, "T", T, "P", p, backend) for name in ("D", "V", "C", "L"))
    out = Props(T=T, p=p, rho=rho, mu=mu, cp=cp, k=k)
    if not all(math.isfinite(v) and v > 0 for v in (rho, mu, cp, k)):
        raise StateError(f"CoolProp returned non-physical properties for {backend} at {T} K, {p} Pa")
    return out


@lru_cache(maxsize=64)
def _tsat(p: float) -> float:
    return CP.PropsSI("T", "P", p, "Q", 0, "IF97::Water")


@lru_cache(maxsize=16)
def _tmax(backend: str) -> float:
    """Upper temperature limit of the backend's data [K] (incompressible mixtures stop at 100 degC)."""
    return CP.PropsSI("Tmax", backend)


@lru_cache(maxsize=16)
def _freeze(backend: str) -> float:
    return CP.PropsSI("T_freeze", "T", 293.15, "P", P_ATM, backend)


def enthalpy(coolant: Coolant, T: float, p: float = P_ATM) -> float:
    """Specific enthalpy [J/kg] (for the outlet energy balance)."""
    coolant.check_liquid(T, p)
    return CP.PropsSI("H", "T", T, "P", p, coolant.backend)
