"""The smeared channel-plate model against a 3-D conduction solve with resolved fins.

The solver's plate model (coldplate/plate/solve.py) replaces the channel floors and
walls with one coefficient spread over the plate's underside,

    h_eff = 1 / (A_plate R_conv),   R_conv = 1 / (h N L_ch (w + 2 depth eta_fin)),

and puts that under the Muzychka-Culham-Yovanovich spreading series for the
base.  Here that chain (coldplate.passages.channels.geometry/back_side, then
coldplate.conduction.spreading_MCY with h_eff, exactly as solve.py does) is
checked against a finite-volume conduction solve written in this file, in
which the base AND the walls between the channels are meshed explicitly.

The plate and passage are the project's own dataclasses (coldplate.design.Plate,
Channels) built directly with plenum_length = 0, so the channels span the whole
plate length as in the 3-D solve; no unit parsing or material lookup is
involved.  The coolant is at a uniform 0 (no bulk temperature rise), so both
sides compare the plate's own rise per watt.

source: computed, 3-D finite-volume solution written below (cell-centred,
second order); no published table is used.
"""
import math

import numpy as np
import pytest
from scipy.sparse import coo_matrix
from scipy.sparse.linalg import spsolve

from coldplate.plate import conduction
from coldplate.design.reader import Channels, Plate
from coldplate.plate.passages import channels


def _grid(breaks, size):
    """Cell edges through every break point, cells at most ``size`` long; edges and widths."""
    edges = [breaks[0]]
    for lo, hi in zip(breaks[:-1], breaks[1:]):
        n = max(1, math.ceil((hi - lo) / size - 1e-9))
        edges += list(lo + (hi - lo) * np.arange(1, n + 1) / n)
    edges = np.array(edges)
    return edges, np.diff(edges)


