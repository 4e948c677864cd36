"""``coldplate size``: bad [search] input gives the usual one-line error (exit 2); the written design reads back
and passes ``coldplate check``; --write-best is atomic and refuses to overwrite; progress only on a terminal;
Ctrl-C prints the best so far and exits 130.

Source for the expectations: the project's input and output contract (README: design-file reference, exit
status, [search]).
"""
from __future__ import annotations

import io
import json
import subprocess
import sys
import tomllib

import pytest

from coldplate.cli import main
from coldplate.design.reader import load_design
from coldplate.sizing import command
from coldplate.sizing.writer import toml_text

from .helpers import ROOT, example_dict, write

SEARCH = {"count": [8, 12], "width": ["1.5 mm", "2 mm"], "depth": ["5 mm", "6 mm"], "base": ["3 mm"],
          "flow": {"from": "0.5 L/min", "to": "3 L/min", "steps": 6}, "face_limit": "30 degC",
          "pressure_drop_limit": "20 kPa"}


def _file(tmp_path, search=None, name="sizing.toml", base="reagent-block-channels"):
    data = example_dict(base)
    data["search"] = dict(SEARCH if search is None else search)
    path = tmp_path / name
    path.write_text(toml_text(data))
    return path


BAD = [
    ("range without steps", {"width": {"from": "1 mm", "to": "2 mm"}}, "[search] width"),
    ("range backwards", {"depth": {"from": "6 mm", "to": "2 mm", "steps": 3}}, "[search] depth"),
    ("unknown key in a range", {"flow": {"from": "1 L/min", "to": "2 L/min", "step": 3}}, "[search] flow"),
    ("empty list", {"count": []}, "[search] count"),
    ("count not whole", {"count": [8, 9.5]}, "[search] count"),
    ("steps not whole", {"base": {"from": "2 mm", "to": "4 mm", "steps": 2.5}}, "[search] base"),
    ("one step over a span", {"base": {"from": "2 mm", "to": "4 mm", "steps": 1}}, "[search] base"),
    ("wrong unit", {"flow": ["2 mm"]}, "[search] flow"),
    ("negative width", {"width": ["-1 mm"]}, "[search] width"),
    ("log spacing from zero", {"depth": {"from": "0 mm", "to": "4 mm", "steps": 3, "spacing": "log"}},
     "[search] depth"),
    ("unknown spacing", {"depth": {"from": "1 mm", "to": "4 mm", "steps": 3, "spacing": "cubic"}},
     "[search] depth"),
    ("unknown key", {"colour": "red"}, "[search] colour"),
    ("face limit missing", {"face_limit": None}, "[search] face_limit"),
    ("face limit below inlet", {"face_limit": "10 degC"}, "[search] face_limit"),
    ("too many candidates", {"count": {"from": 1, "to": 2000}, "width": {"from": "0.1 mm", "to": "1 mm",
                                                                         "steps": 1000},
                             "depth": {"from": "1 mm", "to": "9 mm", "steps": 1000}}, "[search]"),
]


@pytest.mark.parametrize("changes, expect", [c[1:] for c in BAD], ids=[c[0] for c in BAD])
def test_bad_search_gives_one_line_and_exit_2(tmp_path, capsys, changes, expect):
    search = dict(SEARCH)
    for k, v in changes.items():
        if v is None:
            search.pop(k)
        else:
            search[k] = v
    assert main(["size", str(_file(tmp_path, search))]) == 2
    cap = capsys.readouterr()
    assert cap.out == ""
    lines = cap.err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("coldplate: error: ") and expect in lines[0]


def test_missing_search_table_and_loop_water_limit(tmp_path, capsys):
    data = example_dict("reagent-block-channels")
    assert main(["size", str(write(tmp_path, data))]) == 2
    assert "[search]" in capsys.readouterr().err
    assert main(["size", str(_file(tmp_path, dict(SEARCH, max_water="100 L/day"),
                                   base="detector-cavity-glycol"))]) == 2
    assert "[passage] kind" in capsys.readouterr().err


def test_bad_search_in_a_fresh_process_prints_no_traceback(tmp_path):
    path = _file(tmp_path, dict(SEARCH, width={"from": "2 mm", "to": "1 mm", "steps": 3}))
    out = subprocess.run([sys.executable, "-m", "coldplate.cli", "size", str(path)], cwd=ROOT,
                         capture_output=True, text=True)
    assert out.returncode == 2 and out.stdout == ""
    assert out.stderr.count("\n") == 1 and "Traceback" not in out.stderr


