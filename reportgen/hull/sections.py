"""Hull sections from offsets: the starboard half-section mirrored to port.

Axes (SPEC.md): x from the aft perpendicular forward, y from the centreline to starboard,
z from the moulded baseline up; all lengths in metres.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from shapely.geometry import Polygon
from shapely.validation import make_valid


@dataclass(frozen=True)
class Hull:
    """Stations of a hull, ordered by x.

    x_m: station positions, m from AP, strictly increasing.
    sections: the closed section polygon of each station in the (y, z) plane, m.
    half_points: the starboard offsets of each station as given, (n, 2) arrays of (y, z), m.
    """

    x_m: np.ndarray
    sections: tuple[Polygon, ...]
    half_points: tuple[np.ndarray, ...]

    @property
    def deck_edge_yz(self) -> np.ndarray:
        """(n_stations, 2) array: the last (deck-edge) offset point of each station, m."""
        return np.array([p[-1] for p in self.half_points], dtype=float)


def section_polygon(half_points_yz: np.ndarray) -> Polygon:
    """Closed section from a starboard half-section.

    half_points_yz: (n, 2) offsets (y, z) from the keel to the deck edge, z increasing, m.
    The half is mirrored to port and closed across the deck by a straight line between
    the two deck-edge points and, where the first point is off the centreline, across the
    bottom. A station of zero width gives an empty polygon.
    """
    pts = np.asarray(half_points_yz, dtype=float)
    starboard = pts
    port = pts[::-1] * np.array([-1.0, 1.0])
    ring = np.vstack([starboard, port])
    # Drop consecutive duplicates (a point on the centreline appears twice).
    keep = np.ones(len(ring), dtype=bool)
    keep[1:] = np.any(np.abs(np.diff(ring, axis=0)) > 1e-12, axis=1)
    ring = ring[keep]
    if len(ring) < 3 or np.max(np.abs(ring[:, 0])) < 1e-9:
        return Polygon()
    poly = Polygon(ring)
    if not poly.is_valid:
        poly = make_valid(poly)
        if poly.geom_type != "Polygon":
            polys = [g for g in getattr(poly, "geoms", []) if g.geom_type == "Polygon"]
            poly = max(polys, key=lambda g: g.area) if polys else Polygon()
    return poly


def hull_from_stations(stations: list[tuple[float, np.ndarray]]) -> Hull:
    """Hull from (x, half_points) pairs; x in m from AP, half_points as in section_polygon."""
    order = sorted(stations, key=lambda s: s[0])
    x = np.array([s[0] for s in order], dtype=float)
    if np.any(np.diff(x) <= 0):
        raise ValueError("hull stations must have distinct x positions")
    half = tuple(np.asarray(s[1], dtype=float) for s in order)
    return Hull(x_m=x, sections=tuple(section_polygon(p) for p in half), half_points=half)
