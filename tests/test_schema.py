"""The JSON Schemas of the formats (SPEC.md; issue: `reportgen schema`), checked with the
`jsonschema` library against the draft 2020-12 meta-schema, against the demo files, and in
step with the committed copies in docs/schema/ that the demo files' editor hint names."""

from __future__ import annotations

import json
from pathlib import Path

import jsonschema
import pytest
from click.testing import CliRunner
from conftest import ROOT

from reportgen.cli import main
from reportgen.inputs import yamlread
from reportgen.pipeline import evaluate_path
from reportgen.schema import FORMATS, json_schema

DOCS = ROOT / "docs" / "schema"
CONDITIONS = sorted((ROOT / "conditions").glob("*.yaml"))


def _read(path: Path):
    """A file as reportgen reads it, dates as text (as a YAML 1.2 editor sees them)."""
    return json.loads(json.dumps(yamlread.parse(path.read_bytes(), path.name), default=str))


@pytest.mark.parametrize("name", sorted(FORMATS))
def test_each_schema_is_valid_draft_2020_12_and_committed(name):
    done = CliRunner().invoke(main, ["schema", name])
    assert done.exit_code == 0
    printed = json.loads(done.output)
    assert printed["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    jsonschema.Draft202012Validator.check_schema(printed)
    committed = DOCS / f"{name}.schema.json"
    assert committed.exists() and json.loads(committed.read_text()) == printed, \
        f"docs/schema/{name}.schema.json is stale: reportgen schema {name} > {committed}"


@pytest.mark.parametrize("path", CONDITIONS, ids=lambda p: p.stem)
def test_demo_conditions_validate_and_carry_the_editor_hint(path):
    jsonschema.Draft202012Validator(json_schema("condition")).validate(_read(path))
    first = path.read_text().splitlines()[0]
    hint = first.removeprefix("# yaml-language-server: $schema=")
    assert hint != first and (path.parent / hint).resolve() == DOCS / "condition.schema.json"


def test_demo_vessels_validate():
    schema = json_schema("vessel")
    for path in sorted((ROOT / "conditions" / "vessels").glob("*.yaml")):
        jsonschema.Draft202012Validator(schema).validate(_read(path))


def test_a_misspelled_key_fails_the_schema_and_the_reader():
    data = _read(CONDITIONS[0])
    data["condition"]["water_densty"] = data["condition"].pop("water_density", 1.025)
    with pytest.raises(jsonschema.ValidationError, match="water_densty"):
        jsonschema.Draft202012Validator(json_schema("condition")).validate(data)


def test_results_validate_against_the_results_schema():
    results = evaluate_path(CONDITIONS[0]).to_dict()
    jsonschema.Draft202012Validator(json_schema("results")).validate(results)


def test_field_notes_become_descriptions():
    vessel = json_schema("vessel")
    lcb = vessel["$defs"]["Hydrostatics"]["properties"]["lcb"]
    assert lcb["description"] == "m from AP"
