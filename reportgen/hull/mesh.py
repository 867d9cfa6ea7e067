"""Hull offsets from a closed hull mesh (a CAD export, STL or OBJ), by slicing it with trimesh.

Axes as in SPEC.md (x from AP forward, y to starboard, z from the moulded baseline up), all
lengths in m (after `scale`), areas m², volumes m³.

At each station the mesh is cut by the plane x = const (trimesh.intersections.mesh_plane; the
end stations a hair inside the ends, END_NUDGE); the cut's segments are joined into rings
(shapely.polygonize) and the section is their even-odd union, so a hollow stays a hollow.
Its starboard half (y ≥ 0) gives the offsets from the keel (the lowest point on the
centreline) round the outside to the deck edge: the run of the outline that goes inboard
across the deck, nearly level (|dz| ≤ DECK_SLOPE·|dy|), is left out, so the written section
closes across the deck by the straight line between its deck edges (SPEC's offsets). The
stations are spaced evenly over the mesh's length; by default their number is doubled until
the sections, integrated along the length with Simpson's rule, hold the mesh's own volume
(trimesh's divergence-theorem integral over the closed surface) to VOLUME_TOL.
"""

from __future__ import annotations

import io
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np
import shapely
from scipy.integrate import simpson
from shapely.geometry import Polygon, box
from shapely.geometry.polygon import orient

MAX_FACES = 2_000_000
LENGTH_RANGE_M = (1.0, 600.0)  # the mesh's largest extent, m, after scale
OFFSETS_WARN = 0.005  # offsets holding 0.5 % less than the sections get a warning
SYMMETRY_TOL = 0.01  # port and starboard halves may differ by this much of the largest section
MAX_STATIONS = 1001
DEFAULT_STATIONS = 41  # the first try; doubled (2n − 1) until VOLUME_TOL is met
MAX_AUTO_STATIONS = 321
VOLUME_TOL = 0.001  # 0.1 %: a twentieth of Circ.1229's 2 % for displacement
DECK_SLOPE = 0.25  # a deck run rises at most this much per unit of breadth (camber, sheer)
SNAP_M = 1e-7  # cut points closer than this are one point
END_NUDGE = 1e-4  # the end stations are cut this fraction of the length inside the ends
TINY_M = 1e-3  # a cut smaller than this each way is no section (a pointed end)
OPEN_FRACTION = 0.01  # of a cut's length that may stay open (tessellation noise)
SIMPLIFY_M = 5e-5  # points off the outline by less than this (0.05 mm) are dropped
Z_DECREASE_TOL_M = 0.001  # an outline may fall this much (tessellation noise) and is levelled
DECIMALS = 4


@dataclass
class MeshStations:
    """The offsets made from a mesh and what was learnt on the way."""

    stations: list[tuple[float, np.ndarray]]  # (x m, starboard half-section (n, 2) y, z m)
    mesh_volume_m3: float
    section_volume_m3: float  # the cut sections integrated along x (Simpson)
    offsets_volume_m3: float  # the written half-sections, mirrored, integrated along x
    extents_m: tuple[float, float, float, float, float, float]  # x0, x1, y0, y1, z0, z1
    warnings: list[str] = field(default_factory=list)


def load_mesh(raw: bytes, file_type: str, scale: float = 1.0):
    """A closed trimesh.Trimesh from the bytes of an STL or OBJ file, scaled to metres.
    ValueError with the reason when it cannot be read or is not a closed surface."""
    import warnings

    import trimesh

    _check_layout(raw, file_type)
    with warnings.catch_warnings(), np.errstate(all="ignore"):
        warnings.simplefilter("ignore")
        try:
            # unprocessed first: processing drops faces with coordinates that are not finite,
            # and the mesh would then be reported open instead of as holding NaN or infinity
            mesh = trimesh.load_mesh(io.BytesIO(raw), file_type=file_type, process=False)
        except Exception as exc:  # noqa: BLE001 - any reader failure is a bad file
            raise ValueError(f"cannot read it as {file_type.upper()}: {exc}") from None
        return _checked(mesh, scale)


def _check_layout(raw: bytes, file_type: str) -> None:
    """ValueError unless `raw` is laid out as the format says, before a reader guesses: a
    binary STL is an 80-byte header, a 4-byte little-endian triangle count n and 50 bytes per
    triangle (84 + 50·n bytes in all); an ASCII STL and an OBJ are text."""
    if file_type == "stl" and len(raw) >= 84:
        count = int.from_bytes(raw[80:84], "little")
        if len(raw) == 84 + 50 * count:
            return
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        if file_type == "stl":
            raise ValueError("not an STL file: neither a binary STL (84 + 50 bytes per "
                             "triangle, as its header counts them) nor ASCII text") from None
        raise ValueError("not an OBJ file: not text (UTF-8)") from None
    if file_type == "stl" and not text.lstrip().startswith("solid"):
        raise ValueError("not an STL file: neither a binary STL (84 + 50 bytes per triangle, "
                         "as its header counts them) nor ASCII text starting 'solid'")