def fv_channel_plate(a, b, c, d, t, k, h, n, w, depth, cell_x=1e-3, cell_y=0.5e-3, nz_base=4,
                     nz_wall=6, k_along_walls=1.0, h_of_x=None):
    """Top-face maximum rise per watt [K/W] of a plate with ``n`` resolved channels.

    Quarter of the plate (x from the source centre along the flow, y from the
    centre line across it; both symmetry planes adiabatic).  Solid = base
    (thickness t) + the n+1 walls of thickness (b - n w)/(n+1), the outer two
    at the plate edges, height ``depth``.  Channel floors and wetted wall faces
    see h to a fluid at 0 (half-cell + film conductance); wall tips at the lid,
    outer faces and plate ends are adiabatic.  Uniform flux over the centred
    c×d footprint, 1 W on the whole plate.  ``k_along_walls`` scales the
    conductivity along x inside the walls (1 = isotropic metal; 0 is used to
    isolate which approximation of the smeared model matters).  ``h_of_x``: a
    callable giving the coefficient at x from the plate's inlet end [m]; the
    whole length is then meshed (x from -a/2 to a/2 about the source centre;
    only the across-flow symmetry is used) and 1 W leaves half the plate.
    """
    tw = (b - n * w) / (n + 1)
    yb = [b / 2, b / 2 + d / 2, b]
    for j in range(n + 1):
        yb += [j * (w + tw), j * (w + tw) + tw]
    yb = np.unique(np.round([y for y in yb if y >= b / 2 - 1e-12], 12))
    ye, dy = _grid(yb, cell_y)
    ye = ye - b / 2
    wall = ((0.5 * (ye[1:] + ye[:-1]) + b / 2) % (w + tw)) < tw
    if h_of_x is None:
        xe, dx = _grid(np.array([0.0, c / 2, a / 2]), cell_x)
        hx = np.full(dx.size, float(h))
    else:
        xe, dx = _grid(np.unique([-a / 2, -c / 2, c / 2, a / 2]), cell_x)
        hx = np.array([h_of_x(xc + a / 2) for xc in 0.5 * (xe[1:] + xe[:-1])])
    dz = np.r_[np.full(nz_base, t / nz_base), np.full(nz_wall, depth / nz_wall)]
    shape = (dx.size, dy.size, dz.size)
    solid = np.ones(shape, bool)
    solid[:, ~wall, nz_base:] = False
    N = int(solid.sum())
    idx = -np.ones(shape, int)
    idx[solid] = np.arange(N)

    rows, cols, vals = [], [], []
    diag = np.zeros(N)
    widths = (dx[:, None, None], dy[None, :, None], dz[None, None, :])
    for ax in range(3):
        lo = [slice(None)] * 3
        hi = [slice(None)] * 3
        lo[ax], hi[ax] = slice(0, -1), slice(1, None)
        p, q = idx[tuple(lo)], idx[tuple(hi)]
        o1, o2 = (widths[i] for i in range(3) if i != ax)
        G = np.broadcast_to(k * o1 * o2 / (0.5 * (widths[ax][tuple(lo)] + widths[ax][tuple(hi)])),
                            p.shape).copy()
        if ax == 0:
            G[:, :, nz_base:] *= k_along_walls
        both = (p >= 0) & (q >= 0)
        p, q, G = p[both], q[both], G[both]
        rows += [p, q]
        cols += [q, p]
        vals += [-G, -G]
        np.add.at(diag, p, G)
        np.add.at(diag, q, G)

    # convective faces: channel floors, then wall faces next to a channel cell
    cool_idx = [idx[:, ~wall, nz_base - 1].ravel()]
    cool_G = [(np.outer(dx, dy[~wall]) / (dz[nz_base - 1] / (2 * k) + 1 / hx[:, None])).ravel()]
    for j in np.flatnonzero(wall):
        wet = sum(1 for jn in (j - 1, j + 1) if 0 <= jn < dy.size and not wall[jn])
        if wet:
            cool_idx.append(idx[:, j, nz_base:].ravel())
            cool_G.append((wet * np.outer(dx, dz[nz_base:]) / (dy[j] / (2 * k) + 1 / hx[:, None])).ravel())
    ci, cg = np.concatenate(cool_idx), np.concatenate(cool_G)
    np.add.at(diag, ci, cg)
    rows.append(np.arange(N))
    cols.append(np.arange(N))
    vals.append(diag)
    M = coo_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))),
                   shape=(N, N)).tocsr()

    ox = np.clip(np.minimum(xe[1:], c / 2) - np.maximum(xe[:-1], -c / 2), 0, None)
    oy = np.clip(np.minimum(ye[1:], d / 2) - ye[:-1], 0, None)
    q_top = np.outer(ox, oy) / (c * d)  # W into each top cell (1 W on the full plate)
    rhs = np.zeros(N)
    rhs[idx[:, :, 0].ravel()] = q_top.ravel()
    T = np.zeros(shape)
    T[solid] = spsolve(M, rhs)
    T_top = T[:, :, 0] + q_top / np.outer(dx, dy) * dz[0] / (2 * k)  # face value
    return dict(R_max=float(T_top.max()), out=float((cg * T[solid][ci]).sum()), cells=N)


def smeared_model(a, b, c, d, t, k, h, n, w, depth):
    """The solver's chain: channels.back_side -> h_eff -> spreading_MCY; centroid rise per watt [K/W]."""
    plate = Plate(material=None, conductivity=k, length=a, width=b, base=t, pressure_rating=None)
    passage = Channels(count=n, width=w, depth=depth, plenum_length=0.0, port_diameter=None,
                       roughness=0.0)
    geom = channels.geometry(passage, plate)
    assert geom.path_length == pytest.approx(a)  # channels span the plate, as in the 3-D solve
    back = channels.back_side(passage, plate, geom, h)
    h_eff = 1.0 / (a * b * back.total)
    return conduction.spreading_MCY(a, b, c, d, t, k, h_eff).R_centroid


