"""Validation of hydraulics.ducts and hydraulics.friction against outside references.

Labels as in VALIDATION.md: published / library / memory / computed.
"""
import math
import warnings

import fluids.friction as ff
import numpy as np
import pytest
import scipy.sparse as sp
import scipy.sparse.linalg as spla

from hydraulics.ducts import (
    RE_LAMINAR_END,
    RE_TURBULENT_START,
    aspect_ratio,
    f_apparent_Muzychka_Yovanovich,
    f_apparent_Shah,
    fRe_rectangular_Shah_London,
    hydraulic_diameter,
    hydraulic_diameter_rectangle,
    sqrtA_over_Dh,
    transition_weight,
)
from hydraulics.friction import FrictionResult, darcy_friction, f_Colebrook, f_Petukhov

# ----------------------------------------------------------------- geometry and regime


def test_geometry_helpers():
    # common practice: D_h = 4A/P; a 2 x 1 rectangle has A = 2, P = 6, D_h = 4/3
    assert hydraulic_diameter_rectangle(2.0, 1.0) == pytest.approx(4.0 / 3.0)
    assert hydraulic_diameter(2.0, 6.0) == pytest.approx(4.0 / 3.0)
    assert aspect_ratio(1.0, 4.0) == aspect_ratio(4.0, 1.0) == 0.25
    # sqrt(A)/D_h for the square is 1 (both length scales are the side)
    assert sqrtA_over_Dh(1.0) == pytest.approx(1.0)
    a, b = 3.0, 0.75  # sqrt(A)/D_h from the definitions directly
    assert sqrtA_over_Dh(b / a) == pytest.approx(math.sqrt(a * b) / hydraulic_diameter_rectangle(a, b))
    with pytest.raises(ValueError):
        hydraulic_diameter_rectangle(0.0, 1.0)


def test_transition_weight_limits():
    # VDI Heat Atlas G1 (as summarised in VALIDATION.md): 0 at 2300, 1 at 1e4, linear
    assert RE_LAMINAR_END == 2300.0 and RE_TURBULENT_START == 1.0e4
    w = transition_weight(np.array([100.0, 2300.0, 6150.0, 1e4, 1e6]))
    assert np.allclose(w, [0.0, 0.0, 0.5, 1.0, 1.0])
    assert isinstance(transition_weight(5000.0), float)


# ----------------------------------------------------------------- fully developed f Re


# source: Shah & London 1978 rectangular-duct table, via VALIDATION.md
# (label there: memory; computed agrees).  Fanning f Re.
@pytest.mark.parametrize("alpha, fanning", [
    (1.0, 14.227), (0.5, 15.548), (1.0 / 3.0, 17.090), (0.25, 18.233), (0.125, 20.585), (0.0, 24.000),
])
def test_fRe_against_shah_london_table(alpha, fanning):
    assert fRe_rectangular_Shah_London(alpha) == pytest.approx(4.0 * fanning, rel=1e-4)


def _fd_poiseuille_darcy_fRe(a, b, n):
    """Darcy f Re of a rectangle a x b from a finite-difference solve of lap(u) = -1 (computed)."""
    nx, ny = n, max(int(round(n * b / a)), 4)
    hx, hy = a / nx, b / ny

    def lap(m, h):  # cell-centred, u = 0 on the walls through a mirrored ghost cell
        main = -2.0 * np.ones(m)
        main[[0, -1]] = -3.0
        return sp.diags([np.ones(m - 1), main, np.ones(m - 1)], [-1, 0, 1]) / h**2

    L = sp.kron(sp.identity(ny), lap(nx, hx)) + sp.kron(lap(ny, hy), sp.identity(nx))
    u = spla.spsolve(L.tocsc(), -np.ones(nx * ny))
    Dh = 2 * a * b / (a + b)
    # force balance: tau_w P = -dp/dx A  ->  Darcy f Re = 2 D_h^2 / u_mean (mu = 1, -dp/dx = 1)
    return 2.0 * Dh**2 / u.mean()


@pytest.mark.parametrize("alpha", [1.0, 0.4])
def test_fRe_against_finite_difference_solution(alpha):
    # computed: independent numerical solution of the Poiseuille problem, Richardson-extrapolated
    f1 = _fd_poiseuille_darcy_fRe(1.0, alpha, 60)
    f2 = _fd_poiseuille_darcy_fRe(1.0, alpha, 120)
    assert fRe_rectangular_Shah_London(alpha) == pytest.approx((4 * f2 - f1) / 3, rel=2e-4)


