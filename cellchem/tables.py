"""Load the reference tables in ``cellchem/data`` once, as read-only rows.

Each data file is a CSV whose first lines are ``#`` comments giving its source,
its columns and any deviation from the source (see ``data/SOURCES.md``). This
module only reads them; the modules that use a table give the rows meaning.
"""

from __future__ import annotations

import csv
import io
from functools import cache
from importlib import resources


@cache
def read_table(filename: str) -> tuple[dict[str, str], ...]:
    """The rows of ``cellchem/data/<filename>`` as dicts of stripped strings.

    Lines that start with ``#`` (the cited header) are skipped.
    """
    text = resources.files("cellchem.data").joinpath(filename).read_text(encoding="utf-8")
    lines = [line for line in text.splitlines() if line.strip() and not line.startswith("#")]
    reader = csv.DictReader(io.StringIO("\n".join(lines)))
    rows = []
    for number, row in enumerate(reader, 2):
        if None in row or None in row.values():
            raise ValueError(
                f"data file {filename}: data row {number} has the wrong number of fields (quote a value"
                " holding a comma)"
            )
        rows.append({key.strip(): (value or "").strip() for key, value in row.items()})
    return tuple(rows)


@cache
def table_header(filename: str) -> str:
    """The ``#`` comment lines that open a data file (its citation), as text."""
    text = resources.files("cellchem.data").joinpath(filename).read_text(encoding="utf-8")
    header = []
    for line in text.splitlines():
        if not line.startswith("#"):
            break
        header.append(line[1:].strip())
    return "\n".join(header)


def split_names(cell: str | None) -> tuple[str, ...]:
    """The names in a ``|``-separated cell (``other_names``, ``variants``), stripped."""
    return tuple(name.strip() for name in (cell or "").split("|") if name.strip())
