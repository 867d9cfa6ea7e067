"""The two input files (SPEC.md): models, validation and loading.

Every problem found here is raised as `InputError` with one message naming the file, the key
path and, where YAML gives it, the line.
"""

from reportgen.inputs.case import (
    Case,
    case_from_bytes,
    load_case,
    load_case_bytes,
    load_vessel,
    parse_vessel,
)
from reportgen.inputs.condition import CONDITION_FORMAT, Condition
from reportgen.inputs.vessel import VESSEL_FORMAT, Vessel

__all__ = ["CONDITION_FORMAT", "VESSEL_FORMAT", "Case", "Condition", "Vessel",
           "case_from_bytes", "load_case", "load_case_bytes", "load_vessel", "parse_vessel"]
