"""Commands of signing and verification: keygen, sign, verify, approve, extract.

Status goes to stderr, data (reports, JSON) to stdout. A progress bar shows on a terminal
only (never on a pipe, never with NO_COLOR set).
"""

from __future__ import annotations

import functools
import json
import os
import sys
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

import click

from reportgen.cli.group import OutputFile, main
from reportgen.errors import InputError

EXIT_CODES = """\b
Exit status: 0 done, 2 bad input (a clear message on stderr, nothing written)."""


def _escaped(func):
    """The command with its bad-input message printed with control characters escaped (SPEC
    "Verification", point 7: a file name or a text from a hostile file)."""
    @functools.wraps(func)
    def command(*args, **kwargs):
        from reportgen.signing.identity import printable

        try:
            return func(*args, **kwargs)
        except InputError as exc:
            raise InputError(printable(exc)) from None

    return command


def _bar_wanted() -> bool:
    return sys.stderr.isatty() and "NO_COLOR" not in os.environ


@contextmanager
def _progress(label: str, total: int | None = None) -> Iterator:
    """A transient rich progress bar on stderr, or nothing; yields advance()."""
    if not _bar_wanted():
        yield lambda *_a, **_k: None
        return
    from rich.console import Console
    from rich.progress import BarColumn, Progress, SpinnerColumn, TextColumn, TimeElapsedColumn

    columns = [SpinnerColumn(), TextColumn("{task.description}"), BarColumn(),
               TimeElapsedColumn()]
    with Progress(*columns, console=Console(stderr=True), transient=True) as bar:
        task = bar.add_task(label, total=total)

        def advance(step: float = 1, description: str | None = None) -> None:
            bar.update(task, advance=step, **({"description": description}
                                              if description else {}))

        yield advance


def _passphrase(path: Path | None, interactive_for: Path | None) -> bytes | None:
    from reportgen.signing.identity import read_passphrase

    passphrase = read_passphrase(path)
    if passphrase is None and interactive_for is not None and sys.stdin.isatty():
        passphrase = click.prompt("PKCS#12 passphrase (empty for none)", hide_input=True,
                                  default="", show_default=False).encode() or None
    return passphrase


_identity_options = [
    click.option("--key", "key_path", type=click.Path(path_type=Path),
                 help="Private key (PEM or DER), with --cert."),
    click.option("--cert", "cert_path", type=click.Path(path_type=Path),
                 help="Certificate (PEM or DER; further certificates in the file are its "
                      "chain)."),
    click.option("--p12", "p12_path", type=click.Path(path_type=Path),
                 help="PKCS#12 identity instead of --key/--cert."),
    click.option("--passphrase-file", type=click.Path(path_type=Path),
                 help="Passphrase of the key or PKCS#12 file (asked for on a terminal)."),
]


def _with_identity(func):
    for option in reversed(_identity_options):
        func = option(func)
    return func


@main.command(epilog="""\b
Example:
  reportgen keygen --name "A. N. Other, chief officer (invented)" -o ids/officer
""" + EXIT_CODES)
@click.option("--name", required=True, help="The person's name, as the sheet names them.")
@click.option("-o", "--output", "--out", "out_dir", required=True,
              type=click.Path(path_type=Path),
              help="Folder for key.pem, cert.pem and identity.p12 (--out is an alias).")
@click.option("--passphrase-file", type=click.Path(path_type=Path),
              help="Encrypt the key with the passphrase in this file.")
@click.option("--force", is_flag=True, help="Replace existing files.")
def keygen(name: str, out_dir: Path, passphrase_file: Path | None, force: bool) -> None:
    """Make a demo signing identity (self-signed; not for real use)."""
    from reportgen.signing.identity import keygen as make_identity
    from reportgen.signing.identity import read_passphrase

    for path in make_identity(name, out_dir, passphrase=read_passphrase(passphrase_file),
                              force=force):
        click.echo(str(path))


