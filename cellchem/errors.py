"""The one error family: bad chemistry input, and at the command line files
that cannot be used, outputs that cannot be written and bad options; the
warning of a value computed outside its model's range is one of the family too.

Every message is one line, because it may land in a spreadsheet cell. It quotes
the input, gives a position counted from 1 where one applies, and says what was
expected or what would resolve the problem.
"""

from __future__ import annotations


class CellchemError(ValueError):
    """Bad chemistry input: a formula, name, ion or quantity cellchem cannot use.

    Attributes:
        text: the input as it was given.
        position: 1-based position in ``text`` where the problem was found, or None.
        choices: readings that would resolve the problem (for example the
            correctly cased formulas a wrong-case input allows), possibly empty.
    """

    exit_code = 2  # the command line's exit status when this error ends a command

    def __init__(
        self,
        message: str,
        *,
        text: str | None = None,
        position: int | None = None,
        choices: tuple[str, ...] = (),
    ) -> None:
        message = _one_line(message)
        super().__init__(message)
        self.message = message
        self.text = text
        self.position = position
        self.choices = tuple(choices)

    def __str__(self) -> str:
        return self.message

    def __reduce__(self):  # keep the fields through pickling (multiprocessing)
        return (
            _rebuild,
            (type(self), self.message, self.text, self.position, self.choices),
        )


def _one_line(message: str) -> str:
    """Show line breaks and other control characters of a quoted input as
    escapes, so that a message stays on one line (it may land in a cell)."""
    if message.isprintable():
        return message
    return "".join(ch if ch.isprintable() else ch.encode("unicode_escape").decode("ascii") for ch in message)


def _rebuild(cls, message, text, position, choices):
    return cls(message, text=text, position=position, choices=choices)


class FormulaError(CellchemError):
    """A formula that cannot be read: bad syntax, unknown symbol, wrong case."""


class UnknownIonError(CellchemError):
    """An ion given by name, symbol or formula that the ion catalog does not hold,
    or one whose charge is left open."""


class ChemistryError(CellchemError):
    """A formula that reads correctly but cannot give the asked-for quantity,
    such as a molar mass with an unknown water count."""


class NameReadError(CellchemError):
    """A name that cannot be read, or a formula that cannot be named.

    Attributes (beyond CellchemError's):
        reason: why a name was refused, for programs that weigh the refusal
            (the audit): ``'open-charge'`` (a metal's charge is left open; the
            choices are the charges it may have), ``'ratio'`` (the name names
            its ions but not their ratio), ``'may-be'`` (the name is used for
            several compounds; the choices are those a cited table knows),
            ``'basicity'`` (a basicity word that does not fit the name),
            ``'unknown'`` (no reading), ``'too-long'`` (a text longer than a
            name may be, refused unread), or ``''``.
        ions: for ``'ratio'``, the ions the name names, as (formula, charge).
    """

    def __init__(
        self,
        message: str,
        *,
        text: str | None = None,
        position: int | None = None,
        choices: tuple[str, ...] = (),
        reason: str = "",
        ions: tuple[tuple[str, int], ...] = (),
    ) -> None:
        super().__init__(message, text=text, position=position, choices=choices)
        self.reason = reason
        self.ions = tuple(ions)

    def __reduce__(self):  # keep the fields through pickling (multiprocessing)
        return (
            _rebuild_name_error,
            (type(self), self.message, self.text, self.position, self.choices, self.reason, self.ions),
        )


def _rebuild_name_error(cls, message, text, position, choices, reason, ions):
    return cls(message, text=text, position=position, choices=choices, reason=reason, ions=ions)


class RangeWarning(CellchemError, UserWarning):
    """A value computed outside the range its model is trusted in: an activity
    model past its limit, a concentration above what dissolves. Issued with
    ``warnings.warn`` (a ``UserWarning``, so a filter on those catches it) where
    a function is called with ``outside_range='warn'``; where it refuses
    instead, the error is a ChemistryError."""


class UnusableFile(CellchemError):
    """A file cellchem cannot or will not read: the message is one line that
    says why and what would make it usable (exit code 2 at the command line)."""


class OutputError(CellchemError):
    """An output that cannot be written (a read-only folder, a full disk, a
    folder that is a file): the message names the output, and the input is
    never blamed (exit code 2)."""


class UsageError(CellchemError):
    """A command line that cannot be carried out as given (exit code 2)."""
