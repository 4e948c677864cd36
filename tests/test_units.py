"""Unit parsing at the edges. Sources: SI definitions and NIST SP 811 conversion factors."""
from __future__ import annotations

import pytest

from coldplate.design.errors import DesignError
from coldplate.design.units import parse_value


@pytest.mark.parametrize("text,kind,si", [
    ("1.5 L/min", "flow", 1.5e-3 / 60),              # SI: 1 L = 1e-3 m^3
    ("0.4 gallon/minute", "flow", 0.4 * 3.785411784e-3 / 60),  # NIST SP 811: US gallon = 3.785411784 L
    ("15 degC", "temperature", 288.15),              # SI: T/K = t/degC + 273.15
    ("59 degF", "temperature", 288.15),              # NIST SP 811: T/K = (t/degF + 459.67)/1.8
    ("60 psi", "pressure", 60 * 6894.757293168),     # NIST SP 811: 1 psi = 6894.757 Pa
    ("4 bar", "pressure", 4e5),
    ("85 W", "power", 85.0),
    ("290 BTU/hour", "power", 290 * 0.29307107),     # NIST SP 811: 1 Btu_IT/h = 0.2930711 W
    ("0.25 inch", "length", 0.00635),                # NIST SP 811: 1 in = 25.4 mm exactly
    ("3 W/(m*K)", "conductivity", 3.0),
    ("2e-5 K*m**2/W", "area_resistance", 2e-5),
    ("0.2 delta_degC*cm**2/W", "area_resistance", 0.2e-4),
    ("55 %", "fraction", 0.55),
    ("8 h", "time", 28800.0),
    # pint reads an offset unit inside a compound unit as a difference: 1 W/(m degF) = 1.8 W/(m K) (NIST SP 811)
    ("3 W/(m*degC)", "conductivity", 3.0),
    ("3 W/(m*degF)", "conductivity", 5.4),
])
def test_parse_to_si(text, kind, si):
    assert parse_value(text, kind, "[t] k") == pytest.approx(si, rel=1e-6)


@pytest.mark.parametrize("text,kind,needle", [
    ("2 gpm", "flow", "gpm"),
    ("2 lpm", "flow", "lpm"),
    ("50 psig", "pressure", "psig"),
    ("3 cfm", "flow", "cfm"),
    ("2 m", "flow", "not a flow"),
    ("12", "length", "no unit"),
    ("twelve mm", "length", "cannot read"),
    ("5 blorbs", "power", "unknown unit"),
])
def test_refusals(text, kind, needle):
    with pytest.raises(DesignError) as err:
        parse_value(text, kind, "[t] k")
    assert "[t] k" in str(err.value) and needle in str(err.value)
