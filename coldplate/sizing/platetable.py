"""The plate's hottest point for many candidates: the spreading series and the march, tabulated.

For a fixed plate (sides a, b, conductivity k), footprint (c, d) and march points x_i, the one-design
check (:func:`coldplate.solve.solve_plate`) finds the hottest top-face point as

    R_plate = max_i [ s · F_i(t, h) + G_i(t, h) ]                                  [K/W]

with F_i the fraction of the heat absorbed by the coolant up to x_i and G_i the top-face rise per watt on the
centre line (both from :func:`coldplate.conduction.spreading_MCY` at base thickness t and the smeared
back-side coefficient h = h_eff), and s = (T_out − T_in)/Q the coolant's rise per watt (F_i = 1 for a
serpentine).  Only t and h come from the expensive series, so :class:`PlateTable` evaluates the series at
fixed nodes h_j = 10^(j/N) per base thickness (cached), forms Ψ_j = max_i (s F_i + G_i) − 1/(h_j a b) exactly
for every s asked for, and interpolates Ψ in log h with a cubic through the four nodes around each
candidate; the
known one-dimensional part 1/(h a b) is added back exactly.  The same spreading function and the same march
points are used as in the check, so there is one formula for each; the only difference is the interpolation
in h, whose error the sizing tests bound (≤ 0.02 % of R_plate with the default N = 16 nodes a decade).
"""
from __future__ import annotations

import numpy as np

from coldplate.plate.conduction import spreading_MCY
from coldplate.plate.solve import march_points

#: Nodes per decade of h_eff (see the module docstring for the error this gives).
NODES_PER_DECADE = 16
#: Values of s handled at once when the table's rows are formed.
S_BLOCK = 4096


class PlateTable:
    """Tabulated spreading and march of one plate and footprint, for any base thickness and h_eff."""

    def __init__(self, length, width, footprint_length, footprint_width, conductivity, segments,
                 nodes_per_decade: int = NODES_PER_DECADE):
        self.a, self.b, self.c, self.d, self.k = length, width, footprint_length, footprint_width, conductivity
        self.x = march_points(length, footprint_length, segments)
        self.n = int(nodes_per_decade)
        self._nodes: dict[tuple[float, bool, int], tuple[np.ndarray, np.ndarray]] = {}
        self.series_evaluations = 0

    @classmethod
    def for_design(cls, design, nodes_per_decade: int = NODES_PER_DECADE) -> "PlateTable":
        d = design
        return cls(d.plate.length, d.plate.width, d.heat.footprint_length, d.heat.footprint_width,
                   d.plate.conductivity, d.model.segments, nodes_per_decade)

    def _node(self, t: float, single_pass: bool, j: int):
        key = (t, single_pass, j)
        got = self._nodes.get(key)
        if got is None:
            h = 10.0 ** (j / self.n)
            s = spreading_MCY(self.a, self.b, self.c, self.d, t, self.k, h)
            F = np.asarray(s.absorbed_fraction(self.x)) if single_pass else np.ones_like(self.x)
            G = np.asarray(s.top_rise_centreline(self.x)) - 1.0 / (h * self.a * self.b)
            got = self._nodes[key] = (F, G)
            self.series_evaluations += 1
        return got

    def rise(self, t: float, h_eff, s, single_pass: bool = True):
        """Top-face rise per watt at the hottest march point, above the inlet water [K/W].

        ``t`` base thickness [m] (one value); ``h_eff`` [W/(m² K)], an array whose last axis runs with ``s``;
        ``s`` (T_out − T_in)/Q [K/W], a 1-D array along that axis.  NaN h_eff gives NaN.
        """
        h = np.asarray(h_eff, dtype=float)
        s = np.atleast_1d(np.asarray(s, dtype=float))
        bad = ~np.isfinite(h) | (h <= 0)
        if bad.all():
            return np.full(h.shape, np.nan)
        hs = np.where(bad, np.nanmax(np.where(bad, np.nan, h)), h)  # stand-ins inside the range (masked below)
        u = np.log10(hs) * self.n
        j0 = np.floor(u).astype(np.int64)
        w = u - j0
        lo, hi = int(j0.min()) - 1, int(j0.max()) + 2
        psi = np.empty((hi - lo + 1, s.size))
        for row, j in enumerate(range(lo, hi + 1)):
            F, G = self._node(float(t), bool(single_pass), j)
            for a in range(0, s.size, S_BLOCK):  # blocks of s keep the temporary (block × march points) small
                psi[row, a:a + S_BLOCK] = np.max(s[a:a + S_BLOCK, None] * F[None, :] + G[None, :], axis=1)
        # cubic Lagrange interpolation through the nodes j0-1 .. j0+2 (w in [0, 1) between j0 and j0+1),
        # gathered from the flattened table: element (j, q) sits at j * Nq + q
        ns = s.size
        k = (j0 - lo) * ns + np.arange(ns)
        flat = psi.ravel()
        wm, w1, w2 = w + 1.0, w - 1.0, w - 2.0
        ww = w * wm
        out = (w1 * w2 * (wm * 0.5 * flat[k] - w * (1.0 / 6.0) * flat[k - ns])
               + ww * (w1 * (1.0 / 6.0) * flat[k + 2 * ns] - w2 * 0.5 * flat[k + ns]))
        out += 1.0 / (hs * (self.a * self.b))
        return np.where(bad, np.nan, out)

    def exact_rise(self, t: float, h_eff: float, s: float, single_pass: bool = True) -> float:
        """The same quantity from the series at h_eff itself (no interpolation), for checks [K/W]."""
        sp = spreading_MCY(self.a, self.b, self.c, self.d, t, self.k, h_eff)
        F = np.asarray(sp.absorbed_fraction(self.x)) if single_pass else 1.0
        return float(np.max(s * F + np.asarray(sp.top_rise_centreline(self.x))))

