"""The design as a field: from a :class:`~coldplate.design.reader.Design` to the 3-D solve of
:mod:`coldplate.plate.field`, and back to a :class:`~coldplate.plate.result.Result` (``model="field"``).

The operating point is the network's (:func:`coldplate.plate.solve.operating_point`): the coolant's
properties at the bulk mean temperature iterated with the outlet, the flow's Reynolds number, friction and
mean Nusselt number, the pressure drop and the room air are the same numbers in both models.  What the field
changes is the plate:

- **channels**: the walls resolved as metal between the channels, each wetted face at the local coefficient
  h(x) of its own channel (``convection.nusselt_local``, the corrected local correlations the march uses, at
  the distance from the channel's entry), the channels over the cooled length only (``geometry.cooled_offset``
  from each end): over the plenums the plate is base alone with no cooling (the plenum's water would cool it:
  a hotter face).  The wall tips and the channel roofs are adiabatic (the lid unheated, as in the network).
  ``channel_flows`` [m³/s per channel, at inlet conditions] gives each channel its own Re, h(x) and m·cp
  (by default the flow split the operating point solved through the plenums, where the design has plenums);
  without it the flow is shared equally.
- **tube**: each pass a lane under the base along the whole plate length, the groove's footprint (the tube's
  outer diameter) passing heat through the bond, the tube wall and the film in series, per metre of tube as
  ``passages.tube`` writes them, at the local coefficient at the pass's distance along the path (return bends
  counted in that distance, no re-development after a bend: the lower coefficient); the passes are one path in
  series, each with its own water temperature.  The plate between the passes is resolved by the field (the
  network's strip term is not added).
- **cavity**: the plate's underside is the cavity's roof at the local film coefficient along x, the coolant
  marched along x across the whole width.

Each source keeps its own interface (``Source.interface``) on the device side.  The result's temperatures
are the field's; ``resistances`` splits R_th at the hottest point into the hottest source's interface, the
coolant's rise under that point and the plate with its passage (the rest, from the field).
"""
from __future__ import annotations

import math
from typing import TYPE_CHECKING, Sequence

import numpy as np

from coldplate.plate import field as F
from coldplate.plate.convection import nusselt_local
from coldplate.plate.fieldgrid import GridRules, channel_walls
from coldplate.plate.passages import tube
from coldplate.plate.result import Profile, Result, source_outcomes
from coldplate.plate.solve import OperatingPoint, operating_point, passage_flow

if TYPE_CHECKING:
    from coldplate.design.reader import Design

#: Shortest distance from a passage's entry at which the local coefficient is evaluated [m] (the entry's
#: coefficient is unbounded; the field's cell means never sample the entry itself).
ENTRY_FLOOR = 1e-6


def field_sources(design: Design, load: float) -> tuple[F.FieldSource, ...]:
    """The design's sources as the field's, their loads scaled to ``load`` [W] (one source: ``load`` itself,
    as the modules' solve passes the hot-side heat of a design whose source load is not given)."""
    srcs = design.sources
    total = sum(s.load for s in srcs)
    if len(srcs) == 1 or not math.isfinite(total) or total <= 0:
        loads = [load] if len(srcs) == 1 else [load * s.area / sum(o.area for o in srcs) for s in srcs]
    else:
        loads = [s.load * load / total for s in srcs]
    return tuple(F.FieldSource(s.name, float(q), s.size, s.at, s.interface) for s, q in zip(srcs, loads))


class _Local:
    """The local coefficient of one coolant lane: h(x) [W/(m² K)] and Nu(x) at plate positions x [m]."""

    def __init__(self, d: Design, op: OperatingPoint, Re: float, cv, path):
        self.d, self.op, self.Re, self.cv, self.path = d, op, Re, cv, path

    def nusselt(self, x):
        d, op, g = self.d, self.op, self.op.geom
        s = np.maximum(self.path(np.asarray(x, float)), ENTRY_FLOOR)
        return nusselt_local(self.Re, op.props.Pr, s, g.heated_length, g.D_h, g.alpha, shape=g.shape,
                             laminar=d.model.laminar, turbulent=d.model.turbulent, heated=g.heated,
                             mu_ratio=op.mu_ratio, rel_roughness=g.rel_roughness, mean=self.cv)

    def h(self, x):
        return np.asarray(self.nusselt(x).Nu, float) * self.op.props.k / self.op.geom.D_h


