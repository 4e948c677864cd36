"""``coldplate size`` on designs whose plate load or flow comes from another part of the tool.

- thermoelectric modules: the plate is sized for the modules' heat at the starting design, and the written
  design (with its [module] table) passes ``coldplate check`` with the modules solved on the new plate;
- a tap-pressure circuit: the written design fixes the recommended flow and keeps the circuit;
- a pump drive, or a supply-set flow with no flow range, is refused in one line (exit 2).

Source for the expectations: the project's input and output contract (README: [search], [module], [circuit]);
the physics is checked in test_sizing_evaluate.py and test_module_solve.py.
"""
from __future__ import annotations

import tomllib

import pytest

from coldplate.cli import main
from coldplate.design.reader import load_design
from coldplate.check import solve
from coldplate.sizing.writer import toml_text

from .helpers import example_dict

SEARCH = {"count": [8, 14], "width": ["1.5 mm", "2.5 mm"], "depth": ["4 mm", "5 mm"],
          "flow": {"from": "0.3 L/min", "to": "2 L/min", "steps": 6}, "face_limit": "32 degC"}


def _sized(tmp_path, capsys, data):
    data["search"] = dict(SEARCH)
    path, best = tmp_path / "in.toml", tmp_path / "best.toml"
    path.write_text(toml_text(data))
    code = main(["size", str(path), "--quiet", "--write-best", str(best)])
    out = capsys.readouterr().out
    assert code == 0, out
    return out, best


def test_module_design_sizes_for_the_modules_heat(tmp_path, capsys):
    out, best = _sized(tmp_path, capsys, example_dict("sample-stage-thermoelectric"))
    assert "plate load: the modules' hot-side heat" in out
    assert main(["check", str(best)]) == 0
    r = solve(load_design(best))
    assert r.module is not None
    assert r.T_face_max <= 273.15 + 32 + 1e-6  # the face limit holds with the modules solved on the new plate
    assert "module" in tomllib.loads(best.read_text())


def test_pressure_drive_writes_the_recommended_flow(tmp_path, capsys):
    out, best = _sized(tmp_path, capsys, example_dict("tap-to-drain-circuit"))
    data = tomllib.loads(best.read_text())
    assert data["supply"]["drive"] == "flow" and "flow" in data["coolant"] and "circuit" in data
    assert "drive = \"flow\"" in out
    r = solve(load_design(best))
    assert r.circuit is not None and r.circuit.drive == "flow"


@pytest.mark.parametrize("change,needle", [
    ("pump", "[supply] drive"),
    ("no-flow-range", "[search] flow"),
])
def test_refused_in_one_line(tmp_path, capsys, change, needle):
    data = example_dict("tap-to-drain-circuit")
    data["search"] = dict(SEARCH)
    if change == "pump":
        data["supply"] = dict(data["supply"], drive="pump", pump_flow=["0 L/min", "5 L/min", "10 L/min"],
                              pump_head=["20 m", "15 m", "5 m"])
    else:
        del data["search"]["flow"]
    path = tmp_path / "in.toml"
    path.write_text(toml_text(data))
    assert main(["size", str(path), "--quiet"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and needle in err[0], err
