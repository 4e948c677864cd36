"""The advice a check gives: backflow protection, planning, the pressure and velocity budget, loss of flow,
narrow passages, a freezing room and results that are not a working design.

Each check names its source beside it: the US model plumbing codes' backflow-device tables (from memory),
continuity and lumped heating (definitions, computed in the test), Incropera Table A.1 (from memory), the
melting point of tin-lead eutectic solder (published), the ideal thermoelectric model (Ioffe), or common
practice where the trade has no single source.
"""
from __future__ import annotations

import copy
import json
import math

import pytest

from .helpers import network_solve as solve  # the network model's numbers
from coldplate.cli import main
from coldplate.design.reader import design_from_dict
from coldplate.findings.base import DEFER
from coldplate.plate.solve import solve_plate
from reports.jsonout import render_json

from .helpers import example_dict, modified, write

TAP = example_dict("tap-to-drain-circuit")
REAGENT = example_dict("reagent-block-channels")
STAGE = example_dict("sample-stage-thermoelectric")


def _solve(data):
    return solve(design_from_dict(copy.deepcopy(data)))


def _by_id(r):
    out = {}
    for f in r.findings:
        out.setdefault(f.id, f)
    return out


def _device(data, device):
    data = copy.deepcopy(data)
    part = next(p for p in data["circuit"]["part"] if p["kind"] == "backflow")
    part["device"] = device
    return data


# ---------------------------------------------------------------- 1. back pressure rules out both vacuum breakers

def test_back_pressure_rules_out_the_pressure_vacuum_breaker():
    # Source: US model plumbing codes' backflow-device tables (from memory): a pressure vacuum breaker (ASSE
    # 1020) guards against back-siphonage only, so an outlet held at a back pressure rules it out; a
    # reduced-pressure principle assembly, a double check (low hazard) or an air gap serve.
    data = modified(TAP, circuit__back_pressure="1.5 bar", circuit__air_gap=None)
    f = _by_id(_solve(data))
    bad = f["backflow-device-unsuitable"]
    assert bad.severity == "warning" and "back-pressure" in bad.message and "1.50 bar" in bad.message
    assert "reduced-pressure principle assembly" in bad.action and "double check" in bad.action
    assert "pressure vacuum breaker" not in bad.action and bad.action.endswith(DEFER)
    advice = f["cross-connection"].action
    assert "neither vacuum breaker" in advice and "pressure vacuum breaker" not in advice
    # without the back pressure the same circuit's pressure vacuum breaker fits (the valves after it are
    # continuous pressure, which only the atmospheric one may not take)
    assert "backflow-device-unsuitable" not in _by_id(_solve(TAP))


def test_a_pump_is_back_pressure_too():
    # Source: as above (from memory): a pump downstream can push water back against the supply.
    data = modified(_device(TAP, "double-check"), supply__drive="pump", supply__static_pressure="0.2 bar",
                    supply__pump_flow=["0 L/min", "4 L/min", "8 L/min"], supply__pump_head=["20 m", "16 m", "8 m"])
    assert "backflow-device-unsuitable" not in _by_id(_solve(data))  # a double check takes back-pressure
    f = _by_id(_solve(_device(data, "pressure-vacuum-breaker")))
    assert "pump" in f["backflow-device-unsuitable"].message


def test_continuous_pressure_rules_out_only_the_atmospheric_breaker():
    # Source: as above (from memory): an atmospheric vacuum breaker may not stay under pressure (a valve after
    # it); the pressure vacuum breaker may.
    f = _by_id(_solve(_device(TAP, "atmospheric-vacuum-breaker")))
    bad = f["backflow-device-unsuitable"]
    assert "continuous pressure" in bad.message and "pressure vacuum breaker" in bad.action


# ---------------------------------------------------------------- 2. hazard classes as the codes list them

GLYCOL_TAP = modified(TAP, coolant__fluid="propylene-glycol", coolant__fraction="30 %", coolant__basis="mass")


