"""Tank sounding tables from geometry (reportgen.hull.compartments).

References outside the project:
- rectangular tank: V = l·b·h, centroid at the box centre, and the free-surface second
  moment about its own centroidal fore-and-aft axis i = l·b³/12 (second moment of area of a
  rectangle; any naval architecture text, e.g. Rawson & Tupper, Basic Ship Theory, ch. 4).
- Wigley hull y = B/2·(1 − ξ²)(1 − ζ²), ξ = 2x/L − 1, ζ = (T − z)/T (Wigley's analytic form):
  volume by scipy.integrate.dblquad of the clipped breadth, and the waterplane's transverse
  second moment in closed form, I = (2/3)·(B/2)³·(1 − ζ²)³·L·16/35.
- trimesh mass_properties on a closed mesh lofted through the clipped sections.
"""

from __future__ import annotations

import numpy as np
import pytest
import shapely
import trimesh
from scipy.integrate import dblquad
from shapely.geometry.polygon import orient

from reportgen.hull.compartments import (
    TankBox,
    section_at,
    sounding_grid,
    tank_depth,
    tank_table,
)
from reportgen.hull.sections import Hull, hull_from_stations

# --- hulls -------------------------------------------------------------------------------------

BOX_L, BOX_B, BOX_D = 20.0, 10.0, 6.0
WIG_L, WIG_B, WIG_T, WIG_D = 100.0, 10.0, 6.25, 9.0


def box_hull(n_stations: int = 11) -> Hull:
    pts = np.array([[0.0, 0.0], [BOX_B / 2, 0.0], [BOX_B / 2, BOX_D]])
    return hull_from_stations([(x, pts) for x in np.linspace(0.0, BOX_L, n_stations)])


def wigley_y(x: np.ndarray | float, z: np.ndarray | float) -> np.ndarray:
    """Wigley half-breadth, wall-sided above the waterline T (analytic form)."""
    xi = 2.0 * np.asarray(x) / WIG_L - 1.0
    zeta = np.clip((WIG_T - np.asarray(z)) / WIG_T, 0.0, 1.0)
    return WIG_B / 2.0 * (1.0 - xi**2) * (1.0 - zeta**2)


def wigley_hull(xs: np.ndarray) -> Hull:
    # Points dense near the keel (cosine spacing) and every 0.25 m above the waterline.
    z_low = WIG_T * (1.0 - np.cos(np.linspace(0.0, np.pi / 2, 80)))
    z_up = np.arange(WIG_T + 0.25, WIG_D + 1e-9, 0.25)
    z = np.concatenate([z_low, z_up])
    return hull_from_stations(
        [(float(x), np.column_stack([wigley_y(x, z), z])) for x in xs]
    )


# --- rectangular tank in a box hull ------------------------------------------------------------


def test_rectangular_tank_volume_centroid_and_free_surface() -> None:
    # Ends between stations (3.3 and 12.7 with stations every 2 m) and off the centreline.
    box = TankBox(3.3, 12.7, 1.0, 4.0, 0.5, 3.0)
    l, b, h = 12.7 - 3.3, 4.0 - 1.0, 3.0 - 0.5
    s = sounding_grid(box_hull(), box, step_m=0.5)
    assert s[0] == 0.0 and s[-1] == pytest.approx(h)
    t = tank_table(box_hull(), box, s)
    # V = l·b·s; centroid at mid-length, mid-breadth and half the sounding above the bottom.
    np.testing.assert_allclose(t["volume"], l * b * s, rtol=1e-9)
    np.testing.assert_allclose(t["lcg"], (3.3 + 12.7) / 2, atol=1e-9)
    np.testing.assert_allclose(t["tcg"], 2.5, atol=1e-9)
    np.testing.assert_allclose(t["vcg"], 0.5 + s / 2, atol=1e-9)
    # Free surface of a rectangle about its own centroidal axis: l·b³/12.
    np.testing.assert_allclose(t["fsi"], l * b**3 / 12.0, rtol=1e-9)


