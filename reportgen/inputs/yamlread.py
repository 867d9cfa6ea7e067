"""YAML input with limits, and pydantic validation with messages that name key path and line.

The strict way parses with libyaml's C parser (yaml.CSafeLoader) and builds the Python data
with a constructor that refuses what a stability input never needs and a hostile file may
carry: a key given twice, a key that is not a plain value (a list or a mapping as a key),
an alias expansion beyond MAX_EXPANDED_NODES (an "alias bomb"), nesting deeper than
MAX_DEPTH, a scalar that cannot be built (a date that does not exist, an integer of thousands
of digits). Line numbers of every key are worked out only when there is an error to report.
`parse` first tries the quick way (reportgen.inputs.yamlfast), which gives the same data for
a file it is sure of and hands every other file, and every refusal, to the strict way.
"""

from __future__ import annotations

import datetime as dt
import gc
import re
from collections.abc import Iterator
from contextlib import contextmanager
from typing import Any

import yaml
from pydantic import BaseModel, ValidationError

from reportgen.errors import InputError
from reportgen.inputs.yamlfast import MISREAD_NUMBER, NOT_FAST, fast_data, is_misread_number

MAX_EXPANDED_NODES = 2_000_000  # nodes after alias expansion; a large vessel file has ~10⁵
MAX_DEPTH = 64  # nesting of mappings and sequences

_Base = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


class _Refused(Exception):
    def __init__(self, message: str, node: yaml.Node | None) -> None:
        super().__init__(message)
        self.node = node


class _Loader(_Base):  # type: ignore[misc, valid-type]
    """SafeLoader (C parser where available) with the refusals of this module."""

    def __init__(self, stream: str) -> None:
        super().__init__(stream)
        self._expanded = 0
        self._sizes: dict[int, int] = {}
        self._depth = 0

    def construct_object(self, node: yaml.Node, deep: bool = False) -> Any:
        if node in self.constructed_objects:  # an alias: the same node used again
            self._expanded += _size(node, self._sizes)
            if self._expanded > MAX_EXPANDED_NODES:
                raise _Refused(f"aliases expand to more than {MAX_EXPANDED_NODES:,} values "
                               f"(refused: a file that grows when read)", node)
            return self.constructed_objects[node]
        self._expanded += 1
        numbers = _plain_numbers(node)
        if numbers is not None:  # a row of a table: built at once (the bulk of a vessel file)
            self._expanded += len(numbers)
            self.constructed_objects[node] = numbers
            return numbers
        self._depth += 1
        try:
            if self._depth > MAX_DEPTH:
                raise _Refused(f"nested more than {MAX_DEPTH} levels deep", node)
            return super().construct_object(node, deep=True)
        except (_Refused, InputError):
            raise
        except (ValueError, OverflowError, TypeError) as exc:
            raise _Refused(_unreadable(node, exc), node) from None
        finally:
            self._depth -= 1

    def resolve(self, kind: type, value: Any, implicit: tuple[bool, bool]) -> str:
        """The tag of a node: a plain decimal number directly (the tag PyYAML's own implicit
        resolvers give it, float tried before int), everything else by those resolvers."""
        if kind is yaml.ScalarNode and implicit[0]:
            if _FAST_FLOAT.fullmatch(value):
                return _FLOAT_TAG
            if _FAST_INT.fullmatch(value):
                return _INT_TAG
        tag = super().resolve(kind, value, implicit)
        if kind is yaml.ScalarNode and implicit[0] and is_misread_number(tag, value):
            return "tag:yaml.org,2002:str"  # 0250, 1:20: text, refused where a number is due
        return tag

    def construct_mapping(self, node: yaml.Node, deep: bool = False) -> dict:
        if not isinstance(node, yaml.MappingNode):
            return super().construct_mapping(node, deep=deep)
        self.flatten_mapping(node)
        out: dict = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, yaml.ScalarNode):
                raise _Refused("a key must be a plain value, not a list or a mapping", key_node)
            key = self.construct_object(key_node, deep=True)
            if key in out:
                raise _Refused(f"key {key!r} given twice", key_node)
            out[key] = self.construct_object(value_node, deep=True)
        return out


