"""Validation of coldplate.convection against outside references.

Labels as in VALIDATION.md: published / library / memory / computed.
"""
import math
import re

import ht.conv_internal as hci
import numpy as np
import pytest
import scipy.sparse as sp
import scipy.sparse.linalg as spla
from hypothesis import given, settings
from hypothesis import strategies as st

from coldplate.plate.convection import (
    HEATED_ARRANGEMENTS,
    LAMINAR_MODELS,
    TURBULENT_MODELS,
    ConvectionResult,
    Nu_circular_fully_developed,
    Nu_Dittus_Boelter,
    Nu_Gnielinski_VDI,
    Nu_Hausen,
    Nu_Muzychka_Yovanovich_combined,
    Nu_rectangular_finite_difference,
    Nu_rectangular_Shah_London,
    Nu_Sieder_Tate_laminar,
    nusselt,
)
from hydraulics.ducts import RE_LAMINAR_END, RE_TURBULENT_START
import fluids.friction as ff

from coldplate.plate.solve import passage_flow
from hydraulics.friction import f_Konakov

# ----------------------------------------------------------------- fully developed laminar

# source: Shah & London 1978 rectangular-duct table via VALIDATION.md
# (label there: memory; computed agrees), Nu on D_h, all four walls heated.
TABLE = [  # alpha, Nu_T, Nu_H1
    (1.0, 2.976, 3.608), (0.5, 3.391, 4.123), (1.0 / 3.0, 3.956, 4.795),
    (0.25, 4.439, 5.331), (0.125, 5.597, 6.490), (0.0, 7.541, 8.235),
]


@pytest.mark.parametrize("alpha, nu_t, nu_h1", TABLE)
def test_four_walls_against_shah_london_table(alpha, nu_t, nu_h1):
    assert Nu_rectangular_Shah_London(alpha, "4", "T") == pytest.approx(nu_t, rel=5e-3)
    assert Nu_rectangular_Shah_London(alpha, "4", "H1") == pytest.approx(nu_h1, rel=5e-3)


def test_four_walls_h1_against_ht_library():
    # library: ht.conv_internal.Nu_laminar_rectangular_Shan_London (same published fit,
    # independent implementation; not called by the code under test)
    for a in np.linspace(0.0, 1.0, 11):
        assert Nu_rectangular_Shah_London(a) == pytest.approx(hci.Nu_laminar_rectangular_Shan_London(a), rel=1e-3)


def test_parallel_plate_and_circular_limits():
    # textbook standard (VALIDATION.md): one plate heated, the other insulated,
    # 70/13 = 5.385 (H) and 4.861 (T, memory; computed agrees)
    # "3S" also: its heated short walls vanish at alpha = 0
    for heated in ("1L", "3S"):
        assert Nu_rectangular_Shah_London(0.0, heated, condition="H1") == pytest.approx(5.385, abs=5e-4)
        assert Nu_rectangular_Shah_London(0.0, heated, condition="T") == pytest.approx(4.861, abs=5e-4)
    assert Nu_rectangular_Shah_London(0.0, "2L", condition="H1") == pytest.approx(8.235)
    # three-wall fit: two long walls heated, so alpha -> 0 gives both plates heated, 8.235
    assert Nu_rectangular_Shah_London(0.0, "3L") == pytest.approx(8.235)
    # library: ht laminar_Q_const (48/11) and laminar_T_const (3.66, rounded)
    assert Nu_circular_fully_developed("H1") == pytest.approx(hci.laminar_Q_const(), rel=1e-12)
    assert Nu_circular_fully_developed("T") == pytest.approx(hci.laminar_T_const(), abs=5e-3)
    assert Nu_circular_fully_developed("T") == pytest.approx(3.657, abs=5e-4)  # textbook standard
    for heated in ("3L", "3S", "2L", "1L"):
        with pytest.raises(ValueError, match="T"):
            Nu_rectangular_Shah_London(0.5, heated, condition="T")  # no "T" fit / table
    for bad in (3, "3", "top"):
        with pytest.raises(ValueError, match="heated"):
            Nu_rectangular_Shah_London(0.5, bad)