@main.command(epilog="""\b
Example:
  reportgen sign out/ballast.pdf --role prepared --p12 ids/officer/identity.p12 \\
      -o out/ballast-prepared.pdf
  reportgen sign out/ballast-prepared.pdf --role checked --key KEY.pem --cert CERT.pem \\
      -o out/ballast-signed.pdf
\b
Roles sign in order (checked needs prepared, reviewed needs checked). Refused: a certificate
expired or not yet valid, one that may not sign, one that already signed another role, one
whose name is not the name the sheet gives for the role, and a sheet that fails verify's
integrity checks.
""" + EXIT_CODES)
@click.argument("sheet_pdf", metavar="SHEET.pdf", type=click.Path(path_type=Path))
@click.option("--role", required=True, type=click.Choice(["prepared", "checked", "reviewed"]))
@_with_identity
@click.option("--reason", help="Reason shown in the signature.")
@click.option("--location", help="Place of signing.")
@click.option("-o", "--output", "output", required=True, type=OutputFile(),
              help="The signed PDF to write (a new file).")
@click.option("--force", is_flag=True, help="Replace an existing output file.")
@_escaped
def sign(sheet_pdf: Path, role: str, key_path: Path | None, cert_path: Path | None,
         p12_path: Path | None, passphrase_file: Path | None, reason: str | None,
         location: str | None, output: Path, force: bool) -> None:
    """Sign a sheet as prepared, checked or reviewed."""
    from reportgen.signing.identity import printable
    from reportgen.signing.sign import sign_document

    passphrase = _passphrase(passphrase_file, p12_path)
    with _progress(f"signing {sheet_pdf.name} as {role}"):
        done = sign_document(sheet_pdf, output, role, key_path=key_path, cert_path=cert_path,
                             p12_path=p12_path, passphrase=passphrase, reason=reason,
                             location=location, force=force)
    click.echo(f"{output}: signed as {role} by {printable(done['signer'])}", err=True)


def _expand(paths: tuple[Path, ...]) -> tuple[list[Path], list[dict]]:
    """The files to verify (a folder: its PDF files) and the folders without any (each one
    bad input: a mistyped folder must not pass unnoticed beside good files)."""
    files: list[Path] = []
    empty: list[dict] = []
    for path in paths:
        if path.is_dir():
            found = sorted(p for p in path.iterdir() if p.suffix.lower() == ".pdf"
                           and p.is_file())
            if not found:
                from reportgen.signing.identity import printable

                message = printable(f"{path}: no PDF files in this folder")
                click.echo(f"reportgen: {message}", err=True)
                empty.append({"file": str(path), "error": message})
            files.extend(found)
        else:
            files.append(path)
    return files, empty


@main.command(epilog="""\b
Examples:
  reportgen verify out/ballast-signed.pdf --trust ids/officer/cert.pem \\
      --trust ids/master/cert.pem --vessel-trust ids/design-office/cert.pem
  reportgen verify out/ --trust company-root.pem --json > report.json
\b
Exit status: 0 every file verified; 1 a file did not verify (an unsigned one included);
2 a file could not be read as a reportgen document, or a --trust file is bad. With several
files, the worst of them (2 > 1 > 0); every file is still processed.
""")
@click.argument("files", metavar="SHEET.pdf|FOLDER...", nargs=-1, required=True,
                type=click.Path(path_type=Path))
@click.option("--trust", "trust", multiple=True, type=click.Path(path_type=Path),
              help="A trusted certificate (PEM or DER); a CA certificate also vouches for "
                   "those it issues. Repeat for more.")
@click.option("--vessel", "vessel", type=click.Path(path_type=Path),
              help="The approved vessel data file: the embedded one must equal it byte for "
                   "byte.")
@click.option("--vessel-trust", "vessel_trust", multiple=True,
              type=click.Path(path_type=Path),
              help="A certificate trusted to approve vessel data; the embedded vessel data "
                   "must carry an approval trusted through it. Repeat for more.")
@click.option("--accept-other-version", is_flag=True,
              help="Accept a document rendered by another reportgen version (its pages are "
                   "then not compared).")
@click.option("--pages", is_flag=True, hidden=True,
              help="Kept for old scripts: the pages are always compared now.")
