"""Draughts at the marks, and the displacement from the draughts read alongside.

Units: lengths m (x from AP positive forward, draughts above the moulded base or, where said,
the underside of the keel), masses t, densities t/m³, TPC t/cm, MCT t·m/cm, angles deg.
Trim positive by the stern (SPEC.md).

Marks. The draught marks are cut at fixed x off the perpendiculars and read the extreme
draught: moulded draught + keel thickness (SPEC.md, "Draught marks and observed draughts").
A keel parallel to the base line is assumed (no designed rake), and a mark's x does not move
with the draught (marks on a raked stem or stern are taken at the x the vessel file gives).

Observed draughts, the method of the UN/ECE "Code of uniform standards and procedures for the
performance of draught surveys of coal cargoes" (ECE/ENERGY/19, 1992), step by step:
1. at each mark the mean of the port and starboard readings (this also takes out a list: the
   mean of two readings at ±y on a wall-sided section is the centreline draught);
2. the apparent trim between the marks, and the corrections from each mark to its
   perpendicular (to midships for the midships mark) along that straight line,
   correction = apparent trim × distance of the mark off its perpendicular / distance between
   the marks (signed here as the amount added to the mark's draught);
3. moulded draughts = corrected extreme draughts − keel thickness; the true trim between the
   perpendiculars; the list from the midships readings, tan φ = (starboard − port)/B;
4. hog (+) or sag (−) = mean of the draughts at the perpendiculars − the midships draught;
5. the quarter mean draught, the "mean of mean of means" (F + 6·M + A)/8, which allows for a
   parabolic deflection of the hull (a fact of common practice in draught surveys);
6. the displacement of the even-keel hydrostatic table at the quarter mean;
7. the first trim correction, FTC = 100·TPC·t·(Lpp/2 − LCF)/Lpp (t), moving the draught from
   midships to the centre of flotation (positive when the LCF lies towards the deeper end);
8. the second trim correction, STC = 50·t²·(MCT₊ − MCT₋)/Lpp (t), MCT₊ and MCT₋ read 0.5 m
   above and below the quarter mean (known as Nemoto's correction, for the shift of the LCF with trim; the name recalled
   from memory);
9. the density correction, Δ·(ρ_alongside/ρ_table − 1).
A hydrostatic table given at several trims (SPEC.md `trims`, draughts at midships) is read
directly at the quarter mean and the trim of step 3 instead of steps 6 to 8 (linear in draught,
then in trim, as reportgen.floating reads it): the trim corrections are the even-keel table's
approximations of that reading, so they are not applied (basis `trimmed_table`).
The difference observed − calculated (t, and % of the calculated displacement) is compared
with the tolerance (default 0.5 %, SPEC.md).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from reportgen.errors import InputError
from reportgen.floating import HydroTable, waterline_height
from reportgen.interp import interp, interp_columns

MARKS = ("aft", "mid", "fore")
MCT_HALF_SPAN_M = 0.5  # MCT read 50 cm above and below the quarter mean (UN/ECE code)


def draughts_at_marks(marks_x_m: dict[str, float], draft_mid_m: float, trim_m: float,
                      lpp_m: float, keel_m: float) -> dict[str, float]:
    """Extreme draught (m, from the underside of the keel) at each mark x (m from AP) of a
    straight waterline with midships draught `draft_mid_m` (moulded) and trim `trim_m`."""
    return {k: float(waterline_height(x, draft_mid_m, trim_m, lpp_m)) + keel_m
            for k, x in marks_x_m.items()}


@dataclass(frozen=True)
class MarkReading:
    """One mark: x (m from AP), the readings (extreme, m), their mean, the mean made moulded,
    the correction to its perpendicular (to midships for the midships mark, m, added), the
    calculated condition's extreme draught at the mark (m) and mean − calculated (m)."""

    x: float
    port: float
    starboard: float
    mean: float
    moulded: float
    correction: float
    calculated: float
    difference: float


