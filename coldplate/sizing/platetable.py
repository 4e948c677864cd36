"""The plate's hottest point for many candidates: the spreading series and the march, tabulated.

For a fixed plate (cooled length a between the plenums, width b, conductivity k), footprint (c, d), march
grid (:func:`coldplate.plate.solve.march_grid`) and search points x_i (``march_points``), the one-design check
(:func:`coldplate.plate.solve.solve_plate`) finds the hottest top-face point as

    R_plate = max_i [ s · F_i(t, h) + max(0, G_i(t, h) + δ_i) ]                          [K/W]

with F_i the fraction of the heat absorbed by the coolant up to x_i, G_i the top-face rise per watt on the
centre line (both from :func:`coldplate.plate.conduction.spreading_MCY` at base thickness t and the smeared
mean back-side coefficient h = h_eff), s = (T_out − T_in)/Q the coolant's rise per watt (F_i = 1 for a
serpentine) and δ_i the change the local back side makes
(:func:`coldplate.plate.conduction.base_axial_perturbation` on the grid from the series' cooled-face flux q and
the candidate's local back-side resistances r there, interpolated linearly to x_i).  Only t and h come from the expensive series, so
:class:`PlateTable` evaluates it at fixed nodes h_j = 10^(j/N) per base thickness (cached) and interpolates
F_i, G_i − 1/(h a b) and q_i in log h with a cubic through the four nodes around each candidate; the known
one-dimensional part 1/(h a b) is added back exactly.  The same functions and the same march points are used
as in the check, so there is one formula for each; the only difference is the interpolation in h, whose error
the sizing tests bound (≤ 0.02 % of R_plate with the default N = 16 nodes a decade).

Speed (:meth:`PlateTable.rises`): the candidates are sorted by h once for all base thicknesses, and handled in
blocks of :data:`BLOCK` with the march points on the leading axis (the sweeps of the axial change run along it,
row by row, over the whole block).  The cubic interpolation is a matrix product of the nodes the block needs
with sparse weights, split into products of at most :data:`SMALL_PRODUCT` multiply-adds: OpenBLAS runs larger
ones on threads, which on the shared two-core machine was measured several times slower than one thread (no
thread setting is changed).  Every other step writes into the block's arrays in place.
"""
from __future__ import annotations

import numpy as np

from coldplate.plate.conduction import base_axial_perturbation, spreading_MCY
from coldplate.plate.passages import PASSAGES
from coldplate.plate.solve import cooled_span, local_rise, march_grid, march_points

#: Nodes per decade of h_eff (see the module docstring for the error this gives).
NODES_PER_DECADE = 16
#: Candidates handled at once (the temporaries are block × march points, a few MB: near the processor's cache).
BLOCK = 2048
#: Multiply-adds of one interpolation product at most (values × nodes × candidates): OpenBLAS hands larger
#: products to threads, which on a shared two-core machine costs several times the product itself (measured).
SMALL_PRODUCT = 400_000