def _lap(m, h, left, right):
    main = -2.0 * np.ones(m)
    main[0] += -1.0 if left == "D" else 1.0  # mirrored ghost cell: Dirichlet 0 / zero flux
    main[-1] += -1.0 if right == "D" else 1.0
    return sp.diags([np.ones(m - 1), main, np.ones(m - 1)], [-1, 0, 1]) / h**2


def _fd_nu_h1(alpha, heated, n, ny_min=6):
    """Nu_H1 on D_h from a finite-difference solve (computed).

    Long walls y = 0, y = alpha (length 1); short walls x = 0, x = 1 (length alpha).
    heated = (x0, x1, y0, y1).  lap(u) = -1; lap(phi) = u/u_m with phi = 0 on heated
    walls and zero flux elsewhere; Nu = -A D_h / (P_heated phi_bulk), h on the heated
    perimeter, D_h on the full perimeter.
    """
    a, b = 1.0, alpha
    nx, ny = n, max(int(round(n * b)), ny_min)
    hx, hy = a / nx, b / ny
    Ix, Iy = sp.identity(nx), sp.identity(ny)
    Lu = sp.kron(Iy, _lap(nx, hx, "D", "D")) + sp.kron(_lap(ny, hy, "D", "D"), Ix)
    u = spla.spsolve(Lu.tocsc(), -np.ones(nx * ny))
    bc = ["D" if h else "N" for h in heated]
    Lt = sp.kron(Iy, _lap(nx, hx, bc[0], bc[1])) + sp.kron(_lap(ny, hy, bc[2], bc[3]), Ix)
    phi = spla.spsolve(Lt.tocsc(), u / u.mean())
    phib = (u * phi).sum() / u.sum()
    A, Dh = a * b, 2 * a * b / (a + b)
    P_heated = b * heated[0] + b * heated[1] + a * heated[2] + a * heated[3]
    return -A * Dh / (P_heated * phib)


def _fd_extrapolated(alpha, heated):
    n1, n2 = _fd_nu_h1(alpha, heated, 60), _fd_nu_h1(alpha, heated, 120)
    return (4 * n2 - n1) / 3


def test_finite_difference_solver_reproduces_four_wall_table():
    # computed solver checked first against the Shah & London table (memory; computed agrees)
    for alpha, _, nu_h1 in [(1.0, None, 3.608), (0.5, None, 4.123)]:
        assert _fd_extrapolated(alpha, (1, 1, 1, 1)) == pytest.approx(nu_h1, rel=1e-3)


@pytest.mark.parametrize("alpha", [1.0, 0.5, 0.25])
def test_three_walls_against_finite_difference(alpha):
    # computed: two long walls + one short wall heated.  The published fit (Shah & London
    # via Qu & Mudawar 2003, eq. 11) lies 0.5 to 1.2 % below our fine-grid solution
    # (older finite-difference data behind the table); accept 1.5 %.
    fd = _fd_extrapolated(alpha, (1, 0, 1, 1))
    fit = Nu_rectangular_Shah_London(alpha, "3L")
    assert fit == pytest.approx(fd, rel=0.015)


# computed: the "3S" / "1L" / "2L" tables of coldplate.convection came from this solver at
# 32/64/128 cells across the short side, Richardson-extrapolated.  Here a coarser grid
# (nx = 48 along the long side, at least 16 cells across) extrapolated from n and 2n must
# land within 1 %.  Walls: (x0, x1, y0, y1), the y walls being the long ones.
WALLS = {"3S": (1, 1, 1, 0), "1L": (0, 0, 1, 0), "2L": (0, 0, 1, 1), "3L": (1, 0, 1, 1)}