def test_port_tank_mirrors_starboard_tank() -> None:
    hull = box_hull()
    s = np.array([0.0, 0.7, 1.5])
    stbd = tank_table(hull, TankBox(2.0, 8.0, 0.0, 5.0, 0.0, 1.5), s)
    port = tank_table(hull, TankBox(2.0, 8.0, -5.0, 0.0, 0.0, 1.5), s)
    np.testing.assert_allclose(port["tcg"], -stbd["tcg"], atol=1e-12)
    for key in ("volume", "lcg", "vcg", "fsi"):
        np.testing.assert_allclose(port[key], stbd[key], rtol=1e-12)


def test_tank_box_beyond_the_hull_is_clipped_to_it() -> None:
    # A box wider, longer and deeper than the hull holds exactly the hull: V = L·B·D.
    t = tank_table(box_hull(), TankBox(-5.0, 30.0, -20.0, 20.0, -1.0, 9.0),
                   np.array([0.0, BOX_D]))
    assert t["volume"][-1] == pytest.approx(BOX_L * BOX_B * BOX_D, rel=1e-12)


def test_bad_soundings_are_refused() -> None:
    box = TankBox(2.0, 8.0, 0.0, 5.0, 0.0, 1.5)
    with pytest.raises(ValueError, match="strictly increasing"):
        tank_table(box_hull(), box, np.array([0.0, 1.0, 1.0]))
    with pytest.raises(ValueError, match="above the tank top"):
        tank_table(box_hull(), box, np.array([0.0, 2.0]))
    with pytest.raises(ValueError, match="outside the hull"):
        tank_table(box_hull(), TankBox(30.0, 40.0, 0.0, 5.0, 0.0, 1.5), np.array([0.0, 1.0]))


# --- Wigley hull -------------------------------------------------------------------------------


def test_wigley_tank_volume_against_scipy_dblquad() -> None:
    # Tank ends fall between stations (every 5 m): section_at blends the neighbours.
    hull = wigley_hull(np.linspace(0.0, WIG_L, 21))
    box = TankBox(31.0, 58.5, 1.0, 20.0, 0.0, 4.0)
    z_low, z_high = tank_depth(hull, box)
    t = tank_table(hull, box, np.array([0.0, z_high - z_low]))

    def breadth(z: float, x: float) -> float:
        return max(float(wigley_y(x, z)) - 1.0, 0.0)

    vol, _ = dblquad(breadth, 31.0, 58.5, 0.0, 4.0, epsabs=1e-6)
    assert t["volume"][-1] == pytest.approx(vol, rel=1e-3)  # Circ.1229 allows 2 %


def test_wigley_free_surface_against_closed_form() -> None:
    hull = wigley_hull(np.linspace(0.0, WIG_L, 41))
    box = TankBox(0.0, WIG_L, -20.0, 20.0, 0.0, WIG_D)
    levels = np.array([2.0, 4.0, WIG_T])
    t = tank_table(hull, box, levels)
    zeta = (WIG_T - levels) / WIG_T
    # I = ∫ (2/3) y³ dx with y = B/2 (1 − ξ²)(1 − ζ²); ∫ (1 − ξ²)³ dx = L·16/35.
    exact = 2.0 / 3.0 * (WIG_B / 2) ** 3 * (1 - zeta**2) ** 3 * WIG_L * 16.0 / 35.0
    np.testing.assert_allclose(t["fsi"], exact, rtol=2e-3)  # Circ.1229 allows FSM 2 %


