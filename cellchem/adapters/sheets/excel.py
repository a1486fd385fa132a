"""The cellchem worksheet functions for Excel, through xlwings.

Point xlwings at this module (``UDF Modules: cellchem.adapters.sheets.excel``
in the xlwings add-in's settings, or ``UDF_MODULES`` in ``xlwings.conf``) and
import the functions; each ``CC_*`` function then works in a cell like a
built-in one. Every argument arrives as a 2-D list (``ndim=2``), error cells
as their text (``err_to_str``); the results of a range of compounds spill.

The functions themselves, with their names, arguments and one-line
descriptions, are the table ``functions.FUNCTIONS``; this module declares
each entry to xlwings when it is imported (``declare``), so nothing here is
written twice. What the xlwings add-in reads from a declared function is its
name, its signature (``inspect.signature``: the argument names in order, each
optional with ``None`` as its default), its docstring (the function's
description in Excel's function wizard) and the metadata ``xlwings.func`` and
``xlwings.arg`` attach (the category, and each argument's description and
conversion). Without xlwings (or where its decorators do nothing, as on a
machine without Excel) the functions are plain Python and can still be
called.

>>> round(CC_MOLARMASS("NaCl"), 2)
58.44
>>> import inspect; str(inspect.signature(CC_NAME))
'(formula=None, style=None)'
"""

from __future__ import annotations

import inspect
from collections.abc import Callable

from .functions import FUNCTIONS, SheetFunction

try:  # the 'excel' extra
    import xlwings as xw
except ImportError:  # pragma: no cover - inert without xlwings
    xw = None

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


def declare(spec: SheetFunction) -> Callable[..., object]:
    """The function xlwings imports for one entry of ``FUNCTIONS``: named
    ``spec.name``, with ``signature(spec)``, the one-line summary as its
    docstring, and (where xlwings is installed) declared with ``xlwings.func``
    and one ``xlwings.arg`` per argument carrying its description."""
    sig = signature(spec)
    implementation = spec.implementation

    def udf(*args, **kwargs):
        bound = sig.bind(*args, **kwargs)  # a wrong argument is a TypeError, as for a written-out function
        return implementation(*bound.args, **bound.kwargs)

    udf.__name__ = udf.__qualname__ = spec.name
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
    globals()[_spec.name] = declare(_spec)
del _spec

__all__ = sorted(FUNCTIONS)
