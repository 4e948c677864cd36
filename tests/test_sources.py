"""The [[source]] tables: reading, the one centred source [heat] means, and the refusals (overlap, off the plate).

These are checks of the design file's rules (the project's own interface, documented in README.md), not of
physics; the field's physics is checked in tests/test_field.py and tests/test_field_check.py.
"""
import pytest

from coldplate.design.errors import DesignError
from coldplate.design.reader import parse_design
from pathlib import Path

BASE = (Path(__file__).resolve().parent.parent / "examples" / "reagent-block-channels.toml").read_text()


def _with_sources(tables: str, drop_heat: bool = True) -> str:
    text = BASE
    if drop_heat:
        start = text.index("[heat]")
        end = text.index("[interface]")
        text = text[:start] + text[end:]
    return text + "\n" + tables


TWO = '''
[[source]]
name = "driver"
load = "20 W"
size = ["10 mm", "10 mm"]
at = ["15 mm", "-12 mm"]
limit = "70 degC"

[[source]]
name = "diode bar"
load = "40 W"
size = ["8 mm", "20 mm"]
at = ["60 mm", "10 mm"]
interface_resistance = "2e-5 m^2*K/W"
'''


def test_heat_is_one_centred_source():
    d = parse_design(BASE)
    (s,) = d.sources
    assert s.name == "heat" and s.load == pytest.approx(85.0)
    assert s.at == pytest.approx((0.040, 0.0)) and s.size == pytest.approx((0.040, 0.040))
    assert s.interface == pytest.approx(0.1e-3 / 3.0) and s.limit is None


def test_sources_are_read_in_order_with_their_own_interface_and_limit():
    d = parse_design(_with_sources(TWO))
    a, b = d.sources
    assert (a.name, b.name) == ("driver", "diode bar")
    assert a.at == pytest.approx((0.015, -0.012)) and a.limit == pytest.approx(343.15)
    assert a.interface == pytest.approx(0.1e-3 / 3.0)  # from [interface]
    assert b.interface == pytest.approx(2e-5) and b.limit is None
    assert d.heat.load == pytest.approx(60.0)


@pytest.mark.parametrize("change, field, words", [
    (('at = ["60 mm", "10 mm"]', 'at = ["60 mm", "25 mm"]'), "[source 'diode bar'] at", "past the plate's edges"),
    (('at = ["15 mm", "-12 mm"]', 'at = ["3 mm", "-12 mm"]'), "[source 'driver'] at", "past the plate's length"),
    (('at = ["60 mm", "10 mm"]', 'at = ["20 mm", "-5 mm"]'), "[source 'diode bar'] at", "overlaps source 'driver'"),
    (('name = "diode bar"', 'name = "driver"'), "[source 'driver'] name", "two sources are named"),
    (('size = ["8 mm", "20 mm"]', 'size = ["8 mm"]'), "[source 'diode bar'] size", "array of two lengths"),
    (('limit = "70 degC"', 'limt = "70 degC"'), "[source 'driver'] limt", "did you mean `limit`"),
    (('interface_resistance = "2e-5 m^2*K/W"', 'interface_conductivity = "3 W/(m*K)"'),
     "[source 'diode bar'] interface_thickness", "is missing"),
])
def test_refusals_name_the_field(change, field, words):
    with pytest.raises(DesignError) as e:
        parse_design(_with_sources(TWO.replace(*change)))
    assert e.value.field == field and words in str(e.value)


def test_touching_sources_are_accepted():
    text = TWO.replace('at = ["60 mm", "10 mm"]', 'at = ["24 mm", "-12 mm"]').replace(
        'size = ["8 mm", "20 mm"]', 'size = ["8 mm", "10 mm"]')  # driver ends at x = 20 mm, bar starts there
    assert len(parse_design(_with_sources(text)).sources) == 2


def test_heat_and_sources_together_are_refused():
    with pytest.raises(DesignError) as e:
        parse_design(_with_sources(TWO, drop_heat=False))
    assert e.value.field == "[[source]]"