def _fd_coarse(alpha, heated):
    walls = WALLS[heated]
    n1, n2 = _fd_nu_h1(alpha, walls, 48, 16), _fd_nu_h1(alpha, walls, 96, 32)
    return (4 * n2 - n1) / 3


@pytest.mark.parametrize("heated", ["3S", "1L", "2L"])
@pytest.mark.parametrize("alpha", [1.0, 0.5, 0.25, 0.125])
def test_computed_tables_reproduced_by_finite_difference(heated, alpha):
    assert Nu_rectangular_finite_difference(alpha, heated) == pytest.approx(_fd_coarse(alpha, heated), rel=0.01)


@pytest.mark.parametrize("heated", ["3S", "1L", "2L"])
def test_computed_tables_interpolation_between_nodes(heated):
    # computed: the solver at midpoints between table nodes; the monotone cubic
    # interpolation was measured within 0.3 % (3S at alpha = 0.875 the worst); 1 % here
    for alpha in (0.1875, 0.875):
        assert Nu_rectangular_finite_difference(alpha, heated) == pytest.approx(_fd_coarse(alpha, heated), rel=0.01)


def test_monotone_cubic_against_scipy():
    # library: scipy.interpolate.PchipInterpolator (Fritsch-Carlson, the same scheme;
    # scipy is not imported by the code under test) on the module's own nodes
    from scipy.interpolate import PchipInterpolator

    from coldplate.plate.convection import _FD_ALPHA, _FD_H1

    a = np.linspace(0.0, 1.0, 201)
    for heated, nodes in _FD_H1.items():
        ref = PchipInterpolator(_FD_ALPHA, nodes)(a)
        assert np.allclose(Nu_rectangular_finite_difference(a, heated), ref, rtol=1e-12)


def test_square_duct_three_walls_either_name():
    # a square duct with three walls heated is one duct whichever pair is called "long":
    # "3S" (computed table) and "3L" (published fit, Shah & London via Qu & Mudawar 2003,
    # eq. 11) must agree within 1.5 % at alpha = 1
    assert Nu_rectangular_Shah_London(1.0, "3S") == pytest.approx(Nu_rectangular_Shah_London(1.0, "3L"), rel=0.015)
    # and the solver itself treats the two wall sets identically in a square (computed)
    assert _fd_nu_h1(1.0, WALLS["3S"], 32) == pytest.approx(_fd_nu_h1(1.0, WALLS["3L"], 32), rel=1e-12)


@pytest.mark.parametrize("heated, limit", [("3S", 70 / 13), ("1L", 70 / 13), ("2L", 8.235)])
def test_computed_tables_approach_parallel_plates(heated, limit):
    # textbook standard (VALIDATION.md): parallel plates, one plate heated and the
    # other insulated 70/13 = 5.385; both heated 8.235
    assert Nu_rectangular_finite_difference(0.0, heated) == pytest.approx(limit, abs=5e-4)
    # computed: a flat duct (alpha = 0.02) by the solver lies within 5 % of the limit,
    # and the table follows the solver there within 1 %
    fd = _fd_nu_h1(0.02, WALLS[heated], 800, 8)
    assert fd == pytest.approx(limit, rel=0.05)
    assert Nu_rectangular_finite_difference(0.02, heated) == pytest.approx(fd, rel=0.01)


@pytest.mark.parametrize("heated", HEATED_ARRANGEMENTS)
def test_selector_accepts_every_arrangement(heated):
    Pr, L, Dh = 5.0, 0.1, 0.002
    alpha = 0.4
    fd = nusselt(500.0, Pr, L, Dh, alpha, laminar="fully-developed", heated=heated)
    assert fd.Nu == Nu_rectangular_Shah_London(alpha, heated)
    expect = "Finite-difference" if heated in ("3S", "2L", "1L") else "Shah & London"
    assert fd.methods[0].method.startswith(expect)
    lam = nusselt(np.array([500.0, 5000.0]), Pr, L, Dh, alpha, heated=heated)
    assert np.all(np.isfinite(lam.Nu)) and np.all(lam.Nu > 0)
    with pytest.raises(ValueError, match="heated"):
        nusselt(500.0, Pr, L, Dh, 0.4, heated=heated.lower() + "x")


