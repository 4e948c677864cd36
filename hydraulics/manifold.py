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

  with f from :func:`hydraulics.friction.darcy_friction` for a fully developed rectangular duct (laminar Shah &
  London f Re, turbulent Petukhov or Colebrook, the VDI blend between);
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
balance are solved by Newton's method with a finite-difference Jacobian (N + 1 columns, each residual O(N)) and a
backtracking step that keeps every channel flow positive.  Everything is SI: m, m^3/s, Pa, kg/m^3, Pa s.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable

import numpy as np

from hydraulics.ducts import aspect_ratio, fRe_rectangular_Shah_London, hydraulic_diameter_rectangle
from hydraulics.friction import darcy_friction
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
    part ``b`` [Pa s^2/m^6] (minor losses, entry and exit).  Callable as ``dp(Q)``."""

    a: float
    b: float = 0.0

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
    flows; a single callable serves them all), the port offsets [m] and the momentum coefficients."""

    inlet: Header
    outlet: Header
    positions: tuple[float, ...]
    channels: tuple[Callable, ...]
    inlet_port: float = 0.0
    outlet_port: float = 0.0
    k_divide: float = K_DIVIDE
    k_combine: float = K_COMBINE

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
    iterations: int
    residual: float
    methods: tuple = field(default=())


class _HeaderLine:
    """One header as nodes (the channel take-offs and the port) and segments between them, precomputed."""

    def __init__(self, header: Header, y: np.ndarray, port: float, k: float, sign: float, rho, mu):
        self.header, self.k, self.sign, self.rho, self.mu = header, k, sign, rho, mu
        nodes = np.union1d(y, [port])
        self.nodes = nodes
        self.channel_node = np.searchsorted(nodes, y)      # node index of each channel
        self.port_node = int(np.searchsorted(nodes, port))
        left = nodes[:-1]
        self.dx = np.diff(nodes)
        # channels at or left of each segment's left node: their flows sum to the flow leaving leftwards
        self.upto = (y[None, :] <= left[:, None] + 0.0).astype(float)   # (segments, channels)
        self.port_left = (port <= left).astype(float)                     # port at or left of the segment
        self.D_h, self.alpha, self.A = header.D_h, header.alpha, header.area
        self.rel_rough = header.roughness / self.D_h

    def segment_flows(self, Q, total):
        """Flow through each segment toward +y [m^3/s]; ``sign`` +1 for the dividing header, -1 combining."""
        return self.sign * (total * self.port_left - self.upto @ Q)

    def pressures(self, Q, total):
        """Header pressure each channel sees, relative to the port [Pa]; and the friction methods used."""
        F = self.segment_flows(Q, total)
        V = F / self.A
        Re = np.maximum(np.abs(V) * self.D_h * self.rho / self.mu, 1e-9)
        fr = darcy_friction(Re, math.inf, self.D_h, self.alpha, "rectangle", self.rel_rough)
        friction = np.asarray(fr.f) * self.dx / self.D_h * self.rho * V * np.abs(V) / 2.0  # drop toward +y
        M = self.nodes.size
        V_pad = np.concatenate(([0.0], V, [0.0]))          # V_pad[n] left of node n, V_pad[n + 1] right of it
        p_far = np.zeros(M)
        p_far[self.port_node] = 0.0
        # march right from the port: far side of node n is its right segment
        p = 0.0
        for n in range(self.port_node + 1, M):
            p -= friction[n - 1]
            p += -self.k * self.rho * (V_pad[n + 1] ** 2 - V_pad[n] ** 2) / 2.0
            p_far[n] = p
        p = 0.0
        for n in range(self.port_node - 1, -1, -1):
            p += friction[n]
            p += -self.k * self.rho * (V_pad[n] ** 2 - V_pad[n + 1] ** 2) / 2.0
            p_far[n] = p
        return p_far[self.channel_node], fr.methods


def _drops(channels, Q):
    return np.array([float(dp(q)) for dp, q in zip(channels, Q)])


