"""Hostile input to the design reader: every mistake one line naming ``[table] key``, exit 2, nothing written.

One regression test per defect found by fuzzing mutated design files (defects 1 to 8 of the hostile-input
issue); each failed before its fix.  Sources of the expected values: the project's input contract (exit 2,
one line naming the field and what is accepted); unit conversions exact by definition (1 psi = 1 lbf/in²,
1 inch = 25.4 mm: NIST SP 811, appendix B); psychrolib (an independent implementation of the ASHRAE
psychrometric equations) for the frost point at the humidity floor; common practice for the plausible ranges.
"""
from __future__ import annotations

import json
import math

import pytest

from coldplate.cli import main
from coldplate.design.errors import DesignError
from coldplate.design.reader import design_from_dict, parse_design
from coldplate.design.units import parse_value
from coldplate.sizing.writer import toml_text
from hydraulics.validity import Bound

from .helpers import example_dict, modified

BASE = example_dict("reagent-block-channels")
SIZING = example_dict("laser-mount-sizing")
PSI = 0.45359237 * 9.80665 / 0.0254**2  # Pa: 1 lbf/in², exact by the definitions of lb, g_n and inch (NIST SP 811)
INCH = 0.0254  # m, exact by definition


def run(tmp_path, capsys, data, command="check", *extra):
    """Exit status and stderr lines of ``coldplate <command>`` on ``data``; stdout must be empty on failure."""
    path = tmp_path / "design.toml"
    path.write_text(toml_text(data) if isinstance(data, dict) else data, encoding="utf-8")
    code = main([command, str(path), *extra])
    cap = capsys.readouterr()
    if code != 0:
        assert cap.out == "", "nothing is written half-way"
    assert "Traceback" not in cap.err
    return code, cap.err.strip().splitlines(), cap.out


def refused(tmp_path, capsys, data, needle, command="check"):
    code, err, _ = run(tmp_path, capsys, data, command)
    assert code == 2, err
    assert len(err) == 1, err
    assert needle in err[0], err[0]
    return err[0]


# ---------------------------------------------------------------- 1: unit strings

UNIT_CRASHES = [
    ("division by zero", "85 W / 0"),
    ("zero exponent denominator", "85 W**(1/0)"),
    ("open bracket", "85 (W"),
    ("close bracket", "85 W)"),
    ("500-term product (recursion)", "85 W" + "*mm/mm" * 500),
]


@pytest.mark.parametrize("text", [c[1] for c in UNIT_CRASHES], ids=[c[0] for c in UNIT_CRASHES])
def test_unit_strings_that_crashed_the_parser_are_refused(tmp_path, capsys, text):
    refused(tmp_path, capsys, modified(BASE, heat__load=text), "[heat] load:")


@pytest.mark.parametrize("kind,text,needle", [
    ("flow", "1,5 L/min", "decimal comma"),
    ("temperature", "16 degc", "'degC'"),
    ("length", "5 MM", "did you mean 'mm'?"),
    ("power", "85 W)", "unbalanced brackets"),  # pint reads MM as something else, not a length
    ("power", "1,500 W", "no separator"),
    ("temperature", "16 delta_degC", "temperature difference where a temperature is needed"),
    ("temperature_difference", "68 degC", "a temperature where a temperature difference is needed"),
])
def test_unit_hints(kind, text, needle):
    with pytest.raises(DesignError) as exc:
        parse_value(text, kind, "[x] y")
    assert needle in str(exc.value) and "\n" not in str(exc.value)
    assert "scaling factor" not in str(exc.value)


def test_a_temperature_difference_still_reads_in_kelvin_and_delta_degC():
    assert parse_value("68 K", "temperature_difference", "f") == pytest.approx(68.0)
    assert parse_value("68 delta_degC", "temperature_difference", "f") == pytest.approx(68.0)


@pytest.mark.parametrize("value", ["170 %", 70, "70"])
def test_humidity_out_of_range_in_the_users_terms(tmp_path, capsys, value):
    line = refused(tmp_path, capsys, modified(BASE, room__relative_humidity=value), "[room] relative_humidity")
    assert "between 0.1 % and 100 %" in line
    if value != "170 %":
        assert "'70 %'" in line  # a bare number is a fraction: the message shows how to write a percentage


# ---------------------------------------------------------------- 2: very low humidity

def test_humidity_below_the_floor_is_refused_naming_it(tmp_path, capsys):
    line = refused(tmp_path, capsys, modified(BASE, room__relative_humidity="1e-5 %"), "[room] relative_humidity")
    assert "0.1 %" in line


