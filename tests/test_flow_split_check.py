"""The flow split across a channel plate's channels, through the check (coldplate/plate/split.py wired into
solve_plate, the finding, the JSON, the sizing evaluator's batched split).

Sources, beside each check: the equal-split limit and the pressure balances are properties of the network
equations (published: Bajura & Jones 1976's header model, from memory, written as in hydraulics/manifold.py);
the independent network below is "computed by our own solver" (a node-pressure formulation solved with
scipy.optimize.fsolve, header friction from the Shah & London fully developed f Re of the rectangle written
here from memory); the 80 % aim is common practice.
"""
from __future__ import annotations

import copy
import json
import math
from dataclasses import replace

import numpy as np
import pytest

from coldplate.check import solve
from coldplate.design.errors import DesignError
from coldplate.design.reader import design_from_dict, load_data
from coldplate.plate import solve as plate_solve
from coldplate.plate.split import build_manifold, channel_positions, solve_channel_split
from coldplate.plate.passages import channels as channel_passage
from hydraulics.manifold import solve_split, solve_split_batch
from reports.jsonout import check_to_dict

from tests.helpers import ROOT

EXAMPLES = ROOT / "examples"

CHANNEL_EXAMPLES = ("laser-mount-sizing", "reagent-block-channels", "sample-stage-thermoelectric",
                    "tap-to-drain-circuit", "laser-bar-offset-ports")


def _data(name, **passage):
    data = load_data(EXAMPLES / f"{name}.toml")
    data = copy.deepcopy(data)
    data["passage"].update(passage)
    return data


def _solve(name, **passage):
    return solve(design_from_dict(_data(name, **passage)))


def _even(name, monkeypatch, **passage):
    """The same design through the check with the split switched off (every channel at the mean flow,
    the pressure drop friction plus every minor loss): the model before the split was wired in."""
    with monkeypatch.context() as m:
        m.setattr(plate_solve, "solve_channel_split", lambda *a, **k: None)
        return solve(design_from_dict(_data(name, **passage)))


@pytest.mark.parametrize("name", CHANNEL_EXAMPLES)
def test_equal_split_in_the_limit_gives_the_even_model_to_0p1_percent(name, monkeypatch):
    # property of the network equations (Bajura & Jones 1976, from memory): with headers whose pressure
    # changes are negligible next to the channels' drop the split is even and the check is the even model.
    # 100 mm plenums (the top of the plausible range) with centred ports, on every channel example.
    deep = dict(plenum_depth="100 mm", inlet_port="0 mm", outlet_port="0 mm")
    r = _solve(name, **deep)
    assert r.flow_split_min_to_mean > 0.997
    e = _even(name, monkeypatch, **deep)
    assert r.R_th == pytest.approx(e.R_th, rel=1e-3)
    assert r.T_face_max - r.T_in == pytest.approx(e.T_face_max - e.T_in, rel=1e-3)
    # the pressure drop: the even model's to 0.1 % once the headers' own parts (what the even model leaves
    # out; at 100 mm a few tenths of a pascal) are taken off, and never below it (the split errs higher)
    headers = sum(x.pressure_drop(r.props.rho) for x in r.minor_losses if x.name in plate_solve.HEADER_PARTS)
    assert r.dp - headers == pytest.approx(e.dp, rel=1e-3)
    assert r.dp >= e.dp * (1 - 1e-9)
    # the outlet stays on the total flow (a circuit's or the modules' operating point moves a little with dp/R)
    assert r.T_out - r.T_in == pytest.approx(e.T_out - e.T_in, rel=1e-3)
    assert r.water_use_L_per_day == pytest.approx(e.water_use_L_per_day, rel=1e-3)


@pytest.mark.parametrize("name", CHANNEL_EXAMPLES)
def test_mass_is_conserved_and_every_loop_balances(name):
    # mass balance and the pressure balance around every loop (properties of the network; common practice)
    r = _solve(name)
    assert math.fsum(r.channel_flows) == pytest.approx(r.V_dot, rel=1e-9)
    for m in (r.flow_split.flows, r.flow_split.drop):
        mean_drop = float(np.mean(m.channel_drops))
        assert np.max(np.abs(m.inlet_pressure - m.outlet_pressure - m.channel_drops)) <= 1e-9 * mean_drop
        assert math.fsum(m.channel_flows) == pytest.approx(r.m_dot / r.props.rho, rel=1e-9)
    # the pressure breakdown (the least-fed channel's loop) adds up to the port-to-port drop and the ports
    parts = r.dp_friction + sum(x.pressure_drop(r.props.rho) for x in r.minor_losses)
    assert parts == pytest.approx(r.dp, rel=1e-12)
    ports = sum(x.pressure_drop(r.props.rho) for x in r.minor_losses if x.name in channel_passage.PORT_LOSSES)
    assert r.dp == pytest.approx(r.flow_split.drop.port_to_port + ports, rel=1e-8)


