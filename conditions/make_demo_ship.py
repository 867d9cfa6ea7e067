"""Write the invented demo ship's vessel file (hull offsets, tanks, windage, openings).

Run:  .venv/bin/python conditions/make_demo_ship.py

Writes conditions/vessels/linnet-demo-hull.yaml: a `reportgen/vessel-1` file with hull
offsets but without hydrostatics or cross curves; `reportgen tables` makes those into
conditions/vessels/linnet-demo.yaml. Everything here is invented: the ship, its owner,
its identifier and every number. The output is deterministic (fixed decimals, fixed order).

The hull form (main dimensions and offsets) is conditions/demo_ship_form.py; this file adds
the tanks, holds, windage, openings and the rest of the vessel file.
"""

from __future__ import annotations

import sys
from dataclasses import dataclass
from pathlib import Path

import numpy as np
from shapely import union_all
from shapely.geometry import Polygon
from shapely.geometry.polygon import orient

ROOT = Path(__file__).resolve().parent.parent
for _folder in (ROOT, ROOT / "conditions"):  # reportgen, and the hull form beside this file
    if str(_folder) not in sys.path:
        sys.path.insert(0, str(_folder))

from demo_ship_form import (  # the folder is put on the path above
    BILGE_KEEL_AREA,
    BREADTH,
    DEPTH,
    KEEL_THICKNESS,
    LPP,
    STEM_END_X,
    SUMMER_DRAFT,
    TRANSOM_EDGE_Z,
    TRANSOM_X,
    deck_z,
    stations,
    stem_x,
    stern_x,
)

from reportgen.files import write_atomic
from reportgen.hull.compartments import (
    TankBox,
    sounding_grid,
    tank_depth,
    tank_table,
)
from reportgen.hull.grainholds import hold_grain, void_depth_m
from reportgen.hull.sections import Hull, hull_from_stations
from reportgen.yamltext import flow, number, pairs

SHIP_SLUG = "linnet-demo"
OUT_PATH = ROOT / "conditions" / "vessels" / f"{SHIP_SLUG}-hull.yaml"


LIGHTSHIP = {"mass": 2400.0, "lcg": 44.00, "vcg": 6.30, "tcg": 0.0}
DB_HEIGHT = 1.2  # double bottom (tank top) above base
WING_INNER_Y = 6.6  # inboard side of the wing tanks, m from centreline
ER_AFT, ER_FORE = 5.0, 18.0  # engine room bulkheads
HOLD_1 = (18.0, 53.0)  # hold bulkheads, x from AP
HOLD_2 = (53.0, 90.5)
COLLISION_BHD = 90.5
DRAUGHT_MARKS = {"aft": 2.5, "mid": 48.5, "fore": 95.0}  # x of the marks, m from AP
# Grain (International Grain Code, Part B; reportgen.hull.grainholds): invented hatchways 9 m
# wide; Vd1 = 430 mm for a boundary distance of 5.0 m (table B 1-1) with girders 600 mm deep.
GRAIN_HATCH_HALF = 4.5
GRAIN_VD1_MM, GRAIN_GIRDER_MM = 430.0, 600.0
GRAIN_STEP = 0.5  # m of grain depth between the rows of the partly-filled tables


# --- compartments ---------------------------------------------------------------------------


@dataclass(frozen=True)
class TankDef:
    id: str
    name: str
    content: str
    density: float  # t/m³
    box: TankBox
    pair: str | None = None  # id of the transverse twin (IS Code 2008 Part B 3.1.4)


def _pair(tid: str, name: str, content: str, density: float, x0: float, x1: float,
          y_in: float, z0: float, z1: float) -> list[TankDef]:
    return [
        TankDef(f"{tid}P", f"{name} (P)", content, density,
                TankBox(x0, x1, -20.0, -y_in, z0, z1), pair=f"{tid}S"),
        TankDef(f"{tid}S", f"{name} (S)", content, density,
                TankBox(x0, x1, y_in, 20.0, z0, z1), pair=f"{tid}P"),
    ]


