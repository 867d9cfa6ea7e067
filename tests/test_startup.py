"""What a command loads: each command is found through the group's list of modules, and
`check` loads neither the documents, the signing nor their libraries (PDF, figures, CMS)."""

from __future__ import annotations

import importlib
import json
import os
import subprocess
import sys

from conftest import ROOT

from reportgen.cli.group import COMMANDS, main
from reportgen.inputs.vessel import DEFAULT_CALCULATION, Calculation, Vessel


def test_the_list_of_commands_is_the_commands_the_modules_define():
    for module in set(COMMANDS.values()):
        importlib.import_module(f"reportgen.cli.{module}")
    defined = {name: cmd.callback.__module__.rsplit(".", 1)[1]
               for name, cmd in main.commands.items()}
    assert defined == COMMANDS


def test_check_loads_no_document_signing_or_figure_code():
    code = ("import sys, json\nfrom reportgen.cli import main\n"
            "try:\n    main(['check', sys.argv[1]], prog_name='reportgen')\n"
            "except SystemExit:\n    pass\n"
            "print(json.dumps(sorted(sys.modules)), file=sys.stderr)")
    done = subprocess.run([sys.executable, "-c", code,
                           str(ROOT / "conditions" / "ballast-departure.yaml")],
                          capture_output=True, text=True, check=True)
    assert "Caution" in done.stdout  # the check ran and printed its summary
    loaded = set(json.loads(done.stderr.strip().splitlines()[-1]))
    for name in ("weasyprint", "matplotlib", "pyhanko", "pypdf", "pypdfium2", "jinja2",
                 "reportgen.report", "reportgen.signing", "reportgen.cli.signing",
                 "reportgen.cli.formats", "reportgen.schema"):
        assert name not in loaded, name


def test_the_program_turns_pydantic_plugins_off_unless_the_user_chose():
    # pydantic's documented switch (docs.pydantic.dev, Plugins: PYDANTIC_DISABLE_PLUGINS),
    # set by the command line only: the library leaves it alone, a user's setting is kept
    code = ("import os, reportgen.inputs\nbefore = os.environ.get('PYDANTIC_DISABLE_PLUGINS')\n"
            "import reportgen.cli\nprint(before, os.environ.get('PYDANTIC_DISABLE_PLUGINS'))")
    env = {k: v for k, v in os.environ.items() if k != "PYDANTIC_DISABLE_PLUGINS"}
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          check=True, env=env)
    assert done.stdout.split() == ["None", "__all__"]
    env["PYDANTIC_DISABLE_PLUGINS"] = "some_plugin"
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          check=True, env=env)
    assert done.stdout.split() == ["some_plugin", "some_plugin"]


def test_the_default_calculation_is_the_validated_one():
    # made with model_construct at import (no validator built then): it must stay equal to
    # Calculation() field for field, which a validator added to Calculation could change
    made = Calculation()
    assert DEFAULT_CALCULATION == made
    assert DEFAULT_CALCULATION.model_dump() == made.model_dump()
    assert Vessel.model_fields["calculation"].default is DEFAULT_CALCULATION
