"""A tank of the vessel data file (SPEC.md `tanks`): its sounding table, or the box that
`reportgen tables` makes the table from, its content, role and transverse pair.

Units: m, m³, m⁴, t/m³. Axes: x from AP forward, y to starboard, z up from the moulded base.
"""

from typing import Annotated, Literal, Self

from pydantic import AfterValidator, model_validator

from reportgen.inputs.fields import (
    Column,
    Density,
    Increasing,
    Model,
    NonNegative,
    Num,
    Positive,
    Text,
    equal_lengths,
)


class TankTable(Model):
    sounding: Increasing  # m, strictly increasing
    volume: Increasing  # m³, strictly increasing; the last row is the capacity
    lcg: Column  # m from AP
    vcg: Column  # m above base
    tcg: Column  # m, + starboard
    fsi: list[NonNegative]  # m⁴, transverse moment of inertia of the free surface

    @model_validator(mode="after")
    def _rows(self) -> Self:
        equal_lengths(self, ["sounding", "volume", "lcg", "vcg", "tcg", "fsi"])
        if self.volume[0] < 0:
            raise ValueError("volume must not be negative")
        return self


def default_role(content: str) -> Literal["fixed", "consumable"]:
    """IS Code 2008 Part B 3.1.3 (SPEC.md): ballast and cargo tanks hold a fixed filling,
    every other content is a consumable."""
    return "fixed" if content.strip().lower() in ("ballast", "cargo") else "consumable"


def _extent(values: list[float]) -> list[float]:
    if len(values) != 2 or not values[0] < values[1]:
        raise ValueError("give [from, to] with from < to (m)")
    return values


Extent = Annotated[list[Num], AfterValidator(_extent)]


class TankGeometry(Model):
    """A tank as a box (m, SPEC axes) clipped by the hull: `reportgen tables` makes its table."""

    x: Extent  # m from AP
    y: Extent  # m from the centreline, + starboard
    z: Extent  # m above base


class Tank(Model):
    id: Text  # tank id, unique: the key of a condition's `tanks`
    name: Text  # the tank's name, printed on the sheet
    content: Text  # free word: ballast, fuel, fresh water...; groups consumables
    role: Literal["fixed", "consumable"] | None = None  # default by content (default_role)
    pair: Text | None = None  # id of its transverse twin (Part B 3.1.4), given on both
    density: Density  # t/m³
    geometry: TankGeometry | None = None  # the box its table is made from (`tables`)
    table: TankTable | None = None  # required unless geometry is given
    ullage_reference: Positive | None = None  # m above the sounding zero

    @model_validator(mode="after")
    def _table_or_geometry(self) -> Self:
        if self.table is None and self.geometry is None:
            raise ValueError("give the tank's table, or its geometry for `reportgen tables`")
        return self

    @property
    def fs_role(self) -> Literal["fixed", "consumable"]:
        return self.role if self.role is not None else default_role(self.content)