def _checked(mesh, scale: float):
    import trimesh

    if not isinstance(mesh, trimesh.Trimesh) or len(mesh.faces) == 0:
        raise ValueError("no triangles found in it")
    if len(mesh.faces) > MAX_FACES:
        raise ValueError(f"{len(mesh.faces):,} triangles is more than the limit of "
                         f"{MAX_FACES:,}; reduce it in the CAD program")
    if not np.all(np.isfinite(mesh.vertices)):
        raise ValueError("some vertex coordinates are not finite numbers")
    mesh.process()  # what loading with process=True does: equal vertices merged
    if scale != 1.0:
        mesh.apply_scale(scale)
    size = float(np.max(np.ptp(mesh.vertices, axis=0)))
    if not LENGTH_RANGE_M[0] <= size <= LENGTH_RANGE_M[1]:
        raise ValueError(f"the mesh is {size:.6g} m long: not a ship's length in metres (a mesh "
                         f"in millimetres needs --scale 0.001)")
    mesh.update_faces(mesh.nondegenerate_faces())
    _check_closed(mesh)
    if mesh.volume < 0:
        mesh.invert()
    return mesh


def _check_closed(mesh) -> None:
    """ValueError naming why `mesh` does not enclose a volume."""
    if not mesh.is_watertight:
        _, counts = np.unique(mesh.edges_sorted, axis=0, return_counts=True)
        open_edges = int(np.sum(counts == 1))
        shared = int(np.sum(counts > 2))
        parts = []
        if open_edges:
            parts.append(f"{open_edges} edges border only one triangle (holes in the surface: "
                         f"an open deck, transom or a gap between patches)")
        if shared:
            parts.append(f"{shared} edges are shared by more than two triangles")
        raise ValueError("the mesh is not closed (watertight): " + "; ".join(parts)
                         + "; close it in the CAD program and export it again")
    if not mesh.is_winding_consistent:
        raise ValueError("the mesh's triangles are not consistently oriented (some face "
                         "inwards); repair the normals in the CAD program")
    if abs(mesh.volume) <= 0:
        raise ValueError("the mesh encloses no volume")


def _region(segments_yz: np.ndarray, x_m: float):
    """The section from the cut's segments: the rings they close (shapely.polygonize), joined
    even-odd, so that a hollow stays a hollow. ValueError when much of the cut stays open."""
    lines = shapely.set_precision(shapely.linestrings(segments_yz), SNAP_M)
    noded = shapely.get_parts(shapely.union_all(lines))
    faces, cuts, dangles, invalid = shapely.polygonize_full(noded)
    region = Polygon()
    for face in shapely.get_parts(faces):
        region = region.symmetric_difference(Polygon(face.exterior))
    loose = sum(g.length for g in (cuts, dangles, invalid))
    total = float(np.sum(shapely.length(noded)))
    if loose > max(OPEN_FRACTION * total, TINY_M):
        raise ValueError(f"the cut at x = {x_m:.4f} m does not close into a section "
                         f"({loose:.4f} m of its {total:.4f} m stays open)")
    return region


def section(mesh, x_m: float, face_x: np.ndarray | None = None
            ) -> Polygon | shapely.MultiPolygon:
    """The cut of the mesh by the plane x = x_m, in (y, z), m (empty when it misses).
    face_x: (n_faces, 2) least and greatest x of each triangle, to cut only those it crosses."""
    from trimesh.intersections import mesh_plane

    local = None
    if face_x is not None:
        local = np.flatnonzero((face_x[:, 0] <= x_m) & (face_x[:, 1] >= x_m))
        if not local.size:
            return Polygon()
    seg = mesh_plane(mesh, [1.0, 0.0, 0.0], [x_m, 0.0, 0.0], local_faces=local)
    if len(seg) == 0:
        return Polygon()
    yz = np.asarray(seg)[:, :, 1:3].reshape(-1, 2)
    if np.all(np.ptp(yz, axis=0) < TINY_M):
        return Polygon()
    return _region(np.asarray(seg)[:, :, 1:3], x_m)


