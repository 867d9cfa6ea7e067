"""Commands of the limits: limits (the vessel's limiting KG curve) and room (mass still to go)."""

from __future__ import annotations

import math
import re
import sys
from pathlib import Path

import click

from reportgen.cli.group import OutputFile, main, progress
from reportgen.errors import InputError


@main.command(epilog="""\b
Examples:
  reportgen limits conditions/vessels/linnet-demo.yaml
  reportgen limits conditions/vessels/linnet-demo.yaml --trim 1.0 --json > limits.json
  reportgen limits conditions/vessels/linnet-demo.yaml -o out/limits.pdf
\b
With -o, the vessel's approval VESSEL.yaml.p7s, when it lies beside the vessel file, is
embedded and the document prints who approved the data (as a sheet does).
\b
Exit status: 0 the limits were found (and written); 2 bad input (nothing is written).""")
@click.argument("vessel", type=click.Path(path_type=Path))
@click.option("--trim", "trim", type=float, default=0.0, show_default=True,
              help="Upright trim of the curve, m, + by the stern.")
@click.option("--json", "as_json", is_flag=True, help="Print the limits document (JSON).")
@click.option("-o", "--output", "output", type=OutputFile(),
              help="Write the limits document as a PDF/A-3 file.")
@click.option("--booklet-block", "booklet", is_flag=True,
              help="Print the curve as a limiting_kg block for a vessel file (booklet.limits).")
@click.option("--force", is_flag=True, help="Replace an existing file.")
def limits(vessel: Path, trim: float, as_json: bool, output: Path | None, booklet: bool,
           force: bool) -> None:
    """The limiting KG / minimum GM curve of a vessel for its criteria."""
    from reportgen.files import check_output, read_input
    from reportgen.inputs.case import parse_vessel
    from reportgen.limitcurve import displacements, limiting_curve, to_json
    from reportgen.vesseldata import vessel_data

    raw = read_input(vessel, "vessel data file")
    model = parse_vessel(raw, str(vessel))
    approval = None
    if output is not None:
        check_output(output, force)
        approval = _approval_beside(vessel, raw)
    count = len(displacements(vessel_data(model))) if model.has_tables else None
    with progress("limits", count) as advance:
        doc = limiting_curve(model, raw, vessel.name, trim, advance)
    if output is not None:
        from reportgen.report.limitsdoc import write_limits

        write_limits(raw, doc, output, force=force, vessel_sets=list(model.criteria),
                     approval=approval)
        click.echo(f"{output}: limits document written", err=True)
    if as_json:
        click.echo(to_json(doc), nl=False)
    elif booklet:
        from reportgen.limitcurve import booklet_block

        click.echo(booklet_block(doc), nl=False)
    elif output is None:
        from reportgen.limitsummary import render_limits

        click.echo(render_limits(doc))
    sys.exit(0)


def _approval_beside(vessel: Path, raw: bytes) -> bytes | None:
    """VESSEL.yaml.p7s beside the vessel file (SPEC "Verification": the document embeds it and
    prints who approved the data), checked against the vessel bytes now; None without one."""
    from reportgen.inputs.case import approval_beside
    from reportgen.report.render import approval_described

    p7s = approval_beside(vessel)
    approval_described(p7s, raw, vessel.name)  # refused here, before the curve is computed
    return p7s


_DECIMAL = re.compile(r"[-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?")


def _plain(text: str) -> float | None:
    """A plain decimal number (ASCII digits, a point, an exponent), finite; None otherwise:
    float() would also take NaN, infinity, digit grouping ("0_5" as 5) and other scripts'
    digits."""
    text = text.strip()
    value = float(text) if _DECIMAL.fullmatch(text) else None
    return value if value is not None and math.isfinite(value) else None


def _point(at: str) -> tuple[float, float]:
    """X, Z of `--at X,Z`: two plain decimal numbers of metres."""
    values = [_plain(p) for p in at.split(",")]
    if len(values) != 2 or None in values:
        raise InputError(f"--at {at!r}: expected X,Z, two finite numbers of metres, "
                         f"e.g. --at 48.0,9.5")
    return values[0], values[1]


def _tcg(text: str) -> float:
    """Y of `--tcg Y`: one plain decimal number of metres."""
    value = _plain(text)
    if value is None:
        raise InputError(f"--tcg {text!r}: expected one finite number of metres, e.g. --tcg 2.0")
    return value


@main.command(epilog="""\b
Examples:
  reportgen room conditions/full-load-departure.yaml --at 48.0,9.5
  reportgen room conditions/deck-cargo-departure.yaml --at 40,11 --tcg 2.0 --json
\b
Exit status: 0 some mass can be added; 1 none can; 2 bad input.""")
@click.argument("condition", type=click.Path(path_type=Path))
@click.option("--at", "at", required=True, help="X,Z of the added mass: m from AP, m above base.")
@click.option("--tcg", "tcg", default="0.0", show_default=True,
              help="Y of the added mass, m, + starboard.")
@click.option("--json", "as_json", is_flag=True, help="Print the answer as JSON.")
def room(condition: Path, at: str, tcg: str, as_json: bool) -> None:
    """The most mass that can still be added at a point."""
    import json

    from reportgen.inputs import load_case
    from reportgen.room import room_at, room_text

    x, z = _point(at)
    y = _tcg(tcg)
    case = load_case(condition)
    with progress("room", None) as advance:
        answer = room_at(case, x, y, z, advance)
    if as_json:
        click.echo(json.dumps(answer, indent=2, ensure_ascii=False))
    else:
        click.echo(room_text(answer))
    sys.exit(0 if answer["mass"] > 0 else 1)
