"""Fuzzing the design reader: seeded random mutants of every example, the input contract on every outcome.

Each mutant changes one to three things in an example's data: a value scaled by up to 100 either way (its
unit kept, so many mutants are read and solved), a number (zero, negative, huge, tiny, a whole
number past 64 bits, NaN), a unit (undefined, wrong case, unbalanced brackets, division by zero, a long
product, a decimal comma, a temperature difference), a key (misspelt, deleted, emptied), or a value's type
(to anything TOML can hold).
Every outcome must keep the contract (the project's, DEVELOPERS.md "Errors"): the design is read and solves to
finite numbers (JSON without NaN or Infinity) or the physics is refused with one SolveError line, or the
input is refused with one DesignError line naming its field; never another exception, never a warning.
The ``[search]`` table of the sizing example is read as ``coldplate size`` reads it.  One mutant in five
edits the file's text instead (stray characters, a byte-order mark, a doubled line): it must parse or be
refused in one line.

In CI a few hundred mutants run (``COLDPLATE_FUZZ_MUTANTS``, default 300); set it to thousands locally, and
``COLDPLATE_FUZZ_SEED`` to another seed for a fresh campaign.  Source for the expectations: the project's
own input contract (no outside value is checked here).
"""
from __future__ import annotations

import copy
import json
import os
import random
import warnings

import pytest

from coldplate.check import solve
from coldplate.design.errors import ColdplateError, DesignError
from coldplate.design.reader import design_from_dict, parse_design
from coldplate.sizing.writer import toml_text
from coldplate.sizing.search import read_search
from reports.jsonout import render_json

from .helpers import EXAMPLES, example_dict

MUTANTS = int(os.environ.get("COLDPLATE_FUZZ_MUTANTS", "300"))
SEED = int(os.environ.get("COLDPLATE_FUZZ_SEED", "20261202"))
BASES = {p.stem: example_dict(p.stem) for p in EXAMPLES}
TEXTS = {name: toml_text(data) for name, data in BASES.items()}

NUMBERS = ["0", "-1", "-0", "1e308", "1e-308", "1e-15", "3e-15", "1e30", "9223372036854775807",
           "18446744073709551617", "nan", "inf", "-inf", "1e-5", "0.5", "1000000", "1,5", ".5", "5.", "+7"]
UNITS = ["", "W / 0", "W**(1/0)", "(W", "W)", "W" + "*mm/mm" * 500, "degc", "delta_degC", "degC", "degF",
         "K", "%", "inch", "psi", "bar", "kPa", "L/min", "gpm", "mm", "um", "nm", "m", "km", "W/(m*K)",
         "K*m**2/W", "EUR/m**3", "EUR", "s", "h", "m**3/s", "ohm", "V/K", "ft**3/min", "1/0", "**", "e",
         "W W", "m/s", "L", "kWh", "A", "🙂", "\u00b5m", "m\x00m", "m # note"]
STRANGE = [True, False, 0, -1, 1.5, 2**63, 2**70, -(2**64), 10**400, float("nan"), float("inf"), "", " ", "x" * 300,
           [], ["1 mm"], ["1 mm", "2 mm", "3 mm"], {}, {"from": 1, "to": 2**64}, {"from": "1 mm"}, "1e306 EUR",
           "0 EUR/m**3"]


def _paths(data, prefix=()):
    """Every (path, value) of the data, tables and arrays included."""
    out = []
    if isinstance(data, dict):
        for k, v in data.items():
            out.append((prefix + (k,), v))
            out += _paths(v, prefix + (k,))
    elif isinstance(data, list):
        for i, v in enumerate(data):
            out.append((prefix + (i,), v))
            out += _paths(v, prefix + (i,))
    return out


def _parent(data, path):
    for p in path[:-1]:
        data = data[p]
    return data


def _typo(rng: random.Random, key: str) -> str:
    if not key:
        return "x"
    i = rng.randrange(len(key))
    how = rng.choice(("drop", "swap", "add", "case"))
    if how == "drop":
        return key[:i] + key[i + 1:]
    if how == "swap" and len(key) > 1:
        j = min(i + 1, len(key) - 1)
        chars = list(key)
        chars[i], chars[j] = chars[j], chars[i]
        return "".join(chars)
    if how == "case":
        return key.upper()
    return key[:i] + rng.choice("abcdefghijklmnopqrstuvwxyz_") + key[i:]


def _scalable(text: str) -> bool:
    number = text.partition(" ")[0]
    try:
        float(number)
    except ValueError:
        return False
    return True


