"""The field solve through the design path (coldplate.plate.fieldcheck and coldplate.check.solve(model=...)).

Sources named beside each check:
- a review's grid-converged 3-D conjugate solve of a copper channel plate, 0.0489 K/W (the figure as quoted
  in the project's issue, as in tests/test_field.py);
- the Muzychka-Culham-Yovanovich spreading series (Muzychka, Culham & Yovanovich 2003, J. Electronic
  Packaging 125:178), as ``conduction.spreading_MCY`` (itself checked against published values in
  tests/test_conduction.py);
- energy conservation and linearity (superposition) of the discrete problem; Richardson's extrapolation and
  Roache's grid convergence index (Roache 1994, J. Fluids Eng. 116:405; the two-grid safety factor 3, from
  memory), computed;
- the field against the network on every example is an internal comparison, not an outside source: the
  network's simplifications must err toward a hotter face.
"""
import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from coldplate.check import solve
from coldplate.design.errors import SolveError
from coldplate.design.reader import load_design, parse_design
from coldplate.plate import conduction
from coldplate.plate import field as F
from coldplate.plate.fieldcheck import COOLINGS, field_sources, solve_plate_field
from coldplate.plate.fieldgrid import GridRules
from coldplate.plate.solve import operating_point, solve_plate

EXAMPLES = sorted(Path(__file__).resolve().parent.parent.joinpath("examples").glob("*.toml"))

REVIEW_R = 0.0489  # K/W, the review's grid-converged 3-D conjugate solve, fully developed velocity profile

REVIEW_DESIGN = """
title = "review channel case"
[heat]
load = "300 W"
footprint = ["60 mm", "41 mm"]
[interface]
resistance = "0 K*m**2/W"
[plate]
material = "copper"
length = "60 mm"
width = "41 mm"
base = "2 mm"
[passage]
kind = "channels"
count = 20
width = "1 mm"
depth = "3 mm"
plenum_length = "0 mm"
[coolant]
fluid = "water"
inlet_temperature = "20 degC"
flow = "2 L/min"
[supply]
source = "potable"
hours_per_day = 8
static_pressure = "3 bar"
[room]
temperature = "22 degC"
relative_humidity = "40 %"
"""

THREE_SOURCES = """
[[source]]
name = "driver"
load = "20 W"
size = ["12 mm", "10 mm"]
at = ["16 mm", "-15 mm"]
[[source]]
name = "bar"
load = "60 W"
size = ["20 mm", "8 mm"]
at = ["40 mm", "12 mm"]
limit = "45 degC"
[[source]]
name = "sensor"
load = "5 W"
size = ["8 mm", "8 mm"]
at = ["66 mm", "-10 mm"]
interface_resistance = "1e-4 K*m**2/W"
"""


def _reagent_with_sources():
    text = Path(EXAMPLES[0]).parent.joinpath("reagent-block-channels.toml").read_text()
    head, rest = text.split("[heat]", 1)
    rest = rest.split("[interface]", 1)[1]
    return parse_design(head + THREE_SOURCES + "[interface]" + rest)


def test_review_channel_case_through_the_design_path():
    # source: the review's grid-converged 3-D conjugate solve, 0.0489 K/W; here through the design file, the
    # operating point and the local correlation of the check (laminar Muzychka & Yovanovich combined entry)
    r = solve(parse_design(REVIEW_DESIGN), model="field")
    assert r.model == "field"
    assert r.R_th == pytest.approx(REVIEW_R, rel=0.05)
    assert r.field.heat_to_coolant == pytest.approx(300.0, rel=1e-6)


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.stem)
def test_energy_balance_and_the_network_on_every_example(path):
    # source: energy conservation (heat into the coolant = the load, 1e-6 relative); the network against the
    # field is an internal comparison: the network's simplifications err toward a hotter face, so its hottest
    # face is not below the field's by more than the field's grid uncertainty
    field = solve(load_design(path), model="field")
    network = solve(load_design(path), model="network")
    fr = field.field
    assert fr.heat_to_coolant == pytest.approx(fr.load, rel=1e-6)
    assert fr.load == pytest.approx(field.load, rel=1e-12)
    assert network.model == "network" and field.model == "field"
    assert network.T_face_max >= field.T_face_max - field.grid_uncertainty
    assert field.dp == pytest.approx(network.dp, rel=1e-9) if field.load == pytest.approx(network.load) else True
    assert len(field.sources) == len(network.sources) == len(field.design.sources)
    # the grid error estimate (Richardson: the index without Roache's safety factor 3) is below 1 % of the
    # hottest rise, the default grid's aim; the reported uncertainty is three times that
    assert 0 <= field.grid_uncertainty / F.GCI_SAFETY < 0.01 * (field.T_face_max - field.T_in)


