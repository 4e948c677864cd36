"""Minor-loss coefficients from fluids, and their sum as a pressure drop.

Each function here calls one fluids.fittings function directly (never a fuzzy
selector) and returns the loss coefficient K referred to a stated velocity.
A :class:`MinorLoss` keeps the name, K, and the velocity it refers to, so a
passage can list its losses and the report can show them.

References: Rennels & Hudson, *Pipe Flow: A Practical and Comprehensive Guide*
(Wiley, 2012), as implemented in fluids; Idelchik, *Handbook of Hydraulic
Resistance*, for the sudden expansion (Borda-Carnot).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

from fluids.fittings import bend_rounded, contraction_sharp, diffuser_sharp, exit_normal


@dataclass(frozen=True)
class MinorLoss:
    """One minor loss: ``dp = K · rho · V^2 / 2`` with V the referenced velocity."""

    name: str
    K: float  #: loss coefficient [-]
    velocity: float  #: the velocity K refers to [m/s]

    def pressure_drop(self, rho: float) -> float:
        """[Pa]"""
        return self.K * 0.5 * rho * self.velocity**2


def _equivalent_diameter(area: float) -> float:
    return math.sqrt(4.0 * area / math.pi)


def K_sudden_contraction(area_upstream: float, area_downstream: float) -> float:
    """Sharp-edged contraction, K on the downstream (small) velocity [-].

    Calls ``fluids.fittings.contraction_sharp`` (Rennels method) with the
    equivalent round diameters of the two areas.
    """
    if area_downstream >= area_upstream:
        return 0.0
    return float(contraction_sharp(_equivalent_diameter(area_upstream), _equivalent_diameter(area_downstream)))


def K_sudden_expansion(area_upstream: float, area_downstream: float) -> float:
    """Sharp-edged expansion, K on the upstream (small) velocity [-].

    Calls ``fluids.fittings.diffuser_sharp`` (Rennels method); for a large area
    ratio this is the Borda-Carnot value (1 − A1/A2)^2.
    """
    if area_downstream <= area_upstream:
        return 0.0
    return float(diffuser_sharp(_equivalent_diameter(area_upstream), _equivalent_diameter(area_downstream)))


def K_exit() -> float:
    """Exit into a large volume, K = 1 on the pipe velocity (``fluids.fittings.exit_normal``)."""
    return float(exit_normal())


def K_return_bend(D_i: float, bend_radius: float, fd: float, Re: float) -> float:
    """180-degree return bend, K on the tube velocity (``fluids.fittings.bend_rounded``, Rennels)."""
    return float(bend_rounded(Di=D_i, angle=180.0, fd=fd, rc=bend_radius, Re=Re, method="Rennels"))


def total_pressure_drop(losses: tuple[MinorLoss, ...], rho: float) -> float:
    """Sum of the minor losses [Pa]."""
    return sum(loss.pressure_drop(rho) for loss in losses)
