"""The many-candidate evaluator (coldplate.sizing.evaluate).

1. Internal consistency check: the vectorised evaluator against the one-design path
   (coldplate.plate.solve.solve_plate) candidate by candidate, within 0.1 % on R_th and dp, over random samples that
   span laminar, transitional and turbulent flow.  Both paths call the same correlation functions; this check
   guards the parts that differ (tabulated properties, tabulated spreading, array plumbing).
2. The tabulated spreading and march against the series itself (computed).
3. An outside reference: a plate whose footprint covers it (no spreading, a 1-D problem) in turbulent flow,
   against Gnielinski's VDI Heat Atlas form written out in the test with fluids.friction.Colebrook's
   friction factor, and IAPWS-95 water from the
   iapws package (library: none of these functions is called by the code under test) and the plane-wall and
   straight-fin formulas (published: Incropera et al. 2007, secs. 3.1 and 3.6).
"""
from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from fluids.friction import Colebrook
from iapws import IAPWS95

from coldplate.design.reader import design_from_dict
from coldplate.plate.solve import solve_plate
from coldplate.sizing.evaluate import Evaluator, split_nodes
from coldplate.sizing.platetable import PlateTable

from .helpers import example_dict, modified

CHANNELS = design_from_dict(example_dict("reagent-block-channels"))
TUBE = design_from_dict(example_dict("laser-mount-tube"))
TOLERANCE = 1e-3  # 0.1 %, the agreement the sizing issue asks for


def _channel_sample(rng, G=10, Nt=3, Nq=8):
    W = CHANNELS.plate.width
    count = rng.integers(2, 25, G)
    width = np.array([rng.uniform(0.4e-3, 0.8 * W / n) for n in count])
    depth = rng.uniform(0.8e-3, 9e-3, G)
    base = rng.uniform(1e-3, 7e-3, Nt)
    flow = np.sort(10 ** rng.uniform(math.log10(0.05 / 6e4), math.log10(8 / 6e4), Nq))
    return count, width, depth, base, flow


VARIANTS = {
    "example": CHANNELS,
    # no ports, smooth walls, the other correlation choices
    "smooth, fully developed, Dittus-Boelter": design_from_dict(modified(
        example_dict("reagent-block-channels"), passage__port_diameter=None, passage__roughness="0 mm",
        correlations={"laminar": "fully-developed", "turbulent": "dittus-boelter"})),
    # glycol on a pressurised loop (another property backend and line pressure), Hausen
    "glycol loop, Hausen": design_from_dict(modified(
        example_dict("reagent-block-channels"), coolant__fluid="ethylene-glycol", coolant__fraction="40 %",
        coolant__basis="volume", coolant__inlet_temperature="5 degC", supply__source="recirculating",
        supply__static_pressure="2 bar", supply__discharge_limit=None, correlations={"laminar": "hausen"})),
}


@pytest.mark.parametrize("name", VARIANTS)
def test_vectorised_channels_agree_with_solve_plate_internal_consistency(name):
    base_design = VARIANTS[name]
    rng = np.random.default_rng(20261201)
    ev = Evaluator(base_design)
    regimes, checked = set(), 0
    for _ in range(3):
        count, width, depth, base, flow = _channel_sample(rng)
        e = ev.channels(count, width, depth, base, flow)
        # at the flow split's nodes (between them the split is cautious, not equal: tests/test_sizing_split_nodes.py)
        nodes = split_nodes(flow, np.asarray(ev.coolant(flow).ok))
        for g, b, q in zip(rng.integers(0, count.size, 40), rng.integers(0, base.size, 40),
                           rng.choice(nodes, 40)):
            design = dataclasses.replace(
                base_design, passage=dataclasses.replace(base_design.passage, count=int(count[g]),
                                                         width=float(width[g]), depth=float(depth[g])),
                plate=dataclasses.replace(base_design.plate, base=float(base[b])))
            if not e.solvable[g, b, q]:
                continue
            r = solve_plate(design, flow=float(flow[q]))
            regimes.add(r.regime)
            checked += 1
            assert e.R_th[g, b, q] == pytest.approx(r.R_th, rel=TOLERANCE)
            assert e.dp[g, b, q] == pytest.approx(r.dp, rel=TOLERANCE)
            assert e.T_out[g, b, q] == pytest.approx(r.T_out, abs=1e-3)
            assert e.Re[g, b, q] == pytest.approx(r.Re, rel=TOLERANCE)
    # the viscous glycol stays below Re = 1e4 over the sampled flows
    expected = {"laminar", "transitional"} if "glycol" in name else {"laminar", "transitional", "turbulent"}
    assert expected <= regimes
    assert checked >= 60


