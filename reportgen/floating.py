"""Floating position from the hydrostatic table: draughts and trim.

Units: mass t, lengths m (x from AP positive forward, z from the moulded base), density t/m³,
MCT t·m/cm, TPC t/cm. Trim is positive by the stern (draught aft minus draught fore, SPEC.md).

The hydrostatic table is made at its own density ρ_t. A ship of displacement Δ in water of
density ρ_w floats at the volume Δ/ρ_w, which is the table's row at Δ_t = Δ·ρ_t/ρ_w. Geometric
quantities (draught, LCB, LCF, KMt, Lwl, CB) are read at Δ_t unchanged; displacement-type
quantities (MCT, TPC) scale with the density: X_w = X_t·ρ_w/ρ_t.

Values between table rows are interpolated linearly, so the table rows are returned exactly
(MSC.1/Circ.1229: results from pre-programmed tables match those tables). A displacement
outside the table raises InputError: the tables are never extrapolated.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from reportgen.errors import InputError

if TYPE_CHECKING:
    from reportgen.inputs import Hydrostatics


@dataclass(frozen=True)
class HydroTable:
    """An even-keel hydrostatic table as arrays, made at `density` (t/m³)."""

    density: float
    draft: np.ndarray  # m, moulded
    displacement: np.ndarray  # t
    lcb: np.ndarray  # m from AP
    lcf: np.ndarray  # m from AP
    kmt: np.ndarray  # m
    mct: np.ndarray  # t·m/cm
    tpc: np.ndarray  # t/cm
    lwl: np.ndarray | None  # m
    cb: np.ndarray | None

    @classmethod
    def from_model(cls, h: Hydrostatics) -> HydroTable:
        def arr(v: list[float] | None) -> np.ndarray | None:
            return None if v is None else np.asarray(v, dtype=float)

        return cls(float(h.density), arr(h.draft), arr(h.displacement), arr(h.lcb), arr(h.lcf),
                   arr(h.kmt), arr(h.mct), arr(h.tpc), arr(h.lwl), arr(h.cb))


@dataclass(frozen=True)
class HydroPoint:
    """Table values at one displacement, in the water of the condition.

    draft: the table's (even-keel) draught, m; taken as the draught at the LCF when trimmed.
    displacement_table: Δ_t = Δ·ρ_t/ρ_w, t. lwl and cb are None when the table has no column.
    """

    displacement_table: float
    draft: float
    lcb: float
    lcf: float
    kmt: float
    mct: float
    tpc: float
    lwl: float | None
    cb: float | None


def table_displacement(displacement_t: float, water_density: float,
                       table_density: float) -> float:
    """Δ_t = Δ·ρ_t/ρ_w (t): the table's displacement at the same immersed volume."""
    return displacement_t * table_density / water_density


def check_in_range(value: float, column: np.ndarray, what: str, unit: str = "t") -> None:
    """InputError when `value` lies outside the table column (no extrapolation)."""
    lo, hi = float(column[0]), float(column[-1])
    tol = 1e-9 * max(abs(lo), abs(hi), 1.0)
    if not lo - tol <= value <= hi + tol:
        raise InputError(f"the displacement {value:.1f} {unit} is outside the {what} "
                         f"({lo:g} to {hi:g} {unit}); the tables are not extrapolated")


def hydrostatics_at(table: HydroTable, displacement_t: float,
                    water_density: float) -> HydroPoint:
    """Interpolate the hydrostatic table at Δ (t) floating in water of ρ_w (t/m³)."""
    disp_t = table_displacement(displacement_t, water_density, table.density)
    check_in_range(disp_t, table.displacement,
                   f"hydrostatic table (at its density {table.density:g} t/m³)")
    scale = water_density / table.density
    xp = table.displacement

    def at(col: np.ndarray) -> float:
        return float(np.interp(disp_t, xp, col))

    return HydroPoint(
        displacement_table=disp_t,
        draft=at(table.draft),
        lcb=at(table.lcb),
        lcf=at(table.lcf),
        kmt=at(table.kmt),
        mct=at(table.mct) * scale,
        tpc=at(table.tpc) * scale,
        lwl=None if table.lwl is None else at(table.lwl),
        cb=None if table.cb is None else at(table.cb),
    )


def trim_m(displacement_t: float, lcb_m: float, lcg_m: float, mct_tm_per_cm: float) -> float:
    """Trim t = Δ·(LCB − LCG)/(100·MCT) m, + by the stern.

    Trimming moment Δ·(LCB − LCG) (t·m) divided by the moment to change trim one centimetre
    (t·m/cm); the /100 turns cm into m (elementary ship hydrostatics, e.g. Rawson & Tupper,
    Basic Ship Theory, ch. 4 "moment to change trim one centimetre").
    """
    return displacement_t * (lcb_m - lcg_m) / (100.0 * mct_tm_per_cm)


@dataclass(frozen=True)
class Draughts:
    """Moulded draughts at the AP, at midships (x = Lpp/2) and at the FP, m."""

    aft: float
    mid: float
    fore: float


def draughts(draft_lcf_m: float, trim: float, lcf_m: float, lpp_m: float) -> Draughts:
    """Draughts at the perpendiculars from the draught at the LCF and the trim.

    The waterplane rotates about the centre of flotation, so the draught at x is
    T(x) = T_lcf + t·(LCF − x)/Lpp (t + by the stern): d_aft = T_lcf + t·LCF/Lpp,
    d_fore = d_aft − t, d_mid = T(Lpp/2). The even-keel table's draught is taken as the draught
    at the LCF (common practice for small trims: the trimmed waterplane through the LCF
    displaces the same volume to first order).
    """
    aft = draft_lcf_m + trim * lcf_m / lpp_m
    return Draughts(aft=aft, mid=aft - trim * 0.5, fore=aft - trim)


def waterline_height(x_m: float | np.ndarray, draft_mid_m: float, trim: float,
                     lpp_m: float) -> float | np.ndarray:
    """Height of the waterline above base at x (m from AP): T_mid + t·(Lpp/2 − x)/Lpp."""
    return draft_mid_m + trim * (0.5 * lpp_m - np.asarray(x_m, dtype=float)) / lpp_m


def summer_draught_warning(draft_mid_m: float, summer_draft_m: float) -> str | None:
    """A warning when the mean (midships) moulded draught is above the summer draught."""
    if draft_mid_m > summer_draft_m + 1e-9:
        return (f"The mean draught {draft_mid_m:.3f} m is above the summer load line draught "
                f"{summer_draft_m:.3f} m: the ship is overloaded.")
    return None
