"""Shared hull shapes for the hull tests (analytic forms, not project data)."""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np


def box_stations(length: float, breadth: float, depth: float, n: int = 11
                 ) -> list[tuple[float, np.ndarray]]:
    """A rectangular barge: every station the half-section (0,0)-(B/2,0)-(B/2,D)."""
    half = np.array([[0.0, 0.0], [breadth / 2, 0.0], [breadth / 2, depth]])
    return [(float(x), half) for x in np.linspace(0.0, length, n)]


def wigley_stations(length: float, breadth: float, draft: float, depth: float,
                    n_stations: int = 41, n_z: int = 41) -> list[tuple[float, np.ndarray]]:
    """Wigley hull (W. C. S. Wigley, 1934): y = B/2·(1 - ξ²)(1 - ζ²), ξ = 2x/L - 1,
    ζ = (T - z)/T the depth below the design waterline over T (so y = 0 at the keel and
    y = B/2·(1 - ξ²) at the waterline); wall-sided above the waterline up to the depth."""
    out = []
    z = np.linspace(0.0, draft, n_z)
    for x in np.linspace(0.0, length, n_stations):
        xi = 2 * x / length - 1
        zeta = (draft - z) / draft
        y = 0.5 * breadth * (1 - xi**2) * (1 - zeta**2)
        pts = np.column_stack([y, z])
        pts = np.vstack([pts, [pts[-1, 0], depth]])
        out.append((float(x), pts))
    return out


def vessel_ns(stations, length, breadth, depth, summer_draft, lightship_mass,
              density=1.025, openings=()):
    """A stand-in for reportgen.inputs.Vessel with the attributes build_tables reads."""
    return SimpleNamespace(
        hull=SimpleNamespace(
            density=density,
            stations=[SimpleNamespace(x=x, points=p.tolist()) for x, p in stations],
        ),
        particulars=SimpleNamespace(length_bp=length, breadth=breadth, depth=depth,
                                    summer_draft=summer_draft),
        lightship=SimpleNamespace(mass=lightship_mass),
        openings=[SimpleNamespace(name=n, x=x, y=y, z=z) for n, x, y, z in openings],
    )