def solve_split(manifold: Manifold, total_flow: float, rho: float, mu: float) -> ManifoldResult:
    """Channel flows that balance the pressures around every loop, for ``total_flow`` [m^3/s] of a fluid of
    density ``rho`` [kg/m^3] and viscosity ``mu`` [Pa s] (one property set: the split is hydraulic)."""
    for name, value in (("total flow", total_flow), ("density", rho), ("viscosity", mu)):
        if not (math.isfinite(value) and value > 0):
            raise ValueError(f"{name} must be positive and finite, not {value!r}")
    y = np.asarray(manifold.positions, dtype=float)
    n = y.size
    inlet = _HeaderLine(manifold.inlet, y, manifold.inlet_port, manifold.k_divide, +1.0, rho, mu)
    outlet = _HeaderLine(manifold.outlet, y, manifold.outlet_port, manifold.k_combine, -1.0, rho, mu)
    q_mean = total_flow / n
    p_scale = float(np.mean(np.abs(_drops(manifold.channels, np.full(n, q_mean)))))
    if not (math.isfinite(p_scale) and p_scale > 0):
        raise ManifoldError("the channels' drop at the mean flow is not a positive number")

    def residual(x):
        Q, dP = x[:n] * q_mean, x[n] * p_scale
        p_in, _ = inlet.pressures(Q, total_flow)
        p_out, _ = outlet.pressures(Q, total_flow)
        loops = (p_in - (p_out - dP) - _drops(manifold.channels, Q)) / p_scale
        return np.concatenate((loops, [np.sum(x[:n]) - n]))

    x = np.concatenate((np.ones(n), [1.0]))
    r = residual(x)
    iterations = 0
    while np.max(np.abs(r)) > TOLERANCE:
        if iterations >= MAX_ITERATIONS:
            raise ManifoldError(f"the flow split did not converge in {MAX_ITERATIONS} Newton steps "
                                f"(loop residual {np.max(np.abs(r[:n])) * p_scale:.3g} Pa)")
        J = np.empty((n + 1, n + 1))
        for j in range(n + 1):
            h = 1e-7 * max(1.0, abs(x[j]))
            xp = x.copy()
            xp[j] += h
            J[:, j] = (residual(xp) - r) / h
        try:
            step = np.linalg.solve(J, -r)
        except np.linalg.LinAlgError:
            raise ManifoldError("the flow split's Jacobian is singular") from None
        t, norm = 1.0, np.linalg.norm(r)
        while True:
            trial = x + t * step
            if np.all(trial[:n] > 0):
                r_trial = residual(trial)
                if np.all(np.isfinite(r_trial)) and np.linalg.norm(r_trial) < norm * (1 - 1e-4 * t):
                    break
            t /= 2.0
            if t < 1e-10:
                if np.max(np.abs(r)) < 1e3 * TOLERANCE:     # at round-off: the step cannot improve
                    break
                raise ManifoldError("the flow split found no step that lowers the loop residual "
                                    "(a channel may need reverse flow)")
        if t < 1e-10:
            break
        x, r = trial, r_trial
        iterations += 1

    Q = x[:n] * q_mean
    Q = Q * (total_flow / np.sum(Q))           # the mass balance to round-off
    dP = x[n] * p_scale
    p_in, m_in = inlet.pressures(Q, total_flow)
    p_out_rel, m_out = outlet.pressures(Q, total_flow)
    p_out = p_out_rel - dP
    drops = _drops(manifold.channels, Q)
    methods = (HEADER_MODEL,) + tuple(dict.fromkeys(m_in + m_out))
    frozen = [np.array(a, dtype=float) for a in (y, Q, p_in, p_out, drops)]
    for a in frozen:
        a.flags.writeable = False
    return ManifoldResult(
        positions=frozen[0], channel_flows=frozen[1], inlet_pressure=frozen[2], outlet_pressure=frozen[3],
        channel_drops=frozen[4], port_to_port=float(dP),
        inlet_header_drop=float(np.ptp(np.concatenate((p_in, [0.0])))),
        outlet_header_drop=float(np.ptp(np.concatenate((p_out_rel, [0.0])))),
        min_to_mean=float(np.min(Q) / np.mean(Q)), arrangement=manifold.arrangement,
        iterations=iterations, residual=float(np.max(np.abs(p_in - p_out - drops))), methods=methods,
    )
