"""The design file's JSON Schema (``coldplate schema``) and the one field catalogue it is built from.

Outside sources: the JSON Schema draft 2020-12 meta-schema and validator as the ``jsonschema`` package ships
them (library); the reader itself decides what a design file may hold, so the schema is checked to agree with
it: every example and starter validates, and mutants the reader refuses (an unknown key, a word that is not
one of a choice's) fail the schema too.
"""
from __future__ import annotations

import copy
import json
import re
import tomllib

import pytest

jsonschema = pytest.importorskip("jsonschema")

from coldplate.design.catalogue import FIELDS, OTHER_KINDS  # noqa: E402
from coldplate.design.errors import DesignError  # noqa: E402
from coldplate.design.reader import design_from_dict  # noqa: E402
from coldplate.design.schema import choices, design_schema, key_sets, schema_text, tables  # noqa: E402
from coldplate.design.starters import KINDS, starter_text  # noqa: E402
from coldplate.design.units import KINDS as UNIT_KINDS  # noqa: E402
from coldplate.cli import main  # noqa: E402

from .helpers import EXAMPLES  # noqa: E402


@pytest.fixture(scope="module")
def validator():
    schema = design_schema()
    jsonschema.Draft202012Validator.check_schema(schema)  # library: the 2020-12 meta-schema
    return jsonschema.Draft202012Validator(schema)


def _errors(validator, data) -> list[str]:
    return [e.message for e in validator.iter_errors(data)]


def test_the_schema_is_a_valid_draft_2020_12_schema(validator):
    assert design_schema()["$schema"] == "https://json-schema.org/draft/2020-12/schema"


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.stem)
def test_every_example_validates(validator, path):
    assert _errors(validator, tomllib.loads(path.read_text())) == []


@pytest.mark.parametrize("kind", KINDS)
def test_every_starter_validates(validator, kind):
    assert _errors(validator, tomllib.loads(starter_text(kind))) == []


# ---------------------------------------------------------------- the one catalogue


def test_every_key_a_reader_accepts_has_a_description():
    missing = [f"[{t}] {k}" for t, keys in key_sets().items() for k in keys if f"[{t}] {k}" not in FIELDS]
    assert missing == []


def test_every_table_the_reader_knows_has_its_keys():
    assert set(tables()) <= set(key_sets())
    assert set(key_sets()) - set(tables()) == {"top", "circuit.part"}


def test_every_described_key_is_read():
    accepted = {f"[{t}] {k}" for t, keys in key_sets().items() for k in keys}
    assert sorted(set(FIELDS) - accepted) == []


def test_every_kind_is_known_and_every_choice_has_its_words():
    for name, f in FIELDS.items():
        assert f.kind in UNIT_KINDS or f.kind in OTHER_KINDS, name
        assert f.text and "\n" not in f.text and len(f.text) <= 100, name
    choice_fields = {n for n, f in FIELDS.items() if f.kind == "choice"}
    assert choice_fields == set(choices())


def test_descriptions_quote_the_plausible_range():
    # the range is the reader's own ([passage] width: 50 µm to 0.5 m, design/ranges.py), shown in mm
    desc = design_schema()["properties"]["passage"]["properties"]["width"]["description"]
    assert desc.startswith(FIELDS["[passage] width"].text) and "0.05 mm to 500 mm" in desc


def test_schema_command_prints_the_schema(capsys, tmp_path):
    assert main(["schema"]) == 0
    assert json.loads(capsys.readouterr().out) == json.loads(schema_text())
    out = tmp_path / "design.schema.json"
    assert main(["schema", "-o", str(out)]) == 0 and json.loads(out.read_text()) == design_schema()
    assert main(["schema", "-o", str(out)]) == 2  # no --force: refused, one line
    assert len(capsys.readouterr().err.strip().splitlines()) == 2  # "wrote", then the refusal


# ---------------------------------------------------------------- mutants: schema and reader agree


def _reader_refuses(data) -> bool:
    try:
        design_from_dict(data)
    except DesignError:
        return True
    return False


def _tables(data):
    """(path, table) of every table in a design's data, arrays of tables included."""
    for name, value in data.items():
        if isinstance(value, dict):
            yield (name,), value
            for key, sub in value.items():
                if isinstance(sub, list) and sub and all(isinstance(x, dict) for x in sub):
                    for i, item in enumerate(sub):
                        yield (name, key, i), item
        elif isinstance(value, list) and value and all(isinstance(x, dict) for x in value):
            for i, item in enumerate(value):
                yield (name, i), item


