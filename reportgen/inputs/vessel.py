"""The vessel data file (SPEC.md, `format: reportgen/vessel-1`): its pydantic model.

Units: t, m, t/m³, deg, m², m⁴, t·m/cm, t/cm. Axes: x from AP forward, y to starboard, z up
from the moulded base; trims positive by the stern.
"""

from typing import Annotated, Any, Literal, Self

from pydantic import AfterValidator, Field, model_validator
from shapely.geometry import Polygon

from reportgen.criteria.sets import SETS
from reportgen.inputs.booklet import LimitingCurve
from reportgen.inputs.fields import (
    Model,
    Num,
    Percent,
    Point2,
    Positive,
    Text,
)
from reportgen.inputs.grain import VesselGrain
from reportgen.inputs.hullform import AngleTable, HullOffsets, Opening
from reportgen.inputs.marks import DraughtMarks, check_marks
from reportgen.inputs.special import VesselIcing, VesselPassengers, vessel_problems
from reportgen.inputs.tablecheck import (
    curve_problems,
    hull_problems,
    opening_problems,
    particulars_problems,
    table_problems,
    tank_problems,
)
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
    name: Text  # the ship's name, printed on every document
    identifier: Text  # the ship's identifier, printed beside its name on every document
    type: Text = "cargo"  # the ship's type in a free word (general cargo, passenger, ...)


class Lightship(Model):
    mass: Positive  # t, lightship mass
    lcg: Num  # m from AP, lightship LCG
    vcg: Num  # m above base, lightship VCG (KG)
    tcg: Num = 0.0  # m from the centreline, + starboard


class Windage(Model):
    profile: list[Point2]  # [x, z], m: lateral projection of hull and superstructure
    # a closed polygon (Part A 2.3.2.2: the lateral area A and its centre)

    @model_validator(mode="after")
    def _polygon(self) -> Self:
        if len(self.profile) < 3:
            raise ValueError("profile needs at least three points")
        poly = Polygon(self.profile)
        if not poly.is_valid or poly.area <= 0:
            raise ValueError("profile must be a simple closed polygon with positive area")
        return self

    @property
    def top_m(self) -> float:
        """The top of the windage profile above the base (m): SPEC.md "Conventions" bounds
        every centre of mass by it."""
        return max(z for _x, z in self.profile)


class Calculation(Model):
    method: Literal["tables", "hull"] = "tables"  # read the tables, or compute on the offsets
    wind_lever: Literal["half_draft", "underwater_centre"] = "half_draft"  # Z of Part A 2.3.2.2
    # from the centre of A to half the mean draught (half_draft), or to the centre of the
    # underwater lateral area (underwater_centre)
    full_percent: Annotated[Percent, Field(ge=90)] = 98.0  # tank full at this % (Part B 3.1.2)
    gz_beyond_flooding: Literal["exclude", "include"] = "exclude"  # GZ past θf in 2.2.2, 2.2.3
    # exclude: the curve is credited up to θf only; include: to the end of the table


# Calculation() without validation (model_construct): equal to it, every field at its default,
# but its validator is not built at import (it is built with the Vessel's, when first used).
DEFAULT_CALCULATION = Calculation.model_construct()


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
    format: Literal["reportgen/vessel-1"]  # format id: reportgen/vessel-1
    vessel: VesselId  # the ship's name, identifier and type
    source: dict[str, Text] | None = None  # where the data come from, printed on every sheet
    particulars: Particulars  # Lpp, breadth, depth, summer draught, keel, bilge (m, m²)
    lightship: Lightship  # lightship mass (t) and centre of gravity (m)
    hydrostatics: Hydrostatics | None = None  # hydrostatic table by draught; goes with cross_curves
    cross_curves: CrossCurves | None = None  # KN by displacement and heel; goes with hydrostatics
    deck_edge: AngleTable | None = None  # deck edge immersion angle by displacement (deg)
    openings: list[Opening] = Field(default_factory=list)  # unprotected openings, for θf
    # (they need hull offsets or a flooding_angle table)
    flooding_angle: AngleTable | None = None  # angle of flooding θf by displacement (deg)
    windage: Windage  # lateral windage profile for the weather criterion (Part A 2.3)
    tanks: list[Tank] = Field(default_factory=list)  # the ship's tanks: content, density, table
    criteria: CriteriaSets  # criteria sets every condition is checked against
    permitted_criteria: Annotated[list[str], AfterValidator(known_sets)] = Field(
        default_factory=list)  # sets a condition may choose instead (its `criteria`)
    calculation: Calculation = DEFAULT_CALCULATION  # calculation choices, each stated on the sheet
    limiting_kg: LimitingCurve | None = None  # the booklet's curve (criteria set booklet.limits)
    limiting_gm: LimitingCurve | None = None  # the same as a minimum GM curve (gm:)
    hull: HullOffsets | None = None  # hull offsets: for `reportgen tables`, the hull method and θf
    draught_marks: DraughtMarks | None = None  # x of the marks, m from AP
    passengers: VesselPassengers | None = None  # passenger decks (IS Code 2008 Part A 3.1)
    icing: VesselIcing | None = None  # decks that ice up (IS Code 2008 Part B chapter 6)
    grain: VesselGrain | None = None  # grain compartments (Grain Code; SPEC grain.2008)
    notes: Any = None  # free text or data, not read by the calculation

    @model_validator(mode="after")
    def _whole(self) -> Self:
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
        problems = (table_problems(self.particulars, self.hydrostatics, self.cross_curves,
                                   self.grain) + hull_problems(self.particulars, self.hull))
        if problems:
            raise ValueError("implausible tables: " + "; ".join(problems))
        top = self.windage.top_m
        problems = (particulars_problems(self.particulars, self.hydrostatics,
                                         self.windage.profile)
                    + curve_problems(self.particulars, {"deck_edge": self.deck_edge,
                                                        "flooding_angle": self.flooding_angle},
                                     self.limiting_kg or self.limiting_gm, top)
                    + tank_problems(self.particulars, self.tanks, top)
                    + opening_problems(self.particulars, self.openings, top)
                    + vessel_problems(self.particulars, self.passengers, self.icing, top))
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
