"""The working-day commands: ``coldplate new``, several designs side by side, ``--watch``, and the results in
notebooks and spreadsheets.

Sources: the check itself is validated elsewhere (VALIDATION.md); here the outside references are the
formats the output is read back with (Python's ``csv`` module for RFC 4180 CSV, ``json``; ``tomllib`` for
TOML, library), the exit statuses of the project's contract (130 = 128 + SIGINT, the shells' convention:
common practice), the unit definition 1 L/min = 1/60 000 m³/s (SI: the litre is 1e-3 m³, published), and the
single-design check's own output, which the comparison must reproduce figure for figure.
"""
from __future__ import annotations

import csv
import io
import json
import os
import re
import signal
import subprocess
import sys
import threading
import tomllib

import pytest

from coldplate import __version__
from coldplate.check import check_file
from coldplate.cli import main
from coldplate.commands import watch
from coldplate.design.catalogue import FIELDS
from coldplate.design.starters import KINDS, starter_text
from coldplate.findings.base import SEVERITIES
from reports.jsonout import check_to_dict, render_json
from reports.text import render_text

from .helpers import ROOT

EXAMPLES = ROOT / "examples"
#: An optional line of a starter: '# key = value' or '# [table]' (prose comments never look like that).
OPTIONAL = re.compile(r"^# (\[{1,2}[a-z.]+\]{1,2}$|[a-z_]+ = )")
TIMEOUT = 120  # [s] only so that a broken watch loop cannot hang the suite; nothing here measures time


def _uncommented(text: str) -> str:
    return "\n".join(line[2:] if OPTIONAL.match(line) else line for line in text.splitlines()) + "\n"


# ---------------------------------------------------------------- coldplate new


@pytest.mark.parametrize("kind", KINDS)
def test_new_writes_a_design_that_checks_as_it_is(kind, tmp_path, capsys):
    out = tmp_path / f"{kind}.toml"
    assert main(["new", kind, "-o", str(out)]) == 0
    assert main(["check", str(out)]) == 0
    result = check_file(out)
    assert result.design.title and result.T_face_max > result.T_in


@pytest.mark.parametrize("kind", KINDS)
def test_every_key_of_a_starter_is_explained_beside_it_by_the_catalogue(kind):
    text = starter_text(kind)
    table = "top"
    seen = 0
    for line in text.splitlines():
        bare = line[2:] if OPTIONAL.match(line) else line
        head = re.match(r"^\[{1,2}([a-z.]+)\]{1,2}", bare)
        if head:
            table = head.group(1)
            continue
        m = re.match(r"^([a-z_]+) = .*?\s# (.+)$", bare)
        if m:
            assert m.group(2) == FIELDS[f"[{table}] {m.group(1)}"].text, line
            seen += 1
        else:
            assert not re.match(r"^[a-z_]+ = ", bare), f"a key without its description: {line}"
    assert seen >= 15


@pytest.mark.parametrize("kind", KINDS)
def test_uncommenting_the_optional_tables_and_keys_still_reads(kind, tmp_path):
    text = starter_text(kind)
    opened = _uncommented(text)
    assert opened != text  # every starter has something optional
    path = tmp_path / "opened.toml"
    path.write_text(opened)
    result = check_file(path)
    data = tomllib.loads(opened)
    assert result.design.model.segments == data["correlations"]["segments"]
    if "search" in data:  # the sizing table reads too
        from coldplate.sizing.search import read_search

        assert read_search(data, result.design).size > 1