def mark_corrections(mean_m: dict[str, float], marks_x_m: dict[str, float],
                     lpp_m: float) -> tuple[float, float, dict[str, float]]:
    """(apparent trim at the marks m, distance between the aft and forward marks m,
    {mark: correction m}) along the straight line through the aft and forward readings.

    Correction = apparent trim × distance of the mark off its perpendicular (midships for the
    midships mark) / distance between the marks (UN/ECE code), signed as added to the mark's
    draught: T(x_perp) − T(x_mark) with T linear through the two end marks."""
    span = marks_x_m["fore"] - marks_x_m["aft"]
    trim_marks = mean_m["aft"] - mean_m["fore"]
    to = {"aft": 0.0, "mid": 0.5 * lpp_m, "fore": lpp_m}
    return trim_marks, span, {k: trim_marks * (marks_x_m[k] - to[k]) / span for k in MARKS}


def list_deg(port_m: float, starboard_m: float, breadth_m: float) -> float:
    """List (deg, + to starboard) from the readings on the two sides at midships, whose
    marks lie a breadth B apart: tan φ = (starboard − port)/B (wall-sided midship section)."""
    return math.degrees(math.atan2(starboard_m - port_m, breadth_m))


def hog_m(draft_aft_m: float, draft_mid_m: float, draft_fore_m: float) -> float:
    """Hog (+) or sag (−) at midships, m: the mean of the draughts at the perpendiculars less
    the midships draught."""
    return 0.5 * (draft_aft_m + draft_fore_m) - draft_mid_m


def quarter_mean_m(draft_aft_m: float, draft_mid_m: float, draft_fore_m: float) -> float:
    """The quarter mean, (F + 6·M + A)/8 m: the "mean of mean of means" of draught surveys
    (UN/ECE code; a fact of common practice): the mean of the ends averaged twice with the
    midships draught, an allowance for a hog or sag that bends the keel along a parabola."""
    return (draft_fore_m + 6.0 * draft_mid_m + draft_aft_m) / 8.0


def first_trim_correction_t(trim_m: float, lcf_m: float, tpc_t_cm: float,
                            lpp_m: float) -> float:
    """FTC = 100·TPC·t·(Lpp/2 − LCF)/Lpp t (UN/ECE code, "trim × LCF × TPC × 100 / LBP",
    LCF from midships): the layer between the waterline through midships and the one through
    the centre of flotation; positive when the LCF lies towards the deeper end."""
    return 100.0 * tpc_t_cm * trim_m * (0.5 * lpp_m - lcf_m) / lpp_m


def second_trim_correction_t(trim_m: float, mct_plus: float, mct_minus: float,
                             span_m: float, lpp_m: float) -> float:
    """STC = 50·t²·(dMCT/dz)/Lpp t, dMCT/dz = (MCT₊ − MCT₋)/span per metre (UN/ECE code,
    with MCT₊ and MCT₋ at the quarter mean ± 0.5 m, so span = 1 m; Nemoto's correction)."""
    return 50.0 * trim_m * trim_m * (mct_plus - mct_minus) / span_m / lpp_m


def density_correction_t(displacement_t: float, density: float, table_density: float) -> float:
    """Δ·(ρ/ρ_table − 1) t: the table's displacement in the water alongside."""
    return displacement_t * (density / table_density - 1.0)


def table_at_trim(table: HydroTable, draft_mid_m: float, trim_m: float) -> float:
    """Displacement (t, table density) of a table with `trims` at the midships draught and
    trim (m), linear in draught then in trim. InputError outside the table's trims."""
    trims = table.trims
    if not trims[0] - 1e-9 <= trim_m <= trims[-1] + 1e-9:
        raise InputError(f"observed: the trim read, {trim_m:+.3f} m, is outside the hydrostatic "
                         f"table's trims {trims[0]:g} to {trims[-1]:g} m; the table is not "
                         f"extrapolated")
    _in_table(draft_mid_m, table.draft[0], "quarter mean draught")
    rows = table.row_lists  # per trim: (displacement, ..., columns), as lists
    at = interp_columns(draft_mid_m, rows[0][3]["draft"], [r[0] for r in rows])
    return interp(trim_m, trims.tolist(), at)


