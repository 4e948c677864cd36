"""The flow split across a channel plate's channels: the design's plenums as headers, solved at the coolant's
properties with :func:`hydraulics.manifold.solve_split`.

The headers are the plenums: length across the plate (the plate width), section ``plenum_length`` (along the
flow) × the plenum depth (``plenum_depth``, the channel depth unless given), the passage's roughness.  The ports
sit at ``inlet_port`` / ``outlet_port`` across the plate (offsets from the centre line, positive on the left of
the flow: the drawing in :mod:`coldplate.plate.sources`; the manifold's positive side is the side of the last
channel, the same side).  Each channel's drop at its own flow is the check's own chain
(the friction of :func:`coldplate.plate.flow.passage_friction`, the hydraulic half of ``passage_flow``: apparent
friction, laminar developing to turbulent, evaluated by :func:`hydraulics.friction.duct_friction` with the
channel's geometry held; Darcy-Weisbach through :func:`~coldplate.plate.flow.friction_pressure_drop`) plus its contraction from the inlet plenum and
expansion into the outlet plenum (:func:`coldplate.plate.passages.channels.loss_coefficients`); the ports'
own losses are added outside the network (port to plenum, at the port's velocity), so nothing is counted twice.

The header friction is solved both ways, developing over the header's length (the manifold's default) and fully
developed: neither is always the less even split (in a Z the extra friction evens the split a little), so the
split kept is the less even of the two, and the pressure drop the higher (the developing one, always; taken
as the larger of both all the same).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from hydraulics.friction import duct_friction
from hydraulics.manifold import Header, Manifold, ManifoldError, ManifoldResult, solve_split_forms

from coldplate.design.errors import SolveError
from coldplate.plate.flow import friction_pressure_drop
from coldplate.plate.passages import channels as channel_passage


@dataclass(frozen=True)
class ChannelDrop:
    """One channel's pressure drop at its own flow q [m^3/s] → [Pa]: friction by the check's chain and the
    channel's contraction and expansion losses (K on the channel velocity)."""

    pr: object  #: properties (rho, mu, k, Pr)
    geom: object  #: the passage Geometry
    model: object  #: the design's correlation choices
    K_channel: float  #: sum of the channel's own minor-loss coefficients [-]
    takes_arrays = True  #: q may be an array (hydraulics.manifold calls it once for all channels)

    def __call__(self, q):
        # the check's friction (darcy_friction, through passage_friction) with the channel's geometry held:
        # its DuctFriction, equal to round-off and a few array operations a call (the split calls this often)
        g, pr = self.geom, self.pr
        V = np.asarray(q, dtype=float) / g.flow_area
        f = duct_friction(g.path_length, g.D_h, g.alpha, g.shape, g.rel_roughness)(pr.rho * V * g.D_h / pr.mu)
        return friction_pressure_drop(f, g.path_length, g.D_h, pr.rho, V) + self.K_channel * 0.5 * pr.rho * V**2


@dataclass(frozen=True)
class Split:
    """The split the plate solve uses: ``flows`` [m^3/s] per channel (the less even of the two header-friction
    forms), ``drop`` the solve with the higher port-to-port drop (its least-fed channel's loop gives the
    pressure breakdown)."""

    flows: ManifoldResult
    drop: ManifoldResult
    #: both solves: the header friction developing over the header's length, and fully developed
    forms: tuple[ManifoldResult, ManifoldResult] = ()

    @property
    def min_to_mean(self) -> float:
        return self.flows.min_to_mean


#: Positions across the plate are rounded to this many decimals of a metre (a picometre): a port on a channel's
#: centre line must meet it exactly, not 1e-18 m beside it (the network's node order would change with
#: round-off, and with it the split).
POSITION_DECIMALS = 12


def snap(y):
    """A position across the plate [m] rounded to :data:`POSITION_DECIMALS` (floats or arrays)."""
    return np.round(y, POSITION_DECIMALS) + 0.0


def port_offsets(passage) -> tuple[float, float]:
    """The inlet and outlet ports' offsets [m], snapped like the channels' positions."""
    return float(snap(passage.inlet_port)), float(snap(passage.outlet_port))


def channel_positions(passage, plate) -> tuple[float, ...]:
    """Channel centres across the plate [m from the centre line], increasing: the walls between them and the two
    outer walls of equal thickness (:func:`coldplate.plate.passages.channels.wall_thickness`), snapped."""
    t = channel_passage.wall_thickness(passage, plate)
    w = passage.width
    return tuple(float(snap(-0.5 * plate.width + t * (i + 1) + w * (i + 0.5))) for i in range(passage.count))


def channel_loss_coefficient(passage, plate) -> float:
    """The sum of one channel's own minor-loss coefficients (contraction and expansion; not the ports) [-]."""
    return float(sum(K * ratio**2 for name, K, ratio in channel_passage.loss_coefficients(
        passage.count, passage.width, passage.depth, plate.width, passage.port_diameter, passage.header_depth)
        if name not in channel_passage.PORT_LOSSES))


def build_manifold(passage, plate, geom, pr, model, friction_length=None) -> Manifold:
    """The design's headers and channels as a :class:`hydraulics.manifold.Manifold`."""
    header, positions, K, (inlet_port, outlet_port) = _layout(passage, plate)
    drop = ChannelDrop(pr, geom, model, K)
    return Manifold(header, header, positions, (drop,) * passage.count,
                    inlet_port=inlet_port, outlet_port=outlet_port, friction_length=friction_length)


@lru_cache(maxsize=64)
def _layout(passage, plate):
    """The parts of the manifold that the plate's geometry alone fixes (kept: every solve of one design asks
    again): the header, the channels' positions, their loss coefficient and the ports' offsets."""
    header = Header(length=plate.width, depth=passage.header_depth, width=passage.plenum_length,
                    roughness=passage.roughness)
    return header, channel_positions(passage, plate), channel_loss_coefficient(passage, plate), port_offsets(passage)


def solve_channel_split(passage, plate, geom, pr, model, flow: float, start: Split | None = None) -> Split | None:
    """The split at total ``flow`` [m^3/s] and properties ``pr``, or None where there is none to solve (one
    channel, or no plenum: ``plenum_length`` zero leaves no header, and the flow is taken as even).

    Both header-friction forms are solved together (:func:`hydraulics.manifold.solve_split_forms`: one Newton
    iteration on the two systems stacked, each answer the one solve_split gives it).  ``start``: the split of the
    same plate at a neighbouring operating point, whose two forms start this one's; without it both start even."""
    if passage.count < 2 or passage.plenum_length <= 0:
        return None
    starts = start.forms if start is not None and start.forms else None
    try:
        both = solve_split_forms(build_manifold(passage, plate, geom, pr, model), (None, math.inf), flow, pr.rho,
                                 pr.mu, starts)
    except ManifoldError as exc:
        raise SolveError(f"the flow split across the channels could not be solved: {exc}") from None
    flows = min(both, key=lambda m: m.min_to_mean)
    drop = max(both, key=lambda m: m.port_to_port)
    return Split(flows=flows, drop=drop, forms=both)


def least_fed_loop(m: ManifoldResult) -> tuple[int, float, float]:
    """The least-fed channel's index and its loop's header parts [Pa]: the inlet header's drop from the port to
    the channel, and the outlet header's from the channel to the port (each may be negative: recovery)."""
    i = int(np.argmin(m.channel_flows))
    inlet = -float(m.inlet_pressure[i])
    outlet = float(m.outlet_pressure[i]) + m.port_to_port
    return i, inlet, outlet
