"""The condition file (SPEC.md, `format: reportgen/condition-1`): its pydantic model.

Units: t, m, t/m³, m², percent of a tank's capacity.
"""

from typing import Annotated, Any, Literal, Self

from pydantic import AfterValidator, Field, model_validator

from reportgen.inputs.fields import (
    Density,
    IsoDate,
    Model,
    NonNegative,
    Num,
    Percent,
    Positive,
    Text,
    WaterDensity,
)
from reportgen.inputs.grain import ConditionGrain
from reportgen.inputs.special import ConditionPassengers
from reportgen.inputs.vessel import known_sets

CONDITION_FORMAT = "reportgen/condition-1"
FILLING_KINDS = ("percent", "volume", "sounding", "ullage", "mass")


class ConditionInfo(Model):
    title: Text  # the condition's title, printed on the sheet
    voyage: Text | None = None  # the voyage; the sheet says "not stated" without it
    date: IsoDate | None = None  # YYYY-MM-DD, a real date; "not stated" without it
    water_density: WaterDensity = 1.025  # t/m³, of the water the ship floats in
    arrival: bool = False  # true: arrival; timber deck cargo has absorbed water (is2008.timber)


class Filling(Model):
    """One tank's filling: exactly one of the kinds, and optionally the liquid's density."""

    percent: Percent | None = None  # % of the tank's capacity
    volume: NonNegative | None = None  # m³
    sounding: NonNegative | None = None  # m
    ullage: NonNegative | None = None  # m, below the tank's ullage_reference
    mass: NonNegative | None = None  # t
    density: Density | None = None  # t/m³, overrides the tank's

    @model_validator(mode="after")
    def _exactly_one(self) -> Self:
        given = [k for k in FILLING_KINDS if getattr(self, k) is not None]
        if len(given) != 1:
            raise ValueError("give exactly one of " + ", ".join(FILLING_KINDS)
                             + (f" (given: {', '.join(given)})" if given else ""))
        return self

    @property
    def kind(self) -> str:
        for k in FILLING_KINDS:  # a loop, not next(generator): read for every tank filled
            if getattr(self, k) is not None:
                return k
        raise AssertionError("a filling has one kind (checked by the model)")

    @property
    def value(self) -> float:
        return getattr(self, self.kind)


class Item(Model):
    name: Text  # the item's name, printed as its loading line
    mass: Positive  # t
    lcg: Num  # m from AP
    vcg: Num  # m above base
    tcg: Num = 0.0  # m, + starboard
    wind_area: NonNegative | None = None  # m², adds to the lateral windage; 0 states that the
    # item adds none (an item above the deck without wind_area gets a warning)
    wind_z: Num | None = None  # m, centroid of wind_area above base
    timber: bool = False  # timber deck cargo (IS Code 2008 Part A 3.3)

    @model_validator(mode="after")
    def _wind(self) -> Self:
        if self.wind_area and self.wind_z is None:
            raise ValueError("wind_area needs wind_z (its centroid above base, m)")
        if self.wind_z is not None and not self.wind_area:
            raise ValueError("wind_z is given without wind_area")
        return self


class Weather(Model):
    roll_angle: Annotated[float, Field(gt=0, le=60)] | None = None  # θ1, deg: replaces the formula
    roll_angle_source: Text | None = None  # the report θ1 comes from, printed on the sheet

    @model_validator(mode="after")
    def _source(self) -> Self:
        if self.roll_angle is not None and self.roll_angle_source is None:
            raise ValueError("roll_angle needs roll_angle_source (the report it comes from)")
        if self.roll_angle is None and self.roll_angle_source is not None:
            raise ValueError("roll_angle_source is given without roll_angle")
        return self


class Reading(Model):
    port: Positive  # extreme draught read at the mark on the port side, m
    starboard: Positive  # extreme draught read at the mark on the starboard side, m


class Observed(Model):
    """The draughts read at the marks (extreme, m) and the water alongside (SPEC.md)."""

    aft: Reading  # the readings at the aft marks, m
    mid: Reading  # the readings at the midships marks, m
    fore: Reading  # the readings at the forward marks, m
    density: WaterDensity | None = None  # t/m³, of the water alongside (default: the condition's)
    tolerance: Annotated[float, Field(gt=0, le=5)] = 0.5  # % of displacement


class Signatories(Model):
    prepared_by: Text | None = None  # who prepares; the signing certificate's name must match
    checked_by: Text | None = None  # who checks; the signing certificate's name must match
    reviewed_by: Text | None = None  # who reviews; the signing certificate's name must match


def _chosen_sets(values: list[str]) -> list[str]:
    if not values:
        raise ValueError("choose at least one criteria set, or leave criteria out")
    return known_sets(values)


class Condition(Model):
    format: Literal["reportgen/condition-1"]  # format id: reportgen/condition-1
    vessel: Text  # path of the vessel data file, relative to the condition file
    condition: ConditionInfo  # title, voyage, date and water density
    tanks: dict[str, Filling] = Field(default_factory=dict)  # fillings by tank id; others are empty
    items: list[Item]  # cargo, stores, crew, deck cargo (may be empty)
    free_surface: Literal["code", "actual", "maximum"] = "code"  # free-surface rule, Part B 3.1
    criteria: Annotated[list[str], AfterValidator(_chosen_sets)] | None = None  # replaces vessel's
    # criteria sets: each must be in the vessel's criteria or permitted_criteria
    weather: Weather | None = None  # a roll angle θ1 in place of the 2.3.4 formula
    passengers: ConditionPassengers | None = None  # passengers on board (IS Code 2008 Part A 3.1)
    icing: Literal["full", "half", "none"] = "none"  # ice allowance (IS Code 2008 Part B chapter 6)
    signatories: Signatories | None = None  # the persons named for the signature roles
    observed: Observed | None = None  # draughts read alongside (needs the vessel's marks)
    grain: ConditionGrain | None = None  # grain in bulk (SPEC grain.2008)
    notes: Any = None  # free text or data, not read by the calculation
