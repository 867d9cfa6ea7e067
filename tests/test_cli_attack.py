"""Every command attacked as a careless and as a hostile user (SPEC.md "Conventions": a bad
file gives one clear message naming the file, key and line, exit status 2, nothing written;
"Command line": progress bars only on a terminal, never on a pipe or with NO_COLOR, outputs
never replace an input or an existing file). Each test is a hole that was found and mended.
"""

from __future__ import annotations

import io
import os
import shutil
import struct
import sys
from pathlib import Path

import pytest
import yaml
from click.testing import CliRunner
from conftest import PASSING, ROOT

from reportgen.cli import main
from reportgen.cli.group import progress
from reportgen.inputs.yamlread import parse, parse_strict

VESSEL = ROOT / "conditions" / "vessels" / "linnet-demo.yaml"


def _run(*args: str):
    done = CliRunner().invoke(main, list(args))
    assert "Traceback" not in done.output
    return done


@pytest.fixture()
def work(tmp_path) -> Path:
    (tmp_path / "vessels").mkdir()
    shutil.copy(VESSEL, tmp_path / "vessels")
    shutil.copy(PASSING, tmp_path / "c.yaml")
    return tmp_path


class _Terminal(io.StringIO):
    def isatty(self) -> bool:
        return True


@pytest.mark.parametrize("no_color", [None, "", "1"])
def test_progress_bar_on_the_terminal_stderr_only_and_never_with_no_color(monkeypatch,
                                                                            no_color):
    # SPEC "Command line": status on stderr, data on stdout; a bar on a terminal, never with
    # NO_COLOR. The bar was drawn on stdout (rich's default console): mixed into the data on
    # a terminal, and missing when stdout was a file and stderr the terminal.
    out, err = io.StringIO(), _Terminal()
    monkeypatch.setattr(sys, "stdout", out)
    monkeypatch.setattr(sys, "stderr", err)
    if no_color is None:
        monkeypatch.delenv("NO_COLOR", raising=False)
    else:
        monkeypatch.setenv("NO_COLOR", no_color)
    with progress("work", 3) as advance:
        for _ in range(3):
            advance()
    assert out.getvalue() == ""
    assert (err.getvalue() != "") is (no_color is None)


def test_no_progress_bar_when_stderr_is_a_pipe(monkeypatch):
    out, err = io.StringIO(), io.StringIO()  # isatty() False: a pipe or a file
    monkeypatch.setattr(sys, "stdout", out)
    monkeypatch.setattr(sys, "stderr", err)
    monkeypatch.delenv("NO_COLOR", raising=False)
    with progress("work", None) as advance:
        advance(1, 2)
    assert out.getvalue() == err.getvalue() == ""


# YAML 1.1 (yaml.org/type/int.html, /float.html): "0250" is octal (168), "1:20" base 60 (80).
MISREAD = b"a: 0250\nb: 1:20\nc: [0250, 1.5]\nd: -017\ne: 190:20:30.15\nf: 250\ng: 0\nh: 0.5\n"


def test_octal_and_base_60_numbers_are_kept_as_text_by_both_readers():
    want = {"a": "0250", "b": "1:20", "c": ["0250", 1.5], "d": "-017", "e": "190:20:30.15",
            "f": 250, "g": 0, "h": 0.5}
    assert parse(MISREAD, "x") == parse_strict(MISREAD, "x") == want


@pytest.mark.parametrize("typed", ["0250", "1:20", "08"])
def test_a_mass_written_with_a_leading_zero_or_colon_is_refused_not_misread(work, typed):
    # 0250 t was taken as 168 t (octal) and 1:20 as 80 t, silently: a wrong displacement.
    text = (work / "c.yaml").read_text()
    first = next(line for line in text.splitlines() if "mass:" in line)
    value = first.split("mass:")[1].split(",")[0].strip()
    (work / "c.yaml").write_text(text.replace(f"mass: {value}", f"mass: {typed}", 1))
    done = _run("check", str(work / "c.yaml"))
    assert done.exit_code == 2
    assert "items[0].mass (line" in done.output and "plain decimal" in done.output


def test_a_control_character_is_named_with_its_line_and_column(work):
    # SPEC "Conventions": the line, where YAML gives it (libyaml gives the position).
    (work / "c.yaml").write_bytes(b"format: reportgen/condition-1\nvessel: ab\x00c\n")
    done = _run("check", str(work / "c.yaml"))
    assert done.exit_code == 2
    assert "(line 2, column 11): the character U+0000 is not allowed" in done.output
    assert "<unicode string>" not in done.output


