"""Immersed sections and hydrostatics of a hull at a waterplane.

Units: lengths m, areas m², volumes m³, density t/m³, masses t, angles deg (radians only
inside), moments t·m. Axes as SPEC.md: x from AP forward, y to starboard, z up from the
moulded baseline; heel + to starboard, trim + by the stern.

A waterplane is held as a `Plane` (d, slope, heel): a point (x, y, z) is immersed when

    -y·sinθ + z·cosθ <= d + slope·(Lpp/2 - x).

Upright this is z <= T_m + t·(Lpp/2 - x)/Lpp with d = T_m and slope = t/Lpp; heeled, the
waterline meets the centreline of station x at z = (d + slope·(Lpp/2 - x))/cosθ, so the
draught at midships on the centreline is d/cosθ and the trim is slope·Lpp/cosθ. The
(d, slope) form stays regular up to 90° of heel, where the centreline heights do not. Heel
is the angle of the waterline in the transverse section (the convention of cross curves).

Sections are cut at the waterline edge by edge with numpy, all stations at once (Green's
theorem, clip_sections; shapely's overlay is the reference), and integrated along x with
Simpson's rule (scipy.integrate.simpson, which also takes uneven spacing).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import shapely
from scipy.integrate import simpson
from shapely.geometry.polygon import orient

from reportgen.hull.sections import Hull


@dataclass(frozen=True)
class Plane:
    """A waterplane: immersed where -y·sinθ + z·cosθ <= d_m + slope·(Lpp/2 - x).

    d_m: normal distance of the waterplane from the midship keel point, m.
    slope: fall of the waterplane along x (dimensionless; upright = trim/Lpp).
    heel_deg: heel, deg, + to starboard.
    """

    d_m: float
    slope: float
    heel_deg: float

    @classmethod
    def from_draft(cls, draft_m: float, trim_m: float, heel_deg: float, length_bp_m: float
                   ) -> Plane:
        """Waterplane from the centreline draught at midships (m), trim (m, + by the stern,
        over Lpp) and heel (deg)."""
        c = np.cos(np.radians(heel_deg))
        return cls(float(draft_m * c), float(trim_m * c / length_bp_m), float(heel_deg))

    def draft_m(self) -> float:
        """Centreline draught at midships (x = Lpp/2), m; inf at 90° heel."""
        c = np.cos(np.radians(self.heel_deg))
        return float(self.d_m / c) if abs(c) > 1e-12 else float("inf")

    def trim_m(self, length_bp_m: float) -> float:
        """Trim on the centreline, m, + by the stern over Lpp; inf at 90° heel."""
        c = np.cos(np.radians(self.heel_deg))
        return float(self.slope * length_bp_m / c) if abs(c) > 1e-12 else float("inf")


@dataclass(frozen=True)
class HullGeometry:
    """A hull prepared for repeated clipping.

    x_m: station positions, m. sections: shapely polygons (numpy object array).
    weights: Simpson weights so that ∫f dx ≈ weights·f(x_m).
    length_bp_m: Lpp, m (midships at Lpp/2 is the trim reference).
    size_m: a length larger than any section dimension (for half-planes), m.
    deck_edge_yz: (n, 2) starboard deck-edge point (last offset) of each station, m.
    keel_z_m: height of each station's lowest offset point (the keel profile), m.
    vertices: each section's exterior ring, (k, 2) arrays of (y, z), m.
    edges_yz: every edge of every section ring (rings anticlockwise about the part they
    bound) as a column (y0, z0, y1, z1), by station; edge_station: the station of each edge.
    """

    x_m: np.ndarray
    sections: np.ndarray
    weights: np.ndarray
    length_bp_m: float
    size_m: float
    deck_edge_yz: np.ndarray
    keel_z_m: np.ndarray
    vertices: tuple[np.ndarray, ...]
    edges_yz: np.ndarray
    edge_station: np.ndarray


def simpson_weights(x_m: np.ndarray) -> np.ndarray:
    """Weights w with Σ w·f(x) = scipy.integrate.simpson(f, x=x) (Simpson is linear in f)."""
    x = np.asarray(x_m, dtype=float)
    if len(x) < 2:
        raise ValueError("a hull needs at least two stations")
    return simpson(np.eye(len(x)), x=x, axis=1)


def prepare_hull(hull: Hull, length_bp_m: float) -> HullGeometry:
    """HullGeometry of `hull` with Lpp `length_bp_m` (m)."""
    sections = np.array(hull.sections, dtype=object)
    verts = tuple(
        np.asarray(s.exterior.coords, dtype=float) if not s.is_empty else np.zeros((0, 2))
        for s in hull.sections
    )
    allpts = np.vstack([v for v in verts if len(v)] or [np.zeros((1, 2))])
    size = 4.0 * (float(np.max(np.abs(allpts))) + float(np.ptp(hull.x_m)) + 1.0)
    # Every ring anticlockwise about the part it bounds (holes clockwise), for clip_sections.
    oriented = np.array([s if s.is_empty else orient(s, 1.0) for s in hull.sections],
                        dtype=object)
    rings, ring_station = shapely.get_rings(oriented, return_index=True)
    coords, ring_of = shapely.get_coordinates(rings, return_index=True)
    edge_start = np.flatnonzero(ring_of[1:] == ring_of[:-1])  # a point and the next
    return HullGeometry(
        x_m=np.asarray(hull.x_m, dtype=float),
        sections=sections,
        weights=simpson_weights(hull.x_m),
        length_bp_m=float(length_bp_m),
        size_m=size,
        deck_edge_yz=hull.deck_edge_yz,
        keel_z_m=np.array([float(np.min(p[:, 1])) for p in hull.half_points]),
        vertices=verts,
        edges_yz=np.vstack([coords[edge_start].T, coords[edge_start + 1].T]),
        edge_station=ring_station[ring_of[edge_start]],
    )


def plane_height(geom: HullGeometry, plane: Plane) -> np.ndarray:
    """c(x) = d + slope·(Lpp/2 - x) at each station, m (the normal offset of the waterline)."""
    return plane.d_m + plane.slope * (0.5 * geom.length_bp_m - geom.x_m)


def _axes(heel_deg: float) -> tuple[np.ndarray, np.ndarray]:
    """(u, n) in the (y, z) plane: u along the waterline (to starboard-down), n its upward
    normal, for heel + to starboard."""
    t = np.radians(heel_deg)
    return np.array([np.cos(t), np.sin(t)]), np.array([-np.sin(t), np.cos(t)])


@dataclass(frozen=True)
class SectionSlices:
    """Per-station results of clipping at one waterplane (arrays of length n_stations).

    area_m2: immersed section area; my_m3, mz_m3: its first moments about z = 0 line (y·A)
    and y = 0 line (z·A), i.e. A·yc and A·zc. breadth_m: waterline length in the section;
    s1_m2, s2_m3: first and second moments of that waterline about the centreline point,
    measured along the waterline (∫s ds, ∫s² ds).
    """

    area_m2: np.ndarray
    my_m3: np.ndarray
    mz_m3: np.ndarray
    breadth_m: np.ndarray
    s1_m2: np.ndarray
    s2_m3: np.ndarray


def clip_sections(geom: HullGeometry, plane: Plane) -> SectionSlices:
    """Immersed part of every section and its waterline breadth, all stations at once.

    The section edges are taken to waterline axes (s along the waterline, h along its
    upward normal, h measured from each station's own waterline) and each edge is cut at
    h = 0, keeping its part below. By Green's theorem over the boundary of the immersed part
    (the kept edge parts and the waterline, on which h = 0), the area and its first moments
    are sums over the kept parts alone of the polygon (shoelace) terms
    A = ½Σ(s₀h₁ − s₁h₀), ∫s dA = ⅙Σ(s₀ + s₁)(s₀h₁ − s₁h₀), ∫h dA = ⅙Σ(h₀ + h₁)(s₀h₁ − s₁h₀)
    (the terms of an edge on h = 0 vanish); and since ∮ds, ∮s ds and ∮s² ds vanish round a
    closed boundary, the waterline's length b = ∫ds, ∫s ds and ∫s² ds are the sums of
    Δs, Δ(s²)/2 and Δ(s³)/3 over the kept parts that are not themselves on the waterline
    (the rings run anticlockwise, as prepare_hull orients them). Shoelace and centroid of a
    polygon: e.g. P. Bourke, "Calculating the area and centroid of a polygon" (1988);
    Green's theorem: any calculus text. clip_sections_by_intersection, shapely's general
    overlay, is the reference the tests hold this to.
    """
    u, _ = _axes(plane.heel_deg)
    cos, sin = float(u[0]), float(u[1])  # u = (cos, sin), n = (-sin, cos)
    c = plane_height(geom, plane)
    rot = np.array([[cos, sin, 0.0, 0.0], [-sin, cos, 0.0, 0.0],
                    [0.0, 0.0, cos, sin], [0.0, 0.0, -sin, cos]])
    q = rot @ geom.edges_yz  # rows s0, h0, s1, h1 of every edge, h from the station's origin
    ce = c[geom.edge_station]
    h0, h1 = q[1] - ce, q[3] - ce
    below0, below1 = h0 <= 0.0, h1 <= 0.0
    k = np.flatnonzero(below0 | below1)  # the edges with a part below the waterline
    s0, s1, h0, h1 = q[0, k], q[2, k], h0[k], h1[k]
    for ok, s_end, h_end in ((below0[k], s0, h0), (below1[k], s1, h1)):
        x = np.flatnonzero(~ok)  # an edge crossing the waterline ends there (h = 0)
        s_end[x] = s0[x] + h0[x] / (h0[x] - h1[x]) * (s1[x] - s0[x])
        h_end[x] = 0.0
    tol = 1e-9 * geom.size_m
    ds = np.where(np.minimum(h0, h1) <= -tol, s1 - s0, 0.0)  # 0 on the waterline itself
    terms = np.empty((6, len(k)))
    cross = np.multiply(s0, h1, out=terms[0])
    cross -= s1 * h0
    np.multiply(s0 + s1, cross, out=terms[1])
    np.multiply(h0 + h1, cross, out=terms[2])
    terms[3] = ds
    np.multiply(ds, s0 + s1, out=terms[4])
    np.multiply(ds, s0 * s0 + s0 * s1 + s1 * s1, out=terms[5])
    sums = np.zeros((6, len(geom.x_m)))
    if len(k):
        st = geom.edge_station[k]
        first = np.empty(len(k), dtype=bool)
        first[0] = True
        np.not_equal(st[1:], st[:-1], out=first[1:])
        at = np.flatnonzero(first)
        sums[:, st[at]] = np.add.reduceat(terms, at, axis=1)
    area = 0.5 * sums[0]
    m_s = sums[1] / 6.0
    m_h = sums[2] / 6.0 + c * area  # ∫h dA from the section's origin
    return SectionSlices(area, m_s * cos - m_h * sin, m_s * sin + m_h * cos, sums[3],
                         0.5 * sums[4], sums[5] / 3.0)


def clip_sections_by_intersection(geom: HullGeometry, plane: Plane) -> SectionSlices:
    """Reference version of clip_sections by shapely's general overlay: shapely.intersection
    of all sections with the half-planes below their waterlines (one vectorised call) and
    with the waterlines themselves (another). Same result, about four times slower; the
    tests compare the two."""
    u, n = _axes(plane.heel_deg)
    c = plane_height(geom, plane)
    r = geom.size_m
    base = c[:, None] * n[None, :]  # point of each waterline nearest the origin
    # Half-plane below each waterline as a large rectangle (closed ring of 5 points).
    ring = np.stack(
        [base + r * u, base - r * u, base - r * u - 2 * r * n, base + r * u - 2 * r * n,
         base + r * u],
        axis=1,
    )
    below = shapely.polygons(ring)
    immersed = shapely.intersection(geom.sections, below)
    area = shapely.area(immersed)
    my = np.zeros_like(area)
    mz = np.zeros_like(area)
    full = area > 0.0
    if np.any(full):
        cen = shapely.get_coordinates(shapely.centroid(immersed[full]))
        my[full] = area[full] * cen[:, 0]
        mz[full] = area[full] * cen[:, 1]

    lines = shapely.linestrings(np.stack([base - r * u, base + r * u], axis=1))
    cuts = shapely.intersection(geom.sections, lines)
    parts, idx = shapely.get_parts(cuts, return_index=True)
    breadth = np.zeros_like(area)
    s1 = np.zeros_like(area)
    s2 = np.zeros_like(area)
    if len(parts):
        is_line = (shapely.get_type_id(parts) == 1) & ~shapely.is_empty(parts)
        parts, idx = parts[is_line], idx[is_line]
        if len(parts):
            a = shapely.get_coordinates(shapely.get_point(parts, 0)) @ u
            b = shapely.get_coordinates(shapely.get_point(parts, -1)) @ u
            lo, hi = np.minimum(a, b), np.maximum(a, b)
            np.add.at(breadth, idx, hi - lo)
            np.add.at(s1, idx, 0.5 * (hi**2 - lo**2))
            np.add.at(s2, idx, (hi**3 - lo**3) / 3.0)
    return SectionSlices(area, my, mz, breadth, s1, s2)


@dataclass(frozen=True)
class Integrals:
    """Integrals along x at one waterplane (m-based).

    volume_m3, mx_m4 (∫A·x), my_m4 (∫A·yc), mz_m4 (∫A·zc); awp_m2 (∫b), awp_x_m3 (∫b·x),
    awp_xx_m4 (∫b·x²), awp_s_m3 (∫∫s), awp_ss_m4 (∫∫s²) of the waterplane, where s runs
    along the waterline in the transverse section from the centreline.
    """

    volume_m3: float
    mx_m4: float
    my_m4: float
    mz_m4: float
    awp_m2: float
    awp_x_m3: float
    awp_xx_m4: float
    awp_s_m3: float
    awp_ss_m4: float


def integrate(geom: HullGeometry, sl: SectionSlices) -> Integrals:
    """Simpson integration along x of the per-station quantities."""
    w, x = geom.weights, geom.x_m
    return Integrals(
        volume_m3=float(w @ sl.area_m2),
        mx_m4=float(w @ (sl.area_m2 * x)),
        my_m4=float(w @ sl.my_m3),
        mz_m4=float(w @ sl.mz_m3),
        awp_m2=float(w @ sl.breadth_m),
        awp_x_m3=float(w @ (sl.breadth_m * x)),
        awp_xx_m4=float(w @ (sl.breadth_m * x * x)),
        awp_s_m3=float(w @ sl.s1_m2),
        awp_ss_m4=float(w @ sl.s2_m3),
    )


def integrals_at(geom: HullGeometry, plane: Plane) -> Integrals:
    """Clip and integrate at `plane`."""
    return integrate(geom, clip_sections(geom, plane))


def waterline_length(geom: HullGeometry, plane: Plane, sl: SectionSlices) -> float:
    """Lwl, m: the wetted stations' extent, reaching at each end to where the keel profile
    (each station's lowest offset, linear between stations) meets the waterplane, or to the
    end station when its keel point is immersed (a vertical stem or a submerged end)."""
    wet = sl.breadth_m > 1e-9
    if not np.any(wet):
        return 0.0
    i0, i1 = int(np.argmax(wet)), len(wet) - 1 - int(np.argmax(wet[::-1]))
    # Height of the centreline keel point above the waterplane, along its normal (m).
    above = geom.keel_z_m * np.cos(np.radians(plane.heel_deg)) - plane_height(geom, plane)

    def end(inner: int, outer: int) -> float:
        x_in, x_out = geom.x_m[inner], geom.x_m[outer]
        if outer == inner or above[outer] <= 0.0:
            return float(x_out)
        if above[inner] >= 0.0:
            return float(x_in)
        frac = np.clip(-above[inner] / (above[outer] - above[inner]), 0.0, 1.0)
        return float(x_in + frac * (x_out - x_in))

    return end(i1, min(i1 + 1, len(wet) - 1)) - end(i0, max(i0 - 1, 0))


def hydrostatics_at(geom: HullGeometry, plane: Plane, density_t_m3: float) -> dict[str, float]:
    """Hydrostatic particulars at a waterplane.

    Returns (m, t, m², m⁴, t/cm, t·m/cm): volume, displacement (= ρ·V), lcb, vcb, tcb,
    awp, lcf, tcf (transverse centre of the waterplane along the waterline), tpc
    (= ρ·Awp/100), it_cl (second moment of the waterplane about the centreline, ∫∫s²),
    it (about its own centroid axis), il_ap (longitudinal, about x = 0), il (about the LCF),
    bmt = it/V, kmt = vcb + bmt, bml = il/V, kml = vcb + bml, mct, lwl, cb, and the draught
    draft (centreline, midships), trim, heel.

    MCT = Δ·GM_L/(100·Lpp) t·m/cm with GM_L ≈ BM_L (the moment to change trim 1 cm; the
    approximation GM_L ≈ BM_L is common practice since KB - KG is small beside BM_L; e.g.
    C. B. Barrass & D. R. Derrett, Ship Stability for Masters and Mates, chapter on MCTC;
    Rawson & Tupper, Basic Ship Theory, ch. 4).
    CB = V/(Lwl·Bwl·T) with Bwl the largest waterline breadth and T the midship draught.
    KMt, BMt and CB are meaningful upright; at heel they are given for the heeled plane.
    """
    sl = clip_sections(geom, plane)
    it = integrate(geom, sl)
    v = it.volume_m3
    if v <= 0.0:
        raise ValueError("the waterplane immerses no part of the hull")
    lcb, tcb, vcb = it.mx_m4 / v, it.my_m4 / v, it.mz_m4 / v
    aw = it.awp_m2
    lcf = it.awp_x_m3 / aw if aw > 0 else float("nan")
    tcf = it.awp_s_m3 / aw if aw > 0 else float("nan")
    i_t = it.awp_ss_m4 - aw * tcf**2 if aw > 0 else 0.0
    i_l = it.awp_xx_m4 - aw * lcf**2 if aw > 0 else 0.0
    bmt, bml = i_t / v, i_l / v
    disp = density_t_m3 * v
    lpp = geom.length_bp_m
    lwl = waterline_length(geom, plane, sl)
    draft = plane.draft_m()
    bwl = float(np.max(sl.breadth_m))
    cb = v / (lwl * bwl * draft) if lwl > 0 and bwl > 0 and np.isfinite(draft) else float("nan")
    return {
        "draft": draft,
        "trim": plane.trim_m(lpp),
        "heel": plane.heel_deg,
        "volume": v,
        "displacement": disp,
        "lcb": lcb,
        "vcb": vcb,
        "tcb": tcb,
        "awp": aw,
        "lcf": lcf,
        "tcf": tcf,
        # TPC = ρ·Awp/100 t/cm (immersion of 1 cm = 0.01 m of the waterplane area).
        "tpc": density_t_m3 * aw / 100.0,
        "it_cl": it.awp_ss_m4,
        "it": i_t,
        "il_ap": it.awp_xx_m4,
        "il": i_l,
        # BM = I/V (Bouguer; Rawson & Tupper, Basic Ship Theory, ch. 4).
        "bmt": bmt,
        "kmt": vcb + bmt,
        "bml": bml,
        "kml": vcb + bml,
        "mct": disp * bml / (100.0 * lpp),
        "lwl": lwl,
        "bwl": bwl,
        "cb": cb,
    }
