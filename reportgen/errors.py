"""Errors the user can act on."""


class InputError(Exception):
    """Bad input: the message names the file, the key path and, where known, the line.

    The command line prints the message and exits with status 2, writing nothing.
    """