@pytest.mark.parametrize("room_degC", [-50.0, 0.0, 25.0, 60.0])
def test_every_room_at_the_humidity_floor_solves(room_degC):
    """At the floor the frost/dew point is solvable at every accepted room temperature, and agrees with
    psychrolib (an independent implementation of the same ASHRAE equations) within 0.01 K (measured: at most
    0.0007 K, at 0 degC)."""
    import psychrolib

    from coldplate.design.ranges import RH_FLOOR
    from coldplate.plate.psychro import condensation_point

    psychrolib.SetUnitSystem(psychrolib.SI)
    T = room_degC + 273.15
    ours = condensation_point(T, RH_FLOOR)
    theirs = psychrolib.GetTDewPointFromRelHum(room_degC, RH_FLOOR) + 273.15  # psychrolib: over ice below 0 degC
    assert math.isfinite(ours) and ours > 173.15
    assert ours == pytest.approx(theirs, abs=0.01)


def test_a_design_at_the_humidity_floor_checks(tmp_path, capsys):
    code, err, _ = run(tmp_path, capsys, modified(BASE, room__relative_humidity="0.1 %", room__temperature="-50 degC"))
    assert code == 0, err


# ---------------------------------------------------------------- 3: whole numbers past 64 bits in [search]

@pytest.mark.parametrize("count", [{"from": 10**30, "to": 10**30 + 5}, {"from": 1, "to": 2**63 - 1, "steps": 3},
                                   {"from": 2**63 - 2, "to": 2**63 - 1}, [2**64 + 1], 2**63 - 1])
def test_huge_whole_numbers_in_search_give_one_line(tmp_path, capsys, count):
    data = modified(SIZING, search__count=count)
    line = refused(tmp_path, capsys, data, "[search] count:", command="size")
    assert "-9.2" not in line and "e+18" not in line  # the number as written, not an overflowed cast


# ---------------------------------------------------------------- 4: absurd tariffs, finite outputs

@pytest.mark.parametrize("key,value", [("tariff", "1e306 EUR/m**3"), ("tariff", "1e12 EUR/L"),
                                       ("tariff", "1e-300 EUR/m**3"), ("tariff", "0 EUR/m**3"),
                                       ("electricity_tariff", "1e300 EUR/kWh"), ("chiller_price", "1e300 EUR")])
def test_absurd_money_is_refused(tmp_path, capsys, key, value):
    data = example_dict("tap-to-drain-circuit")
    data["supply"][key] = value
    refused(tmp_path, capsys, data, f"[supply] {key}:")


@pytest.mark.parametrize("tariff,price,hours,days", [("1e7 EUR/m**3", "2400 EUR", 10, 250),
                                                     ("1e-6 EUR/m**3", "1e12 EUR", 1 / 60, 1)])
def test_the_extreme_accepted_money_keeps_every_output_finite(tmp_path, capsys, tariff, price, hours, days):
    """At either end of the money and running-time ranges the cost, break-even and payback stay finite: with
    a tariff of a millionth per m³ and a 1e12 chiller run a minute a day, the payback is a huge finite number."""
    data = example_dict("tap-to-drain-circuit")
    data["supply"].update(tariff=tariff, chiller_price=price, hours_per_day=hours, days_per_year=days,
                          electricity_tariff="0 EUR/kWh")
    code, err, out = run(tmp_path, capsys, data, "check", "--format", "json")
    assert code == 0, err
    json.loads(out, parse_constant=lambda c: pytest.fail(f"JSON holds {c}"))
    code, err, text = run(tmp_path, capsys, data, "check")
    assert code == 0, err
    assert not any(w in text.split() for w in ("inf", "nan", "-inf")), text


def test_running_time_below_a_minute_a_day_is_refused(tmp_path, capsys):
    line = refused(tmp_path, capsys, modified(BASE, supply__hours_per_day="30 s"), "[supply] hours_per_day")
    assert "between 1 min and 24 h" in line
    refused(tmp_path, capsys, modified(BASE, supply__days_per_year=0.5), "[supply] days_per_year")


# ---------------------------------------------------------------- 5: values exactly at a limit in other units

def test_fifty_bar_written_in_psi_is_accepted_like_fifty_bar():
    loop = modified(BASE, supply__source="recirculating", supply__discharge="return")
    in_bar = design_from_dict(modified(loop, supply__static_pressure="50 bar"))
    in_psi = design_from_dict(modified(loop, supply__static_pressure="725.1886886510462 psi"))  # 5e6 Pa / PSI
    assert 725.1886886510462 * PSI == pytest.approx(5e6, rel=1e-14)
    assert in_psi.supply.static_pressure == pytest.approx(in_bar.supply.static_pressure, rel=1e-12)


