"""The house rules of the code, read from the source with ``ast`` (no import is run).

1. No import cycle between modules: no module imports another that imports it back, directly or through others.
   Every import counts, also those inside functions (a lazy import still ties the two files together); only the
   imports under ``if TYPE_CHECKING:`` are left out, since they never run.
2. Layers run one way (DEVELOPERS.md, "Layout"): a module imports only from its own layer or the layers below, and
   within a layer only from its own concept (the plate does not import the supply, the supply not the modules).
3. ``reports`` formats results: of ``coldplate`` it may import the unit registry and the errors, nothing that
   computes.
"""
from __future__ import annotations

import ast
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PACKAGES = ("coldplate", "hydraulics", "reports")

#: (layer, concept, module prefixes).  Lower layers first; a prefix matches the module and everything below it,
#: the longest prefix wins.  A module may import its own concept in its own layer, and any layer below.
LAYERS = (
    (0, "hydraulics", ("hydraulics",)),
    (1, "design machinery", ("coldplate.design.errors", "coldplate.design.units", "coldplate.design.ranges",
                               "coldplate.design.fields", "coldplate.design.catalogue")),
    (2, "plate", ("coldplate.plate",)),
    (2, "finding record", ("coldplate.findings.base",)),
    (3, "plate findings", ("coldplate.findings.plate", "coldplate.findings.sources", "coldplate.findings.flow_split")),
    (3, "modules", ("coldplate.modules",)),
    (3, "supply", ("coldplate.supply",)),
    (3, "air", ("coldplate.air",)),
    (4, "air stage", ("coldplate.air.stage",)),
    (4, "design file", ("coldplate.design.reader",)),
    (5, "check", ("coldplate.check",)),
    (6, "sizing", ("coldplate.sizing",)),
    (7, "uncertainty", ("coldplate.uncertainty",)),
    (8, "reports", ("reports",)),
    (9, "command line and API", ("coldplate.cli", "coldplate.sizing.command", "coldplate")),
)
#: What reports may import from coldplate.
REPORTS_MAY_USE = ("coldplate.design.units", "coldplate.design.errors")


def module_name(path: Path) -> str:
    parts = list(path.relative_to(ROOT).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def all_modules() -> dict[str, Path]:
    return {module_name(p): p for pkg in PACKAGES for p in sorted((ROOT / pkg).rglob("*.py"))}


def _is_type_checking(node: ast.If) -> bool:
    t = node.test
    return (isinstance(t, ast.Name) and t.id == "TYPE_CHECKING") or \
        (isinstance(t, ast.Attribute) and t.attr == "TYPE_CHECKING")


def imports_of(name: str, path: Path, known: set[str]) -> set[str]:
    """The project modules that ``name`` imports (resolved: relative imports, and ``from pkg import module``)."""
    is_pkg = path.name == "__init__.py"
    package = name if is_pkg else name.rpartition(".")[0]
    found: set[str] = set()

    def visit(node):
        for child in ast.iter_child_nodes(node):
            if isinstance(child, ast.If) and _is_type_checking(child):
                for sub in child.orelse:
                    visit(sub)
                continue
            if isinstance(child, ast.Import):
                for alias in child.names:
                    found.add(alias.name)
            elif isinstance(child, ast.ImportFrom):
                if child.level:
                    base = package.split(".")
                    base = base[: len(base) - (child.level - 1)]
                    target = ".".join(base + ([child.module] if child.module else []))
                else:
                    target = child.module or ""
                for alias in child.names:
                    sub = f"{target}.{alias.name}"
                    found.add(sub if sub in known else target)
            visit(child)

    visit(ast.parse(path.read_text(), filename=str(path)))
    return {m for m in found if m in known and m != name}


@pytest.fixture(scope="module")
def graph() -> dict[str, set[str]]:
    mods = all_modules()
    known = set(mods)
    return {name: imports_of(name, path, known) for name, path in mods.items()}


def layer_of(module: str) -> tuple[int, str]:
    best = None
    for layer, concept, prefixes in LAYERS:
        for prefix in prefixes:
            if module == prefix or module.startswith(prefix + "."):
                if best is None or len(prefix) > best[2]:
                    best = (layer, concept, len(prefix))
    assert best is not None, f"{module} is in no layer: add it to LAYERS (and to DEVELOPERS.md)"
    return best[0], best[1]


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """Strongly connected components with more than one module (Tarjan), each sorted."""
    index, low, stack, on, out = {}, {}, [], set(), []
    counter = [0]

    def strong(v):
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on.add(v)
        for w in sorted(graph.get(v, ())):
            if w not in index:
                strong(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = []
            while True:
                w = stack.pop()
                on.discard(w)
                comp.append(w)
                if w == v:
                    break
            if len(comp) > 1:
                out.append(sorted(comp))

    for v in sorted(graph):
        if v not in index:
            strong(v)
    return out


def test_the_reader_sees_imports(graph):
    # The check runs every stage, so its imports must show them: a reader that sees nothing would pass the rest.
    assert {"coldplate.plate.solve", "coldplate.findings.plate", "coldplate.design.reader"} <= graph["coldplate.check"]
    assert "coldplate.plate.conduction" in graph["coldplate.plate.passages.channels"]


def test_cycle_finder_finds_a_planted_cycle():
    planted = {"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}
    assert cycles(planted) == [["a", "b", "c"]]


def test_no_import_cycle(graph):
    assert cycles(graph) == []


def test_layers_run_one_way(graph):
    wrong = []
    for module, targets in sorted(graph.items()):
        layer, concept = layer_of(module)
        for target in sorted(targets):
            t_layer, t_concept = layer_of(target)
            if t_layer > layer or (t_layer == layer and t_concept != concept):
                wrong.append(f"{module} ({concept}, layer {layer}) imports {target} ({t_concept}, layer {t_layer})")
    assert wrong == []


def test_reports_only_format(graph):
    wrong = [f"{m} imports {t}" for m, ts in graph.items() if m.startswith("reports")
             for t in ts if t.startswith("coldplate") and t not in REPORTS_MAY_USE]
    assert wrong == []


def test_hydraulics_knows_no_plate(graph):
    wrong = [f"{m} imports {t}" for m, ts in graph.items() if m.startswith("hydraulics")
             for t in ts if not t.startswith("hydraulics")]
    assert wrong == []


def test_every_subpackage_says_what_it_owns():
    for init in sorted((ROOT / "coldplate").rglob("__init__.py")):
        doc = ast.get_docstring(ast.parse(init.read_text()))
        assert doc and len(doc.split()) >= 20, f"{init.relative_to(ROOT)} needs a paragraph saying what it owns"