# (a, b, c, d, t, k, h, n, w, depth) in SI
CASES = {
    # the example plate (examples/reagent-block-channels.toml without plenums), aluminium,
    # wide 40×40 mm footprint, h 5000; 12 channels 2×6 mm, walls 2.77 mm, base 3 mm, eta_fin 0.80
    "aluminium, wide footprint": (0.08, 0.06, 0.04, 0.04, 0.003, 167.0, 5000.0, 12, 0.002, 0.006),
    # copper, narrow 15×8 mm footprint on 60×40 mm, h 15000; 11 channels 1.5×4 mm, base 2 mm,
    # eta_fin 0.83 (odd count: a channel, not a wall, under the source centre)
    "copper, narrow footprint": (0.06, 0.04, 0.015, 0.008, 0.002, 390.0, 15000.0, 11, 0.0015, 0.004),
    # aluminium, 20×10 mm footprint on 100×50 mm, h 20000; 15 channels 1×3 mm, base 4 mm, eta_fin 0.76
    "aluminium, narrow footprint, high h": (0.1, 0.05, 0.02, 0.01, 0.004, 167.0, 20000.0, 15, 0.001,
                                            0.003),
}

# Measured (this grid: 1 mm along the flow, 0.5 mm across, 4 cells in the base, 6 up the walls;
# 10k-23k cells, about 1 s for all three on 2 cores).  Discretisation error, from the same
# solve with every cell halved (2×: 74k-170k cells) and Richardson extrapolation (second
# order, confirmed with a 1.5× grid): the FV maximum here is 0.6 %, 0.8 % and 0.6 % above
# the grid-converged value.
#
#   case                              model K/W   FV K/W    model/FV - 1  (vs extrapolated FV)
#   aluminium, wide footprint         0.05921     0.05582   +6.1 %        (+6.7 %)
#   copper, narrow footprint          0.14385     0.13156   +9.3 %        (+10.2 %)
#   aluminium, narrow, high h         0.16796     0.16564   +1.4 %        (+2.0 %)
#
# The smeared model is conservative (reads high) in every case.  The main cause is that it
# treats the walls only as fins (heat flows up/down them) and ignores conduction ALONG the flow
# inside the walls: walls 3-6 mm tall act as an extra spreading layer under a short footprint.
# With that conduction switched off in the FV (k_along_walls=0, the test below) the gap closes
# to +1.9 %, +2.3 % and +0.2 %; what is left is the outer walls (one wetted face, modelled as
# interior fins), the 2-D fin field and the constriction of heat into the wall roots.
TOLERANCE = {  # relative, a little above the measured difference
    "aluminium, wide footprint": 0.08,
    "copper, narrow footprint": 0.12,
    "aluminium, narrow footprint, high h": 0.03,
}


@pytest.fixture(scope="module")
def fv_results():
    return {name: fv_channel_plate(*case) for name, case in CASES.items()}


@pytest.mark.parametrize("name", list(CASES))
def test_fv_energy_balance(name, fv_results):
    # source: energy conservation of the discrete problem (a quarter of 1 W leaves by convection)
    assert fv_results[name]["out"] == pytest.approx(0.25, rel=1e-8)


@pytest.mark.parametrize("name", list(CASES))
def test_smeared_model_against_resolved_fins(name, fv_results):
    # source: computed, 3-D finite volume with resolved walls (above); measured differences in
    # the comment above TOLERANCE
    model = smeared_model(*CASES[name])
    fv = fv_results[name]["R_max"]
    assert model == pytest.approx(fv, rel=TOLERANCE[name])
    assert model > 0.99 * fv  # conservative: the smeared model does not read low


@pytest.mark.parametrize("name", ["aluminium, wide footprint", "copper, narrow footprint"])
def test_gap_is_conduction_along_the_walls(name):
    # source: computed, the same 3-D solve with the walls' conductivity along the flow set to
    # zero (the smeared model's implicit assumption); measured +1.9 % and +2.3 %
    model = smeared_model(*CASES[name])
    fv = fv_channel_plate(*CASES[name], k_along_walls=0.0)["R_max"]
    assert model == pytest.approx(fv, rel=0.035)
