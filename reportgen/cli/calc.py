"""Commands that evaluate conditions and write their documents: check, sheet."""

from __future__ import annotations

import json
import sys
from pathlib import Path

import click

from reportgen.cli.group import EXIT_BAD_INPUT, main, names_a_folder, progress
from reportgen.errors import InputError
from reportgen.printable import printable_lines


def _worst(codes: list[int]) -> int:
    """The exit status of several files: 2 > 1 > 0."""
    return max(codes, default=0)


@main.command(epilog="""\b
Examples:
  reportgen check conditions/full-load-departure.yaml
  reportgen check conditions/*.yaml --json > results.json
  reportgen check conditions/full-load-departure.yaml --compare
\b
Exit status: 0 every criterion of every condition passed; 1 a criterion failed;
2 bad input (reported on stderr; the other files are still checked).""")
@click.argument("conditions", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option("--json", "as_json", is_flag=True,
              help="Print the results document (JSON); a JSON array for several files.")
@click.option("--compare", is_flag=True,
              help="Evaluate by the tables and on the hull, and print the differences beside "
                   "the MSC.1/Circ.1229 tolerances (the vessel needs both).")
def check(conditions: tuple[Path, ...], as_json: bool, compare: bool) -> None:
    """Evaluate loading conditions against their criteria."""
    from reportgen.pipeline import evaluate_compared, evaluate_path
    from reportgen.summary import render_summary

    codes, docs = [], []
    for i, path in enumerate(conditions):
        try:
            results = evaluate_compared(path) if compare else evaluate_path(path)
        except InputError as exc:
            click.echo(f"reportgen: {printable_lines(exc)}", err=True)
            codes.append(EXIT_BAD_INPUT)
            continue
        codes.append(0 if results.passed else 1)
        if as_json:
            docs.append(results)
        else:
            if i:
                click.echo("\n" + "=" * 100 + "\n")
            click.echo(render_summary(results))
            if results.comparison is not None:
                from reportgen.compare import render

                click.echo("\n" + render([e.model_dump() for e in results.comparison]))
    if as_json:
        if len(conditions) == 1:
            if docs:
                click.echo(docs[0].to_json(), nl=False)
        else:
            click.echo(json.dumps([d.to_dict() for d in docs], indent=2, ensure_ascii=False))
    sys.exit(_worst(codes))


@main.command(epilog="""\b
Examples:
  reportgen sheet conditions/full-load-departure.yaml -o out/full-load.pdf
  reportgen sheet conditions/*.yaml -o out/     (several: one NAME.pdf each in a folder)
\b
Exit status: 0 every sheet written and every condition passes; 1 written, but a condition
fails a criterion; 2 bad input or an output that cannot be written (nothing is written for
that file; the other files are still processed).""")
@click.argument("conditions", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option("-o", "--output", "output", required=True, type=click.Path(),
              help="The PDF to write; a folder for several conditions.")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def sheet(conditions: tuple[Path, ...], output: str, force: bool) -> None:
    """Write calculation sheets (PDF/A-3 with inputs and results embedded)."""
    from reportgen.files import check_output
    from reportgen.inputs import load_case
    from reportgen.pipeline import evaluate
    from reportgen.report.render import write_sheet

    several = len(conditions) > 1
    if not several and names_a_folder(output):
        raise InputError(f"{output}: ends with a slash, which names a folder; give the name "
                         f"of the PDF to write")
    output = Path(output)
    if several and not output.is_dir():
        raise InputError(f"{output}: with several conditions, -o must name an existing folder")
    targets = [output / f"{path.stem}.pdf" for path in conditions] if several else [output]
    first: dict[Path, Path] = {}
    codes = []
    with progress("sheets", len(conditions)) as advance:
        for path, target in zip(conditions, targets, strict=True):
            try:
                if target in first:  # one run never writes a file twice: the later is bad
                    raise InputError(f"{path}: its sheet would be {target}, as is that of "
                                     f"{first[target]} in this run; nothing is written for it "
                                     f"(give each condition once, or sheet them into "
                                     f"different folders)")
                first[target] = path
                case = load_case(path)
                check_output(target, force)
                results = evaluate(case)
                write_sheet(case, results, target, force=force)
            except InputError as exc:
                click.echo(f"reportgen: {printable_lines(exc)}", err=True)
                codes.append(EXIT_BAD_INPUT)
                advance()
                continue
            verdict = "meets every criterion" if results.passed else \
                "FAILS at least one criterion"
            click.echo(f"{target}: sheet written; the condition {verdict}", err=True)
            codes.append(0 if results.passed else 1)
            advance()
    sys.exit(_worst(codes))
