"""Fuzzing the command line with mutated example design files: every outcome keeps the contract.

Source for the expectations: the project's input and output contract (README, "Exit status"):

* exit 0: the command ran; JSON parses with no NaN or Infinity, text shows no ``nan``/``inf``, files are written
  and no temporary is left beside them;
* exit 2: bad input, exactly one line on stderr, ``coldplate: error: ...`` naming ``[table] key`` (or the file);
* exit 1: the physics could not be solved, exactly one line saying why (never an internal fault);
* never a traceback, never a second line (library warnings are turned into errors for the run), never a file
  or temporary left in the output folder by a failed run.

Mutants are seeded: mutant ``i`` of seed ``s`` is the same on every machine, so a failure is reproducible with
``COLDPLATE_FUZZ_SEED=s`` and the mutant's index printed in the message.  The normal run tries a few hundred
mutants (``COLDPLATE_FUZZ``, default 300); set ``COLDPLATE_FUZZ=5000`` for a campaign.  The commands run in
process through :func:`coldplate.cli.main` with ``COLDPLATE_DEBUG=1``, which turns warnings into errors and
lets an internal fault escape as an exception, so the test sees its traceback.
"""
from __future__ import annotations

import contextlib
import copy
import io
import json
import math
import os
import random
import re
import tomllib
from pathlib import Path

import pytest

from coldplate.cli import main

from .helpers import EXAMPLES

N_MUTANTS = int(os.environ.get("COLDPLATE_FUZZ", "300"))
SEED = int(os.environ.get("COLDPLATE_FUZZ_SEED", "12"))

FUZZ_STEPS = 3  # each searched range of an example cut to this many values: `size` on every key form, CI-sized


def _small_search(data: dict) -> dict:
    """The example with its [search] ranges cut to FUZZ_STEPS values and its lists to their first FUZZ_STEPS
    (the contract is what is fuzzed, not the search's reach: the sizing example's 825,705 candidates would run
    for tens of seconds per mutant); every key and every form of value (range, list, limit) is kept."""
    if "search" not in data:
        return data
    table = {}
    for key, v in data["search"].items():
        if isinstance(v, dict) and "from" in v and "to" in v:
            v = dict(v, steps=min(v.get("steps", FUZZ_STEPS), FUZZ_STEPS))
        elif isinstance(v, list):
            v = v[:FUZZ_STEPS]
        table[key] = v
    return dict(data, search=table)


BASES = {p.stem: _small_search(tomllib.loads(p.read_text(encoding="utf-8"))) for p in EXAMPLES}
# two small searches of our own, so `size` is fuzzed on channels and on tubes (scenarios for the test only)
BASES["reagent-block-sizing"] = dict(BASES["reagent-block-channels"], search={
    "count": [6, 10], "width": {"from": "1 mm", "to": "2.5 mm", "steps": 3}, "depth": ["4 mm", "6 mm"],
    "base": ["3 mm"], "flow": {"from": "0.3 L/min", "to": "3 L/min", "steps": 5}, "face_limit": "40 degC",
    "pressure_drop_limit": "30 kPa"})
BASES["laser-mount-tube-sizing"] = dict(BASES["laser-mount-tube"], search={
    "inner_diameter": ["3 mm", "4.6 mm"], "passes": [1, 2, 3], "base": ["3 mm", "5 mm"],
    "flow": {"from": "0.5 L/min", "to": "4 L/min", "steps": 4, "spacing": "log"}, "face_limit": "50 degC"})

NUMBER_TEXT = ["0", "-0", "-1", "1e-300", "1e300", "1e400", "nan", "inf", "-inf", "99999999999999999999999",
               "0.0000001", "-5e3", "1_000", "0x10", "", "1/0", "two", "1,5", "3 4", "+-2"]
SCALES = [1e-9, 1e-3, 0.01, 0.2, 5, 100, 1e4, 1e9, -1]
NUMBERS = [0, -1, 1e300, float("nan"), float("inf"), -float("inf"), 10**30, 1e-300, -0.0, 2**63, 7, 0.5]
UNITS = ["", "parsec", "K", "degC", "degF", "psi", "L/min", "gpm", "m", "W", "%", "kg", "s", "bar", "mm**2",
         "1/s", "delta_degC", "Pa*s", "\u00b5m", "m/", "**", "kelvin kelvin", "psig", "m**3/s", "W/(m*K)"]
