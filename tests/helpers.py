"""Test helpers: a base design as a dict, a tiny TOML writer, and a runner for the CLI."""
from __future__ import annotations

import copy
import json
import tomllib
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = sorted((ROOT / "examples").glob("*.toml"))


def example_dict(name: str = "reagent-block-channels") -> dict:
    return tomllib.loads((ROOT / "examples" / f"{name}.toml").read_text())


def _value(v) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, (int, float)):
        return repr(v)
    if isinstance(v, str):
        return json.dumps(v)
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    raise TypeError(v)


def _is_tables(v) -> bool:
    return isinstance(v, list) and bool(v) and all(isinstance(x, dict) for x in v)


def to_toml(data: dict) -> str:
    lines = [f"{k} = {_value(v)}" for k, v in data.items() if not isinstance(v, dict)]
    for k, v in data.items():
        if isinstance(v, dict):
            lines.append(f"\n[{k}]")
            lines += [f"{kk} = {_value(vv)}" for kk, vv in v.items() if not _is_tables(vv)]
            for kk, vv in v.items():  # arrays of tables, e.g. [[circuit.part]]
                if _is_tables(vv):
                    for item in vv:
                        lines.append(f"\n[[{k}.{kk}]]")
                        lines += [f"{kkk} = {_value(x)}" for kkk, x in item.items()]
    return "\n".join(lines) + "\n"


def modified(base: dict, **changes) -> dict:
    """Copy ``base`` and apply changes given as ``table__key=value``; value None deletes the key."""
    data = copy.deepcopy(base)
    for path, value in changes.items():
        parts = path.split("__")
        target = data
        for p in parts[:-1]:
            target = target.setdefault(p, {})
        if value is None:
            target.pop(parts[-1], None)
        else:
            target[parts[-1]] = value
    return data


def write(tmp_path, data: dict, name="design.toml") -> Path:
    path = tmp_path / name
    path.write_text(to_toml(data))
    return path


def network_solve(design):
    """The check with the network plate model: for tests that hold the network's own numbers or test other
    stages (supply, modules, findings) where the plate model does not matter; the field model's checks are in
    tests/test_field_check.py and tests/test_field.py (and it costs about a second a solve)."""
    from coldplate.check import solve

    return solve(design, model="network")


def network_check_file(path):
    """:func:`coldplate.check_file` with the network plate model (see :func:`network_solve`)."""
    from coldplate.check import check_file

    return check_file(path, model="network")


def solved_or_refused(data: dict, model: str = "network"):
    """(design, result) for a design dict, or None when it is refused with a one-line DesignError."""
    from coldplate.design.reader import design_from_dict
    from coldplate.design.errors import DesignError
    from coldplate.check import solve

    try:
        d = design_from_dict(data)
        return d, solve(d, model=model)
    except DesignError as exc:
        assert exc.field or "design" in str(exc)
        assert "\n" not in str(exc)
        return None
