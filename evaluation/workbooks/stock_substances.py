"""The substances the stock-list workbooks are made of.

Each record is one real compound with the formula, CAS RN and names as catalogues and stock lists print
them. Every CAS RN was checked by its check digit and against the record of the same number in the PyPI
package `chemicals` (PubChem-derived identifier tables): the record's formula must have the same element
counts as the formula below, water of crystallisation included. Molar masses are not stored: the generator
computes them from the formula with `molmass` (IUPAC standard atomic weights). Formulas, CAS RNs and names
were written from memory of handbooks and catalogues (CRC Handbook of Chemistry and Physics, Merck Index,
supplier catalogues: "(from memory)") and kept only where the witness agreed; make_workbooks.verify()
repeats that check on every run.

The records are in stock_substances.csv beside this file; its columns:

    key       a short identifier
    cls       i = inorganic (salts, hydrates, acids, bases, oxides, metals), o = organic (solvents, buffers,
              indicators, sugars, amino acids, organic acids and their salts)
    formula   the formula, hydrate water after a middle dot
    cas       the CAS RN of this very substance (a hydrate's own number)
    names     names as catalogues print them, separated by ";" (each one a correct name of this substance)
    displays  other ways the formula is printed (condensed, Hill, "." for the middle dot), separated by ";"
    group     substances that differ only in water of crystallisation share a group
    confusions  names of ANOTHER compound that a slip turns this name into (sulfite for sulfate, chloride for
              chlorate, another Stock number, another cation), separated by ";" (used to plant errors)
    hazard    a rough pictogram word for the Hazard column (illustrative only, from memory, not checked)
"""

from __future__ import annotations

import csv
from dataclasses import dataclass
from pathlib import Path

CSV_PATH = Path(__file__).resolve().parent / "stock_substances.csv"


@dataclass(frozen=True)
class Substance:
    key: str
    cls: str  # "i" or "o"
    formula: str
    cas: str
    names: tuple[str, ...]
    displays: tuple[str, ...]
    group: str
    confusions: tuple[str, ...]
    hazard: str

    @property
    def organic(self) -> bool:
        return self.cls == "o"

    @property
    def water(self) -> int:
        """Water of crystallisation in the formula (0 for none)."""
        if "·" not in self.formula:
            return 0
        last = self.formula.split("·")[-1]
        if not last.endswith("H2O"):
            return 0
        count = last[: -len("H2O")]
        return int(count) if count else 1

    @property
    def anhydrous_formula(self) -> str:
        """The formula without its water of crystallisation (the formula itself for a non-hydrate)."""
        if self.water == 0:
            return self.formula
        return "·".join(self.formula.split("·")[:-1])


def _split(text: str, sep: str) -> tuple[str, ...]:
    return tuple(part.strip() for part in text.split(sep) if part.strip())


def load() -> list[Substance]:
    """The records of stock_substances.csv ('#' lines are comments)."""
    with open(CSV_PATH, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(line for line in fh if not line.startswith("#")))
    return [
        Substance(
            key=r["key"],
            cls=r["cls"],
            formula=r["formula"],
            cas=r["cas"],
            names=_split(r["names"], ";"),
            displays=_split(r["displays"], ";"),
            group=r["group"],
            confusions=_split(r["confusions"], ";"),
            hazard=r["hazard"],
        )
        for r in rows
    ]
