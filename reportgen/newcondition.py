"""A condition file to start from (`reportgen new`): every tank of the vessel at zero with its
capacity beside it, the lightship as the vessel file gives it, an empty list of items with one
example, and the editor's schema line (SPEC.md, "Setting up a ship").
"""

from __future__ import annotations

import re
from typing import Any

from reportgen.yamltext import number, text_value

SCHEMA_FILE = "condition.schema.json"  # `reportgen schema condition`; docs/schema/ has a copy
_CONTROL = re.compile(r"[\x00-\x1f\x7f-\x9f]")


def _comment(text: str) -> str:
    """Text safe inside a YAML comment: control characters (line breaks too) as spaces."""
    return _CONTROL.sub(" ", str(text))


def _tank_line(tank: Any) -> str:
    table = tank.table
    if table is None:
        size = "capacity not yet computed (geometry: run reportgen tables)"
    else:
        cap = float(table.volume[-1])
        size = (f"capacity {cap:.1f} m³ = {cap * tank.density:.1f} t at {tank.density:g} t/m³"
                f", sounding to {float(table.sounding[-1]):.2f} m")
    return (f"  {text_value(tank.id)}: {{percent: 0}}    # {_comment(tank.name)} "
            f"({_comment(tank.content)}, {tank.fs_role}); {size}")


def condition_text(vessel: Any, vessel_ref: str, schema_ref: str = SCHEMA_FILE) -> str:
    """The text of a new condition file for `vessel`, naming it by `vessel_ref` (the path of
    the vessel file relative to the condition file) and the JSON Schema for an editor by
    `schema_ref` (likewise)."""
    ls = vessel.lightship
    lines = [
        f"# yaml-language-server: $schema={schema_ref}",
        "format: reportgen/condition-1",
        f"vessel: {text_value(vessel_ref)}",
        "condition:",
        "  title: New condition            # say what it is: departure, arrival, ...",
        "  # voyage: From ... to ...",
        "  # date: YYYY-MM-DD",
        "  water_density: 1.025            # t/m³, of the water the ship floats in",
        (f"# Lightship (from the vessel file {_comment(vessel_ref)}): "
         f"{number(ls.mass, 1)} t, LCG {number(ls.lcg, 2)} m, VCG {number(ls.vcg, 2)} m, "
         f"TCG {number(ls.tcg, 2)} m"),
        "# Tanks: one of percent | volume (m³) | sounding (m) | ullage (m) | mass (t) each;",
        "# an optional density (t/m³) replaces the tank's.",
    ]
    if vessel.tanks:
        lines.append("tanks:")
        lines += [_tank_line(t) for t in vessel.tanks]
    else:
        lines.append("tanks: {}                        # this vessel has no tanks")
    holds = getattr(getattr(vessel, "grain", None), "compartments", None) or []
    if holds:
        lines.append("# Grain in bulk (International Grain Code), when carried: uncomment and fill in;")
        lines.append("# a hold is filled (trimmed | untrimmed) or partly filled by volume (m³) or mass (t).")
        lines.append("# grain:")
        lines.append("#   stowage_factor: 1.30          # m³/t")
        lines.append("#   compartments:")
        lines += [f"#     {text_value(h.id)}: {{filled: trimmed}}    # {_comment(h.name)}: "
                  f"{h.filled.volume:.1f} m³ filled" for h in holds]
    lines += [
        "# Items: cargo, stores, crew, deck cargo; masses t, centres m (lcg from AP, vcg above",
        "# base, tcg + starboard); deck cargo adds its windage with wind_area (m²) and wind_z.",
        "items: []",
        "#  - {name: Stores, mass: 12.0, lcg: 10.0, vcg: 9.0, tcg: 0.0}",
        "free_surface: code                # code | actual | maximum (IS Code 2008 Part B 3.1)",
        "# signatories: {prepared_by: ..., checked_by: ...}",
    ]
    return "\n".join(lines) + "\n"
