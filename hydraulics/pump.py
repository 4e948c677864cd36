"""A pump given by a table of flow and pressure-rise points, and its intersection with a system curve.

The table is fitted with a monotone piecewise-cubic Hermite interpolant (PCHIP: Fritsch & Carlson 1980,
SIAM J. Numer. Anal. 17:238, as scipy.interpolate.PchipInterpolator): it passes through every point and,
for a falling table, falls everywhere between them, so the curve cannot invent a hump the data do not have.
The curve is used only inside the table's flows; nothing is extrapolated.

The operating point is the flow where the pump's rise equals what the system needs; it is found with a
bracketed root find (Brent's method, scipy.optimize.brentq) between the table's ends.  A pump that cannot
reach the needed pressure anywhere, or that still has more pressure to give at its largest tabulated flow,
is refused with a one-line :class:`PumpError`.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache
from typing import Callable

import numpy as np


class PumpError(ValueError):
    """The pump and the system do not cross inside the pump's table."""


@dataclass(frozen=True)
class PumpTable:
    """Flow [m^3/s] and pressure rise [Pa] points, flows strictly rising, rises falling."""

    V_dot: tuple[float, ...]
    dp: tuple[float, ...]


def check_table(V_dot, dp) -> PumpTable:
    """Check a pump table: at least three points, flows rising from zero or more, rise falling, all finite."""
    V = np.asarray(V_dot, dtype=float)
    P = np.asarray(dp, dtype=float)
    if V.ndim != 1 or V.shape != P.shape:
        raise PumpError("the flow and pressure-rise lists must have the same length")
    if len(V) < 3:
        raise PumpError("give at least three points of the pump curve")
    if not (np.all(np.isfinite(V)) and np.all(np.isfinite(P))):
        raise PumpError("every point must be finite")
    if V[0] < 0 or np.any(np.diff(V) <= 0):
        raise PumpError("flows must start at zero or more and rise strictly from point to point")
    if np.any(P < 0):
        raise PumpError("a pump's pressure rise (head) cannot be negative")
    if np.any(np.diff(P) >= 0):
        raise PumpError("the pressure rise (head) must fall as the flow rises; a flat or rising stretch gives "
                        "no single operating point")
    return PumpTable(tuple(map(float, V)), tuple(map(float, P)))


def _fit(table: PumpTable):
    """The PCHIP interpolant of the table (numpy in, numpy out; NaN outside the tabulated flows); kept per table
    of tuples (a fan's operating point is found many times in one check)."""
    try:
        return _kept_fit(table)
    except TypeError:  # a table of lists: not hashable, fitted afresh
        return _new_fit(table)


def _new_fit(table: PumpTable):
    from scipy.interpolate import PchipInterpolator

    return PchipInterpolator(np.asarray(table.V_dot), np.asarray(table.dp), extrapolate=False)


_kept_fit = lru_cache(maxsize=64)(_new_fit)


def pump_curve_many(table: PumpTable) -> Callable[[np.ndarray], np.ndarray]:
    """:func:`pump_curve` for arrays of flows: the same fit, NaN outside the tabulated flows."""
    return _fit(table)


def pump_curve(table: PumpTable) -> Callable[[float], float]:
    """The fitted rise dp(V_dot) [Pa], valid from the first to the last tabulated flow (PCHIP)."""
    fit = _fit(table)
    return lambda q: float(fit(q))


def intersect(table: PumpTable, needed: Callable[[float], float], suction: float = 0.0,
              xtol: float = 1e-12) -> float:
    """The flow [m^3/s] where suction + pump rise equals the pressure the system ``needed(V_dot)`` [Pa].

    ``needed`` must rise with flow (a system curve).  Raises :class:`PumpError` when the curves do not cross
    within the table: the pump's rise at its smallest tabulated flow is below the need there ("never reaches
    the needed head"), or at its largest tabulated flow is still above it (the table ends too early).
    """
    from scipy.optimize import brentq

    rise = pump_curve(table)
    lo, hi = table.V_dot[0], table.V_dot[-1]

    def excess(q):
        return suction + rise(q) - needed(q)

    e_lo, e_hi = excess(lo), excess(hi)
    if e_lo < 0:
        raise PumpError(f"the pump never reaches the needed pressure: at {lo * 6e4:.3g} L/min it gives "
                        f"{(suction + rise(lo)) / 1e3:.3g} kPa, the circuit needs {needed(lo) / 1e3:.3g} kPa")
    if e_hi > 0:
        raise PumpError(f"the pump curve ends at {hi * 6e4:.3g} L/min while it still gives more pressure than the "
                        f"circuit needs ({(suction + rise(hi)) / 1e3:.3g} against {needed(hi) / 1e3:.3g} kPa); "
                        "extend the table to larger flows")
    if e_lo == 0:
        return lo
    if e_hi == 0:
        return hi
    return float(brentq(excess, lo, hi, xtol=xtol, rtol=1e-10))


def intersect_many(table: PumpTable, needed: Callable[[np.ndarray], np.ndarray], count: int,
                   iterations: int = 60) -> np.ndarray:
    """The operating flows [m^3/s] of ``count`` systems on one pump (or fan) table at once.

    ``needed(q)`` takes an array of ``count`` flows (one per system) and returns each system's needed
    pressure [Pa] there, rising with flow.  The same fitted curve as :func:`intersect`, the same crossing,
    found by bisection on all systems together (``iterations`` halvings of the table's flow span); NaN where
    a system and the table do not cross inside the table (the cases :func:`intersect` refuses).
    """
    fit = _fit(table)
    lo = np.full(count, table.V_dot[0])
    hi = np.full(count, table.V_dot[-1])
    ok = (fit(lo) - needed(lo) >= 0) & (fit(hi) - needed(hi) <= 0)
    for _ in range(iterations):
        mid = 0.5 * (lo + hi)
        up = fit(mid) - needed(mid) > 0
        lo = np.where(up, mid, lo)
        hi = np.where(up, hi, mid)
    return np.where(ok, 0.5 * (lo + hi), np.nan)