ODD_VALUES = [True, [], {}, [1, 2], {"a": 1}, "", "   ", 3, 2.5, "text", ["1 mm"], ["1 mm", "2 mm", "3 mm"],
              "<script>alert(1)</script>", "x" * 500, "\u2603 snow", [[1]], {"from": 1}]
UNKNOWN_KEYS = ["colour", "lenght", "bend_radius", "drain_air_gap", "flow", "kind", "zzz", "", " ", "a.b"]
_NUMBER = re.compile(r"^\s*([-+0-9.eE_]+|nan|inf|-inf)\s*(.*)$")


# ------------------------------------------------------------------------------------------- mutating

def _slots(data, path=()):
    """Every (container, key, path) holding a value, tables and arrays of tables included."""
    items = data.items() if isinstance(data, dict) else enumerate(data)
    for k, v in items:
        yield data, k, path + (k,)
        if isinstance(v, dict) or (isinstance(v, list) and v and all(isinstance(x, dict) for x in v)):
            yield from _slots(v, path + (k,))


def _tables(data, path=()):
    yield data, path
    for k, v in data.items():
        if isinstance(v, dict):
            yield from _tables(v, path + (k,))
        elif isinstance(v, list):
            for i, x in enumerate(v):
                if isinstance(x, dict):
                    yield from _tables(x, path + (k, i))


def _leaves(data):
    return [s for s in _slots(data) if not isinstance(s[0][s[1]], dict)
            and not (isinstance(s[0][s[1]], list) and s[0][s[1]] and isinstance(s[0][s[1]][0], dict))]


def _mutate_once(data: dict, rng: random.Random, gentle: bool = False) -> str:
    """Change ``data`` in place one way; returns a description.  Gentle: a number scaled by 0.1 to 10, so
    most such mutants are accepted and reach the physics and the reports."""
    leaves = _leaves(data)
    kind = "gentle" if gentle else rng.choice(["delete", "number", "number", "unit", "swap", "type", "unknown",
                                                "choice", "table", "scale", "scale"])
    if not leaves:
        kind = "unknown"
    if kind in ("number", "unit", "scale", "gentle"):
        textual = [s for s in leaves if isinstance(s[0][s[1]], str) and _NUMBER.match(s[0][s[1]])]
        numeric = [s for s in leaves if isinstance(s[0][s[1]], (int, float)) and not isinstance(s[0][s[1]], bool)]
        pool = textual + numeric
        if not pool:
            kind = "type"
        else:
            box, key, path = rng.choice(pool)
            old = box[key]
            if isinstance(old, str):
                num, unit = _NUMBER.match(old).groups()
                if kind == "number":
                    box[key] = f"{rng.choice(NUMBER_TEXT)} {unit}".strip()
                elif kind == "unit":
                    box[key] = f"{num} {rng.choice(UNITS)}".strip()
                else:
                    try:
                        x = float(num.replace("_", ""))
                    except ValueError:
                        x = 1.0
                    factor = (10 ** rng.uniform(-1, 1) if kind == "gentle" else
                              rng.choice(SCALES))
                    box[key] = f"{x * factor:.6g} {unit}".strip()
            else:
                if kind == "gentle":
                    box[key] = type(old)(old * 10 ** rng.uniform(-1, 1)) if isinstance(old, float) else \
                        max(1, round(old * 10 ** rng.uniform(-0.5, 0.5)))
                elif kind == "scale":
                    box[key] = type(old)(old * rng.choice([0, 2, 10, 1000, -1])) if math.isfinite(old) else 0
                else:
                    box[key] = rng.choice(NUMBERS)
            return f"{kind} {'.'.join(map(str, path))}: {old!r} -> {box[key]!r}"
    if kind == "delete":
        box, key, path = rng.choice(list(_slots(data)))
        if isinstance(box, dict):
            del box[key]
        else:
            box.pop(key)
        return f"delete {'.'.join(map(str, path))}"
    if kind == "swap":
        (b1, k1, p1), (b2, k2, p2) = rng.choice(leaves), rng.choice(leaves)
        b1[k1], b2[k2] = b2[k2], b1[k1]
        return f"swap {'.'.join(map(str, p1))} <-> {'.'.join(map(str, p2))}"
    if kind == "type":
        box, key, path = rng.choice(leaves)
        old, box[key] = box[key], copy.deepcopy(rng.choice(ODD_VALUES))
        return f"type {'.'.join(map(str, path))}: {old!r} -> {box[key]!r}"
    if kind == "unknown":
        table, path = rng.choice(list(_tables(data)))
        key = rng.choice(UNKNOWN_KEYS)
        table[key] = copy.deepcopy(rng.choice(ODD_VALUES + ["12 mm", "1 L/min"]))
        return f"unknown {'.'.join(map(str, path + (key,)))} = {table[key]!r}"
    if kind == "choice":
        strings = [s for s in leaves if isinstance(s[0][s[1]], str)]
        others = sorted({s[0][s[1]] for s in strings}) + ["", "none", "water ", "WATER"]
        if not strings:
            return "choice: none"
        box, key, path = rng.choice(strings)
        old, box[key] = box[key], rng.choice(others)
        return f"choice {'.'.join(map(str, path))}: {old!r} -> {box[key]!r}"
    # a whole table: deleted, emptied, or replaced by a scalar
    tables = [(b, k, p) for b, k, p in _slots(data) if isinstance(b[k], dict)]
    if not tables:
        return "table: none"
    box, key, path = rng.choice(tables)
    how = rng.choice(["empty", "scalar", "list"])
    box[key] = {} if how == "empty" else (1 if how == "scalar" else [box[key], box[key]])
    return f"table {'.'.join(map(str, path))}: {how}"


