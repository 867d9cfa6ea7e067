"""The command group every command registers on, its error handling and its helpers
(SPEC.md, "Command line").

Exit status: 0 success (every criterion passed / every signature good), 1 a criterion failed or
a verification found a fault, 2 bad input (a clear message, nothing written).
"""

from __future__ import annotations

import os
import sys
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from importlib import import_module
from pathlib import Path

import click

from reportgen import __version__
from reportgen.errors import InputError
from reportgen.printable import printable_lines

EXIT_BAD_INPUT = 2


@contextmanager
def progress(what: str, total: int | None) -> Iterator[Callable[..., None]]:
    """A progress bar on stderr (status, never on stdout, which carries data) for work of
    `total` steps, shown only when stderr is a terminal and NO_COLOR is not set (set at all,
    even empty: SPEC "never ... with NO_COLOR"); yields the function that advances it one
    step, or that sets (done, total) when given them."""
    from rich.console import Console
    from rich.progress import Progress

    with Progress(console=Console(stderr=True), transient=True,
                  disable=not bar_wanted()) as bar:
        task = bar.add_task(what, total=total)

        def advance(done: int | None = None, of: int | None = None) -> None:
            if done is None:
                bar.advance(task)
            else:
                bar.update(task, completed=done, total=of)

        yield advance


def bar_wanted() -> bool:
    """A progress bar only on a terminal (stderr) and never with NO_COLOR in the environment."""
    return sys.stderr.isatty() and "NO_COLOR" not in os.environ


# Each command and the module of this package that defines it: a command's module is imported
# only when that command runs (or when the help lists them all), so that `check` does not load
# what signing, the documents or the ship-data tools need.
COMMANDS = {
    "check": "calc", "sheet": "calc", "schema": "formats", "limits": "limits", "room": "limits",
    "package": "package", "tables": "setup", "hull-from-mesh": "shipdata", "import": "shipdata",
    "show": "shipdata", "new": "shipdata", "keygen": "signing", "sign": "signing",
    "verify": "signing", "approve": "signing", "extract": "signing",
}


class _Group(click.Group):
    """Turns InputError into one line on stderr and exit status 2, never a traceback; loads
    each command's module when the command is asked for."""

    def list_commands(self, ctx: click.Context) -> list[str]:
        return sorted(COMMANDS)

    def get_command(self, ctx: click.Context, cmd_name: str) -> click.Command | None:
        module = COMMANDS.get(cmd_name)
        if module is not None and cmd_name not in self.commands:
            import_module(f"reportgen.cli.{module}")  # registers its commands on `main`
        return super().get_command(ctx, cmd_name)

    def invoke(self, ctx: click.Context):
        from reportgen.files import command_scope

        try:
            with command_scope():  # outputs never replace this command's inputs
                return super().invoke(ctx)
        except InputError as exc:
            click.echo(f"reportgen: {printable_lines(exc)}", err=True)
            ctx.exit(EXIT_BAD_INPUT)
        except KeyboardInterrupt:
            click.echo("reportgen: interrupted; nothing was written", err=True)
            ctx.exit(130)
        except BrokenPipeError:
            # The reader of stdout went away (`reportgen check ... | head`): no more output,
            # and the status a shell gives a process ended by SIGPIPE (128 + 13), not 1 (a
            # failed criterion). Python's signal module docs, "Note on SIGPIPE": stdout is
            # pointed at devnull so that the interpreter's final flush does not fail again.
            devnull = os.open(os.devnull, os.O_WRONLY)
            os.dup2(devnull, sys.stdout.fileno())
            ctx.exit(128 + 13)


class OutputFile(click.Path):
    """The type of `-o FILE`: a path, refused when it ends with a slash. Such a name means a
    folder (`-o out/`), and the file would otherwise be written under the folder's name."""

    def __init__(self) -> None:
        super().__init__(path_type=Path)

    def convert(self, value, param, ctx):
        if os.fspath(value) == "-":
            self.fail("'-': reportgen writes its documents to files, not to standard output; "
                      "give the name of the file to write", param, ctx)
        if names_a_folder(value):
            self.fail(f"{os.fspath(value)!r} ends with a slash, which names a folder; give the "
                      f"name of the file to write", param, ctx)
        return super().convert(value, param, ctx)


def names_a_folder(value: object) -> bool:
    """True for a path written with a trailing slash (`out/`), which names a folder."""
    text = os.fspath(value) if isinstance(value, (str, os.PathLike)) else ""
    return isinstance(text, str) and text.endswith(tuple(filter(None, (os.sep, os.altsep))))


@click.group(cls=_Group, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, "-V", "--version", prog_name="reportgen")
def main() -> None:
    """Intact stability calculation sheets to the IMO 2008 IS Code."""
