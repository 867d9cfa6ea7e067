"""The results of one evaluation: a typed, immutable model whose JSON is the SPEC.md results
document (format reportgen/results-1) with this project's extension keys (DEVELOPERS.md).

Every float is rounded to DECIMALS when the model is made, so a model made by an evaluation
and one read back from its JSON are equal. Optional sections (`weather`, `limits`, ...) are
left out of the JSON when they do not apply; SPEC's null values (`vanishing`, `thetac`, ...)
are kept as null. The JSON Schema of the document is `Results.model_json_schema()`.

Speed (benchmarks/bench_check.py): the models are built at their first use (defer_build), in
one piece with Results rather than each section again on its own; the annotations are real
objects, not strings (no `from __future__ import annotations`), which pydantic would otherwise
compile one by one at import.
"""

from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field, model_serializer, model_validator

from reportgen.plainjson import DECIMALS, clean, rounded  # noqa: F401 (DECIMALS, rounded: re-exported)
from reportgen.results_draughts import DraughtMarks, Observed
from reportgen.results_special import Icing, Passengers, Timber

RESULTS_FORMAT = "reportgen/results-1"
OPTIONAL_SECTIONS = ("weather", "load_line", "grain", "limits", "comparison", "timber",
                     "passengers", "icing", "draught_marks",
                     "observed")  # left out of the JSON when None


class Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, defer_build=True)


F = float  # m, t, deg, ... as each field's comment says
OptF = float | None


class Software(Section):
    name: str  # the program's name
    version: str  # the program's version


class InputFiles(Section):
    condition_file: str  # attachment name of the condition file
    vessel_file: str  # attachment name of the vessel file


class Signatories(Section):
    prepared_by: str | None = None  # the name the condition gives for this role
    checked_by: str | None = None  # the name the condition gives for this role
    reviewed_by: str | None = None  # the name the condition gives for this role


class ConditionInfo(Section):
    title: str  # the condition's title
    voyage: str | None  # None: not stated
    date: str | None  # YYYY-MM-DD; None: not stated
    water_density: F  # t/m³, of the water the ship floats in
    free_surface: Literal["code", "actual", "maximum"]  # free-surface rule, Part B 3.1
    signatories: Signatories  # the names for the signature roles (none: empty)


class VesselInfo(Section):
    name: str  # the ship's name
    identifier: str  # the ship's identifier
    type: str  # the ship's type, as the vessel file gives it
    sha256: str  # of the vessel file's bytes alone: the vessel data fingerprint
    source: dict[str, str] | None  # the vessel file's `source` block
    length_bp: F  # m, Lpp
    breadth: F  # m, moulded B
    depth: F  # m, moulded depth to the freeboard deck at side
    summer_draft: F  # m, moulded summer load line draught


class Line(Section):
    kind: Literal["lightship", "tank", "item", "grain", "allowance"]  # what the line is
    id: str | None  # tank or grain compartment id; None for the others
    name: str  # the line's name as printed
    content: str | None  # tank content, grain, or the allowance's kind
    role: str | None  # fixed | consumable (tanks)
    percent: OptF  # % of capacity
    sounding: OptF  # m
    ullage: OptF  # m, when the filling was given by ullage
    volume: OptF  # m³
    density: OptF  # t/m³
    mass: F  # t
    lcg: F  # m from AP
    vcg: F  # m above base
    tcg: F  # m from the centreline, + starboard
    fsm: F  # t·m, free-surface moment counted (Part B 3.1)
    slack: bool | None  # tank neither empty nor full (Part B 3.1.2); None: not a tank
    fs_basis: str | None  # why the FSM counts (reportgen.freesurface reasons)


class Centre(Section):
    mass: F  # t
    lcg: OptF  # m from AP; None without mass
    vcg: OptF  # m above base; None without mass
    tcg: OptF  # m, + starboard; None without mass
    fsm: F  # t·m, free-surface moments counted


class Loading(Section):
    lightship: F  # t, lightship mass
    deadweight: F  # t, displacement − lightship
    displacement: F  # t, Δ: the sum of every line
    lcg: F  # m from AP, LCG of the displacement
    vcg: F  # m above base, KG without free surface
    tcg: F  # m, + starboard, TCG of the displacement
    fsm: F  # t·m, ΣFSM counted (Part B 3.1)
    deadweight_centre: Centre  # the deadweight's mass, centre and FSM
    lines: list[Line]  # every loading line: lightship, tanks, grain, items, allowances


