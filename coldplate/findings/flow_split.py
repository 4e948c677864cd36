"""The flow split's rule: a channel that gets too little of the flow (a channel plate's plenums as headers,
solved in :mod:`coldplate.plate.split`).

The remedies are solved, not guessed: the split a plenum twice as deep would give, the split with both ports
on the centre line, with the outlet port moved to the opposite side (a U made a Z) and with half the channels,
each through the same header network at the result's coolant properties and flow.
"""
from __future__ import annotations

from dataclasses import replace

from coldplate.design.errors import SolveError
from coldplate.findings.base import Finding
from coldplate.plate.passages import channels as channel_passage
from coldplate.plate.split import solve_channel_split

#: Least channel flow over the mean below which the split is reported [-]: 80 % is a common design aim for
#: parallel-channel cold plates and heat-exchanger manifolds (common practice, not a standard).
SPLIT_AIM = 0.8


def _split_with(r, **changes) -> float | None:
    """min/mean of the split for the design's passage with ``changes``, at the result's properties and flow
    (None where it cannot be solved or the passage does not fit the plate)."""
    d = r.design
    passage = replace(d.passage, **changes)
    if channel_passage.wall_thickness(passage, d.plate) <= 0:
        return None
    geom = channel_passage.geometry(passage, d.plate)
    try:
        split = solve_channel_split(passage, d.plate, geom, r.props, d.model, r.m_dot / r.props.rho)
    except SolveError:
        return None
    return None if split is None else split.min_to_mean


def remedies(r) -> list[str]:
    """Each remedy that helps, as words with the split it gives (solved; one that does not help is left out:
    with the combining header's larger momentum term a Z can split worse than a U)."""
    d = r.design
    p = d.passage
    out = []
    deeper = 2.0 * p.header_depth
    if deeper <= 0.1:  # the plausible range of [passage] plenum_depth
        s = _split_with(r, plenum_depth=deeper)
        if s is not None:
            out.append((f"plenums twice as deep ({deeper * 1e3:.3g} mm) give {100 * s:.0f} %", s))
    if p.inlet_port != 0.0 or p.outlet_port != 0.0:
        s = _split_with(r, inlet_port=0.0, outlet_port=0.0)
        if s is not None:
            out.append((f"both ports on the centre line give {100 * s:.0f} %", s))
    if r.port_arrangement == "U":
        s = _split_with(r, outlet_port=-p.outlet_port)
        if s is not None:
            out.append((f"the outlet port at {-p.outlet_port * 1e3:+.3g} mm, opposite the inlet (a Z), gives "
                        f"{100 * s:.0f} %", s))
    if p.count >= 4:
        s = _split_with(r, count=p.count // 2)
        if s is not None:
            out.append((f"{p.count // 2} channels of the same size instead of {p.count} give {100 * s:.0f} % "
                        "(less cooling area: check the face again)", s))
    return [text for text, s in out if s > r.flow_split_min_to_mean]


def flow_split(r):
    if not r.channel_flows or r.flow_split_min_to_mean >= SPLIT_AIM:
        return
    q = r.channel_flows
    low = q.index(min(q)) + 1
    fixes = remedies(r)
    yield Finding(
        "flow-split-uneven", "caution",
        f"Channel {low} of {len(q)} (counted from the right of the flow) gets {100 * r.flow_split_min_to_mean:.0f} % "
        f"of the mean flow, below the {100 * SPLIT_AIM:.0f} % that is a common design aim (common practice): the "
        f"plenums' pressure changes along them ({r.header_pressure_drop[0]:.3g} Pa inlet, "
        f"{r.header_pressure_drop[1]:.3g} Pa outlet, ports {r.port_arrangement}) starve it, and the device over "
        "it runs hotter (the hot spot here is computed at its flow).",
        "Deepen the plenums, centre the ports or move them (a U and a Z differ; solved below), or use fewer "
        "channels" + (": " + "; ".join(fixes) + "." if fixes else "."))


RULES = (flow_split,)