# ----------------------------------------------------------------- laminar entry, circular tube


# source: VALIDATION.md, Hausen values (computed from the published formula)
@pytest.mark.parametrize("Gz, nu", [(10.0, 4.223), (100.0, 7.248), (1000.0, 17.02)])
def test_hausen_check_values(Gz, nu):
    assert Nu_Hausen(Gz) == pytest.approx(nu, rel=5e-4)


def test_hausen_and_sieder_tate_against_ht():
    # library: ht.conv_internal.laminar_entry_thermal_Hausen and laminar_entry_Seider_Tate
    # (not called by the code under test)
    Re, Pr, L, D = 1200.0, 6.0, 0.3, 0.004
    assert Nu_Hausen(Re * Pr * D / L) == pytest.approx(hci.laminar_entry_thermal_Hausen(Re, Pr, L, D), rel=1e-12)
    mu, mu_w = 8.9e-4, 6.5e-4
    ref = hci.laminar_entry_Seider_Tate(Re, Pr, L, D, mu=mu, mu_w=mu_w)
    assert Nu_Sieder_Tate_laminar(Re, Pr, L / D, mu / mu_w) == pytest.approx(ref, rel=1e-12)
    # VALIDATION.md: Sieder-Tate has no 3.66 floor, Hausen does
    assert Nu_Sieder_Tate_laminar(100.0, 1.0, 1000.0) < 3.66 < Nu_Hausen(0.1)


# ----------------------------------------------------------------- turbulent

# source: Cengel, Heat and Mass Transfer, problem 8-40 (memory; arithmetic reproduced in
# VALIDATION.md): water at 45 C in a 2 cm tube, V = 0.4244 m/s
K_W, D_W, PR_W = 0.637, 0.02, 3.91
RE_W = 0.4244 * D_W / 0.602e-6


def test_dittus_boelter_worked_example():
    assert RE_W == pytest.approx(14101, rel=1e-3)
    nu = Nu_Dittus_Boelter(RE_W, PR_W)
    assert nu == pytest.approx(82.79, rel=1e-3)
    assert nu * K_W / D_W == pytest.approx(2637, rel=1e-3)
    # library: ht.conv_internal.turbulent_Dittus_Boelter (heating and cooling exponents)
    for heating in (True, False):
        assert Nu_Dittus_Boelter(RE_W, PR_W, heating) == pytest.approx(
            hci.turbulent_Dittus_Boelter(RE_W, PR_W, heating=heating), rel=1e-12)


def _gnielinski_vdi_by_hand(Re, Pr, L_over_D, f=None):
    """Gnielinski's mean Nu for a tube of length L, VDI Heat Atlas 2nd ed. (2010) ch. G1 eq. for Re >= 1e4,
    as in Gnielinski (2013) Int. J. Heat Mass Transfer 63:134 (from memory: this edition writes Re, not
    Re - 1000, and multiplies by [1 + (D/L)^(2/3)]; f = (1.8 log10 Re - 1.5)^-2 for smooth tubes)."""
    if f is None:
        f = (1.8 * math.log10(Re) - 1.5) ** -2
    nu = (f / 8) * Re * Pr / (1 + 12.7 * math.sqrt(f / 8) * (Pr ** (2 / 3) - 1))
    return nu * (1 + (1 / L_over_D) ** (2 / 3))


def _vdi_g1_blend(Re, Pr, L_over_D, nu_lam_2300):
    """VDI Heat Atlas G1 transition (from memory): Nu = (1 - g) Nu_lam(2300) + g Nu_turb(1e4),
    g = (Re - 2300) / (1e4 - 2300); Gnielinski's form above for Re >= 1e4."""
    if Re >= 1e4:
        return _gnielinski_vdi_by_hand(Re, Pr, L_over_D)
    g = (Re - 2300.0) / (1e4 - 2300.0)
    return (1 - g) * nu_lam_2300 + g * _gnielinski_vdi_by_hand(1e4, Pr, L_over_D)


