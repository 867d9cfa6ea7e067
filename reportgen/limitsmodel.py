"""The limits document (SPEC.md "Limits", format reportgen/limits-1) as a typed model: what
`reportgen limits --json` prints and a limits PDF embeds as limits.json, and the source of its
JSON Schema (`reportgen schema limits`). Units: t, m, t/m³, deg."""

from __future__ import annotations

from typing import Literal

from reportgen.results import F, OptF, Section, Software


class LimitsInputs(Section):
    vessel_file: str  # attachment name of the vessel file
    request: str  # name of the request (the trim) hashed with the vessel file's bytes


class LimitsVessel(Section):
    name: str
    identifier: str
    sha256: str  # SHA-256 of the vessel file's bytes
    source: dict[str, str] | None  # the vessel file's `source` block


class Search(Section):
    start: F  # m, the KG the walk starts from at the first displacement (at each next one the
    # search starts on the same steps near the limits already found)
    step_max: F  # m, largest step of the upward walk on KG
    tolerance: F  # m, the final step (kg_max is its passing end)


class LimitsRow(Section):
    displacement: F  # t, in water of the table's density
    draft_mean: F  # m, moulded, at midships
    kmt: F  # m
    kg_max: OptF  # m, largest KG corrected at which every criterion passes; None: none ≥ 0
    gm_min: OptF  # m, kmt − kg_max
    governing: str | None  # id of the criterion that fails just above kg_max
    flooding: F  # deg, θf at this displacement and trim
    deck_edge: F  # deg, deck edge immersion angle at this displacement and trim


class NamedCriterion(Section):
    id: str
    title: str
    reference: str  # source paragraph
    set: str  # criteria set id
    limit: Literal["at_least", "at_most"]


class LimitsDocument(Section):
    format: Literal["reportgen/limits-1"] = "reportgen/limits-1"
    software: Software
    inputs_sha256: str  # SHA-256 of the request bytes followed by the vessel file's bytes
    inputs: LimitsInputs
    vessel: LimitsVessel
    criteria: list[str]  # the criteria sets the curve is found against
    trim: F  # m, + by the stern, upright
    density: F  # t/m³, the hydrostatic table's
    search: Search
    rows: list[LimitsRow]
    criteria_list: list[NamedCriterion]  # the criteria of those sets, with their sources
    warnings: list[str]
