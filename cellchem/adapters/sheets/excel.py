"""The cellchem worksheet functions for Excel through classic xlwings (Windows, a local Python).

Point xlwings at this module (``UDF Modules: cellchem.adapters.sheets.excel``
in the xlwings add-in's settings, or ``UDF_MODULES`` in ``xlwings.conf``) and
import the functions. Classic xlwings writes each function as a VBA function
of the same name, and VBA names allow letters, digits and underscores only,
with no namespaces: the functions are named with the namespace joined by an
underscore, ``CELLCHEM_MOLAR_MASS`` for Excel's ``CELLCHEM.MOLAR_MASS``
(``functions.spelled``). Every argument arrives as a 2-D list (``ndim=2``),
error cells as their text (``err_to_str``); the results of a range spill.

A cell the function cannot answer is an Excel error value, never text: the
result holds a COM error (a VARIANT of type VT_ERROR with the error's code),
``#VALUE!`` for a refusal, and the same error for an error value passed in.
A VBA function's error value carries no message, so ``CELLCHEM_WHY`` gives
it. (A Python exception would reach the cell as text through the VBA wrapper
xlwings writes, so these functions never raise.)

The functions, with their names, arguments and descriptions, are the table
``functions.FUNCTIONS``; this module declares each entry to xlwings when it is
imported (``declare``), so nothing here is written twice. What the xlwings
add-in reads from a declared function is its name, its signature
(``inspect.signature``: the argument names in order, each optional with
``None`` as its default), its docstring (the description in Excel's function
wizard) and the metadata ``xlwings.func`` and ``xlwings.arg`` attach.
Without xlwings the functions are plain Python and can still be called.

>>> round(CELLCHEM_MOLAR_MASS("NaCl"), 2)
58.44
>>> import inspect; str(inspect.signature(CELLCHEM_NAME))
'(formula=None, style=None)'
"""

from __future__ import annotations

import inspect
from collections.abc import Callable

from .cells import COM_ERRORS, CellError
from .functions import FUNCTIONS, SheetFunction, spelled

try:  # the 'excel' extra
    import xlwings as xw
except ImportError:  # pragma: no cover - inert without xlwings
    xw = None
try:  # pywin32, which classic xlwings needs on Windows
    from pythoncom import VT_ERROR
    from win32com.client import VARIANT
except ImportError:  # plain Python elsewhere: a cell with no answer stays a CellError
    VT_ERROR, VARIANT = None, None

CATEGORY = "cellchem"  # the group the functions are listed under in Excel's function wizard
ARGUMENT_OPTIONS = {"ndim": 2, "err_to_str": True}  # how xlwings converts every argument


def signature(spec: SheetFunction) -> inspect.Signature:
    """The Python signature Excel sees for a worksheet function: the table's
    argument names in order, each optional (a missing argument arrives as
    ``None``, which the functions treat as an empty cell)."""
    return inspect.Signature(
        [
            inspect.Parameter(a.name, inspect.Parameter.POSITIONAL_OR_KEYWORD, default=None)
            for a in spec.arguments
        ]
    )


COM_CODES = {text: code for code, text in COM_ERRORS.items()}


def com_error(code: str) -> object:
    """An Excel error value as COM passes it: a VARIANT of type VT_ERROR holding the error's code
    (pywin32, on Windows, where classic xlwings runs its functions)."""
    return VARIANT(VT_ERROR, COM_CODES.get(code, COM_CODES["#VALUE!"]))


def render(result: object) -> object:
    """The table's answer for classic xlwings: every ``CellError`` as a COM error value."""
    if VARIANT is None:
        return result
    if isinstance(result, CellError):
        return com_error(result.code)
    if isinstance(result, list):
        return [[com_error(c.code) if isinstance(c, CellError) else c for c in row] for row in result]
    return result


def declare(spec: SheetFunction) -> Callable[..., object]:
    """The function xlwings imports for one entry of ``FUNCTIONS``: named
    ``spelled(spec.name, "classic")``, with ``signature(spec)``, the one-line
    summary as its docstring, and (where xlwings is installed) declared with
    ``xlwings.func`` and one ``xlwings.arg`` per argument carrying its
    description."""
    sig = signature(spec)
    implementation = spec.implementation
    name = spelled(spec.name, "classic")

    def udf(*args, **kwargs):
        bound = sig.bind(*args, **kwargs)  # a wrong argument is a TypeError, as for a written-out function
        return render(implementation(*bound.args, **bound.kwargs))

    udf.__name__ = udf.__qualname__ = name
    udf.__doc__ = spec.summary
    udf.__module__ = __name__
    udf.__signature__ = sig
    if xw is not None:
        # as the stacked decorators @xw.func / @xw.arg(...) / def would apply them: arguments first
        for argument in reversed(spec.arguments):
            udf = xw.arg(argument.name, doc=argument.description, **ARGUMENT_OPTIONS)(udf)
        udf = xw.func(category=CATEGORY)(udf)
    return udf


for _spec in FUNCTIONS.values():
    globals()[spelled(_spec.name, "classic")] = declare(_spec)
del _spec

__all__ = sorted(spelled(name, "classic") for name in FUNCTIONS)
