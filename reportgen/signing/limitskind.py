"""The limits document as a kind of signed document (reportgen.signing.recompute.Kind).

Its inputs are the embedded vessel file (with its approval VESSEL.yaml.p7s when embedded,
checked by ``verify --vessel-trust`` as for a sheet) and the request (the trim, from
limits.json), whose
canonical bytes (reportgen.limitcurve.request_bytes) stand in the condition's place in the
inputs hash: inputs_sha256 = SHA-256(request bytes + vessel bytes). Verify recomputes the curve
from the vessel bytes at that trim and renders the document again.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import Any

from reportgen.docinfo import LIMITS_FORMAT, LIMITS_NAME, LIMITS_REQUEST_NAME, approval_name
from reportgen.errors import InputError
from reportgen.provenance import vessel_fingerprint
from reportgen.signing.recompute import Inputs, Kind, Rebuilt, register


def _inputs(data: Mapping[str, Any], files: Mapping[str, bytes]) -> Inputs:
    named = data.get("inputs")
    vessel_name = named.get("vessel_file") if isinstance(named, dict) else None
    if not isinstance(vessel_name, str):
        raise InputError("the limits do not name the vessel file (limits.inputs)")
    if vessel_name not in files:
        raise InputError(f"the input file {vessel_name} is not embedded")
    trim = data.get("trim")
    if type(trim) not in (int, float) or not math.isfinite(trim):
        raise InputError("the limits do not state their trim (limits.trim)")
    from reportgen.limitcurve import request_bytes

    return Inputs(LIMITS_REQUEST_NAME, request_bytes(float(trim)), vessel_name,
                  files[vessel_name], files.get(approval_name(vessel_name)))


def _trim(inputs: Inputs) -> float:
    import json

    return float(json.loads(inputs.condition)["trim"])


def _rebuild(inputs: Inputs) -> Rebuilt:
    from reportgen.inputs.case import parse_vessel
    from reportgen.limitcurve import limiting_curve, to_json
    from reportgen.report.limitsdoc import render_limits

    vessel = parse_vessel(inputs.vessel, inputs.vessel_name)
    doc = limiting_curve(vessel, inputs.vessel, inputs.vessel_name, _trim(inputs))
    return Rebuilt(to_json(doc), render_limits(inputs.vessel_name, inputs.vessel, doc,
                                               list(vessel.criteria), inputs.approval))


def _certified(data: Mapping[str, Any], inputs: Inputs | None) -> dict:
    vessel = data.get("vessel") if isinstance(data.get("vessel"), dict) else {}
    fingerprint = vessel.get("sha256")
    if fingerprint is None and inputs is not None:
        fingerprint = vessel_fingerprint(inputs.vessel)
    trim = data.get("trim")
    rows = data.get("rows") if isinstance(data.get("rows"), list) else []
    return {
        "kind": "limits",
        "vessel": vessel.get("name"),
        "identifier": vessel.get("identifier"),
        "vessel_sha256": fingerprint,
        "condition": f"limiting KG / minimum GM curve, upright at a trim of {trim} m",
        "date": None,
        "passed": True,  # a curve has no verdict: "statement" says what it is
        "statement": f"limits at {len(rows)} displacements (a curve: no pass or fail)",
        "failing_criteria": [],
        "signatories": {},
    }


LIMITS = Kind("limits", "limits document", LIMITS_NAME, LIMITS_FORMAT, _inputs, _rebuild,
              _certified)
register(LIMITS)
