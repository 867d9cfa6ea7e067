"""The ship's particulars and its hydrostatic and cross-curve tables in the vessel file
(SPEC.md "Vessel data"): their pydantic models.

Units: m, t, t/m³, deg, t·m/cm, t/cm; trims positive by the stern.
"""

from typing import Annotated, Any, Literal, Self

import numpy as np
from pydantic import AfterValidator, model_validator

from reportgen.inputs.fields import (
    Column,
    Density,
    Increasing,
    Model,
    NonNegative,
    Num,
    Positive,
    increasing,
)

# SPEC.md "Conventions": a centre of mass (an item, a tank, a point) outside x = −0.05·Lpp …
# 1.05·Lpp, |y| ≤ B/2, 0 ≤ z ≤ the top of the windage profile lies outside the ship.
SHIP_X_FRACTIONS = (-0.05, 1.05)


def ship_x_range(length_bp_m: float) -> tuple[float, float]:
    """x from the AP (m) within which a centre of mass lies (SPEC.md "Conventions")."""
    return SHIP_X_FRACTIONS[0] * length_bp_m, SHIP_X_FRACTIONS[1] * length_bp_m


def outside_the_ship(length_bp_m: float, breadth_m: float, top_m: float,
                     x: float | None = None, y: float | None = None, z: float | None = None,
                     names: tuple[str, str, str] = ("x", "y", "z")) -> list[str]:
    """What places a centre at (x, y, z) (m; None: not looked at) outside the ship (SPEC.md
    "Conventions"), each as words naming the coordinate by ``names``; ``top_m`` the top of
    the windage profile above the base (m)."""
    x_lo, x_hi = ship_x_range(length_bp_m)
    found = []
    if x is not None and not x_lo <= x <= x_hi:
        found.append(f"{names[0]} {x:g} m is outside the ship ({x_lo:g} to {x_hi:g} m from "
                     f"the AP: −0.05·Lpp to 1.05·Lpp)")
    if y is not None and not abs(y) <= breadth_m / 2.0:
        found.append(f"{names[1]} {y:g} m is outside the ship's breadth ({breadth_m / 2.0:g} m "
                     f"each side of the centreline)")
    if z is not None and not 0.0 <= z <= top_m:
        found.append(f"{names[2]} {z:g} m is outside the ship (0 to {top_m:g} m: from the base "
                     f"line to the top of the windage profile)")
    return found


class Particulars(Model):
    length_bp: Positive  # Lpp, m
    breadth: Positive  # moulded B, m
    depth: Positive  # moulded depth to the freeboard deck at side, m
    summer_draft: Positive  # moulded summer load line draught, m
    keel_thickness: NonNegative = 0.0  # m; extreme draught = moulded + keel thickness
    bilge: Literal["round", "sharp"] = "round"  # round | sharp: the factor k of Part A 2.3.4
    bilge_keel_area: NonNegative = 0.0  # Ak, m²: bilge keels (both sides) + bar keel lateral area
    service_speed: Positive | None = None  # knots, for the turning heel of Part A 3.1

    @model_validator(mode="after")
    def _draft_below_depth(self) -> Self:
        if self.summer_draft >= self.depth:
            raise ValueError("summer_draft must be less than depth")
        return self


def per_trim(model: Any, name: str, trims: list[float] | None, rows: int) -> None:
    """ValueError unless column `name` is one row of `rows` values (no trims) or one such row
    per trim."""
    value = getattr(model, name)
    if value is None:
        return
    nested = bool(value) and isinstance(value[0], list)
    if trims is None:
        if nested:
            raise ValueError(f"{name}: one row per trim is given, but no trims")
        if len(value) != rows:
            raise ValueError(f"{name} has {len(value)} rows, draft has {rows}")
        return
    if not nested or len(value) != len(trims):
        raise ValueError(f"{name}: with trims, give one row per trim ({len(trims)} rows)")
    for k, row in enumerate(value):
        if len(row) != rows:
            raise ValueError(f"{name} row {k + 1} (trim {trims[k]:g} m) has {len(row)} values, "
                             f"draft has {rows}")