def _value(v) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        return "nan" if math.isnan(v) else ("inf" if v == math.inf else ("-inf" if v == -math.inf else repr(v)))
    if isinstance(v, str):
        return json.dumps(v)
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{" + ", ".join(f"{json.dumps(str(k))} = {_value(x)}" for k, x in v.items()) + "}"
    raise TypeError(v)


def _toml(data: dict) -> str:
    """TOML text: scalars, then tables, arrays of tables as [[a.b]] (one level, as the design files use)."""
    def is_tables(v):
        return isinstance(v, list) and v and all(isinstance(x, dict) for x in v)

    lines = [f"{json.dumps(str(k))} = {_value(v)}" for k, v in data.items() if not isinstance(v, dict)
             and not is_tables(v)]
    for k, v in data.items():
        if isinstance(v, dict):
            lines.append(f"\n[{json.dumps(str(k))}]")
            lines += [f"{json.dumps(str(kk))} = {_value(vv)}" for kk, vv in v.items() if not is_tables(vv)]
            for kk, vv in v.items():
                if is_tables(vv):
                    for item in vv:
                        lines.append(f"\n[[{json.dumps(str(k))}.{json.dumps(str(kk))}]]")
                        lines += [f"{json.dumps(str(a))} = {_value(b)}" for a, b in item.items()]
        elif is_tables(v):
            for item in v:
                lines.append(f"\n[[{json.dumps(str(k))}]]")
                lines += [f"{json.dumps(str(a))} = {_value(b)}" for a, b in item.items()]
    return "\n".join(lines) + "\n"


def _text_damage(text: str, rng: random.Random) -> tuple[bytes, str]:
    """Damage to the file as text: what a dict cannot express."""
    how = rng.choice(["duplicate table", "cut", "bad bytes", "nul", "bom"])
    if how == "duplicate table":
        heads = re.findall(r"^\[[^\[].*\]$", text, flags=re.M)
        if heads:
            text += "\n" + rng.choice(heads) + "\n"
        return text.encode(), how
    if how == "cut":
        return text[: rng.randrange(len(text))].encode(), how
    if how == "bad bytes":
        i = rng.randrange(len(text))
        return text[:i].encode() + b"\xff\xfe" + text[i:].encode(), how
    if how == "nul":
        i = rng.randrange(len(text))
        return (text[:i] + "\x00" + text[i:]).encode(), how
    return b"\xef\xbb\xbf" + text.encode(), how


def mutant(i: int, seed: int = SEED) -> tuple[str, bytes, list[str]]:
    """Mutant ``i``: (example it came from, file bytes, what was changed)."""
    rng = random.Random(seed * 1_000_003 + i)
    name = rng.choice(sorted(BASES))
    data = copy.deepcopy(BASES[name])
    gentle = rng.random() < 0.4
    changes = [_mutate_once(data, rng, gentle) for _ in range(rng.choice([1, 1, 1, 2, 2, 3]))]
    raw = _toml(data).encode()
    if rng.random() < 0.06:
        raw, how = _text_damage(_toml(data), rng)
        changes.append(f"text: {how}")
    return name, raw, changes


