"""Substances by CAS Registry Number, from open data.

Data: ``data/substances.sqlite``, built by ``tools/build_substances.py`` from the
PubChem-derived identifier tables of the PyPI package ``chemicals`` (MIT licence;
the data are from PubChem, public domain); its ``meta`` rows give the source, the
edition and the counts. Each record holds a formula in Hill order (the water of
crystallisation counted in: CuSO4·5H2O is CuH10O9S), the record's molecular weight,
a name and the names it is known by. Open data has errors, so every record was
checked against itself when the table was built (formula against weight, hydrate
words against water, cellchem's reading of its name against its formula); a record
that failed is ``certain=False`` with the reason in ``doubt``, and never grounds an
error of the audit.

The table is an indexed SQLite file opened read-only: a lookup costs microseconds
and the table is never loaded into memory.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache, lru_cache
from importlib import resources

from .cas import read_cas
from .errors import CellchemError
from .formula import Formula
from .names import fold_name as _fold_name
from .reading import as_formula

FILE = "substances.sqlite"


@dataclass(frozen=True)
class Substance:
    """One record of the substance table.

    Attributes:
        cas: the CAS RN, e.g. ``'7758-99-8'``.
        formula: the record's formula as cellchem writes it (Hill order, water
            counted in: ``'CuH10O9S'``).
        molar_mass: the record's molecular weight, g/mol.
        name: the record's common name.
        water: water of crystallisation the formula holds, where it reads as a
            salt with water (5 for CuH10O9S), else None.
        certain: False when the record failed a check when the table was built.
        doubt: why it is uncertain ('' when certain).
    """

    cas: str
    formula: str
    molar_mass: float
    name: str
    water: float | None
    certain: bool
    doubt: str

    @property
    def source(self) -> str:
        return edition()


def fold_name(name: str) -> str:
    """A name folded for exact matching: case, Unicode forms, quotes and dashes,
    spaces, and the spellings sulph/sulf, aluminum/aluminium, cesium/caesium.

    >>> fold_name("Copper(II) Sulphate  Pentahydrate")
    'copper(ii) sulfate pentahydrate'
    """
    return _fold_name(name)


def composition_key(formula: str | Formula) -> str:
    """Element counts of a formula, water included, as one order-free text
    ('Cu1H10O9S1' for CuSO4·5H2O and for CuH10O9S alike)."""
    f = as_formula(formula)
    counts = f.counts
    return "".join(f"{s}{_count(n)}" for s, n in sorted(counts.items()))


def _count(n) -> str:
    return str(int(n)) if float(n).is_integer() else str(float(n))


@cache
def _db():
    """The table, opened read-only (sqlite3 is imported here: Pyodide ships it as a separate package)."""
    try:
        import sqlite3
    except ImportError:
        raise CellchemError(
            "the substance table needs Python's sqlite3 module, which this Python lacks; in xlwings Lite, "
            "add the line sqlite3 to requirements.txt"
        ) from None
    path = resources.files("cellchem.data").joinpath(FILE)
    uri = f"file:{resources.as_file(path).__enter__()}?mode=ro&immutable=1"
    db = sqlite3.connect(uri, uri=True, check_same_thread=False)
    return db


@cache
def meta() -> dict[str, str]:
    """The table's ``meta`` rows: source, edition, files, counts, checks."""
    return dict(_db().execute("SELECT key, value FROM meta").fetchall())


def edition() -> str:
    """Where the table comes from, in one line."""
    m = meta()
    return f"{m['edition']} (PubChem data)"


_COLUMNS = "cas, formula, weight, name, water, doubt"


def _row(row) -> Substance:
    cas, formula, weight, name, water, doubt = row
    return Substance(cas, formula, weight, name, water, not doubt, doubt)


@lru_cache(maxsize=65536)
def _by_cas(number: str) -> Substance | None:
    row = (
        _db()
        .execute(f"SELECT {_COLUMNS} FROM substances WHERE id = ?", (int(number.replace("-", "")),))
        .fetchone()
    )
    return _row(row) if row else None


def substance(cas: object) -> Substance | None:
    """The substance a CAS RN belongs to, or None when the table does not hold it.

    Args:
        cas: a CAS RN in any form ``read_cas`` accepts ('7758-99-8', '7758998').

    Raises:
        CellchemError: the CAS RN is malformed or its check digit is wrong.

    >>> s = substance("7758-99-8")
    >>> s.formula, round(s.molar_mass, 2), s.water
    ('CuH10O9S', 249.69, 5.0)
    """
    return _by_cas(read_cas(cas).number)


@lru_cache(maxsize=65536)
def _by_name(folded: str) -> tuple[tuple[Substance, str], ...]:
    rows = (
        _db()
        .execute(
            "SELECT s.cas, s.formula, s.weight, s.name, s.water, s.doubt, n.kind FROM names n"
            " JOIN substances s ON s.id = n.id WHERE n.name = ? ORDER BY s.id",
            (folded,),
        )
        .fetchall()
    )
    return tuple((_row(r[:6]), "synonym" if r[6] else "name") for r in rows)


def find_substances(name: str) -> tuple[Substance, ...]:
    """The substances whose name, or one of the names their record gives, is this
    name exactly (case, spelling and Unicode forms folded; no fuzzy matching).
    More than one means the name is shared: a caller must not pick one.

    >>> [s.cas for s in find_substances("Ethanol")]
    ['64-17-5']
    """
    if not isinstance(name, str) or not name.strip():
        raise CellchemError("no name given (the text is empty)")
    return tuple(s for s, _ in _by_name(fold_name(name)))


def name_match(name: str) -> tuple[Substance, str] | None:
    """The one substance a name matches exactly and how ('name': the record's own
    name or IUPAC name; 'synonym': one of its other names), or None when none or
    several match."""
    found = _by_name(fold_name(name))
    if len({s.cas for s, _ in found}) != 1:
        return None
    best = min(found, key=lambda item: item[1] != "name")
    return best[0], ("synonym" if best[1] == "synonym" else "name")


@lru_cache(maxsize=65536)
def by_composition(formula: str | Formula) -> tuple[Substance, ...]:
    """The substances whose formula has exactly these element counts (water
    included): the CAS RNs a line's formula may carry.

    >>> [s.cas for s in by_composition("CuSO4·5H2O")]
    ['7758-99-8']
    """
    key = composition_key(formula)
    rows = (
        _db()
        .execute(f"SELECT {_COLUMNS} FROM substances WHERE composition = ? ORDER BY id", (key,))
        .fetchall()
    )
    return tuple(_row(r) for r in rows)


__all__ = [
    "Substance",
    "by_composition",
    "composition_key",
    "edition",
    "find_substances",
    "fold_name",
    "meta",
    "name_match",
    "substance",
]