def test_gnielinski_vdi_form_against_hand_evaluation():
    # published form (VDI Heat Atlas G1, from memory), evaluated independently above
    for Re, Pr, LD in ((1e4, 7.0, 53.0), (5e4, 5.4, 53.0), (2e5, 0.7, 10.0), (1e6, 50.0, 1000.0)):
        assert Nu_Gnielinski_VDI(Re, Pr, LD) == pytest.approx(_gnielinski_vdi_by_hand(Re, Pr, LD), rel=1e-12)
    assert f_Konakov(1e4) == pytest.approx(1 / 5.7**2, rel=1e-12)  # (1.8 * 4 - 1.5)^-2, arithmetic
    # the length factor: a long tube tends to the factor-free form
    long = Nu_Gnielinski_VDI(3e4, 5.0, 1e9)
    assert long == pytest.approx(_gnielinski_vdi_by_hand(3e4, 5.0, 1e9), rel=1e-12)
    ratio = (1 + 20.0 ** (-2 / 3)) / (1 + 1e9 ** (-2 / 3))
    assert Nu_Gnielinski_VDI(3e4, 5.0, 20.0) / long == pytest.approx(ratio, rel=1e-12)


@pytest.mark.parametrize("Re", [4000.0, 6150.0, 9000.0, 1e4, 2e4, 5e4])
def test_transition_blend_and_turbulent_against_vdi_g1(Re):
    # published: VDI Heat Atlas G1 (from memory), a round tube at L/D = 53, Pr 5.4; the turbulent anchor at
    # Re = 1e4 and every Re above carry the length factor [1 + (D/L)^(2/3)] (7.1 % at L/D 53)
    D, LD, Pr = 0.008, 53.0, 5.4
    nu_lam = nusselt(2300.0, Pr, LD * D, D, 1.0, shape="circle").Nu
    mine = nusselt(Re, Pr, LD * D, D, 1.0, shape="circle").Nu
    assert mine == pytest.approx(_vdi_g1_blend(Re, Pr, LD, nu_lam), rel=1e-9)


@pytest.mark.parametrize("eD", [1e-4, 1e-3, 1e-2])
def test_rough_wall_gnielinski_takes_colebrook(eD):
    # library: fluids.friction.Colebrook (the code under test solves Colebrook with its own Clamond steps),
    # put into Gnielinski's form (VDI Heat Atlas G1, from memory) as Gnielinski proposes for rough tubes
    D, L, Pr, Re = 0.006, 0.6, 6.0, 3e4
    f_rough = ff.Colebrook(Re, eD)
    expect = _gnielinski_vdi_by_hand(Re, Pr, L / D, f=f_rough)
    assert nusselt(Re, Pr, L, D, 1.0, shape="circle", rel_roughness=eD).Nu == pytest.approx(expect, rel=1e-9)
    # and the solve's own step passes the passage's roughness on (the check and the sizing search share it)
    class _Props:  # water-like properties, only to reach Re and Pr
        rho, mu, k = 998.0, 1.0e-3, 0.6
    pr = _Props()
    pr.Pr = Pr
    area = math.pi * D**2 / 4
    m_dot = Re * pr.mu * area / D
    model = type("Model", (), {"laminar": "muzychka-yovanovich", "turbulent": "gnielinski"})()
    _, Re_here, _, cv, _ = passage_flow(m_dot, pr, area, D, 1.0, "circle", L, L, "4", eD, model)
    assert Re_here == pytest.approx(Re, rel=1e-12)
    assert cv.Nu == pytest.approx(expect, rel=1e-9)
    smooth = _gnielinski_vdi_by_hand(Re, Pr, L / D)
    assert cv.Nu > smooth  # rough walls transfer more heat