def half_outline(sec, x_m: float, warnings: list[str]) -> np.ndarray | None:
    """Starboard offsets (n, 2) of a section from the keel to the deck edge; None when the
    section has no starboard part."""
    half = sec.intersection(box(0.0, -1e6, 1e6, 1e6))
    polys = [g for g in shapely.get_parts(half) if g.geom_type == "Polygon" and g.area > 0]
    if not polys:
        return None
    main = max(polys, key=lambda g: g.area)
    lost = half.area - main.area
    if lost > 1e-6 * max(half.area, 1e-12):
        warnings.append(f"x = {x_m:.3f} m: {len(polys) - 1} separate part(s) of the section "
                        f"({lost:.4f} m² a side, {100 * lost / half.area:.2f} %) left out; "
                        f"the offsets hold one outline per station")
    if main.interiors:
        warnings.append(f"x = {x_m:.3f} m: a hollow in the section is ignored (the offsets "
                        f"give the outer surface)")
    ring = np.asarray(orient(Polygon(main.exterior), sign=1.0).exterior.coords)[:-1]
    tol = 1e-6 * max(1.0, float(np.max(ring[:, 0])))
    on_cl = np.flatnonzero(np.abs(ring[:, 0]) <= tol)
    if not on_cl.size:
        raise ValueError(f"the section at x = {x_m:.4f} m does not reach the centreline "
                         f"(y = 0): is the mesh placed with its centreline at y = 0?")
    keel = int(on_cl[np.argmin(ring[on_cl, 1])])
    ring = np.roll(ring, -keel, axis=0)
    back = np.flatnonzero(np.abs(ring[1:, 0]) <= tol)
    end = int(back[0]) + 1 if back.size else len(ring) - 1
    path = ring[: end + 1]
    # Leave out the deck: the last run going inboard, nearly level.
    k = len(path) - 1
    while k > 1:
        dy, dz = path[k] - path[k - 1]
        if dy < 0 and abs(dz) <= DECK_SLOPE * abs(dy):
            k -= 1
        else:
            break
    path = path[: k + 1].copy()
    path[0, 0] = 0.0
    drops = np.diff(path[:, 1])
    if np.any(drops < -Z_DECREASE_TOL_M):
        i = int(np.argmax(drops < -Z_DECREASE_TOL_M))
        raise ValueError(f"the section at x = {x_m:.4f} m turns downward (z {path[i, 1]:.3f} to "
                         f"{path[i + 1, 1]:.3f} m at y {path[i + 1, 0]:.3f} m); offsets run "
                         f"from the keel to the deck edge with z rising (a tunnel or overhang "
                         f"cannot be written as offsets)")
    path[:, 1] = np.maximum.accumulate(path[:, 1])
    if len(path) > 2:  # drop the points a straight run or a triangle's diagonal adds
        path = np.asarray(shapely.LineString(path).simplify(SIMPLIFY_M).coords)
    path = np.round(path, DECIMALS) + 0.0
    keep = np.ones(len(path), dtype=bool)
    keep[1:] = np.any(np.diff(path, axis=0) != 0, axis=1)
    path = path[keep]
    if len(path) < 2:
        path = np.array([path[0], path[0] + [0.0, 1e-4]])
    return path


def _cut_all(mesh, xs: np.ndarray, progress: Callable[[], None] | None, done: dict):
    """The sections at xs; `done` keeps those cut before (by x), for a finer spacing."""
    x0, x1 = float(xs[0]), float(xs[-1])
    nudge = END_NUDGE * (x1 - x0)
    face_x = mesh.vertices[:, 0][mesh.faces]
    face_x = np.column_stack([face_x.min(axis=1), face_x.max(axis=1)])
    out = []
    for x in xs:
        key = round(float(x), 9)
        if key not in done:
            at = min(max(float(x), x0 + nudge), x1 - nudge)  # the end faces: just inside
            done[key] = section(mesh, at, face_x)
            if progress is not None:
                progress()
        out.append(done[key])
    return out


