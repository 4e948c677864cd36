"""The standard (ideal, constant-property) model of a thermoelectric module, and its arrays.

One module is described by three parameters, taken constant over the operating range:
``S`` the module's Seebeck coefficient [V/K], ``R`` its electrical resistance [ohm] and ``K`` its
thermal conductance [W/K].  With ``I`` the current [A], ``T_c`` and ``T_h`` the cold and hot face
temperatures [K] and ``dT = T_h - T_c``:

    Q_c = S I T_c - I^2 R / 2 - K dT          heat pumped from the cold face [W]
    Q_h = S I T_h + I^2 R / 2 - K dT = Q_c + P  heat rejected at the hot face [W]
    V   = S dT + I R                           terminal voltage [V]
    P   = V I                                  electrical power [W]

Reference: A. F. Ioffe, *Semiconductor Thermoelements and Thermoelectric Cooling* (1957); D. M. Rowe
(ed.), *CRC Handbook of Thermoelectrics* (1995), the ideal-cooler chapter.  The parameters follow from
a datasheet's maxima (I_max, V_max, dT_max at the rated hot-side temperature) by the derivation of
J. Luo, "Method to estimate thermoelectric module parameters", Electronics Cooling, 2008.

Pure functions: SI floats (or numpy arrays) in and out, temperatures in kelvin.
"""
from __future__ import annotations

import math

import numpy as np

from hydraulics.validity import Bound, Validity, with_validity

LUO_2008 = Validity(
    method="Luo (module parameters from datasheet maxima)",
    reference="J. Luo, Method to estimate thermoelectric module parameters, Electronics Cooling, 2008",
    bounds=(Bound("dT_max/T_h", 0.0, 1.0, "both ends excluded: the cold side stays above absolute zero"),),
)
STANDARD_MODEL = Validity(
    method="standard thermoelectric module model",
    reference="A. F. Ioffe, Semiconductor Thermoelements and Thermoelectric Cooling, 1957; "
              "D. M. Rowe (ed.), CRC Handbook of Thermoelectrics, 1995",
    bounds=(Bound("I/I_max", 0.0, 1.0, "within the datasheet's rating"),),
)


@with_validity(LUO_2008)
def luo_parameters(I_max: float, V_max: float, dT_max: float, T_hot: float) -> tuple[float, float, float]:
    """Module parameters ``(S, R, K)`` from datasheet maxima at the rated hot-side temperature (Luo 2008).

        S = V_max / T_h                                  [V/K]
        R = (T_h - dT_max) V_max / (T_h I_max)            [ohm]
        K = (T_h - dT_max) V_max I_max / (2 T_h dT_max)   [W/K]

    ``I_max`` [A] is the current of the largest temperature difference, ``V_max`` [V] the voltage there,
    ``dT_max`` [K] that difference with no heat load, all at the hot-side temperature ``T_hot`` [K] the
    datasheet rates them at (use that temperature, not a fixed one: the parameters depend on it).
    Valid for 0 < dT_max < T_hot.  Reference: J. Luo, Electronics Cooling, 2008.
    """
    if not (I_max > 0 and V_max > 0 and T_hot > 0 and 0 < dT_max < T_hot):
        raise ValueError("need I_max, V_max, T_hot above zero and 0 < dT_max < T_hot")
    S = V_max / T_hot
    R = (T_hot - dT_max) * V_max / (T_hot * I_max)
    K = (T_hot - dT_max) * V_max * I_max / (2.0 * T_hot * dT_max)
    return S, R, K


def figure_of_merit(S, R, K):
    """Module figure of merit Z = S^2 / (R K) [1/K] (Ioffe 1957)."""
    return S * S / (R * K)


@with_validity(STANDARD_MODEL)
def cold_side_heat(S, R, K, I, T_c, T_h):
    """Heat pumped from the cold face Q_c = S I T_c - I^2 R / 2 - K (T_h - T_c) [W] (Ioffe 1957)."""
    return S * I * T_c - 0.5 * I * I * R - K * (T_h - T_c)


