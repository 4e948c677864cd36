"""Nusselt-number correlations for cold-plate channels and a regime selector.

Every correlation is a function named after its method and carries its
published validity range as a :class:`hydraulics.validity.Validity` record.
Nu is on the hydraulic diameter D_h unless a name says otherwise.  Condition
"T" = uniform wall temperature; "H1" = axially uniform heat flux with a
peripherally uniform wall temperature (the usual idealisation for a
high-conductivity metal plate).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from hydraulics.ducts import (
    RE_LAMINAR_END,
    RE_TURBULENT_START,
    _out,
    fRe_rectangular_Shah_London,
    sqrtA_over_Dh,
    transition_weight,
)
from hydraulics.friction import f_turbulent_heat_transfer
from hydraulics.validity import Bound, Validity, with_validity

INF = math.inf
_CONDITIONS = ("T", "H1")


def _check_condition(condition):
    if condition not in _CONDITIONS:
        raise ValueError(f"condition must be one of {_CONDITIONS}, not {condition!r}")


# ---------------------------------------------------------------- turbulent


@with_validity(Validity(
    method="Dittus-Boelter",
    reference=(
        "Dittus, F.W., Boelter, L.M.K. (1930) Univ. Calif. Publ. Eng. 2:443-461; form and "
        "range as in Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, eq. 8.60"
    ),
    bounds=(
        Bound("Re", 1.0e4, INF, "fully turbulent"),
        Bound("Pr", 0.6, 160.0),
        Bound("L_over_D", 10.0, INF),
    ),
))
def Nu_Dittus_Boelter(Re, Pr, heating=True):
    """Turbulent Nusselt number, Nu = 0.023 Re^0.8 Pr^n [-].

    n = 0.4 when the fluid is heated (wall hotter than fluid, the cold-plate
    case), 0.3 when it is cooled.  Re, Pr [-].
    """
    n = 0.4 if heating else 0.3
    return _out(0.023 * np.asarray(Re, dtype=float) ** 0.8 * np.asarray(Pr, dtype=float) ** n)


@with_validity(Validity(
    method="Gnielinski",
    reference=(
        "Gnielinski, V., VDI Heat Atlas, 2nd ed. (2010), chapter G1, sec. 4.1 (mean Nu, uniform wall "
        "temperature, hydrodynamically developed flow), and Gnielinski (2013) On heat transfer in tubes, "
        "Int. J. Heat Mass Transfer 63:134-140; form and range from memory (this edition writes Re, not "
        "Re - 1000, and carries the length factor)"
    ),
    bounds=(
        Bound("Re", 1.0e4, 1.0e6, "fully turbulent; 2300 to 1e4 is the transition blend"),
        Bound("Pr", 0.1, 1000.0),
        Bound("L_over_D", 1.0, INF, "D/L <= 1"),
    ),
))
def Nu_Gnielinski_VDI(Re, Pr, L_over_D, f=None):
    """Mean turbulent Nusselt number of a tube of finite length, Gnielinski's VDI Heat Atlas form [-].

    Nu = (f/8) Re Pr / [1 + 12.7 (f/8)^(1/2) (Pr^(2/3) - 1)] [1 + (D/L)^(2/3)],
    f the Darcy friction factor [-]: Konakov's smooth-tube (1.8 log10 Re - 1.5)^-2 when None,
    the rough-wall Colebrook value for rough walls.  Re, Pr [-], L_over_D = L/D [-]
    (heated length over the hydraulic diameter; the factor [1 + (D/L)^(2/3)] is the thermal
    and hydrodynamic entry).
    """
    Re = np.asarray(Re, dtype=float)
    Pr = np.asarray(Pr, dtype=float)
    f8 = np.asarray(f_turbulent_heat_transfer(Re, 0.0) if f is None else f, dtype=float) / 8.0
    entry = 1.0 + np.asarray(L_over_D, dtype=float) ** (-2.0 / 3.0)
    return _out(f8 * Re * Pr / (1.0 + 12.7 * np.sqrt(f8) * (Pr ** (2.0 / 3.0) - 1.0)) * entry)


# ---------------------------------------------------------------- laminar, circular tube


@with_validity(Validity(
    method="Hausen",
    reference=(
        "Hausen, H. (1943) Z. VDI Beih. Verfahrenstech. 4:91-98; mean Nu, thermal entry with "
        "a developed velocity profile, uniform wall temperature, circular tube"
    ),
    bounds=(Bound("Gz", 0.0, INF, "Gz = Re Pr D/L"), Bound("Re", 0.0, RE_LAMINAR_END, "laminar")),
))
def Nu_Hausen(Gz):
    """Mean laminar Nusselt number over a thermal entry length [-].

    Nu = 3.66 + 0.0668 Gz / (1 + 0.04 Gz^(2/3)), Graetz number Gz = Re Pr D / L [-].
    Tends to the fully developed 3.66 for long tubes (Gz -> 0).
    """
    Gz = np.asarray(Gz, dtype=float)
    return _out(3.66 + 0.0668 * Gz / (1.0 + 0.04 * Gz ** (2.0 / 3.0)))


@with_validity(Validity(
    method="Sieder-Tate",
    reference=(
        "Sieder, E.N., Tate, G.E. (1936) Heat transfer and pressure drop of liquids in "
        "tubes, Ind. Eng. Chem. 28(12):1429-1435; range as quoted by Incropera & DeWitt, "
        "eq. 8.57 (from memory, not re-checked; the ht library docs quote 0.7 < Pr < 16700 "
        "after Serth 2014)"
    ),
    bounds=(
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar"),
        Bound("Pr", 0.6, 5.0),
        Bound("mu_ratio", 0.0044, 9.75, "mu_bulk / mu_wall"),
    ),
))
def Nu_Sieder_Tate_laminar(Re, Pr, L_over_D, mu_ratio=1.0):
    """Mean laminar Nusselt number, combined entry, uniform wall temperature [-].

    Nu = 1.86 (Re Pr D/L)^(1/3) (mu/mu_w)^0.14, Re, Pr [-], L_over_D = L/D [-],
    mu_ratio = bulk / wall viscosity [-].  Has no fully developed floor: it
    falls below 3.66 for long tubes.
    """
    Gz = np.asarray(Re, dtype=float) * np.asarray(Pr, dtype=float) / np.asarray(L_over_D, dtype=float)
    return _out(1.86 * Gz ** (1.0 / 3.0) * np.asarray(mu_ratio, dtype=float) ** 0.14)


@with_validity(Validity(
    method="Fully developed circular tube",
    reference=(
        "Shah & London (1978), circular duct: Nu_T = 3.657 (Graetz eigenvalue), "
        "Nu_H = 48/11 = 4.364; textbook standard"
    ),
    bounds=(Bound("Re", 0.0, RE_LAMINAR_END, "laminar, fully developed"),),
))
def Nu_circular_fully_developed(condition="H1"):
    """Fully developed laminar Nu of a circular tube [-]: 3.657 ("T") or 48/11 ("H1" or "H")."""
    if condition == "H":
        condition = "H1"
    _check_condition(condition)
    return 48.0 / 11.0 if condition == "H1" else 3.657


# ---------------------------------------------------------------- laminar, rectangular duct

#: Heated-wall arrangements of a rectangular duct (the rest of the perimeter adiabatic):
#: "4" all walls; "3L" both long walls + one short wall; "3S" both short walls + one
#: long wall; "2L" both long walls; "1L" one long wall.
HEATED_ARRANGEMENTS = ("4", "3L", "3S", "2L", "1L")

# Fifth-order fits in alpha (0 <= alpha <= 1) to the Shah & London (1978) tables.
_SL_POLY = {
    ("4", "T"): (7.541, (1.0, -2.610, 4.970, -5.119, 2.702, -0.548)),
    ("4", "H1"): (8.235, (1.0, -2.0421, 3.0853, -2.4765, 1.0578, -0.1861)),
    # Two long walls and one short wall heated, the other short wall adiabatic:
    # Qu & Mudawar (2003) Int. J. Heat Mass Transfer 46:2755, eq. (11), citing Shah & London.
    ("3L", "H1"): (8.235, (1.0, -1.883, 3.767, -5.814, 5.361, -2.0)),
}
# Parallel plates (alpha = 0): both plates heated / one heated, the other insulated.
# "3S" and "1L" both become one heated plate when the short walls vanish.
_PARALLEL_PLATES = {
    ("2L", "T"): 7.541, ("2L", "H1"): 8.235,
    ("1L", "T"): 4.861, ("1L", "H1"): 70.0 / 13.0,
    ("3S", "T"): 4.861, ("3S", "H1"): 70.0 / 13.0,
}

# computed: finite-difference H1 solution, reproduced in tests/test_convection.py.
# Cell-centred second-order scheme, grids 32/64/128 cells across the short side,
# Richardson-extrapolated (observed order 1.9-2.0; the two extrapolations agree within
# 0.01 %); the same solver gives the four-wall Shah & London values 3.608 / 4.123 at
# alpha = 1 / 0.5.  Shah & London (1978) tabulate these configurations as well, but the
# published table could not be consulted.  alpha = 0 is the parallel-plate limit,
# 70/13 for one heated plate ("3S", "1L"), 140/17 = 8.235 for two ("2L").
_FD_ALPHA = np.array((0.0, 0.0625, 0.125, 0.25, 0.375, 0.5, 0.75, 1.0))
_FD_H1 = {
    "3S": np.array((70.0 / 13.0, 4.6309, 4.0860, 3.4395, 3.1844, 3.1398, 3.3057, 3.5682)),
    "1L": np.array((70.0 / 13.0, 5.0172, 4.7003, 4.1945, 3.8156, 3.5139, 3.0434, 2.6855)),
    "2L": np.array((140.0 / 17.0, 7.6466, 7.1348, 6.3063, 5.6940, 5.2373, 4.5789, 4.0950)),
}


def _pchip_slopes(x, y):
    """Node slopes of the monotone piecewise-cubic Hermite interpolant (Fritsch-Carlson)."""
    h, d = np.diff(x), np.diff(y) / np.diff(x)
    m = np.zeros_like(y)
    w1, w2 = 2 * h[1:] + h[:-1], h[1:] + 2 * h[:-1]
    same = d[:-1] * d[1:] > 0
    m[1:-1][same] = (w1 + w2)[same] / (w1[same] / d[:-1][same] + w2[same] / d[1:][same])
    for end, (h0, h1, d0, d1) in ((0, (h[0], h[1], d[0], d[1])), (-1, (h[-1], h[-2], d[-1], d[-2]))):
        s = ((2 * h0 + h1) * d0 - h0 * d1) / (h0 + h1)
        if np.sign(s) != np.sign(d0):
            s = 0.0
        elif np.sign(d0) != np.sign(d1) and abs(s) > abs(3 * d0):
            s = 3 * d0
        m[end] = s
    return m


_FD_SLOPES = {k: _pchip_slopes(_FD_ALPHA, v) for k, v in _FD_H1.items()}


def _pchip(xq, x, y, m):
    i = np.clip(np.searchsorted(x, xq, side="right") - 1, 0, len(x) - 2)
    h = x[i + 1] - x[i]
    t = (xq - x[i]) / h
    return ((2 * t**3 - 3 * t**2 + 1) * y[i] + (t**3 - 2 * t**2 + t) * h * m[i]
            + (-2 * t**3 + 3 * t**2) * y[i + 1] + (t**3 - t**2) * h * m[i + 1])


def _check_alpha(alpha):
    alpha = np.asarray(alpha, dtype=float)
    if np.any(alpha < 0) or np.any(alpha > 1):
        raise ValueError("alpha must lie in [0, 1] (short side / long side)")
    return alpha


def _check_heated(heated):
    if heated not in HEATED_ARRANGEMENTS:
        raise ValueError(f"heated must be one of {HEATED_ARRANGEMENTS}, not {heated!r}")


@with_validity(Validity(
    method="Finite-difference H1 table (computed)",
    reference=(
        "computed: finite-difference H1 solution, reproduced in tests/test_convection.py "
        "(about 0.01 % at the nodes; monotone cubic interpolation in alpha within 0.3 % of the "
        "solver at the midpoints).  Shah & London (1978) tabulate the same configurations, but "
        "the published table could not be consulted"
    ),
    bounds=(
        Bound("alpha", 0.0, 1.0, "short/long side"),
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar, hydrodynamically and thermally developed"),
    ),
))
def Nu_rectangular_finite_difference(alpha, heated="1L", condition="H1"):
    """Fully developed laminar Nu_H1 on D_h of a rectangular duct heated on part of its perimeter [-].

    Solves lap(u) = -1 (u = 0 on all walls) and lap(phi) = u / u_m with phi = 0
    on the heated walls and zero normal gradient on the others; then
    Nu = -A D_h / (P_heated phi_b), phi_b the velocity-weighted mean of phi,
    h referred to the heated perimeter P_heated, D_h = 4A/P to the full
    perimeter, alpha short/long side [-].  Tabulated at alpha = 0, 1/16,
    1/8, 1/4, 3/8, 1/2, 3/4, 1 and interpolated with a monotone piecewise
    cubic.  ``heated``: "3S" (both short walls + one long wall: a wide
    channel under an unheated lid), "2L" (both long walls) or "1L" (one
    long wall: a cavity heated from its floor).  Only "H1"; uniform wall temperature ("T") was not
    computed and raises ValueError.
    """
    _check_condition(condition)
    if heated not in _FD_H1:
        raise ValueError(f"computed table only for heated in {tuple(_FD_H1)}, not {heated!r}")
    if condition != "H1":
        raise ValueError(
            f"heated={heated!r} with condition 'T' is not available: only the H1 table was "
            "computed (the parallel-plate value at alpha = 0 is in Nu_rectangular_Shah_London)"
        )
    alpha = _check_alpha(alpha)
    return _out(_pchip(alpha, _FD_ALPHA, _FD_H1[heated], _FD_SLOPES[heated]))


@with_validity(Validity(
    method="Shah & London (fully developed)",
    reference=(
        "Shah, R.K., London, A.L. (1978) Laminar Flow Forced Convection in Ducts, Academic "
        "Press: rectangular-duct Nu_T, Nu_H1 and their fifth-order polynomial fits (also in "
        "Nellis & Klein 2009, eqs. 5-82/5-83); three-wall H1 fit as given by Qu & Mudawar "
        "(2003), Int. J. Heat Mass Transfer 46:2755-2771, eq. (11)"
    ),
    bounds=(
        Bound("alpha", 0.0, 1.0, "short/long side"),
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar, hydrodynamically and thermally developed"),
    ),
))
def Nu_rectangular_Shah_London(alpha, heated="4", condition="H1"):
    """Fully developed laminar Nu on D_h of a rectangular duct [-].

    Nu = Nu_0 (1 + c1 alpha + ... + c5 alpha^5), alpha short/long side [-];
    ``heated`` names the heated walls (see HEATED_ARRANGEMENTS):

    * "4", "T":  Nu_0 = 7.541, c = -2.610, 4.970, -5.119, 2.702, -0.548
    * "4", "H1": Nu_0 = 8.235, c = -2.0421, 3.0853, -2.4765, 1.0578, -0.1861
    * "3L", "H1": Nu_0 = 8.235, c = -1.883, 3.767, -5.814, 5.361, -2.0:
      both long walls and one short wall heated, the other short wall
      adiabatic (deep channel, lid = short side).  h is referred to the
      heated perimeter, D_h to the full perimeter.  No "T" fit.
    * "2L" at alpha = 0: both plates heated, 8.235 ("H1") / 7.541 ("T").
    * "1L", "3S" at alpha = 0: one plate heated, the other insulated,
      70/13 = 5.385 ("H1") / 4.861 ("T").
    * "2L", "1L", "3S" at alpha > 0: the values come from
      the computed table of :func:`Nu_rectangular_finite_difference` ("H1"
      only), not from Shah & London.
    """
    _check_condition(condition)
    _check_heated(heated)
    alpha = _check_alpha(alpha)
    if heated in ("2L", "1L", "3S") and np.all(alpha == 0):
        return _out(np.full(alpha.shape, _PARALLEL_PLATES[(heated, condition)]))
    if heated in _FD_H1:
        return Nu_rectangular_finite_difference(alpha, heated, condition)
    if (heated, condition) not in _SL_POLY:
        raise ValueError(
            f"heated={heated!r} with condition {condition!r} is not available; "
            "use '4' ('T' or 'H1') or any arrangement with 'H1'"
        )
    nu0, c = _SL_POLY[(heated, condition)]
    poly = sum(ci * alpha**i for i, ci in enumerate(c))
    return _out(nu0 * poly)


# Muzychka & Yovanovich (2004) constants: (C1, C3, Prandtl-function numerator and constant)
_MY_CONST = {"T": (3.24, 0.409, 0.564, 1.664), "H1": (3.86, 0.501, 0.886, 1.909)}
_MY_GAMMA = 0.1
# C2 (Graetz-Leveque asymptote) and C4 (Pohlhausen developing-flow asymptote): the paper gives both sets,
# local and mean (from memory).  They follow from the asymptotes themselves: a local value proportional to
# z^(-1/3) averages to 3/2 of its end value over 0..z, one proportional to z^(-1/2) to 2 of it; the tests
# check that the local form integrated along the duct gives the mean form in both limits.
_MY_C2_MEAN, _MY_C4_MEAN = 1.5, 2.0
_MY_C2_LOCAL, _MY_C4_LOCAL = 1.0, 1.0

_MY_REFERENCE = (
    "Muzychka, Y.S., Yovanovich, M.M. (2004) Laminar forced convection heat transfer in "
    "the combined entry region of non-circular ducts, J. Heat Transfer 126(1):54-61, "
    "doi:10.1115/1.1643752 (stated accuracy about 10 %)"
)


def _my_sqrtA_basis(shape, alpha):
    """r = sqrt(A)/D_h and the fully developed Fanning f Re on the sqrt(A) scale of a rectangle or circle."""
    if shape == "circle":
        r = math.sqrt(math.pi) / 2.0
        return r, 16.0 * r  # Poiseuille: Fanning f Re_D = 16
    r = np.asarray(sqrtA_over_Dh(alpha), dtype=float)
    return r, r * np.asarray(fRe_rectangular_Shah_London(alpha), dtype=float) / 4.0


def _my_combined(Re, Pr, z_length, D_h, alpha, condition, Nu_fd, C2, C4, shape="rectangle"):
    """The Muzychka & Yovanovich blend on D_h with the given C2, C4 (mean or local set)."""
    _check_condition(condition)
    Re = np.asarray(Re, dtype=float)
    Pr = np.asarray(Pr, dtype=float)
    r, fRe = _my_sqrtA_basis(shape, alpha)
    C1, C3, c0, cpr = _MY_CONST[condition]
    z = np.asarray(z_length, dtype=float) / (np.asarray(D_h, dtype=float) * r * (r * Re) * Pr)
    m = 2.27 + 1.65 * Pr ** (1.0 / 3.0)
    fPr = c0 / (1.0 + (cpr * Pr ** (1.0 / 6.0)) ** 4.5) ** (2.0 / 9.0)
    if Nu_fd is None:
        a = 1.0 if shape == "circle" else np.asarray(alpha, dtype=float)
        nu_fd = C1 * fRe / (8.0 * math.sqrt(math.pi) * a ** _MY_GAMMA)
    else:
        nu_fd = np.asarray(Nu_fd, dtype=float) * r
    pohlhausen = C4 * fPr / np.sqrt(z)
    graetz = ((C2 * C3 * (fRe / z) ** (1.0 / 3.0)) ** 5 + nu_fd**5) ** 0.2
    top = np.maximum(pohlhausen, graetz)  # scaled by the larger term: no overflow for large m (viscous liquids)
    nu_sqrtA = top * ((pohlhausen / top) ** m + (graetz / top) ** m) ** (1.0 / m)
    return _out(nu_sqrtA / r)


@with_validity(Validity(
    method="Muzychka & Yovanovich",
    reference=_MY_REFERENCE,
    bounds=(
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar"),
        Bound("Pr", 0.1, INF, "the paper's comparisons span about 0.1 to infinity"),
        Bound("alpha", 1e-6, 1.0, "short/long side, > 0 for the sqrt(A) scale"),
    ),
))
def Nu_Muzychka_Yovanovich_combined(Re, Pr, L, D_h, alpha, condition="H1", Nu_fd=None, shape="rectangle"):
    """Mean Nu on D_h, simultaneously developing laminar flow in a rectangular duct [-].

    On the sqrt(A) scale, z* = L / (sqrt(A) Re_sqrtA Pr)::

        Nu = [ (C4 f(Pr) / sqrt(z*))^m
               + ( (C2 C3 (fRe / z*)^(1/3))^5 + Nu_fd^5 )^(m/5) ]^(1/m)
        m = 2.27 + 1.65 Pr^(1/3),  C2 = 3/2, C4 = 2 (mean values)
        T:  C1 = 3.24, C3 = 0.409, f(Pr) = 0.564 / [1 + (1.664 Pr^(1/6))^(9/2)]^(2/9)
        H1: C1 = 3.86, C3 = 0.501, f(Pr) = 0.886 / [1 + (1.909 Pr^(1/6))^(9/2)]^(2/9)
        Nu_fd = C1 fRe / (8 sqrt(pi) alpha^gamma),  gamma = 1/10

    fRe is the fully developed Fanning f Re_sqrtA (exact Shah & London series,
    converted).  Given ``Nu_fd`` (on D_h, e.g. from
    :func:`Nu_rectangular_Shah_London` with the heated walls of the channel),
    it replaces the model's own asymptote.  Inputs: Re on D_h, Pr [-], L and
    D_h [m], alpha [-]; r = sqrt(A)/D_h converts: Re_sqrtA = r Re,
    Nu_Dh = Nu_sqrtA / r.  ``shape`` "circle" (a round tube, D_h its
    diameter, alpha ignored): r = sqrt(pi)/2 and the circle's Fanning
    f Re = 16 on D, so f Re_sqrtA = 8 sqrt(pi) (the paper's circular duct).
    The length-mean over 0..L: use it for mean quantities; the local value at
    a point is :func:`Nu_Muzychka_Yovanovich_local`.
    """
    if shape not in ("rectangle", "circle"):
        raise ValueError(f"shape must be 'rectangle' or 'circle', not {shape!r}")
    return _my_combined(Re, Pr, L, D_h, alpha, condition, Nu_fd, _MY_C2_MEAN, _MY_C4_MEAN, shape)


@with_validity(Validity(
    method="Muzychka & Yovanovich (local)",
    reference=_MY_REFERENCE + "; local constants C2 = 1, C4 = 1 of the same paper (from memory)",
    bounds=(
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar"),
        Bound("Pr", 0.1, INF, "the paper's comparisons span about 0.1 to infinity"),
        Bound("alpha", 1e-6, 1.0, "short/long side, > 0 for the sqrt(A) scale"),
    ),
))
def Nu_Muzychka_Yovanovich_local(Re, Pr, x, D_h, alpha, condition="H1", Nu_fd=None, shape="rectangle"):
    """Local Nu on D_h at a distance x from the duct's entry, simultaneously developing laminar flow [-].

    The same blend as :func:`Nu_Muzychka_Yovanovich_combined` with the
    paper's local constants and the local coordinate z* = x / (sqrt(A) Re_sqrtA Pr)::

        Nu_x = [ (C4 f(Pr) / sqrt(z*))^m
                 + ( (C2 C3 (fRe / z*)^(1/3))^5 + Nu_fd^5 )^(m/5) ]^(1/m)
        C2 = 1, C4 = 1 (local values; the mean form has 3/2 and 2)

    m, C1, C3, f(Pr), Nu_fd as in the mean form.  Re on D_h, Pr [-], x > 0 and
    D_h [m], alpha short/long side [-] (ignored for ``shape="circle"``, where
    sqrt(A)/D = sqrt(pi)/2 and Fanning f Re_D = 16).  Nu_x falls from the
    entry towards Nu_fd, so the coefficient at the outlet end is the smallest
    along the duct.
    """
    if shape not in ("rectangle", "circle"):
        raise ValueError(f"shape must be 'rectangle' or 'circle', not {shape!r}")
    return _my_combined(Re, Pr, x, D_h, alpha, condition, Nu_fd, _MY_C2_LOCAL, _MY_C4_LOCAL, shape)


# ---------------------------------------------------------------- selector

#: Laminar model names -> correlation functions (fixed at import).
LAMINAR_MODELS = {
    "muzychka-yovanovich": Nu_Muzychka_Yovanovich_combined,
    "hausen": Nu_Hausen,
    "sieder-tate": Nu_Sieder_Tate_laminar,
    "fully-developed": Nu_rectangular_Shah_London,
}
#: Turbulent model names -> correlation functions (fixed at import).
TURBULENT_MODELS = {
    "gnielinski": Nu_Gnielinski_VDI,
    "dittus-boelter": Nu_Dittus_Boelter,
}


def _fully_developed(shape, alpha, heated, condition):
    if shape == "circle":
        return Nu_circular_fully_developed(condition), Nu_circular_fully_developed.validity
    nu = Nu_rectangular_Shah_London(alpha, heated, condition)
    if heated in _FD_H1 and np.any(np.asarray(alpha) > 0):
        return nu, Nu_rectangular_finite_difference.validity
    return nu, Nu_rectangular_Shah_London.validity


def _laminar(name, Re, Pr, L, D_h, alpha, shape, heated, mu_ratio, condition):
    """Laminar Nu and the Validity records used."""
    fn = LAMINAR_MODELS[name]
    if name == "fully-developed":
        nu, v = _fully_developed(shape, alpha, heated, condition)
        return nu, (v,)
    if name == "hausen":
        return fn(Re * Pr * D_h / L), (fn.validity,)
    if name == "sieder-tate":
        return fn(Re, Pr, L / D_h, mu_ratio), (fn.validity,)
    # Muzychka & Yovanovich with the Shah & London (or circular) developed asymptote;
    # a circular tube takes the circle's own sqrt(A)/D and f Re.
    nu_fd, v_fd = _fully_developed(shape, alpha, heated, condition)
    return fn(Re, Pr, L, D_h, alpha, condition, Nu_fd=nu_fd, shape=shape), (fn.validity, v_fd)


def _turbulent(name, Re, Pr, L_over_D, rel_roughness):
    """Turbulent Nu (Gnielinski's with the friction factor of the wall's roughness)."""
    fn = TURBULENT_MODELS[name]
    if name == "gnielinski":
        return fn(Re, Pr, L_over_D, f_turbulent_heat_transfer(Re, rel_roughness))
    return fn(Re, Pr, heating=True)


@dataclass(frozen=True)
class ConvectionResult:
    """Nusselt number on D_h and how it was obtained.

    ``regime``: "laminar", "transitional" or "turbulent" (array of these for
    array Re); ``methods``: Validity records of the correlations used;
    ``transition_weight``: weight of the turbulent value (0 laminar, 1 turbulent).
    """

    Nu: float | np.ndarray
    regime: str | np.ndarray
    methods: tuple[Validity, ...]
    transition_weight: float | np.ndarray


def nusselt(Re, Pr, L, D_h, alpha, shape="rectangle", laminar="muzychka-yovanovich",
            turbulent="gnielinski", heated="4", mu_ratio=1.0, rel_roughness=0.0,
            condition="H1") -> ConvectionResult:
    """Mean Nusselt number on D_h over a channel of length L, all regimes [-].

    Re, Pr [-]; L, D_h [m]; alpha short/long side [-] (ignored for "circle").
    Re <= 2300: laminar model ``laminar``; Re >= 1e4: turbulent model
    ``turbulent``; in between Nu = (1 - w) Nu_lam(2300) + w Nu_turb(1e4),
    w = transition_weight(Re) (VDI Heat Atlas G1), continuous at both ends.
    Gnielinski's turbulent value carries the length factor [1 + (D_h/L)^(2/3)]
    at the anchor Re = 1e4 and above, as the VDI form does, and takes the
    friction factor of :func:`hydraulics.friction.f_turbulent_heat_transfer`
    at ``rel_roughness`` = e/D_h [-] (Konakov smooth, Colebrook rough).  ``heated`` (one of
    HEATED_ARRANGEMENTS) and ``condition`` select the fully developed laminar asymptote.  "hausen" and
    "sieder-tate" are uniform-wall-temperature correlations whatever
    ``condition`` says.
    """
    if laminar not in LAMINAR_MODELS:
        raise ValueError(f"unknown laminar model {laminar!r}; allowed: {sorted(LAMINAR_MODELS)}")
    if turbulent not in TURBULENT_MODELS:
        raise ValueError(f"unknown turbulent model {turbulent!r}; allowed: {sorted(TURBULENT_MODELS)}")
    if shape not in ("rectangle", "circle"):
        raise ValueError(f"shape must be 'rectangle' or 'circle', not {shape!r}")
    _check_condition(condition)
    _check_heated(heated)
    Re = np.asarray(Re, dtype=float)
    if np.any(Re <= 0):
        raise ValueError("Re must be positive")
    args = (Pr, L, D_h, alpha, shape, heated, mu_ratio, condition)
    w = np.asarray(transition_weight(Re), dtype=float)
    # each regime's correlations are evaluated only where some Re needs them (the same values otherwise)
    any_laminar, any_turbulent = bool(np.any(Re < RE_TURBULENT_START)), bool(np.any(Re > RE_LAMINAR_END))
    lam_here, v_lam = _laminar(laminar, np.minimum(Re, RE_LAMINAR_END), *args) if any_laminar else (0.0, ())
    if not any_turbulent:
        Nu = np.where(Re <= RE_LAMINAR_END, lam_here, 0.0)         # every Re laminar: lam_here, broadcast
    else:
        L_over_D = np.asarray(L, dtype=float) / np.asarray(D_h, dtype=float)
        turb_here = _turbulent(turbulent, np.maximum(Re, RE_TURBULENT_START), Pr, L_over_D, rel_roughness)
        if any_laminar:
            lam_end, _ = _laminar(laminar, RE_LAMINAR_END, *args)
            turb_start = _turbulent(turbulent, RE_TURBULENT_START, Pr, L_over_D, rel_roughness)
            blend = (1.0 - w) * np.asarray(lam_end) + w * np.asarray(turb_start)
        else:
            blend = 0.0
        Nu = np.where(Re <= RE_LAMINAR_END, lam_here, np.where(Re >= RE_TURBULENT_START, turb_here, blend))
    regime = np.where(Re <= RE_LAMINAR_END, "laminar",
                      np.where(Re >= RE_TURBULENT_START, "turbulent", "transitional"))
    used = []
    if np.any(Re < RE_TURBULENT_START):
        used.extend(v_lam)
    if np.any(Re > RE_LAMINAR_END):
        used.append(TURBULENT_MODELS[turbulent].validity)
    return ConvectionResult(
        Nu=_out(Nu),
        regime=str(regime) if regime.ndim == 0 else regime,
        methods=tuple(used),
        transition_weight=_out(w),
    )


# ---------------------------------------------------------------- local coefficient along the duct

#: The local form each laminar model uses for the coefficient at a point: its own local form where the method
#: publishes one, otherwise the fully developed value, the smallest local coefficient along a thermal entry
#: (Shah & London 1978), so the face at that point is not reported cooler.
LAMINAR_LOCAL_FORMS = {
    "muzychka-yovanovich": Nu_Muzychka_Yovanovich_local,
    "hausen": Nu_rectangular_Shah_London,
    "sieder-tate": Nu_rectangular_Shah_London,
    "fully-developed": Nu_rectangular_Shah_London,
}


def _laminar_local(name, Re, Pr, x, D_h, alpha, shape, heated, condition):
    """Local laminar Nu at x [m] from the entry and the Validity records used."""
    nu_fd, v_fd = _fully_developed(shape, alpha, heated, condition)
    if LAMINAR_LOCAL_FORMS[name] is not Nu_Muzychka_Yovanovich_local:
        return _out(np.broadcast_to(np.asarray(nu_fd, dtype=float), np.broadcast(Re, x).shape)), (v_fd,)
    a = 1.0 if shape == "circle" else alpha
    nu = Nu_Muzychka_Yovanovich_local(Re, Pr, x, D_h, a, condition, Nu_fd=nu_fd, shape=shape)
    return nu, (Nu_Muzychka_Yovanovich_local.validity, v_fd)


def nusselt_local(Re, Pr, x, L, D_h, alpha, shape="rectangle", laminar="muzychka-yovanovich",
                  turbulent="gnielinski", heated="4", mu_ratio=1.0, rel_roughness=0.0,
                  condition="H1", mean: ConvectionResult | None = None) -> ConvectionResult:
    """Local Nusselt number on D_h at x [m] from the entry of a channel of length L, all regimes [-].

    The laminar part is the laminar model's local form (``LAMINAR_LOCAL_FORMS``: the local Muzychka &
    Yovanovich constants, or the fully developed value for models that publish only a mean); the rest is
    :func:`nusselt`'s own blend, so in the transition the local laminar value at Re = 2300 takes the laminar
    share and the turbulent share is unchanged:

        Nu_x = Nu_mean - (1 - w) (Nu_lam,mean - Nu_lam,x),   w = transition_weight(Re)

    with both laminar values at min(Re, 2300).  The turbulent share drops Gnielinski's length factor
    [1 + (D_h/L)^(2/3)], which is an entry effect of the mean over the length: locally, away from the entry, the
    turbulent coefficient is the fully developed one (the lower, so the face there is not reported cooler)::

        Nu_x -= w (Nu_turb(L/D_h) - Nu_turb(L/D_h -> infinity)),   at max(Re, 1e4)

    ``mean``: the :func:`nusselt` result for the same arguments,
    when already computed.  x broadcasts against Re (e.g. Re (G, 1, Nq) and x (1, P, 1)).  ``methods`` lists
    the local form's record and the records of the mean blend.
    """
    if mean is None:
        mean = nusselt(Re, Pr, L, D_h, alpha, shape, laminar, turbulent, heated, mu_ratio, rel_roughness, condition)
    Re = np.asarray(Re, dtype=float)
    Re_turb = np.maximum(Re, RE_TURBULENT_START)
    L_over_D = np.asarray(L, dtype=float) / np.asarray(D_h, dtype=float)
    entry = (np.asarray(_turbulent(turbulent, Re_turb, Pr, L_over_D, rel_roughness))
             - np.asarray(_turbulent(turbulent, Re_turb, Pr, np.inf, rel_roughness)))
    Re_lam = np.minimum(Re, RE_LAMINAR_END)
    lam_mean, _ = _laminar(laminar, Re_lam, Pr, L, D_h, alpha, shape, heated, mu_ratio, condition)
    lam_x, v_local = _laminar_local(laminar, Re_lam, Pr, np.asarray(x, dtype=float), D_h, alpha, shape, heated,
                                    condition)
    w = np.asarray(mean.transition_weight, dtype=float)
    Nu = np.asarray(mean.Nu) - (1.0 - w) * (np.asarray(lam_mean) - np.asarray(lam_x)) - w * entry
    used = tuple(v_local) + tuple(v for v in mean.methods if v not in v_local) if np.any(w < 1) else mean.methods
    return ConvectionResult(Nu=_out(Nu), regime=mean.regime, methods=used, transition_weight=mean.transition_weight)
