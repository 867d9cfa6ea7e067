"""Command line: arguments -> library calls -> exit codes (SPEC.md, "Command line").

Exit status: 0 success (every criterion passed / every signature good), 1 a criterion failed or
a verification found a fault, 2 bad input (a clear message, nothing written).
"""

from __future__ import annotations

import sys
from pathlib import Path

import click

from reportgen import __version__
from reportgen.errors import InputError

EXIT_BAD_INPUT = 2


class _Group(click.Group):
    """Turns InputError into one line on stderr and exit status 2, never a traceback."""

    def invoke(self, ctx: click.Context):
        try:
            return super().invoke(ctx)
        except InputError as exc:
            click.echo(f"reportgen: {exc}", err=True)
            ctx.exit(EXIT_BAD_INPUT)
        except KeyboardInterrupt:
            click.echo("reportgen: interrupted; nothing was written", err=True)
            ctx.exit(130)


def _read_passphrase(path: Path | None) -> bytes | None:
    if path is None:
        return None
    try:
        return path.read_bytes().rstrip(b"\r\n")
    except OSError as exc:
        raise InputError(f"{path}: cannot read the passphrase file: {exc.strerror}") from None


@click.group(cls=_Group, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="reportgen")
def main() -> None:
    """Intact stability calculation sheets to the IMO 2008 IS Code."""


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


@main.command()
@click.argument("vessel", type=click.Path(path_type=Path))
@click.option("-o", "--output", "output", required=True, type=click.Path(path_type=Path),
              help="The vessel file to write, with the tables.")
@click.option("--even-keel", is_flag=True, help="Cross curves at even keel (default: free trim).")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def tables(vessel: Path, output: Path, even_keel: bool, force: bool) -> None:
    """Make hydrostatics and cross curves from the hull offsets."""
    from rich.progress import Progress

    from reportgen.files import check_output, write_atomic
    from reportgen.hull.tables import build_tables, vessel_text_with_tables
    from reportgen.inputs import load_vessel

    check_output(output, force)
    if output.exists() and output.resolve() == vessel.resolve():
        raise InputError(f"{output}: the output must not be the input file")
    model = load_vessel(vessel)
    if model.hull is None:
        raise InputError(f"{vessel}: hull: no offsets to make tables from")
    with Progress(transient=True, disable=not sys.stderr.isatty()) as bar:
        task = bar.add_task("hull tables", total=None)

        def progress(done: int, total: int) -> None:
            bar.update(task, completed=done, total=total)

        made = build_tables(model, even_keel=even_keel, progress=progress)
    text = vessel_text_with_tables(vessel.read_text(encoding="utf-8"), made)
    write_atomic(output, text.encode("utf-8"), force=force)
    hydro, cross = made["hydrostatics"], made["cross_curves"]
    click.echo(
        f"{output}: hydrostatics at {len(hydro['draft'])} draughts "
        f"({hydro['draft'][0]:g} to {hydro['draft'][-1]:g} m), cross curves at "
        f"{len(cross['displacement'])} displacements x {len(cross['heel'])} heels, "
        f"trim {cross['trim']}", err=True)


@main.command()
@click.option("--name", required=True, help="The person's name, as it will show on signatures.")
@click.option("--out", "out_dir", required=True, type=click.Path(path_type=Path),
              help="Folder for key.pem, cert.pem and identity.p12.")
@click.option("--passphrase-file", type=click.Path(path_type=Path),
              help="Encrypt the key with the passphrase in this file.")
@click.option("--force", is_flag=True, help="Replace existing files.")
def keygen(name: str, out_dir: Path, passphrase_file: Path | None, force: bool) -> None:
    """Make a demo signing identity (self-signed; not for real use)."""
    from reportgen.signing import keygen as make_identity

    written = make_identity(name, out_dir, passphrase=_read_passphrase(passphrase_file),
                            force=force)
    for path in written:
        click.echo(str(path))


@main.command()
@click.argument("sheet_pdf", metavar="SHEET.pdf", type=click.Path(path_type=Path))
@click.option("--role", required=True, type=click.Choice(["prepared", "checked", "reviewed"]))
@click.option("--key", "key_path", type=click.Path(path_type=Path), help="Private key (PEM).")
@click.option("--cert", "cert_path", type=click.Path(path_type=Path), help="Certificate (PEM).")
@click.option("--p12", "p12_path", type=click.Path(path_type=Path), help="PKCS#12 identity.")
@click.option("--passphrase-file", type=click.Path(path_type=Path),
              help="Passphrase of the key or PKCS#12 file.")
@click.option("--reason", help="Reason shown in the signature.")
@click.option("--location", help="Place of signing.")
@click.option("-o", "--output", "output", required=True, type=click.Path(path_type=Path))
@click.option("--force", is_flag=True, help="Replace an existing output file.")
def sign(sheet_pdf: Path, role: str, key_path: Path | None, cert_path: Path | None,
         p12_path: Path | None, passphrase_file: Path | None, reason: str | None,
         location: str | None, output: Path, force: bool) -> None:
    """Sign a sheet as prepared, checked or reviewed."""
    from reportgen.signing import sign_sheet

    if p12_path is None and (key_path is None or cert_path is None):
        raise InputError("sign: give --key and --cert, or --p12")
    if p12_path is not None and (key_path is not None or cert_path is not None):
        raise InputError("sign: give either --key/--cert or --p12, not both")
    passphrase = _read_passphrase(passphrase_file)
    if passphrase is None and p12_path is not None and sys.stdin.isatty():
        passphrase = click.prompt("PKCS#12 passphrase (empty for none)", hide_input=True,
                                  default="", show_default=False).encode() or None
    sign_sheet(sheet_pdf, output, role, key_path=key_path, cert_path=cert_path,
               p12_path=p12_path, passphrase=passphrase, reason=reason, location=location,
               force=force)
    click.echo(f"{output}: signed as {role}", err=True)


@main.command()
@click.argument("sheet_pdf", metavar="SHEET.pdf", type=click.Path(path_type=Path))
@click.option("--trust", "trust", multiple=True, type=click.Path(path_type=Path),
              help="A trusted root certificate (PEM or DER); repeat for more.")
@click.option("--pages", is_flag=True,
              help="Also render the sheet afresh from its embedded inputs and compare the "
                   "printed text of every page.")
@click.option("--json", "as_json", is_flag=True, help="Print the report as JSON.")
def verify(sheet_pdf: Path, trust: tuple[Path, ...], pages: bool, as_json: bool) -> None:
    """Check the signatures and recompute the sheet from its embedded inputs."""
    import json

    from reportgen.signing import render_verify_report, verify_sheet

    report = verify_sheet(sheet_pdf, list(trust), pages=pages)
    if as_json:
        click.echo(json.dumps(report, indent=2, ensure_ascii=False))
    else:
        click.echo(render_verify_report(report))
    sys.exit(0 if report["ok"] else 1)


if __name__ == "__main__":  # pragma: no cover
    main()
