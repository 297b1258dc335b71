"""The exceptions of deltag: one class per kind of error of the library.

Every error carries what the command line prints for it: ``str(e)`` is the whole message,
and the attributes give its parts.
"""


class Error(Exception):
    """Base class of every deltag error."""


class InputError(Error, ValueError):
    """Bad input: an argument, a case, a database or a value the library refuses.

    Attributes:
        message: what is wrong and what was expected.
        file: where the value came from: a case or database file, or the deltag function
            called (``"deltag.speciate"``) for its arguments.
        line, column: 1-based position in ``file``; 0 when not from a file.
        key: the key (or argument) that is wrong, dotted as in a case file
            (``"analytes.Ca"``, ``"pH"``, ``"water.tap.analytes.Ca"`` in a case).
        suggestion: the nearest valid name, or ``""``.
    """

    def __init__(self, text, message="", file="", line=0, column=0, key="", suggestion=""):
        super().__init__(text)
        self.message = message or text
        self.file = file
        self.line = line
        self.column = column
        self.key = key
        self.suggestion = suggestion


class NoSolutionError(InputError):
    """A water for which no solution exists (e.g. a charge balance that would need a
    negative amount). An InputError; the same attributes."""


class ConvergenceError(Error, RuntimeError):
    """A calculation that did not converge.

    Attributes:
        subject: what was being solved.
        residual_norm: the largest scaled residual reached (-1 when not finite).
        reason: why the solver stopped.
        hint: what to try.
    """

    def __init__(self, text, subject="", residual_norm=0.0, reason="", hint=""):
        super().__init__(text)
        self.subject = subject
        self.residual_norm = residual_norm
        self.reason = reason
        self.hint = hint
