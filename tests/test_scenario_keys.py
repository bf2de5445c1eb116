"""The scenario key reference is generated from the kinds' declarations and cannot drift."""

from __future__ import annotations

from pathlib import Path

import pytest

from workbench.scenario import scenario_keys_text, starter_text, study_kind

DOCS = Path(__file__).resolve().parents[1] / "docs" / "scenario-keys.md"
KINDS = ("wall", "shipper", "housing")


def test_committed_docs_page_equals_the_generated_text():
    # regenerate with:
    # python -c "from workbench.scenario import scenario_keys_text as k; \
    #   open('docs/scenario-keys.md', 'w').write(k(None, 'markdown'))"
    assert DOCS.read_text("utf-8") == scenario_keys_text(None, "markdown")


@pytest.mark.parametrize("name", KINDS)
def test_every_input_and_column_is_listed(name):
    kind = study_kind(name)
    text = scenario_keys_text(name)
    for spec in kind.inputs:
        assert spec.name in text and spec.doc in text and spec.label, spec.name
    for col in (*kind.column_kinds, *kind.flag_columns):
        assert col in text, col
    assert kind.candidate_forms, "each built-in kind says what a candidate entry may be"


@pytest.mark.parametrize("name", KINDS)
def test_starter_points_at_the_key_reference(name):
    assert f"heatpath scenario keys {name}" in starter_text(name)


def test_cli_scenario_keys_markdown(capsys):
    from workbench.cli import main

    assert main(["scenario", "keys", "wall", "--format", "markdown"]) == 0
    assert capsys.readouterr().out == scenario_keys_text("wall", "markdown")
    assert main(["scenario", "keys", "walls"]) == 2
    assert "kind: unknown 'walls'" in capsys.readouterr().err
