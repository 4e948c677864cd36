"""The flow split's fast friction, warm starts and paired forms against the general functions they stand in for.

Computed by our own functions: :class:`hydraulics.friction.DuctFriction` (darcy_friction with the geometry held,
which the flow split calls many times a solve) against :func:`hydraulics.friction.darcy_friction` itself, and a
warm-started split against one started even.  The correlations themselves are checked against published values
and ``fluids`` in tests/test_ducts_friction.py.
"""
from __future__ import annotations

import math

import numpy as np
import pytest

from hydraulics.friction import DuctFriction, darcy_friction, duct_friction
from hydraulics.manifold import Header, solve_split, solve_split_forms, uniform_manifold

#: Re from deep laminar through the VDI blend to fully turbulent, both blend ends exactly.
RE = np.array([3.0, 40.0, 650.0, 2299.0, 2300.0, 2301.0, 5000.0, 9999.0, 1e4, 1e4 + 1, 3e4, 2e5])


@pytest.mark.parametrize("shape, alpha, rough, L", [
    ("rectangle", 0.25, 0.0, 0.05), ("rectangle", 1.0, 0.002, 0.3), ("rectangle", 0.05, 0.01, math.inf),
    ("circle", 1.0, 0.0, 0.2), ("circle", 1.0, 0.004, 1.5)])
def test_duct_friction_equals_darcy_friction(shape, alpha, rough, L):
    D_h = 0.004
    fixed = DuctFriction(L, D_h, alpha, shape, rough)
    general = darcy_friction(RE, L, D_h, alpha, shape, rough)
    assert fixed(RE) == pytest.approx(np.asarray(general.f), rel=1e-12)
    for part in (RE[:4], RE[7:9], RE[9:], RE[[0, -1]]):       # all laminar, the blend, all turbulent, mixed
        ref = darcy_friction(part, L, D_h, alpha, shape, rough)
        assert fixed(part) == pytest.approx(np.asarray(ref.f), rel=1e-12)
        assert fixed.methods(part) == ref.methods
    grid = RE.reshape(3, 4)                                   # any array shape (the Newton step's columns)
    assert fixed(grid) == pytest.approx(np.asarray(general.f).reshape(3, 4), rel=1e-12)


def test_duct_friction_over_arrays_of_ducts():
    # many ducts at once (the air sink search's candidates): each equals its own darcy_friction
    D_h = np.linspace(0.001, 0.01, RE.size)
    alpha = np.linspace(0.02, 1.0, RE.size)
    for rough in (0.0, 0.003):
        f = DuctFriction(0.12, D_h, alpha, "rectangle", rough)(RE)
        assert f == pytest.approx(np.asarray(darcy_friction(RE, 0.12, D_h, alpha, "rectangle", rough).f), rel=1e-12)


def test_duct_friction_is_kept_per_geometry():
    a = duct_friction(0.05, 0.004, 0.25, "rectangle", 0.0)
    assert duct_friction(0.05, 0.004, 0.25, "rectangle", 0.0) is a
    assert duct_friction(0.06, 0.004, 0.25, "rectangle", 0.0) is not a
    with pytest.raises(ValueError, match="shape"):
        DuctFriction(0.05, 0.004, 0.25, "triangle")


def _manifold(friction_length=None):
    header = Header(length=0.060, depth=0.004, width=0.006)
    drop = lambda q: 2.0e9 * q + 4.0e13 * q * abs(q)  # noqa: E731  (a channel's laminar and dynamic parts)
    return uniform_manifold(12, header, header, drop, inlet_port=0.027, outlet_port=-0.027,
                            friction_length=friction_length)


def test_warm_started_split_equals_the_even_start():
    # a Z arrangement (ports at opposite ends): an uneven split; the warm start is the split at 5 % more flow
    rho, mu, total = 998.0, 1.0e-3, 2.0 / 6e4
    m = _manifold()
    cold = solve_split(m, total, rho, mu)
    near = solve_split(m, 1.05 * total, rho, mu)
    warm = solve_split(m, total, rho, mu, start=near)
    assert cold.min_to_mean < 0.97                            # a split worth solving
    assert warm.channel_flows == pytest.approx(cold.channel_flows, rel=1e-9)
    assert warm.port_to_port == pytest.approx(cold.port_to_port, rel=1e-9)
    assert warm.iterations < cold.iterations
    other = solve_split(_manifold(math.inf), total, rho, mu, start=cold)   # the other header-friction form
    assert other.channel_flows == pytest.approx(solve_split(_manifold(math.inf), total, rho, mu).channel_flows,
                                                rel=1e-9)
    with pytest.raises(ValueError, match="start"):
        solve_split(uniform_manifold(5, m.inlet, m.outlet, m.channels[0]), total, rho, mu, start=cold)


@pytest.mark.parametrize("inlet_port, outlet_port", [(0.027, -0.027), (0.027, 0.027), (0.0, 0.0)])
def test_both_header_forms_together_equal_each_alone(inlet_port, outlet_port):
    # Z, U and centred ports: the developing and the fully developed header friction solved together
    # (solve_split_forms, as the check does) equal each solved alone (solve_split), with and without starts
    rho, mu, total = 998.0, 1.0e-3, 2.0 / 6e4
    header = Header(length=0.060, depth=0.004, width=0.006)
    drop = lambda q: 2.0e9 * q + 4.0e13 * q * abs(q)  # noqa: E731
    m = uniform_manifold(12, header, header, drop, inlet_port=inlet_port, outlet_port=outlet_port)
    alone = [solve_split(uniform_manifold(12, header, header, drop, inlet_port=inlet_port, outlet_port=outlet_port,
                                          friction_length=fl), total, rho, mu) for fl in (None, math.inf)]
    near = solve_split_forms(m, (None, math.inf), 1.05 * total, rho, mu)
    for starts in (None, near):
        together = solve_split_forms(m, (None, math.inf), total, rho, mu, starts)
        for a, b in zip(together, alone):
            assert a.channel_flows == pytest.approx(b.channel_flows, rel=1e-9)
            assert a.port_to_port == pytest.approx(b.port_to_port, rel=1e-9)
            assert a.inlet_pressure == pytest.approx(b.inlet_pressure, rel=1e-8, abs=1e-9)
            assert a.methods == b.methods and a.residual < 1e-6
    assert alone[0].port_to_port != pytest.approx(alone[1].port_to_port, rel=1e-3)   # two different problems
