"""Commands that set up a ship from a design office's data: hull-from-mesh, import, show, new;
and the tank tables `tables` makes for tanks given by geometry (SPEC.md, "Setting up a ship").
"""

from __future__ import annotations

import hashlib
import json
import os
from pathlib import Path

import click

from reportgen.cli.group import OutputFile, main, progress
from reportgen.errors import InputError
from reportgen.printable import printable_lines

MESH_TYPES = {".stl": "stl", ".obj": "obj"}
_GENERATED = ("# Hull offsets made by", "# (SHA-256 ", "# the offsets (closed", "# warning: ")
CSV_MAX_BYTES = 16 * 1024 * 1024


def tank_tables_of(vessel, vessel_path: Path) -> dict | None:
    """The sounding tables of the vessel's tanks given by geometry (None when there are none),
    made before the hull's tables so that a bad tank box is reported at once."""
    from reportgen.hull.sections import hull_from_stations
    from reportgen.hull.tankfile import tank_tables

    n = sum(t.geometry is not None for t in vessel.tanks)
    if not n:
        return None
    hull = hull_from_stations([(float(s.x), [list(p) for p in s.points])
                               for s in vessel.hull.stations])
    try:
        with progress("tank tables", n) as step:
            made = tank_tables(vessel, hull, progress=step)
    except ValueError as exc:
        raise InputError(f"{vessel_path}: {exc}") from None
    click.echo(f"tank tables of {n} tank(s) made from their geometry", err=True)
    return made


def with_tank_tables(text: str, vessel, made: dict | None) -> str:
    """`text` (the vessel file `tables` writes) with the tank tables `made` (tank_tables_of);
    unchanged when there are none."""
    from reportgen.hull.tankfile import tanks_block, text_with_tanks

    return text if made is None else text_with_tanks(text, tanks_block(vessel, made))


@main.command("hull-from-mesh", epilog="""\b
Examples:
  reportgen hull-from-mesh hull.stl -o hull.yaml
  reportgen hull-from-mesh hull.obj -o hull.yaml --stations 81 --scale 0.001
  reportgen hull-from-mesh hull.stl --vessel head.yaml -o ship-hull.yaml
\b
The mesh must be closed (watertight), in the vessel file's axes: x from the aft
perpendicular forward, y to starboard (the whole hull, or its starboard half), z up from
the moulded baseline. The output holds the hull: block for a vessel file; with
--vessel, that vessel file with its hull: block put in (added, or replaced).
Exit status: 0 written; 2 bad input (nothing written).""")
@click.argument("mesh", type=click.Path(path_type=Path))
@click.option("-o", "--output", required=True, type=OutputFile(),
              help="The YAML file to write (the hull: block).")
@click.option("--stations", type=click.IntRange(3, 1001), default=None,  # mesh.MAX_STATIONS
              help="Number of stations, evenly spaced (default: enough to hold the mesh's "
                   "volume to 0.1 %).")
@click.option("--scale", type=click.FloatRange(min=0, min_open=True), default=1.0,
              callback=lambda _c, _p, v: _finite("--scale", v),
              help="Factor to metres (0.001 for a mesh in millimetres).")
@click.option("--density", type=click.FloatRange(0.99, 1.05), default=1.025,
              help="Water density for the tables made from these offsets, t/m³.")
@click.option("--vessel", "head", type=click.Path(path_type=Path), default=None,
              help="Write this vessel file with the offsets as its hull: block.")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def hull_from_mesh(mesh: Path, output: Path, stations: int | None, scale: float,
                   density: float, head: Path | None, force: bool) -> None:
    """Hull offsets by slicing a closed hull mesh (STL or OBJ)."""
    from reportgen.files import check_output, read_input, write_atomic
    from reportgen.hull.mesh import load_mesh, mesh_stations

    kind = MESH_TYPES.get(mesh.suffix.lower())
    if kind is None:
        raise InputError(f"{mesh}: expected an .stl or .obj mesh file")
    raw = read_input(mesh, "hull mesh")
    head_text = None
    if head is not None:
        from reportgen.inputs.yamlread import decode

        head_text = decode(read_input(head, "vessel data file"), str(head))
    check_output(output, force)
    try:
        with progress("reading the mesh", None):
            m = load_mesh(raw, kind, scale)
        with progress("slicing the mesh", stations) as step:
            made = mesh_stations(m, stations, progress=step)
    except ValueError as exc:
        raise InputError(f"{mesh}: {exc}") from None
    x0, x1, _, y1, z0, z1 = made.extents_m
    if abs(z0) > 0.01:
        made.warnings.append(f"the lowest point of the mesh is at z = {z0:.3f} m; offsets keep "
                             f"the mesh's z, which must be measured from the moulded baseline")
    text = _hull_text(mesh.name, hashlib.sha256(raw).hexdigest(), made, density)
    if head_text is not None:
        text = _with_hull(head_text, text, head, output)
    write_atomic(output, text.encode("utf-8"), force=force)
    for w in made.warnings:
        click.echo(f"reportgen: warning: {printable_lines(w)}", err=True)
    click.echo(f"{output}: {len(made.stations)} stations from x {x0:.3f} to {x1:.3f} m; breadth "
               f"{2 * y1:.3f} m, z {z0:.3f} to {z1:.3f} m; mesh volume "
               f"{made.mesh_volume_m3:.3f} m³, the offsets {made.offsets_volume_m3:.3f} m³",
               err=True)