def test_superposition_of_two_sources_through_the_adapter():
    # source: linearity of the discrete problem at fixed properties: the field of several sources is the sum of
    # each alone (same operating point, same cooling), within the linear solver's tolerance (residual 1e-11)
    d = _reagent_with_sources()
    op = operating_point(d, d.flow, d.heat.load)
    cooling, _, _ = COOLINGS["channels"](d, op, None)
    plate = F.FieldPlate(d.plate.length, d.plate.width, d.plate.base, d.plate.conductivity)
    srcs = field_sources(d, d.heat.load)
    both = F.solve_field(plate, srcs, cooling, uncertainty=False)
    zero = [replace(s, load=0.0) for s in srcs]
    alone = []
    for i in range(len(srcs)):
        one = list(zero)
        one[i] = srcs[i]
        alone.append(F.solve_field(plate, one, cooling, uncertainty=False))
    rise = sum(a.face - a.reference for a in alone)
    assert np.max(np.abs(both.face - both.reference - rise)) < 1e-9 * np.max(rise)
    # the coupling matrix reproduces each source's mean face rise from the loads
    loads = np.array([s.load for s in srcs])
    means = np.array([s.face_mean for s in both.sources]) - both.reference
    assert both.coupling @ loads == pytest.approx(means, rel=1e-9)
    # downstream sources are heated more by upstream ones than the reverse (the coolant carries heat one way)
    names = [s.name for s in srcs]
    up, down = names.index("driver"), names.index("sensor")
    assert both.coupling[down, up] > both.coupling[up, down]


def test_three_sources_through_the_check():
    # source: computed consistency of the outputs: per-source figures, the whole plate's hottest point and the
    # existing keys' meaning (R_th = (hottest - inlet) / total load)
    d = _reagent_with_sources()
    r = solve(d, model="field")
    assert [s.name for s in r.sources] == ["driver", "bar", "sensor"]
    assert r.T_face_max == pytest.approx(max(s.face_max for s in r.sources))
    assert r.R_th == pytest.approx((r.T_face_max - r.T_in) / 85.0)
    bar = r.sources[1]
    assert bar.limit == pytest.approx(318.15)
    assert bar.margin == pytest.approx(318.15 - bar.face_max)
    assert len(r.coupling) == 3 and all(len(row) == 3 for row in r.coupling)
    assert sum(s.load for s in r.sources) == pytest.approx(85.0)
    n = solve(d, model="network")
    # the network is cautious per source: not below the field; its headline is its hottest source
    assert n.T_face_max == pytest.approx(max(a.face_max for a in n.sources), abs=1e-9)
    for a, b in zip(n.sources, r.sources):
        assert a.face_max >= b.face_max - r.grid_uncertainty


def test_grid_convergence_order_and_the_gci_bound():
    # source: Richardson extrapolation over three grids of ratio 2 (the cavity example with its developing
    # film coefficient, a coarser level-0 grid so that level 2 stays small): the source's mean face shows an
    # order near the formal 2 (measured 1.82), and the grid convergence index reported at level 1 (from levels 0
    # and 1, Roache's factor 3 / (2^2 - 1)) bounds the error of level 1 against the extrapolated value, for the
    # mean and for the hottest point (whose cell value converges non-monotonically: measured changes +0.0023 K
    # and -0.0029 K, which is why its index takes the mean's when larger)
    d = load_design(Path(EXAMPLES[0]).parent / "detector-cavity-glycol.toml")
    rules = GridRules(edge_fraction=0.25, largest_fraction=0.16)
    runs = [solve_plate_field(d, level=k, rules=rules, uncertainty=False) for k in (0, 1, 2)]
    M = [r.sources[0].face_mean for r in runs]
    H = [r.T_face_max for r in runs]
    p = math.log(abs(M[1] - M[0]) / abs(M[2] - M[1])) / math.log(2.0)
    assert 1.5 < p < 2.5
    mean_exact = M[2] + (M[2] - M[1]) / (2.0**p - 1.0)
    r1 = solve_plate_field(d, level=1, rules=rules)
    assert r1.T_face_max == pytest.approx(H[1], abs=1e-9)
    assert abs(M[1] - mean_exact) <= r1.field.sources[0].mean_uncertainty
    assert abs(H[1] - H[2]) <= r1.grid_uncertainty


