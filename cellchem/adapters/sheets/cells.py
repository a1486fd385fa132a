"""Cell values in and out of the worksheet functions: the rules the Excel
(xlwings Lite, classic xlwings) and LibreOffice Calc layers share.

In: a single cell arrives as a scalar, a range as a 2-D list (rows of
values); empty cells are ``None``; numbers are floats; Excel error values
arrive as their text (``'#N/A'``) or as the integer codes COM uses.

Out: a function of one compound given a range returns a 2-D list of the same
shape (it spills); empty in gives empty out; numbers stay numbers. A cell
the function cannot answer is a ``CellError``: an error value passed in
comes out as the same error value, and bad chemistry input is refused as
``#VALUE!`` carrying cellchem's one-line message. No layer shows a refusal as
text that could pass for an answer: each turns ``CellError`` into its
platform's own error value (``lite``, ``excel``, ``calc.component``), and
``why`` gives the message where the platform cannot show it.

LibreOffice Calc hands values over differently (``from_calc``, ``to_calc``):
a range is a tuple of row tuples with ``''`` for empty cells, a reference to
one empty cell arrives as ``0.0``, exactly as a real zero does, an omitted
argument as ``None``; a result must be rows of cells, with no empty value
and no boolean. Each argument says what a lone 0 means (``ZERO_*``).
"""

from __future__ import annotations

import math
import struct
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from ...errors import CellchemError

REFUSED = "#VALUE!"  # the error value of a refusal: "a value in the formula is of the wrong type"

EXCEL_ERRORS = frozenset(
    {"#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A", "#GETTING_DATA", "#SPILL!", "#CALC!"}
)
# the codes COM gives for error cells (xlwings on Windows without err_to_str); the same table is in
# xlwings' _xlwindows.py
COM_ERRORS = {
    -2146826281: "#DIV/0!",
    -2146826246: "#N/A",
    -2146826259: "#NAME?",
    -2146826288: "#NULL!",
    -2146826252: "#NUM!",
    -2146826265: "#REF!",
    -2146826273: "#VALUE!",
}


@dataclass(frozen=True)
class CellError:
    """A cell with no answer: ``code`` is the spreadsheet error value to show
    (``#VALUE!`` for a refusal, or the error value that came in), ``message``
    cellchem's reason (empty for an error value passed through)."""

    code: str
    message: str = ""

    def __str__(self) -> str:
        return self.code + (f" {self.message}" if self.message else "")


def error_value(v: object) -> str | None:
    """The error text of an Excel error value, or None."""
    if isinstance(v, CellError):
        return v.code
    if isinstance(v, str) and v in EXCEL_ERRORS:
        return v
    if isinstance(v, int) and not isinstance(v, bool) and v in COM_ERRORS:
        return COM_ERRORS[v]
    return None


def blank(v: object) -> bool:
    return v is None or (isinstance(v, str) and not v.strip())


def refusal(exc: Exception) -> CellError:
    """The cell for a refused input: ``#VALUE!`` with the whole one-line message."""
    return CellError(REFUSED, str(exc))


def reason(result: object) -> object:
    """What ``why`` shows for a result: the message of a refusal, the error
    value that came in, or empty for an answer; a range cell by cell."""
    if isinstance(result, list):
        return [reason(row) if isinstance(row, list) else _reason_one(row) for row in result]
    return _reason_one(result)


def _reason_one(v: object) -> str | None:
    if isinstance(v, CellError):
        return v.message or f"the input is the error value {v.code}"
    return None


def cells_of(result: object) -> list[object]:
    """Every cell of a result, row by row."""
    if isinstance(result, list):
        return [x for row in result for x in (row if isinstance(row, list) else [row])]
    return [result]


def as_grid(v: object) -> tuple[list[list[object]], bool]:
    """(rows, was a range): a scalar becomes [[v]]."""
    if isinstance(v, list | tuple):
        if v and all(isinstance(r, list | tuple) for r in v):
            return [list(r) for r in v], True
        return [list(v)], True
    return [[v]], False


