"""Command line: arguments -> library calls -> exit codes (SPEC.md, "Command line").

Exit status: 0 success (every criterion passed / every signature good), 1 a criterion failed or
a verification found a fault, 2 bad input (a clear message, nothing written).

group.py holds the command group and the module of each command (COMMANDS); a command's
module registers it on the group when it is first asked for.
"""

import os

from reportgen.cli.group import main

# pydantic looks for plugins (the entry points of group "pydantic" in the metadata of every
# installed distribution) the first time it builds a validator: ~5 ms of each `check`. The
# program uses none, and its validation must not change with whatever else is installed, so
# it turns them off as pydantic documents (docs.pydantic.dev, Plugins: PYDANTIC_DISABLE_PLUGINS)
# unless the user set the variable. Here, in the program, not in the library: a program that
# imports reportgen keeps its own plugins. (Read when a validator is built, after this.)
os.environ.setdefault("PYDANTIC_DISABLE_PLUGINS", "__all__")

__all__ = ["main"]