def _finite(option: str, value: float) -> float:
    """`value` when it is a finite number; click's ranges let NaN and infinity through."""
    import math

    if not math.isfinite(value):
        raise click.BadParameter(f"{value!r}: expected a finite number", param_hint=option)
    return value


def _with_hull(head_text: str, hull_text: str, head: Path, output: Path) -> str:
    """The vessel file `head_text` with its top-level hull: block (and the comment lines this
    command wrote above it) replaced by `hull_text`, or `hull_text` appended; checked as a
    vessel file."""
    from reportgen.hull.tables import _block_spans
    from reportgen.inputs import parse_vessel

    lines = head_text.splitlines(keepends=True)
    spans = _block_spans(lines)
    if "hull" in spans:
        start, end = spans["hull"]
        while start > 0 and lines[start - 1].startswith(_GENERATED):
            start -= 1
        text = "".join(lines[:start]) + hull_text + "".join(lines[end:])
    else:
        sep = "" if head_text.endswith("\n") or not head_text else "\n"
        text = head_text + sep + hull_text
    parse_vessel(text.encode("utf-8"), f"{head} (with the offsets added)")
    return text


def _hull_text(name: str, sha256: str, made, density: float) -> str:
    from reportgen.yamltext import flow, number

    off = 100.0 * (made.offsets_volume_m3 / made.mesh_volume_m3 - 1.0)
    lines = [
        f"# Hull offsets made by `reportgen hull-from-mesh` from {json.dumps(name)}",
        (f"# (SHA-256 {sha256}): {len(made.stations)} stations; the mesh encloses "
         f"{made.mesh_volume_m3:.3f} m³,"),
        (f"# the offsets (closed straight across the deck) {made.offsets_volume_m3:.3f} m³ "
         f"({off:+.3f} %)."),
        *[f"# warning: {json.dumps(w, ensure_ascii=False)[1:-1]}" for w in made.warnings],
        "hull:",
        f"  density: {number(density)}",
        "  stations:",
    ]
    for x, pts in made.stations:
        lines += [f"    - x: {number(x)}",
                  "      points: [" + ", ".join(flow(p, 4) for p in pts) + "]"]
    return "\n".join(lines) + "\n"


@main.command("import", epilog="""\b
Examples:
  reportgen import hydrostatics booklet-hydrostatics.csv >> ship.yaml
  reportgen import cross-curves kn.csv --trim free -o kn.yaml
  reportgen import tank wb1p.csv
  reportgen import offsets offsets.csv -o hull.yaml
\b
Header row of key names, a unit allowed in brackets: draft (m), displacement (t), ...
Cross curves: the first header cell 'displacement', then the heels (deg); one row per
displacement. Offsets: columns x, y, z, each station's rows together, keel to deck edge.
Tables at several trims: a trim column (for cross curves the first), rows of a trim together.
Exit status: 0 printed or written; 2 bad input (the line and column named).""")
@click.argument("kind", type=click.Choice(["hydrostatics", "cross-curves", "tank", "offsets"]))
@click.argument("csv_file", metavar="FILE.csv", type=click.Path(path_type=Path))
@click.option("--trim", type=click.Choice(["free", "even_keel", "fixed"]), default=None,
              help="Cross curves: how the table was made (stated on every sheet; default "
                   "free, said in the block).")
@click.option("--density", type=click.FloatRange(0.99, 1.05), default=1.025,
              help="Hydrostatics and offsets: the water density of the table, t/m³.")
