"""Commands of signing and verification: keygen, sign, verify."""

from __future__ import annotations

import sys
from pathlib import Path

import click

from reportgen.cli import main, read_passphrase
from reportgen.errors import InputError


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

    written = make_identity(name, out_dir, passphrase=read_passphrase(passphrase_file),
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
    passphrase = read_passphrase(passphrase_file)
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
