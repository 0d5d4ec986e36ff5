"""The package's own exceptions.

InputError is what the command line turns into a one-line message and exit code 2.
"""


class VacsimError(Exception):
    """Base class of every error vacsim raises on purpose."""


class InputError(VacsimError, ValueError):
    """Bad user input: a quantity, a scenario key, a log file.

    The message is one line that names where the problem is (file, field) and what was
    expected (the kind of quantity or its unit).
    """


class SolverError(VacsimError, RuntimeError):
    """The ODE solver failed; carries the solver's own message."""
