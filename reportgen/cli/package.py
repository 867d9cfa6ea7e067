"""The command that gathers several conditions of one vessel into one document: package."""

from __future__ import annotations

import sys
from pathlib import Path

import click

from reportgen.cli.group import OutputFile, main, progress


@main.command(epilog="""\b
Examples:
  reportgen package conditions/full-load-departure.yaml conditions/full-load-arrival.yaml \\
      -o out/package.pdf
  reportgen package departure.yaml arrival.yaml -o voyage-12.pdf --title "Voyage 12"
\b
Every condition must name a vessel file with the same bytes. Exit status: 0 the package is
written and every condition passes; 1 written, but a condition fails a criterion; 2 bad input
or an output that cannot be written (nothing is written).""")
@click.argument("conditions", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option("-o", "--output", "output", required=True, type=OutputFile(),
              help="The PDF to write.")
@click.option("--title", default=None, help="The package's title (default: the vessel's "
              "loading conditions).")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def package(conditions: tuple[Path, ...], output: Path, title: str | None,
            force: bool) -> None:
    """Write one calculation package of several conditions (PDF/A-3, inputs embedded)."""
    from reportgen.files import check_output
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report.package import make_package, write_package

    check_output(output, force)
    with progress("package", 2 * len(conditions) + 1) as advance:
        cases = []
        for path in conditions:
            cases.append(load_case(path))
            advance()

        def counted(case):
            results = evaluate(case)
            advance()
            return results

        pkg = make_package(cases, title, evaluate=counted)
        write_package(pkg, output, force=force)
        advance()
    failed = [m.results.condition.title for m in pkg.members if not m.results.passed]
    click.echo(f"{output}: package of {counted_words(len(pkg.members), len(failed))}",
               err=True)
    sys.exit(1 if failed else 0)


def counted_words(count: int, failed: int) -> str:
    """"3 conditions written; ..." with the number agreeing: 1 condition, 2 conditions."""
    written = f"{count} condition{'' if count == 1 else 's'} written"
    if not failed:
        verdict = "every condition meets every criterion" if count > 1 else \
            "the condition meets every criterion"
    elif count == 1:
        verdict = "the condition FAILS at least one criterion"
    else:
        verdict = f"{failed} of {count} conditions FAIL{'S' if failed == 1 else ''} at least " \
                  f"one criterion"
    return f"{written}; {verdict}"