def mesh_stations(mesh, n_stations: int | None = None,
                  progress: Callable[[], None] | None = None) -> MeshStations:
    """Offsets of `mesh` (closed, from load_mesh) at n_stations evenly spaced stations from its
    aft end to its fore end; None: DEFAULT_STATIONS, doubled until VOLUME_TOL is met (at most
    MAX_AUTO_STATIONS). ValueError when a section cannot be written as offsets."""
    (x0, y0, z0), (x1, y1, z1) = mesh.bounds
    breadth = y1 - max(y0, -y1)
    if y0 < -1e-6 * breadth and abs(y0 + y1) > 0.005 * (y1 - y0):
        raise ValueError(f"the mesh is not symmetric about the centreline: y runs from "
                         f"{y0:.3f} to {y1:.3f} m (a whole hull from -B/2 to B/2, or the "
                         f"starboard half from 0, is expected)")
    half = y0 >= -1e-6 * breadth  # the starboard half only, closed at the centreplane
    mirror = 2.0 if half else 1.0  # volumes below are of the whole hull
    volume = mirror * float(mesh.volume)
    warnings: list[str] = []
    n = n_stations or DEFAULT_STATIONS
    done: dict = {}
    while True:
        xs = np.linspace(x0, x1, n)
        secs = _cut_all(mesh, xs, progress, done)
        areas = np.array([s.area for s in secs])
        sec_volume = mirror * float(simpson(areas, x=xs))
        miss = abs(sec_volume - volume) / volume
        if n_stations is not None or miss <= VOLUME_TOL or 2 * n - 1 > MAX_AUTO_STATIONS:
            break
        n = 2 * n - 1
    if miss > VOLUME_TOL:
        warnings.append(f"the sections at {n} stations integrate to {sec_volume:.3f} m³, "
                        f"{100 * miss:.2f} % off the mesh's volume {volume:.3f} m³: give more "
                        f"stations (--stations)")
    _check_symmetric(xs, secs)
    stations: list[tuple[float, np.ndarray]] = []
    for x, sec in zip(xs, secs, strict=True):
        pts = half_outline(sec, float(x), warnings)
        stations.append((round(float(x), DECIMALS) + 0.0, pts))
    _fill_empty(stations)
    _deck_jumps(stations, z1 - z0, warnings)
    written = np.array([2.0 * _half_area(p) for _, p in stations])
    off_volume = float(simpson(written, x=np.array([s[0] for s in stations])))
    if abs(off_volume - sec_volume) > OFFSETS_WARN * sec_volume:
        warnings.append(f"the offsets hold {off_volume:.3f} m³ where the sections hold "
                        f"{sec_volume:.3f} m³ ({100 * (off_volume / sec_volume - 1):+.2f} %): "
                        f"deck camber, a deckhouse or separate parts are left out")
    return MeshStations(stations, volume, sec_volume, off_volume, (x0, x1, y0, y1, z0, z1),
                        warnings)


def _check_symmetric(xs: np.ndarray, secs: list) -> None:
    """ValueError where a section's port and starboard halves differ by more than SYMMETRY_TOL
    of the largest section (a whole hull must be symmetric; a half hull has no port part)."""
    largest = max((s.area for s in secs), default=0.0)
    for x, sec in zip(xs, secs, strict=True):
        stbd = sec.intersection(box(0.0, -1e6, 1e6, 1e6)).area
        port = sec.intersection(box(-1e6, -1e6, 0.0, 1e6)).area
        if port > 0 and abs(port - stbd) > SYMMETRY_TOL * largest:
            raise ValueError(f"the hull is not symmetric about the centreline (y = 0): at x = "
                             f"{x:.3f} m the section has {stbd:.4f} m² to starboard and "
                             f"{port:.4f} m² to port")


def _deck_jumps(stations: list[tuple[float, np.ndarray]], height_m: float,
                warnings: list[str]) -> None:
    """A warning where the deck edge jumps between neighbouring stations by more than a tenth
    of the mesh's height: a deckhouse or a raised deck in the mesh ends the offsets at its top."""
    z = np.array([p[-1, 1] for _, p in stations])
    for i in np.flatnonzero(np.abs(np.diff(z)) > 0.1 * height_m)[:3]:
        warnings.append(f"the deck edge jumps from z {z[i]:.2f} m (x {stations[i][0]:g} m) to "
                        f"{z[i + 1]:.2f} m (x {stations[i + 1][0]:g} m): the offsets end at the "
                        f"highest deck of each section; leave deckhouses out of the mesh")


def _half_area(points: np.ndarray) -> float:
    """Area (m²) of the starboard half-section closed along the deck and the centreline."""
    ring = np.vstack([points, [[0.0, points[-1, 1]]], [[0.0, points[0, 1]]]])
    return abs(Polygon(ring).area) if len(points) > 1 else 0.0


def _fill_empty(stations: list[tuple[float, np.ndarray | None]]) -> None:
    """A station the mesh does not reach gets a zero-width section at its neighbour's keel and
    deck heights."""
    for i, (x, pts) in enumerate(stations):
        if pts is not None:
            continue
        near = [p for _, p in sorted(((abs(j - i), q) for j, (_, q) in enumerate(stations)
                                      if q is not None), key=lambda t: t[0])][:1]
        z_lo, z_hi = (float(near[0][0, 1]), float(near[0][-1, 1])) if near else (0.0, 1.0)
        stations[i] = (x, np.array([[0.0, z_lo], [0.0, max(z_hi, z_lo + 1e-4)]]))
