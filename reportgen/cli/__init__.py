"""Command line: arguments -> library calls -> exit codes (SPEC.md, "Command line").

Exit status: 0 success (every criterion passed / every signature good), 1 a criterion failed or
a verification found a fault, 2 bad input (a clear message, nothing written).

group.py holds the command group; each module below registers its commands on it.
"""

from reportgen.cli import calc, formats, limits, package, setup, shipdata, signing  # noqa: F401
from reportgen.cli.group import main

__all__ = ["main"]
