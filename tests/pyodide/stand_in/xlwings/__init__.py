"""A recording stand-in for xlwings' custom-function decorators ``func``, ``arg`` and ``ret``.

The main.py that cellchem writes for xlwings Lite imports ``func`` and ``arg``
from ``xlwings``. The tests run that main.py with this directory first on
``sys.path`` (in Pyodide and in CPython alike), so these decorators record what
main.py declares instead of registering anything with Excel. They take exactly
the keywords that xlwings documents and refuse any other with a TypeError that
names it, so a main.py that passes here uses no keyword xlwings does not know.

What was read for the keywords (the documentation, not xlwings' code):

- ``func``: the keyword arguments documented in the docstring of xlwings'
  ``func`` (xlwings 0.37): ``name``, ``namespace``, ``cache``, ``help_url``
  (xlwings Lite and Server), ``required_roles`` (Server only), ``volatile``
  (all), ``category``, ``call_in_wizard``, ``async_mode`` (classic xlwings
  only); and xlwings' "Office.js Custom Functions" page
  (docs/pro/server/officejs_custom_functions.rst: namespace, help_url,
  volatile).
- ``arg`` and ``ret`` options: xlwings' "Converters and Options" page
  (docs/advanced_features/converters.rst: ``ndim``, ``numbers``, ``dates``,
  ``empty``, ``transpose``, ``expand``, ``chunksize``, ``err_to_str``,
  ``formatter``; ``dtype``, ``copy``, ``order`` for NumPy arrays; ``index``,
  ``header`` for pandas), the Office.js custom-functions page (``doc``,
  ``parse_dates``, ``date_format``, ``err_to_str``, ``ndim``, ``transpose``)
  and the docstring of xlwings' ``arg`` (``doc``; ``vba`` for classic xlwings).

``call`` plays the part of xlwings Lite's runtime for one call, as those
pages describe it: Excel hands every argument over as a range; a range of one
cell arrives as that cell's value; an empty cell or a left-out argument
arrives as the parameter's default, without conversion; otherwise the
recorded options apply (``ndim=2`` makes a single value ``[[value]]``,
``err_to_str`` keeps an error cell as its text where it would otherwise be
``None``, ``empty`` replaces empty cells inside a range). ``cells`` describes
how the result shows in Excel: the texts ``#N/A``, ``#VALUE!`` ... become
error values (Office.js ``Excel.ErrorCellValueType`` names), an exception
shows ``#VALUE!`` with its message.

This is not xlwings: it converts no dates, numbers or DataFrames and talks to
no Excel. Only the recorded metadata and the argument shapes are emulated.
"""

from __future__ import annotations

import inspect
import re
from collections.abc import Callable
from typing import Any

__version__ = "stand-in"

# documented options of @arg and @ret (see the module's description for the pages read)
CONVERTER_OPTIONS = frozenset(
    {
        "ndim",
        "numbers",
        "dates",
        "empty",
        "transpose",
        "expand",
        "chunksize",
        "err_to_str",
        "formatter",
        "dtype",
        "copy",
        "order",
        "index",
        "header",
        "parse_dates",
        "date_format",
    }
)
ARG_ONLY = frozenset({"doc", "vba"})
# keywords xlwings documents as classic-only (xlwings Lite ignores them) or Server-only
NOT_FOR_LITE = frozenset({"category", "call_in_wizard", "async_mode", "required_roles", "vba", "expand"})

# the error texts xlwings writes to Excel as error values, with Office.js's ErrorCellValueType names
ERROR_TYPES = {
    "#DIV/0!": "Div0",
    "#N/A": "NotAvailable",
    "#NAME?": "Name",
    "#NULL!": "Null",
    "#NUM!": "Num",
    "#REF!": "Ref",
    "#VALUE!": "Value",
}

# Excel's rule for a custom function's name (letters, digits, periods and underscores, starting
# with a letter, at most 128 characters), as xlwings states it when it refuses a name
_EXCEL_NAME = re.compile(r"[A-Za-z][A-Za-z0-9._]{0,127}")


