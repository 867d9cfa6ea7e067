"""The README's walk-through of setting up a ship, command by command, on the invented example
in conditions/setup-example/: mesh -> offsets -> tables (tank tables from geometry) -> show ->
new -> check, with nothing written by hand but the vessel head file.

Outside reference: trimesh cuts the same OBJ mesh at a waterplane (slice_mesh_plane with a
cap) and its volume and centre (mass_properties, divergence theorem) are compared with the
hydrostatic table the offsets gave (MSC.1/Circ.1229: displacement 2 %, LCB 1 % / 50 cm,
VCB 1 % / 5 cm; asked far inside).
"""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
import trimesh
import yaml
from click.testing import CliRunner

from reportgen.cli import main

EXAMPLE = Path(__file__).resolve().parent.parent / "conditions" / "setup-example"


def run(*args) -> str:
    done = CliRunner().invoke(main, [str(a) for a in args])
    assert done.exit_code in (0, 1), done.output
    return done.stdout


@pytest.fixture(scope="module")
def ship(tmp_path_factory):
    out = tmp_path_factory.mktemp("tern")
    run("hull-from-mesh", EXAMPLE / "tern-hull.obj", "--vessel", EXAMPLE / "tern-head.yaml",
        "-o", out / "tern-hull.yaml")
    # The same as the hull: block alone put after the head.
    run("hull-from-mesh", EXAMPLE / "tern-hull.obj", "-o", out / "tern-offsets.yaml")
    assert (out / "tern-hull.yaml").read_text() == ((EXAMPLE / "tern-head.yaml").read_text()
                                                    + (out / "tern-offsets.yaml").read_text())
    run("tables", out / "tern-hull.yaml", "-o", out / "tern.yaml")
    return out


def test_the_mesh_is_what_its_generator_writes():
    import sys

    sys.path.insert(0, str(EXAMPLE))
    try:
        import make_tern_mesh
    finally:
        sys.path.remove(str(EXAMPLE))
    assert (EXAMPLE / "tern-hull.obj").read_text() == make_tern_mesh.obj_text()


def test_day_tank_csv_is_the_table_in_the_head_file():
    printed = run("import", "tank", EXAMPLE / "day-tank.csv")
    head = yaml.safe_load((EXAMPLE / "tern-head.yaml").read_text())
    day = next(t for t in head["tanks"] if t["id"] == "DAY")
    assert yaml.safe_load(printed)["table"] == day["table"]


def under_water(mesh: trimesh.Trimesh, draft: float) -> trimesh.Trimesh:
    """The part of the mesh below z = draft, closed by a fan in the waterplane (the waterplane
    of this hull is star-shaped about its centre)."""
    cut = trimesh.intersections.slice_mesh_plane(mesh, [0, 0, -1], [0, 0, draft], cap=False)
    cut.merge_vertices()
    cut.update_faces(cut.nondegenerate_faces())
    boundary = cut.edges[trimesh.grouping.group_rows(cut.edges_sorted, require_count=1)]
    centre = cut.vertices[np.unique(boundary)].mean(axis=0)
    verts = np.vstack([cut.vertices, centre])
    cap = np.column_stack([boundary[:, 1], boundary[:, 0], np.full(len(boundary), len(verts) - 1)])
    closed = trimesh.Trimesh(verts, np.vstack([cut.faces, cap]), process=False)
    assert closed.is_watertight
    return closed


def test_tables_from_the_mesh_match_trimesh(ship):
    vessel = yaml.safe_load((ship / "tern.yaml").read_text())
    h = vessel["hydrostatics"]
    mesh = trimesh.load_mesh(EXAMPLE / "tern-hull.obj")
    for i in (10, 30):
        t = h["draft"][i]
        under = under_water(mesh, t)
        assert h["displacement"][i] == pytest.approx(1.025 * under.volume, rel=2e-3)
        assert h["lcb"][i] == pytest.approx(under.center_mass[0], abs=0.05)
    assert all(t["table"]["volume"][-1] > 0 for t in vessel["tanks"])


def test_show_new_check(ship):
    shown = json.loads(run("show", ship / "tern.yaml", "--json"))
    assert [t["id"] for t in shown["tanks"]] == ["APT", "FWP", "FWS", "FOP", "FOS", "DAY",
                                                 "DB1P", "DB1S", "FPT"]
    assert shown["tanks"][5]["capacity_m3"] == 1.5
    run("new", ship / "tern.yaml", "-o", ship / "departure.yaml")
    text = (ship / "departure.yaml").read_text()
    text = text.replace("FWP: {percent: 0}", "FWP: {percent: 90}").replace(
        "items: []", "items:\n  - {name: Cargo, mass: 300.0, lcg: 24.0, vcg: 3.0}")
    (ship / "departure.yaml").write_text(text)
    res = json.loads(run("check", ship / "departure.yaml", "--json"))
    assert res["loading"]["deadweight"] == pytest.approx(
        300.0 + 0.9 * shown["tanks"][1]["capacity_t"], abs=0.01)
    assert np.isfinite(res["hydrostatics"]["gm_fluid"])