# ----------------------------------------------------------------- Muzychka & Yovanovich


def _my_by_hand_square(Re, Pr, L, D, cond):
    """Independent evaluation for a square duct (sqrt(A) = D_h, so no conversion).

    published: Muzychka & Yovanovich (2004) mean-Nu constants C2 = 3/2, C4 = 2, gamma = 1/10;
    T: C1 = 3.24, C3 = 0.409, f(Pr) = 0.564/[1+(1.664 Pr^(1/6))^(9/2)]^(2/9);
    H: C1 = 3.86, C3 = 0.501, f(Pr) = 0.886/[1+(1.909 Pr^(1/6))^(9/2)]^(2/9).
    Square-duct Fanning f Re = 14.227 (Shah & London table, memory; computed agrees).
    """
    C1, C3, c0, cp = (3.24, 0.409, 0.564, 1.664) if cond == "T" else (3.86, 0.501, 0.886, 1.909)
    fRe = 14.227
    z = L / (D * Re * Pr)
    m = 2.27 + 1.65 * Pr ** (1 / 3)
    fPr = c0 / (1 + (cp * Pr ** (1 / 6)) ** 4.5) ** (2 / 9)
    lev = (1.5 * C3 * (fRe / z) ** (1 / 3)) ** 5
    fd = (C1 * fRe / (8 * math.sqrt(math.pi))) ** 5
    return ((2 * fPr / math.sqrt(z)) ** m + (lev + fd) ** (m / 5)) ** (1 / m)


def _my_by_hand_circle(Re, Pr, L, D, cond, nu_fd):
    """The same model for a round tube on its own scale: sqrt(A) = sqrt(pi) D / 2, Fanning f Re_sqrtA =
    16 sqrt(pi)/2 = 8 sqrt(pi) (published: Muzychka & Yovanovich 2004 treat the circle this way; from memory),
    then Nu_D = Nu_sqrtA / (sqrt(pi)/2); the given fully developed Nu_D replaces the model's asymptote."""
    C1, C3, c0, cp = (3.24, 0.409, 0.564, 1.664) if cond == "T" else (3.86, 0.501, 0.886, 1.909)
    r = math.sqrt(math.pi) / 2
    fRe = 8 * math.sqrt(math.pi)
    z = L / ((r * D) * (r * Re) * Pr)
    m = 2.27 + 1.65 * Pr ** (1 / 3)
    fPr = c0 / (1 + (cp * Pr ** (1 / 6)) ** 4.5) ** (2 / 9)
    lev = (1.5 * C3 * (fRe / z) ** (1 / 3)) ** 5
    return ((2 * fPr / math.sqrt(z)) ** m + (lev + (nu_fd * r) ** 5) ** (m / 5)) ** (1 / m) / r


@pytest.mark.parametrize("cond, nu_fd", [("T", 3.657), ("H1", 48 / 11)])
@pytest.mark.parametrize("L", [0.005, 0.05, 0.5])
def test_round_tube_takes_the_circles_constants(cond, nu_fd, L):
    Re, Pr, D = 800.0, 5.0, 0.004
    sel = nusselt(Re, Pr, L, D, 1.0, shape="circle", condition=cond).Nu
    assert sel == pytest.approx(_my_by_hand_circle(Re, Pr, L, D, cond, nu_fd), rel=1e-12)


@pytest.mark.parametrize("cond, c_mean", [("T", 1.615), ("H1", 1.953)])
def test_round_tube_thermal_entry_near_leveque(cond, c_mean):
    # published: Shah & London (1978) Graetz-Leveque limit of a circular tube, mean Nu = c x*^(-1/3),
    # x* = L / (D Re Pr): 1.615 uniform wall temperature, 1.953 uniform flux (from memory; 1.5 x the local
    # 1.077 and 1.302).  Large Pr and a short tube isolate that term; the circle's constants land within
    # 5 % of it (-4.3 % and -3.0 %), the square of the same D_h (the former constants) 7-8 % low.
    Re, Pr, D, xs = 1000.0, 1e4, 0.004, 1e-4
    nu = nusselt(Re, Pr, xs * D * Re * Pr, D, 1.0, shape="circle", condition=cond).Nu
    assert nu == pytest.approx(c_mean * xs ** (-1 / 3), rel=0.05)


