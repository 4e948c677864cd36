"""The solved design against independent hand calculations built from outside libraries.

The solve's own correlation code does not call these library functions, so they are independent references:
- Gnielinski's VDI Heat Atlas (G1) form written out here with fluids.friction.Colebrook's friction factor,
  and ht.conv_internal.turbulent_Dittus_Boelter;
- fluids.friction.Colebrook (our code solves Colebrook with fluids' Clamond routine);
- iapws.IAPWS95 for water properties (our code uses CoolProp's IF97 backend).
"""
from __future__ import annotations

import math

import pytest
from fluids.friction import Colebrook
from ht.conv_internal import turbulent_Dittus_Boelter
from iapws import IAPWS95

from coldplate.design.reader import design_from_dict
from .helpers import network_solve as solve  # the network model's numbers

from .helpers import example_dict, modified


def _props(T, p):
    w = IAPWS95(T=T, P=p / 1e6)
    return w.rho, w.mu, w.cp * 1e3, w.k


@pytest.fixture(scope="module")
def turbulent_tube():
    # 3.5 L/min through a 4.6 mm tube: Re about 16 000, clearly turbulent.
    d = design_from_dict(modified(example_dict("laser-mount-tube"), coolant__flow="3.5 L/min"))
    return solve(d)


def test_turbulent_tube_reynolds_and_h_against_gnielinski_vdi(turbulent_tube):
    r = turbulent_tube
    assert r.regime == "turbulent"
    rho, mu, cp, k = _props(r.props.T, r.line_pressure)
    D = r.geometry.D_h
    V = r.m_dot / (rho * math.pi * D**2 / 4)
    Re = rho * V * D / mu
    Pr = cp * mu / k
    assert r.Re == pytest.approx(Re, rel=2e-3)
    # published: Gnielinski, VDI Heat Atlas 2010 ch. G1 (from memory), Nu = (f/8) Re Pr / [1 + 12.7
    # (f/8)^(1/2) (Pr^(2/3) - 1)] [1 + (D/L)^(2/3)], L the heated length; the drawn copper tube's
    # roughness gives the rough-wall friction factor (library: fluids.friction.Colebrook)
    fd = Colebrook(Re, r.geometry.roughness / D)
    LD = r.geometry.heated_length / D
    nu = (fd / 8) * Re * Pr / (1 + 12.7 * math.sqrt(fd / 8) * (Pr ** (2 / 3) - 1)) * (1 + LD ** (-2 / 3))
    assert r.h == pytest.approx(nu * k / D, rel=5e-3)


def test_turbulent_tube_friction_drop_against_fluids_colebrook(turbulent_tube):
    r = turbulent_tube
    rho, mu, _, _ = _props(r.props.T, r.line_pressure)
    D = r.geometry.D_h
    V = r.m_dot / (rho * math.pi * D**2 / 4)
    Re = rho * V * D / mu
    f = Colebrook(Re, r.geometry.roughness / D)
    dp_ref = f * r.geometry.path_length / D * rho * V**2 / 2  # Darcy-Weisbach
    assert r.dp_friction == pytest.approx(dp_ref, rel=5e-3)


def test_dittus_boelter_selectable_against_ht():
    d = design_from_dict(modified(example_dict("laser-mount-tube"), coolant__flow="3.5 L/min",
                                  correlations={"turbulent": "dittus-boelter"}))
    r = solve(d)
    rho, mu, cp, k = _props(r.props.T, r.line_pressure)
    D = r.geometry.D_h
    Re = rho * (r.m_dot / (rho * math.pi * D**2 / 4)) * D / mu
    h_ref = turbulent_Dittus_Boelter(Re=Re, Pr=cp * mu / k, heating=True) * k / D
    assert r.h == pytest.approx(h_ref, rel=5e-3)
    assert any(m.method == "Dittus-Boelter" for m in r.methods)


def test_fully_developed_laminar_tube_is_48_over_11():
    # Source: textbook standard, uniform heat flux in a circular tube, Nu = 48/11 = 4.364.
    d = design_from_dict(modified(example_dict("laser-mount-tube"), coolant__flow="0.2 L/min",
                                  correlations={"laminar": "fully-developed"}))
    r = solve(d)
    assert r.regime == "laminar"
    assert r.Nu == pytest.approx(48 / 11, rel=1e-3)


def test_convection_resistance_is_one_over_h_area(turbulent_tube):
    # Source: definition of h; the tube's wetted area in the plate is pi·D_i·(passes·L), the bonded half fully
    # effective and the unbonded half through the wall as a curved fin: eta = tanh(mL)/(mL) (Incropera, straight
    # fin with adiabatic tip), m = sqrt(h/(k t)) for a wall wetted on one face, L a quarter of the mean circumference.
    r = turbulent_tube
    h = r.h_hot  # the breakdown is at the hottest point, with the local coefficient there
    p = r.design.passage
    parts = dict(r.resistances)
    A = math.pi * r.geometry.D_h * r.geometry.heated_length
    k_copper = 388.0  # W/(m K), copper near room temperature (Incropera Table A.1 gives 401 for pure copper;
    #                   the project's table holds 388 for C11000, from memory; the fin is 0.97 efficient either way)
    t = (p.outer_diameter - p.inner_diameter) / 2
    mL = math.sqrt(h / (k_copper * t)) * math.pi * (p.outer_diameter + p.inner_diameter) / 8
    eta = math.tanh(mL) / mL
    assert parts["convection"] == pytest.approx(1 / (h * A * (0.5 + 0.5 * eta)), rel=2e-3)
