"""The standard thermoelectric module model against outside references.

Sources, named beside each check:
- *computed* check values of VALIDATION.md ("Thermoelectric module (standard model)"):
  Luo (2008, Electronics Cooling) derivation of S, R, K from datasheet maxima, and the model at one point.
- *published* classic ideal-module results (Ioffe 1957, "Semiconductor Thermoelements and Thermoelectric
  Cooling"; also Rowe, CRC Handbook of Thermoelectrics 1995), recalled *from memory*: with a perfect heat
  sink and no load the largest temperature difference is Z Tc^2 / 2 at I = S Tc / R; the largest heat
  pumped with no temperature difference is S^2 T^2 / (2R) at I = S T / R; the best COP at a fixed
  difference is at I = S dT / (R (sqrt(1 + Z Tm) - 1)) with COP = Tc (M - Th/Tc) / (dT (M + 1)).
  The tests find those optima by brute-force search over the current, not by the closed forms.
- energy balance (first law): Q_h - Q_c = V I.
"""
from __future__ import annotations

import math

import numpy as np
import pytest

from coldplate.modules import model as te

# VALIDATION.md, "Thermoelectric module (standard model)", label: computed
TH, DTMAX, IMAX, VMAX = 300.0, 70.0, 6.0, 15.0


def test_luo_parameters_reference_values():
    # computed (VALIDATION.md): S = 0.05 V/K, R = 1.91667 ohm, K = 0.492857 W/K
    S, R, K = te.luo_parameters(IMAX, VMAX, DTMAX, TH)
    assert S == pytest.approx(0.05, rel=1e-9)
    assert R == pytest.approx(1.91667, rel=1e-5)
    assert K == pytest.approx(0.492857, rel=1e-6)


def test_model_at_one_point_reference_values():
    # computed (VALIDATION.md): I = 4 A, Tc = 290 K, Th = 300 K
    S, R, K = te.luo_parameters(IMAX, VMAX, DTMAX, TH)
    Qc = te.cold_side_heat(S, R, K, 4.0, 290.0, 300.0)
    V = te.module_voltage(S, R, 4.0, 290.0, 300.0)
    P = te.electrical_power(S, R, 4.0, 290.0, 300.0)
    assert Qc == pytest.approx(37.738, abs=5e-4)
    assert V == pytest.approx(8.1667, abs=5e-5)
    assert P == pytest.approx(32.667, abs=5e-4)
    assert te.coefficient_of_performance(Qc, P) == pytest.approx(1.155, abs=5e-4)


@pytest.mark.parametrize("I_max,V_max,dT_max,T_h", [(IMAX, VMAX, DTMAX, TH), (3.9, 16.1, 72.0, 323.15),
                                                     (8.5, 24.6, 66.0, 298.15), (1.2, 3.8, 60.0, 350.0)])
def test_module_reproduces_its_datasheet(I_max, V_max, dT_max, T_h):
    """The derived module gives back its own maxima at the rated hot side (computed, VALIDATION.md
    "Thermoelectric module (standard model)": 'at (Imax, dTmax) Qc = 0 and V = Vmax exactly'; the dT_max and
    its current by brute-force search)."""
    S, R, K = te.luo_parameters(I_max, V_max, dT_max, T_h)
    T_c = T_h - dT_max
    assert te.cold_side_heat(S, R, K, I_max, T_c, T_h) == pytest.approx(0.0, abs=1e-9)
    assert te.module_voltage(S, R, I_max, T_c, T_h) == pytest.approx(V_max, rel=1e-12)
    # brute force: at each current, the no-load cold face with the hot side held at T_h
    I = np.linspace(0.0, 2.0 * I_max, 400_001)[1:]
    T_c_noload = te.cold_face_temperature(S, R, K, I, 0.0, T_h)
    k = int(np.argmin(T_c_noload))
    assert T_h - T_c_noload[k] == pytest.approx(dT_max, abs=1e-6)
    assert I[k] == pytest.approx(I_max, abs=2 * (I[1] - I[0]))
    # Q_max as datasheets quote it: at I_max with no temperature difference
    Q_search = te.cold_side_heat(S, R, K, I_max, T_h, T_h)
    assert te.datasheet_max_heat(S, R, I_max, T_h) == pytest.approx(Q_search, rel=1e-12)
    # computed (algebra of Luo's three equations): Q_max = I_max V_max (T_h + dT_max) / (2 T_h)
    assert Q_search == pytest.approx(I_max * V_max * (T_h + dT_max) / (2 * T_h), rel=1e-12)


@pytest.mark.parametrize("S,R,K,T_h", [(0.05, 1.91667, 0.492857, 300.0), (0.0254, 1.2, 0.31, 320.0),
                                       (0.06, 3.0, 0.4, 280.0)])