def test_five_mm_written_in_inches_is_accepted_at_the_limit():
    from coldplate.design.ranges import RANGES

    high = RANGES["[interface] thickness"].high  # 5 mm
    assert 0.19685039370078744 * INCH == pytest.approx(high, rel=1e-14)  # its SI float lands just above 5 mm
    thick = modified(BASE, interface__thickness="0.19685039370078744 inch", interface__conductivity="1000 W/(m*K)")
    assert design_from_dict(thick).interface.resistance_area == pytest.approx(high / 1000, rel=1e-12)


def test_the_coldest_room_is_accepted_at_its_limit():
    assert design_from_dict(modified(BASE, room__temperature="-50 degC")).room.temperature == pytest.approx(223.15)


def test_one_comparison_rule():
    from hydraulics.validity import REL_TOL, at_least, at_most

    assert at_most(5e-3 * (1 + 0.5 * REL_TOL), 5e-3) and not at_most(5e-3 * (1 + 2 * REL_TOL), 5e-3)
    assert at_least(223.15 * (1 - 0.5 * REL_TOL), 223.15) and not at_least(223.15 * (1 - 2 * REL_TOL), 223.15)
    assert not at_least(-1e-300, 0.0) and at_most(0.0, 0.0)  # at zero the rule is exact
    b = Bound("x", 0.0, 1.0, low_open=True)
    assert not b.contains(0.0) and b.contains(1e-300) and b.contains(1.0 + 0.5 * REL_TOL)
    assert Bound("x", -math.inf, math.inf).contains(1e300)


# ---------------------------------------------------------------- 6: sizing limits in other units

def test_min_width_in_inches_sizes_like_millimetres():
    from coldplate.sizing.recommend import size
    from coldplate.sizing.search import read_search

    flows = []
    # a flow range reaching below the grid's best, so the refinement has room to improve on it (with the grid's
    # best at the lowest flow there is nothing to refine, and both units would pass untested)
    room = dict(search__flow={"from": "0.05 L/min", "to": "6 L/min", "steps": 60},
                search__count={"from": 20, "to": 30}, search__depth={"from": "6 mm", "to": "9 mm", "steps": 4})
    for text in ("0.8 mm", "0.03149606299212599 inch"):  # 0.8 mm / INCH; its SI float lands just above 0.8 mm
        data = modified(SIZING, search__min_width=text, **room)
        design = design_from_dict(data)
        spec = read_search(data, design)
        assert spec.limits.min_width == pytest.approx(0.8e-3, rel=1e-12)
        result = size(data, design, spec)
        assert result.refinement is not None and result.refinement.result is not None
        flows.append(result.recommended.flow)
    assert flows[1] == pytest.approx(flows[0], rel=1e-9)


# ---------------------------------------------------------------- 7: unknown keys

@pytest.mark.parametrize("table,right,typo", [("passage", "depth", "dept"), ("coolant", "flow", "flwo"),
                                              ("plate", "base", "bsae"), ("room", "temperature", "temprature")])
def test_a_typo_for_a_required_key_is_named_as_unknown(tmp_path, capsys, table, right, typo):
    data = modified(BASE, **{f"{table}__{right}": None, f"{table}__{typo}": BASE[table][right]})
    line = refused(tmp_path, capsys, data, f"[{table}] {typo}:")
    assert f"unknown key `{typo}`; did you mean `{right}`?" in line


def test_a_typo_beside_the_real_key_lists_every_known_key_nearest_first(tmp_path, capsys):
    data = modified(SIZING, search__cont=8)
    line = refused(tmp_path, capsys, data, "[search] cont:", command="size")
    assert "did you mean `count`?" in line
    known = line.split("known here: ")[1].rstrip(")").split(", ")
    assert known[0] == "count"
    assert {"count", "width", "depth", "base", "flow", "face_limit", "min_width", "max_water"} <= set(known)


def test_a_typo_for_an_optional_key_lists_the_key_meant_first(tmp_path, capsys):
    data = modified(SIZING, search__count=None, search__cont=SIZING["search"]["count"])
    line = refused(tmp_path, capsys, data, "[search] cont:", command="size")
    assert "did you mean `count`?" in line and line.split("known here: ")[1].startswith("count, ")