def _record(f: Callable[..., Any]) -> dict[str, Any]:
    """The metadata of ``f``, created from its signature on first use."""
    if not hasattr(f, "__xlfunc__"):
        params = []
        for position, p in enumerate(inspect.signature(f).parameters.values()):
            if p.kind not in (p.POSITIONAL_ONLY, p.POSITIONAL_OR_KEYWORD):
                raise TypeError(f"{f.__name__}: only plain positional parameters are recorded, not {p}")
            params.append(
                {
                    "name": p.name,
                    "position": position,
                    "doc": None,
                    "options": {},
                    "optional": p.default is not p.empty,
                    "default": None if p.default is p.empty else p.default,
                    "arg_decorators": 0,
                }
            )
        f.__xlfunc__ = {
            "python_name": f.__name__,
            "func_applied": False,
            "doc": f.__doc__,
            "args": params,
            "ret": {"options": {}, "ret_decorators": 0},
            "keywords": {"func": [], "arg": [], "ret": []},
        }
    return f.__xlfunc__


def _check_options(decorator: str, options: dict[str, Any], allowed: frozenset[str]) -> None:
    for key in options:
        if key not in allowed:
            raise TypeError(
                f"{decorator}() got an unexpected keyword argument {key!r}: "
                f"xlwings documents {', '.join(sorted(allowed))}"
            )


def func(
    f: Callable[..., Any] | None = None,
    *,
    name: str | None = None,
    namespace: str | None = None,
    volatile: bool = False,
    cache: bool = False,
    help_url: str | None = None,
    required_roles: list[str] | None = None,
    category: int | str | None = None,
    call_in_wizard: bool = True,
    async_mode: str | None = None,
) -> Any:
    """``@func`` or ``@func(...)``: records the function's Excel name, namespace and flags."""
    given = {
        k: v
        for k, v in {
            "name": name,
            "namespace": namespace,
            "volatile": volatile,
            "cache": cache,
            "help_url": help_url,
            "required_roles": required_roles,
            "category": category,
            "call_in_wizard": call_in_wizard,
            "async_mode": async_mode,
        }.items()
        if v != {"volatile": False, "cache": False, "call_in_wizard": True}.get(k)
    }
    for flag in ("volatile", "cache", "call_in_wizard"):
        if not isinstance(given.get(flag, False), bool):
            raise TypeError(f"func(): {flag} must be True or False, not {given[flag]!r}")
    if given.get("volatile") and given.get("cache"):
        raise TypeError("func(): a volatile function cannot be cached")
    if name is not None and not (isinstance(name, str) and _EXCEL_NAME.fullmatch(name)):
        raise ValueError(f"func(): {name!r} is not a name Excel accepts for a function")

    def inner(g: Callable[..., Any]) -> Callable[..., Any]:
        meta = _record(g)
        if meta["func_applied"]:
            raise TypeError(f"{g.__name__}: @func applied twice")
        meta.update(
            func_applied=True,
            name=name,
            excel_name=name if name is not None else g.__name__.upper(),
            namespace=namespace,
            volatile=volatile,
            cache=cache,
            help_url=help_url,
            required_roles=required_roles,
            category=category,
            call_in_wizard=call_in_wizard,
            async_mode=async_mode,
        )
        meta["keywords"]["func"] = sorted(given)
        return g

    return inner if f is None else inner(f)


def arg(arg: str, convert: Any = None, **options: Any) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """``@arg("x", convert=None, **options)``: records one argument's description and options."""
    _check_options("arg", options, CONVERTER_OPTIONS | ARG_ONLY)
    if convert is not None:
        options["convert"] = convert

    def inner(g: Callable[..., Any]) -> Callable[..., Any]:
        meta = _record(g)
        if meta["func_applied"]:
            raise TypeError(f"{g.__name__}: @arg must stand below @func")
        found = [a for a in meta["args"] if a["name"] == arg.lstrip("*")]
        if not found:
            raise TypeError(f"{g.__name__}: @arg names {arg!r}, which is not one of its parameters")
        record = found[0]
        record["arg_decorators"] += 1
        given = dict(options)
        if "doc" in given:
            record["doc"] = given.pop("doc")
        record["options"].update(given)
        meta["keywords"]["arg"] = sorted(set(meta["keywords"]["arg"]) | set(options))
        return g

    return inner


