"""Floating position from the hydrostatic table: draughts and trim at the condition's state.

Units: mass t, lengths m (x from AP positive forward, z from the moulded base), density t/m³,
MCT t·m/cm, TPC t/cm. Trim is positive by the stern (draught aft minus draught fore, SPEC.md).

The hydrostatic table is made at its own density ρ_t. A ship of displacement Δ in water of
density ρ_w floats at the volume Δ/ρ_w, which is the table's row at Δ_t = Δ·ρ_t/ρ_w. Geometric
quantities (draught, LCB, LCF, KMt, Lwl, CB) are read at Δ_t unchanged; displacement-type
quantities (MCT, TPC) scale with the density: X_w = X_t·ρ_w/ρ_t.

Two kinds of table (SPEC.md, "Vessel data file"):
- even keel (no `trims`): the trim follows from the moment to change trim,
  t = Δ·(LCB − LCG)/(100·MCT), and the table's draught is taken at the LCF;
- at several trims (`trims`): the condition floats at the trim at which LCB = LCG (SPEC: xB
  = LCG), found between the table's trims; every column is read at that trim, and the draught
  is the table's midships draught. A trim outside the table's trims is an error.

Values between rows are interpolated linearly (in displacement, then in trim), so the table
rows are returned exactly (MSC.1/Circ.1229: results from pre-programmed tables match those
tables). A displacement or trim outside the table raises InputError: never extrapolated.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property

import numpy as np

from reportgen.errors import InputError
from reportgen.interp import interp, interp_columns

COLUMNS = ("draft", "lcb", "lcf", "kmt", "mct", "tpc", "lwl", "cb")


@dataclass(frozen=True, eq=False)  # arrays: == has no truth value; compared by identity
class HydroTable:
    """A hydrostatic table as arrays, made at `density` (t/m³).

    trims: (k,) m, + by the stern, or None for an even-keel table (then k = 1). Every other
    array is (k, n): one row per trim over the n draughts (draft: the same row repeated).
    """

    density: float
    trims: np.ndarray | None
    draft: np.ndarray
    displacement: np.ndarray
    lcb: np.ndarray
    lcf: np.ndarray
    kmt: np.ndarray
    mct: np.ndarray
    tpc: np.ndarray
    lwl: np.ndarray | None
    cb: np.ndarray | None

    @cached_property
    def row_lists(self) -> list[tuple[list[float], float, float, dict[str, list[float] | None]]]:
        """Per trim row: (displacement as a list, its least and largest value, each column of
        COLUMNS as a list or None), made once, for reportgen.interp."""
        out = []
        for k in range(self.displacement.shape[0]):
            xp = self.displacement[k]
            cols = {n: None if getattr(self, n) is None else getattr(self, n)[k].tolist()
                    for n in COLUMNS}
            out.append((*table_axis(xp), cols))
        return out


@dataclass(frozen=True)
class HydroPoint:
    """Table values at one displacement and trim, in the water of the condition.

    draft: the table's draught (m; midships for a trimmed table, at the LCF for an even-keel
    one); displacement_table: Δ_t = Δ·ρ_t/ρ_w, t; trim: m, + by the stern. lwl and cb are
    None when the table has no column.
    """

    displacement_table: float
    trim: float
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


def table_axis(values: np.ndarray) -> tuple[list[float], float, float]:
    """A table's axis as a list, with its least and largest value (made once per table, for
    reportgen.interp and `outside`)."""
    return values.tolist(), float(np.min(values)), float(np.max(values))


def outside(value: float, lo: float, hi: float) -> bool:
    """Whether `value` lies outside lo..hi beyond a relative 1e-9 (no extrapolation)."""
    tol = 1e-9 * max(abs(lo), abs(hi), 1.0)
    return not lo - tol <= value <= hi + tol


def range_error(value: float, lo: float, hi: float, what: str, unit: str = "t") -> InputError:
    """The refusal of a value outside a table's lo..hi (`what` names the table)."""
    return InputError(f"the {'displacement' if unit == 't' else 'value'} {value:.1f} {unit} "
                      f"is outside the {what} ({lo:g} to {hi:g} {unit}); the tables are not "
                      f"extrapolated")


