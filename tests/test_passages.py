"""Passage kinds: the dispatcher's names agree with the design reader and the modules; geometry and
minor losses against textbook formulas."""
from __future__ import annotations

import math

import pytest

from coldplate.design import reader as design_mod
from coldplate.design.reader import design_from_dict
from coldplate.plate.passages import PASSAGES
from hydraulics.losses import K_exit, K_sudden_contraction, K_sudden_expansion

from .helpers import example_dict


def test_passage_names_agree_everywhere():
    # Dispatcher names must agree with the design reader's choices and each module's own kind.
    assert tuple(PASSAGES) == design_mod.PASSAGE_KINDS
    examples = {"channels": "reagent-block-channels", "tube": "laser-mount-tube", "cavity": "detector-cavity-glycol"}
    for kind, module in PASSAGES.items():
        d = design_from_dict(example_dict(examples[kind]))
        assert d.passage.kind == kind
        assert module.geometry(d.passage, d.plate).kind == kind
        for name in ("geometry", "back_side", "back_side_total", "minor_losses"):
            assert callable(getattr(module, name))


def test_back_side_total_equals_the_back_side():
    # Computed by our own functions: the array form the march uses equals back_side's total at each h, for
    # every passage kind (one h at a time against all at once), to round-off.
    import numpy as np

    examples = {"channels": "reagent-block-channels", "tube": "laser-mount-tube", "cavity": "detector-cavity-glycol"}
    h = np.array([150.0, 900.0, 4200.0, 21000.0])
    for kind, module in PASSAGES.items():
        d = design_from_dict(example_dict(examples[kind]))
        g = module.geometry(d.passage, d.plate)
        one_by_one = [module.back_side(d.passage, d.plate, g, float(x)).total for x in h]
        assert np.asarray(module.back_side_total(d.passage, d.plate, g, h)) == pytest.approx(one_by_one, rel=1e-13)
        assert float(module.back_side_total(d.passage, d.plate, g, 900.0)) == pytest.approx(one_by_one[1], rel=1e-13)


def test_channel_geometry_by_hand():
    # Source: definitions; D_h = 4A/P = 2wd/(w+d); walls = (W - N w)/(N + 1).
    d = design_from_dict(example_dict("reagent-block-channels"))
    g = PASSAGES["channels"].geometry(d.passage, d.plate)
    w, dep = 0.002, 0.006
    assert g.D_h == pytest.approx(2 * w * dep / (w + dep))
    assert g.alpha == pytest.approx(1 / 3)
    assert PASSAGES["channels"].wall_thickness(d.passage, d.plate) == pytest.approx((0.060 - 12 * 0.002) / 13)
    assert g.heated == "3L"  # floor (short side) and both tall side walls


def test_tube_length_by_hand():
    # Source: geometry; passes·L straight plus (passes − 1) half-circles of radius r.
    d = design_from_dict(example_dict("laser-mount-tube"))
    g = PASSAGES["tube"].geometry(d.passage, d.plate)
    assert g.path_length == pytest.approx(3 * 0.100 + 2 * math.pi * 0.008)
    assert g.heated_length == pytest.approx(0.300)


@pytest.mark.parametrize("ratio", [0.1, 0.3, 0.6])
def test_sudden_expansion_is_borda_carnot(ratio):
    # Source: Borda-Carnot, K = (1 - A1/A2)^2 on the upstream velocity (any fluid-mechanics textbook);
    # the Rennels form used by fluids agrees within a few per cent.
    assert K_sudden_expansion(ratio, 1.0) == pytest.approx((1 - ratio) ** 2, rel=0.06)


def test_contraction_and_exit_are_in_published_bands():
    # Source: sharp-edged contraction K from 0.5 (large area ratio) to 0 (no contraction) on the downstream
    # velocity (common practice; Rennels & Hudson's sharp-edged value for a large ratio is about 0.57, from
    # memory); exit loss K = 1 (textbook).
    assert 0.4 < K_sudden_contraction(1.0, 0.01) < 0.6
    assert K_sudden_contraction(1.0, 0.95) < 0.1
    assert K_exit() == 1.0


def _eta_adiabatic_tip(h, k, thickness, height, wetted_faces):
    """published: Incropera, DeWitt, Bergman & Lavine (2007) sec. 3.6, fin of uniform cross-section with an
    adiabatic tip: eta = tanh(mL)/(mL), m = sqrt(h P / (k A_c)); per unit length P = the wetted faces, A_c = t."""
    m = math.sqrt(h * wetted_faces / (k * thickness))
    return math.tanh(m * height) / (m * height)


@pytest.mark.parametrize("count", [1, 2, 12])
def test_channel_outer_walls_are_wetted_on_one_face(count):
    from coldplate.plate.passages import channels
    w, d, L, t, k, h = 0.002, 0.006, 0.068, 0.0015, 167.0, 6000.0
    eta_in = _eta_adiabatic_tip(h, k, t, d, wetted_faces=2)
    eta_out = _eta_adiabatic_tip(h, k, t, d, wetted_faces=1)
    # n channels have 2n side faces: 2(n - 1) on the walls between channels, 2 on the two outer walls
    expect = L * (count * w + d * (2 * (count - 1) * eta_in + 2 * eta_out))
    wetted, effective, m, eta = channels.fin_areas(count, w, d, L, t, k, h)
    assert effective == pytest.approx(expect, rel=1e-12)
    assert wetted == pytest.approx(count * L * (w + 2 * d), rel=1e-12)
    assert eta == pytest.approx(eta_in, rel=1e-12) and eta_out > eta_in
