"""Laminar duct hydraulics: geometry helpers, regime limits and laminar friction.

Conventions used throughout :mod:`hydraulics` and :mod:`coldplate`:

* ``alpha`` is the aspect ratio of a rectangular duct, short side / long side,
  ``0 <= alpha <= 1`` (``0`` = parallel plates, ``1`` = square).
* ``Re`` and the Darcy friction factor ``f`` are on the hydraulic diameter
  ``D_h = 4 A / P`` unless a name says otherwise (``_sqrtA``: square root of
  the flow area, the length scale of Muzychka & Yovanovich).
* Darcy ``f`` = 4 x Fanning ``f``.
"""
from __future__ import annotations

import math
from functools import lru_cache

import numpy as np

from hydraulics.validity import Bound, Validity, with_validity

INF = math.inf

#: End of the laminar regime and start of the fully turbulent regime.  Between
#: the two, values are interpolated linearly in :func:`transition_weight`
#: (VDI Heat Atlas, chapter G1; Gnielinski 2013, Int. J. Heat Mass Transfer 63:134).
RE_LAMINAR_END = 2300.0
RE_TURBULENT_START = 1.0e4

# Odd series indices for the exact rectangular-duct solution; the terms fall as
# n**-5, so 101 terms leave a truncation error far below 1e-12.
_ODD_N = np.arange(1, 202, 2, dtype=float)
# For alpha <= 1, tanh(n pi / (2 alpha)) is 1 to double precision once n pi / 2 > 19.1 (n >= 13): those terms
# are summed once here, so an array of many aspect ratios costs 6 tanh per element, not 101.
_HEAD_N = _ODD_N[_ODD_N < 13]
_TAIL_SUM = float(np.sum(1.0 / _ODD_N[_ODD_N >= 13] ** 5))


def _out(x):
    """Return a Python float for 0-d input, else the array."""
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x


def transition_weight(Re):
    """Weight of the turbulent value in the transition range [-].

    gamma = clip((Re - 2300) / (1e4 - 2300), 0, 1): 0 in laminar flow, 1 in
    fully turbulent flow, linear in between (VDI Heat Atlas G1).
    """
    Re = np.asarray(Re, dtype=float)
    w = (Re - RE_LAMINAR_END) / (RE_TURBULENT_START - RE_LAMINAR_END)
    return _out(np.clip(w, 0.0, 1.0))


def aspect_ratio(a, b):
    """Aspect ratio short side / long side of a rectangle with sides a, b [m] -> [-] in (0, 1]."""
    a = np.asarray(a, dtype=float)
    b = np.asarray(b, dtype=float)
    if np.any(a <= 0) or np.any(b <= 0):
        raise ValueError("rectangle sides must be positive")
    return _out(np.minimum(a, b) / np.maximum(a, b))


def hydraulic_diameter_rectangle(width, depth):
    """Hydraulic diameter of a rectangular channel, D_h = 2 w d / (w + d) [m]."""
    w = np.asarray(width, dtype=float)
    d = np.asarray(depth, dtype=float)
    if np.any(w <= 0) or np.any(d <= 0):
        raise ValueError("width and depth must be positive")
    return _out(2.0 * w * d / (w + d))


def hydraulic_diameter(area, wetted_perimeter):
    """Hydraulic diameter D_h = 4 A / P [m] from flow area A [m^2] and wetted perimeter P [m]."""
    A = np.asarray(area, dtype=float)
    P = np.asarray(wetted_perimeter, dtype=float)
    if np.any(A <= 0) or np.any(P <= 0):
        raise ValueError("area and wetted perimeter must be positive")
    return _out(4.0 * A / P)


def sqrtA_over_Dh(alpha):
    """Ratio sqrt(A) / D_h = (1 + alpha) / (2 sqrt(alpha)) of a rectangle [-] (alpha > 0).

    Converts between the hydraulic-diameter basis and the sqrt(area) basis of
    Muzychka & Yovanovich: Re_sqrtA = Re_Dh * r, fRe_sqrtA = fRe_Dh * r,
    Nu_sqrtA = Nu_Dh * r.
    """
    alpha = np.asarray(alpha, dtype=float)
    if np.any(alpha <= 0) or np.any(alpha > 1):
        raise ValueError("the sqrt(A) basis needs 0 < alpha <= 1")
    return _out((1.0 + alpha) / (2.0 * np.sqrt(alpha)))


SHAH_LONDON_FRE = Validity(
    method="Shah & London",
    reference=(
        "Shah, R.K., London, A.L. (1978) Laminar Flow Forced Convection in Ducts, "
        "Academic Press (Adv. Heat Transfer Suppl. 1), rectangular ducts: exact series "
        "for fully developed laminar flow"
    ),
    bounds=(
        Bound("alpha", 0.0, 1.0, "short/long side"),
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar, fully developed"),
    ),
)


@with_validity(SHAH_LONDON_FRE)
def fRe_rectangular_Shah_London(alpha):
    """Fully developed laminar Darcy f*Re of a rectangular duct (Re on D_h) [-].

    Exact series solution (Fanning form, Shah & London 1978)::

        (f Re)_Fanning = 24 / [(1+alpha)^2 (1 - (192 alpha / pi^5)
                                 * sum_{n odd} tanh(n pi / (2 alpha)) / n^5)]

    and Darcy f*Re = 4 * (f Re)_Fanning.  alpha = 0 (parallel plates) gives 96,
    alpha = 1 (square) 56.91.  Accepts floats or arrays of alpha [-] (a float's value is kept: a plate's
    channels and headers ask for the same few aspect ratios many times in a solve).
    """
    if np.ndim(alpha) == 0:
        return _fRe_rectangular_one(float(alpha))
    if np.size(alpha) == 1:                         # one duct as a one-entry array (a single sink's fins)
        return np.full(np.shape(alpha), _fRe_rectangular_one(float(np.ravel(alpha)[0])))
    return _fRe_rectangular(alpha)


