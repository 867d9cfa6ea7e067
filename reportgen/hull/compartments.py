"""Tank sounding tables from the hull geometry.

A tank is the part of the hull inside a box: x_aft..x_fore, y_min..y_max, z_min..z_max
(axes as in SPEC.md: x from AP forward, y to starboard, z from the moulded baseline up).
Its liquid at a level z is the tank's section clipped at that level (shapely), integrated
along x with Simpson's rule (scipy). All lengths in m, areas in m², volumes in m³,
second moments in m⁴.

The sounding is measured from the tank's lowest point; the table's columns are the
sounding, the liquid volume, the liquid centroid (lcg, vcg, tcg) and the transverse second
moment of the free surface about its own centroidal longitudinal axis (fsi):

    i_T = ∫ (∫ y² dy) dx − A·ȳ²

(the parallel-axis theorem; the free-surface moment of a slack tank is ρ·i_T, e.g.
Rawson & Tupper, Basic Ship Theory, ch. 4, free surface effect).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import shapely
from scipy.integrate import simpson
from shapely.geometry import Polygon

from reportgen.hull.sections import Hull, section_polygon

_X_TOL_M = 1e-6


@dataclass(frozen=True)
class TankBox:
    """The box that cuts a tank out of the hull, m (port tanks have negative y)."""

    x_aft: float
    x_fore: float
    y_min: float
    y_max: float
    z_min: float
    z_max: float

    def __post_init__(self) -> None:
        if not (self.x_aft < self.x_fore and self.y_min < self.y_max and self.z_min < self.z_max):
            raise ValueError(f"tank box needs min < max on every axis: {self}")


def _arc_parameter(points_yz: np.ndarray) -> np.ndarray:
    """Normalised arc length (0..1) along a half-section polyline."""
    seg = np.hypot(*np.diff(points_yz, axis=0).T)
    s = np.concatenate([[0.0], np.cumsum(seg)])
    return s / s[-1] if s[-1] > 0 else np.linspace(0.0, 1.0, len(s))


def _resample(points_yz: np.ndarray, s_new: np.ndarray) -> np.ndarray:
    s = _arc_parameter(points_yz)
    if len(points_yz) == 1:
        return np.repeat(points_yz, len(s_new), axis=0)
    return np.column_stack(
        [np.interp(s_new, s, points_yz[:, 0]), np.interp(s_new, s, points_yz[:, 1])]
    )


def section_at(hull: Hull, x_m: float) -> Polygon:
    """Section polygon at any x inside the hull's station range, m.

    At a station, that station's section. Between stations, the two neighbouring
    half-sections are matched by normalised arc length (keel to deck edge) and blended
    linearly in x.
    """
    xs = hull.x_m
    if x_m < xs[0] - _X_TOL_M or x_m > xs[-1] + _X_TOL_M:
        raise ValueError(f"x = {x_m} m is outside the hull stations {xs[0]}..{xs[-1]} m")
    near = np.flatnonzero(np.abs(xs - x_m) <= _X_TOL_M)
    if near.size:
        return hull.sections[int(near[0])]
    j = int(np.searchsorted(xs, x_m))
    a, b = hull.half_points[j - 1], hull.half_points[j]
    t = (x_m - xs[j - 1]) / (xs[j] - xs[j - 1])
    s = np.union1d(_arc_parameter(a), _arc_parameter(b))
    blended = (1.0 - t) * _resample(a, s) + t * _resample(b, s)
    return section_polygon(blended)


def _x_grid(hull: Hull, box: TankBox) -> np.ndarray:
    """Integration stations of a tank: its two ends and every hull station between, m."""
    lo = max(box.x_aft, float(hull.x_m[0]))
    hi = min(box.x_fore, float(hull.x_m[-1]))
    if hi - lo <= _X_TOL_M:
        raise ValueError(f"tank box {box} lies outside the hull stations")
    inner = hull.x_m[(hull.x_m > lo + _X_TOL_M) & (hull.x_m < hi - _X_TOL_M)]
    return np.concatenate([[lo], inner, [hi]])


@dataclass(frozen=True)
class _TankGeometry:
    x_m: np.ndarray  # integration stations
    sections: np.ndarray  # tank section (hull ∩ box) at each station, shapely array
    z_low: float  # lowest point of the tank, m
    z_high: float  # highest point of the tank, m


def _tank_geometry(hull: Hull, box: TankBox) -> _TankGeometry:
    x = _x_grid(hull, box)
    hull_sections = np.array([section_at(hull, float(xi)) for xi in x], dtype=object)
    cut = shapely.box(box.y_min, box.z_min, box.y_max, box.z_max)
    tank = shapely.intersection(hull_sections, cut)
    bounds = shapely.bounds(tank)  # (miny->y_min, z_min, y_max, z_max) per station; nan if empty
    if np.all(np.isnan(bounds[:, 1])):
        raise ValueError(f"tank box {box} does not cut the hull")
    return _TankGeometry(
        x_m=x,
        sections=tank,
        z_low=float(np.nanmin(bounds[:, 1])),
        z_high=float(np.nanmax(bounds[:, 3])),
    )


def tank_depth(hull: Hull, box: TankBox) -> tuple[float, float]:
    """(lowest, highest) z of the tank's space inside the hull, m above base."""
    g = _tank_geometry(hull, box)
    return g.z_low, g.z_high