class Hydrostatics(Section):
    draft_mean: F  # m, moulded, at midships
    draft_fore: F  # m, moulded, at the FP
    draft_aft: F  # m, moulded, at the AP
    trim: F  # m, + by the stern
    heel: OptF  # deg, + starboard; None: no equilibrium within the tables
    lcb: F  # m from AP
    lcf: F  # m from AP
    mct: F  # t·m/cm, in the condition's water
    tpc: F  # t/cm, in the condition's water
    kmt: F  # m, transverse KM above base
    kg_solid: F  # m, KG above base without free surface
    fsc: F  # m, free-surface correction ΣFSM/Δ (Part B 3.1)
    kg_fluid: F  # m, KG corrected: kg_solid + fsc
    gm_solid: F  # m, kmt − kg_solid
    gm_fluid: F  # m, kmt − kg_fluid: the GM of Part A 2.2.4
    draft_aft_extreme: F  # m, draft_aft + keel thickness
    draft_mean_extreme: F  # m, draft_mean + keel thickness
    draft_fore_extreme: F  # m, draft_fore + keel thickness
    summer_draft: F  # m, moulded summer load line draught


class GZ(Section):
    heel: list[F]  # deg, + starboard, 1° steps
    gz: list[F]  # m, GZ at KG corrected, at each heel
    kn: list[F]  # m, KN at each heel (GZ is made from it)


class Angles(Section):
    deck_edge: F  # deg, deck edge immersion angle
    flooding: F  # deg, angle of flooding θf
    gz_max: F  # deg, on the credited curve
    vanishing: OptF  # deg; None: GZ stays positive to the end of the table
    flooding_opening: str | None  # the opening that governs θf; None: not known
    flooding_opening_xyz: list[F] | None  # m: x from AP, y, z of that opening
    side: Literal["starboard", "port"]  # criteria's side: the list's, starboard without list
    deck_edge_source: str  # table_trims | hull | table | formula
    deck_edge_trim: OptF  # m, the trim the angle was taken at
    flooding_source: str  # table_trims | hull | table | none (taken as 90°)
    flooding_trim: OptF  # m, the trim θf was taken at
    credited_to: F  # deg: the end of the curve credited to 2.2.2 and 2.2.3


class Weather(Section):
    wind_pressure: F  # N/m², P of Part A 2.3.2.2
    wind_area: F  # m², A: lateral area above the waterline
    wind_z: F  # m above base
    lw1: F  # m, steady wind lever (2.3.2.2)
    lw2: F  # m, gust lever 1.5·lw1 (2.3.2.3)
    theta0: OptF  # deg, steady heel under lw1 (2.3.1.2)
    theta1: OptF  # deg, roll to windward (2.3.4, or given)
    theta2: OptF  # deg, min(θf, 50°, θc): end of area b
    thetac: OptF  # deg, second intercept of lw2 with GZ
    area_a: OptF  # m·rad, area a (2.3.1.4)
    area_b: OptF  # m·rad, area b (2.3.1.4)
    roll_period: OptF  # s, T = 2·C·B/√GM (2.3.4)
    c: F  # C of the roll period (2.3.4)
    s: OptF  # factor s by T (2.3.4)
    r: F  # r = 0.73 + 0.6·OG/d (2.3.4)
    og: F  # m, OG = KG − d (2.3.4)
    x1: F  # factor X1 by B/d (2.3.4)
    x2: F  # factor X2 by CB (2.3.4)
    k: F  # factor k by the bilge (2.3.4)
    lever: F  # m, Z of 2.3.2.2
    z_method: str  # half_draft | underwater_centre
    theta1_formula: OptF  # deg, θ1 by the formula of 2.3.4
    roll_angle_source: str | None  # where a given θ1 comes from
    b_over_d: F  # B/d, d the mean moulded draught
    cb: F  # CB, for X2 (2.3.4)
    kg_over_d_minus_1: F  # KG/d − 1, KG corrected: range of the 2.3.4 tables
    theta_lw2: OptF  # deg, first intercept of lw2 with GZ
    theta_start: OptF  # deg, θ0 − θ1: start of area a
    areas_missing: list[str] = Field(default_factory=list)  # no_theta0 | no_lw2 | no_roll
    k_length: OptF = None  # m, L of k's table 2.3.4-3: the greater of Lpp and Lwl


class LoadLine(Section):
    summer_draft: F  # m, moulded
    fwa: F  # m, fresh water allowance
    dwa: F  # m, dock water allowance in the condition's water
    permissible_draft: F  # m, moulded, at midships
    deadweight_to_marks: F  # t still available to the permissible draught (negative: over)


class GrainCompartment(Section):
    id: str  # compartment id
    name: str  # the compartment's name
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
    heel: OptF  # deg, from the grain shift (A 7.1.1); None: arm not reached
    residual_area: OptF  # m·rad, between GZ and the heeling arm (A 7.1.2)
    residual_to: F  # deg, the end of the residual area
    allowable_moment: OptF  # t·m; None: no grain heeling moment passes
    heel_limit: F  # deg, min(12°, deck edge)
    residual_to_reason: Literal["forty", "flooding", "max_difference"]  # the reason for residual_to
    moment_margin: OptF  # t·m, allowable − actual
    compartments: list[GrainCompartment]  # each compartment with grain


