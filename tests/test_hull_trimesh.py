"""Volume and centre of buoyancy against trimesh (reference library).

A closed triangle mesh is lofted through the same offsets (each station's section as a ring,
consecutive rings joined by quads, the end rings closed by fans), cut by trimesh at the
waterplane (trimesh.intersections.slice_mesh_plane), and the cut closed by a fan in the
waterplane; trimesh's mass_properties (divergence-theorem integrals over the closed
surface) then give the volume and centroid to compare with the section integration.
The mesh is ruled between stations where the section integration uses Simpson's rule, so
the two differ by the discretisation (O(h²)); with 81 stations that is well under 0.1 %.
"""

from __future__ import annotations

import numpy as np
import pytest
import trimesh
from hull_helpers import box_stations, wigley_stations

from reportgen.hull.equilibrium import equilibrium
from reportgen.hull.hydrostatics import Plane, _axes, integrals_at, prepare_hull
from reportgen.hull.sections import hull_from_stations

L, B, T, D = 100.0, 10.0, 6.0, 9.0


def lofted_mesh(stations) -> trimesh.Trimesh:
    rings = []
    for x, half in stations:
        port = half[::-1] * np.array([-1.0, 1.0])
        yz = np.vstack([half, port])
        rings.append(np.column_stack([np.full(len(yz), x), yz]))
    m = len(rings[0])
    verts = np.vstack(rings + [rings[0].mean(axis=0), rings[-1].mean(axis=0)])
    c0, c1 = len(verts) - 2, len(verts) - 1
    faces = []
    for i in range(len(rings) - 1):
        for j in range(m):
            k = (j + 1) % m
            aj, ak, bj, bk = i * m + j, i * m + k, (i + 1) * m + j, (i + 1) * m + k
            faces += [[aj, ak, bk], [aj, bk, bj]]
    last = (len(rings) - 1) * m
    for j in range(m):
        k = (j + 1) % m
        faces += [[c0, k, j], [c1, last + j, last + k]]
    mesh = trimesh.Trimesh(verts, np.array(faces), process=False)
    if mesh.mass_properties.volume < 0:
        mesh.invert()
    return mesh


def immersed_mesh(mesh: trimesh.Trimesh, plane: Plane, lpp: float) -> trimesh.Trimesh:
    """The part of `mesh` under the waterplane, closed by a fan in the plane."""
    _, n = _axes(plane.heel_deg)
    normal = np.array([plane.slope, n[0], n[1]])  # immersed: normal·p <= d + slope·Lpp/2
    origin = normal * (plane.d_m + plane.slope * lpp / 2) / (normal @ normal)
    cut = trimesh.intersections.slice_mesh_plane(mesh, -normal, origin, cap=False)
    # Join the vertices the cut made once per face, and drop the zero-area faces that
    # coincident offsets (keel points on the centreline, zero-width ends) leave.
    cut.merge_vertices()
    cut.update_faces(cut.nondegenerate_faces())
    cut.remove_unreferenced_vertices()
    edges = cut.edges  # oriented edges of the faces
    boundary = trimesh.grouping.group_rows(cut.edges_sorted, require_count=1)
    bnd = edges[boundary]
    centre = cut.vertices[np.unique(bnd)].mean(axis=0)
    verts = np.vstack([cut.vertices, centre])
    c = len(verts) - 1
    cap = np.column_stack([bnd[:, 1], bnd[:, 0], np.full(len(bnd), c)])
    return trimesh.Trimesh(verts, np.vstack([cut.faces, cap]), process=False)


CASES = [
    ("wigley", 0.0, 0.0, 6.0),
    ("wigley", 0.8, 20.0, 5.0),
    ("wigley", -0.5, 55.0, 4.0),
    ("box", 0.6, 30.0, 4.0),
]


@pytest.mark.parametrize("shape,trim,heel,draft", CASES)
def test_volume_and_centroid_match_trimesh(shape, trim, heel, draft):
    if shape == "wigley":
        stations = wigley_stations(L, B, T, D, n_stations=81, n_z=31)
    else:
        stations = box_stations(L, B, D, n=11)
    geom = prepare_hull(hull_from_stations(stations), L)
    plane = Plane.from_draft(draft, trim, heel, L)
    ours = integrals_at(geom, plane)
    ref = immersed_mesh(lofted_mesh(stations), plane, L)
    assert ref.is_watertight
    mp = ref.mass_properties
    assert ours.volume_m3 == pytest.approx(mp.volume, rel=1e-3)
    centre = np.array([ours.mx_m4, ours.my_m4, ours.mz_m4]) / ours.volume_m3
    np.testing.assert_allclose(centre, mp.center_mass, atol=0.01)


def test_heeled_equilibrium_volume_matches_trimesh():
    stations = wigley_stations(L, B, T, D, n_stations=81, n_z=31)
    geom = prepare_hull(hull_from_stations(stations), L)
    vol = 0.8 * integrals_at(geom, Plane(T, 0.0, 0.0)).volume_m3
    e = equilibrium(geom, vol, 30.0, lcg_m=L / 2 - 1.0)
    ref = immersed_mesh(lofted_mesh(stations), e.plane, L).mass_properties
    assert ref.volume == pytest.approx(vol, rel=1e-3)
    assert e.lcb_m == pytest.approx(L / 2 - 1.0, abs=1e-6)
    np.testing.assert_allclose([e.lcb_m, e.tcb_m, e.vcb_m], ref.center_mass, atol=0.01)
