"""The worksheet functions in Excel through xlwings Lite: nothing to install but the add-in.

xlwings Lite runs Python inside Excel's add-in runtime (Pyodide) and
registers the functions that ``main.py`` declares with its ``func`` and
``arg`` decorators. ``main_source`` writes that ``main.py`` from the one
function table (``functions.FUNCTIONS``): one declaration per function, in
the ``cellchem`` namespace (Excel shows ``=CELLCHEM.MOLAR_MASS(...)``), with
the function's and each argument's description, every argument as a 2-D
range with error cells as their text. Each declared function calls ``call``.

``call`` turns the table's answer into what Excel takes from xlwings Lite:

- a single cell the function refuses raises ``Refused``; xlwings Lite turns
  an exception into ``#VALUE!`` with the message on the cell's error
  indicator (Excel's custom-function errors carry a message there);
- in a spilled range a refused cell is the text ``"#VALUE!"``, which xlwings
  turns into the error value itself (custom-function runtime 1.4 and later);
  a range cannot carry one message per cell, so ``=CELLCHEM.WHY(...)`` gives
  them;
- an error value passed in comes out as the same error value.

``requirements`` writes the ``requirements.txt`` beside it. Neither this
module nor ``main.py`` imports xlwings' decorators outside Excel: the tests
run ``main.py`` under a recording stand-in.
"""

from __future__ import annotations

from ... import __version__
from ...errors import CellchemError
from .cells import CellError, cells_of
from .functions import FUNCTIONS, NAMESPACE, SheetFunction

# what every argument is declared with: a range as rows (a single cell as [[v]]), error cells as text
ARGUMENT_OPTIONS = {"ndim": 2, "err_to_str": True}
# what the functions need in Pyodide beside the cellchem wheel: the standard library's sqlite3 (for the
# substance table) is a separate package of Pyodide's own; pint and pyparsing come from the wheel's
# dependencies
EXTRA_REQUIREMENTS = ("sqlite3",)


class Refused(CellchemError):
    """A single cell refused: xlwings Lite shows ``#VALUE!`` and this message."""


def call(name: str, *args: object) -> object:
    """One function of the table, as main.py calls it."""
    return render(FUNCTIONS[name].implementation(*args))


def render(result: object) -> object:
    """The table's answer as xlwings Lite takes it (see the module's description)."""
    if isinstance(result, CellError):
        if result.message:
            raise Refused(result.message)
        return result.code
    if isinstance(result, list):
        every = cells_of(result)
        if len(every) == 1 and isinstance(every[0], CellError) and every[0].message:
            raise Refused(every[0].message)
        return [[c.code if isinstance(c, CellError) else c for c in row] for row in result]
    return result


def require(version: str) -> None:
    """Refuse to run a main.py written for another cellchem than the one installed."""
    if version != __version__:
        raise CellchemError(
            f"main.py was written for cellchem {version}, but requirements.txt installed cellchem "
            f"{__version__}; write main.py again with `cellchem excel-lite` for the wheel you host"
        )


def _declaration(spec: SheetFunction) -> list[str]:
    lines = [f"@func(name={spec.name!r}, namespace={NAMESPACE.lower()!r})"]
    for a in spec.arguments:
        options = ", ".join(f"{k}={v!r}" for k, v in ARGUMENT_OPTIONS.items())
        lines.append(f"@arg({a.name!r}, {options}, doc={a.description!r})")
    params = ", ".join(a.name + ("=None" if a.optional else "") for a in spec.arguments)
    names = ", ".join(a.name for a in spec.arguments)
    lines += [
        f"def {spec.python_name}({params}):",
        f'    """{spec.summary}"""',
        f"    return lite.call({spec.name!r}, {names})",
    ]
    return lines


