"""Impossible conditions and tables are refused, and deck cargo without windage is named
(SPEC.md "Conventions"; each case one an adversarial review found printed as PASS).

The bounds are physical facts: a centre of mass lies inside the ship; a ship afloat upright
has its keel under water and its deck edge above it at both perpendiculars; a hull holds no
more water than its bounding box (block coefficient ≤ 1, definition of CB); KN is a distance
inside the hull's section.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import numpy as np
import pytest
import yaml
from click.testing import CliRunner
from conftest import PASSING, ROOT

from reportgen.cli import main
from reportgen.errors import InputError
from reportgen.inputs import parse_vessel
from reportgen.inputs.tablecheck import table_problems

DEMO_VESSEL = ROOT / "conditions" / "vessels" / "linnet-demo.yaml"
ITEM_LINE = "  - {name: Stores and provisions, mass: 20.0, lcg: 9.0, vcg: 11.0, wind_area: 0}"


@pytest.fixture()
def work(tmp_path) -> Path:
    (tmp_path / "vessels").mkdir()
    shutil.copy(DEMO_VESSEL, tmp_path / "vessels")
    shutil.copy(PASSING, tmp_path / "c.yaml")
    assert ITEM_LINE in (tmp_path / "c.yaml").read_text()
    return tmp_path


def _check(work: Path, old: str, new: str):
    text = (work / "c.yaml").read_text().replace(old, new)
    (work / "x.yaml").write_text(text)
    done = CliRunner().invoke(main, ["check", str(work / "x.yaml")])
    assert "Traceback" not in done.output
    return done


@pytest.mark.parametrize("item, words", [
    ("{name: Stores and provisions, mass: 20.0, lcg: 135.5, vcg: 11.0}", "lcg 135.5 m is outside"),
    ("{name: Stores and provisions, mass: 20.0, lcg: 9.0, vcg: 116.0}", "vcg 116 m is outside"),
    ("{name: Stores and provisions, mass: 20.0, lcg: 9.0, vcg: -1.0}", "vcg -1 m is outside"),
    ("{name: Stores and provisions, mass: 20.0, lcg: 9.0, vcg: 11.0, tcg: 30.0}",
     "tcg 30 m is outside"),
    # SPEC.md "Conventions" bounds exactly: x −0.05·Lpp … 1.05·Lpp (Lpp 97 m: −4.85 … 101.85),
    # z up to the top of the windage profile (21 m on the demo ship)
    ("{name: Stores and provisions, mass: 20.0, lcg: 102.0, vcg: 11.0}",
     "lcg 102 m is outside the ship (-4.85 to 101.85 m"),
    ("{name: Stores and provisions, mass: 20.0, lcg: -5.0, vcg: 11.0}", "lcg -5 m is outside"),
    ("{name: Stores and provisions, mass: 20.0, lcg: 9.0, vcg: 21.5}",
     "vcg 21.5 m is outside the ship (0 to 21 m"),
])
def test_a_mass_outside_the_ship_is_refused(work, item, words):
    done = _check(work, ITEM_LINE, "  - " + item)
    assert done.exit_code == 2 and words in done.output and "Stores and provisions" in done.output


@pytest.mark.parametrize("item", [
    "{name: Stores and provisions, mass: 20.0, lcg: 101.8, vcg: 11.0}",  # just inside 1.05·Lpp
    "{name: Stores and provisions, mass: 20.0, lcg: -4.8, vcg: 11.0}",
    "{name: Stores and provisions, mass: 20.0, lcg: 9.0, vcg: 21.0}",  # at the profile's top
    "{name: Stores and provisions, mass: 20.0, lcg: 9.0, vcg: 11.0, tcg: 7.8}",  # at B/2
])
def test_a_mass_just_inside_the_bounds_is_assessed(work, item):
    done = _check(work, ITEM_LINE, "  - " + item)
    assert done.exit_code in (0, 1), done.output


def _on_hull(work: Path) -> None:
    """The copied vessel computed on its hull offsets: the floating position is then the real
    one at any trim (the demo's tables stop at trims −3 to 4 m and refuse beyond, first)."""
    v = work / "vessels" / DEMO_VESSEL.name
    text = v.read_text()
    assert "calculation: {method: tables" in text
    v.write_text(text.replace("calculation: {method: tables", "calculation: {method: hull"))


@pytest.mark.parametrize("lcg", [95.0, 85.0])
def test_a_trim_beyond_the_tables_is_refused_first(work, lcg):
    done = _check(work, ITEM_LINE, ITEM_LINE + f"\n  - {{name: Big, mass: 3000.0, lcg: {lcg}, "
                                              "vcg: 5.0}")
    assert done.exit_code == 2 and "outside the hydrostatic table's trims" in done.output


def test_a_condition_that_cannot_float_is_refused(work):
    # 2000 t at x = 95 m on a 97 m ship: the trim puts the keel aft out of the water.
    _on_hull(work)
    done = _check(work, ITEM_LINE, ITEM_LINE + "\n  - {name: Big, mass: 2000.0, lcg: 95.0, "
                                              "vcg: 5.0}")
    assert done.exit_code == 2 and "below zero" in done.output


def test_a_condition_with_the_deck_under_water_is_refused(work):
    # 1500 t at x = 30 m: trimmed by the stern with the deck edge aft under water.
    _on_hull(work)
    done = _check(work, ITEM_LINE, ITEM_LINE + "\n  - {name: Big, mass: 1500.0, lcg: 30.0, "
                                              "vcg: 5.0}")
    assert done.exit_code == 2 and "above the moulded depth" in done.output


def test_an_item_above_the_deck_inside_the_profile_is_named_unless_it_states_no_windage(work):
    # SPEC.md "Condition file": an item whose VCG is above the depth and that has no
    # wind_area gets a warning. Stores at (9, 11) lie inside the demo ship's accommodation in
    # its profile: the warning says its windage is taken as inside the profile.
    done = _check(work, ITEM_LINE, ITEM_LINE.replace(", wind_area: 0}", "}"))
    assert "'Stores and provisions' lies above the deck and gives no wind_area" in done.output
    assert done.output.index("Result:") < done.output.index("'Stores and provisions' lies")
    done = _check(work, "x", "x")  # the demo states wind_area: 0
    assert "Stores and provisions' lies" not in done.output and done.exit_code in (0, 1)


def test_an_item_above_the_deck_is_named_whatever_the_criteria(work):
    # SPEC.md "Condition file" names the warning without condition on the criteria chosen
    text = (work / "c.yaml").read_text().replace(ITEM_LINE, ITEM_LINE.replace(
        ", wind_area: 0}", "}")) + "criteria: [is2008.general]\n"
    (work / "x.yaml").write_text(text)
    done = CliRunner().invoke(main, ["check", str(work / "x.yaml")])
    assert done.exit_code in (0, 1) and "Weather" not in done.output.split("Loading")[0]
    assert "'Stores and provisions' lies above the deck and gives no wind_area" in done.output


def test_deck_cargo_without_windage_is_named_beside_the_verdict(work):
    done = _check(work, ITEM_LINE, ITEM_LINE + "\n  - {name: Deck pipes, mass: 100.0, lcg: 60.0, "
                                              "vcg: 11.0}")
    assert done.exit_code in (0, 1)
    verdict_at = done.output.index("Result:")
    warning_at = done.output.index("'Deck pipes' lies above the deck")
    assert warning_at > verdict_at and warning_at < done.output.index("Loading")
    # with its own wind area the warning goes
    done = _check(work, ITEM_LINE, ITEM_LINE + "\n  - {name: Deck pipes, mass: 100.0, lcg: 60.0, "
                                              "vcg: 11.0, wind_area: 40.0, wind_z: 11.0}")
    assert "Deck pipes" not in done.output


def _vessel_problem(edit) -> str:
    """The message of reading the demo vessel file after `edit(data)` (parsed, so the test
    does not depend on how the file lays out its rows)."""
    data = yaml.safe_load(DEMO_VESSEL.read_text())
    edit(data)
    with pytest.raises(InputError) as caught:
        parse_vessel(yaml.safe_dump(data).encode(), "edited.yaml")
    return str(caught.value)


def test_kn_beyond_the_hull_is_refused():
    def edit(data):
        kn = np.asarray(data["cross_curves"]["kn"], dtype=float)
        kn[..., 0, 1] += 100.0  # 100 m of KN at 5° on a ship 15.6 m broad
        data["cross_curves"]["kn"] = kn.tolist()

    assert "cross_curves.kn row 1" in _vessel_problem(edit)


def test_displacement_above_a_block_coefficient_of_one_is_refused():
    def edit(data):  # CB 0.637 at the lightest row of the demo ship: × 1.6 gives CB 1.02
        h = data["hydrostatics"]
        h["displacement"] = (np.asarray(h["displacement"], dtype=float) * 1.6).tolist()

    assert "block coefficient above 1" in _vessel_problem(edit)


def test_the_demo_vessel_file_is_plausible():
    v = parse_vessel(DEMO_VESSEL.read_bytes(), "demo")
    assert table_problems(v.particulars, v.hydrostatics, v.cross_curves, v.grain) == []


def test_items_outside_the_profile_as_shapely_covers_finds_them():
    """unwinded_deck_items asks shapely's intersects_xy for every item at once; for a point
    that is the same as shapely's covers (inside or on the outline: the reference), checked
    at the demo profile's vertices, on its edges and at random points."""
    from shapely.geometry import Point, Polygon

    from reportgen.loading import item_line
    from reportgen.plausible import unwinded_deck_items

    profile = Polygon(yaml.safe_load(DEMO_VESSEL.read_text())["windage"]["profile"])
    xy = np.asarray(profile.exterior.coords)
    rng = np.random.default_rng(5)
    on_edges = xy[:-1] + rng.uniform(0.0, 1.0, (len(xy) - 1, 1)) * (xy[1:] - xy[:-1])
    points = np.vstack([xy, on_edges, rng.uniform([-5.0, 0.0], [105.0, 25.0], (400, 2))])
    lines = [item_line(f"p{i}", 1.0, x, z, 0.0) for i, (x, z) in enumerate(points)]
    want = [ln.name for ln in lines if not profile.covers(Point(ln.lcg, ln.vcg))]
    outside, inside = unwinded_deck_items(lines, profile, -1.0, set())
    assert outside == want
    assert inside == [ln.name for ln in lines if ln.name not in want]
    assert 0 < len(want) < len(lines)


# Each bound below is physical (reportgen/inputs/tablecheck.py docstring); each edit is a typing
# error a careless user makes that would flatter the ship (more GM, no downflooding, less grain
# heeling), so a refusal is the only safe answer.

def test_kmt_beyond_draught_plus_the_largest_bm_is_refused():
    # KMt typed in cm: 100 × the table. KMt ≤ T + ρ·L·B³/(12·Δ) (BM = I_T/∇, I_T of the
    # rectangle L × B is L·B³/12: second moment of area of a rectangle, any handbook).
    def edit(data):
        h = data["hydrostatics"]
        h["kmt"] = (np.asarray(h["kmt"], dtype=float) * 100.0).tolist()

    assert "hydrostatics.kmt at trim -3 m row 1" in _vessel_problem(edit)


def test_tpc_beyond_a_waterplane_filling_the_box_is_refused():
    # TPC = ρ·Awp/100 (definition); × 10 puts Awp beyond L × B.
    def edit(data):
        h = data["hydrostatics"]
        h["tpc"] = (np.asarray(h["tpc"], dtype=float) * 10.0).tolist()

    assert "hydrostatics.tpc" in _vessel_problem(edit)


def test_full_breadths_given_as_offsets_are_refused():
    # Offsets are half-breadths; the full breadth typed instead doubles y (and BM eightfold).
    def edit(data):
        for st in data["hull"]["stations"]:
            st["points"] = [[2.0 * y, z] for y, z in st["points"]]

    assert "exceeds half the moulded breadth (7.8 m)" in _vessel_problem(edit)


@pytest.mark.parametrize("key, value, words", [
    ("z", 11600.0, "z 11600 m is outside the ship"),  # typed in mm: it would never flood
    ("x", -40.0, "x -40 m is outside the ship"),
    ("y", 9.0, "y 9 m is beyond the side"),
])
def test_an_opening_outside_the_ship_is_refused(key, value, words):
    def edit(data):
        data["openings"][0][key] = value

    assert words in _vessel_problem(edit)


@pytest.mark.parametrize("key, value, words", [
    ("vhm", 1e12, "volumetric heeling moment 1e+12"),  # no shift of the grain makes this
    ("volume", 1e12, "volume 1e+12 m³ exceeds the box"),
    ("vcg", 300.0, "vcg 300) m lies outside the ship"),
])
def test_grain_data_no_hold_can_have_are_refused(key, value, words):
    def edit(data):
        data["grain"]["compartments"][0]["filled"][key] = value
        data["grain"]["compartments"][0].pop("partly", None)

    assert words in _vessel_problem(edit)


def test_the_demo_hulls_and_openings_are_plausible():
    from reportgen.inputs.tablecheck import hull_problems, opening_problems

    for name in ("linnet-demo.yaml", "plover-ferry.yaml"):
        v = parse_vessel((DEMO_VESSEL.parent / name).read_bytes(), name)
        top = max(z for _, z in v.windage.profile)
        assert hull_problems(v.particulars, v.hull) == []
        assert opening_problems(v.particulars, v.openings, top) == []


@pytest.mark.parametrize("wind, words", [
    # A of IS Code 2008 Part A 2.3.2.2 is the lateral area above the waterline: a centroid
    # below it (here below the base) would shorten the wind lever, the unsafe direction
    ("wind_area: 40.0, wind_z: -1.0", "wind_z -1 m is outside the windage above the waterline"),
    ("wind_area: 40.0, wind_z: 3.0", "wind_z 3 m is outside"),  # under the 6.15 m draught
    ("wind_area: 40.0, wind_z: 1.0e+6", "wind_z 1e+06 m is outside"),
    ("wind_area: 1.0e+12, wind_z: 11.0", "exceeds the ship's whole silhouette box"),
])
def test_item_windage_that_cannot_be_is_refused(work, wind, words):
    done = _check(work, ITEM_LINE, ITEM_LINE + "\n  - {name: Deck pipes, mass: 100.0, lcg: 60.0, "
                                              f"vcg: 11.0, {wind}}}")
    assert done.exit_code == 2 and words in done.output and "Deck pipes" in done.output


def test_a_breadth_the_tables_and_offsets_contradict_is_refused():
    # B in mm (15600 for 15.6 m) would make B/d, X1 and T of the weather criterion flatter
    # the ship. B is the greatest moulded breadth, so the offsets reach B/2 (definition).
    def with_offsets(data):
        data["particulars"]["breadth"] = 15600.0

    assert "the hull offsets' greatest half-breadth is 7.8 m" in _vessel_problem(with_offsets)

    # Without offsets: Δ/(ρ·Lwl·B·T) at the summer draught (definition of CB) comes out
    # 1000 times too small.
    def tables_only(data):
        data["particulars"]["breadth"] = 15600.0
        data.pop("hull")
        data["calculation"]["method"] = "tables"
        data["tanks"] = [t for t in data["tanks"] if "table" in t]

    assert "gives a block coefficient of 0.001" in _vessel_problem(tables_only)


def test_a_bilge_keel_area_larger_than_the_hull_side_is_refused():
    def edit(data):  # 18 m² typed in cm² would give k its most favourable 0.70 (Part A 2.3.4)
        data["particulars"]["bilge_keel_area"] = 180000.0

    assert "bilge_keel_area 180000 m² exceeds the side of the hull's box" in \
        _vessel_problem(edit)


def test_a_depth_above_the_windage_profile_is_refused():
    def edit(data):
        data["particulars"]["depth"] = 84.0  # 8.4 m typed with a slipped decimal point
        data.pop("hull")  # (the offsets, short of such a deck, would be refused first)
        data["tanks"] = [t for t in data["tanks"] if "table" in t]

    assert "particulars.depth 84 m is above the top of the windage profile" in \
        _vessel_problem(edit)


@pytest.mark.parametrize("column, value, words", [
    ("lcg", 1e12, "lcg 1e+12 m is outside the ship"),
    ("vcg", -1.0, "vcg -1 m is outside the ship"),
    ("tcg", 30.0, "tcg 30 m is outside the ship's breadth"),
    ("fsi", 1e12, "exceeds the widest waterplane's L·B³/12"),
])
def test_a_tank_table_row_no_tank_can_have_is_refused(column, value, words):
    # A row the demo conditions never read (the first) is refused as well: another filling
    # would read it.
    def edit(data):
        data["tanks"][0]["table"][column][0] = value

    assert "table row 1" in (got := _vessel_problem(edit)) and words in got


def _set(path, value):
    def edit(data):
        node = data
        for key in path[:-1]:
            node = node[key]
        node[path[-1]] = value
    return edit


@pytest.mark.parametrize("path, value, words", [
    # MCT = Δ·GML/(100·Lpp), GML ≤ T + I_L/∇, I_L ≤ B·L³/12 (rectangle; any handbook)
    (("hydrostatics", "mct", 0, 0), 1e12, "hydrostatics.mct at trim -3 m row 1"),
    (("hydrostatics", "lwl", 0, 0), 1e12, "hydrostatics.lwl at trim -3 m row 1"),
    # |trim| ≤ D for a ship with both draughts between 0 and D
    (("hydrostatics", "trims", 0), -1e12, "hydrostatics.trims: -1e+12 m is beyond any trim"),
    (("deck_edge", "trims", 0), -1e12, "deck_edge.trims: -1e+12 m"),
    # KN = yB·cos φ + zB·sin φ > 0 for 0 < φ ≤ 90° (B on the immersed side, above the keel)
    (("cross_curves", "kn", 0, 0, 1), -1.0, "KN is positive at every heel above 0°"),
    (("flooding_angle", "displacement", 0), -1.0, "flooding_angle.displacement: -1 t"),
    (("limiting_kg", "kg", 0), 1e12, "limiting_kg.kg: 1e+12 m is above the ship"),
])
def test_a_table_value_no_ship_can_have_is_refused(path, value, words):
    assert words in _vessel_problem(_set(path, value))


def test_a_length_the_profile_contradicts_is_refused():
    # Lpp in mm: the windage profile (the hull's lateral projection) and the offsets still run
    # from the aft to the forward perpendicular of a 97 m ship (definition of Lpp)
    assert "runs from x -2 to 98 m, not from the aft to the forward perpendicular" in \
        _vessel_problem(_set(("particulars", "length_bp"), 97000.0))


def test_offsets_that_cannot_float_the_condition_are_a_clear_refusal(monkeypatch):
    # The ferry's angles are found on its offsets: where the offsets cannot float what the
    # tables float (offsets of another hull), the user gets the reason, not a traceback.
    import reportgen.hull.tables as hull_tables

    def fails(*args, **kwargs):
        raise ValueError("no free-trim equilibrium found at heel 35° for LCG 28.700 m")

    monkeypatch.setattr(hull_tables, "immersion_angle", fails)
    done = CliRunner().invoke(main, ["check", str(ROOT / "conditions" / "ferry-departure.yaml")])
    assert done.exit_code == 2 and "Traceback" not in done.output
    assert "hull offsets: no free-trim equilibrium found" in done.output
    assert "must describe the hull of the tables" in done.output
