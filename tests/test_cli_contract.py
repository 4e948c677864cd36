"""Regression tests for the command line's contract (issue 12, items 9 to 16): each defect found by the fuzzing
campaign or by a trial as a new user has a test here.

Sources for the expectations: the project's contract (README: exit status, design-file reference, reports);
for unit conversions NIST SP 811 (1 psi = 6 894.757 Pa, 1 bar = 1e5 Pa; from memory); for HTML escaping the HTML Living
Standard (a `<` starts a tag; `&lt;` is the character); for Markdown the CommonMark specification (any ASCII
punctuation may be backslash-escaped; raw HTML passes through, which is why it is escaped).
"""
from __future__ import annotations

import json
import os
import re
import stat
import subprocess
import sys

import pytest

from coldplate.cli import main
from coldplate.sizing.writer import toml_text

from .helpers import ROOT, example_dict, modified, write

PSI = 6894.757  # Pa per psi, NIST SP 811 (from memory; test_display_units.py checks the factor in use)


def _one_line(err: str) -> str:
    lines = err.strip().splitlines()
    assert len(lines) == 1 and "Traceback" not in err, err
    return lines[0]


# ------------------------------------------------------------------ 9: size with nothing feasible

def test_size_with_nothing_feasible_names_the_binding_limits_on_stderr(tmp_path, capsys):
    data = example_dict("reagent-block-channels")
    data["search"] = {"count": [8, 12], "width": ["1.5 mm", "2 mm"], "depth": ["5 mm"], "base": ["3 mm"],
                      "flow": {"from": "0.5 L/min", "to": "3 L/min", "steps": 4}, "face_limit": "15.2 degC"}
    path = tmp_path / "s.toml"
    path.write_text(toml_text(data))
    assert main(["size", str(path), "--quiet", "--write-best", str(tmp_path / "best.toml")]) == 1
    line = _one_line(capsys.readouterr().err)
    assert line.startswith("coldplate: cannot size: no design meets every limit")
    assert "[search] face_limit 15.20 degC binds alone" in line and "nearest" in line
    assert "nothing written" in line and not (tmp_path / "best.toml").exists()


# ------------------------------------------------------------------ 12: the umask everywhere

@pytest.mark.parametrize("mask", [0o022, 0o027])
def test_written_files_get_the_umask_permissions(tmp_path, capsys, mask):
    """Files created by a program get 0666 less the umask (POSIX open(2), common practice)."""
    data = example_dict("laser-mount-sizing")
    data["search"] = {"count": [8, 10], "width": ["2 mm"], "depth": ["5 mm"], "base": ["3 mm"],
                      "flow": ["2 L/min", "3 L/min"], "face_limit": "60 degC"}
    path = tmp_path / "s.toml"
    path.write_text(toml_text(data))
    old = os.umask(mask)
    try:
        assert main(["size", str(path), "--quiet", "--write-best", str(tmp_path / "best.toml")]) == 0
        assert main(["report", str(path), "-o", str(tmp_path / "r.html")]) == 0
        assert main(["report", str(path), "-o", str(tmp_path / "r.md")]) == 0
        assert main(["curves", str(path), "-o", str(tmp_path / "c.csv")]) == 0
    finally:
        os.umask(old)
    capsys.readouterr()
    modes = {p.name: stat.S_IMODE(p.stat().st_mode) for p in tmp_path.iterdir() if p.name != "s.toml"}
    assert len(modes) >= 5 and set(modes.values()) == {0o666 & ~mask}, modes


# ------------------------------------------------------------------ 13: size JSON under modules

