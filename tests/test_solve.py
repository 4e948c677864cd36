"""The design check end to end, against outside references.

Sources named beside each check.
"""
from __future__ import annotations

import json
import math

import iapws
import psychrolib
import pytest

from .helpers import network_check_file as check_file
from coldplate.cli import main
from coldplate.design.reader import design_from_dict
from .helpers import network_solve as solve  # the network model's numbers

from .helpers import EXAMPLES, example_dict, modified

REQUIRED_JSON_KEYS = {
    "thermal_resistance_K_per_W", "resistances_K_per_W", "surface_temperature_max_C", "outlet_temperature_C",
    "pressure_drop_Pa", "velocity_m_per_s", "reynolds", "regime", "heat_transfer_coefficient_W_per_m2K",
    "flow_m3_per_s", "water_use_L_per_day", "dew_point_C", "findings",
}


@pytest.fixture(scope="module")
def results():
    return {p.stem: check_file(p) for p in EXAMPLES}


def test_examples_cover_every_passage_kind(results):
    assert {r.design.passage.kind for r in results.values()} == {"channels", "tube", "cavity"}


@pytest.mark.parametrize("path", EXAMPLES, ids=[p.stem for p in EXAMPLES])
def test_json_output_has_the_contracted_keys(path, capsys):
    assert main(["check", str(path), "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert REQUIRED_JSON_KEYS <= set(data)
    for f in data["findings"]:
        assert set(f) == {"id", "severity", "message", "action"}
    assert math.isclose(sum(data["resistances_K_per_W"].values()), data["thermal_resistance_K_per_W"], rel_tol=1e-9)


def test_text_output_runs(capsys):
    assert main(["check", str(EXAMPLES[0])]) == 0
    out = capsys.readouterr().out
    assert "thermal resistance" in out and "Findings" in out


def test_breakdown_adds_up_and_defines_R(results):
    # Definition (issue contract): R = (hottest mounting-face T - inlet T) / load, parts add up to R.
    for r in results.values():
        assert math.isclose(sum(v for _, v in r.resistances), r.R_th, rel_tol=1e-12)
        assert math.isclose(r.T_in + r.R_th * r.load, r.T_face_max, rel_tol=1e-12)
        assert r.T_face_max > r.T_plate_max > r.T_in


def test_energy_balance_against_iapws97(results):
    # Source: IAPWS-IF97 enthalpy from the independent `iapws` package (not CoolProp):
    # m_dot * (h(T_out) - h(T_in)) must equal the load.
    for r in results.values():
        if not r.design.coolant.is_water:
            continue
        P = r.line_pressure / 1e6
        h_in = iapws.IAPWS97(T=r.T_in, P=P).h * 1e3
        h_out = iapws.IAPWS97(T=r.T_out, P=P).h * 1e3
        assert r.m_dot * (h_out - h_in) == pytest.approx(r.load, rel=2e-4)


def test_water_use_arithmetic(results):
    # Source: definition; litres a day = m^3/s * 1000 L/m^3 * 3600 s/h * hours a day, once-through only.
    for r in results.values():
        d = r.design
        if not d.supply.once_through:
            assert r.water_use_L_per_day == 0.0
            continue
        assert r.water_use_L_per_day == pytest.approx(r.V_dot * 1000 * 3600 * d.supply.hours_per_day, rel=1e-12)
        assert r.water_use_m3_per_year == pytest.approx(r.water_use_L_per_day * d.supply.days_per_year / 1000, rel=1e-12)


def test_room_dew_point_against_psychrolib(results):
    # Source: psychrolib (ASHRAE Handbook Fundamentals formulation), independent of our implementation.
    psychrolib.SetUnitSystem(psychrolib.SI)
    for r in results.values():
        room = r.design.room
        ref = psychrolib.GetTDewPointFromRelHum(room.temperature - 273.15, room.relative_humidity)
        assert r.T_dew - 273.15 == pytest.approx(ref, abs=0.05)


def test_water_properties_against_iapws95(results):
    # Source: IAPWS-95 via the independent `iapws` package; IF97 agrees within about 0.05 % (IAPWS R7-97).
    r = results["reagent-block-channels"]
    ref = iapws.IAPWS95(T=r.props.T, P=r.props.p / 1e6)
    assert r.props.rho == pytest.approx(ref.rho, rel=5e-4)
    assert r.props.cp == pytest.approx(ref.cp * 1e3, rel=1e-3)
    assert r.props.mu == pytest.approx(ref.mu, rel=5e-3)
    assert r.props.k == pytest.approx(ref.k, rel=5e-3)


def test_potable_supply_raises_cross_connection_and_defers_to_codes(results):
    r = results["reagent-block-channels"]
    ids = [f.id for f in r.findings]
    assert "cross-connection" in ids and "drain-air-gap" in ids and "once-through-restriction" in ids
    assert len(ids) == len(set(ids)), "each finding once"
    cc = next(f for f in r.findings if f.id == "cross-connection")
    # Common practice (ASSE 1001 / 1020): 8 h a day under pressure is short enough for an AVB.
    assert "atmospheric vacuum breaker" in cc.action and "codes" in cc.action
    assert "Never return cooling water" in cc.action


def test_continuous_pressure_rules_out_the_atmospheric_vacuum_breaker():
    # Common practice (codes often limit an AVB to 12 h of continuous pressure; ASSE 1020 PVB may stay pressurised).
    d = design_from_dict(modified(example_dict(), supply__hours_per_day=24))
    cc = next(f for f in solve(d).findings if f.id == "cross-connection")
    assert "pressure vacuum breaker" in cc.action


def test_additive_on_potable_supply_is_high_hazard():
    # Common practice: glycol makes the cross-connection a high hazard (RP assembly or air gap).
    d = design_from_dict(modified(example_dict(), coolant__fluid="ethylene-glycol", coolant__fraction="25 %",
                                  coolant__basis="volume"))
    cc = next(f for f in solve(d).findings if f.id == "cross-connection")
    assert "high hazard" in cc.message and "reduced-pressure" in cc.action


def test_cold_inlet_in_humid_room_sweats():
    # Source for the dew point: psychrolib, 30 degC / 70 % RH -> 23.9 degC; an 8 degC inlet is far below it.
    d = design_from_dict(modified(example_dict(), coolant__inlet_temperature="8 degC",
                                  room__temperature="30 degC", room__relative_humidity="70 %"))
    f = {x.id: x for x in solve(d).findings}
    assert f["condensation"].severity == "warning"


def test_hot_discharge_flagged():
    # Common practice / common code limit: 60 degC at the drain.
    d = design_from_dict(modified(example_dict(), coolant__flow="0.02 L/min"))
    r = solve(d)
    assert r.T_out > 333.15
    assert "discharge-temperature" in [f.id for f in r.findings]


def test_findings_sorted_by_severity(results):
    from coldplate.findings.base import SEVERITIES
    for r in results.values():
        ranks = [SEVERITIES.index(f.severity) for f in r.findings]
        assert ranks == sorted(ranks)


def test_once_through_plate_boils_at_atmospheric_pressure(results):
    # A plate running to an open drain sits near one atmosphere while flowing, whatever the static supply
    # pressure. Source: IAPWS-IF97 saturation temperature at 101.325 kPa from the independent `iapws` package.
    r = results["reagent-block-channels"]
    assert r.design.supply.static_pressure == pytest.approx(4e5)
    assert r.T_boil == pytest.approx(iapws.iapws97._TSat_P(0.101325), abs=0.01)


def test_closed_loop_uses_no_water_and_has_no_drain_findings(results):
    r = results["detector-cavity-glycol"]
    assert not r.design.supply.once_through
    assert r.water_use_L_per_day == 0.0
    ids = {f.id for f in r.findings}
    assert not ids & {"discharge-temperature", "drain-air-gap", "once-through-restriction", "cross-connection"}


def test_tube_strips_by_hand():
    # Source: 1-D conduction with a uniform source (Fourier's law): a strip draining over a length l has its
    # peak rise q'' l^2 / (2 k t) at its adiabatic line; the strip with the longest l is taken (cautious): here
    # the plate beside the outer passes (5.8 mm to one side) rather than the gaps (4.8 mm to each side).
    from coldplate.plate.passages import tube
    d = design_from_dict(example_dict("laser-mount-tube"))
    p, pl = d.passage, d.plate
    gap = 2 * p.bend_radius - p.outer_diameter
    edge = (pl.width - (p.passes - 1) * 2 * p.bend_radius - p.outer_diameter) / 2
    assert edge > gap / 2
    expected = edge**2 / (2 * pl.conductivity * pl.base) / (pl.length * pl.width)
    back = tube.back_side(p, pl, tube.geometry(p, pl), h=3000.0)
    assert dict(back.parts)["plate between passes"] == pytest.approx(expected, rel=1e-12)
