"""Every source key cited in a docstring's References section resolves in tables/sources.csv.

An audit of a result must be able to follow every formula to its source; a key
that resolves nowhere would leave a hole in the report's list of sources.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

from workbench.materials import load_sources

PACKAGE = Path(__file__).resolve().parents[1] / "workbench"
_SECTION = re.compile(r"References\n-+\n(.*?)(?=\n[A-Z][A-Za-z ]+\n-+\n|\Z)", re.S)
_KEY = re.compile(r"``([a-z0-9][a-z0-9.-]*-[a-z0-9.-]+|[a-z]+[0-9]+)``")


def _cited_keys():
    for path in sorted(PACKAGE.rglob("*.py")):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            if isinstance(node, (ast.FunctionDef, ast.ClassDef, ast.Module)):
                section = _SECTION.search(ast.get_docstring(node) or "")
                if section:
                    for key in _KEY.findall(section.group(1)):
                        yield path.relative_to(PACKAGE.parent), getattr(node, "name", "<module>"), key


def test_docstrings_cite_sources():
    assert sum(1 for _ in _cited_keys()) > 30


@pytest.mark.parametrize("where, name, key", sorted(set(_cited_keys())))
def test_cited_key_resolves(where, name, key):
    assert key in load_sources().index, f"{where}::{name} cites {key!r}, not in tables/sources.csv"