@pytest.mark.parametrize("cond", ["T", "H1"])
@pytest.mark.parametrize("L", [0.005, 0.05, 0.5])
def test_muzychka_yovanovich_against_hand_evaluation(cond, L):
    Re, Pr, D = 800.0, 5.0, 0.002
    mine = Nu_Muzychka_Yovanovich_combined(Re, Pr, L, D, 1.0, condition=cond)
    assert mine == pytest.approx(_my_by_hand_square(Re, Pr, L, D, cond), rel=2e-4)


def test_muzychka_yovanovich_prandtl_constant_and_limits():
    # from memory: Pohlhausen 0.339 (flat plate, uniform T); 0.564/0.339 = 1.664, not 1.644
    assert round(0.564 / 0.339, 3) == 1.664
    Re, Pr, Dh = 500.0, 6.0, 0.002
    for alpha in (1.0, 0.5, 0.2):
        nu_fd = Nu_rectangular_Shah_London(alpha, "4", "H1")
        long = Nu_Muzychka_Yovanovich_combined(Re, Pr, 1e4 * Dh * Re * Pr, Dh, alpha, "H1", Nu_fd=nu_fd)
        assert long == pytest.approx(nu_fd, rel=1e-4)  # long duct -> the given asymptote
        short = Nu_Muzychka_Yovanovich_combined(Re, Pr, 0.01, Dh, alpha, "H1", Nu_fd=nu_fd)
        assert short > 2.0 * nu_fd  # short duct: entry effects raise the mean Nu
        lengths = np.array([0.005, 0.02, 0.1, 1.0])
        assert np.all(np.diff(Nu_Muzychka_Yovanovich_combined(Re, Pr, lengths, Dh, alpha, Nu_fd=nu_fd)) < 0)


@pytest.mark.parametrize("alpha, nu_t, nu_h1", TABLE[:5])
def test_muzychka_yovanovich_own_asymptote_within_published_accuracy(alpha, nu_t, nu_h1):
    # published: the model's own fully developed limit is claimed to be within about 10 %
    # of exact values; against the Shah & London table (memory; computed agrees) we measure
    # +3.5 to +12.3 % (worst: "T" at alpha = 0.5), always high.  Hence the selector passes
    # the Shah & London value as Nu_fd.  Bound used here: 0 to +13 %.
    Re, Pr, Dh = 500.0, 6.0, 0.002
    L = 1e5 * Dh * Re * Pr
    for cond, exact in (("T", nu_t), ("H1", nu_h1)):
        ratio = Nu_Muzychka_Yovanovich_combined(Re, Pr, L, Dh, alpha, cond) / exact
        assert 1.0 < ratio < 1.13, (cond, ratio)


# ----------------------------------------------------------------- selector


def _norm(text):
    return re.sub(r"[^a-z]", "", text.lower())


def test_dispatcher_names_agree_with_functions():
    for table in (LAMINAR_MODELS, TURBULENT_MODELS):
        for name, fn in table.items():
            assert callable(fn) and fn.validity.method
            assert _norm(name) in _norm(fn.validity.method), (name, fn.validity.method)
            assert fn.__name__.startswith("Nu_")


def test_unknown_model_names_raise():
    with pytest.raises(ValueError, match="hausen"):
        nusselt(1000.0, 5.0, 0.1, 0.002, 0.5, laminar="nope")
    with pytest.raises(ValueError, match="gnielinski"):
        nusselt(1000.0, 5.0, 0.1, 0.002, 0.5, turbulent="nope")


