"""VALIDATION.md is in the repository and traces every check to a test that exists (common practice: a check
value must be traceable from the project alone)."""
from __future__ import annotations

import ast
import re

import pytest

from .helpers import ROOT

VALIDATION = ROOT / "VALIDATION.md"
SOURCE_DIRS = ("tests", "coldplate", "hydraulics", "reports", "benchmarks", "examples")
#: Ways a test could point at a reference file outside the repository (the folder name is joined here so this
#: guard does not itself read as such a pointer to a text search).
OUTSIDE = ("reference-values", "../" + "shared", "/work/", "/home/", "/root/")


def _text() -> str:
    assert VALIDATION.is_file(), "VALIDATION.md must sit at the top of the repository"
    return VALIDATION.read_text(encoding="utf-8")


def _cited_tests(text: str) -> set[tuple[str, str]]:
    """Every `file::function` in the file; a bare `::function` belongs to the file named last before it."""
    out, last = set(), None
    for m in re.finditer(r"`(test_\w+\.py)?::(\w+)`", text):
        last = m.group(1) or last
        assert last, f"'::{m.group(2)}' has no file before it"
        out.add((last, m.group(2)))
    return out


def _test_functions(path) -> set[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    return {n.name for n in ast.walk(tree) if isinstance(n, ast.FunctionDef)}


def test_every_cited_test_exists():
    cited = _cited_tests(_text())
    assert len(cited) > 100  # the file covers the suite, not a sample
    missing = []
    for name, func in sorted(cited):
        path = ROOT / "tests" / name
        if not path.is_file() or func not in _test_functions(path):
            missing.append(f"{name}::{func}")
    assert not missing, "VALIDATION.md names tests that do not exist: " + ", ".join(missing)


def test_every_test_file_is_listed():
    text = _text()
    unlisted = [p.name for p in sorted((ROOT / "tests").glob("test_*.py")) if p.name not in text]
    assert not unlisted, "add these test files' checks to VALIDATION.md: " + ", ".join(unlisted)


def test_sections_the_tests_cite_exist():
    headings = {line.lstrip("#").strip() for line in _text().splitlines() if line.startswith("#")}
    for path in sorted((ROOT / "tests").glob("*.py")):
        for section in re.findall(r'VALIDATION\.md,?\s*\(?"([^"\n]+)"', path.read_text(encoding="utf-8")):
            assert section in headings, f"{path.name} cites VALIDATION.md section {section!r}, which is missing"


@pytest.mark.parametrize("folder", SOURCE_DIRS)
def test_nothing_points_outside_the_repository(folder):
    for path in sorted((ROOT / folder).rglob("*")):
        if path.suffix not in (".py", ".toml", ".md") or path == ROOT / "tests" / "test_validation_file.py":
            continue
        text = path.read_text(encoding="utf-8")
        for needle in OUTSIDE:
            assert needle not in text, f"{path.relative_to(ROOT)} points outside the repository ({needle!r})"
