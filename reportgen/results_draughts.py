"""The results document's `draught_marks` and `observed` sections (SPEC.md, "Draught marks and
observed draughts"; reportgen.draughts computes them). Units as each field's comment says."""

from typing import Literal

from pydantic import BaseModel, ConfigDict

F = float
OptF = float | None


class Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, defer_build=True)  # see results.py


class MarkDraught(Section):
    x: F  # m from AP, of the mark
    draft: F  # m, extreme (moulded + keel thickness), on the centreline


class DraughtMarks(Section):
    aft: MarkDraught  # the aft marks: x and draught
    mid: MarkDraught  # the midships marks: x and draught
    fore: MarkDraught  # the forward marks: x and draught


class MarkReading(Section):
    x: F  # m from AP
    port: F  # m, extreme, as read
    starboard: F  # m, extreme, as read
    mean: F  # m, extreme, mean of port and starboard
    moulded: F  # m, mean − keel thickness
    correction: F  # m, added: to the perpendicular (to midships for the midships mark)
    calculated: F  # m, extreme draught at the mark of the condition as calculated
    difference: F  # m, mean − calculated


class Difference(Section):
    t: F  # observed − calculated displacement, t
    percent: F  # % of the calculated displacement


class Observed(Section):
    """The draughts read alongside worked to a displacement (reportgen.draughts)."""

    aft: MarkReading  # readings at the aft marks, worked
    mid: MarkReading  # readings at the midships marks, worked
    fore: MarkReading  # readings at the forward marks, worked
    keel_thickness: F  # m
    marks_span: F  # m between the aft and forward marks
    trim_at_marks: F  # m, apparent
    draft_aft: F  # m, moulded, at the AP
    draft_mean: F  # m, moulded, at midships (as hydrostatics.draft_mean)
    draft_fore: F  # m, moulded, at the FP
    trim: F  # m, + by the stern
    list: F  # deg, + to starboard
    hog: F  # m, + hog, − sag
    quarter_mean: F  # m, (F + 6·M + A)/8
    table_density: F  # t/m³
    density: F  # t/m³, alongside
    basis: Literal["even_keel", "trimmed_table"]  # how the table was read
    displacement_table: F  # t, the table at the quarter mean (even keel, or at the trim)
    lcf: OptF  # m from AP; this and the five below: even_keel only
    tpc: OptF  # t/cm, table density
    mct_plus: OptF  # t·m/cm, at mct_plus_draft
    mct_minus: OptF  # t·m/cm, at mct_minus_draft
    mct_plus_draft: OptF  # m, quarter mean + 0.5 (or the table's end)
    mct_minus_draft: OptF  # m, quarter mean − 0.5 (or the table's end)
    first_trim_correction: F  # t, 100·TPC·trim·(Lpp/2 − LCF)/Lpp
    second_trim_correction: F  # t, 50·trim²·(MCT₊ − MCT₋)/Lpp
    displacement_trim_corrected: F  # t, table density
    density_correction: F  # t, Δ·(density/table_density − 1)
    displacement: F  # t, observed
    calculated: F  # t, the loading's displacement
    difference: Difference  # observed − calculated displacement, t and %
    tolerance: F  # %
    within: bool  # |difference| % ≤ tolerance
    density_stated: bool  # False: not given; the condition's water taken as the water alongside
