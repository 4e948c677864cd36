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
from hydraulics.friction import f_Petukhov
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
        "Gnielinski, V. (1976) New equations for heat and mass transfer in turbulent pipe "
        "and channel flow, Int. Chem. Eng. 16(2):359-368"
    ),
    bounds=(Bound("Re", 3000.0, 5.0e6), Bound("Pr", 0.5, 2000.0)),
))
def Nu_Gnielinski(Re, Pr, f=None):
    """Turbulent Nusselt number of Gnielinski [-].

    Nu = (f/8)(Re - 1000) Pr / [1 + 12.7 (f/8)^(1/2) (Pr^(2/3) - 1)],
    f the Darcy friction factor [-] (Petukhov smooth-tube value when None).
    """
    Re = np.asarray(Re, dtype=float)
    Pr = np.asarray(Pr, dtype=float)
    f8 = np.asarray(f_Petukhov(Re) if f is None else f, dtype=float) / 8.0
    return _out(f8 * (Re - 1000.0) * Pr / (1.0 + 12.7 * np.sqrt(f8) * (Pr ** (2.0 / 3.0) - 1.0)))


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

# Fifth-order fits in alpha (0 <= alpha <= 1) to the Shah & London (1978) tables.
_SL_POLY = {
    (4, "T"): (7.541, (1.0, -2.610, 4.970, -5.119, 2.702, -0.548)),
    (4, "H1"): (8.235, (1.0, -2.0421, 3.0853, -2.4765, 1.0578, -0.1861)),
    # Two long walls and one short wall heated, the other short wall adiabatic:
    # Qu & Mudawar (2003) Int. J. Heat Mass Transfer 46:2755, eq. (11), citing Shah & London.
    (3, "H1"): (8.235, (1.0, -1.883, 3.767, -5.814, 5.361, -2.0)),
}
# Parallel plates (alpha = 0): both plates heated / one heated, the other insulated.
_PARALLEL_PLATES = {(2, "T"): 7.541, (2, "H1"): 8.235, (1, "T"): 4.861, (1, "H1"): 70.0 / 13.0}


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
def Nu_rectangular_Shah_London(alpha, heated_walls=4, condition="H1"):
    """Fully developed laminar Nu on D_h of a rectangular duct [-].

    Nu = Nu_0 (1 + c1 alpha + ... + c5 alpha^5), alpha short/long side [-]:

    * heated_walls=4, "T":  Nu_0 = 7.541, c = -2.610, 4.970, -5.119, 2.702, -0.548
    * heated_walls=4, "H1": Nu_0 = 8.235, c = -2.0421, 3.0853, -2.4765, 1.0578, -0.1861
    * heated_walls=3, "H1": Nu_0 = 8.235, c = -1.883, 3.767, -5.814, 5.361, -2.0,
      for BOTH LONG walls and one short wall heated, the other short wall
      adiabatic (deep channel, width < depth, lid = short side).  h is
      referred to the heated perimeter, D_h to the full perimeter.  The
      published table for a heated short wall pair with an adiabatic LONG wall
      (wide shallow channel under an unheated lid) could not be found to
      check, so that case is not offered; nor is three-wall "T".
    * heated_walls=2 or 1 only for parallel plates (alpha = 0): 8.235 / 7.541
      both plates heated, 70/13 = 5.385 / 4.861 one plate heated and the other
      insulated.  Finite-alpha values for one or two heated walls were not
      verified, so they raise ValueError.
    """
    _check_condition(condition)
    alpha = np.asarray(alpha, dtype=float)
    if np.any(alpha < 0) or np.any(alpha > 1):
        raise ValueError("alpha must lie in [0, 1] (short side / long side)")
    if heated_walls in (1, 2):
        if np.any(alpha != 0):
            raise ValueError(
                "heated_walls=1 or 2 is only available for parallel plates (alpha = 0); "
                "the finite-aspect-ratio table values could not be verified"
            )
        return _out(np.full(alpha.shape, _PARALLEL_PLATES[(heated_walls, condition)]))
    if (heated_walls, condition) not in _SL_POLY:
        raise ValueError(
            f"heated_walls={heated_walls!r} with condition {condition!r} is not available; "
            "use heated_walls=4 ('T' or 'H1') or 3 ('H1')"
        )
    nu0, c = _SL_POLY[(heated_walls, condition)]
    poly = sum(ci * alpha**i for i, ci in enumerate(c))
    return _out(nu0 * poly)


# Muzychka & Yovanovich (2004) constants: (C1, C3, Prandtl-function numerator and constant)
_MY_CONST = {"T": (3.24, 0.409, 0.564, 1.664), "H1": (3.86, 0.501, 0.886, 1.909)}
_MY_C2_MEAN, _MY_C4_MEAN, _MY_GAMMA = 1.5, 2.0, 0.1


