"""The core imports no spreadsheet library (DEVELOPERS.md, layout)."""

import subprocess
import sys


def test_import_cellchem_loads_no_spreadsheet_library():
    code = (
        "import sys, cellchem, cellchem.audit, cellchem.cli;"
        "bad = [m for m in ('openpyxl', 'xlwings', 'uno') if m in sys.modules];"
        "print(','.join(bad))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


def test_public_names():
    import cellchem

    for name in (
        "parse_formula",
        "molar_mass",
        "composition",
        "mass_fraction",
        "salt_formula",
        "charge_balance",
        "oxidation_state",
        "net_charge",
        "CellchemError",
    ):
        assert name in cellchem.__all__
        assert hasattr(cellchem, name)
    assert issubclass(cellchem.CellchemError, ValueError)