def text(v: object, what: str) -> str:
    """A text argument: strings as they are; a whole number as its digits
    (a CAS RN or a count typed as a number); other numbers refused."""
    if isinstance(v, str):
        return v.strip()
    if isinstance(v, bool):
        raise CellchemError(f"{what}: expected text, read {v!r}")
    if isinstance(v, int | float) and math.isfinite(v) and float(v).is_integer():
        return str(int(v))
    raise CellchemError(f"{what}: expected text, read {v!r}")


def number(v: object, what: str) -> float:
    """A number argument: floats and ints; text that is a number."""
    if isinstance(v, bool):
        raise CellchemError(f"{what}: expected a number, read {v!r}")
    if v is CALC_ZERO:
        raise CellchemError(
            f"{what}: read 0, which is also what LibreOffice passes for an empty cell; "
            'write the zero as text ("0"), or leave the argument out for the default'
        )
    if isinstance(v, int | float):
        if not math.isfinite(v):
            raise CellchemError(f"{what}: {v!r} is not a finite number")
        return float(v)
    if isinstance(v, str):
        try:
            out = float(v.strip())
        except ValueError:
            raise CellchemError(f"{what}: expected a number, read {v!r}") from None
        if math.isfinite(out):
            return out
    raise CellchemError(f"{what}: expected a number, read {v!r}")


def quantity(v: object, what: str) -> float | str:
    """A number or text with a unit (``'250 mL'``), for the core's unit readers."""
    if isinstance(v, str):
        return v.strip()
    return number(v, what)


def out(value: object) -> object:
    """A result for a cell: numbers as floats, None as empty, the rest as is."""
    if isinstance(value, bool) or value is None or isinstance(value, str | CellError):
        return value
    if isinstance(value, int | float):
        return float(value)
    return str(value)


def cellwise(
    fn: Callable[..., object],
    args: Sequence[object],
    blank_when: Callable[[list[object]], bool] | None = None,
) -> object:
    """Apply ``fn`` to each cell of the arguments, broadcast: every range
    argument must have one shape; single cells apply to every cell. The first
    argument blank (or ``blank_when(values)``) gives a blank result; an error
    value in any argument gives that error value; a CellchemError gives a
    refusal (``CellError``)."""
    grids = [as_grid(a) for a in args]
    shapes = {
        (len(g), len(g[0]) if g else 0)
        for g, was in grids
        if was and (len(g), len(g[0]) if g else 0) != (1, 1)
    }
    if len(shapes) > 1:
        return refusal(
            CellchemError(
                "the ranges given have different shapes: " + ", ".join(f"{r}x{c}" for r, c in sorted(shapes))
            )
        )
    any_range = any(was for _g, was in grids)
    rows, cols = shapes.pop() if shapes else (1, 1)
    # a single cell applies to every cell of the result; decided once, not per cell
    single = [(len(g), len(g[0])) == (1, 1) for g, _was in grids]
    result: list[list[object]] = []
    for i in range(rows):
        line: list[object] = []
        for j in range(cols):
            values = [g[0][0] if one else g[i][j] for (g, _was), one in zip(grids, single)]
            line.append(_one(fn, values, blank_when))
        result.append(line)
    return result if any_range else result[0][0]


def _one(
    fn: Callable[..., object], values: list[object], blank_when: Callable[[list[object]], bool] | None = None
) -> object:
    for v in values:
        err = error_value(v)
        if err is not None:
            return CellError(err)
    if (blank_when or _first_blank)(values):
        return None
    try:
        return out(fn(*values))
    except CellchemError as exc:
        return refusal(exc)


def _first_blank(values: list[object]) -> bool:
    return blank(values[0])


def flat(v: object) -> list[object]:
    """Every cell of a range, row by row (blank cells kept)."""
    rows, _ = as_grid(v)
    return [x for r in rows for x in r]


