"""The approved booklet's limiting curve in the vessel file (`limiting_kg` / `limiting_gm`,
criteria set booklet.limits, SPEC.md "Limits"). Units: t, m."""

from typing import Self

from pydantic import model_validator

from reportgen.inputs.fields import Increasing, Model, Num, Positive, Text, equal_lengths


class LimitingCurve(Model):
    """The approved booklet's limiting curve (criteria set booklet.limits): KG max (m, KG
    corrected for free surface) or GM min (m, GM corrected) by displacement (t)."""

    source: Text  # where the curve comes from; the reference of its criterion
    displacement: Increasing  # t
    kg: list[Positive] | None = None  # m, maximum KG corrected
    gm: list[Num] | None = None  # m, minimum GM corrected

    @model_validator(mode="after")
    def _one_column(self) -> Self:
        if (self.kg is None) == (self.gm is None):
            raise ValueError("give exactly one of kg (maximum KG) and gm (minimum GM)")
        equal_lengths(self, ["displacement", "kg", "gm"])
        return self