def test_a_typo_in_a_circuit_part_is_named():
    data = example_dict("tap-to-drain-circuit")
    hose = next(p for p in data["circuit"]["part"] if p["kind"] == "hose")
    hose["lenght"] = hose.pop("length")
    with pytest.raises(DesignError) as exc:
        design_from_dict(data)
    assert "unknown key `lenght`; did you mean `length`?" in str(exc.value)


def test_a_misspelt_table_is_named_with_the_nearest():
    data = modified(BASE)
    data["rooom"] = data.pop("room")
    with pytest.raises(DesignError) as exc:
        design_from_dict(data)
    assert "`rooom`; did you mean `room`?" in str(exc.value)


def test_an_empty_key_is_named(tmp_path, capsys):
    text = toml_text(BASE).replace("[passage]\n", '[passage]\n"" = 1\n', 1)
    refused(tmp_path, capsys, text, '[passage] "":')
    text = '"" = 1\n' + toml_text(BASE)
    refused(tmp_path, capsys, text, 'top-level key "":')


def test_a_byte_order_mark_is_accepted(tmp_path, capsys):
    code, err, _ = run(tmp_path, capsys, "\ufeff" + toml_text(BASE))
    assert code == 0, err
    assert parse_design("\ufeff" + toml_text(BASE)).title == BASE["title"]


def test_a_key_that_does_not_apply_is_not_called_unknown():
    from coldplate.design.fields import Table

    t = Table({"kind": "tube", "count": 3}, "passage", ("kind", "count"))
    t.raw("kind")
    with pytest.raises(DesignError) as exc:
        t.finish()
    assert "does not apply" in str(exc.value)


# ---------------------------------------------------------------- 8: implausible geometry

@pytest.mark.parametrize("changes,needle", [
    ({"plate__base": "3e-15 m"}, "[plate] base:"),
    ({"plate__length": "1 um", "plate__width": "1 um", "passage__width": "0.5 um", "passage__count": 1,
      "heat__footprint": ["1 um", "1 um"]}, "[plate] length:"),
    ({"passage__width": "0.5 um"}, "[passage] width:"),
    ({"interface__conductivity": "1e-6 W/(m*K)"}, "[interface] conductivity:"),
    ({"heat__footprint": ["1e-9 m", "40 mm"]}, "[heat] footprint"),
    ({"passage__depth": "1 nm"}, "[passage] depth:"),
])
def test_implausible_geometry_is_refused_naming_the_range(tmp_path, capsys, changes, needle):
    line = refused(tmp_path, capsys, modified(BASE, **changes), needle)
    assert "plausible range: between" in line


def test_the_two_ways_of_writing_the_interface_share_one_range(tmp_path, capsys):
    """5 mm at 0.08 W/(m K) is 0.0625 m² K/W, just as written per area: both are refused with one range."""
    from coldplate.design.ranges import INTERFACE_RESISTANCE

    as_area = modified(BASE, interface__conductivity=None, interface__thickness=None,
                       interface__resistance="0.0625 K*m**2/W")
    as_layer = modified(BASE, interface__conductivity="0.08 W/(m*K)", interface__thickness="5 mm")
    a = refused(tmp_path, capsys, as_area, "[interface] resistance")
    b = refused(tmp_path, capsys, as_layer, "[interface] thickness / conductivity")
    shown = f"between 0 m² K/W and {INTERFACE_RESISTANCE.high:g} m² K/W"
    assert shown in a and shown in b
    ok = modified(BASE, interface__conductivity="0.1 W/(m*K)", interface__thickness="5 mm")  # 0.05 m² K/W
    assert design_from_dict(ok).interface.resistance_area == pytest.approx(0.05)


def test_every_range_is_a_bound_with_its_field_and_a_source():
    from coldplate.design.ranges import RANGES

    for field, bound in RANGES.items():
        assert isinstance(bound, Bound) and bound.variable == field
        assert bound.low < bound.high and bound.note


def test_every_example_still_reads():
    from .helpers import EXAMPLES
    from coldplate.design.reader import load_design

    for path in EXAMPLES:
        load_design(path)


def test_a_refinement_step_off_the_plate_warns_nothing():
    """SLSQP may try channels that do not fit (a wall of negative width): the evaluation is non-finite,
    read as an unmet limit, and prints no numpy warning (a stray stderr line)."""
    import warnings

    import numpy as np

    from coldplate.sizing.evaluate import Evaluator
    from coldplate.sizing.refine import _evaluate

    design = design_from_dict(SIZING)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        e = _evaluate(Evaluator(design), "channels", {"count": 30, "width": 3e-3, "depth": 5e-3, "base": 3e-3,
                                                      "flow": 1e-5})
    assert not np.isfinite(e.R_th).any()