# ------------------------------------------------------------------------------------------- running

def commands(data_has_search: bool, out: Path, rng: random.Random) -> list[str]:
    """One command line for a mutant (without the design file)."""
    pool = [["check"], ["check", "--format", "json"], ["check", "--units", "us"], ["curves"],
            ["curves", "--format", "json"], ["curves", "-o", str(out / "curve.csv")],
            ["report", "-o", str(out / "report.html")], ["report", "-o", str(out / "report.md")]]
    weights = [6, 5, 3, 2, 2, 1, 1, 1]
    if data_has_search:
        pool += [["size", "--quiet"], ["size", "--quiet", "--format", "json"],
                 ["size", "--quiet", "--write-best", str(out / "best.toml")]]
        weights += [1, 1, 1]
    argv = list(rng.choices(pool, weights)[0])
    # check and report: the field plate model (the default) on one mutant in five, the fast network on the
    # rest, so both models' input contracts are fuzzed and the campaign stays short (a field solve is ~1 s)
    if argv[0] in ("check", "report") and rng.random() < 0.8:
        argv += ["--model", "network"]
    return argv


def _no_constant(name):
    raise ValueError(f"JSON holds {name}")


#: An exit-2 line names a field ("[table] key"), a top-level key, an option, or the file itself.
_NAMES_WHAT = re.compile(r"\[[^\]]+\]|top-level key|^coldplate: error: \w+: |design file|TOML|(?:^|\s)(--[a-z][\w-]+|-o)\b", re.M)
_NONFINITE_TEXT = re.compile(r"(?<![\w.])(nan|inf|infinity)(?![\w])", re.I)


def run(argv: list[str]) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            rc = main(argv)
        except SystemExit as exc:  # argparse
            rc = exc.code if isinstance(exc.code, int) else 2
    return rc, out.getvalue(), err.getvalue()


def violations(argv: list[str], rc: int, out: str, err: str, folder: Path, source: bytes = b"") -> list[str]:
    """What breaks the contract in one outcome (empty when it is kept).  ``source``: the design file, whose own
    strings (a part named "inf ...") are not numbers of ours."""
    bad = []
    files = sorted(p.name for p in folder.iterdir())
    if rc not in (0, 1, 2):
        bad.append(f"exit status {rc}")
    if "Traceback" in err or "Traceback" in out:
        bad.append("traceback")
    if rc != 0:
        lines = err.rstrip("\n").split("\n")
        if len(lines) != 1 or not lines[0].strip():
            bad.append(f"{len(lines)} stderr lines" if lines[0].strip() else "empty stderr")
        if "internal error" in err:
            bad.append("internal error")
        if rc == 2 and not err.startswith("coldplate: error: "):
            bad.append("exit 2 without 'coldplate: error:'")
        if rc == 2 and not _NAMES_WHAT.search(err):
            bad.append("exit 2 naming no field, option or file")
        if out and argv[0] != "size":
            bad.append("stdout written on failure")
        if files:
            bad.append(f"files left on failure: {files}")
    else:
        if argv[0] == "size":
            lines = [x for x in err.split("\n") if x.strip()]
            if len(lines) > 1:
                bad.append(f"{len(lines)} stderr lines")
        elif err:
            bad.append("stderr on success: " + err[:200])
        if any(n.startswith(".") or n.endswith(".tmp") for n in files):
            bad.append(f"temporaries left: {files}")
        if "--format" in argv and argv[argv.index("--format") + 1] == "json" and "-o" not in argv:
            try:
                doc = json.loads(out, parse_constant=_no_constant)
            except ValueError as exc:
                bad.append(f"JSON: {exc}")
            else:
                bad += _impossible(doc)
        else:
            ours = " ".join(out.split())
            for s in sorted(set(re.findall(r'"((?:[^"\\]|\\.)*)"', source.decode("utf-8", "replace"))), key=len,
                            reverse=True):
                if _NONFINITE_TEXT.search(s):
                    ours = ours.replace(" ".join(s.split()), "")
            if _NONFINITE_TEXT.search(ours):
                bad.append(f"non-finite in text: {_NONFINITE_TEXT.search(ours).group(0)!r}")
        if argv[0] == "report" and not any(n.startswith("report.") for n in files):
            bad.append("report not written")
    return bad


