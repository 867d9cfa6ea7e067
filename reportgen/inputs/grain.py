"""Grain in bulk in the input files (SPEC.md, "Cargo and ship-type criteria", grain.2008): the
vessel's grain compartments and the condition's grain loading, and the checks that need both.

Units: volumes m³, centres m (x from AP, z from base), volumetric heeling moments (vhm) m⁴ as
the grain loading booklet gives them (the vertical-shift allowance of the International Grain
Code, MSC.23(59), B 1.3 and B 1.5, included), stowage factor m³/t, mass t.
"""

from typing import Annotated, Literal, Self

from pydantic import Field, model_validator

from reportgen.errors import InputError
from reportgen.inputs.fields import (
    Column,
    Increasing,
    Model,
    NonNegative,
    Num,
    Positive,
    Text,
    equal_lengths,
)
from reportgen.inputs.yamlread import key_lines
from reportgen.inputs.yamlread import where as key_where

GRAIN_SET = "grain.2008"


class FilledGrain(Model):
    """A filled compartment (Grain Code A 2.2): the whole space's volume and centre (B 1.3,
    B 1.4: the cargo at the volumetric centre of the whole space) and its VHM trimmed."""

    volume: Positive  # m³
    lcg: Num  # m from AP
    vcg: Num  # m above base
    vhm: NonNegative  # m⁴


class PartlyGrain(Model):
    """A partly filled compartment (A 2.4) by volume: centre and VHM at each volume."""

    volume: Increasing  # m³
    lcg: Column  # m from AP
    vcg: Column  # m above base
    vhm: list[NonNegative]  # m⁴

    @model_validator(mode="after")
    def _rows(self) -> Self:
        equal_lengths(self, ["volume", "lcg", "vcg", "vhm"])
        if self.volume[0] < 0:
            raise ValueError("volume must not be negative")
        return self


class GrainCompartment(Model):
    id: Text  # compartment id, unique; the condition's grain names it
    name: Text  # the compartment's name, printed on the sheet
    filled: FilledGrain  # the compartment filled, trimmed (A 2.2)
    filled_untrimmed_vhm: NonNegative | None = None  # m⁴ (A 2.3, B 1.1.3)
    partly: PartlyGrain | None = None  # partly filled (A 2.4): centre and VHM by volume

    @model_validator(mode="after")
    def _partly_within(self) -> Self:
        if self.partly is not None and self.partly.volume[-1] > self.filled.volume * (1 + 1e-9):
            raise ValueError(f"partly: the largest volume {self.partly.volume[-1]:g} m³ exceeds "
                             f"the filled volume {self.filled.volume:g} m³")
        return self


class VesselGrain(Model):
    compartments: Annotated[list[GrainCompartment], Field(min_length=1)]  # each cargo space

    @model_validator(mode="after")
    def _unique(self) -> Self:
        ids = [c.id for c in self.compartments]
        dup = sorted({i for i in ids if ids.count(i) > 1})
        if dup:
            raise ValueError(f"grain compartment id listed twice: {', '.join(dup)}")
        return self


class GrainFilling(Model):
    """One compartment's grain: filled (trimmed | untrimmed), or partly by volume or mass."""

    filled: Literal["trimmed", "untrimmed"] | None = None  # a filled compartment (A 2.2, A 2.3)
    volume: Positive | None = None  # m³
    mass: Positive | None = None  # t

    @model_validator(mode="after")
    def _exactly_one(self) -> Self:
        given = [k for k in ("filled", "volume", "mass") if getattr(self, k) is not None]
        if len(given) != 1:
            raise ValueError("give exactly one of filled, volume, mass"
                             + (f" (given: {', '.join(given)})" if given else ""))
        return self


class ConditionGrain(Model):
    stowage_factor: Annotated[float, Field(ge=0.5, le=5.0)]  # m³/t (grain: about 1.2 to 2.5)
    compartments: Annotated[dict[str, GrainFilling], Field(min_length=1)]  # by compartment id


def check_grain(cond, vessel, name: str, raw: bytes) -> None:
    """InputError naming the key when the condition's grain does not fit the vessel's data:
    an unknown compartment, no vessel grain data, a filling outside the compartment's table,
    an untrimmed filling without its VHM, or grain.2008 chosen without grain on board."""
    g = cond.grain
    lines = None

    def where(*path: object) -> str:
        nonlocal lines
        lines = lines if lines is not None else key_lines(raw)
        return key_where(path, lines)

    sets = cond.criteria if cond.criteria is not None else vessel.criteria
    if g is None:
        if GRAIN_SET in sets:
            key = where("criteria") if cond.criteria is not None else "criteria"
            raise InputError(f"{name}: {key}: the criteria set {GRAIN_SET} needs the "
                             f"condition's grain block (stowage_factor and compartments)")
        return
    if vessel.grain is None:
        raise InputError(f"{name}: {where('grain')}: the vessel file has no grain compartments "
                         f"(grain: compartments:)")
    known = {c.id: c for c in vessel.grain.compartments}
    for cid, filling in g.compartments.items():
        comp = known.get(cid)
        if comp is None:
            raise InputError(f"{name}: {where('grain', 'compartments', cid)}: unknown grain "
                             f"compartment {cid!r} (this vessel's: {', '.join(known)})")
        if filling.filled == "untrimmed" and comp.filled_untrimmed_vhm is None:
            raise InputError(f"{name}: {where('grain', 'compartments', cid, 'filled')}: "
                             f"compartment {cid} has no filled_untrimmed_vhm in the vessel file")
        if filling.filled is None:
            volume = (filling.volume if filling.volume is not None
                      else filling.mass * g.stowage_factor)
            if comp.partly is None:
                raise InputError(f"{name}: {where('grain', 'compartments', cid)}: compartment "
                                 f"{cid} has no partly-filled table in the vessel file")
            lo, hi = comp.partly.volume[0], comp.partly.volume[-1]
            if not lo - 1e-9 <= volume <= hi * (1 + 1e-9):
                kind = "volume" if filling.volume is not None else "mass"
                raise InputError(f"{name}: {where('grain', 'compartments', cid, kind)}: "
                                 f"{volume:.1f} m³ of grain is outside the partly-filled table "
                                 f"of {cid} ({lo:g} to {hi:g} m³)")

