"""The README's commands and code keep working.

The README is what a new user follows first. Its Python block is run as written; every
``make`` target it names exists in the Makefile; every ``heatpath`` command line it shows
runs (from a copy of the examples, in a temporary folder, so nothing is written into the
repository) and exits 0; and the ``[limits]`` block it shows is accepted by a scenario file.
No physical value is asserted here (the functions the README calls are checked against
published sources in their own test files).
"""

from __future__ import annotations

import re
import shlex
import shutil
from pathlib import Path

import pytest

from workbench import cli

ROOT = Path(__file__).resolve().parent.parent
README = (ROOT / "README.md").read_text(encoding="utf-8")


def _blocks(language: str) -> list[str]:
    return re.findall(rf"```{language}\n(.*?)```", README, flags=re.S)


def _make_targets() -> set[str]:
    text = (ROOT / "Makefile").read_text(encoding="utf-8")
    return set(re.findall(r"^([A-Za-z][\w-]*):", text, flags=re.M))


def _heatpath_lines() -> list[str]:
    lines = []
    for block in _blocks("bash"):
        for line in block.splitlines():
            line = line.split("#", 1)[0].strip()
            if line.startswith(".venv/bin/heatpath "):
                lines.append(line.removeprefix(".venv/bin/heatpath "))
    return lines


def test_readme_python_block_runs():
    blocks = _blocks("python")
    assert blocks, "the README shows how to call the core from Python"
    for code in blocks:
        exec(compile(code, "README.md", "exec"), {})


def test_readme_make_targets_exist():
    named = set()
    for block in _blocks("bash"):
        named |= set(re.findall(r"^make (\w[\w-]*)", block, flags=re.M))
    assert {"lab", "test", "app"} <= named
    assert named <= _make_targets(), named - _make_targets()


def test_readme_first_paragraph_states_the_job():
    first = README.split("\n\n", 2)[1]
    assert "choose the material and thickness of a wall between hot and cold" in first


@pytest.mark.filterwarnings("ignore::workbench._checks.ValidityWarning")
@pytest.mark.parametrize("line", _heatpath_lines())
def test_readme_heatpath_commands_run(line, tmp_path, monkeypatch, capsys):
    shutil.copytree(ROOT / "examples", tmp_path / "examples")
    monkeypatch.chdir(tmp_path)
    args = shlex.split(line)
    if args[:1] == ["diff"]:  # two scenario files of the reader's own: two saved reviews
        shutil.copy(ROOT / "examples" / "wall.toml", tmp_path / "old.toml")
        text = (ROOT / "examples" / "wall.toml").read_text(encoding="utf-8")
        (tmp_path / "new.toml").write_text(text.replace('title = "', 'title = "Revised: ', 1), encoding="utf-8")
    if args[:2] == ["materials", "check"]:  # the reader's own materials file, in the curated columns
        shutil.copy(ROOT / "tables" / "materials.csv", tmp_path / "my_materials.csv")
    assert cli.main(args) == 0, capsys.readouterr().err


def test_readme_limits_block_is_accepted():
    from workbench.scenario import scenario_from_text

    block = next(b for b in _blocks("toml") if "[limits]" in b)
    text = (ROOT / "examples" / "wall.toml").read_text(encoding="utf-8")
    scen = scenario_from_text(text + "\n" + block, origin="wall_with_limits.toml")
    assert scen.limits == {"max_list_entries": 5000, "max_sweep_cells": 500000000}
