"""Robustness of the supply side: any circuit the reader accepts gives an operating point that uses exactly the
tap's pressure and a least flow that meets its limits, or fails with a one-line DesignError. Property-based
(hypothesis); the checks are the definitions of the operating point and of the least flow."""
from __future__ import annotations

import copy
import math

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from coldplate.plate.solve import solve_plate

from .helpers import example_dict, solved_or_refused

TAP = example_dict("tap-to-drain-circuit")


@st.composite
def circuits(draw):
    data = copy.deepcopy(TAP)
    s, parts = data["supply"], data["circuit"]["part"]
    s["static_pressure"] = f"{draw(st.floats(0.2, 8)):.4g} bar"
    s["face_limit"] = f"{draw(st.floats(20, 90)):.4g} degC"
    data["heat"]["load"] = f"{draw(st.floats(1, 2000)):.4g} W"
    data["coolant"]["inlet_temperature"] = f"{draw(st.floats(5, 40)):.3g} degC"
    hose = next(p for p in parts if p.get("name") == "supply hose")
    hose["inner_diameter"] = f"{draw(st.floats(3, 25)):.3g} mm"
    hose["length"] = f"{draw(st.floats(0.1, 50)):.3g} m"
    barb = next(p for p in parts if p.get("name") == "tap hose barb")
    barb["diameter"] = hose["inner_diameter"]
    barb["bore"] = f"{float(hose['inner_diameter'].split()[0]) * draw(st.floats(0.3, 0.95)):.3g} mm"
    next(p for p in parts if p.get("name") == "needle valve")["kv"] = draw(st.floats(0.01, 5))
    next(p for p in parts if p.get("name") == "down to the sink")["height"] = f"{draw(st.floats(-3, 3)):.3g} m"
    return data


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(circuits())
def test_any_circuit_solves_or_says_why(data):
    if (solved := solved_or_refused(data)) is None:
        return  # refused in one line, which is also an answer
    d, r = solved
    c, p = r.circuit, r.planning
    assert math.isclose(c.needed_pressure, d.supply.static_pressure, rel_tol=1e-6)
    assert all(math.isfinite(v) for _, v in c.points)
    if p.binding == "unreachable":
        assert math.isinf(p.V_dot_min)
        return
    at = solve_plate(d, p.V_dot_min)
    assert at.T_out <= d.supply.discharge_limit + 1e-4 and at.T_face_max <= d.supply.face_limit + 1e-4
    below = solve_plate(d, 0.98 * p.V_dot_min) if p.V_dot_min > 0 else None
    if below is not None:
        assert below.T_out > d.supply.discharge_limit or below.T_face_max > d.supply.face_limit
