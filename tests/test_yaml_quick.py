"""The reader's quick way (reportgen.inputs.yamlfast) gives exactly what its strict way gives
(the same values of the same types, or the same refusal with the same message naming the
line), and hands the file to the strict way whenever a row it took out might not have been a
row. The reference is the strict way, itself tested against PyYAML's safe loader
(test_yaml_fastpath.py) and YAML 1.1's scalar forms (https://yaml.org/type/float.html,
https://yaml.org/type/int.html)."""

from __future__ import annotations

import pytest
from conftest import ROOT
from hypothesis import given, settings
from hypothesis import strategies as st

from reportgen.errors import InputError
from reportgen.inputs import yamlread
from reportgen.inputs.yamlfast import NOT_FAST, fast_data, rows_out


def typed(value) -> str:
    """A text that differs whenever the values differ in type or sign (int 1 vs float 1.0,
    0.0 vs -0.0) and that treats NaN as equal to itself."""
    if isinstance(value, dict):
        return "{" + ",".join(f"{typed(k)}:{typed(v)}" for k, v in value.items()) + "}"
    if isinstance(value, list):
        return "[" + ",".join(typed(v) for v in value) + "]"
    return f"{type(value).__name__}:{value!r}"


def outcome(read, text: str) -> str:
    try:
        return typed(read(text.encode(), "f.yaml"))
    except InputError as exc:
        return f"refused: {exc}"


def same_as_strict(text: str) -> str:
    quick, strict = outcome(yamlread.parse, text), outcome(yamlread.parse_strict, text)
    assert quick == strict, text
    return quick


def test_the_demo_files_take_the_quick_way_and_read_as_the_strict_way():
    for path in sorted((ROOT / "conditions").rglob("*.yaml")):
        text = path.read_text(encoding="utf-8")
        quick = fast_data(text)
        assert quick is not NOT_FAST, path.name
        assert typed(quick) == typed(yamlread.parse_strict(path.read_bytes(), path.name))
    big = (ROOT / "conditions" / "vessels" / "linnet-demo.yaml").read_text(encoding="utf-8")
    assert len(rows_out(big)[1]) > 300  # its tables are taken out as rows


# Scalars a row may hold: plain decimals (taken out), and forms YAML 1.1 reads otherwise
# (exponents, signs, leading zeros, underscores, hexadecimal, sexagesimal, dates, .inf,
# .nan, null, booleans, quoted words with escapes), which must stay with YAML.
TOKENS = ["0", "-0", "7", "-12", "3.25", "-0.0", "0.000", "12345678901234567890123",
          "1" * 400 + ".5", ".5", "-.5", "1.", "1e3", "1.0e3", "1.5e+3", "1.5E-3", "+1", "+1.5",
          "01", "007", "-01.5", "1_000", "0x1F", "0b101", "1:30", "2026-12-03", ".inf",
          "-.inf", ".nan", "NaN", "inf", "~", "null", "yes", "on", '"a"', '"x # y, ]"',
          '"tab\\tthere"', "'single'", '""', "word", "[]", "[1, 2.5]", '["p", -3]']
token = st.sampled_from(TOKENS)
row = st.lists(token, max_size=6).map(lambda items: "[" + ", ".join(items) + "]")
gaps = st.sampled_from([", ", ",", " , ", ",  "])


@settings(max_examples=150, deadline=None)
@given(st.lists(st.tuples(row, st.sampled_from(["", "  # note", "# x"])), min_size=1,
                max_size=4), st.sampled_from(["key: {}", "- {}", "  - {}", "a:\n  - {}"]))
def test_rows_of_any_scalars_read_as_the_strict_way(rows, layout):
    if layout.startswith(("- ", "  - ", "a:")):
        body = "\n".join(layout.format(r) + c for r, c in rows)
    else:
        body = "\n".join(f"k{i}: {r}{c}" for i, (r, c) in enumerate(rows))
    same_as_strict(body + "\n")


@settings(max_examples=60, deadline=None)
@given(st.lists(token, min_size=1, max_size=6), gaps)
def test_rows_over_several_lines_or_with_comments_inside_read_as_the_strict_way(items, gap):
    same_as_strict("key: [" + gap.join(items) + ",\n  9.5]\n")
    same_as_strict("key: [  # first\n  " + (gap + "\n  ").join(items) + "  # last\n  ]\n")
    same_as_strict("key: [[" + gap.join(items) + "],\n      [1.5]]\nnext: 2\n")


def test_plain_decimals_keep_their_type_and_sign():
    got = yamlread.parse(b"a: [0, -0, 1, -0.0, 0.5, 10.250, -3, 12345678901234567890]\n", "f")
    assert typed(got) == typed({"a": [0, 0, 1, -0.0, 0.5, 10.25, -3, 12345678901234567890]})
    assert str(got["a"][3]) == "-0.0"  # the sign of zero survives (float("-0.0"))


