"""The lines around the plate (hydraulics.circuit) and the pump (hydraulics.pump) against outside references.

Sources are named beside each check: a textbook worked example (from memory), Crane TP-410's friction-factor
table (from memory), fluids functions the code under test does not call (library), the IEC 60534 definition
of Kv, and a pump/system intersection solved by hand (quadratic formula) in the test.
"""
from __future__ import annotations

import math

import fluids.core
import fluids.fittings as ff
import fluids.friction
import numpy as np
import pytest

from hydraulics import circuit as hc
from hydraulics.pump import PumpError, PumpTable, check_table, intersect, pump_curve

# ---------------------------------------------------------------- the fitting table

#: What each of our fitting names must call: the fluids.fittings function names, in term order.
EXPECTED = {
    "elbow-90": ("ft_Crane",), "elbow-45": ("ft_Crane",), "tee-run": ("ft_Crane",),
    "tee-branch": ("K_branch_diverging_Crane",), "bend-90": ("bend_rounded_Crane",),
    "ball-valve": ("K_ball_valve_Crane",), "gate-valve": ("K_gate_valve_Crane",),
    "globe-valve": ("K_globe_valve_Crane",), "check-valve": ("K_swing_check_valve_Crane",),
    "contraction": ("contraction_sharp",), "expansion": ("diffuser_sharp",),
    "hose-barb": ("contraction_sharp", "diffuser_sharp"),
}


def test_every_fitting_name_calls_the_function_it_says():
    # Source: the project's rule (a name -> function table is checked by a test).
    assert set(hc.FITTINGS) == set(EXPECTED)
    for name, kind in hc.FITTINGS.items():
        assert tuple(t.function.__name__ for t in kind.terms) == EXPECTED[name], name
        for t in kind.terms:
            assert t.function is getattr(ff, t.function.__name__), name
        names = " ".join(EXPECTED[name])
        assert ("Crane" in kind.source) == ("Crane" in names), name  # the source names the method used


@pytest.mark.parametrize("name", sorted(hc.FITTINGS))
def test_fitting_K_is_the_fluids_value(name):
    # Source (library): the fluids.fittings function called directly with the table's arguments.
    D, bore = 0.0095, (0.006 if name != "expansion" else 0.013)
    kind = hc.FITTINGS[name]
    other = bore if kind.needs_other else None
    expected = 0.0
    for t in kind.terms:
        K = t.multiplier * t.function(**t.arguments(D, other))
        expected += K * (D / other) ** 4 if t.basis == "other" else K
    assert hc.K_fitting(name, D, other) == pytest.approx(expected, rel=1e-12)
    assert hc.K_fitting(name, D, other) > 0


@pytest.mark.parametrize("D, fT", [(0.0525, 0.019), (0.0158, 0.027), (0.0266, 0.023)])
def test_crane_elbow_and_tee_against_the_crane_friction_table(D, fT):
    # Source: Crane TP-410 (2009) p. A-27 fT table for clean commercial steel: 2 in 0.019, 1/2 in 0.027,
    # 1 in 0.023 (schedule 40 bores 52.5, 15.8, 26.6 mm); standard elbow 30 fT, 45° elbow 16 fT, tee run 20 fT
    # (p. A-29). All from memory. fluids computes fT from Colebrook at the pipe's roughness; the rounded table
    # sits up to about 6 % higher at the smallest size (0.0255 against 0.027 at 1/2 in).
    for name, n in (("elbow-90", 30), ("elbow-45", 16), ("tee-run", 20)):
        assert hc.K_fitting(name, D) == pytest.approx(n * fT, rel=0.07)


def test_unknown_fitting_and_missing_bore():
    with pytest.raises(KeyError, match="unknown fitting"):
        hc.K_fitting("elbow-91", 0.01)
    with pytest.raises(ValueError, match="bore"):
        hc.K_fitting("hose-barb", 0.01)


def test_hose_barb_against_borda_carnot():
    # Source: Borda-Carnot sudden expansion (1 - A1/A2)^2 on the small velocity (Idelchik), plus a sharp
    # contraction of about 0.5 (1 - A2/A1) for a large area ratio (common practice, from memory): the barb's K
    # on the bore velocity lies near their sum.
    D, b = 0.0095, 0.006
    K_bore = hc.K_fitting("hose-barb", D, b) * (b / D) ** 4
    ratio = (b / D) ** 2
    approx = (1 - ratio) ** 2 + 0.5 * (1 - ratio)
    assert K_bore == pytest.approx(approx, rel=0.25)


# ---------------------------------------------------------------- pipe run with fittings: a worked example

FT = 0.3048
LBF_PER_FT2 = 47.880259


