"""The vessel's tables as arrays, made once per vessel (the models are frozen, so the arrays
made from one cannot go stale). Everything downstream of this module takes these arrays and
plain values, never the file models."""

from __future__ import annotations

import weakref
from dataclasses import dataclass
from functools import cached_property
from typing import TYPE_CHECKING

import numpy as np
from shapely.geometry import Polygon

from reportgen.floating import HydroTable, table_axis
from reportgen.inputs.vessel import rows_of
from reportgen.loading import TankTable, VesselTank, vessel_tank
from reportgen.stability import CrossCurves

if TYPE_CHECKING:
    from reportgen.hull.hydrostatics import HullGeometry
    from reportgen.inputs import Vessel


@dataclass(frozen=True, eq=False)  # arrays: == has no truth value; compared by identity
class AngleTable:
    """An angle table (deck edge or flooding): trims m or None, displacement t, angle (k, n)
    deg."""

    trims: np.ndarray | None
    displacement: np.ndarray
    angle: np.ndarray
    opening: np.ndarray | None = None  # (k, n) names of the governing openings, or None

    @cached_property
    def lists(self) -> tuple[tuple[list[float], float, float], list[list[float]],
                             tuple[list[float], float, float] | None]:
        """(the displacement axis, the angle rows, the trim axis or None) as lists, each axis
        with its least and largest value (floating.table_axis), made once, for
        reportgen.interp."""
        return (table_axis(self.displacement), self.angle.tolist(),
                None if self.trims is None else table_axis(self.trims))


def _trims(values: list[float] | None) -> np.ndarray | None:
    return None if values is None else np.asarray(values, dtype=float)


def hydro_table(h) -> HydroTable:
    """Arrays of a vessel file's `hydrostatics` block."""
    k = 1 if h.trims is None else len(h.trims)
    draft = np.asarray(h.draft, dtype=float)
    return HydroTable(float(h.density), _trims(h.trims), np.tile(draft, (k, 1)),
                      *(rows_of(getattr(h, n), k) for n in
                        ("displacement", "lcb", "lcf", "kmt", "mct", "tpc", "lwl", "cb")))


def cross_curves(cc) -> CrossCurves:
    """Arrays of a vessel file's `cross_curves` block (kn as (k, n_disp, n_heel))."""
    kn = np.asarray(cc.kn, dtype=float)
    return CrossCurves(np.asarray(cc.heel, dtype=float), np.asarray(cc.displacement, dtype=float),
                       _trims(cc.trims), kn.reshape((-1,) + kn.shape[-2:]))


def angle_table(t) -> AngleTable | None:
    if t is None:
        return None
    k = 1 if t.trims is None else len(t.trims)
    names = None if getattr(t, "opening", None) is None else \
        np.asarray(t.opening, dtype=object).reshape(k, -1)
    return AngleTable(_trims(t.trims), np.asarray(t.displacement, dtype=float),
                      rows_of(t.angle, k), names)


@dataclass(frozen=True, eq=False)  # arrays: == has no truth value; compared by identity
class VesselData:
    """Arrays and polygons of one vessel's tables; the hull geometry made when first asked."""

    hydro: HydroTable | None
    cross: CrossCurves | None
    profile: Polygon
    tanks: tuple[VesselTank, ...]  # in the vessel's order, with their tables' arrays
    deck_edge: AngleTable | None
    flooding: AngleTable | None
    stations: tuple | None  # the hull offsets: ((x m, (n, 2) array of y, z m), ...)
    length_bp_m: float

    @cached_property
    def hull(self) -> HullGeometry | None:
        """The hull offsets prepared for clipping, or None without offsets."""
        if self.stations is None:
            return None
        from reportgen.hull.hydrostatics import prepare_hull
        from reportgen.hull.sections import hull_from_stations

        return prepare_hull(hull_from_stations(list(self.stations)), self.length_bp_m)


def make_vessel_data(vessel: Vessel) -> VesselData:
    untabled = [t.id for t in vessel.tanks if t.table is None]
    if untabled:  # a tank given by geometry alone: `reportgen tables` makes its table
        from reportgen.errors import InputError

        raise InputError(f"tanks {', '.join(untabled)} have a geometry but no table; make the "
                         f"tables first with 'reportgen tables'")
    tanks = tuple(vessel_tank(t, TankTable.from_columns(t.table.sounding, t.table.volume,
                                                        t.table.lcg, t.table.vcg, t.table.tcg,
                                                        t.table.fsi))
                  for t in vessel.tanks)
    stations = None if vessel.hull is None else tuple(
        (float(s.x), np.asarray(s.points, dtype=float).reshape(-1, 2))
        for s in vessel.hull.stations)
    return VesselData(
        hydro_table(vessel.hydrostatics) if vessel.hydrostatics is not None else None,
        cross_curves(vessel.cross_curves) if vessel.cross_curves is not None else None,
        Polygon(vessel.windage.profile),
        tanks,
        angle_table(vessel.deck_edge),
        angle_table(vessel.flooding_angle),
        stations,
        float(vessel.particulars.length_bp),
    )


_BY_VESSEL: dict[int, VesselData] = {}


def vessel_data(vessel: Vessel) -> VesselData:
    """`make_vessel_data(vessel)`, made once per vessel object (keyed by identity, removed
    when the object is collected)."""
    key = id(vessel)
    hit = _BY_VESSEL.get(key)
    if hit is None:
        hit = make_vessel_data(vessel)
        _BY_VESSEL[key] = hit
        weakref.finalize(vessel, _BY_VESSEL.pop, key, None)
    return hit
