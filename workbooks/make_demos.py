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


# ---------------------------------------------------------------------------
# The inventory workbook and the supplier table (the audit's demo)
# ---------------------------------------------------------------------------

# The stores' catalogue: name as the stores write it, formula, CAS RN. CAS RNs
# are recalled (from memory) and each passes its check digit; they identify
# the compounds, they are not anyone's data.
CATALOGUE = [
    ("Sodium chloride", "NaCl", "7647-14-5"),
    ("Potassium chloride", "KCl", "7447-40-7"),
    ("Calcium chloride dihydrate", "CaCl2·2H2O", "10035-04-8"),
    ("Magnesium sulfate heptahydrate", "MgSO4·7H2O", "10034-99-8"),
    ("Copper(II) sulfate pentahydrate", "CuSO4·5H2O", "7758-99-8"),
    ("Iron(II) sulfate heptahydrate", "FeSO4·7H2O", "7782-63-0"),
    ("Iron(III) chloride hexahydrate", "FeCl3·6H2O", "10025-77-1"),
    ("Zinc sulfate heptahydrate", "ZnSO4·7H2O", "7446-20-0"),
    ("Sodium hydrogencarbonate", "NaHCO3", "144-55-8"),
    ("Sodium carbonate, anhydrous", "Na2CO3", "497-19-8"),
    ("Calcium carbonate", "CaCO3", "471-34-1"),
    ("Sodium hydroxide pellets", "NaOH", "1310-73-2"),
    ("Potassium hydroxide", "KOH", "1310-58-3"),
    ("Calcium hydroxide", "Ca(OH)2", "1305-62-0"),
    ("Potassium nitrate", "KNO3", "7757-79-1"),
    ("Sodium nitrate", "NaNO3", "7631-99-4"),
    ("Silver nitrate", "AgNO3", "7761-88-8"),
    ("Lead(II) nitrate", "Pb(NO3)2", "10099-74-8"),
    ("Ammonium chloride", "NH4Cl", "12125-02-9"),
    ("Ammonium sulfate", "(NH4)2SO4", "7783-20-2"),
    ("Ammonium nitrate", "NH4NO3", "6484-52-2"),
    ("Potassium iodide", "KI", "7681-11-0"),
    ("Potassium bromide", "KBr", "7758-02-3"),
    ("Sodium thiosulfate pentahydrate", "Na2S2O3·5H2O", "10102-17-7"),
    ("Potassium manganate(VII)", "KMnO4", "7722-64-7"),
    ("Potassium dichromate", "K2Cr2O7", "7778-50-9"),
    ("Potassium chromate", "K2CrO4", "7789-00-6"),
    ("Barium chloride dihydrate", "BaCl2·2H2O", "10326-27-9"),
    ("Aluminium sulfate", "Al2(SO4)3", "10043-01-3"),
    ("Aluminium potassium sulfate dodecahydrate", "KAl(SO4)2·12H2O", "7784-24-9"),
    ("Ammonium iron(II) sulfate hexahydrate", "(NH4)2Fe(SO4)2·6H2O", "7783-85-9"),
    ("Potassium hexacyanidoferrate(II) trihydrate", "K4[Fe(CN)6]·3H2O", "14459-95-1"),
    ("Potassium hexacyanidoferrate(III)", "K3[Fe(CN)6]", "13746-66-2"),
    ("Cobalt(II) chloride hexahydrate", "CoCl2·6H2O", "7791-13-1"),
    ("Nickel(II) sulfate hexahydrate", "NiSO4·6H2O", "10101-97-0"),
    ("Manganese(II) sulfate monohydrate", "MnSO4·H2O", "10034-96-5"),
    ("Copper(II) oxide", "CuO", "1317-38-0"),
    ("Magnesium oxide", "MgO", "1309-48-4"),
    ("Zinc oxide", "ZnO", "1314-13-2"),
    ("Iron(III) oxide", "Fe2O3", "1309-37-1"),
    ("Manganese(IV) oxide", "MnO2", "1313-13-9"),
    ("Mercury(II) chloride", "HgCl2", "7487-94-7"),
    ("Sodium sulfate, anhydrous", "Na2SO4", "7757-82-6"),
    ("Sodium sulfite", "Na2SO3", "7757-83-7"),
    ("Sodium acetate trihydrate", "CH3COONa·3H2O", "6131-90-4"),
    ("Sodium tetraborate decahydrate", "Na2B4O7·10H2O", "1303-96-4"),
    ("Disodium hydrogenphosphate dodecahydrate", "Na2HPO4·12H2O", "10039-32-4"),
    ("Sodium dihydrogenphosphate dihydrate", "NaH2PO4·2H2O", "13472-35-0"),
    ("Potassium dihydrogenphosphate", "KH2PO4", "7778-77-0"),
    ("Calcium sulfate dihydrate", "CaSO4·2H2O", "10101-41-4"),
    ("Strontium chloride hexahydrate", "SrCl2·6H2O", "10025-70-4"),
    ("Lithium chloride", "LiCl", "7447-41-8"),
    ("Tin(II) chloride dihydrate", "SnCl2·2H2O", "10025-69-1"),
    ("Sodium fluoride", "NaF", "7681-49-4"),
    ("Potassium iodate", "KIO3", "7758-05-6"),
    ("Potassium chlorate", "KClO3", "3811-04-9"),
    ("Hydrochloric acid 36%", "HCl", "7647-01-0"),
    ("Sulfuric acid 98%", "H2SO4", "7664-93-9"),
    ("Nitric acid 70%", "HNO3", "7697-37-2"),
    ("Ammonia solution 35%", "NH3", "7664-41-7"),
]

