"""Build the demo files in workbooks/ from the invented data below.

Scenario (invented): the science stores of Kestrel Fen College, a made-up
sixth-form college, with stock from two made-up suppliers, Tarnhollow
Scientific and Quillbrook Reagents. No real site, supplier or person.

Run:  python workbooks/make_demos.py   (a test runs it and compares the output)
"""

from __future__ import annotations

import csv
import io
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent

# Location, item as written on the shelf label, formula as entered, stated
# molar mass (g/mol, as entered), supplier, quantity, unit. Some lines carry the
# defects real lists carry: a wrong molar mass, the anhydrous mass against a
# hydrate formula, a formula in capitals, a typo, an unknown water count.
STOCK_LIST = [
    ("Store B14 shelf 1", "Sodium chloride", "NaCl", "58.44", "Tarnhollow Scientific", "2.5", "kg"),
    (
        "Store B14 shelf 1",
        "Copper(II) sulfate pentahydrate",
        "CuSO4·5H2O",
        "249.68",
        "Quillbrook Reagents",
        "500",
        "g",
    ),
    (
        "Store B14 shelf 1",
        "Copper sulphate crystals",
        "CuSO₄·5H₂O",
        "159.61",
        "Tarnhollow Scientific",
        "1",
        "kg",
    ),
    (
        "Store B14 shelf 2",
        "Magnesium sulfate heptahydrate",
        "MgSO4.7H2O",
        "246.47",
        "Quillbrook Reagents",
        "1",
        "kg",
    ),
    (
        "Store B14 shelf 2",
        "Aluminium potassium sulfate dodecahydrate",
        "KAl(SO4)2·12H2O",
        "474.39",
        "Tarnhollow Scientific",
        "500",
        "g",
    ),
    (
        "Store B14 shelf 2",
        "Ammonium iron(II) sulfate hexahydrate",
        "(NH4)2Fe(SO4)2·6H2O",
        "392.14",
        "Quillbrook Reagents",
        "250",
        "g",
    ),
    (
        "Store B14 shelf 3",
        "Potassium hexacyanidoferrate(II) trihydrate",
        "K4[Fe(CN)6]·3H2O",
        "422.39",
        "Tarnhollow Scientific",
        "100",
        "g",
    ),
    (
        "Store B14 shelf 3",
        "Iron(III) chloride, anhydrous",
        "FeCl3",
        "162.20",
        "Quillbrook Reagents",
        "250",
        "g",
    ),
    ("Store B14 shelf 3", "Iron(II,III) oxide", "Fe3O4", "231.53", "Tarnhollow Scientific", "100", "g"),
    ("Store B14 shelf 4", "Sodium carbonate, hydrated", "Na2CO3·xH2O", "", "Quillbrook Reagents", "1", "kg"),
    ("Store B14 shelf 4", "Sodium hydrogen carbonate", "NaHCO3", "84.01", "Tarnhollow Scientific", "1", "kg"),
    (
        "Store B14 shelf 4",
        "Sodium chloride (typo on intake)",
        "NaCl2",
        "58.44",
        "Tarnhollow Scientific",
        "500",
        "g",
    ),
    (
        "Store B14 shelf 5",
        "Cobalt(II) chloride hexahydrate",
        "co Cl2·6H2O",
        "237.93",
        "Quillbrook Reagents",
        "50",
        "g",
    ),
    ("Store B14 shelf 5", "Copper(II) oxide", "CUO", "79.55", "Quillbrook Reagents", "250", "g"),
    ("Store B14 shelf 5", "Mercury(I) chloride", "Hg2Cl2", "472.09", "Tarnhollow Scientific", "25", "g"),
    ("Store B14 shelf 6", "Potassium manganate(VII)", "KMnO4", "158.03", "Tarnhollow Scientific", "500", "g"),
    ("Store B14 shelf 6", "Potassium dichromate", "K2Cr2O7", "294.18", "Quillbrook Reagents", "100", "g"),
    (
        "Store B14 shelf 6",
        "Calcium sulfate hemihydrate",
        "CaSO4·0.5H2O",
        "145.15",
        "Tarnhollow Scientific",
        "2",
        "kg",
    ),
    (
        "Store B14 shelf 7",
        "Sodium tetraborate decahydrate",
        "Na2B4O7.10H2O",
        "381.37",
        "Quillbrook Reagents",
        "500",
        "g",
    ),
    (
        "Store B14 shelf 7",
        "Sodium acetate trihydrate",
        "CH3COONa·3H2O",
        "136.08",
        "Tarnhollow Scientific",
        "500",
        "g",
    ),
    (
        "Store B14 shelf 7",
        "Barium chloride dihydrate",
        "BaCl2·2H2O",
        "244.26",
        "Quillbrook Reagents",
        "100",
        "g",
    ),
    ("Store B14 shelf 8", "Silver nitrate", "AgNO3", "169.87", "Tarnhollow Scientific", "25", "g"),
    ("Store B14 shelf 8", "Sulfuric acid 98%", "H2SO4", "98.08", "Quillbrook Reagents", "2.5", "L"),
    ("Store B14 shelf 8", "Glucose", "C6H12O6", "180.16", "Tarnhollow Scientific", "1", "kg"),
]

STOCK_HEADER = ("Location", "Item", "Formula", "Molar mass (g/mol)", "Supplier", "Quantity", "Unit")


def stock_list_csv() -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(STOCK_HEADER)
    writer.writerows(STOCK_LIST)
    return buffer.getvalue()


def build(target: Path = HERE) -> list[Path]:
    """Write every demo file into ``target``; return their paths."""
    target.mkdir(parents=True, exist_ok=True)
    path = target / "demo-stock-list.csv"
    path.write_text(stock_list_csv(), encoding="utf-8")
    return [path]


if __name__ == "__main__":
    for written in build(Path(sys.argv[1]) if len(sys.argv) > 1 else HERE):
        print(written)
