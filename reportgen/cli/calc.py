"""Commands that evaluate conditions and write their documents: check, sheet."""

from __future__ import annotations

import sys
from pathlib import Path

import click

from reportgen.cli import main


@main.command()
@click.argument("condition", type=click.Path(path_type=Path))
@click.option("--json", "as_json", is_flag=True, help="Print the results document (JSON).")
def check(condition: Path, as_json: bool) -> None:
    """Evaluate a loading condition against the vessel's criteria."""
    from reportgen.pipeline import evaluate_path

    results = evaluate_path(condition)
    if as_json:
        click.echo(results.to_json(), nl=False)
    else:
        from reportgen.summary import render_summary

        click.echo(render_summary(results.to_dict()))
    sys.exit(0 if results.passed else 1)


@main.command()
@click.argument("condition", type=click.Path(path_type=Path))
@click.option("-o", "--output", "output", required=True, type=click.Path(path_type=Path),
              help="The PDF to write.")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def sheet(condition: Path, output: Path, force: bool) -> None:
    """Write the calculation sheet (PDF/A-3 with inputs and results embedded)."""
    from reportgen.files import check_output
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report.render import write_sheet

    check_output(output, force)
    case = load_case(condition)
    results = evaluate(case)
    write_sheet(case, results, output, force=force)
    verdict = "meets every criterion" if results.passed else "FAILS at least one criterion"
    click.echo(f"{output}: sheet written; the condition {verdict}", err=True)
