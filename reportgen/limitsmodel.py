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
    name: str  # the ship's name
    identifier: str  # the ship's identifier
    sha256: str  # SHA-256 of the vessel file's bytes
    source: dict[str, str] | None  # the vessel file's `source` block


class Search(Section):
    start: F  # m, the KG the search starts from
    step_max: F  # m, largest step of the upward walk on KG
    tolerance: F  # m, the final step (kg_max is its passing end)


class LimitsRow(Section):
    displacement: F  # t, in water of the table's density
    draft_mean: F  # m, moulded, at midships
    kmt: F  # m, transverse KM above base
    kg_max: OptF  # m, largest KG corrected at which every criterion passes; None: none ≥ 0
    gm_min: OptF  # m, kmt − kg_max
    governing: str | None  # id of the criterion that fails just above kg_max
    flooding: F  # deg, θf at this displacement and trim
    deck_edge: F  # deg, deck edge immersion angle at this displacement and trim


class NamedCriterion(Section):
    id: str  # criterion id, e.g. area_0_30
    title: str  # the criterion in words
    reference: str  # source paragraph
    set: str  # criteria set id
    limit: Literal["at_least", "at_most"]  # at_least: attained ≥ required; at_most: ≤


class LimitsDocument(Section):
    format: Literal["reportgen/limits-1"] = "reportgen/limits-1"  # format id: reportgen/limits-1
    software: Software  # the program that made it: name and version
    inputs_sha256: str  # SHA-256 of the request bytes followed by the vessel file's bytes
    inputs: LimitsInputs  # attachment names the curve rests on
    vessel: LimitsVessel  # the ship and its data fingerprint
    criteria: list[str]  # the criteria sets the curve is found against
    trim: F  # m, + by the stern, upright
    density: F  # t/m³, the hydrostatic table's
    search: Search  # how the KG search ran (m)
    rows: list[LimitsRow]  # one per cross-curve displacement within the table
    criteria_list: list[NamedCriterion]  # the criteria of those sets, with their sources
    warnings: list[str]  # warnings printed beside the curve
