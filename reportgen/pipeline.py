"""One condition through the flow: inputs -> loading -> floating -> stability -> angles ->
criteria -> results (DESIGN.md). The stages are in reportgen.stages; this module puts them in
order and names the files in any message about bad input found on the way.
"""

from __future__ import annotations

from pathlib import Path

from reportgen import assemble, limits, stages
from reportgen.errors import InputError
from reportgen.inputs import Case, load_case
from reportgen.results import Results
from reportgen.vesseldata import VesselData, vessel_data


def evaluate(case: Case, data: VesselData | None = None, method: str | None = None
             ) -> Results:
    """Evaluate a case. `data` (the vessel's arrays) may be passed when evaluating many
    conditions of one vessel; it must have been made from `case.vessel`. `method` (tables |
    hull) overrides the vessel's calculation.method (check --compare).

    An InputError found while evaluating (a displacement beyond the tables, a windage profile
    that does not reach above the waterline, ...) names the condition and vessel files."""
    try:
        up = stages.upright(case, data if data is not None else vessel_data(case.vessel),
                            method)
        fsc, kg_fluid = stages.kg_fluid_of(up)
        k = stages.at_kg(up, kg_fluid)
        return assemble.results(up, k, fsc, limits.condition_limits(up, k))
    except InputError as exc:
        raise InputError(f"{case.condition_name} (vessel {case.vessel_name}): {exc}") from None


def evaluate_path(condition_path: str | Path) -> Results:
    """Read a condition file and its vessel, and evaluate."""
    return evaluate(load_case(condition_path))


def evaluate_compared(condition_path: str | Path) -> Results:
    """The condition by the vessel's own method, with the `comparison` of the tables against
    the hull (reportgen.compare); the vessel needs both tables and hull offsets."""
    from reportgen.compare import comparison

    case = load_case(condition_path)
    v = case.vessel
    if not v.has_tables or v.hull is None:
        missing = "hull offsets (hull:)" if v.hull is None else \
            "hydrostatics and cross_curves"
        raise InputError(f"{case.condition_name} (vessel {case.vessel_name}): check --compare "
                         f"evaluates by the tables and on the hull, and the vessel file has no "
                         f"{missing}")
    data = vessel_data(v)
    by_tables = evaluate(case, data, "tables")
    by_hull = evaluate(case, data, "hull")
    own = by_hull if v.calculation.method == "hull" else by_tables
    doc = own.to_dict()
    doc["comparison"] = comparison(by_tables, by_hull)
    return Results.model_validate(doc)