def _ring(poly: shapely.Polygon, n: int) -> np.ndarray:
    """n points of the polygon boundary, evenly spaced by arc length from its lowest point."""
    ring = shapely.LineString(orient(poly, sign=1.0).exterior.coords)
    coords = np.asarray(ring.coords)[:-1]
    start = int(np.lexsort((coords[:, 0], coords[:, 1]))[0])
    ring = shapely.LineString(np.vstack([np.roll(coords, -start, axis=0),
                                         np.roll(coords, -start, axis=0)[:1]]))
    d = np.linspace(0.0, ring.length, n, endpoint=False)
    return shapely.get_coordinates(shapely.line_interpolate_point(ring, d))


def _lofted_mesh(xs: np.ndarray, polys: list[shapely.Polygon], n: int = 400) -> trimesh.Trimesh:
    rings = [_ring(p, n) for p in polys]
    verts = [np.column_stack([np.full(n, x), r]) for x, r in zip(xs, rings)]
    faces = []
    for i in range(len(xs) - 1):
        a, b = i * n, (i + 1) * n
        for k in range(n):
            k1 = (k + 1) % n
            faces += [[a + k, a + k1, b + k1], [a + k, b + k1, b + k]]
    centres = []
    for j, (x, p) in enumerate(((xs[0], polys[0]), (xs[-1], polys[-1]))):
        c = len(xs) * n + j
        centres.append([x, p.centroid.x, p.centroid.y])
        base = 0 if j == 0 else (len(xs) - 1) * n
        for k in range(n):
            # Rings run anticlockwise in (y, z): the aft cap faces −x, the fore cap +x.
            k1 = base + (k + 1) % n
            faces.append([c, k1, base + k] if j == 0 else [c, base + k, k1])
    return trimesh.Trimesh(np.vstack([*verts, centres]), np.array(faces), process=True)


@pytest.mark.parametrize("sounding_fraction", [0.55, 1.0])
def test_wigley_tank_against_trimesh_mesh_of_the_clipped_sections(
    sounding_fraction: float,
) -> None:
    xs_hull = np.linspace(0.0, WIG_L, 81)  # every 1.25 m
    hull = wigley_hull(xs_hull)
    box = TankBox(22.5, 47.5, 1.2, 20.0, 0.5, 5.5)  # ends at stations, off the centreline
    z_low, z_high = tank_depth(hull, box)
    s = sounding_fraction * (z_high - z_low)
    t = tank_table(hull, box, np.array([0.0, s]))
    xs = xs_hull[(xs_hull >= 22.5) & (xs_hull <= 47.5)]
    cut = shapely.box(box.y_min, box.z_min, box.y_max, z_low + s)
    polys = [shapely.intersection(section_at(hull, float(x)), cut) for x in xs]
    mesh = _lofted_mesh(xs, polys)
    assert mesh.is_watertight and mesh.is_winding_consistent and mesh.volume > 0
    props = mesh.mass_properties
    # The mesh is ruled between sections (trapezoidal in x); the table uses Simpson's rule.
    assert t["volume"][1] == pytest.approx(props.volume, rel=1e-3)  # Circ.1229: 2 %
    lcg, tcg, vcg = props.center_mass
    assert t["lcg"][1] == pytest.approx(lcg, abs=0.005)  # Circ.1229: 1 % / 50 cm
    assert t["tcg"][1] == pytest.approx(tcg, abs=0.002)
    assert t["vcg"][1] == pytest.approx(vcg, abs=0.002)  # Circ.1229: 1 % / 5 cm


def test_zero_sounding_row_is_the_tank_bottom() -> None:
    hull = wigley_hull(np.linspace(0.0, WIG_L, 21))
    box = TankBox(30.0, 60.0, 0.0, 20.0, 0.0, 4.0)
    s = sounding_grid(hull, box, step_m=0.5)
    t = tank_table(hull, box, s)
    assert t["volume"][0] == 0.0
    assert np.all(np.diff(t["volume"]) > 0)
    z_low, _ = tank_depth(hull, box)
    assert t["vcg"][0] == pytest.approx(z_low)
    assert 30.0 <= t["lcg"][0] <= 60.0 and 0.0 <= t["tcg"][0] <= WIG_B / 2