def _impossible(doc: dict) -> list[str]:
    """Physically impossible numbers in a check's JSON (exit 0)."""
    if "check" in doc:  # size --format json
        doc = doc["check"] or {}
    if "thermal_resistance_K_per_W" not in doc:
        return []
    bad = []
    if not doc["thermal_resistance_K_per_W"] > 0:
        bad.append(f"R_th {doc['thermal_resistance_K_per_W']}")
    if not doc["pressure_drop_Pa"] >= 0:
        bad.append(f"pressure drop {doc['pressure_drop_Pa']}")
    if not doc["flow_m3_per_s"] > 0:
        bad.append(f"flow {doc['flow_m3_per_s']}")
    if not doc["surface_temperature_max_C"] >= doc["inlet_temperature_C"] - 1e-6 and doc["heat_load_W"] > 0:
        bad.append("mounting face below the inlet with heat going in")
    return bad


def campaign(n: int, seed: int, tmp_path: Path) -> tuple[int, list[str]]:
    """Run ``n`` mutants; returns (runs, reports of violations)."""
    os.environ["COLDPLATE_DEBUG"] = "1"
    reports = []
    for i in range(n):
        name, raw, changes = mutant(i, seed)
        work = tmp_path / f"m{i}"
        out = work / "out"
        out.mkdir(parents=True)
        path = work / "design.toml"
        path.write_bytes(raw)
        rng = random.Random(seed * 7919 + i)
        argv = commands(b"[\"search\"]" in raw, out, rng) + [str(path)]
        try:
            rc, so, se = run(argv)
            bad = violations(argv, rc, so, se, out, raw)
        except Exception as exc:  # an internal fault escaped main (COLDPLATE_DEBUG=1)
            import traceback

            tb = traceback.format_exception(exc)
            bad, se = [f"internal fault {type(exc).__name__}: {exc}"], "".join(tb[-3:])
        if bad:
            reports.append(f"mutant {i} of {name} ({'; '.join(changes)}), `{' '.join(argv[:-1])}`: "
                           f"{', '.join(bad)}\n    stderr: {se.strip()[:400]}")
        import shutil

        shutil.rmtree(work, ignore_errors=True)
    return n, reports


def test_mutants_keep_the_contract(tmp_path, monkeypatch):
    monkeypatch.setenv("COLDPLATE_DEBUG", "1")
    n, reports = campaign(N_MUTANTS, SEED, tmp_path)
    assert not reports, f"{len(reports)} of {n} mutants break the contract:\n" + "\n".join(reports)


def test_mutants_are_seed_stable():
    """The same seed gives the same mutants (so a failure is reproducible); another seed differs."""
    assert [mutant(i, 3) for i in range(20)] == [mutant(i, 3) for i in range(20)]
    assert [mutant(i, 3)[1] for i in range(20)] != [mutant(i, 4)[1] for i in range(20)]


def test_the_checker_sees_a_broken_contract(tmp_path):
    """The contract check itself can fail: a traceback, two lines, NaN in JSON, debris are all caught."""
    (tmp_path / ".report.html.123.tmp").write_text("x")
    assert "traceback" in violations(["check", "f"], 1, "", "Traceback (most recent call last):\n x\n", tmp_path)
    assert any("stderr lines" in v for v in violations(["check", "f"], 2, "", "coldplate: error: a\nb\n", tmp_path))
    assert any("JSON" in v for v in violations(["check", "--format", "json", "f"], 0, '{"a": NaN}', "", tmp_path))
    assert any("non-finite" in v for v in violations(["check", "f"], 0, "R = nan K/W", "", tmp_path))
    part = b'name = "inf lbows"'
    assert not any("non-finite" in v for v in violations(["check", "f"], 0, "at inf lbows", "", tmp_path, part))
    assert any("temporaries" in v for v in violations(["check", "f"], 0, "ok", "", tmp_path))
    assert any("files left" in v for v in violations(["check", "f"], 2, "", "coldplate: error: x\n", tmp_path))
    assert any("naming no field" in v for v in violations(["check", "f"], 2, "", "coldplate: error: bad\n", tmp_path))
    assert not any("naming no field" in v for v in violations(
        ["check", "f"], 2, "", "coldplate: error: [plate] base: '-1 mm' is negative\n", tmp_path))
