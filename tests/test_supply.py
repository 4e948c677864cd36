"""The supply side end to end: operating point from tap pressure or a pump, least flow, water and money.

Sources are named beside each check: definitions (mass and pressure balances, the annual arithmetic), iapws
(library: an enthalpy balance the code under test does not compute with iapws), hand-solved cases, and
round trips through a different path of the code (a fixed-flow solve at the flow the pressure solve found).
"""
from __future__ import annotations

import copy
import json
import math

import pytest
from iapws import IAPWS97

from coldplate.cli import main
from coldplate.design.reader import design_from_dict
from coldplate.supply.operating import PlateAt
from .helpers import network_solve as solve  # the network model's numbers
from coldplate.plate.solve import solve_plate
from hydraulics.circuit import G

from .helpers import example_dict, write

TAP = example_dict("tap-to-drain-circuit")


def _design(data=TAP):
    return design_from_dict(copy.deepcopy(data))


@pytest.fixture(scope="module")
def tap():
    return solve(_design())


def _with(**supply):
    data = copy.deepcopy(TAP)
    for k, v in supply.items():
        if v is None:
            data["supply"].pop(k, None)
        else:
            data["supply"][k] = v
    return data


def test_example_from_tap_to_drain(tap):
    # The bundled example: flow from tap pressure, least flow, water and money per year all present.
    c, p = tap.circuit, tap.planning
    assert c.drive == "pressure" and c.supply_pressure == pytest.approx(3.5e5)
    assert tap.V_dot == c.V_dot > 0
    assert 0 < p.V_dot_min < c.V_dot and p.binding == "mounting face"
    assert p.cost_per_year > p.cost_per_year_min > 0 and p.currency == "EUR"
    assert {f.id for f in tap.findings} >= {"water-waste", "cross-connection", "drain-air-gap"}


def test_pressure_balance_along_the_circuit(tap):
    # Source: definition: the supply pressure less every part's loss (lifts as rho g dz) and the exit loss
    # leaves exactly the outlet's back pressure (0 for a free discharge) at the operating flow.
    c = tap.circuit
    names = [n for n, _ in c.points]
    assert names[0] == "supply" and names[-1] == "outlet"
    assert c.points[-1][1] == pytest.approx(0.0, abs=1e-3)
    assert c.needed_pressure == pytest.approx(3.5e5, rel=1e-8)
    # the plate's own drop is the drop across its slot
    i = names.index("plate")
    assert c.points[i - 1][1] - c.points[i][1] == pytest.approx(tap.dp, rel=1e-9)
    assert c.plate_inlet_pressure == pytest.approx(c.points[i - 1][1])
    # a lift of -0.4 m raises the pressure by rho g 0.4 (hydrostatics)
    j = names.index("down to the bench")
    rho = _design().coolant.props(tap.T_in).rho
    assert c.points[j][1] - c.points[j - 1][1] == pytest.approx(rho * G * 0.4, rel=1e-3)


def test_mass_conservation(tap):
    # Source: definition (steady flow in series): the mass flow through the lines equals the plate's, which is
    # the inlet volumetric flow times the inlet density; the water drained per day is that flow for the hours.
    d = _design()
    rho_in = d.coolant.props(d.inlet_temperature, d.supply.line_pressure).rho
    assert tap.circuit.m_dot == pytest.approx(tap.m_dot, rel=1e-12)
    assert tap.m_dot == pytest.approx(rho_in * tap.V_dot, rel=1e-12)
    assert tap.planning.water_L_per_day == pytest.approx(tap.V_dot * 1000 * 3600 * 10, rel=1e-12)
    # the energy the water carries away is the load: m (h_out - h_in) with iapws (library) enthalpies
    h_in = IAPWS97(T=tap.T_in, P=0.101325).h * 1e3
    h_out = IAPWS97(T=tap.T_out, P=0.101325).h * 1e3
    assert tap.m_dot * (h_out - h_in) == pytest.approx(tap.load, rel=2e-3)


def test_fixed_flow_round_trip(tap):
    # Source: a different path through the code: the fixed-flow drive at the flow the pressure solve found
    # must need exactly the tap's static pressure.
    data = _with(drive="flow")
    data["coolant"]["flow"] = f"{tap.V_dot} m**3/s"
    r = solve(design_from_dict(data))
    assert r.circuit.supply_pressure is None
    assert r.circuit.needed_pressure == pytest.approx(3.5e5, rel=1e-6)
    assert "supply-pressure-short" not in {f.id for f in r.findings}
    data["coolant"]["flow"] = f"{tap.V_dot * 1.3} m**3/s"
    r = solve(design_from_dict(data))
    assert "supply-pressure-short" in {f.id for f in r.findings}