@click.option("--json", "as_json", is_flag=True, help="Print the report as JSON.")
def verify(files: tuple[Path, ...], trust: tuple[Path, ...], vessel: Path | None,
           vessel_trust: tuple[Path, ...], accept_other_version: bool, pages: bool,
           as_json: bool) -> None:
    """Verify signed sheets: signatures, trust, pages and a recomputation."""
    from reportgen.files import read_input
    from reportgen.signing.identity import printable
    from reportgen.signing.report import one_line, render_report, summary_line
    from reportgen.signing.trust import load_trust
    from reportgen.signing.verify import verify_document

    store = load_trust(trust)
    vessel_store = load_trust(vessel_trust) if vessel_trust else None
    if vessel is not None:
        read_input(vessel, "approved vessel data file")  # a bad --vessel is bad input, once
    paths, unreadable = _expand(files)
    reports: list[dict] = []
    with _progress("verifying", total=len(paths)) as advance:
        for path in paths:
            try:
                reports.append(verify_document(
                    path, store, vessel=vessel, vessel_trust=vessel_store or (),
                    accept_other_version=accept_other_version))
            except InputError as exc:
                if len(paths) == 1 and not unreadable:  # file names and parser texts
                    raise InputError(printable(exc)) from None  # are escaped (point 7)
                click.echo(f"reportgen: {printable(exc)}", err=True)
                unreadable.append({"file": str(path), "error": printable(exc)})
            advance()
    status = 2 if unreadable or not paths else (0 if all(r["ok"] for r in reports) else 1)
    if as_json:
        if len(paths) == 1 and reports and not unreadable:
            document: object = reports[0]
        else:
            document = {"format": "reportgen/verify-batch-1", "files": reports,
                        "unreadable": unreadable,
                        "summary": {"files": len(reports) + len(unreadable),
                                    "verified": sum(1 for r in reports if r["ok"]),
                                    "not_verified": sum(1 for r in reports if not r["ok"]),
                                    "unreadable": len(unreadable)}}
        click.echo(json.dumps(document, indent=2, ensure_ascii=True))
    elif len(paths) == 1 and reports and not unreadable:
        color = sys.stdout.isatty() and "NO_COLOR" not in os.environ
        click.echo(render_report(reports[0], color=color), nl=False)
    else:
        for report in reports:
            click.echo(one_line(report))
        click.echo(summary_line(reports, len(unreadable)))
    sys.exit(status)


@main.command(epilog="""\b
Example:
  reportgen approve conditions/vessels/SHIP.yaml --p12 ids/design-office/identity.p12
  (writes conditions/vessels/SHIP.yaml.p7s, which `sheet` then embeds)
""" + EXIT_CODES)
@click.argument("vessel_file", metavar="VESSEL.yaml", type=click.Path(path_type=Path))
@_with_identity
@click.option("-o", "--output", "output", type=OutputFile(),
              help="The approval to write (default: VESSEL.yaml.p7s beside the file).")
@click.option("--force", is_flag=True, help="Replace an existing approval.")
@_escaped
def approve(vessel_file: Path, key_path: Path | None, cert_path: Path | None,
            p12_path: Path | None, passphrase_file: Path | None, output: Path | None,
            force: bool) -> None:
    """Approve vessel data: a detached CMS signature (RFC 5652) of the file's bytes."""
    from reportgen.signing.approve import approve_vessel
    from reportgen.signing.identity import printable

    done = approve_vessel(vessel_file, output, key_path=key_path, cert_path=cert_path,
                          p12_path=p12_path, passphrase=_passphrase(passphrase_file, p12_path),
                          force=force)
    click.echo(f"{done['output']}: vessel data approved by {printable(done['signer'])}",
               err=True)


@main.command(epilog="""\b
Examples:
  reportgen extract out/ballast-signed.pdf -o out/ballast-inputs
  reportgen check out/ballast-inputs/ballast-departure.yaml --json
  reportgen extract out/limits-signed.pdf -o out/limits-inputs
  (a limits document gives its vessel file; the command to re-run it is printed on stderr)
""" + EXIT_CODES)
@click.argument("sheet_pdf", metavar="SHEET.pdf", type=click.Path(path_type=Path))
@click.option("-o", "--output", "out_dir", required=True, type=click.Path(path_type=Path),
              help="Folder to write the condition and vessel files (and approval) into "
                   "(a limits document: its vessel file and approval).")
@click.option("--force", is_flag=True, help="Replace existing files.")
@_escaped
def extract(sheet_pdf: Path, out_dir: Path, force: bool) -> None:
    """Write a document's embedded input files, ready to run again."""
    from reportgen.signing.approve import extract_and_hint

    written, hint = extract_and_hint(sheet_pdf, out_dir, force=force)
    for path in written:
        click.echo(str(path))
    if hint is not None:
        click.echo(f"re-run: {hint}", err=True)