def tank_defs() -> list[TankDef]:
    wb, fo, fw = 1.025, 0.94, 1.000
    return [
        TankDef("APT", "Aft peak", "ballast", wb, TankBox(-3.0, ER_AFT, -20.0, 20.0, 0.0, 6.6)),
        *_pair("FW", "Fresh water", "fresh water", fw, ER_AFT, 10.0, 1.0, 2.0, 7.0),
        *_pair("FO", "Fuel oil", "fuel oil", fo, 10.0, ER_FORE, 2.5, DB_HEIGHT, 7.0),
        *_pair("DB3", "No.3 double bottom", "ballast", wb, HOLD_1[0], 45.0, 0.0, 0.0,
               DB_HEIGHT),
        *_pair("DB2", "No.2 double bottom", "ballast", wb, 45.0, 70.0, 0.0, 0.0, DB_HEIGHT),
        *_pair("DB1", "No.1 double bottom", "ballast", wb, 70.0, COLLISION_BHD, 0.0, 0.0,
               DB_HEIGHT),
        *_pair("WT2", "No.2 wing tank", "ballast", wb, HOLD_1[0], HOLD_1[1], WING_INNER_Y,
               DB_HEIGHT, DEPTH),
        *_pair("WT1", "No.1 wing tank", "ballast", wb, HOLD_2[0], 80.0, WING_INNER_Y,
               DB_HEIGHT, DEPTH),
        TankDef("FPT", "Fore peak", "ballast", wb,
                TankBox(COLLISION_BHD, 100.0, -20.0, 20.0, 0.0, 7.6)),
    ]


HOLDS = [
    ("Hold 1", TankBox(HOLD_1[0], HOLD_1[1], -WING_INNER_Y, WING_INNER_Y, DB_HEIGHT, 12.0)),
    ("Hold 2", TankBox(HOLD_2[0], HOLD_2[1], -WING_INNER_Y, WING_INNER_Y, DB_HEIGHT, 12.0)),
]


# --- windage and openings -------------------------------------------------------------------


def windage_polygon() -> Polygon:
    """Lateral projection: hull to the deck at side, hatch coamings, deckhouse, funnel."""
    zs = np.linspace(0.0, TRANSOM_EDGE_Z, 12)
    stern = [(stern_x(z), z) for z in zs]
    deck = [(x, deck_z(x)) for x in np.linspace(TRANSOM_X, STEM_END_X, 40)]
    zs_f = np.linspace(deck_z(STEM_END_X), 0.0, 16)
    stem = [(stem_x(z), z) for z in zs_f]
    hull = Polygon([*stern, *deck, *stem])
    coaming = 1.6
    parts = [
        hull,
        Polygon([(20.0, 7.5), (51.0, 7.5), (51.0, DEPTH + coaming), (20.0, DEPTH + coaming)]),
        Polygon([(55.0, 7.5), (86.0, 7.5), (86.0, deck_z(86.0) + coaming),
                 (55.0, deck_z(55.0) + coaming)]),
        Polygon([(0.5, 7.5), (15.5, 7.5), (15.5, 16.1), (0.5, 16.1)]),  # poop + 2 tiers
        Polygon([(6.0, 16.0), (15.5, 16.0), (15.5, 18.8), (6.0, 18.8)]),  # wheelhouse
        Polygon([(2.0, 16.0), (5.6, 16.0), (5.0, 21.0), (2.4, 21.0)]),  # funnel
    ]
    return orient(union_all(parts).simplify(0.0005), sign=1.0)


OPENINGS = [
    ("Engine room ventilator (S)", 12.5, 5.0, 11.6),
    ("Engine room ventilator (P)", 12.5, -5.0, 11.6),
    ("Engine room air intake (S)", 8.0, 6.2, 13.9),
    ("Engine room air intake (P)", 8.0, -6.2, 13.9),
]


# --- output ---------------------------------------------------------------------------------





def _printable_rows(volume_m3: np.ndarray, nd: int) -> np.ndarray:
    """Rows whose volumes stay strictly increasing once printed with nd decimals."""
    printed = np.round(volume_m3, nd)
    keep = [0]
    for i in range(1, len(printed)):
        if printed[i] > printed[keep[-1]]:
            keep.append(i)
    if keep[-1] != len(printed) - 1:
        keep[-1] = len(printed) - 1  # the full row always stays
    return np.array(keep)