def test_size_json_under_modules_carries_the_module_keys_of_check_json(tmp_path, capsys):
    data = example_dict("sample-stage-thermoelectric")
    data["search"] = {"count": [12, 14], "width": ["2.5 mm"], "depth": ["5 mm"], "base": ["4 mm"],
                      "flow": ["1 L/min", "1.5 L/min"], "face_limit": "60 degC"}
    path = tmp_path / "s.toml"
    path.write_text(toml_text(data))
    best = tmp_path / "best.toml"
    assert main(["size", str(path), "--quiet", "--format", "json", "--write-best", str(best)]) == 0
    sized = json.loads(capsys.readouterr().out)["check"]
    assert main(["check", str(best), "--format", "json"]) == 0
    checked = json.loads(capsys.readouterr().out)
    for key in ("cold_face_temperature_C", "module_current_A", "cop", "hot_face_temperature_C", "module"):
        assert key in sized
    assert set(sized) == set(checked)
    assert sized["cold_face_temperature_C"] == pytest.approx(checked["cold_face_temperature_C"])


# ------------------------------------------------------------------ 14: US units

@pytest.fixture(scope="module")
def circuit_us():
    out = subprocess.run([sys.executable, "-m", "coldplate.cli", "check", str(ROOT / "examples" /
                          "tap-to-drain-circuit.toml"), "--units", "us"], capture_output=True, text=True,
                         env=dict(os.environ, PYTHONPATH=str(ROOT)))
    assert out.returncode == 0, out.stderr
    json_out = subprocess.run([sys.executable, "-m", "coldplate.cli", "check", str(ROOT / "examples" /
                               "tap-to-drain-circuit.toml"), "--format", "json"], capture_output=True, text=True,
                              env=dict(os.environ, PYTHONPATH=str(ROOT)))
    return " ".join(out.stdout.split()), json.loads(json_out.stdout)


def test_us_brackets_are_converted_from_the_exact_value(circuit_us):
    text, doc = circuit_us
    outlet = doc["circuit"]["plate_outlet_pressure_Pa"]
    m = re.search(r"sits (\d+\.\d) kPa \((\d+\.\d+) psi\) below atmospheric", text)
    assert m, text
    assert float(m.group(1)) == pytest.approx(abs(outlet) / 1e3, abs=0.05)
    assert m.group(2) == f"{abs(outlet) / PSI:.3g}"  # from the exact value, not from the rounded kPa figure
    assert f"{abs(outlet) / PSI:.3f}" in text  # the table shows the same figure


def test_us_plate_rating_is_rounded_sensibly_and_the_passage_in_inches(circuit_us):
    text, doc = circuit_us
    assert "plate rated 100 psi" in text  # 6.9 bar = 690 000 Pa / 6894.757 = 100.08 psi
    assert "100.08" not in text
    # the passage line in the display system too: 2.5 mm, 5 mm and 90 mm in inches (1 in = 25.4 mm exactly,
    # NIST SP 811), three significant figures; JSON keeps the SI line
    assert "passage: 10 channels 0.0984 in × 0.197 in, 3.54 in long" in text
    assert doc["passage"].startswith("10 channels 2.5 × 5 mm, 90 mm long")


# ------------------------------------------------------------------ 15: small things users asked for

def test_version(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["--version"])
    assert exc.value.code == 0
    from coldplate import __version__

    assert capsys.readouterr().out.strip() == f"coldplate {__version__}"


def test_command_line_mistakes_are_one_line(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["check"])
    assert exc.value.code == 2
    assert _one_line(capsys.readouterr().err).startswith("coldplate: error: ")


def test_single_pass_tube_needs_no_bend_radius(tmp_path, capsys):
    one = modified(example_dict("laser-mount-tube"), passage__passes=1, passage__bend_radius=None)
    assert main(["check", str(write(tmp_path, one))]) == 0
    assert "1 pass," in capsys.readouterr().out
    three = modified(example_dict("laser-mount-tube"), passage__bend_radius=None)
    assert main(["check", str(write(tmp_path, three, "three.toml"))]) == 2
    assert "[passage] bend_radius" in _one_line(capsys.readouterr().err)