def ret(convert: Any = None, **options: Any) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """``@ret(convert=None, **options)``: records the result's options."""
    _check_options("ret", options, CONVERTER_OPTIONS)
    if convert is not None:
        options["convert"] = convert

    def inner(g: Callable[..., Any]) -> Callable[..., Any]:
        meta = _record(g)
        if meta["func_applied"]:
            raise TypeError(f"{g.__name__}: @ret must stand below @func")
        meta["ret"]["options"].update(options)
        meta["ret"]["ret_decorators"] += 1
        meta["keywords"]["ret"] = sorted(set(meta["keywords"]["ret"]) | set(options))
        return g

    return inner


def _plain(v: Any) -> Any:
    """A JSON-safe form of a recorded value (a converter type by its name)."""
    if v is None or isinstance(v, bool | int | float | str):
        return v
    if isinstance(v, list | tuple):
        return [_plain(x) for x in v]
    if isinstance(v, dict):
        return {str(k): _plain(x) for k, x in v.items()}
    return getattr(v, "__name__", repr(v))


def declared(module: Any) -> list[dict[str, Any]]:
    """The recorded metadata of every function of ``module`` that ``@func`` declared, JSON-safe."""
    out = []
    for value in vars(module).values():
        meta = getattr(value, "__xlfunc__", None)
        if callable(value) and meta and meta["func_applied"]:
            record = _plain(meta)
            record["not_for_lite"] = sorted(
                k for k in meta["keywords"]["func"] + meta["keywords"]["arg"] if k in NOT_FOR_LITE
            )
            out.append(record)
    return out


class ErrorCell:
    """An error value in a cell (``#N/A`` ...), as a test hands one to ``call``."""

    def __init__(self, text: str) -> None:
        self.text = text

    def __repr__(self) -> str:
        return f"ErrorCell({self.text!r})"


def _as_range(value: Any) -> list[list[Any]]:
    """What Excel hands over for an argument: always rows of cells."""
    if isinstance(value, list):
        return [list(r) if isinstance(r, list) else [r] for r in value] if value else [[None]]
    return [[value]]


def _convert(rows: list[list[Any]], options: dict[str, Any]) -> Any:
    """The value a function receives for one argument (not empty, not left out)."""

    def cell(v: Any) -> Any:
        if isinstance(v, ErrorCell):
            return v.text if options.get("err_to_str") else None
        if v is None:
            return options.get("empty")
        return v

    rows = [[cell(v) for v in r] for r in rows]
    if options.get("transpose"):
        rows = [list(c) for c in zip(*rows)]
    ndim = options.get("ndim")
    if ndim == 2:
        return rows
    if len(rows) == 1 and len(rows[0]) == 1:
        return rows[0][0] if ndim is None else [rows[0][0]]
    if len(rows) == 1 or all(len(r) == 1 for r in rows):
        return [v for r in rows for v in r]  # a row or a column arrives as a list
    return rows


def call(f: Callable[..., Any], cells: list[Any]) -> Any:
    """Call ``f`` as xlwings Lite does for a formula whose arguments are ``cells``
    (a value per argument: a scalar for one cell, a list of rows for a range,
    ``None`` for an empty cell or a left-out argument, ``ErrorCell`` for an error)."""
    meta = f.__xlfunc__
    if len(cells) > len(meta["args"]):
        raise TypeError(f"{meta['excel_name']} takes {len(meta['args'])} arguments, given {len(cells)}")
    args = []
    for i, info in enumerate(meta["args"]):
        rows = _as_range(cells[i] if i < len(cells) else None)
        if len(rows) == 1 and len(rows[0]) == 1 and rows[0][0] is None:
            args.append(info["default"])  # an empty cell or a left-out argument: no conversion
        else:
            args.append(_convert(rows, info["options"]))
    return f(*args)


def cells(result: Any) -> dict[str, Any]:
    """How a result shows in Excel: its shape and any cells that become error values."""
    rows = result if isinstance(result, list) else [[result]]
    rows = [r if isinstance(r, list) else [r] for r in rows]
    errors = [
        [i, j, ERROR_TYPES[v]]
        for i, r in enumerate(rows)
        for j, v in enumerate(r)
        if isinstance(v, str) and v in ERROR_TYPES
    ]
    return {"rows": len(rows), "columns": max((len(r) for r in rows), default=0), "error_values": errors}
