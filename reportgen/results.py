"""The results of one evaluation: a typed, immutable model whose JSON is the SPEC.md results
document (format reportgen/results-1) with this project's extension keys (DEVELOPERS.md).

Every float is rounded to DECIMALS when the model is made, so a model made by an evaluation
and one read back from its JSON are equal. Optional sections (`weather`, `limits`, ...) are
left out of the JSON when they do not apply; SPEC's null values (`vanishing`, `thetac`, ...)
are kept as null. The JSON Schema of the document is `Results.model_json_schema()`.
"""

from __future__ import annotations

import math
from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field, model_serializer, model_validator

from reportgen.results_draughts import DraughtMarks, Observed
from reportgen.results_special import Icing, Passengers, Timber

RESULTS_FORMAT = "reportgen/results-1"
DECIMALS = 6  # every float in the document is rounded to this many decimals
OPTIONAL_SECTIONS = ("weather", "load_line", "grain", "limits", "comparison", "timber",
                     "passengers", "icing", "draught_marks",
                     "observed")  # left out of the JSON when None


def clean(value: Any) -> Any:
    """Plain JSON data: floats rounded to DECIMALS (−0.0 as 0.0), tuples as lists, numpy
    scalars as Python numbers, non-finite floats as null; key order kept."""
    t = type(value)
    if t is float:
        if not math.isfinite(value):
            return None
        r = round(value, DECIMALS)
        return 0.0 if r == 0 else r
    if t is dict:
        return {str(k): clean(v) for k, v in value.items()}
    if t is list or t is tuple:
        return [clean(v) for v in value]
    if value is None or t is bool or t is str or t is int:
        return value
    if isinstance(value, BaseModel):
        return clean(value.model_dump())
    if hasattr(value, "item"):  # numpy scalar
        return clean(value.item())
    if isinstance(value, float):
        return clean(float(value))
    raise TypeError(f"cannot put {type(value).__name__} into the results document")


class Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


F = float  # m, t, deg, ... as each field's comment says
OptF = float | None


class Software(Section):
    name: str
    version: str


class InputFiles(Section):
    condition_file: str  # attachment name of the condition file
    vessel_file: str  # attachment name of the vessel file


class Signatories(Section):
    prepared_by: str | None = None
    checked_by: str | None = None
    reviewed_by: str | None = None


class ConditionInfo(Section):
    title: str
    voyage: str | None
    date: str | None  # YYYY-MM-DD
    water_density: F  # t/m³
    free_surface: Literal["code", "actual", "maximum"]
    signatories: Signatories


class VesselInfo(Section):
    name: str
    identifier: str
    type: str
    sha256: str  # of the vessel file's bytes alone: the vessel data fingerprint
    source: dict[str, str] | None  # the vessel file's `source` block
    length_bp: F  # m
    breadth: F  # m
    depth: F  # m
    summer_draft: F  # m


class Line(Section):
    kind: Literal["lightship", "tank", "item", "grain", "allowance"]
    id: str | None
    name: str
    content: str | None
    role: str | None  # fixed | consumable (tanks)
    percent: OptF  # % of capacity
    sounding: OptF  # m
    ullage: OptF  # m, when the filling was given by ullage
    volume: OptF  # m³
    density: OptF  # t/m³
    mass: F  # t
    lcg: F  # m from AP
    vcg: F  # m above base
    tcg: F  # m, + starboard
    fsm: F  # t·m counted
    slack: bool | None
    fs_basis: str | None  # why the FSM counts (reportgen.freesurface reasons)


class Centre(Section):
    mass: F  # t
    lcg: OptF  # m
    vcg: OptF  # m
    tcg: OptF  # m
    fsm: F  # t·m


class Loading(Section):
    lightship: F  # t
    deadweight: F  # t
    displacement: F  # t
    lcg: F  # m
    vcg: F  # m
    tcg: F  # m
    fsm: F  # t·m
    deadweight_centre: Centre
    lines: list[Line]


class Hydrostatics(Section):
    draft_mean: F  # m, moulded, at midships
    draft_fore: F
    draft_aft: F
    trim: F  # m, + by the stern
    heel: OptF  # deg, + starboard; None: no equilibrium within the tables
    lcb: F
    lcf: F
    mct: F  # t·m/cm
    tpc: F  # t/cm
    kmt: F
    kg_solid: F
    fsc: F
    kg_fluid: F
    gm_solid: F
    gm_fluid: F
    draft_aft_extreme: F
    draft_mean_extreme: F
    draft_fore_extreme: F
    summer_draft: F


class GZ(Section):
    heel: list[F]  # deg, + starboard
    gz: list[F]  # m
    kn: list[F]  # m


class Angles(Section):
    deck_edge: F  # deg
    flooding: F  # deg
    gz_max: F  # deg, on the credited curve
    vanishing: OptF  # deg; None: GZ stays positive to the end of the table
    flooding_opening: str | None
    flooding_opening_xyz: list[F] | None  # m
    side: Literal["starboard", "port"]
    deck_edge_source: str
    deck_edge_trim: OptF  # m, the trim the angle was taken at
    flooding_source: str
    flooding_trim: OptF  # m
    credited_to: F  # deg: the end of the curve credited to 2.2.2 and 2.2.3


class Weather(Section):
    wind_pressure: F  # N/m²
    wind_area: F  # m²
    wind_z: F  # m above base
    lw1: F  # m
    lw2: F  # m
    theta0: OptF  # deg
    theta1: OptF
    theta2: OptF
    thetac: OptF
    area_a: OptF  # m·rad
    area_b: OptF
    roll_period: OptF  # s
    c: F
    s: OptF
    r: F
    og: F  # m
    x1: F
    x2: F
    k: F
    lever: F  # Z, m
    z_method: str
    theta1_formula: OptF
    roll_angle_source: str | None
    b_over_d: F
    cb: F
    kg_over_d_minus_1: F
    theta_lw2: OptF
    theta_start: OptF
    areas_missing: list[str] = Field(default_factory=list)  # no_theta0 | no_lw2 | no_roll


