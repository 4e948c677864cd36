"""The demo's thermoelectric module (examples/sample-stage-thermoelectric.toml) is an invented, physical one.

The example must not carry any product's datasheet; its module is our own, with the couple count stated in
the file.  These checks hold that invented module to the physics of a bismuth-telluride module, each against
the source named beside it:

- Luo (2008, Electronics Cooling) derivation S = V_max/T_h, R = (T_h - dT_max) V_max / (T_h I_max),
  K = (T_h - dT_max) V_max I_max / (2 T_h dT_max), typed out again here (published);
- Ioffe (1957) ideal module: Z = S^2/(R K), dT_max = Z T_c^2 / 2, Q_max = S I_max T_h - I_max^2 R / 2
  (published, recalled from memory);
- per couple, a bismuth-telluride couple near room temperature has a Seebeck coefficient of about
  0.38-0.45 mV/K (two legs of about 190-225 uV/K) and room-temperature modules reach Z T of about 0.6-0.9
  (from memory; common practice for commercial-grade material).
"""
from __future__ import annotations

import re

import pytest

from .helpers import network_solve as solve  # the network model's numbers
from coldplate.design.reader import design_from_dict

from .helpers import ROOT, example_dict

NAME = "sample-stage-thermoelectric"


def _luo(I_max, V_max, dT_max, T_h):
    """Luo (2008), typed out again (published)."""
    return V_max / T_h, (T_h - dT_max) * V_max / (T_h * I_max), (T_h - dT_max) * V_max * I_max / (2 * T_h * dT_max)


def _couples() -> int:
    """The couple count the example states in its comment ("<N> bismuth-telluride couples")."""
    text = (ROOT / "examples" / f"{NAME}.toml").read_text()
    found = re.search(r"(\d+) bismuth-telluride couples", text)
    assert found, "the example must state its invented module's couple count"
    return int(found.group(1))


def test_demo_module_is_invented_and_says_so():
    # common practice: demo data are scenarios of our own; the example says so beside the maxima
    text = (ROOT / "examples" / f"{NAME}.toml").read_text()
    assert "invented module" in text and "not any product's datasheet" in text


def test_demo_module_is_a_physical_bismuth_telluride_module():
    m = design_from_dict(example_dict(NAME)).module
    N = _couples()
    S, R, K = _luo(m.max_current, m.max_voltage, m.max_temperature_difference, m.rated_hot_side)
    # from memory: 0.38-0.45 mV/K per couple
    assert 0.38e-3 <= S / N <= 0.45e-3
    # from memory: Z T_h of a room-temperature module 0.6-0.9
    Z = S * S / (R * K)
    assert 0.6 <= Z * m.rated_hot_side <= 0.9
    # Ioffe (1957): the ideal module's largest difference Z T_c^2 / 2 is the datasheet's dT_max (the
    # maxima are consistent with one another, so Luo's three parameters describe one module)
    T_c = m.rated_hot_side - m.max_temperature_difference
    assert 0.5 * Z * T_c**2 == pytest.approx(m.max_temperature_difference, rel=1e-9)
    # Ioffe (1957): Q_max at I_max with no difference; the datasheet value given is within 1 % of it
    q_max = S * m.max_current * m.rated_hot_side - 0.5 * m.max_current**2 * R
    assert m.max_heat == pytest.approx(q_max, rel=0.01)
    # computed from the comment's stated figures (our own arithmetic, written in the example)
    assert S == pytest.approx(0.04585, rel=1e-3) and Z == pytest.approx(2.58e-3, rel=2e-3)
    assert q_max == pytest.approx(47.9, rel=1e-3)


def test_demo_still_shows_the_frost_finding():
    # computed by our own solver: the README's example of the cold face below the room's dew/frost point;
    # the drive current stays below the coldest current, and the datasheet Q_max raises no mismatch note
    r = solve(design_from_dict(example_dict(NAME)))
    ids = [f.id for f in r.findings]
    assert "module-cold-face-frost" in ids
    assert "module-past-coldest-current" not in ids
    assert "module-datasheet-mismatch" not in ids
    assert r.module.T_cold < r.T_dew - 20.0
    assert r.module.current < r.module.coldest_current < r.design.module.max_current