def _cengel_circuit(fittings=()):
    # Çengel & Cimbala, Fluid Mechanics, example "head loss in a water pipe" (from memory): water at 60 °F
    # (62.36 lbm/ft³, 7.536e-4 lbm/(ft s)), 2-in stainless pipe (roughness 0.000007 ft), 0.2 ft³/s, 200 ft.
    D, L = 2 / 12 * FT, 200 * FT
    parts = (hc.Line("pipe", D, L, 0.000007 * FT),) + tuple(fittings) + (hc.PlateSlot(),)
    rho = 62.36 * 0.45359237 / FT**3
    mu = 7.536e-4 * 0.45359237 / FT
    return hc.Circuit(parts), hc.Fluid(rho, mu), 0.2 * FT**3, D


def test_darcy_weisbach_worked_example():
    # Source: Çengel & Cimbala (from memory): V = 9.17 ft/s, Re = 126,400, f = 0.0174, dp = 1700 lbf/ft²,
    # head loss 27.3 ft.
    c, fluid, Q, D = _cengel_circuit()
    losses, pressures, _ = hc.walk(c, Q * fluid.rho, fluid, fluid, 0.0, 0.0)
    dp = losses[0].dp
    assert losses[0].Re == pytest.approx(126_400, rel=0.005)
    assert dp == pytest.approx(1700 * LBF_PER_FT2, rel=0.01)
    # library: fluids.core.head_from_P (not called by the code) gives the head loss
    assert fluids.core.head_from_P(dp, fluid.rho) == pytest.approx(27.3 * FT, rel=0.01)
    # library: fluids.friction.friction_factor with Colebrook (the code uses Clamond through darcy_friction)
    V = Q / (math.pi * D**2 / 4)
    f = fluids.friction.friction_factor(Re=losses[0].Re, eD=0.000007 / (2 / 12), Method="Colebrook")
    assert dp == pytest.approx(f * (200 / (2 / 12)) * 0.5 * fluid.rho * V**2, rel=1e-6)
    assert -pressures[-1] == pytest.approx(dp, rel=1e-12)  # the plate slot adds nothing here


def test_pipe_with_fittings_adds_crane_losses():
    # Source: the worked example above plus two standard elbows (30 fT) and an open gate valve (8 fT) with the
    # Crane TP-410 2-in fT = 0.019 (from memory), summed by hand: dp = dp_pipe + sum(K) rho V²/2.
    D = 2 / 12 * FT
    fittings = (hc.Fitting("elbows", "elbow-90", D, count=2), hc.Fitting("gate", "gate-valve", D))
    c, fluid, Q, _ = _cengel_circuit(fittings)
    V = Q / (math.pi * D**2 / 4)
    need = hc.required_pressure(c, Q * fluid.rho, fluid, fluid, 0.0)
    by_hand = 1700 * LBF_PER_FT2 + (2 * 30 + 8) * 0.019 * 0.5 * fluid.rho * V**2
    assert need == pytest.approx(by_hand, rel=0.015)


# ---------------------------------------------------------------- valves, devices, lifts, outlet

def test_kv_valve_against_fluids_conversion():
    # Source: IEC 60534-1 definition (Q in m³/h through Kv at 1 bar, water); library: fluids.fittings.Kv_to_K
    # (not called by the code) turns Kv into K on the line velocity; fluids' water density differs from
    # 1000 kg/m³ by about 0.1 %.
    D, Kv, Q = 0.01, 0.5, 2e-4
    V = Q / (math.pi * D**2 / 4)
    assert hc.dp_valve_Kv(Q, Kv, 1000.0) == pytest.approx(ff.Kv_to_K(Kv, D) * 1000 * V**2 / 2, rel=2e-3)
    assert hc.dp_valve_Kv(Kv / 3600, Kv, 1000.0) == pytest.approx(1e5, rel=1e-12)  # definition: 1 bar at Q = Kv
    # Cv = 1.156 Kv (IEC 60534-1); library: fluids.fittings.Kv_to_Cv
    assert hc.Kv_from_Cv(ff.Kv_to_Cv(0.8)) == pytest.approx(0.8, rel=1e-3)


