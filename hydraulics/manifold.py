"""Flow split across the parallel channels of a plate: the inlet and outlet headers as a discrete network.

A channel plate feeds N parallel channels from an inlet header (a rectangular plenum running across the plate)
and collects them in an outlet header.  Each header is a line of segments between the channel take-offs; a
port feeds (or drains) its header at a given position across the plate, as an offset from the centre line
(positive toward the last channel).  Both ports on one side make a U arrangement, opposite sides a Z; a port
anywhere else is allowed too.  The headers are closed at both ends.

Discrete-element header model (the momentum form of Bajura & Jones 1976, written per segment as in the
discrete-element manifold analyses; the coefficient names are ours):

* along a segment of length dx between take-offs, Darcy-Weisbach friction at the segment's own flow::

      dp_friction = f (dx / D_h) rho V |V| / 2          [Pa], V = F / A [m/s], F the segment's flow [m^3/s]

  with f from :func:`hydraulics.friction.darcy_friction` for the rectangular header (laminar: Muzychka &
  Yovanovich's apparent friction over the header's length by default, the Shah & London f Re when fully
  developed; turbulent Petukhov or Colebrook; the VDI blend between);
* at a take-off the axial momentum changes.  A momentum balance on the header (Bajura & Jones 1976, from
  memory) gives ``dp = -(2 - theta) rho V dV``, theta the ratio of the branch fluid's axial velocity to the
  header velocity.  Across one take-off, with V_port and V_far the header velocities on the port side and the far
  side of it::

      p_far - p_port_side = -k rho (V_far^2 - V_port^2) / 2     [Pa],  k = 2 - theta

  In the dividing (inlet) header the branch fluid leaves with about the header's axial velocity, theta ~ 1,
  k_divide = 1: static pressure recovers as the header slows (Bernoulli's value).  In the combining (outlet)
  header the branch fluid arrives with no axial velocity, theta = 0, k_combine = 2: the header loses twice the
  dynamic head it gains.  These are the momentum-theory values (from memory); measured coefficients differ a
  little and are parameters.  A smaller k_divide (less recovery) and a larger k_combine raise the port-to-port
  drop, the direction the project's simplifications err in.
* each channel sees the header pressure on the far side of its own take-off (the side away from the port);
  the port node itself has no momentum term (the port's own entry or exit loss is the caller's minor loss).

The unknowns are the N channel flows and the port-to-port drop; the N loop equations (inlet header pressure at
the take-off - outlet header pressure at the discharge = the channel's drop at its own flow) and the mass
balance are solved by Newton's method with a finite-difference Jacobian (N + 1 columns of the headers' part,
array evaluations; the channels' part is diagonal, one call per channel) and a backtracking step that keeps every
channel flow positive.  Everything is SI: m, m^3/s, Pa, kg/m^3, Pa s.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from functools import lru_cache
from typing import Callable

import numpy as np

from hydraulics.ducts import aspect_ratio, fRe_rectangular_Shah_London, hydraulic_diameter_rectangle
from hydraulics.friction import DuctFriction, darcy_friction, duct_friction
from hydraulics.validity import Validity

#: Momentum coefficients k = 2 - theta of the dividing and combining header (momentum theory, theta = 1 and 0;
#: Bajura & Jones 1976, from memory).
K_DIVIDE = 1.0
K_COMBINE = 2.0

#: Newton's stopping rule: every loop residual below this fraction of the mean channel drop.
TOLERANCE = 1e-11
MAX_ITERATIONS = 60

HEADER_MODEL = Validity(
    method="Bajura & Jones",
    reference=(
        "Bajura, R.A., Jones, E.H. (1976) Flow distribution manifolds, J. Fluids Eng. 98(4):654-665 "
        "(momentum form of the header equations, dp = -(2 - theta) rho V dV, from memory); discrete per "
        "segment between take-offs; friction by Darcy-Weisbach at the segment's flow"
    ),
    bounds=(),   # the paper states no numeric range we can cite; the friction records carry theirs
)


class ManifoldError(ArithmeticError):
    """The flow split could not be solved (no convergence, or a channel would need reverse flow)."""


@dataclass(frozen=True)
class Header:
    """A rectangular plenum across the plate: ``length`` across the plate [m] (the header's axis), ``depth``
    normal to the plate [m], ``width`` along the channels' flow [m], wall roughness [m]."""

    length: float
    depth: float
    width: float
    roughness: float = 0.0

    def __post_init__(self):
        for name in ("length", "depth", "width"):
            value = getattr(self, name)
            if not (math.isfinite(value) and value > 0):
                raise ValueError(f"header {name} must be positive and finite, not {value!r}")
        if not (math.isfinite(self.roughness) and self.roughness >= 0):
            raise ValueError(f"header roughness must be >= 0, not {self.roughness!r}")

    @property
    def area(self) -> float:
        return self.depth * self.width

    @property
    def D_h(self) -> float:
        return float(hydraulic_diameter_rectangle(self.width, self.depth))

    @property
    def alpha(self) -> float:
        return float(aspect_ratio(self.width, self.depth))


@dataclass(frozen=True)
class LinearQuadraticChannel:
    """A channel whose drop is ``a Q + b Q |Q|`` [Pa]: a laminar (linear) part ``a`` [Pa s/m^3] and a quadratic
    part ``b`` [Pa s^2/m^6] (minor losses, entry and exit).  Callable as ``dp(Q)``, Q a float or an array."""

    a: float
    b: float = 0.0
    takes_arrays = True

    def __call__(self, Q):
        Q = np.asarray(Q, dtype=float)
        return self.a * Q + self.b * Q * np.abs(Q)


def laminar_channel(width, depth, length, mu, rho, K_minor=0.0) -> LinearQuadraticChannel:
    """A rectangular channel in fully developed laminar flow plus minor losses, as a
    :class:`LinearQuadraticChannel`.

    Darcy-Weisbach with the Shah & London f Re of the rectangle::

        dp = (f Re) mu L Q / (2 D_h^2 A) + K_minor rho Q |Q| / (2 A^2)     [Pa]

    width, depth, length [m], mu [Pa s], rho [kg/m^3], K_minor [-] (sum of the channel's minor-loss
    coefficients on its own velocity).
    """
    A = width * depth
    D_h = float(hydraulic_diameter_rectangle(width, depth))
    fRe = float(fRe_rectangular_Shah_London(aspect_ratio(width, depth)))
    return LinearQuadraticChannel(a=fRe * mu * length / (2.0 * D_h**2 * A), b=K_minor * rho / (2.0 * A**2))


@dataclass(frozen=True)
class Manifold:
    """The network: ``inlet`` and ``outlet`` headers, the channels' positions across the plate (offsets from the
    centre line [m], increasing), one drop function per channel (``dp_channel(Q) -> Pa``, called at positive
    flows; a single callable serves them all), the port offsets [m] and the momentum coefficients.

    ``friction_length`` [m] is the length over which the headers' laminar friction is taken as developing
    (Muzychka & Yovanovich's apparent friction in ``darcy_friction``): None, the default, takes the header's
    whole length, as if the flow developed from the port along the header, which gives more friction than a
    fully developed profile: always a higher port-to-port drop (the direction the project errs in) and, in a U
    arrangement, a less even split; in a Z the extra friction can offset the momentum terms and even the split
    out a little, so there the default is not guaranteed to err toward the starving channel.  ``math.inf``
    gives fully developed friction, the usual discrete-manifold assumption."""

    inlet: Header
    outlet: Header
    positions: tuple[float, ...]
    channels: tuple[Callable, ...]
    inlet_port: float = 0.0
    outlet_port: float = 0.0
    k_divide: float = K_DIVIDE
    k_combine: float = K_COMBINE
    friction_length: float | None = None

    def __post_init__(self):
        y = np.asarray(self.positions, dtype=float)
        if y.ndim != 1 or y.size < 2:
            raise ValueError("a manifold needs at least two channel positions")
        if not np.all(np.isfinite(y)) or np.any(np.diff(y) <= 0):
            raise ValueError("channel positions must be finite and strictly increasing")
        if len(self.channels) != y.size:
            raise ValueError(f"{len(self.channels)} channel drop functions for {y.size} channels")
        for name, header in (("inlet", self.inlet), ("outlet", self.outlet)):
            port = getattr(self, f"{name}_port")
            if not (math.isfinite(port) and abs(port) <= header.length / 2.0 * (1 + 1e-12)):
                raise ValueError(f"{name} port at {port!r} m lies outside its header (half-length "
                                 f"{header.length / 2.0:g} m)")
            if y[0] < -header.length / 2.0 * (1 + 1e-12) or y[-1] > header.length / 2.0 * (1 + 1e-12):
                raise ValueError(f"channels reach outside the {name} header")
        for name in ("k_divide", "k_combine"):
            if not (math.isfinite(getattr(self, name)) and getattr(self, name) >= 0):
                raise ValueError(f"{name} must be >= 0")
        if self.friction_length is not None and not self.friction_length > 0:
            raise ValueError(f"friction_length must be positive (math.inf: fully developed), not "
                             f"{self.friction_length!r}")

    @property
    def arrangement(self) -> str:
        """"U" (both ports on one side of the centre line), "Z" (opposite sides) or "centred" (a port on it)."""
        a, b = np.sign(self.inlet_port), np.sign(self.outlet_port)
        if a == 0 or b == 0:
            return "centred"
        return "U" if a == b else "Z"


def uniform_manifold(n, inlet, outlet, dp_channel, inlet_port=0.0, outlet_port=0.0, **k) -> Manifold:
    """N channels at equal pitch across the inlet header's length (centres at (i + 1/2) pitch from its edge),
    all with the same drop function."""
    pitch = inlet.length / n
    y = tuple(-inlet.length / 2.0 + (i + 0.5) * pitch for i in range(n))
    return Manifold(inlet, outlet, y, (dp_channel,) * n, inlet_port, outlet_port, **k)


@dataclass(frozen=True)
class ManifoldResult:
    """The solved split.  Pressures are relative to the inlet port [Pa]; positions [m] across the plate.

    ``channel_flows`` [m^3/s] per channel; ``min_to_mean`` the least channel flow over the mean;
    ``inlet_pressure`` the inlet header's pressure each channel sees, ``outlet_pressure`` the outlet header's;
    ``channel_drops`` each channel's drop at its flow; ``port_to_port`` the drop from inlet port to outlet port;
    ``inlet_header_drop`` / ``outlet_header_drop`` the largest pressure difference along each header;
    ``header_reynolds`` the largest segment Reynolds number of the inlet and of the outlet header (for the
    friction records' ranges);
    ``iterations`` Newton steps; ``residual`` the largest loop residual left [Pa]; ``methods`` the Validity
    records used (the header model and the friction correlations of the header segments)."""

    positions: np.ndarray
    channel_flows: np.ndarray
    inlet_pressure: np.ndarray
    outlet_pressure: np.ndarray
    channel_drops: np.ndarray
    port_to_port: float
    inlet_header_drop: float
    outlet_header_drop: float
    min_to_mean: float
    arrangement: str
    header_reynolds: tuple[float, float]
    iterations: int
    residual: float
    methods: tuple = field(default=())


class _HeaderLine:
    """One header as nodes (the channel take-offs and the port) and segments between them, precomputed: the
    geometry once per header and channel layout (:func:`_header_geometry`), the fluid's scales per solve."""

    def __init__(self, header: Header, y: np.ndarray, port: float, k: float, sign: float, rho, mu,
                 friction_length):
        g = _header_geometry(header, tuple(map(float, y)), float(port), float(k), float(sign), friction_length)
        self.__dict__.update(g)
        self.rho, self.mu = rho, mu
        self._M_momentum = g["_M_momentum_per_rho"] * rho
        self._friction_scale = (self.dx / self.D_h * rho / 2.0)[:, None]
        self._Re_scale = self.D_h * rho / mu

    def segment_flows(self, Q, total):
        """Flow through each segment toward +y [m^3/s]; ``sign`` +1 for the dividing header, -1 combining.
        ``Q`` is (N,) or (N, M): M flow sets at once, one per column."""
        port_left = self.port_left if np.ndim(Q) == 1 else self.port_left[:, None]
        return self.sign * (total * port_left - self.upto @ Q)

    def pressures(self, Q, total, records=False):
        """Header pressure each channel sees, relative to the port [Pa]; the friction records used (with
        ``records``, else none); the largest segment Reynolds number.  ``Q`` (N,) gives (N,) pressures; ``Q``
        (N, M), M flow sets as columns (the Newton step's finite-difference columns in one call), gives (N, M).
        Friction factors from the header's :class:`~hydraulics.friction.DuctFriction` (``darcy_friction``
        with the geometry held); the walk to each take-off by the two matrices of :func:`_walk`."""
        one = np.ndim(Q) == 1
        V = self.segment_flows(Q, total) / self.A
        V = V[:, None] if one else V
        Re = np.maximum(np.abs(V) * self._Re_scale, 1e-9)
        friction = self.friction(Re) * self._friction_scale * V * np.abs(V)            # toward +y
        p_far = self._M_friction @ friction + self._M_momentum @ (V * V)
        methods = self.friction.methods(Re) if records else ()
        return (p_far[:, 0] if one else p_far), methods, float(np.max(Re))


@lru_cache(maxsize=64)
def _header_geometry(header: Header, y: tuple, port: float, k: float, sign: float, friction_length) -> dict:
    """A header's nodes, segments and walk matrices for channels at ``y`` and the port at ``port`` (kept: a
    plate's headers keep their layout from one solve to the next; the arrays are read-only)."""
    y = np.asarray(y)
    nodes = np.union1d(y, [port])
    left = nodes[:-1]
    g = dict(k=k, sign=sign, nodes=nodes, channel_node=np.searchsorted(nodes, y),  # node index of each channel
             port_node=int(np.searchsorted(nodes, port)), dx=np.diff(nodes),
             upto=(y[None, :] <= left[:, None]).astype(float),    # channels at or left of each segment
             port_left=(port <= left).astype(float),              # the port at or left of each segment
             D_h=header.D_h, alpha=header.alpha, A=header.area, rel_rough=header.roughness / header.D_h,
             L=header.length if friction_length is None else friction_length)
    g["friction"] = duct_friction(float(g["L"]), float(g["D_h"]), float(g["alpha"]), "rectangle",
                                  float(g["rel_rough"]))
    # the walk from the port to each take-off is linear in the segments' friction terms and their squared
    # velocities: two fixed matrices (channels x segments), built by walking unit inputs
    S = g["dx"].size
    walk = lambda friction, V2: _walk(g["port_node"], g["channel_node"], k, friction, V2)  # noqa: E731
    g["_M_friction"] = walk(np.eye(S), np.zeros((S + 2, S)))
    g["_M_momentum_per_rho"] = walk(np.zeros((S, S)), np.concatenate((np.zeros((1, S)), np.eye(S),
                                                                      np.zeros((1, S)))))
    for a in g.values():
        if isinstance(a, np.ndarray):
            a.flags.writeable = False
    return g


def _walk(P, channel_node, k_rho, friction, V2):
    """Header pressure at each channel's take-off [Pa] from the segments' friction terms toward +y (S, M) [Pa]
    and the squared velocities padded with the closed ends (S + 2, M) [m^2/s^2], the port at node ``P``, the
    momentum coefficient times the density ``k_rho``: right of the port the far side of node n is its right
    segment, left of it its left segment (Bajura & Jones's momentum term at each take-off,
    k rho (V_far^2 - V_port^2) / 2)."""
    edge = np.zeros((1, friction.shape[1]))
    right = np.cumsum(-friction[P:] - k_rho * (V2[P + 2:] - V2[P + 1:-1]) / 2.0, axis=0)
    left = np.cumsum((friction[:P] - k_rho * (V2[:P] - V2[1:P + 1]) / 2.0)[::-1], axis=0)[::-1]
    return np.concatenate((left, edge, right))[channel_node]


def _drops(channels, Q):
    """Each channel's drop at its flow [Pa]; one array call when every channel has the same drop function and it
    says it takes arrays (an attribute ``takes_arrays`` that is true)."""
    if getattr(channels[0], "takes_arrays", False) and all(dp is channels[0] for dp in channels):
        return np.asarray(channels[0](np.asarray(Q, dtype=float)), dtype=float).reshape(-1)
    return np.array([float(dp(q)) for dp, q in zip(channels, Q)])


def solve_split(manifold: Manifold, total_flow: float, rho: float, mu: float,
                start: ManifoldResult | None = None) -> ManifoldResult:
    """Channel flows that balance the pressures around every loop, for ``total_flow`` [m^3/s] of a fluid of
    density ``rho`` [kg/m^3] and viscosity ``mu`` [Pa s] (one property set: the split is hydraulic).

    Newton starts from the even split, or from ``start``'s flows (scaled to ``total_flow``) and port-to-port drop:
    the solved split of a neighbouring problem (the same plate at a nearby flow) saves a step or two.  Give
    ``start`` only where the caller always solves the same sequence, so an answer never depends on what was solved
    before it (every start meets the same tolerance; the answers differ by round-off of it)."""
    return solve_split_forms(manifold, (manifold.friction_length,), total_flow, rho, mu, (start,))[0]


def _pressures_forms(lines, Qs, total, records):
    """The header pressures of K header-friction forms of one header (``lines``: their _HeaderLine, alike but for
    the friction), ``Qs`` one flow array per form ((N,) or (N, M) each): one array evaluation for all of them (the
    friction factors form by form).  Returns, per form, what :meth:`_HeaderLine.pressures` returns."""
    if len(lines) == 1:
        return [lines[0].pressures(Qs[0], total, records=records)]
    one = np.ndim(Qs[0]) == 1
    Q = np.concatenate([q[:, None] if one else q for q in Qs], axis=1)
    line = lines[0]
    V = line.segment_flows(Q, total) / line.A
    Re = np.maximum(np.abs(V) * line._Re_scale, 1e-9)
    width = Q.shape[1] // len(lines)
    f = _forms_friction(tuple(float(ln.L) for ln in lines), float(line.D_h), float(line.alpha),
                        float(line.rel_rough), width)(Re)
    p_far = line._M_friction @ (f * line._friction_scale * V * np.abs(V)) + line._M_momentum @ (V * V)
    out = []
    for k, ln in enumerate(lines):
        cols = slice(k * width, (k + 1) * width)
        p = p_far[:, cols]
        out.append((p[:, 0] if one else p, ln.friction.methods(Re[:, cols]) if records else (),
                    float(np.max(Re[:, cols]))))
    return out


@lru_cache(maxsize=64)
def _forms_friction(lengths: tuple, D_h: float, alpha: float, rel_rough: float, width: int) -> DuctFriction:
    """One DuctFriction for K forms' columns side by side (``width`` columns each, form k's friction length
    ``lengths[k]``): the forms differ only in that length, so one call covers them all."""
    return DuctFriction(np.repeat(np.asarray(lengths, dtype=float), width), D_h, alpha, "rectangle", rel_rough)


def solve_split_forms(manifold: Manifold, friction_lengths, total_flow: float, rho: float, mu: float,
                      starts=None) -> tuple[ManifoldResult, ...]:
    """:func:`solve_split` for K header-friction forms of one manifold at once (``friction_lengths``: each form's
    ``Manifold.friction_length``, None the header's length; the check solves the developing and the fully
    developed form): the K systems stacked (block diagonal) under one Newton iteration, every evaluation of the
    headers and of the channels one array call for all forms, the step's backtracking shared; stopped when every
    loop residual of every form is below TOLERANCE, so each answer is the one solve_split gives that form, to
    round-off of the tolerance.  ``starts``: one start (or None) per form, as solve_split's ``start``.  Returns
    one ManifoldResult per form, in order."""
    for name, value in (("total flow", total_flow), ("density", rho), ("viscosity", mu)):
        if not (math.isfinite(value) and value > 0):
            raise ValueError(f"{name} must be positive and finite, not {value!r}")
    y = np.asarray(manifold.positions, dtype=float)
    n, K = y.size, len(friction_lengths)
    m = n + 1
    starts = tuple(starts) if starts is not None else (None,) * K
    inlets = [_HeaderLine(manifold.inlet, y, manifold.inlet_port, manifold.k_divide, +1.0, rho, mu, fl)
              for fl in friction_lengths]
    outlets = [_HeaderLine(manifold.outlet, y, manifold.outlet_port, manifold.k_combine, -1.0, rho, mu, fl)
               for fl in friction_lengths]
    q_mean = total_flow / n
    p_scale = float(np.mean(np.abs(_drops(manifold.channels, np.full(n, q_mean)))))
    if not (math.isfinite(p_scale) and p_scale > 0):
        raise ManifoldError("the channels' drop at the mean flow is not a positive number")
    flow_rows = (np.arange(K * m) % m) < n   # the unknowns that are channel flows (the rest: each form's drop)

    last = {}  # the latest single evaluation of each part, which the answer reuses when it is at that point

    def headers(x):
        """The loops' header part, inlet header - outlet header [p_scale], and the mass balance [-], form after
        form; ``x`` (K (N + 1),) or (K (N + 1), M), M unknown sets as columns."""
        one = x.ndim == 1
        X = x.reshape((K, m) + x.shape[1:])
        Qs = [X[k, :n] * q_mean for k in range(K)]
        p_in, p_out = _pressures_forms(inlets, Qs, total_flow, one), _pressures_forms(outlets, Qs, total_flow, one)
        if one:
            last["headers"] = x, p_in, p_out
        return np.concatenate([np.concatenate(((p_in[k][0] - p_out[k][0] + X[k, n] * p_scale) / p_scale,
                                               [np.sum(X[k, :n], axis=0) - n])) for k in range(K)])

    def channels(x):
        X = x.reshape(K, m)
        if getattr(manifold.channels[0], "takes_arrays", False) and all(dp is manifold.channels[0]
                                                                       for dp in manifold.channels):
            drops = _drops(manifold.channels, (X[:, :n] * q_mean).ravel()).reshape(K, n)
        else:
            drops = np.stack([_drops(manifold.channels, X[k, :n] * q_mean) for k in range(K)])
        last["channels"] = x, drops
        return np.concatenate((drops / p_scale, np.zeros((K, 1))), axis=1).ravel()

    def parts(x):
        """The header and the channel parts at ``x``: their difference is the residual; the Jacobian reuses them."""
        return headers(x), channels(x)

    x = np.ones(K * m)
    for k, start in enumerate(starts):
        if start is not None:
            q0 = np.asarray(start.channel_flows, dtype=float)
            if q0.shape != (n,) or not np.all(q0 > 0):
                raise ValueError("start must be a split of the same channels with every flow positive")
            x[k * m:(k + 1) * m] = np.concatenate((q0 * (n / np.sum(q0)),
                                                    [start.port_to_port * (total_flow / np.sum(q0)) / p_scale]))
    base_h, base_c = parts(x)
    r = base_h - base_c
    iterations = 0
    diag = np.flatnonzero(flow_rows)
    while np.max(np.abs(r)) > TOLERANCE:
        if iterations >= MAX_ITERATIONS:
            raise ManifoldError(f"the flow split did not converge in {MAX_ITERATIONS} Newton steps "
                                f"(loop residual {np.max(np.abs(r)) * p_scale:.3g} Pa)")
        # finite differences: the headers couple every flow of a form (all the columns in one array evaluation;
        # the forms' blocks do not touch); a channel's drop depends on its own flow only, so its part of the
        # Jacobian is diagonal (one call)
        step_sizes = 1e-7 * np.maximum(1.0, np.abs(x))
        J = (headers(x[:, None] + np.diag(step_sizes)) - base_h[:, None]) / step_sizes[None, :]
        J[diag, diag] -= (channels(x + step_sizes * flow_rows)[diag] - base_c[diag]) / step_sizes[diag]
        try:
            step = np.linalg.solve(J, -r)
        except np.linalg.LinAlgError:
            raise ManifoldError("the flow split's Jacobian is singular") from None
        t, norm, accepted = 1.0, np.linalg.norm(r), None
        while t >= 1e-10:
            trial = x + t * step
            if np.all(trial[flow_rows] > 0):
                h_trial, c_trial = parts(trial)
                r_trial = h_trial - c_trial
                if np.all(np.isfinite(r_trial)) and np.linalg.norm(r_trial) < norm * (1 - 1e-4 * t):
                    accepted = trial, h_trial, c_trial, r_trial
                    break
            t /= 2.0
        if accepted is None:
            if np.max(np.abs(r)) < 1e3 * TOLERANCE:     # at round-off already: no step can improve it
                break
            raise ManifoldError("the flow split found no step that lowers the loop residual "
                                "(a channel may need reverse flow)")
        x, base_h, base_c, r = accepted
        iterations += 1

    at_h, p_ins, p_outs = last["headers"]
    at_c, all_drops = last["channels"]
    results = []
    for k in range(K):
        xk = x[k * m:(k + 1) * m]
        Q = xk[:n] * q_mean
        Q = Q * (total_flow / np.sum(Q))           # the mass balance to round-off (a change of about 1e-12)
        dP = xk[n] * p_scale
        if at_h is x:                              # the answer's own evaluation: its pressures, not a new walk
            (p_in, m_in, Re_in), (p_out_rel, m_out, Re_out) = p_ins[k], p_outs[k]
        else:
            p_in, m_in, Re_in = inlets[k].pressures(Q, total_flow, records=True)
            p_out_rel, m_out, Re_out = outlets[k].pressures(Q, total_flow, records=True)
        p_out = p_out_rel - dP
        drops = all_drops[k] if at_c is x else _drops(manifold.channels, Q)
        methods = (HEADER_MODEL,) + tuple(dict.fromkeys(m_in + m_out))
        frozen = [np.array(a, dtype=float) for a in (y, Q, p_in, p_out, drops)]
        for a in frozen:
            a.flags.writeable = False
        results.append(ManifoldResult(
            positions=frozen[0], channel_flows=frozen[1], inlet_pressure=frozen[2], outlet_pressure=frozen[3],
            channel_drops=frozen[4], port_to_port=float(dP),
            inlet_header_drop=float(np.ptp(np.concatenate((p_in, [0.0])))),
            outlet_header_drop=float(np.ptp(np.concatenate((p_out_rel, [0.0])))),
            min_to_mean=float(np.min(Q) / np.mean(Q)), arrangement=manifold.arrangement,
            header_reynolds=(Re_in, Re_out), iterations=iterations,
            residual=float(np.max(np.abs(p_in - p_out - drops))), methods=methods,
        ))
    return tuple(results)


# ---------------------------------------------------------------- many manifolds at once (the sizing search)


@dataclass(frozen=True)
class BatchResult:
    """The split of B manifolds: ``channel_flows`` (B, N) [m^3/s], ``min_to_mean`` (B,), ``port_to_port`` (B,)
    [Pa], ``converged`` (B,) bool (False: no split found; the other values NaN there)."""

    channel_flows: np.ndarray
    min_to_mean: np.ndarray
    port_to_port: np.ndarray
    converged: np.ndarray


class _BatchHeader:
    """One header of B manifolds that share their node order (N channels, the port between the same two
    channels or on the same one): the arrays of :class:`_HeaderLine` with a leading axis B."""

    def __init__(self, length, depth, width, roughness, y, port, k, sign, rho, mu, friction_length):
        B = y.shape[0]
        line = _HeaderLine(Header(1.0, 1.0, 1.0), y[0], float(port[0]), k, sign, 1.0, 1.0, None)
        self.channel_node, self.P = line.channel_node, line.port_node
        self.port_left = line.port_left                                   # (S,): the shared order
        self.upto_count = line.upto.sum(axis=1).astype(int)               # channels at or left of each segment
        self.nodes = np.empty((B, line.nodes.size))
        self.nodes[:, :] = np.nan
        for b in range(B):
            self.nodes[b] = np.union1d(y[b], [port[b]])
        self.dx = np.diff(self.nodes, axis=1)
        self.k, self.sign = k, sign
        self.rho, self.mu = rho[:, None], mu[:, None]
        self.D_h = hydraulic_diameter_rectangle(width, depth)[:, None]
        self.alpha = aspect_ratio(width, depth)[:, None]
        self.A = (depth * width)[:, None]
        self.rel = (roughness / self.D_h[:, 0])[:, None]
        self.L = (length if friction_length is None else np.full_like(length, friction_length))[:, None]

    def pressures(self, Q, total, f=None):
        """Header pressures (b, N) and the segments' friction factors; ``f`` given: those factors are used (the
        Jacobian's columns, where re-evaluating the correlation for every column would cost N calls)."""
        # channels at or left of each segment: a prefix of the channels, so a cumulative sum, not a product
        cq = np.concatenate((np.zeros((Q.shape[0], 1)), np.cumsum(Q, axis=1)), axis=1)
        V = self.sign * (total[:, None] * self.port_left[None, :] - cq[:, self.upto_count]) / self.A
        if f is None:
            Re = np.maximum(np.abs(V) * self.D_h * self.rho / self.mu, 1e-9)
            f = np.asarray(darcy_friction(Re, self.L, self.D_h, self.alpha, "rectangle", self.rel).f)
        friction = f * self.dx / self.D_h * self.rho * V * np.abs(V) / 2.0
        zeros = np.zeros((V.shape[0], 1))
        V2 = np.concatenate((zeros, V, zeros), axis=1) ** 2
        P, k, rho = self.P, self.k, self.rho
        right = np.cumsum(-friction[:, P:] - k * rho * (V2[:, P + 2:] - V2[:, P + 1:-1]) / 2.0, axis=1)
        left = np.cumsum((friction[:, :P] - k * rho * (V2[:, :P] - V2[:, 1:P + 1]) / 2.0)[:, ::-1], axis=1)[:, ::-1]
        p_far = np.concatenate((left, zeros, right), axis=1)
        return p_far[:, self.channel_node], f


def solve_split_batch(length, depth, width, roughness, positions, inlet_port, outlet_port, dp_channels,
                      total_flow, rho, mu, friction_length=None, k_divide=K_DIVIDE, k_combine=K_COMBINE
                      ) -> BatchResult:
    """:func:`solve_split` for B manifolds at once whose inlet and outlet headers are alike (the same
    ``length``, ``depth``, ``width``, ``roughness``, arrays (B,) [m]) and that share their node order:
    ``positions`` (B, N) increasing [m], the ports (B,) [m] between the same channels in every row (the caller
    groups them).  ``dp_channels(Q, rows)`` takes flows (b, N) [m^3/s] of the rows ``rows`` (indices into B) and returns each
    channel's drop (b, N) [Pa];
    ``total_flow``, ``rho``, ``mu`` arrays (B,).  The same equations, unknowns, scaling, finite-difference
    backtracking as :func:`solve_split`, row by row, vectorised over the rows; the finite-difference Jacobian
    holds the header segments' friction factors at the current iterate (one correlation call per iteration
    instead of N + 1: a quasi-Newton step; the residual, and so the answer, is the exact one)."""
    y = np.asarray(positions, dtype=float)
    B, n = y.shape
    arr = lambda a: np.broadcast_to(np.asarray(a, dtype=float), (B,)).copy()  # noqa: E731
    length, depth, width, roughness, total, rho, mu = map(arr, (length, depth, width, roughness, total_flow, rho, mu))
    inlet = _BatchHeader(length, depth, width, roughness, y, arr(inlet_port), k_divide, +1.0, rho, mu,
                         friction_length)
    outlet = _BatchHeader(length, depth, width, roughness, y, arr(outlet_port), k_combine, -1.0, rho, mu,
                          friction_length)
    q_mean = (total / n)[:, None]
    p_scale = np.mean(np.abs(dp_channels(np.broadcast_to(q_mean, (B, n)).copy(), np.arange(B))), axis=1)[:, None]
    ok = np.isfinite(p_scale[:, 0]) & (p_scale[:, 0] > 0)
    p_scale = np.where(ok[:, None], p_scale, 1.0)

    def headers(x, rows, f=(None, None), with_f=False):
        Q, dP = x[:, :n] * q_mean[rows], x[:, n:] * p_scale[rows]
        p_in, f_in = _sub(inlet, rows).pressures(Q, total[rows], f[0])
        p_out, f_out = _sub(outlet, rows).pressures(Q, total[rows], f[1])
        out = np.concatenate(((p_in - p_out + dP) / p_scale[rows], np.sum(x[:, :n], axis=1, keepdims=True) - n),
                             axis=1)
        return (out, (f_in, f_out)) if with_f else out

    def channels(x, rows):
        return np.concatenate((dp_channels(x[:, :n] * q_mean[rows], rows) / p_scale[rows],
                               np.zeros((x.shape[0], 1))), axis=1)

    x = np.ones((B, n + 1))
    active = np.flatnonzero(ok)
    r = np.zeros((B, n + 1))
    if active.size:
        r[active] = headers(x[active], active) - channels(x[active], active)
    done = ~ok
    for _ in range(MAX_ITERATIONS + 1):
        conv = np.max(np.abs(r), axis=1) <= TOLERANCE
        active = np.flatnonzero(~done & ~conv)
        if not active.size:
            break
        xa, ra = x[active], r[active]
        h = 1e-7 * np.maximum(1.0, np.abs(xa))
        (base_h, f_now), base_c = headers(xa, active, with_f=True), channels(xa, active)
        frozen = headers(xa, active, f_now)
        # every column at once: row b's N + 1 perturbed copies stacked along the batch axis
        eye = np.eye(n + 1)
        xp = (xa[:, None, :] + eye[None, :, :] * h[:, :, None]).reshape(-1, n + 1)
        rep = np.repeat(active, n + 1)
        f_rep = tuple(np.repeat(fk, n + 1, axis=0) for fk in f_now)
        cols = headers(xp, rep, f_rep).reshape(active.size, n + 1, n + 1)    # [b, j, :] = column j
        J = np.swapaxes((cols - frozen[:, None, :]) / h[:, :, None], 1, 2)
        xp = xa + h * (np.arange(n + 1) < n)
        diag = (channels(xp, active)[:, :n] - base_c[:, :n]) / h[:, :n]
        J[:, np.arange(n), np.arange(n)] -= diag
        try:
            step = np.linalg.solve(J, -ra[..., None])[..., 0]
        except np.linalg.LinAlgError:
            step = np.stack([np.linalg.lstsq(Jb, -rb, rcond=None)[0] for Jb, rb in zip(J, ra)])
        norm = np.linalg.norm(ra, axis=1)
        t = np.ones(active.size)
        accepted = np.zeros(active.size, dtype=bool)
        while not accepted.all() and t.max() >= 1e-10:
            trying = np.flatnonzero(~accepted & (t >= 1e-10))
            trial = xa[trying] + t[trying, None] * step[trying]
            pos = np.all(trial[:, :n] > 0, axis=1)
            r_trial = np.full(trial.shape, np.inf)
            if pos.any():
                rows = active[trying[pos]]
                r_trial[pos] = headers(trial[pos], rows) - channels(trial[pos], rows)
            good = np.all(np.isfinite(r_trial), axis=1) & (np.linalg.norm(r_trial, axis=1)
                                                           < norm[trying] * (1 - 1e-4 * t[trying]))
            idx = trying[good]
            x[active[idx]], r[active[idx]] = trial[good], r_trial[good]
            accepted[idx] = True
            t[trying[~good]] /= 2.0
        stuck = active[~accepted]
        at_round_off = np.max(np.abs(r[stuck]), axis=1) < 1e3 * TOLERANCE if stuck.size else np.array([], bool)
        r[stuck[at_round_off]] = 0.0          # at round-off already: converged
        done[stuck[~at_round_off]] = True     # no step lowers the residual: no split
    conv = ~done & (np.max(np.abs(r), axis=1) <= TOLERANCE)
    Q = x[:, :n] * q_mean
    Q = Q * (total / np.sum(Q, axis=1))[:, None]
    dP = x[:, n] * p_scale[:, 0]
    nan = np.where(conv, 1.0, np.nan)
    return BatchResult(channel_flows=Q * nan[:, None], min_to_mean=np.min(Q, axis=1) / np.mean(Q, axis=1) * nan,
                       port_to_port=dP * nan, converged=conv)


def _sub(header: _BatchHeader, rows) -> _BatchHeader:
    """The header's rows ``rows`` (a view of the per-row arrays)."""
    out = object.__new__(_BatchHeader)
    out.__dict__.update(header.__dict__)
    for name in ("dx", "rho", "mu", "D_h", "alpha", "A", "rel", "L"):
        out.__dict__[name] = header.__dict__[name][rows]
    return out