def _channels(d: Design, op: OperatingPoint, channel_flows):
    g, p = op.geom, d.passage
    off = g.cooled_offset
    span = (off, d.plate.length - off) if off > 0 else None
    L_cool = d.plate.length - 2.0 * off
    # distance from the channels' entry (over a plenum, where no channel runs, the nearest channel end's)
    entry = lambda x: np.clip(x - off, 0.0, L_cool)  # noqa: E731
    if channel_flows is None:
        locals_ = [_Local(d, op, op.Re, op.cv, entry)] * p.count
        mass = op.m_dot
    else:
        flows = np.asarray(channel_flows, float)
        if flows.shape != (p.count,) or not np.all(np.isfinite(flows) & (flows > 0)):
            raise ValueError(f"channel_flows needs {p.count} positive flows, one per channel")
        rho_in = op.m_dot / op.flow
        locals_, mass = [], []
        for q in flows:
            _, Re, _, cv, _ = passage_flow(rho_in * q, op.props, g.flow_area, g.D_h, g.alpha, g.shape,
                                           g.path_length, g.heated_length, g.heated, g.rel_roughness, d.model,
                                           op.mu_ratio)
            locals_.append(_Local(d, op, float(Re), cv, entry))
            mass.append(rho_in * q)
    cooling = F.ChannelCooling(count=p.count, width=p.width, depth=p.depth, mass_flow=mass, cp=op.props.cp,
                               inlet=op.T_in, h=[lc.h for lc in locals_], lid=0.0, span=span)
    centres = channel_walls(d.plate.width, p.count, p.width).mean(axis=1)
    return cooling, locals_, centres


def _tube(d: Design, op: OperatingPoint):
    p, g, L, W = d.passage, op.geom, d.plate.length, d.plate.width
    n, do = p.passes, p.outer_diameter
    pitch = 2.0 * (p.bend_radius or 0.0)
    centres = (np.arange(n) - (n - 1) / 2) * pitch
    lanes = tuple((max(c - do / 2, -W / 2), min(c + do / 2, W / 2)) for c in centres)
    parts = dict(tube.conduction_parts(p, d.plate, g))
    r_fixed = (parts["bond"] + parts["tube wall"]) * g.heated_length  # [K m/W] per metre of tube
    bend = math.pi * (p.bend_radius or 0.0)
    locals_, us = [], []
    for k, (lo, hi) in enumerate(lanes):
        start = k * (L + bend)
        path = (lambda x, s0=start: s0 + x) if k % 2 == 0 else (lambda x, s0=start: s0 + L - x)
        lc = _Local(d, op, op.Re, op.cv, path)
        width = hi - lo

        def u(x, lc=lc, width=width):
            r_conv = tube.convection(p, g, lc.h(x))[0] * g.heated_length
            return 1.0 / ((r_fixed + r_conv) * width)

        locals_.append(lc)
        us.append(u)
    cooling = F.LaneCooling(lanes=lanes, u=us, mass_flow=op.m_dot, cp=op.props.cp, inlet=op.T_in, serpentine=True)
    return cooling, locals_, centres


def _cavity(d: Design, op: OperatingPoint):
    lc = _Local(d, op, op.Re, op.cv, lambda x: x)
    W = d.plate.width
    cooling = F.LaneCooling(lanes=((-W / 2, W / 2),), u=[lc.h], mass_flow=op.m_dot, cp=op.props.cp,
                            inlet=op.T_in, serpentine=False)
    return cooling, [lc], np.zeros(1)


COOLINGS = {"channels": _channels, "tube": lambda d, op, flows: _tube(d, op),
            "cavity": lambda d, op, flows: _cavity(d, op)}


