"""Coolant properties tabulated once per run from CoolProp, for evaluating many candidates at once.

The one-design check calls CoolProp at each state it needs.  A search needs the same properties at
thousands of bulk temperatures, so :class:`PropertyTable` calls CoolProp (through
:meth:`hydraulics.coolant.Coolant.props` and :func:`hydraulics.coolant.enthalpy`, the same calls the check
makes) on evenly spaced temperature nodes at the line pressure and interpolates linearly between them.

Error bound.  Linear interpolation on a node spacing Δ errs by at most Δ²/8 · max|y''|.  Density, heat
capacity and conductivity of water and glycol mixtures curve by less than |y''/y| = 1e-4 K⁻², so with the
default Δ = 0.2 K the bound is 0.04/8 · 1e-4 = 5e-7.  Viscosity falls nearly exponentially
(|μ''/μ| up to 3e-3 K⁻² for cold glycol), so it is interpolated in ln μ, which is nearly straight
(|(ln μ)''| < 1e-3 K⁻²): the bound is 5e-6 in ln μ, i.e. 0.0005 %.  ``tests/test_sizing_proptable.py`` checks the bound (0.001 %)
against CoolProp at points halfway between nodes, where the error is largest.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from hydraulics.coolant import Coolant, enthalpy

#: Default node spacing [K] (see the module docstring for the error bound it gives).
SPACING_K = 0.2
#: Largest interpolation error the tests accept, relative [-] (well under the 0.01 % asked of the table).
ERROR_BOUND = 1e-5


@dataclass(frozen=True)
class PropertyState:
    """Properties at an array of temperatures (SI), the fields of :class:`hydraulics.coolant.Props`."""

    rho: np.ndarray
    mu: np.ndarray
    cp: np.ndarray
    k: np.ndarray

    @property
    def Pr(self):
        return self.cp * self.mu / self.k


class PropertyTable:
    """Density, viscosity, heat capacity, conductivity and enthalpy of a coolant at one pressure.

    ``T_low``..``T_high`` [K] must lie inside the liquid range (checked by CoolProp calls at the nodes);
    ``p`` absolute [Pa].
    """

    def __init__(self, coolant: Coolant, p: float, T_low: float, T_high: float, spacing: float = SPACING_K):
        if not T_high > T_low:
            raise ValueError("the property table needs T_high > T_low")
        n = max(int(math.ceil((T_high - T_low) / spacing)), 2) + 1
        self.coolant, self.p = coolant, p
        self.T = np.linspace(T_low, T_high, n)
        rows = [coolant.props(float(T), p) for T in self.T]
        self.rho = np.array([r.rho for r in rows])
        self.mu = np.array([r.mu for r in rows])
        self._log_mu = np.log(self.mu)
        self.cp = np.array([r.cp for r in rows])
        self.k = np.array([r.k for r in rows])
        self.H = np.array([enthalpy(coolant, float(T), p) for T in self.T])
        if np.any(np.diff(self.H) <= 0):
            raise ValueError("enthalpy must rise with temperature over the table")

    @property
    def T_low(self) -> float:
        return float(self.T[0])

    @property
    def T_high(self) -> float:
        return float(self.T[-1])

    def at(self, T) -> PropertyState:
        """Properties at temperatures ``T`` [K] (array); outside the table the end values are held."""
        T = np.asarray(T, dtype=float)
        return PropertyState(np.interp(T, self.T, self.rho), np.exp(np.interp(T, self.T, self._log_mu)),
                             np.interp(T, self.T, self.cp), np.interp(T, self.T, self.k))

    def enthalpy(self, T):
        """Specific enthalpy [J/kg] at ``T`` [K]."""
        return np.interp(np.asarray(T, dtype=float), self.T, self.H)

    def temperature(self, H):
        """Temperature [K] at specific enthalpy ``H`` [J/kg] (the table's inverse); NaN beyond its top."""
        H = np.asarray(H, dtype=float)
        T = np.interp(H, self.H, self.T)
        return np.where(H > self.H[-1], np.nan, T)
