"""Field types and small validators shared by the vessel and condition models.

Units are those of SPEC.md: t, m, t/m³, deg, m², m⁴.
"""

from itertools import pairwise
from typing import Annotated

from pydantic import AfterValidator, BaseModel, BeforeValidator, ConfigDict, Field

from reportgen.inputs.yamlread import iso_date


def _strictly_increasing(values: list[float]) -> list[float]:
    if len(values) < 2:
        raise ValueError("needs at least two rows")
    # the first step b - a <= 0 (as numpy's diff would find it; a few dozen rows: plain floats)
    i = next((i for i, (a, b) in enumerate(pairwise(values)) if b - a <= 0), None)
    if i is not None:
        raise ValueError(f"must be strictly increasing (row {i + 1}: {values[i]}, row {i + 2}: "
                         f"{values[i + 1]})")
    return values


Num = Annotated[float, Field(allow_inf_nan=False)]  # finite (checked inside pydantic's core)
Positive = Annotated[float, Field(gt=0, allow_inf_nan=False)]
NonNegative = Annotated[float, Field(ge=0, allow_inf_nan=False)]
Density = Annotated[float, Field(ge=0.5, le=2.5)]  # t/m³, any liquid a ship carries
WaterDensity = Annotated[float, Field(ge=0.99, le=1.05)]  # t/m³, fresh to dense sea water
Percent = Annotated[float, Field(ge=0, le=100)]
Column = list[Num]
Increasing = Annotated[list[Num], AfterValidator(_strictly_increasing)]
IsoDate = Annotated[str, BeforeValidator(iso_date)]
Text = Annotated[str, Field(min_length=1, max_length=2000)]
Point2 = Annotated[list[Num], Field(min_length=2, max_length=2)]


def increasing(values: list[float]) -> list[float]:
    """`values` unchanged; ValueError naming the rows where they do not strictly increase."""
    return _strictly_increasing(values)


class Model(BaseModel):
    """Every file model: unknown keys refused, types strict, values frozen. Built when first
    used (defer_build): a part of a file (a tank, a station) is then built once, inside the
    whole file's model, rather than also as a model of its own at import."""

    model_config = ConfigDict(extra="forbid", strict=True, frozen=True, defer_build=True)


def equal_lengths(model: BaseModel, names: list[str]) -> None:
    """ValueError when the named columns (those given) differ in length."""
    lengths = {n: len(getattr(model, n)) for n in names if getattr(model, n) is not None}
    if len(set(lengths.values())) > 1:
        listed = ", ".join(f"{n}: {k}" for n, k in lengths.items())
        raise ValueError(f"columns must have the same number of rows ({listed})")
