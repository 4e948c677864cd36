"""Bad supply-side input: one line on stderr naming the field, exit status 2, nothing on stdout.

Source for the expectations: the project's input contract (README "[circuit]" and "[supply]").
"""
from __future__ import annotations

import copy
import subprocess
import sys

import pytest

from coldplate.cli import main

from .helpers import ROOT, example_dict, modified, write

TAP = example_dict("tap-to-drain-circuit")
BASE = example_dict("reagent-block-channels")


def part(index, **changes):
    """A copy of the tap example with circuit part ``index`` (0-based) changed; None deletes a key."""
    data = copy.deepcopy(TAP)
    p = data["circuit"]["part"][index]
    for k, v in changes.items():
        if v is None:
            p.pop(k, None)
        else:
            p[k] = v
    return data


def without_plate():
    data = copy.deepcopy(TAP)
    data["circuit"]["part"] = [p for p in data["circuit"]["part"] if p["kind"] != "plate"]
    return data


def two_plates():
    data = copy.deepcopy(TAP)
    data["circuit"]["part"].append({"kind": "plate"})
    return data


WEAK_PUMP = modified(TAP, supply__drive="pump", supply__static_pressure=None, circuit__air_gap=None,
                     circuit__back_pressure="1 bar",
                     supply__pump_flow=["0 L/min", "2 L/min", "4 L/min"], supply__pump_head=["1 m", "0.8 m", "0.3 m"])
SHORT_PUMP = modified(WEAK_PUMP, supply__pump_head=["200 m", "190 m", "180 m"])

CASES = [
    ("negative hose length", part(3, length="-2 m"), "[circuit.part 4] length"),
    ("unknown fitting", part(2, fitting="elbow-91"), "[circuit.part 3] fitting"),
    ("barb bore above the hose", part(2, bore="12 mm"), "[circuit.part 3] bore"),
    ("barb without bore", part(2, bore=None), "[circuit.part 3] bore: is missing"),
    ("unknown roughness material", part(3, material="velvet"), "[circuit.part 4] material"),
    ("hose material and roughness", part(3, roughness="0.01 mm"), "exactly one"),
    ("valve with neither kv nor cv", part(5, kv=None), "[circuit.part 6]"),
    ("valve kv negative", part(5, kv=-1), "[circuit.part 6] kv"),
    ("unknown backflow device", part(0, device="bucket"), "[circuit.part 1] device"),
    ("unknown part kind", part(1, kind="pond"), "[circuit.part 2] kind"),
    ("unknown part key", part(1, colour="blue"), "[circuit.part 2] colour: unknown key"),
    ("no plate in the circuit", without_plate(), "[circuit] part"),
    ("two plates in the circuit", two_plates(), "[circuit] part"),
    ("air gap with a back pressure", modified(TAP, circuit__back_pressure="0.2 bar"), "[circuit] air_gap"),
    ("pressure drive without static pressure", modified(TAP, supply__static_pressure=None),
     "[supply] static_pressure"),
    ("flow given while the tap sets it", modified(TAP, coolant__flow="2 L/min"), "[coolant] flow"),
    ("fixed flow without a flow", modified(TAP, supply__drive="flow"), "[coolant] flow: is missing"),
    ("pressure drive without a circuit", modified(BASE, supply__drive="pressure", coolant__flow=None),
     "[supply] drive"),
    ("unknown drive", modified(TAP, supply__drive="siphon"), "[supply] drive"),
    ("pump never reaches the needed head", WEAK_PUMP, "[supply] pump_head: the pump never reaches"),
    ("pump table ends too early", SHORT_PUMP, "[supply] pump_head: the pump curve ends"),
    ("pump head rising", modified(WEAK_PUMP, supply__pump_head=["1 m", "2 m", "0.3 m"]), "[supply] pump_head"),
    ("pump lists of unequal length", modified(WEAK_PUMP, supply__pump_head=["1 m", "0.8 m"]), "[supply] pump_head"),
    ("pump curve without pump drive", modified(TAP, supply__pump_flow=["0 L/min"]), "[supply] pump_flow"),
    ("tariff without a currency", modified(TAP, supply__tariff="4.10 /m**3"), "[supply] tariff"),
    ("tariff per length", modified(TAP, supply__tariff="4.10 EUR/m"), "[supply] tariff"),
    ("two currencies", modified(TAP, supply__electricity_tariff="0.28 USD/kWh"), "[supply] electricity_tariff"),
    ("chiller power without electricity tariff", modified(TAP, supply__electricity_tariff=None),
     "[supply] electricity_tariff"),
    ("planning on a loop", modified(example_dict("detector-cavity-glycol"), supply__face_limit="40 degC"),
     "[supply] face_limit"),
    ("tap too weak for the back pressure", modified(TAP, supply__static_pressure="0.5 bar", circuit__air_gap=None,
                                                   circuit__back_pressure="1 bar"),
     "[supply] static_pressure"),
]


@pytest.mark.parametrize("name,data,needle", CASES, ids=[c[0] for c in CASES])
def test_bad_supply_input_one_line_exit_2(tmp_path, capsys, name, data, needle):
    code = main(["check", str(write(tmp_path, data))])
    captured = capsys.readouterr()
    assert code == 2, captured.err
    assert captured.out == ""
    lines = captured.err.strip().splitlines()
    assert len(lines) == 1, captured.err
    assert needle in lines[0], lines[0]
    assert "Traceback" not in captured.err


def test_subprocess_pump_refusal(tmp_path):
    proc = subprocess.run([sys.executable, "-m", "coldplate.cli", "check", str(write(tmp_path, WEAK_PUMP))],
                          capture_output=True, text=True, cwd=ROOT)
    assert proc.returncode == 2 and proc.stdout == ""
    assert proc.stderr.count("\n") == 1 and "never reaches" in proc.stderr