def test_readme_says_which_tables_are_required():
    """Deleting each table from an example: the reader refuses exactly those the README calls required."""
    from coldplate.design.errors import DesignError
    from coldplate.design.reader import design_from_dict

    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    m = re.search(r"Required tables: (.*?)\. Optional tables: (.*?)\.", " ".join(readme.split()))
    assert m, "README: the 'Required tables: ... Optional tables: ...' sentence"
    said_required = set(re.findall(r"`\[(\w+)\]`", m.group(1)))
    said_optional = set(re.findall(r"`\[(\w+)\]`", m.group(2)))
    base = example_dict("sample-stage-thermoelectric") | {"correlations": {"laminar": "hausen"}}
    base |= {k: v for k, v in example_dict("tap-to-drain-circuit").items() if k == "circuit"}
    refused = set()
    for table in [k for k, v in base.items() if isinstance(v, dict)]:
        data = {k: v for k, v in base.items() if k != table}
        if table == "module":  # without modules the plate needs its own load
            data["heat"] = dict(data["heat"], load="50 W")
        try:
            design_from_dict(data)
        except DesignError:
            refused.add(table)
    assert refused == said_required
    assert said_optional >= {"module", "circuit", "correlations", "search"} and not said_optional & refused


def test_drain_air_gap_finding_reads_the_given_gap(tmp_path, capsys):
    base = example_dict("reagent-block-channels")
    gap40 = modified(base, supply__drain_air_gap="40 mm")
    assert main(["check", str(write(tmp_path, gap40)), "--format", "json"]) == 0
    found = {f["id"]: f for f in json.loads(capsys.readouterr().out)["findings"]}
    assert "40 mm air gap given" in found["drain-air-gap"]["message"]
    assert "drain-air-gap-short" not in found
    gap10 = modified(base, supply__drain_air_gap="10 mm")
    assert main(["check", str(write(tmp_path, gap10)), "--format", "json"]) == 0
    found = {f["id"]: f for f in json.loads(capsys.readouterr().out)["findings"]}
    # 25 mm at least: ASME A112.1.2 (twice the outlet diameter, never under 25 mm)
    assert "10 mm" in found["drain-air-gap-short"]["message"] and "25 mm" in found["drain-air-gap-short"]["message"]
    assert "drain-air-gap" not in found
    none = modified(base)
    assert main(["check", str(write(tmp_path, none))]) == 0
    assert "Discharge through an air gap of at least twice" in " ".join(capsys.readouterr().out.split())
    loop = modified(example_dict("detector-cavity-glycol"), supply__drain_air_gap="40 mm")
    assert main(["check", str(write(tmp_path, loop))]) == 2
    assert "[supply] drain_air_gap" in _one_line(capsys.readouterr().err)


def test_text_summary_number_formats_are_consistent(capsys):
    for example in ("reagent-block-channels", "tap-to-drain-circuit", "sample-stage-thermoelectric"):
        for units in ("si", "us"):
            assert main(["check", str(ROOT / "examples" / f"{example}.toml"), "--units", units]) == 0
            text = capsys.readouterr().out
            table = text.split("Correlations used")[0]
            assert not re.search(r"\d\.\d+e[+-]\d\d", table), table  # plain figures in the tables
            assert "- / " not in table


# ------------------------------------------------------------------ 16: user text in reports

HOSTILE = "<script>alert(1)</script> [click](javascript:alert(2)) *bold* `tick`"


def _outside_fences(md: str) -> str:
    return re.sub(r"^(`{3,})toml\n.*?^\1$", "", md, flags=re.S | re.M)


