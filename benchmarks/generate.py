"""Synthetic inventories for the benchmarks (invented data).

A realistic mix for a stores list: compounds repeated from a catalogue of
about sixty, hydrates, names in varied forms (legacy, British, grade words),
some organics and mixtures, and a few defects (a wrong molar mass, a formula
in capitals, a bad CAS check digit). Ten columns. Deterministic for a seed.

    python benchmarks/generate.py 100000 /tmp/inventory-100000.xlsx
"""

from __future__ import annotations

import random
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "workbooks"))


def _header() -> list[str]:
    import make_demos

    return [*make_demos.INVENTORY_HEADER, "Notes"]


VARIANTS = {
    "Copper(II) sulfate pentahydrate": ["Copper sulphate crystals", "Cupric sulfate 5-hydrate, AR"],
    "Iron(III) chloride hexahydrate": ["Ferric chloride hexahydrate", "Iron (III) chloride, 6-hydrate"],
    "Sodium hydrogencarbonate": ["Sodium bicarbonate", "Sodium hydrogen carbonate, GPR"],
    "Aluminium sulfate": ["Aluminum sulfate", "Aluminium sulphate"],
}
ORGANIC = [
    ("Glucose", "C6H12O6", 180.16, "50-99-7"),
    ("Ethanol, absolute", "C2H5OH", 46.07, "64-17-5"),
    ("Universal indicator solution", "", None, ""),
    ("Citric acid monohydrate", "C6H8O7·H2O", 210.14, "5949-29-1"),
]


def rows(count: int, seed: int = 1):
    import make_demos

    from cellchem import molar_mass

    rng = random.Random(seed)
    catalogue = [(n, f, round(float(molar_mass(f)), 2), c) for n, f, c in make_demos.CATALOGUE]
    for i in range(count):
        roll = rng.random()
        if roll < 0.06:
            name, formula, mass, cas = rng.choice(ORGANIC)
        else:
            name, formula, mass, cas = rng.choice(catalogue)
            if name in VARIANTS and rng.random() < 0.5:
                name = rng.choice(VARIANTS[name])
            if rng.random() < 0.3:
                formula = formula.replace("·", ".")
            defect = rng.random()
            if defect < 0.02:
                mass = round(mass * 1.1, 2)
            elif defect < 0.03:
                formula = formula.upper()
            elif defect < 0.04 and cas:
                cas = cas[:-1] + str((int(cas[-1]) + 1) % 10)
        yield [
            f"S-{i + 1:07d}",
            rng.choice(make_demos.LOCATIONS),
            name,
            formula,
            mass,
            cas,
            rng.choice(make_demos.SUPPLIERS),
            rng.choice([25, 100, 500, 1000]),
            "g",
            "",
        ]


def write(count: int, path: Path, seed: int = 1) -> Path:
    from openpyxl import Workbook

    wb = Workbook(write_only=True)
    ws = wb.create_sheet("Stock")
    ws.append(_header())
    for row in rows(count, seed):
        ws.append(row)
    wb.save(path)
    return path


if __name__ == "__main__":
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 10000
    out = Path(sys.argv[2]) if len(sys.argv) > 2 else Path(f"inventory-{n}.xlsx")
    print(write(n, out))
