"""Saturation vapour pressure, dew point and frost point of moist air.

Hyland & Wexler (1983) as given in ASHRAE Handbook Fundamentals 2017, ch. 1,
eqs. 5 (over ice) and 6 (over liquid water).  Temperatures in [K], pressures in
[Pa], relative humidity as a fraction [-].  Following ASHRAE, relative humidity
is taken relative to the saturation pressure at the dry-bulb temperature, over
ice below 273.15 K and over liquid water from 273.15 K up.

The inversions use a safeguarded Newton iteration (Newton steps inside a
bisection bracket) on ln p, vectorised over numpy arrays; scipy is not needed.
"""
from __future__ import annotations

import numpy as np

from hydraulics.validity import Bound, Validity, with_validity

T_FREEZE = 273.15  # [K], where ASHRAE switches between the two equations
T_MIN, T_MAX = 173.15, 473.15  # [K], -100 °C and 200 °C

_REF = "ASHRAE Handbook Fundamentals 2017 (SI), ch. 1 Psychrometrics; Hyland & Wexler 1983"

HYLAND_WEXLER_ICE = Validity(
    method="Hyland & Wexler (over ice)",
    reference=_REF + ", eq. 5",
    bounds=(Bound("T", T_MIN, T_FREEZE, "K"),),
)
HYLAND_WEXLER_WATER = Validity(
    method="Hyland & Wexler (over liquid water)",
    reference=_REF + ", eq. 6",
    bounds=(Bound("T", T_FREEZE, T_MAX, "K"),),
)

PSYCHROMETRICS_ASHRAE = Validity(
    method="ASHRAE psychrometrics (Hyland & Wexler)",
    reference=_REF + ", eqs. 5 and 6 inverted",
    bounds=(Bound("T", T_MIN, T_MAX, "dry bulb, K"),
            Bound("RH", 0.0, 1.0, "fraction; 0 itself excluded")),
)

# ln p = C1/T + C2 + C3 T + C4 T² + C5 T³ + C6 T⁴ + C7 ln T   (ice, eq. 5)
_ICE = (-5.6745359e03, 6.3925247e00, -9.6778430e-03, 6.2215701e-07,
        2.0747825e-09, -9.4840240e-13, 4.1635019e00)
# ln p = C8/T + C9 + C10 T + C11 T² + C12 T³ + C13 ln T       (water, eq. 6)
_WATER = (-5.8002206e03, 1.3914993e00, -4.8640239e-02, 4.1764768e-05,
          -1.4452093e-08, 0.0, 6.5459673e00)


def _ln_p(T, C):
    return C[0] / T + C[1] + T * (C[2] + T * (C[3] + T * (C[4] + T * C[5]))) + C[6] * np.log(T)


def _dln_p(T, C):
    return -C[0] / T**2 + C[2] + T * (2 * C[3] + T * (3 * C[4] + T * 4 * C[5])) + C[6] / T


def _out(value):
    value = np.asarray(value)
    return float(value) if value.ndim == 0 else value


def _check_T(T, low, high, what):
    T = np.asarray(T, dtype=float)
    bad = ~((T >= low - 1e-9) & (T <= high + 1e-9))  # allow °C -> K rounding
    if np.any(bad):
        raise ValueError(f"{what}: T = {T[bad].ravel()[0]:.6g} K outside {low:g}..{high:g} K")
    return T


@with_validity(HYLAND_WEXLER_ICE)
def p_sat_ice_HylandWexler(T):
    """Saturation pressure of water vapour over ice [Pa] at T [K].

    ln p_ws = C1/T + C2 + C3 T + C4 T² + C5 T³ + C6 T⁴ + C7 ln T  (ASHRAE 2017 ch. 1 eq. 5)
    Raises ValueError outside the range.
    """
    T = _check_T(T, T_MIN, T_FREEZE, "p_sat_ice_HylandWexler")
    return _out(np.exp(_ln_p(T, _ICE)))


@with_validity(HYLAND_WEXLER_WATER)
def p_sat_water_HylandWexler(T):
    """Saturation pressure of water vapour over liquid water [Pa] at T [K].

    ln p_ws = C8/T + C9 + C10 T + C11 T² + C12 T³ + C13 ln T  (ASHRAE 2017 ch. 1 eq. 6)
    Raises ValueError outside the range.
    """
    T = _check_T(T, T_FREEZE, T_MAX, "p_sat_water_HylandWexler")
    return _out(np.exp(_ln_p(T, _WATER)))