@with_validity(Validity(
    method="Muzychka & Yovanovich",
    reference=(
        "Muzychka, Y.S., Yovanovich, M.M. (2004) Laminar forced convection heat transfer in "
        "the combined entry region of non-circular ducts, J. Heat Transfer 126(1):54-61, "
        "doi:10.1115/1.1643752 (stated accuracy about 10 %)"
    ),
    bounds=(
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar"),
        Bound("Pr", 0.1, INF, "the paper's comparisons span about 0.1 to infinity"),
        Bound("alpha", 1e-6, 1.0, "short/long side, > 0 for the sqrt(A) scale"),
    ),
))
def Nu_Muzychka_Yovanovich_combined(Re, Pr, L, D_h, alpha, condition="H1", Nu_fd=None):
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
    Nu_Dh = Nu_sqrtA / r.
    """
    _check_condition(condition)
    Re = np.asarray(Re, dtype=float)
    Pr = np.asarray(Pr, dtype=float)
    r = np.asarray(sqrtA_over_Dh(alpha), dtype=float)
    C1, C3, c0, cpr = _MY_CONST[condition]
    fRe = r * np.asarray(fRe_rectangular_Shah_London(alpha), dtype=float) / 4.0
    z = np.asarray(L, dtype=float) / (np.asarray(D_h, dtype=float) * r * (r * Re) * Pr)
    m = 2.27 + 1.65 * Pr ** (1.0 / 3.0)
    fPr = c0 / (1.0 + (cpr * Pr ** (1.0 / 6.0)) ** 4.5) ** (2.0 / 9.0)
    if Nu_fd is None:
        nu_fd = C1 * fRe / (8.0 * math.sqrt(math.pi) * np.asarray(alpha, dtype=float) ** _MY_GAMMA)
    else:
        nu_fd = np.asarray(Nu_fd, dtype=float) * r
    developing = (_MY_C2_MEAN * C3 * (fRe / z) ** (1.0 / 3.0)) ** 5
    nu_sqrtA = ((_MY_C4_MEAN * fPr / np.sqrt(z)) ** m + (developing + nu_fd**5) ** (m / 5.0)) ** (1.0 / m)
    return _out(nu_sqrtA / r)


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
    "gnielinski": Nu_Gnielinski,
    "dittus-boelter": Nu_Dittus_Boelter,
}


def _fully_developed(shape, alpha, heated_walls, condition):
    if shape == "circle":
        return Nu_circular_fully_developed(condition), Nu_circular_fully_developed.validity
    return Nu_rectangular_Shah_London(alpha, heated_walls, condition), Nu_rectangular_Shah_London.validity


def _laminar(name, Re, Pr, L, D_h, alpha, shape, heated_walls, mu_ratio, condition):
    """Laminar Nu and the Validity records used."""
    fn = LAMINAR_MODELS[name]
    if name == "fully-developed":
        nu, v = _fully_developed(shape, alpha, heated_walls, condition)
        return nu, (v,)
    if name == "hausen":
        return fn(Re * Pr * D_h / L), (fn.validity,)
    if name == "sieder-tate":
        return fn(Re, Pr, L / D_h, mu_ratio), (fn.validity,)
    # Muzychka & Yovanovich with the Shah & London (or circular) developed asymptote;
    # a circular tube is taken as the square (alpha = 1) of the same D_h.
    nu_fd, v_fd = _fully_developed(shape, alpha, heated_walls, condition)
    a = 1.0 if shape == "circle" else alpha
    return fn(Re, Pr, L, D_h, a, condition, Nu_fd=nu_fd), (fn.validity, v_fd)


def _turbulent(name, Re, Pr, f_turbulent):
    fn = TURBULENT_MODELS[name]
    if name == "gnielinski":
        f = None if f_turbulent is None else f_turbulent(Re)
        return fn(Re, Pr, f)
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
            turbulent="gnielinski", heated_walls=4, mu_ratio=1.0, f_turbulent=None,
            condition="H1") -> ConvectionResult:
    """Mean Nusselt number on D_h over a channel of length L, all regimes [-].

    Re, Pr [-]; L, D_h [m]; alpha short/long side [-] (ignored for "circle").
    Re <= 2300: laminar model ``laminar``; Re >= 1e4: turbulent model
    ``turbulent``; in between Nu = (1 - w) Nu_lam(2300) + w Nu_turb(1e4),
    w = transition_weight(Re) (VDI Heat Atlas G1), continuous at both ends.
    ``f_turbulent``: optional callable Re -> Darcy f for Gnielinski (e.g. a
    rough-wall Colebrook); Petukhov when None.  ``heated_walls`` and
    ``condition`` select the fully developed laminar asymptote.  "hausen" and
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
    Re = np.asarray(Re, dtype=float)
    if np.any(Re <= 0):
        raise ValueError("Re must be positive")
    args = (Pr, L, D_h, alpha, shape, heated_walls, mu_ratio, condition)
    w = np.asarray(transition_weight(Re), dtype=float)
    lam_here, v_lam = _laminar(laminar, np.minimum(Re, RE_LAMINAR_END), *args)
    lam_end, _ = _laminar(laminar, RE_LAMINAR_END, *args)
    turb_here = _turbulent(turbulent, np.maximum(Re, RE_TURBULENT_START), Pr, f_turbulent)
    turb_start = _turbulent(turbulent, RE_TURBULENT_START, Pr, f_turbulent)
    blend = (1.0 - w) * np.asarray(lam_end) + w * np.asarray(turb_start)
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
