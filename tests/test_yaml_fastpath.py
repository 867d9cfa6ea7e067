"""The reader's fast path for rows of numbers builds exactly what PyYAML's safe loader (the
reference) builds, for any row a table can hold and for the values it must leave alone."""

from __future__ import annotations

import yaml
from conftest import ROOT
from hypothesis import given
from hypothesis import strategies as st

from reportgen.inputs import yamlread

FLOAT_TAG = "tag:yaml.org,2002:float"
numbers = st.one_of(st.integers(-10**12, 10**12),
                    st.floats(allow_nan=False, allow_infinity=False, width=64))


@given(st.lists(numbers, min_size=1, max_size=12))
def test_rows_of_numbers_read_as_the_safe_loader_reads_them(row):
    text = f"row: [{', '.join(repr(v) for v in row)}]\n"
    assert yamlread.parse(text.encode(), "t") == yaml.safe_load(text)


def test_values_that_are_not_plain_decimals_are_left_to_the_full_constructor():
    text = ("a: [1_000, 0x1F, 017, .inf, -.nan, 1:30, '2.5', 2.5, 1e3, 1.0e3, 007, -0, yes, "
            "1., +1.5, -01.5, 00, -0.0, 1.5e-3, 1.5E+3, 0b101, 190:20:30.15, 2026-12-03, "
            "~, null, .5, -.5, 1__2.5]\nb: {1.5: x, 2: y, -3: z}\n")
    got, ref = yamlread.parse(text.encode(), "t"), yaml.safe_load(text)
    # Except what YAML 1.1 makes octal or base 60 (yaml.org/type/int.html): both readers keep
    # those as the text written, so that a number field refuses them (a leading zero is not
    # taken for octal: 017 is not 15).
    written = text[text.index("[") + 1:text.index("]")].split(", ")
    misread = {"017", "1:30", "007", "00", "190:20:30.15"}
    ref["a"] = [w if w in misread else v for w, v in zip(written, ref["a"], strict=True)]
    assert [repr(v) for v in got["a"]] == [repr(v) for v in ref["a"]]
    assert yamlread.parse_strict(text.encode(), "t") == got
    assert got["b"] == ref["b"]


def test_the_demo_files_read_as_the_safe_loader_reads_them():
    for path in sorted((ROOT / "conditions").rglob("*.yaml")):
        raw = path.read_bytes()
        assert yamlread.parse(raw, path.name) == yaml.safe_load(raw), path.name


def test_rows_of_plain_numbers_take_the_fast_path(monkeypatch):
    """A row of plain numbers never reaches PyYAML's per-scalar constructor (libyaml's parser
    marks a plain scalar with the style "" where PyYAML's own marks it None: both are plain)."""
    calls = []
    table = dict(yamlread._Loader.yaml_constructors)
    real = table[FLOAT_TAG]
    table[FLOAT_TAG] = lambda loader, node: calls.append(node) or real(loader, node)
    monkeypatch.setattr(yamlread._Loader, "yaml_constructors", table)
    text = "row: [" + ", ".join(f"{i}.5" for i in range(100)) + "]\n"
    assert yamlread.parse(text.encode(), "t")["row"][-1] == 99.5
    assert calls == []