# Mappings built by the loader above are plain dicts; make the standard tag use it.
_Loader.add_constructor("tag:yaml.org,2002:map", _Loader.construct_mapping)


def _size(node: yaml.Node, memo: dict[int, int]) -> int:
    """Number of nodes of `node` with every alias expanded (memoised by node identity)."""
    key = id(node)
    if key in memo:
        return memo[key]
    memo[key] = 1  # a recursive alias counts once while it is being measured
    if isinstance(node, yaml.MappingNode):
        total = 1 + sum(_size(k, memo) + _size(v, memo) for k, v in node.value)
    elif isinstance(node, yaml.SequenceNode):
        total = 1 + sum(_size(v, memo) for v in node.value)
    else:
        total = 1
    memo[key] = total
    return total


_FLOAT_TAG = "tag:yaml.org,2002:float"
_INT_TAG = "tag:yaml.org,2002:int"
_FAST_FLOAT = re.compile(r"-?[0-9]+\.[0-9]+")  # within PyYAML's float pattern, not its int
_FAST_INT = re.compile(r"-?(?:0|[1-9][0-9]*)")  # within PyYAML's int pattern, not its float
_PLAIN_DECIMAL = re.compile(r"-?[0-9]+(\.[0-9]*)?([eE][-+]?[0-9]+)?")


def _plain_numbers(node: yaml.Node) -> list | None:
    """The numbers of a sequence of plain decimal scalars (what the safe constructor would
    make of them: int for an int-tagged integer, float otherwise), or None when the sequence
    holds anything else (left to the full constructor)."""
    if not isinstance(node, yaml.SequenceNode) or not node.value:
        return None
    out = []
    for child in node.value:
        if not isinstance(child, yaml.ScalarNode) or child.style:  # plain: None or ""
            return None
        tag, value = child.tag, child.value
        if tag == _FLOAT_TAG and _PLAIN_DECIMAL.fullmatch(value) and "." in value:
            out.append(float(value))
        elif tag == _INT_TAG and value.lstrip("-").isdigit() and len(value) < 20 and (
                value.lstrip("-")[:1] != "0" or value.lstrip("-") == "0"):
            out.append(int(value))
        else:
            return None
    return out


def _unreadable(node: yaml.Node, exc: Exception) -> str:
    """Why a scalar could not be built, in the user's terms."""
    text = str(node.value)[:40] + ("..." if len(str(node.value)) > 40 else "")
    if node.tag.endswith(":timestamp"):
        return f"{text!r} is not a date that exists (ISO 8601, YYYY-MM-DD)"
    if node.tag.endswith((":int", ":float")):
        return f"{text!r} is not a number reportgen can read ({len(str(node.value))} characters)"
    return f"cannot read this value: {exc}"


def decode(raw: bytes, name: str) -> str:
    """UTF-8 text of a file (a leading byte-order mark allowed)."""
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputError(f"{name}: not UTF-8 text (byte {exc.start})") from None


def _line(node: yaml.Node | None) -> str:
    return f" (line {node.start_mark.line + 1})" if node is not None and node.start_mark else ""


@contextmanager
def cyclic_gc_paused() -> Iterator[None]:
    """Python's cyclic garbage collector paused while a file's data are built: they are trees
    (nothing cyclic to collect), and the collector's repeated passes over the many new objects
    of a vessel file cost a large part of the reading time. Restored as it was afterwards."""
    was = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was:
            gc.enable()


def parse(raw: bytes, name: str) -> Any:
    """The data of a YAML file (one document); InputError naming the file and line.

    The quick way (reportgen.inputs.yamlfast) first; whatever it is not sure of, the strict
    way below, which makes every refusal and its message."""
    with cyclic_gc_paused():
        text = decode(raw, name)
        data = fast_data(text)
        return _parse(text, name) if data is NOT_FAST else data


def parse_strict(raw: bytes, name: str) -> Any:
    """`parse` without the quick way (the reference the quick way is tested against)."""
    with cyclic_gc_paused():
        return _parse(decode(raw, name), name)