def test_vectorised_tubes_agree_with_solve_plate_internal_consistency():
    rng = np.random.default_rng(7)
    ev = Evaluator(TUBE)
    wall = 0.5 * (TUBE.passage.outer_diameter - TUBE.passage.inner_diameter)
    di = rng.uniform(3e-3, 7e-3, 4)
    passes = np.array([1, 2, 3, 2])
    base = np.array([2.5e-3, 5e-3])
    flow = np.array([0.1, 0.5, 1.5, 4.0]) / 6e4
    e = ev.tubes(di, passes, base, flow)
    regimes = set()
    for g in range(di.size):
        for b in range(base.size):
            for q in range(flow.size):
                p = dataclasses.replace(TUBE.passage, inner_diameter=float(di[g]),
                                        outer_diameter=float(di[g] + 2 * wall), passes=int(passes[g]))
                design = dataclasses.replace(TUBE, passage=p, plate=dataclasses.replace(TUBE.plate, base=float(base[b])))
                r = solve_plate(design, flow=float(flow[q]))
                regimes.add(r.regime)
                assert e.R_th[g, b, q] == pytest.approx(r.R_th, rel=TOLERANCE)
                assert e.dp[g, b, q] == pytest.approx(r.dp, rel=TOLERANCE)
    assert {"laminar", "turbulent"} <= regimes


def test_boiling_candidates_are_marked_not_solvable():
    ev = Evaluator(CHANNELS)
    e = ev.channels([12], [2e-3], [6e-3], [3e-3], [1e-8, 1.5 / 6e4])  # 0.6 mL/min cannot carry 85 W
    assert not e.solvable[0, 0, 0] and math.isnan(e.R_th[0, 0, 0])
    assert e.solvable[0, 0, 1]


def test_plate_table_interpolation_error_is_bounded():
    # computed: the tabulated hottest-point rise against the spreading series evaluated at h_eff itself
    table = PlateTable.for_design(CHANNELS)
    rng = np.random.default_rng(3)
    worst = 0.0
    for _ in range(60):
        t, h, s = rng.uniform(1e-3, 8e-3), 10 ** rng.uniform(2, 5), 10 ** rng.uniform(-3.5, -0.5)
        # local back side: a resistance falling to the mean's 0.7 at the inlet end and rising to 1.4 times it
        r = (1.0 / h) * np.linspace(0.7, 1.4, table.xg.size)
        got = table.rise(t, np.array([h]), np.array([s]), r[None, :])[0]
        worst = max(worst, abs(got / table.exact_rise(t, h, s, r) - 1))
    assert worst < 2e-4