def test_backflow_lift_exit_and_static_head():
    # Source: definitions in the module (device loss model), hydrostatics rho g dz, exit loss K = 1
    # (Borda-Carnot into a large volume).
    bf = hc.Backflow("bf", "pressure-vacuum-breaker", dp_rated=5e4, flow_rated=5e-4, dp_open=7e3)
    assert hc.dp_backflow(0.0, bf) == 0.0
    assert hc.dp_backflow(5e-4, bf) == pytest.approx(5e4)
    assert hc.dp_backflow(2.5e-4, bf) == pytest.approx(7e3 + 43e3 / 4)
    fluid = hc.Fluid(998.0, 1e-3)
    c = hc.Circuit((bf, hc.Rise("up", 1.5), hc.PlateSlot(), hc.Rise("down", -0.5)), back_pressure=2e4,
                   outlet_diameter=0.01)
    assert hc.static_head(c, fluid, fluid) == pytest.approx(2e4 + 7e3 + 998 * hc.G * 1.0)
    Q = 1e-4
    V = Q / (math.pi * 0.01**2 / 4)
    need = hc.required_pressure(c, Q * 998, fluid, fluid, 1234.0)
    assert need == pytest.approx(2e4 + hc.dp_backflow(Q, bf) + 998 * hc.G * 1.0 + 1234.0 + 0.5 * 998 * V**2)
    assert c.heights() == (0.0, 1.5, 1.5, 1.0)
    assert c.can_hold_pressure()  # the back pressure


def test_can_hold_pressure_sees_valves_downstream():
    # Source: common practice (an atmospheric vacuum breaker must have no shut-off valve after it).
    parts = (hc.Backflow("avb", "atmospheric-vacuum-breaker", 1e4, 3e-4), hc.Line("hose", 0.01, 1.0, 1e-5),
             hc.PlateSlot(), hc.Line("drain", 0.01, 1.0, 1e-5))
    assert not hc.Circuit(parts).can_hold_pressure(0)
    with_valve = parts[:2] + (hc.Fitting("shut-off", "ball-valve", 0.01),) + parts[2:]
    assert hc.Circuit(with_valve).can_hold_pressure(0)
    before = (hc.Valve("needle", 0.3),) + parts
    assert not hc.Circuit(before).can_hold_pressure(1)  # a valve upstream of the device does not count


def test_joukowsky_surge():
    # Source: Joukowsky (1898): dp = rho a V for instant closure.
    assert hc.surge_Joukowsky(1000.0, 1.0, 1400.0) == pytest.approx(1.4e6)


# ---------------------------------------------------------------- the pump

def test_pump_fit_passes_through_points_and_stays_monotone():
    # Source: PCHIP's defining properties (Fritsch & Carlson 1980): interpolates and keeps monotone data monotone.
    t = check_table([0, 1e-4, 2e-4, 3e-4], [4e5, 3.6e5, 2.2e5, 0.5e5])
    fit = pump_curve(t)
    for q, p in zip(t.V_dot, t.dp):
        assert fit(q) == pytest.approx(p, rel=1e-12)
    qs = np.linspace(0, 3e-4, 301)
    assert np.all(np.diff([fit(q) for q in qs]) < 0)


def test_pump_system_intersection_hand_solved():
    # Source: solved by hand. Pump falling linearly, 3 bar at shut-off to 0 at 1.5e-4 m³/s (PCHIP of
    # collinear points is that line); system 0.5 bar static plus 1e13 Q². Setting them equal gives
    # 1e13 Q² + 2e9 Q - 2.5e5 = 0, Q = (-2e9 + sqrt(4e18 + 1e19)) / 2e13 = 8.7083e-5 m³/s.
    t = PumpTable((0.0, 5e-5, 1e-4, 1.5e-4), (3e5, 2e5, 1e5, 0.0))
    Q = intersect(t, lambda q: 5e4 + 1e13 * q**2)
    assert Q == pytest.approx((-2e9 + math.sqrt(4e18 + 1e19)) / 2e13, rel=1e-9)
    assert Q == pytest.approx(8.7083e-5, rel=1e-4)
    # suction pressure adds to the pump's rise: 1 bar at the suction shifts the crossing
    Q2 = intersect(t, lambda q: 5e4 + 1e13 * q**2, suction=1e5)
    assert 1e13 * Q2**2 + 2e9 * Q2 - 3.5e5 == pytest.approx(0.0, abs=1e-3)


def test_pump_refusals():
    t = PumpTable((0.0, 5e-5, 1e-4), (3e5, 2e5, 1e5))
    with pytest.raises(PumpError, match="never reaches"):
        intersect(t, lambda q: 4e5 + q)
    with pytest.raises(PumpError, match="ends at"):
        intersect(t, lambda q: 1e3 + q)
    for flows, rises, msg in (([0, 1e-4], [2e5, 1e5], "three"), ([0, 1e-4, 1e-4], [3e5, 2e5, 1e5], "rise"),
                              ([0, 1e-4, 2e-4], [3e5, 3.2e5, 1e5], "fall"), ([0, 1e-4, 2e-4], [3e5, 1e5, -1], "negative")):
        with pytest.raises(PumpError, match=msg):
            check_table(flows, rises)