@pytest.mark.parametrize("value", [1e-5, 1e16, -2.5e-7, 1e22, 0.1])
def test_numbers_written_for_yaml_read_back_as_numbers(value):
    # yaml.org/type/float.html: an exponent form is a float in YAML 1.1 only with a decimal
    # point and a signed exponent; Python's repr writes 1e-05 and 1e+16, which read as text.
    from reportgen.yamltext import number

    assert yaml.safe_load(number(value)) == value


def test_import_of_a_tank_table_with_a_small_value_is_not_refused(tmp_path):
    (tmp_path / "t.csv").write_text("sounding,volume,lcg,vcg,tcg,fsi\n0,0,5,0,0,0\n"
                                    "1,10,5,0.5,0.00001,10\n2,20,5,1,0,10\n")
    done = _run("import", "tank", str(tmp_path / "t.csv"))
    assert done.exit_code == 0, done.output
    assert yaml.safe_load(done.stdout)["table"]["tcg"] == [0.0, 1e-5, 0.0]


def test_csv_with_decimal_commas_and_points_is_refused(tmp_path):
    # 1.500 beside 0,5 in a semicolon sheet is 1500 written with a thousands separator (common
    # practice in European spreadsheets); it was read as 1.5 m³.
    (tmp_path / "t.csv").write_text("sounding;volume;lcg;vcg;tcg;fsi\n0;0;5;0;0;0\n"
                                    "1;1.500;5;0,5;0;10\n2;2.000;5;1;0;10\n")
    done = _run("import", "tank", str(tmp_path / "t.csv"))
    assert done.exit_code == 2
    assert "line 3, column 2: '1.500' has a decimal point" in done.output
    (tmp_path / "t.csv").write_text("sounding;volume;lcg;vcg;tcg;fsi\n0;0;5;0;0;0\n"
                                    "1;1500;5;0,5;0;10\n2;2000;5;1;0;10\n")
    assert _run("import", "tank", str(tmp_path / "t.csv")).exit_code == 0


# Binary STL (common practice, the format as CAD programs write it): an 80-byte header, a
# little-endian uint32 triangle count n, then 50 bytes per triangle.
@pytest.mark.parametrize("name, data, said", [
    ("garbage.stl", bytes(range(256)) * 4, "not an STL file"),
    ("liar.stl", b"\0" * 80 + struct.pack("<I", 0xFFFFFFFF) + b"\0" * 100, "not an STL file"),
    ("garbage.obj", bytes(range(256)) * 4, "not an OBJ file"),
])
def test_a_mesh_file_that_is_not_one_is_named_as_such(tmp_path, name, data, said):
    # The message was the reader's own failure to import a text-encoding guesser.
    (tmp_path / name).write_bytes(data)
    done = _run("hull-from-mesh", str(tmp_path / name), "-o", str(tmp_path / "h.yaml"))
    assert done.exit_code == 2 and said in done.output
    assert "module" not in done.output and not (tmp_path / "h.yaml").exists()


@pytest.mark.parametrize("scale", ["nan", "inf"])
def test_mesh_scale_must_be_finite(tmp_path, scale):
    (tmp_path / "m.stl").write_bytes(b"solid x\nendsolid x\n")
    done = _run("hull-from-mesh", str(tmp_path / "m.stl"), "-o", str(tmp_path / "h.yaml"),
                "--scale", scale)
    assert done.exit_code == 2 and "expected a finite number" in done.output


@pytest.mark.parametrize("at", ["nan,5", "inf,5", "1_0,5", "\u0664\u0668,9", "48", "48,9,1"])
def test_room_at_takes_two_plain_finite_numbers(at):
    done = _run("room", "no-such-condition.yaml", "--at", at)
    assert done.exit_code == 2 and "--at" in done.output and "expected X,Z" in done.output


def test_tables_refuses_a_hard_link_to_its_input_before_any_work(work, monkeypatch):
    # SPEC "Command line": never replaces one of its own inputs, with --force too; the input
    # is read once (the text written is made from the bytes validated).
    from reportgen.hull import tables

    def never(*_a, **_k):
        raise AssertionError("tables built before the output was checked")

    monkeypatch.setattr(tables, "build_tables", never)
    hull = work / "hull.yaml"
    shutil.copy(ROOT / "conditions" / "vessels" / "linnet-demo-hull.yaml", hull)
    os.link(hull, work / "link.yaml")
    done = _run("tables", str(hull), "-o", str(work / "link.yaml"), "--force")
    assert done.exit_code == 2 and "is one of the input files" in done.output


