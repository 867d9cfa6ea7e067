"""The condition file (SPEC.md, `format: reportgen/condition-1`): its pydantic model.

Units: t, m, t/m³, m², percent of a tank's capacity.
"""

from __future__ import annotations

from typing import Annotated, Any, Literal

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
    title: Text
    voyage: Text | None = None
    date: IsoDate | None = None
    water_density: WaterDensity = 1.025  # t/m³
    arrival: bool = False  # timber deck cargo water absorption (SPEC, is2008.timber)


class Filling(Model):
    """One tank's filling: exactly one of the kinds, and optionally the liquid's density."""

    percent: Percent | None = None  # of the tank's capacity
    volume: NonNegative | None = None  # m³
    sounding: NonNegative | None = None  # m
    ullage: NonNegative | None = None  # m, below the tank's ullage_reference
    mass: NonNegative | None = None  # t
    density: Density | None = None  # t/m³, overrides the tank's

    @model_validator(mode="after")
    def _exactly_one(self) -> Filling:
        given = [k for k in FILLING_KINDS if getattr(self, k) is not None]
        if len(given) != 1:
            raise ValueError("give exactly one of " + ", ".join(FILLING_KINDS)
                             + (f" (given: {', '.join(given)})" if given else ""))
        return self

    @property
    def kind(self) -> str:
        return next(k for k in FILLING_KINDS if getattr(self, k) is not None)

    @property
    def value(self) -> float:
        return getattr(self, self.kind)


class Item(Model):
    name: Text
    mass: Positive  # t
    lcg: Num  # m from AP
    vcg: Num  # m above base
    tcg: Num = 0.0  # m, + starboard
    wind_area: NonNegative | None = None  # m², adds to the lateral windage
    wind_z: Num | None = None  # m, centroid of wind_area above base
    timber: bool = False  # timber deck cargo (IS Code 2008 Part A 3.3)

    @model_validator(mode="after")
    def _wind(self) -> Item:
        if self.wind_area and self.wind_z is None:
            raise ValueError("wind_area needs wind_z (its centroid above base, m)")
        if self.wind_z is not None and not self.wind_area:
            raise ValueError("wind_z is given without wind_area")
        return self


class Weather(Model):
    roll_angle: Annotated[float, Field(gt=0, le=60)] | None = None  # θ1, deg
    roll_angle_source: Text | None = None

    @model_validator(mode="after")
    def _source(self) -> Weather:
        if self.roll_angle is not None and self.roll_angle_source is None:
            raise ValueError("roll_angle needs roll_angle_source (the report it comes from)")
        if self.roll_angle is None and self.roll_angle_source is not None:
            raise ValueError("roll_angle_source is given without roll_angle")
        return self


class Reading(Model):
    port: Positive  # extreme draught read at the mark on the port side, m
    starboard: Positive  # m


class Observed(Model):
    """The draughts read at the marks (extreme, m) and the water alongside (SPEC.md)."""

    aft: Reading
    mid: Reading
    fore: Reading
    density: WaterDensity | None = None  # t/m³, of the water alongside (default: the
    # condition's water_density)
    tolerance: Annotated[float, Field(gt=0, le=5)] = 0.5  # % of displacement


class Signatories(Model):
    prepared_by: Text | None = None
    checked_by: Text | None = None
    reviewed_by: Text | None = None


def _chosen_sets(values: list[str]) -> list[str]:
    if not values:
        raise ValueError("choose at least one criteria set, or leave criteria out")
    return known_sets(values)


class Condition(Model):
    format: Literal["reportgen/condition-1"]
    vessel: Text  # path of the vessel data file, relative to the condition file
    condition: ConditionInfo
    tanks: dict[str, Filling] = Field(default_factory=dict)
    items: list[Item]
    free_surface: Literal["code", "actual", "maximum"] = "code"
    criteria: Annotated[list[str], AfterValidator(_chosen_sets)] | None = None
    weather: Weather | None = None
    passengers: ConditionPassengers | None = None  # IS Code 2008 Part A 3.1
    icing: Literal["full", "half", "none"] = "none"  # IS Code 2008 Part B chapter 6
    signatories: Signatories | None = None
    observed: Observed | None = None  # draughts read alongside (needs the vessel's marks)
    grain: ConditionGrain | None = None  # grain in bulk (SPEC grain.2008)
    notes: Any = None
