"""The air side's own correlations, one pure function per published method (SI floats or numpy arrays).

What the water plate already has is reused, not repeated: forced flow between the fins is a rectangular duct
(``coldplate.plate.convection.nusselt``: Muzychka & Yovanovich developing laminar flow on the Shah & London
fully developed limits, Gnielinski turbulent, the VDI transition blend; ``hydraulics.friction.darcy_friction``:
Muzychka & Yovanovich apparent friction, Petukhov turbulent), the fin of adiabatic tip is
``coldplate.plate.conduction.fin_efficiency_straight``, the base's spreading the Muzychka, Culham & Yovanovich
series (``conduction.spreading_MCY``) and the entry and exit losses fluids' sharp contraction and expansion
(``hydraulics.losses``).  Here: the fin with a convecting tip (corrected length), natural convection between
vertical plates (Bar-Cohen & Rohsenow's composite of Elenbaas's limits) and its optimum spacing, and the
upward-facing heated plate a bare module's hot face is.
"""
from __future__ import annotations

import math

import numpy as np

from coldplate.plate.conduction import fin_efficiency_straight
from hydraulics.validity import Bound, Validity, with_validity

#: Standard gravity [m/s^2] (ISO 80000-3; the value ISO 2533 uses).
G0 = 9.80665


def _out(x):
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x


FIN_CORRECTED_TIP = Validity(
    method="straight fin, convecting tip (corrected length)",
    reference="Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer, 6th ed. (2007), "
    "sec. 3.6.4, eq. 3.89: L_c = L + t/2 (Harper & Brown 1922); error below 8 % for h t / (2 k) <= 0.0625",
    bounds=(
        Bound("mL", 0.0, math.inf),
        Bound("Bi", 0.0, 0.0625, "h t / (2 k), the corrected length's stated range"),
    ),
)


@with_validity(FIN_CORRECTED_TIP)
def fin_efficiency_corrected_tip(m, height, thickness):
    """Efficiency of a straight rectangular fin whose tip convects, eta = tanh(m L_c) / (m L_c) [-].

    m = sqrt(2 h / (k t)) [1/m] (``conduction.fin_m``), fin height L [m], thickness t [m]; the tip is folded
    onto the sides by the corrected length L_c = L + t/2, and eta applies to the area 2 L_c per unit length.
    """
    Lc = np.asarray(height, dtype=float) + 0.5 * np.asarray(thickness, dtype=float)
    return _out(fin_efficiency_straight(m, Lc))


ELENBAAS_BAR_COHEN_ROHSENOW = Validity(
    method="Bar-Cohen & Rohsenow (Elenbaas limits)",
    reference="A. Bar-Cohen, W.M. Rohsenow, Thermally optimum spacing of vertical, natural convection cooled, "
    "parallel plates, J. Heat Transfer 106 (1984) 116-123, symmetric isothermal plates: "
    "Nu_S = [576/El^2 + 2.873/El^(1/2)]^(-1/2); limits after W. Elenbaas, Heat dissipation of parallel plates "
    "by free convection, Physica 9 (1942) 1-28",
    bounds=(Bound("El", 0.0, math.inf, "composite of the fully developed and isolated-plate limits, any El",
                  low_open=True),),
)


@with_validity(ELENBAAS_BAR_COHEN_ROHSENOW)
def Nu_vertical_channel_Bar_Cohen_Rohsenow(El):
    """Mean Nusselt number on the spacing S of a channel between two vertical isothermal plates [-].

    El = Ra_S S / L = g beta (T_w - T_inf) S^4 / (nu alpha L) [-] (Elenbaas number), S spacing [m], L plate
    height [m]; Nu_S = h S / k with h on T_w - T_inf (ambient air: the air's rise in the channel is inside h)::

        Nu_S = [576 / El^2 + 2.873 / El^(1/2)]^(-1/2)
    """
    El = np.asarray(El, dtype=float)
    return _out((576.0 / El**2 + 2.873 / np.sqrt(El)) ** -0.5)


OPTIMUM_SPACING_BAR_COHEN_ROHSENOW = Validity(
    method="Bar-Cohen & Rohsenow optimum spacing",
    reference="A. Bar-Cohen, W.M. Rohsenow, J. Heat Transfer 106 (1984) 116-123: spacing of most heat from an "
    "array of symmetric isothermal vertical plates, S_opt = 2.714 / P^(1/4), P = g beta dT Pr / (nu^2 L)",
    bounds=(Bound("dT", 0.0, math.inf, "plate above ambient", low_open=True),),
)


@with_validity(OPTIMUM_SPACING_BAR_COHEN_ROHSENOW)
def spacing_optimum_Bar_Cohen_Rohsenow(L, dT, nu, alpha, beta, g=G0):
    """Optimum plate spacing of a vertical natural-convection fin array [m].

    L plate height [m], dT wall minus ambient [K], nu kinematic viscosity [m^2/s], alpha thermal diffusivity
    [m^2/s], beta expansion coefficient [1/K], g [m/s^2]::

        S_opt = 2.714 (L nu alpha / (g beta dT))^(1/4) = 2.714 L Ra_L^(-1/4)
    """
    return _out(2.714 * (np.asarray(L, dtype=float) * nu * alpha / (g * beta * np.asarray(dT, dtype=float))) ** 0.25)


HOT_PLATE_FACING_UP = Validity(
    method="heated horizontal plate facing up (Lloyd & Moran)",
    reference="J.R. Lloyd, W.R. Moran, Natural convection adjacent to horizontal surfaces of various planforms, "
    "J. Heat Transfer 96 (1974) 443-447, as Incropera et al. 6th ed. eq. 9.30: Nu_L = 0.54 Ra_L^(1/4), "
    "L = A / P",
    bounds=(Bound("Ra_L", 1e4, 1e7, "laminar range of the 0.54 form"),),
)


@with_validity(HOT_PLATE_FACING_UP)
def Nu_hot_plate_up_Lloyd_Moran(Ra_L):
    """Mean Nusselt number of the upper face of a heated horizontal plate, on L = area / perimeter [-].

    Ra_L = g beta (T_s - T_inf) L^3 / (nu alpha) [-]::

        Nu_L = 0.54 Ra_L^(1/4)
    """
    return _out(0.54 * np.asarray(Ra_L, dtype=float) ** 0.25)