def rows_of(value: list | None, n_trims: int) -> np.ndarray | None:
    """A column given flat (no trims) or per trim as an (n_trims, n) array (None stays None)."""
    if value is None:
        return None
    arr = np.asarray(value, dtype=float)
    return arr.reshape(1, -1) if arr.ndim == 1 else arr.reshape(n_trims, -1)


Rows = Column | list[Column]
Trims = Annotated[list[Num], AfterValidator(increasing)]


class Hydrostatics(Model):
    density: Density = 1.025  # t/m³, the density the table was made at
    trims: Trims | None = None  # m, + by the stern; then columns other than draft are per trim
    draft: Increasing  # moulded, m (at midships when trims are given)
    displacement: Rows  # t, at `density`
    lcb: Rows  # m from AP
    lcf: Rows  # m from AP
    kmt: Rows  # m, transverse KM above base
    mct: Rows  # t·m/cm, moment to change trim 1 cm
    tpc: Rows  # t/cm, tonnes per cm immersion
    lwl: Rows | None = None  # m, waterline length (default length_bp)
    cb: Rows | None = None  # block coefficient (default Δ/(ρ·Lwl·B·T)), for X2 of Part A 2.3.4

    @model_validator(mode="after")
    def _rows(self) -> Self:
        n = len(self.draft)
        names = ["displacement", "lcb", "lcf", "kmt", "mct", "tpc", "lwl", "cb"]
        for name in names:
            per_trim(self, name, self.trims, n)
        if self.draft[0] < 0:
            raise ValueError("draft must not be negative")
        k = 1 if self.trims is None else len(self.trims)
        for k_row, row in enumerate(rows_of(self.displacement, k)):
            where = "" if self.trims is None else f" at trim {self.trims[k_row]:g} m"
            try:
                increasing(list(row))
            except ValueError as exc:
                raise ValueError(f"displacement{where}: {exc}") from None
        for name in ("kmt", "mct", "tpc", "lwl", "cb"):
            arr = rows_of(getattr(self, name), k)
            if arr is not None and np.any(arr <= 0):
                raise ValueError(f"{name}: values must be positive")
        cb = rows_of(self.cb, k)
        if cb is not None and np.any(cb > 1.0):
            raise ValueError("cb: a block coefficient cannot exceed 1")
        return self


class CrossCurves(Model):
    trim: Literal["free", "even_keel", "fixed"]  # how the table was made (stated on the sheet)
    trims: Trims | None = None  # m: the upright trims the tables were made at
    heel: Increasing  # deg, from 0 to at least 60; negative heels by symmetry
    displacement: Increasing  # t, strictly increasing, at the hydrostatic table's density
    kn: list[Column] | list[list[Column]]  # m: kn[i][j], or kn[k][i][j] with trims

    @model_validator(mode="after")
    def _shape(self) -> Self:
        if self.heel[0] != 0:
            raise ValueError("heel must start at 0 (negative heels follow by symmetry)")
        if self.heel[-1] < 60 or self.heel[-1] > 90:
            raise ValueError("heel must reach at least 60 deg and not exceed 90 deg")
        if self.trim == "fixed" and self.trims is None:
            raise ValueError("trim: fixed needs trims (the trims the table was made at)")
        tables = [self.kn] if self.trims is None else self.kn
        if self.trims is not None and len(self.kn) != len(self.trims):
            raise ValueError(f"kn: with trims, give one table per trim ({len(self.trims)})")
        for k, table in enumerate(tables):
            at = "" if self.trims is None else f" (trim {self.trims[k]:g} m)"
            if not table or not isinstance(table[0], list):
                raise ValueError(f"kn{at}: expected one row per displacement")
            if len(table) != len(self.displacement):
                raise ValueError(f"kn{at} has {len(table)} rows, displacement has "
                                 f"{len(self.displacement)}: one row per displacement")
            for i, row in enumerate(table):
                if not isinstance(row, list) or len(row) != len(self.heel):
                    raise ValueError(f"kn{at} row {i + 1} has {len(row)} values, heel has "
                                     f"{len(self.heel)}: one value per heel")
        return self