def _at(data, path):
    for p in path:
        data = data[p]
    return data


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.stem)
def test_an_unknown_key_fails_schema_and_reader(validator, path):
    base = tomllib.loads(path.read_text())
    for where, _ in list(_tables(base)):
        if where == ("search",):  # read by `coldplate size`, not by the check's reader
            continue
        data = copy.deepcopy(base)
        _at(data, where)["flow_rte"] = "1 L/min"
        assert _errors(validator, data), where
        if where == ("uncertainty",):  # read by the band (coldplate.uncertainty.reader), not the check's reader
            from coldplate.design.reader import design_from_dict
            from coldplate.uncertainty.reader import read_uncertainty

            with pytest.raises(DesignError):
                read_uncertainty(data, design_from_dict(data))
            continue
        assert _reader_refuses(data), where
    data = copy.deepcopy(base)
    data["plates"] = {"length": "1 mm"}  # an unknown table
    assert _errors(validator, data) and _reader_refuses(data)


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: p.stem)
def test_a_word_outside_a_choice_fails_schema_and_reader(validator, path):
    base = tomllib.loads(path.read_text())
    tried = 0
    for where, table in list(_tables(base)):
        name = where[0] if len(where) == 1 else f"{where[0]}.{where[1]}"
        for key in table:
            if choices().get(f"[{name}] {key}") is None:
                continue
            data = copy.deepcopy(base)
            _at(data, where)[key] = "not-one-of-them"
            assert _errors(validator, data), (where, key)
            assert _reader_refuses(data), (where, key)
            tried += 1
    assert tried >= 3  # every example has at least a passage kind, a fluid and a supply source


def test_a_key_of_another_passage_kind_fails_the_schema(validator):
    data = tomllib.loads(starter_text("channels"))
    data["passage"]["passes"] = 2  # a tube's key on a channel plate
    assert any("passes" in m for m in _errors(validator, data))
    assert _reader_refuses(data)


def test_unit_strings_follow_the_pattern(validator):
    data = tomllib.loads(starter_text("channels"))
    data["plate"]["length"] = 90  # a bare number where a length is needed: the reader refuses it too
    assert _errors(validator, data) and _reader_refuses(data)
    data["plate"]["length"] = "90 mm"
    data["room"]["relative_humidity"] = 0.5  # a fraction may be a bare number
    assert _errors(validator, data) == [] and not _reader_refuses(data)
    assert re.search(design_schema()["properties"]["plate"]["properties"]["base"]["pattern"], "3e-3 m")


def test_the_catalogue_kind_is_the_kind_the_reader_parses(monkeypatch):
    """Every value the readers parse, while reading every example and every starter with its optional lines
    opened, is parsed as the kind its catalogue record names (so the schema's patterns cannot drift)."""
    from coldplate.design import fields
    from coldplate.sizing.search import read_search

    from .test_workday import _uncommented

    seen: dict[str, set[str]] = {}
    original = {name: getattr(fields.Table, name) for name in ("value", "integer", "choice", "word")}

    def recorder(method, kind_of):
        def wrapped(self, key, *args, **kw):
            seen.setdefault(f"[{self.name.split(' ')[0]}] {key}", set()).add(kind_of(args))
            return original[method](self, key, *args, **kw)
        return wrapped

    monkeypatch.setattr(fields.Table, "value", recorder("value", lambda a: a[0]))
    monkeypatch.setattr(fields.Table, "integer", recorder("integer", lambda a: "integer"))
    monkeypatch.setattr(fields.Table, "choice", recorder("choice", lambda a: "choice"))
    monkeypatch.setattr(fields.Table, "word", recorder("word", lambda a: "name"))
    texts = [p.read_text() for p in EXAMPLES] + [_uncommented(starter_text(k)) for k in KINDS]
    for text in texts:
        data = tomllib.loads(text)
        design = design_from_dict(data)
        if "search" in data:
            read_search(data, design)
    wrong = {name: kinds for name, kinds in seen.items() if kinds != {FIELDS[name].kind}}
    assert wrong == {}
    assert len(seen) >= 60  # the readers were seen at work
