"""The design check's physics over arrays of candidate plates at once (numpy).

One physics, two evaluation modes.  Every step calls the same function the one-design check
(:func:`coldplate.solve.solve_plate`) calls, with arrays instead of floats:

* coolant outlet from the enthalpy balance H(T_out) = H(T_in) + Q/ṁ and properties at the bulk mean
  temperature: :class:`~coldplate.sizing.proptable.PropertyTable` (CoolProp, tabulated once per run);
* channel geometry: :func:`coldplate.passages.channels.wall_thickness`, ``channel_length``,
  :func:`hydraulics.ducts.hydraulic_diameter_rectangle`, :func:`~hydraulics.ducts.aspect_ratio`;
* velocity, Reynolds number, friction and Nusselt number: :func:`coldplate.solve.passage_flow` (the check's
  own step: :func:`hydraulics.friction.darcy_friction`, :func:`coldplate.convection.nusselt`), and
  :func:`coldplate.solve.friction_pressure_drop`;
* back side: :func:`coldplate.passages.channels.fin_areas` (fin efficiency of the walls);
* the local coefficient along the march: :func:`coldplate.plate.convection.nusselt_local` at the check's
  march grid (:func:`coldplate.plate.solve.march_grid`, ``path_position``), the walls' fin efficiency at
  that coefficient;
* spreading and the march for the hottest point: :class:`~coldplate.sizing.platetable.PlateTable`
  (the series :func:`coldplate.conduction.spreading_MCY` at tabulated h_eff, the base's axial change with the
  local back side, the check's march points);
* minor losses: :func:`coldplate.passages.channels.loss_coefficients` (fluids' Rennels formulas).
* tubes: the tube module's ``geometry``, ``conduction_parts`` (per base thickness), ``convection`` and
  ``bend_loss_coefficient`` (arrays over flows), the same functions its ``back_side`` and ``minor_losses``
  use.

Candidates are given as axes that broadcast: geometry arrays of length G (count, width, depth — or
inner diameter and passes for a tube), base thicknesses (Nt) and flows (Nq); the result arrays have shape
(G, Nt, Nq).  Work that depends on fewer axes is done on fewer elements (friction and Nusselt on G × Nq,
the local coefficient and back side on G × Nq × grid points, the spreading series per base thickness and
h_eff node); what is left per candidate is the interpolation and the base's axial change at each march point,
done by :meth:`PlateTable.rises` for all bases of a block of geometries at once (about half a million channel-plate
candidates a second of processor time, 0.3 to 0.5 million a second of wall time on the shared 2-core
development machine; ``benchmarks/sizing.py``).  Tubes loop over geometries and base thicknesses in Python
(tube searches are small) and are vectorised over flows.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace
from types import SimpleNamespace

import numpy as np

from hydraulics.coolant import enthalpy
from hydraulics.ducts import RE_LAMINAR_END, RE_TURBULENT_START, aspect_ratio, hydraulic_diameter_rectangle
from hydraulics.manifold import solve_split_batch

from coldplate.plate import conduction
from coldplate.design.reader import Design
from coldplate.design.errors import DesignError
from coldplate.plate.passages import channels as channel_passage
from coldplate.plate.passages import tube as tube_passage
from coldplate.plate.convection import nusselt_local
from coldplate.plate.solve import friction_pressure_drop, passage_flow, path_position
from coldplate.plate.flow import passage_friction
from coldplate.plate.split import channel_positions, port_offsets
from coldplate.sizing.platetable import PlateTable
from coldplate.sizing.proptable import PropertyTable

#: Keep the bulk outlet this far below the boiling point / end of the property data [K].
TOP_MARGIN_K = 0.5
#: Elements (geometries × flows × march points) of the local-coefficient arrays formed at once.
LOCAL_BLOCK = 1 << 20
#: Geometry-and-flow rows of one batched flow-split solve (its Jacobians are rows × (N + 1)² floats).
SPLIT_BLOCK = 2048
#: Flow axes with at most this many solvable flows get the exact split at every flow (see ``Evaluator.splits``):
#: short axes are cheap, and on them a design that meets a limit to the last digit is still found
#: (tests/test_sizing_search.py).
SPLIT_EXACT_FLOWS = 8
#: Going down the flow axis, the next node of the exact split is the first flow at most this fraction of the node
#: above: 6 nodes on the sizing example's 59 flows (0.3 gave 4 nodes, about as fast in the whole search on the
#: shared machine and more pessimistic; see DEVELOPERS.md "Sizing").
SPLIT_NODE_RATIO = 0.5
#: Round-off allowed when two nodes are compared for the monotonicity the interpolation relies on.
MONOTONE_TOLERANCE = 1e-9
#: Taken off the least-fed share between two nodes in the friction's blend: about three times the deepest dip
#: below the lesser node measured on the examples' geometries at SPLIT_NODE_RATIO 0.5 (0.0082 on the laser-mount
#: sizing example's, 0.0092 on the reagent block's; at 0.3 the dips reached 0.0205: a wider ratio needs a wider
#: margin).  Held by tests/test_sizing_split_nodes.py.
BLEND_SHARE_MARGIN = 0.03


@dataclass(frozen=True)
class Evaluation:
    """Arrays of shape (G, Nt, Nq) (SI, kelvin), one element per candidate."""

    R_th: np.ndarray  #: (hottest mounting face − inlet) / load [K/W]; NaN where the coolant would boil
    T_face: np.ndarray  #: hottest mounting face [K]
    dp: np.ndarray  #: plate pressure drop [Pa]
    T_out: np.ndarray  #: outlet [K]
    velocity: np.ndarray  #: mean velocity in the passage [m/s]
    Re: np.ndarray
    flow: np.ndarray  #: volumetric flow at the inlet [m^3/s]
    solvable: np.ndarray  #: False where the coolant would boil or leave the property data


class Evaluator:
    """Everything fixed during a search (plate outline, footprint, load, coolant, inlet), built once.

    ``design`` is the design file's design; the candidates replace its passage sizes, base and flow.
    ``passages``: the passage kinds accepted (the search sizes channels and tubes; the uncertainty band's rows
    also take a cavity, through their own stages on the shared tables); ``wall_viscosity``: the caller iterates
    Sieder-Tate's wall viscosity itself (the band's rows do; the search's stages do not, so it refuses it).
    """

    def __init__(self, design: Design, passages: tuple[str, ...] = ("channels", "tube"),
                 wall_viscosity: bool = False):
        d = self.design = design
        if d.model.laminar == "sieder-tate" and not wall_viscosity:
            raise DesignError("[correlations] laminar", "sieder-tate needs each candidate's wall temperature; "
                                                        "size with another laminar model")
        if d.passage.kind not in passages:
            raise DesignError("[passage] kind", f"sizing covers channels and tube passages, not {d.passage.kind}")
        self.Q = d.heat.load
        self.T_in = d.inlet_temperature
        self.p = d.supply.line_pressure
        c = d.coolant
        self.T_top = c.upper_limit(self.p) - TOP_MARGIN_K
        if self.T_top <= self.T_in + TOP_MARGIN_K:
            raise DesignError("[coolant] inlet_temperature", "is within a kelvin of boiling or of the end of the "
                                                             "property data: no flow can carry heat away")
        self.rho_in = c.props(self.T_in, self.p).rho
        self.H_in = enthalpy(c, self.T_in, self.p)
        self.props = PropertyTable(c, self.p, self.T_in, self.T_top)
        self.plate = PlateTable.for_design(d)
        self.A_cool = self.plate.area  # the back side is smeared over the cooled length between the plenums
        self.R_int = conduction.R_interface(d.interface.resistance_area,
                                            d.heat.footprint_length * d.heat.footprint_width)

    # ---------------------------------------------------------------- shared stages

    def coolant(self, flow):
        """Outlet, bulk-mean properties and the coolant's rise per watt for flows [m^3/s] (any shape)."""
        flow = np.asarray(flow, dtype=float)
        m_dot = self.rho_in * flow  # the volumetric flow is taken at inlet conditions
        T_out = self.props.temperature(self.H_in + self.Q / m_dot)
        solvable = np.isfinite(T_out) & (T_out < self.T_top)
        T_out = np.where(solvable, T_out, np.nan)
        pr = self.props.at(np.where(solvable, 0.5 * (self.T_in + T_out), self.T_in))
        return SimpleNamespace(m_dot=m_dot, T_out=T_out, pr=pr, s=(T_out - self.T_in) / self.Q, ok=solvable)

    def _finish(self, R_plate, dp, st, V, Re, shape):
        R_th = R_plate + self.R_int
        full = lambda a: np.broadcast_to(a, shape)  # noqa: E731
        ok = full(st.ok) & np.isfinite(R_th)
        dp = np.where(st.ok, dp, np.nan)
        return Evaluation(R_th=full(R_th), T_face=full(self.T_in + self.Q * R_th), dp=full(dp),
                          T_out=full(st.T_out), velocity=full(V), Re=full(Re), flow=full(st.flow), solvable=ok)

    # ---------------------------------------------------------------- channels

    def channels(self, count, width, depth, base, flow) -> Evaluation:
        """Channel plates: ``count``, ``width``, ``depth`` 1-D of length G; ``base`` (Nt,), ``flow`` (Nq,)."""
        d = self.design
        n = np.asarray(count, dtype=float).reshape(-1, 1, 1)
        w = np.asarray(width, dtype=float).reshape(-1, 1, 1)
        dep = np.asarray(depth, dtype=float).reshape(-1, 1, 1)
        base = np.atleast_1d(np.asarray(base, dtype=float))
        flow = np.atleast_1d(np.asarray(flow, dtype=float))
        st = self.coolant(flow.reshape(1, 1, -1))
        st.flow = flow.reshape(1, 1, -1)
        pr = st.pr
        passage = SimpleNamespace(count=n, width=w, depth=dep, plenum_length=d.passage.plenum_length)
        wall = channel_passage.wall_thickness(passage, d.plate)
        L = channel_passage.channel_length(passage, d.plate)
        D_h = hydraulic_diameter_rectangle(w, dep)
        alpha = aspect_ratio(w, dep)
        area = n * w * dep
        shape = (n.shape[0], 1, flow.size)
        # the flow split per geometry and flow (the check's own header network): the least-fed channel sets the
        # heat transfer and the coolant's rise, the port-to-port drop the pressure
        share, port_to_port = self.splits(n.ravel(), w.ravel(), dep.ravel(), st)
        m_heat = st.m_dot * share
        V, Re, f, h = (np.empty(shape) for _ in range(4))
        # the heated-wall arrangement follows each channel's shape: one call per arrangement
        heated = channel_passage.heated_walls(w, dep).ravel()
        for kind in np.unique(heated):
            rows = heated == kind
            V[rows], Re[rows], fr, _, h[rows] = passage_flow(
                m_heat[rows], pr, area[rows], D_h[rows], alpha[rows], "rectangle", L, L, str(kind),
                d.passage.roughness / D_h[rows], d.model)
            f[rows] = fr.f
        _, effective, _, _ = channel_passage.fin_areas(n, w, dep, L, wall, d.plate.conductivity, h)
        h_eff = effective * h / self.A_cool  # 1 / (A_cool R_below), R_below = 1 / (h A_effective)
        G, Nq, P = n.shape[0], flow.size, self.plate.xg.size
        x = path_position(self.plate.xg, self.plate.a, self.plate.segments, SimpleNamespace(single_pass=True))
        R_plate = np.empty((G, base.size, Nq))
        step = max(1, LOCAL_BLOCK // (Nq * P))
        for a in range(0, G, step):
            blk = slice(a, a + step)
            r_x = np.empty((min(step, G - a), Nq, P))
            kinds = heated[blk]
            for kind in np.unique(kinds):
                rows = np.flatnonzero(kinds == kind) + a
                e = lambda v: v[rows][..., None] if np.ndim(v) else v  # noqa: E731  (g, 1, 1, 1): march points last
                cv_x = nusselt_local(Re[rows][..., None], pr.Pr[..., None], x, e(L), e(D_h), e(alpha),
                                     laminar=d.model.laminar, turbulent=d.model.turbulent, heated=str(kind),
                                     rel_roughness=d.passage.roughness / e(D_h))
                h_x = np.asarray(cv_x.Nu) * pr.k[..., None] / e(D_h)
                _, eff_x, _, _ = channel_passage.fin_areas(e(n), e(w), e(dep), e(L), e(wall), d.plate.conductivity,
                                                           h_x)
                r_x[rows - a] = (self.A_cool / (h_x * eff_x))[:, 0]
            s_blk = np.broadcast_to(st.s / share, shape)[blk, 0, :]
            R_plate[blk] = np.moveaxis(self.plate.rises(base, h_eff[blk, 0, :], s_blk, r_x), -1, 1)
        dp = friction_pressure_drop(f, L, D_h, pr.rho, V)
        dyn = 0.5 * pr.rho * V**2
        dyn_mean = 0.5 * pr.rho * (st.m_dot / (pr.rho * area))**2
        split = np.isfinite(port_to_port)
        dp = np.where(split, port_to_port, dp)
        for name, K, ratio in channel_passage.loss_coefficients(n, w, dep, d.plate.width, d.passage.port_diameter,
                                                                d.passage.plenum_depth):
            if name in channel_passage.PORT_LOSSES:
                dp = dp + K * ratio**2 * np.where(split, dyn_mean, dyn)
            else:  # a channel's own loss: inside the port-to-port drop where there is a split
                dp = dp + np.where(split, 0.0, K * ratio**2 * dyn)
        return self._finish(R_plate, dp, st, V, Re, (n.shape[0], base.size, flow.size))

    def splits(self, count, width, depth, st):
        """The flow split for each geometry (1-D arrays of length G) at each flow: the least channel flow over
        the mean and the port-to-port drop [Pa], arrays (G, 1, Nq).  Share 1 and drop NaN where there is no
        split (one channel, no plenum) or the coolant would boil.

        Solved exactly (:meth:`_solve_splits`) only at the nodes of the flow axis (:func:`split_nodes`: the top
        solvable flow, then every flow that is at most ``SPLIT_NODE_RATIO`` of the node above, and the lowest);
        a flow between two nodes takes the lesser of the two nodes' shares and the drop of the node above scaled
        down by the flow ratio to the first power.  Why that errs toward a hotter face and a higher pressure
        (measured on the examples' geometries, ``tests/test_sizing_split_nodes.py``): the drop falls at least in
        proportion to the flow (laminar friction ~Q, developing and turbulent flow and the headers faster, and a
        lower flow runs warmer, thinner water); the least-fed share mostly falls as the flow rises (header
        momentum ~Q² against channel friction ~Q to Q^1.75) but rises at low flows where the headers' laminar
        friction (~Q) leads (offset ports): a rise then a fall has its least at an end of the interval, so the
        lesser node share bounds it.  Only in the friction's laminar-turbulent blend does the share dip between
        its nodes (friction rising with Re evens the split, then turbulence ends it): there the lesser node share
        is lowered by ``BLEND_SHARE_MARGIN``.  Where a node is unsolved or the drop falls slower than the flow
        between two nodes, every flow between them is solved exactly.  With few flows (at most
        ``SPLIT_EXACT_FLOWS``: refinement, single checks) every flow is a node."""
        d = self.design
        G = count.size
        full = st.m_dot.shape
        ok = np.broadcast_to(st.ok, full).ravel()
        mdot = st.m_dot.ravel()
        Nq = mdot.size
        share = np.ones((G, 1, Nq))
        drop = np.full((G, 1, Nq), np.nan)
        if d.passage.plenum_length <= 0:
            return share, drop
        wall = (d.plate.width - count * width) / (count + 1)
        fits = (count >= 2) & np.isfinite(width) & np.isfinite(depth) & (width > 0) & (depth > 0) & (wall > 0)
        share[~fits & (count >= 2)] = np.nan   # off the plate (a refinement's trial step): not solvable
        g_fit = np.flatnonzero(fits)
        if not g_fit.size or not ok.any():
            return share, drop
        Qv = mdot / self.rho_in  # the volumetric flow at the inlet, the axis the nodes are taken on
        nodes = split_nodes(Qv, ok)
        most = np.full((G, 1, Nq), np.nan)  # the best-fed channel's flow over the mean, at the nodes
        self._solve_splits(count, width, depth, st, (share, drop, most), *_pairs(g_fit, nodes))
        if nodes.size == np.count_nonzero(ok):
            return share, drop
        # every solvable flow between two nodes (ascending by flow): the node above it, and the node below
        order = np.flatnonzero(ok)[np.argsort(Qv[ok], kind="stable")]
        is_node = np.isin(order, nodes)
        pos, j = np.flatnonzero(is_node), np.arange(order.size)
        above = order[pos[np.searchsorted(pos, j)]]  # the top and the lowest flow are nodes: both exist
        below = order[pos[np.searchsorted(pos, j, side="right") - 1]]
        between = ~is_node
        q_b, up, lo = order[between], above[between], below[between]
        sh_up, sh_lo = share[g_fit][:, 0, up], share[g_fit][:, 0, lo]
        dr_up, dr_lo = drop[g_fit][:, 0, up], drop[g_fit][:, 0, lo]
        ratio_nodes = Qv[lo] / Qv[up]
        # Reynolds numbers of the channels: the least-fed one at the node below, the best-fed one at the node
        # above (the larger of the two nodes' best-fed shares).  Where the span between reaches into the
        # friction's laminar-turbulent blend, friction rising with Re makes the split MORE even as the flow rises
        # (measured: up to +0.5 % of share from one flow step to the next on the laser example's geometries) and
        # the share dips below both nodes (see BLEND_SHARE_MARGIN): there the interval takes
        # the lesser of its two nodes' shares less ``BLEND_SHARE_MARGIN``.
        mu = np.broadcast_to(st.pr.mu, full).ravel()
        D_h = hydraulic_diameter_rectangle(width[g_fit], depth[g_fit])[:, None]
        Re_mean = mdot[None, :] * D_h / (mu[None, :] * count[g_fit][:, None] * width[g_fit][:, None]
                                         * depth[g_fit][:, None])
        Re_least_lo = np.minimum(sh_lo, sh_up) * Re_mean[:, lo]
        Re_most_up = np.maximum(most[g_fit][:, 0, up], most[g_fit][:, 0, lo]) * Re_mean[:, up]
        blend = (Re_most_up >= RE_LAMINAR_END) & (Re_least_lo <= RE_TURBULENT_START)
        solved = np.isfinite(sh_up) & np.isfinite(sh_lo) & np.isfinite(dr_up) & np.isfinite(dr_lo)
        falls = dr_lo <= dr_up * ratio_nodes * (1.0 + MONOTONE_TOLERANCE)
        trusted = solved & falls
        ratio = Qv[q_b] / Qv[up]
        gi, qi = np.nonzero(trusted)
        share[g_fit[gi], 0, q_b[qi]] = (np.minimum(sh_lo[gi, qi], sh_up[gi, qi])
                                        - np.where(blend[gi, qi], BLEND_SHARE_MARGIN, 0.0))
        # the drop: the node above's scaled down by the flow ratio to the first power, the least any part of it
        # falls with the flow (a chord on log axes was tried: 0.2 % low in places where the exponent passes 2 in
        # the blend and falls back)
        drop[g_fit[gi], 0, q_b[qi]] = dr_up[gi, qi] * ratio[qi]
        gi, qi = np.nonzero(~trusted)  # the nodes contradict the assumptions here: exact
        if gi.size:
            self._solve_splits(count, width, depth, st, (share, drop, most), g_fit[gi], q_b[qi])
        return share, drop

    def _solve_splits(self, count, width, depth, st, out, gg, qq):
        """The exact split for the geometry-and-flow pairs (gg, qq), written into ``out``: the least channel
        flow over the mean, the port-to-port drop and the greatest channel flow over the mean, arrays (G, 1, Nq).
        The check's own header network (:mod:`coldplate.plate.split`: its positions, headers and channel losses,
        the same friction through ``passage_friction``), solved for every pair at once by
        :func:`hydraulics.manifold.solve_split_batch` (rows grouped by channel count and where the ports fall
        among the channels), both header-friction forms, the less even split and the higher drop kept."""
        d = self.design
        pr = st.pr
        full = st.m_dot.shape
        rho, mu = (np.broadcast_to(getattr(pr, k), full).ravel() for k in ("rho", "mu"))
        mdot = st.m_dot.ravel()
        if not gg.size:
            return
        # the channel positions and where the ports fall among them, once per geometry (not per pair)
        positions, key_of = {}, {}
        for g in np.unique(gg):
            passage = replace(d.passage, count=int(count[g]), width=float(width[g]), depth=float(depth[g]))
            y = positions[g] = np.asarray(channel_positions(passage, d.plate))
            key_of[g] = (int(count[g]),) + tuple(int(np.searchsorted(y, port, side)) for port in port_offsets(passage)
                                                 for side in ("left", "right"))
        keys = {}
        for i, g in enumerate(gg):
            keys.setdefault(key_of[g], []).append(i)
        blocks = [(c, np.asarray(rows[i:i + SPLIT_BLOCK])) for (c, *_), rows in keys.items()
                  for i in range(0, len(rows), SPLIT_BLOCK)]
        for c, rows in blocks:
            g, q = gg[rows], qq[rows]
            y = np.array([positions[k] for k in g])
            w, dep = width[g][:, None], depth[g][:, None]
            L = d.plate.length - 2.0 * d.passage.plenum_length
            D_h, alpha = hydraulic_diameter_rectangle(w, dep), aspect_ratio(w, dep)
            K = sum(np.asarray(Kc) * ratio**2 for name, Kc, ratio in channel_passage.loss_coefficients(
                c, w, dep, d.plate.width, d.passage.port_diameter, d.passage.plenum_depth)
                if name not in channel_passage.PORT_LOSSES)
            props = SimpleNamespace(rho=rho[q][:, None], mu=mu[q][:, None])

            def dp_channels(Q, r, w=w, dep=dep, D_h=D_h, alpha=alpha, K=K, props=props):
                pr_r = SimpleNamespace(rho=props.rho[r], mu=props.mu[r])
                V, _, fr = passage_friction(pr_r.rho * Q, pr_r, w[r] * dep[r], D_h[r], alpha[r], "rectangle", L,
                                            d.passage.roughness / D_h[r])
                return friction_pressure_drop(np.asarray(fr.f), L, D_h[r], pr_r.rho, V) + K[r] * 0.5 * pr_r.rho * V**2

            depth_h = np.full(rows.size, d.passage.plenum_depth) if d.passage.plenum_depth is not None else depth[g]
            both = [solve_split_batch(d.plate.width, depth_h, d.passage.plenum_length, d.passage.roughness, y,
                                      *port_offsets(d.passage), dp_channels, mdot[q] / rho[q],
                                      rho[q], mu[q], friction_length=fl) for fl in (None, math.inf)]
            # a row without a split (not converged: NaN) is a candidate that cannot be solved, as in the check
            share, drop, most = out
            share[g, 0, q] = np.minimum(both[0].min_to_mean, both[1].min_to_mean)
            drop[g, 0, q] = np.maximum(both[0].port_to_port, both[1].port_to_port)
            most[g, 0, q] = np.maximum(*(np.max(b.channel_flows, axis=1) / np.mean(b.channel_flows, axis=1)
                                         for b in both))


    # ---------------------------------------------------------------- tubes

    def tubes(self, inner_diameter, passes, base, flow) -> Evaluation:
        """Serpentine tube plates: ``inner_diameter``, ``passes`` 1-D of length G; ``base`` (Nt,), ``flow`` (Nq,).

        The tube's wall thickness, bend radius, material and bond stay those of the design file.
        """
        d = self.design
        di_all = np.atleast_1d(np.asarray(inner_diameter, dtype=float))
        np_all = np.atleast_1d(np.asarray(passes)).astype(int)
        base = np.atleast_1d(np.asarray(base, dtype=float))
        flow = np.atleast_1d(np.asarray(flow, dtype=float))
        G, Nt, Nq = di_all.size, base.size, flow.size
        st = self.coolant(flow)
        st.flow = flow.reshape(1, 1, -1)
        pr = st.pr
        wall = 0.5 * (d.passage.outer_diameter - d.passage.inner_diameter)
        R_plate = np.full((G, Nt, Nq), np.nan)
        dp = np.full((G, 1, Nq), np.nan)
        V_all = np.full((G, 1, Nq), np.nan)
        Re_all = np.full((G, 1, Nq), np.nan)
        for g in range(G):
            passage = replace(d.passage, inner_diameter=float(di_all[g]), outer_diameter=float(di_all[g] + 2 * wall),
                              passes=int(np_all[g]))
            geom = tube_passage.geometry(passage, d.plate)
            V, Re, fr, _, h = passage_flow(st.m_dot, pr, geom.n_parallel * geom.flow_area, geom.D_h, geom.alpha,
                                           geom.shape, geom.path_length, geom.heated_length, geom.heated,
                                           geom.rel_roughness, d.model)
            f = np.asarray(fr.f)
            dp[g, 0] = (friction_pressure_drop(f, geom.path_length, geom.D_h, pr.rho, V)
                        + tube_passage.bend_loss_coefficient(passage, f, Re) * 0.5 * pr.rho * V**2)
            V_all[g, 0], Re_all[g, 0] = V, Re
            r_conv = tube_passage.convection(passage, geom, h)[0]
            x = path_position(self.plate.xg, self.plate.a, self.plate.segments, geom)
            cv_x = nusselt_local(np.asarray(Re)[:, None], pr.Pr[:, None], x, geom.heated_length, geom.D_h,
                                 geom.alpha, shape=geom.shape, laminar=d.model.laminar, turbulent=d.model.turbulent,
                                 heated=geom.heated, rel_roughness=geom.rel_roughness)
            r_conv_x = tube_passage.convection(passage, geom, np.asarray(cv_x.Nu) * pr.k[:, None] / geom.D_h)[0]
            for b, t in enumerate(base):
                fixed = sum(r for _, r in tube_passage.conduction_parts(passage, replace(d.plate, base=float(t)),
                                                                         geom))
                R_plate[g, b] = self.plate.rise(float(t), 1.0 / (self.A_cool * (fixed + r_conv)), st.s,
                                                self.A_cool * (fixed + r_conv_x), single_pass=geom.single_pass)
        return self._finish(R_plate, dp, st, V_all, Re_all, (G, Nt, Nq))


def split_nodes(flow, ok):
    """Indices of the flows (1-D, [m^3/s]) at which :meth:`Evaluator.splits` solves the split exactly: every
    solvable flow when there are at most ``SPLIT_EXACT_FLOWS`` of them; otherwise the top one, going down every
    flow at most ``SPLIT_NODE_RATIO`` times the last node, and the lowest one (so every flow has a node above and
    below it)."""
    idx = np.flatnonzero(ok)
    if idx.size <= SPLIT_EXACT_FLOWS:
        return idx
    idx = idx[np.argsort(flow[idx], kind="stable")]
    nodes = [idx[-1]]
    for j in idx[-2::-1]:
        if flow[j] <= SPLIT_NODE_RATIO * flow[nodes[-1]]:
            nodes.append(j)
    if nodes[-1] != idx[0]:
        nodes.append(idx[0])
    return np.asarray(nodes[::-1])


def _pairs(g, q):
    gg, qq = np.meshgrid(g, q, indexing="ij")
    return gg.ravel(), qq.ravel()