def test_vacuum_breakers_serve_a_high_hazard_and_the_double_check_does_not():
    # Source: US model plumbing codes' backflow-device tables (from memory): both vacuum breakers are listed
    # for a high or a low hazard (back-siphonage only); the double check for a low hazard only.
    assert "backflow-device-unsuitable" not in _by_id(_solve(GLYCOL_TAP))
    bad = _by_id(_solve(_device(GLYCOL_TAP, "double-check")))["backflow-device-unsuitable"]
    assert "high hazard" in bad.message and "low hazard only" in bad.message
    assert "reduced-pressure principle assembly" in bad.action and "double check" not in bad.action.split("(")[0]


def test_a_glycol_loop_needs_a_reduced_pressure_assembly_because_it_is_pressurised():
    # Source: as above (from memory): the loop holds its own pressure (back-pressure), which rules out both
    # vacuum breakers; the additive is a high hazard, which rules out the double check.
    f = _by_id(_solve(example_dict("detector-cavity-glycol")))["make-up-protection"]
    assert "back-pressure" in f.action and "both vacuum breakers" in f.action and "double check" in f.action
    assert f.action.endswith(DEFER)


# ---------------------------------------------------------------- 3. planning never advises an overheating flow

NO_FACE_LIMIT = modified(example_dict("laser-mount-tube"), supply__tariff="3 EUR/m**3")


def test_no_throttling_advised_without_a_face_limit():
    # Source: computed (solve_plate at the least flow, in the test); common practice: a flow is only advised
    # when the device's limit is known.
    r = _solve(NO_FACE_LIMIT)
    p = r.planning
    assert p.face_limit is None and p.face_limit_from == "none" and p.binding == "discharge"
    hot = solve_plate(r.design, p.V_dot_min).T_face_max
    assert hot == pytest.approx(p.T_face_at_min, abs=1e-6) and hot > 358.15  # well above any device's rating
    data = json.loads(render_json(r))  # the JSON says where the limit came from (a key added, none changed)
    assert data["planning"]["face_limit_from"] == "none" and data["planning"]["face_limit_C"] is None
    waste = _by_id(r)["water-waste"]
    assert "throttle" not in waste.action.lower() and "face_limit" in waste.action
    assert f"{hot - 273.15:.1f} degC" in waste.message


def test_text_summary_shows_the_face_at_the_advised_flow(tmp_path, capsys):
    # Source: computed (the planning result's face temperature at the least flow, in the text as in the report).
    for data in (NO_FACE_LIMIT, TAP):
        r = _solve(data)
        assert main(["check", str(write(tmp_path, data))]) == 0
        text = capsys.readouterr().out
        row = next(line for line in text.splitlines() if "mounting face at the least flow" in line)
        assert f"{r.planning.T_face_at_min - 273.15:.2f}" in row
        assert ("not a safe flow" in row) == (data is NO_FACE_LIMIT)


def test_the_modules_hot_side_limit_serves_as_the_face_limit():
    # Source: the modules' hot faces sit on the mounting face (coldplate's module model); common practice.
    data = modified(STAGE, supply__tariff="3 EUR/m**3", coolant__flow="4 L/min")
    r = _solve(data)
    p = r.planning
    assert p.face_limit_from == "module hot-side limit" and p.face_limit == pytest.approx(353.15)
    assert p.T_face_at_min <= p.face_limit + 1e-6 or p.binding == "discharge"


# ---------------------------------------------------------------- 4. pressure and velocity budget

def test_pinhole_port_gives_a_danger_with_the_port_velocity():
    # Source: continuity, V = Q / (pi d^2 / 4), computed in the test; plate rating: common practice table.
    data = modified(REAGENT, passage__port_diameter="0.3 mm")
    r = _solve(data)
    V_port = 1.5 / 6e4 / (math.pi * 0.0003**2 / 4)
    f = _by_id(r)
    assert f["plate-drop-above-rating"].severity == "danger"
    assert f"{V_port:,.0f} m/s" in f["velocity-high"].message and f["velocity-high"].severity == "warning"
    assert "supply-pressure-short" in f  # 4 bar static cannot push it
    assert "pressure-budget" in f