def _parse(text: str, name: str) -> Any:
    loader = _Loader(text)
    node = None
    try:
        node = loader.get_single_node()
        return loader.construct_document(node) if node is not None else None
    except _Refused as exc:
        path = _path_to(node, exc.node) if node is not None else None
        if path:
            lines: dict[tuple, int] = {}
            _walk(node, (), lines, set())
            raise InputError(f"{name}: {where(path, lines)}: {exc}") from None
        raise InputError(f"{name}: {exc}{_line(exc.node)}") from None
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        at = f" (line {mark.line + 1}, column {mark.column + 1})" if mark else ""
        raise InputError(f"{name}: not valid YAML{at}: {exc.problem or exc}") from None
    except yaml.reader.ReaderError as exc:  # a character YAML forbids (NUL, most controls)
        line = text.count("\n", 0, exc.position) + 1
        column = exc.position - (text.rfind("\n", 0, exc.position) + 1) + 1
        raise InputError(f"{name}: not valid YAML (line {line}, column {column}): the "
                         f"character U+{exc.character:04X} is not allowed in a YAML file") \
            from None
    except yaml.YAMLError as exc:
        raise InputError(f"{name}: not valid YAML: {exc}") from None
    except RecursionError:
        raise InputError(f"{name}: nested too deeply to read") from None
    finally:
        loader.dispose()


def key_lines(raw: bytes) -> dict[tuple, int]:
    """The 1-based line of every key path of a YAML file that `parse` accepted."""
    loader = _Loader(decode(raw, ""))
    try:
        node = loader.get_single_node()
    finally:
        loader.dispose()
    lines: dict[tuple, int] = {}
    if node is not None:
        _walk(node, (), lines, set())
    return lines


def _walk(node: yaml.Node, path: tuple, lines: dict[tuple, int], seen: set[int]) -> None:
    lines.setdefault(path, node.start_mark.line + 1)
    if id(node) in seen:  # an alias: its lines are those of the anchor
        return
    seen.add(id(node))
    if isinstance(node, yaml.MappingNode):
        for key_node, value_node in node.value:
            key = key_node.value
            if isinstance(key, str) and key.lstrip("-").isdigit():
                key = int(key)
            _walk(value_node, (*path, key), lines, seen)
            lines[(*path, key)] = key_node.start_mark.line + 1
    elif isinstance(node, yaml.SequenceNode):
        for i, item in enumerate(node.value):
            _walk(item, (*path, i), lines, seen)


def _path_to(root: yaml.Node, target: yaml.Node | None) -> tuple | None:
    """The key path of `target` inside the node tree `root` (None when it is not a value)."""
    stack: list[tuple[yaml.Node, tuple]] = [(root, ())]
    seen: set[int] = set()
    while stack:
        node, path = stack.pop()
        if node is target:
            return path
        if id(node) in seen:
            continue
        seen.add(id(node))
        if isinstance(node, yaml.MappingNode):
            stack += [(v, (*path, k.value)) for k, v in node.value]
        elif isinstance(node, yaml.SequenceNode):
            stack += [(v, (*path, i)) for i, v in enumerate(node.value)]
    return None


def where(path: tuple, lines: dict[tuple, int]) -> str:
    """'a.b[2].c (line 7)' for a key path, with the line of the deepest known prefix."""
    text = ""
    for p in path:
        text += f"[{p}]" if isinstance(p, int) else (f".{p}" if text else str(p))
    for k in range(len(path), -1, -1):
        if path[:k] in lines:
            return f"{text or '(top level)'} (line {lines[path[:k]]})"
    return text or "(top level)"


# YAML 1.1 (the version PyYAML reads) takes a number with an exponent for a number only with
# a decimal point and a signed exponent: 1.0e+6 is a number; 1e6, 1.0e6 and 1e+6 are text.
_LEADING_ZERO = re.compile(r"[-+]?0[0-9_]+")  # 08, 09: neither octal nor decimal in YAML 1.1
_EXPONENT_TEXT = re.compile(r"^[-+]?[0-9][0-9_]*(\.[0-9_]*)?[eE][-+]?[0-9]+$")