def check_in_range(value: float, column: np.ndarray, what: str, unit: str = "t") -> None:
    """InputError when `value` lies outside the table column (no extrapolation)."""
    lo, hi = float(np.min(column)), float(np.max(column))
    if outside(value, lo, hi):
        raise range_error(value, lo, hi, what, unit)


def _row(table: HydroTable, k: int, disp_t: float) -> tuple[list[float], dict]:
    """Trim row k's displacements and columns (HydroTable.row_lists); InputError when Δ_t
    lies outside them."""
    xp, lo, hi, cols = table.row_lists[k]
    if outside(disp_t, lo, hi):
        raise range_error(disp_t, lo, hi, "hydrostatic table" + (
            "" if table.trims is None else f" at trim {table.trims[k]:g} m"))
    return xp, cols


def _row_values(table: HydroTable, k: int, disp_t: float) -> dict[str, float | None]:
    """Every column at Δ_t in trim row k, linear in displacement (None: no such column)."""
    xp, cols = _row(table, k, disp_t)
    present = [n for n in COLUMNS if cols[n] is not None]
    out: dict[str, float | None] = dict.fromkeys(COLUMNS)
    out.update(zip(present, interp_columns(disp_t, xp, [cols[n] for n in present]),
                   strict=True))
    return out


def _lcb_at(table: HydroTable, k: int, disp_t: float) -> float:
    """LCB (m) at Δ_t in trim row k."""
    xp, cols = _row(table, k, disp_t)
    return interp(disp_t, xp, cols["lcb"])


def _blend(a: dict, b: dict, w: float) -> dict:
    return {k: None if a[k] is None else (1.0 - w) * a[k] + w * b[k] for k in a}


def float_trimmed(table: HydroTable, disp_t: float, lcg_m: float) -> tuple[float, dict]:
    """(trim m, columns) at which LCB = LCG, between the table's trims (linear in trim)."""
    trims = table.trims.tolist()
    f = [_lcb_at(table, k, disp_t) - lcg_m for k in range(len(trims))]  # LCB − LCG by trim

    def row(k: int) -> dict:  # every column, only at the trims the answer is made from
        return _row_values(table, k, disp_t)

    for k in range(len(trims) - 1):
        if f[k] == 0.0:
            return trims[k], row(k)
        if f[k] * f[k + 1] <= 0.0:
            w = f[k] / (f[k] - f[k + 1])
            return trims[k] + w * (trims[k + 1] - trims[k]), _blend(row(k), row(k + 1), w)
    if f[-1] == 0.0:
        return trims[-1], row(len(trims) - 1)
    # Outside: estimate how far, from the MCT of the nearest end, to say so.
    end = 0 if abs(f[0]) < abs(f[-1]) else -1
    est = trims[end] + (disp_t * f[end]) / (100.0 * row(end)["mct"])
    raise InputError(f"the condition trims about {est:+.2f} m (LCG {lcg_m:.3f} m), outside the "
                     f"hydrostatic table's trims {trims[0]:g} to {trims[-1]:g} m; the tables "
                     f"are not extrapolated")


def trim_m(displacement_t: float, lcb_m: float, lcg_m: float, mct_tm_per_cm: float) -> float:
    """Trim t = Δ·(LCB − LCG)/(100·MCT) m, + by the stern.

    Trimming moment Δ·(LCB − LCG) (t·m) divided by the moment to change trim one centimetre
    (t·m/cm); the /100 turns cm into m (elementary ship hydrostatics, e.g. Rawson & Tupper,
    Basic Ship Theory, ch. 4 "moment to change trim one centimetre").
    """
    return displacement_t * (lcb_m - lcg_m) / (100.0 * mct_tm_per_cm)


