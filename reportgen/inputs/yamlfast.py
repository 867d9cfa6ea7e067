"""The quick way through a YAML file, taken only when it is sure to give what the strict
reader (reportgen.inputs.yamlread) gives; `NOT_FAST` otherwise, and the strict reader then
reads the file and makes every refusal and message with its line.

Two steps:

1. Rows of numbers out of the text. A vessel file is mostly one-line flow sequences of plain
   decimal numbers (`volume: [0.000, 0.097, ...]`, `points: [[0.0, 6.6], ...]`). Each such
   row that stands alone at the end of its line (after `key: `, `- ` or indentation only,
   before an optional comment) is replaced by a plain marker word on the same line, and all
   rows are read at once by the JSON reader. Outside double quotes only the characters
   `-0123456789., []` may appear in a row, so a row the JSON reader accepts holds numbers
   written `-?(0|[1-9][0-9]*)(\\.[0-9]+)?` and nested lists of them: YAML 1.1 (PyYAML's
   resolver) makes an int of the first form and a float of the second, as JSON does, with
   the same `int()`/`float()` of the same text. Inside double quotes only printable ASCII
   without `"` and `\\` (no escapes), which YAML and JSON read as the same string (the
   openings' names of a flooding-angle table). Anything else (exponents, `.5`, `1.`, `+1`,
   `0x1F`, `1_000`, `.inf`, `'single quotes'`, a trailing comma, a row over several lines
   or with a comment inside) stays in the text for YAML to read.
2. The rest of the text (a few kB) through libyaml's parser as events, built directly into
   dicts, lists and scalars with PyYAML's own resolver and scalar constructors. Whatever the
   strict reader would refuse or treat specially is not handled here: an anchor or alias, an
   explicit tag, a key given twice, a key that is not a plain value, a merge key, more than
   one document, nesting deeper than DEPTH, a scalar that cannot be built, a parse error.

Every marker must come back as a whole plain scalar in a value position exactly once;
a marker that landed inside a quoted or block scalar, a comment or a key means the row was
not a row, and the whole file goes to the strict reader.
"""

from __future__ import annotations

import json
import re
from typing import Any

import yaml

try:
    from yaml import _yaml  # libyaml's binding (CParser)
except ImportError:  # without libyaml every file takes the strict way
    _yaml = None

NOT_FAST = object()  # "read this file the strict way"
DEPTH = 32  # deeper files go the strict way (which refuses beyond its own MAX_DEPTH, 64)

_MARK = "_rgrow_"
_NUMBERS = r"[-0-9., ]++"  # digits, signs, points, commas and spaces
_TEXT = r'"[ !#-\[\]-~]*+"'  # a double-quoted word of printable ASCII without " or \\
_ROW = re.compile(
    r"(?m)^([ ]*+(?:-[ ]+)*+(?:[A-Za-z_][A-Za-z0-9_]*:[ ]+)?)"  # indentation, "- ", "key: "
    rf"(\[(?:{_NUMBERS}|{_TEXT}|\[(?:{_NUMBERS}|{_TEXT})*+\])*+\])"  # a flow sequence of
    # numbers and words, or of such sequences (two levels at most; possessive: no backtracking)
    r"(?=[ ]*(?:#[^\n]*)?\r?$)")  # then only a comment before the end of the line

_RESOLVER = yaml.resolver.Resolver()
_FIRST = _RESOLVER.yaml_implicit_resolvers  # first character -> PyYAML's implicit resolvers
_FAST_FLOAT = re.compile(r"-?[0-9]+\.[0-9]+")  # PyYAML's float, not its int: float(text)
_FAST_INT = re.compile(r"-?(?:0|[1-9][0-9]*)")  # PyYAML's int, not its float: int(text)
# Numbers YAML 1.1 reads in a way a person typing a decimal does not mean (yaml.org/type/int.html
# and float.html): a leading zero makes octal (0250 is 168) and colons make base 60 (1:20 is
# 80). Such a plain scalar is kept as text, so that a number field refuses it and says why
# (yamlread._message) instead of taking a value nobody wrote; free text (notes) keeps it as
# written. Both readers resolve through `is_misread_number`.
MISREAD_NUMBER = re.compile(r"[-+]?0[0-7_]+|[-+]?[0-9][0-9_]*(?::[0-5]?[0-9])+(?:\.[0-9_]*)?")
_NUMBER_TAGS = ("tag:yaml.org,2002:int", "tag:yaml.org,2002:float")


def is_misread_number(tag: str, text: str) -> bool:
    """True when YAML 1.1 would make `text` (resolved to `tag`) an octal or base-60 number."""
    return tag in _NUMBER_TAGS and MISREAD_NUMBER.fullmatch(text) is not None


_CONSTRUCTOR = yaml.constructor.SafeConstructor()
_SCALARS = {f"tag:yaml.org,2002:{name}": getattr(_CONSTRUCTOR, f"construct_yaml_{name}")
            for name in ("bool", "int", "float", "null", "timestamp", "str")}