# Lines the audit reads but cannot name-check: organics, mixtures, kits.
NOT_INORGANIC = [
    ("Glucose", "C6H12O6", "50-99-7"),
    ("Ethanol, absolute", "C2H5OH", "64-17-5"),
    ("Universal indicator solution", "", ""),
    ("pH 7 buffer solution", "", ""),
    ("Benedict's reagent", "", ""),
    ("Starch, soluble", "", "9005-84-9"),
]

LOCATIONS = [
    "Prep room A cupboard 1",
    "Prep room A cupboard 2",
    "Store B14 shelf 1",
    "Store B14 shelf 2",
    "Store B14 shelf 3",
    "Acids cabinet C2",
    "Oxidisers cabinet C3",
    "Poisons cabinet C4",
    "Lab 3 fume cupboard",
]
SUPPLIERS = ["Tarnhollow Scientific", "Quillbrook Reagents", "Marrowdene Lab Supply"]

# Seeded discrepancies: (name, formula, stated molar mass, CAS RN, what the audit should find)
SEEDED = [
    ("Copper(II) oxide", "CUO", 79.55, "1317-38-0", "capitals read as U, C, O"),
    ("Cobalt(II) chloride hexahydrate", "co Cl2·6H2O", 237.93, "7791-13-1", "formula does not read"),
    ("Sodium chloride", "NaCl2", 58.44, "7647-14-5", "formula not balanced"),
    ("Copper(II) sulfate pentahydrate", "CuSO4", 249.68, "7758-99-8", "name and formula differ in water"),
    ("Iron(II) chloride", "FeCl3", 162.2, "7705-08-0", "a different charge"),
    ("Sodium sulfite", "Na2SO4", 142.04, "7757-82-6", "a different ion"),
    ("Calcium hydroxide", "CaOH2", 74.09, "1305-62-0", "missing parentheses"),
    ("Potasium nitrate", "KNO3", 101.1, "7757-79-1", "misspelled name (a note)"),
    ("Copper sulphate crystals", "CuSO₄·5H₂O", 249.68, "7758-99-8", "open charge settled (a note)"),
    ("Magnesium sulfate", "MgSO4·7H2O", 246.47, "10034-99-8", "name silent about the hydrate"),
    ("Potassium chloride", "KCl", 75.55, "7447-40-7", "wrong molar mass"),
    ("Magnesium sulfate, anhydrous", "MgSO4", 246.47, "7487-88-9", "molar mass of the heptahydrate"),
    (
        "Copper(II) sulfate pentahydrate",
        "CuSO4·5H2O",
        159.61,
        "7758-99-8",
        "molar mass of the anhydrous salt",
    ),
    ("Potassium iodide", "KI", 166.0, "7681-11-1", "CAS check digit wrong"),
    ("Sodium hydroxide pellets", "NaOH", 40.0, "1310732", "CAS without hyphens (a note)"),
    ("Zinc oxide", "ZnO", 81.38, "1314-13", "CAS malformed"),
    ("Sodium carbonate, hydrated", "Na2CO3·xH2O", None, "", "unknown water count"),
    ("Iron chloride", "FeBr3", 295.56, "", "open charge that fits no reading"),
    ("Sodium chloride", "KCl", 74.55, "7447-40-7", "a different cation"),
    ("Potassium chloride", "KCl", 74.55, "7647-14-5", "CAS of another substance"),
    ("Calcium chloride dihydrate", "CaCl2·2H2O", 147.01, "10043-52-4", "CAS of the anhydrous salt"),
    ("Sodium nitrate", "NaNO3", 84.99, "7613-99-4", "CAS digits swapped"),
    ("Ethanol, absolute", "C2H6O2", 46.07, "64-17-5", "organic formula against name, CAS and molar mass"),
    ("Acetone", "C3H6O", 58.08, "67-56-1", "organic CAS of another substance"),
]


def _inventory_rows() -> list[list[object]]:
    import random

    from cellchem import molar_mass

    rng = random.Random(20261202)
    rows: list[list[object]] = []
    number = 1
    for round_ in range(4):
        for name, formula, cas in CATALOGUE:
            mass = round(float(molar_mass(formula)), 2)
            qty = rng.choice([25, 50, 100, 250, 500, 1000, 2500])
            unit = "g" if formula not in ("HCl", "H2SO4", "HNO3", "NH3") else "mL"
            rows.append(
                [
                    f"KF-{number:04d}",
                    rng.choice(LOCATIONS),
                    name,
                    formula if round_ % 2 == 0 else formula.replace("·", "."),
                    mass,
                    cas,
                    rng.choice(SUPPLIERS),
                    qty,
                    unit,
                ]
            )
            number += 1
        for name, formula, cas in NOT_INORGANIC:
            mass = round(float(molar_mass(formula)), 2) if formula else None
            rows.append(
                [
                    f"KF-{number:04d}",
                    rng.choice(LOCATIONS),
                    name,
                    formula,
                    mass,
                    cas,
                    rng.choice(SUPPLIERS),
                    500,
                    "mL",
                ]
            )
            number += 1
    # the seeded lines, spread through the list at fixed places
    for i, (name, formula, mass, cas, _why) in enumerate(SEEDED):
        at = 7 + i * 11
        rows.insert(
            at,
            [
                f"KF-9{i:03d}",
                LOCATIONS[i % len(LOCATIONS)],
                name,
                formula,
                mass,
                cas,
                SUPPLIERS[i % 3],
                100,
                "g",
            ],
        )
    return rows


