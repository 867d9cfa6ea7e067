"""The vessel file's `draught_marks` (SPEC.md, "Draught marks and observed draughts"): x of
the aft, midships and forward marks, m from AP; the marks read extreme draughts."""

from typing import Self

from pydantic import model_validator

from reportgen.inputs.fields import Model, Num
from reportgen.inputs.tables import ship_x_range


class DraughtMarks(Model):
    """x of the draught marks, m from AP."""

    aft: Num  # m from AP, x of the aft marks
    mid: Num  # m from AP, x of the midships marks
    fore: Num  # m from AP, x of the forward marks

    @model_validator(mode="after")
    def _order(self) -> Self:
        if not self.aft < self.mid < self.fore:
            raise ValueError("the marks must lie aft < mid < fore (x from AP, m)")
        return self


def check_marks(marks: DraughtMarks | None, lpp_m: float) -> None:
    """ValueError when a mark lies off the ship (x outside −0.05·Lpp … 1.05·Lpp, SPEC.md)."""
    x_lo, x_hi = ship_x_range(lpp_m)
    if marks is not None and not (x_lo <= marks.aft and marks.fore <= x_hi):
        raise ValueError(f"draught_marks: the marks must lie on the ship, x from "
                         f"{x_lo:g} to {x_hi:g} m (−0.05·Lpp to 1.05·Lpp)")