def test_extract_writes_nothing_when_a_file_stands_where_a_folder_must_go(tmp_path, demo):
    # "nothing is written" on a refusal: the condition file was written, then the vessel's
    # folder could not be made.
    out = tmp_path / "out"
    out.mkdir()
    (out / "vessels").write_text("a file, not a folder")
    done = _run("extract", str(demo["unsigned"]), "-o", str(out))
    assert done.exit_code == 2 and "exists and is not a folder" in done.output
    assert sorted(p.name for p in out.iterdir()) == ["vessels"]


def test_a_vessel_path_that_is_a_folder_or_a_device_is_named_as_such(work):
    # SPEC "Conventions": the message names the key, its line and the reason; a folder or
    # /dev/zero was reported as "not found".
    text = (work / "c.yaml").read_text()
    for ref, reason in (("vessels", "it is a folder"), ("/dev/zero", "character device")):
        (work / "c.yaml").write_text(text.replace("vessels/linnet-demo.yaml", ref, 1))
        done = _run("check", str(work / "c.yaml"))
        assert done.exit_code == 2
        assert "vessel (line" in done.output and reason in done.output


@pytest.mark.parametrize("command", [
    ["sheet", str(PASSING)], ["new", str(VESSEL)], ["limits", str(VESSEL)],
    ["package", str(PASSING)], ["import", "tank", "t.csv"], ["tables", str(VESSEL)],
    ["hull-from-mesh", "m.stl"]])
def test_an_output_named_with_a_trailing_slash_is_not_written_as_a_file(tmp_path, command):
    # `-o out/` means a folder; a file named "out" was written in its place (SPEC "Command
    # line": -o names the file to write; a folder only for several sheets).
    out = tmp_path / "out"
    done = _run(*command, "-o", f"{out}/")
    assert done.exit_code == 2 and "ends with a slash, which names a folder" in done.output
    assert not out.exists()