@click.option("-o", "--output", type=OutputFile(), default=None,
              help="Write the YAML block to this file instead of printing it.")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def import_table(kind: str, csv_file: Path, trim: str | None, density: float,
                 output: Path | None, force: bool) -> None:
    """The vessel file's YAML block of a table, from a spreadsheet export (CSV)."""
    from reportgen.files import check_output, read_input, write_atomic
    from reportgen.inputs.csvtables import TableError, block
    from reportgen.inputs.yamlread import decode

    raw = read_input(csv_file, "CSV table", max_bytes=CSV_MAX_BYTES)
    if output is not None:
        check_output(output, force)
    try:
        text = block(kind, decode(raw, str(csv_file)), density=density, trim=trim)
    except TableError as exc:
        raise InputError(f"{csv_file}: {exc}") from None
    _validate_block(kind, text, csv_file)
    if kind == "cross-curves" and trim is None:
        click.echo("reportgen: note: cross curves taken as made free to trim (trim: free); "
                   "give --trim even_keel or --trim fixed if the booklet's table is otherwise",
                   err=True)
    if output is None:
        click.echo(text, nl=False)
    else:
        write_atomic(output, text.encode("utf-8"), force=force)
        click.echo(f"{output}: {kind} block written", err=True)


def _validate_block(kind: str, text: str, source: Path) -> None:
    """The block checked by the vessel file's own model (the same rules as a vessel file)."""
    import yaml
    from pydantic import ValidationError

    from reportgen.inputs import vessel as vm

    model = {"hydrostatics": vm.Hydrostatics, "cross-curves": vm.CrossCurves,
             "tank": vm.TankTable, "offsets": vm.HullOffsets}[kind]
    data = next(iter(yaml.safe_load(text).values()))
    try:
        model.model_validate(data)
    except ValidationError as exc:
        err = exc.errors(include_url=False)[0]
        where = ".".join(str(p) for p in err["loc"])
        raise InputError(f"{source}: {where}: {err['msg'].removeprefix('Value error, ')}"
                         ) from None


@main.command(epilog="""\b
Examples:
  reportgen show conditions/vessels/linnet-demo.yaml
  reportgen show ship.yaml --json
\b
Exit status: 0 shown; 2 bad input.""")
@click.argument("vessel", type=click.Path(path_type=Path))
@click.option("--json", "as_json", is_flag=True, help="Print the same as a JSON document.")
def show(vessel: Path, as_json: bool) -> None:
    """A vessel's tanks, holds, openings, criteria and the ranges of its tables."""
    from reportgen.files import read_input
    from reportgen.inputs import parse_vessel
    from reportgen.showtext import render_show
    from reportgen.vesselinfo import summary

    raw = read_input(vessel, "vessel data file")
    data = summary(parse_vessel(raw, str(vessel)), hashlib.sha256(raw).hexdigest())
    if as_json:
        click.echo(json.dumps(data, indent=2, ensure_ascii=False))
    else:
        click.echo(render_show(data), nl=False)


@main.command(epilog="""\b
Examples:
  reportgen new conditions/vessels/linnet-demo.yaml -o conditions/my-departure.yaml
\b
Exit status: 0 written; 2 bad input (nothing written).""")
@click.argument("vessel", type=click.Path(path_type=Path))
@click.option("-o", "--output", required=True, type=OutputFile(),
              help="The condition file to write.")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def new(vessel: Path, output: Path, force: bool) -> None:
    """A condition file to start from: every tank at zero, no items."""
    from reportgen.files import check_output, write_atomic
    from reportgen.inputs import load_vessel
    from reportgen.newcondition import SCHEMA_FILE, condition_text

    model = load_vessel(vessel)
    check_output(output, force)
    here = output.resolve().parent
    ref = Path(os.path.relpath(vessel.resolve(), here)).as_posix()
    # The editor's schema: the repository's copy in docs/schema when reportgen runs from a
    # checkout, else a file of that name beside the condition (`reportgen schema condition`).
    docs = Path(__file__).resolve().parents[2] / "docs" / "schema" / SCHEMA_FILE
    schema_ref = Path(os.path.relpath(docs, here)).as_posix() if docs.is_file() else SCHEMA_FILE
    write_atomic(output, condition_text(model, ref, schema_ref).encode("utf-8"), force=force)
    tanks = f"{len(model.tanks)} tanks at zero" if model.tanks else "no tanks (it has none)"
    click.echo(f"{output}: a condition for {model.vessel.name} with {tanks} and no items",
               err=True)
    untabled = [t.id for t in model.tanks if t.table is None]
    if untabled:
        click.echo(f"reportgen: note: tanks {', '.join(untabled)} have no table yet: make the "
                   f"vessel's tables with 'reportgen tables' before checking", err=True)