def test_least_flow_checked_at_the_answer(tap):
    # Source: the least flow's definition, checked by solving the design at the answer (solve_plate):
    # the binding limit is met exactly there and broken just below it.
    d, p = _design(), tap.planning
    at = solve_plate(d, p.V_dot_min)
    assert at.T_face_max == pytest.approx(d.supply.face_limit, abs=1e-4)
    below = solve_plate(d, p.V_dot_min * 0.99)
    assert below.T_face_max > d.supply.face_limit
    assert at.T_out <= d.supply.discharge_limit


def test_least_flow_by_the_drain_limit_against_an_enthalpy_balance():
    # Source: library (iapws IF97 enthalpies): with no mounting-face limit the discharge limit binds, and the
    # least flow is load / (h(T_limit) - h(T_in)) / rho_in.
    data = _with(face_limit=None, discharge_limit="25 degC")
    r = solve(design_from_dict(data))
    p = r.planning
    assert p.binding == "discharge"
    T_in, T_lim = 16 + 273.15, 25 + 273.15
    w_in, w_lim = IAPWS97(T=T_in, P=0.101325), IAPWS97(T=T_lim, P=0.101325)
    m_dot = 120.0 / ((w_lim.h - w_in.h) * 1e3)
    assert p.V_dot_min == pytest.approx(m_dot / w_in.rho, rel=2e-3)
    assert p.T_out_at_min == pytest.approx(T_lim, abs=1e-4)


def test_annual_arithmetic_and_breakeven(tap):
    # Source: definitions: m³/year = flow × 3600 × hours × days; cost = m³ × tariff; chiller electricity =
    # power × hours × days × tariff (0.9 kW × 10 h × 250 d × 0.28 EUR/kWh = 630 EUR by hand).
    p, b = tap.planning, tap.planning.breakeven
    m3 = tap.V_dot * 3600 * 10 * 250
    assert p.water_m3_per_year == pytest.approx(m3, rel=1e-12)
    assert p.cost_per_year == pytest.approx(m3 * 4.10, rel=1e-12)
    assert p.cost_per_year_min == pytest.approx(p.V_dot_min * 3600 * 10 * 250 * 4.10, rel=1e-12)
    assert b.electricity_cost_per_year == pytest.approx(630.0, rel=1e-12)
    assert b.breakeven_flow * 3600 * 10 * 250 * 4.10 == pytest.approx(630.0, rel=1e-12)
    assert b.payback_years == pytest.approx(2400 / (p.cost_per_year - 630.0), rel=1e-12)


def test_curves(tap):
    c, u = tap.circuit.curve, tap.planning.use_curve
    assert len(c.V_dot) == len(c.dp_circuit) == len(c.dp_plate) >= 10
    assert all(b > a for a, b in zip(c.dp_circuit, c.dp_circuit[1:]))  # a system curve rises with flow
    assert all(b >= a for a, b in zip(c.dp_plate, c.dp_plate[1:]))
    assert len(u.V_dot) == len(u.T_face) == len(u.m3_per_year) >= 10
    assert all(b < a for a, b in zip(u.T_face, u.T_face[1:]))  # more water, cooler face
    assert min(u.V_dot) <= tap.planning.V_dot_min and max(u.V_dot) >= tap.V_dot


def test_pump_drive_meets_the_system_curve():
    # Source: definition of the operating point: the pump's rise at the answer equals what the circuit needs.
    data = _with(drive="pump", static_pressure=None, pump_flow=["0 L/min", "2 L/min", "4 L/min", "6 L/min"],
                 pump_head=["20 m", "18 m", "13 m", "5 m"])
    r = solve(design_from_dict(data))
    c = r.circuit
    assert c.drive == "pump" and c.pump is not None
    assert c.supply_pressure == pytest.approx(c.needed_pressure, rel=1e-7)
    assert 0 < c.V_dot < 6 / 6e4
    # this pump and circuit cross between the tabulated 2 and 4 L/min, so the rise lies between those heads
    # times rho g (a monotone fit between its points)
    rho = _design().coolant.props(r.T_in).rho
    assert 2 / 6e4 < c.V_dot < 4 / 6e4
    assert 13 * rho * G < c.supply_pressure < 18 * rho * G


def test_json_keys(tmp_path, capsys):
    path = write(tmp_path, TAP)
    assert main(["check", str(path), "--format", "json"]) == 0
    out = json.loads(capsys.readouterr().out)
    for key in ("operating_flow_m3_per_s", "supply_pressure_used_Pa", "minimum_flow_m3_per_s", "water_cost_per_year"):
        assert isinstance(out[key], float) and math.isfinite(out[key]), key
    assert len(out["circuit"]["system_curve"]["flow_m3_per_s"]) == len(out["circuit"]["system_curve"]["circuit_Pa"])
    assert out["planning"]["currency"] == "EUR"


def test_text_report_has_the_supply_sections(tmp_path, capsys):
    assert main(["check", str(write(tmp_path, TAP))]) == 0
    text = capsys.readouterr().out
    assert "Supply circuit" in text and "Water planning" in text and "least flow" in text


def _part(data, name):
    return next(p for p in data["circuit"]["part"] if p.get("name") == name)


