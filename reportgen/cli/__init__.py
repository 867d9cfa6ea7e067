"""Command line: arguments -> library calls -> exit codes (SPEC.md, "Command line").

Exit status: 0 success (every criterion passed / every signature good), 1 a criterion failed or
a verification found a fault, 2 bad input (a clear message, nothing written).

group.py holds the command group and the module of each command (COMMANDS); a command's
module registers it on the group when it is first asked for.
"""

from reportgen.cli.group import main

__all__ = ["main"]