INVENTORY_HEADER = [
    "Stock no.",
    "Location",
    "Item",
    "Formula",
    "Mol. wt. (g/mol)",
    "CAS No.",
    "Supplier",
    "Qty",
    "Unit",
]


def _fixed_zip(path: Path) -> None:
    """Rewrite a workbook package with fixed member times and a fixed
    modification date, so the demo file is the same bytes on every build."""
    import re
    import zipfile

    with zipfile.ZipFile(path) as z:
        members = [(info, z.read(info.filename)) for info in z.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        for info, data in members:
            if info.filename == "docProps/core.xml":
                data = re.sub(
                    rb"<dcterms:modified([^>]*)>[^<]*<", rb"<dcterms:modified\1>2026-01-05T09:00:00Z<", data
                )
                data = re.sub(
                    rb"<dcterms:created([^>]*)>[^<]*<", rb"<dcterms:created\1>2026-01-05T09:00:00Z<", data
                )
            fixed = zipfile.ZipInfo(info.filename, date_time=(2026, 1, 5, 9, 0, 0))
            fixed.compress_type = zipfile.ZIP_DEFLATED
            z.writestr(fixed, data)


def inventory_workbook(path: Path) -> None:
    """The stores' inventory: a 'Stock' sheet with a title above the header, a
    'Read me' sheet with no table, and a hidden 'Old stock 2019' sheet."""
    from openpyxl import Workbook
    from openpyxl.styles import Font

    wb = Workbook()
    ws = wb.active
    ws.title = "Stock"
    ws.append(["Kestrel Fen College - science stores inventory"])
    ws["A1"].font = Font(bold=True, size=14)
    ws.append(["Checked by the stores team, January 2026 (invented demo data)"])
    ws.append([])
    ws.append(INVENTORY_HEADER)
    for cell in ws[4]:
        cell.font = Font(bold=True)
    for row in _inventory_rows():
        ws.append(row)
    ws.freeze_panes = "A5"
    readme = wb.create_sheet("Read me")
    readme.append(["This workbook is invented demo data for cellchem."])
    readme.append(
        ["Kestrel Fen College, Tarnhollow Scientific, Quillbrook Reagents and Marrowdene Lab Supply"]
    )
    readme.append(["are made-up names."])
    old = wb.create_sheet("Old stock 2019")
    old.append(["Item", "Formula", "MW"])
    old.append(["Sodium chloride", "NaCl", 58.44])
    old.append(["Copper sulfate", "CuSO4", 100])
    old.sheet_state = "hidden"
    wb.properties.creator = "Kestrel Fen College stores (invented)"
    wb.save(path)
    _fixed_zip(path)


SUPPLIER_HEADER = [
    "Cat. no.",
    "Product description",
    "Mol. formula",
    "Mol. wt.",
    "CAS-No.",
    "Pack size",
    "Unit",
    "Price GBP",
]


def supplier_table_csv() -> bytes:
    """A supplier's price list as a European export: semicolons, decimal
    commas, cp1252, two title lines above the header."""
    import random

    from cellchem import molar_mass

    rng = random.Random(7)
    buffer = io.StringIO()
    writer = csv.writer(buffer, delimiter=";", lineterminator="\r\n")
    writer.writerow(["Quillbrook Reagents - price list 2026 (invented demo data)"])
    writer.writerow(["Prices in GBP, excl. VAT; µ = micro; 5 °C storage where marked"])
    writer.writerow(SUPPLIER_HEADER)
    for i, (name, formula, cas) in enumerate(CATALOGUE[:40]):
        mass = f"{float(molar_mass(formula)):.2f}".replace(".", ",")
        writer.writerow(
            [
                f"QR-{1000 + i}",
                f"{name}, AR grade",
                formula,
                mass,
                cas,
                rng.choice([100, 250, 500]),
                "g",
                f"{rng.uniform(4, 60):.2f}".replace(".", ","),
            ]
        )
    seeded = [
        ("QR-2001", "Sodium chloride, min. 99.5 %", "NaCl", "58,44", "7647-14-5"),
        ("QR-2002", "Copper(II) sulphate, 5-hydrate", "CuSO4.5H2O", "159,61", "7758-99-8"),
        ("QR-2003", "Ferric chloride, anhydrous", "FeCl3", "162,20", "7705-08-0"),
        ("QR-2004", "Cupric nitrate trihydrate", "Cu(NO3)2.3H2O", "241,60", "10031-43-3"),
        ("QR-2005", "Sodium bicarbonate", "NaHCO3", "84,01", "144-55-9"),
        ("QR-2006", "Potassium permanganate", "KMnO4", "158,03", "7722-64-7"),
        ("QR-2007", "Sodium sulphite", "Na2SO4", "126,04", "7757-83-7"),
        ("QR-2008", "Calcium chloride, fused", "CaCl2", "147,01", "10043-52-4"),
        ("QR-2009", "Ammonium ferrous sulfate", "(NH4)2Fe(SO4)2·6H2O", "392,14", "7783-85-9"),
        ("QR-2010", "Lab detergent concentrate", "", "", ""),
    ]
    for cat, name, formula, mass, cas in seeded:
        writer.writerow([cat, name, formula, mass, cas, 500, "g", "9,99"])
    return buffer.getvalue().encode("cp1252")


# ---------------------------------------------------------------------------
# The worksheet-functions demo
# ---------------------------------------------------------------------------

# Each row: a label, then a formula that uses one function on the stock list
# above it (rows 4-9). The Excel and LibreOffice layers compute them; a test
# evaluates them with an independent formula engine and compares with the core.
FUNCTION_DEMOS = [
    ("Formula from the name", "=CELLCHEM.FORMULA(A5)"),
    ("Systematic name", "=CELLCHEM.NAME(B6)"),
    ("Legacy name", '=CELLCHEM.NAME(B7,"legacy")'),
    ("Salt of Al3+ and sulfate", '=CELLCHEM.SALT("Al3+","sulfate")'),
    ("Molar mass (g/mol)", "=CELLCHEM.MOLAR_MASS(B5)"),
    ("Mass fraction of Cu", '=CELLCHEM.MASS_FRACTION(B5,"Cu")'),
    ("Net charge of SO4 2-", '=CELLCHEM.NET_CHARGE("SO4 2-")'),
    ("Oxidation state of Mn", '=CELLCHEM.OXIDATION_STATE(B8,"Mn")'),
    ("Balanced?", "=CELLCHEM.CHARGES_BALANCE(B9)"),
    ("Line check", "=CELLCHEM.CHECK_LINE(A9,B9,C9,D9)"),
    ("CAS RN valid?", "=CELLCHEM.CAS_VALID(D6)"),
    ("Formula the substance table holds for the CAS RN", '=CELLCHEM.SUBSTANCE(D5,"formula")'),
    ("Ionic strength (mol/L)", '=CELLCHEM.IONIC_STRENGTH("MgCl2",0.1)'),
    ("Activity of Ca2+ at I = 0.01", '=CELLCHEM.ACTIVITY_COEFFICIENT("Ca2+",0.01,"extended")'),
    ("Conductivity of 0.01 M KCl (uS/cm)", '=CELLCHEM.CONDUCTIVITY("KCl",0.01)'),
    (
        "Grams of CuSO4.5H2O for 250 mL of 0.1 M CuSO4",
        '=CELLCHEM.GRAMS_TO_WEIGH("CuSO4",0.1,"250 mL",1,"CuSO4.5H2O")',
    ),
    ("37 % w/w HCl (1.18 g/mL) in mol/L", '=CELLCHEM.CONVERT_CONCENTRATION(37,"% w/w","mol/L","HCl",1.18)'),
    ("A refusal: molar mass of a formula with a typo", '=CELLCHEM.MOLAR_MASS(B9&"Xx")'),
    ("Why it was refused", '=CELLCHEM.WHY("MOLAR_MASS",B9&"Xx")'),
]
FUNCTION_STOCK = [
    ("Item", "Formula", "MW", "CAS No."),
    ("Copper(II) sulfate pentahydrate", "CuSO4·5H2O", 249.68, "7758-99-8"),
    ("Sodium chloride", "NaCl", 58.44, "7647-14-5"),
    ("Ferric chloride", "FeCl3", 162.2, "7705-08-0"),
    ("Potassium manganate(VII)", "KMnO4", 158.03, "7722-64-7"),
    ("Sodium chloride", "NaCl2", 58.44, "7647-14-5"),
]


def functions_workbook(path: Path) -> None:
    """A sheet using every cellchem function on a short invented stock list, with
    the range forms (a column of molar masses, the spilled ions of a salt)."""
    from openpyxl import Workbook
    from openpyxl.styles import Font
    from openpyxl.worksheet.formula import ArrayFormula

    wb = Workbook()
    ws = wb.active
    ws.title = "Functions"
    ws.append(["cellchem worksheet functions - Kestrel Fen College stores (invented demo data)"])
    ws["A1"].font = Font(bold=True, size=14)
    ws.append(["Install the cellchem functions (README, Worksheet functions) to compute the cells below."])
    ws.append([])
    for row in FUNCTION_STOCK:
        ws.append(list(row))
    for cell in ws[4]:
        cell.font = Font(bold=True)
    ws["E4"] = "Molar mass (range)"
    ws["E4"].font = Font(bold=True)
    ws["E5"] = ArrayFormula("E5:E9", "=CELLCHEM.MOLAR_MASS(B5:B9)")
    ws.append([])
    start = ws.max_row + 1
    ws.cell(row=start, column=1, value="What").font = Font(bold=True)
    ws.cell(row=start, column=2, value="Result").font = Font(bold=True)
    ws.cell(row=start, column=3, value="Formula used").font = Font(bold=True)
    for i, (label, formula) in enumerate(FUNCTION_DEMOS, start + 1):
        ws.cell(row=i, column=1, value=label)
        ws.cell(row=i, column=2, value=formula)
        text = ws.cell(row=i, column=3, value=formula)
        text.data_type = "s"  # shown as text beside the live formula
        text.quotePrefix = True
    row = start + len(FUNCTION_DEMOS) + 2
    ws.cell(row=row, column=1, value="Ions of Al2(SO4)3 (spilled)")
    ws.cell(row=row, column=2).value = ArrayFormula(f"B{row}:D{row + 1}", '=CELLCHEM.IONS("Al2(SO4)3")')
    row += 3
    ws.cell(row=row, column=1, value="Ion balance (meq/L)")
    for k, (ion, value) in enumerate([("Ca2+", 2.0), ("Mg2+", 1.0), ("HCO3-", 2.5), ("Cl-", 0.45)]):
        ws.cell(row=row + 1 + k, column=1, value=ion)
        ws.cell(row=row + 1 + k, column=2, value=value)
    ws.cell(row=row, column=3).value = ArrayFormula(
        f"C{row}:F{row}", f'=CELLCHEM.ION_BALANCE(A{row + 1}:A{row + 4},B{row + 1}:B{row + 4},"meq/L")'
    )
    ws.column_dimensions["A"].width = 46
    ws.column_dimensions["B"].width = 30
    ws.column_dimensions["C"].width = 50
    wb.save(path)
    _fixed_zip(path)


# LibreOffice Calc reads add-in functions in OpenDocument files by their
# programmatic names, and Calc's names for them (CELLCHEM_MOLAR_MASS) differ
# from Excel's (CELLCHEM.MOLAR_MASS; README, Worksheet functions), so the demo
# has an .ods twin.


def _odf_formula(formula: str) -> str:
    """An Excel formula (=CELLCHEM.X_Y(B5,"a")) in OpenFormula (of:=ORG...XY([.B5];"a"))."""
    import re

    from cellchem.adapters.sheets.calc.component import IMPLEMENTATION, method_name

    out = []
    for token in re.findall(
        r'"[^"]*"|CELLCHEM\.[A-Z_]+|[A-Z]+[0-9]+(?::[A-Z]+[0-9]+)?|.', formula.lstrip("=")
    ):
        if token.startswith('"'):
            out.append(token)
        elif token.startswith("CELLCHEM."):
            out.append(f"{IMPLEMENTATION}.{method_name(token.removeprefix('CELLCHEM.'))}".upper())
        elif re.fullmatch(r"[A-Z]+[0-9]+(?::[A-Z]+[0-9]+)?", token):
            out.append("[" + ":".join("." + part for part in token.split(":")) + "]")
        elif token == ",":
            out.append(";")
        else:
            out.append(token)
    return "of:=" + "".join(out)


def functions_ods(xlsx: Path, path: Path) -> None:
    """The functions demo as an OpenDocument spreadsheet for LibreOffice Calc:
    the same cells as the .xlsx (read back from it), formulas in OpenFormula."""
    import zipfile
    from xml.sax.saxutils import escape, quoteattr

    from openpyxl import load_workbook
    from openpyxl.utils import range_boundaries
    from openpyxl.worksheet.formula import ArrayFormula

    ws = load_workbook(xlsx).active
    rows = []
    for r in range(1, ws.max_row + 1):
        cells = []
        for c in range(1, ws.max_column + 1):
            v = ws.cell(row=r, column=c).value
            if isinstance(v, ArrayFormula):
                c1, r1, c2, r2 = range_boundaries(v.ref)
                span = (
                    f' table:number-matrix-columns-spanned="{c2 - c1 + 1}"'
                    f' table:number-matrix-rows-spanned="{r2 - r1 + 1}"'
                )
                cells.append(f"<table:table-cell table:formula={quoteattr(_odf_formula(v.text))}{span}/>")
            elif isinstance(v, str) and v.startswith("=") and ws.cell(row=r, column=c).data_type == "f":
                cells.append(f"<table:table-cell table:formula={quoteattr(_odf_formula(v))}/>")
            elif isinstance(v, int | float):
                cells.append(
                    f'<table:table-cell office:value-type="float" office:value="{v!r}">'
                    f"<text:p>{v}</text:p></table:table-cell>"
                )
            elif v is not None:
                cells.append(
                    '<table:table-cell office:value-type="string">'
                    f"<text:p>{escape(str(v))}</text:p></table:table-cell>"
                )
            else:
                cells.append("<table:table-cell/>")
        rows.append("<table:table-row>" + "".join(cells) + "</table:table-row>")
    ns = (
        'xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" '
        'xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" '
        'xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0" '
        'xmlns:of="urn:oasis:names:tc:opendocument:xmlns:of:1.2" office:version="1.3"'
    )
    content = (
        f'<?xml version="1.0" encoding="UTF-8"?>\n<office:document-content {ns}>'
        "<office:body><office:spreadsheet>"
        f'<table:table table:name="{ws.title}">' + "".join(rows) + "</table:table>"
        "</office:spreadsheet></office:body></office:document-content>\n"
    )
    manifest = (
        '<?xml version="1.0" encoding="UTF-8"?>\n'
        '<manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0"'
        ' manifest:version="1.3"><manifest:file-entry manifest:full-path="/"'
        ' manifest:media-type="application/vnd.oasis.opendocument.spreadsheet"/>'
        '<manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/>'
        "</manifest:manifest>\n"
    )
    with zipfile.ZipFile(path, "w") as z:
        for name, data, method in (
            ("mimetype", "application/vnd.oasis.opendocument.spreadsheet", zipfile.ZIP_STORED),
            ("content.xml", content, zipfile.ZIP_DEFLATED),
            ("META-INF/manifest.xml", manifest, zipfile.ZIP_DEFLATED),
        ):
            info = zipfile.ZipInfo(name, date_time=(2026, 1, 5, 9, 0, 0))
            info.compress_type = method
            z.writestr(info, data)


# ---------------------------------------------------------------------------
# The supplier's SDS summary and the store with locations (cellchem survey)
# ---------------------------------------------------------------------------

SDS_HEADER = [
    "Product name",
    "Formula",
    "CAS No.",
    "EC No.",
    "UN No.",
    "Signal word",
    "Hazard statements",
    "Precautionary statements",
    "Pictograms",
]
# Each line as the SDS gives it (EC numbers, UN numbers and GHS statements as suppliers print them,
# from memory); the planted inconsistencies are marked, and tests/test_survey.py checks each is found.
SDS_LINES = [
    (
        "Hydrochloric acid 37%",
        "HCl",
        "7647-01-0",
        "231-595-7",
        "UN1789",
        "Danger",
        "H290, H314, H335",
        "P260, P280, P303+P361+P353, P305+P351+P338",
        "GHS05, GHS07",
    ),
    (
        "Sulfuric acid 96%",
        "H2SO4",
        "7664-93-9",
        "231-639-5",
        "UN1830",
        "Danger",
        "H290, H314",
        "P280, P301+P330+P331, P305+P351+P338",
        "GHS05",
    ),
    # planted: the UN number of hydrochloric acid
    (
        "Nitric acid 65%",
        "HNO3",
        "7697-37-2",
        "231-714-2",
        "UN1789",
        "Danger",
        "H272, H290, H314",
        "P210, P280",
        "GHS03, GHS05",
    ),
    # planted: H314 carries Danger
    (
        "Sodium hydroxide pellets",
        "NaOH",
        "1310-73-2",
        "215-185-5",
        "UN1823",
        "Warning",
        "H290, H314",
        "P280, P305+P351+P338",
        "GHS05",
    ),
    # planted: H319 and H336 carry GHS07, which is missing
    (
        "Acetone",
        "C3H6O",
        "67-64-1",
        "200-662-2",
        "UN1090",
        "Danger",
        "H225, H319, H336, EUH066",
        "P210, P233, P305+P351+P338",
        "GHS02",
    ),
    # planted: the EC number's check digit (200-578-6)
    (
        "Ethanol absolute",
        "C2H6O",
        "64-17-5",
        "200-578-7",
        "UN1170",
        "Danger",
        "H225, H319",
        "P210, P233",
        "GHS02, GHS07",
    ),
    ("Sodium chloride", "NaCl", "7647-14-5", "231-598-3", "", "", "", "", ""),
    (
        "Potassium permanganate",
        "KMnO4",
        "7722-64-7",
        "231-760-3",
        "UN1490",
        "Danger",
        "H272, H302, H410",
        "P210, P220, P273",
        "GHS03, GHS07, GHS09",
    ),
    # planted: only Warning statements, yet Danger
    (
        "Ammonium chloride",
        "NH4Cl",
        "12125-02-9",
        "235-186-4",
        "",
        "Danger",
        "H302, H319",
        "P264, P270, P301+P312",
        "GHS07",
    ),
    (
        "Hydrogen peroxide 30%",
        "H2O2",
        "7722-84-1",
        "231-765-0",
        "UN2014",
        "Danger",
        "H302, H318, H412",
        "P280, P305+P351+P338+P310",
        "GHS05, GHS07",
    ),
    (
        "Potassium cyanide",
        "KCN",
        "151-50-8",
        "205-792-3",
        "UN1680",
        "Danger",
        "H290, H300+H310+H330, H372, H410, EUH032",
        "P260, P264, P273, P280, P301+P310",
        "GHS05, GHS06, GHS08, GHS09",
    ),
    # planted: a combination of a P2xx and a P3xx statement
    (
        "Sodium azide",
        "NaN3",
        "26628-22-8",
        "247-852-1",
        "UN1687",
        "Danger",
        "H300, H373, H410, EUH032",
        "P264, P273+P301",
        "GHS06, GHS08, GHS09",
    ),
    # planted: GHS06, which no statement carries
    (
        "Silver nitrate",
        "AgNO3",
        "7761-88-8",
        "231-853-9",
        "UN1493",
        "Danger",
        "H272, H314, H410",
        "P210, P280",
        "GHS03, GHS05, GHS06, GHS09",
    ),
    (
        "Toluene",
        "C7H8",
        "108-88-3",
        "203-625-9",
        "UN1294",
        "Danger",
        "H225, H304, H315, H336, H361d, H373",
        "P210, P301+P310, P331",
        "GHS02, GHS07, GHS08",
    ),
    (
        "Barium chloride dihydrate",
        "BaCl2·2H2O",
        "10326-27-9",
        "233-788-1",
        "UN1564",
        "Danger",
        "H301, H332",
        "P264, P301+P310",
        "GHS06",
    ),
    ("Zinc oxide", "ZnO", "1314-13-2", "215-222-5", "UN3077", "Warning", "H410", "P273, P391, P501", "GHS09"),
    (
        "Mercury(II) chloride",
        "HgCl2",
        "7487-94-7",
        "231-299-8",
        "UN1624",
        "Danger",
        "H300, H314, H341, H361f, H372, H410",
        "P260, P264, P280",
        "GHS05, GHS06, GHS08, GHS09",
    ),
    ("Calcium carbonate", "CaCO3", "471-34-1", "207-439-9", "", "", "", "", ""),
    (
        "Lead(II) nitrate",
        "Pb(NO3)2",
        "10099-74-8",
        "233-245-9",
        "UN1469",
        "Danger",
        "H272, H302+H332, H318, H360Df, H373, H410",
        "P201, P210, P273",
        "GHS03, GHS05, GHS07, GHS08, GHS09",
    ),
    ("Sodium thiosulfate pentahydrate", "Na2S2O3·5H2O", "10102-17-7", "231-867-5", "", "", "", "", ""),
    # planted: a letter l where the digit 1 belongs
    ("Magnesium sulfate heptahydrate", "MgSO4·7H2O", "10034-99-8", "231-298-2", "", "", "H3l9", "", ""),
    # planted: a code the GHS does not have
    ("D(+)-Glucose", "C6H12O6", "50-99-7", "200-075-1", "", "Warning", "H999", "", "GHS07"),
    # planted: an EC number with a digit missing
    (
        "Calcium chloride dihydrate",
        "CaCl2·2H2O",
        "10035-04-8",
        "233-140",
        "",
        "Warning",
        "H319",
        "P305+P351+P338",
        "GHS07",
    ),
]

STORE_HEADER = ["Location", "Item", "Formula", "CAS No.", "Pack size", "No. of packs", "Hazard statements"]
# (location, item, formula, CAS RN, pack size, packs, H statements); the planted questions are marked
STORE_SHEETS = {
    "Chemistry store": [
        ("Acids cabinet C2", "Hydrochloric acid 37%", "HCl", "7647-01-0", "2.5 L", 2, "H290, H314, H335"),
        ("Acids cabinet C2", "Sulfuric acid 96%", "H2SO4", "7664-93-9", "2.5 L", 1, "H290, H314"),
        ("Acids cabinet C2", "Nitric acid 65%", "HNO3", "7697-37-2", "1 L", 1, "H272, H290, H314"),
        # planted: a cyanide among the acids
        (
            "Acids cabinet C2",
            "Potassium cyanide",
            "KCN",
            "151-50-8",
            "100 g",
            1,
            "H290, H300+H310+H330, H372, H410",
        ),
        (
            "Oxidisers cabinet C3",
            "Potassium permanganate",
            "KMnO4",
            "7722-64-7",
            "500 g",
            2,
            "H272, H302, H410",
        ),
        (
            "Oxidisers cabinet C3",
            "Potassium dichromate",
            "K2Cr2O7",
            "7778-50-9",
            "250 g",
            1,
            "H272, H301, H312, H314, H317, H330, H334, H340, H350, H360FD, H372, H410",
        ),
        # planted: a flammable liquid among the oxidisers
        ("Oxidisers cabinet C3", "Ethanol absolute", "C2H6O", "64-17-5", "1 L", 2, "H225, H319"),
        (
            "Oxidisers cabinet C3",
            "Lead(II) nitrate",
            "Pb(NO3)2",
            "10099-74-8",
            "500 g",
            1,
            "H272, H302+H332, H318, H360Df, H373, H410",
        ),
        (
            "Poisons cabinet C4",
            "Mercury(II) chloride",
            "HgCl2",
            "7487-94-7",
            "100 g",
            1,
            "H300, H314, H341, H361f, H372, H410",
        ),
        (
            "Poisons cabinet C4",
            "Mercury(II) oxide",
            "HgO",
            "21908-53-2",
            "25 g",
            2,
            "H300+H310+H330, H373, H410",
        ),
        ("Poisons cabinet C4", "Sodium azide", "NaN3", "26628-22-8", "100 g", 1, "H300, H373, H410, EUH032"),
        (
            "Poisons cabinet C4",
            "Barium chloride dihydrate",
            "BaCl2·2H2O",
            "10326-27-9",
            "500 g",
            1,
            "H301, H332",
        ),
        ("Store B14 shelf 1", "Sodium chloride", "NaCl", "7647-14-5", "1 kg", 3, ""),
        # planted: the same substance twice at one location
        ("Store B14 shelf 1", "Sodium chloride", "NaCl", "7647-14-5", "500 g", 2, ""),
        (
            "Store B14 shelf 1",
            "Copper(II) sulfate pentahydrate",
            "CuSO4·5H2O",
            "7758-99-8",
            "500 g",
            2,
            "H302, H315, H319, H410",
        ),
        # planted: a pack size with no unit
        (
            "Store B14 shelf 1",
            "Zinc sulfate heptahydrate",
            "ZnSO4·7H2O",
            "7446-20-0",
            "500",
            1,
            "H302, H318, H410",
        ),
        ("Store B14 shelf 2", "Sodium hydroxide pellets", "NaOH", "1310-73-2", "1 kg", 2, "H290, H314"),
        # planted: an ammonium salt beside a strong base
        ("Store B14 shelf 2", "Ammonium chloride", "NH4Cl", "12125-02-9", "500 g", 1, "H302, H319"),
        ("Store B14 shelf 2", "Silver nitrate", "AgNO3", "7761-88-8", "25 g", 1, "H272, H314, H410"),
        ("Flammables cabinet F1", "Acetone", "C3H6O", "67-64-1", "2.5 L", 4, "H225, H319, H336"),
        (
            "Flammables cabinet F1",
            "Toluene",
            "C7H8",
            "108-88-3",
            "2.5 L",
            1,
            "H225, H304, H315, H336, H361d, H373",
        ),
    ],
    "Prep room": [
        ("Prep room A cupboard 1", "Hydrochloric acid 2 M", "HCl", "7647-01-0", "1 L", 3, "H290"),
        # planted: a sulfide beside an acid
        (
            "Prep room A cupboard 1",
            "Sodium sulfide nonahydrate",
            "Na2S·9H2O",
            "1313-84-4",
            "250 g",
            1,
            "H290, H301, H314, H400",
        ),
        # planted: a water-reactive metal beside an aqueous acid
        (
            "Prep room A cupboard 1",
            "Sodium (metal, under oil)",
            "Na",
            "7440-23-5",
            "25 g",
            1,
            "H260, H314, EUH014",
        ),
        (
            "Prep room A cupboard 2",
            "Lead(II) acetate trihydrate",
            "Pb(CH3COO)2·3H2O",
            "6080-56-4",
            "100 g",
            1,
            "H360Df, H373, H410",
        ),
        ("Prep room A cupboard 2", "Sodium chloride", "NaCl", "7647-14-5", "500 g", 1, ""),
        (
            "Prep room A cupboard 2",
            "Hydrogen peroxide 30%",
            "H2O2",
            "7722-84-1",
            "1 L",
            1,
            "H302, H318, H412",
        ),
        (
            "Prep room A cupboard 2",
            "Copper(II) sulfate pentahydrate",
            "CuSO4·5H2O",
            "7758-99-8",
            "6 x 100 g",
            1,
            "H302, H315, H319, H410",
        ),
    ],
}


def sds_workbook(path: Path) -> None:
    """A supplier's SDS summary: identity, EC and UN numbers, signal word, H and P statements and
    pictograms, with planted inconsistencies of every kind the checks look for."""
    from openpyxl import Workbook
    from openpyxl.styles import Font

    wb = Workbook()
    ws = wb.active
    ws.title = "SDS summary"
    ws.append(
        ["Quillbrook Reagents - safety data sheet summary for Kestrel Fen College (invented demo data)"]
    )
    ws["A1"].font = Font(bold=True, size=14)
    ws.append([])
    ws.append(SDS_HEADER)
    for cell in ws[3]:
        cell.font = Font(bold=True)
    for line in SDS_LINES:
        ws.append([v if v != "" else None for v in line])
    ws.freeze_panes = "A4"
    for letter, width in zip("ABCDEFGHI", (34, 14, 12, 11, 9, 10, 44, 44, 30)):
        ws.column_dimensions[letter].width = width
    wb.properties.creator = "Quillbrook Reagents (invented)"
    wb.save(path)
    _fixed_zip(path)


def store_workbook(path: Path) -> None:
    """The store as the stores team keeps it: one sheet per room, each line with its location, pack
    size and number of packs, and the H statements copied from the SDS."""
    from openpyxl import Workbook
    from openpyxl.styles import Font

    wb = Workbook()
    first = True
    for title, lines in STORE_SHEETS.items():
        ws = wb.active if first else wb.create_sheet()
        first = False
        ws.title = title
        ws.append([f"Kestrel Fen College - {title.lower()} (invented demo data)"])
        ws["A1"].font = Font(bold=True, size=14)
        ws.append(STORE_HEADER)
        for cell in ws[2]:
            cell.font = Font(bold=True)
        for line in lines:
            ws.append([v if v != "" else None for v in line])
        ws.freeze_panes = "A3"
        for letter, width in zip("ABCDEFG", (24, 34, 18, 12, 11, 11, 44)):
            ws.column_dimensions[letter].width = width
    wb.properties.creator = "Kestrel Fen College stores (invented)"
    wb.save(path)
    _fixed_zip(path)


def build(target: Path = HERE) -> list[Path]:
    """Write every demo file into ``target``; return their paths."""
    target.mkdir(parents=True, exist_ok=True)
    path = target / "demo-stock-list.csv"
    path.write_text(stock_list_csv(), encoding="utf-8")
    inventory = target / "demo-inventory.xlsx"
    inventory_workbook(inventory)
    supplier = target / "demo-supplier-table.csv"
    supplier.write_bytes(supplier_table_csv())
    functions = target / "demo-worksheet-functions.xlsx"
    functions_workbook(functions)
    calc = target / "demo-worksheet-functions.ods"
    functions_ods(functions, calc)
    sds = target / "demo-sds-summary.xlsx"
    sds_workbook(sds)
    store = target / "demo-store.xlsx"
    store_workbook(store)
    return [path, inventory, supplier, functions, calc, sds, store]


if __name__ == "__main__":
    for written in build(Path(sys.argv[1]) if len(sys.argv) > 1 else HERE):
        print(written)