def test_a_reader_that_goes_away_is_not_a_failed_criterion():
    # `reportgen check ... | head`: the broken pipe ended the program with status 1, which
    # SPEC "Command line" gives to a failed criterion; now 128 + SIGPIPE, as a shell reports a
    # process the signal ends (Python's signal docs, "Note on SIGPIPE"), and no traceback.
    import subprocess

    p = subprocess.Popen([sys.executable, "-m", "reportgen", "schema", "vessel"],
                         stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    p.stdout.close()  # long before the interpreter has started: the first write fails
    err = p.stderr.read()
    assert p.wait() == 141 and b"Traceback" not in err


def test_a_mesh_vertex_that_is_not_a_number_is_named_as_such(tmp_path):
    # The faces at a NaN vertex were dropped while loading, and the mesh reported open.
    obj = ("v nan 0 0\nv 50 0 0\nv 0 10 0\nv 0 0 6\n"
           "f 1 3 2\nf 1 2 4\nf 1 4 3\nf 2 3 4\n")
    (tmp_path / "m.obj").write_text(obj)
    done = _run("hull-from-mesh", str(tmp_path / "m.obj"), "-o", str(tmp_path / "h.yaml"))
    assert done.exit_code == 2 and "not finite numbers" in done.output


@pytest.mark.parametrize("key, kind", [("1", "a number"), ("yes", "true or false"),
                                       ("2026-01-01", "a date"), ("null", "null")])
def test_a_key_yaml_reads_as_a_number_date_or_truth_is_named_as_written(work, key, kind):
    # YAML 1.1 resolves plain keys like values (yaml.org/type/bool.html: yes is true); the
    # message showed "tanks.datetime.date(2026, 1, 1)" or "tanks.None".
    text = (work / "c.yaml").read_text().replace("tanks:\n", f"tanks:\n  {key}: {{percent: 1}}\n",
                                                 1)
    (work / "c.yaml").write_text(text)
    done = _run("check", str(work / "c.yaml"))
    line = text.splitlines().index(f"  {key}: {{percent: 1}}") + 1
    assert done.exit_code == 2
    assert f"(line {line}): the key {key} is read as {kind}" in done.output
    assert f"write it in quotes ('{key}')" in done.output


def test_several_sheets_never_write_one_file_twice(work):
    # Two conditions of one name from two folders (or one given twice) made the same
    # out/NAME.pdf; with --force the second replaced the first sheet of the same run, exit 0.
    # SPEC.md "Command line": every file is processed and a bad one reported (exit 2): the
    # later one is the bad one. (The first is made unreadable here so that no PDF is drawn.)
    (work / "d1").mkdir()
    (work / "d2").mkdir()
    text = (work / "c.yaml").read_text().replace("vessels/", "../vessels/", 1)
    (work / "d1" / "c.yaml").write_text(text.replace("format:", "formt:", 1))
    (work / "d2" / "c.yaml").write_text(text)
    (work / "out").mkdir()
    for second in (work / "d2" / "c.yaml", work / "d1" / "c.yaml"):
        done = _run("sheet", str(work / "d1" / "c.yaml"), str(second), "-o",
                    str(work / "out"), "--force")
        assert done.exit_code == 2 and "nothing is written for it" in done.output
        assert f"as is that of {work / 'd1' / 'c.yaml'} in this run" in done.output
    assert list((work / "out").iterdir()) == []


def test_an_input_named_by_bytes_that_are_not_utf8_is_refused_by_name(work):
    # The name goes into the results (JSON, UTF-8): `check --json` ended in a traceback, and
    # `limits` blamed the table's water density.
    odd = work / os.fsdecode(b"\xff.yaml")
    shutil.copy(work / "c.yaml", odd)
    shutil.copy(VESSEL, work / "vessels" / os.fsdecode(b"\xfe.yaml"))
    for args in (["check", "--json", str(odd)],
                 ["limits", str(work / "vessels" / os.fsdecode(b"\xfe.yaml")), "--json"]):
        done = _run(*args)
        assert done.exit_code == 2 and "is not UTF-8 text; rename the file" in done.output


def test_force_replaces_only_a_regular_file(tmp_path):
    # `-o /dev/stdout --force` run as root replaced the /dev/stdout link with a file; a FIFO
    # or a device is not an output file to replace.
    from reportgen.errors import InputError
    from reportgen.files import check_output

    os.mkfifo(tmp_path / "pipe")
    for target in ("/dev/null", str(tmp_path / "pipe")):  # (/dev/stdout is a file in pytest)
        with pytest.raises(InputError, match="replaces only a regular file"):
            check_output(target, force=True)
    (tmp_path / "old.yaml").write_text("x")
    check_output(tmp_path / "old.yaml", force=True)  # a file: replaced with --force


def test_output_dash_is_not_a_file_named_dash(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    done = _run("new", str(VESSEL), "-o", "-")
    assert done.exit_code == 2 and "not to standard output" in done.output
    assert not (tmp_path / "-").exists()


@pytest.mark.parametrize("tcg", ["0_5", "nan", "-inf", "1e400", "\u0663"])
def test_room_tcg_takes_one_plain_finite_number(tcg):
    # float() reads "0_5" as 5 m and "٣" (Arabic-Indic three) as 3 m: a typed Y must be what
    # it looks like (SPEC.md "Conventions": bad input refused, exit 2, the option named).
    done = _run("room", "no-such-condition.yaml", "--at", "48,9.5", "--tcg", tcg)
    assert done.exit_code == 2 and "--tcg" in done.output and "expected one finite" in done.output


def test_keygen_refuses_a_name_no_certificate_can_hold_and_makes_no_folder(tmp_path):
    # RFC 5280 Appendix A.1: ub-common-name INTEGER ::= 64 (the subject's common name).
    done = _run("keygen", "--name", "A" * 65, "-o", str(tmp_path / "id"))
    assert done.exit_code == 2 and "at most 64" in done.output
    assert not (tmp_path / "id").exists()


@pytest.mark.parametrize("command", [["sign", "x.pdf", "--role", "prepared", "--p12", "x.p12"],
                                     ["approve", "v.yaml", "--p12", "x.p12"]])
def test_sign_and_approve_refuse_an_output_naming_a_folder(tmp_path, command):
    # SPEC.md "Command line": -o names the file to write; "out/" names a folder.
    done = _run(*command, "-o", str(tmp_path) + "/")
    assert done.exit_code == 2 and "names a folder" in done.output