def solve_plate_field(design: Design, flow: float | None = None, load: float | None = None, *,
                      channel_flows: Sequence[float] | None = None, level: int = F.DEFAULT_LEVEL,
                      rules: GridRules = GridRules(), uncertainty: bool = True) -> Result:
    """The plate alone at a volumetric flow [m³/s] and heat load [W] (the design's own when not given), solved
    as a field; the same call as :func:`coldplate.plate.solve.solve_plate`, so the modules' solve and the supply
    take either.  ``channel_flows`` [m³/s each]: a channel plate's split (default: equal shares); ``level``,
    ``rules``, ``uncertainty`` as in :func:`coldplate.plate.field.solve_field`."""
    d = design
    Q = d.heat.load if load is None else float(load)
    flow = d.flow if flow is None else float(flow)
    op = operating_point(d, flow, Q)
    if channel_flows is not None and d.passage.kind != "channels":
        raise ValueError("channel_flows is for channel plates")
    if channel_flows is None and op.split is not None:
        # the flow split through the plenums (coldplate.plate.split): each channel its own flow, Re, h(x) and m cp,
        # in the field's channel order (from y < 0 to y > 0, as the split lists them)
        channel_flows = op.result_fields()["channel_flows"]
    cooling, locals_, centres = COOLINGS[d.passage.kind](d, op, channel_flows)
    plate = F.FieldPlate(d.plate.length, d.plate.width, d.plate.base, d.plate.conductivity)
    sources = field_sources(d, Q)
    fr = F.solve_field(plate, sources, cooling, level=level, rules=rules, uncertainty=uncertainty)

    hot = max(range(len(fr.sources)), key=lambda i: fr.sources[i].face_max)
    x_hot, y_hot = fr.sources[hot].hottest_at
    lane = int(np.argmin(np.abs(centres - y_hot)))
    lc = locals_[lane]
    j = int(np.argmin(np.abs(fr.face_y - y_hot)))
    x_prof = fr.face_x
    T_top = fr.face[:, j]
    T_bulk = np.interp(x_prof, fr.bulk_x, fr.bulk[lane])
    T_bulk_hot = float(np.interp(x_hot, fr.bulk_x, fr.bulk[lane]))
    T_face_max = fr.hottest
    src = sources[hot]
    R_int = src.interface / src.area * src.load / Q
    R_th = (T_face_max - op.T_in) / Q
    R_cool = (T_bulk_hot - op.T_in) / Q
    parts = (("interface", R_int), ("plate and passage (field)", R_th - R_int - R_cool),
             ("coolant temperature rise", R_cool))
    cv_hot = lc.nusselt(np.array([x_hot]))
    Nu_hot = float(np.asarray(cv_hot.Nu, float).ravel()[0])
    return Result(
        **op.result_fields(), R_th=R_th, resistances=parts, T_face_max=T_face_max,
        T_plate_max=float(np.max(fr.face)), x_hot=float(x_hot), methods=op.methods(cv_hot.methods),
        profile=Profile(tuple(map(float, x_prof)), tuple(map(float, T_bulk)), tuple(map(float, T_top))),
        assumptions=assumptions(d, channel_flows is not None), load=Q,
        Nu_hot=Nu_hot, h_hot=Nu_hot * op.props.k / op.geom.D_h,
        model="field", sources=source_outcomes(fr, d.sources),
        coupling=tuple(tuple(map(float, row)) for row in fr.coupling),
        grid_uncertainty=float(fr.grid_uncertainty), field=fr,
    )


def assumptions(d: Design, split: bool) -> tuple[str, ...]:
    out = [
        "steady state; each heat source a rectangle of uniform flux on the mounting face where the design "
        "places it; the plate solved as a 3-D field of finite volumes (grid uncertainty from the grid a level "
        "coarser)",
        "the local heat transfer coefficient along the flow from the local correlations; coolant properties at "
        "the bulk mean temperature and the line pressure; flow given at inlet conditions",
        "the sides of the plate and the mounting face outside the sources are adiabatic (no heat to room air)",
    ]
    kind = d.passage.kind
    if kind == "channels":
        out.append("the channel walls resolved as metal; the wall tips and channel roofs adiabatic (lid unheated)")
        out.append("the flow split between channels as given by the manifold" if split
                   else "flow is shared evenly between channels")
        if getattr(d.passage, "plenum_length", 0.0):
            out.append("the plate over the plenums is base alone with no cooling")
    elif kind == "tube":
        out.append("the tube's passes in series, each with its own water temperature; the groove's footprint "
                   "(the tube's outer diameter) passes heat through bond, tube wall and film; the base keeps its "
                   "full thickness over the groove")
    else:
        out.append("flow spreads evenly across the cavity width")
    return tuple(out)