def test_one_dimensional_turbulent_plate_against_outside_references():
    # A footprint covering the whole plate: no spreading, so R = s + t/(kA) + 1/(h_eff A) + R_int, the hottest
    # point at the outlet end (published: plane wall; the coolant's rise follows the absorbed heat).
    # plenums 60 mm deep: the headers' pressure changes are too small to matter, the flow splits evenly (the
    # evaluator's split is checked to be even to 0.1 %; tests/test_flow_split_check.py holds the split itself)
    data = modified(example_dict("reagent-block-channels"), heat__footprint=["80 mm", "60 mm"],
                    passage__port_diameter=None, passage__count=3, passage__width="3 mm", passage__depth="4 mm",
                    passage__plenum_depth="60 mm")
    d = design_from_dict(data)
    flow = 10.0 / 6e4
    ev = Evaluator(d)
    e = ev.channels([3], [3e-3], [4e-3], [d.plate.base], [flow])
    share, _ = ev.splits(np.array([3]), np.array([3e-3]), np.array([4e-3]), ev.coolant(np.array([flow]).reshape(1, 1, -1)))
    assert share.item() == pytest.approx(1.0, rel=1e-3)
    assert e.Re.item() > 1e4
    # water at the bulk mean temperature from IAPWS-95 (library: iapws), outlet by an energy balance
    T_in, Q = d.inlet_temperature, d.heat.load
    w_in = IAPWS95(T=T_in, P=0.101325)
    m_dot = w_in.rho * flow
    T_out = T_in + Q / (m_dot * w_in.cp * 1e3)
    w = IAPWS95(T=0.5 * (T_in + T_out), P=0.101325)
    mu, k_w, cp, rho = w.mu, w.k, w.cp * 1e3, w.rho
    wch, dep, n = 3e-3, 4e-3, 3
    D_h = 2 * wch * dep / (wch + dep)
    V = m_dot / (rho * n * wch * dep)
    Re = rho * V * D_h / mu
    L = d.plate.length - 2 * d.passage.plenum_length
    fd = Colebrook(Re, d.passage.roughness / D_h)  # library: fluids.friction.Colebrook (Lambert W form)
    # published: Gnielinski, VDI Heat Atlas 2010 ch. G1 (from memory), with the rough-wall friction factor
    # (fd above); at the hottest point (the outlet end) the local coefficient, so without the mean's entry
    # factor [1 + (D_h/L)^(2/3)] (the fully developed value: the local one falls towards it along the tube)
    Pr = cp * mu / k_w
    Nu = (fd / 8) * Re * Pr / (1 + 12.7 * math.sqrt(fd / 8) * (Pr ** (2 / 3) - 1))
    h = Nu * k_w / D_h
    k = d.plate.conductivity
    wall = (d.plate.width - n * wch) / (n + 1)

    def eta(wetted_faces):  # published: straight fin, adiabatic tip (Incropera sec. 3.6), m = sqrt(h P/(k A_c))
        m = math.sqrt(wetted_faces * h / (k * wall))
        return math.tanh(m * dep) / (m * dep)

    A = L * d.plate.width  # the cooled length between the plenums (the footprint over them is put on it)
    # the n - 1 inner walls wetted on both faces, the two outer walls on one
    R_below = 1.0 / (h * L * (n * wch + 2 * dep * ((n - 1) * eta(2) + eta(1))))
    A_fp = d.plate.length * d.plate.width  # the interface covers the whole footprint
    R_ref = (T_out - T_in) / Q + d.plate.base / (k * A) + R_below + d.interface.resistance_area / A_fp
    assert e.R_th.item() == pytest.approx(R_ref, rel=3e-3)  # IAPWS-95 vs IF97 and Clamond vs Lambert W
    dp_friction_ref = fd * L / D_h * 0.5 * rho * V**2
    # minor losses: Borda-Carnot expansion (published, Idelchik) and the sharp contraction of hydraulics.losses
    from hydraulics.losses import K_sudden_contraction
    # (the plenums' face is the plate width times the plenum depth, 60 mm: the header's own drop is negligible)
    sigma = n * wch * dep / (d.plate.width * 60e-3)
    K = (1 - sigma) ** 2 + K_sudden_contraction(1.0, sigma)
    assert e.dp.item() == pytest.approx(dp_friction_ref + K * 0.5 * rho * V**2, rel=3e-3)