def _shah_london_fRe(alpha):
    # published: Shah & London (1978), fully developed laminar flow in a rectangle, Darcy f Re (from memory)
    return 96.0 * (1 - 1.3553 * alpha + 1.9467 * alpha**2 - 1.7012 * alpha**3 + 0.9564 * alpha**4
                   - 0.2537 * alpha**5)


def test_split_agrees_with_an_independent_node_pressure_network():
    # computed by our own solver: the same physics written another way.  Unknowns: the pressure at every node
    # of both headers and the channel flows; equations: each header segment's friction and each take-off's
    # momentum change (k = 1 dividing, 2 combining; Bajura & Jones 1976, from memory), each node's mass
    # balance, each channel's drop at its flow; scipy.optimize.fsolve.  Fully developed laminar header flow
    # (Shah & London above), so the check's fully developed solve is compared; the channels' drop function is
    # the check's own (an input here, not what is tested).
    from scipy.optimize import fsolve

    data = _data("laser-bar-offset-ports")
    data["coolant"]["flow"] = "0.8 L/min"
    d = design_from_dict(data)
    res = solve(d)
    assert max(res.flow_split.flows.header_reynolds) < 2000   # laminar headers: the formula above applies
    man = build_manifold(d.passage, d.plate, res.geometry, res.props, d.model, friction_length=math.inf)
    total = res.m_dot / res.props.rho
    ours = solve_split(man, total, res.props.rho, res.props.mu)
    rho, mu = res.props.rho, res.props.mu
    y = np.asarray(channel_positions(d.passage, d.plate))
    n = y.size
    H = man.inlet
    A, Dh = H.area, H.D_h
    fRe = _shah_london_fRe(H.alpha)
    dp_channel = man.channels[0]

    def header_eq(p, port, k, sign, Q):
        """Residuals of one header: p at its channel nodes and the port (port pressure 0)."""
        nodes = np.union1d(y, [port])
        idx = np.searchsorted(nodes, y)
        pin = int(np.searchsorted(nodes, port))
        out = []
        # pressure at each node: p_nodes; the port node is 0
        p_nodes = np.insert(p, pin, 0.0) if nodes.size == n + 1 else p.copy()
        # flow in each segment toward +y: the port's supply left of it minus the channels taken off left of it
        for s in range(nodes.size - 1):
            left_flow = sum(Q[i] for i in range(n) if idx[i] <= s)
            F = sign * ((total if pin <= s else 0.0) - left_flow)
            V = F / A
            friction = fRe * mu / (rho * abs(V) * Dh + 1e-300) * (nodes[s + 1] - nodes[s]) / Dh * rho * V * abs(V) / 2
            # momentum at the take-off between this segment and the next toward the far side of the port
            V_near = V
            if s >= pin:   # right of the port: the far side of node s + 1 is segment s + 1
                V_far = (sign * ((total if pin <= s + 1 else 0.0) - sum(Q[i] for i in range(n) if idx[i] <= s + 1))
                         / A) if s + 1 < nodes.size - 1 else 0.0
                out.append(p_nodes[s + 1] - p_nodes[s] + friction + k * rho * (V_far**2 - V_near**2) / 2)
            else:          # left of the port: the far side of node s is segment s - 1
                V_far = (sign * ((total if pin <= s - 1 else 0.0) - sum(Q[i] for i in range(n) if idx[i] <= s - 1))
                         / A) if s >= 1 else 0.0
                out.append(p_nodes[s] - p_nodes[s + 1] - friction + k * rho * (V_far**2 - V_near**2) / 2)
        return out, p_nodes[idx]

    def equations(u):
        Q = u[:n] * total / n
        p_in, p_out, dP = u[n:2 * n] * 100.0, u[2 * n:3 * n] * 100.0, u[3 * n] * 100.0
        e_in, pc_in = header_eq(p_in, d.passage.inlet_port, 1.0, +1.0, Q)
        e_out, pc_out = header_eq(p_out, d.passage.outlet_port, 2.0, -1.0, Q)
        loops = [pc_in[i] - (pc_out[i] - dP) - float(dp_channel(Q[i])) for i in range(n)]
        mass = [np.sum(Q) - total]
        return np.array(e_in + e_out + loops + mass) / 100.0

    # a port on a channel's position shares its node: this scenario's ports (30 mm) are between channels
    assert not np.any(np.isclose(y, d.passage.inlet_port)) and not np.any(np.isclose(y, d.passage.outlet_port))
    u0 = np.concatenate((np.ones(n), np.zeros(2 * n), [10.0]))
    sol, info, ier, msg = fsolve(equations, u0, full_output=True, xtol=1e-13)
    assert ier == 1, msg
    Q_ref = sol[:n] * total / n
    # 1e-3: the check's fully developed header friction is Muzychka & Yovanovich's sqrt(A) model at an
    # unbounded length, not Shah & London's polynomial; measured 6e-5 of the mean flow, 1e-4 on the drop
    assert np.max(np.abs(ours.channel_flows - Q_ref)) <= 1e-3 * total / n
    assert ours.port_to_port == pytest.approx(sol[3 * n] * 100.0, rel=1e-3)
    assert ours.min_to_mean == pytest.approx(np.min(Q_ref) / np.mean(Q_ref), rel=1e-3)
    # the check keeps the less even of the developing and the fully developed split
    assert res.flow_split_min_to_mean <= ours.min_to_mean + 1e-12


