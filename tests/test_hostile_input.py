"""Hostile input through the command line (SPEC "Conventions": one clear message, exit 2, no
traceback, nothing written; "Command line": outputs never replace inputs).

Each case is one found by an adversarial review: endless files (/dev/zero), a FIFO, a YAML
alias bomb, an output that is a folder or one of the inputs.
"""

from __future__ import annotations

import os
import resource
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner
from conftest import PASSING, ROOT

from reportgen.cli import main


def _run(*args: str):
    done = CliRunner().invoke(main, list(args))
    assert "Traceback" not in done.output
    return done


@pytest.fixture()
def work(tmp_path) -> Path:
    (tmp_path / "vessels").mkdir()
    shutil.copy(ROOT / "conditions" / "vessels" / "linnet-demo.yaml", tmp_path / "vessels")
    shutil.copy(PASSING, tmp_path / "c.yaml")
    return tmp_path


def test_dev_zero_as_vessel_file_and_as_trust_file(work, demo):
    text = (work / "c.yaml").read_text().replace("vessels/linnet-demo.yaml", "/dev/zero")
    (work / "z.yaml").write_text(text)
    done = _run("check", str(work / "z.yaml"))
    assert done.exit_code == 2 and "/dev/zero" in done.stderr
    done = _run("verify", str(demo["two"]), "--trust", "/dev/zero")
    assert done.exit_code == 2 and "character device" in done.stderr


def test_fifo_as_condition_is_refused_without_hanging(work):
    fifo = work / "pipe.yaml"
    os.mkfifo(fifo)
    done = _run("check", str(fifo))
    assert done.exit_code == 2 and "FIFO" in done.stderr


def test_output_that_is_the_input_or_a_folder(work):
    condition = work / "c.yaml"
    before = condition.read_bytes()
    done = _run("sheet", str(condition), "-o", str(condition), "--force")
    assert done.exit_code == 2 and "input" in done.stderr
    assert condition.read_bytes() == before
    done = _run("sheet", str(condition), "-o", str(work / "vessels"), "--force")
    assert done.exit_code == 2 and "is a folder" in done.stderr
    done = _run("sheet", str(condition), "-o", str(work / "missing" / "x.pdf"))
    assert done.exit_code == 2 and "does not exist" in done.stderr
    assert sorted(p.name for p in work.iterdir()) == ["c.yaml", "vessels"]


def test_keygen_takes_output_and_the_old_out_alias(tmp_path):
    assert _run("keygen", "--name", "A (invented)", "-o", str(tmp_path / "a")).exit_code == 0
    assert _run("keygen", "--name", "B (invented)", "--out", str(tmp_path / "b")).exit_code == 0
    assert (tmp_path / "a" / "cert.pem").exists() and (tmp_path / "b" / "identity.p12").exists()
    done = _run("keygen", "--name", "A (invented)", "-o", str(tmp_path / "a"))
    assert done.exit_code == 2 and "already exists" in done.stderr


def _bomb(levels: int = 9) -> str:
    """The classic "billion laughs" in YAML: each level holds nine aliases of the one below
    (9^9 ≈ 3.9e8 leaves once expanded)."""
    lines = ['  a0: &a0 "lol"']
    for i in range(1, levels + 1):
        lines.append(f"  a{i}: &a{i} [" + ", ".join([f"*a{i - 1}"] * 9) + "]")
    return "notes:\n" + "\n".join(lines) + "\n"


def test_yaml_alias_bomb_is_refused(work):
    condition = work / "bomb.yaml"
    condition.write_text((work / "c.yaml").read_text().split("notes:")[0] + _bomb())

    def limit() -> None:  # 1 GiB of address space: a bomb that expands dies, not the host
        resource.setrlimit(resource.RLIMIT_AS, (1024 ** 3, 1024 ** 3))

    done = subprocess.run([sys.executable, "-m", "reportgen", "check", str(condition)],
                          capture_output=True, text=True, timeout=60, preexec_fn=limit,
                          check=False)
    assert done.returncode == 2 and "Traceback" not in done.stderr, done.stderr
    assert "alias" in done.stderr.lower()


@pytest.mark.parametrize("typed, hint", [
    ("2.0e1", "2.0e+1"), ("20e0", "20.0e+0"), ("2.0E+1", None), ("2.0e+1", None)])
def test_a_number_yaml_reads_as_text_is_named_with_the_way_to_write_it(work, typed, hint):
    # YAML 1.1 (PyYAML's resolver; yaml.org/type/float.html): a float with an exponent needs
    # a decimal point and a signed exponent, so 2.0e1 is the text "2.0e1"
    before = (work / "c.yaml").read_text()
    assert "Stores and provisions, mass: 20.0," in before
    text = before.replace("Stores and provisions, mass: 20.0,",
                          f"Stores and provisions, mass: {typed},")
    (work / "x.yaml").write_text(text)
    done = _run("check", str(work / "x.yaml"))
    if hint is None:
        assert done.exit_code in (0, 1)
    else:
        assert done.exit_code == 2
        assert f"'{typed}' is text in YAML 1.1" in done.output and hint in done.output
