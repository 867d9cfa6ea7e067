"""Commands that set up a ship's data: tables."""

from __future__ import annotations

from pathlib import Path

import click

from reportgen.cli.group import OutputFile, main, progress
from reportgen.errors import InputError


@main.command(epilog="""\b
Examples:
  reportgen tables conditions/vessels/linnet-demo-hull.yaml -o ship.yaml
  reportgen tables hull.yaml -o ship.yaml --trims -1,0,1,2,3 --even-keel
\b
Tanks given by geometry (a box clipped by the hull) get their sounding tables too.
Exit status: 0 written; 2 bad input or offsets that cannot be integrated faithfully
(nothing written).""")
@click.argument("vessel", type=click.Path(path_type=Path))
@click.option("-o", "--output", "output", required=True, type=OutputFile(),
              help="The vessel file to write, with the tables.")
@click.option("--even-keel", is_flag=True, help="Cross curves at even keel (default: free trim).")
@click.option("--trims", "trims_text", metavar="LIST",
              help="Make every table at these trims, m + by the stern (e.g. -1,0,1,2,3,4).")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def tables(vessel: Path, output: Path, even_keel: bool, trims_text: str | None,
           force: bool) -> None:
    """Make hydrostatics, cross curves, deck-edge and flooding angles from the hull offsets."""
    from reportgen.files import check_output, read_input, write_atomic
    from reportgen.hull.tables import build_tables, vessel_text_with_tables
    from reportgen.hull.trimmed import parse_trims
    from reportgen.inputs import parse_vessel
    from reportgen.inputs.yamlread import decode

    try:
        trims = None if trims_text is None else parse_trims(trims_text)
    except ValueError as exc:
        raise InputError(str(exc)) from None
    # The input read first, so that the output check knows it under any name (a link, a path
    # spelt otherwise); the text written is made from these same bytes, never a second read.
    raw = read_input(vessel, "vessel data file")
    check_output(output, force)
    model = parse_vessel(raw, str(vessel))
    if model.hull is None:
        raise InputError(f"{vessel}: hull: no offsets to make tables from")
    from reportgen.cli.shipdata import tank_tables_of, with_tank_tables  # tanks by geometry

    tanks_made = tank_tables_of(model, vessel)
    with progress("hull tables", None) as advance:
        try:
            made = build_tables(model, even_keel=even_keel, trims=trims, progress=advance)
        except ValueError as exc:
            raise InputError(f"{vessel}: {exc}") from None
    text = vessel_text_with_tables(decode(raw, str(vessel)), made)
    text = with_tank_tables(text, model, tanks_made)
    write_atomic(output, text.encode("utf-8"), force=force)
    hydro, cross = made["hydrostatics"], made["cross_curves"]
    click.echo(
        f"{output}: hydrostatics at {len(hydro['draft'])} draughts "
        f"({hydro['draft'][0]:g} to {hydro['draft'][-1]:g} m), cross curves at "
        f"{len(cross['displacement'])} displacements x {len(cross['heel'])} heels, "
        f"trim {cross['trim']}"
        + ("" if trims is None else f" at trims {', '.join(f'{t:g}' for t in trims)} m"),
        err=True)