class _NotFast(Exception):
    """The file holds something the strict reader must see."""


def fast_data(text: str) -> Any:
    """The data of YAML text as the strict reader builds them, or NOT_FAST."""
    if _yaml is None or not hasattr(_yaml, "CParser"):
        return NOT_FAST
    try:
        skeleton, rows = rows_out(text)
        return _Builder(skeleton, rows).document()
    except Exception:  # noqa: BLE001 (_NotFast, a YAML error, a scalar that cannot be built,
        return NOT_FAST  # anything unforeseen: the strict reader decides and says why)


def rows_out(text: str) -> tuple[str, list]:
    """(text with each row of numbers replaced by a marker word, the rows' values)."""
    if _MARK in text:
        return text, []
    parts = _ROW.split(text)  # [text, prefix, row, text, prefix, row, ..., text]
    rows = parts[2::3]
    if not rows:
        return text, []
    try:
        values = json.loads("[" + ",".join(rows) + "]", parse_constant=_refuse)
        parts[2::3] = [f"{_MARK}{i}" for i in range(len(rows))]
    except ValueError:  # some row is not one: read them one by one, leave the others
        values = []
        for k in range(2, len(parts), 3):
            try:
                value = json.loads(parts[k], parse_constant=_refuse)
            except ValueError:
                continue
            parts[k] = f"{_MARK}{len(values)}"
            values.append(value)
    return "".join(parts), values


def _refuse(name: str) -> None:
    raise ValueError(f"{name} is not a plain decimal")  # never reached: no letters in a row


class _Builder:
    """Dicts, lists and scalars straight from libyaml's events (no node objects)."""

    def __init__(self, text: str, rows: list) -> None:
        self.parser = _yaml.CParser(text)
        self.rows = rows
        self.used = 0

    def document(self) -> Any:
        try:
            get = self.parser.get_event
            if type(get()) is not yaml.StreamStartEvent:
                raise _NotFast
            event = get()
            if type(event) is yaml.StreamEndEvent:
                value = None
            elif type(event) is yaml.DocumentStartEvent:
                value = self.node(get(), 0)
                if type(get()) is not yaml.DocumentEndEvent:
                    raise _NotFast
                if type(get()) is not yaml.StreamEndEvent:  # a second document
                    raise _NotFast
            else:
                raise _NotFast
            if self.used != len(self.rows):  # a marker inside a string or comment
                raise _NotFast
            return value
        finally:
            self.parser.dispose()

    def node(self, event: Any, depth: int) -> Any:
        kind = type(event)
        if kind is yaml.ScalarEvent:
            if event.anchor is not None or event.tag is not None:
                raise _NotFast
            value = event.value
            if value.startswith(_MARK) and event.implicit[0]:
                return self.row(value)
            return scalar(value) if event.implicit[0] else value
        if kind is yaml.AliasEvent or event.anchor is not None or event.tag is not None:
            raise _NotFast
        if depth >= DEPTH:
            raise _NotFast
        get = self.parser.get_event
        if kind is yaml.SequenceStartEvent:
            items = []
            event = get()
            while type(event) is not yaml.SequenceEndEvent:
                items.append(self.node(event, depth + 1))
                event = get()
            return items
        if kind is yaml.MappingStartEvent:
            out: dict = {}
            event = get()
            while type(event) is not yaml.MappingEndEvent:
                if type(event) is not yaml.ScalarEvent or event.tag is not None or \
                        event.anchor is not None:
                    raise _NotFast  # a list, mapping, alias or tagged value as a key
                text = event.value
                if event.implicit[0]:
                    if text.startswith(_MARK) or text == "<<":
                        raise _NotFast  # a row as a key, or a merge key
                    key = scalar(text)
                else:
                    key = text
                if key in out:
                    raise _NotFast  # a key given twice: the strict reader says where
                out[key] = self.node(get(), depth + 1)
                event = get()
            return out
        raise _NotFast

    def row(self, text: str) -> list:
        index = text[len(_MARK):]
        if self.used >= len(self.rows) or index != str(self.used):
            raise _NotFast  # not our marker, or not in the order written
        self.used += 1
        return self.rows[int(index)]


def scalar(text: str) -> Any:
    """The value of a plain scalar, as PyYAML's safe loader makes it."""
    if text and text[0] not in _FIRST and None not in _FIRST:  # no resolver: a string
        return text
    if _FAST_FLOAT.fullmatch(text):
        return float(text)
    if _FAST_INT.fullmatch(text):
        return int(text)
    tag = _RESOLVER.resolve(yaml.ScalarNode, text, (True, False))
    if is_misread_number(tag, text):
        return text
    build = _SCALARS.get(tag)
    if build is None:
        raise _NotFast  # merge, value, yaml or a tag of our own: the strict reader decides
    return build(yaml.ScalarNode(tag, text))