def test_new_refuses_to_overwrite_without_force(tmp_path, capsys):
    out = tmp_path / "mine.toml"
    out.write_text("# my own work\n")
    assert main(["new", "tube", "-o", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--force" in err[0] and "Traceback" not in err[0]
    assert out.read_text() == "# my own work\n"
    assert main(["new", "tube", "-o", str(out), "--force"]) == 0
    assert out.read_text() == starter_text("tube")


# ---------------------------------------------------------------- side by side

FILES = [EXAMPLES / "reagent-block-channels.toml", EXAMPLES / "laser-mount-tube.toml",
         EXAMPLES / "tap-to-drain-circuit.toml"]


def test_one_design_keeps_todays_output(capsys):
    path = FILES[0]
    assert main(["check", str(path)]) == 0
    assert capsys.readouterr().out == render_text(check_file(path), __version__).rstrip("\n") + "\n"
    assert main(["check", str(path), "--format", "json"]) == 0
    assert capsys.readouterr().out == render_json(check_file(path), __version__) + "\n"


def test_three_designs_side_by_side_text(capsys):
    assert main(["check", *map(str, FILES)]) == 0
    out = capsys.readouterr().out
    results = [check_file(p) for p in FILES]
    head = out.splitlines()[0]
    assert all(p.name in head for p in FILES)
    # the hottest face: each design's own figure, the coolest marked best and the hottest worst
    row = next(line for line in out.splitlines() if line.startswith("mounting face, hottest"))
    faces = [r.T_face_max - 273.15 for r in results]
    for f in faces:
        assert f"{f:.2f}" in row
    assert f"{min(faces):.2f} (best)" in row and f"{max(faces):.2f} (worst)" in row
    for s in SEVERITIES:
        assert any(line.startswith(f"{s} findings") for line in out.splitlines())


def test_side_by_side_csv_reads_back_with_the_figures(capsys):
    assert main(["check", *map(str, FILES), "--format", "csv"]) == 0
    rows = list(csv.reader(io.StringIO(capsys.readouterr().out)))
    assert rows[0] == ["row", "unit", *[p.name for p in FILES], "best", "worst"]
    by = {r[0]: r for r in rows[1:]}
    results = [check_file(p) for p in FILES]
    dp = [float(x) for x in by["pressure drop (plate)"][2:5]]
    assert by["pressure drop (plate)"][1] == "kPa"
    assert dp == pytest.approx([r.dp / 1e3 for r in results], rel=1e-5)
    best = FILES[min(range(3), key=lambda i: results[i].dp)].name
    assert by["pressure drop (plate)"][5] == best
    for s in SEVERITIES:
        assert [int(x) for x in by[f"{s} findings"][2:5]] == [sum(f.severity == s for f in r.findings)
                                                            for r in results]


def test_side_by_side_json_is_a_list_of_the_checks(capsys):
    assert main(["check", *map(str, FILES), "--format", "json"]) == 0
    items = json.loads(capsys.readouterr().out)
    assert [i["file"] for i in items] == [p.name for p in FILES]
    for item, path in zip(items, FILES):
        item.pop("file")
        assert item == json.loads(json.dumps(check_to_dict(check_file(path), __version__)))


def test_a_design_that_fails_is_one_line_and_the_others_run(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text(FILES[0].read_text().replace("count = 12", "count = \"twelve\""))
    assert main(["check", str(FILES[0]), str(bad), str(FILES[1])]) == 2
    captured = capsys.readouterr()
    err = captured.err.strip().splitlines()
    assert len(err) == 1 and "bad.toml" in err[0] and "[passage] count" in err[0]
    lines = captured.out.splitlines()
    failed = [line for line in lines if line.startswith("could not check")]
    assert len(failed) == 1 and "[passage] count" in failed[0]
    assert f"{check_file(FILES[1]).T_face_max - 273.15:.2f}" in lines[2]


# ---------------------------------------------------------------- --watch


def _flow(text: str, litres_per_minute: float) -> str:
    return re.sub(r'^flow = ".*"$', f'flow = "{litres_per_minute} L/min"', text, flags=re.M)


def test_watch_reads_both_saves_from_a_writing_thread(tmp_path):
    path = tmp_path / "design.toml"
    base = FILES[0].read_text()
    path.write_text(_flow(base, 1.0))
    lines, results, stop = [], [], threading.Event()
    solved = threading.Semaphore(0)

    def on_solved(r):
        results.append(r)
        solved.release()

    def writer():
        try:
            for text in (_flow(base, 2.0), base.replace("count = 12", "count = \"x\""), _flow(base, 3.0)):
                assert solved.acquire(timeout=TIMEOUT)  # the previous version has been read
                path.write_text(text)
                os.utime(path, ns=(os.stat(path).st_atime_ns, os.stat(path).st_mtime_ns + 1_000_000))
            assert solved.acquire(timeout=TIMEOUT)
        finally:
            stop.set()

    thread = threading.Thread(target=writer)
    thread.start()
    watch(path, lines.append, stop=stop, poll=0.02, on_solved=on_solved)
    thread.join()
    assert len(results) == 4 and results[2] is None  # the broken save: its error line, then the next save
    # the flows written, read back (1 L/min = 1e-3 m³ / 60 s)
    assert [r.V_dot * 6e4 for r in (results[0], results[1], results[3])] == pytest.approx([1.0, 2.0, 3.0])
    text = "\n".join(lines)
    assert "coolant flow up: 1 -> 2 L/min" in text and "coolant flow up: 2 -> 3 L/min" in text
    assert "thermal resistance down" in text
    assert any(line.startswith("coldplate: error: [passage] count") for line in lines)
    assert text.count("waiting for the next save") == 1


def test_watch_ends_on_ctrl_c_with_130(tmp_path):
    path = tmp_path / "design.toml"
    path.write_text(FILES[0].read_text())
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    env.pop("COLDPLATE_DEBUG", None)
    p = subprocess.Popen([sys.executable, "-m", "coldplate.cli", "check", str(path), "--watch"], env=env,
                         stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    try:
        for line in p.stdout:  # wait until it watches (the first check printed)
            if line.startswith("coldplate: watching"):
                break
        p.send_signal(signal.SIGINT)
        out, err = p.communicate(timeout=TIMEOUT)
    finally:
        if p.poll() is None:
            p.kill()
    assert p.returncode == 130  # 128 + SIGINT (common practice)
    assert err.strip().splitlines() == ["coldplate: stopped watching"]


def test_watch_refuses_several_files_and_other_formats(capsys):
    assert main(["check", str(FILES[0]), str(FILES[1]), "--watch"]) == 2
    assert main(["check", str(FILES[0]), "--watch", "--format", "json"]) == 2
    assert len(capsys.readouterr().err.strip().splitlines()) == 2


# ---------------------------------------------------------------- notebooks and spreadsheets


def test_result_renders_the_reports_summary_in_a_notebook():
    import coldplate
    from html import escape

    r = coldplate.check_file(FILES[2])
    html = r._repr_html_()
    assert "<script" not in html.lower() and "javascript:" not in html.lower()
    assert escape(r.design.title) in html
    for f in r.findings:
        assert f'data-id="{f.id}"' in html
    assert f"{r.T_face_max - 273.15:.2f}" in html


def test_to_dict_is_the_json_object():
    import coldplate

    r = coldplate.check_file(FILES[0])
    assert json.loads(json.dumps(r.to_dict())) == json.loads(render_json(r, __version__))


def test_to_frame_profile_and_curves():
    pd = pytest.importorskip("pandas")
    import coldplate

    r = coldplate.check_file(FILES[0])
    frame = r.to_frame()
    assert isinstance(frame, pd.DataFrame)
    assert frame["x_m"].tolist() == list(r.profile.x)
    assert frame["bulk_temperature_C"].tolist() == pytest.approx([t - 273.15 for t in r.profile.T_bulk])
    curves = r.to_frame("curves")
    assert {"flow_m3_per_s", "thermal_resistance_K_per_W", "pressure_drop_Pa"} <= set(curves.columns)
    assert curves["pressure_drop_Pa"].is_monotonic_increasing  # more flow, more drop (common practice)
    with pytest.raises(ValueError):
        r.to_frame("nothing")


@pytest.fixture(scope="module")
def small_search(tmp_path_factory):
    """The channels starter with its optional [search] table opened: a small search."""
    path = tmp_path_factory.mktemp("size") / "search.toml"
    path.write_text(_uncommented(starter_text("channels")))
    return path


def test_size_csv_writes_the_front(small_search, capsys):
    import coldplate

    assert main(["size", str(small_search), "--format", "csv", "--quiet"]) == 0
    rows = list(csv.DictReader(io.StringIO(capsys.readouterr().out)))
    s = coldplate.size_file(small_search)
    assert len(rows) == len(s.outcome.pareto) > 1
    assert [float(r["thermal_resistance_K_per_W"]) for r in rows] == pytest.approx(
        [c.R_th for c in s.outcome.pareto], rel=1e-7)
    assert {"count_SI", "width_SI", "depth_SI", "flow_SI"} <= set(rows[0])
    html = s._repr_html_()
    assert "<script" not in html.lower() and "Trade-off front" in html
    assert s.to_dict()["recommended"] is not None
    pd = pytest.importorskip("pandas")
    frame = s.to_frame()
    assert isinstance(frame, pd.DataFrame) and len(frame) == len(rows)
