"""The vessel data file (SPEC.md, `format: reportgen/vessel-1`): its pydantic model.

Units: t, m, t/m³, deg, m², m⁴, t·m/cm, t/cm. Axes: x from AP forward, y to starboard, z up
from the moulded base; trims positive by the stern.
"""

from __future__ import annotations

from typing import Annotated, Any, Literal

import numpy as np
from pydantic import AfterValidator, Field, model_validator
from shapely.geometry import Polygon

from reportgen.criteria.sets import SETS
from reportgen.inputs.booklet import LimitingCurve
from reportgen.inputs.fields import (
    Density,
    Increasing,
    Model,
    Num,
    Percent,
    Point2,
    Positive,
    Text,
    increasing,
)
from reportgen.inputs.grain import VesselGrain
from reportgen.inputs.marks import DraughtMarks, check_marks
from reportgen.inputs.special import VesselIcing, VesselPassengers, vessel_problems
from reportgen.inputs.tablecheck import table_problems
from reportgen.inputs.tables import (  # noqa: F401 (re-exported)
    CrossCurves,
    Hydrostatics,
    Particulars,
    Trims,
    per_trim,
    rows_of,
)
from reportgen.inputs.tanks import Tank, TankTable, default_role  # noqa: F401 (re-exported)

VESSEL_FORMAT = "reportgen/vessel-1"


class VesselId(Model):
    name: Text
    identifier: Text
    type: Text = "cargo"


class Lightship(Model):
    mass: Positive  # t
    lcg: Num  # m from AP
    vcg: Num  # m above base
    tcg: Num = 0.0  # m, + starboard


Angle = Annotated[float, Field(ge=0, le=90)]  # 0: immersed already upright


class AngleTable(Model):
    trims: Trims | None = None  # m, + by the stern
    displacement: Increasing  # t
    angle: list[Angle] | list[list[Angle]]  # deg: angle[i], or angle[k][i] with trims
    # optional (flooding angle): the governing opening's name at each entry, as `angle`
    opening: list[Text] | list[list[Text]] | None = None

    @model_validator(mode="after")
    def _rows(self) -> AngleTable:
        per_trim(self, "angle", self.trims, len(self.displacement))
        per_trim(self, "opening", self.trims, len(self.displacement))
        return self


class Opening(Model):
    name: Text
    x: Num  # m from AP
    y: Num  # m from centreline, + starboard
    z: Num  # m above base


class Windage(Model):
    profile: list[Point2]  # [x, z], m: closed polygon of the lateral projection

    @model_validator(mode="after")
    def _polygon(self) -> Windage:
        if len(self.profile) < 3:
            raise ValueError("profile needs at least three points")
        poly = Polygon(self.profile)
        if not poly.is_valid or poly.area <= 0:
            raise ValueError("profile must be a simple closed polygon with positive area")
        return self


class Station(Model):
    x: Num  # m from AP
    points: list[Point2]  # [y, z], m: starboard half-section, keel to deck edge

    @model_validator(mode="after")
    def _offsets(self) -> Station:
        pts = np.asarray(self.points, dtype=float).reshape(-1, 2)
        if len(pts) < 2:
            raise ValueError("a station needs at least two points (keel to deck edge)")
        if np.any(pts[:, 0] < 0):
            raise ValueError("half-breadths y must not be negative (starboard half-section)")
        if np.any(np.diff(pts[:, 1]) < 0):
            raise ValueError("points must run from the keel to the deck edge, z not decreasing")
        return self


class HullOffsets(Model):
    density: Density = 1.025  # t/m³, for the tables made from the offsets
    stations: list[Station]

    @model_validator(mode="after")
    def _stations(self) -> HullOffsets:
        if len(self.stations) < 3:
            raise ValueError("needs at least three stations")
        increasing([s.x for s in self.stations])
        return self


class Calculation(Model):
    method: Literal["tables", "hull"] = "tables"
    wind_lever: Literal["half_draft", "underwater_centre"] = "half_draft"
    full_percent: Annotated[Percent, Field(ge=90)] = 98.0  # Part B 3.1.2
    gz_beyond_flooding: Literal["exclude", "include"] = "exclude"


def known_sets(values: list[str]) -> list[str]:
    """The criteria set ids, each known (reportgen.criteria.sets) and listed once."""
    for v in values:
        if v not in SETS:
            raise ValueError(f"unknown criteria set {v!r}; known: {', '.join(SETS)}")
    if len(set(values)) != len(values):
        raise ValueError("a criteria set is listed twice")
    return values


def _some_sets(values: list[str]) -> list[str]:
    if not values:
        raise ValueError("choose at least one criteria set")
    return known_sets(values)


