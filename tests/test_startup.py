"""What a command loads: each command is found through the group's list of modules, and
`check` loads neither the documents, the signing nor their libraries (PDF, figures, CMS)."""

from __future__ import annotations

import importlib
import json
import subprocess
import sys

from conftest import ROOT

from reportgen.cli.group import COMMANDS, main


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