class Limits(Section):
    """SPEC.md "Limits": the condition's KG margin (m) and the criterion that governs it."""

    kg_max: OptF  # m, largest KG corrected at which every criterion passes; None: none ≥ 0
    kg_margin: OptF  # m, kg_max − kg_fluid (negative: KG must come down by that much)
    gm_min: OptF  # m, kmt − kg_max
    governing: str | None  # id of the criterion that fails just above kg_max
    governing_title: str | None  # that criterion's title
    governing_reference: str | None  # that criterion's source paragraph
    tolerance: F  # m, the search's resolution


class Criterion(Section):
    id: str  # criterion id, e.g. area_0_30
    title: str  # the criterion in words
    reference: str  # source paragraph, e.g. IS Code 2008, Part A, 2.2.1
    required: OptF  # the Code's value, in unit; None: does not exist
    attained: OptF  # the condition's value, in unit; None: does not exist
    unit: str  # unit of required and attained: m, m·rad, deg, ...
    passed: bool  # attained meets required as limit says
    margin: OptF  # the spare on the safe side, in unit
    limit: Literal["at_least", "at_most"]  # at_least: attained ≥ required; at_most: ≤
    set: str  # criteria set id, e.g. is2008.general


class CountedTank(Section):
    id: str  # tank id
    fsm: F  # t·m
    reason: str  # slack | largest_of_table | worst_pair | worst_single | maximum_rule


class CriteriaSet(Section):
    id: str  # set id, e.g. is2008.weather
    title: str  # the set's title


class Assumptions(Section):
    method: Literal["tables", "hull"]  # tables | hull: what the floating position rests on
    hydrostatics_trims: list[F] | None  # m: the table's trims, None for even keel
    cross_curves_trim: str  # free | even_keel | fixed, or hull
    cross_curves_trims: list[F] | None  # m: the cross curves' trims; None: one trim
    table_density: OptF  # t/m³, the hydrostatic table's; None: hull
    water_density: F  # t/m³, the condition's
    free_surface: str  # code | actual | maximum (Part B 3.1)
    full_percent: F  # %: a tank this full has no free surface
    free_surface_tanks: list[CountedTank]  # each tank whose FSM counts, and why
    wind_pressure: F  # N/m², P of 2.3.2.2
    z_method: str  # Z of 2.3.2.2: half_draft | underwater_centre
    roll_angle_source: str | None  # where a given θ1 comes from
    cb_source: str  # table | computed | hull
    list_side: str | None  # the side of the list; None: no list
    gz_beyond_flooding: Literal["exclude", "include"]  # GZ past θf in 2.2.2, 2.2.3
    fsc_method: str  # rise_of_kg: FSC = ΣFSM/Δ at every heel
    criteria_sets: list[CriteriaSet]  # the sets checked, with their titles
    criteria_chosen: bool  # chosen by the condition among those the vessel permits


class ComparisonEntry(Section):
    """One quantity of `check --compare` (SPEC.md; reportgen.compare)."""

    quantity: str  # key, e.g. lcb, gz_30, criterion_gm0
    label: str  # the quantity in words
    unit: str  # unit of the values
    tables: OptF  # value by the vessel's tables
    hull: OptF  # value on the hull offsets
    difference: OptF  # tables − hull
    tolerance: OptF  # MSC.1/Circ.1229; None where the circular gives none
    within: bool | None  # |difference| ≤ tolerance; None: no tolerance
    basis: str  # the tolerance's source, or none


class Results(Section):
    format: Literal["reportgen/results-1"] = RESULTS_FORMAT  # format id: reportgen/results-1
    software: Software  # the program that computed it: name and version
    inputs_sha256: str  # SHA-256 of the condition file's bytes then the vessel's
    inputs: InputFiles  # attachment names of the two input files
    condition: ConditionInfo  # the condition's title, voyage, date, water, signatories
    vessel: VesselInfo  # the ship, its dimensions and data fingerprint
    loading: Loading  # masses and centres: lightship, deadweight, displacement
    hydrostatics: Hydrostatics  # floating position and initial stability
    gz: GZ  # the GZ curve, heel + to starboard
    angles: Angles  # deck edge, θf, max GZ, vanishing angle (deg)
    weather: Weather | None = None  # Part A 2.3 quantities, when a set needs them
    load_line: LoadLine | None = None  # FWA, DWA, permissible draught
    draught_marks: DraughtMarks | None = None  # calculated draughts at the vessel's marks
    observed: Observed | None = None  # the draughts read, worked to a displacement
    grain: Grain | None = None  # Grain Code A 7 quantities, with grain on board
    limits: Limits | None = None  # the condition's KG margin (SPEC "Limits")
    timber: Timber | None = None  # timber deck cargo (Part A 3.3)
    passengers: Passengers | None = None  # passengers crowded, and their heels (Part A 3.1)
    icing: Icing | None = None  # ice allowance (Part B chapter 6)
    criteria: list[Criterion]  # every criterion checked, set by set
    passed: bool  # true when every criterion passed
    warnings: list[str] = Field(default_factory=list)  # warnings printed beside the verdict
    assumptions: Assumptions  # the methods and choices the results rest on
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
    def from_json(cls, text: str) -> "Results":
        return cls.model_validate_json(text)