@pytest.mark.parametrize("name", ["reagent-block-channels", "laser-mount-tube", "detector-cavity-glycol",
                                  "tap-to-drain-circuit", "sample-stage-thermoelectric"])
def test_every_check_has_a_pressure_budget(name):
    # Source: definition (the shares are the plate's drop over the static pressure and over the rating).
    r = _solve(example_dict(name))
    note = _by_id(r)["pressure-budget"].message
    p = r.design.supply.static_pressure
    rating = r.design.plate.pressure_rating or {"channels": 6.9e5, "tube": 1.0e6, "cavity": 3.4e5}[
        r.design.passage.kind]  # common practice table of usual ratings
    assert f"{100 * r.dp / rating:.3g} %" in note
    if p:
        assert f"{100 * r.dp / p:.3g} %" in note


def test_erosion_limits_by_material():
    # Source: common practice: copper alloys erode above about 2.4 m/s cold water (8 ft/s), aluminium about
    # 2 m/s, stainless steels about 6 m/s.
    fast = modified(REAGENT, coolant__flow="20 L/min", passage__port_diameter="10 mm")
    r = _solve(fast)
    V_port = 20 / 6e4 / (math.pi * 0.01**2 / 4)  # 4.2 m/s
    assert 2.0 < V_port < 6.0
    assert "velocity-high" in _by_id(r)
    steel = modified(fast, plate__material="stainless-316")
    f = _by_id(_solve(steel))
    assert "velocity-high" not in f and "velocity-noise" in f  # below 6 m/s, above the 3 m/s noise level


# ---------------------------------------------------------------- 5. loss of flow

def test_loss_of_flow_interlock_from_the_plate_heat_capacity():
    # Source: lumped heating dT/dt = Q / (rho c V) (definition), with rho c of 6061 aluminium, 2700 kg/m^3 x
    # 896 J/(kg K) (ASM Handbook, from memory); device limit 85 degC (common practice).
    r = _solve(REAGENT)
    C = 0.080 * 0.060 * 0.003 * 2700 * 896
    t = C * (358.15 - r.T_face_max) / 85.0
    assert t < 60
    f = _by_id(r)["loss-of-flow"]
    assert f"{t:.0f} s" in f.message and "interlock" in f.action and f.action.endswith(DEFER)
    # a thick copper block with a small load keeps more than a minute: no finding
    heavy = modified(REAGENT, plate__material="copper", plate__base="20 mm", heat__load="5 W")
    assert "loss-of-flow" not in _by_id(_solve(heavy))


def test_loss_of_flow_for_a_plate_without_modules_and_with_its_face_limit():
    # Source: as above; copper rho c from Incropera Table A.1, 8933 x 385 (from memory).
    r = _solve(TAP)
    C = 0.100 * 0.060 * 0.003 * 8933 * 385
    t = C * (303.15 - r.T_face_max) / 120.0
    assert f"{t:.0f} s" in _by_id(r)["loss-of-flow"].message


# ---------------------------------------------------------------- 6. narrow passages on tap water

def test_narrow_channels_on_tap_water_get_strainer_advice():
    # Source: common practice: passages below about 1 mm clog on tap water's debris and scale.
    narrow = modified(REAGENT, passage__width="0.8 mm", passage__count=20)
    f = _by_id(_solve(narrow))["small-passages-tap-water"]
    assert "0.8 mm" in f.message and "strainer" in f.action and "flush" in f.action
    assert "small-passages-tap-water" not in _by_id(_solve(REAGENT))
    loop = modified(narrow, supply__source="recirculating")
    assert "small-passages-tap-water" not in _by_id(_solve(loop))


# ---------------------------------------------------------------- 7. freezing room

