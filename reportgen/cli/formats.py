"""Commands about the file formats themselves: schema."""

from __future__ import annotations

import json

import click

from reportgen.cli.group import main
from reportgen.schema import FORMATS


@main.command(epilog="""\b
Examples:
  reportgen schema condition > condition.schema.json
  reportgen schema vessel
\b
The same schemas lie in docs/schema/ of the repository; a file's first line
  # yaml-language-server: $schema=PATH/condition.schema.json
lets an editor complete and check its keys.
\b
Exit status: 0 printed; 2 an unknown format name.""")
@click.argument("name", type=click.Choice(sorted(FORMATS)))
def schema(name: str) -> None:
    """Print the JSON Schema (draft 2020-12) of a reportgen format."""
    from reportgen.schema import json_schema

    click.echo(json.dumps(json_schema(name), indent=2, ensure_ascii=False))