def test_uniform_coefficient_reproduces_the_spreading_series_through_the_plate_dimensions():
    # source: Muzychka, Culham & Yovanovich (2003) series (conduction.spreading_MCY, 800 terms): the design's
    # plate and [heat] footprint as the field's sources, cooled at a uniform coefficient (the series' boundary);
    # mean and centroid rise within 1 %
    d = load_design(Path(EXAMPLES[0]).parent / "reagent-block-channels.toml")
    plate = F.FieldPlate(d.plate.length, d.plate.width, d.plate.base, d.plate.conductivity)
    srcs = tuple(replace(s, interface=0.0) for s in field_sources(d, 10.0))
    h = 4000.0
    fr = F.solve_field(plate, srcs, F.UniformBack(h, 300.0))
    ref = conduction.spreading_MCY(d.plate.length, d.plate.width, d.heat.footprint_length,
                                   d.heat.footprint_width, d.plate.base, d.plate.conductivity, h, n_terms=800)
    assert (fr.sources[0].face_mean - 300.0) / 10.0 == pytest.approx(ref.R_mean, rel=0.01)
    assert (fr.face_at(d.plate.length / 2, 0.0) - 300.0) / 10.0 == pytest.approx(ref.R_centroid, rel=0.01)


def test_channel_flows_give_each_channel_its_own_rise():
    # source: energy conservation per channel: a channel with less flow warms more; the total still equals
    # the load (1e-6); by default the field takes the plenums' own split (the flow split through the headers)
    d = load_design(Path(EXAMPLES[0]).parent / "reagent-block-channels.toml")
    n = d.passage.count
    default = solve_plate_field(d, uncertainty=False)
    assert len(default.channel_flows) == n
    given = solve_plate_field(d, channel_flows=default.channel_flows, uncertainty=False)
    assert given.T_face_max == pytest.approx(default.T_face_max, abs=1e-9)
    flows = np.linspace(0.5, 1.5, n)
    flows *= d.flow / flows.sum()
    uneven = solve_plate_field(d, channel_flows=list(flows), uncertainty=False)
    fr = uneven.field
    assert fr.heat_to_coolant == pytest.approx(fr.load, rel=1e-6)
    rise = fr.bulk[:, -1] - fr.reference
    assert rise[0] > rise[-1]


def test_plenums_are_uncooled_base():
    # source: common practice (the plate over a plenum has no channel under it): the coolant takes no heat
    # over the plenums, so its bulk temperature is flat there
    d = load_design(Path(EXAMPLES[0]).parent / "reagent-block-channels.toml")
    fr = solve_plate_field(d, uncertainty=False).field
    off = d.passage.plenum_length
    before = fr.bulk_x <= off + 1e-12
    after = fr.bulk_x >= d.plate.length - off - 1e-12
    assert np.allclose(fr.bulk[:, before], fr.reference, atol=1e-12)
    assert np.allclose(fr.bulk[:, after], fr.bulk[:, -1:], atol=1e-12)