@pytest.mark.parametrize("text", [
    'a: |-\n  [1, 2]\n',  # the row is the text of a block scalar
    'a: >-\n  [1, 2]\n',
    'a: "first\n  [1, 2]\n  last"\n',  # inside a quoted string over several lines
    'a: first\n  [1, 2]\n',  # a plain scalar's continuation line
    '- [1, 2]: x\n',  # a row as a key (refused by the strict way)
    'a: 1\nb: [1, 2]\nc: _rgrow_0\n',  # the marker word written in the file itself
    'a: &r [1, 2]\nb: *r\n',  # anchor and alias
    'a: !!str [1, 2]\n',
    'a: [1, 2]\na: [3]\n',  # a key given twice (refused, with its line)
    'a: [1, 2]\n---\nb: [3]\n',  # two documents
    'base: &b {x: [1, 2]}\nc:\n  <<: *b\n',  # a merge key
    'a: [1, 2]]\n',  # not YAML
    "a: [1, 2]\n\tb: 3\n",
    'a: ' + '[' * 70 + ']' * 70 + '\n',  # nested deeper than the strict way allows
    'a:\n' + ''.join('  ' * i + f'k{i}:\n' for i in range(1, 40)) + '  ' * 40 + 'z: [1]\n',
    'a: 2026-02-30\n',  # a date that does not exist
    'a: [1, 2] # c\r\nb: [3]\r\n',  # Windows line ends
    'a: [1, 2]\rb: [3]\r',  # old Mac line ends (one line to Python's re, three to YAML)
    'a: [1, 2]\x85b: [3]\n',  # NEL, a line break to YAML 1.1
    'a: [1, 2] x\n', 'a: [1, 2]#c\n', '? [1, 2]\n: v\n',
    '{a: [1, 2],\n b: [3]\n}\n',  # rows inside a flow mapping over several lines
    'a: [\n  [1, 2]\n  ]\n',
    'a:\n[1, 2]\n', 'x: [1, 2]\n  more\n', 'x: [1, 2]\n  y: 3\n', '[1, 2]\n', '- - [1]\n  - [2]\n',
    'a: [\n  - [1, 2]\n]\n', 'a: {\n  b: [1, 2]\n}\n', '- - - [1]\n', 'a:\t[1, 2]\n',
    'a: [1, 2] \t# tab before the comment\n', 'a: [1, 2] \r\n', '%YAML 1.1\n---\na: [1]\n...\n',
    '', '---\n', '# only a comment\n', 'a: [1, 2]\nb: "_rgrow_0"\n', '"<<": [1]\n',
])
def test_text_where_a_row_might_not_be_a_row_reads_as_the_strict_way(text):
    same_as_strict(text)


@pytest.mark.parametrize("text", [
    'a: |-\n  [1, 2]\n', 'a: first\n  [1, 2]\n', '- [1, 2]: x\n', 'a: 1\nc: _rgrow_0\n',
    'a: &r [1, 2]\nb: *r\n', 'a: [1, 2]\na: [3]\n', 'a: [1, 2]\n---\nb: [3]\n',
    'a: "first\n  [1, 2]\n  last"\n', 'a: 2026-02-30\n', 'a: !!set {x}\n',
])
def test_the_quick_way_hands_these_to_the_strict_way(text):
    assert fast_data(text) is NOT_FAST


def test_a_refusal_names_file_key_and_line_as_before():
    text = b"format: reportgen/condition-1\ntanks:\n  a: [1, 2]\n  a: [3, 4]\n"
    with pytest.raises(InputError) as caught:
        yamlread.parse(text, "cond.yaml")
    assert str(caught.value) == "cond.yaml: key 'a' given twice (line 4)"
    assert outcome(yamlread.parse_strict, text.decode()) == "refused: f.yaml: key 'a' given twice (line 4)"


BROKEN_VESSEL = [  # (text of the demo ferry's file, what it becomes)
    ("[0.0000, 0.5317,", "[0.0000, .nan,"),  # NaN in a KN row (refused by the model)
    ("[0.0000, 0.5317,", "[0.0000, .inf,"),
    ("[0.0000, 0.5317,", "[0.0000, 5.317e1,"),  # YAML 1.1 reads it as a string (no sign)
    ("[0.0000, 0.5317,", "[0.0000, 0.5317, 9.9,"),  # a row one value too long
    ("[0.0000, 0.5317,", '[0.0000, "0.5317",'),  # a quoted number
    ("[0.0000, 0.5317,", "[0.0000, 0.5317,,"),
    ("  kn:\n", "  kn:\n  kn:\n"),  # a key given twice
    ("  kn:\n", "  kn:\n    - [1, 2]: x\n"),
    ("  kn:\n", "  kns:\n"),  # a misspelt key
]


@pytest.mark.parametrize(("old", "new"), BROKEN_VESSEL)
def test_a_broken_vessel_file_is_refused_alike_with_its_line(tmp_path, monkeypatch, old, new):
    """Through the whole loading of a case: the same refusal, naming file, key and line,
    whether or not the quick way took the file."""
    from reportgen.inputs import case as case_module
    from reportgen.inputs import yamlfast

    text = (ROOT / "conditions" / "vessels" / "plover-ferry.yaml").read_text(encoding="utf-8")
    assert old in text
    (tmp_path / "vessels").mkdir()
    (tmp_path / "vessels" / "plover-ferry.yaml").write_text(text.replace(old, new, 1),
                                                            encoding="utf-8")
    condition = tmp_path / "c.yaml"
    condition.write_bytes((ROOT / "conditions" / "ferry-arrival.yaml").read_bytes())

    def message() -> str:
        with pytest.raises(InputError) as caught:
            case_module.load_case(condition)
        return str(caught.value)

    quick = message()
    monkeypatch.setattr(yamlread, "fast_data", lambda text: yamlfast.NOT_FAST)
    assert quick == message()
    assert "plover-ferry.yaml" in quick and "line" in quick
