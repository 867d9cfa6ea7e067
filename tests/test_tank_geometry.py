"""Tanks given by geometry: `reportgen tables` makes their sounding tables; then `new` and
`check` accept the vessel.

Sources:
- rectangular tank: V = l·b·s, LCG and TCG at the box centre, VCG = bottom + s/2, and the
  free-surface second moment about its own fore-and-aft axis i = l·b³/12 (second moment of
  area of a rectangle; Rawson & Tupper, Basic Ship Theory, ch. 4, free surface effect).
- Wigley hull y = B/2·(1 − ξ²)(1 − ζ²) (W. C. S. Wigley, 1934): the liquid volume of a
  starboard bottom tank integrated in closed form over x and z, and its free surface by
  scipy.integrate.quad over the analytic waterline; the table read by linear interpolation
  (as the loading does) must hold them within MSC.1/Circ.1229's 2 % (volume, FSM).
"""

from __future__ import annotations

import numpy as np
import pytest
import yaml
from click.testing import CliRunner
from scipy.integrate import quad

from reportgen.cli import main
from reportgen.hull.compartments import TankBox
from reportgen.hull.sections import hull_from_stations
from reportgen.hull.tanks import geometry_tank_table

L, B, D, TS = 40.0, 10.0, 6.0, 3.5

HEAD = f"""format: reportgen/vessel-1
vessel: {{name: Box Test, identifier: RG-TEST-BOX, type: barge}}
particulars: {{length_bp: {L}, breadth: {B}, depth: {D}, summer_draft: {TS}}}
lightship: {{mass: 400.0, lcg: 20.0, vcg: 3.0}}
windage:
  profile: [[0, 0], [40, 0], [40, 6], [0, 6]]
tanks:
  # inside the hull: 8 m x 5 m x 3 m
  - {{id: C1, name: Centre tank, content: fresh water, density: 1.0,
      geometry: {{x: [10, 18], y: [-3, 2], z: [0.5, 3.5]}}}}
  # reaches past the side (B/2 = 5 m): clipped to y -5..-2
  - {{id: W1, name: "Wing tank: port", content: ballast, density: 1.025,
      geometry: {{x: [22, 30], y: [-9, -2], z: [0, 4]}}}}
  - id: T1
    name: Small tank from a table
    content: fuel oil
    density: 0.9
    table: {{sounding: [0, 1], volume: [0, 2], lcg: [5, 5], vcg: [1, 1.5], tcg: [0, 0],
             fsi: [0.5, 0.5]}}
criteria: [is2008.general]
hull:
  stations:
"""


@pytest.fixture(scope="module")
def made(tmp_path_factory):
    base = tmp_path_factory.mktemp("tanks")
    stations = "".join(f"    - {{x: {x:g}, points: [[0, 0], [{B / 2:g}, 0], [{B / 2:g}, {D:g}]]}}\n"
                       for x in np.linspace(0.0, L, 5))
    (base / "box-hull.yaml").write_text(HEAD + stations)
    done = CliRunner().invoke(main, ["tables", str(base / "box-hull.yaml"), "-o",
                                     str(base / "box.yaml")])
    assert done.exit_code == 0, done.output
    tanks = {t["id"]: t for t in yaml.safe_load((base / "box.yaml").read_text())["tanks"]}
    return base, tanks


def test_box_tank_is_its_closed_forms(made):
    _, tanks = made
    t = {k: np.array(v) for k, v in tanks["C1"]["table"].items()}
    s = t["sounding"]
    assert s[0] == 0.0 and s[-1] == pytest.approx(3.0)
    l, b = 8.0, 5.0
    np.testing.assert_allclose(t["volume"], l * b * s, atol=1e-4)  # V = l·b·s
    np.testing.assert_allclose(t["vcg"][1:], 0.5 + s[1:] / 2, atol=1e-4)  # VCG = s/2 up
    np.testing.assert_allclose(t["lcg"], 14.0, atol=1e-4)
    np.testing.assert_allclose(t["tcg"], -0.5, atol=1e-4)
    np.testing.assert_allclose(t["fsi"], l * b**3 / 12, rtol=1e-6)  # i = l·b³/12
    assert tanks["C1"]["geometry"] == {"x": [10.0, 18.0], "y": [-3.0, 2.0], "z": [0.5, 3.5]}


def test_box_clipped_by_the_hull_side(made):
    _, tanks = made
    t = {k: np.array(v) for k, v in tanks["W1"]["table"].items()}
    l, b = 8.0, 3.0  # y from -5 (the shell) to -2
    np.testing.assert_allclose(t["volume"], l * b * t["sounding"], atol=1e-4)
    np.testing.assert_allclose(t["tcg"], -3.5, atol=1e-4)
    np.testing.assert_allclose(t["fsi"], l * b**3 / 12, rtol=1e-6)
    assert tanks["W1"]["name"] == "Wing tank: port"


