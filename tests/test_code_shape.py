"""The shape of the code: short functions, and no study-specific code in the generic layers.

These are rules of the contributor guide (DEVELOPERS.md, "Where things live"), checked
so they cannot drift: a function longer than :data:`MAX_LINES` lines of code is split by
what its steps mean, and the scenario-file layer and the report name no study kind.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "workbench"
MAX_LINES = 120
"""Lines of code per function: docstring, blank and comment-only lines aside; nested
functions count toward the function that holds them."""


def _docstring_lines(node: ast.AST) -> set[int]:
    body = getattr(node, "body", [])
    if (
        isinstance(body, list)
        and body
        and isinstance(body[0], ast.Expr)
        and isinstance(body[0].value, ast.Constant)
        and isinstance(body[0].value.value, str)
    ):
        return set(range(body[0].lineno, body[0].end_lineno + 1))
    return set()


def code_lines(source: str, node: ast.AST) -> int:
    """Lines of code of one function node in ``source`` (the rule above).

    >>> src = 'def f(x):\\n    \\"\\"\\"Doc.\\"\\"\\"\\n\\n    # note\\n    return x\\n'
    >>> code_lines(src, ast.parse(src).body[0])
    2
    """
    lines = source.splitlines()
    skip = _docstring_lines(node)
    count = 0
    for i in range(node.lineno, node.end_lineno + 1):
        text = lines[i - 1].strip()
        if text and not text.startswith("#") and i not in skip:
            count += 1
    return count


def long_functions(limit: int = MAX_LINES) -> list[str]:
    out = []
    for path in sorted(PACKAGE.rglob("*.py")):
        source = path.read_text(encoding="utf-8")
        for node in ast.walk(ast.parse(source)):
            if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
                n = code_lines(source, node)
                if n > limit:
                    rel = path.relative_to(PACKAGE.parent)
                    out.append(f"{rel}:{node.lineno}: {node.name} has {n} lines of code")
    return out


def test_no_function_longer_than_the_limit():
    assert long_functions() == []


def test_the_counter_finds_a_long_function(tmp_path):
    body = "\n".join(f"    x{i} = {i}" for i in range(MAX_LINES + 1))
    src = f'def f():\n    """Doc."""\n{body}\n'
    node = ast.parse(src).body[0]
    assert code_lines(src, node) == MAX_LINES + 2


KIND_WORDS = re.compile(r"\b(wall|shipper|housing)\b", re.IGNORECASE)


@pytest.mark.parametrize("module", ["scenario.py", "report.py"])
def test_generic_layers_have_no_study_specific_code(module):
    """The scenario-file layer and the report take what they need from a kind's
    declaration: their code (docstrings and comments aside) names no study kind."""
    source = (PACKAGE / module).read_text(encoding="utf-8")
    tree = ast.parse(source)
    skip: set[int] = set()
    for node in ast.walk(tree):
        skip |= _docstring_lines(node)
    hits = []
    for i, line in enumerate(source.splitlines(), start=1):
        code = line.split("#", 1)[0]
        if i not in skip and KIND_WORDS.search(code):
            hits.append(f"{module}:{i}: {line.strip()}")
    assert hits == []


def test_scenario_layer_is_small():
    lines = (PACKAGE / "scenario.py").read_text(encoding="utf-8").count("\n")
    assert lines <= 950, f"workbench/scenario.py has {lines} lines; the guide says about 900"


def _module_name(path: Path) -> str:
    rel = path.relative_to(PACKAGE.parent).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join(parts)


def import_graph() -> dict[str, set[str]]:
    """``module -> modules of workbench it imports`` (at module level or inside functions;
    ``from workbench import units`` counts as importing ``workbench.units``, not the package;
    a package's ``__init__`` that re-exports its modules imports them)."""
    modules = {_module_name(p): p for p in PACKAGE.rglob("*.py")}
    graph: dict[str, set[str]] = {m: set() for m in modules}
    for name, path in modules.items():
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            targets = []
            if isinstance(node, ast.Import):
                targets = [a.name for a in node.names]
            elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
                # ``from pkg import sub`` imports the submodule; ``from mod import name`` the module
                subs = [f"{node.module}.{a.name}" for a in node.names]
                targets = [t for t in subs if t in modules]
                if len(targets) < len(subs):
                    targets.append(node.module)
            for t in targets:
                if t in modules and t != name and t != "workbench":
                    graph[name].add(t)
    return graph


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """Import loops (each as the modules along it), found by depth-first search.

    >>> cycles({"a": {"b"}, "b": {"a"}, "c": set()})
    [['a', 'b', 'a']]
    >>> cycles({"a": {"b"}, "b": set()})
    []
    """
    found, state = [], {}

    def visit(m: str, stack: list[str]) -> None:
        state[m] = "open"
        stack.append(m)
        for n in sorted(graph.get(m, ())):
            if state.get(n) == "open":
                found.append(stack[stack.index(n):] + [n])
            elif n not in state:
                visit(n, stack)
        stack.pop()
        state[m] = "done"

    for m in sorted(graph):
        if m not in state:
            visit(m, [])
    return found


def test_no_import_cycles():
    """The layers import one way (core → studies → report/review/widgets/cli): no module of
    workbench imports, even inside a function, one that imports it back."""
    graph = import_graph()
    assert len(graph) > 30 and graph["workbench.report"]  # the graph was read
    assert cycles(graph) == []


def test_the_core_imports_no_study_and_no_file_layer():
    graph = import_graph()
    core = ("conduction", "surfaces", "air_layers", "geometry", "transient", "housing", "spreading",
            "freight", "ranking", "stacks", "uncertainty", "touch", "air_properties", "_checks")
    for name in core:
        upward = {m for m in graph[f"workbench.{name}"]
                  if m.startswith(("workbench.studies", "workbench.scenario", "workbench.report",
                                   "workbench.widgets", "workbench.cli", "workbench.review"))}
        assert upward == set(), (name, upward)


def test_studies_sit_below_the_file_layer():
    """A study package (object, kind, charts) uses the scenario layer's parts but not the
    scenario module, the evaluation, the report or the widgets: the scenario module finds the
    kinds by name on first use (``workbench.studykind._BUILTIN_KINDS``)."""
    graph = import_graph()
    above = ("workbench.scenario", "workbench.evaluation", "workbench.report", "workbench.review",
             "workbench.widgets", "workbench.cli", "workbench.exports")
    for name, targets in graph.items():
        if name.startswith("workbench.studies"):
            upward = {m for m in targets if m.startswith(above)}
            assert upward == set(), (name, upward)
