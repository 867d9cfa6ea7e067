"""The hull's form in the vessel file (SPEC.md "Vessel data"): the offsets, the unprotected
openings and the deck-edge and flooding-angle tables, as pydantic models (apart from the
vessel model, so that the plausibility checks of reportgen.inputs.tablecheck can name them
without importing it).

Units: m, deg, t. Axes: x from AP forward, y to starboard, z up from the moulded base; trims
positive by the stern.
"""

from itertools import pairwise
from typing import Annotated, Self

from pydantic import Field, model_validator

from reportgen.inputs.fields import Density, Increasing, Model, Num, Point2, Text, increasing
from reportgen.inputs.tables import Trims, per_trim

Angle = Annotated[float, Field(ge=0, le=90)]  # 0: immersed already upright


class AngleTable(Model):
    trims: Trims | None = None  # m, + by the stern: the trims of the rows of `angle`
    displacement: Increasing  # t, strictly increasing, at the hydrostatic table's density
    angle: list[Angle] | list[list[Angle]]  # deg: angle[i], or angle[k][i] with trims
    opening: list[Text] | list[list[Text]] | None = None  # governing opening's name by entry
    # (flooding_angle only) shaped as `angle`; each one of `openings`

    @model_validator(mode="after")
    def _rows(self) -> Self:
        per_trim(self, "angle", self.trims, len(self.displacement))
        per_trim(self, "opening", self.trims, len(self.displacement))
        return self


class Opening(Model):
    name: Text  # the opening's name, printed when it governs θf
    x: Num  # m from AP
    y: Num  # m from centreline, + starboard
    z: Num  # m above base


class Station(Model):
    x: Num  # m from AP
    points: list[Point2]  # [y, z], m: starboard half-section, keel to deck edge

    @model_validator(mode="after")
    def _offsets(self) -> Self:
        pts = self.points  # [y, z] pairs (Point2); a few dozen: plain floats
        if len(pts) < 2:
            raise ValueError("a station needs at least two points (keel to deck edge)")
        if any(y < 0 for y, _ in pts):
            raise ValueError("half-breadths y must not be negative (starboard half-section)")
        if any(b[1] - a[1] < 0 for a, b in pairwise(pts)):
            raise ValueError("points must run from the keel to the deck edge, z not decreasing")
        return self


class HullOffsets(Model):
    density: Density = 1.025  # t/m³, for the tables made from the offsets
    stations: list[Station]  # sections, at least three, x strictly increasing

    @model_validator(mode="after")
    def _stations(self) -> Self:
        if len(self.stations) < 3:
            raise ValueError("needs at least three stations")
        increasing([s.x for s in self.stations])
        return self
