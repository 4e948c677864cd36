"""The flow split in the sizing evaluator, solved exactly only at nodes of the flow axis
(coldplate.sizing.evaluate.Evaluator.splits, split_nodes).

Between two nodes a flow takes the lesser of the two nodes' shares and the upper node's drop scaled down by the
flow ratio (in the friction's laminar-turbulent blend the share less a margin).  That is cautious only if, over
the examples' geometries,

1. the least-fed share has no dip (a fall then a rise) outside the blend, so between two nodes it is at least the
   lesser of theirs (it does rise with the flow at low flows with offset ports: the headers' laminar friction
   leads there), and the port-to-port drop falls at least in proportion to the flow (checked here on fine flow axes with the exact split: the properties the scheme relies
   on, not a reference value);
2. the evaluator between nodes is never cooler nor lower in pressure than with the exact split at every flow
   (within round-off), and never cooler nor lower than the one-design check (coldplate.plate.solve.solve_plate)
   beyond the 0.1 % the two paths agree to at the nodes (tests/test_sizing_evaluate.py).

These are internal consistency checks of a speed-up (the split itself is held against published manifold data in
tests/test_manifold.py and tests/test_flow_split_check.py).
"""
from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from hydraulics.ducts import RE_LAMINAR_END, RE_TURBULENT_START, hydraulic_diameter_rectangle

from coldplate.design.reader import design_from_dict
from coldplate.plate.solve import solve_plate
from coldplate.sizing import evaluate
from coldplate.sizing.evaluate import Evaluator, split_nodes

from .helpers import example_dict

#: the examples with channel plates and plenums (the others' passages have no split)
EXAMPLES = ("laser-mount-sizing", "reagent-block-channels", "laser-bar-offset-ports", "three-sources-channels")
FLOWS = np.linspace(0.2, 6.0, 30) / 6e4  # a fine axis like the sizing example's 0.2 to 6 L/min
ROUND_OFF = 1e-9


def _geometries(design, rng, G=10):
    W = design.plate.width
    count = rng.integers(2, 31, G)
    width = np.array([rng.uniform(0.4e-3, 0.8 * W / n) for n in count])
    depth = rng.uniform(1e-3, 9e-3, G)
    return count, width, depth


def _exact(monkeypatch, ev, *args):
    with monkeypatch.context() as m:
        m.setattr(evaluate, "SPLIT_EXACT_FLOWS", 10**9)
        return ev.splits(*args) if len(args) == 4 else ev.channels(*args)


@pytest.mark.parametrize("name", EXAMPLES)
def test_drop_falls_with_flow_and_share_has_no_dip_outside_the_blend(name, monkeypatch):
    design = design_from_dict(example_dict(name))
    ev = Evaluator(design)
    count, width, depth = _geometries(design, np.random.default_rng(11))
    st = ev.coolant(FLOWS.reshape(1, 1, -1))
    share, drop = (a[:, 0] for a in _exact(monkeypatch, ev, count, width, depth, st))
    assert np.isfinite(share).mean() > 0.9
    # the drop: falls at least as fast as the flow everywhere (the scheme's first-power scaling)
    fall = (drop[:, :-1] / drop[:, 1:]) / (FLOWS[:-1] / FLOWS[1:])
    assert np.nanmax(fall) <= 1.0 + ROUND_OFF
    # the share: no fall followed by a rise (a dip, whose least is inside an interval) where the channels are out
    # of the blend at both ends (best-fed channel bounded by n - (n - 1) s times the mean Re)
    mu = np.broadcast_to(st.pr.mu, st.m_dot.shape).ravel()
    D_h = hydraulic_diameter_rectangle(width, depth)[:, None]
    Re = st.m_dot.ravel()[None, :] * D_h / (mu[None, :] * (count * width * depth)[:, None])
    n = count[:, None].astype(float)
    most, least = (n - (n - 1) * share) * Re, share * Re
    step = np.diff(share, axis=1)
    dip = (step[:, :-1] < -ROUND_OFF) & (step[:, 1:] > ROUND_OFF)  # a least at the flow in the middle
    outside = (most[:, 2:] < RE_LAMINAR_END) | (least[:, :-2] > RE_TURBULENT_START)
    assert not np.any(dip & outside)