def test_written_design_reads_back_and_passes_check(tmp_path, capsys):
    out = tmp_path / "best.toml"
    assert main(["size", str(_file(tmp_path)), "--write-best", str(out), "--quiet"]) == 0
    text = capsys.readouterr().out
    assert "Recommended" in text and "Why" in text
    assert "[search]" not in out.read_text()
    d = load_design(out)
    data = tomllib.loads(out.read_text())
    assert d.passage.count == data["passage"]["count"]
    assert main(["check", str(out)]) == 0
    capsys.readouterr()
    # the check of the written file is what size reported for it
    assert main(["size", str(_file(tmp_path)), "--format", "json", "--quiet"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert main(["check", str(out), "--format", "json"]) == 0
    check = json.loads(capsys.readouterr().out)
    assert check["thermal_resistance_K_per_W"] == pytest.approx(report["check"]["thermal_resistance_K_per_W"])
    assert main(["check", str(out), "--format", "json", "--model", "network"]) == 0
    network = json.loads(capsys.readouterr().out)  # the search's model
    assert report["recommended"]["thermal_resistance_K_per_W"] == pytest.approx(
        network["thermal_resistance_K_per_W"], rel=1e-3)
    assert report["recheck"]["network_thermal_resistance_K_per_W"] == pytest.approx(
        network["thermal_resistance_K_per_W"])
    assert report["recheck"]["field_thermal_resistance_K_per_W"] == pytest.approx(
        check["thermal_resistance_K_per_W"])
    assert {f["id"] for f in report["check"]["findings"]} >= {"cross-connection", "electricity-near-water"}


def test_write_best_refuses_to_overwrite_without_force(tmp_path, capsys):
    out = tmp_path / "best.toml"
    out.write_text("keep me\n")
    assert main(["size", str(_file(tmp_path)), "--write-best", str(out)]) == 2
    assert "--force" in capsys.readouterr().err and out.read_text() == "keep me\n"
    assert main(["size", str(_file(tmp_path)), "--write-best", str(out), "--force"]) == 0
    assert load_design(out).title
    assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".")] == []  # no temporary left


def test_write_best_into_a_missing_directory_is_refused_before_the_search(tmp_path, capsys):
    out = tmp_path / "no-such-dir" / "best.toml"
    assert main(["size", str(_file(tmp_path)), "--write-best", str(out)]) == 2
    captured = capsys.readouterr()
    assert captured.out == "" and "does not exist" in captured.err and len(captured.err.strip().splitlines()) == 1


def test_infeasible_search_exits_1_and_names_the_binding_limit(tmp_path, capsys):
    out = tmp_path / "best.toml"
    assert main(["size", str(_file(tmp_path, dict(SEARCH, face_limit="15.2 degC"))), "--write-best", str(out)]) == 1
    cap = capsys.readouterr()
    assert "face_limit binds" in cap.out and not out.exists()


def test_progress_bar_only_on_a_terminal(tmp_path, capsys):
    assert main(["size", str(_file(tmp_path))]) == 0  # pytest's stderr is not a terminal
    assert "sizing [" not in capsys.readouterr().err
    stream = io.StringIO()
    bar = command.ProgressBar(stream)
    bar(50, 100)
    bar(100, 100)
    bar.close()
    assert "100 %" in stream.getvalue() and "100 / 100 candidates" in stream.getvalue()


def test_ctrl_c_prints_the_best_so_far_and_exits_130(tmp_path, capsys, monkeypatch):
    class Interrupting(command.ProgressBar):
        calls = 0

        def __call__(self, done, total):
            Interrupting.calls += 1
            if Interrupting.calls == 2:
                raise KeyboardInterrupt

    monkeypatch.setattr(command, "ProgressBar", Interrupting)
    monkeypatch.setattr(sys.stderr, "isatty", lambda: True, raising=False)
    monkeypatch.setattr("coldplate.sizing.run.CHUNK", 12)  # one geometry per chunk: several chunks
    out = tmp_path / "best.toml"
    assert main(["size", str(_file(tmp_path)), "--write-best", str(out)]) == command.EXIT_INTERRUPTED
    cap = capsys.readouterr()
    assert "Recommended" in cap.out and "interrupted" in cap.out
    assert "interrupted" in cap.err and not out.exists()


def test_example_sizing_file_recommends_a_design_that_checks(tmp_path, capsys):
    example = ROOT / "examples" / "laser-mount-sizing.toml"
    out = tmp_path / "laser.toml"
    assert main(["size", str(example), "--write-best", str(out), "--quiet"]) == 0
    assert "Recommended" in capsys.readouterr().out
    assert main(["check", str(out)]) == 0
    assert main(["check", str(example)]) == 0  # the check ignores [search]


def test_writer_round_trips_what_tomllib_reads():
    data = {"title": "a \"quoted\" name", "n": 3, "x": 1.5, "flag": True,
            "t": {"list": ["1 mm", "2 mm"], "inline": {"from": "1 mm", "to": "2 mm", "steps": 3}, "k-ey": 2}}
    assert tomllib.loads(toml_text(data, header="line one\nline two")) == data
