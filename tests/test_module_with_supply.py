"""Thermoelectric modules fed through a supply circuit: the two couplings agree with each other.

Internal consistency checks (the module model and the circuit are each checked against outside references
in test_thermoelectric.py, test_module_solve.py, test_circuit.py and test_supply.py): at the answer, the
circuit uses exactly the tap pressure at the flow the modules were solved at, and the plate at that flow and
at the modules' heat has its hottest mounting face at the modules' hot face.
"""
from __future__ import annotations

import pytest

from coldplate.design.reader import design_from_dict
from .helpers import network_solve as solve  # the network model's numbers
from coldplate.plate.solve import solve_plate
from tests.helpers import example_dict


@pytest.fixture(scope="module")
def combined():
    te = example_dict("sample-stage-thermoelectric")
    tap = example_dict("tap-to-drain-circuit")
    data = dict(te, supply=dict(tap["supply"]), circuit=tap["circuit"],
                coolant={k: v for k, v in te["coolant"].items() if k != "flow"})
    design = design_from_dict(data)
    return design, solve(design)


def test_flow_is_the_circuits_operating_point_at_the_modules_heat(combined):
    design, r = combined
    assert r.circuit.drive == "pressure"
    assert r.V_dot == pytest.approx(r.circuit.V_dot, rel=1e-12)
    # the circuit needs exactly the static tap pressure at this flow (pressure balance, within 1 Pa)
    assert r.circuit.needed_pressure == pytest.approx(design.supply.static_pressure, abs=1.0)
    assert r.load == pytest.approx(r.module.Q_hot, rel=1e-12)


def test_hot_face_is_the_plate_at_that_flow_and_heat(combined):
    design, r = combined
    plate = solve_plate(design, flow=r.V_dot, load=r.module.Q_hot)
    assert plate.T_face_max == pytest.approx(r.module.T_hot, abs=1e-5)
    assert r.module.Q_hot - r.module.Q_cold == pytest.approx(r.module.power, rel=1e-9)  # first law


def test_planning_says_it_holds_the_modules_heat(combined):
    _, r = combined
    assert r.planning is not None and r.planning.V_dot_min < r.V_dot
    assert any(a.startswith("planning with modules") for a in r.assumptions)
