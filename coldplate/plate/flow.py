"""The passage at one operating point: velocity, Reynolds number, friction, Nusselt number and coefficient.

The one formula for the check (:mod:`coldplate.plate.solve`), the flow split across channels
(:mod:`coldplate.plate.split`) and the sizing search (arrays of candidates).
"""
from __future__ import annotations

from hydraulics.friction import darcy_friction

from coldplate.plate.convection import nusselt


def passage_flow(m_dot, pr, total_area, D_h, alpha, shape, path_length, heated_length, heated, rel_roughness,
                 model, mu_ratio=1.0):
    """The passage at an operating point: velocity [m/s], Reynolds number, Darcy friction (FrictionResult),
    Nusselt number (ConvectionResult) and heat transfer coefficient [W/(m² K)].

    V = ṁ / (ρ A_total), Re = ρ V D_h / μ, h = Nu k / D_h.  ``pr`` has rho, mu, k, Pr; every argument may be a
    float or a numpy array (the sizing evaluator passes arrays of candidates), ``model`` the design's
    correlation choices.  The one formula for both the check and the sizing search.
    """
    V, Re, fr = passage_friction(m_dot, pr, total_area, D_h, alpha, shape, path_length, rel_roughness)
    cv = nusselt(Re, pr.Pr, heated_length, D_h, alpha, shape=shape, laminar=model.laminar,
                 turbulent=model.turbulent, heated=heated, mu_ratio=mu_ratio, rel_roughness=rel_roughness)
    h = cv.Nu * pr.k / D_h
    return V, Re, fr, cv, h


def friction_pressure_drop(f, length, D_h, rho, V):
    """Darcy-Weisbach: dp = f (L / D_h) ρ V² / 2 [Pa] (floats or arrays)."""
    return f * length / D_h * 0.5 * rho * V**2


def passage_friction(m_dot, pr, total_area, D_h, alpha, shape, path_length, rel_roughness):
    """The hydraulic half of :func:`passage_flow`: velocity [m/s], Reynolds number and Darcy friction
    (FrictionResult) at mass flow ``m_dot`` [kg/s] through ``total_area`` [m²].  Floats or numpy arrays (the
    flow split calls it for every channel at once)."""
    V = m_dot / (pr.rho * total_area)
    Re = pr.rho * V * D_h / pr.mu
    return V, Re, darcy_friction(Re, path_length, D_h, alpha, shape, rel_roughness)