def p_sat(T):
    """Saturation pressure [Pa] at T [K]: over ice below 273.15 K, over water above (ASHRAE)."""
    T = _check_T(T, T_MIN, T_MAX, "p_sat")
    ice = T < T_FREEZE
    return _out(np.exp(np.where(ice, _ln_p(T, _ICE), _ln_p(T, _WATER))))


def vapour_pressure(T, RH):
    """Partial pressure of water vapour p_w = RH · p_sat(T) [Pa]; T [K], RH fraction (0, 1]."""
    RH = np.asarray(RH, dtype=float)
    bad = ~((RH > 0.0) & (RH <= 1.0))
    if np.any(bad):
        raise ValueError(f"RH = {RH[bad].ravel()[0]:.6g} outside (0, 1] (a fraction, not percent)")
    return np.asarray(p_sat(T)) * RH


def _invert(p_w, C, low, high, what):
    """T in [low, high] with ln p(T) = ln p_w, by Newton steps kept inside a bracket."""
    target = np.log(np.asarray(p_w, dtype=float))
    lo = np.full(target.shape, low)
    hi = np.full(target.shape, high)
    out_of_range = (target < _ln_p(lo, C)) | (target > _ln_p(hi, C))
    if np.any(out_of_range):
        p = np.exp(target[out_of_range].ravel()[0])
        raise ValueError(f"{what}: vapour pressure {p:.6g} Pa gives a result outside "
                         f"{low:g}..{high:g} K")
    T = 0.5 * (lo + hi)
    for _ in range(100):
        f = _ln_p(T, C) - target
        lo = np.where(f < 0.0, T, lo)
        hi = np.where(f > 0.0, T, hi)
        T_new = T - f / _dln_p(T, C)
        outside = ~((T_new > lo) & (T_new < hi))
        T_new = np.where(outside, 0.5 * (lo + hi), T_new)
        done = np.all(np.abs(T_new - T) < 1e-10)
        T = T_new
        if done:
            break
    return _out(T)


@with_validity(PSYCHROMETRICS_ASHRAE)
def dew_point(T, RH):
    """Dew point over liquid water [K] of air at dry bulb T [K] and relative humidity RH [-].

    Solves p_sat_water_HylandWexler(T_dew) = RH · p_sat(T).  Raises ValueError
    if T or RH is out of range or the dew point would fall below 273.15 K (use
    :func:`frost_point` or :func:`condensation_point` there).
    """
    p_w = vapour_pressure(T, RH)
    return _invert(p_w, _WATER, T_FREEZE, T_MAX, "dew_point")


@with_validity(PSYCHROMETRICS_ASHRAE)
def frost_point(T, RH):
    """Frost point over ice [K] of air at dry bulb T [K] and relative humidity RH [-].

    Solves p_sat_ice_HylandWexler(T_frost) = RH · p_sat(T).  Raises ValueError
    if T or RH is out of range or the frost point would lie above 273.15 K.
    """
    p_w = vapour_pressure(T, RH)
    return _invert(p_w, _ICE, T_MIN, T_FREEZE, "frost_point")


@with_validity(PSYCHROMETRICS_ASHRAE)
def condensation_point(T, RH):
    """Surface temperature [K] below which moisture deposits: dew point if >= 273.15 K, else frost point.

    T [K], RH fraction (0, 1].  Works on arrays elementwise.  ASHRAE's two
    equations do not meet exactly at 273.15 K (611.21 Pa over water, 611.15 Pa
    over ice); a vapour pressure in that gap gives 273.15 K.
    """
    p_w = np.asarray(vapour_pressure(T, RH))
    liquid = p_w >= np.exp(_ln_p(T_FREEZE, _WATER))
    p_w = np.where(liquid, p_w, np.minimum(p_w, np.exp(_ln_p(T_FREEZE, _ICE))))
    out = np.empty(p_w.shape)
    if np.any(liquid):
        out[liquid] = _invert(p_w[liquid], _WATER, T_FREEZE, T_MAX, "dew_point")
    if np.any(~liquid):
        out[~liquid] = _invert(p_w[~liquid], _ICE, T_MIN, T_FREEZE, "frost_point")
    return _out(out)