def _ids(data):
    return {f.id for f in solve(design_from_dict(data)).findings}


def test_backflow_findings_read_the_circuit():
    # Source: common practice / US model codes (from memory): an atmospheric vacuum breaker must have no valve
    # after it and sit above the highest point downstream (6 in); a pressure vacuum breaker 12 in.
    data = copy.deepcopy(TAP)
    _part(data, "pressure vacuum breaker")["device"] = "atmospheric-vacuum-breaker"
    ids = _ids(data)
    assert "backflow-device-unsuitable" in ids  # the needle and ball valves are downstream
    data = copy.deepcopy(TAP)
    _part(data, "down to the bench")["height"] = "0.2 m"  # the bench is now above the breaker
    assert "backflow-device-height" in _ids(data)
    assert "backflow-device-height" not in _ids(TAP)


def test_air_gap_and_water_hammer_findings():
    # Source: air gap at least twice the outlet's diameter and 25 mm (ASME A112.1.2); Joukowsky surge.
    data = copy.deepcopy(TAP)
    data["circuit"]["air_gap"] = "15 mm"
    _part(data, "needle valve")["solenoid"] = True
    r = solve(design_from_dict(data))
    ids = {f.id for f in r.findings}
    assert "drain-air-gap-short" in ids and "water-hammer" in ids
    (name, dp), = r.circuit.surges
    V = r.V_dot / (math.pi * 0.0095**2 / 4)
    assert dp == pytest.approx(r.circuit.m_dot / r.V_dot * 1400 * V, rel=1e-9)


def test_plate_inlet_pressure_above_rating():
    data = copy.deepcopy(TAP)
    data["plate"]["pressure_rating"] = "0.5 bar"
    parts = data["circuit"]["part"]
    valve = parts.pop(next(i for i, p in enumerate(parts) if p.get("name") == "needle valve"))
    parts.append(valve)  # throttling after the plate puts the tap pressure on it
    assert "plate-inlet-pressure" in _ids(data)


def test_existing_examples_unchanged():
    # The plain design check does no supply stage: no circuit, no planning.
    for name in ("reagent-block-channels", "laser-mount-tube", "detector-cavity-glycol"):
        r = solve(design_from_dict(example_dict(name)))
        assert r.circuit is None and r.planning is None


def test_planning_without_a_circuit_and_unreachable_limits():
    # A once-through design with a fixed flow and planning keys gets planning without a circuit; a face limit
    # one kelvin above the inlet cannot be met by any flow (the interface alone needs more).
    base = example_dict("reagent-block-channels")
    base["supply"].update(face_limit="40 degC", tariff="2.5 EUR/m**3")
    r = solve(design_from_dict(copy.deepcopy(base)))
    assert r.circuit is None and r.planning is not None and r.planning.binding == "mounting face"
    assert r.planning.cost_per_year == pytest.approx(r.V_dot * 3600 * 8 * 365 * 2.5, rel=1e-12)
    base["supply"]["face_limit"] = "16 degC"
    r = solve(design_from_dict(base))
    assert r.planning.binding == "unreachable" and math.isinf(r.planning.V_dot_min)
    assert "limits-unreachable" in {f.id for f in r.findings}


@pytest.mark.parametrize("bar", [1.0, 2.0, 5.0])
def test_operating_flow_rises_with_tap_pressure_and_uses_all_of_it(bar):
    # Source: definition (the circuit uses exactly the static pressure) and monotonicity of a system curve.
    r = solve(design_from_dict(_with(static_pressure=f"{bar} bar")))
    assert r.circuit.needed_pressure == pytest.approx(bar * 1e5, rel=1e-7)
    need = PlateAt(_design(_with(static_pressure=f"{bar} bar"))).need
    assert need(0.95 * r.V_dot) < bar * 1e5 < need(1.05 * r.V_dot)
    if bar > 1.0:
        weaker = solve(design_from_dict(_with(static_pressure=f"{bar / 2} bar")))
        assert weaker.V_dot < r.V_dot


def test_backflow_device_size_finding():
    data = copy.deepcopy(TAP)
    _part(data, "pressure vacuum breaker")["rated_flow"] = "1 L/min"
    _part(data, "pressure vacuum breaker")["loss"] = "0.1 bar"
    assert "backflow-device-size" in _ids(data)
    assert "backflow-device-size" not in _ids(TAP)


def test_pump_shut_off_above_the_plate_rating():
    # Source: common practice: a pump's shut-off head reaches the plate when a valve after it closes.
    data = _with(drive="pump", static_pressure=None, pump_flow=["0 L/min", "2 L/min", "4 L/min", "6 L/min"],
                 pump_head=["20 m", "18 m", "13 m", "5 m"])
    data["plate"]["pressure_rating"] = "1.5 bar"  # below 20 m of water (1.96 bar)
    assert "pump-above-rating" in _ids(data)
    data["plate"]["pressure_rating"] = "3 bar"
    assert "pump-above-rating" not in _ids(data)