@pytest.mark.parametrize("suffix", ["html", "md"])
def test_hostile_title_and_part_name_are_escaped(tmp_path, capsys, suffix):
    data = example_dict("tap-to-drain-circuit")
    data["title"] = HOSTILE
    data["circuit"]["part"][1]["name"] = "<img src=x onerror=alert(3)>"
    path = tmp_path / "d.toml"
    path.write_text(toml_text(data))
    out = tmp_path / f"r.{suffix}"
    assert main(["report", str(path), "-o", str(out)]) == 0
    capsys.readouterr()
    text = out.read_text(encoding="utf-8")
    shown = _outside_fences(text) if suffix == "md" else text
    assert "<script" not in shown and "<img" not in shown
    assert "&lt;script&gt;" in shown and "&lt;img src=x" in shown
    if suffix == "md":
        assert "[click](" not in shown and "\\[click\\]" in shown
        assert "\\*bold\\*" in shown
        assert "<script>alert(1)</script>" in text  # the design file is quoted as read, inside its fence


def test_markdown_fence_outlasts_backticks_in_the_design_file(tmp_path, capsys):
    data = example_dict("reagent-block-channels")
    data["title"] = "a ```` run of backticks"
    path = tmp_path / "d.toml"
    path.write_text(toml_text(data))
    assert main(["report", str(path), "-o", str(tmp_path / "r.md")]) == 0
    capsys.readouterr()
    text = (tmp_path / "r.md").read_text(encoding="utf-8")
    assert "`````toml\n" in text


# ------------------------------------------------------------------ 11: debris (in process)

def _dead_pid() -> int:
    p = subprocess.Popen([sys.executable, "-c", "pass"])
    p.wait()
    return p.pid


def test_leftovers_of_a_killed_run_are_removed_and_a_live_run_s_are_kept(tmp_path, capsys):
    dead, live = _dead_pid(), os.getppid()
    (tmp_path / f".r.html.{dead}.tmp").write_text("half")
    (tmp_path / f".r.html.{live}.tmp").write_text("another run, still going")
    stage = tmp_path / f".r.md.{dead}.tmp"
    stage.mkdir()
    (stage / "r.md").write_text("never moved")
    (stage / "r.flow.svg").write_text("never moved")
    (stage / ".targets").write_text("r.md\nr.breakdown.svg\nr.flow.svg\n")
    (tmp_path / "r.breakdown.svg").write_text("moved by the killed run")
    source = str(ROOT / "examples" / "reagent-block-channels.toml")
    assert main(["report", source, "-o", str(tmp_path / "r.md")]) == 0  # no --force needed
    assert main(["report", source, "-o", str(tmp_path / "r.html")]) == 0
    capsys.readouterr()
    names = sorted(p.name for p in tmp_path.iterdir())
    assert f".r.html.{live}.tmp" in names
    assert [n for n in names if n.startswith(".")] == [f".r.html.{live}.tmp"]
    assert "moved by" not in (tmp_path / "r.breakdown.svg").read_text()


def test_markdown_report_is_all_or_none_when_stopped_while_moving(tmp_path, capsys, monkeypatch):
    import reports.make as make

    real, calls = os.replace, []

    def stopping(a, b):
        calls.append(b)
        if len(calls) == 3:
            raise KeyboardInterrupt
        real(a, b)

    monkeypatch.setattr(make.os, "replace", stopping)
    rc = main(["report", str(ROOT / "examples" / "reagent-block-channels.toml"), "-o", str(tmp_path / "r.md")])
    assert rc == 130
    assert _one_line(capsys.readouterr().err) == "coldplate: interrupted; nothing written"
    assert list(tmp_path.iterdir()) == []


def test_us_report_shows_the_plate_rating_rounded_sensibly(tmp_path, capsys):
    out = tmp_path / "r.md"
    assert main(["report", str(ROOT / "examples" / "tap-to-drain-circuit.toml"), "--units", "us", "-o", str(out)]) == 0
    capsys.readouterr()
    text = out.read_text(encoding="utf-8")
    assert "| plate pressure rating (gauge) | 100 | psi |" in text  # 6.9 bar / 6894.757 Pa (NIST SP 811)
    assert "100.08" not in text and "100.1 " not in text