def test_ideal_max_temperature_difference_perfect_sink(S, R, K, T_h):
    """Ioffe (1957), from memory: at Q_c = 0 the largest dT is Z Tc^2 / 2, reached at I = S Tc / R."""
    I = np.linspace(1e-4, 3.0 * S * T_h / R, 600_001)
    T_c = te.cold_face_temperature(S, R, K, I, 0.0, T_h)
    k = int(np.argmin(T_c))
    dT_search, Tc_min = T_h - T_c[k], T_c[k]
    Z = S * S / (R * K)
    assert dT_search == pytest.approx(Z * Tc_min**2 / 2.0, rel=1e-6)
    assert I[k] == pytest.approx(S * Tc_min / R, abs=2 * (I[1] - I[0]))
    dT, I_at = te.max_temperature_difference(S, R, K, T_h)
    assert dT == pytest.approx(dT_search, abs=1e-6)
    assert I_at == pytest.approx(I[k], abs=2 * (I[1] - I[0]))


@pytest.mark.parametrize("S,R,T", [(0.05, 1.91667, 300.0), (0.0254, 1.2, 320.0)])
def test_ideal_max_heat_pumping_at_zero_difference(S, R, T):
    """Ioffe (1957), from memory: with dT = 0 the largest Q_c is S^2 T^2 / (2R), at I = S T / R."""
    I = np.linspace(0.0, 3.0 * S * T / R, 300_001)
    Q = te.cold_side_heat(S, R, 0.4, I, T, T)
    k = int(np.argmax(Q))
    assert Q[k] == pytest.approx(S * S * T * T / (2 * R), rel=1e-9)
    assert I[k] == pytest.approx(S * T / R, abs=2 * (I[1] - I[0]))
    Q_max, I_max = te.max_heat_pumping(S, R, T)
    assert (Q_max, I_max) == (pytest.approx(Q[k], rel=1e-9), pytest.approx(I[k], abs=2 * (I[1] - I[0])))


@pytest.mark.parametrize("T_c,T_h", [(280.0, 300.0), (260.0, 310.0), (295.0, 300.0)])
def test_best_cop_at_fixed_difference(T_c, T_h):
    """Ioffe (1957), from memory: the optimum COP at fixed faces is Tc (M - Th/Tc) / (dT (M + 1)),
    M = sqrt(1 + Z Tm), at I = S dT / (R (M - 1)); found here by brute force over the current."""
    S, R, K = te.luo_parameters(IMAX, VMAX, DTMAX, TH)
    I = np.linspace(0.01, 3 * IMAX, 400_001)
    cop = te.coefficient_of_performance(te.cold_side_heat(S, R, K, I, T_c, T_h),
                                        te.electrical_power(S, R, I, T_c, T_h))
    k = int(np.nanargmax(cop))
    dT, Tm = T_h - T_c, 0.5 * (T_c + T_h)
    M = math.sqrt(1 + te.figure_of_merit(S, R, K) * Tm)
    assert cop[k] == pytest.approx(T_c * (M - T_h / T_c) / (dT * (M + 1)), rel=1e-8)
    assert I[k] == pytest.approx(S * dT / (R * (M - 1)), abs=2 * (I[1] - I[0]))


def test_energy_balance():
    """First law: the hot side rejects the pumped heat plus the electrical power, Q_h - Q_c = V I."""
    rng = np.random.default_rng(3)
    S, R, K = rng.uniform(0.01, 0.08, 200), rng.uniform(0.5, 4, 200), rng.uniform(0.1, 1, 200)
    I, T_c, T_h = rng.uniform(0, 10, 200), rng.uniform(230, 320, 200), rng.uniform(270, 360, 200)
    Qh, Qc = te.hot_side_heat(S, R, K, I, T_c, T_h), te.cold_side_heat(S, R, K, I, T_c, T_h)
    np.testing.assert_allclose(Qh - Qc, te.module_voltage(S, R, I, T_c, T_h) * I, rtol=1e-12, atol=1e-12)


def test_hot_side_line_matches_the_equations():
    """Q_h = c0 + c1 T_h with T_c eliminated (computed: the model's own equations at random points)."""
    rng = np.random.default_rng(5)
    S, R, K = te.luo_parameters(IMAX, VMAX, DTMAX, TH)
    for _ in range(50):
        I, Qc, T_h = rng.uniform(0, 6), rng.uniform(0, 40), rng.uniform(280, 350)
        c0, c1 = te.hot_side_heat_line(S, R, K, I, Qc)
        T_c = te.cold_face_temperature(S, R, K, I, Qc, T_h)
        assert te.cold_side_heat(S, R, K, I, T_c, T_h) == pytest.approx(Qc, abs=1e-9)
        assert c0 + c1 * T_h == pytest.approx(te.hot_side_heat(S, R, K, I, T_c, T_h), rel=1e-12)


def test_array_supply():
    """Series strings add voltages, parallel strings add currents (Kirchhoff; common practice)."""
    assert te.array_supply(4.0, 9.0, 4, 1) == (4.0, 36.0)
    assert te.array_supply(4.0, 9.0, 4, 4) == (16.0, 9.0)
    assert te.array_supply(4.0, 9.0, 6, 2) == (8.0, 27.0)
    with pytest.raises(ValueError):
        te.array_supply(4.0, 9.0, 5, 2)


def test_luo_refuses_impossible_maxima():
    with pytest.raises(ValueError):
        te.luo_parameters(6.0, 15.0, 300.0, 300.0)
