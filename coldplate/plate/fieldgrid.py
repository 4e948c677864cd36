"""The structured, non-uniform grid of the plate's field solve (:mod:`coldplate.plate.field`).

Axes: x along the flow from the inlet edge (0 .. length), y across the plate from its centre line
(-width/2 .. +width/2; channel 0 lies at -width/2), z down into the plate from the mounting face (0 at the face:
the base, then the channel layer, then the lid).  The grid is a tensor product of three 1-D edge lists.

Every x and y edge list passes through the plate's edges and every source's edges (and, across, every channel
wall's faces), so each cell is wholly inside or outside a source and wholly wall or channel.  Cells are finest at
a source's edges (where the imposed flux jumps) and grow geometrically away from them up to a largest size:
a target spacing ``s(d) = min(s_max, s_min + (g - 1) d)``, d the distance to the nearest source edge on that
axis, which is the spacing of a geometric series of ratio g.  Each stretch between two break points gets
``ceil(integral of 1/s)`` cells placed by equal steps of that integral.

Levels: :func:`build_grid` makes a level-0 grid from :class:`GridRules` and then halves every cell ``level``
times.  A level is thus an exact refinement of the one below (ratio 2 on every axis, same stretching), the
family a Richardson estimate needs (:func:`coldplate.plate.field.solve_field` solves the level below the
requested one for its grid uncertainty).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

#: z-layer codes of :attr:`Grid.layer`
BASE, CHANNEL_LAYER, LID = 0, 1, 2


@dataclass(frozen=True)
class GridRules:
    """How the level-0 grid is drawn (the default level halves it once, see ``field.DEFAULT_LEVEL``).

    ``edge_fraction``: cell size at a source edge as a fraction of that source's smaller side, at most
    ``edge_max`` [m]; ``growth``: geometric ratio of successive cells away from a source edge;
    ``largest_fraction``: largest cell as a fraction of the plate's smaller side; ``base_cells``,
    ``channel_cells``, ``lid_cells``: level-0 cells through the base, up the channel walls and through the lid.
    The values were chosen by measurement (benchmarks/field.py and tests/test_field.py: grid error of the
    hottest face under 1 % at the default level on the review case and the spreading case).
    """

    edge_fraction: float = 0.125
    edge_max: float = 1.0e-3
    growth: float = 1.3
    largest_fraction: float = 0.08
    base_cells: int = 2
    channel_cells: int = 3
    lid_cells: int = 1


@dataclass(frozen=True)
class Grid:
    """Cell edges on three axes, the z layer of each z cell and the channel of each y cell (-1: a wall)."""

    xe: np.ndarray
    ye: np.ndarray
    ze: np.ndarray
    layer: np.ndarray  #: per z cell: BASE, CHANNEL_LAYER or LID
    channel_of_y: np.ndarray  #: per y cell: channel index inside a channel's span, -1 under a wall
    level: int
    #: per x cell: True where the channels run (False over a plenum: the channel layer is void there, the base
    #: above it uncooled); None: everywhere
    channels_at_x: np.ndarray | None = None

    @property
    def dx(self):
        return np.diff(self.xe)

    @property
    def dy(self):
        return np.diff(self.ye)

    @property
    def dz(self):
        return np.diff(self.ze)

    @property
    def xc(self):
        return 0.5 * (self.xe[1:] + self.xe[:-1])

    @property
    def yc(self):
        return 0.5 * (self.ye[1:] + self.ye[:-1])

    @property
    def shape(self):
        return (self.xe.size - 1, self.ye.size - 1, self.ze.size - 1)

    def solid(self) -> np.ndarray:
        """Boolean (nx, ny, nz): True for metal; the channel layer is fluid where a channel runs."""
        nx, ny, nz = self.shape
        mask = np.ones((nx, ny, nz), bool)
        fluid_y = self.channel_of_y >= 0
        fluid_z = self.layer == CHANNEL_LAYER
        mask[:, fluid_y[:, None] & fluid_z[None, :]] = False
        if self.channels_at_x is not None:  # over a plenum: no walls, no channels (void, adiabatic)
            mask[np.ix_(~self.channels_at_x, np.arange(ny), fluid_z)] = False
        return mask


def _axis(breaks, edges_at, s_min, s_max, growth, min_cells=1):
    """Edges through every break point, spaced ``min(s_max, s_min + (growth-1) d)`` (d to the nearest source edge)."""
    breaks = np.unique(np.round(np.asarray(breaks, float), 12))
    marks = np.asarray(edges_at, float)
    out = [breaks[0]]
    for lo, hi in zip(breaks[:-1], breaks[1:]):
        p = np.linspace(lo, hi, 401)
        d = np.abs(p[:, None] - marks[None, :]).min(axis=1) if marks.size else np.full(p.size, np.inf)
        s = np.minimum(s_max, s_min + (growth - 1.0) * d)
        inv = 1.0 / s
        cum = np.concatenate(([0.0], np.cumsum(0.5 * (inv[1:] + inv[:-1]) * np.diff(p))))
        n = max(min_cells, math.ceil(cum[-1] - 1e-9))
        inner = np.interp(cum[-1] * np.arange(1, n) / n, cum, p)
        out += list(inner) + [hi]
    return np.asarray(out)


def _halve(edges, times):
    for _ in range(times):
        mid = 0.5 * (edges[1:] + edges[:-1])
        edges = np.sort(np.concatenate((edges, mid)))
    return edges


def channel_walls(width, count, channel_width):
    """Across-plate spans (y from the centre line) [m] of the ``count`` channels; walls of equal thickness
    (width - count * channel_width) / (count + 1), the outer two at the plate's edges (as in
    ``coldplate.plate.passages.channels``)."""
    tw = (width - count * channel_width) / (count + 1)
    lo = -width / 2 + tw + np.arange(count) * (channel_width + tw)
    return np.column_stack((lo, lo + channel_width))


def build_grid(length, width, base, sources, channels=None, rules=GridRules(), level=1, channel_span=None,
               lanes=()):
    """The grid of a plate ``length`` × ``width`` [m] with a ``base`` [m] below the mounting face.

    ``sources``: iterable of (x centre, y centre, size along, size across) [m]; ``channels``: None (base only)
    or (count, channel width, depth, lid thickness) [m]; ``channel_span``: (x start, x end) [m] where the
    channels run (None: the whole length), each end an x edge; ``lanes``: (y low, y high) [m] spans of coolant
    under the base (a tube's groove, a cavity), each end a y edge.  Returns a :class:`Grid` at ``level`` (>= 0).
    """
    sources = list(sources)
    smallest = min(min(s[2], s[3]) for s in sources)
    s_min = min(rules.edge_fraction * smallest, rules.edge_max)
    s_max = max(rules.largest_fraction * min(length, width), s_min)
    # A source edge on the plate's (adiabatic) edge is no flux jump (the mirror image continues the flux), so
    # only edges inside the plate are refined toward; all edges remain break points.
    x_all = [v for (xc, _, c, _) in sources for v in (xc - c / 2, xc + c / 2)]
    y_all = [v for (_, yc, _, d) in sources for v in (yc - d / 2, yc + d / 2)]
    tol = 1e-9 * max(length, width)
    x_marks = [v for v in x_all if tol < v < length - tol]
    y_marks = [v for v in y_all if abs(v) < width / 2 - tol]
    xb = [0.0, length] + x_all + (list(channel_span) if channel_span is not None else [])
    yb = [-width / 2, width / 2] + y_all + [float(np.clip(v, -width / 2, width / 2)) for ln in lanes for v in ln]
    spans = None
    if channels is not None:
        count, w, depth, lid = channels
        spans = channel_walls(width, count, w)
        yb += list(spans.ravel())
    xe = _axis(xb, x_marks, s_min, s_max, rules.growth)
    ye = _axis(yb, y_marks, s_min, s_max, rules.growth)
    # through the base: the same stretching from the mounting face (where the flux enters), at least base_cells
    zs = [_axis([0.0, base], [0.0], s_min, s_max, rules.growth, rules.base_cells)]
    zs[0] = zs[0] * (base / zs[0][-1])
    rules_base = zs[0].size - 1
    layers = [np.full(rules_base, BASE)]
    if channels is not None:
        zs.append(np.linspace(base, base + depth, rules.channel_cells + 1)[1:])
        layers.append(np.full(rules.channel_cells, CHANNEL_LAYER))
        if lid > 0:
            zs.append(np.linspace(base + depth, base + depth + lid, rules.lid_cells + 1)[1:])
            layers.append(np.full(rules.lid_cells, LID))
    ze = np.concatenate(zs)
    layer = np.concatenate(layers)
    xe, ye = _halve(xe, level), _halve(ye, level)
    ze_f = _halve(ze, level)
    layer = np.repeat(layer, 2**level)
    yc = 0.5 * (ye[1:] + ye[:-1])
    channel_of_y = np.full(yc.size, -1)
    if spans is not None:
        for j, (lo, hi) in enumerate(spans):
            channel_of_y[(yc > lo) & (yc < hi)] = j
    at_x = None
    if spans is not None and channel_span is not None:
        xc = 0.5 * (xe[1:] + xe[:-1])
        at_x = (xc > channel_span[0]) & (xc < channel_span[1])
    return Grid(xe=xe, ye=ye, ze=ze_f, layer=layer, channel_of_y=channel_of_y, level=int(level),
                channels_at_x=at_x)