def main_source() -> str:
    """The main.py to paste into xlwings Lite."""
    head = [
        f'"""cellchem {__version__} worksheet functions for xlwings Lite (written by `cellchem excel-lite`).',
        "",
        "Each function appears in Excel as =CELLCHEM.NAME(...). A refused input shows #VALUE!: hover over",
        'the cell\'s error flag to read why, or use =CELLCHEM.WHY("NAME", same arguments). Results are',
        "checks and aids: for hazards and for making up solutions the supplier's SDS, local regulations",
        "and the site's safety officer decide.",
        '"""',
        "",
        "from xlwings import arg, func",
        "",
        "from cellchem.adapters.sheets import lite",
        "",
        f"lite.require({__version__!r})",
    ]
    body: list[str] = []
    for spec in FUNCTIONS.values():
        body += ["", ""] + _declaration(spec)
    return "\n".join(head + body) + "\n"


def wheel_name() -> str:
    """The file name of the cellchem wheel main.py is written for."""
    return f"cellchem-{__version__}-py3-none-any.whl"


def requirement(wheel_url: str | None) -> str:
    """The requirement line for cellchem: the hosted wheel's address, or the release by name (from
    PyPI, or from the private package index a self-hosted xlwings Lite is set up with). An address
    must be http(s) and end in the wheel's file name, of the version main.py is written for."""
    if wheel_url is None:
        return f"cellchem=={__version__}"
    url = wheel_url.strip()
    if not url.lower().startswith(("https://", "http://")):
        raise CellchemError(
            f"wheel address {wheel_url!r}: xlwings Lite downloads packages from inside Excel's add-in "
            "runtime, which reads web addresses only; put the wheel on a web server (an intranet site, "
            "a static file host) and give its https:// address"
        )
    if url.rsplit("/", 1)[-1].split("?", 1)[0] != wheel_name():
        raise CellchemError(
            f"wheel address {wheel_url!r}: expected it to end in {wheel_name()}, the wheel of the "
            f"cellchem ({__version__}) that main.py is written for"
        )
    return url


def requirements(wheel_url: str | None) -> str:
    """The requirements.txt for xlwings Lite: cellchem (see ``requirement``) and sqlite3."""
    return "\n".join([requirement(wheel_url), *EXTRA_REQUIREMENTS]) + "\n"


def instructions(wheel_url: str | None) -> str:
    """What to do with main.py and requirements.txt, in the words of README's section."""
    where = (
        f"requirements.txt installs cellchem from {wheel_url}."
        if wheel_url
        else f"requirements.txt asks for cellchem=={__version__} by name: that works once the release is on "
        "PyPI, or with a self-hosted xlwings Lite whose private package index holds it. Otherwise host "
        "the wheel (step 1) and run `cellchem excel-lite --wheel-url ADDRESS` again."
    )
    return "\n".join(
        [
            f"cellchem {__version__} worksheet functions for Excel through xlwings Lite",
            "",
            where,
            "",
            f"1. Host the wheel {wheel_name()} where Excel can download it: an https:// address on an",
            "   intranet web server or a static file host, served with the header",
            "   Access-Control-Allow-Origin (Excel's add-in runtime is a browser: it cannot read a file",
            "   share path, and it refuses downloads from servers that do not allow other sites). Build",
            "   the wheel from a cellchem checkout with: python -m pip wheel --no-deps . -w dist",
            "2. In Excel: Home > Add-ins, search for xlwings Lite, Add. Open it from the ribbon.",
            "3. In the xlwings Lite pane, replace the text of requirements.txt with this folder's",
            "   requirements.txt; the packages install (the pane's output shows the log).",
            "4. Replace the text of main.py with this folder's main.py and save (Ctrl+S). The functions",
            "   appear as =CELLCHEM.MOLAR_MASS(...) and the others; type =CELLCHEM. to see the list.",
            "",
            "A refused input shows #VALUE!; hover over the cell's error flag for the reason, or use",
            '=CELLCHEM.WHY("MOLAR_MASS", A2) (in a spilled range the reason of each cell is only in WHY).',
            "",
            "Results are checks and aids. For hazards and for making up solutions the supplier's SDS,",
            "local regulations and the site's safety officer decide.",
            "",
        ]
    )
