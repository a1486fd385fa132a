"""The cellchem Calc add-in: the worksheet functions as UNO methods.

This file is copied into the extension as ``cellchem_calc.py`` and runs in
LibreOffice's own Python. Calc calls one method per function (``molarMass``
for ``CELLCHEM.MOLAR_MASS``, see ``method_name``); each method converts what
Calc passes (``cells.from_calc``), calls the same function the Excel layers
call (``sheet_functions``) and converts the answer back (``cells.to_calc``).

A cell the function cannot answer is Calc's own error value, never text: a
single refused cell raises a UNO RuntimeException, which Calc shows as
``#VALUE!`` (``ISERROR`` sees it), and a refused cell inside a range result
is an error cell too (``to_calc``). Calc shows no message with an add-in's
error, so ``CELLCHEM.WHY`` gives it.

The bundled core is put first on ``sys.path`` and checked to be the one
imported, so another cellchem or pint installed where LibreOffice's Python
looks cannot answer in its place. Without ``uno`` (outside LibreOffice) the
module only offers the naming helpers the builder uses.
"""

from __future__ import annotations

import os
import sys

IMPLEMENTATION = "org.cellchem.sheet.Functions"
SERVICE = "com.sun.star.sheet.AddIn"
INTERFACE = "org.cellchem.sheet.XCellchemFunctions"
MINIMUM_PYTHON = (3, 11)


def method_name(function: str) -> str:
    """The UNO method behind a worksheet function: MOLAR_MASS -> molarMass."""
    return parameter_name(function.lower())


def parameter_name(argument: str) -> str:
    """An argument's UNO parameter name (IDL names have no underscores): molar_mass -> molarMass."""
    head, *rest = argument.split("_")
    return head + "".join(part.capitalize() for part in rest)


def _load_bundle(here: str) -> tuple[object, object, str | None]:
    """(sheet_functions, cells, problem): the bundled modules, or why they cannot be used."""
    if sys.version_info < MINIMUM_PYTHON:
        found = ".".join(map(str, sys.version_info[:3]))
        return None, None, f"cellchem needs Python 3.11 or newer; this LibreOffice runs Python {found}"
    bundle = os.path.join(here, "pythonpath")
    if bundle in sys.path:
        sys.path.remove(bundle)
    sys.path.insert(0, bundle)
    try:
        from cellchem.adapters.sheets import cells
        from cellchem.adapters.sheets import functions as sheet_functions
    except Exception as exc:  # a broken or shadowed bundle: say so in the cell
        return None, None, f"cellchem could not be loaded from {bundle}: {exc}"
    import pint
    import pyparsing

    import cellchem

    for module in (cellchem, pint, pyparsing):
        where = os.path.abspath(getattr(module, "__file__", "") or "")
        if not where.startswith(os.path.abspath(bundle) + os.sep):
            return None, None, f"{module.__name__} was loaded from {where}, not from the extension's {bundle}"
    return sheet_functions, cells, None


def _make_class(sheet_functions, cells, problem: str | None):
    import unohelper
    from com.sun.star.lang import XServiceInfo
    from com.sun.star.uno import RuntimeException
    from org.cellchem.sheet import XCellchemFunctions

    def method(spec):
        zeros = tuple(a.zero for a in spec.arguments)
        implementation = spec.implementation

        def call(self, *values):
            try:
                args = [cells.from_calc(v, z) for v, z in zip(values, zeros)]
                result = implementation(*args)
            except Exception as exc:  # a fault in cellchem itself: an error cell, not a dialog
                result = cells.refusal(exc)
            if isinstance(result, cells.CellError):
                raise RuntimeException(str(result), self)  # Calc: #VALUE!
            return cells.to_calc(result)

        call.__name__ = method_name(spec.name)
        call.__doc__ = spec.summary
        return call

    namespace = {
        "__init__": lambda self, ctx=None: setattr(self, "ctx", ctx),
        "getImplementationName": lambda self: IMPLEMENTATION,
        "supportsService": lambda self, name: name == SERVICE,
        "getSupportedServiceNames": lambda self: (SERVICE,),
    }
    if problem is None:
        for spec in sheet_functions.FUNCTIONS.values():
            namespace[method_name(spec.name)] = method(spec)
    else:  # the bundle could not be used: every function fails, and CELLCHEM.WHY tells why

        def unusable(self, name):
            def fail(*args):
                if name == method_name("WHY"):
                    return ((problem,),)
                raise RuntimeException(problem, self)

            return fail

        namespace["__getattr__"] = unusable
    return type("CellchemFunctions", (unohelper.Base, XCellchemFunctions, XServiceInfo), namespace)


try:
    import uno  # noqa: F401  (present only inside LibreOffice's Python)
    import unohelper
except ImportError:  # outside LibreOffice: the naming helpers only
    g_ImplementationHelper = None
else:
    _sheet_functions, _cells, _problem = _load_bundle(os.path.dirname(os.path.abspath(__file__)))
    g_ImplementationHelper = unohelper.ImplementationHelper()
    g_ImplementationHelper.addImplementation(
        _make_class(_sheet_functions, _cells, _problem), IMPLEMENTATION, (SERVICE,)
    )