def sounding_grid(hull: Hull, box: TankBox, step_m: float = 0.1) -> np.ndarray:
    """Soundings 0, step, 2·step, ... and the full depth of the tank, strictly increasing, m.

    A regular value closer than a quarter step to the full depth is dropped.
    """
    z_low, z_high = tank_depth(hull, box)
    full = z_high - z_low
    regular = np.arange(0.0, full, step_m)
    regular = regular[regular < full - 0.25 * step_m]
    return np.append(regular, full)


def _liquid(geom: _TankGeometry, levels_z: np.ndarray) -> dict[str, np.ndarray]:
    """Volume (m³) and first moments (m⁴) of the liquid below each level z (m)."""
    n_lev, n_x = len(levels_z), len(geom.x_m)
    sections = np.broadcast_to(geom.sections, (n_lev, n_x))
    big = 1e4
    cut = shapely.box(-big, -big, big, np.broadcast_to(levels_z[:, None], (n_lev, n_x)))
    wet = shapely.intersection(sections, cut)
    area = shapely.area(wet)
    cen = shapely.centroid(wet)
    full = ~shapely.is_empty(cen)
    cy = np.zeros(area.shape)
    cz = np.zeros(area.shape)
    xy = shapely.get_coordinates(cen[full])
    cy[full], cz[full] = xy[:, 0], xy[:, 1]
    x = geom.x_m
    return {
        "volume": simpson(area, x=x, axis=-1),
        "mx": simpson(area * x, x=x, axis=-1),
        "my": simpson(area * cy, x=x, axis=-1),
        "mz": simpson(area * cz, x=x, axis=-1),
    }


def _free_surface_inertia(geom: _TankGeometry, levels_z: np.ndarray) -> np.ndarray:
    """Transverse second moment of the free surface at each level z about its centroid, m⁴."""
    n_lev, n_x = len(levels_z), len(geom.x_m)
    sections = np.broadcast_to(geom.sections, (n_lev, n_x)).ravel()
    z = np.broadcast_to(levels_z[:, None], (n_lev, n_x)).ravel()
    big = 1e4
    coords = np.stack(
        [np.column_stack([np.full_like(z, -big), z]), np.column_stack([np.full_like(z, big), z])],
        axis=1,
    )
    lines = shapely.linestrings(coords)
    cut = shapely.intersection(sections, lines)
    parts, index = shapely.get_parts(cut, return_index=True)
    b = shapely.bounds(parts)
    y1, y2 = b[:, 0], b[:, 2]
    ok = ~np.isnan(y1)
    width = np.zeros(len(z))
    m1 = np.zeros(len(z))
    m2 = np.zeros(len(z))
    np.add.at(width, index[ok], (y2 - y1)[ok])
    np.add.at(m1, index[ok], ((y2**2 - y1**2) / 2.0)[ok])
    np.add.at(m2, index[ok], ((y2**3 - y1**3) / 3.0)[ok])
    x = geom.x_m
    area = simpson(width.reshape(n_lev, n_x), x=x, axis=-1)
    first = simpson(m1.reshape(n_lev, n_x), x=x, axis=-1)
    second = simpson(m2.reshape(n_lev, n_x), x=x, axis=-1)
    with np.errstate(invalid="ignore", divide="ignore"):
        ybar = np.where(area > 0, first / np.where(area > 0, area, 1.0), 0.0)
    # Parallel-axis theorem: i about the centroid = i about the centreline − A·ȳ².
    return np.maximum(second - area * ybar**2, 0.0)


def tank_table(hull: Hull, box: TankBox, soundings_m: np.ndarray) -> dict[str, np.ndarray]:
    """Sounding table of the tank cut out of `hull` by `box`.

    soundings_m: strictly increasing, from 0 (the tank's lowest point) to at most the full
    depth, m. Returns columns sounding (m), volume (m³), lcg, vcg, tcg (m, of the liquid)
    and fsi (m⁴). At a zero sounding the volume is 0, lcg and tcg are those of a vanishing
    layer at the bottom and vcg is the bottom itself (the limit as the volume goes to zero).
    """
    s = np.asarray(soundings_m, dtype=float)
    if s.ndim != 1 or s.size < 2 or np.any(np.diff(s) <= 0) or s[0] < 0:
        raise ValueError("soundings must be a strictly increasing list starting at 0 m or above")
    geom = _tank_geometry(hull, box)
    full = geom.z_high - geom.z_low
    if s[-1] > full + 1e-9:
        raise ValueError(f"sounding {s[-1]} m is above the tank top ({full} m)")
    levels = np.minimum(geom.z_low + s, geom.z_high)
    liq = _liquid(geom, levels)
    vol = liq["volume"]
    with np.errstate(invalid="ignore", divide="ignore"):
        lcg = liq["mx"] / vol
        tcg = liq["my"] / vol
        vcg = liq["mz"] / vol
    empty = vol <= 0.0
    if np.any(empty):
        thin = _liquid(geom, np.array([geom.z_low + 1e-3 * full]))
        lcg[empty] = thin["mx"][0] / thin["volume"][0]
        tcg[empty] = thin["my"][0] / thin["volume"][0]
        vcg[empty] = geom.z_low
        vol[empty] = 0.0
    return {
        "sounding": s,
        "volume": vol,
        "lcg": lcg,
        "vcg": vcg,
        "tcg": tcg,
        "fsi": _free_surface_inertia(geom, levels),
    }
