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

from dataclasses import dataclass

import numpy as np
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


def _equivalent_diameter(area):
    return np.sqrt(4.0 * np.asarray(area, dtype=float) / np.pi)


def _out(x):
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x


def K_sudden_contraction(area_upstream, area_downstream):
    """Sharp-edged contraction, K on the downstream (small) velocity [-].

    Calls ``fluids.fittings.contraction_sharp`` (Rennels method) with the
    equivalent round diameters of the two areas; 0 where there is no
    contraction.  Floats or numpy arrays (the Rennels formula is plain arithmetic).
    """
    up = np.asarray(area_upstream, dtype=float)
    down = np.minimum(np.asarray(area_downstream, dtype=float), up)
    K = contraction_sharp(_equivalent_diameter(up), _equivalent_diameter(down))
    return _out(np.where(down >= up, 0.0, K))


def K_sudden_expansion(area_upstream, area_downstream):
    """Sharp-edged expansion, K on the upstream (small) velocity [-].

    Calls ``fluids.fittings.diffuser_sharp`` (Rennels method); for a large area
    ratio this is the Borda-Carnot value (1 − A1/A2)^2; 0 where there is no
    expansion.  Floats or numpy arrays.
    """
    down = np.asarray(area_downstream, dtype=float)
    up = np.minimum(np.asarray(area_upstream, dtype=float), down)
    K = diffuser_sharp(_equivalent_diameter(up), _equivalent_diameter(down))
    return _out(np.where(up >= down, 0.0, K))


def K_exit() -> float:
    """Exit into a large volume, K = 1 on the pipe velocity (``fluids.fittings.exit_normal``)."""
    return float(exit_normal())


def K_return_bend(D_i: float, bend_radius: float, fd, Re):
    """180-degree return bend, K on the tube velocity (``fluids.fittings.bend_rounded``, Rennels).  ``fd`` and
    ``Re`` may be numpy arrays (Rennels' formula is plain arithmetic in fd)."""
    return _out(bend_rounded(Di=D_i, angle=180.0, fd=np.asarray(fd, dtype=float), rc=bend_radius, Re=Re,
                             method="Rennels"))


def total_pressure_drop(losses: tuple[MinorLoss, ...], rho: float) -> float:
    """Sum of the minor losses [Pa]."""
    return sum(loss.pressure_drop(rho) for loss in losses)
