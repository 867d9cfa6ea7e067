"""Property tests (hypothesis) of hydrostatics and equilibrium on the Wigley hull.

Physical facts (Archimedes; symmetry of a hull about its centreline plane; Rawson & Tupper,
Basic Ship Theory, ch. 4): displacement grows with draught; KN(0°) = 0 for a hull symmetric
about the centreline; KN(-θ) = -KN(θ) for such a hull; the equilibrium at heel immerses the
prescribed volume (the upright volume at the same displacement).
"""

from __future__ import annotations

import pytest
from hull_helpers import wigley_stations
from hypothesis import given, settings
from hypothesis import strategies as st

from reportgen.hull.equilibrium import equilibrium
from reportgen.hull.hydrostatics import Plane, hydrostatics_at, integrals_at, prepare_hull
from reportgen.hull.sections import hull_from_stations

L, B, T, D, RHO = 90.0, 14.0, 5.0, 8.0, 1.025
GEOM = prepare_hull(hull_from_stations(wigley_stations(L, B, T, D, n_stations=21, n_z=21)), L)
FAST = settings(max_examples=15, deadline=None)


@FAST
@given(t1=st.floats(0.2, 7.8), dt=st.floats(0.01, 2.0))
def test_displacement_increases_with_draught(t1, dt):
    t2 = min(t1 + dt, 7.99)
    d1 = hydrostatics_at(GEOM, Plane(t1, 0.0, 0.0), RHO)["displacement"]
    d2 = hydrostatics_at(GEOM, Plane(t2, 0.0, 0.0), RHO)["displacement"]
    assert d2 > d1


@FAST
@given(draft=st.floats(1.0, 7.0))
def test_kn_zero_upright(draft):
    vol = integrals_at(GEOM, Plane(draft, 0.0, 0.0)).volume_m3
    assert equilibrium(GEOM, vol, 0.0, lcg_m=L / 2).kn_m == pytest.approx(0.0, abs=1e-9)


@FAST
@given(draft=st.floats(1.0, 7.0), heel=st.floats(1.0, 90.0), free=st.booleans())
def test_kn_odd_in_heel(draft, heel, free):
    vol = integrals_at(GEOM, Plane(draft, 0.0, 0.0)).volume_m3
    lcg = L / 2 if free else None
    kn_s = equilibrium(GEOM, vol, heel, lcg_m=lcg).kn_m
    kn_p = equilibrium(GEOM, vol, -heel, lcg_m=lcg).kn_m
    assert kn_p == pytest.approx(-kn_s, abs=1e-6)


@FAST
@given(draft=st.floats(1.0, 7.0), heel=st.floats(0.0, 90.0), shift=st.floats(-2.0, 2.0))
def test_heeled_volume_equals_upright_volume(draft, heel, shift):
    vol = integrals_at(GEOM, Plane(draft, 0.0, 0.0)).volume_m3
    e = equilibrium(GEOM, vol, heel, lcg_m=L / 2 + shift)
    check = integrals_at(GEOM, e.plane)  # re-integrate at the found plane
    assert check.volume_m3 == pytest.approx(vol, rel=1e-8)
    assert check.mx_m4 / check.volume_m3 == pytest.approx(L / 2 + shift, abs=1e-5)
