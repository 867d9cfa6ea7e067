"""`python -m reportgen` is the same program as `reportgen`."""

from reportgen.cli import main

main(prog_name="reportgen")