class LoadLine(Section):
    summer_draft: F  # m, moulded
    fwa: F  # m, fresh water allowance
    dwa: F  # m, dock water allowance in the condition's water
    permissible_draft: F  # m, moulded, at midships
    deadweight_to_marks: F  # t still available to the permissible draught (negative: over)


class GrainCompartment(Section):
    id: str
    name: str
    state: Literal["trimmed", "untrimmed", "partly"]  # filled trimmed or untrimmed, or partly
    volume: F  # m³
    mass: F  # t
    lcg: F  # m from AP
    vcg: F  # m above base
    vhm: F  # m⁴
    heeling_moment: F  # t·m, VHM / SF


class Grain(Section):
    """Grain Code A 7 (SPEC.md grain.2008) and this project's extension keys."""

    stowage_factor: F  # m³/t
    vhm: F  # m⁴, Σ of the compartments
    heeling_moment: F  # t·m, ΣVHM / SF
    lambda0: F  # m, grain heeling arm at 0°: ΣVHM / (SF·Δ)
    lambda40: F  # m, at 40°: 0.8·λ0
    heel: OptF  # deg; None: GZ does not reach the heeling arm
    residual_area: OptF  # m·rad, between GZ and the heeling arm (A 7.1.2)
    residual_to: F  # deg, the end of the residual area
    allowable_moment: OptF  # t·m; None: no grain heeling moment passes
    heel_limit: F  # deg, min(12°, deck edge)
    residual_to_reason: Literal["forty", "flooding", "max_difference"]
    moment_margin: OptF  # t·m, allowable − actual
    compartments: list[GrainCompartment]


class Limits(Section):
    """SPEC.md "Limits": the condition's KG margin (m) and the criterion that governs it."""

    kg_max: OptF  # m, largest KG corrected at which every criterion passes; None: none ≥ 0
    kg_margin: OptF  # m, kg_max − kg_fluid (negative: KG must come down by that much)
    gm_min: OptF  # m, kmt − kg_max
    governing: str | None  # id of the criterion that fails just above kg_max
    governing_title: str | None
    governing_reference: str | None
    tolerance: F  # m, the search's resolution


class Criterion(Section):
    id: str
    title: str
    reference: str
    required: OptF
    attained: OptF
    unit: str
    passed: bool
    margin: OptF  # the spare on the safe side, in unit
    limit: Literal["at_least", "at_most"]
    set: str


class CountedTank(Section):
    id: str
    fsm: F  # t·m
    reason: str  # slack | largest_of_table | worst_pair | worst_single | maximum_rule


class CriteriaSet(Section):
    id: str
    title: str


class Assumptions(Section):
    method: Literal["tables", "hull"]
    hydrostatics_trims: list[F] | None  # m: the table's trims, None for even keel
    cross_curves_trim: str  # free | even_keel | fixed, or hull
    cross_curves_trims: list[F] | None
    table_density: OptF  # t/m³
    water_density: F
    free_surface: str
    full_percent: F
    free_surface_tanks: list[CountedTank]
    wind_pressure: F
    z_method: str
    roll_angle_source: str | None
    cb_source: str  # table | computed | hull
    list_side: str | None
    gz_beyond_flooding: Literal["exclude", "include"]
    fsc_method: str
    criteria_sets: list[CriteriaSet]
    criteria_chosen: bool  # chosen by the condition among those the vessel permits


class ComparisonEntry(Section):
    """One quantity of `check --compare` (SPEC.md; reportgen.compare)."""

    quantity: str
    label: str
    unit: str
    tables: OptF
    hull: OptF
    difference: OptF  # tables − hull
    tolerance: OptF  # MSC.1/Circ.1229; None where the circular gives none
    within: bool | None
    basis: str


class Results(Section):
    format: Literal["reportgen/results-1"] = RESULTS_FORMAT
    software: Software
    inputs_sha256: str
    inputs: InputFiles
    condition: ConditionInfo
    vessel: VesselInfo
    loading: Loading
    hydrostatics: Hydrostatics
    gz: GZ
    angles: Angles
    weather: Weather | None = None
    load_line: LoadLine | None = None
    draught_marks: DraughtMarks | None = None
    observed: Observed | None = None
    grain: Grain | None = None
    limits: Limits | None = None
    timber: Timber | None = None
    passengers: Passengers | None = None
    icing: Icing | None = None
    criteria: list[Criterion]
    passed: bool
    warnings: list[str] = Field(default_factory=list)
    assumptions: Assumptions
    comparison: list[ComparisonEntry] | None = None  # only with check --compare

    @model_validator(mode="before")
    @classmethod
    def _rounded(cls, data: Any) -> Any:
        return clean(data) if isinstance(data, dict) else data

    @model_serializer(mode="wrap")
    def _without_absent(self, handler: Any) -> dict:
        out = handler(self)
        for key in OPTIONAL_SECTIONS:
            if out.get(key) is None:
                out.pop(key, None)
        return out

    def to_json(self) -> str:
        """The results document: indented, keys in document order, a final newline; the
        same text every run."""
        return self.model_dump_json(indent=2) + "\n"

    def to_dict(self) -> dict:
        return self.model_dump(mode="json")

    @classmethod
    def from_json(cls, text: str) -> Results:
        return cls.model_validate_json(text)
