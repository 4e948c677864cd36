"""The property table of the sizing search against CoolProp between its nodes (library: CoolProp, called here
directly at the midpoints, where linear interpolation errs most) and against IAPWS-95 water from the iapws
package (library)."""
from __future__ import annotations

import CoolProp.CoolProp as CP
import numpy as np
import pytest
from iapws import IAPWS95

from coldplate.sizing.proptable import ERROR_BOUND, PropertyTable
from hydraulics.coolant import P_ATM, Coolant


@pytest.mark.parametrize("coolant, p, T_low, T_high", [
    (Coolant("water"), P_ATM, 275.15, 372.0),
    (Coolant("water"), P_ATM + 3e5, 280.15, 400.0),
    (Coolant("propylene-glycol", 0.3, "mass"), P_ATM, 263.15, 360.0),
], ids=["water 1 atm", "water 4 bar", "propylene glycol 30 %"])
def test_interpolation_error_between_nodes_is_bounded(coolant, p, T_low, T_high):
    table = PropertyTable(coolant, p, T_low, T_high)
    mid = 0.5 * (table.T[:-1] + table.T[1:])[::7]
    got = table.at(mid)
    for name, key in (("rho", "D"), ("mu", "V"), ("cp", "C"), ("k", "L")):
        ref = np.array([CP.PropsSI(key, "T", float(T), "P", p, coolant.backend) for T in mid])
        assert np.max(np.abs(getattr(got, name) / ref - 1)) < ERROR_BOUND, name
    H_ref = np.array([CP.PropsSI("H", "T", float(T), "P", p, coolant.backend) for T in mid])
    assert np.max(np.abs(table.enthalpy(mid) - H_ref)) < ERROR_BOUND * 4200 * 10  # J/kg: 1e-4 K of cp·ΔT
    assert np.max(np.abs(table.temperature(H_ref) - mid)) < 1e-4


def test_table_matches_iapws95_water():
    # library: iapws (IAPWS-95); IF97 agrees with it within 0.05 % for liquid water (IAPWS R7-97)
    table = PropertyTable(Coolant("water"), P_ATM, 280.0, 360.0)
    for T in (288.15, 313.3, 341.7):
        w = IAPWS95(T=T, P=P_ATM / 1e6)
        got = table.at(T)
        assert float(got.rho) == pytest.approx(w.rho, rel=5e-4)
        assert float(got.cp) == pytest.approx(w.cp * 1e3, rel=2e-3)
        assert float(got.mu) == pytest.approx(w.mu, rel=2e-3)


def test_temperature_above_the_table_is_nan():
    table = PropertyTable(Coolant("water"), P_ATM, 290.0, 300.0)
    assert np.isnan(table.temperature(table.H[-1] + 1.0))
