"""Display units of the reports (reports/display_units.py) against NIST SP 811 and an independent pint registry.

US energy is the International Table Btu, as NIST SP 811 lists it (pint's bare 'Btu' is the ISO value).
"""
from __future__ import annotations

import math

import pint
import pytest

from reports.display_units import KINDS, SYSTEMS, DisplayUnits, annotate, conversion, format_number

# NIST SP 811 (2008), appendix B: exact definitions (published).
INCH = 0.0254  # m, exact
FOOT = 12 * INCH
POUND = 0.45359237  # kg, exact
G_N = 9.80665  # m/s^2, standard acceleration of gravity, exact
BTU_IT = 1055.05585262  # J, exact (International Table Btu, from the IT calorie 4.1868 J)
GALLON = 231 * INCH**3  # US liquid gallon, exact (3.785411784e-3 m^3)
HOUR, DAY = 3600.0, 86400.0
YEAR = 365.25 * DAY  # pint's 'year' is the Julian year (365.25 d); the report labels say 'year'

# display = factor * SI + offset, from the exact definitions above (published, arithmetic computed here)
EXACT_US = {
    "temperature": (1.8, -459.67),  # t/degF = 1.8 T/K - 459.67
    "temperature_difference": (1.8, 0.0),
    "flow": (60.0 / GALLON, 0.0),  # m^3/s -> gallon/minute
    "pressure": (INCH**2 / (POUND * G_N), 0.0),  # Pa -> psi
    "length": (1.0 / INCH, 0.0),
    "length_m": (1.0 / FOOT, 0.0),
    "power": (HOUR / BTU_IT, 0.0),  # W -> Btu/h
    "thermal_resistance": (1.8 * BTU_IT / HOUR, 0.0),  # K/W -> degF h/Btu
    "velocity": (1.0 / FOOT, 0.0),
    "heat_transfer_coefficient": (FOOT**2 * HOUR / (BTU_IT * 1.8), 0.0),
    "conductivity": (FOOT * HOUR / (BTU_IT * 1.8), 0.0),
    "volume_per_day": (1e-3 / GALLON, 0.0),  # L/day -> gallon/day
    "volume_per_year": (1.0 / GALLON, 0.0),  # m^3/year -> gallon/year
    "area_resistance": (1.8 * BTU_IT / (HOUR * FOOT**2), 0.0),
}
EXACT_SI = {
    "temperature": (1.0, -273.15),
    "flow": (6e4, 0.0),
    "pressure": (1e-3, 0.0),
    "length": (1e3, 0.0),
}

# NIST SP 811 (2008), appendix B.8, factors to SI as printed there (7 significant figures; from memory,
# and each agrees with the exact definitions above to the digits shown).
NIST_TO_SI = {
    "pressure": 6.894757e3,  # psi -> Pa
    "power": 2.930711e-1,  # Btu_IT/h -> W
    "flow": 6.309020e-5,  # gallon (US)/min -> m^3/s
    "heat_transfer_coefficient": 5.678263,  # Btu_IT/(h ft^2 degF) -> W/(m^2 K)
    "conductivity": 1.730735,  # Btu_IT/(h ft degF) -> W/(m K)
    "area_resistance": 1.761102e-1,  # degF h ft^2/Btu_IT -> K m^2/W
    "length": 2.54e-2,  # in -> m
    "velocity": 3.048e-1,  # ft/s -> m/s
}


def test_every_kind_has_both_systems():
    for kind, (_, table) in KINDS.items():
        assert set(table) == set(SYSTEMS), kind


@pytest.mark.parametrize("kind", sorted(EXACT_US))
def test_us_factors_against_nist_exact_definitions(kind):
    factor, offset = conversion(kind, "us")
    assert factor == pytest.approx(EXACT_US[kind][0], rel=1e-9)
    assert offset == pytest.approx(EXACT_US[kind][1], abs=1e-9)


@pytest.mark.parametrize("kind", sorted(NIST_TO_SI))
def test_us_factors_against_nist_table(kind):
    factor, _ = conversion(kind, "us")
    assert 1.0 / factor == pytest.approx(NIST_TO_SI[kind], rel=1e-6)


@pytest.mark.parametrize("kind", sorted(EXACT_SI))
def test_si_display_factors(kind):
    assert conversion(kind, "si") == pytest.approx(EXACT_SI[kind])


@pytest.mark.parametrize("system", SYSTEMS)
@pytest.mark.parametrize("kind", sorted(KINDS))
def test_factors_against_an_independent_pint_registry(kind, system):
    # library: a fresh pint registry (not the project's), converting two values in the constructor form
    ureg = pint.UnitRegistry()
    si, table = KINDS[kind]
    unit = table[system][0]
    u = DisplayUnits(system)
    for x in (0.0, 1.0, 310.15, 2.5e-5):
        expected = ureg.Quantity(x, si).to(unit).magnitude
        assert u.value(kind, x) == pytest.approx(expected, rel=1e-9, abs=1e-9)


def test_year_is_what_pint_says():
    # library: pint's year is the Julian year, so the yearly volume factor uses it; checked, not assumed
    assert pint.UnitRegistry().Quantity(1, "year").to("day").magnitude == pytest.approx(YEAR / DAY)


def test_arrays_and_labels():
    u = DisplayUnits("us")
    assert list(u.value("temperature", [273.15, 373.15])) == pytest.approx([32.0, 212.0])  # published: ice, steam
    assert u.label("flow") == "gpm" and u.label("pressure") == "psi" and u.label("power") == "BTU/h"
    assert DisplayUnits().text("temperature", 300.0) == "26.85 °C"
    with pytest.raises(ValueError):
        DisplayUnits("imperial")


def test_number_format():
    assert format_number(0.135897) == "0.1359"
    assert format_number(262.8) == "262.8"
    assert format_number(2548501.9) == "2,548,502"
    assert format_number(3.3e-5) == "3.300e-05"
    assert format_number(26.549, "temperature") == "26.55"
    assert format_number(0.0) == "0"


def test_annotate_findings_in_us_units():
    us = DisplayUnits("us")
    text = "inlet (15.0 degC) at 4 bar, 551.6 kPa, 1.5 L/min, 2.4 m/s and 25 mm"
    out = annotate(text, us)
    assert "15.0 degC (59.0 °F)" in out
    assert "4 bar (58 psi)" in out  # 4e5 Pa / 6894.757 = 58.0
    assert "551.6 kPa (80 psi)" in out
    assert "1.5 L/min (0.396 gpm)" in out
    assert "2.4 m/s (7.87 ft/s)" in out
    assert "25 mm (0.984 in)" in out
    assert annotate(text, DisplayUnits("si")) == text
    assert annotate("a K/W value and 3 mmHg", us) == "a K/W value and 3 mmHg"
    assert math.isclose(float(annotate("-5.0 degC", us).split("(")[1].split()[0]), 23.0)
