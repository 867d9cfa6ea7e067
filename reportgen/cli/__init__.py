"""Command line: arguments -> library calls -> exit codes (SPEC.md, "Command line").

Exit status: 0 success (every criterion passed / every signature good), 1 a criterion failed or
a verification found a fault, 2 bad input (a clear message, nothing written).

group.py holds the command group and the module of each command (COMMANDS); a command's
module registers it on the group when it is first asked for.
"""

import atexit
import gc
import os

from reportgen.cli.group import main

# pydantic looks for plugins (the entry points of group "pydantic" in the metadata of every
# installed distribution) the first time it builds a validator: ~5 ms of each `check`. The
# program uses none, and its validation must not change with whatever else is installed, so
# it turns them off as pydantic documents (docs.pydantic.dev, Plugins: PYDANTIC_DISABLE_PLUGINS)
# unless the user set the variable. Here, in the program, not in the library: a program that
# imports reportgen keeps its own plugins. (Read when a validator is built, after this.)
os.environ.setdefault("PYDANTIC_DISABLE_PLUGINS", "__all__")

# At exit the interpreter runs full garbage collections over every object still alive (some
# 70 000: numpy's, scipy's, pydantic's, ours) before freeing memory the system frees anyway:
# about 0.1 s of every command (benchmarks/bench_check.py). Moving them to the permanent
# generation at exit (gc.freeze) skips those scans. The teardown still releases every object
# not in a reference cycle and closes its files; what a cycle holds is left to the system, as
# Python already allows for objects alive at exit. (Outputs are closed before: files.py.)
atexit.register(gc.freeze)

__all__ = ["main"]
