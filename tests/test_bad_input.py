"""Bad input: one line on stderr naming the field and the problem, exit status 2, no traceback.

Source for the expectations: the project's own input contract (README, design-file reference).
"""
from __future__ import annotations

import subprocess
import sys

import pytest

from coldplate.cli import main

from .helpers import ROOT, example_dict, modified, write

BASE = example_dict("reagent-block-channels")
TUBE = example_dict("laser-mount-tube")
CAVITY = example_dict("detector-cavity-glycol")

CASES = [
    # (id, base, changes, text the one-line message must contain)
    ("missing field", BASE, {"heat__load": None}, "[heat] load: is missing"),
    ("missing table", BASE, {"room": None}, "[room]"),
    ("missing title", BASE, {"title": None}, "title"),
    ("flow given as a length", BASE, {"coolant__flow": "2 m"}, "[coolant] flow"),
    ("load given as a length", BASE, {"heat__load": "85 mm"}, "[heat] load"),
    ("bare number", BASE, {"plate__width": 60}, "[plate] width"),
    ("unknown unit", BASE, {"coolant__flow": "2 gpm"}, "gpm"),
    ("zero flow", BASE, {"coolant__flow": "0 L/min"}, "[coolant] flow"),
    ("negative load", BASE, {"heat__load": "-5 W"}, "[heat] load"),
    ("NaN", BASE, {"plate__base": "nan mm"}, "[plate] base"),
    ("infinite", BASE, {"heat__load": "inf W"}, "[heat] load"),
    ("absurd length", BASE, {"plate__length": "40 m"}, "[plate] length"),
    ("absurd flow", BASE, {"coolant__flow": "5000 L/min"}, "[coolant] flow"),
    ("zero channel count", BASE, {"passage__count": 0}, "[passage] count"),
    ("count not an integer", BASE, {"passage__count": 12.5}, "[passage] count"),
    ("unknown material", BASE, {"plate__material": "unobtainium"}, "[plate] material"),
    ("near-miss material", BASE, {"plate__material": "aluminum6061x"}, "[plate] material"),
    ("unknown fluid", BASE, {"coolant__fluid": "mercury"}, "[coolant] fluid"),
    ("inlet at freezing", BASE, {"coolant__inlet_temperature": "0 degC"}, "[coolant] inlet_temperature"),
    ("inlet below freezing", BASE, {"coolant__inlet_temperature": "-5 degC"}, "[coolant] inlet_temperature"),
    ("inlet boiling", BASE, {"coolant__inlet_temperature": "100 degC", "supply__static_pressure": None}, "[coolant] inlet_temperature"),
    ("channels do not fit", BASE, {"passage__count": 30}, "do not fit"),
    ("channels exactly fill width", BASE, {"passage__count": 30, "passage__width": "2 mm"}, "[passage] count"),
    ("both material and conductivity", BASE, {"plate__conductivity": "200 W/(m*K)"}, "exactly one"),
    ("neither material nor conductivity", BASE, {"plate__material": None}, "exactly one"),
    ("interface both forms", BASE, {"interface__resistance": "1e-5 K*m**2/W"}, "[interface]"),
    ("interface neither form", BASE, {"interface__thickness": None}, "[interface]"),
    ("unknown key (typo)", BASE, {"plate__lenght": "80 mm"}, "[plate] lenght: unknown key"),
    ("unknown table", BASE, {"extras": {"a": 1}}, "extras"),
    ("unknown passage kind", BASE, {"passage__kind": "pins"}, "[passage] kind"),
    ("footprint larger than plate", BASE, {"heat__footprint": ["90 mm", "40 mm"]}, "[heat] footprint"),
    ("footprint not a pair", BASE, {"heat__footprint": ["40 mm"]}, "[heat] footprint"),
    ("relative humidity above 100 %", BASE, {"room__relative_humidity": "120 %"}, "[room] relative_humidity"),
    ("hours above 24", BASE, {"supply__hours_per_day": 30}, "[supply] hours_per_day"),
    ("unknown source", BASE, {"supply__source": "river"}, "[supply] source"),
    ("tube outer not above inner", TUBE, {"passage__outer_diameter": "4 mm"}, "[passage] outer_diameter"),
    ("tube passes do not fit", TUBE, {"passage__passes": 5}, "[passage] passes"),
    ("tube unknown bond", TUBE, {"passage__bond": "glue"}, "[passage] bond"),
    ("glycol without basis", CAVITY, {"coolant__basis": None}, "[coolant] basis"),
    ("glycol fraction above data", CAVITY, {"coolant__fraction": "90 %"}, "[coolant] fraction"),
    ("glycol below its freezing point", CAVITY, {"coolant__inlet_temperature": "-20 degC"},
     "[coolant] inlet_temperature"),
    ("flow too small: outlet boils", BASE, {"coolant__flow": "0.005 L/min"}, "[coolant] flow"),
    ("inlet above boiling at line pressure", BASE, {"coolant__inlet_temperature": "160 degC"},
     "[coolant] inlet_temperature"),
    ("potable water returned", BASE, {"supply__discharge": "return"}, "[supply] discharge"),
    ("recirculating water to a drain", BASE, {"supply__source": "recirculating", "supply__discharge": "drain"},
     "[supply] discharge"),
    ("cavity taller than wide", CAVITY, {"passage__height": "60 mm"}, "[passage] height"),
]


@pytest.mark.parametrize("name,base,changes,needle", CASES, ids=[c[0] for c in CASES])
def test_bad_input_one_line_exit_2(tmp_path, capsys, name, base, changes, needle):
    path = write(tmp_path, modified(base, **changes))
    code = main(["check", str(path)])
    captured = capsys.readouterr()
    assert code == 2, captured.err
    assert captured.out == ""  # nothing written half-way
    lines = captured.err.strip().splitlines()
    assert len(lines) == 1, captured.err
    assert needle in lines[0]
    assert "Traceback" not in captured.err


def test_not_toml(tmp_path, capsys):
    path = tmp_path / "bad.toml"
    path.write_text("title = 'x'\n[heat\nload = 3")
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "TOML" in err[0]


def test_missing_file(capsys):
    assert main(["check", "/nonexistent/design.toml"]) == 2
    assert "does not exist" in capsys.readouterr().err


def test_subprocess_exit_status_and_no_traceback(tmp_path):
    path = write(tmp_path, modified(BASE, coolant__flow="2 m"))
    proc = subprocess.run([sys.executable, "-m", "coldplate.cli", "check", str(path)], capture_output=True,
                          text=True, cwd=ROOT)
    assert proc.returncode == 2
    assert proc.stdout == ""
    assert proc.stderr.count("\n") == 1 and "Traceback" not in proc.stderr