def mutate(rng: random.Random, data: dict) -> dict:
    """One to three random changes to a copy of ``data``."""
    data = copy.deepcopy(data)
    for _ in range(rng.choices((1, 2, 3), weights=(6, 3, 1))[0]):
        paths = _paths(data)
        if not paths:
            break
        path, value = rng.choice(paths)
        parent = _parent(data, path)
        key = path[-1]
        op = rng.random()
        if isinstance(value, str) and op < 0.35 and _scalable(value):  # a value scaled, its unit kept
            number, _, unit = value.partition(" ")
            parent[key] = f"{float(number) * 10 ** rng.uniform(-2, 2):.6g} {unit}"
        elif isinstance(value, str) and op < 0.55:
            number, _, unit = value.partition(" ")
            if rng.random() < 0.5:
                number = rng.choice(NUMBERS)
            else:
                unit = rng.choice(UNITS)
            parent[key] = f"{number} {unit}".strip() if rng.random() < 0.9 else f"{number}{unit}"
        elif op < 0.67 and isinstance(key, str):
            parent[_typo(rng, key)] = parent.pop(key)
        elif op < 0.74 and isinstance(key, str):
            del parent[key]
        elif op < 0.77 and isinstance(parent, dict):
            parent[""] = 1
        elif isinstance(value, (int, float)) and not isinstance(value, bool) and op < 0.85:
            parent[key] = rng.choice([0, -1, 2**63 - 1, 2**64 + 1, 10**30, value * 1000, -value, 0.5, 1e-300])
        else:
            parent[key] = copy.deepcopy(rng.choice(STRANGE))
    return data


def mutate_text(rng: random.Random, text: str) -> str:
    """One to three character edits to a design file's text (a byte-order mark, a stray quote, a lost
    bracket, a doubled line), for the TOML parser and what follows it."""
    for _ in range(rng.randint(1, 3)):
        i = rng.randrange(len(text) + 1)
        how = rng.choice(("insert", "delete", "replace", "bom", "line"))
        if how == "bom":
            text = "\ufeff" + text
        elif how == "line":
            lines = text.splitlines(keepends=True)
            j = rng.randrange(len(lines))
            lines.insert(j, lines[rng.randrange(len(lines))])
            text = "".join(lines)
        else:
            c = rng.choice('"[]{}=,.#\n \t\\0123456789eE-+%_ \u00b5\u00b0xyz')
            cut = 0 if how == "insert" else 1
            text = text[:i] + ("" if how == "delete" else c) + text[i + cut:]
    return text


def text_outcome(text: str) -> str:
    """The contract on a mutated file's text: parse_design reads it or refuses it in one line."""
    try:
        design = parse_design(text)
    except DesignError as exc:
        assert "\n" not in str(exc) and "\r" not in str(exc), str(exc)
        return "refused"
    assert design.title
    return "read"


def _no_constants(name):
    raise AssertionError(f"JSON holds {name}")


def outcome(data: dict, model: str = "network") -> str:
    """Apply the contract to one mutant with a plate model; return what happened ("refused", "unsolvable",
    "solved")."""
    try:
        design = design_from_dict(data)
        if "search" in data:
            read_search(data, design)
    except DesignError as exc:
        text = str(exc)
        assert "\n" not in text and "\r" not in text, text
        assert exc.field, f"no field named: {text}"
        assert len(text) < 400, text
        return "refused"
    try:
        result = solve(design, model=model)
    except DesignError as exc:  # a state the solve reaches (the coolant boils in the plate): still one line
        assert "\n" not in str(exc) and exc.field, str(exc)
        return "refused"
    except ColdplateError as exc:
        assert "\n" not in str(exc), str(exc)
        return "unsolvable"
    json.loads(render_json(result), parse_constant=_no_constants)
    return "solved"


def test_mutants_keep_the_input_contract():
    rng = random.Random(SEED)
    names = sorted(BASES)
    seen = {"refused": 0, "unsolvable": 0, "solved": 0, "read": 0}
    for i in range(MUTANTS):
        name = names[i % len(names)]
        as_text = i % 5 == 4  # one mutant in five edits the file's text instead of its data
        data = mutate_text(rng, TEXTS[name]) if as_text else mutate(rng, BASES[name])
        with warnings.catch_warnings():
            warnings.simplefilter("error")  # a warning would be a second line on stderr
            try:
                # the field plate model (the check's default, about a second a solve) on one mutant in five,
                # the fast network on the rest: both models' contracts are held
                model = "field" if i % 5 == 0 else "network"
                seen[text_outcome(data) if as_text else outcome(data, model)] += 1
            except Exception as exc:
                pytest.fail(f"mutant {i} of {name} (seed {SEED}) broke the contract: {type(exc).__name__}: "
                            f"{exc}\n{data}")
    assert sum(seen.values()) == MUTANTS
    assert seen["refused"] and seen["solved"], seen  # the mutants reach both sides of the reader
