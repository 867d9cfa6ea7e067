"""The calculation package as a kind of signed document (reportgen.signing.recompute.Kind).

Its inputs are the condition files package.json lists (``conditions[i].file``) and its vessel
file (``vessel.file``); inputs_sha256 = SHA-256(the condition files in order + the vessel
file). Verify re-reads every condition under the names its embedded results record (those
``check`` saw), evaluates it, finds the vessel's limiting KG curve again (package.json
``limits``), and renders the package again to compare it byte for byte.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping
from typing import Any

from reportgen.docinfo import PACKAGE_FORMAT, PACKAGE_NAME, PACKAGE_TITLE_PREFIX, approval_name
from reportgen.errors import InputError
from reportgen.provenance import vessel_fingerprint
from reportgen.signing.recompute import Inputs, Kind, Rebuilt, register
from reportgen.signing.recompute import _sheet_certified as sheet_certified


def _package_inputs(data: Mapping[str, Any], files: Mapping[str, bytes]) -> Inputs:
    """The condition files package.json lists (conditions[i].file) and its vessel file."""
    listed = data.get("conditions")
    vessel = data.get("vessel")
    vessel_name = vessel.get("file") if isinstance(vessel, dict) else None
    if not isinstance(listed, list) or not listed or not isinstance(vessel_name, str):
        raise InputError("package.json does not name its input files (conditions[].file, "
                         "vessel.file)")
    conditions, read_as = [], []
    for i, entry in enumerate(listed):
        name = entry.get("file") if isinstance(entry, dict) else None
        results = entry.get("results") if isinstance(entry, dict) else None
        named = results.get("inputs") if isinstance(results, dict) else None
        named = named if isinstance(named, dict) else {}
        as_read = (named.get("condition_file"), named.get("vessel_file"))
        if not isinstance(name, str) or not all(isinstance(n, str) for n in as_read):
            raise InputError(f"package.json: conditions[{i}] does not name its file (file, "
                             f"results.inputs)")
        conditions.append(name)
        read_as.append(as_read)
    title = data.get("title")
    if not isinstance(title, str):
        raise InputError("package.json: title is not a text")
    for name in [*conditions, vessel_name]:
        if name not in files:
            raise InputError(f"the input file {name} is not embedded")
    return Inputs(conditions[0], files[conditions[0]], vessel_name, files[vessel_name],
                  files.get(approval_name(vessel_name)),
                  tuple((name, files[name]) for name in conditions), tuple(read_as), title)


def _rebuild_package(inputs: Inputs) -> Rebuilt:
    """Evaluate every embedded condition and render the package from them. Each condition is
    read under the names its embedded results give (those ``check`` saw), so that its
    results can equal ``check --json`` of the condition."""
    from reportgen.inputs import load_case_bytes
    from reportgen.report.package import Member, make_package, package_json, render_package

    cases = [load_case_bytes(data, inputs.vessel, cond_name, vessel_name, inputs.approval)
             for (_name, data), (cond_name, vessel_name)
             in zip(inputs.condition_files(), inputs.read_as, strict=True)]
    built = make_package(cases, inputs.title)  # the limiting KG curve computed again too
    pkg = dataclasses.replace(
        built, members=tuple(Member(name, m.case, m.results) for (name, _data), m
                             in zip(inputs.condition_files(), built.members, strict=True)),
        vessel_file=inputs.vessel_name, vessel_bytes=inputs.vessel, approval=inputs.approval)
    return Rebuilt(package_json(pkg), render_package(pkg))


def _package_certified(data: Mapping[str, Any], inputs: Inputs | None) -> dict:
    """What a package certifies: its vessel, title and each condition's verdict."""
    listed = data.get("conditions") if isinstance(data.get("conditions"), list) else []
    each = [sheet_certified(c.get("results") if isinstance(c.get("results"), dict) else {},
                            None) for c in listed if isinstance(c, dict)]
    vessel = data.get("vessel") if isinstance(data.get("vessel"), dict) else {}
    fingerprint = vessel.get("sha256")
    if fingerprint is None and inputs is not None:
        fingerprint = vessel_fingerprint(inputs.vessel)
    roles = {}
    for c in each:
        roles.update({k: v for k, v in c["signatories"].items() if v})
    dates = sorted(str(c["date"]) for c in each if c["date"])
    return {
        "kind": "package",
        "vessel": vessel.get("name"),
        "identifier": vessel.get("identifier"),
        "vessel_sha256": fingerprint,
        "condition": f"{data.get('title')} ({len(each)} condition{'' if len(each) == 1 else 's'})",
        "date": dates[-1] if dates else None,
        "passed": bool(each) and all(c["passed"] for c in each),
        "failing_criteria": [{"id": f"condition {i}", "title": c["condition"],
                              "reference": ", ".join(str(f.get("id"))
                                                     for f in c["failing_criteria"])}
                             for i, c in enumerate(each, 1) if not c["passed"]],
        "signatories": roles,
        "conditions": [{k: c[k] for k in ("condition", "date", "passed")} for c in each],
    }


PACKAGE = Kind("package", "calculation package", PACKAGE_NAME, PACKAGE_FORMAT,
               _package_inputs, _rebuild_package, _package_certified, PACKAGE_TITLE_PREFIX)


register(PACKAGE)