def demo_tank_table(t: TankDef, hull: Hull) -> dict[str, np.ndarray]:
    """The table printed for tank t: every 0.2 m of sounding (0.1 m in tanks under 2 m deep),
    keeping the rows that print distinctly."""
    z_low, z_high = tank_depth(hull, t.box)
    step = 0.1 if z_high - z_low < 2.0 else 0.2
    tab = tank_table(hull, t.box, sounding_grid(hull, t.box, step_m=step))
    rows = _printable_rows(tab["volume"], 3)
    return {k: v[rows] for k, v in tab.items()}


def _tank_lines(t: TankDef, hull: Hull) -> list[str]:
    tab = demo_tank_table(t, hull)
    return [
        f"  - id: {t.id}",
        f"    name: {t.name}",
        f"    content: {t.content}",
        *([f"    pair: {t.pair}"] if t.pair else []),
        f"    density: {number(t.density, 3)}",
        "    table:",
        f"      sounding: {flow(tab['sounding'], 3)}",
        f"      volume: {flow(tab['volume'], 3)}",
        f"      lcg: {flow(tab['lcg'], 3)}",
        f"      vcg: {flow(tab['vcg'], 3)}",
        f"      tcg: {flow(tab['tcg'], 3)}",
        f"      fsi: {flow(tab['fsi'], 2)}",
    ]


def _box_note(box: TankBox) -> str:
    return (f"x {number(box.x_aft, 2)}..{number(box.x_fore, 2)}, y {number(box.y_min, 2)}..{number(box.y_max, 2)},"
            f" z {number(box.z_min, 2)}..{number(box.z_max, 2)} (m; inside the hull)")


def _grain_lines(hull: Hull) -> list[str]:
    """The `grain:` block: each hold's filled and partly-filled data (reportgen.hull.grainholds
    states the Grain Code assumptions)."""
    lines = ["grain:", "  compartments:"]
    for k, (name, box) in enumerate(HOLDS, start=1):
        g = hold_grain(hull, box, sounding_grid(hull, box, step_m=GRAIN_STEP),
                       void_depth_m(GRAIN_VD1_MM, GRAIN_GIRDER_MM), GRAIN_HATCH_HALF)
        f, p = g["filled"], g["partly"]
        rows = _printable_rows(p["volume"], 1)
        lines += [
            f"    - id: H{k}",
            f"      name: {name}",
            (f"      filled: {{volume: {number(f['volume'], 1)}, lcg: {number(f['lcg'], 3)}, "
             f"vcg: {number(f['vcg'], 3)}, vhm: {number(f['vhm'], 1)}}}"),
            f"      filled_untrimmed_vhm: {number(g['untrimmed_vhm'], 1)}",
            "      partly:",
            *[f"        {key}: {flow(p[key][rows], nd)}"
              for key, nd in (("volume", 1), ("lcg", 3), ("vcg", 3), ("vhm", 1))],
        ]
    return lines


# The demo ship's limiting KG curve (IS Code 2008 Part A 2.2 and 2.3), as printed by
# `reportgen limits conditions/vessels/linnet-demo.yaml --booklet-block` on the tables made
# from these offsets at trims -3..4 m; held as the booklet's curve (criteria set booklet.limits).
LIMITING_KG_LINES = [
    'limiting_kg:',
    '  source: "reportgen limits, upright at trim 0"',
    '  displacement: [2056.872, 2374.78, 2692.689, 3010.597, 3328.505, 3646.414, 3964.322, 4282.23, 4600.139, 4918.047, 5235.955, 5553.863, 5871.772, 6189.68, 6507.588, 6825.497, 7143.405, 7461.313, 7779.222, 8097.13]',
    '  kg: [6.186345, 6.607913, 6.936296, 7.04852, 6.945358, 6.716665, 6.522034, 6.368643, 6.254371, 6.171145, 6.107866, 6.049196, 5.998216, 5.915954, 5.776791, 5.461092, 5.200233, 4.963973, 4.757504, 4.602243]',
]