@lru_cache(maxsize=1024)
def _fRe_rectangular_one(alpha: float) -> float:
    return _fRe_rectangular(alpha)


def _fRe_rectangular(alpha):
    alpha = np.asarray(alpha, dtype=float)
    if np.any(alpha < 0) or np.any(alpha > 1):
        raise ValueError("alpha must lie in [0, 1] (short side / long side)")
    a = alpha[..., None]
    safe = np.where(a > 0, a, 1.0)
    # tanh(n pi / (2 alpha)) -> 1 as alpha -> 0; the series term is multiplied
    # by alpha anyway, so alpha = 0 needs no special case beyond avoiding 1/0.
    t = np.where(a > 0, np.tanh(_HEAD_N * math.pi / (2.0 * safe)), 1.0)
    series = np.sum(t / _HEAD_N**5, axis=-1) + _TAIL_SUM
    fanning = 24.0 / ((1.0 + alpha) ** 2 * (1.0 - 192.0 * alpha / math.pi**5 * series))
    return _out(4.0 * fanning)


SHAH_APPARENT = Validity(
    method="Shah",
    reference=(
        "Shah, R.K. (1978) A correlation for laminar hydrodynamic entry length solutions "
        "for circular and noncircular ducts, J. Fluids Eng. 100(2):177-179 (stated accuracy "
        "+/-2.4 %); constants K(inf) = 1.25, C = 0.00021 for the circular tube, as given in "
        "Shah & London (1978)"
    ),
    bounds=(
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar"),
        Bound("x_plus", 0.0, INF, "x+ = L/(D Re)"),
    ),
)


@with_validity(SHAH_APPARENT)
def f_apparent_Shah(Re, L, D):
    """Apparent Darcy friction factor, developing laminar flow in a circular tube [-].

    With x+ = L / (D Re) [-], length L [m], diameter D [m]::

        (f_app Re)_Fanning = 3.44 / sqrt(x+)
                             + [K/(4 x+) + 16 - 3.44/sqrt(x+)] / (1 + C / x+^2),
        K = 1.25, C = 0.00021,

    returned as Darcy f_app = 4 (f_app Re)_Fanning / Re.  f_app includes the
    wall shear and the momentum change of the developing profile over 0..L.
    """
    Re = np.asarray(Re, dtype=float)
    xp = np.asarray(L, dtype=float) / (np.asarray(D, dtype=float) * Re)
    s = 3.44 / np.sqrt(xp)
    fanning_Re = s + (1.25 / (4.0 * xp) + 16.0 - s) / (1.0 + 0.00021 / xp**2)
    return _out(4.0 * fanning_Re / Re)


MUZYCHKA_YOVANOVICH_APPARENT = Validity(
    method="Muzychka & Yovanovich",
    reference=(
        "Muzychka, Y.S., Yovanovich, M.M. (2009) Pressure drop in laminar developing flow "
        "in noncircular ducts: a scaling and modeling approach, J. Fluids Eng. 131(11):111105, "
        "doi:10.1115/1.4000377 (stated accuracy 10 % with nominal aspect ratios); fully "
        "developed fRe from the Shah & London (1978) exact series"
    ),
    bounds=(
        Bound("Re", 0.0, RE_LAMINAR_END, "laminar"),
        Bound("alpha", 1e-6, 1.0, "short/long side, > 0 for the sqrt(A) scale"),
    ),
)


@with_validity(MUZYCHKA_YOVANOVICH_APPARENT)
def f_apparent_Muzychka_Yovanovich(Re, L, D_h, alpha):
    """Apparent Darcy friction factor, developing laminar flow in a rectangular duct [-].

    Model of Muzychka & Yovanovich (2009) on the sqrt(A) length scale::

        f_app Re_sqrtA = [ (3.44 / sqrt(L+))^2 + (f Re_sqrtA,fd)^2 ]^(1/2)   (Fanning)
        L+ = L / (sqrt(A) Re_sqrtA)

    Inputs and output are on the hydraulic-diameter basis: Re on D_h [-], L
    and D_h [m], alpha short/long side [-].  With r = sqrt(A)/D_h =
    (1+alpha)/(2 sqrt(alpha)): Re_sqrtA = r Re, f Re_sqrtA,fd = r (f Re)_Fanning,Dh
    where the fully developed value is the exact Shah & London series (the
    paper uses its one-term approximation).  Returned: Darcy f on D_h.
    """
    Re = np.asarray(Re, dtype=float)
    r = np.asarray(sqrtA_over_Dh(alpha), dtype=float)
    fRe_fd_sqrtA = r * np.asarray(fRe_rectangular_Shah_London(alpha), dtype=float) / 4.0
    Re_sqrtA = r * Re
    L_plus = np.asarray(L, dtype=float) / (np.asarray(D_h, dtype=float) * r * Re_sqrtA)
    fapp_Re_sqrtA = np.sqrt((3.44 / np.sqrt(L_plus)) ** 2 + fRe_fd_sqrtA**2)
    return _out(4.0 * fapp_Re_sqrtA / Re_sqrtA)
