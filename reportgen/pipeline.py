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


def evaluate(case: Case, data: VesselData | None = None) -> Results:
    """Evaluate a case. `data` (the vessel's arrays) may be passed when evaluating many
    conditions of one vessel; it must have been made from `case.vessel`.

    An InputError found while evaluating (a displacement beyond the tables, a windage profile
    that does not reach above the waterline, ...) names the condition and vessel files."""
    try:
        up = stages.upright(case, data if data is not None else vessel_data(case.vessel))
        fsc, kg_fluid = stages.kg_fluid_of(up)
        k = stages.at_kg(up, kg_fluid)
        return assemble.results(up, k, fsc, limits.condition_limits(up, k))
    except InputError as exc:
        raise InputError(f"{case.condition_name} (vessel {case.vessel_name}): {exc}") from None


def evaluate_path(condition_path: str | Path) -> Results:
    """Read a condition file and its vessel, and evaluate."""
    return evaluate(load_case(condition_path))