CriteriaSets = Annotated[list[str], AfterValidator(_some_sets)]


class Vessel(Model):
    format: Literal["reportgen/vessel-1"]
    vessel: VesselId
    source: dict[str, Text] | None = None  # where the data come from, printed on every sheet
    particulars: Particulars
    lightship: Lightship
    hydrostatics: Hydrostatics | None = None
    cross_curves: CrossCurves | None = None
    deck_edge: AngleTable | None = None
    openings: list[Opening] = Field(default_factory=list)
    flooding_angle: AngleTable | None = None
    windage: Windage
    tanks: list[Tank] = Field(default_factory=list)
    criteria: CriteriaSets
    permitted_criteria: Annotated[list[str], AfterValidator(known_sets)] = Field(
        default_factory=list)
    calculation: Calculation = Calculation()
    limiting_kg: LimitingCurve | None = None  # the booklet's curve (criteria set booklet.limits)
    limiting_gm: LimitingCurve | None = None  # the same as a minimum GM curve (gm:)
    hull: HullOffsets | None = None
    draught_marks: DraughtMarks | None = None  # x of the marks, m from AP
    passengers: VesselPassengers | None = None  # IS Code 2008 Part A 3.1
    icing: VesselIcing | None = None  # IS Code 2008 Part B chapter 6
    grain: VesselGrain | None = None  # grain compartments (Grain Code; SPEC grain.2008)
    notes: Any = None

    @model_validator(mode="after")
    def _whole(self) -> Vessel:
        if (self.hydrostatics is None) != (self.cross_curves is None):
            raise ValueError("hydrostatics and cross_curves go together: give both or neither")
        if not self.has_tables and self.hull is None:
            raise ValueError("give hydrostatics with cross_curves, or hull offsets")
        if self.calculation.method == "hull" and self.hull is None:
            raise ValueError("calculation.method hull needs hull offsets")
        if self.openings and self.hull is None and self.flooding_angle is None:
            raise ValueError("openings: the angle of flooding of an opening is found on the hull "
                             "offsets, and this file has none; give hull offsets (hull:) or the "
                             "booklet's flooding_angle table (no approximation of θf is safe "
                             "enough to print)")
        check_marks(self.draught_marks, self.particulars.length_bp)
        self._booklet_curve()
        named = getattr(self.flooding_angle, "opening", None) or []
        unknown = {n for row in named for n in (row if isinstance(row, list) else [row])} - {
            o.name for o in self.openings}
        if unknown:
            raise ValueError(f"flooding_angle.opening names {min(unknown)!r}, which is not "
                             f"one of the openings")
        if self.hull is None and any(t.table is None for t in self.tanks):
            raise ValueError("tanks: a tank given by geometry alone needs hull offsets to make "
                             "its table from")
        ids = [t.id for t in self.tanks]
        dup = sorted({i for i in ids if ids.count(i) > 1})
        if dup:
            raise ValueError(f"tank id listed twice: {', '.join(dup)}")
        by_id = {t.id: t for t in self.tanks}
        for t in self.tanks:
            if t.pair is None:
                continue
            twin = by_id.get(t.pair)
            if twin is None or twin.pair != t.id or twin.id == t.id:
                raise ValueError(f"tanks: {t.id} names {t.pair!r} as its pair; a pair is two "
                                 f"tanks of this vessel that name each other")
            if twin.content != t.content:
                raise ValueError(f"tanks: the pair {t.id}/{twin.id} holds different contents")
        problems = table_problems(self.particulars, self.hydrostatics, self.cross_curves,
                                  self.grain)
        if problems:
            raise ValueError("implausible tables: " + "; ".join(problems))
        top = max(z for _, z in self.windage.profile)
        problems = vessel_problems(self.particulars, self.passengers, self.icing, top)
        if problems:
            raise ValueError(problems[0])
        return self

    def _booklet_curve(self) -> None:
        if self.limiting_kg is not None and self.limiting_gm is not None:
            raise ValueError("give limiting_kg or limiting_gm, not both")
        if self.limiting_gm is not None and self.limiting_gm.gm is None:
            raise ValueError("limiting_gm: give the minimum GM as gm")
        wanted = "booklet.limits" in list(self.criteria) + list(self.permitted_criteria)
        if wanted and self.limiting_kg is None and self.limiting_gm is None:
            raise ValueError("criteria booklet.limits needs the booklet's curve: limiting_kg "
                             "(or limiting_gm)")

    @property
    def has_tables(self) -> bool:
        return self.hydrostatics is not None and self.cross_curves is not None

    @property
    def can_evaluate(self) -> bool:
        """Tables to read, or offsets to compute on (calculation.method hull)."""
        return self.has_tables or self.calculation.method == "hull"