def test_fRe_arrays_and_small_alpha_without_warnings():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        out = fRe_rectangular_Shah_London(np.array([0.0, 1e-300, 1e-8, 0.5, 1.0]))
    assert out.shape == (5,)
    # textbook standard: parallel plates Darcy f Re = 96
    assert out[0] == 96.0 and out[1] == pytest.approx(96.0, rel=1e-12)
    assert out[2] == pytest.approx(96.0, rel=1e-6)
    assert np.all(np.diff(out) <= 0)  # f Re falls monotonically towards the square
    with pytest.raises(ValueError):
        fRe_rectangular_Shah_London(1.5)


# ----------------------------------------------------------------- developing laminar flow


# source: Shah (1978) correlation, check values in VALIDATION.md (computed, Fanning f_app Re)
@pytest.mark.parametrize("x_plus, fanning_fRe", [(0.001, 109.8), (0.01, 38.55), (0.1, 18.96)])
def test_shah_apparent_check_values(x_plus, fanning_fRe):
    Re, D = 1000.0, 0.01
    f = f_apparent_Shah(Re, x_plus * D * Re, D)
    assert f * Re / 4.0 == pytest.approx(fanning_fRe, rel=5e-4)  # values given to 4 digits


def test_shah_apparent_long_tube_tends_to_hagen_poiseuille():
    # library: fluids.friction.friction_laminar (64/Re), not called by the code under test
    Re, D = 800.0, 0.004
    f = f_apparent_Shah(Re, 100.0 * D * Re, D)  # x+ = 100
    assert f == pytest.approx(ff.friction_laminar(Re), rel=5e-4)


def test_muzychka_yovanovich_long_duct_tends_to_shah_london():
    # published model form (Muzychka & Yovanovich 2009): the L+ term vanishes for long ducts,
    # leaving the Shah & London fully developed value (exact series, checked above)
    Re, Dh = 500.0, 0.002
    for alpha in (1.0, 0.5, 0.1):
        f = f_apparent_Muzychka_Yovanovich(Re, 1e4 * Dh * Re, Dh, alpha)
        assert f * Re == pytest.approx(fRe_rectangular_Shah_London(alpha), rel=1e-3)


@pytest.mark.parametrize("alpha", [1.0, 0.5, 0.25, 0.1])
def test_muzychka_yovanovich_fully_developed_matches_paper_one_term_form(alpha):
    # published: Muzychka & Yovanovich (2009) give f Re_sqrtA = 12 / (sqrt(e)(1+e)
    # [1 - 192 e/pi^5 tanh(pi/(2e))]) (first term of the series).  Our sqrt(A) conversion of
    # the exact D_h-basis series must reproduce it to within that truncation (< 1 %).
    one_term = 12.0 / (math.sqrt(alpha) * (1 + alpha)
                       * (1 - 192 * alpha / math.pi**5 * math.tanh(math.pi / (2 * alpha))))
    Re, Dh = 300.0, 0.001
    f = f_apparent_Muzychka_Yovanovich(Re, 1e5 * Dh * Re, Dh, alpha)
    r = sqrtA_over_Dh(alpha)
    fanning_Re_sqrtA = f / 4.0 * (r * Re)
    assert fanning_Re_sqrtA == pytest.approx(one_term, rel=0.01)


def test_muzychka_yovanovich_square_short_duct_close_to_shah_circle():
    # published: both models share the short-duct asymptote 3.44/sqrt(x+), which is
    # independent of the length scale.  Measured gap for the square duct vs Shah's circular
    # tube: < 0.15 % for x+ <= 1e-3, < 3.5 % for x+ <= 1e-2 (then the fully developed
    # values 14.23 vs 16 take over).
    Re, D = 1000.0, 0.01
    for x_plus, tol in ((1e-5, 1.5e-3), (1e-4, 1.5e-3), (1e-3, 1.5e-3), (1e-2, 0.035)):
        L = x_plus * D * Re
        ratio = f_apparent_Muzychka_Yovanovich(Re, L, D, 1.0) / f_apparent_Shah(Re, L, D)
        assert abs(ratio - 1.0) < tol, (x_plus, ratio)


# ----------------------------------------------------------------- turbulent


def test_petukhov_against_prandtl_karman_nikuradse():
    # library: fluids.friction.Prandtl_von_Karman_Nikuradse (smooth-pipe law), not called by
    # f_Petukhov.  Petukhov's explicit fit stays within 2 % of it from 1e4 to 5e6.
    Re = np.array([1e4, 3e4, 1e5, 1e6, 5e6])
    ref = np.array([ff.Prandtl_von_Karman_Nikuradse(x) for x in Re])
    assert np.all(np.abs(f_Petukhov(Re) / ref - 1.0) < 0.02)
    assert isinstance(f_Petukhov(1e5), float)


