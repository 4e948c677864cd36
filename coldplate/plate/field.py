"""The plate as a field: a 3-D finite-volume conduction solve of a cold plate carrying several heat sources.

The computational core; :mod:`coldplate.plate.fieldcheck` builds its inputs from a design and turns its
result into the check's ``Result`` (the check's default plate model).  Inputs are plain dataclasses in SI
(kelvin, metres, watts), so it does not depend on the design reader; the output is a frozen
:class:`FieldResult`.

The model
---------
The solid is the base (``base`` thick, under the whole mounting face) and, for a channel plate, the walls
between the channels (``depth`` tall, the outer two at the plate's edges) and an optional lid below them.  The
metal's conductivity k is constant.  Rectangular sources on the mounting face put a uniform flux
``load / (size along × size across)`` into the metal; the rest of the mounting face, the plate's sides and
(without a lid) the wall tips are adiabatic.  Each wetted face (channel floor, wall side, roof under a lid)
passes heat to its channel's coolant through ``A / (distance to the cell centre / k + 1 / h)``, h the local
coefficient at that x (the caller's; its mean over each cell by 3-point Gauss-Legendre, which never samples
the inlet edge, where an entry coefficient is singular).

The coolant of each channel is a bulk temperature at every x edge of the grid, solved in the same sparse
system: for segment i of channel c (one x cell), ``m_c cp (T_i - T_(i-1)) = sum over its wetted faces of
G (T_wall - (T_(i-1) + T_i) / 2)``, with T_0 the inlet temperature.  The flow is shared equally between
the channels unless one mass flow per channel is given (a manifold's split).  ``LaneCooling`` carries the
same balance for coolant under the base's bottom face: a tube's passes in series (each pass its own water
temperature, alternating direction) or a cavity.  The unknowns are the rises
above the inlet, so the system is linear in the loads, and the field of several sources is the sum of each
source's field per watt (superposition): one matrix, a right-hand side per source.  The
coupling matrix ``C[i, j]`` is the mean face rise of source i per watt of source j; with the coolant
carried downstream it is not symmetric (water warmed by an upstream source heats a downstream one); with a
fixed fluid temperature (``UniformBack``) the conduction operator is symmetric and so is C (reciprocity).

Discretisation: cell-centred finite volumes, second order on the structured grid of
:mod:`coldplate.plate.fieldgrid`; a face value on the mounting face is the cell value plus the flux's
half-cell rise.  The grid uncertainty is Roache's grid convergence index from the requested grid and the
one a level coarser (exactly every other edge): ``U = F_s |T_fine - T_coarse| / (2^p - 1)`` with the
formal order p = 2 and the two-grid safety factor F_s = 3 (Roache, P.J. (1994) Perspective: a method for
uniform reporting of grid refinement studies, J. Fluids Eng. 116:405-413; F_s = 3 for two grids, from
memory).  With p = 2 this is ``|T_fine - T_coarse|``.  The hottest point's uncertainty is the larger of its
own index and the sources' mean-face indices (the hottest cell value converges non-monotonically).

The linear solver (:mod:`coldplate.plate.fieldsolver`, measured in ``benchmarks/field.py``)
-----------------------------------------------------------------------------------------
The system is not symmetric (the coolant carries heat one way), which rules out plain conjugate gradients for
channel plates.  Above ``fieldsolver.DIRECT_UP_TO`` unknowns (every example's default grid) it is solved by
GMRES with a classical algebraic multigrid preconditioner (pyamg): the field at the loads to a relative residual
of 1e-11 (the temperatures agree with the LU's to about 1e-11 of the rise, the energy balance to 1e-12), and with
several sources each source's own field per watt, which only the coupling matrix needs, to 1e-3
(``fieldsolver.COUPLING_RTOL``: the coupling within 3e-4 of its largest entry, far inside its grid uncertainty),
then moved so that it reproduces the sources' mean faces from the loads exactly (``fieldsolver.solve_loads``);
a solve that does not converge is handed to the LU, so the answer is never less accurate.  Smaller grids take
SuperLU's direct LU (minimum degree on A + A^T), exact to round-off.  The LU's fill grows faster than the cells
(47 times the matrix on the three-source example's 102,240 cells: 2.5 s and 400 MB to factorise, against 0.7 s
and tens of MB for the multigrid solve of its three sources); the measurements behind the choice are in the
solver module's docstring.  The level below, for the grid uncertainty, is solved first: at the loads alone
when no coupling is asked for, otherwise per source as well, its fields then starting the requested level's
(each cell from its parent, :func:`_parents`: a third fewer iterations on the 8-source benchmark).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable, Sequence, Union

import numpy as np

from coldplate.design.errors import DesignError
from coldplate.plate import fieldsolver
from coldplate.plate.fieldgrid import BASE, CHANNEL_LAYER, LID, Grid, GridRules, build_grid

#: The grid level solved by default (level 0 of :class:`GridRules` halved once); its Richardson partner is level 0.
DEFAULT_LEVEL = 1
#: Formal order of the discretisation and the two-grid safety factor of the grid convergence index (Roache 1994).
GRID_ORDER, GCI_SAFETY = 2.0, 3.0
#: The most solid cells the field solves (the multigrid solve grows with the cells, but its fallback, a direct LU
#: of more, takes minutes and gigabytes): beyond, a SolveError names the count and points to the network model.
#: The examples take 12,672-102,240, the 8-source benchmark 87,120.
MAX_CELLS = 250_000

Coefficient = Union[float, Callable[[np.ndarray], np.ndarray]]


@dataclass(frozen=True)
class FieldPlate:
    """The metal block: ``length`` along the flow, ``width`` across, ``base`` below the mounting face [m];
    ``conductivity`` [W/(m K)], constant."""

    length: float
    width: float
    base: float
    conductivity: float


@dataclass(frozen=True)
class FieldSource:
    """A rectangular heat source on the mounting face with a uniform flux.

    ``load`` [W]; ``size`` = (along the flow, across) [m]; ``at`` = its centre: (distance from the inlet edge
    along the flow, offset across from the plate's centre line, positive toward the side of the last channel)
    [m]; ``interface`` = its interface resistance per area [K m²/W] (the device-side face temperature adds
    ``load / area × interface``).
    """

    name: str
    load: float
    size: tuple[float, float]
    at: tuple[float, float]
    interface: float = 0.0

    @property
    def area(self) -> float:
        return self.size[0] * self.size[1]


@dataclass(frozen=True)
class ChannelCooling:
    """Straight channels along the whole plate length under the base, coolant flowing from x = 0.

    ``count`` channels ``width`` × ``depth`` [m], walls of equal thickness with the outer two at the plate's
    edges; ``lid`` [m] of metal below the channels (0: none, the wall tips and the channel roofs adiabatic).
    ``mass_flow`` [kg/s]: a number, the whole plate's, shared equally; or a sequence, one per channel (a
    manifold's split); ``cp`` [J/(kg K)]; ``inlet`` [K]; ``h`` [W/(m² K)] on every wetted
    face: a number, a function of x [m] (distance from the plate's inlet edge, numpy array in and out), or a
    sequence of such functions, one per channel.  Use :func:`tabulated` for values at points along the flow.
    ``span`` = (x start, x end) [m] where the channels run (None: the whole length): beyond it, over a
    plenum, the plate is base alone, uncooled (no walls, no channels: a hotter face than the plenum's water
    would give).
    """

    count: int
    width: float
    depth: float
    mass_flow: Union[float, Sequence[float]]
    cp: float
    inlet: float
    h: Union[Coefficient, Sequence[Coefficient]]
    lid: float = 0.0
    span: tuple[float, float] | None = None


@dataclass(frozen=True)
class LaneCooling:
    """Coolant in lanes under the base's bottom face along the whole plate length: a tube's passes or a cavity.

    ``lanes``: (y low, y high) [m] spans across, one per lane, where the base's bottom face passes heat to that
    lane's coolant through ``u`` [W/(m² K)] per area of the span (a number, a function of x [m], or a sequence
    of them, one per lane: a cavity's film coefficient; a tube's groove, bond, wall and film per metre of tube
    divided by the span's width).  ``serpentine``: the lanes are one path in series, lane 0 along x from the
    inlet edge, lane 1 back, and so on, each pass with its own water temperature, ``mass_flow`` through every
    lane; otherwise the lanes are in parallel sharing ``mass_flow`` equally.  ``cp`` [J/(kg K)], ``inlet`` [K].
    """

    lanes: tuple[tuple[float, float], ...]
    u: Union[Coefficient, Sequence[Coefficient]]
    mass_flow: float
    cp: float
    inlet: float
    serpentine: bool = False


@dataclass(frozen=True)
class UniformBack:
    """The base alone, its bottom face at a uniform ``h`` [W/(m² K)] to a fluid held at ``fluid`` [K]
    (the spreading problem's boundary; no channels, no coolant rise)."""

    h: float
    fluid: float


def tabulated(x, h) -> Callable[[np.ndarray], np.ndarray]:
    """h(x) from values ``h`` [W/(m² K)] at points ``x`` [m] along the flow (linear between, held beyond)."""
    x, h = np.asarray(x, float), np.asarray(h, float)
    if x.ndim != 1 or x.shape != h.shape or np.any(np.diff(x) <= 0):
        raise ValueError("tabulated needs increasing x and one h per x")
    return lambda q: np.interp(q, x, h)


@dataclass(frozen=True)
class SourceField:
    """One source's result: face temperatures on the device side of its interface [K]."""

    name: str
    load: float  #: [W]
    face_max: float  #: hottest face temperature [K]
    face_mean: float  #: mean face temperature [K]
    hottest_at: tuple[float, float]  #: (x, y) of the hottest cell centre [m]
    grid_uncertainty: float  #: of face_max [K] (nan when not estimated)
    mean_uncertainty: float = math.nan  #: of face_mean [K], the same estimate (nan when not estimated)


@dataclass(frozen=True)
class FieldResult:
    """The solved field.  Temperatures in kelvin, positions in metres (axes as in :mod:`fieldgrid`)."""

    sources: tuple[SourceField, ...]
    coupling: np.ndarray  #: (N, N) [K/W]: mean face rise of source i per watt of source j (interface on the diagonal)
    face_x: np.ndarray  #: (nx,) cell centres along the flow
    face_y: np.ndarray  #: (ny,) cell centres across
    face: np.ndarray  #: (nx, ny) mounting-face temperature, plate side of any interface
    bulk_x: np.ndarray  #: (nx + 1,) x edges where the bulk temperatures sit (empty for UniformBack)
    bulk: np.ndarray  #: (channels, nx + 1) coolant bulk temperature (inlet first)
    channel_heat: np.ndarray  #: (channels,) heat into each channel's coolant [W], m cp (T_out - T_in)
    heat_to_coolant: float  #: [W]
    load: float  #: total source load [W]
    reference: float  #: inlet (or fixed fluid) temperature [K]
    hottest: float  #: hottest device-side face temperature over all sources [K]
    grid_uncertainty: float  #: of ``hottest`` [K], Richardson / grid convergence index (nan when not estimated)
    cells: int  #: solid cells (fluid nodes not counted)
    unknowns: int  #: solid cells + coolant nodes
    iterations: int  #: Krylov iterations over all right-hand sides (0 with the direct factorisation)
    method: str  #: the linear solver of the requested level: "direct", "amg" or "gmres" (:mod:`fieldsolver`)
    level: int
    coarse_hottest: float = field(default=math.nan)  #: hottest at the level below [K]

    @property
    def thermal_resistance(self) -> float:
        """(hottest face - inlet) / total load [K/W]."""
        return (self.hottest - self.reference) / self.load

    def face_at(self, x, y):
        """Mounting-face temperature (plate side) at (x, y) [m], bilinear between cell centres [K]."""
        fx, fy = self.face_x, self.face_y
        i = int(np.clip(np.searchsorted(fx, x) - 1, 0, fx.size - 2))
        j = int(np.clip(np.searchsorted(fy, y) - 1, 0, fy.size - 2))
        tx = float(np.clip((x - fx[i]) / (fx[i + 1] - fx[i]), 0.0, 1.0))
        ty = float(np.clip((y - fy[j]) / (fy[j + 1] - fy[j]), 0.0, 1.0))
        F = self.face
        return float((1 - tx) * (1 - ty) * F[i, j] + tx * (1 - ty) * F[i + 1, j]
                     + (1 - tx) * ty * F[i, j + 1] + tx * ty * F[i + 1, j + 1])


# ------------------------------------------------------------------------------------------ input checks

def _check(plate: FieldPlate, sources, cooling):
    for key in ("length", "width", "base", "conductivity"):
        v = getattr(plate, key)
        if not (math.isfinite(v) and v > 0):
            raise DesignError(f"[plate] {key}", f"must be a positive number, got {v!r}")
    if not sources:
        raise DesignError("[source]", "the field needs at least one source")
    names = [s.name for s in sources]
    if len(set(names)) != len(names):
        raise DesignError("[source] name", "every source needs its own name")
    eps = 1e-12
    for s in sources:
        f = f"[source] {s.name}"
        if not (math.isfinite(s.load) and s.load >= 0):
            raise DesignError(f"{f} load", f"must be zero or positive, got {s.load!r}")
        if not all(math.isfinite(v) and v > 0 for v in s.size):
            raise DesignError(f"{f} size", "both sides must be positive")
        if not (math.isfinite(s.interface) and s.interface >= 0):
            raise DesignError(f"{f} interface", "must be zero or positive")
        (x, y), (c, d) = s.at, s.size
        if x - c / 2 < -eps or x + c / 2 > plate.length + eps or abs(y) + d / 2 > plate.width / 2 + eps:
            raise DesignError(f"{f} at", "the source leaves the plate's mounting face")
    for i, a in enumerate(sources):
        for b in sources[i + 1:]:
            ox = min(a.at[0] + a.size[0] / 2, b.at[0] + b.size[0] / 2) - max(a.at[0] - a.size[0] / 2,
                                                                              b.at[0] - b.size[0] / 2)
            oy = min(a.at[1] + a.size[1] / 2, b.at[1] + b.size[1] / 2) - max(a.at[1] - a.size[1] / 2,
                                                                              b.at[1] - b.size[1] / 2)
            if ox > eps and oy > eps:
                raise DesignError(f"[source] {a.name} at", f"overlaps source {b.name!r}")
    if sum(s.load for s in sources) <= 0:
        raise DesignError("[source] load", "the sources carry no heat")
    if isinstance(cooling, ChannelCooling):
        for key in ("width", "depth", "cp"):
            v = getattr(cooling, key)
            if not (math.isfinite(v) and v > 0):
                raise DesignError(f"[passage] {key}", f"must be a positive number, got {v!r}")
        m = np.asarray(cooling.mass_flow, float)
        if m.ndim > 1 or (m.ndim == 1 and m.size != cooling.count) or not np.all(np.isfinite(m) & (m > 0)):
            raise DesignError("[coolant] flow", "must be positive: one number, or one per channel")
        if cooling.count < 1 or cooling.count * cooling.width >= plate.width:
            raise DesignError("[passage] count", "the channels do not fit across the plate")
        if not (cooling.lid >= 0):
            raise DesignError("[passage] lid", "must be zero or positive")
        if cooling.span is not None and not (0 <= cooling.span[0] < cooling.span[1] <= plate.length):
            raise DesignError("[passage] plenum_length", "the channels must run over part of the plate's length")
    elif isinstance(cooling, LaneCooling):
        if not (math.isfinite(cooling.mass_flow) and cooling.mass_flow > 0 and cooling.cp > 0):
            raise DesignError("[coolant] flow", "must be a positive number")
        if not cooling.lanes or any(not (lo < hi) for lo, hi in cooling.lanes):
            raise DesignError("[passage] passes", "every lane needs a positive width")
    elif isinstance(cooling, UniformBack):
        if not (math.isfinite(cooling.h) and cooling.h > 0):
            raise DesignError("[passage] h", "must be a positive number")
    else:
        raise TypeError("cooling must be ChannelCooling, LaneCooling or UniformBack")


# ------------------------------------------------------------------------------------------ assembly

#: 5-point Gauss-Legendre on (0, 1): nodes and weights
_GAUSS = tuple(0.5 * (v + 1.0) for v in np.polynomial.legendre.leggauss(5)[0]), \
    tuple(0.5 * w for w in np.polynomial.legendre.leggauss(5)[1])


def _cell_mean(h: Coefficient, xe: np.ndarray) -> np.ndarray:
    """Mean of h over each x cell: 5-point Gauss-Legendre in t with x = lo + dx t³ (the ends are never sampled).

    The substitution clusters the points toward each cell's upstream end, where an entry coefficient is
    singular (h ~ x^(-1/2) .. x^(-1/3) in developing flow): the integrand 3 t² h becomes bounded there, so the
    entry cell's mean converges at the grid's order instead of about first order with plain Gauss points; for
    h linear over a cell the rule is exact (3 t² (a + b t³) is of degree 5).
    """
    if callable(h):
        lo, dx = xe[:-1], np.diff(xe)
        out = sum(w * 3.0 * p * p * np.asarray(h(lo + p**3 * dx), float) for p, w in zip(*_GAUSS))
    else:
        out = np.full(xe.size - 1, float(h))
    if not np.all(np.isfinite(out)) or np.any(out <= 0):
        raise DesignError("[coolant] h", "the heat transfer coefficient must be positive and finite along the flow")
    return out


@dataclass
class _System:
    grid: Grid
    matrix: object  # scipy.sparse csc
    idx: np.ndarray  # (nx, ny, nz) solid-cell number or -1
    n_solid: int
    n_channels: int  # coolant lanes: channels, tube passes or a cavity
    mcp: np.ndarray  # per lane [W/K]
    wet: tuple  # (solid index, G) of faces to a fixed fluid (UniformBack)
    direction: np.ndarray = field(default_factory=lambda: np.zeros(0, int))  # per lane: +1 along x, -1 against
    upstream: np.ndarray = field(default_factory=lambda: np.zeros(0, int))  # per lane: the lane feeding it, -1 the inlet


def _assemble(grid: Grid, k: float, cooling) -> _System:
    from scipy.sparse import coo_matrix

    nx, ny, nz = grid.shape
    solid = grid.solid()
    ns = int(solid.sum())
    idx = -np.ones(solid.shape, np.int64)
    idx[solid] = np.arange(ns)
    dx, dy, dz = grid.dx, grid.dy, grid.dz
    widths = (dx[:, None, None], dy[None, :, None], dz[None, None, :])
    rows, cols, vals = [], [], []
    diag = np.zeros(ns)
    for ax in range(3):
        lo, hi = [slice(None)] * 3, [slice(None)] * 3
        lo[ax], hi[ax] = slice(0, -1), slice(1, None)
        p, q = idx[tuple(lo)], idx[tuple(hi)]
        o1, o2 = (widths[i] for i in range(3) if i != ax)
        G = np.broadcast_to(k * o1 * o2 / (0.5 * (widths[ax][tuple(lo)] + widths[ax][tuple(hi)])), p.shape)
        both = (p >= 0) & (q >= 0)
        p, q, G = p[both], q[both], G[both]
        rows += [p, q]
        cols += [q, p]
        vals += [-G, -G]
        np.add.at(diag, p, G)
        np.add.at(diag, q, G)

    if isinstance(cooling, UniformBack):
        nb = int(np.sum(grid.layer == BASE))
        s = idx[:, :, nb - 1].ravel()
        G = (np.outer(dx, dy) / (dz[nb - 1] / (2 * k) + 1.0 / cooling.h)).ravel()
        np.add.at(diag, s, G)
        rows.append(np.arange(ns))
        cols.append(np.arange(ns))
        vals.append(diag)
        n = ns
        M = coo_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(n, n))
        return _System(grid, M.tocsc(), idx, ns, 0, np.zeros(0), (s, G))

    if isinstance(cooling, ChannelCooling):
        faces, mcp, direction, upstream = _channel_faces(grid, idx, k, cooling)
    else:
        faces, mcp, direction, upstream = _lane_faces(grid, idx, k, cooling)
    return _couple(grid, idx, ns, rows, cols, vals, diag, faces, mcp, direction, upstream)


def _channel_faces(grid: Grid, idx, k: float, cooling: "ChannelCooling"):
    """The wetted faces of channel walls, floors and roofs: (solid cell, lane, x cell, conductance) arrays."""
    nx, ny, _ = grid.shape
    dx, dy, dz = grid.dx, grid.dy, grid.dz
    nc = cooling.count
    hs = cooling.h if isinstance(cooling.h, (list, tuple)) else [cooling.h] * nc
    if len(hs) != nc:
        raise DesignError("[coolant] h", f"one coefficient per channel: {nc} channels, {len(hs)} given")
    run = np.ones(nx, bool) if grid.channels_at_x is None else grid.channels_at_x
    I = np.flatnonzero(run)
    H = np.ones((nc, nx))
    H[:, I] = [_cell_mean(h, grid.xe[I[0]:I[-1] + 2]) for h in hs]
    ch = grid.channel_of_y
    out = []

    def add(s_idx, c_idx, i_idx, area, dist):
        out.append((s_idx.ravel(), c_idx.ravel(), i_idx.ravel(), (area / (dist / k + 1.0 / H[c_idx, i_idx])).ravel()))

    z_base = np.flatnonzero(grid.layer == BASE)
    z_chan = np.flatnonzero(grid.layer == CHANNEL_LAYER)
    z_lid = np.flatnonzero(grid.layer == LID)
    for j in np.flatnonzero(ch >= 0):
        c = np.full(I.size, ch[j])
        add(idx[I, j, z_base[-1]], c, I, dx[I] * dy[j], dz[z_base[-1]] / 2)  # channel floor
        if z_lid.size:
            add(idx[I, j, z_lid[0]], c, I, dx[I] * dy[j], dz[z_lid[0]] / 2)  # channel roof
    for j in np.flatnonzero(ch < 0):
        for jn in (j - 1, j + 1):
            if 0 <= jn < ny and ch[jn] >= 0:
                ii, kk = np.meshgrid(I, z_chan, indexing="ij")
                add(idx[ii, j, kk], np.full(ii.shape, ch[jn]), ii, np.outer(dx[I], dz[z_chan]), dy[j] / 2)
    m = np.broadcast_to(np.asarray(cooling.mass_flow, float), (nc,)) if np.ndim(cooling.mass_flow) == 0 \
        else np.asarray(cooling.mass_flow, float)
    if np.ndim(cooling.mass_flow) == 0:
        m = m / nc
    return out, m * cooling.cp, np.ones(nc, int), -np.ones(nc, int)


def _lane_faces(grid: Grid, idx, k: float, cooling: "LaneCooling"):
    """The base's bottom faces over each lane: (solid cell, lane, x cell, conductance) arrays."""
    nx = grid.shape[0]
    dx, dy, dz = grid.dx, grid.dy, grid.dz
    nb = int(np.sum(grid.layer == BASE))
    yc = grid.yc
    nl = len(cooling.lanes)
    us = cooling.u if isinstance(cooling.u, (list, tuple)) else [cooling.u] * nl
    if len(us) != nl:
        raise DesignError("[coolant] h", f"one coefficient per lane: {nl} lanes, {len(us)} given")
    out = []
    I = np.arange(nx)
    for l, ((lo, hi), u) in enumerate(zip(cooling.lanes, us)):
        U = _cell_mean(u, grid.xe)
        for j in np.flatnonzero((yc > lo) & (yc < hi)):
            G = dx * dy[j] / (dz[nb - 1] / (2 * k) + 1.0 / U)
            out.append((idx[:, j, nb - 1], np.full(nx, l), I, G))
    if cooling.serpentine:
        mcp = np.full(nl, cooling.mass_flow * cooling.cp)
        direction = np.where(np.arange(nl) % 2 == 0, 1, -1)
        upstream = np.arange(nl) - 1
    else:
        mcp = np.full(nl, cooling.mass_flow * cooling.cp / nl)
        direction, upstream = np.ones(nl, int), -np.ones(nl, int)
    return out, mcp, direction, upstream


def _couple(grid, idx, ns, rows, cols, vals, diag, faces, mcp, direction, upstream):
    """The coolant nodes and their coupling to the wetted solid faces, in the same sparse matrix.

    One node per lane and x cell: its bulk temperature at the cell's downstream edge.  For node n of a lane,
    with u its upstream node (the previous cell along the lane's direction; for a lane's first cell the
    outlet of the lane feeding it, or the inlet, rise 0): ``m cp (T_n - T_u) = sum G (T_s - (T_u + T_n) / 2)``
    over the cell's wetted faces; each solid face cell gets the matching ``G ((T_u + T_n) / 2 - T_s)``.
    """
    from scipy.sparse import coo_matrix

    nx = grid.shape[0]
    nl = mcp.size
    fs, fc, fi, fG = (np.concatenate([f[i] for f in faces]) for i in range(4))
    assert np.all(fs >= 0)
    node = ns + fc * nx + fi
    # upstream node of every (lane, x cell), -1 for the inlet
    lane = np.repeat(np.arange(nl), nx)
    cell = np.tile(np.arange(nx), nl)
    d = direction[lane]
    prev = cell - d
    first = (prev < 0) | (prev >= nx)
    up = np.where(first, -1, ns + lane * nx + np.clip(prev, 0, nx - 1))
    feed = upstream[lane]
    last_of_feed = np.where(direction[np.maximum(feed, 0)] > 0, nx - 1, 0)
    up = np.where(first & (feed >= 0), ns + np.maximum(feed, 0) * nx + last_of_feed, up)
    face_up = up[node - ns]
    has_up = face_up >= 0
    np.add.at(diag, fs, fG)
    rows += [fs, fs[has_up]]
    cols += [node, face_up[has_up]]
    vals += [-0.5 * fG, -0.5 * fG[has_up]]
    nf = nl * nx
    seg = ns + np.arange(nf)
    m_node = mcp[lane]
    half = np.zeros(nf)
    np.add.at(half, node - ns, 0.5 * fG)
    upn = up >= 0
    rows += [node, seg, seg[upn]]
    cols += [fs, seg, up[upn]]
    vals += [-fG, m_node + half, -m_node[upn] + half[upn]]
    rows.append(np.arange(ns))
    cols.append(np.arange(ns))
    vals.append(diag)
    n = ns + nf
    M = coo_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(n, n))
    return _System(grid, M.tocsc(), idx, ns, nl, mcp, (), direction, upstream)


def _source_columns(grid: Grid, system: _System, sources) -> tuple[np.ndarray, np.ndarray]:
    """Right-hand sides for 1 W on each source (n, N) and each source's flux per watt on the top cells (nx, ny, N)."""
    xe, ye = grid.xe, grid.ye
    top = system.idx[:, :, 0]
    n = system.matrix.shape[0]
    B = np.zeros((n, len(sources)))
    flux = np.zeros(top.shape + (len(sources),))
    for m, s in enumerate(sources):
        (xc, yc), (c, d) = s.at, s.size
        ox = np.clip(np.minimum(xe[1:], xc + c / 2) - np.maximum(xe[:-1], xc - c / 2), 0, None)
        oy = np.clip(np.minimum(ye[1:], yc + d / 2) - np.maximum(ye[:-1], yc - d / 2), 0, None)
        q = np.outer(ox, oy) / (c * d)  # W per watt of source in each top cell
        B[top.ravel(), m] = q.ravel()
        flux[:, :, m] = q / np.outer(grid.dx, grid.dy)
    return B, flux


@dataclass(frozen=True)
class _Level:
    grid: Grid
    face: np.ndarray  # (nx, ny) face rise at the loads (plate side of the interfaces)
    face_unit: np.ndarray | None  # (nx, ny, N) face rise per watt of each source (None: solved at the loads only)
    masks: np.ndarray  # (nx, ny, N) bool: cells under each source
    weights: np.ndarray  # (nx, ny, N) area weights of each source's cells (sum 1)
    fluid: np.ndarray  # (nc, nx) outlet-node rises at the loads
    system: _System
    wet: float  # heat to a fixed fluid at the loads [W] (UniformBack)
    cells: int
    unknowns: int
    iterations: int
    method: str  # the linear solver used ("direct", "amg" or "gmres")
    unit: np.ndarray | None  # (unknowns, N) each source's field per watt (None: solved at the loads only)


def _solve_level(plate, sources, cooling, rules, level, method, loads, per_source=True, below=None,
                 start_only=False) -> _Level:
    """One grid level at ``loads``: the field at the loads and, with ``per_source``, each source's field per watt
    as well (for the coupling; :func:`fieldsolver.solve_loads`).  Without, one right-hand side (enough for the
    faces' values).  ``below``: the level below solved per source, whose fields start this level's (each cell
    takes its parent's value: the levels are exact halvings, :func:`_parents`).  ``start_only``: this level's
    own fields serve only to start the next one's (solved to ``fieldsolver.START_RTOL``)."""
    channels, span, lanes = None, None, ()
    if isinstance(cooling, ChannelCooling):
        channels, span = (cooling.count, cooling.width, cooling.depth, cooling.lid), cooling.span
    elif isinstance(cooling, LaneCooling):
        lanes = cooling.lanes
    grid = build_grid(plate.length, plate.width, plate.base,
                      [(s.at[0], s.at[1], s.size[0], s.size[1]) for s in sources], channels, rules, level,
                      channel_span=span, lanes=lanes)
    nx, ny, nz = grid.shape
    if nx * ny * nz > MAX_CELLS:
        from coldplate.design.errors import SolveError

        raise SolveError(f"the plate as a field would need {nx * ny * nz:,} cells (more than {MAX_CELLS:,}: many "
                         "channels or sources far smaller than the plate); use the network model (--model network)")
    system = _assemble(grid, plate.conductivity, cooling)
    B, flux = _source_columns(grid, system, sources)
    if per_source:
        guess = None if below is None or below.unit is None else below.unit[_parents(below.system, system)]
        x, X, iterations, used = fieldsolver.solve_loads(system.matrix, B, loads, method, guess,
                                                         fieldsolver.START_RTOL if start_only else None)
    else:
        X, iterations, used = fieldsolver.solve(system.matrix, B @ loads[:, None], method)
        x, X = X[:, 0], None
    top = system.idx[:, :, 0]
    half = grid.dz[0] / (2 * plate.conductivity)  # the flux's half-cell rise from the top cell to the face
    face = x[top] + (flux @ loads) * half
    face_unit = None if X is None else X[top] + flux * half
    area = np.outer(grid.dx, grid.dy)[:, :, None]
    # each cell's share of a source's watt (an exact partition: the grid has an edge at every source edge, to
    # round-off); the source's cells for its hottest point are those it covers at least half of
    weights = flux * area
    masks = flux * np.asarray([s.area for s in sources]) > 0.5
    nx = grid.shape[0]
    fluid = x[system.n_solid:].reshape(system.n_channels, nx) if system.n_channels else np.zeros((0, nx))
    wet = 0.0
    if system.wet:
        s, G = system.wet
        wet = float(G @ x[s])
    return _Level(grid, face, face_unit, masks, weights, fluid, system, wet, system.n_solid,
                  system.matrix.shape[0], iterations, used, X)


def _parents(coarse: _System, fine: _System) -> np.ndarray:
    """For every unknown of ``fine`` (a level one above ``coarse``: each cell halved on every axis), the unknown
    of ``coarse`` it lies in: a solid cell's parent cell (walls, channels and plenum ends are coarse edges, so a
    solid cell's parent is solid), a coolant node's lane at its parent x cell."""
    nx = fine.grid.shape[0]
    solid = fine.idx >= 0
    i, j, k = np.nonzero(solid)
    out = np.empty(fine.matrix.shape[0], np.int64)
    out[fine.idx[solid]] = coarse.idx[i // 2, j // 2, k // 2]
    if fine.n_channels:
        nxc = coarse.grid.shape[0]
        lane, cell = np.divmod(np.arange(fine.n_channels * nx), nx)
        out[fine.n_solid:] = coarse.n_solid + lane * nxc + cell // 2
    if np.any(out < 0):
        raise AssertionError("a solid cell over a void parent: the levels are not halvings of each other")
    return out


def _source_values(lv: _Level, sources, loads):
    """Per source: (face max rise, mean rise, position) on the device side; the coupling matrix (None when the
    level was solved at the loads only)."""
    face, coupling = lv.face, None
    if lv.face_unit is not None:
        coupling = np.einsum("xyi,xyj->ij", lv.weights, lv.face_unit)
        for i, s in enumerate(sources):
            coupling[i, i] += s.interface / s.area
    out = []
    xc, yc = lv.grid.xc, lv.grid.yc
    for i, s in enumerate(sources):
        rise = face + loads[i] / s.area * s.interface
        masked = np.where(lv.masks[:, :, i], rise, -np.inf)
        a, b = np.unravel_index(int(np.argmax(masked)), masked.shape)
        mean = float((lv.weights[:, :, i] * rise).sum())
        out.append((float(masked[a, b]), mean, (float(xc[a]), float(yc[b]))))
    return face, out, coupling


def _lane_bulk(system: _System, rise: np.ndarray):
    """Each lane's bulk rise at the x edges (lanes, nx + 1) and the heat each lane takes [W]."""
    nl, nx = rise.shape
    edges = np.zeros((nl, nx + 1))
    heat = np.zeros(nl)
    outlet = np.zeros(nl)
    for l in range(nl):
        feed = system.upstream[l]
        up = 0.0 if feed < 0 else outlet[feed]
        if system.direction[l] > 0:
            edges[l, 0], edges[l, 1:] = up, rise[l]
            outlet[l] = rise[l, -1]
        else:
            edges[l, -1], edges[l, :-1] = up, rise[l]
            outlet[l] = rise[l, 0]
        heat[l] = system.mcp[l] * (outlet[l] - up)
    return edges, heat


def _read_only(a):
    a = np.array(a, dtype=float)
    a.flags.writeable = False
    return a


def solve_field(plate: FieldPlate, sources: Sequence[FieldSource], cooling, *, level: int = DEFAULT_LEVEL,
                rules: GridRules = GridRules(), method: str = "auto", uncertainty: bool = True,
                coupling: bool = True) -> FieldResult:
    """Solve the plate's field for ``sources`` with ``cooling`` (:class:`ChannelCooling` or :class:`UniformBack`).

    ``level``: grid level (:func:`coldplate.plate.fieldgrid.build_grid`); ``uncertainty``: also solve the level
    below and report the grid convergence index (needs level >= 1); ``method``: the linear solver ("auto", "amg",
    "direct" or "gmres", :func:`coldplate.plate.fieldsolver.solve`); ``coupling``: also each source's field per
    watt, for the coupling matrix (False: the field at the loads alone, one right-hand side, and an empty
    coupling).  Bad input raises
    :class:`~coldplate.design.errors.DesignError` naming the field; nothing is solved then.
    """
    sources = tuple(sources)
    _check(plate, sources, cooling)
    loads = np.array([s.load for s in sources], float)
    # the level below first (the grid uncertainty's partner): with the coupling, solved per source too, so that
    # its fields start the requested level's (fieldsolver.solve_loads)
    lc = None
    if uncertainty and level >= 1:
        lc = _solve_level(plate, sources, cooling, rules, level - 1, method, loads, per_source=coupling,
                          start_only=True)
    lv = _solve_level(plate, sources, cooling, rules, level, method, loads, per_source=coupling, below=lc)
    face, values, C = _source_values(lv, sources, loads)
    ref = cooling.fluid if isinstance(cooling, UniformBack) else cooling.inlet
    hottest = max(v[0] for v in values)
    U = np.full(len(sources), math.nan)
    U_mean = np.full(len(sources), math.nan)
    U_hot = coarse_hot = math.nan
    if lc is not None:
        _, cvals, _ = _source_values(lc, sources, loads)
        factor = GCI_SAFETY / (2.0**GRID_ORDER - 1.0)
        U_mean = np.array([factor * abs(f[1] - c[1]) for f, c in zip(values, cvals)])
        # the hottest point is a cell value and moves between cells from grid to grid, so its change can be
        # small by chance (non-monotone convergence, measured in tests/test_field_check.py): its uncertainty is
        # the larger of its own index and the mean's, the mean face converging monotonically at the grid's order
        U = np.array([max(factor * abs(f[0] - c[0]), um) for f, c, um in zip(values, cvals, U_mean)])
        coarse_hot = max(c[0] for c in cvals)
        U_hot = max(factor * abs(hottest - coarse_hot), float(np.max(U_mean)))
        coarse_hot += ref
    grid = lv.grid
    if lv.fluid.shape[0]:
        bulk, channel_heat = _lane_bulk(lv.system, lv.fluid)  # lv.fluid: (lanes, nx) downstream-edge nodes
        bulk = ref + bulk
        bulk_x = grid.xe.copy()
    else:
        bulk, bulk_x, channel_heat = np.zeros((0, 0)), np.zeros(0), np.zeros(0)
    heat = float(channel_heat.sum()) if channel_heat.size else lv.wet
    C = np.zeros((0, 0)) if C is None else C
    C, face, bulk, bulk_x, channel_heat = (_read_only(a) for a in (C, ref + face, bulk, bulk_x, channel_heat))
    return FieldResult(
        sources=tuple(SourceField(s.name, float(s.load), ref + v[0], ref + v[1], v[2], float(u), float(um))
                      for s, v, u, um in zip(sources, values, U, U_mean)),
        coupling=C, face_x=_read_only(grid.xc), face_y=_read_only(grid.yc), face=face,
        bulk_x=bulk_x, bulk=bulk, channel_heat=channel_heat, heat_to_coolant=heat,
        load=float(loads.sum()), reference=float(ref), hottest=ref + hottest, grid_uncertainty=float(U_hot),
        cells=lv.cells, unknowns=lv.unknowns, iterations=lv.iterations, method=lv.method, level=int(level),
        coarse_hottest=float(coarse_hot),
    )