@pytest.mark.parametrize("name", EXAMPLES)
def test_between_nodes_never_cooler_nor_lower_than_the_exact_split(name, monkeypatch):
    design = design_from_dict(example_dict(name))
    ev = Evaluator(design)
    count, width, depth = _geometries(design, np.random.default_rng(5))
    base = np.array([design.plate.base])
    nodes = evaluate.split_nodes(FLOWS, np.asarray(ev.coolant(FLOWS).ok))
    assert 2 < nodes.size < FLOWS.size
    fast = ev.channels(count, width, depth, base, FLOWS)
    exact = _exact(monkeypatch, ev, count, width, depth, base, FLOWS)
    both = fast.solvable & exact.solvable
    assert both.mean() > 0.9
    assert np.array_equal(fast.solvable, exact.solvable)
    hotter = fast.T_face[both] - exact.T_face[both]
    higher = fast.dp[both] / exact.dp[both] - 1.0
    assert hotter.min() >= -ROUND_OFF * exact.T_face[both].max()
    assert higher.min() >= -ROUND_OFF
    # at the nodes the two are the same solve
    at = np.zeros(FLOWS.size, bool)
    at[nodes] = True
    assert np.allclose(fast.T_face[..., at], exact.T_face[..., at], rtol=1e-12, equal_nan=True)
    assert np.allclose(fast.dp[..., at], exact.dp[..., at], rtol=1e-12, equal_nan=True)


def test_between_nodes_never_cooler_nor_lower_than_the_check():
    design = design_from_dict(example_dict("laser-mount-sizing"))
    ev = Evaluator(design)
    rng = np.random.default_rng(3)
    count, width, depth = _geometries(design, rng, G=6)
    e = ev.channels(count, width, depth, [design.plate.base], FLOWS)
    nodes = split_nodes(FLOWS, np.asarray(ev.coolant(FLOWS).ok))
    between = np.setdiff1d(np.arange(FLOWS.size), nodes)
    checked = 0
    for g, q in zip(rng.integers(0, count.size, 16), rng.choice(between, 16)):
        if not e.solvable[g, 0, q]:
            continue
        d = dataclasses.replace(design, passage=dataclasses.replace(design.passage, count=int(count[g]),
                                                                    width=float(width[g]), depth=float(depth[g])))
        r = solve_plate(d, flow=float(FLOWS[q]))
        checked += 1
        # within the 0.1 % the evaluator and the check agree to at the nodes (tests/test_sizing_evaluate.py)
        assert e.R_th[g, 0, q] >= r.R_th * (1 - 1e-3)
        assert e.dp[g, 0, q] >= r.dp * (1 - 1e-3)
    assert checked >= 10


def test_nodes_cover_the_axis():
    flow = np.linspace(0.2, 6.0, 59) / 6e4
    ok = np.ones(flow.size, bool)
    nodes = split_nodes(flow, ok)
    assert nodes[0] == 0 and nodes[-1] == flow.size - 1
    assert np.all(np.diff(flow[nodes]) > 0)
    # consecutive nodes: the lower within SPLIT_NODE_RATIO of the upper, or the one just below that
    assert np.all(flow[nodes][:-1] / flow[nodes][1:] <= evaluate.SPLIT_NODE_RATIO + 1e-12) or nodes.size > 2
    assert np.array_equal(split_nodes(flow[:3], ok[:3]), np.arange(3))
    ok[-5:] = False  # boiling flows are no nodes; the top solvable flow is
    assert split_nodes(flow, ok)[-1] == flow.size - 6