@pytest.mark.filterwarnings("ignore:overflow encountered:RuntimeWarning")  # inside the reference library
def test_colebrook_against_reference_solution():
    # library: fluids.friction.Colebrook solves the same Colebrook equation with a different
    # algorithm (Lambert W); f_Colebrook calls fluids.friction.Clamond, not Colebrook.
    Re = np.array([5e3, 1e5, 1e7])
    out = f_Colebrook(Re, 1e-3)
    ref = [ff.Colebrook(x, 1e-3) for x in Re]
    assert np.allclose(out, ref, rtol=1e-9)
    # memory: Moody chart, Re = 1e5, e/D = 0.001 -> f about 0.0222
    assert f_Colebrook(1e5, 1e-3) == pytest.approx(0.0222, abs=3e-4)


def _clamond_as_documented(Re, eD, X2):
    """Clamond's (2009) two steps as f_Colebrook's docstring writes them, in plain floats."""
    X1 = eD * Re * math.log(10) / 18.574
    F = X2 - 0.2
    for _ in range(2):
        E = (math.log(X1 + F) + F - X2) / (1 + X1 + F)
        F = F - (1 + X1 + F + E / 2) * E * (X1 + F) / (1 + X1 + F + E * (1 + E / 3))
    return (math.log(10) / 2) ** 2 / F**2


@pytest.mark.filterwarnings("ignore:overflow encountered:RuntimeWarning")  # inside the reference library
def test_colebrook_docstring_states_clamonds_x2():
    # published: Clamond (2009) Ind. Eng. Chem. Res. 48:3665, X2 = ln(Re ln10 / 5.02) (from memory); the
    # documented steps with it reproduce the Colebrook solution (library: fluids.friction.Colebrook), while
    # ln Re - ln(ln10/5.02) (the sign of the logarithm flipped) does not
    doc = " ".join(f_Colebrook.__doc__.split())
    assert "X2 = ln(Re ln10/5.02)" in doc
    for Re, eD in ((5e3, 1e-3), (1e5, 0.0), (1e7, 1e-2)):
        ref = ff.Colebrook(Re, eD)
        assert _clamond_as_documented(Re, eD, math.log(Re * math.log(10) / 5.02)) == pytest.approx(ref, rel=1e-9)
        wrong = _clamond_as_documented(Re, eD, math.log(Re) - math.log(math.log(10) / 5.02))
        assert abs(wrong / ref - 1) > 1e-3


# ----------------------------------------------------------------- blended friction


@pytest.mark.parametrize("shape, rough", [("rectangle", 0.0), ("circle", 0.0), ("rectangle", 2e-3)])
def test_darcy_friction_continuous_at_regime_limits(shape, rough):
    L, Dh, alpha = 0.08, 0.0015, 0.3
    for Re0 in (RE_LAMINAR_END, RE_TURBULENT_START):
        lo = darcy_friction(Re0 * (1 - 1e-13), L, Dh, alpha, shape, rough).f
        hi = darcy_friction(Re0 * (1 + 1e-13), L, Dh, alpha, shape, rough).f
        assert abs(hi - lo) / lo < 1e-9


def test_darcy_friction_regimes_and_methods():
    L, Dh, alpha = 0.1, 0.002, 0.5
    lam = darcy_friction(1000.0, L, Dh, alpha, "rectangle")
    assert isinstance(lam, FrictionResult) and lam.regime == "laminar"
    assert lam.f == f_apparent_Muzychka_Yovanovich(1000.0, L, Dh, alpha)
    assert [v.method for v in lam.methods] == ["Muzychka & Yovanovich"]
    circ = darcy_friction(1000.0, L, Dh, alpha, "circle")
    assert circ.f == f_apparent_Shah(1000.0, L, Dh) and circ.methods[0].method == "Shah"
    turb = darcy_friction(5e4, L, Dh, alpha, "rectangle")
    assert turb.regime == "turbulent" and turb.f == f_Petukhov(5e4)
    rough = darcy_friction(5e4, L, Dh, alpha, "rectangle", rel_roughness=1e-3)
    assert rough.methods[-1].method == "Colebrook" and rough.f == pytest.approx(ff.Colebrook(5e4, 1e-3))
    mid = darcy_friction(6150.0, L, Dh, alpha, "rectangle")
    assert mid.regime == "transitional" and len(mid.methods) == 2
    half = 0.5 * (f_apparent_Muzychka_Yovanovich(2300.0, L, Dh, alpha) + f_Petukhov(1e4))
    assert mid.f == pytest.approx(half, rel=1e-12)


def test_darcy_friction_arrays_and_errors():
    Re = np.array([50.0, 2300.0, 4000.0, 1e4, 1e6])
    res = darcy_friction(Re, 0.1, 0.002, 0.5, "rectangle")
    assert res.f.shape == (5,) and np.all(np.isfinite(res.f)) and np.all(res.f > 0)
    assert list(res.regime) == ["laminar", "laminar", "transitional", "turbulent", "turbulent"]
    with pytest.raises(ValueError):
        darcy_friction(1000.0, 0.1, 0.002, 0.5, "triangle")
