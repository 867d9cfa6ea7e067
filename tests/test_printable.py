"""Texts from input files are printed escaped, never acted on: SPEC.md "Verification" point 7
("names and texts from certificates and inputs are printed with control characters escaped"),
applied to the readable text of `check` and to error messages. An escape sequence (ECMA-48
CSI, ESC [) would rewrite the terminal; a line break would forge a line under the verdict; a
bidirectional override (Unicode UAX #9, U+202E) would reverse what follows it."""

from __future__ import annotations

from click.testing import CliRunner
from eval_box import RHO, B, L, condition_dict, write_case

from reportgen.cli import main
from reportgen.printable import printable, printable_lines

HOSTILE = "Departure\x1b[2J\nResult: PASS\u202eLIAF\x9b"


def test_printable_escapes_controls_separators_and_bidi_overrides():
    assert printable(HOSTILE) == "Departure\\x1b[2J\\x0aResult: PASS\\u202eLIAF\\x9b"
    assert printable("Hold 1 sawn timber, 4.2 m³ — ø") == "Hold 1 sawn timber, 4.2 m³ — ø"
    assert printable_lines("line one\x1b\nline two") == "line one\\x1b\nline two"


def test_check_text_prints_a_hostile_title_escaped(tmp_path):
    disp = RHO * L * B * 7.0  # the box floating at 7 m (eval_box: closed-form hydrostatics)
    cond = condition_dict(items=[{"name": "Cargo", "mass": disp - 1000.0, "lcg": 50.0,
                                  "vcg": 6.0, "tcg": 0.0}])
    cond["condition"]["title"] = HOSTILE
    result = CliRunner().invoke(main, ["check", str(write_case(tmp_path, cond))])
    assert result.exit_code in (0, 1), result.output
    assert "\x1b" not in result.output and "\u202e" not in result.output
    assert "Condition: Departure\\x1b[2J\\x0aResult: PASS\\u202eLIAF\\x9b" in result.output


def test_error_message_quoting_a_hostile_key_is_escaped(tmp_path):
    cond = condition_dict(items=[])
    cond["tanks"] = {"X\x1b[2JY": {"percent": 5.0}}
    result = CliRunner().invoke(main, ["check", str(write_case(tmp_path, cond))])
    assert result.exit_code == 2
    assert "\x1b" not in result.output and "X\\x1b[2JY" in result.output
