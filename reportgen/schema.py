"""The JSON Schema (draft 2020-12) of each reportgen format, generated from its model.

The models are the one definition of every format: the schema an editor uses to complete and
check keys (`# yaml-language-server: $schema=...`), the key tables of docs/formats.md and the
validation of a file all come from them. A field's meaning and unit are the comment written
beside it in the model's source (`name: type  # m from AP`); `field_notes` reads those comments
so that they are written once.
"""

from __future__ import annotations

import inspect
import io
import tokenize
from functools import cache
from importlib import import_module
from typing import Any

from pydantic import BaseModel

DIALECT = "https://json-schema.org/draft/2020-12/schema"

# format name -> (model "module:Class", the format id in the file's `format` key, the mode:
# of the schema (validation: what a reader accepts))
FORMATS: dict[str, tuple[str, str, str]] = {
    "vessel": ("reportgen.inputs.vessel:Vessel", "reportgen/vessel-1", "validation"),
    "condition": ("reportgen.inputs.condition:Condition", "reportgen/condition-1", "validation"),
    "results": ("reportgen.results:Results", "reportgen/results-1", "validation"),
    "limits": ("reportgen.limitsmodel:LimitsDocument", "reportgen/limits-1", "validation"),
    "package": ("reportgen.packagedoc:PackageDocument", "reportgen/package-1", "validation"),
}


def model_of(name: str) -> type[BaseModel]:
    module, cls = FORMATS[name][0].split(":")
    return getattr(import_module(module), cls)


@cache
def field_notes(cls: type) -> dict[str, str]:
    """The comment written beside each field of a model class, by field name (an empty dict
    when the source cannot be read, as in a frozen build)."""
    try:
        source = inspect.getsource(cls)
    except (OSError, TypeError):
        return {}
    notes: dict[str, str] = {}
    name = None
    for tok in tokenize.generate_tokens(io.StringIO(source).readline):
        if tok.type == tokenize.NAME and tok.start[1] == 4 and name is None:
            name = tok.string
        elif tok.type == tokenize.COMMENT and name is not None:
            notes.setdefault(name, tok.string.lstrip("# ").strip())
        if tok.type == tokenize.NEWLINE:
            name = None
    return notes


def _classes(root: type[BaseModel]) -> dict[str, type]:
    """Every model class reachable from `root`, by class name (the schema's $defs keys)."""
    found: dict[str, type] = {}

    def visit(tp: Any) -> None:
        if isinstance(tp, type) and issubclass(tp, BaseModel):
            if tp.__name__ in found:
                return
            found[tp.__name__] = tp
            for f in tp.model_fields.values():
                visit(f.annotation)
        for arg in getattr(tp, "__args__", ()) or ():
            visit(arg)
        origin = getattr(tp, "__origin__", None)
        if origin is not None and origin is not tp:
            visit(origin)

    visit(root)
    return found


def _describe(node: dict, cls: type) -> None:
    notes = field_notes(cls)
    for key, prop in node.get("properties", {}).items():
        if key in notes and "description" not in prop:
            prop["description"] = notes[key]


def json_schema(name: str) -> dict[str, Any]:
    """The JSON Schema of format `name` (a key of FORMATS), with the fields' notes as
    descriptions."""
    _model, format_id, mode = FORMATS[name]
    model = model_of(name)
    schema = model.model_json_schema(mode=mode)
    classes = _classes(model)
    _describe(schema, model)
    for def_name, node in schema.get("$defs", {}).items():
        if def_name in classes:
            _describe(node, classes[def_name])
    return {"$schema": DIALECT, "$id": f"https://reportgen.invalid/schema/{name}.schema.json",
            "title": f"reportgen {name} file ({format_id})", **schema}
