"""Tables from few, unevenly spaced stations: a barge with raked ends described by seven
stations gives its exact displacement, or is refused (issue: faithful integration or an
honest refusal).

Analytic: box sections of breadth B whose keel rises linearly from 0 to H over R metres at
each end, so the immersed section area B·(T − z_keel(x)) varies linearly between stations and
V = B·(T·L − 2·(R·H/2)) for T above H (hand derivation).
"""

from __future__ import annotations

import numpy as np
import pytest
from hull_helpers import vessel_ns

from reportgen.hull.tables import build_tables

L, B, D, H, R, RHO = 100.0, 16.0, 8.0, 2.0, 20.0, 1.025
STATIONS_X = [0.0, 8.0, 20.0, 50.0, 80.0, 92.0, 100.0]  # uneven spacing, kinks on stations


def _keel_m(x: float) -> float:
    return H * max(0.0, (R - x) / R, (x - (L - R)) / R)


def test_raked_barge_from_seven_stations_is_exact_or_refused():
    stations = [(x, np.array([[0.0, _keel_m(x)], [B / 2, _keel_m(x)], [B / 2, D]]))
                for x in STATIONS_X]
    vessel = vessel_ns(stations, L, B, D, 5.0, 800.0, RHO)
    try:
        tables = build_tables(vessel, heels_deg=[0.0, 30.0, 60.0])
    except ValueError as exc:  # an honest refusal must name where the stations are too far
        assert "x = " in str(exc)
        return
    h = tables["hydrostatics"]
    checked = 0
    for draft, displacement in zip(h["draft"], h["displacement"], strict=True):
        if draft > H:
            exact = RHO * B * (draft * L - 2 * (R * H / 2))
            assert displacement == pytest.approx(exact, rel=0.01)
            checked += 1
    assert checked > 3