def vessel_text() -> str:
    """The whole -hull.yaml vessel file as text (deterministic)."""
    st = stations()
    hull = hull_from_stations([(x, np.array(p, dtype=float)) for x, p in st])
    lines = [
        "format: reportgen/vessel-1",
        "# Invented demo ship: generated by conditions/make_demo_ship.py; do not edit by hand.",
        "vessel: {name: Linnet Demo, identifier: RG-DEMO-01, type: general cargo}",
        "source:",
        "  tables: made by `reportgen tables` from the invented hull offsets of this file",
        "  lightship: invented for the demo (no inclining experiment)",
        "  tanks: sounding tables computed from the tank boundaries inside the hull offsets "
        + "by conditions/make_demo_ship.py",
        "  grain: hold volumes, centres and volumetric heeling moments computed from the hold "
        + "boundaries inside the hull offsets by the International Grain Code's assumptions "
        + "(Part B) by conditions/make_demo_ship.py",
        "  limiting_kg: the limiting KG curve made by `reportgen limits` from this file's "
        + "tables (general and weather criteria, upright at trim 0)",
        "particulars:",
        f"  length_bp: {number(LPP, 2)}",
        f"  breadth: {number(BREADTH, 2)}",
        f"  depth: {number(DEPTH, 2)}",
        f"  summer_draft: {number(SUMMER_DRAFT, 3)}",
        f"  keel_thickness: {number(KEEL_THICKNESS, 3)}",
        "  bilge: round",
        f"  bilge_keel_area: {number(BILGE_KEEL_AREA, 1)}",
        "lightship: {" + ", ".join(f"{k}: {number(v, 2)}" for k, v in LIGHTSHIP.items()) + "}",
        "openings:",
        *[f"  - {{name: {n}, x: {number(x, 2)}, y: {number(y, 2)}, z: {number(z, 2)}}}"
          for n, x, y, z in OPENINGS],
        "windage:",
        "  profile: " + pairs(
            [(round(x, 3), round(z, 3)) for x, z in windage_polygon().exterior.coords[:-1]], 3),
        "tanks:",
    ]
    for t in tank_defs():
        lines += _tank_lines(t, hull)
    lines += [
        "criteria: [is2008.general, is2008.weather, booklet.limits]",
        "permitted_criteria: [is2008.timber, grain.2008]",
        *LIMITING_KG_LINES,
        "icing: {deck_area: 1350.0, deck_lcg: 47.0, deck_vcg: 9.6}  "
        + "# exposed decks, hatch covers and house tops (invented)",
        "calculation: {method: tables, wind_lever: half_draft, full_percent: 98.0, "
        + "gz_beyond_flooding: exclude}",
        "draught_marks: {" + ", ".join(f"{k}: {number(v, 2)}" for k, v in DRAUGHT_MARKS.items())
        + "}",
        *_grain_lines(hull),
        "hull:",
        "  density: 1.025",
        "  stations:",
    ]
    for x, pts in st:
        lines += [f"    - x: {number(x, 4)}", f"      points: {pairs(pts, 3)}"]
    lines += [
        "notes:",
        "  owner: Harrowgate Coastal Carriers (invented; no such company)",
        "  description: >-",
        "    Invented single-deck general cargo ship for the reportgen demonstration;",
        "    not a real ship. Two box holds above a double bottom, wing ballast tanks,",
        "    engine room and deckhouse aft. Identifier RG-DEMO-01 is made up.",
        "  holds:",
        *[f"    - {name}: {_box_note(box)}" for name, box in HOLDS],
        "  engine_room: " + f"x {number(ER_AFT, 2)}..{number(ER_FORE, 2)} (m)",
        "  tank_boxes:",
        *[f"    {t.id}: {_box_note(t.box)}" for t in tank_defs()],
    ]
    return "\n".join(lines) + "\n"


def write(path: Path = OUT_PATH) -> Path:
    """Write the vessel file to `path` (atomically; an existing file is replaced)."""
    write_atomic(path, vessel_text().encode("utf-8"), force=True)
    return path


if __name__ == "__main__":
    print(write())