def test_batched_split_equals_the_single_solve():
    # internal consistency: the sizing evaluator's batched Newton against hydraulics.manifold.solve_split
    d = design_from_dict(_data("laser-bar-offset-ports"))
    res = solve(d)
    rows = []
    for width, flow in ((2e-3, 1.0), (2.2e-3, 2.0), (1.8e-3, 3.0)):
        p = replace(d.passage, width=width)
        geom = channel_passage.geometry(p, d.plate)
        rows.append((p, geom, flow / 6e4))
    singles = [solve_channel_split(p, d.plate, g, res.props, d.model, q) for p, g, q in rows]
    y = np.array([channel_positions(p, d.plate) for p, _, _ in rows])
    drops = [build_manifold(p, d.plate, g, res.props, d.model).channels[0] for p, g, _ in rows]

    def dp_channels(Q, r):
        return np.stack([np.asarray(drops[i](Q[j]), dtype=float) for j, i in enumerate(r)])

    for fl, pick in ((None, "drop"), (math.inf, None)):
        b = solve_split_batch(d.plate.width, d.passage.header_depth, d.passage.plenum_length, d.passage.roughness,
                              y, d.passage.inlet_port, d.passage.outlet_port, dp_channels,
                              np.array([q for _, _, q in rows]), res.props.rho, res.props.mu, friction_length=fl)
        assert b.converged.all()
        for i, (p, g, q) in enumerate(rows):
            one = solve_split(build_manifold(p, d.plate, g, res.props, d.model, fl), q, res.props.rho, res.props.mu)
            assert np.max(np.abs(b.channel_flows[i] - one.channel_flows)) <= 1e-9 * q
            assert b.port_to_port[i] == pytest.approx(one.port_to_port, rel=1e-9)
    for s, (p, g, q) in zip(singles, rows):
        assert s.min_to_mean <= 1.0


def test_the_80_percent_finding_fires_and_clears():
    # common practice: at least 80 % of the mean in every channel is a usual design aim
    starved = _solve("laser-bar-offset-ports")
    assert starved.flow_split_min_to_mean < 0.8
    f = [x for x in starved.findings if x.id == "flow-split-uneven"]
    assert len(f) == 1 and "80 %" in f[0].message and "twice as deep" in f[0].action
    deeper = _solve("laser-bar-offset-ports", plenum_depth="8 mm")
    assert deeper.flow_split_min_to_mean >= 0.8
    assert not [x for x in deeper.findings if x.id == "flow-split-uneven"]
    # the finding's number for the deeper plenum is the split the deeper plate gets
    assert f"give {100 * deeper.flow_split_min_to_mean:.0f} %" in f[0].action
    # a starving channel runs the face hotter (every simplification errs toward a hotter face)
    assert starved.T_face_max > deeper.T_face_max


def test_json_carries_the_split():
    r = _solve("laser-bar-offset-ports")
    out = json.loads(json.dumps(check_to_dict(r)))
    assert out["channel_flows_m3_per_s"] == pytest.approx(list(r.channel_flows))
    assert len(out["channel_flows_m3_per_s"]) == 16
    assert out["flow_split_min_to_mean"] == pytest.approx(r.flow_split_min_to_mean)
    assert set(out["header_pressure_drop_Pa"]) == {"inlet", "outlet"}
    tube = solve(design_from_dict(load_data(EXAMPLES / "laser-mount-tube.toml")))
    assert check_to_dict(tube)["channel_flows_m3_per_s"] is None


def test_report_figure_shows_flow_per_channel():
    pytest.importorskip("matplotlib")
    from reports import plots
    from reports.display_units import DisplayUnits
    from reports.flow_split import split_section

    r = _solve("laser-bar-offset-ports")
    svg = plots.draw(plots.channel_flows, r, DisplayUnits("si"), name="flow_split")
    assert svg.startswith("<svg") and svg.count('id="flow_split-patch') >= 16   # a bar per channel
    section = split_section(r, DisplayUnits("si"), ())
    assert len([row for row in section.rows if row.label.startswith("channel ")]) == 16
    assert "80 %" in " ".join(section.paragraphs)


@pytest.mark.parametrize("key, value, words", [
    ("inlet_port", "60 mm", "edge"), ("outlet_port", "-48 mm", "edge"), ("plenum_depth", "0 mm", "plausible"),
])
def test_bad_port_and_plenum_keys_are_refused_in_one_line(key, value, words):
    with pytest.raises(DesignError) as exc:
        design_from_dict(_data("laser-bar-offset-ports", **{key: value}))
    text = str(exc.value)
    assert f"[passage] {key}" in text and words in text and "\n" not in text


def test_port_keys_need_a_plenum():
    with pytest.raises(DesignError) as exc:
        design_from_dict(_data("reagent-block-channels", plenum_length="0 mm", inlet_port="5 mm"))
    assert "[passage] inlet_port" in str(exc.value)