def test_table_tank_kept_exactly(made):
    _, tanks = made
    assert tanks["T1"]["table"]["volume"] == [0.0, 2.0]
    assert "geometry" not in tanks["T1"]


def test_new_then_check_accepts_it(made):
    base, _ = made
    cond = base / "empty.yaml"
    done = CliRunner().invoke(main, ["new", str(base / "box.yaml"), "-o", str(cond)])
    assert done.exit_code == 0, done.output
    text = cond.read_text()
    assert text.startswith("# yaml-language-server: $schema=")
    for tid in ("C1", "W1", "T1"):
        assert f"  {tid}: {{percent: 0}}" in text
    assert "capacity 120.0 m³" in text  # C1: 8 x 5 x 3
    assert "Lightship" in text and "items: []" in text
    checked = CliRunner().invoke(main, ["check", str(cond), "--json"])
    assert checked.exit_code in (0, 1), checked.output  # evaluated, not refused
    # Filled from the template: the tank is read from the table made from its geometry.
    cond.write_text(text.replace("C1: {percent: 0}", "C1: {percent: 50}"))
    checked = CliRunner().invoke(main, ["check", str(cond), "--json"])
    assert checked.exit_code in (0, 1), checked.output
    lines = yaml.safe_load(checked.output)["loading"]["lines"]
    c1 = next(ln for ln in lines if ln["id"] == "C1")
    # Half of 8 x 5 x 3 m of fresh water (1.0 t/m³), its centre at half the sounding.
    assert c1["mass"] == pytest.approx(60.0, abs=1e-3)
    assert c1["vcg"] == pytest.approx(0.5 + 0.75, abs=1e-3)


def test_check_refuses_a_tank_without_its_table(made):
    base, _ = made
    cond = base / "c.yaml"
    cond.write_text("format: reportgen/condition-1\nvessel: box-hull.yaml\n"
                    "condition: {title: t}\nitems: []\n")
    done = CliRunner().invoke(main, ["check", str(cond)])
    assert done.exit_code == 2 and "reportgen tables" in done.output


# --- a shaped tank: rows fine enough for linear interpolation ------------------------------

WL, WB, WT, WD = 100.0, 10.0, 6.0, 9.0


def wigley_y(x, z):
    xi = 2.0 * x / WL - 1.0
    zeta = np.clip((WT - z) / WT, 0.0, 1.0)
    return WB / 2.0 * (1.0 - xi**2) * (1.0 - zeta**2)


def test_shaped_tank_rows_hold_circ_1229_by_interpolation():
    z = np.concatenate([WT * (1.0 - np.cos(np.linspace(0.0, np.pi / 2, 80))),
                        np.arange(WT + 0.25, WD + 1e-9, 0.25)])
    hull = hull_from_stations([(float(x), np.column_stack([wigley_y(x, z), z]))
                               for x in np.linspace(0.0, WL, 41)])
    x0, x1, top = 30.0, 70.0, 2.0  # a starboard bottom tank, V-shaped: y grows like z
    table = geometry_tank_table(hull, TankBox(x0, x1, 0.0, 20.0, 0.0, top))

    def xint(p):  # ∫ (1 − ξ²)^p dx over the tank
        return quad(lambda x: (1.0 - (2.0 * x / WL - 1.0) ** 2) ** p, x0, x1)[0]

    for h in np.linspace(0.03, top - 0.01, 23):
        zeta_int = h - (WT**3 - (WT - h) ** 3) / (3.0 * WT**2)  # ∫0^h (1 − ζ²) dz
        volume = WB / 2.0 * xint(1) * zeta_int
        g = 1.0 - ((WT - h) / WT) ** 2
        # Free surface of the strip 0..y: i about its own centroidal axis.
        area, first, second = (WB / 2 * g * xint(1), (WB / 2 * g) ** 2 / 2 * xint(2),
                               (WB / 2 * g) ** 3 / 3 * xint(3))
        fsi = second - first**2 / area
        got_v = np.interp(h, table["sounding"], table["volume"])
        got_i = np.interp(h, table["sounding"], table["fsi"])
        assert got_v == pytest.approx(volume, rel=0.02)  # Circ.1229: volume 2 %
        assert got_i == pytest.approx(fsi, rel=0.02)  # Circ.1229: FSM 2 %


def test_vessel_data_refuses_a_tank_without_its_table(made):
    """Every route to the numbers (conditions, limits, packages) passes vessel_data."""
    from reportgen.errors import InputError
    from reportgen.inputs import load_vessel
    from reportgen.vesseldata import make_vessel_data

    base, _ = made
    with pytest.raises(InputError, match="C1, W1 have a geometry but no table"):
        make_vessel_data(load_vessel(base / "box-hull.yaml"))
    tanks = {t.id: t for t in make_vessel_data(load_vessel(base / "box.yaml")).tanks}
    assert tanks["C1"].table.capacity_m3 == 120.0