@pytest.mark.parametrize("shape", ["rectangle", "circle"])
@pytest.mark.parametrize("laminar", sorted(LAMINAR_MODELS))
@pytest.mark.parametrize("turbulent", sorted(TURBULENT_MODELS))
def test_selector_continuous_at_regime_limits(shape, laminar, turbulent):
    args = dict(Pr=5.0, L=0.1, D_h=0.002, alpha=0.4, shape=shape, laminar=laminar, turbulent=turbulent)
    for Re0 in (RE_LAMINAR_END, RE_TURBULENT_START):
        lo = nusselt(Re0 * (1 - 1e-13), **args).Nu
        hi = nusselt(Re0 * (1 + 1e-13), **args).Nu
        assert abs(hi - lo) / lo < 1e-9


def test_selector_regimes_values_and_methods():
    Pr, L, Dh, alpha = 5.0, 0.1, 0.002, 0.4
    lam = nusselt(1000.0, Pr, L, Dh, alpha)
    assert isinstance(lam, ConvectionResult) and lam.regime == "laminar" and lam.transition_weight == 0.0
    nu_fd = Nu_rectangular_Shah_London(alpha)
    assert lam.Nu == Nu_Muzychka_Yovanovich_combined(1000.0, Pr, L, Dh, alpha, Nu_fd=nu_fd)
    assert [v.method for v in lam.methods] == ["Muzychka & Yovanovich", "Shah & London (fully developed)"]
    turb = nusselt(3e4, Pr, L, Dh, alpha, turbulent="dittus-boelter")
    assert turb.regime == "turbulent" and turb.Nu == Nu_Dittus_Boelter(3e4, Pr)
    mid = nusselt(6150.0, Pr, L, Dh, alpha, laminar="hausen")
    expect = 0.5 * Nu_Hausen(2300.0 * Pr * Dh / L) + 0.5 * Nu_Gnielinski_VDI(1e4, Pr, L / Dh)
    assert mid.regime == "transitional" and mid.Nu == pytest.approx(expect, rel=1e-12)
    assert mid.transition_weight == pytest.approx(0.5)
    fd = nusselt(500.0, Pr, L, Dh, alpha, laminar="fully-developed", heated="3L")
    assert fd.Nu == Nu_rectangular_Shah_London(alpha, "3L")
    circ = nusselt(500.0, Pr, L, Dh, alpha, shape="circle", laminar="fully-developed", condition="T")
    assert circ.Nu == pytest.approx(3.657)
    rough = nusselt(5e4, Pr, L, Dh, alpha, rel_roughness=0.01)
    assert rough.Nu == pytest.approx(Nu_Gnielinski_VDI(5e4, Pr, L / Dh, ff.Clamond(5e4, 0.01)), rel=1e-9)


def test_selector_arrays():
    Re = np.array([10.0, 2300.0, 5000.0, 1e4, 1e6])
    res = nusselt(Re, 7.0, 0.05, 0.001, 0.25)
    assert res.Nu.shape == (5,) and np.all(np.diff(res.Nu) > 0)
    assert list(res.regime) == ["laminar", "laminar", "transitional", "turbulent", "turbulent"]


@settings(max_examples=60, deadline=None)
@given(
    Re=st.floats(10.0, 1e6),
    Pr=st.floats(1.0, 50.0),
    L=st.floats(1e-3, 1.0),
    alpha=st.floats(0.05, 1.0),
    laminar=st.sampled_from(sorted(LAMINAR_MODELS)),
    turbulent=st.sampled_from(sorted(TURBULENT_MODELS)),
    shape=st.sampled_from(["rectangle", "circle"]),
)
def test_selector_finite_and_positive(Re, Pr, L, alpha, laminar, turbulent, shape):
    nu = nusselt(Re, Pr, L, 0.002, alpha, shape=shape, laminar=laminar, turbulent=turbulent).Nu
    assert math.isfinite(nu) and nu > 0