@dataclass(frozen=True)
class Survey:
    """The observed draughts worked to a displacement (module docstring, steps 1 to 9)."""

    aft: MarkReading
    mid: MarkReading
    fore: MarkReading
    keel_thickness: float  # m
    marks_span: float  # m between the aft and forward marks
    trim_at_marks: float  # m, apparent (aft mark − forward mark)
    draft_aft: float  # m, moulded, at the AP
    draft_mean: float  # m, moulded, at midships (SPEC: draft_mean is at midships)
    draft_fore: float  # m, moulded, at the FP
    trim: float  # m, + by the stern
    list: float  # deg, + to starboard
    hog: float  # m, + hog, − sag
    quarter_mean: float  # m, moulded
    table_density: float  # t/m³
    density: float  # t/m³, alongside
    basis: str  # even_keel (UN/ECE steps 6 to 8) | trimmed_table (read at the trim)
    displacement_table: float  # t, at the quarter mean (even keel, or at the trim read)
    lcf: float | None  # m from AP, at the quarter mean (even_keel only, as the four below)
    tpc: float | None  # t/cm, at the quarter mean, table density
    mct_plus: float | None  # t·m/cm, at mct_plus_draft
    mct_minus: float | None  # t·m/cm, at mct_minus_draft
    mct_plus_draft: float | None  # m: QM + 0.5 (or the table's end)
    mct_minus_draft: float | None  # m: QM − 0.5 (or the table's end)
    first_trim_correction: float  # t
    second_trim_correction: float  # t
    displacement_trim_corrected: float  # t, table density
    density_correction: float  # t
    displacement: float  # t, in the water alongside
    calculated: float  # t, the loading's displacement
    difference_t: float  # observed − calculated
    difference_percent: float  # % of the calculated displacement
    tolerance: float  # %
    within: bool
    density_stated: bool = True  # False: the condition's water taken as the water alongside


def _in_table(value_m: float, draft: np.ndarray, what: str) -> None:
    lo, hi = float(draft[0]), float(draft[-1])
    if not lo - 1e-9 <= value_m <= hi + 1e-9:
        raise InputError(f"observed: the {what} {value_m:.3f} m is outside the hydrostatic "
                         f"table's draughts ({lo:g} to {hi:g} m); the table is not "
                         f"extrapolated")