def test_a_room_below_freezing_warns_of_standing_water():
    # Source: water freezes at 0 degC at one atmosphere (published; IAPWS melting line), common practice.
    cold = modified(REAGENT, room__temperature="-5 degC", room__relative_humidity="50 %")
    f = _by_id(_solve(cold))["freezing-room"]
    assert f.severity == "warning" and "standing" in f.message and f.action.endswith(DEFER)
    assert "freezing-room" not in _by_id(_solve(REAGENT))


# ---------------------------------------------------------------- 8. results that are not a working design

def test_a_face_hotter_than_melting_solder_is_a_danger():
    # Source: tin-lead eutectic solder melts at 183 degC (published property of the alloy); the needed
    # resistance is (limit - inlet) / load (definition).
    hot = modified(REAGENT, interface__thickness="5 mm", interface__conductivity="0.2 W/(m*K)")
    r = _solve(hot)
    assert r.T_face_max > 473.15
    f = _by_id(r)["face-temperature-absurd"]
    assert f.severity == "danger"
    assert f"{(358.15 - r.T_in) / r.load:.3g} K/W" in f.action
    assert "face-temperature-absurd" not in _by_id(_solve(REAGENT))


def test_modules_past_their_capacity_are_a_danger():
    # Source: the ideal module model (Ioffe 1957): at most S^2 T_h^2 / (2 R) pumped per module with no
    # temperature difference; beyond it the cold face ends hotter than the hot face and the power goes negative.
    r = _solve(modified(STAGE, module__cold_load="300 W"))
    m = r.module
    assert m.T_cold > m.T_hot
    S, R, K = m.parameters
    q_max = S * S * m.T_hot**2 / (2 * R)
    f = _by_id(r)["module-overdriven"]
    assert f.severity == "danger" and f"at least {math.ceil(300 / q_max)} modules" in f.action
    assert "module-overdriven" not in _by_id(_solve(STAGE))


def test_target_note_only_when_the_target_is_reached(tmp_path, capsys):
    # Source: the solve's own result (the shortfall is set when the target is out of reach).
    out_of_reach = modified(STAGE, module__current=None, module__cold_face_temperature="10 degC",
                            module__cold_load="300 W")
    assert main(["check", str(write(tmp_path, out_of_reach))]) == 0
    text = capsys.readouterr().out
    assert "(set to reach the target cold face)" not in text and "out of reach" in text
    reachable = modified(STAGE, module__current=None, module__cold_face_temperature="0 degC")
    assert main(["check", str(write(tmp_path, reachable, "b.toml"))]) == 0
    assert "(set to reach the target cold face)" in capsys.readouterr().out


@pytest.mark.parametrize("change, key", [
    (dict(module__max_voltage="1e-12 V"), "[module] max_voltage"),
    (dict(module__max_temperature_difference="300 K"), "[module] max_temperature_difference"),
    (dict(module__max_temperature_difference="160 K"), "[module] max_temperature_difference"),
])
def test_datasheet_values_that_give_no_module_are_refused(tmp_path, capsys, change, key):
    # Source: one thermocouple of bismuth telluride has about 400 uV/K (two legs of about 200 uV/K; from
    # memory); bulk thermoelectric materials reach Z T about 1 (common practice): Luo's relations give
    # Z T_h = 2 dT_max T_h / (T_h - dT_max)^2, above 4 for dT_max above half of T_h.
    assert main(["check", str(write(tmp_path, modified(STAGE, **change)))]) == 2
    err = capsys.readouterr().err.strip()
    assert err.startswith(f"coldplate: error: {key}:") and "\n" not in err


def test_datasheet_values_of_real_modules_are_accepted():
    # Source: the example's datasheet (a scenario of our own, dT_max 70 K rated at 30 degC): Luo's relation
    # Z T_h = 2 dT_max T_h / (T_h - dT_max)^2 = 0.781, inside the Z T of bulk materials (about 1, common practice).
    T, dT = 303.15, 70.0
    assert 2 * dT * T / (T - dT) ** 2 == pytest.approx(0.781, abs=1e-3)
    assert _solve(modified(STAGE, module__max_temperature_difference="140 K")).module is not None
