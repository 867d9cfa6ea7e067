"""Commands that set up a ship's data: tables."""

from __future__ import annotations

import sys
from pathlib import Path

import click

from reportgen.cli.group import main
from reportgen.errors import InputError


@main.command()
@click.argument("vessel", type=click.Path(path_type=Path))
@click.option("-o", "--output", "output", required=True, type=click.Path(path_type=Path),
              help="The vessel file to write, with the tables.")
@click.option("--even-keel", is_flag=True, help="Cross curves at even keel (default: free trim).")
@click.option("--trims", "trims_text", metavar="LIST",
              help="Make every table at these trims, m + by the stern (e.g. -1,0,1,2,3,4).")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def tables(vessel: Path, output: Path, even_keel: bool, trims_text: str | None,
           force: bool) -> None:
    """Make hydrostatics, cross curves, deck-edge and flooding angles from the hull offsets."""
    from rich.progress import Progress

    from reportgen.files import check_output, write_atomic
    from reportgen.hull.tables import build_tables, vessel_text_with_tables
    from reportgen.hull.trimmed import parse_trims
    from reportgen.inputs import load_vessel

    try:
        trims = None if trims_text is None else parse_trims(trims_text)
    except ValueError as exc:
        raise InputError(str(exc)) from None
    check_output(output, force)
    if output.exists() and output.resolve() == vessel.resolve():
        raise InputError(f"{output}: the output must not be the input file")
    model = load_vessel(vessel)
    if model.hull is None:
        raise InputError(f"{vessel}: hull: no offsets to make tables from")
    from reportgen.cli.shipdata import tank_tables_of, with_tank_tables  # tanks by geometry

    tanks_made = tank_tables_of(model, vessel)
    with Progress(transient=True, disable=not sys.stderr.isatty()) as bar:
        task = bar.add_task("hull tables", total=None)

        def progress(done: int, total: int) -> None:
            bar.update(task, completed=done, total=total)

        try:
            made = build_tables(model, even_keel=even_keel, trims=trims, progress=progress)
        except ValueError as exc:
            raise InputError(f"{vessel}: {exc}") from None
    text = vessel_text_with_tables(vessel.read_text(encoding="utf-8"), made)
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