def test_tube_passes_in_series():
    # source: energy conservation along the serpentine: each pass starts at the temperature the previous one
    # ended with, and the last pass leaves at inlet + load / (m cp)
    d = load_design(Path(EXAMPLES[0]).parent / "laser-mount-tube.toml")
    r = solve_plate_field(d, uncertainty=False)
    fr = r.field
    assert fr.bulk.shape[0] == d.passage.passes
    assert fr.bulk[0, 0] == pytest.approx(fr.reference)
    assert fr.bulk[1, -1] == pytest.approx(fr.bulk[0, -1])  # pass 1 starts at x = L where pass 0 ended
    assert fr.bulk[2, 0] == pytest.approx(fr.bulk[1, 0])
    assert fr.heat_to_coolant == pytest.approx(fr.load, rel=1e-6)
    assert fr.bulk[2, -1] - fr.reference == pytest.approx(fr.load / (r.m_dot * r.props.cp), rel=1e-9)


def test_random_placements_solve_to_finite_balanced_fields():
    # source: energy conservation and the contract (every accepted placement solves to finite numbers): seeded
    # random sources (1 to 3, sizes 3-25 mm, anywhere on the face, edges and plenums included) on the example
    # channel plate and the tube plate
    from coldplate.plate.sources import Source

    rng = np.random.default_rng(13)
    solved = capped = 0
    for name in ("reagent-block-channels.toml", "laser-mount-tube.toml", "detector-cavity-glycol.toml"):
        d = load_design(Path(EXAMPLES[0]).parent / name)
        L, W = d.plate.length, d.plate.width
        for trial in range(3):
            placed = []
            for k in range(int(rng.integers(1, 4))):
                for _ in range(50):
                    a, b = rng.uniform(0.003, 0.025, 2)
                    x = rng.uniform(a / 2, L - a / 2)
                    y = rng.uniform(-W / 2 + b / 2, W / 2 - b / 2)
                    s = Source(f"s{k}", float(rng.uniform(1, 40)), (float(a), float(b)), (float(x), float(y)),
                               1e-5, "test")
                    if all(min(s.edges()[1], o.edges()[1]) <= max(s.edges()[0], o.edges()[0])
                           or min(s.edges()[3], o.edges()[3]) <= max(s.edges()[2], o.edges()[2]) for o in placed):
                        placed.append(s)
                        break
            dd = replace(d, sources=tuple(placed))
            total = sum(s.load for s in placed)
            try:
                r = solve_plate_field(dd, load=total, uncertainty=False)
            except SolveError as exc:  # the grid cap: refused in one line that points to the network model
                assert "would need" in str(exc) and "--model network" in str(exc)
                capped += 1
                continue
            solved += 1
            assert math.isfinite(r.T_face_max) and r.T_face_max > r.T_in
            assert r.field.heat_to_coolant == pytest.approx(total, rel=1e-6)
            assert r.T_face_max == pytest.approx(max(s.face_max for s in r.sources))
    assert solved >= 7 and solved + capped == 9


def test_model_option_of_the_command(capsys):
    # source: the command-line contract: --model network gives the network's figures, --model field (the
    # default) the field's; an unknown model is refused on one line with exit 2
    import json

    from coldplate.cli import main

    path = str(Path(EXAMPLES[0]).parent / "detector-cavity-glycol.toml")
    d = load_design(path)
    assert main(["check", path, "--format", "json", "--model", "network"]) == 0
    net = json.loads(capsys.readouterr().out)
    assert net["thermal_resistance_K_per_W"] == pytest.approx(solve(d, model="network").R_th, rel=1e-9)
    assert main(["check", path, "--format", "json"]) == 0
    fld = json.loads(capsys.readouterr().out)
    assert fld["thermal_resistance_K_per_W"] == pytest.approx(solve(d, model="field").R_th, rel=1e-9)
    with pytest.raises(SystemExit) as stop:  # argparse's refusal, as the CLI contract tests take it
        main(["check", path, "--model", "guess"])
    assert stop.value.code == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "--model" in err


def test_a_grid_too_large_is_refused_in_one_line():
    # source: the contract (physics that cannot be solved: one line, exit 1): a plate whose field would exceed
    # field.MAX_CELLS raises SolveError naming the count and the network model, before any assembly
    from coldplate.design.errors import SolveError

    d = load_design(Path(EXAMPLES[0]).parent / "reagent-block-channels.toml")
    with pytest.raises(SolveError, match="--model network") as err:
        solve_plate_field(d, level=3, uncertainty=False)
    assert "\n" not in str(err.value)
