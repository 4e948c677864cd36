"""Validation of coldplate.psychro against ASHRAE values, psychrolib and iapws.

psychrolib (ASHRAE Handbook formulation) and iapws (IAPWS-IF97 saturation line,
IAPWS R14-08 sublimation line) are independent packages: the code under test
calls neither.
"""
import subprocess
import sys

import numpy as np
import psychrolib
import pytest
from iapws._iapws import _Sublimation_Pressure
from iapws.iapws97 import _PSat_T

from coldplate.plate import psychro

psychrolib.SetUnitSystem(psychrolib.SI)
K0 = 273.15


@pytest.mark.parametrize("T_c, p_ref", [(25.0, 3169.7), (50.0, 12351.3)])
def test_saturation_pressure_ashrae_table(T_c, p_ref):
    # source: published, ASHRAE Handbook Fundamentals 2017 ch. 1 (VALIDATION.md);
    # the table comes from IAPWS-95, eq. 6 reproduces it within about 0.02 %
    assert psychro.p_sat_water_HylandWexler(T_c + K0) == pytest.approx(p_ref, rel=3e-4)


def test_saturation_over_water_against_iapws():
    # source: library, iapws.iapws97._PSat_T (IAPWS-IF97 region 4) [MPa]
    T = np.linspace(273.16, K0 + 200.0, 41)  # IF97 starts at the triple point
    ref = np.array([_PSat_T(t) for t in T]) * 1e6
    np.testing.assert_allclose(psychro.p_sat_water_HylandWexler(T), ref, rtol=5e-4)


def test_saturation_over_ice_against_iapws():
    # source: library, iapws._iapws._Sublimation_Pressure (IAPWS R14-08) [MPa]
    T = np.linspace(K0 - 80.0, K0, 33)
    ref = np.array([_Sublimation_Pressure(t) for t in T]) * 1e6
    np.testing.assert_allclose(psychro.p_sat_ice_HylandWexler(T), ref, rtol=5e-4)


def test_saturation_against_psychrolib():
    # source: library, psychrolib.GetSatVapPres (ASHRAE 2017 ch. 1 eqs. 5 and 6);
    # psychrolib switches at 0.01 °C, this module at 0 °C, so that band is skipped
    assert psychro.p_sat(-100.0 + K0) > 0  # rounding of -100 + 273.15 must not raise
    for T_c in list(np.arange(-100.0, -0.5, 7.3)) + list(np.arange(0.5, 200.0, 9.7)):
        assert psychro.p_sat(T_c + K0) == pytest.approx(psychrolib.GetSatVapPres(T_c), rel=1e-9)


@pytest.mark.parametrize("T_c, RH, Td_c", [
    (25.0, 0.50, 13.86), (20.0, 0.60, 12.01), (30.0, 0.70, 23.93), (25.0, 0.80, 21.31)])
def test_dew_point_reference_values(T_c, RH, Td_c):
    # source: library, VALIDATION.md "Dew point" (ASHRAE psychrometrics;
    # 25 °C / 80 % is psychrolib's own example)
    assert psychro.dew_point(T_c + K0, RH) - K0 == pytest.approx(Td_c, abs=0.006)
    assert psychro.condensation_point(T_c + K0, RH) == psychro.dew_point(T_c + K0, RH)


def test_condensation_point_against_psychrolib_grid():
    # source: library, psychrolib.GetTDewPointFromRelHum (over ice below the triple point)
    T_c = np.arange(-40.0, 95.0, 5.0) + 0.3
    RH = np.array([0.03, 0.1, 0.25, 0.5, 0.75, 0.9, 1.0])
    TT, RR = np.meshgrid(T_c, RH)
    ours = psychro.condensation_point(TT + K0, RR) - K0
    ref = np.vectorize(psychrolib.GetTDewPointFromRelHum)(TT, RR)
    assert ours.shape == TT.shape
    np.testing.assert_allclose(ours, ref, atol=2e-3)
    # the dedicated functions agree where their phase applies
    water = ref > 0.05
    np.testing.assert_allclose(psychro.dew_point(TT[water] + K0, RR[water]) - K0, ref[water],
                               atol=2e-3)
    ice = ref < -0.05
    np.testing.assert_allclose(psychro.frost_point(TT[ice] + K0, RR[ice]) - K0, ref[ice],
                               atol=2e-3)


def test_saturated_air():
    # source: definition, at RH = 1 the dew (frost) point equals the dry bulb
    assert psychro.dew_point(300.0, 1.0) == pytest.approx(300.0, abs=1e-8)
    assert psychro.frost_point(260.0, 1.0) == pytest.approx(260.0, abs=1e-8)
    assert psychro.condensation_point(260.0, 1.0) == pytest.approx(260.0, abs=1e-8)


def test_frost_point_below_freezing_against_psychrolib():
    # source: library, psychrolib.GetTDewPointFromRelHum (inverts the ice equation
    # below the triple point)
    T, RH = K0 - 5.0, 0.6
    Tf = psychro.frost_point(T, RH)
    assert Tf == pytest.approx(psychrolib.GetTDewPointFromRelHum(-5.0, 0.6) + K0, abs=2e-3)
    assert Tf < T


def test_condensation_point_across_the_equation_gap():
    # source: ASHRAE eqs. 5 and 6 differ at 0 °C (611.21 vs 611.15 Pa); the result
    # must stay continuous there (within 2 mK of 273.15 K) and not raise
    T = K0 + 10.0
    p10 = psychro.p_sat(T)
    out = [psychro.condensation_point(T, p_w / p10) for p_w in (611.10, 611.18, 611.25)]
    assert out == pytest.approx([K0] * 3, abs=2e-3)
    assert out[0] < out[1] <= out[2]


@pytest.mark.parametrize("T, RH", [
    (300.0, 0.0), (300.0, -0.1), (300.0, 1.01), (300.0, 50.0),  # RH as percent by mistake
    (170.0, 0.5), (480.0, 0.5), (float("nan"), 0.5)])
def test_out_of_range_raises(T, RH):
    # source: ASHRAE 2017 ch. 1 states -100..200 °C; RH is a fraction (0, 1]
    with pytest.raises(ValueError):
        psychro.condensation_point(T, RH)


def test_phase_specific_ranges_raise():
    # source: eq. 6 (water) is stated from 0 °C up, eq. 5 (ice) up to 0 °C
    with pytest.raises(ValueError):
        psychro.dew_point(K0 - 10.0, 0.5)
    with pytest.raises(ValueError):
        psychro.frost_point(K0 + 25.0, 0.5)
    with pytest.raises(ValueError):
        psychro.p_sat_water_HylandWexler(K0 - 1.0)
    assert "Validity" in psychro.p_sat_ice_HylandWexler.__doc__
    # the range record flags what the functions reject (solve.py reports it)
    assert psychro.dew_point.validity.violations(T=K0 - 120.0)
    assert not psychro.dew_point.validity.violations(T=K0 + 25.0, RH=0.5)


def test_import_does_not_pull_scipy():
    # source: project requirement (fast start-up); fails if scipy gets imported
    code = "import sys; import coldplate.plate.psychro; print('scipy' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         cwd=str(__import__("pathlib").Path(__file__).resolve().parents[1]))
    assert out.stdout.strip() == "False", out.stderr