def aggregate(fn: Callable[..., object], *args: object) -> object:
    """Apply ``fn`` to whole ranges (the functions over a solution's
    solutes); an error value in, or a refusal, gives one error cell."""
    for a in args:
        for v in flat(a):
            err = error_value(v)
            if err is not None:
                return CellError(err)
    try:
        return fn(*args)
    except CellchemError as exc:
        return refusal(exc)


# What a lone 0.0 from LibreOffice Calc means for an argument: Calc passes a
# reference to one empty cell as 0.0, the same value as a real zero.
ZERO_IS_EMPTY = "empty"  # text, or a quantity that is never 0 (molar mass, volume): read as an empty cell
ZERO_IS_ZERO = "zero"  # a value where 0 is common and harmless (a concentration to convert)
ZERO_IS_AMBIGUOUS = "ambiguous"  # 0 and empty mean different things (0 degrees C vs the default 25)
ZERO_AS_TARGET = "target"  # WHY's arguments: read by the rule of the function WHY explains (settle_zero)


# Calc keeps an error inside a number as a NaN whose low bits hold the error's code (519: #VALUE!,
# "no value"); a plain NaN shows as #NUM!. tests/test_calc.py checks what Calc shows.
CALC_VALUE_ERROR = struct.unpack("<d", struct.pack("<Q", 0x7FF8000000000000 | 519))[0]


class _CalcZero:
    """A lone 0 from Calc where 0 and an empty cell mean different things:
    not blank, and refused where a number is read (``number``)."""

    def __repr__(self) -> str:
        return "0"


CALC_ZERO = _CalcZero()


class _CalcZeroUnread:
    """A lone 0 from Calc not yet read: WHY passes it on to the function it explains."""

    def __repr__(self) -> str:
        return "0"


CALC_ZERO_UNREAD = _CalcZeroUnread()


def settle_zero(v: object, zero: str) -> object:
    """A value WHY passed on, read by the ``zero`` rule of the argument it fills."""
    return from_calc(0.0, zero) if v is CALC_ZERO_UNREAD else v


def from_calc(v: object, zero: str = ZERO_IS_EMPTY) -> object:
    """A value as LibreOffice Calc passes it, in the shape the worksheet
    functions take (the xlwings shape): ranges as lists of rows with None
    for empty cells, a lone empty text or an empty-cell 0.0 as None.

    >>> from_calc(((1.0, ''), ('NaCl', 2.0)))
    [[1.0, None], ['NaCl', 2.0]]
    >>> from_calc(0.0) is None, from_calc(0.0, ZERO_IS_ZERO), from_calc(0.0, ZERO_IS_AMBIGUOUS)
    (True, 0.0, 0)
    """
    if isinstance(v, tuple | list):
        return [
            [None if x == "" else x for x in (row if isinstance(row, tuple | list) else (row,))] for row in v
        ]
    if v == "" or v is None:
        return None
    if isinstance(v, float) and v == 0.0:
        if zero == ZERO_AS_TARGET:
            return CALC_ZERO_UNREAD
        if zero == ZERO_IS_EMPTY:
            return None
        if zero == ZERO_IS_AMBIGUOUS:
            return CALC_ZERO
    return v


def to_calc(result: object) -> tuple[tuple[object, ...], ...]:
    """A result as LibreOffice Calc takes it: always rows of cells (one cell
    shows as a plain value); empty as '', TRUE and FALSE as 1 and 0 (Calc
    has no boolean value; a boolean number format shows them as words).

    >>> to_calc(True), to_calc([[1.5, None], ['x', False]])
    (((1.0,),), ((1.5, ''), ('x', 0.0)))
    """
    rows, _ = as_grid(result)
    return tuple(tuple(_calc_cell(x) for x in row) for row in rows)


def _calc_cell(v: object) -> object:
    if isinstance(v, CellError):
        return CALC_VALUE_ERROR  # an error cell in Calc's result array
    if v is None:
        return ""
    if isinstance(v, bool):
        return 1.0 if v else 0.0
    if isinstance(v, int | float):
        return float(v)
    return v if isinstance(v, str) else str(v)