def hot_side_heat(S, R, K, I, T_c, T_h):
    """Heat rejected at the hot face Q_h = S I T_h + I^2 R / 2 - K (T_h - T_c) [W] (Ioffe 1957)."""
    return S * I * T_h + 0.5 * I * I * R - K * (T_h - T_c)


def module_voltage(S, R, I, T_c, T_h):
    """Terminal voltage V = S (T_h - T_c) + I R [V] (Ioffe 1957)."""
    return S * (T_h - T_c) + I * R


def electrical_power(S, R, I, T_c, T_h):
    """Electrical power P = V I = S I (T_h - T_c) + I^2 R [W]."""
    return module_voltage(S, R, I, T_c, T_h) * I


def coefficient_of_performance(Q_c, P):
    """COP = Q_c / P [-]; NaN where no power is drawn (P <= 0: the module is off or generating)."""
    Q_c, P = np.asarray(Q_c, dtype=float), np.asarray(P, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(P > 0, Q_c / np.where(P > 0, P, 1.0), np.nan)
    return float(out) if out.ndim == 0 else out


def cold_face_temperature(S, R, K, I, Q_c, T_h):
    """Cold face temperature that pumps ``Q_c`` [W] at current ``I`` [A] with the hot face at ``T_h`` [K].

    The cold-side equation solved for T_c:  T_c = (Q_c + I^2 R / 2 + K T_h) / (S I + K)  [K].
    """
    return (Q_c + 0.5 * I * I * R + K * T_h) / (S * I + K)


def hot_side_heat_line(S, R, K, I, Q_c):
    """Coefficients ``(c0, c1)`` of Q_h = c0 + c1 T_h at a fixed cold-side load ``Q_c`` and current ``I``.

    Eliminating T_c with :func:`cold_face_temperature` (a = (Q_c + I^2 R/2)/(S I + K)):

        c1 = S^2 I^2 / (S I + K)  [W/K],   c0 = I^2 R / 2 + K a  [W]

    The hot-side heat grows with the hot-face temperature by c1; a heat sink of resistance R_s [K/W]
    seen by N such modules has a steady state only while N R_s c1 < 1 (otherwise the hot side runs away).
    """
    a = (Q_c + 0.5 * I * I * R) / (S * I + K)
    return 0.5 * I * I * R + K * a, S * S * I * I / (S * I + K)


def max_temperature_difference(S, R, K, T_h):
    """Largest temperature difference with no load and the hot face held at ``T_h`` [K] (Ioffe 1957).

    At Q_c = 0 the difference is largest at I = S T_c / R, where dT = Z T_c^2 / 2; with T_h fixed this
    gives T_c,min = (sqrt(1 + 2 Z T_h) - 1) / Z.  Returns ``(dT_max, I_at_dT_max)`` [K], [A].
    """
    Z = figure_of_merit(S, R, K)
    T_c = (math.sqrt(1.0 + 2.0 * Z * T_h) - 1.0) / Z
    return T_h - T_c, S * T_c / R


def max_heat_pumping(S, R, T):
    """Largest heat pumped with no temperature difference, at both faces ``T`` [K] (Ioffe 1957).

    Q_c = S I T - I^2 R / 2 is largest at I = S T / R, where it is S^2 T^2 / (2 R).
    Returns ``(Q_max, I)`` [W], [A].
    """
    return S * S * T * T / (2.0 * R), S * T / R


def datasheet_max_heat(S, R, I_max, T_h):
    """The heat pumped at the datasheet's I_max with no temperature difference [W].

    Datasheets quote their Q_max at I_max and dT = 0: Q = S I_max T_h - I_max^2 R / 2.
    """
    return S * I_max * T_h - 0.5 * I_max * I_max * R


def array_supply(current: float, voltage: float, count: int, strings: int) -> tuple[float, float]:
    """What the power supply delivers to ``count`` identical modules wired as ``strings`` parallel strings.

    Each string holds ``count // strings`` modules in series: ``strings = 1`` is all in series,
    ``strings = count`` all in parallel.  Returns ``(array current [A], array voltage [V])``.
    """
    if count < 1 or strings < 1 or count % strings:
        raise ValueError(f"{count} modules cannot form {strings} equal strings")
    return current * strings, voltage * (count // strings)