def _message(err: dict) -> str:
    if err["type"] == "extra_forbidden":
        return "unknown key (check the spelling; free text goes under notes:)"
    if err["type"] == "missing":
        return "required key is missing"
    text = err["msg"].removeprefix("Value error, ")
    given = err.get("input")
    if isinstance(given, str) and _EXPONENT_TEXT.match(given.strip()):
        mantissa, exponent = re.split("[eE]", given.strip())
        mantissa += "" if "." in mantissa else ".0"
        exponent = exponent if exponent[0] in "+-" else "+" + exponent
        text += (f" ({given!r} is text in YAML 1.1: write the number with a decimal point "
                 f"and a signed exponent, {mantissa}e{exponent})")
    elif isinstance(given, str) and (MISREAD_NUMBER.fullmatch(given.strip())
                                     or _LEADING_ZERO.fullmatch(given.strip())):
        text += (f" ({given!r} is not read as a number: YAML 1.1 would take a leading zero "
                 f"for octal and colons for base 60; write a plain decimal number)")
    return text


def validate(model: type[BaseModel], data: Any, name: str, raw: bytes) -> Any:
    """`model` validated from `data`; the first error as InputError with key path and line.

    The format line is checked first, so that a file of another kind is named as such.
    """
    expected = model.model_fields["format"].annotation.__args__[0]
    if not isinstance(data, dict):
        raise InputError(f"{name}: expected a YAML mapping starting with 'format: {expected}'")
    if data.get("format") != expected:
        found = data.get("format")
        lines = key_lines(raw)
        raise InputError(f"{name}: {where(('format',), lines)}: expected 'format: {expected}'"
                         + (f", found {found!r}" if found is not None else ", key missing"))
    try:
        with cyclic_gc_paused():
            return model.model_validate(data)
    except ValidationError as exc:
        errors = exc.errors(include_url=False)
        # A misspelt key is reported before the "missing" it causes.
        err = min(errors, key=lambda e: e["type"] != "extra_forbidden")
        more = f" (and {exc.error_count() - 1} more problems)" if exc.error_count() > 1 else ""
        if err["loc"][-1:] == ("[key]",) and err["type"] == "string_type":
            raise InputError(f"{name}: {_key_not_text(data, err['loc'][:-2], err['loc'][-2], raw)}"
                             f"{more}") from None
        loc = tuple(p for p in err["loc"] if not (isinstance(p, str) and "[" in p))
        raise InputError(f"{name}: {where(loc, key_lines(raw))}: {_message(err)}{more}") \
            from None


def _key_not_text(data: Any, parent: tuple, shown: Any, raw: bytes) -> str:
    """'where: the key ... is not read as text' for a key of the mapping at `parent` that YAML
    made a number, a date, null or a truth (pydantic shows it as `shown`, a repr for a date),
    with the key as written in the file and its line."""
    from reportgen.inputs.yamlfast import scalar

    for p in parent:
        data = data[p]
    key = next((k for k in data if shown in (k, repr(k))), shown)
    lines = key_lines(raw)
    written = next((p[-1] for p in lines if len(p) == len(parent) + 1 and p[:-1] == parent
                    and type(scalar(str(p[-1]))) is type(key) and scalar(str(p[-1])) == key),
                   None)
    kind = {bool: "true or false", type(None): "null (nothing)", dt.date: "a date",
            dt.datetime: "a date and time"}.get(type(key), "a number")
    if written is None:
        return f"{where(parent, lines)}: a key is read as {kind}, not as text"
    return (f"{where((*parent, written), lines)}: the key {written} is read as {kind}, not as "
            f"text; write it in quotes ('{written}')")


def iso_date(value: Any) -> str:
    """An ISO 8601 calendar date YYYY-MM-DD that exists (SPEC.md "Conventions"). A ValueError
    (which pydantic reports as a validation error with its key) otherwise."""
    if isinstance(value, dt.date) and not isinstance(value, dt.datetime):
        return value.isoformat()
    text = value if isinstance(value, str) else None
    if text is None or len(text) != 10 or text[4] != "-" or text[7] != "-":
        problem = ("a date and time" if isinstance(value, dt.datetime) else repr(value))
        raise ValueError(f"{problem} is not a date written YYYY-MM-DD (ISO 8601)")
    try:
        return dt.date.fromisoformat(text).isoformat()
    except ValueError:
        raise ValueError(f"{text!r} is not a date that exists") from None