def hydrostatics_at(table: HydroTable, displacement_t: float, water_density: float,
                    lcg_m: float) -> HydroPoint:
    """The table at Δ (t) floating in water of ρ_w (t/m³) with its centre of gravity at
    LCG (m): the trim of equilibrium and every column at it."""
    disp_t = table_displacement(displacement_t, water_density, table.density)
    if table.trims is None:
        cols = _row_values(table, 0, disp_t)
        # the trimming moment is that of the ship in its water: Δ and MCT in that water
        trim = trim_m(disp_t, cols["lcb"], lcg_m, cols["mct"])
    else:
        trim, cols = float_trimmed(table, disp_t, lcg_m)
    scale = water_density / table.density
    return HydroPoint(disp_t, trim, cols["draft"], cols["lcb"], cols["lcf"], cols["kmt"],
                      cols["mct"] * scale, cols["tpc"] * scale, cols["lwl"], cols["cb"])


@dataclass(frozen=True)
class Draughts:
    """Moulded draughts at the AP, at midships (x = Lpp/2) and at the FP, m."""

    aft: float
    mid: float
    fore: float


def draughts_about_lcf(draft_lcf_m: float, trim: float, lcf_m: float, lpp_m: float) -> Draughts:
    """Draughts at the perpendiculars from the draught at the LCF and the trim.

    The waterplane rotates about the centre of flotation, so the draught at x is
    T(x) = T_lcf + t·(LCF − x)/Lpp (t + by the stern): d_aft = T_lcf + t·LCF/Lpp,
    d_fore = d_aft − t, d_mid = T(Lpp/2). The even-keel table's draught is taken as the draught
    at the LCF (common practice for small trims: the trimmed waterplane through the LCF
    displaces the same volume to first order).
    """
    aft = draft_lcf_m + trim * lcf_m / lpp_m
    return Draughts(aft=aft, mid=aft - trim * 0.5, fore=aft - trim)


def draughts_about_midships(draft_mid_m: float, trim: float) -> Draughts:
    """Draughts at the perpendiculars from the midships draught and the trim (m)."""
    return Draughts(aft=draft_mid_m + 0.5 * trim, mid=draft_mid_m, fore=draft_mid_m - 0.5 * trim)


def waterline_height(x_m: float | np.ndarray, draft_mid_m: float, trim: float,
                     lpp_m: float) -> float | np.ndarray:
    """Height of the waterline above base at x (m from AP): T_mid + t·(Lpp/2 − x)/Lpp."""
    return draft_mid_m + trim * (0.5 * lpp_m - np.asarray(x_m, dtype=float)) / lpp_m


def draughts(table: HydroTable, point: HydroPoint, lpp_m: float) -> Draughts:
    """The draughts of a table point: about the LCF (even keel) or midships (trimmed)."""
    if table.trims is None:
        return draughts_about_lcf(point.draft, point.trim, point.lcf, lpp_m)
    return draughts_about_midships(point.draft, point.trim)


@dataclass(frozen=True)
class Floating:
    """The upright floating position of a condition and the particulars at it.

    method: tables | hull; displacement_table_t: Δ at the hydrostatic table's density (t; the
    argument of every table); trim m (+ by the stern); draughts m (moulded); lcb, lcf m from
    AP; kmt m; mct t·m/cm and tpc t/cm in the condition's water; lwl m and cb, None when the
    table has no such column.
    """

    method: str
    displacement_table_t: float
    trim: float
    draughts: Draughts
    lcb: float
    lcf: float
    kmt: float
    mct: float
    tpc: float
    lwl: float | None
    cb: float | None


def floating_on_tables(table: HydroTable, displacement_t: float, water_density: float,
                       lcg_m: float, lpp_m: float) -> Floating:
    """The floating position read from the hydrostatic table (module docstring)."""
    p = hydrostatics_at(table, displacement_t, water_density, lcg_m)
    return Floating("tables", p.displacement_table, p.trim, draughts(table, p, lpp_m), p.lcb,
                    p.lcf, p.kmt, p.mct, p.tpc, p.lwl, p.cb)