class PlateTable:
    """Tabulated spreading and march of one plate and footprint, for any base thickness and h_eff."""

    def __init__(self, length, width, footprint_length, footprint_width, conductivity, segments,
                 nodes_per_decade: int = NODES_PER_DECADE, cooled_offset: float = 0.0):
        self.length, self.offset = length, cooled_offset
        self.a, self.c = cooled_span(length, cooled_offset, footprint_length)
        self.b, self.d, self.k = width, footprint_width, conductivity
        self.segments = int(segments)
        self.x = march_points(self.a, self.c, self.segments)  # the hottest-point search
        self.xg = march_grid(self.a, self.segments)  # the local back side and the base's axial change
        self.spacing = float(self.xg[1] - self.xg[0])
        # the tables hold the search points reordered, the grid's points first (every grid point is a search
        # point), then the others, each linear between grid rows i, i + 1 (np.interp in the check); the
        # hottest point is a maximum over the points, so their order does not matter
        on = np.searchsorted(self.x, self.xg)
        assert np.array_equal(self.x[on], self.xg)
        off = np.setdiff1d(np.arange(self.x.size), on)
        self._order = np.concatenate([on, off])
        self._left = np.clip(np.searchsorted(self.xg, self.x[off], side="right") - 1, 0, self.xg.size - 2)
        t = (self.x[off] - self.xg[self._left]) / (self.xg[self._left + 1] - self.xg[self._left])
        self._t = t[:, None]
        self._1mt = 1.0 - self._t
        self.n = int(nodes_per_decade)
        self._nodes: dict[tuple[float, bool, int], tuple[np.ndarray, np.ndarray, np.ndarray]] = {}
        self.series_evaluations = 0

    @classmethod
    def for_design(cls, design, nodes_per_decade: int = NODES_PER_DECADE) -> "PlateTable":
        d = design
        offset = PASSAGES[d.passage.kind].geometry(d.passage, d.plate).cooled_offset
        return cls(d.plate.length, d.plate.width, d.heat.footprint_length, d.heat.footprint_width,
                   d.plate.conductivity, d.model.segments, nodes_per_decade, offset)

    @property
    def area(self) -> float:
        """The cooled area a·b [m²] over which the back side is smeared."""
        return self.a * self.b

    def _node(self, t: float, single_pass: bool, j: int):
        key = (t, single_pass, j)
        got = self._nodes.get(key)
        if got is None:
            h = 10.0 ** (j / self.n)
            s = spreading_MCY(self.a, self.b, self.c, self.d, t, self.k, h)
            F = np.asarray(s.absorbed_fraction(self.x)) if single_pass else np.ones_like(self.x)
            G = np.asarray(s.top_rise_centreline(self.x)) - 1.0 / (h * self.area)
            F, G = F[self._order], G[self._order]  # the grid's points first (see __init__)
            q = np.asarray(s.cooled_flux_centreline(self.xg))
            got = self._nodes[key] = (F, G, q)
            self.series_evaluations += 1
        return got

    def rise(self, t: float, h_eff, s, r_local, single_pass: bool = True):
        """Top-face rise per watt at the hottest march point, above the inlet water [K/W], for one base
        thickness ``t`` [m]: :meth:`rises` with one base."""
        return self.rises(np.array([float(t)]), h_eff, s, r_local, single_pass)[..., 0]

    def rises(self, bases, h_eff, s, r_local, single_pass: bool = True):
        """Top-face rise per watt at the hottest march point, above the inlet water [K/W], for every base.

        ``bases`` base thicknesses [m] (1-D, Nt); ``h_eff`` mean smeared coefficient [W/(m² K)] and ``s``
        (T_out − T_in)/Q [K/W], arrays of one shape (candidates); ``r_local`` the back side's local resistance
        times the cooled area [m² K/W] at the march grid's points (``xg``), that shape plus a last axis along
        them.  Returns that shape plus a last axis of length Nt.  NaN h_eff gives NaN.

        Work that does not depend on the base (sorting by h, the local resistances along x) is done once
        for all bases; the interpolation in h is a matrix product per block of candidates, split so that each
        product stays on one thread.
        """
        bases = np.atleast_1d(np.asarray(bases, dtype=float))
        h = np.asarray(h_eff, dtype=float)
        shape = h.shape
        h = h.ravel()
        Pg = self.xg.size
        s = np.broadcast_to(np.asarray(s, dtype=float), shape).ravel()
        r = np.broadcast_to(np.asarray(r_local, dtype=float), shape + (Pg,)).reshape(-1, Pg)
        bad = ~np.isfinite(h) | (h <= 0) | ~np.all(np.isfinite(r), axis=-1)
        out = np.full((h.size, bases.size), np.nan)
        if bad.all():
            return out.reshape(shape + (bases.size,))
        ok = np.flatnonzero(~bad)
        u_all = np.log10(h[ok]) * self.n
        order = np.argsort(u_all, kind="stable")  # runs of neighbouring h: few intervals per block
        ok, u_all = ok[order], u_all[order]
        j_all = np.floor(u_all).astype(np.int64)
        P = self.x.size
        sp = bool(single_pass)
        # every node the candidates need (each j0 takes j0-1 .. j0+2), once per base: (2P + Pg, nodes)
        starts = j_all[np.concatenate([[True], j_all[1:] != j_all[:-1]])]
        needed = np.unique(starts[:, None] + np.arange(-1, 3))
        tables = [np.concatenate([np.stack([self._node(float(t), sp, int(j))[i] for j in needed])
                                  for i in range(3)], axis=1).T for t in bases]
        col = np.searchsorted(needed, j_all - 1)  # the column of each candidate's first node
        for a in range(0, ok.size, BLOCK):
            sel, u, j0, c0 = ok[a:a + BLOCK], u_all[a:a + BLOCK], j_all[a:a + BLOCK], col[a:a + BLOCK]
            m = sel.size
            lo, hi = int(c0[0]), int(c0[-1]) + 4
            # cubic Lagrange weights through the nodes j0-1 .. j0+2 (w in [0, 1) between j0 and j0+1), as a
            # sparse-by-columns weight matrix, so F, G and q at every point come from one matrix product
            w = u - j0
            wm, w1, w2 = w + 1.0, w - 1.0, w - 2.0
            weights = np.zeros((hi - lo, m))
            cols, jj = np.arange(m), c0 - lo
            for k, lk in enumerate((-w * w1 * w2 / 6.0, wm * w1 * w2 / 2.0, -wm * w * w2 / 2.0, wm * w * w1 / 6.0)):
                weights[jj + k, cols] = lk
            hb = h[sel]
            rm = 1.0 / hb
            one_d = 1.0 / (hb * self.area)
            sb = s[sel]
            rT = np.ascontiguousarray(r[sel].T)  # (Pg, m): x on the leading axis for the sweeps
            FGq = np.empty((2 * P + Pg, m))
            for b, t in enumerate(bases):
                t = float(t)
                tb = tables[b][:, lo:hi]
                step = max(64, SMALL_PRODUCT // (tb.shape[0] * tb.shape[1]))
                for c in range(0, m, step):  # products small enough for BLAS to keep to one thread
                    FGq[:, c:c + step] = tb @ weights[:, c:c + step]
                F, G, q = FGq[:P], FGq[P:2 * P], FGq[2 * P:]
                delta = base_axial_perturbation(self.spacing, self.k * t, q, rT, rm, x_first=True)
                G += one_d
                on, off = G[:Pg], G[Pg:]
                local_rise(on, delta, out=on)  # the search points on the grid: the grid's own values
                if off.size:  # the others: linear between grid points
                    dx = delta[self._left]
                    dx *= self._1mt
                    dx += self._t * delta[self._left + 1]
                    local_rise(off, dx, out=off)
                rise = G
                F *= sb
                F += rise
                out[sel, b] = F.max(axis=0)
        return out.reshape(shape + (bases.size,))

    def exact_rise(self, t: float, h_eff: float, s: float, r_local, single_pass: bool = True) -> float:
        """The same quantity from the series at h_eff itself (no interpolation), for checks [K/W]."""
        sp = spreading_MCY(self.a, self.b, self.c, self.d, t, self.k, h_eff)
        F = np.asarray(sp.absorbed_fraction(self.x)) if single_pass else 1.0
        delta = base_axial_perturbation(self.spacing, self.k * t, sp.cooled_flux_centreline(self.xg),
                                        np.asarray(r_local, dtype=float), 1.0 / h_eff)
        return float(np.max(s * F + local_rise(sp.top_rise_centreline(self.x), np.interp(self.x, self.xg, delta))))
