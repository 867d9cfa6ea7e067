"""The vessel file's `tanks:` block with the tables made from each tank's geometry.

Only a file with at least one tank given by `geometry` is changed: its `tanks:` block is
written anew (every tank in its order, keys in the SPEC order; comments inside that block are
not kept), every other line of the file stays as it was. Tanks given by a table alone keep
their numbers exactly (shortest round-trip decimals).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from typing import Any

import numpy as np

from reportgen.hull.sections import Hull
from reportgen.hull.tables import _block_spans
from reportgen.hull.tanks import COLUMNS, DECIMALS, box_of, geometry_tank_table
from reportgen.yamltext import flow, number, text_value

GENERATED_COMMENT = ("# Tank tables of tanks given by geometry made by `reportgen tables` "
                     "(the box clipped by the hull offsets).")


def tank_lines(tank: Any, table: dict[str, Sequence[float]], decimals: int | None) -> list[str]:
    """The lines of one tank entry of the `tanks:` list (indented for it)."""
    out = [f"  - id: {text_value(tank.id)}", f"    name: {text_value(tank.name)}",
           f"    content: {text_value(tank.content)}"]
    if tank.role is not None:
        out.append(f"    role: {tank.role}")
    if tank.pair is not None:
        out.append(f"    pair: {text_value(tank.pair)}")
    out.append(f"    density: {number(tank.density)}")
    if tank.geometry is not None:
        g = tank.geometry
        out.append(f"    geometry: {{x: {flow(g.x)}, y: {flow(g.y)}, z: {flow(g.z)}}}")
    out.append("    table:")
    out += [f"      {k}: {flow(table[k], decimals)}" for k in COLUMNS]
    if tank.ullage_reference is not None:
        out.append(f"    ullage_reference: {number(tank.ullage_reference)}")
    return out


def tank_tables(vessel: Any, hull: Hull, progress: Callable[[], None] | None = None
                ) -> dict[str, dict[str, np.ndarray]]:
    """The table of every tank of `vessel` given by geometry, by tank id. ValueError naming the
    tank when its box does not cut the hull."""
    out: dict[str, dict[str, np.ndarray]] = {}
    for tank in vessel.tanks:
        if tank.geometry is None:
            continue
        try:
            out[tank.id] = geometry_tank_table(hull, box_of(tank.geometry))
        except ValueError:
            g = tank.geometry
            raise ValueError(
                f"tanks: {tank.id}: geometry: the box x {g.x[0]:g} to {g.x[1]:g} m, y {g.y[0]:g} "
                f"to {g.y[1]:g} m, z {g.z[0]:g} to {g.z[1]:g} m holds no part of the hull (its "
                f"stations run from x {hull.x_m[0]:g} to {hull.x_m[-1]:g} m)") from None
        if progress is not None:
            progress()
    return out


def tanks_block(vessel: Any, made: dict[str, dict[str, np.ndarray]]) -> str:
    """The whole `tanks:` block: tables of `made` for the tanks given by geometry, the others'
    tables as they are."""
    lines = [GENERATED_COMMENT, "tanks:"]
    for tank in vessel.tanks:
        if tank.id in made:
            lines += tank_lines(tank, made[tank.id], DECIMALS)
        else:
            t = tank.table
            lines += tank_lines(tank, {k: getattr(t, k) for k in COLUMNS}, None)
    return "\n".join(lines) + "\n"


def text_with_tanks(original_text: str, block: str) -> str:
    """`original_text` with its top-level `tanks:` block (and a GENERATED_COMMENT line just
    before it) replaced by `block`; appended at the end when there is none."""
    lines = original_text.splitlines(keepends=True)
    spans = _block_spans(lines)
    if "tanks" not in spans:
        text = original_text if original_text.endswith("\n") or not original_text else \
            original_text + "\n"
        return text + "\n" + block
    start, end = spans["tanks"]
    while start > 0 and lines[start - 1].rstrip("\r\n") == GENERATED_COMMENT:
        start -= 1
    return "".join(lines[:start]) + block + "".join(lines[end:])