def survey(readings_m: dict[str, tuple[float, float]], marks_x_m: dict[str, float],
           calculated_at_marks_m: dict[str, float], table: HydroTable, lpp_m: float,
           breadth_m: float, depth_m: float, keel_m: float, density: float,
           calculated_t: float, tolerance_percent: float) -> Survey:
    """The displacement from the readings {mark: (port, starboard)} (extreme, m) at the marks
    (x m from AP), by the steps of the module docstring.

    InputError for draughts that cannot be: a reading below the keel thickness, a moulded
    draught at a perpendicular below zero or above the depth (SPEC.md), or a quarter mean (or
    trim, for a table at trims) outside the table."""
    for k, pair in readings_m.items():
        for side, value in zip(("port", "starboard"), pair, strict=True):
            if value < keel_m:
                raise InputError(f"observed.{k}.{side}: {value:g} m is less than the keel "
                                 f"thickness {keel_m:g} m: the marks read extreme draughts, "
                                 f"from the underside of the keel")
    mean = {k: 0.5 * (p + s) for k, (p, s) in readings_m.items()}
    trim_marks, span, corr = mark_corrections(mean, marks_x_m, lpp_m)
    moulded = {k: mean[k] - keel_m for k in MARKS}
    at = {k: moulded[k] + corr[k] for k in MARKS}
    for k, word in (("aft", "aft perpendicular"), ("fore", "forward perpendicular")):
        if not 0.0 <= at[k] <= depth_m:
            raise InputError(f"observed: the readings give a moulded draught of {at[k]:.3f} m "
                             f"at the {word}, outside 0 to the depth {depth_m:g} m: check "
                             f"the readings and the vessel's draught_marks")
    qm = quarter_mean_m(at["aft"], at["mid"], at["fore"])
    trim = at["aft"] - at["fore"]
    lcf = tpc = mct_plus = mct_minus = hi = lo = None
    if table.trims is None:
        basis = "even_keel"
        draft = table.draft[0]
        _in_table(qm, draft, "quarter mean draught")
        disp, lcf, tpc = (float(np.interp(qm, draft, getattr(table, c)[0]))
                          for c in ("displacement", "lcf", "tpc"))
        lo = max(qm - MCT_HALF_SPAN_M, float(draft[0]))
        hi = min(qm + MCT_HALF_SPAN_M, float(draft[-1]))
        mct_plus = float(np.interp(hi, draft, table.mct[0]))
        mct_minus = float(np.interp(lo, draft, table.mct[0]))
        ftc = first_trim_correction_t(trim, lcf, tpc, lpp_m)
        stc = second_trim_correction_t(trim, mct_plus, mct_minus, hi - lo, lpp_m)
    else:
        basis = "trimmed_table"
        disp = table_at_trim(table, qm, trim)
        ftc = stc = 0.0
    corrected = disp + ftc + stc
    dens = density_correction_t(corrected, density, table.density)
    observed = corrected + dens
    diff = observed - calculated_t
    pct = 100.0 * diff / calculated_t
    marks = {k: MarkReading(marks_x_m[k], readings_m[k][0], readings_m[k][1], mean[k],
                            moulded[k], corr[k], calculated_at_marks_m[k],
                            mean[k] - calculated_at_marks_m[k]) for k in MARKS}
    return Survey(
        marks["aft"], marks["mid"], marks["fore"], keel_m, span, trim_marks,
        at["aft"], at["mid"], at["fore"], trim,
        list_deg(readings_m["mid"][0], readings_m["mid"][1], breadth_m),
        hog_m(at["aft"], at["mid"], at["fore"]), qm, table.density, density, basis, disp, lcf,
        tpc,
        mct_plus, mct_minus, hi, lo, ftc, stc, corrected, dens, observed, calculated_t, diff,
        pct, tolerance_percent, abs(pct) <= tolerance_percent)


def survey_warnings(s: Survey, water_density: float) -> list[str]:
    """The warnings beside the verdict: the difference beyond the tolerance; water alongside
    of another density than the condition's (t/m³), which the calculated draughts are for."""
    out = []
    if round(water_density, 4) != round(s.density, 4):
        out.append(f"The water alongside ({s.density:.4f} t/m³) is not the condition's water "
                   f"({water_density:.4f} t/m³): the displacements compare, but the calculated "
                   f"draughts at the marks are for the condition's water, not for the water "
                   f"the readings were taken in.")
    if not s.within:
        out.append(_difference_warning(s))
    return out


def _difference_warning(s: Survey) -> str:
    more = "more" if s.difference_t > 0 else "less"
    return (f"The observed draughts (read alongside) give a displacement of "
            f"{s.displacement:.1f} t and the loading adds up to {s.calculated:.1f} t: a "
            f"difference of {s.difference_t:+.1f} t ({s.difference_percent:+.2f} %), "
            f"{abs(s.difference_t):.1f} t {more} on board than declared, beyond the tolerance "
            f"of {s.tolerance:g} %. The loading does not account for everything on board (a "
            f"weight not declared, ballast or a tank sounding not as stated); this calculation "
            f"is not valid for the ship as she floats until the difference is found.")


def marks_section(marks_x_m: dict[str, float], at_marks_m: dict[str, float]) -> dict:
    """The results' `draught_marks`: {mark: {x, draft}} with the extreme draught (m)."""
    return {k: {"x": marks_x_m[k], "draft": at_marks_m[k]} for k in MARKS}


def observed_section(s: Survey) -> dict:
    """The results' `observed` (SPEC.md, "Draught marks and observed draughts")."""
    out: dict = {}
    for k in Survey.__dataclass_fields__:
        if k == "difference_t":
            out["difference"] = {"t": s.difference_t, "percent": s.difference_percent}
        elif k != "difference_percent":
            out[k] = vars(getattr(s, k)) if k in MARKS else getattr(s, k)
    return out
